/*
 * load.c — a bounded loopback load test of greybodyd (libcurl multi).
 *
 * Starts the server (tests/support/greybodyd_run.h), then keeps CONCURRENCY
 * requests in flight for --seconds seconds, cycling through every successful
 * computation among the integration case files (all endpoints, GET and POST;
 * tests/support/case_replay.h) and checking each answer against the case's
 * expected values (computed by the oracle, never by the server).  Monte Carlo
 * runs are left out: they are heavy work, bounded by --max-batches, and 64 of
 * them at once are meant to get 503 overloaded (test_http covers them).  The first
 * WARM_UP_FRACTION of the run brings the server to its working set; the
 * resident memory (VmRSS of /proc/PID/status) is read then and at the end,
 * and may grow by at most RSS_GROWTH_BOUND_KB.  Finally SIGTERM must stop the
 * server with exit status 0.
 *
 * Passes when no request failed or was answered wrongly, memory stayed within
 * the bound, and the server exited 0.  Prints the figures and a closing
 * "load: N passed, M failed" line.
 *
 * usage: load [--seconds N] [--concurrency N]     (GREYBODYD picks the binary)
 */
#include <curl/curl.h>
#include <signal.h>
#include <stdbool.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

#include "case_replay.h"
#include "greybodyd_run.h"
#include "report_text.h"

#define DEFAULT_SECONDS 20
#define DEFAULT_CONCURRENCY 64
#define MAX_CONCURRENCY 512
#define WARM_UP_FRACTION 0.2
/* Resident memory may grow this much after the warm-up: allocator noise, never a leak's pace. */
#define RSS_GROWTH_BOUND_KB (8L * 1024)
#define REPORT_LIMIT 4000

typedef struct slot {
    CURL *easy;
    size_t case_index;
    report_text body;
    char url[4096];
} slot;

static double now_seconds(void)
{
    struct timespec now;
    clock_gettime(CLOCK_MONOTONIC, &now);
    return (double)now.tv_sec + (double)now.tv_nsec / 1e9;
}

static long resident_kb(pid_t pid)
{
    char path[64];
    snprintf(path, sizeof path, "/proc/%d/status", (int)pid);
    FILE *status = fopen(path, "r");
    if (status == NULL) {
        return -1;
    }
    char line[256];
    long kb = -1;
    while (fgets(line, sizeof line, status) != NULL) {
        if (strncmp(line, "VmRSS:", 6) == 0) {
            kb = strtol(line + 6, NULL, 10);
        }
    }
    fclose(status);
    return kb;
}

static size_t collect(char *data, size_t size, size_t count, void *user)
{
    report_text_append(user, data, size * count);
    return size * count;
}

static void arm(slot *s, const greybodyd_run *run, const replay_case *one, size_t index)
{
    s->case_index = index;
    report_text_clear(&s->body);
    snprintf(s->url, sizeof s->url, "%s%s", run->base_url, one->path);
    curl_easy_setopt(s->easy, CURLOPT_URL, s->url);
    curl_easy_setopt(s->easy, CURLOPT_HTTPHEADER, one->headers);
    curl_easy_setopt(s->easy, CURLOPT_WRITEFUNCTION, collect);
    curl_easy_setopt(s->easy, CURLOPT_WRITEDATA, &s->body);
    curl_easy_setopt(s->easy, CURLOPT_NOPROXY, "*");
    curl_easy_setopt(s->easy, CURLOPT_TIMEOUT, 30L);
    if (one->body != NULL) {
        curl_easy_setopt(s->easy, CURLOPT_POSTFIELDS, one->body);
        curl_easy_setopt(s->easy, CURLOPT_POSTFIELDSIZE_LARGE, (curl_off_t)one->body_length);
    } else {
        curl_easy_setopt(s->easy, CURLOPT_HTTPGET, 1L);
    }
}

