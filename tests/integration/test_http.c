/*
 * test_http.c — plays every case file in tests/integration/cases/ against the
 * real build/greybodyd on an ephemeral loopback port, then checks that the routes
 * the server knows and the paths the contract documents are the same set, that
 * GET /openapi.json serves api-docs/openapi.json, and that SIGTERM stops the
 * server with exit status 0.
 *
 * A case file is one request and what its answer must hold:
 *   {"name": "...", "source": "where the expected numbers come from",
 *    "method": "GET", "path": "/v1/radiance?temperature=300&wavelength=10",
 *    "headers": {"Origin": "http://dash.example"},            optional
 *    "body": {...} or "raw text",                              optional
 *    "fill": {"pointer": "/temperature", "count": 1001, "value": 300},  optional
 *    "pad_body_to": 70000,                                     optional
 *    "expect": {"status": 200, "content_type": "application/json",
 *               "fields": {"/radiance": {"approx": 9.92, "rel": 1e-9}, "/radiance_unit": "..."},
 *               "absent": ["/total_model_temperature"],
 *               "header": {"Allow": {"tokens": ["GET", "POST"]}, "Access-Control-Allow-Origin": null},
 *               "body_contains": ["# TYPE "], "prometheus": true}}
 * tests/integration/README.md describes every key.
 *
 * Environment: GREYBODY_ROOT (default ".": the project root), GREYBODYD
 * (default "$GREYBODY_ROOT/build/greybodyd").  The server's own output goes to
 * build/tests/integration/greybodyd.log.
 */
#include <ctype.h>
#include <curl/curl.h>
#include <dirent.h>
#include <errno.h>
#include <jansson.h>
#include <math.h>
#include <signal.h>
#include <stdarg.h>
#include <stdbool.h>
#include <stddef.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <strings.h>
#include <sys/wait.h>

#include <setjmp.h> /* cmocka needs these before its header */
#include <cmocka.h>

#include "http_client.h"
#include "json_expect.h"
#include "prometheus_check.h"
#include "report_text.h"
#include "response_log.h"
#include "router.h"
#include "server_process.h"

#define CORS_ORIGIN "http://dash.example"
/* Small limits so that the 413 cases need only small files. */
#define SERVER_MAX_BODY_BYTES "65536"
#define SERVER_MAX_ARRAY "1000"
#define PATH_TEXT_MAX 4096
#define START_ATTEMPTS 5
/* Polls 25 ms apart: bounds on waiting, never assertions about time. */
#define HEALTH_POLLS 400
#define EXIT_POLLS 1200

static const char *project_root(void)
{
    const char *root = getenv("GREYBODY_ROOT");
    return root != NULL && root[0] != '\0' ? root : ".";
}

static void project_path(char *out, size_t size, const char *relative)
{
    snprintf(out, size, "%s/%s", project_root(), relative);
}

/* ---- the server under test ------------------------------------------------- */

static server_process server = {.pid = -1};
static char base_url[64];
static CURL *client;

static long get_status(const char *path);

static bool answers_healthz(void *context)
{
    (void)context;
    return get_status("/healthz") == 200;
}

static bool start_server(void)
{
    char binary[PATH_TEXT_MAX];
    const char *configured = getenv("GREYBODYD");
    if (configured != NULL && configured[0] != '\0') {
        snprintf(binary, sizeof binary, "%s", configured);
    } else {
        project_path(binary, sizeof binary, "build/greybodyd");
    }
    char log_path[PATH_TEXT_MAX];
    project_path(log_path, sizeof log_path, "build/tests/integration/greybodyd.log");

    for (int attempt = 0; attempt < START_ATTEMPTS; attempt++) {
        int port = server_process_free_port();
        if (port <= 0) {
            continue;
        }
        char listen[64];
        snprintf(listen, sizeof listen, "127.0.0.1:%d", port);
        snprintf(base_url, sizeof base_url, "http://127.0.0.1:%d", port);
        char *const argv[] = {binary,
                              "--listen",
                              listen,
                              "--cors-origins",
                              CORS_ORIGIN,
                              "--max-body-bytes",
                              SERVER_MAX_BODY_BYTES,
                              "--max-array",
                              SERVER_MAX_ARRAY,
                              NULL};
        if (!server_process_spawn(&server, argv, log_path)) {
            break;
        }
        if (server_process_wait_ready(&server, answers_healthz, NULL, HEALTH_POLLS)) {
            return true;
        }
        /* Another process may have taken the port between our probe and the bind. */
        server_process_kill(&server);
    }
    fprintf(stderr, "test_http: %s did not become healthy; see %s\n", binary, log_path);
    return false;
}

