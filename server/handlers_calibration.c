/*
 * /v1/calibration/fit and /v1/calibration/apply: a radiation thermometer's
 * calibration against reference sources (core/calibration.h).
 *
 * The fit answers a `calibration` object -- {"model", "parameters",
 * "covariance", and "band" for the band model} -- that /v1/calibration/apply
 * takes back as it is: the band as the fit request gave it (a preset stays a
 * name), parameters by name (A_um, B_um_K, C or gain, offset), covariance as
 * {"parameters": [names], "matrix": [[...]]}.  Temperatures, temperature
 * uncertainties and residuals are in the request's temperature_unit; the
 * calibration itself is in kelvin terms (B in um K) and so does not depend on
 * the unit of the request that made it.
 */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "calibration.h"
#include "elementwise.h"
#include "handlers.h"
#include "handlers_calibration.h"
#include "units.h"

static const char *const model_names[] = {"sakuma-hattori", "band", NULL};
static const char *const parameter_names[2][GB_CALIBRATION_MAX_PARAMETERS + 1] = {
    {"A_um", "B_um_K", "C", NULL}, {"gain", "offset", NULL, NULL}};

static size_t parameter_count(gb_calibration_model model)
{
    return model == GB_CALIBRATION_BAND ? 2 : 3;
}

/* Prefixes the field of a problem recorded while reading a nested object ("band" -> "calibration.band"). */
static void prefix_field(gb_problem *problem, const char *prefix)
{
    char field[GB_PROBLEM_FIELD_MAX];
    if (problem->field[0] == '\0') {
        snprintf(problem->field, sizeof problem->field, "%s", prefix);
        return;
    }
    snprintf(field, sizeof field, "%s.%.*s", prefix, (int)(sizeof field / 2), problem->field);
    snprintf(problem->field, sizeof problem->field, "%s", field);
}

/* The first member of `object` whose name is not in `names` (NULL-terminated), or NULL. */
static const char *first_unknown_key(json_t *object, const char *const *names)
{
    const char *key;
    json_t *member;
    json_object_foreach(object, key, member) {
        size_t j = 0;
        while (names[j] != NULL && strcmp(key, names[j]) != 0) {
            j++;
        }
        if (names[j] == NULL) {
            return key;
        }
    }
    return NULL;
}

/* A JSON value copied into the writer as it is (numbers with 17 digits). */
static void write_json_value(gb_jw *w, json_t *value)
{
    const char *key;
    json_t *member;
    size_t index;
    switch (json_typeof(value)) {
    case JSON_OBJECT:
        gb_jw_object_begin(w);
        json_object_foreach(value, key, member) {
            gb_jw_key(w, key);
            write_json_value(w, member);
        }
        gb_jw_object_end(w);
        break;
    case JSON_ARRAY:
        gb_jw_array_begin(w);
        json_array_foreach(value, index, member) {
            write_json_value(w, member);
        }
        gb_jw_array_end(w);
        break;
    case JSON_STRING: gb_jw_string(w, json_string_value(value)); break;
    case JSON_INTEGER:
    case JSON_REAL: gb_jw_number(w, json_number_value(value)); break;
    case JSON_TRUE: gb_jw_bool(w, true); break;
    case JSON_FALSE: gb_jw_bool(w, false); break;
    default: gb_jw_null(w); break;
    }
}

static void write_parameters(gb_jw *w, const gb_calibration *c)
{
    gb_jw_object_begin(w);
    for (size_t j = 0; j < c->parameter_count; j++) {
        gb_jw_knumber(w, parameter_names[c->model][j], c->parameter[j]);
    }
    gb_jw_object_end(w);
}

