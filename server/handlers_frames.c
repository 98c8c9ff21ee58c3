/*
 * The frame form (frames.h) of /v1/corrected-temperature,
 * /v1/band-temperature, /v1/brightness-temperature and
 * /v1/calibration/apply: the scalar inputs from the query string, the pixels
 * through core/frame.h, band tables from the shared cache (tablecache.h).
 */
#include <math.h>
#include <stddef.h>
#include <string.h>

#include "constants.h"
#include "handlers_calibration.h"
#include "handlers_frames.h"
#include "params.h"
#include "spectral.h"
#include "tablecache.h"

/*
 * Table ranges, tried in order: the first that holds the frame's signal
 * temperatures is used (each is one whose accuracy core/bandtable.h states).
 * Pixels outside the chosen range still get exact answers, only slower.
 */
static const double table_ranges[][2] = {{150.0, 2000.0}, {100.0, 10000.0}, {10.0, 1000.0}};
#define TABLE_RANGES (sizeof table_ranges / sizeof table_ranges[0])
/* Above this the frame is hot: the 100-10 000 K table rather than the cold one. */
#define HOT_FRAME_K 2000.0

static const char *const reflected_names[] = {"reflected_temperature", "reflected_radiance",
                                              NULL};
static const char *const atmosphere_names[] = {"atmosphere_temperature", "path_radiance", NULL};
static const char *const model_names[] = {"band", "total", NULL};
enum { FORM_TEMPERATURE = 0, FORM_RADIANCE = 1 };
#define FORM_ABSENT ((size_t)-1)

/* The smallest and largest value of the signal plane. */
static void plane_extremes(const gb_frame *frame, double *low, double *high)
{
    float smallest = frame->signal[0], largest = frame->signal[0];
    for (size_t i = 1; i < frame->count; i++) {
        smallest = frame->signal[i] < smallest ? frame->signal[i] : smallest;
        largest = frame->signal[i] > largest ? frame->signal[i] : largest;
    }
    *low = smallest;
    *high = largest;
}

/* The temperatures (K) the frame's signals span, as far as they can be known before solving. */
static void signal_span(const gb_band *band, const gb_frame *frame, double *low_k,
                        double *high_k)
{
    double low, high;
    plane_extremes(frame, &low, &high);
    *low_k = table_ranges[0][0];
    *high_k = table_ranges[0][1];
    if (frame->signal_kind == GB_TERM_TEMPERATURE) {
        (void)gb_temperature_to_kelvin(low, frame->unit, low_k);
        (void)gb_temperature_to_kelvin(high, frame->unit, high_k);
    } else {
        (void)gb_band_temperature(band, low * frame->radiance_scale, 1.0, low_k);
        (void)gb_band_temperature(band, high * frame->radiance_scale, 1.0, high_k);
    }
}

/* Runs the measurement equation over the frame with the best table the cache has. */
static void measure(const gb_band *band, const gb_frame_terms *terms, gb_frame *frame)
{
    double low_k, high_k;
    gb_table_lease lease = {NULL, 0};
    signal_span(band, frame, &low_k, &high_k);
    size_t chosen = high_k > HOT_FRAME_K ? 1 : 2; /* when none holds the whole frame */
    for (size_t i = 0; i < TABLE_RANGES; i++) {
        if (low_k >= table_ranges[i][0] && high_k <= table_ranges[i][1]) {
            chosen = i;
            break;
        }
    }
    (void)gb_table_cache_acquire(band, table_ranges[chosen][0], table_ranges[chosen][1], &lease);
    /* Only programming errors fail here (the inputs were checked): the statuses say it all. */
    (void)gb_frame_measure_temperature(band, lease.table, terms, frame);
    gb_table_cache_release(&lease);
}

/* A scalar emissivity (required, or 1 by default), unless the map gives one per pixel. */
static bool read_emissivity(gb_params *p, unsigned required, gb_frame *frame)
{
    gb_num emissivity;
    if (frame->emissivity_map != NULL) {
        return true;
    }
    if (!gb_params_number(p, "emissivity", required, 1.0, &emissivity)) {
        return false;
    }
    gb_status status = gb_check_emissivity(emissivity.scalar);
    if (status != GB_OK) {
        return gb_params_fail_status(p, status, "emissivity");
    }
    frame->emissivity = emissivity.scalar;
    return true;
}

