#include "reply_check.h"

#include <jansson.h>
#include <math.h>
#include <stdbool.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "presets.h"

static gb_config config;
static bool configured;

const gb_config *fuzz_config(void)
{
    if (!configured) {
        json_object_seed(0);
        gb_config_defaults(&config);
        config.max_array = 64;
        config.max_draws = 1000;
        config.max_spectrum_points = 256;
        config.max_spectrum_curves = 4;
        char error[512];
        gb_presets *presets = gb_presets_read(NULL, error, sizeof error);
        if (presets != NULL) {
            gb_presets_install(presets);
        } else {
            fprintf(stderr, "fuzz: presets not loaded (%s); preset names will be unknown\n",
                    error);
        }
        configured = true;
    }
    return &config;
}

const gb_route *fuzz_pick_route(const char *path)
{
    size_t found = gb_route_find(path);
    const gb_route *route = gb_route_at(found);
    if (route != NULL && route->kind == GB_ROUTE_COMPUTE) {
        return route;
    }
    size_t compute_routes = 0;
    for (size_t i = 0; i < gb_route_count(); i++) {
        compute_routes += gb_route_at(i)->kind == GB_ROUTE_COMPUTE;
    }
    size_t hash = 0;
    for (const char *p = path; *p != '\0'; p++) {
        hash = hash * 31u + (unsigned char)*p;
    }
    size_t wanted = compute_routes > 0 ? hash % compute_routes : 0;
    for (size_t i = 0; i < gb_route_count(); i++) {
        if (gb_route_at(i)->kind == GB_ROUTE_COMPUTE && wanted-- == 0) {
            return gb_route_at(i);
        }
    }
    return gb_route_at(0);
}

static void fail(const char *why, const gb_reply *reply, const gb_route *route,
                 const uint8_t *input, size_t size)
{
    fprintf(stderr, "fuzz: %s\n  route: %s\n  status: %d\n  input (%zu bytes): %.*s\n  body: %.*s\n",
            why, route->path, reply->status, size, (int)(size < 2000 ? size : 2000),
            (const char *)input, (int)(reply->length < 2000 ? reply->length : 2000),
            reply->body != NULL ? reply->body : "");
    abort();
}

static bool all_numbers_finite(const json_t *value)
{
    if (json_is_number(value)) {
        return isfinite(json_number_value(value));
    }
    const char *key;
    size_t index;
    json_t *child;
    if (json_is_object(value)) {
        json_object_foreach((json_t *)(uintptr_t)value, key, child) {
            if (!all_numbers_finite(child)) {
                return false;
            }
        }
    } else if (json_is_array(value)) {
        json_array_foreach(value, index, child) {
            if (!all_numbers_finite(child)) {
                return false;
            }
        }
    }
    return true;
}

void fuzz_check_reply(gb_reply *reply, const gb_route *route, const uint8_t *input, size_t size)
{
    if (reply->status < 200 || reply->status > 499) {
        fail("status outside 200-499", reply, route, input, size);
    }
    if (reply->body == NULL || reply->length == 0) {
        fail("no body", reply, route, input, size);
    }
    bool is_problem = reply->content_type != NULL &&
                      strcmp(reply->content_type, GB_CONTENT_PROBLEM) == 0;
    bool is_json = reply->content_type != NULL && strcmp(reply->content_type, GB_CONTENT_JSON) == 0;
    if (!is_problem && !is_json) {
        gb_reply_release(reply); /* another media type (CSV, binary): only the status is checked */
        return;
    }
    if (is_problem != (reply->status >= 400)) {
        fail("problem documents go with 4xx, and only there", reply, route, input, size);
    }
    json_error_t error;
    /* jansson refuses NaN and Infinity, so a parsed body has only finite numbers in it. */
    json_t *body = json_loadb(reply->body, reply->length, JSON_REJECT_DUPLICATES, &error);
    if (!json_is_object(body) || !all_numbers_finite(body)) {
        fail("body is not one JSON object of finite numbers", reply, route, input, size);
    }
    if (is_problem) {
        json_t *status = json_object_get(body, "status");
        if (!json_is_integer(status) || json_integer_value(status) != reply->status ||
            !json_is_string(json_object_get(body, "code")) ||
            !json_is_string(json_object_get(body, "title")) ||
            !json_is_string(json_object_get(body, "detail")) ||
            !json_is_string(json_object_get(body, "type")) ||
            json_object_get(body, "field") == NULL) {
            fail("problem document incomplete", reply, route, input, size);
        }
    }
    json_decref(body);
    gb_reply_release(reply);
}
