#include "params.h"

#include <ctype.h>
#include <errno.h>
#include <math.h>
#include <microhttpd.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <strings.h>

#include "config.h"
#include "presets.h"

/* ---------------------------------------------------------------- body ---- */

/*
 * A structural scan of JSON text (no values decoded): finds the nesting depth
 * and, when `stop` is inside the text, the path of object keys leading to that
 * position ("band.wavelength"), which names the field of a parse error such as
 * a number overflowing to infinity.  Returns false when the depth exceeds
 * `max_depth` (at most GB_CONFIG_MAX_DEPTH_CEILING) before `stop`.
 */
typedef struct scan_level {
    bool object;
    bool expecting_key;
    char key[48];
} scan_level;

static bool scan_json(const char *text, size_t length, size_t stop, int max_depth, char *path,
                      size_t path_size)
{
    scan_level levels[GB_CONFIG_MAX_DEPTH_CEILING + 1];
    if (max_depth > GB_CONFIG_MAX_DEPTH_CEILING) {
        max_depth = GB_CONFIG_MAX_DEPTH_CEILING;
    }
    int depth = 0;
    bool in_string = false;
    bool escaped = false;
    size_t string_start = 0;
    if (stop > length) {
        stop = length;
    }
    for (size_t i = 0; i < stop; i++) {
        char ch = text[i];
        if (in_string) {
            if (escaped) {
                escaped = false;
            } else if (ch == '\\') {
                escaped = true;
            } else if (ch == '"') {
                in_string = false;
                if (depth > 0 && levels[depth - 1].object && levels[depth - 1].expecting_key) {
                    scan_level *level = &levels[depth - 1];
                    size_t n = i - string_start;
                    if (n >= sizeof level->key) {
                        n = sizeof level->key - 1;
                    }
                    memcpy(level->key, text + string_start, n);
                    level->key[n] = '\0';
                    level->expecting_key = false;
                }
            }
            continue;
        }
        switch (ch) {
        case '"':
            in_string = true;
            string_start = i + 1;
            break;
        case '{':
        case '[':
            if (depth >= max_depth) {
                return false;
            }
            levels[depth].object = ch == '{';
            levels[depth].expecting_key = ch == '{';
            levels[depth].key[0] = '\0';
            depth++;
            break;
        case '}':
        case ']':
            if (depth > 0) {
                depth--;
            }
            break;
        case ',':
            if (depth > 0 && levels[depth - 1].object) {
                levels[depth - 1].expecting_key = true;
            }
            break;
        default:
            break;
        }
    }
    if (path != NULL && path_size > 0) {
        size_t used = 0;
        path[0] = '\0';
        for (int d = 0; d < depth; d++) {
            if (!levels[d].object || levels[d].key[0] == '\0') {
                continue;
            }
            int n = snprintf(path + used, path_size - used, "%s%s", used ? "." : "",
                             levels[d].key);
            if (n < 0 || (size_t)n >= path_size - used) {
                break;
            }
            used += (size_t)n;
        }
    }
    return true;
}

json_t *gb_params_parse_body(const char *body, size_t length, gb_problem *problem)
{
    return gb_params_parse_body_within(body, length, GB_PARAMS_MAX_DEPTH, problem);
}