/* One scene term: a temperature in the request's unit (to K) or a radiance >= 0. */
static bool read_term(gb_params *p, const char *const *names, size_t form,
                      gb_temperature_unit unit, gb_term *term)
{
    gb_num number;
    if (!gb_params_number(p, names[form], GB_REQUIRED, 0.0, &number)) {
        return false;
    }
    gb_status status = GB_OK;
    if (form == FORM_TEMPERATURE) {
        term->kind = GB_TERM_TEMPERATURE;
        status = gb_temperature_to_kelvin(number.scalar, unit, &term->value);
    } else {
        term->kind = GB_TERM_RADIANCE;
        term->value = number.scalar;
        status = number.scalar >= 0.0 ? GB_OK : GB_ERR_RADIANCE_DOMAIN;
    }
    return status == GB_OK || gb_params_fail_status(p, status, names[form]);
}

bool gb_convert_frame_corrected(gb_frame_call *call, gb_problem *problem)
{
    static const char *const fields[] = {
        "emissivity", "reflected_temperature", "reflected_radiance", "transmittance",
        "atmosphere_temperature", "path_radiance", "band", "model", "temperature_unit", NULL};
    gb_frame *frame = call->frame;
    gb_params p;
    gb_num transmittance;
    gb_scene scene = {.atmosphere = {GB_TERM_TEMPERATURE, NAN}};
    gb_band band, total = {.kind = GB_BAND_TOTAL};
    gb_frame_terms terms;
    size_t reflected_form = 0, atmosphere_form = FORM_ABSENT, model = 0;
    bool band_given = false;
    bool ok = gb_params_begin(&p, call->query, true, call->config->max_array, fields, problem) &&
              gb_params_temperature_unit(&p, &frame->unit) && read_emissivity(&p, GB_REQUIRED, frame) &&
              gb_params_one_of(&p, reflected_names, true, &reflected_form) &&
              read_term(&p, reflected_names, reflected_form, frame->unit, &scene.reflected) &&
              gb_params_number(&p, "transmittance", 0, 1.0, &transmittance) &&
              gb_params_one_of(&p, atmosphere_names, false, &atmosphere_form) &&
              (atmosphere_form == FORM_ABSENT ||
               read_term(&p, atmosphere_names, atmosphere_form, frame->unit, &scene.atmosphere)) &&
              gb_params_band(&p, false, &band, &band_given) &&
              gb_params_choice(&p, "model", model_names, 0, &model);
    if (ok && model == 1 && band_given) {
        ok = gb_params_fail(&p, GB_PROBLEM_CONFLICTING_FIELDS, "band",
                            "\"band\" does not apply to model \"total\" (the whole spectrum).");
    }
    if (ok && atmosphere_form == FORM_ABSENT && transmittance.scalar != 1.0) {
        ok = gb_params_fail(&p, GB_PROBLEM_MISSING_FIELD, "atmosphere_temperature",
                            "\"atmosphere_temperature\" (or \"path_radiance\") is required "
                            "when transmittance is below 1.");
    }
    const gb_band *model_band = model == 1 ? &total : &band;
    scene.transmittance = transmittance.scalar;
    if (ok) {
        gb_status status = gb_frame_prepare(model_band, &scene, &terms);
        if (status != GB_OK) {
            ok = gb_params_fail_status(
                &p, status,
                status == GB_ERR_TRANSMITTANCE_DOMAIN ? "transmittance"
                : status == GB_ERR_BAND_LIMITS || status == GB_ERR_BAND_REVERSED
                    ? "band"
                    : atmosphere_names[atmosphere_form == FORM_ABSENT ? 0 : atmosphere_form]);
        }
    }
    if (ok) {
        frame->signal_kind = strcmp(call->signal, "measured_radiance") == 0
                                 ? GB_TERM_RADIANCE
                                 : GB_TERM_TEMPERATURE;
        measure(model_band, &terms, frame);
    }
    gb_params_end(&p);
    return ok;
}

