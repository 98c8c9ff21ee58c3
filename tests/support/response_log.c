#include "response_log.h"

#include <jansson.h>
#include <stdbool.h>
#include <stdio.h>
#include <stdlib.h>

static bool append_line(const char *location, const char *text)
{
    FILE *file = fopen(location, "a");
    if (file == NULL) {
        return false;
    }
    bool written = fprintf(file, "%s\n", text) >= 0;
    return fclose(file) == 0 && written;
}

void response_log_append(const char *method, const char *path, const http_response *response)
{
    static bool write_failed;
    const char *location = getenv("GREYBODY_RESPONSE_LOG");
    if (location == NULL || location[0] == '\0' || write_failed) {
        return;
    }
    char content_type[256] = "";
    http_response_header(response, "Content-Type", content_type, sizeof content_type);
    json_t *line = json_pack("{s:s, s:s, s:I, s:s}", "method", method, "path", path, "status",
                             (json_int_t)response->status, "content_type", content_type);
    /* A body that is not UTF-8 text is recorded as null (JSON strings must be UTF-8). */
    json_t *body = json_stringn(response->body.data != NULL ? response->body.data : "",
                                response->body.length);
    char *text = NULL;
    if (line != NULL && json_object_set_new(line, "body", body != NULL ? body : json_null()) == 0) {
        text = json_dumps(line, JSON_COMPACT);
    }
    if (text == NULL || !append_line(location, text)) {
        write_failed = true;
        fprintf(stderr, "response_log: cannot append to %s\n", location);
    }
    free(text);
    json_decref(line);
}
