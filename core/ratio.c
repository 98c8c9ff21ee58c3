#include "ratio.h"

#include <math.h>
#include <stddef.h>

#include "constants.h"
#include "planck.h"
#include "solver.h"

#define FIRST_GUESS_K 1000.0

static gb_status check_channel(const gb_channel *channel)
{
    if (channel == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    if (channel->is_band) {
        return gb_band_validate(&channel->band);
    }
    if (!isfinite(channel->wavelength_um)) {
        return GB_ERR_NOT_FINITE;
    }
    return channel->wavelength_um > 0.0 ? GB_OK : GB_ERR_SPECTRAL_DOMAIN;
}

#define LOG_C1L_UM 18.59551011461265267347/* ln(2 h c^2) for wavelengths in um */

/*
 * ln L and d(ln L)/dT of one channel at T (valid channel and T).  A single
 * wavelength is done in logarithms throughout, so that ratios of radiances
 * far below the smallest double (cold targets at short wavelengths) still
 * come out right: ln L = ln c1' - 5 ln(lambda) - ln(e^x - 1).
 */
static gb_status channel_log_radiance(const gb_channel *channel, double temperature_k,
                                      double *log_radiance, double *log_slope)
{
    if (channel->is_band) {
        double radiance, derivative;
        gb_status status =
            gb_band_radiance(&channel->band, temperature_k, &radiance, &derivative);
        if (status != GB_OK) {
            return status;
        }
        if (!(radiance > 0.0)) {
            return GB_ERR_RADIANCE_OUT_OF_RANGE;
        }
        *log_radiance = log(radiance);
        *log_slope = derivative / radiance;
        return GB_OK;
    }
    {
        double x = GB_C2_UM / (channel->wavelength_um * temperature_k);
        double one_minus_decay = -expm1(-x);
        /* ln(e^x - 1) = x + ln(1 - e^-x) */
        *log_radiance = LOG_C1L_UM - 5.0 * log(channel->wavelength_um) - x - log(one_minus_decay);
        *log_slope = x / (temperature_k * one_minus_decay);
        return isfinite(*log_radiance) ? GB_OK : GB_ERR_RADIANCE_OUT_OF_RANGE;
    }
}

/*
 * ln of the model ratio and its derivative with respect to T.  Two single
 * wavelengths take the closed form 5 ln(l2/l1) - (x1 - x2) - ln(1 - e^-x1)
 * + ln(1 - e^-x2), whose terms are small, so ln R keeps its accuracy near
 * the Rayleigh-Jeans limit where it is nearly constant.
 */
static gb_status log_ratio(const gb_channel *first, const gb_channel *second,
                           double temperature_k, double *value, double *slope)
{
    double l1, s1, l2, s2;
    gb_status status;
    if (!first->is_band && !second->is_band) {
        double w1 = first->wavelength_um, w2 = second->wavelength_um;
        double x1 = GB_C2_UM / (w1 * temperature_k), x2 = GB_C2_UM / (w2 * temperature_k);
        double keep1 = -expm1(-x1), keep2 = -expm1(-x2);
        *value = 5.0 * log(w2 / w1) - GB_C2_UM / temperature_k * (1.0 / w1 - 1.0 / w2) -
                 log(keep1) + log(keep2);
        *slope = (x1 / keep1 - x2 / keep2) / temperature_k;
        return isfinite(*value) ? GB_OK : GB_ERR_RADIANCE_OUT_OF_RANGE;
    }
    status = channel_log_radiance(first, temperature_k, &l1, &s1);
    if (status == GB_OK) {
        status = channel_log_radiance(second, temperature_k, &l2, &s2);
    }
    if (status != GB_OK) {
        return status;
    }
    *value = l1 - l2;
    *slope = s1 - s2;
    return GB_OK;
}

static gb_status check_inputs(const gb_channel *first, const gb_channel *second,
                              double emissivity_ratio)
{
    gb_status status = check_channel(first);
    if (status == GB_OK) {
        status = check_channel(second);
    }
    if (status != GB_OK) {
        return status;
    }
    if (!isfinite(emissivity_ratio)) {
        return GB_ERR_NOT_FINITE;
    }
    if (!(emissivity_ratio > 0.0)) {
        return GB_ERR_EMISSIVITY_DOMAIN;
    }
    if (!first->is_band && !second->is_band && !(first->wavelength_um < second->wavelength_um)) {
        return GB_ERR_BAND_REVERSED;
    }
    return GB_OK;
}

gb_status gb_ratio_at(const gb_channel *first, const gb_channel *second, double temperature_k,
                      double emissivity_ratio, double *signal_ratio)
{
    double value, slope, ratio;
    gb_status status;
    if (signal_ratio == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    status = check_inputs(first, second, emissivity_ratio);
    if (status == GB_OK) {
        status = gb_check_temperature(temperature_k);
    }
    if (status == GB_OK) {
        status = log_ratio(first, second, temperature_k, &value, &slope);
    }
    if (status != GB_OK) {
        return status;
    }
    ratio = emissivity_ratio * exp(value);
    if (!isfinite(ratio)) {
        return GB_ERR_RESULT_OVERFLOW;
    }
    *signal_ratio = ratio;
    return GB_OK;
}

struct channel_pair {
    const gb_channel *first;
    const gb_channel *second;
};

static gb_status pair_log_ratio(const void *context, double temperature_k, double *value,
                                double *slope)
{
    const struct channel_pair *pair = context;
    return log_ratio(pair->first, pair->second, temperature_k, value, slope);
}

gb_status gb_ratio_temperature(const gb_channel *first, const gb_channel *second,
                               double signal_ratio, double emissivity_ratio,
                               gb_ratio_result *result)
{
    gb_ratio_result answer = {0};
    double slope;
    gb_status status;
    if (result == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    status = check_inputs(first, second, emissivity_ratio);
    if (status != GB_OK) {
        return status;
    }
    if (!isfinite(signal_ratio)) {
        return GB_ERR_NOT_FINITE;
    }
    if (!(signal_ratio > 0.0)) {
        return GB_ERR_RADIANCE_DOMAIN;
    }
    {
        struct channel_pair pair = {first, second};
        status = gb_solve_rising(pair_log_ratio, &pair, log(signal_ratio) - log(emissivity_ratio),
                                 FIRST_GUESS_K, &answer.temperature_k, &slope);
    }
    if (status != GB_OK) {
        return status == GB_ERR_RADIANCE_OUT_OF_RANGE ? GB_ERR_RATIO_UNREACHABLE : status;
    }
    answer.emissivity_ratio_sensitivity = -1.0 / (emissivity_ratio * slope);
    if (!first->is_band && !second->is_band) {
        double l1 = first->wavelength_um, l2 = second->wavelength_um;
        double denominator = log(emissivity_ratio) + 5.0 * log(l2 / l1) - log(signal_ratio);
        double wien = GB_C2_UM * (1.0 / l1 - 1.0 / l2) / denominator;
        if (denominator > 0.0 && isfinite(wien)) {
            answer.wien_temperature_k = wien;
            answer.has_wien_temperature = 1;
        }
    }
    if (!isfinite(answer.emissivity_ratio_sensitivity)) {
        return GB_ERR_RESULT_OVERFLOW;
    }
    *result = answer;
    return GB_OK;
}
