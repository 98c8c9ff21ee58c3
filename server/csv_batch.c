#include "csv_batch.h"

#include <ctype.h>
#include <jansson.h>
#include <stdatomic.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "csv.h"
#include "handlers.h"
#include "params.h"
#include "problem.h"

#define MAX_RESULTS 4

/* An endpoint that takes CSV batches, and the members of its JSON answer that become columns. */
typedef struct csv_endpoint {
    gb_handler handler;
    const char *results[MAX_RESULTS + 1];
} csv_endpoint;

static const csv_endpoint endpoints[] = {
    {gb_handle_corrected_temperature, {"temperature", NULL}},
    {gb_handle_sensitivity,
     {"temperature", "combined_standard_uncertainty", "expanded_uncertainty", NULL}},
    {gb_handle_calibration_apply, {"temperature", "u_temperature", NULL}},
};

static const csv_endpoint *endpoint_for(const gb_route *route)
{
    for (size_t i = 0; route != NULL && i < sizeof endpoints / sizeof endpoints[0]; i++) {
        if (route->handler == endpoints[i].handler) {
            return &endpoints[i];
        }
    }
    return NULL;
}

/*
 * "text/csv", any case, parameters after ';'.  A charset, when named, must be
 * UTF-8 or its subset US-ASCII: the cells become JSON strings.
 */
static bool is_csv_media_type(const char *value)
{
    char lower[160];
    size_t n = 0;
    const char *charset;
    if (value == NULL) {
        return false;
    }
    for (; *value != '\0' && n + 1 < sizeof lower; value++) {
        if (*value != ' ' && *value != '\t' && *value != '"') {
            lower[n++] = (char)tolower((unsigned char)*value);
        }
    }
    lower[n] = '\0';
    if (*value != '\0' || strncmp(lower, "text/csv", 8) != 0 ||
        (lower[8] != '\0' && lower[8] != ';')) {
        return false;
    }
    charset = strstr(lower, ";charset=");
    if (charset == NULL) {
        return true;
    }
    charset += strlen(";charset=");
    return strncmp(charset, "utf-8", 5) == 0 || strncmp(charset, "utf8", 4) == 0 ||
           strncmp(charset, "us-ascii", 8) == 0;
}

bool gb_csv_batch_accepts(const gb_route *route, const char *content_type)
{
    return endpoint_for(route) != NULL && is_csv_media_type(content_type);
}

static const char *text_or(const char *text, const char *fallback)
{
    return text != NULL ? text : fallback;
}

/* The problem document of a handler's answer, as a problem of ours. */
static void copy_problem(json_t *answer, gb_problem_kind kind, gb_problem *problem)
{
    const char *field = json_string_value(json_object_get(answer, "field"));
    const char *detail = json_string_value(json_object_get(answer, "detail"));
    gb_problem_set(problem, kind, field, "%s", text_or(detail, ""));
}

static json_t *answer_of(const gb_reply *reply)
{
    return reply->body != NULL ? json_loadb(reply->body, reply->length, 0, NULL) : NULL;
}

/* Runs the endpoint's JSON handler on one row (an object of strings, like a query). */
static json_t *run_row(gb_context *context, const csv_endpoint *endpoint, json_t *row,
                       gb_heavy_work *heavy, int *status)
{
    gb_call call = {&context->config, row, true, atomic_load(&context->draining), heavy};
    gb_reply reply;
    json_t *answer;
    gb_reply_init(&reply);
    endpoint->handler(&call, &reply);
    answer = answer_of(&reply);
    *status = reply.status;
    gb_reply_release(&reply);
    return answer;
}

/* Columns named "_..." (sample ids, instrument tags) are echoed and never read as inputs. */
static bool passes_through(const char *name)
{
    return name[0] == '_';
}

static bool read_table(const gb_context *context, const char *text, size_t length, gb_csv *csv,
                       gb_problem *problem)
{
    size_t max_rows = context->config.max_csv_rows;
    switch (gb_csv_parse(text, length, max_rows + 1, csv)) {
    case GB_CSV_OK: break;
    case GB_CSV_UNTERMINATED_QUOTE:
        gb_problem_set(problem, GB_PROBLEM_MALFORMED_CSV, NULL,
                       "The quoted field opened on line %zu is never closed.", csv->error_line);
        return false;
    case GB_CSV_TOO_MANY_RECORDS:
        gb_problem_set(problem, GB_PROBLEM_TOO_MANY_ROWS, NULL,
                       "More than %zu data rows; send the batch in parts.", max_rows);
        return false;
    default:
        gb_problem_set(problem, GB_PROBLEM_INTERNAL, NULL, "Out of memory reading the CSV.");
        return false;
    }
    if (csv->record_count == 0) {
        gb_problem_set(problem, GB_PROBLEM_MALFORMED_CSV, NULL,
                       "The body is empty: send a header row naming the inputs, then one row "
                       "per measurement.");
        return false;
    }
    return true;
}

