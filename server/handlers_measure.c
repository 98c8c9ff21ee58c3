/*
 * /v1/corrected-temperature and /v1/sensitivity: the measurement equation of
 * a radiometer (measure.h) and its uncertainty (uncertainty.h).
 */
#include <math.h>
#include <string.h>

#include "elementwise.h"
#include "handlers.h"
#include "measure.h"
#include "uncertainty.h"
#include "units.h"

/* The unused atmosphere when transmittance is 1 and none is given (any value would do). */
#define UNUSED_ATMOSPHERE_K 288.15

enum { FORM_TEMPERATURE = 0, FORM_RADIANCE = 1, FORM_ABSENT = 2 };
enum { MODEL_BAND = 0, MODEL_TOTAL = 1 };

static const char *const signal_names[] = {"apparent_temperature", "measured_radiance", NULL};
static const char *const reflected_names[] = {"reflected_temperature", "reflected_radiance",
                                              NULL};
static const char *const atmosphere_names[] = {"atmosphere_temperature", "path_radiance", NULL};
static const char *const model_names[] = {"band", "total", NULL};

/* The scene as the request gives it. */
typedef struct scene_request {
    gb_temperature_unit unit;
    size_t signal_form, reflected_form, atmosphere_form;
    gb_num signal, emissivity, reflected, transmittance, atmosphere;
    gb_band band;
    gb_band total;
    size_t model;
} scene_request;

static const char *signal_field(const scene_request *s)
{
    return signal_names[s->signal_form];
}

static const char *reflected_field(const scene_request *s)
{
    return reflected_names[s->reflected_form];
}

static const char *atmosphere_field(const scene_request *s)
{
    return s->atmosphere_form == FORM_RADIANCE ? "path_radiance" : "atmosphere_temperature";
}

static const gb_band *model_band(const scene_request *s)
{
    return s->model == MODEL_TOTAL ? &s->total : &s->band;
}

static bool any_below_one(const gb_num *num)
{
    for (size_t i = 0; i < num->count; i++) {
        double t = gb_num_at(num, i);
        if (t > 0.0 && t < 1.0) {
            return true;
        }
    }
    return false;
}

static bool read_scene(gb_params *p, unsigned array, scene_request *s)
{
    bool band_given = false;
    size_t which = 0;
    memset(s, 0, sizeof *s);
    s->total.kind = GB_BAND_TOTAL;
    if (!gb_params_temperature_unit(p, &s->unit) ||
        !gb_params_one_of(p, signal_names, true, &s->signal_form) ||
        !gb_params_number(p, signal_names[s->signal_form], GB_REQUIRED | array, 0.0,
                          &s->signal) ||
        !gb_params_number(p, "emissivity", GB_REQUIRED | array, 0.0, &s->emissivity) ||
        !gb_params_one_of(p, reflected_names, true, &s->reflected_form) ||
        !gb_params_number(p, reflected_names[s->reflected_form], GB_REQUIRED | array, 0.0,
                          &s->reflected) ||
        !gb_params_number(p, "transmittance", array, 1.0, &s->transmittance) ||
        !gb_params_one_of(p, atmosphere_names, false, &which)) {
        return false;
    }
    s->atmosphere_form = which == (size_t)-1 ? FORM_ABSENT : which;
    if (s->atmosphere_form == FORM_ABSENT) {
        s->atmosphere.name = "atmosphere_temperature";
        s->atmosphere.count = 1;
        s->atmosphere.scalar = UNUSED_ATMOSPHERE_K;
    } else if (!gb_params_number(p, atmosphere_names[which], GB_REQUIRED | array, 0.0,
                                 &s->atmosphere)) {
        return false;
    }
    if (!gb_params_band(p, false, &s->band, &band_given) ||
        !gb_params_choice(p, "model", model_names, MODEL_BAND, &s->model)) {
        return false;
    }
    if (s->model == MODEL_TOTAL && band_given) {
        return gb_params_fail(p, GB_PROBLEM_CONFLICTING_FIELDS, "band",
                              "\"band\" does not apply to model \"total\" (the whole spectrum).");
    }
    if (s->atmosphere_form == FORM_ABSENT && any_below_one(&s->transmittance)) {
        return gb_params_fail(p, GB_PROBLEM_MISSING_FIELD, "atmosphere_temperature",
                              "\"atmosphere_temperature\" (or \"path_radiance\") is required "
                              "when transmittance is below 1.");
    }
    return true;
}

