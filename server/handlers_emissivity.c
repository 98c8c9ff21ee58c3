/*
 * /v1/emissivity: a surface's emissivity from a reference measurement
 * (core/emissivity.h, after the reference-temperature procedures of ASTM
 * E1933), with its standard uncertainty after JCGM 100:2008 (GUM) eq. (10).
 *
 * The surface's true temperature comes from a contact probe
 * (`surface_temperature`) or from a reference patch of known emissivity on the
 * same surface read by the same instrument (`reference_apparent_temperature`
 * and `reference_emissivity`): the patch's measurement equation is solved for
 * its temperature (measure.h), which is then the surface temperature.  With a
 * patch the surface temperature depends on the reflected temperature,
 * transmittance and atmosphere too, so their sensitivities are total
 * derivatives: d eps/dx = (d eps/dx at fixed T) + (d eps/dT)(dT/dx).
 */
#include <math.h>
#include <string.h>

#include "elementwise.h"
#include "emissivity.h"
#include "handlers.h"
#include "measure.h"
#include "scene.h"
#include "uncertainty.h"
#include "units.h"

enum { FORM_CONTACT = 0, FORM_PATCH = 1 };

/* Element inputs after the scene's (GB_SCENE_IN_*). */
enum { IN_SURFACE = GB_SCENE_IN_COUNT, IN_REFERENCE_EMISSIVITY, IN_COUNT };

/* Budget rows, in the order they are written. */
enum { ROW_SURFACE = 0, ROW_REFERENCE_EMISSIVITY, ROW_SIGNAL, ROW_REFLECTED, ROW_TRANSMITTANCE,
       ROW_ATMOSPHERE, ROW_COUNT };

static const char *const surface_names[] = {"surface_temperature",
                                            "reference_apparent_temperature", NULL};

typedef struct emissivity_request {
    gb_scene_request scene;
    size_t form;
    gb_num surface, reference_emissivity;
    gb_scene_uncertainty u;            /* the scene's inputs (no emissivity) */
    double u_surface_k;                /* u of surface_temperature or reference_apparent_temperature */
    double u_reference_emissivity;
    double u_given[ROW_COUNT];         /* as given, in the request's units */
    double u_kelvin[ROW_COUNT];        /* temperatures as kelvin-sized differences */
    const char *row_names[ROW_COUNT];
    bool row_is_temperature[ROW_COUNT];
} emissivity_request;

/* One element's answer: eps, the surface temperature used, d eps / d(row) per kelvin. */
typedef struct emissivity_answer {
    double emissivity;
    double surface_k;
    double surface; /* in the request's unit: the probe's value as given, or the patch's */
    double partial[ROW_COUNT];
} emissivity_answer;

static const char *field_for(const void *context, gb_status status)
{
    const emissivity_request *r = context;
    switch (status) {
    case GB_ERR_EMISSIVITY_DOMAIN: return gb_scene_signal_field(&r->scene);
    case GB_ERR_EMISSIVITY_UNDETERMINED:
        return gb_scene_reflected_names[r->scene.reflected_form];
    case GB_ERR_TEMPERATURE_DOMAIN: return surface_names[r->form];
    default: return gb_scene_field_for(&r->scene, status);
    }
}

/* The patch's own temperature and its sensitivities (the scene with the patch's reading). */
static gb_status solve_patch(const emissivity_request *r, const gb_scene *scene,
                             const double *in, gb_sensitivity *patch, const char **field)
{
    gb_scene reference = *scene;
    reference.signal.kind = GB_TERM_TEMPERATURE;
    gb_status status = gb_temperature_to_kelvin(in[IN_SURFACE], r->scene.unit,
                                                &reference.signal.value);
    if (status != GB_OK) {
        *field = surface_names[FORM_PATCH];
        return status;
    }
    reference.emissivity = in[IN_REFERENCE_EMISSIVITY];
    if (!(reference.emissivity > 0.0 && reference.emissivity <= 1.0)) {
        *field = "reference_emissivity";
        return GB_ERR_EMISSIVITY_DOMAIN;
    }
    status = gb_measure_sensitivity(&r->scene.band, &reference, patch);
    if (status != GB_OK) {
        *field = status == GB_ERR_EMISSIVITY_DOMAIN ? "reference_emissivity"
                                                    : surface_names[FORM_PATCH];
    }
    return status;
}