/*
 * The header: names present, unique, not query parameters too, and known to
 * the endpoint -- asked of the handler itself with a probe row holding every
 * column, so the list of fields lives in one place.
 */
static bool check_header(gb_context *context, const csv_endpoint *endpoint, json_t *query,
                         const gb_csv *csv, gb_problem *problem)
{
    const gb_csv_record *header = &csv->records[0];
    json_t *probe, *answer;
    int status = 0;
    if (header->malformed) {
        gb_problem_set(problem, GB_PROBLEM_MALFORMED_CSV, NULL,
                       "The header row has a quote out of place at column %zu.", header->column);
        return false;
    }
    probe = json_copy(query);
    for (size_t j = 0; probe != NULL && j < header->field_count; j++) {
        const char *name = gb_csv_field(csv, 0, j);
        bool repeated = false;
        for (size_t k = 0; k < j && !repeated; k++) {
            repeated = strcmp(gb_csv_field(csv, 0, k), name) == 0;
        }
        if (name[0] == '\0') {
            gb_problem_set(problem, GB_PROBLEM_MALFORMED_CSV, NULL,
                           "Column %zu of the header has no name.", j + 1);
        } else if (repeated) {
            gb_problem_set(problem, GB_PROBLEM_MALFORMED_CSV, name,
                           "Column \"%s\" appears twice in the header.", name);
        } else if (passes_through(name)) {
            continue;
        } else if (json_object_get(query, name) != NULL) {
            gb_problem_set(problem, GB_PROBLEM_CONFLICTING_FIELDS, name,
                           "\"%s\" is both a column and a query parameter; give it once.", name);
        } else if (json_object_set_new(probe, name, json_string("")) != 0) {
            gb_problem_set(problem, GB_PROBLEM_MALFORMED_CSV, NULL,
                           "Column %zu of the header is not valid UTF-8.", j + 1);
        }
        if (gb_problem_is_set(problem)) {
            json_decref(probe);
            return false;
        }
    }
    if (probe == NULL) {
        gb_problem_set(problem, GB_PROBLEM_INTERNAL, NULL, "Out of memory.");
        return false;
    }
    if (json_object_size(probe) == json_object_size(query)) {
        json_decref(probe); /* no input column: nothing to ask */
        return true;
    }
    answer = run_row(context, endpoint, probe, NULL, &status);
    json_decref(probe);
    if (status >= 400 &&
        strcmp(text_or(json_string_value(json_object_get(answer, "code")), ""), "unknown_field") ==
            0) {
        copy_problem(answer, GB_PROBLEM_UNKNOWN_FIELD, problem);
    }
    json_decref(answer);
    return !gb_problem_is_set(problem);
}

static void write_number_cell(gb_jw *w, json_t *value)
{
    char text[40] = "";
    if (json_is_number(value)) {
        snprintf(text, sizeof text, "%.17g", json_number_value(value));
    }
    gb_csv_write_field(w, text, false);
}

/* "<code> (<field>): <detail>" of a problem document. */
static void write_error_cell(gb_jw *w, json_t *problem)
{
    char text[GB_PROBLEM_DETAIL_MAX + GB_PROBLEM_FIELD_MAX + 64];
    const char *code = json_string_value(json_object_get(problem, "code"));
    const char *field = json_string_value(json_object_get(problem, "field"));
    const char *detail = json_string_value(json_object_get(problem, "detail"));
    if (field != NULL) {
        snprintf(text, sizeof text, "%s (%s): %s", text_or(code, "internal_error"), field,
                 text_or(detail, ""));
    } else {
        snprintf(text, sizeof text, "%s: %s", text_or(code, "internal_error"),
                 text_or(detail, ""));
    }
    gb_csv_write_field(w, text, false);
}

/* A row that never reached the handler: empty results, then the reason. */
static void write_row_failure(gb_jw *w, const csv_endpoint *endpoint, const char *reason)
{
    char text[GB_PROBLEM_DETAIL_MAX + 32];
    for (size_t k = 0; endpoint->results[k] != NULL; k++) {
        gb_csv_write_field(w, "", false);
    }
    snprintf(text, sizeof text, "malformed_csv: %s", reason);
    gb_csv_write_field(w, text, false);
}

