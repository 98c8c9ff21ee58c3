/*
 * greybodyd_suite.h — the server and the HTTP client that a cmocka group of
 * HTTP tests shares: started in the group's setup (libcurl initialised, one
 * easy handle, greybodyd on a free loopback port with the given extra
 * arguments), stopped in its teardown (SIGTERM; the group fails unless the
 * server exits 0).
 *
 * Ownership: the suite holds its handle and server until greybodyd_suite_stop().
 */
#ifndef GREYBODY_TEST_GREYBODYD_SUITE_H
#define GREYBODY_TEST_GREYBODYD_SUITE_H

#include <curl/curl.h>
#include <stdbool.h>

#include "greybodyd_run.h"

typedef struct greybodyd_suite {
    greybodyd_run server;
    CURL *client;
} greybodyd_suite;

/* 0 when the server answers /healthz, -1 otherwise (a cmocka setup's result). */
int greybodyd_suite_start(greybodyd_suite *suite, const char *log_name,
                          const char *const *extra_args);

/* 0 when the server exited with status 0, -1 otherwise (a cmocka teardown's result). */
int greybodyd_suite_stop(greybodyd_suite *suite);

#endif
