#include "request.h"

#include <errno.h>
#include <jansson.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <strings.h>
#include <time.h>

#include "csv_batch.h"
#include "frames.h"
#include "heavywork.h"
#include "log.h"
#include "metrics.h"
#include "params.h"
#include "problem.h"
#include "reply.h"
#include "router.h"

#define PATH_KEEP 600

typedef struct gb_request {
    struct timespec started;
    gb_method method;
    char method_name[16];
    char path[PATH_KEEP];
    size_t route;
    bool want_body;        /* a POST to a /v1 route with a JSON body: keep it */
    bool media_ok;         /* Content-Type is application/json */
    bool frame;            /* a POST of application/octet-stream frames (frames.h) */
    bool csv;              /* a POST of a text/csv batch (csv_batch.h) */
    char *body;
    size_t body_length;
    size_t body_capacity;
    bool body_too_large;
    bool responded;
    int status;
    size_t bytes;
    const char *problem_code;
} gb_request;

static double seconds_since(const struct timespec *start)
{
    struct timespec now;
    clock_gettime(CLOCK_MONOTONIC, &now);
    return (double)(now.tv_sec - start->tv_sec) + (double)(now.tv_nsec - start->tv_nsec) / 1e9;
}

/* "application/json", optionally with "; charset=utf-8" (any case, quotes allowed). */
static bool is_json_media_type(const char *value)
{
    if (value == NULL) {
        return false;
    }
    while (*value == ' ' || *value == '\t') {
        value++;
    }
    static const char json[] = "application/json";
    if (strncasecmp(value, json, sizeof json - 1) != 0) {
        return false;
    }
    const char *p = value + sizeof json - 1;
    while (*p == ' ' || *p == '\t') {
        p++;
    }
    while (*p == ';') {
        p++;
        while (*p == ' ' || *p == '\t') {
            p++;
        }
        const char *end = strchr(p, ';');
        size_t n = end != NULL ? (size_t)(end - p) : strlen(p);
        while (n > 0 && (p[n - 1] == ' ' || p[n - 1] == '\t')) {
            n--;
        }
        if (n >= 8 && strncasecmp(p, "charset=", 8) == 0) {
            const char *charset = p + 8;
            size_t m = n - 8;
            if (m >= 2 && charset[0] == '"' && charset[m - 1] == '"') {
                charset++;
                m -= 2;
            }
            if (!((m == 5 && strncasecmp(charset, "utf-8", 5) == 0) ||
                  (m == 4 && strncasecmp(charset, "utf8", 4) == 0))) {
                return false;
            }
        } else if (n > 0) {
            return false; /* no other parameters are defined for application/json */
        }
        p += n;
        while (*p == ' ' || *p == '\t') {
            p++;
        }
    }
    return *p == '\0';
}

static bool append_body(gb_request *rq, size_t limit, const char *data, size_t size)
{
    if (rq->body_too_large || size > limit - rq->body_length) {
        rq->body_too_large = true;
        free(rq->body);
        rq->body = NULL;
        rq->body_length = rq->body_capacity = 0;
        return false;
    }
    if (rq->body_length + size > rq->body_capacity) {
        size_t capacity = rq->body_capacity ? rq->body_capacity : 4096;
        while (capacity < rq->body_length + size) {
            capacity = capacity > limit / 2 ? limit : capacity * 2;
        }
        char *grown = realloc(rq->body, capacity);
        if (grown == NULL) {
            rq->body_too_large = true; /* cannot hold it: treat as over the limit */
            free(rq->body);
            rq->body = NULL;
            rq->body_length = rq->body_capacity = 0;
            return false;
        }
        rq->body = grown;
        rq->body_capacity = capacity;
    }
    memcpy(rq->body + rq->body_length, data, size);
    rq->body_length += size;
    return true;
}