static void write_covariance(gb_jw *w, const gb_calibration *c)
{
    gb_jw_object_begin(w);
    gb_jw_key(w, "parameters");
    gb_jw_array_begin(w);
    for (size_t j = 0; j < c->parameter_count; j++) {
        gb_jw_string(w, parameter_names[c->model][j]);
    }
    gb_jw_array_end(w);
    gb_jw_key(w, "matrix");
    gb_jw_array_begin(w);
    for (size_t j = 0; j < c->parameter_count; j++) {
        gb_jw_array_begin(w);
        for (size_t k = 0; k < c->parameter_count; k++) {
            gb_jw_number(w, c->covariance[j][k]);
        }
        gb_jw_array_end(w);
    }
    gb_jw_array_end(w);
    gb_jw_object_end(w);
}

/* --------------------------------------------------------------------- fit ---- */

typedef struct fit_request {
    gb_temperature_unit unit;
    gb_calibration_model model;
    gb_band band;
    bool band_given;
    gb_num emissivity;
    gb_calibration_point *points;
    size_t count;
} fit_request;

static const char *point_field(const gb_calibration_point *point, gb_status status)
{
    switch (status) {
    case GB_ERR_TEMPERATURE_DOMAIN: return "temperature";
    case GB_ERR_UNCERTAINTY_DOMAIN: return point->u_signal < 0.0 ? "u_signal" : "u_temperature";
    default: return "signal";
    }
}

/* One member of points[i]: a number, or absent (then `fallback`, unless required). */
static bool point_number(gb_params *p, json_t *point, size_t i, const char *name, bool required,
                         double fallback, double *out)
{
    json_t *value = json_object_get(point, name);
    char field[GB_PROBLEM_FIELD_MAX];
    snprintf(field, sizeof field, "points[%zu].%s", i, name);
    *out = fallback;
    if (value == NULL) {
        return !required || gb_params_fail(p, GB_PROBLEM_MISSING_FIELD, field,
                                           "\"%s\" is required in every point.", name);
    }
    if (!json_is_number(value)) {
        return gb_params_fail(p, GB_PROBLEM_WRONG_TYPE, field, "\"%s\" must be a number.",
                              field);
    }
    *out = json_number_value(value);
    return true;
}

static bool read_point(gb_params *p, const fit_request *r, json_t *value, size_t i,
                       gb_calibration_point *point)
{
    static const char *const keys[] = {"temperature", "signal", "u_temperature", "u_signal",
                                       NULL};
    char field[GB_PROBLEM_FIELD_MAX];
    double temperature, u_temperature;
    const char *unknown;
    gb_status status;
    if (!json_is_object(value)) {
        snprintf(field, sizeof field, "points[%zu]", i);
        return gb_params_fail(p, GB_PROBLEM_WRONG_TYPE, field,
                              "Each point must be an object {\"temperature\": ..., "
                              "\"signal\": ...}.");
    }
    unknown = first_unknown_key(value, keys);
    if (unknown != NULL) {
        snprintf(field, sizeof field, "points[%zu].%.40s", i, unknown);
        return gb_params_fail(p, GB_PROBLEM_UNKNOWN_FIELD, field,
                              "Unknown field \"%s\"; a point has temperature, signal, "
                              "u_temperature and u_signal.",
                              field);
    }
    if (!point_number(p, value, i, "temperature", true, 0.0, &temperature) ||
        !point_number(p, value, i, "signal", true, 0.0, &point->signal) ||
        !point_number(p, value, i, "u_temperature", false, 0.0, &u_temperature) ||
        !point_number(p, value, i, "u_signal", false, 0.0, &point->u_signal)) {
        return false;
    }
    status = gb_temperature_to_kelvin(temperature, r->unit, &point->temperature_k);
    if (status == GB_OK) {
        status = gb_temperature_difference_to_kelvin(u_temperature, r->unit,
                                                     &point->u_temperature_k);
    }
    if (status == GB_OK) {
        status = gb_calibration_check_point(r->model, point);
    }
    if (status != GB_OK) {
        snprintf(field, sizeof field, "points[%zu].%s", i, point_field(point, status));
        return gb_params_fail_status(p, status, field);
    }
    return true;
}

