/*
 * batch.h — array forms of the core's conversions, for whole frames and
 * batch requests: n elements in, n results out, caller's buffers, nothing
 * allocated.
 *
 * Every input is a gb_strided: element i is values[i * stride], so stride 1
 * walks an array and stride 0 repeats one value for every element
 * (broadcasting).  Each element is computed exactly as the scalar function
 * would (same accuracy, same statuses); element_status[i] receives its
 * status and results[i] its value, or 0.0 where the status is not GB_OK.
 * The function itself returns GB_ERR_INVALID_ARGUMENT for NULL buffers or
 * n = 0, the band's own status for an invalid band, and otherwise GB_OK even
 * when some elements failed: check element_status.  Thread-safe; separate
 * calls may run on disjoint slices of one frame in parallel.
 */
#ifndef GREYBODY_BATCH_H
#define GREYBODY_BATCH_H

#include <stddef.h>

#include "band.h"
#include "measure.h"
#include "planck.h"
#include "status.h"

typedef struct gb_strided {
    const double *values;
    size_t stride; /* 0 broadcasts values[0] */
} gb_strided;

/* The same value for every element. */
#define GB_BROADCAST(pointer) ((gb_strided){(pointer), 0})
/* Consecutive values. */
#define GB_ARRAY(pointer) ((gb_strided){(pointer), 1})

gb_status gb_batch_planck_radiance(gb_spectral_coordinate coordinate, size_t count,
                                   gb_strided position, gb_strided temperature_k,
                                   gb_strided emissivity, double *radiance,
                                   gb_status *element_status);

gb_status gb_batch_brightness_temperature(gb_spectral_coordinate coordinate, size_t count,
                                          gb_strided position, gb_strided radiance,
                                          gb_strided emissivity, double *temperature_k,
                                          gb_status *element_status);

gb_status gb_batch_band_radiance(const gb_band *band, size_t count, gb_strided temperature_k,
                                 gb_strided emissivity, double *radiance,
                                 gb_status *element_status);

gb_status gb_batch_band_temperature(const gb_band *band, size_t count, gb_strided radiance,
                                    gb_strided emissivity, double *temperature_k,
                                    gb_status *element_status);

/* The scene's numbers element by element; the term kinds are shared by all elements. */
typedef struct gb_batch_scene {
    gb_term_kind signal_kind;
    gb_strided signal;
    gb_strided emissivity;
    gb_term_kind reflected_kind;
    gb_strided reflected;
    gb_strided transmittance;
    gb_term_kind atmosphere_kind;
    gb_strided atmosphere;
} gb_batch_scene;

gb_status gb_batch_measure_temperature(const gb_band *band, size_t count,
                                       const gb_batch_scene *scene, double *temperature_k,
                                       gb_status *element_status);

#endif