static void run_compute(gb_context *context, struct MHD_Connection *connection, gb_request *rq,
                        const gb_route *route, gb_reply *reply)
{
    gb_problem problem;
    gb_problem_clear(&problem);
    json_t *input = NULL;
    bool from_query = rq->method != GB_METHOD_POST;
    gb_heavy_work heavy = {&context->batches, GB_BATCH_WAIT_SECONDS, false};
    if (rq->frame) {
        gb_frames_serve(context, connection, route, &rq->body, rq->body_length,
                        rq->body_too_large, &heavy, reply);
        gb_heavy_work_leave(&heavy);
        return;
    }
    if (rq->csv) {
        gb_csv_batch_serve(context, connection, route, &rq->body, rq->body_length,
                           rq->body_too_large, &heavy, reply);
        gb_heavy_work_leave(&heavy);
        return;
    }

    if (from_query) {
        input = gb_params_from_query(connection, &problem);
    } else if (!rq->media_ok) {
        gb_problem_set(&problem, GB_PROBLEM_UNSUPPORTED_MEDIA_TYPE, NULL,
                       "Send the request body as Content-Type: application/json.");
    } else if (rq->body_too_large) {
        gb_problem_set(&problem, GB_PROBLEM_BODY_TOO_LARGE, NULL,
                       "The request body is larger than %zu bytes.",
                       context->config.max_body_bytes);
    } else {
        if (rq->body_length > GB_LARGE_BODY_BYTES) {
            if (!gb_heavy_work_enter(&heavy)) {
                gb_heavy_work_refused(&problem, "large requests");
            }
        }
        if (!gb_problem_is_set(&problem)) {
            input = gb_params_parse_body_within(rq->body, rq->body_length,
                                                context->config.max_depth, &problem);
        }
        free(rq->body); /* parsed (or refused): the text is no longer needed */
        rq->body = NULL;
        rq->body_length = rq->body_capacity = 0;
    }

    if (input != NULL) {
        gb_call call = {&context->config, input, from_query,
                        atomic_load(&context->draining), &heavy};
        route->handler(&call, reply);
        json_decref(input);
    } else {
        gb_reply_problem(reply, &problem);
    }
    gb_heavy_work_leave(&heavy);
}

static void dispatch(gb_context *context, struct MHD_Connection *connection, gb_request *rq,
                     gb_reply *reply, const char **preflight_methods)
{
    if (rq->route == GB_ROUTE_NONE) {
        gb_problem problem;
        gb_problem_clear(&problem);
        gb_problem_set(&problem, GB_PROBLEM_NOT_FOUND, NULL,
                       "No endpoint at this path; GET /openapi.json lists them.");
        gb_reply_problem(reply, &problem);
        return;
    }
    const gb_route *route = gb_route_at(rq->route);
    if (!(route->methods & (unsigned)rq->method)) {
        gb_problem problem;
        gb_problem_clear(&problem);
        gb_problem_set(&problem, GB_PROBLEM_METHOD_NOT_ALLOWED, NULL,
                       "%.15s is not allowed here; allowed: %s.", rq->method_name,
                       route->allow);
        gb_reply_problem(reply, &problem);
        reply->allow = route->allow;
        return;
    }
    if (rq->method == GB_METHOD_OPTIONS) {
        gb_reply_empty(reply, 204);
        reply->allow = route->allow;
        if (MHD_lookup_connection_value(connection, MHD_HEADER_KIND,
                                        "Access-Control-Request-Method") != NULL) {
            *preflight_methods = route->allow;
        }
        return;
    }
    if (route->kind == GB_ROUTE_OPS) {
        gb_call call = {&context->config, NULL, false, atomic_load(&context->draining), NULL};
        route->handler(&call, reply);
        return;
    }
    run_compute(context, connection, rq, route, reply);
}

