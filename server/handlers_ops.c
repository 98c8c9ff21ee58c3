/* Operations endpoints: /healthz, /readyz, /version, /metrics, /openapi.json. */
#include <jansson.h>
#include <microhttpd.h>
#include <stdio.h>

#include "handlers.h"
#include "metrics.h"
#include "openapi.h"
#include "version.h"

void gb_handle_healthz(const gb_call *call, gb_reply *reply)
{
    static const char body[] = "{\"status\":\"ok\"}";
    (void)call;
    gb_reply_static(reply, 200, GB_CONTENT_JSON, body, sizeof body - 1);
    reply->no_store = true;
}

void gb_handle_readyz(const gb_call *call, gb_reply *reply)
{
    static const char ready[] = "{\"status\":\"ready\"}";
    static const char draining[] = "{\"status\":\"draining\"}";
    if (call->draining) {
        gb_reply_static(reply, 503, GB_CONTENT_JSON, draining, sizeof draining - 1);
        reply->retry_after = 1;
    } else {
        gb_reply_static(reply, 200, GB_CONTENT_JSON, ready, sizeof ready - 1);
    }
    reply->no_store = true;
}

void gb_handle_version(const gb_call *call, gb_reply *reply)
{
    gb_jw w;
    gb_jw_init(&w, 512);
    gb_jw_object_begin(&w);
    gb_jw_kstring(&w, "name", GREYBODY_NAME);
    gb_jw_kstring(&w, "version", GREYBODY_VERSION);
    const char *api = gb_openapi_api_version(call->config->openapi_path);
    if (api != NULL) {
        gb_jw_kstring(&w, "api", api); /* the contract's version (info.version) */
    }
    gb_jw_key(&w, "build");
    gb_jw_object_begin(&w);
#ifdef GREYBODY_COMMIT
    gb_jw_kstring(&w, "commit", GREYBODY_COMMIT);
#endif
#if defined(__clang__)
    gb_jw_kstring(&w, "compiler", "clang " __clang_version__);
#elif defined(__GNUC__)
    gb_jw_kstring(&w, "compiler", "gcc " __VERSION__);
#endif
    gb_jw_kstring(&w, "microhttpd", MHD_get_version());
    gb_jw_kstring(&w, "jansson", JANSSON_VERSION);
    gb_jw_object_end(&w);
    gb_jw_object_end(&w);
    gb_reply_json(reply, 200, &w);
}

void gb_handle_metrics(const gb_call *call, gb_reply *reply)
{
    (void)call;
    size_t length = 0;
    char *text = gb_metrics_render(&length);
    if (text == NULL) {
        gb_reply_fail(reply, GB_PROBLEM_INTERNAL, NULL, "Out of memory.");
        return;
    }
    gb_reply_owned(reply, 200, GB_METRICS_CONTENT_TYPE, text, length);
    reply->no_store = true;
}

void gb_handle_openapi(const gb_call *call, gb_reply *reply)
{
    size_t length = 0;
    const char *document = gb_openapi_document(call->config->openapi_path, &length);
    if (document == NULL) {
        gb_problem problem;
        gb_problem_clear(&problem);
        /* The file tried is in the start-up log line, not here: paths are internal details. */
        gb_problem_set(&problem, GB_PROBLEM_OPENAPI_UNAVAILABLE, NULL,
                       "The server could not load its OpenAPI document; its operator can set "
                       "--openapi or GREYBODY_OPENAPI.");
        gb_reply_problem(reply, &problem);
        return;
    }
    gb_reply_static(reply, 200, GB_CONTENT_JSON, document, length);
}
