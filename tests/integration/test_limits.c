/*
 * test_limits.c — every resource bound of greybodyd is enforced with the
 * documented answer, and the server keeps serving other clients meanwhile:
 * body size, array length, JSON nesting depth, response size, header memory
 * per connection, idle timeout, read timeout (trickling clients), total and
 * per-address connections, worker threads, and 500 idle or trickling
 * connections at once while ordinary requests are still answered.
 *
 * Each test starts its own server with small limits on a free loopback port
 * (tests/support/greybodyd_run.h).  Waits are bounded polls; the one timing
 * bound asserted is the liveness one of the issue: an ordinary request under
 * connection pressure is answered within LIVENESS_SECONDS.
 *
 * Check value: Wien's displacement constant b = 2.897771955e-3 m K (CODATA
 * 2018), so the spectral peak of a 5000 K blackbody is at 0.579554391 um.
 */
#include <curl/curl.h>
#include <dirent.h>
#include <jansson.h>
#include <math.h>
#include <stdbool.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

#include <setjmp.h> /* cmocka needs these before its header */
#include <cmocka.h>

#include "greybodyd_fixture.h"
#include "http_client.h"
#include "raw_socket.h"

#define WIEN_B_UM_K 2897.771955 /* CODATA 2018 */
#define PEAK_PATH "/v1/peak?temperature=5000"
#define LIVENESS_SECONDS 1L
#define TEXT_MAX 300000

typedef struct answer {
    long status;
    json_t *body; /* NULL when the body is not JSON */
    char text[4096];
    char header[256]; /* the header asked for, "" when absent */
} answer;

static CURL *client;

/* One request; false when no answer came (connection refused or closed, or time-out). */
static bool ask(const greybodyd_run *run, const char *method, const char *path,
                const char *body, size_t body_length, struct curl_slist *headers,
                const char *wanted_header, long timeout_seconds, answer *out)
{
    char url[4096];
    snprintf(url, sizeof url, "%s%s", run->base_url, path);
    http_response response;
    char error[512];
    http_options options = {timeout_seconds, NULL};
    memset(out, 0, sizeof *out);
    struct curl_slist *json_type = NULL;
    if (body != NULL && headers == NULL) {
        json_type = curl_slist_append(NULL, "Content-Type: application/json");
        headers = json_type;
    }
    bool answered = http_client_exchange(client, url, method, headers, body, body_length,
                                         &options, &response, error, sizeof error);
    curl_slist_free_all(json_type);
    if (!answered) {
        snprintf(out->text, sizeof out->text, "%s", error);
        return false;
    }
    out->status = response.status;
    snprintf(out->text, sizeof out->text, "%s", response.body.data);
    out->body = json_loadb(response.body.data, response.body.length, 0, NULL);
    if (wanted_header != NULL) {
        http_response_header(&response, wanted_header, out->header, sizeof out->header);
    }
    http_response_free(&response);
    return true;
}

static void answer_free(answer *a)
{
    json_decref(a->body);
    a->body = NULL;
}

static const char *problem_code(const answer *a)
{
    return json_string_value(json_object_get(a->body, "code"));
}

/* An ordinary request gets the right number, within `timeout_seconds`. */
static void assert_serving(const greybodyd_run *run, long timeout_seconds)
{
    answer a;
    bool answered = ask(run, "GET", PEAK_PATH, NULL, 0, NULL, NULL, timeout_seconds, &a);
    if (!answered) {
        fail_msg("an ordinary request got no answer: %s", a.text);
    }
    assert_int_equal(a.status, 200);
    double peak = json_number_value(json_object_get(a.body, "peak_wavelength"));
    assert_true(fabs(peak - WIEN_B_UM_K / 5000.0) <= 1e-9 * peak);
    answer_free(&a);
}

