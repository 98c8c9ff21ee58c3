#include "reply.h"

#include <stdint.h>
#include <stdlib.h>
#include <string.h>

void gb_reply_init(gb_reply *reply)
{
    memset(reply, 0, sizeof *reply);
}

void gb_reply_release(gb_reply *reply)
{
    if (!reply->body_static) {
        free(reply->body);
    }
    reply->body = NULL;
    reply->length = 0;
}

static void internal_error(gb_reply *reply)
{
    static const char body[] =
        "{\"type\":\"" GB_PROBLEM_TYPE_BASE "internal_error\",\"title\":\"Internal error\","
        "\"status\":500,\"detail\":\"Out of memory while writing the response.\","
        "\"code\":\"internal_error\",\"field\":null}";
    gb_reply_static(reply, 500, GB_CONTENT_PROBLEM, body, sizeof body - 1);
    reply->no_store = true;
    reply->problem_code = "internal_error";
}

void gb_reply_json(gb_reply *reply, int status, gb_jw *writer)
{
    size_t length = 0;
    char *body = gb_jw_take(writer, &length);
    if (body == NULL) {
        internal_error(reply);
        return;
    }
    gb_reply_owned(reply, status, GB_CONTENT_JSON, body, length);
}

void gb_reply_problem(gb_reply *reply, const gb_problem *problem)
{
    size_t length = 0;
    char *body = gb_problem_render(problem, &length);
    if (body == NULL) {
        internal_error(reply);
        return;
    }
    gb_reply_owned(reply, problem->http_status, GB_CONTENT_PROBLEM, body, length);
    reply->retry_after = problem->retry_after;
    reply->no_store = true;
    reply->problem_code = problem->code;
}

void gb_reply_fail(gb_reply *reply, gb_problem_kind kind, const char *field, const char *detail)
{
    gb_problem problem;
    gb_problem_clear(&problem);
    if (detail != NULL) {
        gb_problem_set(&problem, kind, field, "%s", detail);
    } else {
        gb_problem_set(&problem, kind, field, NULL);
    }
    gb_reply_problem(reply, &problem);
}

void gb_reply_static(gb_reply *reply, int status, const char *content_type, const char *body,
                     size_t length)
{
    gb_reply_release(reply);
    reply->status = status;
    reply->content_type = content_type;
    reply->body = (char *)(uintptr_t)body;
    reply->length = length;
    reply->body_static = true;
}

void gb_reply_owned(gb_reply *reply, int status, const char *content_type, char *body,
                    size_t length)
{
    gb_reply_release(reply);
    reply->status = status;
    reply->content_type = content_type;
    reply->body = body;
    reply->length = length;
    reply->body_static = false;
}

void gb_reply_empty(gb_reply *reply, int status)
{
    gb_reply_release(reply);
    reply->status = status;
    reply->content_type = NULL;
    reply->body_static = true;
}