static bool read_points(gb_params *p, fit_request *r, size_t max_points)
{
    json_t *points = json_object_get(p->root, "points");
    size_t n;
    if (!gb_params_ok(p)) {
        return false;
    }
    if (points == NULL) {
        return gb_params_fail(p, GB_PROBLEM_MISSING_FIELD, "points",
                              "The field \"points\" is required: the calibration points.");
    }
    if (!json_is_array(points)) {
        return gb_params_fail(p, GB_PROBLEM_WRONG_TYPE, "points",
                              "\"points\" must be an array of {\"temperature\", \"signal\"} "
                              "objects.");
    }
    n = json_array_size(points);
    if (n == 0) {
        return gb_params_fail(p, GB_PROBLEM_EMPTY_ARRAY, "points", "\"points\" is empty.");
    }
    if (n > max_points) {
        return gb_params_fail(p, GB_PROBLEM_ARRAY_TOO_LONG, "points",
                              "\"points\" has %zu points; at most %zu are accepted.", n,
                              max_points);
    }
    r->points = calloc(n, sizeof *r->points);
    if (r->points == NULL) {
        return gb_params_fail(p, GB_PROBLEM_INTERNAL, NULL, "Out of memory.");
    }
    r->count = n;
    for (size_t i = 0; i < n; i++) {
        if (!read_point(p, r, json_array_get(points, i), i, &r->points[i])) {
            return false;
        }
    }
    return true;
}

static bool read_fit(gb_params *p, fit_request *r, size_t max_points)
{
    size_t model = 0;
    if (!gb_params_temperature_unit(p, &r->unit) ||
        !gb_params_choice(p, "model", model_names, GB_CALIBRATION_SAKUMA_HATTORI, &model) ||
        !gb_params_band(p, false, &r->band, &r->band_given) ||
        !gb_params_number(p, "source_emissivity", 0, 1.0, &r->emissivity)) {
        return false;
    }
    r->model = (gb_calibration_model)model;
    if (r->model == GB_CALIBRATION_SAKUMA_HATTORI && r->band_given) {
        return gb_params_fail(p, GB_PROBLEM_CONFLICTING_FIELDS, "band",
                              "\"band\" belongs to model \"band\"; the Sakuma-Hattori equation "
                              "has its own effective wavelength (A, B).");
    }
    if (!(r->emissivity.scalar > 0.0 && r->emissivity.scalar <= 1.0)) {
        return gb_params_fail_status(p, GB_ERR_EMISSIVITY_DOMAIN, "source_emissivity");
    }
    return read_points(p, r, max_points);
}

/* The fit's failure as a problem that says what is wrong with the points. */
static void fit_problem(gb_problem *problem, gb_status status, const fit_request *r)
{
    char detail[GB_PROBLEM_DETAIL_MAX];
    size_t p = parameter_count(r->model), cooler = 0, warmer = 0;
    const char *field = "points";
    detail[0] = '\0';
    switch (status) {
    case GB_ERR_CALIBRATION_TOO_FEW_POINTS:
        snprintf(detail, sizeof detail,
                 "Model \"%s\" has %zu parameters and needs at least %zu points (one degree of "
                 "freedom); %zu given.",
                 model_names[r->model], p, p + 1, r->count);
        break;
    case GB_ERR_CALIBRATION_DEGENERATE:
        snprintf(detail, sizeof detail,
                 "The points cannot determine model \"%s\": it needs at least %zu different "
                 "temperatures, spread over the range to be calibrated.",
                 model_names[r->model], p);
        break;
    case GB_ERR_CALIBRATION_NOT_MONOTONIC:
        gb_calibration_find_reversal(r->points, r->count, &cooler, &warmer);
        snprintf(detail, sizeof detail,
                 "The signal must rise with temperature, but points[%zu] is cooler than "
                 "points[%zu] and its signal is not lower.",
                 cooler, warmer);
        break;
    case GB_ERR_UNCERTAINTY_PARTIAL:
        snprintf(detail, sizeof detail,
                 "Give u_signal or u_temperature for every point (a weighted fit) or for none "
                 "(unweighted); a zero counts as not given.");
        break;
    case GB_ERR_CALIBRATION_NO_FIT:
        snprintf(detail, sizeof detail,
                 "No usable calibration fits these points (the fit did not converge, or it "
                 "cannot convert a point's own signal back). Check the points for a swapped or "
                 "mistyped value, or try the other model.");
        break;
    case GB_ERR_EMISSIVITY_DOMAIN: field = "source_emissivity"; break;
    default: field = "band"; break;
    }
    gb_problem_from_status(problem, status, field, detail[0] != '\0' ? detail : NULL);
}