/* A radiance request body for `count` temperatures, padded with spaces to `pad_to` bytes. */
static char *radiance_body(size_t count, size_t pad_to, size_t *length)
{
    char *text = malloc(TEXT_MAX);
    assert_non_null(text);
    size_t used = (size_t)snprintf(text, TEXT_MAX, "{\"wavelength\": 10, \"temperature\": [");
    for (size_t i = 0; i < count; i++) {
        used += (size_t)snprintf(text + used, TEXT_MAX - used, "%s%zu", i ? "," : "", 300 + i);
    }
    used += (size_t)snprintf(text + used, TEXT_MAX - used, "]}");
    while (used < pad_to && used + 1 < TEXT_MAX) {
        text[used++] = ' ';
    }
    text[used] = '\0';
    *length = used;
    return text;
}

/* ---- body, array, depth, response ------------------------------------------- */

/*
 * POSTs `count` radiance temperatures padded to `pad_to` bytes; asserts the status, and for an
 * error the problem code.  Returns the number of radiances answered (0 for an error).
 */
static size_t expect_radiance(const greybodyd_run *run, size_t count, size_t pad_to, long status,
                              const char *code)
{
    size_t length;
    char *body = radiance_body(count, pad_to, &length);
    answer a;
    assert_true(ask(run, "POST", "/v1/radiance", body, length, NULL, NULL, 10, &a));
    free(body);
    assert_int_equal(a.status, status);
    if (code != NULL) {
        assert_string_equal(problem_code(&a), code);
    }
    size_t answered = json_array_size(json_object_get(a.body, "radiance"));
    answer_free(&a);
    return answered;
}

static void body_size_limit(void **state)
{
    (void)state;
    greybodyd_run run;
    const char *args[] = {"--max-body-bytes", "4096", NULL};
    fixture_start(&run, "limits-body", NULL, args);
    assert_int_equal(expect_radiance(&run, 3, 4096, 200, NULL), 3); /* exactly at the limit */
    expect_radiance(&run, 3, 4097, 413, "body_too_large");
    assert_serving(&run, 10);
    assert_int_equal(fixture_stop(&run), 0);
}

static void array_length_limit(void **state)
{
    (void)state;
    greybodyd_run run;
    const char *args[] = {"--max-array", "50", NULL};
    fixture_start(&run, "limits-array", NULL, args);
    assert_int_equal(expect_radiance(&run, 50, 0, 200, NULL), 50);
    expect_radiance(&run, 51, 0, 413, "array_too_long");
    assert_serving(&run, 10);
    assert_int_equal(fixture_stop(&run), 0);
}

/* {"temperature": [[...[300]...]]} with `depth` levels in all (the object is one). */
static void nested_body(int depth, char *out, size_t size)
{
    size_t used = (size_t)snprintf(out, size, "{\"wavelength\": 10, \"temperature\": ");
    for (int i = 1; i < depth; i++) {
        out[used++] = '[';
    }
    used += (size_t)snprintf(out + used, size - used, "300");
    for (int i = 1; i < depth; i++) {
        out[used++] = ']';
    }
    snprintf(out + used, size - used, "}");
}

static void nesting_depth_limit(void **state)
{
    (void)state;
    greybodyd_run run;
    const char *args[] = {"--max-depth", "8", NULL};
    fixture_start(&run, "limits-depth", NULL, args);
    char body[512];
    answer a;
    nested_body(8, body, sizeof body);
    assert_true(ask(&run, "POST", "/v1/radiance", body, strlen(body), NULL, NULL, 10, &a));
    /* Within the limit: parsed, then refused for its shape, naming the field. */
    assert_int_equal(a.status, 400);
    assert_string_equal(problem_code(&a), "wrong_type");
    assert_string_equal(json_string_value(json_object_get(a.body, "field")), "temperature");
    answer_free(&a);
    nested_body(9, body, sizeof body);
    assert_true(ask(&run, "POST", "/v1/radiance", body, strlen(body), NULL, NULL, 10, &a));
    assert_int_equal(a.status, 400);
    assert_string_equal(problem_code(&a), "malformed_json");
    assert_non_null(strstr(json_string_value(json_object_get(a.body, "detail")), "deeper than 8"));
    answer_free(&a);
    /* Far deeper than any stack would like: refused the same way, server unharmed. */
    static char deep[300000];
    memset(deep, '[', 200000);
    deep[200000] = '\0';
    assert_true(ask(&run, "POST", "/v1/radiance", deep, 200000, NULL, NULL, 10, &a));
    assert_int_equal(a.status, 400);
    assert_string_equal(problem_code(&a), "malformed_json");
    answer_free(&a);
    assert_serving(&run, 10);
    assert_int_equal(fixture_stop(&run), 0);
}