/* ---- HTTP ------------------------------------------------------------------ */

/* One exchange; false with `error` filled when the transfer itself failed. */
static bool http_exchange(const char *method, const char *path, struct curl_slist *headers,
                          const char *body, size_t body_length, http_response *response,
                          char *error, size_t error_size)
{
    char url[PATH_TEXT_MAX];
    snprintf(url, sizeof url, "%s%s", base_url, path);
    if (!http_client_exchange(client, url, method, headers, body, body_length, NULL, response,
                              error, error_size)) {
        return false;
    }
    response_log_append(method, path, response); /* for tests/spec/check_responses.py */
    return true;
}

static long get_status(const char *path)
{
    http_response response;
    char error[256];
    if (!http_exchange("GET", path, NULL, NULL, 0, &response, error, sizeof error)) {
        return -1;
    }
    long status = response.status;
    http_response_free(&response);
    return status;
}

/* ---- JSON pointer (RFC 6901) --------------------------------------------- */

/* Sets `value` (stolen) at `pointer` inside `root`; the parent must exist. */
static bool json_pointer_set(json_t *root, const char *pointer, json_t *value)
{
    const char *slash = strrchr(pointer, '/');
    if (slash == NULL) {
        json_decref(value);
        return false;
    }
    char parent_pointer[256];
    snprintf(parent_pointer, sizeof parent_pointer, "%.*s", (int)(slash - pointer), pointer);
    json_t *parent = json_expect_pointer(root, parent_pointer);
    if (!json_is_object(parent)) {
        json_decref(value);
        return false;
    }
    return json_object_set_new(parent, slash + 1, value) == 0;
}

/* ---- expectations ---------------------------------------------------------- */

static bool uses_approx(json_t *expected)
{
    if (json_expect_is_approx(expected)) {
        return true;
    }
    size_t index;
    const char *key;
    json_t *child;
    if (json_is_array(expected)) {
        json_array_foreach(expected, index, child) {
            if (uses_approx(child)) {
                return true;
            }
        }
    } else if (json_is_object(expected)) {
        json_object_foreach(expected, key, child) {
            if (uses_approx(child)) {
                return true;
            }
        }
    }
    return false;
}

/* Copies `text` without blanks, lower-cased: media types and parameters are case-insensitive here. */
static void squeeze(const char *text, size_t length, char *out, size_t size)
{
    size_t used = 0;
    for (size_t i = 0; i < length && text[i] != '\0' && used + 1 < size; i++) {
        if (text[i] != ' ' && text[i] != '\t') {
            out[used++] = (char)tolower((unsigned char)text[i]);
        }
    }
    out[used] = '\0';
}

/*
 * The media types must be equal, and every parameter the expectation names
 * must be present: "text/plain; version=0.0.4" accepts an added charset.
 */
static bool content_type_matches(const char *expected, const char *actual)
{
    char want[256];
    char have[256];
    squeeze(expected, strcspn(expected, ";"), want, sizeof want);
    squeeze(actual, strcspn(actual, ";"), have, sizeof have);
    if (strcmp(want, have) != 0) {
        return false;
    }
    char actual_parameters[512];
    squeeze(actual, strlen(actual), actual_parameters, sizeof actual_parameters);
    for (const char *parameter = strchr(expected, ';'); parameter != NULL;
         parameter = strchr(parameter + 1, ';')) {
        char needle[256];
        size_t length = strcspn(parameter + 1, ";");
        squeeze(parameter + 1, length, needle, sizeof needle);
        size_t needle_length = strlen(needle);
        bool found = false;
        for (const char *at = strchr(actual_parameters, ';'); at != NULL && !found;
             at = strchr(at + 1, ';')) {
            found = strncmp(at + 1, needle, needle_length) == 0
                    && (at[1 + needle_length] == ';' || at[1 + needle_length] == '\0');
        }
        if (!found) {
            return false;
        }
    }
    return true;
}

static bool has_token(const char *list, const char *token)
{
    size_t token_length = strlen(token);
    const char *cursor = list;
    while (*cursor != '\0') {
        while (*cursor == ' ' || *cursor == ',') {
            cursor++;
        }
        size_t length = strcspn(cursor, ", ");
        if (length == token_length && strncasecmp(cursor, token, length) == 0) {
            return true;
        }
        cursor += length;
    }
    return false;
}