static enum MHD_Result queue(gb_context *context, struct MHD_Connection *connection,
                             gb_request *rq, gb_reply *reply, const char *preflight_methods)
{
    struct MHD_Response *response;
    if (reply->status == 0) {
        gb_reply_fail(reply, GB_PROBLEM_INTERNAL, NULL, "The handler gave no response.");
    }
    if (reply->status < 400 && reply->length > context->config.max_response_bytes) {
        gb_reply_release(reply);
        gb_reply_fail(reply, GB_PROBLEM_RESPONSE_TOO_LARGE, NULL,
                      "The answer would be larger than the server's limit; ask for fewer "
                      "values per request.");
    }
    if (reply->body == NULL || reply->length == 0) {
        response = MHD_create_response_from_buffer(0, NULL, MHD_RESPMEM_PERSISTENT);
    } else if (reply->body_static) {
        response = MHD_create_response_from_buffer(reply->length, reply->body,
                                                   MHD_RESPMEM_PERSISTENT);
    } else {
        response = MHD_create_response_from_buffer(reply->length, reply->body,
                                                   MHD_RESPMEM_MUST_FREE);
        if (response != NULL) {
            reply->body = NULL; /* now owned by the response */
        }
    }
    if (response == NULL) {
        gb_reply_release(reply);
        return MHD_NO;
    }
    if (reply->content_type != NULL) {
        MHD_add_response_header(response, MHD_HTTP_HEADER_CONTENT_TYPE, reply->content_type);
    }
    MHD_add_response_header(response, "X-Content-Type-Options", "nosniff");
    if (reply->no_store || reply->status >= 400) {
        MHD_add_response_header(response, MHD_HTTP_HEADER_CACHE_CONTROL, "no-store");
    }
    if (reply->allow != NULL) {
        MHD_add_response_header(response, MHD_HTTP_HEADER_ALLOW, reply->allow);
    }
    if (reply->www_authenticate != NULL) {
        MHD_add_response_header(response, MHD_HTTP_HEADER_WWW_AUTHENTICATE,
                                reply->www_authenticate);
    }
    for (size_t i = 0; i < GB_REPLY_EXTRA_HEADERS && reply->extra_headers[i].name != NULL; i++) {
        MHD_add_response_header(response, reply->extra_headers[i].name,
                                reply->extra_headers[i].value);
    }
    if (reply->retry_after > 0) {
        char seconds[16];
        snprintf(seconds, sizeof seconds, "%d", reply->retry_after);
        MHD_add_response_header(response, MHD_HTTP_HEADER_RETRY_AFTER, seconds);
    }
    if (atomic_load(&context->draining)) {
        MHD_add_response_header(response, MHD_HTTP_HEADER_CONNECTION, "close");
    }
    gb_cors_add_headers(&context->cors, response,
                        MHD_lookup_connection_value(connection, MHD_HEADER_KIND,
                                                    MHD_HTTP_HEADER_ORIGIN),
                        preflight_methods);

    rq->responded = true;
    rq->status = reply->status;
    rq->bytes = rq->method == GB_METHOD_HEAD ? 0 : reply->length;
    rq->problem_code = reply->problem_code;
    enum MHD_Result result = MHD_queue_response(connection, (unsigned)reply->status, response);
    MHD_destroy_response(response);
    gb_reply_release(reply);
    return result;
}

static gb_request *start(struct MHD_Connection *connection, const char *url, const char *method)
{
    gb_request *rq = calloc(1, sizeof *rq);
    if (rq == NULL) {
        return NULL;
    }
    clock_gettime(CLOCK_MONOTONIC, &rq->started);
    gb_metrics_in_flight_add(1);
    snprintf(rq->method_name, sizeof rq->method_name, "%s", method);
    snprintf(rq->path, sizeof rq->path, "%s", url);
    rq->method = gb_method_parse(method);
    rq->route = gb_route_find(url);
    const gb_route *route = gb_route_at(rq->route);
    rq->media_ok = is_json_media_type(
        MHD_lookup_connection_value(connection, MHD_HEADER_KIND, MHD_HTTP_HEADER_CONTENT_TYPE));
    rq->frame = rq->method == GB_METHOD_POST &&
                gb_frames_accepts(route, MHD_lookup_connection_value(connection, MHD_HEADER_KIND,
                                                                     MHD_HTTP_HEADER_CONTENT_TYPE));
    rq->csv = rq->method == GB_METHOD_POST &&
              gb_csv_batch_accepts(route, MHD_lookup_connection_value(
                                              connection, MHD_HEADER_KIND,
                                              MHD_HTTP_HEADER_CONTENT_TYPE));
    rq->want_body = route != NULL && route->kind == GB_ROUTE_COMPUTE &&
                    rq->method == GB_METHOD_POST && (rq->media_ok || rq->frame || rq->csv);
    return rq;
}

