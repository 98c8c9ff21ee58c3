#include "ratio.h"

#include <math.h>
#include <stddef.h>

#include "constants.h"
#include "planck.h"

#define MAX_SOLVER_STEPS 200
#define SOLVER_RELATIVE_STEP 1e-13

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

/* L and dL/dT of one channel at T (valid channel and T). */
static gb_status channel_radiance(const gb_channel *channel, double temperature_k,
                                  double *radiance, double *derivative)
{
    gb_status status;
    if (channel->is_band) {
        return gb_band_radiance(&channel->band, temperature_k, radiance, derivative);
    }
    status = gb_planck_radiance(GB_WAVELENGTH, channel->wavelength_um, temperature_k, 1.0,
                                radiance);
    if (status == GB_OK) {
        status = gb_planck_radiance_derivative(GB_WAVELENGTH, channel->wavelength_um,
                                               temperature_k, derivative);
    }
    return status;
}

/* ln of the model ratio and its derivative with respect to T; 0 from status when defined. */
static gb_status log_ratio(const gb_channel *first, const gb_channel *second,
                           double temperature_k, double *value, double *slope)
{
    double l1, d1, l2, d2;
    gb_status status = channel_radiance(first, temperature_k, &l1, &d1);
    if (status == GB_OK) {
        status = channel_radiance(second, temperature_k, &l2, &d2);
    }
    if (status != GB_OK) {
        return status;
    }
    if (!(l1 > 0.0 && l2 > 0.0)) {
        return GB_ERR_RADIANCE_OUT_OF_RANGE;
    }
    *value = log(l1) - log(l2);
    *slope = d1 / l1 - d2 / l2;
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

/* Where the model's log ratio reaches `target`, by safeguarded Newton in u = 1/T. */
static gb_status solve_ratio(const gb_channel *first, const gb_channel *second, double target,
                             double *temperature_k, double *slope_at_solution)
{
    double u_low = 1.0 / GB_BAND_TEMPERATURE_MAX, u_high = 1.0 / GB_BAND_TEMPERATURE_MIN;
    double value, slope, u = 1.0 / 1000.0;
    gb_status status = log_ratio(first, second, GB_BAND_TEMPERATURE_MAX, &value, &slope);
    if (status != GB_OK || !(target <= value)) {
        return GB_ERR_RATIO_UNREACHABLE;
    }
    for (int step = 0; step < MAX_SOLVER_STEPS; ++step) {
        double temperature = 1.0 / u, next, mismatch;
        status = log_ratio(first, second, temperature, &value, &slope);
        if (status != GB_OK) {
            u_high = u; /* a channel underflowed: too cold */
            next = sqrt(u_low * u_high);
        } else {
            mismatch = value - target;
            if (mismatch == 0.0) {
                *temperature_k = temperature;
                *slope_at_solution = slope;
                return GB_OK;
            }
            if (mismatch > 0.0) {
                u_low = u;
            } else {
                u_high = u;
            }
            next = u + mismatch / (slope * temperature * temperature);
            if (!(next >= u_low && next <= u_high) || !(slope > 0.0)) {
                next = sqrt(u_low * u_high);
            } else if (fabs(next - u) <= SOLVER_RELATIVE_STEP * u) {
                status = log_ratio(first, second, 1.0 / next, &value, &slope);
                if (status != GB_OK) {
                    return status;
                }
                *temperature_k = 1.0 / next;
                *slope_at_solution = slope;
                return GB_OK;
            }
        }
        if (u_high - u_low <= SOLVER_RELATIVE_STEP * u_low) {
            if (1.0 / u_high <= GB_BAND_TEMPERATURE_MIN * (1.0 + 1e-9)) {
                return GB_ERR_RATIO_UNREACHABLE;
            }
            *temperature_k = 2.0 / (u_low + u_high);
            status = log_ratio(first, second, *temperature_k, &value, slope_at_solution);
            return status == GB_OK ? GB_OK : GB_ERR_RATIO_UNREACHABLE;
        }
        u = next;
    }
    return GB_ERR_NO_CONVERGENCE;
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
    status = solve_ratio(first, second, log(signal_ratio) - log(emissivity_ratio),
                         &answer.temperature_k, &slope);
    if (status != GB_OK) {
        return status;
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
