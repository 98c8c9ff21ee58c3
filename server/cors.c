#include "cors.h"

#include <microhttpd.h>
#include <string.h>

static void trim(const char **start, const char **end)
{
    while (*start < *end && (**start == ' ' || **start == '\t')) {
        (*start)++;
    }
    while (*end > *start && ((*end)[-1] == ' ' || (*end)[-1] == '\t' || (*end)[-1] == '/')) {
        (*end)--;
    }
}

bool gb_cors_parse(gb_cors *cors, const char *list)
{
    memset(cors, 0, sizeof *cors);
    const char *p = list != NULL ? list : "";
    while (*p != '\0') {
        const char *comma = strchr(p, ',');
        const char *end = comma != NULL ? comma : p + strlen(p);
        const char *start = p;
        trim(&start, &end);
        size_t n = (size_t)(end - start);
        if (n == 1 && *start == '*') {
            cors->any = true;
        } else if (n > 0) {
            if (cors->count >= GB_CORS_MAX_ORIGINS || n >= sizeof cors->origins[0]) {
                return false;
            }
            memcpy(cors->origins[cors->count], start, n);
            cors->origins[cors->count][n] = '\0';
            cors->count++;
        }
        p = comma != NULL ? comma + 1 : end + strlen(end);
    }
    return true;
}

bool gb_cors_allowed(const gb_cors *cors, const char *origin)
{
    if (origin == NULL || origin[0] == '\0') {
        return false;
    }
    if (cors->any) {
        return true;
    }
    for (size_t i = 0; i < cors->count; i++) {
        if (strcmp(origin, cors->origins[i]) == 0) {
            return true;
        }
    }
    return false;
}

void gb_cors_add_headers(const gb_cors *cors, struct MHD_Response *response, const char *origin,
                         const char *preflight_methods)
{
    if (!cors->any && cors->count == 0) {
        return;
    }
    if (!cors->any) {
        /* The answer depends on the Origin: caches must keep them apart. */
        MHD_add_response_header(response, MHD_HTTP_HEADER_VARY, "Origin");
    }
    if (!gb_cors_allowed(cors, origin)) {
        return;
    }
    MHD_add_response_header(response, MHD_HTTP_HEADER_ACCESS_CONTROL_ALLOW_ORIGIN,
                            cors->any ? "*" : origin);
    if (preflight_methods != NULL) {
        MHD_add_response_header(response, "Access-Control-Allow-Methods", preflight_methods);
        MHD_add_response_header(response, "Access-Control-Allow-Headers",
                                GB_CORS_ALLOW_HEADERS);
        MHD_add_response_header(response, "Access-Control-Max-Age", GB_CORS_MAX_AGE);
    } else {
        MHD_add_response_header(response, "Access-Control-Expose-Headers",
                                "Retry-After, Allow");
    }
}