static void response_size_limit(void **state)
{
    (void)state;
    greybodyd_run run;
    const char *args[] = {"--max-response-bytes", "4096", NULL};
    fixture_start(&run, "limits-response", NULL, args);
    assert_int_equal(expect_radiance(&run, 5, 0, 200, NULL), 5);
    /* Three arrays of 200 numbers: far over 4 KiB. */
    expect_radiance(&run, 200, 0, 413, "response_too_large");
    assert_serving(&run, 10);
    assert_int_equal(fixture_stop(&run), 0);
}

/* ---- connections -------------------------------------------------------------- */

static void header_memory_limit(void **state)
{
    (void)state;
    greybodyd_run run;
    const char *args[] = {"--connection-memory", "8192", NULL};
    fixture_start(&run, "limits-memory", NULL, args);
    char *big = malloc(12000);
    assert_non_null(big);
    memset(big, 'a', 11999);
    memcpy(big, "X-Filler: ", 10);
    big[11999] = '\0';
    struct curl_slist *headers = curl_slist_append(NULL, big);
    answer a;
    assert_true(ask(&run, "GET", PEAK_PATH, NULL, 0, headers, NULL, 10, &a));
    assert_int_equal(a.status, 431); /* Request Header Fields Too Large (RFC 6585) */
    answer_free(&a);
    curl_slist_free_all(headers);
    free(big);
    assert_serving(&run, 10);
    assert_int_equal(fixture_stop(&run), 0);
}

static void idle_timeout(void **state)
{
    (void)state;
    greybodyd_run run;
    const char *args[] = {"--timeout", "1", NULL};
    fixture_start(&run, "limits-idle", NULL, args);
    int silent = raw_connect(NULL, run.port);
    assert_true(silent >= 0);
    assert_serving(&run, 10);
    /* Silent for longer than the timeout: the server hangs up (bounded wait, not a speed test). */
    assert_true(raw_wait_closed(silent, 8000));
    raw_close(silent);
    assert_serving(&run, 10);
    assert_int_equal(fixture_stop(&run), 0);
}

static void read_timeout_cuts_trickling_client(void **state)
{
    (void)state;
    greybodyd_run run;
    /* The idle timeout alone would never end it: a byte arrives every 300 ms. */
    const char *args[] = {"--timeout", "2", "--read-timeout", "2", NULL};
    fixture_start(&run, "limits-read", NULL, args);
    int trickler = raw_connect(NULL, run.port);
    assert_true(trickler >= 0);
    static const char request[] = "POST /v1/radiance HTTP/1.1\r\nHost: x\r\n"
                                  "Content-Type: application/json\r\nContent-Length: 60\r\n\r\n"
                                  "{\"temperature\": 300, \"wavelength\": 10}";
    bool cut = false;
    for (size_t i = 0; i < 40 && !cut; i++) { /* at most 12 s */
        if (!raw_send(trickler, request + (i % (sizeof request - 1)), 1)) {
            cut = true;
            break;
        }
        cut = raw_wait_closed(trickler, 300);
    }
    assert_true(cut);
    raw_close(trickler);
    assert_serving(&run, 10);
    assert_int_equal(fixture_stop(&run), 0);
}

/*
 * One more connection from `source` is closed by the server at once (the kernel still accepts
 * it).  The held connections may not all be counted yet on a busy machine, so a knock that the
 * server keeps is let go and tried again, for up to about ten seconds.
 */
