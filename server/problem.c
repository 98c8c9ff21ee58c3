#include "problem.h"

#include <stdarg.h>
#include <stdio.h>
#include <string.h>

#include "jsonw.h"

/* The core's statuses: HTTP status and title.  The code is gb_status_name(). */
static const struct {
    int http_status;
    const char *title;
} core_table[GB_STATUS_COUNT] = {
    [GB_OK] = {200, "OK"},
    [GB_ERR_NOT_FINITE] = {400, "Number is not finite"},
    [GB_ERR_INVALID_ARGUMENT] = {400, "Invalid argument"},
    [GB_ERR_TEMPERATURE_DOMAIN] = {422, "Temperature out of range"},
    [GB_ERR_SPECTRAL_DOMAIN] = {422, "Spectral position out of range"},
    [GB_ERR_RADIANCE_DOMAIN] = {422, "Radiance out of range"},
    [GB_ERR_EMISSIVITY_DOMAIN] = {422, "Emissivity out of range"},
    [GB_ERR_TRANSMITTANCE_DOMAIN] = {422, "Transmittance out of range"},
    [GB_ERR_UNCERTAINTY_DOMAIN] = {422, "Negative uncertainty"},
    [GB_ERR_BAND_LIMITS] = {422, "Band limit out of range"},
    [GB_ERR_BAND_REVERSED] = {422, "Band limits reversed"},
    [GB_ERR_RESPONSE_TOO_SHORT] = {422, "Spectral response too short"},
    [GB_ERR_RESPONSE_UNSORTED] = {422, "Spectral response not sorted"},
    [GB_ERR_RESPONSE_NEGATIVE] = {422, "Negative spectral response"},
    [GB_ERR_RESPONSE_ALL_ZERO] = {422, "Spectral response all zero"},
    [GB_ERR_RADIANCE_OUT_OF_RANGE] = {422, "Radiance unreachable"},
    [GB_ERR_NET_SIGNAL_NOT_POSITIVE] = {422, "Net surface signal not positive"},
    [GB_ERR_RESULT_OVERFLOW] = {422, "Result overflow"},
    [GB_ERR_NO_CONVERGENCE] = {500, "Solver did not converge"},
    [GB_ERR_EMISSIVITY_UNDETERMINED] = {422, "Emissivity cannot be determined"},
    [GB_ERR_RATIO_UNREACHABLE] = {422, "Signal ratio unreachable"},
    [GB_ERR_DRAW_COUNT] = {422, "Draw count out of range"},
    [GB_ERR_DISTRIBUTION_UNKNOWN] = {400, "Unknown distribution"},
    [GB_ERR_CALIBRATION_TOO_FEW_POINTS] = {422, "Too few calibration points"},
    [GB_ERR_CALIBRATION_DEGENERATE] = {422, "Calibration points cannot determine the model"},
    [GB_ERR_CALIBRATION_NOT_MONOTONIC] = {422, "Signal does not rise with temperature"},
    [GB_ERR_CALIBRATION_NO_FIT] = {422, "Calibration fit failed"},
    [GB_ERR_UNCERTAINTY_PARTIAL] = {422, "Uncertainties given for some points only"},
    [GB_ERR_SIGNAL_OUT_OF_RANGE] = {422, "Signal out of calibrated range"},
};

