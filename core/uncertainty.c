#include "uncertainty.h"

#include <math.h>
#include <stddef.h>

static const char *const input_names[GB_INPUT_COUNT] = {
    [GB_INPUT_EMISSIVITY] = "emissivity",       [GB_INPUT_REFLECTED] = "reflected",
    [GB_INPUT_TRANSMITTANCE] = "transmittance", [GB_INPUT_ATMOSPHERE] = "atmosphere",
    [GB_INPUT_SIGNAL] = "signal",
};

const char *gb_input_name(gb_input input)
{
    return (unsigned)input < (unsigned)GB_INPUT_COUNT ? input_names[input] : "unknown";
}

gb_status gb_measure_sensitivity(const gb_band *band, const gb_scene *scene,
                                 gb_sensitivity *sensitivity)
{
    gb_measurement m;
    gb_sensitivity result;
    double emissivity, transmittance, denominator, emitted_and_reflected;
    gb_status status;
    if (sensitivity == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    status = gb_measure_solve(band, scene, &m);
    if (status != GB_OK) {
        return status;
    }
    emissivity = scene->emissivity;
    transmittance = scene->transmittance;
    denominator = transmittance * emissivity * m.surface_derivative;
    if (!(denominator > 0.0)) {
        /* L'(T) underflowed: T is insensitive to nothing we can express. */
        return GB_ERR_RESULT_OVERFLOW;
    }
    emitted_and_reflected =
        emissivity * m.surface_radiance + (1.0 - emissivity) * m.reflected_radiance;
    result.temperature_k = m.temperature_k;
    result.defined[GB_INPUT_EMISSIVITY] = 1;
    result.partial[GB_INPUT_EMISSIVITY] =
        transmittance * (m.reflected_radiance - m.surface_radiance) / denominator;
    result.defined[GB_INPUT_REFLECTED] = 1;
    result.partial[GB_INPUT_REFLECTED] =
        -transmittance * (1.0 - emissivity) *
        (scene->reflected.kind == GB_TERM_TEMPERATURE ? m.reflected_derivative : 1.0) /
        denominator;
    result.defined[GB_INPUT_SIGNAL] = 1;
    result.partial[GB_INPUT_SIGNAL] =
        (scene->signal.kind == GB_TERM_TEMPERATURE ? m.signal_derivative : 1.0) / denominator;
    if (scene->atmosphere.kind == GB_TERM_RADIANCE) {
        result.defined[GB_INPUT_ATMOSPHERE] = 1;
        result.partial[GB_INPUT_ATMOSPHERE] = -1.0 / denominator;
        result.defined[GB_INPUT_TRANSMITTANCE] = 1;
        result.partial[GB_INPUT_TRANSMITTANCE] = -emitted_and_reflected / denominator;
    } else if (isnan(scene->atmosphere.value)) {
        /* tau = 1 with no atmosphere temperature: dT/dT_atm is 0, dT/dtau unknown. */
        result.defined[GB_INPUT_ATMOSPHERE] = 1;
        result.partial[GB_INPUT_ATMOSPHERE] = 0.0;
        result.defined[GB_INPUT_TRANSMITTANCE] = 0;
        result.partial[GB_INPUT_TRANSMITTANCE] = 0.0;
    } else {
        result.defined[GB_INPUT_ATMOSPHERE] = 1;
        result.partial[GB_INPUT_ATMOSPHERE] =
            -(1.0 - transmittance) * m.atmosphere_derivative / denominator;
        result.defined[GB_INPUT_TRANSMITTANCE] = 1;
        result.partial[GB_INPUT_TRANSMITTANCE] =
            (m.atmosphere_radiance - emitted_and_reflected) / denominator;
    }
    for (size_t i = 0; i < GB_INPUT_COUNT; ++i) {
        if (!isfinite(result.partial[i])) {
            return GB_ERR_RESULT_OVERFLOW;
        }
    }
    *sensitivity = result;
    return GB_OK;
}

gb_status gb_gum_budget(const gb_sensitivity *sensitivity,
                        const double standard_uncertainty[GB_INPUT_COUNT], gb_budget *budget)
{
    gb_budget result;
    double sum_of_squares = 0.0;
    if (sensitivity == NULL || standard_uncertainty == NULL || budget == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    for (size_t i = 0; i < GB_INPUT_COUNT; ++i) {
        double u = standard_uncertainty[i];
        if (!isfinite(u)) {
            return GB_ERR_NOT_FINITE;
        }
        if (u < 0.0) {
            return GB_ERR_UNCERTAINTY_DOMAIN;
        }
        if (u > 0.0 && !sensitivity->defined[i]) {
            return GB_ERR_INVALID_ARGUMENT;
        }
        result.standard_uncertainty[i] = u;
        result.contribution[i] = u > 0.0 ? fabs(sensitivity->partial[i]) * u : 0.0;
        sum_of_squares += result.contribution[i] * result.contribution[i];
    }
    result.combined_standard_uncertainty = sqrt(sum_of_squares);
    result.coverage_factor = GB_COVERAGE_FACTOR;
    result.expanded_uncertainty = GB_COVERAGE_FACTOR * result.combined_standard_uncertainty;
    if (!isfinite(result.expanded_uncertainty)) {
        return GB_ERR_RESULT_OVERFLOW;
    }
    *budget = result;
    return GB_OK;
}

gb_status gb_emissivity_error(const gb_band *band, const gb_scene *scene, double delta,
                              double *temperature_error_k)
{
    gb_scene shifted;
    double true_temperature, shifted_temperature;
    gb_status status;
    if (scene == NULL || temperature_error_k == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    if (!isfinite(delta)) {
        return GB_ERR_NOT_FINITE;
    }
    shifted = *scene;
    shifted.emissivity = scene->emissivity + delta;
    if (!(shifted.emissivity > 0.0 && shifted.emissivity <= 1.0)) {
        return GB_ERR_EMISSIVITY_DOMAIN;
    }
    status = gb_measure_temperature(band, scene, &true_temperature);
    if (status == GB_OK) {
        status = gb_measure_temperature(band, &shifted, &shifted_temperature);
    }
    if (status != GB_OK) {
        return status;
    }
    *temperature_error_k = shifted_temperature - true_temperature;
    return GB_OK;
}
