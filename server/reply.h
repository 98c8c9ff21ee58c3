/*
 * reply.h — what a handler hands back: an HTTP status, a body and the few
 * headers that depend on the handler (Allow, Retry-After).  Headers common to
 * every response (CORS, nosniff, Cache-Control on errors) are added by
 * request.c when the response is queued.
 *
 * Ownership: a body set with gb_reply_owned()/gb_reply_json() is malloc'd and
 * freed by gb_reply_release(); a static body is never freed.
 */
#ifndef GREYBODY_REPLY_H
#define GREYBODY_REPLY_H

#include <stdbool.h>
#include <stddef.h>

#include "jsonw.h"
#include "problem.h"

#define GB_CONTENT_JSON "application/json"
#define GB_CONTENT_PROBLEM "application/problem+json"
#define GB_REPLY_EXTRA_HEADERS 4

typedef struct gb_reply {
    int status;               /* 0 until a handler sets it */
    const char *content_type; /* NULL: no body */
    char *body;
    size_t length;
    bool body_static;
    const char *allow;      /* Allow header (405, OPTIONS) or NULL */
    int retry_after;        /* Retry-After seconds, 0 = none */
    const char *www_authenticate; /* WWW-Authenticate header (401) or NULL */
    bool no_store;          /* Cache-Control: no-store (always on errors) */
    const char *problem_code; /* for the log: the problem code of an error reply */
    /* Headers of the handler's own (frames: pixel counts); name NULL = unused. */
    struct {
        const char *name;
        char value[96];
    } extra_headers[GB_REPLY_EXTRA_HEADERS];
} gb_reply;

void gb_reply_init(gb_reply *reply);
void gb_reply_release(gb_reply *reply);

/* Takes the writer's buffer as a JSON body (a 500 problem if the writer failed). */
void gb_reply_json(gb_reply *reply, int status, gb_jw *writer);
/* A problem document with its status, Retry-After and no-store. */
void gb_reply_problem(gb_reply *reply, const gb_problem *problem);
/* Shorthand: a server problem. */
void gb_reply_fail(gb_reply *reply, gb_problem_kind kind, const char *field, const char *detail);
/* A body the reply does not own (string literals, the loaded OpenAPI document). */
void gb_reply_static(gb_reply *reply, int status, const char *content_type, const char *body,
                     size_t length);
/* A malloc'd body the reply takes over. */
void gb_reply_owned(gb_reply *reply, int status, const char *content_type, char *body,
                    size_t length);
/* No body (204). */
void gb_reply_empty(gb_reply *reply, int status);

#endif
