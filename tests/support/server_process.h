/*
 * server_process.h — runs a server binary as a child process for tests:
 * picks a free loopback port, starts the child with its output in a log file,
 * waits (bounded) until it answers, and stops it.
 *
 * Every wait is a bounded number of polls 25 ms apart, so a broken server
 * fails the run instead of hanging it; no test asserts on how long anything
 * took.
 */
#ifndef GREYBODY_TEST_SERVER_PROCESS_H
#define GREYBODY_TEST_SERVER_PROCESS_H

#include <stdbool.h>
#include <sys/types.h>

typedef struct server_process {
    pid_t pid;   /* -1 before spawning */
    bool exited; /* reaped; wait_status holds its waitpid() status */
    int wait_status;
} server_process;

/* A loopback TCP port that was free a moment ago (bound to port 0 and released), or -1. */
int server_process_free_port(void);

/* Starts argv[0] with `argv`, stdout and stderr appended to `log_path`. */
bool server_process_spawn(server_process *process, char *const argv[], const char *log_path);

/* Reaps the child if it has exited; true once it has (or was never started). */
bool server_process_has_exited(server_process *process);

/* Polls `is_ready(context)` until it says yes (true), or the child exits or `polls` run out (false). */
bool server_process_wait_ready(server_process *process, bool (*is_ready)(void *context),
                               void *context, int polls);

/* Sends SIGTERM and waits up to `polls` polls; true when the child exited (see wait_status). */
bool server_process_terminate(server_process *process, int polls);

/* SIGKILL and reap, if still running. */
void server_process_kill(server_process *process);

#endif
