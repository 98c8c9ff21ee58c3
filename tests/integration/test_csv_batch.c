/*
 * test_csv_batch.c — CSV batches over HTTP (server/csv_batch.h) against the
 * real build/greybodyd, started here with --max-csv-rows 4: the row bound,
 * and a whole lab round trip -- the README bench fitted through
 * /v1/calibration/fit, then its signals converted by /v1/calibration/apply as
 * a CSV batch (calibration as a query parameter, then as a column) -- every
 * cell read back and compared at full precision.
 *
 * Expected values: tests/reference/vectors/calibration_apply.tsv (mpmath at
 * 40 digits, tests/reference/calibration.py: the fitted calibration applied
 * exactly, u(T) by implicit differentiation with the fitted covariance), set
 * "readme_handheld_cavity" (invented data, the README's worked example).
 */
#include <curl/curl.h>
#include <jansson.h>
#include <math.h>
#include <stdbool.h>
#include <stddef.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <setjmp.h> /* cmocka needs these before its header */
#include <stdarg.h>
#include <cmocka.h>

#include "csv.h"
#include "greybodyd_suite.h"
#include "http_client.h"
#include "jsonw.h"
#include "vector_table.h"

#define MAX_CSV_ROWS "4"
#define SET "readme_handheld_cavity"
#define MAX_SIGNALS 16
/* tests/unit/test_calibration.c measures 2.2e-12 K and 8e-11 relative against the same values. */
#define TEMPERATURE_TOLERANCE_K 1e-9
#define UNCERTAINTY_TOLERANCE 1e-8

static greybodyd_suite suite;

static void exchange(const char *method, const char *path, const char *content_type,
                     const char *body, http_response *response)
{
    char url[16384], error[256], header[128];
    struct curl_slist *headers = NULL;
    snprintf(url, sizeof url, "%s%s", suite.server.base_url, path);
    if (content_type != NULL) {
        snprintf(header, sizeof header, "Content-Type: %s", content_type);
        headers = curl_slist_append(NULL, header);
    }
    bool exchanged = http_client_exchange(suite.client, url, method, headers, body,
                                          body != NULL ? strlen(body) : 0, NULL, response, error,
                                          sizeof error);
    curl_slist_free_all(headers);
    if (!exchanged) {
        fail_msg("%s %s: %s", method, path, error);
    }
}

static const char *body_of(const http_response *response)
{
    return response->body.data != NULL ? response->body.data : "";
}

/* ---- the row bound ------------------------------------------------------------ */

static void rows_beyond_the_bound_are_413(void **state)
{
    static const char four[] = "signal\r\n1\r\n2\r\n\r\n3\r\n4\r\n";
    static const char five[] = "signal\r\n1\r\n2\r\n3\r\n4\r\n5\r\n";
    http_response response;
    (void)state;
    /* Four data rows (the empty line is none) are within --max-csv-rows 4. */
    exchange("POST", "/v1/calibration/apply", "text/csv", four, &response);
    assert_int_equal(response.status, 200);
    http_response_free(&response);
    exchange("POST", "/v1/calibration/apply", "text/csv", five, &response);
    assert_int_equal(response.status, 413);
    assert_non_null(strstr(body_of(&response), "\"code\":\"too_many_rows\""));
    assert_non_null(strstr(body_of(&response), "More than 4 data rows"));
    http_response_free(&response);
}

/* ---- the README bench, fitted and applied -------------------------------------- */

static const char fit_body[] =
    "{\"source_emissivity\":0.995,\"temperature_unit\":\"C\",\"points\":["
    "{\"temperature\":50,\"signal\":1160,\"u_temperature\":0.15,\"u_signal\":3},"
    "{\"temperature\":100,\"signal\":2083,\"u_temperature\":0.15,\"u_signal\":3},"
    "{\"temperature\":150,\"signal\":3299,\"u_temperature\":0.2,\"u_signal\":3},"
    "{\"temperature\":200,\"signal\":4759,\"u_temperature\":0.2,\"u_signal\":3},"
    "{\"temperature\":300,\"signal\":8350,\"u_temperature\":0.3,\"u_signal\":3},"
    "{\"temperature\":500,\"signal\":17337,\"u_temperature\":0.5,\"u_signal\":3}]}";

/* The calibration object of the fit answer, as compact JSON text (malloc'd). */
static char *fitted_calibration(void)
{
    http_response response;
    json_t *answer;
    char *text;
    exchange("POST", "/v1/calibration/fit", "application/json", fit_body, &response);
    assert_int_equal(response.status, 200);
    answer = json_loads(body_of(&response), 0, NULL);
    assert_non_null(answer);
    text = json_dumps(json_object_get(answer, "calibration"), JSON_COMPACT |
                                                                  JSON_REAL_PRECISION(17));
    assert_non_null(text);
    json_decref(answer);
    http_response_free(&response);
    return text;
}

typedef struct expected_rows {
    size_t count;
    char signal[MAX_SIGNALS][40], u_signal[MAX_SIGNALS][40];
    double temperature_k[MAX_SIGNALS], u_temperature_k[MAX_SIGNALS];
} expected_rows;