static void write_fit(gb_jw *w, const fit_request *r, json_t *band_value,
                      const gb_calibration *c, const gb_fit_summary *summary,
                      const double *residual_k)
{
    double per_kelvin = 1.0;
    gb_temperature_difference_from_kelvin(1.0, r->unit, &per_kelvin);
    gb_jw_object_begin(w);
    gb_jw_kstring(w, "model", model_names[c->model]);
    gb_jw_key(w, "parameters");
    write_parameters(w, c);
    gb_jw_key(w, "parameter_uncertainties");
    gb_jw_object_begin(w);
    for (size_t j = 0; j < c->parameter_count; j++) {
        gb_jw_knumber(w, parameter_names[c->model][j], sqrt(c->covariance[j][j]));
    }
    gb_jw_object_end(w);
    gb_jw_key(w, "covariance");
    write_covariance(w, c);
    gb_jw_key(w, "residuals_temperature");
    gb_jw_array_begin(w);
    for (size_t i = 0; i < r->count; i++) {
        gb_jw_number(w, residual_k[i] * per_kelvin);
    }
    gb_jw_array_end(w);
    gb_jw_knumber(w, "rms_residual", summary->rms_residual_k * per_kelvin);
    gb_jw_kstring(w, "temperature_unit", gb_temperature_unit_symbol(r->unit));
    gb_jw_kinteger(w, "degrees_of_freedom", (long long)summary->degrees_of_freedom);
    gb_jw_knumber(w, "chi_squared", summary->chi_squared);
    gb_jw_key(w, "weighted");
    gb_jw_bool(w, summary->weighted != 0);
    gb_jw_knumber(w, "source_emissivity", r->emissivity.scalar);
    gb_jw_key(w, "calibration");
    gb_jw_object_begin(w);
    gb_jw_kstring(w, "model", model_names[c->model]);
    if (c->model == GB_CALIBRATION_BAND) {
        gb_jw_key(w, "band");
        if (band_value != NULL) {
            write_json_value(w, band_value);
        } else {
            gb_jw_object_begin(w);
            gb_jw_key(w, "wavelength");
            gb_jw_array_begin(w);
            gb_jw_number(w, r->band.lower);
            gb_jw_number(w, r->band.upper);
            gb_jw_array_end(w);
            gb_jw_object_end(w);
        }
    }
    gb_jw_key(w, "parameters");
    write_parameters(w, c);
    gb_jw_key(w, "covariance");
    write_covariance(w, c);
    gb_jw_object_end(w);
    gb_jw_object_end(w);
}

