#include "metrics.h"

#include <stdarg.h>
#include <stdatomic.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>

#include "jsonw.h"
#include "router.h"
#include "version.h"

#define MAX_ENDPOINTS 32 /* routes + "unmatched" */
#define STATUS_MIN 100
#define STATUS_SLOTS 500 /* 100..599 */

static const double bucket_bounds[] = {0.0005, 0.001, 0.0025, 0.005, 0.01, 0.025, 0.05,
                                       0.1,    0.25,  0.5,    1.0,   2.5,  5.0,   10.0};
#define BUCKETS (sizeof bucket_bounds / sizeof bucket_bounds[0])

static atomic_long in_flight;
static atomic_uint_fast64_t requests[MAX_ENDPOINTS][STATUS_SLOTS];
static atomic_uint_fast64_t buckets[MAX_ENDPOINTS][BUCKETS + 1]; /* last: above every bound */
static atomic_uint_fast64_t duration_ns[MAX_ENDPOINTS];

void gb_metrics_in_flight_add(long delta)
{
    atomic_fetch_add_explicit(&in_flight, delta, memory_order_relaxed);
}

long gb_metrics_in_flight(void)
{
    return atomic_load_explicit(&in_flight, memory_order_relaxed);
}

static size_t endpoint_slot(size_t route)
{
    size_t routes = gb_route_count();
    if (route >= routes || route >= MAX_ENDPOINTS - 1) {
        return routes < MAX_ENDPOINTS - 1 ? routes : MAX_ENDPOINTS - 1; /* "unmatched" */
    }
    return route;
}

static const char *endpoint_name(size_t slot)
{
    const char *path = gb_route_path(slot);
    return path != NULL && slot < MAX_ENDPOINTS - 1 ? path : "unmatched";
}

void gb_metrics_observe(size_t route, int status, double seconds)
{
    size_t slot = endpoint_slot(route);
    if (status >= STATUS_MIN && status < STATUS_MIN + STATUS_SLOTS) {
        atomic_fetch_add_explicit(&requests[slot][status - STATUS_MIN], 1, memory_order_relaxed);
    }
    if (!(seconds >= 0.0)) {
        seconds = 0.0;
    }
    size_t b = 0;
    while (b < BUCKETS && seconds > bucket_bounds[b]) {
        b++;
    }
    atomic_fetch_add_explicit(&buckets[slot][b], 1, memory_order_relaxed);
    atomic_fetch_add_explicit(&duration_ns[slot], (uint_fast64_t)(seconds * 1e9 + 0.5),
                              memory_order_relaxed);
}

static void append(gb_jw *w, const char *format, ...) __attribute__((format(printf, 2, 3)));

static void append(gb_jw *w, const char *format, ...)
{
    char line[512];
    va_list args;
    va_start(args, format);
    int n = vsnprintf(line, sizeof line, format, args);
    va_end(args);
    if (n < 0 || (size_t)n >= sizeof line) {
        w->failed = true;
        return;
    }
    gb_jw_raw(w, line, (size_t)n);
}

char *gb_metrics_render(size_t *length)
{
    gb_jw w;
    gb_jw_init(&w, 8192);
    size_t slots = gb_route_count() + 1;
    if (slots > MAX_ENDPOINTS) {
        slots = MAX_ENDPOINTS;
    }

    append(&w, "# HELP greybody_http_requests_total HTTP requests answered, by endpoint and "
               "status.\n# TYPE greybody_http_requests_total counter\n");
    for (size_t e = 0; e < slots; e++) {
        for (int s = 0; s < STATUS_SLOTS; s++) {
            uint_fast64_t count = atomic_load_explicit(&requests[e][s], memory_order_relaxed);
            if (count > 0) {
                append(&w, "greybody_http_requests_total{endpoint=\"%s\",status=\"%d\"} %llu\n",
                       endpoint_name(e), s + STATUS_MIN, (unsigned long long)count);
            }
        }
    }

    append(&w, "# HELP greybody_http_request_duration_seconds Time from a request's arrival to "
               "the end of its response.\n"
               "# TYPE greybody_http_request_duration_seconds histogram\n");
    for (size_t e = 0; e < slots; e++) {
        uint_fast64_t counts[BUCKETS + 1];
        uint_fast64_t total = 0;
        for (size_t b = 0; b <= BUCKETS; b++) {
            counts[b] = atomic_load_explicit(&buckets[e][b], memory_order_relaxed);
            total += counts[b];
        }
        if (total == 0 && e == slots - 1) {
            continue; /* "unmatched" appears once something was unmatched */
        }
        const char *name = endpoint_name(e);
        uint_fast64_t cumulative = 0;
        for (size_t b = 0; b < BUCKETS; b++) {
            cumulative += counts[b];
            append(&w,
                   "greybody_http_request_duration_seconds_bucket{endpoint=\"%s\",le=\"%g\"} "
                   "%llu\n",
                   name, bucket_bounds[b], (unsigned long long)cumulative);
        }
        append(&w,
               "greybody_http_request_duration_seconds_bucket{endpoint=\"%s\",le=\"+Inf\"} %llu\n",
               name, (unsigned long long)total);
        double sum = (double)atomic_load_explicit(&duration_ns[e], memory_order_relaxed) / 1e9;
        append(&w, "greybody_http_request_duration_seconds_sum{endpoint=\"%s\"} %.9f\n", name,
               sum);
        append(&w, "greybody_http_request_duration_seconds_count{endpoint=\"%s\"} %llu\n", name,
               (unsigned long long)total);
    }

    append(&w, "# HELP greybody_http_requests_in_flight HTTP requests being received, computed "
               "or sent.\n# TYPE greybody_http_requests_in_flight gauge\n"
               "greybody_http_requests_in_flight %ld\n",
           gb_metrics_in_flight());
    append(&w, "# HELP greybody_build_info The running version (always 1).\n"
               "# TYPE greybody_build_info gauge\ngreybody_build_info{version=\"%s\"} 1\n",
           GREYBODY_VERSION);
    return gb_jw_take(&w, length);
}
