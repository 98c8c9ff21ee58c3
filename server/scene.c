#include "scene.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

/* Fills the per-element input of an absent atmosphere (tau = 1); the core is given NaN. */
#define UNUSED_ATMOSPHERE_K 288.15

const char *const gb_scene_signal_names[] = {"apparent_temperature", "measured_radiance", NULL};
const char *const gb_scene_reflected_names[] = {"reflected_temperature", "reflected_radiance",
                                                NULL};
const char *const gb_scene_atmosphere_names[] = {"atmosphere_temperature", "path_radiance",
                                                 NULL};
const char *const gb_scene_model_names[] = {"band", "total", NULL};

const char *gb_scene_signal_field(const gb_scene_request *s)
{
    return gb_scene_signal_names[s->signal_form];
}

static const char *reflected_field(const gb_scene_request *s)
{
    return gb_scene_reflected_names[s->reflected_form];
}

static const char *atmosphere_field(const gb_scene_request *s)
{
    return s->atmosphere_form == GB_FORM_RADIANCE ? "path_radiance" : "atmosphere_temperature";
}

const gb_band *gb_scene_model_band(const gb_scene_request *s)
{
    return s->model == GB_MODEL_TOTAL ? &s->total : &s->band;
}

bool gb_scene_temperature_inputs(const gb_scene_request *s)
{
    return s->signal_form == GB_FORM_TEMPERATURE && s->reflected_form == GB_FORM_TEMPERATURE &&
           s->atmosphere_form != GB_FORM_RADIANCE;
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

bool gb_scene_read(gb_params *p, unsigned array, unsigned parts, gb_scene_request *s)
{
    bool band_given = false;
    size_t which = 0;
    memset(s, 0, sizeof *s);
    s->total.kind = GB_BAND_TOTAL;
    s->emissivity.name = "emissivity";
    s->emissivity.count = 1;
    s->emissivity.scalar = 1.0;
    if (!gb_params_temperature_unit(p, &s->unit) ||
        !gb_params_one_of(p, gb_scene_signal_names, true, &s->signal_form) ||
        !gb_params_number(p, gb_scene_signal_names[s->signal_form], GB_REQUIRED | array, 0.0,
                          &s->signal) ||
        ((parts & GB_SCENE_EMISSIVITY) &&
         !gb_params_number(p, "emissivity", GB_REQUIRED | array, 0.0, &s->emissivity)) ||
        !gb_params_one_of(p, gb_scene_reflected_names, true, &s->reflected_form) ||
        !gb_params_number(p, gb_scene_reflected_names[s->reflected_form], GB_REQUIRED | array,
                          0.0, &s->reflected) ||
        !gb_params_number(p, "transmittance", array, 1.0, &s->transmittance) ||
        !gb_params_one_of(p, gb_scene_atmosphere_names, false, &which)) {
        return false;
    }
    s->atmosphere_form = which == (size_t)-1 ? GB_FORM_ABSENT : which;
    if (s->atmosphere_form == GB_FORM_ABSENT) {
        s->atmosphere.name = "atmosphere_temperature";
        s->atmosphere.count = 1;
        s->atmosphere.scalar = UNUSED_ATMOSPHERE_K;
    } else if (!gb_params_number(p, gb_scene_atmosphere_names[which], GB_REQUIRED | array, 0.0,
                                 &s->atmosphere)) {
        return false;
    }
    if (!gb_params_band(p, false, &s->band, &band_given) ||
        ((parts & GB_SCENE_MODEL) &&
         !gb_params_choice(p, "model", gb_scene_model_names, GB_MODEL_BAND, &s->model))) {
        return false;
    }
    if (s->model == GB_MODEL_TOTAL && band_given) {
        return gb_params_fail(p, GB_PROBLEM_CONFLICTING_FIELDS, "band",
                              "\"band\" does not apply to model \"total\" (the whole spectrum).");
    }
    if (s->atmosphere_form == GB_FORM_ABSENT && any_below_one(&s->transmittance)) {
        return gb_params_fail(p, GB_PROBLEM_MISSING_FIELD, "atmosphere_temperature",
                              "\"atmosphere_temperature\" (or \"path_radiance\") is required "
                              "when transmittance is below 1.");
    }
    return true;
}

void gb_scene_inputs(const gb_scene_request *s, const gb_num *inputs[GB_SCENE_IN_COUNT])
{
    inputs[GB_SCENE_IN_SIGNAL] = &s->signal;
    inputs[GB_SCENE_IN_EMISSIVITY] = &s->emissivity;
    inputs[GB_SCENE_IN_REFLECTED] = &s->reflected;
    inputs[GB_SCENE_IN_TRANSMITTANCE] = &s->transmittance;
    inputs[GB_SCENE_IN_ATMOSPHERE] = &s->atmosphere;
}

/* A term in core units: a temperature in the request's unit, or a radiance (> 0 or >= 0). */
static gb_status build_term(const gb_scene_request *s, size_t form, double value,
                            bool zero_allowed, gb_term *term)
{
    term->kind = form == GB_FORM_RADIANCE ? GB_TERM_RADIANCE : GB_TERM_TEMPERATURE;
    if (form != GB_FORM_RADIANCE) {
        return gb_temperature_to_kelvin(value, s->unit, &term->value);
    }
    term->value = value;
    return value > 0.0 || (zero_allowed && value == 0.0) ? GB_OK : GB_ERR_RADIANCE_DOMAIN;
}

gb_status gb_scene_build(const gb_scene_request *s, const double *in, gb_scene *scene,
                         const char **field)
{
    gb_status status = build_term(s, s->signal_form, in[GB_SCENE_IN_SIGNAL], false,
                                  &scene->signal);
    if (status != GB_OK) {
        *field = gb_scene_signal_field(s);
        return status;
    }
    scene->emissivity = in[GB_SCENE_IN_EMISSIVITY];
    if (!(scene->emissivity > 0.0 && scene->emissivity <= 1.0)) {
        *field = "emissivity";
        return GB_ERR_EMISSIVITY_DOMAIN;
    }
    status = build_term(s, s->reflected_form, in[GB_SCENE_IN_REFLECTED], true, &scene->reflected);
    if (status != GB_OK) {
        *field = reflected_field(s);
        return status;
    }
    scene->transmittance = in[GB_SCENE_IN_TRANSMITTANCE];
    if (!(scene->transmittance > 0.0 && scene->transmittance <= 1.0)) {
        *field = "transmittance";
        return GB_ERR_TRANSMITTANCE_DOMAIN;
    }
    if (s->atmosphere_form == GB_FORM_ABSENT) {
        /* measure.h: NaN is "not given" (tau = 1 here), so nothing is computed from it. */
        scene->atmosphere.kind = GB_TERM_TEMPERATURE;
        scene->atmosphere.value = NAN;
        return GB_OK;
    }
    status = build_term(s, s->atmosphere_form, in[GB_SCENE_IN_ATMOSPHERE], true,
                        &scene->atmosphere);
    if (status != GB_OK) {
        *field = atmosphere_field(s);
        return status;
    }
    return GB_OK;
}

const char *gb_scene_field_for(const void *context, gb_status status)
{
    const gb_scene_request *s = context;
    if (gb_params_is_band_status(status)) {
        return "band";
    }
    switch (status) {
    case GB_ERR_EMISSIVITY_DOMAIN: return "emissivity";
    case GB_ERR_TRANSMITTANCE_DOMAIN: return "transmittance";
    default: return gb_scene_signal_field(s);
    }
}

/* Reads u_<input> in the form matching the input; the other form is a conflict. */
static bool read_one_uncertainty(gb_params *p, const char *const forms[2], size_t form,
                                 gb_num *out, const char **name)
{
    size_t other = form == GB_FORM_RADIANCE ? GB_FORM_TEMPERATURE : GB_FORM_RADIANCE;
    char own[48], wrong[48];
    *name = forms[form == GB_FORM_ABSENT ? GB_FORM_TEMPERATURE : form];
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

bool gb_scene_read_uncertainty(gb_params *p, const gb_scene_request *s, unsigned parts,
                               gb_scene_uncertainty *u)
{
    static const char *const emissivity_form[2] = {"emissivity", NULL};
    static const char *const transmittance_form[2] = {"transmittance", NULL};
    gb_num given[GB_INPUT_COUNT];
    memset(u, 0, sizeof *u);
    memset(given, 0, sizeof given);
    u->names[GB_INPUT_EMISSIVITY] = "emissivity";
    bool ok = (!(parts & GB_SCENE_EMISSIVITY) ||
               read_one_uncertainty(p, emissivity_form, GB_FORM_TEMPERATURE,
                                    &given[GB_INPUT_EMISSIVITY], &u->names[GB_INPUT_EMISSIVITY])) &&
              read_one_uncertainty(p, gb_scene_reflected_names, s->reflected_form,
                                   &given[GB_INPUT_REFLECTED], &u->names[GB_INPUT_REFLECTED]) &&
              read_one_uncertainty(p, transmittance_form, GB_FORM_TEMPERATURE,
                                   &given[GB_INPUT_TRANSMITTANCE],
                                   &u->names[GB_INPUT_TRANSMITTANCE]) &&
              read_one_uncertainty(p, gb_scene_atmosphere_names, s->atmosphere_form,
                                   &given[GB_INPUT_ATMOSPHERE], &u->names[GB_INPUT_ATMOSPHERE]) &&
              read_one_uncertainty(p, gb_scene_signal_names, s->signal_form,
                                   &given[GB_INPUT_SIGNAL], &u->names[GB_INPUT_SIGNAL]);
    if (!ok) {
        return false;
    }
    if (s->atmosphere_form == GB_FORM_ABSENT && given[GB_INPUT_TRANSMITTANCE].scalar > 0.0) {
        return gb_params_fail(p, GB_PROBLEM_MISSING_FIELD, "atmosphere_temperature",
                              "\"atmosphere_temperature\" (or \"path_radiance\") is required "
                              "when u_transmittance is above 0.");
    }
    u->is_temperature[GB_INPUT_REFLECTED] = s->reflected_form == GB_FORM_TEMPERATURE;
    u->is_temperature[GB_INPUT_ATMOSPHERE] = s->atmosphere_form != GB_FORM_RADIANCE;
    u->is_temperature[GB_INPUT_SIGNAL] = s->signal_form == GB_FORM_TEMPERATURE;
    for (size_t i = 0; i < GB_INPUT_COUNT; i++) {
        char name[48];
        snprintf(name, sizeof name, "u_%s", u->names[i]);
        u->given[i] = given[i].scalar;
        u->kelvin[i] = given[i].scalar;
        if (given[i].scalar < 0.0) {
            return gb_params_fail_status(p, GB_ERR_UNCERTAINTY_DOMAIN, name);
        }
        if (u->is_temperature[i] &&
            gb_temperature_difference_to_kelvin(given[i].scalar, s->unit, &u->kelvin[i]) !=
                GB_OK) {
            return gb_params_fail_status(p, GB_ERR_RESULT_OVERFLOW, name);
        }
    }
    return true;
}
