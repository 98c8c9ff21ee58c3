#include "spectrum.h"

#include <math.h>

gb_status gb_spectral_grid(double lower, double upper, size_t count, gb_grid_spacing spacing,
                           double *positions)
{
    double last, ratio, log_lower, log_span;
    if (positions == NULL || count < 2 || count > GB_SPECTRUM_MAX_POINTS ||
        (spacing != GB_GRID_LINEAR && spacing != GB_GRID_LOGARITHMIC)) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    if (!isfinite(lower) || !isfinite(upper)) {
        return GB_ERR_NOT_FINITE;
    }
    if (!(lower > 0.0)) {
        return GB_ERR_BAND_LIMITS;
    }
    if (!(lower < upper)) {
        return GB_ERR_BAND_REVERSED;
    }
    last = (double)(count - 1);
    ratio = upper / lower;
    log_lower = log(lower);
    log_span = log(upper) - log_lower;
    for (size_t i = 0; i < count; ++i) {
        double share = (double)i / last;
        if (spacing == GB_GRID_LINEAR) {
            positions[i] = lower + share * (upper - lower);
        } else if (isfinite(ratio)) {
            positions[i] = lower * pow(ratio, share);
        } else {
            /* upper/lower beyond a double: work in logarithms (less accurate, still finite). */
            positions[i] = exp(log_lower + share * log_span);
        }
    }
    positions[0] = lower;
    positions[count - 1] = upper;
    return GB_OK;
}
