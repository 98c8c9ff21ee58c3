/*
 * greybodyd — configuration, start, wait for SIGTERM/SIGINT, drain, exit 0.
 *
 * The signals are blocked before any thread starts (threads inherit the mask)
 * and taken synchronously with sigwait.  On the first one the daemon stops
 * accepting, requests in flight are given --drain-timeout seconds to finish,
 * then the daemon stops (closing idle keep-alive connections).  A second
 * signal during the drain stops at once.
 */
#include <jansson.h>
#include <signal.h>
#include <stdio.h>
#include <time.h>

#include "config.h"
#include "log.h"
#include "openapi.h"
#include "presets.h"
#include "server.h"
#include "version.h"

int main(int argc, char **argv)
{
    gb_config config;
    switch (gb_config_load(&config, argc, argv, stdout, stderr)) {
    case GB_CONFIG_OK: break;
    case GB_CONFIG_EXIT_SUCCESS: return 0;
    case GB_CONFIG_ERROR: return 2;
    }

    json_object_seed(0);
    sigset_t stop_signals;
    sigemptyset(&stop_signals);
    sigaddset(&stop_signals, SIGTERM);
    sigaddset(&stop_signals, SIGINT);
    pthread_sigmask(SIG_BLOCK, &stop_signals, NULL);
    signal(SIGPIPE, SIG_IGN);

    char error[512];
    gb_presets *presets = gb_presets_read(config.presets_dir, error, sizeof error);
    if (presets == NULL) {
        gb_log_event("error", "presets_invalid", error);
        return 1;
    }
    snprintf(error, sizeof error, "%zu band and %zu material presets from %.400s",
             gb_presets_band_count(presets), gb_presets_material_count(presets),
             gb_presets_folder(presets));
    gb_log_event("info", "presets_loaded", error);
    gb_presets_install(presets);
    gb_server *server = gb_server_start(&config, error, sizeof error);
    if (server == NULL) {
        gb_log_event("error", "start_failed", error);
        return 1;
    }
    char message[768];
    snprintf(message, sizeof message,
             "greybody %s listening on %s (port %u), %s; openapi: %s%s", GREYBODY_VERSION,
             config.listen, (unsigned)gb_server_port(server),
             config.threads ? "thread pool" : "thread per connection",
             gb_openapi_source(), gb_openapi_api_version(config.openapi_path) != NULL ? "" : " (not loaded)");
    gb_log_event("info", "listening", message);

    int signal_number = 0;
    sigwait(&stop_signals, &signal_number);
    snprintf(message, sizeof message, "signal %d: no longer accepting; draining %ld request(s)",
             signal_number, gb_server_in_flight(server));
    gb_log_event("info", "draining", message);
    gb_server_quiesce(server);

    struct timespec deadline;
    clock_gettime(CLOCK_MONOTONIC, &deadline);
    deadline.tv_sec += (time_t)config.drain_seconds;
    for (;;) {
        if (gb_server_in_flight(server) <= 0) {
            break;
        }
        struct timespec now;
        clock_gettime(CLOCK_MONOTONIC, &now);
        if (now.tv_sec > deadline.tv_sec ||
            (now.tv_sec == deadline.tv_sec && now.tv_nsec >= deadline.tv_nsec)) {
            gb_log_event("warn", "drain_timeout", "requests still in flight; stopping anyway");
            break;
        }
        struct timespec pause = {0, 20 * 1000 * 1000};
        if (sigtimedwait(&stop_signals, NULL, &pause) > 0) {
            gb_log_event("warn", "second_signal", "stopping without waiting");
            break;
        }
    }
    gb_server_stop(server);
    gb_log_event("info", "stopped", "greybody stopped");
    return 0;
}