static bool knock_is_refused(const char *source, int port)
{
    for (int attempt = 0; attempt < 20; attempt++) {
        int extra = raw_connect(source, port);
        bool refused = extra >= 0 && raw_wait_closed(extra, 500);
        if (extra >= 0) {
            raw_close(extra);
        }
        if (refused) {
            return true;
        }
        nanosleep(&(struct timespec){0, 100 * 1000 * 1000}, NULL);
    }
    return false;
}

static void total_connection_limit(void **state)
{
    (void)state;
    greybodyd_run run;
    const char *args[] = {"--max-connections", "20", NULL};
    fixture_start(&run, "limits-connections", NULL, args);
    int held[20];
    for (int i = 0; i < 20; i++) {
        held[i] = raw_connect(NULL, run.port);
        assert_true(held[i] >= 0);
    }
    assert_true(knock_is_refused(NULL, run.port));
    answer a;
    assert_false(ask(&run, "GET", PEAK_PATH, NULL, 0, NULL, NULL, 3, &a));
    for (int i = 0; i < 5; i++) {
        raw_close(held[i]);
    }
    bool served = false;
    for (int attempt = 0; attempt < 40 && !served; attempt++) {
        served = ask(&run, "GET", PEAK_PATH, NULL, 0, NULL, NULL, 2, &a) && a.status == 200;
        answer_free(&a);
        nanosleep(&(struct timespec){0, 50 * 1000 * 1000}, NULL);
    }
    assert_true(served);
    for (int i = 5; i < 20; i++) {
        raw_close(held[i]);
    }
    assert_int_equal(fixture_stop(&run), 0);
}

static void per_address_connection_limit(void **state)
{
    (void)state;
    greybodyd_run run;
    const char *args[] = {"--max-connections-per-ip", "5", NULL};
    fixture_start(&run, "limits-per-ip", NULL, args);
    int held[5];
    for (int i = 0; i < 5; i++) {
        held[i] = raw_connect("127.0.0.2", run.port);
        assert_true(held[i] >= 0);
    }
    assert_true(knock_is_refused("127.0.0.2", run.port));
    /* Another address is served as usual. */
    assert_serving(&run, 10);
    int other = raw_connect("127.0.0.3", run.port);
    assert_true(other >= 0);
    static const char request[] = "GET " PEAK_PATH " HTTP/1.1\r\nHost: x\r\nConnection: close\r\n\r\n";
    assert_true(raw_send(other, request, sizeof request - 1));
    char reply[2048];
    raw_read(other, reply, sizeof reply, 5000);
    assert_non_null(strstr(reply, "HTTP/1.1 200"));
    raw_close(other);
    for (int i = 0; i < 5; i++) {
        raw_close(held[i]);
    }
    assert_int_equal(fixture_stop(&run), 0);
}

/* Threads of the process, from /proc (the worker count is what is bounded). */
static int thread_count(pid_t pid)
{
    char path[64];
    snprintf(path, sizeof path, "/proc/%d/task", (int)pid);
    DIR *tasks = opendir(path);
    if (tasks == NULL) {
        return -1;
    }
    int count = 0;
    struct dirent *entry;
    while ((entry = readdir(tasks)) != NULL) {
        count += entry->d_name[0] != '.';
    }
    closedir(tasks);
    return count;
}

/*
 * The server's thread count while `connections` idle connections are open.  A busy machine may
 * take a while to start a thread per connection, so the count is read again (for up to 5 s)
 * until it reaches `at_least`; a bound from above needs no waiting.
 */