static void load_expected(expected_rows *rows)
{
    vector_table *table = vector_table_load("calibration_apply.tsv");
    rows->count = 0;
    for (size_t i = 0; i < vector_table_rows(table); i++) {
        if (strcmp(vector_table_text(table, i, "set"), SET) != 0) {
            continue;
        }
        assert_true(rows->count < MAX_SIGNALS);
        snprintf(rows->signal[rows->count], sizeof rows->signal[0], "%s",
                 vector_table_text(table, i, "signal"));
        snprintf(rows->u_signal[rows->count], sizeof rows->u_signal[0], "%s",
                 vector_table_text(table, i, "u_signal"));
        rows->temperature_k[rows->count] = vector_table_number(table, i, "temperature_k");
        rows->u_temperature_k[rows->count] = vector_table_number(table, i, "u_temperature_k");
        rows->count++;
    }
    vector_table_free(table);
    assert_true(rows->count >= 4);
}

/* Column index of `name` in the header of `csv`. */
static size_t column_of(const gb_csv *csv, const char *name)
{
    for (size_t j = 0; j < csv->records[0].field_count; j++) {
        if (strcmp(gb_csv_field(csv, 0, j), name) == 0) {
            return j;
        }
    }
    fail_msg("no column %s in the answer", name);
    return 0;
}

/* Posts rows [first, first + count) of `rows` and checks every answer cell. */
static void check_batch(const expected_rows *rows, size_t first, size_t count, const char *path,
                        const char *calibration_column)
{
    gb_jw w;
    char *body;
    size_t length = 0;
    http_response response;
    gb_csv csv;
    gb_jw_init(&w, 1024);
    gb_csv_write_field(&w, "signal", true);
    gb_csv_write_field(&w, "u_signal", false);
    if (calibration_column != NULL) {
        gb_csv_write_field(&w, "calibration", false);
    }
    gb_csv_end_record(&w);
    for (size_t i = first; i < first + count; i++) {
        gb_csv_write_field(&w, rows->signal[i], true);
        gb_csv_write_field(&w, rows->u_signal[i], false);
        if (calibration_column != NULL) {
            gb_csv_write_field(&w, calibration_column, false);
        }
        gb_csv_end_record(&w);
    }
    body = gb_jw_take(&w, &length);
    exchange("POST", path, "text/csv", body, &response);
    free(body);
    assert_int_equal(response.status, 200);
    assert_int_equal(gb_csv_parse(body_of(&response), strlen(body_of(&response)), 100, &csv),
                     GB_CSV_OK);
    assert_int_equal(csv.record_count, count + 1);
    size_t t_column = column_of(&csv, "temperature"), u_column = column_of(&csv, "u_temperature");
    size_t error_column = column_of(&csv, "error");
    for (size_t r = 1; r <= count; r++) {
        size_t i = first + r - 1;
        double t = strtod(gb_csv_field(&csv, r, t_column), NULL);
        double u = strtod(gb_csv_field(&csv, r, u_column), NULL);
        assert_string_equal(gb_csv_field(&csv, r, 0), rows->signal[i]); /* echoed as sent */
        assert_string_equal(gb_csv_field(&csv, r, error_column), "");
        printf("  signal %s u %s: T %.15g K (mpmath %.15g), u(T) %.10g K (mpmath %.10g)\n",
               rows->signal[i], rows->u_signal[i], t, rows->temperature_k[i], u,
               rows->u_temperature_k[i]);
        assert_true(fabs(t - rows->temperature_k[i]) <= TEMPERATURE_TOLERANCE_K);
        assert_true(fabs(u / rows->u_temperature_k[i] - 1.0) <= UNCERTAINTY_TOLERANCE);
    }
    gb_csv_free(&csv);
    http_response_free(&response);
}

static void fitted_bench_applied_as_csv_matches_mpmath(void **state)
{
    expected_rows rows;
    char *calibration = fitted_calibration();
    char *escaped = curl_easy_escape(suite.client, calibration, 0);
    char path[16384];
    (void)state;
    load_expected(&rows);
    assert_non_null(escaped);
    snprintf(path, sizeof path, "/v1/calibration/apply?calibration=%s", escaped);
    /* The row bound is 4: the batch goes in parts, as a client must send it. */
    for (size_t first = 0; first < rows.count; first += 4) {
        size_t count = rows.count - first < 4 ? rows.count - first : 4;
        check_batch(&rows, first, count, path, NULL);
    }
    /* The calibration as a column: its JSON text quoted, quotes doubled, per row. */
    check_batch(&rows, 0, 3, "/v1/calibration/apply", calibration);
    curl_free(escaped);
    free(calibration);
}

/* ---- the whole run ---------------------------------------------------------------- */

static int start(void **state)
{
    static const char *const args[] = {"--max-csv-rows", MAX_CSV_ROWS, NULL};
    (void)state;
    return greybodyd_suite_start(&suite, "csv_batch", args);
}

static int stop(void **state)
{
    (void)state;
    return greybodyd_suite_stop(&suite);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(rows_beyond_the_bound_are_413),
        cmocka_unit_test(fitted_bench_applied_as_csv_matches_mpmath),
    };
    return cmocka_run_group_tests_name("CSV batches over HTTP", tests, start, stop);
}