static gb_status solve(const emissivity_request *r, const double *in, emissivity_answer *answer,
                       const char **field)
{
    gb_scene scene;
    gb_sensitivity patch;
    gb_emissivity_estimate estimate;
    gb_status status = gb_scene_build(&r->scene, in, &scene, field);
    if (status != GB_OK) {
        return status;
    }
    if (r->scene.atmosphere_form == GB_FORM_ABSENT) {
        scene.atmosphere.value = NAN; /* measure.h: not given (tau = 1) */
    }
    memset(answer, 0, sizeof *answer);
    if (r->form == FORM_CONTACT) {
        status = gb_temperature_to_kelvin(in[IN_SURFACE], r->scene.unit, &answer->surface_k);
        *field = status != GB_OK ? surface_names[FORM_CONTACT] : NULL;
        answer->surface = in[IN_SURFACE];
    } else {
        status = solve_patch(r, &scene, in, &patch, field);
        answer->surface_k = patch.temperature_k;
        if (status == GB_OK) {
            status = gb_temperature_from_kelvin(patch.temperature_k, r->scene.unit,
                                                &answer->surface);
        }
    }
    if (status != GB_OK) {
        return status;
    }
    status = gb_emissivity_from_reference(&r->scene.band, &scene, answer->surface_k, &estimate);
    if (status != GB_OK) {
        *field = field_for(r, status);
        return status;
    }
    const double *e = estimate.partial;
    double *c = answer->partial;
    answer->emissivity = estimate.emissivity;
    c[ROW_SIGNAL] = e[GB_EMISSIVITY_BY_SIGNAL];
    c[ROW_REFLECTED] = e[GB_EMISSIVITY_BY_REFLECTED];
    bool tau_defined = estimate.defined[GB_EMISSIVITY_BY_TRANSMITTANCE];
    /* Unknown without an atmosphere (tau = 1): null, not a made-up 0. */
    c[ROW_TRANSMITTANCE] = tau_defined ? e[GB_EMISSIVITY_BY_TRANSMITTANCE] : NAN;
    c[ROW_ATMOSPHERE] =
        r->scene.atmosphere_form == GB_FORM_ABSENT ? 0.0 : e[GB_EMISSIVITY_BY_ATMOSPHERE];
    if (r->form == FORM_CONTACT) {
        c[ROW_SURFACE] = e[GB_EMISSIVITY_BY_SURFACE_TEMPERATURE];
        return GB_OK;
    }
    /* Through the patch: the surface temperature moves with its reading and its emissivity,
     * and with the terms both readings share. */
    double by_surface = e[GB_EMISSIVITY_BY_SURFACE_TEMPERATURE];
    c[ROW_SURFACE] = by_surface * patch.partial[GB_INPUT_SIGNAL];
    c[ROW_REFERENCE_EMISSIVITY] = by_surface * patch.partial[GB_INPUT_EMISSIVITY];
    c[ROW_REFLECTED] += by_surface * patch.partial[GB_INPUT_REFLECTED];
    if (tau_defined && patch.defined[GB_INPUT_TRANSMITTANCE]) {
        c[ROW_TRANSMITTANCE] += by_surface * patch.partial[GB_INPUT_TRANSMITTANCE];
    }
    if (r->scene.atmosphere_form != GB_FORM_ABSENT) {
        c[ROW_ATMOSPHERE] += by_surface * patch.partial[GB_INPUT_ATMOSPHERE];
    }
    return GB_OK;
}

/* u(eps) = sqrt(sum (c_i u_i)^2), JCGM 100:2008 eq. (10), uncorrelated inputs. */
static double combined_uncertainty(const emissivity_request *r, const emissivity_answer *a,
                                   double contribution[ROW_COUNT])
{
    double sum = 0.0;
    for (size_t i = 0; i < ROW_COUNT; i++) {
        /* A null (unknown) sensitivity with no uncertainty contributes nothing. */
        contribution[i] = r->u_kelvin[i] > 0.0 ? fabs(a->partial[i]) * r->u_kelvin[i] : 0.0;
        sum += contribution[i] * contribution[i];
    }
    return sqrt(sum);
}

/* in: GB_SCENE_IN_*, surface (or patch reading), reference emissivity; out: eps, u, T */
static gb_status emissivity_element(const void *context, const double *in, double *out,
                                    const char **field)
{
    const emissivity_request *r = context;
    emissivity_answer answer;
    double contribution[ROW_COUNT];
    gb_status status = solve(r, in, &answer, field);
    if (status != GB_OK) {
        return status;
    }
    out[0] = answer.emissivity;
    out[1] = combined_uncertainty(r, &answer, contribution);
    out[2] = answer.surface;
    return GB_OK;
}

/* ---------------------------------------------------------------- reading ---- */