json_t *gb_params_parse_body_within(const char *body, size_t length, unsigned max_depth,
                                    gb_problem *problem)
{
    if (length == 0) {
        gb_problem_set(problem, GB_PROBLEM_MALFORMED_JSON, NULL,
                       "The request body is empty; send a JSON object.");
        return NULL;
    }
    if (!scan_json(body, length, length, (int)max_depth, NULL, 0)) {
        gb_problem_set(problem, GB_PROBLEM_MALFORMED_JSON, NULL,
                       "JSON nested deeper than %u levels.", max_depth);
        return NULL;
    }
    json_error_t error;
    /* DECODE_ANY: a scalar body is valid JSON, just not an object (not_an_object below). */
    json_t *root = json_loadb(
        body, length, JSON_REJECT_DUPLICATES | JSON_DECODE_INT_AS_REAL | JSON_DECODE_ANY, &error);
    if (root == NULL) {
        char path[GB_PROBLEM_FIELD_MAX];
        scan_json(body, length, (size_t)error.position, GB_CONFIG_MAX_DEPTH_CEILING, path,
                  sizeof path);
        switch (json_error_code(&error)) {
        case json_error_numeric_overflow:
            gb_problem_set(problem, GB_PROBLEM_NOT_FINITE, path[0] ? path : NULL,
                           "A number is too large for a double (line %d, column %d).",
                           error.line, error.column);
            break;
        case json_error_duplicate_key:
            gb_problem_set(problem, GB_PROBLEM_MALFORMED_JSON, path[0] ? path : NULL,
                           "A field is given twice (line %d, column %d).", error.line,
                           error.column);
            break;
        default:
            gb_problem_set(problem, GB_PROBLEM_MALFORMED_JSON, NULL, "%s (line %d, column %d).",
                           error.text, error.line, error.column);
            break;
        }
        return NULL;
    }
    if (!json_is_object(root)) {
        json_decref(root);
        gb_problem_set(problem, GB_PROBLEM_NOT_AN_OBJECT, NULL,
                       "The request body must be a JSON object.");
        return NULL;
    }
    return root;
}

/* --------------------------------------------------------------- query ---- */

typedef struct query_state {
    json_t *object;
    gb_problem *problem;
} query_state;

bool gb_params_query_put(json_t *object, const char *key, const char *value,
                         gb_problem *problem)
{
    if (key == NULL) {
        return true;
    }
    if (value == NULL) {
        gb_problem_set(problem, GB_PROBLEM_INVALID_QUERY, key,
                       "Query parameter \"%s\" has no value.", key);
        return false;
    }
    if (json_object_get(object, key) != NULL) {
        gb_problem_set(problem, GB_PROBLEM_INVALID_QUERY, key,
                       "Query parameter \"%s\" is given more than once.", key);
        return false;
    }
    json_t *text = json_string(value);
    if (text == NULL || json_object_set_new(object, key, text) != 0) {
        gb_problem_set(problem, GB_PROBLEM_INVALID_QUERY, NULL,
                       "A query parameter is not valid UTF-8.");
        return false;
    }
    return true;
}

static enum MHD_Result query_argument(void *cls, enum MHD_ValueKind kind, const char *key,
                                      const char *value)
{
    query_state *state = cls;
    (void)kind;
    return gb_params_query_put(state->object, key, value, state->problem) ? MHD_YES : MHD_NO;
}

json_t *gb_params_from_query(struct MHD_Connection *connection, gb_problem *problem)
{
    query_state state = {json_object(), problem};
    if (state.object == NULL) {
        gb_problem_set(problem, GB_PROBLEM_INTERNAL, NULL, "Out of memory.");
        return NULL;
    }
    MHD_get_connection_values(connection, MHD_GET_ARGUMENT_KIND, query_argument, &state);
    if (gb_problem_is_set(problem)) {
        json_decref(state.object);
        return NULL;
    }
    return state.object;
}

/* ------------------------------------------------------------- readers ---- */

bool gb_params_fail(gb_params *params, gb_problem_kind kind, const char *field,
                    const char *detail, ...)
{
    if (gb_problem_is_set(params->problem)) {
        return false;
    }
    char text[GB_PROBLEM_DETAIL_MAX];
    va_list args;
    va_start(args, detail);
    vsnprintf(text, sizeof text, detail, args);
    va_end(args);
    gb_problem_set(params->problem, kind, field, "%s", text);
    return false;
}

bool gb_params_fail_status(gb_params *params, gb_status status, const char *field)
{
    if (!gb_problem_is_set(params->problem)) {
        gb_problem_from_status(params->problem, status, field, NULL);
    }
    return false;
}

static void *allocate(gb_params *params, size_t count, size_t size)
{
    if (params->allocation_count >= GB_PARAMS_MAX_ALLOCATIONS || count == 0 ||
        count > ((size_t)-1) / size) {
        gb_params_fail(params, GB_PROBLEM_INTERNAL, NULL, "Too many allocations.");
        return NULL;
    }
    void *memory = malloc(count * size);
    if (memory == NULL) {
        gb_params_fail(params, GB_PROBLEM_INTERNAL, NULL, "Out of memory.");
        return NULL;
    }
    params->allocations[params->allocation_count++] = memory;
    return memory;
}