static void check_headers(json_t *expected_headers, const http_response *response,
                          report_text *report)
{
    const char *name;
    json_t *expected;
    json_object_foreach(expected_headers, name, expected) {
        char value[1024];
        bool present = http_response_header(response, name, value, sizeof value);
        if (json_is_null(expected)) {
            if (present) {
                report_text_printf(report, "  header %s: expected absent, got \"%s\"\n", name,
                                   value);
            }
        } else if (!present) {
            report_text_printf(report, "  header %s: expected, but absent\n", name);
        } else if (json_is_string(expected)) {
            if (strcmp(value, json_string_value(expected)) != 0) {
                report_text_printf(report, "  header %s: expected \"%s\", got \"%s\"\n", name,
                                   json_string_value(expected), value);
            }
        } else {
            size_t index;
            json_t *token;
            json_array_foreach(json_object_get(expected, "tokens"), index, token) {
                if (!has_token(value, json_string_value(token))) {
                    report_text_printf(report, "  header %s: \"%s\" does not list %s\n", name,
                                       value, json_string_value(token));
                }
            }
        }
    }
}

/* ---- cases ----------------------------------------------------------------- */

typedef struct http_case {
    char file[256];
    char *name;
    json_t *spec;
} http_case;

static http_case *cases;
static size_t case_count;

static int compare_cases(const void *left, const void *right)
{
    return strcmp(((const http_case *)left)->file, ((const http_case *)right)->file);
}

static size_t load_cases(void)
{
    char directory[PATH_TEXT_MAX];
    project_path(directory, sizeof directory, "tests/integration/cases");
    DIR *dir = opendir(directory);
    if (dir == NULL) {
        fprintf(stderr, "test_http: cannot open %s: %s\n", directory, strerror(errno));
        return 0;
    }
    size_t capacity = 0;
    struct dirent *entry;
    while ((entry = readdir(dir)) != NULL) {
        size_t length = strlen(entry->d_name);
        if (length < 6 || strcmp(entry->d_name + length - 5, ".json") != 0) {
            continue;
        }
        if (case_count == capacity) {
            capacity = capacity ? capacity * 2 : 64;
            http_case *grown = realloc(cases, capacity * sizeof *cases);
            if (grown == NULL) {
                break;
            }
            cases = grown;
        }
        http_case *loaded = &cases[case_count++];
        memset(loaded, 0, sizeof *loaded);
        snprintf(loaded->file, sizeof loaded->file, "%s", entry->d_name);
    }
    closedir(dir);
    qsort(cases, case_count, sizeof *cases, compare_cases);
    for (size_t i = 0; i < case_count; i++) {
        char path[PATH_TEXT_MAX + 256];
        snprintf(path, sizeof path, "%s/%s", directory, cases[i].file);
        json_error_t error;
        cases[i].spec = json_load_file(path, JSON_REJECT_DUPLICATES, &error);
        const char *name = json_string_value(json_object_get(cases[i].spec, "name"));
        char label[512];
        snprintf(label, sizeof label, "%s", name != NULL ? name : cases[i].file);
        if (cases[i].spec == NULL) {
            fprintf(stderr, "test_http: %s:%d: %s\n", cases[i].file, error.line, error.text);
        }
        cases[i].name = strdup(label);
    }
    return case_count;
}

/* The request body: `body` (raw string or JSON), with `fill` and `pad_body_to` applied. */
static char *build_body(json_t *spec, size_t *length, report_text *report)
{
    json_t *body = json_object_get(spec, "body");
    if (body == NULL) {
        return NULL;
    }
    char *serialized;
    if (json_is_string(body)) {
        serialized = strdup(json_string_value(body));
    } else {
        json_t *copy = json_deep_copy(body);
        json_t *fill = json_object_get(spec, "fill");
        if (fill != NULL) {
            json_t *array = json_array();
            json_int_t count = json_integer_value(json_object_get(fill, "count"));
            for (json_int_t i = 0; i < count; i++) {
                json_array_append(array, json_object_get(fill, "value"));
            }
            const char *pointer = json_string_value(json_object_get(fill, "pointer"));
            if (pointer == NULL || !json_pointer_set(copy, pointer, array)) {
                report_text_printf(report, "  case: fill.pointer does not name a member of body\n");
            }
        }
        serialized = json_dumps(copy, JSON_COMPACT | JSON_REAL_PRECISION(17));
        json_decref(copy);
    }
    if (serialized == NULL) {
        return NULL;
    }
    *length = strlen(serialized);
    json_int_t pad_to = json_integer_value(json_object_get(spec, "pad_body_to"));
    if (pad_to > 0 && (size_t)pad_to > *length) {
        /* Trailing whitespace keeps the JSON valid, so only the size is at fault. */
        char *padded = realloc(serialized, (size_t)pad_to + 1);
        if (padded == NULL) {
            free(serialized);
            return NULL;
        }
        memset(padded + *length, ' ', (size_t)pad_to - *length);
        padded[pad_to] = '\0';
        serialized = padded;
        *length = (size_t)pad_to;
    }
    return serialized;
}

