/*
 * fuzz_query.c — the GET request path of every /v1 endpoint, without a
 * socket: query string -> arguments -> gb_params_query_put (what the server
 * does with each argument libmicrohttpd hands it) -> the endpoint's handler
 * reading strings -> the answer checks of reply_check.h.
 *
 * Input: a request target, e.g. /v1/peak?temperature=5778&temperature_unit=K.
 * The query is split as libmicrohttpd splits it: at '&', then at the first
 * '=', each part percent-decoded by libmicrohttpd's own MHD_http_unescape
 * ('+' stays '+'); a part without '=' is a key without a value.
 */
#include <microhttpd.h>
#include <stddef.h>
#include <stdint.h>
#include <stdlib.h>
#include <string.h>

#include "params.h"
#include "reply_check.h"

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size);

/* Adds every argument of `query` (modified in place); false once one is refused. */
static bool put_arguments(json_t *object, char *query, gb_problem *problem)
{
    char *cursor = query;
    while (cursor != NULL && *cursor != '\0') {
        char *next = strchr(cursor, '&');
        if (next != NULL) {
            *next++ = '\0';
        }
        char *equals = strchr(cursor, '=');
        char *value = NULL;
        if (equals != NULL) {
            *equals = '\0';
            value = equals + 1;
            value[MHD_http_unescape(value)] = '\0';
        }
        cursor[MHD_http_unescape(cursor)] = '\0';
        if (!gb_params_query_put(object, cursor, value, problem)) {
            return false;
        }
        cursor = next;
    }
    return true;
}

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
    const gb_config *config = fuzz_config();
    char *target = malloc(size + 1);
    if (target == NULL) {
        return 0;
    }
    memcpy(target, data, size);
    target[size] = '\0';
    char *query = strchr(target, '?');
    if (query != NULL) {
        *query++ = '\0';
    }
    const gb_route *route = fuzz_pick_route(target);

    gb_problem problem;
    gb_problem_clear(&problem);
    gb_reply reply;
    gb_reply_init(&reply);
    json_t *input = json_object();
    if (input == NULL) {
        free(target);
        return 0;
    }
    if (put_arguments(input, query != NULL ? query : target + size, &problem)) {
        gb_call call = {.config = config, .input = input, .from_query = true};
        route->handler(&call, &reply);
    } else {
        gb_reply_problem(&reply, &problem);
    }
    json_decref(input);
    free(target);
    fuzz_check_reply(&reply, route, data, size);
    return 0;
}