static int threads_with_open_connections(const char *threads_option, int connections,
                                         int at_least)
{
    greybodyd_run run;
    const char *args[] = {"--threads", threads_option, NULL};
    fixture_start(&run, "limits-threads", NULL, args);
    int held[64];
    for (int i = 0; i < connections; i++) {
        held[i] = raw_connect(NULL, run.port);
        assert_true(held[i] >= 0);
    }
    nanosleep(&(struct timespec){0, 300 * 1000 * 1000}, NULL);
    assert_serving(&run, 10);
    int count = thread_count(run.process.pid);
    for (int wait = 0; wait < 50 && count < at_least; wait++) {
        nanosleep(&(struct timespec){0, 100 * 1000 * 1000}, NULL);
        count = thread_count(run.process.pid);
    }
    for (int i = 0; i < connections; i++) {
        raw_close(held[i]);
    }
    assert_int_equal(fixture_stop(&run), 0);
    return count;
}

static void worker_threads_bounded(void **state)
{
    (void)state;
    /* A pool of 2: the main thread, 2 workers and the read-timeout watcher, whatever the load. */
    int pooled = threads_with_open_connections("2", 40, 0);
    assert_true(pooled >= 3 && pooled <= 5);
    /* The contrast that shows the count is meaningful: a thread per connection. */
    int per_connection = threads_with_open_connections("0", 40, 40);
    assert_true(per_connection >= 40);
}

/* ---- pressure ----------------------------------------------------------------- */

#define PRESSURE_CONNECTIONS 500
#define PRESSURE_ADDRESSES 10

static void serves_under_idle_and_trickling_connections(void **state)
{
    (void)state;
    greybodyd_run run;
    const char *args[] = {"--max-connections", "1000", NULL};
    fixture_start(&run, "limits-pressure", NULL, args);
    static int held[PRESSURE_CONNECTIONS];
    for (int i = 0; i < PRESSURE_CONNECTIONS; i++) {
        char source[32];
        snprintf(source, sizeof source, "127.0.0.%d", 2 + i % PRESSURE_ADDRESSES);
        held[i] = raw_connect(source, run.port);
        assert_true(held[i] >= 0);
    }
    static const char start_line[] = "GET " PEAK_PATH " HTTP/1.1\r\nX-Slow: ";
    for (int round = 0; round < 10; round++) {
        /* Half of them trickle a header a few bytes at a time; the other half stay silent. */
        for (int i = 0; i < PRESSURE_CONNECTIONS; i += 2) {
            if (round == 0) {
                assert_true(raw_send(held[i], start_line, sizeof start_line - 1));
            } else {
                assert_true(raw_send(held[i], "ab", 2));
            }
        }
        assert_serving(&run, LIVENESS_SECONDS);
        nanosleep(&(struct timespec){0, 100 * 1000 * 1000}, NULL);
    }
    for (int i = 0; i < PRESSURE_CONNECTIONS; i++) {
        raw_close(held[i]);
    }
    assert_serving(&run, 10);
    assert_int_equal(fixture_stop(&run), 0);
}

int main(void)
{
    curl_global_init(CURL_GLOBAL_DEFAULT);
    client = curl_easy_init();
    const struct CMUnitTest tests[] = {
        cmocka_unit_test_teardown(body_size_limit, fixture_kill_leftover),
        cmocka_unit_test_teardown(array_length_limit, fixture_kill_leftover),
        cmocka_unit_test_teardown(nesting_depth_limit, fixture_kill_leftover),
        cmocka_unit_test_teardown(response_size_limit, fixture_kill_leftover),
        cmocka_unit_test_teardown(header_memory_limit, fixture_kill_leftover),
        cmocka_unit_test_teardown(idle_timeout, fixture_kill_leftover),
        cmocka_unit_test_teardown(read_timeout_cuts_trickling_client, fixture_kill_leftover),
        cmocka_unit_test_teardown(total_connection_limit, fixture_kill_leftover),
        cmocka_unit_test_teardown(per_address_connection_limit, fixture_kill_leftover),
        cmocka_unit_test_teardown(worker_threads_bounded, fixture_kill_leftover),
        cmocka_unit_test_teardown(serves_under_idle_and_trickling_connections, fixture_kill_leftover),
    };
    int failed = cmocka_run_group_tests_name("limits", tests, NULL, NULL);
    curl_easy_cleanup(client);
    curl_global_cleanup();
    return failed == 0 ? 0 : 1;
}