/* One element's scene in core units; on failure *field names the input. */
static gb_status build_scene(const scene_request *s, const double *in, gb_scene *scene,
                             const char **field)
{
    gb_status status;
    /* signal */
    scene->signal.kind = s->signal_form == FORM_TEMPERATURE ? GB_TERM_TEMPERATURE
                                                            : GB_TERM_RADIANCE;
    if (s->signal_form == FORM_TEMPERATURE) {
        status = gb_temperature_to_kelvin(in[0], s->unit, &scene->signal.value);
    } else {
        scene->signal.value = in[0];
        status = in[0] > 0.0 ? GB_OK : GB_ERR_RADIANCE_DOMAIN;
    }
    if (status != GB_OK) {
        *field = signal_field(s);
        return status;
    }
    /* emissivity */
    scene->emissivity = in[1];
    if (!(in[1] > 0.0 && in[1] <= 1.0)) {
        *field = "emissivity";
        return GB_ERR_EMISSIVITY_DOMAIN;
    }
    /* reflected */
    scene->reflected.kind = s->reflected_form == FORM_TEMPERATURE ? GB_TERM_TEMPERATURE
                                                                  : GB_TERM_RADIANCE;
    if (s->reflected_form == FORM_TEMPERATURE) {
        status = gb_temperature_to_kelvin(in[2], s->unit, &scene->reflected.value);
    } else {
        scene->reflected.value = in[2];
        status = in[2] >= 0.0 ? GB_OK : GB_ERR_RADIANCE_DOMAIN;
    }
    if (status != GB_OK) {
        *field = reflected_field(s);
        return status;
    }
    /* transmittance */
    scene->transmittance = in[3];
    if (!(in[3] > 0.0 && in[3] <= 1.0)) {
        *field = "transmittance";
        return GB_ERR_TRANSMITTANCE_DOMAIN;
    }
    /* atmosphere */
    scene->atmosphere.kind = s->atmosphere_form == FORM_RADIANCE ? GB_TERM_RADIANCE
                                                                 : GB_TERM_TEMPERATURE;
    if (s->atmosphere_form == FORM_ABSENT) {
        scene->atmosphere.value = UNUSED_ATMOSPHERE_K;
        status = GB_OK;
    } else if (s->atmosphere_form == FORM_TEMPERATURE) {
        status = gb_temperature_to_kelvin(in[4], s->unit, &scene->atmosphere.value);
    } else {
        scene->atmosphere.value = in[4];
        status = in[4] >= 0.0 ? GB_OK : GB_ERR_RADIANCE_DOMAIN;
    }
    if (status != GB_OK) {
        *field = atmosphere_field(s);
        return status;
    }
    return GB_OK;
}

/* The field a status of the solver itself points at. */
static const char *solver_field(const void *context, gb_status status)
{
    const scene_request *s = context;
    switch (status) {
    case GB_ERR_EMISSIVITY_DOMAIN: return "emissivity";
    case GB_ERR_TRANSMITTANCE_DOMAIN: return "transmittance";
    case GB_ERR_BAND_LIMITS:
    case GB_ERR_BAND_REVERSED:
    case GB_ERR_RESPONSE_TOO_SHORT:
    case GB_ERR_RESPONSE_UNSORTED:
    case GB_ERR_RESPONSE_NEGATIVE:
    case GB_ERR_RESPONSE_ALL_ZERO: return "band";
    default: return signal_field(s);
    }
}

static bool temperature_inputs(const scene_request *s)
{
    return s->signal_form == FORM_TEMPERATURE && s->reflected_form == FORM_TEMPERATURE &&
           s->atmosphere_form != FORM_RADIANCE;
}

/* ---------------------------------------------------- corrected-temperature ---- */

