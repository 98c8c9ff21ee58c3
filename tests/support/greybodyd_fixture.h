/*
 * greybodyd_fixture.h — greybodyd_run for cmocka tests: a start that fails
 * the test when the server does not come up, a stop that asserts the server
 * exited (and returns its status), and a teardown that kills a server a
 * failed test left running, so that no process outlives the test program.
 */
#ifndef GREYBODY_TEST_GREYBODYD_FIXTURE_H
#define GREYBODY_TEST_GREYBODYD_FIXTURE_H

#include "greybodyd_run.h"

/* Starts over http (or https trusting `ca_file` when it is not NULL); fails the test otherwise. */
void fixture_start(greybodyd_run *run, const char *log_name, const char *ca_file,
                   const char *const *args);

/* SIGTERM; asserts the server exited and returns its exit status. */
int fixture_stop(greybodyd_run *run);

/* cmocka teardown: kills the server started last if it is still running. */
int fixture_kill_leftover(void **state);

#endif
