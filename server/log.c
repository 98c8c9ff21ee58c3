#include "log.h"

#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>
#include <unistd.h>

#include "jsonw.h"

#define LOG_PATH_MAX 512

static void timestamp(char *out, size_t size)
{
    struct timespec now;
    struct tm parts;
    clock_gettime(CLOCK_REALTIME, &now);
    gmtime_r(&now.tv_sec, &parts);
    char seconds[32];
    strftime(seconds, sizeof seconds, "%Y-%m-%dT%H:%M:%S", &parts);
    snprintf(out, size, "%s.%03ldZ", seconds, now.tv_nsec / 1000000L);
}

static void emit(gb_jw *w)
{
    gb_jw_raw(w, "\n", 1);
    size_t length = 0;
    char *line = gb_jw_take(w, &length);
    if (line == NULL) {
        return;
    }
    size_t done = 0;
    while (done < length) {
        ssize_t n = write(STDERR_FILENO, line + done, length - done);
        if (n <= 0) {
            break;
        }
        done += (size_t)n;
    }
    gb_jw_free(w);
    free(line);
}

static void begin(gb_jw *w, const char *level)
{
    char ts[48];
    timestamp(ts, sizeof ts);
    gb_jw_init(w, 256);
    gb_jw_object_begin(w);
    gb_jw_kstring(w, "ts", ts);
    gb_jw_kstring(w, "level", level);
}

void gb_log_request(const char *method, const char *path, int status, double duration_ms,
                    size_t bytes, const char *problem_code)
{
    gb_jw w;
    char shortened[LOG_PATH_MAX + 4];
    if (path != NULL && strlen(path) > LOG_PATH_MAX) {
        memcpy(shortened, path, LOG_PATH_MAX);
        memcpy(shortened + LOG_PATH_MAX, "...", 4);
        path = shortened;
    }
    begin(&w, "info");
    gb_jw_kstring(&w, "method", method);
    gb_jw_kstring(&w, "path", path);
    gb_jw_kinteger(&w, "status", status);
    gb_jw_key(&w, "duration_ms");
    gb_jw_fixed(&w, duration_ms, 3);
    gb_jw_kinteger(&w, "bytes", (long long)bytes);
    if (problem_code != NULL) {
        gb_jw_kstring(&w, "code", problem_code);
    }
    gb_jw_object_end(&w);
    emit(&w);
}

void gb_log_event(const char *level, const char *event, const char *message)
{
    gb_jw w;
    begin(&w, level);
    gb_jw_kstring(&w, "event", event);
    gb_jw_kstring(&w, "message", message);
    gb_jw_object_end(&w);
    emit(&w);
}