static bool name_in(const char *name, const char *const *list)
{
    for (size_t i = 0; list[i] != NULL; i++) {
        if (strcmp(name, list[i]) == 0) {
            return true;
        }
    }
    return false;
}

bool gb_params_begin(gb_params *params, json_t *root, bool from_query, size_t max_array,
                     const char *const *allowed, gb_problem *problem)
{
    memset(params, 0, sizeof *params);
    params->root = root;
    params->from_query = from_query;
    params->max_array = max_array;
    params->problem = problem;
    if (gb_problem_is_set(problem)) {
        return false;
    }
    bool band_allowed = name_in("band", allowed);
    const char *key;
    json_t *value;
    json_object_foreach(root, key, value)
    {
        if (name_in(key, allowed)) {
            continue;
        }
        if (from_query && band_allowed && strcmp(key, "band_wavenumber") == 0) {
            continue;
        }
        return gb_params_fail(params, GB_PROBLEM_UNKNOWN_FIELD, key,
                              "Unknown field \"%s\"; see /openapi.json for this endpoint's "
                              "fields.",
                              key);
    }
    return true;
}

void gb_params_end(gb_params *params)
{
    for (size_t i = 0; i < params->allocation_count; i++) {
        free(params->allocations[i]);
    }
    params->allocation_count = 0;
}

bool gb_params_ok(const gb_params *params)
{
    return !gb_problem_is_set(params->problem);
}

bool gb_params_has(const gb_params *params, const char *name)
{
    return json_object_get(params->root, name) != NULL;
}

bool gb_params_one_of(gb_params *params, const char *const *names, bool required, size_t *which)
{
    if (!gb_params_ok(params)) {
        return false;
    }
    size_t found = (size_t)-1;
    for (size_t i = 0; names[i] != NULL; i++) {
        if (!gb_params_has(params, names[i])) {
            continue;
        }
        if (found != (size_t)-1) {
            return gb_params_fail(params, GB_PROBLEM_CONFLICTING_FIELDS, names[i],
                                  "Give only one of \"%s\" and \"%s\".", names[found], names[i]);
        }
        found = i;
    }
    if (found == (size_t)-1 && required) {
        char list[GB_PROBLEM_DETAIL_MAX / 2] = "";
        size_t used = 0;
        for (size_t i = 0; names[i] != NULL; i++) {
            int n = snprintf(list + used, sizeof list - used, "%s\"%s\"",
                             i == 0 ? "" : (names[i + 1] == NULL ? " or " : ", "), names[i]);
            if (n < 0 || (size_t)n >= sizeof list - used) {
                break;
            }
            used += (size_t)n;
        }
        if (names[0] != NULL && names[1] == NULL) {
            return gb_params_fail(params, GB_PROBLEM_MISSING_FIELD, names[0],
                                  "The field %s is required.", list);
        }
        return gb_params_fail(params, GB_PROBLEM_MISSING_FIELD, names[0],
                              "One of %s is required.", list);
    }
    *which = found;
    return true;
}

/* Parses one number of a query string: 0 ok, 1 not a number, 2 not finite. */
static int parse_text_number(const char *text, double *out)
{
    const char *p = text;
    if (*p == '+' || *p == '-') {
        p++;
    }
    if (strcasecmp(p, "nan") == 0 || strcasecmp(p, "inf") == 0 ||
        strcasecmp(p, "infinity") == 0) {
        return 2;
    }
    size_t digits = 0;
    while (isdigit((unsigned char)*p)) {
        p++;
        digits++;
    }
    if (*p == '.') {
        p++;
        while (isdigit((unsigned char)*p)) {
            p++;
            digits++;
        }
    }
    if (digits == 0) {
        return 1;
    }
    if (*p == 'e' || *p == 'E') {
        p++;
        if (*p == '+' || *p == '-') {
            p++;
        }
        if (!isdigit((unsigned char)*p)) {
            return 1;
        }
        while (isdigit((unsigned char)*p)) {
            p++;
        }
    }
    if (*p != '\0') {
        return 1;
    }
    errno = 0;
    double value = strtod(text, NULL);
    if (!isfinite(value)) {
        return 2;
    }
    *out = value; /* an underflow to 0 is accepted, as jansson does for bodies */
    return 0;
}

