/*
 * /v1/corrected-temperature and /v1/sensitivity: the measurement equation of
 * a radiometer (measure.h) and its uncertainty (uncertainty.h; with "method":
 * "monte-carlo" also montecarlo.h, see sensitivity_montecarlo.h).  The
 * request's scene is read by scene.h.
 */
#include <math.h>
#include <string.h>

#include "elementwise.h"
#include "handlers.h"
#include "measure.h"
#include "scene.h"
#include "sensitivity_montecarlo.h"
#include "uncertainty.h"
#include "units.h"

/* ---------------------------------------------------- corrected-temperature ---- */

/* in: GB_SCENE_IN_*; out: T [, T total model] */
static gb_status corrected_element(const void *context, const double *in, double *out,
                                   const char **field)
{
    const gb_scene_request *s = context;
    gb_scene scene;
    double kelvin;
    gb_status status = gb_scene_build(s, in, &scene, field);
    if (status != GB_OK) {
        return status;
    }
    status = gb_measure_temperature(gb_scene_model_band(s), &scene, &kelvin);
    if (status == GB_OK) {
        status = gb_temperature_from_kelvin(kelvin, s->unit, &out[0]);
    }
    if (status != GB_OK) {
        return status;
    }
    if (s->model == GB_MODEL_BAND && gb_scene_temperature_inputs(s)) {
        /* For comparison only: no value (null) rather than an error if it fails. */
        double total_kelvin;
        if (gb_measure_temperature(&s->total, &scene, &total_kelvin) != GB_OK ||
            gb_temperature_from_kelvin(total_kelvin, s->unit, &out[1]) != GB_OK) {
            out[1] = NAN;
        }
    }
    return GB_OK;
}

static const char *const scene_fields[] = {
    "apparent_temperature", "measured_radiance", "emissivity", "reflected_temperature",
    "reflected_radiance",   "transmittance",     "atmosphere_temperature", "path_radiance",
    "band",                 "model",             "temperature_unit",       NULL};

void gb_handle_corrected_temperature(const gb_call *call, gb_reply *reply)
{
    gb_problem problem;
    gb_problem_clear(&problem);
    gb_params p;
    gb_scene_request s;
    gb_elementwise batch = {0};
    bool ok = gb_params_begin(&p, call->input, call->from_query, call->config->max_array,
                              scene_fields, &problem) &&
              gb_scene_read(&p, GB_ARRAY_OK, GB_SCENE_EMISSIVITY | GB_SCENE_MODEL, &s);
    gb_scene_inputs(&s, batch.inputs);
    batch.input_count = GB_SCENE_IN_COUNT;
    ok = ok && gb_params_broadcast(&p, batch.inputs, GB_SCENE_IN_COUNT, &batch.count,
                                   &batch.is_array);
    if (!ok) {
        gb_reply_problem(reply, &problem);
        gb_params_end(&p);
        return;
    }
    const char *unit = gb_temperature_unit_symbol(s.unit);
    batch.outputs[0] = (gb_output){"temperature", "temperature_unit", unit, false};
    batch.output_count = 1;
    batch.extras[0][0] = "model";
    batch.extras[0][1] = gb_scene_model_names[s.model];
    batch.extra_count = 1;
    if (s.model == GB_MODEL_BAND && gb_scene_temperature_inputs(&s)) {
        batch.outputs[1] = (gb_output){"total_model_temperature", NULL, NULL, true};
        batch.output_count = 2;
    }
    batch.element = corrected_element;
    batch.field_for = gb_scene_field_for;
    batch.context = &s;
    gb_elementwise_reply(&batch, reply);
    gb_params_end(&p);
}

/* ------------------------------------------------------------- sensitivity ---- */

static const double default_emissivity_errors[] = {-0.05, -0.02, -0.01, 0.01, 0.02, 0.05};

