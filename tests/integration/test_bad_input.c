/*
 * test_bad_input.c — plays the table tests/integration/bad-input.json: one
 * bad request a row (malformed and truncated JSON, duplicate keys, wrong
 * types, non-finite numbers, overlong strings, deep nesting, empty and
 * mismatched arrays, reversed bands, bad response tables, impossible
 * physics, unknown units and fields, wrong methods and media types), each
 * against the status and problem code the API documents.  After every row
 * the server must still answer /healthz with 200.
 *
 * Every answer must be an RFC 9457 problem document: Content-Type
 * application/problem+json, "type" ending in the code, "status" equal to the
 * HTTP status, a non-empty "detail", "field" as the row says.
 */
#include <curl/curl.h>
#include <jansson.h>
#include <stdbool.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <setjmp.h> /* cmocka needs these before its header */
#include <cmocka.h>

#include "greybodyd_run.h"
#include "http_client.h"

#define MINIMUM_ROWS 60

static CURL *client;
static greybodyd_run server;

/* `text` with the row's repeat marker replaced by its repeated text (malloc'd). */
static char *expand(const char *text, json_t *repeat)
{
    const char *marker = json_string_value(json_object_get(repeat, "marker"));
    const char *unit = json_string_value(json_object_get(repeat, "text"));
    size_t count = (size_t)json_integer_value(json_object_get(repeat, "count"));
    const char *at = marker != NULL ? strstr(text, marker) : NULL;
    if (at == NULL || unit == NULL) {
        return strdup(text);
    }
    size_t unit_length = strlen(unit);
    size_t length = strlen(text) - strlen(marker) + unit_length * count;
    char *out = malloc(length + 1);
    assert_non_null(out);
    size_t used = (size_t)(at - text);
    memcpy(out, text, used);
    for (size_t i = 0; i < count; i++) {
        memcpy(out + used, unit, unit_length);
        used += unit_length;
    }
    strcpy(out + used, at + strlen(marker));
    return out;
}

static void play_row(void **state)
{
    json_t *row = *state;
    json_t *repeat = json_object_get(row, "repeat");
    char *path = expand(json_string_value(json_object_get(row, "path")), repeat);
    const char *body_text = json_string_value(json_object_get(row, "body"));
    char *body = body_text != NULL ? expand(body_text, repeat) : NULL;
    json_t *content_type = json_object_get(row, "content_type");
    struct curl_slist *headers = NULL;
    if (json_is_string(content_type)) {
        char line[256];
        snprintf(line, sizeof line, "Content-Type: %s", json_string_value(content_type));
        headers = curl_slist_append(headers, line);
    } else if (content_type != NULL) {
        headers = curl_slist_append(headers, "Content-Type:"); /* none at all */
    }
    char url[300000];
    snprintf(url, sizeof url, "%s%s", server.base_url, path);
    http_response response;
    char error[512];
    bool answered = http_client_exchange(client, url,
                                         json_string_value(json_object_get(row, "method")),
                                         headers, body, body != NULL ? strlen(body) : 0, NULL,
                                         &response, error, sizeof error);
    curl_slist_free_all(headers);
    free(path);
    free(body);
    if (!answered) {
        fail_msg("no answer: %s", error);
    }
    long expected_status = (long)json_integer_value(json_object_get(row, "status"));
    const char *expected_code = json_string_value(json_object_get(row, "code"));
    char type[256];
    assert_true(http_response_header(&response, "Content-Type", type, sizeof type));
    json_t *problem = json_loadb(response.body.data, response.body.length, 0, NULL);
    if (response.status != expected_status || problem == NULL ||
        strcmp(type, "application/problem+json") != 0) {
        fail_msg("status %ld (expected %ld), %s: %.600s", response.status, expected_status, type,
                 response.body.data);
    }
    const char *code = json_string_value(json_object_get(problem, "code"));
    if (code == NULL || strcmp(code, expected_code) != 0) {
        fail_msg("code %s, expected %s: %.600s", code != NULL ? code : "(none)", expected_code,
                 response.body.data);
    }
    const char *problem_type = json_string_value(json_object_get(problem, "type"));
    assert_non_null(problem_type);
    assert_string_equal(problem_type + strlen(problem_type) - strlen(expected_code), expected_code);
    assert_int_equal(json_integer_value(json_object_get(problem, "status")), expected_status);
    const char *detail = json_string_value(json_object_get(problem, "detail"));
    assert_true(detail != NULL && detail[0] != '\0');
    json_t *field = json_object_get(problem, "field");
    json_t *prefix = json_object_get(row, "field_prefix");
    if (prefix != NULL) {
        assert_true(json_is_string(field));
        assert_true(strncmp(json_string_value(field), json_string_value(prefix),
                            strlen(json_string_value(prefix))) == 0);
    } else {
        json_t *expected_field = json_object_get(row, "field");
        if (!json_equal(field, expected_field)) {
            char *shown = json_dumps(field, JSON_ENCODE_ANY);
            fail_msg("field %s, expected %s", shown != NULL ? shown : "(absent)",
                     json_is_string(expected_field) ? json_string_value(expected_field) : "null");
        }
    }
    json_decref(problem);
    http_response_free(&response);

    snprintf(url, sizeof url, "%s/healthz", server.base_url);
    assert_true(http_client_exchange(client, url, "GET", NULL, NULL, 0, NULL, &response, error,
                                     sizeof error));
    assert_int_equal(response.status, 200);
    http_response_free(&response);
}

static void server_stops_cleanly(void **state)
{
    (void)state;
    int status = -1;
    bool exited = greybodyd_stop(&server, &status);
    if (!exited) {
        greybodyd_kill(&server);
    }
    assert_true(exited);
    assert_int_equal(status, 0);
}

int main(void)
{
    char table_path[512];
    snprintf(table_path, sizeof table_path, "%s/tests/integration/bad-input.json",
             greybodyd_root());
    json_error_t error;
    json_t *table = json_load_file(table_path, JSON_REJECT_DUPLICATES, &error);
    json_t *rows = json_object_get(table, "rows");
    if (!json_is_array(rows) || json_array_size(rows) < MINIMUM_ROWS) {
        fprintf(stderr, "test_bad_input: %s: expected at least %d rows (%s)\n", table_path,
                MINIMUM_ROWS, error.text);
        printf("bad-input: 0 passed, 1 failed\n");
        return 1;
    }
    curl_global_init(CURL_GLOBAL_DEFAULT);
    client = curl_easy_init();
    if (!greybodyd_start(&server, "bad-input", "http", NULL)) {
        printf("bad-input: 0 passed, 1 failed\n");
        return 1;
    }
    size_t count = json_array_size(rows);
    struct CMUnitTest *tests = calloc(count + 1, sizeof *tests);
    for (size_t i = 0; i < count; i++) {
        json_t *row = json_array_get(rows, i);
        tests[i].name = json_string_value(json_object_get(row, "name"));
        tests[i].test_func = play_row;
        tests[i].initial_state = row;
    }
    tests[count].name = "server exits 0 on SIGTERM after the bad input";
    tests[count].test_func = server_stops_cleanly;
    int failed = _cmocka_run_group_tests("bad-input", tests, count + 1, NULL, NULL);
    if (server.process.pid > 0) {
        greybodyd_kill(&server);
    }
    printf("bad-input: %zu rows\n", count);
    free(tests);
    json_decref(table);
    curl_easy_cleanup(client);
    curl_global_cleanup();
    return failed == 0 ? 0 : 1;
}