/* The server's own problems. */
static const struct {
    const char *code;
    int http_status;
    const char *title;
} server_table[GB_PROBLEM_KIND_COUNT] = {
    [GB_PROBLEM_MALFORMED_JSON] = {"malformed_json", 400, "Malformed JSON"},
    [GB_PROBLEM_NOT_AN_OBJECT] = {"not_an_object", 400, "Body is not a JSON object"},
    [GB_PROBLEM_WRONG_TYPE] = {"wrong_type", 400, "Wrong type"},
    [GB_PROBLEM_MISSING_FIELD] = {"missing_field", 400, "Missing field"},
    [GB_PROBLEM_CONFLICTING_FIELDS] = {"conflicting_fields", 400, "Conflicting fields"},
    [GB_PROBLEM_UNKNOWN_FIELD] = {"unknown_field", 400, "Unknown field"},
    [GB_PROBLEM_UNKNOWN_UNIT] = {"unknown_unit", 400, "Unknown unit"},
    [GB_PROBLEM_NOT_FINITE] = {"not_finite", 400, "Number is not finite"},
    [GB_PROBLEM_ARRAY_LENGTH_MISMATCH] = {"array_length_mismatch", 400, "Array lengths differ"},
    [GB_PROBLEM_EMPTY_ARRAY] = {"empty_array", 400, "Empty array"},
    [GB_PROBLEM_INVALID_QUERY] = {"invalid_query", 400, "Invalid query parameter"},
    [GB_PROBLEM_INVALID_BAND] = {"invalid_band", 400, "Invalid band"},
    [GB_PROBLEM_NOT_FOUND] = {"not_found", 404, "Not found"},
    [GB_PROBLEM_METHOD_NOT_ALLOWED] = {"method_not_allowed", 405, "Method not allowed"},
    [GB_PROBLEM_BODY_TOO_LARGE] = {"body_too_large", 413, "Body too large"},
    [GB_PROBLEM_ARRAY_TOO_LONG] = {"array_too_long", 413, "Array too long"},
    [GB_PROBLEM_UNSUPPORTED_MEDIA_TYPE] = {"unsupported_media_type", 415,
                                           "Unsupported media type"},
    [GB_PROBLEM_OVERLOADED] = {"overloaded", 503, "Server busy"},
    [GB_PROBLEM_OPENAPI_UNAVAILABLE] = {"openapi_unavailable", 503,
                                        "OpenAPI document not available"},
    [GB_PROBLEM_UNAUTHORIZED] = {"unauthorized", 401, "Authentication required"},
    [GB_PROBLEM_RESPONSE_TOO_LARGE] = {"response_too_large", 413, "Response too large"},
    [GB_PROBLEM_MALFORMED_CSV] = {"malformed_csv", 400, "Malformed CSV"},
    [GB_PROBLEM_TOO_MANY_ROWS] = {"too_many_rows", 413, "Too many rows"},
    [GB_PROBLEM_INTERNAL] = {"internal_error", 500, "Internal error"},
};

void gb_problem_clear(gb_problem *problem)
{
    memset(problem, 0, sizeof *problem);
}

bool gb_problem_is_set(const gb_problem *problem)
{
    return problem->http_status != 0;
}

static void set_field(gb_problem *problem, const char *field)
{
    if (field == NULL) {
        problem->field[0] = '\0';
    } else {
        snprintf(problem->field, sizeof problem->field, "%s", field);
    }
}

void gb_problem_set(gb_problem *problem, gb_problem_kind kind, const char *field,
                    const char *detail, ...)
{
    if ((unsigned)kind >= (unsigned)GB_PROBLEM_KIND_COUNT) {
        kind = GB_PROBLEM_INTERNAL;
    }
    problem->http_status = server_table[kind].http_status;
    problem->code = server_table[kind].code;
    problem->title = server_table[kind].title;
    problem->retry_after = kind == GB_PROBLEM_OVERLOADED ? 1 : 0;
    set_field(problem, field);
    if (detail == NULL) {
        snprintf(problem->detail, sizeof problem->detail, "%s.", problem->title);
    } else {
        va_list args;
        va_start(args, detail);
        vsnprintf(problem->detail, sizeof problem->detail, detail, args);
        va_end(args);
    }
}

int gb_problem_status_http(gb_status status)
{
    if ((unsigned)status >= (unsigned)GB_STATUS_COUNT || status == GB_OK) {
        return 500;
    }
    return core_table[status].http_status;
}

void gb_problem_from_status(gb_problem *problem, gb_status status, const char *field,
                            const char *detail)
{
    if ((unsigned)status >= (unsigned)GB_STATUS_COUNT || status == GB_OK) {
        gb_problem_set(problem, GB_PROBLEM_INTERNAL, field, "Unexpected core status %d.",
                       (int)status);
        return;
    }
    problem->http_status = core_table[status].http_status;
    problem->title = core_table[status].title;
    problem->code = gb_status_name(status);
    problem->retry_after = 0;
    set_field(problem, field);
    snprintf(problem->detail, sizeof problem->detail, "%s",
             detail != NULL ? detail : gb_status_text(status));
}

char *gb_problem_render(const gb_problem *problem, size_t *length)
{
    gb_jw w;
    gb_jw_init(&w, 512);
    gb_jw_object_begin(&w);
    gb_jw_key(&w, "type");
    {
        char type[160];
        snprintf(type, sizeof type, GB_PROBLEM_TYPE_BASE "%s", problem->code);
        gb_jw_string(&w, type);
    }
    gb_jw_kstring(&w, "title", problem->title);
    gb_jw_kinteger(&w, "status", problem->http_status);
    gb_jw_kstring(&w, "detail", problem->detail);
    gb_jw_kstring(&w, "code", problem->code);
    gb_jw_kstring(&w, "field", problem->field[0] ? problem->field : NULL);
    gb_jw_object_end(&w);
    return gb_jw_take(&w, length);
}