void gb_handle_sensitivity(const gb_call *call, gb_reply *reply)
{
    static const char *const fields[] = {
        "apparent_temperature", "measured_radiance", "emissivity", "reflected_temperature",
        "reflected_radiance", "transmittance", "atmosphere_temperature", "path_radiance", "band",
        "model", "temperature_unit", "u_emissivity", "u_reflected_temperature",
        "u_reflected_radiance", "u_transmittance", "u_atmosphere_temperature", "u_path_radiance",
        "u_apparent_temperature", "u_measured_radiance", "emissivity_errors",
        GB_SENSITIVITY_MC_FIELDS, NULL};
    const unsigned parts = GB_SCENE_EMISSIVITY | GB_SCENE_MODEL;
    gb_problem problem;
    gb_problem_clear(&problem);
    gb_params p;
    gb_scene_request s;
    gb_scene_uncertainty u;
    gb_sensitivity_mc mc;
    const double *deltas = NULL;
    size_t delta_count = 0;

    bool ok = gb_params_begin(&p, call->input, call->from_query, call->config->max_array,
                              fields, &problem) &&
              gb_scene_read(&p, 0, parts, &s) && gb_scene_read_uncertainty(&p, &s, parts, &u) &&
              gb_params_number_list(&p, "emissivity_errors", default_emissivity_errors,
                                    sizeof default_emissivity_errors /
                                        sizeof default_emissivity_errors[0],
                                    &deltas, &delta_count) &&
              gb_sensitivity_mc_read(&p, call->config->max_draws, &u, &mc);
    if (!ok) {
        gb_reply_problem(reply, &problem);
        gb_params_end(&p);
        return;
    }

    double in[GB_SCENE_IN_COUNT] = {s.signal.scalar, s.emissivity.scalar, s.reflected.scalar,
                                    s.transmittance.scalar, s.atmosphere.scalar};
    gb_scene scene;
    gb_sensitivity sensitivity;
    gb_budget budget;
    gb_monte_carlo_result monte_carlo;
    const char *field = NULL;
    gb_status status = gb_scene_build(&s, in, &scene, &field);
    if (status == GB_OK) {
        status = gb_measure_sensitivity(gb_scene_model_band(&s), &scene, &sensitivity);
        field = gb_scene_field_for(&s, status);
    }
    /*
     * tau = 1 with no atmosphere given: dT/dT_atm is 0 (the core says so), but dT/dtau needs
     * the atmosphere's radiance, so it is unknown and written as null, never as a made-up 0.
     */
    bool transmittance_known = sensitivity.defined[GB_INPUT_TRANSMITTANCE];
    if (status == GB_OK) {
        status = gb_gum_budget(&sensitivity, u.kelvin, &budget);
        field = status != GB_OK ? "u_emissivity" : field;
    }
    if (status != GB_OK) {
        /* Inputs are finite here: a non-finite value is a result out of range. */
        status = status == GB_ERR_NOT_FINITE ? GB_ERR_RESULT_OVERFLOW : status;
        gb_problem_from_status(&problem, status, field, NULL);
        gb_reply_problem(reply, &problem);
        gb_params_end(&p);
        return;
    }
    if (mc.enabled && !gb_sensitivity_mc_run(&mc, call->heavy_work, gb_scene_model_band(&s),
                                             &scene, &monte_carlo, &problem)) {
        gb_reply_problem(reply, &problem);
        gb_params_end(&p);
        return;
    }

    /* Output: temperatures in the request's unit; sensitivities per input unit. */
    double difference = 1.0; /* kelvin-sized -> unit-sized */
    gb_temperature_difference_from_kelvin(1.0, s.unit, &difference);
    double temperature = NAN;
    gb_temperature_from_kelvin(sensitivity.temperature_k, s.unit, &temperature);
    double c[GB_INPUT_COUNT];
    for (size_t i = 0; i < GB_INPUT_COUNT; i++) {
        /* dT/dx: per kelvin of a temperature input is unitless; otherwise unit-sized. */
        c[i] = u.is_temperature[i] ? sensitivity.partial[i] : sensitivity.partial[i] * difference;
    }
    if (!transmittance_known) {
        c[GB_INPUT_TRANSMITTANCE] = NAN; /* written as null */
    }

    gb_jw w;
    gb_jw_init(&w, 2048);
    gb_jw_object_begin(&w);
    gb_jw_knumber(&w, "temperature", temperature);
    gb_jw_kstring(&w, "temperature_unit", gb_temperature_unit_symbol(s.unit));
    gb_jw_kstring(&w, "model", gb_scene_model_names[s.model]);
    gb_jw_key(&w, "sensitivity");
    gb_jw_object_begin(&w);
    for (size_t i = 0; i < GB_INPUT_COUNT; i++) {
        gb_jw_knumber(&w, u.names[i], c[i]);
    }
    gb_jw_object_end(&w);
    gb_jw_key(&w, "budget");
    gb_jw_array_begin(&w);
    for (size_t i = 0; i < GB_INPUT_COUNT; i++) {
        gb_jw_object_begin(&w);
        gb_jw_kstring(&w, "quantity", u.names[i]);
        gb_jw_knumber(&w, "standard_uncertainty", u.given[i]);
        gb_jw_knumber(&w, "sensitivity", c[i]);
        gb_jw_knumber(&w, "contribution", budget.contribution[i] * difference);
        gb_jw_object_end(&w);
    }
    gb_jw_array_end(&w);
    gb_jw_knumber(&w, "combined_standard_uncertainty",
                  budget.combined_standard_uncertainty * difference);
    gb_jw_knumber(&w, "expanded_uncertainty", budget.expanded_uncertainty * difference);
    gb_jw_knumber(&w, "coverage_factor", budget.coverage_factor);
    gb_jw_key(&w, "emissivity_error");
    gb_jw_object_begin(&w);
    gb_jw_key(&w, "delta");
    gb_jw_array_begin(&w);
    for (size_t i = 0; i < delta_count; i++) {
        gb_jw_number(&w, deltas[i]);
    }
    gb_jw_array_end(&w);
    gb_jw_key(&w, "temperature_error");
    gb_jw_array_begin(&w);
    for (size_t i = 0; i < delta_count; i++) {
        double error_k;
        if (gb_emissivity_error(gb_scene_model_band(&s), &scene, deltas[i], &error_k) == GB_OK) {
            gb_jw_number(&w, error_k * difference);
        } else {
            gb_jw_null(&w);
        }
    }
    gb_jw_array_end(&w);
    gb_jw_object_end(&w);
    if (mc.enabled) {
        gb_sensitivity_mc_write(&w, &mc, &monte_carlo, &u, s.unit);
    }
    gb_jw_object_end(&w);
    gb_params_end(&p);
    gb_reply_json(reply, 200, &w);
}
