#include "batch.h"

static double element(gb_strided input, size_t index)
{
    return input.values[index * input.stride];
}

static int readable(gb_strided input)
{
    return input.values != NULL;
}

static gb_status check_buffers(size_t count, const double *results,
                               const gb_status *element_status)
{
    return (count == 0 || results == NULL || element_status == NULL) ? GB_ERR_INVALID_ARGUMENT
                                                                      : GB_OK;
}

/*
 * One position for every element: worked out once.  A position the
 * preparation refuses is left to the per-element path, which reports it in
 * the scalar functions' order of checks.
 */
static int shared_position(gb_spectral_coordinate coordinate, gb_strided position,
                           gb_planck_position *prepared)
{
    return position.stride == 0 &&
           gb_planck_prepare(coordinate, position.values[0], prepared) == GB_OK;
}

/* Stores one element's outcome: its value on success, 0 otherwise. */
static void store(gb_status status, double value, double *result, gb_status *element_status)
{
    *element_status = status;
    *result = status == GB_OK ? value : 0.0;
}

gb_status gb_batch_planck_radiance(gb_spectral_coordinate coordinate, size_t count,
                                   gb_strided position, gb_strided temperature_k,
                                   gb_strided emissivity, double *radiance,
                                   gb_status *element_status)
{
    gb_planck_position prepared;
    if (check_buffers(count, radiance, element_status) != GB_OK || !readable(position) ||
        !readable(temperature_k) || !readable(emissivity)) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    if (shared_position(coordinate, position, &prepared)) {
        for (size_t i = 0; i < count; ++i) {
            double value = 0.0;
            gb_status status = gb_planck_radiance_prepared(&prepared, element(temperature_k, i),
                                                           element(emissivity, i), &value);
            store(status, value, &radiance[i], &element_status[i]);
        }
        return GB_OK;
    }
    for (size_t i = 0; i < count; ++i) {
        double value = 0.0;
        gb_status status = gb_planck_radiance(coordinate, element(position, i),
                                              element(temperature_k, i), element(emissivity, i),
                                              &value);
        store(status, value, &radiance[i], &element_status[i]);
    }
    return GB_OK;
}

gb_status gb_batch_brightness_temperature(gb_spectral_coordinate coordinate, size_t count,
                                          gb_strided position, gb_strided radiance,
                                          gb_strided emissivity, double *temperature_k,
                                          gb_status *element_status)
{
    gb_planck_position prepared;
    if (check_buffers(count, temperature_k, element_status) != GB_OK || !readable(position) ||
        !readable(radiance) || !readable(emissivity)) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    if (shared_position(coordinate, position, &prepared)) {
        for (size_t i = 0; i < count; ++i) {
            double value = 0.0;
            gb_status status = gb_brightness_temperature_prepared(
                &prepared, element(radiance, i), element(emissivity, i), &value);
            store(status, value, &temperature_k[i], &element_status[i]);
        }
        return GB_OK;
    }
    for (size_t i = 0; i < count; ++i) {
        double value = 0.0;
        gb_status status = gb_brightness_temperature(coordinate, element(position, i),
                                                     element(radiance, i),
                                                     element(emissivity, i), &value);
        store(status, value, &temperature_k[i], &element_status[i]);
    }
    return GB_OK;
}

/* The checks both band forms make before their loops: buffers, inputs, then the band. */
static gb_status check_band_batch(const gb_band *band, size_t count, gb_strided first,
                                  gb_strided second, const double *results,
                                  const gb_status *element_status)
{
    if (check_buffers(count, results, element_status) != GB_OK || !readable(first) ||
        !readable(second)) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    return gb_band_validate(band);
}

gb_status gb_batch_band_radiance(const gb_band *band, size_t count, gb_strided temperature_k,
                                 gb_strided emissivity, double *radiance,
                                 gb_status *element_status)
{
    gb_status checked =
        check_band_batch(band, count, temperature_k, emissivity, radiance, element_status);
    if (checked != GB_OK) {
        return checked;
    }
    for (size_t i = 0; i < count; ++i) {
        gb_band_quantities quantities = {0};
        gb_status status = gb_band_evaluate(band, element(temperature_k, i),
                                            element(emissivity, i), &quantities);
        store(status, quantities.radiance, &radiance[i], &element_status[i]);
    }
    return GB_OK;
}

gb_status gb_batch_band_temperature(const gb_band *band, size_t count, gb_strided radiance,
                                    gb_strided emissivity, double *temperature_k,
                                    gb_status *element_status)
{
    gb_status checked =
        check_band_batch(band, count, radiance, emissivity, temperature_k, element_status);
    if (checked != GB_OK) {
        return checked;
    }
    for (size_t i = 0; i < count; ++i) {
        double value = 0.0;
        gb_status status = gb_band_temperature(band, element(radiance, i),
                                               element(emissivity, i), &value);
        store(status, value, &temperature_k[i], &element_status[i]);
    }
    return GB_OK;
}

gb_status gb_batch_measure_temperature(const gb_band *band, size_t count,
                                       const gb_batch_scene *scene, double *temperature_k,
                                       gb_status *element_status)
{
    gb_status band_status;
    if (check_buffers(count, temperature_k, element_status) != GB_OK || scene == NULL ||
        !readable(scene->signal) || !readable(scene->emissivity) ||
        !readable(scene->reflected) || !readable(scene->transmittance) ||
        !readable(scene->atmosphere)) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    band_status = gb_band_validate(band);
    if (band_status != GB_OK) {
        return band_status;
    }
    for (size_t i = 0; i < count; ++i) {
        gb_scene one = {
            .signal = {scene->signal_kind, element(scene->signal, i)},
            .emissivity = element(scene->emissivity, i),
            .reflected = {scene->reflected_kind, element(scene->reflected, i)},
            .transmittance = element(scene->transmittance, i),
            .atmosphere = {scene->atmosphere_kind, element(scene->atmosphere, i)},
        };
        double value = 0.0;
        gb_status status = gb_measure_temperature(band, &one, &value);
        store(status, value, &temperature_k[i], &element_status[i]);
    }
    return GB_OK;
}
