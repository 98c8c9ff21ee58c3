#include "server.h"

#include <jansson.h>
#include <microhttpd.h>
#include <netdb.h>
#include <stdarg.h>
#include <stdbool.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/socket.h>
#include <time.h>
#include <unistd.h>

#include "log.h"
#include "metrics.h"
#include "openapi.h"
#include "request.h"
#include "tls.h"

#define THREAD_STACK_BYTES ((size_t)1024 * 1024)

struct gb_server {
    gb_context context;
    struct MHD_Daemon *daemon;
    MHD_socket quiesced_socket;
    bool quiesced;
    uint16_t port;
    struct sockaddr_storage address;
    gb_tls tls;
};

/* Undoes a partial start: what gb_server_start acquired before it failed. */
static void release_security(gb_server *server)
{
    gb_deadlines_stop(server->context.deadlines);
    server->context.deadlines = NULL;
    gb_tls_free(&server->tls);
    gb_auth_clear(&server->context.auth);
}

/* libmicrohttpd's own messages, as log events, at most 20 a second. */
static void mhd_logger(void *cls, const char *format, va_list args)
{
    static time_t window;
    static int count;
    (void)cls;
    time_t now = time(NULL);
    if (now != window) {
        window = now;
        count = 0;
    }
    if (++count > 20) {
        return;
    }
    char message[512];
    vsnprintf(message, sizeof message, format, args);
    size_t n = strlen(message);
    while (n > 0 && (message[n - 1] == '\n' || message[n - 1] == '\r')) {
        message[--n] = '\0';
    }
    gb_log_event("warn", "microhttpd", message);
}

/* "host:port", "[v6]:port", ":port" (all IPv4 interfaces) -> socket address. */
static bool resolve(const char *listen, struct sockaddr_storage *out, socklen_t *out_length,
                    char *error, size_t error_size)
{
    char host[256];
    const char *port;
    if (listen[0] == '[') {
        const char *close = strchr(listen, ']');
        if (close == NULL || close[1] != ':' || (size_t)(close - listen - 1) >= sizeof host) {
            snprintf(error, error_size, "--listen %s: expected [address]:port", listen);
            return false;
        }
        memcpy(host, listen + 1, (size_t)(close - listen - 1));
        host[close - listen - 1] = '\0';
        port = close + 2;
    } else {
        const char *colon = strrchr(listen, ':');
        if (colon == NULL || (size_t)(colon - listen) >= sizeof host) {
            snprintf(error, error_size, "--listen %s: expected host:port", listen);
            return false;
        }
        memcpy(host, listen, (size_t)(colon - listen));
        host[colon - listen] = '\0';
        port = colon + 1;
    }
    char *end = NULL;
    long number = strtol(port, &end, 10);
    if (port[0] == '\0' || *end != '\0' || number < 0 || number > 65535) {
        snprintf(error, error_size, "--listen %s: port must be 0-65535", listen);
        return false;
    }
    struct addrinfo hints;
    memset(&hints, 0, sizeof hints);
    hints.ai_family = AF_UNSPEC;
    hints.ai_socktype = SOCK_STREAM;
    hints.ai_flags = AI_NUMERICSERV | AI_PASSIVE;
    struct addrinfo *found = NULL;
    const char *node = host[0] == '\0' || strcmp(host, "*") == 0 ? "0.0.0.0" : host;
    int rc = getaddrinfo(node, port, &hints, &found);
    if (rc != 0 || found == NULL) {
        snprintf(error, error_size, "--listen %s: %s", listen, gai_strerror(rc));
        return false;
    }
    memcpy(out, found->ai_addr, found->ai_addrlen);
    *out_length = found->ai_addrlen;
    freeaddrinfo(found);
    return true;
}