static struct curl_slist *build_headers(json_t *spec, bool has_body)
{
    struct curl_slist *list = NULL;
    bool has_content_type = false;
    const char *name;
    json_t *value;
    json_object_foreach(json_object_get(spec, "headers"), name, value) {
        char line[1024];
        snprintf(line, sizeof line, "%s: %s", name, json_string_value(value));
        list = curl_slist_append(list, line);
        has_content_type = has_content_type || strcasecmp(name, "Content-Type") == 0;
    }
    if (has_body && !has_content_type) {
        list = curl_slist_append(list, "Content-Type: application/json");
    }
    return list;
}

static void check_expectations(json_t *spec, const http_response *response, report_text *report)
{
    json_t *expect = json_object_get(spec, "expect");
    long expected_status = (long)json_integer_value(json_object_get(expect, "status"));
    if (response->status != expected_status) {
        report_text_printf(report, "  status: expected %ld, got %ld\n", expected_status,
                           response->status);
    }
    const char *content_type = json_string_value(json_object_get(expect, "content_type"));
    if (content_type != NULL) {
        char actual[256];
        if (!http_response_header(response, "Content-Type", actual, sizeof actual)) {
            report_text_printf(report, "  content type: expected %s, got none\n", content_type);
        } else if (!content_type_matches(content_type, actual)) {
            report_text_printf(report, "  content type: expected %s, got %s\n", content_type,
                               actual);
        }
    }
    json_t *fields = json_object_get(expect, "fields");
    json_t *absent = json_object_get(expect, "absent");
    json_t *document = NULL;
    if (fields != NULL || absent != NULL) {
        json_error_t error;
        document = json_loadb(response->body.data, response->body.length, 0, &error);
        if (document == NULL) {
            report_text_printf(report, "  body is not JSON (%s): %.200s\n", error.text,
                               response->body.data);
        }
    }
    if (document != NULL) {
        const char *pointer;
        json_t *expected;
        json_object_foreach(fields, pointer, expected) {
            json_expect_match(pointer, expected, json_expect_pointer(document, pointer), report);
        }
        size_t index;
        json_t *pointer_value;
        json_array_foreach(absent, index, pointer_value) {
            json_t *found = json_expect_pointer(document, json_string_value(pointer_value));
            if (found != NULL) {
                char shown[256];
                json_expect_describe(found, shown, sizeof shown);
                report_text_printf(report, "  %s: expected absent, got %s\n",
                                   json_string_value(pointer_value), shown);
            }
        }
        json_decref(document);
    }
    check_headers(json_object_get(expect, "header"), response, report);
    size_t index;
    json_t *needle;
    json_array_foreach(json_object_get(expect, "body_contains"), index, needle) {
        if (strstr(response->body.data, json_string_value(needle)) == NULL) {
            report_text_printf(report, "  body does not contain \"%s\"\n",
                               json_string_value(needle));
        }
    }
    if (json_is_true(json_object_get(expect, "prometheus"))) {
        prometheus_check_exposition(response->body.data, report);
    }
}