static bool read_surface(gb_params *p, unsigned array, emissivity_request *r)
{
    static const char *const contact_only[] = {"u_surface_temperature", NULL};
    static const char *const patch_only[] = {"reference_emissivity",
                                             "u_reference_apparent_temperature",
                                             "u_reference_emissivity", NULL};
    gb_num u_surface, u_reference = {0};
    if (!gb_params_one_of(p, surface_names, true, &r->form) ||
        !gb_params_number(p, surface_names[r->form], GB_REQUIRED | array, 0.0, &r->surface)) {
        return false;
    }
    const char *const *other = r->form == FORM_CONTACT ? patch_only : contact_only;
    for (size_t i = 0; other[i] != NULL; i++) {
        if (gb_params_has(p, other[i])) {
            return gb_params_fail(p, GB_PROBLEM_CONFLICTING_FIELDS, other[i],
                                  "\"%s\" belongs to the %s form; this request gives \"%s\".",
                                  other[i], r->form == FORM_CONTACT ? "reference patch" : "contact",
                                  surface_names[r->form]);
        }
    }
    r->reference_emissivity = (gb_num){"reference_emissivity", false, false, 1, NULL, 1.0};
    char u_name[48];
    snprintf(u_name, sizeof u_name, "u_%s", surface_names[r->form]);
    if ((r->form == FORM_PATCH &&
         (!gb_params_number(p, "reference_emissivity", GB_REQUIRED | array, 0.0,
                            &r->reference_emissivity) ||
          !gb_params_number(p, "u_reference_emissivity", 0, 0.0, &u_reference))) ||
        !gb_params_number(p, u_name, 0, 0.0, &u_surface)) {
        return false;
    }
    if (u_surface.scalar < 0.0) {
        return gb_params_fail_status(p, GB_ERR_UNCERTAINTY_DOMAIN, u_name);
    }
    r->u_given[ROW_SURFACE] = u_surface.scalar;
    gb_temperature_difference_to_kelvin(u_surface.scalar, r->scene.unit, &r->u_kelvin[ROW_SURFACE]);
    r->row_names[ROW_SURFACE] = surface_names[r->form];
    r->row_is_temperature[ROW_SURFACE] = true;
    if (r->form == FORM_PATCH) {
        if (u_reference.scalar < 0.0) {
            return gb_params_fail_status(p, GB_ERR_UNCERTAINTY_DOMAIN, "u_reference_emissivity");
        }
        r->u_given[ROW_REFERENCE_EMISSIVITY] = u_reference.scalar;
        r->u_kelvin[ROW_REFERENCE_EMISSIVITY] = u_reference.scalar;
        r->row_names[ROW_REFERENCE_EMISSIVITY] = "reference_emissivity";
    }
    return true;
}

/* The scene's own uncertainties into the budget rows. */
static void scene_rows(emissivity_request *r)
{
    static const struct {
        size_t row;
        gb_input input;
    } map[] = {{ROW_SIGNAL, GB_INPUT_SIGNAL},
               {ROW_REFLECTED, GB_INPUT_REFLECTED},
               {ROW_TRANSMITTANCE, GB_INPUT_TRANSMITTANCE},
               {ROW_ATMOSPHERE, GB_INPUT_ATMOSPHERE}};
    for (size_t i = 0; i < sizeof map / sizeof map[0]; i++) {
        r->u_given[map[i].row] = r->u.given[map[i].input];
        r->u_kelvin[map[i].row] = r->u.kelvin[map[i].input];
        r->row_names[map[i].row] = r->u.names[map[i].input];
        r->row_is_temperature[map[i].row] = r->u.is_temperature[map[i].input];
    }
}

/* ---------------------------------------------------------------- writing ---- */

static void write_scalar(const emissivity_request *r, const emissivity_answer *a,
                         gb_reply *reply)
{
    double contribution[ROW_COUNT];
    double u = combined_uncertainty(r, a, contribution);
    double difference = 1.0;
    gb_temperature_difference_from_kelvin(1.0, r->scene.unit, &difference);
    gb_jw w;
    gb_jw_init(&w, 1024);
    gb_jw_object_begin(&w);
    gb_jw_knumber(&w, "emissivity", a->emissivity);
    gb_jw_knumber(&w, "u_emissivity", u);
    gb_jw_knumber(&w, "expanded_uncertainty", GB_COVERAGE_FACTOR * u);
    gb_jw_knumber(&w, "coverage_factor", GB_COVERAGE_FACTOR);
    gb_jw_knumber(&w, "surface_temperature", a->surface);
    gb_jw_kstring(&w, "temperature_unit", gb_temperature_unit_symbol(r->scene.unit));
    gb_jw_key(&w, "budget");
    gb_jw_array_begin(&w);
    for (size_t i = 0; i < ROW_COUNT; i++) {
        if (r->row_names[i] == NULL) {
            continue;
        }
        /* d eps / d(one degree of the request's unit) for temperatures */
        double c = r->row_is_temperature[i] ? a->partial[i] / difference : a->partial[i];
        gb_jw_object_begin(&w);
        gb_jw_kstring(&w, "quantity", r->row_names[i]);
        gb_jw_knumber(&w, "standard_uncertainty", r->u_given[i]);
        gb_jw_knumber(&w, "sensitivity", c);
        gb_jw_knumber(&w, "contribution", contribution[i]);
        gb_jw_object_end(&w);
    }
    gb_jw_array_end(&w);
    gb_jw_object_end(&w);
    gb_reply_json(reply, 200, &w);
}