/* A query value as a number, naming `field` in any problem. */
static bool query_number(gb_params *params, const char *field, const char *text, double *out)
{
    switch (parse_text_number(text, out)) {
    case 0:
        return true;
    case 2:
        return gb_params_fail(params, GB_PROBLEM_NOT_FINITE, field,
                              "\"%s\" must be a finite number.", field);
    default:
        if (strchr(text, ',') != NULL) {
            return gb_params_fail(params, GB_PROBLEM_INVALID_QUERY, field,
                                  "\"%s\" must be a single number in a query string (send "
                                  "arrays in a JSON body with POST).",
                                  field);
        }
        return gb_params_fail(params, GB_PROBLEM_INVALID_QUERY, field,
                              "\"%s\" must be a number.", field);
    }
}

/* Reads a JSON array of numbers into memory owned by params. */
static bool json_number_array(gb_params *params, const char *field, json_t *array,
                              double **values, size_t *count)
{
    size_t n = json_array_size(array);
    if (n == 0) {
        return gb_params_fail(params, GB_PROBLEM_EMPTY_ARRAY, field,
                              "\"%s\" is an empty array.", field);
    }
    if (n > params->max_array) {
        return gb_params_fail(params, GB_PROBLEM_ARRAY_TOO_LONG, field,
                              "\"%s\" has %zu elements; at most %zu are accepted.", field, n,
                              params->max_array);
    }
    double *out = allocate(params, n, sizeof *out);
    if (out == NULL) {
        return false;
    }
    for (size_t i = 0; i < n; i++) {
        json_t *element = json_array_get(array, i);
        if (!json_is_number(element)) {
            return gb_params_fail(params, GB_PROBLEM_WRONG_TYPE, field,
                                  "Element %zu of \"%s\" is not a number.", i, field);
        }
        out[i] = json_number_value(element);
        if (!isfinite(out[i])) {
            return gb_params_fail(params, GB_PROBLEM_NOT_FINITE, field,
                                  "Element %zu of \"%s\" is not finite.", i, field);
        }
    }
    *values = out;
    *count = n;
    return true;
}

bool gb_params_number(gb_params *params, const char *name, unsigned flags, double fallback,
                      gb_num *out)
{
    memset(out, 0, sizeof *out);
    out->name = name;
    out->count = 1;
    out->scalar = fallback;
    if (!gb_params_ok(params)) {
        return false;
    }
    json_t *value = json_object_get(params->root, name);
    if (value == NULL) {
        if (flags & GB_REQUIRED) {
            return gb_params_fail(params, GB_PROBLEM_MISSING_FIELD, name,
                                  "The field \"%s\" is required.", name);
        }
        return true;
    }
    out->present = true;
    if (params->from_query && json_is_string(value)) {
        return query_number(params, name, json_string_value(value), &out->scalar);
    }
    if (json_is_number(value)) {
        out->scalar = json_number_value(value);
        if (!isfinite(out->scalar)) {
            return gb_params_fail(params, GB_PROBLEM_NOT_FINITE, name,
                                  "\"%s\" must be a finite number.", name);
        }
        return true;
    }
    if (json_is_array(value)) {
        if (!(flags & GB_ARRAY_OK)) {
            return gb_params_fail(params, GB_PROBLEM_WRONG_TYPE, name,
                                  "\"%s\" must be a single number here (arrays are not "
                                  "accepted).",
                                  name);
        }
        double *values = NULL;
        if (!json_number_array(params, name, value, &values, &out->count)) {
            return false;
        }
        out->values = values;
        out->is_array = true;
        return true;
    }
    return gb_params_fail(params, GB_PROBLEM_WRONG_TYPE, name,
                          (flags & GB_ARRAY_OK) ? "\"%s\" must be a number or an array of "
                                                  "numbers."
                                                : "\"%s\" must be a number.",
                          name);
}

