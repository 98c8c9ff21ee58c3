/*
 * router.h — the route table: path, allowed methods, handler.
 *
 * Paths match exactly (no trailing-slash or prefix matching).  Every route
 * answers OPTIONS (CORS preflight) and HEAD wherever it answers GET.  An
 * unknown path is 404; a known path with another method is 405 with Allow.
 */
#ifndef GREYBODY_ROUTER_H
#define GREYBODY_ROUTER_H

#include <jansson.h>
#include <stdbool.h>
#include <stddef.h>

#include "config.h"
#include "heavywork.h"
#include "reply.h"

typedef enum gb_method {
    GB_METHOD_OTHER = 0,
    GB_METHOD_GET = 1,
    GB_METHOD_HEAD = 2,
    GB_METHOD_POST = 4,
    GB_METHOD_OPTIONS = 8
} gb_method;

gb_method gb_method_parse(const char *name);

/* What a handler gets. */
typedef struct gb_call {
    const gb_config *config;
    json_t *input;   /* /v1 routes: the request's fields (an object); others: NULL */
    bool from_query; /* input came from a GET query string: its values are strings */
    bool draining;   /* the server is shutting down */
    gb_heavy_work *heavy_work; /* /v1 routes: take a slot before heavy computation; else NULL */
} gb_call;

typedef void (*gb_handler)(const gb_call *call, gb_reply *reply);

typedef enum gb_route_kind {
    GB_ROUTE_COMPUTE = 0, /* /v1: input from the query (GET) or a JSON body (POST) */
    GB_ROUTE_OPS          /* operations: no input */
} gb_route_kind;

typedef struct gb_route {
    const char *path;
    unsigned methods;  /* gb_method bits */
    const char *allow; /* the Allow header value, e.g. "GET, HEAD, POST, OPTIONS" */
    gb_route_kind kind;
    gb_handler handler;
} gb_route;

#define GB_ROUTE_NONE ((size_t)-1)

/* The served routes, in table order (for the OpenAPI cross-check). */
size_t gb_route_count(void);
/* The route's path, e.g. "/v1/radiance"; NULL when i is out of range. */
const char *gb_route_path(size_t i);
/*
 * The route's methods as in its Allow header: upper-case names separated by
 * ", ", e.g. "GET, HEAD, POST, OPTIONS"; NULL when i is out of range.
 */
const char *gb_route_methods(size_t i);

const gb_route *gb_route_at(size_t i);
/* Index of the route serving `path`, or GB_ROUTE_NONE. */
size_t gb_route_find(const char *path);

#endif
