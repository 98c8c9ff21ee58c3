#include "emissivity.h"

#include <math.h>
#include <stddef.h>

#include "planck.h"

gb_status gb_emissivity_from_reference(const gb_band *band, const gb_scene *scene,
                                       double surface_temperature_k,
                                       gb_emissivity_estimate *estimate)
{
    gb_measurement m;
    gb_emissivity_estimate result = {0};
    gb_scene grey;
    double surface_radiance, surface_derivative, transmittance, contrast, emissivity;
    gb_status status;
    if (scene == NULL || estimate == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    /* The scene's emissivity is the unknown; validate the rest with a placeholder. */
    grey = *scene;
    grey.emissivity = 1.0;
    status = gb_measure_terms(band, &grey, &m);
    if (status == GB_OK) {
        status = gb_check_temperature(surface_temperature_k);
    }
    if (status == GB_OK) {
        status = gb_band_radiance(band, surface_temperature_k, &surface_radiance,
                                  &surface_derivative);
    }
    if (status != GB_OK) {
        return status;
    }
    transmittance = scene->transmittance;
    contrast = transmittance * (surface_radiance - m.reflected_radiance);
    if (contrast == 0.0) {
        return GB_ERR_EMISSIVITY_UNDETERMINED;
    }
    emissivity =
        (m.signal_radiance - m.atmosphere_part - transmittance * m.reflected_radiance) / contrast;
    if (!isfinite(emissivity)) {
        return GB_ERR_EMISSIVITY_UNDETERMINED;
    }
    if (!(emissivity > 0.0 && emissivity <= 1.0)) {
        return GB_ERR_EMISSIVITY_DOMAIN;
    }
    result.emissivity = emissivity;
    result.partial[GB_EMISSIVITY_BY_SURFACE_TEMPERATURE] =
        -emissivity * transmittance * surface_derivative / contrast;
    result.partial[GB_EMISSIVITY_BY_SIGNAL] =
        (scene->signal.kind == GB_TERM_TEMPERATURE ? m.signal_derivative : 1.0) / contrast;
    result.partial[GB_EMISSIVITY_BY_REFLECTED] =
        -(1.0 - emissivity) * transmittance *
        (scene->reflected.kind == GB_TERM_TEMPERATURE ? m.reflected_derivative : 1.0) / contrast;
    if (scene->atmosphere.kind == GB_TERM_RADIANCE) {
        result.partial[GB_EMISSIVITY_BY_ATMOSPHERE] = -1.0 / contrast;
        result.partial[GB_EMISSIVITY_BY_TRANSMITTANCE] =
            (-m.reflected_radiance - emissivity * (surface_radiance - m.reflected_radiance)) /
            contrast;
        result.defined[GB_EMISSIVITY_BY_TRANSMITTANCE] = 1;
    } else {
        result.partial[GB_EMISSIVITY_BY_ATMOSPHERE] =
            -(1.0 - transmittance) * m.atmosphere_derivative / contrast;
        result.partial[GB_EMISSIVITY_BY_TRANSMITTANCE] =
            (m.atmosphere_radiance - m.reflected_radiance -
             emissivity * (surface_radiance - m.reflected_radiance)) /
            contrast;
        result.defined[GB_EMISSIVITY_BY_TRANSMITTANCE] = !isnan(scene->atmosphere.value);
    }
    result.defined[GB_EMISSIVITY_BY_SURFACE_TEMPERATURE] = 1;
    result.defined[GB_EMISSIVITY_BY_SIGNAL] = 1;
    result.defined[GB_EMISSIVITY_BY_REFLECTED] = 1;
    result.defined[GB_EMISSIVITY_BY_ATMOSPHERE] = 1;
    for (size_t i = 0; i < GB_EMISSIVITY_INPUT_COUNT; ++i) {
        if (!isfinite(result.partial[i])) {
            return GB_ERR_RESULT_OVERFLOW;
        }
    }
    *estimate = result;
    return GB_OK;
}
