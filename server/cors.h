/*
 * cors.h — Cross-Origin Resource Sharing for browser dashboards.
 *
 * The allow-list is "*" (any origin) or a comma-separated list of exact
 * origins ("https://a.example,http://localhost:3000"); empty means no CORS
 * headers at all.  Access-Control-Allow-Origin goes on every response to an
 * allowed Origin (not only on the preflight); a preflight (OPTIONS with
 * Access-Control-Request-Method) from an allowed origin also gets
 * Allow-Methods, Allow-Headers and Max-Age.
 */
#ifndef GREYBODY_CORS_H
#define GREYBODY_CORS_H

#include <stdbool.h>
#include <stddef.h>

#include "config.h"

struct MHD_Response;

typedef struct gb_cors {
    bool any;
    size_t count;
    char origins[GB_CORS_MAX_ORIGINS][256];
} gb_cors;

/* false when the list is malformed (too many or too long origins). */
bool gb_cors_parse(gb_cors *cors, const char *list);

bool gb_cors_allowed(const gb_cors *cors, const char *origin);

#define GB_CORS_MAX_AGE "600"
#define GB_CORS_ALLOW_HEADERS "Content-Type, Accept, Authorization"

/*
 * Adds the CORS headers for a request from `origin` (may be NULL).
 * `preflight_methods` is the route's method list when the request is a
 * preflight, else NULL.
 */
void gb_cors_add_headers(const gb_cors *cors, struct MHD_Response *response, const char *origin,
                         const char *preflight_methods);

#endif
