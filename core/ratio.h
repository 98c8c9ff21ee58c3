/*
 * ratio.h — two-colour (ratio) temperature: the temperature of a surface from
 * the ratio of its signals in two channels, each a single wavelength or a band.
 *
 *   R = r_eps L1(T) / L2(T),  r_eps = eps1 / eps2   (1 for a grey body)
 *
 * Exact: Newton's method on ln R against 1/T with a bisection safeguard, as
 * in band.h, over [GB_BAND_TEMPERATURE_MIN, GB_BAND_TEMPERATURE_MAX]; the
 * model ratio must rise with T, i.e. channel 1 lies at shorter wavelengths
 * than channel 2 (checked for single wavelengths; for bands a falling ratio
 * gives GB_ERR_RATIO_UNREACHABLE).  Single wavelengths are worked in
 * logarithms, so cold targets whose radiances underflow still solve.
 * Accuracy: relative error <= 1e-12 in T, or, near the Rayleigh-Jeans limit
 * where the ratio hardly changes with T, |dT| <= 4e-15 / |d lnR/dT|
 * (the rounding of ln R, magnified by the conditioning).
 * Wien approximation (single wavelengths only; reported beside the exact
 * answer so users see what the approximation costs):
 *   T_W = c2 (1/lambda1 - 1/lambda2) / (ln r_eps + 5 ln(lambda2/lambda1) - ln R)
 * Sensitivity to the emissivity ratio, from d ln R = 0:
 *   dT/dr_eps = -1 / (r_eps (L1'/L1 - L2'/L2))   K per unit of ratio.
 */
#ifndef GREYBODY_RATIO_H
#define GREYBODY_RATIO_H

#include "band.h"
#include "status.h"

typedef struct gb_channel {
    int is_band;          /* 0: a single wavelength; 1: a band */
    double wavelength_um; /* when !is_band */
    gb_band band;         /* when is_band */
} gb_channel;

typedef struct gb_ratio_result {
    double temperature_k;
    double wien_temperature_k;       /* single wavelengths only; else 0 */
    int has_wien_temperature;
    double emissivity_ratio_sensitivity; /* dT / d r_eps, K */
} gb_ratio_result;

/* Signal ratio S1/S2 (> 0) and emissivity ratio eps1/eps2 (> 0, finite) -> temperature. */
gb_status gb_ratio_temperature(const gb_channel *first, const gb_channel *second,
                               double signal_ratio, double emissivity_ratio,
                               gb_ratio_result *result);

/* The model ratio r_eps L1(T)/L2(T), for building test signals and plots. */
gb_status gb_ratio_at(const gb_channel *first, const gb_channel *second, double temperature_k,
                      double emissivity_ratio, double *signal_ratio);

#endif
