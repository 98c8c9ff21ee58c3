/*
 * bandtable.h — a band's radiance and its inverse, tabulated once for fast
 * per-pixel work (whole thermal frames).
 *
 * A table covers [t_min, t_max] and holds, at 4096 and 2048 nodes:
 *   forward: y = ln L_band(T) at nodes evenly spaced in u = 1/T, with dy/du;
 *   inverse: T at nodes evenly spaced in y, with dT/dy;
 * both filled from the exact band functions of band.h (the inverse nodes by
 * gb_band_temperature).  Lookups take the node by one division (no search)
 * and interpolate by cubic Hermite polynomials (stored per interval as the
 * cubic's coefficients, so a lookup is one load and three multiply-adds), whose error falls as the
 * fourth power of the node spacing.  In these coordinates both curves are
 * smooth (ln L is nearly linear in 1/T at the Wien end), and a lookup costs
 * one division or one logarithm plus a cubic: no search, no exp in the
 * inverse.
 *
 * Accuracy inside [t_min, t_max], measured in tests/unit/test_bandtable.c
 * against the exact band functions (8-14 um band): relative error in L and
 * in T <= 1e-10 for 150-2000 K, <= 1e-8 in L and 1e-11 in T for 100-10 000 K,
 * <= 1e-8 in T for 10-1000 K -- finer than a float32 frame can hold.
 * Outside the range lookups answer GB_ERR_TEMPERATURE_DOMAIN (radiance) or
 * GB_ERR_RADIANCE_OUT_OF_RANGE (temperature) and the caller falls back to
 * band.h.  A table is 192 KiB, built in ~3 ms (2048 exact inversions); once
 * built it is read-only and may be shared between threads.
 * Response bands: the table keeps the caller's response pointers, so the
 * arrays must outlive the table.
 */
#ifndef GREYBODY_BANDTABLE_H
#define GREYBODY_BANDTABLE_H

#include <stddef.h>

#include "band.h"
#include "status.h"

#define GB_BAND_TABLE_FORWARD_NODES 4096
#define GB_BAND_TABLE_INVERSE_NODES 2048

typedef struct gb_band_table {
    gb_band band;
    double t_min, t_max;
    double u_min, u_step, u_scale; /* forward grid, u = 1/T from 1/t_max; scale = 1/step */
    double y_min, y_step, y_scale; /* inverse grid */
    /* Per interval, the Hermite cubic's coefficients of t^0..t^3 (t: fraction of the step). */
    double forward[GB_BAND_TABLE_FORWARD_NODES - 1][4];
    double inverse[GB_BAND_TABLE_INVERSE_NODES - 1][4];
} gb_band_table;

/* Builds the table; 0 < t_min < t_max <= GB_BAND_TEMPERATURE_MAX, t_min >= GB_BAND_TEMPERATURE_MIN. */
gb_status gb_band_table_build(const gb_band *band, double t_min, double t_max,
                              gb_band_table *table);

/* Blackbody band radiance at T from the table. */
gb_status gb_band_table_radiance(const gb_band_table *table, double temperature_k,
                                 double *radiance);

/* Temperature whose blackbody band radiance is `radiance`, from the table. */
gb_status gb_band_table_temperature(const gb_band_table *table, double radiance,
                                    double *temperature_k);

/*
 * Array forms for whole frames: `count` lookups exactly as above;
 * element_status[i] receives each one's status and the result is 0 where it
 * is not GB_OK (the caller falls back to band.h for those).  Input and output
 * may be the same array.  GB_ERR_INVALID_ARGUMENT for NULL or count 0.
 */
gb_status gb_band_table_radiance_array(const gb_band_table *table, size_t count,
                                       const double *temperature_k, double *radiance,
                                       gb_status *element_status);
gb_status gb_band_table_temperature_array(const gb_band_table *table, size_t count,
                                          const double *radiance, double *temperature_k,
                                          gb_status *element_status);

#endif
