/*
 * greybodyd_run.h — a greybodyd child process for tests that need servers of
 * their own (limits, faults, security, load): started on a free loopback port
 * with the given extra arguments, ready once /healthz answers 200 (bounded
 * polls), stopped with SIGTERM.
 *
 * The binary is $GREYBODYD, else $GREYBODY_ROOT/build/greybodyd (GREYBODY_ROOT
 * defaults to "."), so the sanitizer and valgrind runs can swap it.  Output
 * is appended to build/tests/<log_name>.log under GREYBODY_ROOT.
 */
#ifndef GREYBODY_TEST_GREYBODYD_RUN_H
#define GREYBODY_TEST_GREYBODYD_RUN_H

#include <stdbool.h>

#include "server_process.h"

#define GREYBODYD_MAX_ARGS 40

typedef struct greybodyd_run {
    server_process process;
    int port;
    char base_url[96];  /* "http://127.0.0.1:PORT" (https with TLS) */
    char log_path[512];
    const char *ca_file; /* trusted for https readiness probes; NULL for http */
} greybodyd_run;

/*
 * Starts the server with `extra_args` (NULL-terminated, may be NULL) after
 * --listen 127.0.0.1:PORT, reached over http (`scheme` must be "http"; use
 * greybodyd_start_https for TLS).  false (with the reason on stderr) when it
 * did not become healthy.
 */
bool greybodyd_start(greybodyd_run *run, const char *log_name, const char *scheme,
                     const char *const *extra_args);

/* The same over https, trusting `ca_file` (the authority that signed the server's --tls-cert). */
bool greybodyd_start_https(greybodyd_run *run, const char *log_name, const char *ca_file,
                           const char *const *extra_args);

/*
 * Starts the server and waits for it to exit by itself (a start-up failure),
 * at most `polls` polls of 25 ms.  true when it exited; *exit_status is its
 * exit code (or 128 + signal).
 */
bool greybodyd_start_expecting_exit(const char *log_name, const char *const *extra_args,
                                    int polls, int *exit_status);

/* SIGTERM, then waits (bounded); true when it exited.  *exit_status as above. */
bool greybodyd_stop(greybodyd_run *run, int *exit_status);

/* SIGKILL if still running (cleanup after a failed test). */
void greybodyd_kill(greybodyd_run *run);

/* The binary under test and the project root. */
const char *greybodyd_binary(void);
const char *greybodyd_root(void);

#endif
