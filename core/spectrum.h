/*
 * spectrum.h — grids of spectral positions for drawing Planck curves.
 *
 * gb_spectral_grid fills `count` positions from `lower` to `upper`
 * inclusive, evenly spaced (linear) or in equal ratios (logarithmic, for
 * curves spanning decades).  Any positive unit: the grid does not care.
 * The end points are exact.  Inner points: linear grids within 3 ulp of
 * lower + s (upper - lower); logarithmic grids within (2 + |ln(upper/lower)|)
 * ulp of lower (upper/lower)^s, s = i/(count - 1) (the rounding of s is
 * magnified by the logarithm of the span).  When upper/lower is beyond a
 * double the logarithmic points are exp(ln lower + s (ln upper - ln lower)),
 * within (2 + |ln lower| + |ln upper|) ulp.
 */
#ifndef GREYBODY_SPECTRUM_H
#define GREYBODY_SPECTRUM_H

#include <stddef.h>

#include "status.h"

#define GB_SPECTRUM_MAX_POINTS 100000

typedef enum gb_grid_spacing {
    GB_GRID_LINEAR = 0,
    GB_GRID_LOGARITHMIC
} gb_grid_spacing;

/* count in [2, GB_SPECTRUM_MAX_POINTS] (else GB_ERR_INVALID_ARGUMENT); 0 < lower < upper. */
gb_status gb_spectral_grid(double lower, double upper, size_t count, gb_grid_spacing spacing,
                           double *positions);

#endif
