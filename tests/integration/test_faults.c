/*
 * test_faults.c — greybodyd under faults:
 *   - SIGTERM while requests are in flight: each of them is answered in full
 *     and correctly, then the server exits 0;
 *   - clients that hang up mid-request (in the headers, in the body, before
 *     reading the answer) harm nothing: the in-flight gauge returns to its
 *     resting value and others are served;
 *   - a bad presets folder at start-up: a message naming the file, exit != 0;
 *   - a restarted server gives the same answers, byte for byte, and they are
 *     the case files' expected values (tests/support/case_replay.h).
 *
 * Check value: Wien's displacement constant b = 2.897771955e-3 m K (CODATA
 * 2018): the spectral peak of a 5000 K blackbody is at 0.579554391 um.
 */
#include <curl/curl.h>
#include <jansson.h>
#include <math.h>
#include <signal.h>
#include <stdbool.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <time.h>

#include <setjmp.h> /* cmocka needs these before its header */
#include <cmocka.h>

#include "case_replay.h"
#include "greybodyd_fixture.h"
#include "http_client.h"
#include "raw_socket.h"

#define WIEN_B_UM_K 2897.771955 /* CODATA 2018 */
#define PEAK_BODY "{\"temperature\": 5000}"
#define IN_FLIGHT 8

static CURL *client;
static void pause_ms(long milliseconds)
{
    struct timespec interval = {milliseconds / 1000, (milliseconds % 1000) * 1000000L};
    nanosleep(&interval, NULL);
}

static double peak_of(const char *http_text)
{
    const char *body = strstr(http_text, "\r\n\r\n");
    json_t *document = body != NULL ? json_loads(body + 4, 0, NULL) : NULL;
    double peak = json_number_value(json_object_get(document, "peak_wavelength"));
    json_decref(document);
    return peak;
}

/* The greybody_http_requests_in_flight sample of /metrics, or -1. */
static long in_flight(const greybodyd_run *run)
{
    char url[160];
    snprintf(url, sizeof url, "%s/metrics", run->base_url);
    http_response response;
    char error[256];
    long value = -1;
    if (http_client_exchange(client, url, "GET", NULL, NULL, 0, NULL, &response, error,
                             sizeof error)) {
        const char *line = strstr(response.body.data, "\ngreybody_http_requests_in_flight ");
        if (line != NULL) {
            value = strtol(line + strlen("\ngreybody_http_requests_in_flight "), NULL, 10);
        }
    }
    http_response_free(&response);
    return value;
}

static void sigterm_finishes_requests_in_flight(void **state)
{
    (void)state;
    greybodyd_run run;
    fixture_start(&run, "faults-sigterm", NULL, NULL);
    char head[256];
    int length = snprintf(head, sizeof head,
                          "POST /v1/peak HTTP/1.1\r\nHost: x\r\nContent-Type: application/json\r\n"
                          "Content-Length: %zu\r\n\r\n",
                          strlen(PEAK_BODY));
    int clients[IN_FLIGHT];
    for (int i = 0; i < IN_FLIGHT; i++) {
        clients[i] = raw_connect(NULL, run.port);
        assert_true(clients[i] >= 0);
        /* Headers and half of the body: the request is under way when the signal comes. */
        assert_true(raw_send(clients[i], head, (size_t)length));
        assert_true(raw_send(clients[i], PEAK_BODY, 10));
    }
    long flying = -1;
    for (int poll = 0; poll < 200 && flying < IN_FLIGHT + 1; poll++) {
        flying = in_flight(&run); /* counts the /metrics request too */
        pause_ms(25);
    }
    assert_int_equal(flying, IN_FLIGHT + 1);
    assert_int_equal(kill(run.process.pid, SIGTERM), 0);
    pause_ms(200);
    for (int i = 0; i < IN_FLIGHT; i++) {
        assert_true(raw_send(clients[i], PEAK_BODY + 10, strlen(PEAK_BODY) - 10));
        char answer[4096];
        raw_read(clients[i], answer, sizeof answer, 5000);
        assert_non_null(strstr(answer, "HTTP/1.1 200"));
        double peak = peak_of(answer);
        assert_true(fabs(peak - WIEN_B_UM_K / 5000.0) <= 1e-9 * peak);
        raw_close(clients[i]);
    }
    assert_int_equal(fixture_stop(&run), 0);
}