/* Problems with the case file itself, so that a typo cannot pass silently. */
static void check_case_shape(json_t *spec, report_text *report)
{
    json_t *expect = json_object_get(spec, "expect");
    if (!json_is_string(json_object_get(spec, "method"))
        || !json_is_string(json_object_get(spec, "path")) || !json_is_object(expect)
        || !json_is_integer(json_object_get(expect, "status"))) {
        report_text_printf(report, "  case: needs method, path and expect.status\n");
    }
    static const char *const known_keys[] = {"name",        "source",  "note", "method",
                                             "path",        "headers", "body", "fill",
                                             "pad_body_to", "expect",  "heavy", NULL};
    static const char *const known_expect_keys[] = {
        "status", "content_type",  "fields",     "absent",
        "header", "body_contains", "prometheus", NULL};
    const char *const *key_lists[] = {known_keys, known_expect_keys};
    json_t *objects[] = {spec, expect};
    for (size_t list = 0; list < 2; list++) {
        const char *key;
        json_t *value;
        json_object_foreach(objects[list], key, value) {
            bool known = false;
            for (const char *const *k = key_lists[list]; *k != NULL; k++) {
                known = known || strcmp(*k, key) == 0;
            }
            if (!known) {
                report_text_printf(report, "  case: unknown key \"%s\"\n", key);
            }
        }
    }
    if (uses_approx(json_object_get(expect, "fields"))
        && !json_is_string(json_object_get(spec, "source"))) {
        report_text_printf(report, "  case: numeric expectations need a \"source\"\n");
    }
}

static void fail_with_report(const char *label, report_text *report)
{
    print_error("%s:\n%s", label, report->data);
    report_text_free(report);
    fail();
}

static void run_case(void **state)
{
    const http_case *current = *state;
    report_text report = {0};
    if (current->spec == NULL) {
        report_text_printf(&report, "  case file is not valid JSON\n");
        fail_with_report(current->file, &report);
    }
    check_case_shape(current->spec, &report);
    if (report.length > 0) {
        fail_with_report(current->file, &report);
    }
    if (server_process_has_exited(&server)) {
        report_text_printf(&report, "  the server is not running\n");
        fail_with_report(current->file, &report);
    }
    size_t body_length = 0;
    char *body = build_body(current->spec, &body_length, &report);
    struct curl_slist *headers = build_headers(current->spec, body != NULL);
    const char *method = json_string_value(json_object_get(current->spec, "method"));
    const char *path = json_string_value(json_object_get(current->spec, "path"));
    http_response response;
    char error[512];
    if (!http_exchange(method, path, headers, body, body_length, &response, error, sizeof error)) {
        report_text_printf(&report, "  %s\n", error);
    } else {
        check_expectations(current->spec, &response, &report);
        if (report.length > 0) {
            report_text_printf(&report, "  (request %s %s; response body: %.600s)\n", method, path,
                               response.body.data);
        }
        http_response_free(&response);
    }
    curl_slist_free_all(headers);
    free(body);
    if (report.length > 0) {
        fail_with_report(current->file, &report);
    }
}

/* ---- whole-server checks --------------------------------------------------- */

typedef struct documented_path {
    char path[128];
    bool get;
    bool post;
} documented_path;

#define MAX_DOCUMENTED_PATHS 64

/*
 * The paths of api-docs/openapi.yaml ("  /x:" lines directly under "paths:")
 * and whether each documents get and post ("    get:" lines below it).
 */
static size_t contract_paths(documented_path *paths, size_t capacity)
{
    char location[PATH_TEXT_MAX];
    project_path(location, sizeof location, "api-docs/openapi.yaml");
    FILE *file = fopen(location, "r");
    if (file == NULL) {
        return 0;
    }
    size_t count = 0;
    bool in_paths = false;
    char *line = NULL;
    size_t line_capacity = 0;
    while (getline(&line, &line_capacity, file) > 0) {
        if (line[0] != ' ' && line[0] != '\n' && line[0] != '#') {
            in_paths = strncmp(line, "paths:", 6) == 0;
        } else if (in_paths && strncmp(line, "  /", 3) == 0 && count < capacity) {
            documented_path *entry = &paths[count++];
            memset(entry, 0, sizeof *entry);
            snprintf(entry->path, sizeof entry->path, "%.*s", (int)strcspn(line + 2, ":"),
                     line + 2);
        } else if (in_paths && count > 0) {
            paths[count - 1].get = paths[count - 1].get || strncmp(line, "    get:", 8) == 0;
            paths[count - 1].post = paths[count - 1].post || strncmp(line, "    post:", 9) == 0;
        }
    }
    free(line);
    fclose(file);
    return count;
}

static const documented_path *find_documented(const char *path, const documented_path *paths,
                                              size_t count)
{
    for (size_t i = 0; i < count; i++) {
        if (strcmp(paths[i].path, path) == 0) {
            return &paths[i];
        }
    }
    return NULL;
}

