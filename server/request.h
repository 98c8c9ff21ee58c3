/*
 * request.h — one HTTP request's life inside libmicrohttpd.
 *
 * First call of the access handler: the request is remembered (per-request
 * state in *con_cls) and nothing is answered, except an early 413 when
 * Content-Length already exceeds the body limit.  Body calls: chunks are
 * copied into a buffer capped at max_body_bytes (beyond it they are
 * discarded and the request is marked too large).  Final call: route, method,
 * media type, limits, parse, handler, response.  The completion callback
 * (also run for aborted requests) records metrics, writes the log line and
 * frees the state.
 */
#ifndef GREYBODY_REQUEST_H
#define GREYBODY_REQUEST_H

#include <microhttpd.h>
#include <semaphore.h>
#include <stdatomic.h>
#include <stdbool.h>

#include "auth.h"
#include "config.h"
#include "cors.h"
#include "deadline.h"

/* Bodies above this size are "large": parsed and computed under gb_context.batches. */
#define GB_LARGE_BODY_BYTES (64u * 1024u)
/* How long a large request waits for a free slot before 503. */
#define GB_BATCH_WAIT_SECONDS 2

/* What every request of one server shares. */
typedef struct gb_context {
    gb_config config;
    gb_cors cors;
    sem_t batches;       /* large requests computed at once */
    atomic_bool draining; /* shutting down: /readyz says so, responses close */
    gb_auth auth;          /* bearer token, when configured */
    gb_deadlines *deadlines; /* read timeout watcher, NULL when off */
} gb_context;

/* libmicrohttpd callbacks; `cls` is the gb_context. */
enum MHD_Result gb_request_access(void *cls, struct MHD_Connection *connection, const char *url,
                                  const char *method, const char *version,
                                  const char *upload_data, size_t *upload_data_size,
                                  void **con_cls);
void gb_request_completed(void *cls, struct MHD_Connection *connection, void **con_cls,
                          enum MHD_RequestTerminationCode reason);

#endif
