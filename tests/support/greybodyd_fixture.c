#include "greybodyd_fixture.h"

#include <stdbool.h>
#include <stddef.h>

#include <setjmp.h> /* cmocka needs these before its header */
#include <stdarg.h>
#include <cmocka.h>

static greybodyd_run *running; /* the server a failing test may leave behind */

void fixture_start(greybodyd_run *run, const char *log_name, const char *ca_file,
                   const char *const *args)
{
    bool started = ca_file != NULL ? greybodyd_start_https(run, log_name, ca_file, args)
                                   : greybodyd_start(run, log_name, "http", args);
    if (!started) {
        fail_msg("server did not start; see %s", run->log_path);
    }
    running = run;
}

int fixture_stop(greybodyd_run *run)
{
    int status = -1;
    bool exited = greybodyd_stop(run, &status);
    if (!exited) {
        greybodyd_kill(run);
    }
    running = NULL;
    assert_true(exited);
    return status;
}

int fixture_kill_leftover(void **state)
{
    (void)state;
    if (running != NULL) {
        greybodyd_kill(running);
        running = NULL;
    }
    return 0;
}