/*
 * Both ways: every route the server has is documented with the same GET/POST
 * operations, and every documented path is routed.  HEAD (wherever GET is)
 * and OPTIONS (everywhere) are general conventions of the contract.
 */
static void routes_match_contract(void **state)
{
    (void)state;
    static documented_path documented[MAX_DOCUMENTED_PATHS];
    size_t documented_count = contract_paths(documented, MAX_DOCUMENTED_PATHS);
    assert_true(documented_count > 0);
    report_text report = {0};
    for (size_t i = 0; i < gb_route_count(); i++) {
        const char *path = gb_route_path(i);
        const char *methods = gb_route_methods(i);
        const documented_path *entry = find_documented(path, documented, documented_count);
        if (entry == NULL) {
            report_text_printf(&report, "  route %s is served but not in api-docs/openapi.yaml\n",
                               path);
        } else if (entry->get != has_token(methods, "GET")
                   || entry->post != has_token(methods, "POST")) {
            report_text_printf(&report, "  %s: the server allows %s; the contract documents%s%s\n",
                               path, methods, entry->get ? " get" : "", entry->post ? " post" : "");
        }
    }
    for (size_t i = 0; i < documented_count; i++) {
        bool routed = false;
        for (size_t r = 0; r < gb_route_count() && !routed; r++) {
            routed = strcmp(gb_route_path(r), documented[i].path) == 0;
        }
        if (!routed) {
            report_text_printf(&report, "  path %s is in api-docs/openapi.yaml but not served\n",
                               documented[i].path);
        }
    }
    if (report.length > 0) {
        fail_with_report("routes and contract differ", &report);
    }
}

/* A JSON file of the project, or NULL (with the reason on stderr). */
static json_t *load_project_json(const char *relative)
{
    char location[PATH_TEXT_MAX];
    project_path(location, sizeof location, relative);
    json_error_t error;
    json_t *document = json_load_file(location, 0, &error);
    if (document == NULL) {
        fprintf(stderr, "test_http: %s: %s\n", location, error.text);
    }
    return document;
}

static void served_openapi_is_the_generated_file(void **state)
{
    (void)state;
    json_t *on_disk = load_project_json("api-docs/openapi.json");
    assert_non_null(on_disk);
    http_response response;
    char transfer_error[512];
    assert_true(http_exchange("GET", "/openapi.json", NULL, NULL, 0, &response, transfer_error,
                              sizeof transfer_error));
    assert_int_equal(response.status, 200);
    json_error_t error;
    json_t *served = json_loadb(response.body.data, response.body.length, 0, &error);
    http_response_free(&response);
    bool same = served != NULL && json_equal(served, on_disk);
    json_decref(served);
    json_decref(on_disk);
    assert_true(same);
}

/* Follows a local "$ref" ("#/components/...") inside `document`; other nodes come back as they are. */
static json_t *dereference(json_t *document, json_t *node)
{
    const char *reference = json_string_value(json_object_get(node, "$ref"));
    if (reference == NULL || reference[0] != '#') {
        return node;
    }
    return json_expect_pointer(document, reference + 1);
}

/* The same shape with every number turned into an approx matcher (documented examples are rounded). */
static json_t *as_matcher(json_t *example)
{
    if (json_is_number(example)) {
        return json_pack("{s:f,s:f}", "approx", json_number_value(example), "rel", 1e-9);
    }
    json_t *copy = json_is_array(example)    ? json_array()
                   : json_is_object(example) ? json_object()
                                             : NULL;
    if (copy == NULL) {
        return json_incref(example);
    }
    size_t index;
    const char *key;
    json_t *child;
    json_array_foreach(example, index, child) {
        json_array_append_new(copy, as_matcher(child));
    }
    json_object_foreach(example, key, child) {
        json_object_set_new(copy, key, as_matcher(child));
    }
    return copy;
}

