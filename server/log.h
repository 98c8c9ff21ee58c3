/*
 * log.h — structured logging: one JSON object per line on stderr, each line
 * written with a single write(2) so that lines from concurrent requests never
 * interleave.
 *   request lines: {"ts", "level":"info", "method", "path", "status",
 *                   "duration_ms", "bytes", "code" (problem code or absent)}
 *   event lines:   {"ts", "level", "event", "message"}
 */
#ifndef GREYBODY_LOG_H
#define GREYBODY_LOG_H

#include <stddef.h>

void gb_log_request(const char *method, const char *path, int status, double duration_ms,
                    size_t bytes, const char *problem_code);

void gb_log_event(const char *level, const char *event, const char *message);

#endif