/* Splits "a,b,c" into numbers (memory owned by params). */
static bool text_number_list(gb_params *params, const char *field, const char *text,
                             gb_problem_kind shape_problem, double **values, size_t *count)
{
    size_t n = 1;
    for (const char *p = text; *p; p++) {
        n += *p == ',';
    }
    if (n > params->max_array) {
        return gb_params_fail(params, GB_PROBLEM_ARRAY_TOO_LONG, field,
                              "\"%s\" has %zu elements; at most %zu are accepted.", field, n,
                              params->max_array);
    }
    double *out = allocate(params, n, sizeof *out);
    char *copy = allocate(params, strlen(text) + 1, 1);
    if (out == NULL || copy == NULL) {
        return false;
    }
    memcpy(copy, text, strlen(text) + 1);
    char *item = copy;
    for (size_t i = 0; i < n; i++) {
        char *comma = strchr(item, ',');
        if (comma != NULL) {
            *comma = '\0';
        }
        while (*item == ' ') {
            item++;
        }
        for (size_t end = strlen(item); end > 0 && item[end - 1] == ' '; end--) {
            item[end - 1] = '\0';
        }
        int parsed = parse_text_number(item, &out[i]);
        if (parsed == 2) {
            return gb_params_fail(params, GB_PROBLEM_NOT_FINITE, field,
                                  "Every number in \"%s\" must be finite.", field);
        }
        if (parsed != 0) {
            return gb_params_fail(params, shape_problem, field,
                                  "\"%s\" must be a comma-separated list of numbers.", field);
        }
        item = comma != NULL ? comma + 1 : item;
    }
    *values = out;
    *count = n;
    return true;
}

bool gb_params_number_list(gb_params *params, const char *name, const double *fallback,
                           size_t fallback_count, const double **values, size_t *count)
{
    *values = fallback;
    *count = fallback_count;
    if (!gb_params_ok(params)) {
        return false;
    }
    json_t *value = json_object_get(params->root, name);
    if (value == NULL) {
        return true;
    }
    double *list = NULL;
    bool ok;
    if (params->from_query && json_is_string(value)) {
        ok = text_number_list(params, name, json_string_value(value), GB_PROBLEM_INVALID_QUERY,
                              &list, count);
    } else if (json_is_array(value)) {
        ok = json_number_array(params, name, value, &list, count);
    } else if (json_is_number(value)) {
        /* a lone number is accepted as a list of one */
        double one = json_number_value(value);
        list = allocate(params, 1, sizeof *list);
        ok = list != NULL;
        if (ok) {
            list[0] = one;
            *count = 1;
        }
    } else {
        return gb_params_fail(params, GB_PROBLEM_WRONG_TYPE, name,
                              "\"%s\" must be an array of numbers.", name);
    }
    if (ok) {
        *values = list;
    }
    return ok;
}

static bool read_string(gb_params *params, const char *name, const char **text)
{
    json_t *value = json_object_get(params->root, name);
    *text = NULL;
    if (value == NULL) {
        return true;
    }
    if (!json_is_string(value)) {
        return gb_params_fail(params, GB_PROBLEM_WRONG_TYPE, name, "\"%s\" must be a string.",
                              name);
    }
    *text = json_string_value(value);
    return true;
}

bool gb_params_temperature_unit(gb_params *params, gb_temperature_unit *unit)
{
    const char *text = NULL;
    *unit = GB_KELVIN;
    if (!gb_params_ok(params) || !read_string(params, "temperature_unit", &text)) {
        return false;
    }
    if (text != NULL && gb_temperature_unit_parse(text, unit) != GB_OK) {
        return gb_params_fail(params, GB_PROBLEM_UNKNOWN_UNIT, "temperature_unit",
                              "Unknown temperature unit \"%.40s\"; use \"K\", \"C\" or \"F\".",
                              text);
    }
    return true;
}