static void check_documented_example(const char *path, const char *name, json_t *request_example,
                                     json_t *response_example, report_text *report)
{
    char *body = json_dumps(json_object_get(request_example, "value"),
                            JSON_COMPACT | JSON_REAL_PRECISION(17));
    struct curl_slist *headers = curl_slist_append(NULL, "Content-Type: application/json");
    http_response response;
    char error[512];
    if (body == NULL
        || !http_exchange("POST", path, headers, body, strlen(body), &response, error,
                          sizeof error)) {
        report_text_printf(report, "  %s example %s: no answer\n", path, name);
    } else {
        json_error_t parse_error;
        json_t *answer = json_loadb(response.body.data, response.body.length, 0, &parse_error);
        json_t *matcher = as_matcher(json_object_get(response_example, "value"));
        char where[256];
        snprintf(where, sizeof where, "%s example %s", path, name);
        if (response.status != 200 || answer == NULL) {
            report_text_printf(report, "  %s: status %ld, %.200s\n", where, response.status,
                               response.body.data);
        } else {
            json_expect_match(where, matcher, answer, report);
        }
        json_decref(matcher);
        json_decref(answer);
        http_response_free(&response);
    }
    curl_slist_free_all(headers);
    free(body);
}

/*
 * Every POST example in the contract that has a request and a response of the
 * same name is played against the server, so the documentation cannot drift
 * from what the service answers.  The examples were computed with
 * tests/integration/oracle.py (mpmath), not copied from the server.
 */
static void documented_examples_match_server(void **state)
{
    (void)state;
    json_t *document = load_project_json("api-docs/openapi.json");
    assert_non_null(document);
    report_text report = {0};
    size_t played = 0;
    const char *path;
    json_t *item;
    json_object_foreach(json_object_get(document, "paths"), path, item) {
        json_t *post = json_object_get(item, "post");
        json_t *requests =
            json_expect_pointer(post, "/requestBody/content/application~1json/examples");
        json_t *responses =
            json_expect_pointer(post, "/responses/200/content/application~1json/examples");
        const char *name;
        json_t *request_example;
        json_object_foreach(requests, name, request_example) {
            json_t *response_example = json_object_get(responses, name);
            if (response_example == NULL) {
                continue;
            }
            check_documented_example(path, name, dereference(document, request_example),
                                     dereference(document, response_example), &report);
            played++;
        }
    }
    json_decref(document);
    if (played == 0) {
        report_text_printf(&report, "  no request/response example pairs found\n");
    }
    if (report.length > 0) {
        fail_with_report("documented examples differ from the server", &report);
    }
}

static void server_exits_zero_on_sigterm(void **state)
{
    (void)state;
    /* An idle keep-alive connection would hold the drain until its timeout. */
    curl_easy_cleanup(client);
    client = NULL;
    assert_false(server_process_has_exited(&server));
    if (!server_process_terminate(&server, EXIT_POLLS)) {
        server_process_kill(&server);
        fail_msg("greybodyd did not exit after SIGTERM");
    }
    assert_true(WIFEXITED(server.wait_status));
    assert_int_equal(WEXITSTATUS(server.wait_status), 0);
}

int main(void)
{
    json_object_seed(1);
    curl_global_init(CURL_GLOBAL_DEFAULT);
    client = curl_easy_init();
    size_t loaded = load_cases();
    if (!start_server()) {
        fprintf(stderr, "test_http: every test below will fail: the server did not start\n");
    }

    size_t test_count = loaded + 4;
    struct CMUnitTest *tests = calloc(test_count, sizeof *tests);
    if (tests == NULL) {
        server_process_kill(&server);
        return EXIT_FAILURE;
    }
    for (size_t i = 0; i < loaded; i++) {
        tests[i] = (struct CMUnitTest){cases[i].name, run_case, NULL, NULL, &cases[i]};
    }
    tests[loaded] = (struct CMUnitTest)cmocka_unit_test(routes_match_contract);
    tests[loaded + 1] = (struct CMUnitTest)cmocka_unit_test(served_openapi_is_the_generated_file);
    /* Last: it stops the server the others need. */
    tests[loaded + 2] = (struct CMUnitTest)cmocka_unit_test(documented_examples_match_server);
    tests[loaded + 3] = (struct CMUnitTest)cmocka_unit_test(server_exits_zero_on_sigterm);

    int failed = _cmocka_run_group_tests("integration", tests, test_count, NULL, NULL);
    printf("%zu passed, %d failed\n",
           failed >= 0 && (size_t)failed <= test_count ? test_count - (size_t)failed : 0, failed);

    server_process_kill(&server);
    if (client != NULL) {
        curl_easy_cleanup(client);
    }
    curl_global_cleanup();
    for (size_t i = 0; i < loaded; i++) {
        json_decref(cases[i].spec);
        free(cases[i].name);
    }
    free(cases);
    free(tests);
    return failed == 0 ? EXIT_SUCCESS : EXIT_FAILURE;
}