enum MHD_Result gb_request_access(void *cls, struct MHD_Connection *connection, const char *url,
                                  const char *method, const char *version,
                                  const char *upload_data, size_t *upload_data_size,
                                  void **con_cls)
{
    gb_context *context = cls;
    gb_request *rq = *con_cls;
    (void)version;

    if (rq == NULL) {
        rq = start(connection, url, method);
        if (rq == NULL) {
            return MHD_NO;
        }
        *con_cls = rq;
        gb_auth_verdict verdict = gb_auth_check(
            &context->auth, url, rq->method == GB_METHOD_OPTIONS,
            MHD_lookup_connection_value(connection, MHD_HEADER_KIND,
                                        MHD_HTTP_HEADER_AUTHORIZATION));
        if (verdict != GB_AUTH_GRANTED) {
            /* Refused before the body is read; the connection closes after the answer. */
            gb_reply reply;
            gb_reply_init(&reply);
            gb_reply_fail(&reply, GB_PROBLEM_UNAUTHORIZED, NULL,
                          verdict == GB_AUTH_MISSING
                              ? "This server needs \"Authorization: Bearer <token>\"."
                              : "The bearer token is not valid.");
            reply.www_authenticate = gb_auth_challenge(verdict);
            return queue(context, connection, rq, &reply, NULL);
        }
        if (rq->want_body) {
            const char *length = MHD_lookup_connection_value(connection, MHD_HEADER_KIND,
                                                             MHD_HTTP_HEADER_CONTENT_LENGTH);
            if (length != NULL) {
                char *end = NULL;
                errno = 0;
                unsigned long long declared = strtoull(length, &end, 10);
                if (errno != ERANGE && declared > 0 &&
                    declared <= context->config.max_body_bytes) {
                    /* The size is announced: one allocation instead of a growing buffer. */
                    rq->body = malloc((size_t)declared);
                    rq->body_capacity = rq->body != NULL ? (size_t)declared : 0;
                }
                if (errno == ERANGE || declared > context->config.max_body_bytes) {
                    /* Refuse at once rather than read a body we would throw away. */
                    gb_reply reply;
                    gb_reply_init(&reply);
                    gb_problem problem;
                    gb_problem_clear(&problem);
                    gb_problem_set(&problem, GB_PROBLEM_BODY_TOO_LARGE, NULL,
                                   "The request body is larger than %zu bytes.",
                                   context->config.max_body_bytes);
                    gb_reply_problem(&reply, &problem);
                    return queue(context, connection, rq, &reply, NULL);
                }
            }
        }
        return MHD_YES;
    }

    if (*upload_data_size > 0) {
        if (rq->want_body && !rq->responded) {
            append_body(rq, context->config.max_body_bytes, upload_data, *upload_data_size);
        }
        *upload_data_size = 0;
        return MHD_YES;
    }
    if (rq->responded) {
        return MHD_YES;
    }
    gb_deadlines_received(connection);

    gb_reply reply;
    gb_reply_init(&reply);
    const char *preflight_methods = NULL;
    dispatch(context, connection, rq, &reply, &preflight_methods);
    return queue(context, connection, rq, &reply, preflight_methods);
}

void gb_request_completed(void *cls, struct MHD_Connection *connection, void **con_cls,
                          enum MHD_RequestTerminationCode reason)
{
    gb_request *rq = *con_cls;
    (void)cls;
    gb_deadlines_restart(connection);
    if (rq == NULL) {
        return;
    }
    *con_cls = NULL;
    double seconds = seconds_since(&rq->started);
    int status = rq->responded ? rq->status : 0;
    if (rq->responded) {
        gb_metrics_observe(rq->route, status, seconds);
    }
    const char *code = rq->problem_code;
    if (reason != MHD_REQUEST_TERMINATED_COMPLETED_OK && code == NULL) {
        code = "connection_aborted";
    }
    gb_log_request(rq->method_name, rq->path, status, seconds * 1000.0, rq->bytes, code);
    gb_metrics_in_flight_add(-1);
    free(rq->body);
    free(rq);
}
