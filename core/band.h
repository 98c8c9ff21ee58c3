/*
 * band.h — radiometric quantities integrated over a sensor band.
 *
 * A band is one of:
 *   GB_BAND_TOTAL       the whole spectrum (Stefan-Boltzmann, sigma T^4 / pi)
 *   GB_BAND_WAVELENGTH  a flat (top-hat) band between two wavelengths, um
 *   GB_BAND_WAVENUMBER  a flat band between two wavenumbers, cm^-1
 *   GB_BAND_RESPONSE    a tabulated relative spectral response R(lambda):
 *                       (wavelength um, value) pairs, piecewise linear
 *                       between points, zero outside; R is *not*
 *                       renormalised, so band radiance = int R L dlambda.
 * The response arrays belong to the caller and must outlive every call made
 * with the band; nothing here allocates.
 *
 * Units: band radiance W m^-2 sr^-1; exitance W m^-2 (pi x radiance,
 * Lambertian); photon exitance photons s^-1 m^-2; fraction dimensionless
 * (share of the total exitance sigma T^4); derivatives per kelvin.
 *
 * Methods and accuracy (measured against 30-digit mpmath quadrature,
 * tests/unit/test_band.c):
 *   flat bands: difference of blackbody fractions (fraction.h), choosing F or
 *     1 - F to cancel least; when the band holds so small a share that the
 *     difference would lose more than 2 bits, 20-point Gauss-Legendre
 *     quadrature of Planck's law over the band instead.  dL/dT from the
 *     closed form (sigma T^3 / pi)[4 dF + (15/pi^4)(x2^4/(e^x2-1) -
 *     x1^4/(e^x1-1))].  With x = c2/(lambda_short T): relative error <= 1e-13
 *     for x <= 100, <= (x + 4) 1e-15 beyond (the rounding of x, magnified by
 *     x through e^-x, as in planck.h), for T in [1 K, 1e6 K] and limits in
 *     [1e-3 um, 1e5 um], wherever the band radiance is a normal double (the
 *     other quantities derive from it and share its digits).
 *   response bands: 20-point Gauss-Legendre on each linear piece, subdivided
 *     so that every sub-interval spans a wavelength ratio <= 1.5 and an
 *     exponent range <= 6; relative error <= 1e-12.
 * A band whose radiance underflows at a very low temperature gives 0.
 */
#ifndef GREYBODY_BAND_H
#define GREYBODY_BAND_H

#include <stddef.h>

#include "status.h"

typedef enum gb_band_kind {
    GB_BAND_TOTAL = 0,
    GB_BAND_WAVELENGTH,
    GB_BAND_WAVENUMBER,
    GB_BAND_RESPONSE
} gb_band_kind;

typedef struct gb_band {
    gb_band_kind kind;
    double lower; /* um (WAVELENGTH) or cm^-1 (WAVENUMBER) */
    double upper;
    const double *response_wavelength_um; /* RESPONSE: strictly increasing, > 0 */
    const double *response_value;         /* RESPONSE: >= 0, not all 0 */
    size_t response_count;                /* RESPONSE: >= 2 */
} gb_band;

/* Temperatures the band solver searches, K. */
#define GB_BAND_TEMPERATURE_MIN 0.1
#define GB_BAND_TEMPERATURE_MAX 1e6

/* Checks a band: limits positive, finite and increasing; response table valid. */
gb_status gb_band_validate(const gb_band *band);

/* Blackbody band radiance L_band(T) and, when `derivative` is not NULL, dL_band/dT. */
gb_status gb_band_radiance(const gb_band *band, double temperature_k, double *radiance,
                           double *derivative);

/* Everything the band endpoint reports, for a grey body of the given emissivity. */
typedef struct gb_band_quantities {
    double radiance;            /* eps L_band, W m^-2 sr^-1 */
    double exitance;            /* pi eps L_band, W m^-2 */
    double photon_exitance;     /* photons s^-1 m^-2 (response-weighted for RESPONSE) */
    double fraction;            /* L_band / (sigma T^4 / pi), independent of eps */
    double total_exitance;      /* eps sigma T^4, W m^-2 */
    double radiance_derivative; /* eps dL_band/dT, W m^-2 sr^-1 K^-1 */
} gb_band_quantities;

gb_status gb_band_evaluate(const gb_band *band, double temperature_k, double emissivity,
                           gb_band_quantities *quantities);

/*
 * Inverse: the temperature at which a grey body of `emissivity` has band
 * radiance `radiance`.  Safeguarded Newton iteration on ln L against 1/T
 * within [GB_BAND_TEMPERATURE_MIN, GB_BAND_TEMPERATURE_MAX] (solver.h), so
 * it always converges; relative error <= 1e-12 (<= 1 uK up to 1e5 K).  The
 * whole spectrum (GB_BAND_TOTAL) inverts in closed form, within the same
 * temperature range.  GB_ERR_RADIANCE_DOMAIN for radiance <= 0;
 * GB_ERR_RADIANCE_OUT_OF_RANGE when the answer lies outside that range.
 */
gb_status gb_band_temperature(const gb_band *band, double radiance, double emissivity,
                              double *temperature_k);

#endif
