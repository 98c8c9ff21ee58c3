/*
 * metrics.h — request counters, a latency histogram and the in-flight gauge,
 * rendered in the Prometheus text format (version 0.0.4) at /metrics:
 *   greybody_http_requests_total{endpoint,status}        counter
 *   greybody_http_request_duration_seconds{endpoint}     histogram
 *   greybody_http_requests_in_flight                     gauge
 *   greybody_build_info{version}                         gauge (always 1)
 * `endpoint` is a route path, or "unmatched" for paths no route serves (so
 * that unknown URLs cannot grow the number of series).  Updates are lock-free
 * relaxed atomics; the state is process-wide.
 */
#ifndef GREYBODY_METRICS_H
#define GREYBODY_METRICS_H

#include <stddef.h>

void gb_metrics_in_flight_add(long delta);
long gb_metrics_in_flight(void);

/* One finished request; `route` is a route index or GB_ROUTE_NONE. */
void gb_metrics_observe(size_t route, int status, double seconds);

/* The exposition text, malloc'd; NULL on allocation failure. */
char *gb_metrics_render(size_t *length);

#define GB_METRICS_CONTENT_TYPE "text/plain; version=0.0.4; charset=utf-8"

#endif