void gb_handle_calibration_fit(const gb_call *call, gb_reply *reply)
{
    static const char *const fields[] = {"points", "source_emissivity", "model", "band",
                                         "temperature_unit", NULL};
    gb_problem problem;
    gb_params p;
    fit_request r;
    gb_calibration calibration;
    gb_fit_summary summary;
    double *residual_k = NULL;
    size_t max_points = call->config->max_array < GB_CALIBRATION_MAX_POINTS
                            ? call->config->max_array
                            : GB_CALIBRATION_MAX_POINTS;
    gb_problem_clear(&problem);
    memset(&r, 0, sizeof r);
    if (gb_params_begin(&p, call->input, call->from_query, call->config->max_array, fields,
                        &problem) &&
        read_fit(&p, &r, max_points)) {
        residual_k = calloc(r.count, sizeof *residual_k);
        if (residual_k == NULL) {
            gb_problem_set(&problem, GB_PROBLEM_INTERNAL, NULL, "Out of memory.");
        } else {
            gb_status status = gb_calibration_fit(r.model, &r.band, r.emissivity.scalar, r.points,
                                                  r.count, &calibration, &summary, residual_k);
            if (status != GB_OK) {
                fit_problem(&problem, status, &r);
            }
        }
    }
    if (gb_problem_is_set(&problem)) {
        gb_reply_problem(reply, &problem);
    } else {
        gb_jw w;
        gb_jw_init(&w, 2048 + r.count * 32);
        write_fit(&w, &r, r.band_given ? json_object_get(call->input, "band") : NULL,
                  &calibration, &summary, residual_k);
        gb_reply_json(reply, 200, &w);
    }
    free(residual_k);
    free(r.points);
    gb_params_end(&p);
}

/* ------------------------------------------------------------------- apply ---- */

typedef struct apply_request {
    gb_temperature_unit unit;
    gb_calibration calibration;
    gb_num signal, u_signal;
} apply_request;

/* calibration.parameters: exactly the model's names, numbers. */
static bool read_parameters(gb_params *inner, gb_calibration *c)
{
    json_t *value = json_object_get(inner->root, "parameters");
    const char *const *names = parameter_names[c->model];
    const char *unknown;
    json_t *member;
    char field[GB_PROBLEM_FIELD_MAX];
    if (value == NULL) {
        return gb_params_fail(inner, GB_PROBLEM_MISSING_FIELD, "parameters",
                              "\"calibration.parameters\" is required.");
    }
    if (!json_is_object(value)) {
        return gb_params_fail(inner, GB_PROBLEM_WRONG_TYPE, "parameters",
                              "\"calibration.parameters\" must be an object such as {\"%s\": "
                              "..., \"%s\": ...}.",
                              names[0], names[1]);
    }
    unknown = first_unknown_key(value, names);
    if (unknown != NULL) {
        snprintf(field, sizeof field, "parameters.%.40s", unknown);
        return gb_params_fail(inner, GB_PROBLEM_UNKNOWN_FIELD, field,
                              "\"%s\" is not a parameter of model \"%s\".", unknown,
                              model_names[c->model]);
    }
    for (size_t j = 0; j < c->parameter_count; j++) {
        member = json_object_get(value, names[j]);
        snprintf(field, sizeof field, "parameters.%s", names[j]);
        if (member == NULL) {
            return gb_params_fail(inner, GB_PROBLEM_MISSING_FIELD, field,
                                  "Model \"%s\" needs the parameter \"%s\".",
                                  model_names[c->model], names[j]);
        }
        if (!json_is_number(member)) {
            return gb_params_fail(inner, GB_PROBLEM_WRONG_TYPE, field, "\"%s\" must be a number.",
                                  names[j]);
        }
        c->parameter[j] = json_number_value(member);
    }
    return true;
}

