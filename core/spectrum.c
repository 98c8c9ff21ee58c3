#include "spectrum.h"

#include <math.h>

gb_status gb_spectral_grid(double lower, double upper, size_t count, gb_grid_spacing spacing,
                           double *positions)
{
    double last;
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
    for (size_t i = 0; i < count; ++i) {
        double share = (double)i / last;
        positions[i] = spacing == GB_GRID_LINEAR ? lower + share * (upper - lower)
                                                 : lower * pow(upper / lower, share);
    }
    positions[count - 1] = upper;
    return GB_OK;
}
