#include "planck.h"

#include <float.h>
#include <math.h>
#include <stddef.h>

#include "constants.h"

/* Above this exponent the radiance is evaluated in logarithms (exp(-x) is near underflow). */
#define LOG_FORM_EXPONENT 700.0

static gb_status check_position(double position)
{
    if (!isfinite(position)) {
        return GB_ERR_NOT_FINITE;
    }
    return position > 0.0 ? GB_OK : GB_ERR_SPECTRAL_DOMAIN;
}

gb_status gb_check_temperature(double temperature_k)
{
    if (!isfinite(temperature_k)) {
        return GB_ERR_NOT_FINITE;
    }
    return (temperature_k > 0.0 && temperature_k <= GB_TEMPERATURE_MAX) ? GB_OK
                                                                       : GB_ERR_TEMPERATURE_DOMAIN;
}

gb_status gb_check_emissivity(double emissivity)
{
    if (!isfinite(emissivity)) {
        return GB_ERR_NOT_FINITE;
    }
    return (emissivity > 0.0 && emissivity <= 1.0) ? GB_OK : GB_ERR_EMISSIVITY_DOMAIN;
}

#define C1L_PER_WAVENUMBER_CM 1.19104297239718841407948920e-8 /* 2 h c^2 x 1e8, W m^-2 sr^-1 cm^4 */
#define C2_CM_K 1.438776877503933802147                         /* c2 in cm K */
#define TWO_H_OVER_C2 1.4744994647625415786e-50                 /* 2 h / c^2, J s^3 m^-2 */
#define H_OVER_K 4.799243073366221248e-11                       /* h / k, K s */
/* 2 c in the three coordinates' photon units (c1' divided by the photon energy). */
#define PHOTON_PER_WAVELENGTH_UM 5.99584916e26 /* 2 c x 1e18, photons s^-1 m^-2 sr^-1 um^3 */
#define PHOTON_PER_WAVENUMBER_CM 5.99584916e14 /* 2 c x 1e6 */
#define PHOTON_PER_FREQUENCY 2.2253001121072368643e-17 /* 2 / c^2 */

/*
 * A spectral coordinate reduced to the two numbers Planck's law needs there:
 * the exponent x = h c / (lambda k T) and the prefactor c1' s^p (with its
 * logarithm for the far ends), plus the photon energy for photon radiance.
 */
