#include "greybodyd_run.h"

#include <curl/curl.h>
#include <signal.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <sys/wait.h>

#include "http_client.h"

#define START_ATTEMPTS 5
#define READY_POLLS 800 /* 20 s: a server under valgrind starts slowly */
#define EXIT_POLLS 1200

const char *greybodyd_root(void)
{
    const char *root = getenv("GREYBODY_ROOT");
    return root != NULL && root[0] != '\0' ? root : ".";
}

const char *greybodyd_binary(void)
{
    static char path[512];
    const char *configured = getenv("GREYBODYD");
    if (configured != NULL && configured[0] != '\0') {
        return configured;
    }
    snprintf(path, sizeof path, "%s/build/greybodyd", greybodyd_root());
    return path;
}

static bool answers_healthz(void *context)
{
    greybodyd_run *run = context;
    CURL *client = curl_easy_init();
    if (client == NULL) {
        return false;
    }
    char url[160];
    snprintf(url, sizeof url, "%s/healthz", run->base_url);
    http_response response;
    char error[256];
    http_options options = {2, run->ca_file};
    bool ok = http_client_exchange(client, url, "GET", NULL, NULL, 0, &options, &response, error,
                                   sizeof error) &&
              response.status == 200;
    http_response_free(&response);
    curl_easy_cleanup(client);
    return ok;
}

static size_t build_argv(const char *listen, const char *const *extra_args, char **argv)
{
    size_t n = 0;
    argv[n++] = (char *)(uintptr_t)greybodyd_binary();
    argv[n++] = "--listen";
    argv[n++] = (char *)(uintptr_t)listen;
    for (size_t i = 0; extra_args != NULL && extra_args[i] != NULL && n + 1 < GREYBODYD_MAX_ARGS;
         i++) {
        argv[n++] = (char *)(uintptr_t)extra_args[i];
    }
    argv[n] = NULL;
    return n;
}

static void log_path_for(const char *log_name, char *out, size_t size)
{
    char folder[400];
    snprintf(folder, sizeof folder, "%s/build/tests", greybodyd_root());
    mkdir(folder, 0755);
    snprintf(out, size, "%s/%s.log", folder, log_name);
}

static bool start_server(greybodyd_run *run, const char *log_name, const char *ca_file,
                         const char *const *extra_args)
{
    memset(run, 0, sizeof *run);
    run->ca_file = ca_file;
    const char *scheme = ca_file != NULL ? "https" : "http";
    log_path_for(log_name, run->log_path, sizeof run->log_path);
    for (int attempt = 0; attempt < START_ATTEMPTS; attempt++) {
        run->port = server_process_free_port();
        if (run->port <= 0) {
            continue;
        }
        char listen[64];
        snprintf(listen, sizeof listen, "127.0.0.1:%d", run->port);
        snprintf(run->base_url, sizeof run->base_url, "%s://127.0.0.1:%d", scheme, run->port);
        char *argv[GREYBODYD_MAX_ARGS + 1];
        build_argv(listen, extra_args, argv);
        run->process.pid = -1;
        if (!server_process_spawn(&run->process, argv, run->log_path)) {
            break;
        }
        if (server_process_wait_ready(&run->process, answers_healthz, run, READY_POLLS)) {
            return true;
        }
        /* Another process may have taken the port between the probe and the bind. */
        server_process_kill(&run->process);
    }
    fprintf(stderr, "greybodyd_run: %s did not become healthy; see %s\n", greybodyd_binary(),
            run->log_path);
    return false;
}

bool greybodyd_start(greybodyd_run *run, const char *log_name, const char *scheme,
                     const char *const *extra_args)
{
    if (strcmp(scheme, "http") != 0) {
        fprintf(stderr, "greybodyd_run: scheme %s: use greybodyd_start_https for TLS\n", scheme);
        return false;
    }
    return start_server(run, log_name, NULL, extra_args);
}

bool greybodyd_start_https(greybodyd_run *run, const char *log_name, const char *ca_file,
                           const char *const *extra_args)
{
    return start_server(run, log_name, ca_file, extra_args);
}

static int exit_code(int wait_status)
{
    if (WIFEXITED(wait_status)) {
        return WEXITSTATUS(wait_status);
    }
    return WIFSIGNALED(wait_status) ? 128 + WTERMSIG(wait_status) : -1;
}

static bool never_ready(void *context)
{
    (void)context;
    return false;
}

bool greybodyd_start_expecting_exit(const char *log_name, const char *const *extra_args,
                                    int polls, int *exit_status)
{
    char log_path[512];
    log_path_for(log_name, log_path, sizeof log_path);
    int port = server_process_free_port();
    char listen[64];
    snprintf(listen, sizeof listen, "127.0.0.1:%d", port);
    char *argv[GREYBODYD_MAX_ARGS + 1];
    build_argv(listen, extra_args, argv);
    server_process process = {.pid = -1};
    if (!server_process_spawn(&process, argv, log_path)) {
        return false;
    }
    server_process_wait_ready(&process, never_ready, NULL, polls);
    if (!server_process_has_exited(&process)) {
        server_process_kill(&process);
        return false;
    }
    *exit_status = exit_code(process.wait_status);
    return true;
}

bool greybodyd_stop(greybodyd_run *run, int *exit_status)
{
    if (!server_process_terminate(&run->process, EXIT_POLLS)) {
        return false;
    }
    *exit_status = exit_code(run->process.wait_status);
    return true;
}

void greybodyd_kill(greybodyd_run *run)
{
    server_process_kill(&run->process);
}