/* in: signal, emissivity, reflected, transmittance, atmosphere; out: T [, T total model] */
static gb_status corrected_element(const void *context, const double *in, double *out,
                                   const char **field)
{
    const scene_request *s = context;
    gb_scene scene;
    double kelvin;
    gb_status status = build_scene(s, in, &scene, field);
    if (status != GB_OK) {
        return status;
    }
    status = gb_measure_temperature(model_band(s), &scene, &kelvin);
    if (status == GB_OK) {
        status = gb_temperature_from_kelvin(kelvin, s->unit, &out[0]);
    }
    if (status != GB_OK) {
        return status;
    }
    if (s->model == MODEL_BAND && temperature_inputs(s)) {
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
    scene_request s;
    gb_elementwise batch = {0};
    bool ok = gb_params_begin(&p, call->input, call->from_query, call->config->max_array,
                              scene_fields, &problem) &&
              read_scene(&p, GB_ARRAY_OK, &s);
    batch.inputs[0] = &s.signal;
    batch.inputs[1] = &s.emissivity;
    batch.inputs[2] = &s.reflected;
    batch.inputs[3] = &s.transmittance;
    batch.inputs[4] = &s.atmosphere;
    batch.input_count = 5;
    ok = ok && gb_params_broadcast(&p, batch.inputs, 5, &batch.count, &batch.is_array);
    if (!ok) {
        gb_reply_problem(reply, &problem);
        gb_params_end(&p);
        return;
    }
    const char *unit = gb_temperature_unit_symbol(s.unit);
    batch.outputs[0] = (gb_output){"temperature", "temperature_unit", unit, false};
    batch.output_count = 1;
    batch.extras[0][0] = "model";
    batch.extras[0][1] = model_names[s.model];
    batch.extra_count = 1;
    if (s.model == MODEL_BAND && temperature_inputs(&s)) {
        batch.outputs[1] = (gb_output){"total_model_temperature", NULL, NULL, true};
        batch.output_count = 2;
    }
    batch.element = corrected_element;
    batch.field_for = solver_field;
    batch.context = &s;
    gb_elementwise_reply(&batch, reply);
    gb_params_end(&p);
}

/* ------------------------------------------------------------- sensitivity ---- */

static const double default_emissivity_errors[] = {-0.05, -0.02, -0.01, 0.01, 0.02, 0.05};

typedef struct uncertainty_inputs {
    gb_num u[GB_INPUT_COUNT];
    const char *names[GB_INPUT_COUNT]; /* the u_ field names used */
} uncertainty_inputs;

/* Reads u_<input> in the form matching the input; the other form is a conflict. */
static bool read_uncertainty(gb_params *p, const char *const forms[2], size_t form,
                             gb_num *out, const char **name)
{
    size_t other = form == FORM_RADIANCE ? FORM_TEMPERATURE : FORM_RADIANCE;
    char own[48], wrong[48];
    *name = forms[form == FORM_ABSENT ? FORM_TEMPERATURE : form];
    snprintf(own, sizeof own, "u_%s", *name);
    if (forms[other] != NULL) {
        snprintf(wrong, sizeof wrong, "u_%s", forms[other]);
        if (gb_params_has(p, wrong)) {
            return gb_params_fail(p, GB_PROBLEM_CONFLICTING_FIELDS, wrong,
                                  "\"%s\" does not match the input given (use \"%s\").", wrong,
                                  own);
        }
    }
    return gb_params_number(p, own, 0, 0.0, out);
}

void gb_handle_sensitivity(const gb_call *call, gb_reply *reply)
{
    static const char *const fields[] = {
        "apparent_temperature", "measured_radiance", "emissivity", "reflected_temperature",
        "reflected_radiance", "transmittance", "atmosphere_temperature", "path_radiance", "band",
        "model", "temperature_unit", "u_emissivity", "u_reflected_temperature",
        "u_reflected_radiance", "u_transmittance", "u_atmosphere_temperature", "u_path_radiance",
        "u_apparent_temperature", "u_measured_radiance", "emissivity_errors", NULL};
    static const char *const emissivity_form[2] = {"emissivity", NULL};
    static const char *const transmittance_form[2] = {"transmittance", NULL};
    gb_problem problem;
    gb_problem_clear(&problem);
    gb_params p;
    scene_request s;
    uncertainty_inputs u;
    const double *deltas = NULL;
    size_t delta_count = 0;
    memset(&u, 0, sizeof u);

    bool ok = gb_params_begin(&p, call->input, call->from_query, call->config->max_array,
                              fields, &problem) &&
              read_scene(&p, 0, &s) &&
              read_uncertainty(&p, emissivity_form, FORM_TEMPERATURE,
                               &u.u[GB_INPUT_EMISSIVITY], &u.names[GB_INPUT_EMISSIVITY]) &&
              read_uncertainty(&p, reflected_names, s.reflected_form, &u.u[GB_INPUT_REFLECTED],
                               &u.names[GB_INPUT_REFLECTED]) &&
              read_uncertainty(&p, transmittance_form, FORM_TEMPERATURE,
                               &u.u[GB_INPUT_TRANSMITTANCE], &u.names[GB_INPUT_TRANSMITTANCE]) &&
              read_uncertainty(&p, atmosphere_names, s.atmosphere_form,
                               &u.u[GB_INPUT_ATMOSPHERE], &u.names[GB_INPUT_ATMOSPHERE]) &&
              read_uncertainty(&p, signal_names, s.signal_form, &u.u[GB_INPUT_SIGNAL],
                               &u.names[GB_INPUT_SIGNAL]) &&
              gb_params_number_list(&p, "emissivity_errors", default_emissivity_errors,
                                    sizeof default_emissivity_errors /
                                        sizeof default_emissivity_errors[0],
                                    &deltas, &delta_count);
    if (ok && s.atmosphere_form == FORM_ABSENT && u.u[GB_INPUT_TRANSMITTANCE].scalar > 0.0) {
        ok = gb_params_fail(&p, GB_PROBLEM_MISSING_FIELD, "atmosphere_temperature",
                            "\"atmosphere_temperature\" (or \"path_radiance\") is required when "
                            "u_transmittance is above 0.");
    }
    /* Uncertainties must not be negative; field = the u_ name. */
    for (size_t i = 0; ok && i < GB_INPUT_COUNT; i++) {
        if (u.u[i].scalar < 0.0) {
            char name[48];
            snprintf(name, sizeof name, "u_%s", u.names[i]);
            ok = gb_params_fail_status(&p, GB_ERR_UNCERTAINTY_DOMAIN, name);
        }
    }
    if (!ok) {
        gb_reply_problem(reply, &problem);
        gb_params_end(&p);
        return;
    }

    double in[5] = {s.signal.scalar, s.emissivity.scalar, s.reflected.scalar,
                    s.transmittance.scalar, s.atmosphere.scalar};
    gb_scene scene;
    gb_sensitivity sensitivity;
    gb_budget budget;
    const char *field = NULL;
    gb_status status = build_scene(&s, in, &scene, &field);
    if (status == GB_OK) {
        status = gb_measure_sensitivity(model_band(&s), &scene, &sensitivity);
        field = solver_field(&s, status);
    }
    /* Temperature-form uncertainties are differences in the request's unit: to kelvin. */
    double standard[GB_INPUT_COUNT];
    bool is_temperature[GB_INPUT_COUNT] = {
        false, s.reflected_form == FORM_TEMPERATURE, false,
        s.atmosphere_form != FORM_RADIANCE, s.signal_form == FORM_TEMPERATURE};
    for (size_t i = 0; status == GB_OK && i < GB_INPUT_COUNT; i++) {
        standard[i] = u.u[i].scalar;
        if (is_temperature[i]) {
            status = gb_temperature_difference_to_kelvin(u.u[i].scalar, s.unit, &standard[i]);
            field = status != GB_OK ? u.names[i] : field;
        }
    }
    if (status == GB_OK && s.atmosphere_form == FORM_ABSENT && s.transmittance.scalar == 1.0) {
        /* No atmosphere in the path: neither it nor the transmittance matters. */
        sensitivity.partial[GB_INPUT_TRANSMITTANCE] = 0.0;
        sensitivity.partial[GB_INPUT_ATMOSPHERE] = 0.0;
    }
    if (status == GB_OK) {
        status = gb_gum_budget(&sensitivity, standard, &budget);
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

    /* Output: temperatures in the request's unit; sensitivities per input unit. */
    double difference = 1.0; /* kelvin-sized -> unit-sized */
    gb_temperature_difference_from_kelvin(1.0, s.unit, &difference);
    double temperature = NAN;
    gb_temperature_from_kelvin(sensitivity.temperature_k, s.unit, &temperature);
    double c[GB_INPUT_COUNT];
    for (size_t i = 0; i < GB_INPUT_COUNT; i++) {
        /* dT/dx: per kelvin of a temperature input is unitless; otherwise unit-sized. */
        c[i] = is_temperature[i] ? sensitivity.partial[i] : sensitivity.partial[i] * difference;
    }

    gb_jw w;
    gb_jw_init(&w, 2048);
    gb_jw_object_begin(&w);
    gb_jw_knumber(&w, "temperature", temperature);
    gb_jw_kstring(&w, "temperature_unit", gb_temperature_unit_symbol(s.unit));
    gb_jw_kstring(&w, "model", model_names[s.model]);
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
        gb_jw_knumber(&w, "standard_uncertainty", u.u[i].scalar);
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
        if (gb_emissivity_error(model_band(&s), &scene, deltas[i], &error_k) == GB_OK) {
            gb_jw_number(&w, error_k * difference);
        } else {
            gb_jw_null(&w);
        }
    }
    gb_jw_array_end(&w);
    gb_jw_object_end(&w);
    gb_jw_object_end(&w);
    gb_params_end(&p);
    gb_reply_json(reply, 200, &w);
}
