#include "openapi.h"

#include <jansson.h>
#include <limits.h>
#include <pthread.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>
#include <unistd.h>

#include "datapath.h"

#define DEFAULT_RELATIVE "api-docs/openapi.json"
#define MAX_DOCUMENT_BYTES (8u * 1024u * 1024u)

static pthread_mutex_t lock = PTHREAD_MUTEX_INITIALIZER;
static char *document;      /* written once under the lock, then read-only */
static size_t document_length;
static char source[PATH_MAX + 64];
static time_t last_attempt;
static char api_version[64];

static char *read_file(const char *path, size_t *length)
{
    FILE *file = fopen(path, "rb");
    if (file == NULL) {
        return NULL;
    }
    char *data = NULL;
    size_t used = 0;
    size_t capacity = 0;
    for (;;) {
        if (used + 4096 + 1 > capacity) {
            capacity = capacity ? capacity * 2 : 65536;
            if (capacity > MAX_DOCUMENT_BYTES + 4097) {
                free(data);
                fclose(file);
                return NULL;
            }
            char *grown = realloc(data, capacity);
            if (grown == NULL) {
                free(data);
                fclose(file);
                return NULL;
            }
            data = grown;
        }
        size_t n = fread(data + used, 1, capacity - used - 1, file);
        used += n;
        if (n == 0) {
            break;
        }
    }
    bool failed = ferror(file) != 0;
    fclose(file);
    if (failed) {
        free(data);
        return NULL;
    }
    data[used] = '\0';
    *length = used;
    return data;
}

/* Candidate paths: the configured one, or the default places (datapath.h). */
static size_t candidates(const char *configured, char out[GB_DATA_PATH_CANDIDATES][PATH_MAX])
{
    return gb_data_path_candidates(configured, DEFAULT_RELATIVE, out);
}

static bool load_locked(const char *configured)
{
    if (document != NULL) {
        return true;
    }
    last_attempt = time(NULL);
    char paths[GB_DATA_PATH_CANDIDATES][PATH_MAX];
    size_t count = candidates(configured, paths);
    snprintf(source, sizeof source, "%.3000s", paths[0]);
    for (size_t i = 0; i < count; i++) {
        size_t length = 0;
        char *data = read_file(paths[i], &length);
        if (data == NULL) {
            continue;
        }
        json_error_t error;
        json_t *parsed = json_loadb(data, length, 0, &error);
        if (parsed == NULL) {
            snprintf(source, sizeof source, "%.3000s (not valid JSON: line %d: %.60s)", paths[i],
                     error.line, error.text);
            free(data);
            continue;
        }
        const char *version = json_string_value(json_object_get(json_object_get(parsed, "info"),
                                                                "version"));
        snprintf(api_version, sizeof api_version, "%s", version != NULL ? version : "");
        json_decref(parsed);
        snprintf(source, sizeof source, "%.3000s", paths[i]);
        document_length = length;
        document = data;
        return true;
    }
    return false;
}

bool gb_openapi_load(const char *configured_path)
{
    pthread_mutex_lock(&lock);
    bool ok = load_locked(configured_path);
    pthread_mutex_unlock(&lock);
    return ok;
}

const char *gb_openapi_document(const char *configured_path, size_t *length)
{
    pthread_mutex_lock(&lock);
    if (document == NULL && time(NULL) != last_attempt) {
        load_locked(configured_path);
    }
    const char *out = document;
    *length = document_length;
    pthread_mutex_unlock(&lock);
    return out;
}

const char *gb_openapi_api_version(const char *configured_path)
{
    pthread_mutex_lock(&lock);
    if (document == NULL && time(NULL) != last_attempt) {
        load_locked(configured_path);
    }
    const char *out = document != NULL && api_version[0] != '\0' ? api_version : NULL;
    pthread_mutex_unlock(&lock);
    return out;
}

const char *gb_openapi_source(void)
{
    return source;
}