bool gb_params_wavelength_unit(gb_params *params, gb_wavelength_unit *unit, bool *present)
{
    const char *text = NULL;
    *unit = GB_MICROMETRE;
    *present = false;
    if (!gb_params_ok(params) || !read_string(params, "wavelength_unit", &text)) {
        return false;
    }
    if (text != NULL) {
        *present = true;
        if (gb_wavelength_unit_parse(text, unit) != GB_OK) {
            return gb_params_fail(params, GB_PROBLEM_UNKNOWN_UNIT, "wavelength_unit",
                                  "Unknown wavelength unit \"%.40s\"; use \"um\", \"nm\" or "
                                  "\"m\".",
                                  text);
        }
    }
    return true;
}

bool gb_params_choice(gb_params *params, const char *name, const char *const *choices,
                      size_t fallback, size_t *index)
{
    const char *text = NULL;
    *index = fallback;
    if (!gb_params_ok(params) || !read_string(params, name, &text)) {
        return false;
    }
    if (text == NULL) {
        return true;
    }
    for (size_t i = 0; choices[i] != NULL; i++) {
        if (strcmp(text, choices[i]) == 0) {
            *index = i;
            return true;
        }
    }
    char list[128] = "";
    size_t used = 0;
    for (size_t i = 0; choices[i] != NULL; i++) {
        int n = snprintf(list + used, sizeof list - used, "%s\"%s\"", i ? " or " : "",
                         choices[i]);
        if (n < 0 || (size_t)n >= sizeof list - used) {
            break;
        }
        used += (size_t)n;
    }
    return gb_params_fail(params, GB_PROBLEM_WRONG_TYPE, name, "\"%s\" must be %s.", name, list);
}

/* ---------------------------------------------------------------- band ---- */

#define BAND_PRESET_PREFIX "preset:"

static void default_band(gb_band *band)
{
    memset(band, 0, sizeof *band);
    band->kind = GB_BAND_WAVELENGTH;
    band->lower = 8.0;
    band->upper = 14.0;
}

/* A band of the presets folder (presets.h); an unknown name -> invalid_band naming `field`. */
static bool band_from_preset(gb_params *params, const char *field, const char *name,
                             gb_band *band)
{
    if (gb_presets_find_band(name, band)) {
        return true;
    }
    return gb_params_fail(params, GB_PROBLEM_INVALID_BAND, field,
                          "Unknown band preset \"%.60s\" in \"%s\"; GET /v1/presets lists them.",
                          name, field);
}

static bool limits_from_text(gb_params *params, const char *field, const char *text,
                             gb_band_kind kind, gb_band *band)
{
    double *values = NULL;
    size_t count = 0;
    if (kind == GB_BAND_WAVELENGTH && strcmp(text, "total") == 0) {
        band->kind = GB_BAND_TOTAL;
        return true;
    }
    if (kind == GB_BAND_WAVELENGTH &&
        strncmp(text, BAND_PRESET_PREFIX, sizeof BAND_PRESET_PREFIX - 1) == 0) {
        return band_from_preset(params, field, text + sizeof BAND_PRESET_PREFIX - 1, band);
    }
    if (!text_number_list(params, field, text, GB_PROBLEM_INVALID_BAND, &values, &count)) {
        return false;
    }
    if (count != 2) {
        return gb_params_fail(params, GB_PROBLEM_INVALID_BAND, field,
                              "\"%s\" must be two limits, low and high, such as %s.", field,
                              kind == GB_BAND_WAVELENGTH ? "8,14" : "700,1250");
    }
    band->kind = kind;
    band->lower = values[0];
    band->upper = values[1];
    return true;
}

static bool limits_from_json(gb_params *params, const char *field, const char *member,
                             json_t *value, gb_band_kind kind, gb_band *band)
{
    if (!json_is_array(value) || json_array_size(value) != 2 ||
        !json_is_number(json_array_get(value, 0)) || !json_is_number(json_array_get(value, 1))) {
        return gb_params_fail(params, GB_PROBLEM_INVALID_BAND, field,
                              "\"%s.%s\" must be an array of two numbers, low and high.", field,
                              member);
    }
    band->kind = kind;
    band->lower = json_number_value(json_array_get(value, 0));
    band->upper = json_number_value(json_array_get(value, 1));
    return true;
}