gb_server *gb_server_start(const gb_config *config, char *error, size_t error_size)
{
    gb_server *server = calloc(1, sizeof *server);
    if (server == NULL) {
        snprintf(error, error_size, "out of memory");
        return NULL;
    }
    server->context.config = *config;
    server->quiesced_socket = MHD_INVALID_SOCKET;
    atomic_init(&server->context.draining, false);
    if (!gb_cors_parse(&server->context.cors, config->cors_origins)) {
        snprintf(error, error_size, "--cors-origins: at most %d origins of under 256 characters",
                 GB_CORS_MAX_ORIGINS);
        free(server);
        return NULL;
    }
    socklen_t address_length = 0;
    if (!resolve(config->listen, &server->address, &address_length, error, error_size)) {
        free(server);
        return NULL;
    }
    if (!gb_auth_load(&server->context.auth, config, error, error_size) ||
        !gb_tls_load(&server->tls, config, error, error_size)) {
        release_security(server);
        free(server);
        return NULL;
    }
    bool watcher_failed = false;
    server->context.deadlines = gb_deadlines_start(config->read_timeout_seconds, &watcher_failed);
    if (watcher_failed) {
        snprintf(error, error_size, "cannot start the read-timeout watcher");
        release_security(server);
        free(server);
        return NULL;
    }
    if (sem_init(&server->context.batches, 0, config->max_batches) != 0) {
        snprintf(error, error_size, "cannot create the batch semaphore");
        release_security(server);
        free(server);
        return NULL;
    }
    json_object_seed(0);
    gb_openapi_load(config->openapi_path);

    unsigned flags = MHD_USE_ITC | MHD_USE_ERROR_LOG;
    if (config->threads == 0) {
        flags |= MHD_USE_THREAD_PER_CONNECTION | MHD_USE_POLL_INTERNAL_THREAD;
    } else {
        flags |= MHD_USE_EPOLL_INTERNAL_THREAD;
    }
    if (server->address.ss_family == AF_INET6) {
        flags |= MHD_USE_IPv6;
    }
    if (server->tls.enabled) {
        flags |= MHD_USE_TLS;
    }
    struct MHD_OptionItem tls_options[] = {
        {server->tls.enabled ? MHD_OPTION_HTTPS_MEM_CERT : MHD_OPTION_END, 0,
         server->tls.certificate},
        {MHD_OPTION_HTTPS_MEM_KEY, 0, server->tls.key},
        {MHD_OPTION_END, 0, NULL},
    };
    struct MHD_OptionItem options[] = {
        {MHD_OPTION_EXTERNAL_LOGGER, (intptr_t)mhd_logger, NULL},
        {MHD_OPTION_SOCK_ADDR, 0, &server->address},
        {MHD_OPTION_CONNECTION_LIMIT, (intptr_t)config->max_connections, NULL},
        {MHD_OPTION_CONNECTION_TIMEOUT, (intptr_t)config->timeout_seconds, NULL},
        {MHD_OPTION_THREAD_STACK_SIZE, (intptr_t)THREAD_STACK_BYTES, NULL},
        {MHD_OPTION_NOTIFY_COMPLETED, (intptr_t)gb_request_completed, &server->context},
        {MHD_OPTION_NOTIFY_CONNECTION, (intptr_t)gb_deadlines_notify, server->context.deadlines},
        {MHD_OPTION_PER_IP_CONNECTION_LIMIT, (intptr_t)config->max_connections_per_ip, NULL},
        {MHD_OPTION_CONNECTION_MEMORY_LIMIT, (intptr_t)config->connection_memory_bytes, NULL},
        {config->threads > 0 ? MHD_OPTION_THREAD_POOL_SIZE : MHD_OPTION_END,
         (intptr_t)config->threads, NULL},
        {MHD_OPTION_END, 0, NULL},
    };
    server->daemon = MHD_start_daemon(flags, 0, NULL, NULL, gb_request_access, &server->context,
                                      MHD_OPTION_ARRAY, options, MHD_OPTION_ARRAY, tls_options,
                                      MHD_OPTION_END);
    if (server->daemon == NULL) {
        if (server->tls.enabled) {
            snprintf(error, error_size,
                     "cannot listen on %s with TLS (address in use, or --tls-cert/--tls-key "
                     "rejected: a certificate and its matching unencrypted key?)",
                     config->listen);
        } else {
            snprintf(error, error_size,
                     "cannot listen on %s (address in use or not available?)", config->listen);
        }
        sem_destroy(&server->context.batches);
        release_security(server);
        free(server);
        return NULL;
    }
    const union MHD_DaemonInfo *info =
        MHD_get_daemon_info(server->daemon, MHD_DAEMON_INFO_BIND_PORT);
    server->port = info != NULL ? info->port : 0;
    return server;
}

uint16_t gb_server_port(const gb_server *server)
{
    return server->port;
}

void gb_server_quiesce(gb_server *server)
{
    if (server->quiesced) {
        return;
    }
    atomic_store(&server->context.draining, true);
    server->quiesced_socket = MHD_quiesce_daemon(server->daemon);
    server->quiesced = true;
}

long gb_server_in_flight(const gb_server *server)
{
    (void)server;
    return gb_metrics_in_flight();
}

void gb_server_stop(gb_server *server)
{
    if (server == NULL) {
        return;
    }
    MHD_stop_daemon(server->daemon);
    if (server->quiesced_socket != MHD_INVALID_SOCKET) {
        close(server->quiesced_socket);
    }
    release_security(server);
    sem_destroy(&server->context.batches);
    free(server);
}