/* calibration.covariance (optional: absent means exact parameters). */
static bool read_covariance(gb_params *inner, gb_calibration *c)
{
    json_t *value = json_object_get(inner->root, "covariance");
    json_t *names, *matrix;
    size_t n = c->parameter_count;
    if (value == NULL) {
        return true;
    }
    names = json_object_get(value, "parameters");
    matrix = json_object_get(value, "matrix");
    if (!json_is_object(value) || !json_is_array(matrix) || json_array_size(matrix) != n ||
        json_object_size(value) != (names != NULL ? 2u : 1u)) {
        return gb_params_fail(inner, GB_PROBLEM_WRONG_TYPE, "covariance",
                              "\"calibration.covariance\" must be {\"parameters\": [names], "
                              "\"matrix\": [[...]]}, %zu x %zu, as /v1/calibration/fit gives it.",
                              n, n);
    }
    if (names != NULL) {
        bool same = json_is_array(names) && json_array_size(names) == n;
        for (size_t j = 0; same && j < n; j++) {
            const char *name = json_string_value(json_array_get(names, j));
            same = name != NULL && strcmp(name, parameter_names[c->model][j]) == 0;
        }
        if (!same) {
            return gb_params_fail(inner, GB_PROBLEM_WRONG_TYPE, "covariance.parameters",
                                  "The covariance of model \"%s\" is in the order %s, %s%s%s.",
                                  model_names[c->model], parameter_names[c->model][0],
                                  parameter_names[c->model][1], n == 3 ? ", " : "",
                                  n == 3 ? parameter_names[c->model][2] : "");
        }
    }
    for (size_t j = 0; j < n; j++) {
        json_t *row = json_array_get(matrix, j);
        if (!json_is_array(row) || json_array_size(row) != n) {
            return gb_params_fail(inner, GB_PROBLEM_WRONG_TYPE, "covariance.matrix",
                                  "Row %zu of the covariance matrix must hold %zu numbers.", j,
                                  n);
        }
        for (size_t k = 0; k < n; k++) {
            json_t *cell = json_array_get(row, k);
            if (!json_is_number(cell)) {
                return gb_params_fail(inner, GB_PROBLEM_WRONG_TYPE, "covariance.matrix",
                                      "Row %zu of the covariance matrix must hold numbers.", j);
            }
            c->covariance[j][k] = json_number_value(cell);
        }
    }
    return true;
}

static const char *calibration_field(gb_status status)
{
    switch (status) {
    case GB_ERR_UNCERTAINTY_DOMAIN: return "calibration.covariance";
    case GB_ERR_INVALID_ARGUMENT:
    case GB_ERR_NOT_FINITE: return "calibration.parameters";
    default: return "calibration.band";
    }
}

/* The calibration object (in a query or CSV row: its JSON text); handlers_calibration.h. */
bool gb_read_calibration(gb_params *p, gb_params *inner, size_t max_array, json_t **owned,
                         gb_calibration *c)
{
    static const char *const fields[] = {"model", "parameters", "covariance", "band", NULL};
    json_t *value = json_object_get(p->root, "calibration");
    size_t model = 0;
    bool band_given = false;
    gb_status status;
    memset(c, 0, sizeof *c);
    memset(inner, 0, sizeof *inner);
    if (!gb_params_ok(p)) {
        return false;
    }
    if (value == NULL) {
        return gb_params_fail(p, GB_PROBLEM_MISSING_FIELD, "calibration",
                              "The field \"calibration\" is required: the \"calibration\" "
                              "object of a /v1/calibration/fit answer.");
    }
    if (p->from_query && json_is_string(value)) {
        const char *text = json_string_value(value);
        *owned = gb_params_parse_body(text, strlen(text), p->problem);
        if (*owned == NULL) {
            prefix_field(p->problem, "calibration");
            return false;
        }
        value = *owned;
    }
    if (!json_is_object(value)) {
        return gb_params_fail(p, GB_PROBLEM_WRONG_TYPE, "calibration",
                              "\"calibration\" must be the object a /v1/calibration/fit answer "
                              "holds under \"calibration\".");
    }
    if (!gb_params_begin(inner, value, false, max_array, fields, p->problem) ||
        !gb_params_choice(inner, "model", model_names, (size_t)-1, &model)) {
        prefix_field(p->problem, "calibration");
        return false;
    }
    if (model == (size_t)-1) {
        return gb_params_fail(p, GB_PROBLEM_MISSING_FIELD, "calibration.model",
                              "\"calibration.model\" is required: \"sakuma-hattori\" or "
                              "\"band\".");
    }
    c->model = (gb_calibration_model)model;
    c->parameter_count = parameter_count(c->model);
    if (!gb_params_band(inner, false, &c->band, &band_given) || !read_parameters(inner, c) ||
        !read_covariance(inner, c)) {
        prefix_field(p->problem, "calibration");
        return false;
    }
    if (c->model == GB_CALIBRATION_SAKUMA_HATTORI && band_given) {
        return gb_params_fail(p, GB_PROBLEM_CONFLICTING_FIELDS, "calibration.band",
                              "A Sakuma-Hattori calibration has no band.");
    }
    status = gb_calibration_check(c);
    if (status != GB_OK) {
        char detail[GB_PROBLEM_DETAIL_MAX];
        snprintf(detail, sizeof detail, "%s",
                 status == GB_ERR_UNCERTAINTY_DOMAIN
                     ? "The covariance matrix must be symmetric with variances >= 0 and "
                       "correlations within [-1, 1] (positive semi-definite)."
                 : status == GB_ERR_INVALID_ARGUMENT
                     ? "The parameters are outside the model's domain: A_um and C must be "
                       "positive (sakuma-hattori), gain must be positive (band)."
                     : gb_status_text(status));
        gb_problem_from_status(p->problem, status, calibration_field(status), detail);
        return false;
    }
    return true;
}

