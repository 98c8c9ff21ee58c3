#include "measure.h"

#include <math.h>
#include <stddef.h>

#include "planck.h"

static gb_status check_unit_interval(double value, gb_status out_of_range)
{
    if (!isfinite(value)) {
        return GB_ERR_NOT_FINITE;
    }
    return (value > 0.0 && value <= 1.0) ? GB_OK : out_of_range;
}

static gb_status check_radiance_term(double value, int zero_allowed)
{
    if (!isfinite(value)) {
        return GB_ERR_NOT_FINITE;
    }
    return (value > 0.0 || (zero_allowed && value == 0.0)) ? GB_OK : GB_ERR_RADIANCE_DOMAIN;
}

static gb_status check_term(const gb_term *term, int zero_radiance_allowed)
{
    switch (term->kind) {
    case GB_TERM_TEMPERATURE: return gb_check_temperature(term->value);
    case GB_TERM_RADIANCE: return check_radiance_term(term->value, zero_radiance_allowed);
    }
    return GB_ERR_INVALID_ARGUMENT;
}

/* An atmosphere temperature is needed only when tau < 1; NaN then means "not given". */
static int atmosphere_temperature_absent(const gb_scene *scene)
{
    return scene->atmosphere.kind == GB_TERM_TEMPERATURE && scene->transmittance == 1.0 &&
           isnan(scene->atmosphere.value);
}

gb_status gb_scene_validate(const gb_scene *scene)
{
    gb_status status;
    if (scene == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    status = check_term(&scene->signal, 0);
    if (status == GB_OK) {
        status = check_unit_interval(scene->emissivity, GB_ERR_EMISSIVITY_DOMAIN);
    }
    if (status == GB_OK) {
        status = check_term(&scene->reflected, 1);
    }
    if (status == GB_OK) {
        status = check_unit_interval(scene->transmittance, GB_ERR_TRANSMITTANCE_DOMAIN);
    }
    if (status == GB_OK && !atmosphere_temperature_absent(scene)) {
        status = check_term(&scene->atmosphere, 1);
    }
    return status;
}

/* A term as band radiance, with dL/dT for a temperature (0 for a radiance). */
static gb_status term_radiance(const gb_band *band, const gb_term *term, double *radiance,
                               double *derivative)
{
    if (term->kind == GB_TERM_RADIANCE) {
        *radiance = term->value;
        *derivative = 0.0;
        return GB_OK;
    }
    return gb_band_radiance(band, term->value, radiance, derivative);
}

gb_status gb_measure_terms(const gb_band *band, const gb_scene *scene,
                           gb_measurement *measurement)
{
    gb_measurement m = {0};
    gb_status status;
    if (measurement == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    status = gb_scene_validate(scene);
    if (status == GB_OK) {
        status = gb_band_validate(band);
    }
    if (status == GB_OK) {
        status = term_radiance(band, &scene->signal, &m.signal_radiance, &m.signal_derivative);
    }
    if (status == GB_OK) {
        status = term_radiance(band, &scene->reflected, &m.reflected_radiance,
                               &m.reflected_derivative);
    }
    if (status == GB_OK && !atmosphere_temperature_absent(scene)) {
        status = term_radiance(band, &scene->atmosphere, &m.atmosphere_radiance,
                               &m.atmosphere_derivative);
    }
    if (status != GB_OK) {
        return status;
    }
    m.atmosphere_part = scene->atmosphere.kind == GB_TERM_TEMPERATURE
                            ? (1.0 - scene->transmittance) * m.atmosphere_radiance
                            : m.atmosphere_radiance;
    *measurement = m;
    return GB_OK;
}

gb_status gb_measure_solve(const gb_band *band, const gb_scene *scene,
                           gb_measurement *measurement)
{
    gb_measurement m;
    double emissivity, transmittance, net, check_radiance;
    gb_status status;
    if (measurement == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    status = gb_measure_terms(band, scene, &m);
    if (status != GB_OK) {
        return status;
    }
    emissivity = scene->emissivity;
    transmittance = scene->transmittance;
    net = m.signal_radiance - transmittance * (1.0 - emissivity) * m.reflected_radiance -
          m.atmosphere_part;
    m.surface_radiance = net / (transmittance * emissivity);
    if (!(m.surface_radiance > 0.0)) {
        return GB_ERR_NET_SIGNAL_NOT_POSITIVE;
    }
    status = gb_band_temperature(band, m.surface_radiance, 1.0, &m.temperature_k);
    if (status == GB_OK) {
        status = gb_band_radiance(band, m.temperature_k, &check_radiance, &m.surface_derivative);
    }
    if (status != GB_OK) {
        return status;
    }
    *measurement = m;
    return GB_OK;
}

gb_status gb_measure_temperature(const gb_band *band, const gb_scene *scene,
                                 double *temperature_k)
{
    gb_measurement measurement;
    gb_status status;
    if (temperature_k == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    status = gb_measure_solve(band, scene, &measurement);
    if (status == GB_OK) {
        *temperature_k = measurement.temperature_k;
    }
    return status;
}