static const char *scalar_detail(gb_status status)
{
    switch (status) {
    case GB_ERR_EMISSIVITY_DOMAIN:
        return "These readings give no emissivity in (0, 1]: the spot reads hotter than a "
               "blackbody at the surface temperature would (above 1), or colder than its "
               "surroundings allow (below 0). Check the surface temperature, the reflected "
               "temperature, and that both readings are of the same spot.";
    case GB_ERR_EMISSIVITY_UNDETERMINED:
        return "The surface and the surroundings it reflects give the same radiance (the surface "
               "temperature equals the reflected temperature), so the reading does not depend on "
               "the emissivity. Heat or cool the object, or change what it reflects, so that "
               "they differ by many kelvin.";
    default: return NULL;
    }
}

void gb_handle_emissivity(const gb_call *call, gb_reply *reply)
{
    static const char *const fields[] = {
        "surface_temperature", "reference_apparent_temperature", "reference_emissivity",
        "apparent_temperature", "measured_radiance", "reflected_temperature",
        "reflected_radiance", "transmittance", "atmosphere_temperature", "path_radiance", "band",
        "temperature_unit", "u_surface_temperature", "u_reference_apparent_temperature",
        "u_reference_emissivity", "u_apparent_temperature", "u_measured_radiance",
        "u_reflected_temperature", "u_reflected_radiance", "u_transmittance",
        "u_atmosphere_temperature", "u_path_radiance", NULL};
    gb_problem problem;
    gb_problem_clear(&problem);
    gb_params p;
    emissivity_request r;
    gb_elementwise batch = {0};
    memset(&r, 0, sizeof r);
    bool ok = gb_params_begin(&p, call->input, call->from_query, call->config->max_array,
                              fields, &problem) &&
              gb_scene_read(&p, GB_ARRAY_OK, 0, &r.scene) && read_surface(&p, GB_ARRAY_OK, &r) &&
              gb_scene_read_uncertainty(&p, &r.scene, 0, &r.u);
    gb_scene_inputs(&r.scene, batch.inputs);
    batch.inputs[IN_SURFACE] = &r.surface;
    batch.inputs[IN_REFERENCE_EMISSIVITY] = &r.reference_emissivity;
    batch.input_count = IN_COUNT;
    ok = ok && gb_params_broadcast(&p, batch.inputs, IN_COUNT, &batch.count, &batch.is_array);
    if (!ok) {
        gb_reply_problem(reply, &problem);
        gb_params_end(&p);
        return;
    }
    scene_rows(&r);
    if (!batch.is_array) {
        double in[IN_COUNT];
        const char *field = NULL;
        emissivity_answer answer;
        for (size_t i = 0; i < IN_COUNT; i++) {
            in[i] = gb_num_at(batch.inputs[i], 0);
        }
        gb_status status = solve(&r, in, &answer, &field);
        if (status == GB_OK) {
            write_scalar(&r, &answer, reply);
        } else {
            gb_problem_from_status(&problem, status, field != NULL ? field : field_for(&r, status),
                                   scalar_detail(status));
            gb_reply_problem(reply, &problem);
        }
        gb_params_end(&p);
        return;
    }
    const char *unit = gb_temperature_unit_symbol(r.scene.unit);
    batch.outputs[0] = (gb_output){"emissivity", NULL, NULL, false};
    batch.outputs[1] = (gb_output){"u_emissivity", NULL, NULL, false};
    batch.outputs[2] = (gb_output){"surface_temperature", "temperature_unit", unit, false};
    batch.output_count = 3;
    batch.element = emissivity_element;
    batch.field_for = field_for;
    batch.context = &r;
    gb_elementwise_reply(&batch, reply);
    gb_params_end(&p);
}