/* in: signal, u_signal; out: temperature, u_temperature (request's unit). */
static gb_status apply_element(const void *context, const double *in, double *out,
                               const char **field)
{
    const apply_request *r = context;
    double kelvin, u_kelvin;
    gb_status status = gb_calibration_apply(&r->calibration, in[0], in[1], &kelvin, &u_kelvin);
    if (status == GB_OK) {
        status = gb_temperature_from_kelvin(kelvin, r->unit, &out[0]);
    }
    if (status == GB_OK) {
        status = gb_temperature_difference_from_kelvin(u_kelvin, r->unit, &out[1]);
    }
    if (status == GB_ERR_UNCERTAINTY_DOMAIN) {
        *field = "u_signal";
    }
    return status;
}

static const char *apply_field(const void *context, gb_status status)
{
    (void)context;
    return status == GB_ERR_UNCERTAINTY_DOMAIN ? "u_signal" : "signal";
}

void gb_handle_calibration_apply(const gb_call *call, gb_reply *reply)
{
    static const char *const fields[] = {"signal", "u_signal", "calibration", "temperature_unit",
                                         NULL};
    gb_problem problem;
    gb_params p, inner;
    apply_request r;
    json_t *owned = NULL;
    gb_elementwise batch = {0};
    gb_problem_clear(&problem);
    memset(&r, 0, sizeof r);
    memset(&inner, 0, sizeof inner);
    bool ok = gb_params_begin(&p, call->input, call->from_query, call->config->max_array, fields,
                              &problem) &&
              gb_params_temperature_unit(&p, &r.unit) &&
              gb_params_number(&p, "signal", GB_REQUIRED | GB_ARRAY_OK, 0.0, &r.signal) &&
              gb_params_number(&p, "u_signal", GB_ARRAY_OK, 0.0, &r.u_signal) &&
              gb_read_calibration(&p, &inner, call->config->max_array, &owned, &r.calibration);
    batch.inputs[0] = &r.signal;
    batch.inputs[1] = &r.u_signal;
    batch.input_count = 2;
    ok = ok && gb_params_broadcast(&p, batch.inputs, 2, &batch.count, &batch.is_array);
    if (!ok) {
        gb_reply_problem(reply, &problem);
    } else {
        const char *unit = gb_temperature_unit_symbol(r.unit);
        batch.outputs[0] = (gb_output){"temperature", "temperature_unit", unit, false};
        batch.outputs[1] = (gb_output){"u_temperature", NULL, NULL, false};
        batch.output_count = 2;
        batch.extras[0][0] = "model";
        batch.extras[0][1] = model_names[r.calibration.model];
        batch.extra_count = 1;
        batch.element = apply_element;
        batch.field_for = apply_field;
        batch.context = &r;
        gb_elementwise_reply(&batch, reply);
    }
    gb_params_end(&inner);
    gb_params_end(&p);
    json_decref(owned);
}
