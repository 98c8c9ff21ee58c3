/*
 * fuzz_body.c — the POST request path of every /v1 endpoint, without a
 * socket: body -> parse (nesting check, jansson) -> the endpoint's handler
 * (validation, core, serialization) -> the answer checks of reply_check.h.
 *
 * Input: the endpoint's path, a newline, then the body, e.g.
 *   /v1/radiance\n{"temperature": 300, "wavelength": 10}
 * A first line that names no /v1 path still picks one (from its bytes), so
 * mutations of the path keep reaching handlers.
 */
#include <stddef.h>
#include <stdint.h>
#include <string.h>

#include "params.h"
#include "reply_check.h"

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size);

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
    const gb_config *config = fuzz_config();
    const uint8_t *newline = memchr(data, '\n', size);
    size_t path_length = newline != NULL ? (size_t)(newline - data) : size;
    char path[128];
    size_t kept = path_length < sizeof path - 1 ? path_length : sizeof path - 1;
    memcpy(path, data, kept);
    path[kept] = '\0';
    const char *body = newline != NULL ? (const char *)newline + 1 : "";
    size_t body_length = newline != NULL ? size - path_length - 1 : 0;

    const gb_route *route = fuzz_pick_route(path);
    gb_problem problem;
    gb_problem_clear(&problem);
    gb_reply reply;
    gb_reply_init(&reply);
    json_t *input = gb_params_parse_body_within(body, body_length, config->max_depth, &problem);
    if (input != NULL) {
        gb_call call = {.config = config, .input = input, .from_query = false};
        route->handler(&call, &reply);
        json_decref(input);
    } else {
        gb_reply_problem(&reply, &problem);
    }
    fuzz_check_reply(&reply, route, data, size);
    return 0;
}