static bool response_from_json(gb_params *params, const char *field, json_t *value,
                               gb_band *band)
{
    if (!json_is_object(value)) {
        return gb_params_fail(params, GB_PROBLEM_INVALID_BAND, field,
                              "\"%s.response\" must be an object "
                              "{\"wavelength\": [...], \"value\": [...]}.",
                              field);
    }
    const char *key;
    json_t *member;
    json_object_foreach(value, key, member)
    {
        if (strcmp(key, "wavelength") != 0 && strcmp(key, "value") != 0) {
            char unknown[GB_PROBLEM_FIELD_MAX];
            snprintf(unknown, sizeof unknown, "%.20s.response.%.60s", field, key);
            return gb_params_fail(params, GB_PROBLEM_UNKNOWN_FIELD, unknown,
                                  "Unknown field \"%s\".", unknown);
        }
    }
    json_t *wavelength = json_object_get(value, "wavelength");
    json_t *response = json_object_get(value, "value");
    if (!json_is_array(wavelength) || !json_is_array(response)) {
        return gb_params_fail(params, GB_PROBLEM_INVALID_BAND, field,
                              "\"%s.response\" needs arrays \"wavelength\" and \"value\".",
                              field);
    }
    if (json_array_size(wavelength) != json_array_size(response)) {
        return gb_params_fail(params, GB_PROBLEM_INVALID_BAND, field,
                              "\"%s.response.wavelength\" and \"%s.response.value\" must have "
                              "the same length.",
                              field, field);
    }
    char wavelength_field[GB_PROBLEM_FIELD_MAX], value_field[GB_PROBLEM_FIELD_MAX];
    snprintf(wavelength_field, sizeof wavelength_field, "%.20s.response.wavelength", field);
    snprintf(value_field, sizeof value_field, "%.20s.response.value", field);
    double *lambda = NULL;
    double *r = NULL;
    size_t n = 0;
    if (!json_number_array(params, wavelength_field, wavelength, &lambda, &n) ||
        !json_number_array(params, value_field, response, &r, &n)) {
        return false;
    }
    band->kind = GB_BAND_RESPONSE;
    band->response_wavelength_um = lambda;
    band->response_value = r;
    band->response_count = n;
    return true;
}

static bool band_from_json(gb_params *params, const char *field, json_t *value, gb_band *band)
{
    if (!json_is_object(value)) {
        return gb_params_fail(params, GB_PROBLEM_WRONG_TYPE, field,
                              "\"%s\" must be an object such as {\"wavelength\": [8, 14]} or "
                              "{\"preset\": \"midwave-3-5\"}.",
                              field);
    }
    static const char *const kinds[] = {"wavelength", "wavenumber", "response", "total",
                                        "preset", NULL};
    const char *chosen = NULL;
    const char *key;
    json_t *member;
    json_object_foreach(value, key, member)
    {
        if (!name_in(key, kinds)) {
            char unknown[GB_PROBLEM_FIELD_MAX];
            snprintf(unknown, sizeof unknown, "%.20s.%.60s", field, key);
            return gb_params_fail(params, GB_PROBLEM_UNKNOWN_FIELD, unknown,
                                  "Unknown field \"%s\"; a band is one of wavelength, "
                                  "wavenumber, response, total or preset.",
                                  unknown);
        }
        if (chosen != NULL) {
            return gb_params_fail(params, GB_PROBLEM_CONFLICTING_FIELDS, field,
                                  "A band is given by only one of \"%s\" and \"%s\".", chosen,
                                  key);
        }
        chosen = key;
    }
    if (chosen == NULL) {
        return gb_params_fail(params, GB_PROBLEM_INVALID_BAND, field,
                              "\"%s\" is empty; give wavelength, wavenumber, response, total or "
                              "preset.",
                              field);
    }
    member = json_object_get(value, chosen);
    if (strcmp(chosen, "wavelength") == 0) {
        return limits_from_json(params, field, chosen, member, GB_BAND_WAVELENGTH, band);
    }
    if (strcmp(chosen, "wavenumber") == 0) {
        return limits_from_json(params, field, chosen, member, GB_BAND_WAVENUMBER, band);
    }
    if (strcmp(chosen, "response") == 0) {
        return response_from_json(params, field, member, band);
    }
    if (strcmp(chosen, "preset") == 0) {
        if (!json_is_string(member)) {
            return gb_params_fail(params, GB_PROBLEM_INVALID_BAND, field,
                                  "\"%s.preset\" must be the name of a band preset.", field);
        }
        return band_from_preset(params, field, json_string_value(member), band);
    }
    if (!json_is_true(member)) {
        return gb_params_fail(params, GB_PROBLEM_INVALID_BAND, field,
                              "\"%s.total\" must be true.", field);
    }
    band->kind = GB_BAND_TOTAL;
    return true;
}

