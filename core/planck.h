/*
 * planck.h — Planck's law for a blackbody or grey body at one spectral position,
 * its inverse (brightness temperature), Wien's displacement law and the
 * Stefan-Boltzmann law.
 *
 * Spectral coordinates and the units of spectral radiance L:
 *   GB_WAVELENGTH  position in um,    L in W m^-2 sr^-1 um^-1
 *   GB_WAVENUMBER  position in cm^-1, L in W m^-2 sr^-1 (cm^-1)^-1
 *   GB_FREQUENCY   position in Hz,    L in W m^-2 sr^-1 Hz^-1
 * Spectral photon radiance is L divided by the photon energy, in
 * photons s^-1 m^-2 sr^-1 per the same spectral unit.  Hemispherical spectral
 * exitance of a Lambertian surface is pi L.
 *
 * Method: L = eps c1' s^p / expm1(x), x = h c / (lambda k T) in each
 * coordinate (M. Planck, 1901; constants CODATA 2018).  expm1 keeps the long
 * wavelength (Rayleigh-Jeans) end exact; for x > 700, or where s^p would
 * overflow or underflow, the same expression is evaluated in logarithms so
 * that results that underflow come out as a correct 0 rather than NaN.
 *
 * Domain: temperature in (0, 1e9] K; position > 0 and finite; emissivity in
 * (0, 1].  Accuracy where the result is a normal double: relative error
 * <= (x + |ln L| + 4) 2.2e-16 -- the rounding of x is magnified by x through
 * e^-x, and where the logarithmic form is used (x > 700, or c1' s^p beyond a
 * normal double, e.g. wavelengths beyond 1e61 um) the rounding of ln L is
 * magnified the same way; for everyday inputs this is a few 1e-15
 * (measured against 50-digit mpmath, tests/unit/test_planck.c);
 * subnormal results carry fewer digits; results below the smallest double
 * are 0.  Photon radiance and dL/dT are worked in logarithms where the
 * radiance itself is subnormal, so they stay accurate while they are normal.
 * A result too large for a double gives GB_ERR_RESULT_OVERFLOW.
 */
#ifndef GREYBODY_PLANCK_H
#define GREYBODY_PLANCK_H

#include "status.h"

typedef enum gb_spectral_coordinate {
    GB_WAVELENGTH = 0, /* um */
    GB_WAVENUMBER,     /* cm^-1 */
    GB_FREQUENCY       /* Hz */
} gb_spectral_coordinate;

/* Spectral radiance of a grey body. */
gb_status gb_planck_radiance(gb_spectral_coordinate coordinate, double position,
                             double temperature_k, double emissivity, double *radiance);

/* Spectral photon radiance of a grey body. */
gb_status gb_planck_photon_radiance(gb_spectral_coordinate coordinate, double position,
                                    double temperature_k, double emissivity,
                                    double *photon_radiance);

/*
 * dL/dT of the blackbody spectral radiance, per kelvin, in the coordinate's
 * radiance unit: L x / (T (1 - e^-x)).  Same domain and accuracy as above.
 */
gb_status gb_planck_radiance_derivative(gb_spectral_coordinate coordinate, double position,
                                        double temperature_k, double *derivative);

/*
 * Brightness temperature: the temperature at which a grey body of the given
 * emissivity emits `radiance` at `position`.  Closed form
 * T = (h c / lambda k) / log1p(eps c1' s^p / L), with logarithms where the
 * ratio would overflow.  Domain: radiance > 0 and finite.  A radiance that
 * needs T > 1e9 K gives GB_ERR_RADIANCE_OUT_OF_RANGE.  Accuracy <= 4e-15
 * relative (the round trip T -> L -> T is tested to 1e-13).
 */
gb_status gb_brightness_temperature(gb_spectral_coordinate coordinate, double position,
                                    double radiance, double emissivity, double *temperature_k);

/*
 * A spectral position worked out once for many temperatures or radiances
 * (array forms, batch.h and frame.h): the exponent x T and the prefactor
 * c1' s^p with their logarithms.  The functions above prepare one per call;
 * the _prepared forms below run the same arithmetic from it, so results and
 * statuses are identical (position errors are reported by the preparation).
 */
typedef struct gb_planck_position {
    gb_spectral_coordinate coordinate;
    double exponent_times_t;     /* x T, in K */
    double prefactor;            /* c1' s^p in the coordinate's radiance unit */
    double log_prefactor;
    double photon_prefactor;     /* c1' s^p / (photon energy) */
    double log_photon_prefactor;
} gb_planck_position;

gb_status gb_planck_prepare(gb_spectral_coordinate coordinate, double position,
                            gb_planck_position *prepared);
gb_status gb_planck_radiance_prepared(const gb_planck_position *prepared, double temperature_k,
                                      double emissivity, double *radiance);
gb_status gb_brightness_temperature_prepared(const gb_planck_position *prepared,
                                             double radiance, double emissivity,
                                             double *temperature_k);

/* Wien's displacement law: where the blackbody curves of temperature T peak. */
typedef struct gb_wien_peaks {
    double wavelength_um;        /* peak of L per wavelength: b / T, b = 2897.77... um K */
    double wavenumber_cm;        /* peak of L per wavenumber: 1.96099... cm^-1 K^-1 x T */
    double frequency_hz;         /* peak of L per frequency: 5.8789...e10 Hz K^-1 x T */
    double photon_wavelength_um; /* peak of photon radiance per wavelength: 3669.70... um K / T */
    double radiance_at_peak;     /* L per wavelength at wavelength_um, W m^-2 sr^-1 um^-1 */
} gb_wien_peaks;

/* Exact to rounding (<= 2 ulp) for the positions; radiance_at_peak as gb_planck_radiance. */
gb_status gb_wien_peaks_at(double temperature_k, gb_wien_peaks *peaks);

/* Inverse Wien: the temperature whose radiance-per-wavelength curve peaks at `wavelength_um`. */
gb_status gb_wien_temperature(double peak_wavelength_um, double *temperature_k);

/* Stefan-Boltzmann: total hemispherical exitance eps sigma T^4 (W m^-2), <= 2 ulp. */
gb_status gb_total_exitance(double temperature_k, double emissivity, double *exitance);
/* Total radiance eps sigma T^4 / pi (W m^-2 sr^-1). */
gb_status gb_total_radiance(double temperature_k, double emissivity, double *radiance);
/* Total photon exitance eps sigma_q T^3 (photons s^-1 m^-2). */
gb_status gb_total_photon_exitance(double temperature_k, double emissivity,
                                   double *photon_exitance);

/* Shared argument checks, exported so that every module reports them alike. */
gb_status gb_check_temperature(double temperature_k);
gb_status gb_check_emissivity(double emissivity);

#endif
