/*
 * /v1/presets: the band presets and the table of typical emissivities loaded
 * at start-up (presets.h), with the warning that a table emissivity is a
 * starting point, not a measurement.
 */
#include "handlers.h"
#include "presets.h"

void gb_handle_presets(const gb_call *call, gb_reply *reply)
{
    size_t length = 0;
    const char *document = gb_presets_document(&length);
    (void)call;
    if (document == NULL) {
        /* greybodyd refuses to start without presets; only an embedding could get here. */
        gb_reply_fail(reply, GB_PROBLEM_INTERNAL, NULL, "No presets are loaded.");
        return;
    }
    gb_reply_static(reply, 200, GB_CONTENT_JSON, document, length);
}