/* One band value (an object, or in query form the text of `kind`), checked by the core. */
static bool band_value(gb_params *params, const char *field, json_t *value, gb_band_kind kind,
                       gb_band *band)
{
    bool ok;
    memset(band, 0, sizeof *band);
    if (params->from_query) {
        ok = json_is_string(value) &&
             limits_from_text(params, field, json_string_value(value), kind, band);
    } else {
        ok = band_from_json(params, field, value, band);
    }
    if (!ok) {
        return false;
    }
    gb_status status = gb_band_validate(band);
    if (status != GB_OK) {
        return gb_params_fail_status(params, status, field);
    }
    return true;
}

bool gb_params_band_value(gb_params *params, const char *field, json_t *value, gb_band *band)
{
    if (!gb_params_ok(params)) {
        return false;
    }
    return band_value(params, field, value, GB_BAND_WAVELENGTH, band);
}

bool gb_params_is_band_status(gb_status status)
{
    switch (status) {
    case GB_ERR_BAND_LIMITS:
    case GB_ERR_BAND_REVERSED:
    case GB_ERR_RESPONSE_TOO_SHORT:
    case GB_ERR_RESPONSE_UNSORTED:
    case GB_ERR_RESPONSE_NEGATIVE:
    case GB_ERR_RESPONSE_ALL_ZERO: return true;
    default: return false;
    }
}

bool gb_params_band(gb_params *params, bool required, gb_band *band, bool *present)
{
    default_band(band);
    *present = false;
    if (!gb_params_ok(params)) {
        return false;
    }
    json_t *value = json_object_get(params->root, "band");
    json_t *wavenumber = params->from_query ? json_object_get(params->root, "band_wavenumber")
                                            : NULL;
    if (value != NULL && wavenumber != NULL) {
        return gb_params_fail(params, GB_PROBLEM_CONFLICTING_FIELDS, "band_wavenumber",
                              "Give only one of \"band\" and \"band_wavenumber\".");
    }
    if (value == NULL && wavenumber == NULL) {
        if (required) {
            return gb_params_fail(params, GB_PROBLEM_MISSING_FIELD, "band",
                                  "The field \"band\" is required.");
        }
        return true;
    }
    *present = true;
    if (value != NULL) {
        return band_value(params, "band", value, GB_BAND_WAVELENGTH, band);
    }
    return band_value(params, "band_wavenumber", wavenumber, GB_BAND_WAVENUMBER, band);
}

/* ----------------------------------------------------------- broadcast ---- */

bool gb_params_broadcast(gb_params *params, const gb_num *const *inputs, size_t input_count,
                         size_t *count, bool *is_array)
{
    *count = 1;
    *is_array = false;
    if (!gb_params_ok(params)) {
        return false;
    }
    const gb_num *first = NULL;
    for (size_t i = 0; i < input_count; i++) {
        const gb_num *num = inputs[i];
        if (num == NULL || !num->is_array) {
            continue;
        }
        *is_array = true;
        if (num->count == 1) {
            continue;
        }
        if (first == NULL) {
            first = num;
            *count = num->count;
        } else if (num->count != first->count) {
            return gb_params_fail(params, GB_PROBLEM_ARRAY_LENGTH_MISMATCH, num->name,
                                  "\"%s\" has %zu elements but \"%s\" has %zu; arrays must have "
                                  "equal lengths (or length 1).",
                                  num->name, num->count, first->name, first->count);
        }
    }
    return true;
}