/* The row as an object of strings on top of the query parameters; NULL with a reason. */
static json_t *row_object(json_t *query, const gb_csv *csv, size_t i, char *reason,
                          size_t reason_size)
{
    const gb_csv_record *record = &csv->records[i];
    size_t columns = csv->records[0].field_count;
    json_t *row;
    if (record->malformed) {
        snprintf(reason, reason_size,
                 "line %zu, column %zu: a quote out of place (quote a field that holds commas, "
                 "quotes or line breaks, and double the quotes inside it).",
                 record->line, record->column);
        return NULL;
    }
    if (record->field_count != columns) {
        snprintf(reason, reason_size, "line %zu has %zu fields; the header has %zu.",
                 record->line, record->field_count, columns);
        return NULL;
    }
    row = json_copy(query);
    for (size_t j = 0; row != NULL && j < columns; j++) {
        const char *cell = gb_csv_field(csv, i, j);
        if (cell[0] != '\0' && !passes_through(gb_csv_field(csv, 0, j)) &&
            json_object_set_new(row, gb_csv_field(csv, 0, j), json_string(cell)) != 0) {
            snprintf(reason, reason_size, "line %zu, column %zu is not valid UTF-8.",
                     record->line, j + 1);
            json_decref(row);
            return NULL;
        }
    }
    if (row == NULL) {
        snprintf(reason, reason_size, "out of memory.");
    }
    return row;
}

static void answer_rows(gb_context *context, const csv_endpoint *endpoint, json_t *query,
                        const gb_csv *csv, gb_heavy_work *heavy, gb_reply *reply)
{
    size_t columns = csv->records[0].field_count;
    gb_jw w;
    gb_jw_init(&w, 256 + csv->record_count * (64 + columns * 16));
    for (size_t j = 0; j < columns; j++) {
        gb_csv_write_field(&w, gb_csv_field(csv, 0, j), j == 0);
    }
    for (size_t k = 0; endpoint->results[k] != NULL; k++) {
        gb_csv_write_field(&w, endpoint->results[k], false);
    }
    gb_csv_write_field(&w, "error", false);
    gb_csv_end_record(&w);
    for (size_t i = 1; i < csv->record_count && !w.failed; i++) {
        const gb_csv_record *record = &csv->records[i];
        char reason[GB_PROBLEM_DETAIL_MAX];
        json_t *row = row_object(query, csv, i, reason, sizeof reason);
        for (size_t j = 0; j < columns; j++) {
            gb_csv_write_field(&w, j < record->field_count ? gb_csv_field(csv, i, j) : "",
                               j == 0);
        }
        if (row == NULL) {
            write_row_failure(&w, endpoint, reason);
        } else {
            int status = 0;
            json_t *answer = run_row(context, endpoint, row, heavy, &status);
            for (size_t k = 0; endpoint->results[k] != NULL; k++) {
                write_number_cell(&w, status == 200 ? json_object_get(answer, endpoint->results[k])
                                                    : NULL);
            }
            if (status == 200) {
                gb_csv_write_field(&w, "", false);
            } else {
                write_error_cell(&w, answer);
            }
            json_decref(answer);
            json_decref(row);
        }
        gb_csv_end_record(&w);
    }
    if (w.failed) {
        gb_jw_free(&w);
        gb_reply_fail(reply, GB_PROBLEM_INTERNAL, NULL, "Out of memory writing the CSV answer.");
        return;
    }
    size_t length = 0;
    char *text = gb_jw_take(&w, &length);
    gb_reply_owned(reply, 200, GB_CONTENT_CSV, text, length);
}

void gb_csv_batch_serve(gb_context *context, struct MHD_Connection *connection,
                        const gb_route *route, char **body, size_t length, bool body_too_large,
                        gb_heavy_work *heavy, gb_reply *reply)
{
    gb_problem problem;
    const csv_endpoint *endpoint = endpoint_for(route);
    char *text = *body;
    json_t *query = NULL;
    gb_csv csv;
    *body = NULL; /* ours now */
    memset(&csv, 0, sizeof csv);
    gb_problem_clear(&problem);
    if (body_too_large) {
        gb_problem_set(&problem, GB_PROBLEM_BODY_TOO_LARGE, NULL,
                       "The request body is larger than %zu bytes.",
                       context->config.max_body_bytes);
    } else if (endpoint == NULL) {
        gb_problem_set(&problem, GB_PROBLEM_UNSUPPORTED_MEDIA_TYPE, NULL,
                       "This endpoint takes no CSV; send application/json.");
    } else if ((query = gb_params_from_query(connection, &problem)) != NULL &&
               read_table(context, text != NULL ? text : "", text != NULL ? length : 0, &csv,
                          &problem) &&
               check_header(context, endpoint, query, &csv, &problem)) {
        if (length > GB_LARGE_BODY_BYTES && !gb_heavy_work_enter(heavy)) {
            gb_heavy_work_refused(&problem, "large requests");
        } else {
            answer_rows(context, endpoint, query, &csv, heavy, reply);
        }
    }
    if (gb_problem_is_set(&problem)) {
        gb_reply_problem(reply, &problem);
    }
    gb_csv_free(&csv);
    json_decref(query);
    free(text);
}