gb_status gb_planck_prepare(gb_spectral_coordinate coordinate, double position,
                            gb_planck_position *terms)
{
    gb_status status;
    if (terms == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    status = check_position(position);
    if (status != GB_OK) {
        return status;
    }
    terms->coordinate = coordinate;
    switch (coordinate) {
    case GB_WAVELENGTH: {
        double squared = position * position;
        double log_position = log(position);
        terms->exponent_times_t = GB_C2_UM / position;
        terms->prefactor = GB_C1L_UM / (squared * squared * position);
        terms->log_prefactor = log(GB_C1L_UM) - 5.0 * log_position;
        terms->photon_prefactor = PHOTON_PER_WAVELENGTH_UM / (squared * squared);
        terms->log_photon_prefactor = log(PHOTON_PER_WAVELENGTH_UM) - 4.0 * log_position;
        break;
    }
    case GB_WAVENUMBER:
        terms->exponent_times_t = C2_CM_K * position;
        terms->prefactor = C1L_PER_WAVENUMBER_CM * position * position * position;
        terms->log_prefactor = log(C1L_PER_WAVENUMBER_CM) + 3.0 * log(position);
        terms->photon_prefactor = PHOTON_PER_WAVENUMBER_CM * position * position;
        terms->log_photon_prefactor = log(PHOTON_PER_WAVENUMBER_CM) + 2.0 * log(position);
        break;
    case GB_FREQUENCY:
        terms->exponent_times_t = H_OVER_K * position;
        terms->prefactor = TWO_H_OVER_C2 * position * position * position;
        terms->log_prefactor = log(TWO_H_OVER_C2) + 3.0 * log(position);
        terms->photon_prefactor = PHOTON_PER_FREQUENCY * position * position;
        terms->log_photon_prefactor = log(PHOTON_PER_FREQUENCY) + 2.0 * log(position);
        break;
    default:
        return GB_ERR_INVALID_ARGUMENT;
    }
    if (!isfinite(terms->exponent_times_t) || !(terms->exponent_times_t > 0.0)) {
        return GB_ERR_SPECTRAL_DOMAIN;
    }
    return GB_OK;
}

/* ln of prefactor / expm1(x), valid for every x > 0: ln P - x - ln(1 - e^-x). */
static double log_bose_einstein(double log_prefactor, double exponent)
{
    return log_prefactor - exponent - log(-expm1(-exponent));
}

/* prefactor / expm1(x), robust at both ends: in logarithms wherever a direct
 * evaluation would pass through an overflow, an underflow or a subnormal. */
static double bose_einstein(double prefactor, double log_prefactor, double exponent)
{
    if (exponent <= LOG_FORM_EXPONENT && isnormal(prefactor) && isfinite(prefactor)) {
        /* Beyond x = 1, e^x - 1 cancels less than a bit and exp costs half of expm1. */
        double direct = prefactor / (exponent > 1.0 ? exp(exponent) - 1.0 : expm1(exponent));
        if (isnormal(direct)) {
            return direct;
        }
    }
    if (isinf(exponent)) {
        return 0.0;
    }
    return exp(log_bose_einstein(log_prefactor, exponent));
}

static gb_status planck_common(gb_spectral_coordinate coordinate, double position,
                               double temperature_k, gb_planck_position *terms,
                               double *radiance, double *exponent)
{
    gb_status status = gb_check_temperature(temperature_k);
    if (status != GB_OK) {
        return status;
    }
    status = gb_planck_prepare(coordinate, position, terms);
    if (status != GB_OK) {
        return status;
    }
    *exponent = terms->exponent_times_t / temperature_k;
    *radiance = bose_einstein(terms->prefactor, terms->log_prefactor, *exponent);
    return isfinite(*radiance) ? GB_OK : GB_ERR_RESULT_OVERFLOW;
}

gb_status gb_planck_radiance_prepared(const gb_planck_position *prepared, double temperature_k,
                                      double emissivity, double *radiance)
{
    double blackbody;
    gb_status status;
    if (prepared == NULL || radiance == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    status = gb_check_emissivity(emissivity);
    if (status == GB_OK) {
        status = gb_check_temperature(temperature_k);
    }
    if (status != GB_OK) {
        return status;
    }
    blackbody = bose_einstein(prepared->prefactor, prepared->log_prefactor,
                              prepared->exponent_times_t / temperature_k);
    if (!isfinite(blackbody)) {
        return GB_ERR_RESULT_OVERFLOW;
    }
    *radiance = emissivity * blackbody;
    return GB_OK;
}

gb_status gb_planck_radiance(gb_spectral_coordinate coordinate, double position,
                             double temperature_k, double emissivity, double *radiance)
{
    gb_planck_position terms;
    gb_status status;
    if (radiance == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    /* Checked in the order emissivity, temperature, position, as before preparation existed. */
    status = gb_check_emissivity(emissivity);
    if (status == GB_OK) {
        status = gb_check_temperature(temperature_k);
    }
    if (status == GB_OK) {
        status = gb_planck_prepare(coordinate, position, &terms);
    }
    if (status != GB_OK) {
        return status;
    }
    return gb_planck_radiance_prepared(&terms, temperature_k, emissivity, radiance);
}

gb_status gb_planck_photon_radiance(gb_spectral_coordinate coordinate, double position,
                                    double temperature_k, double emissivity,
                                    double *photon_radiance)
{
    gb_planck_position terms;
    double blackbody, exponent, photons;
    gb_status status;
    if (photon_radiance == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    status = gb_check_emissivity(emissivity);
    if (status == GB_OK) {
        status = planck_common(coordinate, position, temperature_k, &terms, &blackbody, &exponent);
    }
    if (status != GB_OK) {
        return status;
    }
    /* A subnormal radiance may still give a normal photon radiance: divide in logarithms. */
    photons = emissivity * bose_einstein(terms.photon_prefactor, terms.log_photon_prefactor,
                                         exponent);
    if (!isfinite(photons)) {
        return GB_ERR_RESULT_OVERFLOW;
    }
    *photon_radiance = photons;
    return GB_OK;
}

gb_status gb_planck_radiance_derivative(gb_spectral_coordinate coordinate, double position,
                                        double temperature_k, double *derivative)
{
    gb_planck_position terms;
    double blackbody, exponent, result;
    gb_status status;
    if (derivative == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    status = planck_common(coordinate, position, temperature_k, &terms, &blackbody, &exponent);
    if (status != GB_OK) {
        return status;
    }
    /* x / (1 - e^-x) tends to 1 as x -> 0; -expm1(-x) keeps it exact there. */
    if (isnormal(blackbody)) {
        result = blackbody / temperature_k * (exponent / -expm1(-exponent));
    } else if (isinf(exponent)) {
        result = 0.0;
    } else {
        result = exp(log_bose_einstein(terms.log_prefactor, exponent) +
                     log(exponent / -expm1(-exponent)) - log(temperature_k));
    }
    if (!isfinite(result)) {
        return GB_ERR_RESULT_OVERFLOW;
    }
    *derivative = result;
    return GB_OK;
}

gb_status gb_brightness_temperature(gb_spectral_coordinate coordinate, double position,
                                    double radiance, double emissivity, double *temperature_k)
{
    gb_planck_position terms;
    gb_status status;
    if (temperature_k == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    if (!isfinite(radiance)) {
        return GB_ERR_NOT_FINITE;
    }
    status = gb_check_emissivity(emissivity);
    if (status != GB_OK) {
        return status;
    }
    status = gb_planck_prepare(coordinate, position, &terms);
    if (status != GB_OK) {
        return status;
    }
    return gb_brightness_temperature_prepared(&terms, radiance, emissivity, temperature_k);
}

gb_status gb_brightness_temperature_prepared(const gb_planck_position *terms, double radiance,
                                             double emissivity, double *temperature_k)
{
    double ratio, exponent, temperature;
    gb_status status;
    if (terms == NULL || temperature_k == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    if (!isfinite(radiance)) {
        return GB_ERR_NOT_FINITE;
    }
    status = gb_check_emissivity(emissivity);
    if (status != GB_OK) {
        return status;
    }
    if (!(radiance > 0.0)) {
        return GB_ERR_RADIANCE_DOMAIN;
    }
    ratio = emissivity * terms->prefactor / radiance;
    if (isnormal(ratio) && isnormal(terms->prefactor) && isfinite(terms->prefactor)) {
        /* From r = 1 up, 1 + r rounds by at most half an ulp of a number >= 2: log is as good. */
        exponent = ratio >= 1.0 ? log(1.0 + ratio) : log1p(ratio);
    } else {
        /* ln(1 + r) with r = exp(q): q + log1p(exp(-q)), stable for any q. */
        double log_ratio = log(emissivity) + terms->log_prefactor - log(radiance);
        exponent = log_ratio > 0.0 ? log_ratio + log1p(exp(-log_ratio)) : log1p(exp(log_ratio));
    }
    temperature = terms->exponent_times_t / exponent;
    if (!(temperature <= GB_TEMPERATURE_MAX)) {
        return GB_ERR_RADIANCE_OUT_OF_RANGE;
    }
    if (!(temperature > 0.0)) {
        return GB_ERR_RADIANCE_OUT_OF_RANGE;
    }
    *temperature_k = temperature;
    return GB_OK;
}

gb_status gb_wien_peaks_at(double temperature_k, gb_wien_peaks *peaks)
{
    gb_wien_peaks result;
    gb_status status;
    if (peaks == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    status = gb_check_temperature(temperature_k);
    if (status != GB_OK) {
        return status;
    }
    result.wavelength_um = GB_WIEN_WAVELENGTH_UM_K / temperature_k;
    result.wavenumber_cm = GB_WIEN_WAVENUMBER_CM_PER_K * temperature_k;
    result.frequency_hz = GB_WIEN_FREQUENCY_HZ_PER_K * temperature_k;
    result.photon_wavelength_um = GB_WIEN_PHOTON_WAVELENGTH_UM_K / temperature_k;
    if (!isfinite(result.photon_wavelength_um)) {
        return GB_ERR_RESULT_OVERFLOW; /* a body so cold its peak lies beyond any double */
    }
    status = gb_planck_radiance(GB_WAVELENGTH, result.wavelength_um, temperature_k, 1.0,
                                &result.radiance_at_peak);
    if (status != GB_OK) {
        return status;
    }
    *peaks = result;
    return GB_OK;
}

gb_status gb_wien_temperature(double peak_wavelength_um, double *temperature_k)
{
    double temperature;
    gb_status status;
    if (temperature_k == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    status = check_position(peak_wavelength_um);
    if (status != GB_OK) {
        return status;
    }
    temperature = GB_WIEN_WAVELENGTH_UM_K / peak_wavelength_um;
    status = gb_check_temperature(temperature);
    if (status != GB_OK) {
        return GB_ERR_SPECTRAL_DOMAIN;
    }
    *temperature_k = temperature;
    return GB_OK;
}

/* eps * constant * T^power, the shape of every Stefan-Boltzmann form. */
static gb_status total_law(double temperature_k, double emissivity, double constant, int power,
                           double *out)
{
    double result, squared;
    gb_status status;
    if (out == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    status = gb_check_temperature(temperature_k);
    if (status == GB_OK) {
        status = gb_check_emissivity(emissivity);
    }
    if (status != GB_OK) {
        return status;
    }
    squared = temperature_k * temperature_k;
    result = emissivity * constant * (power == 4 ? squared * squared : squared * temperature_k);
    if (!isfinite(result)) {
        return GB_ERR_RESULT_OVERFLOW;
    }
    *out = result;
    return GB_OK;
}

gb_status gb_total_exitance(double temperature_k, double emissivity, double *exitance)
{
    return total_law(temperature_k, emissivity, GB_SIGMA, 4, exitance);
}

gb_status gb_total_radiance(double temperature_k, double emissivity, double *radiance)
{
    return total_law(temperature_k, emissivity, GB_SIGMA / GB_PI, 4, radiance);
}

gb_status gb_total_photon_exitance(double temperature_k, double emissivity,
                                   double *photon_exitance)
{
    return total_law(temperature_k, emissivity, GB_SIGMA_PHOTON, 3, photon_exitance);
}
