#include "solver.h"

#include <math.h>
#include <stddef.h>

#include "band.h"

#define MAX_STEPS 200
#define RELATIVE_STEP 1e-13

gb_status gb_solve_rising(gb_rising_model model, const void *context, double target,
                          double first_guess_k, double *temperature_k,
                          double *slope_at_solution)
{
    double u_low = 1.0 / GB_BAND_TEMPERATURE_MAX; /* hottest end: g > 0 there */
    double u_high = 1.0 / GB_BAND_TEMPERATURE_MIN; /* coldest end: g < 0 there */
    double u, value, slope;
    gb_status status = model(context, GB_BAND_TEMPERATURE_MAX, &value, &slope);
    if (status != GB_OK || !(target <= value)) {
        return GB_ERR_RADIANCE_OUT_OF_RANGE;
    }
    status = model(context, GB_BAND_TEMPERATURE_MIN, &value, &slope);
    if (status == GB_OK && target < value) {
        return GB_ERR_RADIANCE_OUT_OF_RANGE;
    }
    u = 1.0 / fmin(fmax(first_guess_k, GB_BAND_TEMPERATURE_MIN), GB_BAND_TEMPERATURE_MAX);
    for (int step = 0; step < MAX_STEPS; ++step) {
        double temperature = 1.0 / u, next;
        status = model(context, temperature, &value, &slope);
        if (status != GB_OK) {
            u_high = u; /* cannot be evaluated: far too cold */
            next = sqrt(u_low * u_high);
        } else {
            double mismatch = value - target;
            if (mismatch == 0.0) {
                next = u;
            } else {
                if (mismatch > 0.0) {
                    u_low = u;
                } else {
                    u_high = u;
                }
                /* dg/du = dv/dT dT/du = -slope T^2 */
                next = u + mismatch / (slope * temperature * temperature);
            }
            if (!(slope > 0.0) || !(next >= u_low && next <= u_high)) {
                next = sqrt(u_low * u_high);
            } else if (fabs(next - u) <= RELATIVE_STEP * u) {
                if (next != u && model(context, 1.0 / next, &value, &slope) != GB_OK) {
                    return GB_ERR_RADIANCE_OUT_OF_RANGE;
                }
                *temperature_k = 1.0 / next;
                if (slope_at_solution != NULL) {
                    *slope_at_solution = slope;
                }
                return GB_OK;
            }
        }
        if (u_high - u_low <= RELATIVE_STEP * u_low) {
            double answer = 2.0 / (u_low + u_high);
            if (model(context, answer, &value, &slope) != GB_OK) {
                return GB_ERR_RADIANCE_OUT_OF_RANGE;
            }
            *temperature_k = answer;
            if (slope_at_solution != NULL) {
                *slope_at_solution = slope;
            }
            return GB_OK;
        }
        u = next;
    }
    return GB_ERR_NO_CONVERGENCE;
}