static void disconnecting_clients_harm_nothing(void **state)
{
    (void)state;
    greybodyd_run run;
    fixture_start(&run, "faults-disconnect", NULL, NULL);
    static const char half_headers[] = "POST /v1/radiance HTTP/1.1\r\nHost: x\r\nContent-Ty";
    static const char half_body[] = "POST /v1/radiance HTTP/1.1\r\nHost: x\r\n"
                                    "Content-Type: application/json\r\nContent-Length: 500\r\n"
                                    "\r\n{\"temperature\": [300, 301";
    char whole[8192];
    int used = snprintf(whole, sizeof whole, "%s", "{\"wavelength\": 10, \"temperature\": [");
    for (int i = 0; i < 400; i++) {
        used += snprintf(whole + used, sizeof whole - (size_t)used, "%s%d", i ? "," : "", 300 + i);
    }
    snprintf(whole + used, sizeof whole - (size_t)used, "]}");
    char unread[9000];
    snprintf(unread, sizeof unread,
             "POST /v1/radiance HTTP/1.1\r\nHost: x\r\nContent-Type: application/json\r\n"
             "Content-Length: %zu\r\n\r\n%s",
             strlen(whole), whole);
    for (int round = 0; round < 20; round++) {
        const char *texts[] = {half_headers, half_body, unread};
        for (size_t k = 0; k < 3; k++) {
            int fd = raw_connect(NULL, run.port);
            assert_true(fd >= 0);
            assert_true(raw_send(fd, texts[k], strlen(texts[k])));
            raw_close(fd); /* gone before the end of the request, or without reading the answer */
        }
    }
    long flying = -1;
    for (int poll = 0; poll < 200 && flying != 1; poll++) {
        pause_ms(25);
        flying = in_flight(&run);
    }
    assert_int_equal(flying, 1); /* only the /metrics request that asks */
    char url[160];
    snprintf(url, sizeof url, "%s/v1/peak?temperature=5000", run.base_url);
    http_response response;
    char error[256];
    assert_true(http_client_exchange(client, url, "GET", NULL, NULL, 0, NULL, &response, error,
                                     sizeof error));
    assert_int_equal(response.status, 200);
    http_response_free(&response);
    assert_int_equal(fixture_stop(&run), 0);
}

static void write_file(const char *path, const char *text)
{
    FILE *file = fopen(path, "w");
    assert_non_null(file);
    fputs(text, file);
    fclose(file);
}

static void log_path_of(const char *log_name, char *out, size_t size)
{
    snprintf(out, size, "%s/build/tests/%s.log", greybodyd_root(), log_name);
}

static bool log_says(const char *log_name, const char *text)
{
    char path[512];
    log_path_of(log_name, path, sizeof path);
    FILE *log = fopen(path, "r");
    if (log == NULL) {
        return false;
    }
    static char content[65536];
    size_t n = fread(content, 1, sizeof content - 1, log);
    content[n] = '\0';
    fclose(log);
    return strstr(content, text) != NULL;
}

/* Starts with `args`, expects a refusal whose message names `file`. */
static void expect_refused(const char *log_name, const char *const *args, const char *file)
{
    char path[512];
    log_path_of(log_name, path, sizeof path);
    remove(path); /* logs are appended to: only this start's lines may count */
    int status = -1;
    assert_true(greybodyd_start_expecting_exit(log_name, args, 400, &status));
    assert_true(status != 0);
    assert_true(log_says(log_name, "presets_invalid"));
    assert_true(log_says(log_name, file));
}

/*
 * Whole files broken at start-up (test_presets.c covers bad entries in well-formed files): a
 * materials file cut short and a bands file that is not JSON.
 */
