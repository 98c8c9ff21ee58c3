/*
 * server.h — the greybodyd daemon: start libmicrohttpd on the configured
 * address, stop accepting (quiesce), and stop.
 *
 * Threading: --threads 0 (default) runs a thread per connection (a slow
 * batch request never delays other connections); --threads N runs a pool of
 * N epoll workers.  Either way large requests are bounded by --max-batches.
 * Thread stacks are 1 MiB and JSON nesting is checked before parsing.
 *
 * Call json_object_seed(0) before gb_server_start() when threads may already
 * exist; gb_server_start() calls it itself otherwise (it is idempotent).
 */
#ifndef GREYBODY_SERVER_H
#define GREYBODY_SERVER_H

#include <stddef.h>
#include <stdint.h>

#include "config.h"

typedef struct gb_server gb_server;

/* NULL on failure, with a message in `error`. */
gb_server *gb_server_start(const gb_config *config, char *error, size_t error_size);

/* The port actually bound (useful with --listen host:0). */
uint16_t gb_server_port(const gb_server *server);

/* Stops accepting connections; answers in flight finish; /readyz turns 503. */
void gb_server_quiesce(gb_server *server);

/* Requests being received, computed or sent. */
long gb_server_in_flight(const gb_server *server);

/* Stops the daemon (closing idle connections) and frees everything. */
void gb_server_stop(gb_server *server);

#endif