/* Checks a band read from the query; a bad one is a 422 naming "band". */
static bool valid_band(gb_params *p, const gb_band *band)
{
    gb_status status = gb_band_validate(band);
    return status == GB_OK || gb_params_fail_status(p, status, "band");
}

bool gb_convert_frame_band_temperature(gb_frame_call *call, gb_problem *problem)
{
    static const char *const fields[] = {"band", "emissivity", "temperature_unit", NULL};
    /* The band-temperature relation is the measurement equation with nothing reflected. */
    static const gb_frame_terms nothing_else = {0.0, 1.0, 0.0};
    gb_frame *frame = call->frame;
    gb_params p;
    gb_band band;
    bool band_given = false;
    bool ok = gb_params_begin(&p, call->query, true, call->config->max_array, fields, problem) &&
              gb_params_temperature_unit(&p, &frame->unit) &&
              gb_params_band(&p, false, &band, &band_given) && valid_band(&p, &band) &&
              read_emissivity(&p, 0, frame);
    if (ok) {
        frame->signal_kind = GB_TERM_RADIANCE;
        frame->radiance_scale = strcmp(call->signal, "exitance") == 0 ? 1.0 / GB_PI : 1.0;
        measure(&band, &nothing_else, frame);
    }
    gb_params_end(&p);
    return ok;
}

bool gb_convert_frame_brightness(gb_frame_call *call, gb_problem *problem)
{
    static const char *const fields[] = {"wavelength",   "wavenumber", "frequency",
                                         "wavelength_unit", "emissivity", "temperature_unit",
                                         NULL};
    gb_frame *frame = call->frame;
    gb_params p;
    gb_spectral spectral;
    gb_num position;
    gb_planck_position prepared;
    double core_position = 0.0;
    bool ok = gb_params_begin(&p, call->query, true, call->config->max_array, fields, problem) &&
              gb_params_temperature_unit(&p, &frame->unit) &&
              gb_spectral_read(&p, &spectral, &position) && read_emissivity(&p, 0, frame);
    if (ok) {
        gb_status status = gb_spectral_to_core(&spectral, position.scalar, &core_position);
        if (status == GB_OK) {
            status = gb_planck_prepare(spectral.coordinate, core_position, &prepared);
        }
        ok = status == GB_OK || gb_params_fail_status(&p, status, spectral.field);
    }
    if (ok) {
        frame->signal_kind = GB_TERM_RADIANCE;
        frame->radiance_scale = gb_spectral_density_in(&spectral, 1.0);
        (void)gb_frame_brightness_temperature(&prepared, frame);
    }
    gb_params_end(&p);
    return ok;
}

bool gb_convert_frame_calibration_apply(gb_frame_call *call, gb_problem *problem)
{
    static const char *const fields[] = {"calibration", "temperature_unit", NULL};
    gb_frame *frame = call->frame;
    gb_params p, inner;
    gb_calibration calibration;
    json_t *owned = NULL;
    memset(&inner, 0, sizeof inner);
    if (frame->emissivity_map != NULL) {
        gb_problem_set(problem, GB_PROBLEM_UNKNOWN_FIELD, "emissivity",
                       "A calibration gives blackbody-equivalent temperatures and takes no "
                       "emissivity map; correct them with /v1/corrected-temperature.");
        return false;
    }
    if (json_object_get(call->query, "u_signal") != NULL) {
        gb_problem_set(problem, GB_PROBLEM_UNKNOWN_FIELD, "u_signal",
                       "A frame carries no per-pixel uncertainty: send u_signal with the JSON "
                       "or CSV form, which return u_temperature.");
        return false;
    }
    bool ok = gb_params_begin(&p, call->query, true, call->config->max_array, fields, problem) &&
              gb_params_temperature_unit(&p, &frame->unit) &&
              gb_read_calibration(&p, &inner, call->config->max_array, &owned, &calibration);
    if (ok) {
        /* gb_read_calibration checked the calibration: the statuses say it all. */
        (void)gb_frame_calibration_apply(&calibration, frame);
    }
    gb_params_end(&inner);
    gb_params_end(&p);
    json_decref(owned);
    return ok;
}