static void bad_presets_stop_the_start(void **state)
{
    (void)state;
    char folder[512];
    snprintf(folder, sizeof folder, "%s/build/tests/bad-presets", greybodyd_root());
    mkdir(folder, 0755);
    char bands[600];
    char materials[600];
    snprintf(bands, sizeof bands, "%s/bands.json", folder);
    snprintf(materials, sizeof materials, "%s/materials.json", folder);
    char copy[2400];
    snprintf(copy, sizeof copy,
             "cp '%s/shared/bands.json' '%s' && cp '%s/shared/materials.json' '%s'",
             greybodyd_root(), bands, greybodyd_root(), materials);
    assert_int_equal(system(copy), 0);
    const char *args[] = {"--presets-dir", folder, NULL};

    /* The project's own files start (the contrast that makes the failures below mean something). */
    greybodyd_run run;
    fixture_start(&run, "faults-presets-good", NULL, args);
    assert_int_equal(fixture_stop(&run), 0);

    write_file(materials, "{\"about\": \"cut short\", \"materials\": [");
    expect_refused("faults-presets-truncated", args, "materials.json");

    assert_int_equal(system(copy), 0);
    write_file(bands, "not json at all");
    expect_refused("faults-presets-bands", args, "bands.json");
}

/* Replays every chosen case; the bodies go to `bodies` (one malloc'd string per case). */
static void replay_all(const greybodyd_run *run, const replay_case *cases, size_t count,
                       char **bodies)
{
    report_text report = {0};
    for (size_t i = 0; i < count; i++) {
        char url[4096];
        snprintf(url, sizeof url, "%s%s", run->base_url, cases[i].path);
        http_response response;
        char error[256];
        if (!http_client_exchange(client, url, cases[i].method, cases[i].headers, cases[i].body,
                                  cases[i].body_length, NULL, &response, error, sizeof error)) {
            fail_msg("%s: %s", cases[i].name, error);
        }
        replay_check(&cases[i], response.status, response.body.data, response.body.length,
                     &report);
        bodies[i] = strdup(response.body.data);
        http_response_free(&response);
    }
    if (report.length > 0) {
        fail_msg("answers differ from the case files:\n%s", report.data);
    }
    report_text_free(&report);
}

static void restarts_to_the_same_answers(void **state)
{
    (void)state;
    char cases_dir[512];
    snprintf(cases_dir, sizeof cases_dir, "%s/tests/integration/cases", greybodyd_root());
    replay_case *cases = NULL;
    size_t count = replay_load(cases_dir, &cases);
    assert_true(count >= 20);
    char **first = calloc(count, sizeof *first);
    char **second = calloc(count, sizeof *second);
    greybodyd_run run;
    fixture_start(&run, "faults-restart", NULL, NULL);
    replay_all(&run, cases, count, first);
    assert_int_equal(fixture_stop(&run), 0);
    fixture_start(&run, "faults-restart", NULL, NULL);
    replay_all(&run, cases, count, second);
    assert_int_equal(fixture_stop(&run), 0);
    for (size_t i = 0; i < count; i++) {
        if (strcmp(first[i], second[i]) != 0) {
            fail_msg("%s: the answer changed across the restart", cases[i].name);
        }
        free(first[i]);
        free(second[i]);
    }
    free(first);
    free(second);
    replay_free(cases, count);
}

int main(void)
{
    curl_global_init(CURL_GLOBAL_DEFAULT);
    client = curl_easy_init();
    const struct CMUnitTest tests[] = {
        cmocka_unit_test_teardown(sigterm_finishes_requests_in_flight, fixture_kill_leftover),
        cmocka_unit_test_teardown(disconnecting_clients_harm_nothing, fixture_kill_leftover),
        cmocka_unit_test_teardown(bad_presets_stop_the_start, fixture_kill_leftover),
        cmocka_unit_test_teardown(restarts_to_the_same_answers, fixture_kill_leftover),
    };
    int failed = cmocka_run_group_tests_name("faults", tests, NULL, NULL);
    curl_easy_cleanup(client);
    curl_global_cleanup();
    return failed == 0 ? 0 : 1;
}
