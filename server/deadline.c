#include "deadline.h"

#include <pthread.h>
#include <stdatomic.h>
#include <stdio.h>
#include <stdlib.h>
#include <sys/socket.h>
#include <time.h>

#include "log.h"

#define WATCH_INTERVAL_NS 250000000L

typedef struct watched {
    struct watched *previous;
    struct watched *next;
    MHD_socket socket;
    atomic_llong since_ns;  /* monotonic clock at which the current request began */
    atomic_bool receiving; /* the current request has not fully arrived yet */
    bool cut;
} watched;

struct gb_deadlines {
    long long limit_ns;
    pthread_mutex_t lock;
    pthread_cond_t wake;
    bool stopping;
    pthread_t thread;
    watched *head;
    atomic_ulong cut_count;
};

static long long now_ns(void)
{
    struct timespec now;
    clock_gettime(CLOCK_MONOTONIC, &now);
    return (long long)now.tv_sec * 1000000000LL + now.tv_nsec;
}

static void cut_overdue(gb_deadlines *deadlines)
{
    long long now = now_ns();
    unsigned long cut_now = 0;
    for (watched *entry = deadlines->head; entry != NULL; entry = entry->next) {
        if (entry->cut || !atomic_load(&entry->receiving) ||
            now - atomic_load(&entry->since_ns) <= deadlines->limit_ns) {
            continue;
        }
        shutdown(entry->socket, SHUT_RDWR);
        entry->cut = true;
        cut_now++;
    }
    if (cut_now > 0) {
        atomic_fetch_add(&deadlines->cut_count, cut_now);
        char message[96];
        snprintf(message, sizeof message, "closed %lu connection(s) past the read timeout",
                 cut_now);
        gb_log_event("warn", "read_timeout", message);
    }
}

static void *watch(void *argument)
{
    gb_deadlines *deadlines = argument;
    pthread_mutex_lock(&deadlines->lock);
    while (!deadlines->stopping) {
        struct timespec until;
        clock_gettime(CLOCK_REALTIME, &until);
        until.tv_nsec += WATCH_INTERVAL_NS;
        if (until.tv_nsec >= 1000000000L) {
            until.tv_sec += 1;
            until.tv_nsec -= 1000000000L;
        }
        pthread_cond_timedwait(&deadlines->wake, &deadlines->lock, &until);
        if (!deadlines->stopping) {
            cut_overdue(deadlines);
        }
    }
    pthread_mutex_unlock(&deadlines->lock);
    return NULL;
}

gb_deadlines *gb_deadlines_start(unsigned seconds, bool *failed)
{
    *failed = false;
    if (seconds == 0) {
        return NULL;
    }
    gb_deadlines *deadlines = calloc(1, sizeof *deadlines);
    if (deadlines == NULL) {
        *failed = true;
        return NULL;
    }
    deadlines->limit_ns = (long long)seconds * 1000000000LL;
    atomic_init(&deadlines->cut_count, 0);
    pthread_mutex_init(&deadlines->lock, NULL);
    pthread_cond_init(&deadlines->wake, NULL);
    if (pthread_create(&deadlines->thread, NULL, watch, deadlines) != 0) {
        pthread_cond_destroy(&deadlines->wake);
        pthread_mutex_destroy(&deadlines->lock);
        free(deadlines);
        *failed = true;
        return NULL;
    }
    return deadlines;
}

void gb_deadlines_stop(gb_deadlines *deadlines)
{
    if (deadlines == NULL) {
        return;
    }
    pthread_mutex_lock(&deadlines->lock);
    deadlines->stopping = true;
    pthread_cond_signal(&deadlines->wake);
    pthread_mutex_unlock(&deadlines->lock);
    pthread_join(deadlines->thread, NULL);
    /* Connections still listed (none after MHD_stop_daemon) are only records: free them. */
    while (deadlines->head != NULL) {
        watched *entry = deadlines->head;
        deadlines->head = entry->next;
        free(entry);
    }
    pthread_cond_destroy(&deadlines->wake);
    pthread_mutex_destroy(&deadlines->lock);
    free(deadlines);
}

void gb_deadlines_notify(void *cls, struct MHD_Connection *connection, void **socket_context,
                         enum MHD_ConnectionNotificationCode code)
{
    gb_deadlines *deadlines = cls;
    if (deadlines == NULL) {
        return;
    }
    if (code == MHD_CONNECTION_NOTIFY_STARTED) {
        const union MHD_ConnectionInfo *info =
            MHD_get_connection_info(connection, MHD_CONNECTION_INFO_CONNECTION_FD);
        watched *entry = info != NULL ? calloc(1, sizeof *entry) : NULL;
        if (entry == NULL) {
            return; /* unwatched: libmicrohttpd's idle timeout still applies */
        }
        entry->socket = info->connect_fd;
        atomic_init(&entry->since_ns, now_ns());
        atomic_init(&entry->receiving, true);
        pthread_mutex_lock(&deadlines->lock);
        entry->next = deadlines->head;
        if (deadlines->head != NULL) {
            deadlines->head->previous = entry;
        }
        deadlines->head = entry;
        pthread_mutex_unlock(&deadlines->lock);
        *socket_context = entry;
        return;
    }
    watched *entry = *socket_context;
    if (entry == NULL) {
        return;
    }
    pthread_mutex_lock(&deadlines->lock);
    if (entry->previous != NULL) {
        entry->previous->next = entry->next;
    } else {
        deadlines->head = entry->next;
    }
    if (entry->next != NULL) {
        entry->next->previous = entry->previous;
    }
    pthread_mutex_unlock(&deadlines->lock);
    free(entry);
    *socket_context = NULL;
}

static watched *watched_of(struct MHD_Connection *connection)
{
    const union MHD_ConnectionInfo *info =
        MHD_get_connection_info(connection, MHD_CONNECTION_INFO_SOCKET_CONTEXT);
    return info != NULL ? info->socket_context : NULL;
}

void gb_deadlines_received(struct MHD_Connection *connection)
{
    watched *entry = watched_of(connection);
    if (entry != NULL) {
        atomic_store(&entry->receiving, false);
    }
}

void gb_deadlines_restart(struct MHD_Connection *connection)
{
    watched *entry = watched_of(connection);
    if (entry != NULL) {
        atomic_store(&entry->since_ns, now_ns());
        atomic_store(&entry->receiving, true);
    }
}

unsigned long gb_deadlines_cut_count(const gb_deadlines *deadlines)
{
    return deadlines != NULL ? atomic_load(&deadlines->cut_count) : 0;
}
