/*
 * deadline.h — the read timeout: a client must finish sending each request
 * (request line, headers and body) within --read-timeout seconds, counted
 * from the moment the connection opened or the previous answer was handed
 * over.  libmicrohttpd's own timeout (--timeout) only closes connections
 * that stay silent; a client that trickles a byte now and then would keep a
 * connection, a thread and its memory for ever.  This closes it.
 *
 * How: every connection is registered when libmicrohttpd opens it
 * (MHD_OPTION_NOTIFY_CONNECTION); a watcher thread looks at the registry
 * four times a second and shuts down (shutdown(2), never close(2): the
 * descriptor stays libmicrohttpd's) the socket of any connection still
 * receiving past its deadline.  libmicrohttpd then sees the end of the
 * stream and cleans up as for any client that went away.  The registry lock
 * is held while a socket is shut down and while a closing connection is
 * unregistered, which happens before libmicrohttpd closes the descriptor,
 * so the number can never belong to another connection by then.
 */
#ifndef GREYBODY_DEADLINE_H
#define GREYBODY_DEADLINE_H

#include <microhttpd.h>
#include <stdbool.h>

typedef struct gb_deadlines gb_deadlines;

/* NULL when `seconds` is 0 (no read timeout) or on failure (*failed set). */
gb_deadlines *gb_deadlines_start(unsigned seconds, bool *failed);

/* Stops the watcher; call after the daemon has stopped (every connection is gone). */
void gb_deadlines_stop(gb_deadlines *deadlines);

/* MHD_OPTION_NOTIFY_CONNECTION callback; `cls` is the gb_deadlines (may be NULL). */
void gb_deadlines_notify(void *cls, struct MHD_Connection *connection, void **socket_context,
                         enum MHD_ConnectionNotificationCode code);

/* The request on `connection` has fully arrived: its clock stops. */
void gb_deadlines_received(struct MHD_Connection *connection);

/* The answer was handed over: the clock of the next request starts now. */
void gb_deadlines_restart(struct MHD_Connection *connection);

/* Connections cut so far (for tests and the log). */
unsigned long gb_deadlines_cut_count(const gb_deadlines *deadlines);

#endif