int main(int argc, char **argv)
{
    long seconds = DEFAULT_SECONDS;
    long concurrency = DEFAULT_CONCURRENCY;
    for (int i = 1; i + 1 < argc; i += 2) {
        if (strcmp(argv[i], "--seconds") == 0) {
            seconds = strtol(argv[i + 1], NULL, 10);
        } else if (strcmp(argv[i], "--concurrency") == 0) {
            concurrency = strtol(argv[i + 1], NULL, 10);
        }
    }
    if (seconds < 2 || seconds > 86400 || concurrency < 1 || concurrency > MAX_CONCURRENCY) {
        fprintf(stderr, "usage: load [--seconds 2..86400] [--concurrency 1..%d]\n",
                MAX_CONCURRENCY);
        return 2;
    }
    char cases_dir[512];
    snprintf(cases_dir, sizeof cases_dir, "%s/tests/integration/cases", greybodyd_root());
    replay_case *cases = NULL;
    size_t case_count = replay_load(cases_dir, &cases);
    size_t kept = 0;
    for (size_t i = 0; i < case_count; i++) {
        bool heavy = strstr(cases[i].path, "monte-carlo") != NULL ||
                     (cases[i].body != NULL && strstr(cases[i].body, "monte-carlo") != NULL);
        if (heavy) {
            replay_free_one(&cases[i]);
        } else {
            cases[kept++] = cases[i];
        }
    }
    case_count = kept;
    if (case_count == 0) {
        fprintf(stderr, "load: no cases in %s\nload: 0 passed, 1 failed\n", cases_dir);
        return 1;
    }
    curl_global_init(CURL_GLOBAL_DEFAULT);
    greybodyd_run run;
    if (!greybodyd_start(&run, "load", "http", NULL)) {
        printf("load: 0 passed, 1 failed\n");
        return 1;
    }

    CURLM *multi = curl_multi_init();
    curl_multi_setopt(multi, CURLMOPT_MAX_HOST_CONNECTIONS, concurrency);
    static slot slots[MAX_CONCURRENCY];
    size_t next_case = 0;
    for (long i = 0; i < concurrency; i++) {
        slots[i].easy = curl_easy_init();
        curl_easy_setopt(slots[i].easy, CURLOPT_PRIVATE, &slots[i]);
        arm(&slots[i], &run, &cases[next_case], next_case);
        next_case = (next_case + 1) % case_count;
        curl_multi_add_handle(multi, slots[i].easy);
    }

    double started = now_seconds();
    double warm_until = started + (double)seconds * WARM_UP_FRACTION;
    double stop_at = started + (double)seconds;
    long rss_after_warm_up = -1;
    long rss_peak = 0;
    unsigned long served = 0;
    unsigned long failed = 0;
    report_text report = {0};
    int active = (int)concurrency;
    double next_sample = started;
    while (active > 0) {
        int running_handles = 0;
        curl_multi_perform(multi, &running_handles);
        CURLMsg *message;
        int left;
        while ((message = curl_multi_info_read(multi, &left)) != NULL) {
            if (message->msg != CURLMSG_DONE) {
                continue;
            }
            slot *s = NULL;
            curl_easy_getinfo(message->easy_handle, CURLINFO_PRIVATE, (char **)&s);
            const replay_case *one = &cases[s->case_index];
            long status = 0;
            curl_easy_getinfo(s->easy, CURLINFO_RESPONSE_CODE, &status);
            if (message->data.result != CURLE_OK) {
                failed++;
                if (report.length < REPORT_LIMIT) {
                    report_text_printf(&report, "  %s: %s\n", one->name,
                                       curl_easy_strerror(message->data.result));
                }
            } else {
                report_text errors = {0};
                if (replay_check(one, status, s->body.data != NULL ? s->body.data : "",
                                 s->body.length, &errors)) {
                    served++;
                } else {
                    failed++;
                    if (report.length < REPORT_LIMIT) {
                        report_text_append(&report, errors.data, errors.length);
                    }
                }
                report_text_free(&errors);
            }
            curl_multi_remove_handle(multi, s->easy);
            if (now_seconds() < stop_at) {
                arm(s, &run, &cases[next_case], next_case);
                next_case = (next_case + 1) % case_count;
                curl_multi_add_handle(multi, s->easy);
            } else {
                active--;
            }
        }
        double now = now_seconds();
        if (now >= next_sample) {
            long rss = resident_kb(run.process.pid);
            rss_peak = rss > rss_peak ? rss : rss_peak;
            if (rss_after_warm_up < 0 && now >= warm_until) {
                rss_after_warm_up = rss;
            }
            next_sample = now + 0.5;
        }
        curl_multi_poll(multi, NULL, 0, 100, NULL);
    }
    double elapsed = now_seconds() - started;
    long rss_end = resident_kb(run.process.pid);
    for (long i = 0; i < concurrency; i++) {
        curl_easy_cleanup(slots[i].easy);
        report_text_free(&slots[i].body);
    }
    curl_multi_cleanup(multi);
    int exit_status = -1;
    bool exited = greybodyd_stop(&run, &exit_status);
    if (!exited) {
        greybodyd_kill(&run);
    }

    bool memory_flat = rss_after_warm_up > 0 && rss_end > 0 &&
                       rss_end - rss_after_warm_up <= RSS_GROWTH_BOUND_KB;
    printf("load: %lu requests answered correctly in %.1f s (%.0f per second) at concurrency %ld "
           "over %zu cases, %lu failed or wrong\n",
           served, elapsed, (double)served / elapsed, concurrency, case_count, failed);
    printf("load: server VmRSS %ld kB after warm-up, %ld kB at the end, peak %ld kB "
           "(bound: growth <= %ld kB)\n",
           rss_after_warm_up, rss_end, rss_peak, RSS_GROWTH_BOUND_KB);
    printf("load: server exit status after SIGTERM: %d\n", exited ? exit_status : -1);
    if (report.length > 0) {
        printf("load: failures (first ones):\n%s", report.data);
    }
    bool ok = failed == 0 && served > 0 && memory_flat && exited && exit_status == 0;
    printf("load: %d passed, %d failed\n", ok ? 1 : 0, ok ? 0 : 1);
    report_text_free(&report);
    replay_free(cases, case_count);
    curl_global_cleanup();
    return ok ? 0 : 1;
}
