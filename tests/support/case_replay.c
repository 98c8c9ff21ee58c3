#include "case_replay.h"

#include <dirent.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <strings.h>

#include "json_expect.h"

static int by_name(const void *left, const void *right)
{
    return strcmp(*(char *const *)left, *(char *const *)right);
}

/* Fills `one` from a parsed case file; false when the case is not a plain successful computation. */
static bool take_case(json_t *spec, const char *file_name, replay_case *one)
{
    json_t *expect = json_object_get(spec, "expect");
    const char *method = json_string_value(json_object_get(spec, "method"));
    const char *path = json_string_value(json_object_get(spec, "path"));
    json_t *fields = json_object_get(expect, "fields");
    if (method == NULL || path == NULL || strncmp(path, "/v1/", 4) != 0 ||
        json_integer_value(json_object_get(expect, "status")) != 200 || !json_is_object(fields) ||
        json_object_get(spec, "fill") != NULL || json_object_get(spec, "pad_body_to") != NULL ||
        json_is_true(json_object_get(spec, "heavy")) ||
        (strcmp(method, "GET") != 0 && strcmp(method, "POST") != 0)) {
        return false;
    }
    memset(one, 0, sizeof *one);
    snprintf(one->name, sizeof one->name, "%s", file_name);
    snprintf(one->method, sizeof one->method, "%s", method);
    one->path = strdup(path);
    json_t *body = json_object_get(spec, "body");
    if (json_is_string(body)) {
        one->body = strdup(json_string_value(body));
    } else if (body != NULL) {
        one->body = json_dumps(body, JSON_COMPACT | JSON_ENCODE_ANY | JSON_REAL_PRECISION(17));
    }
    one->body_length = one->body != NULL ? strlen(one->body) : 0;
    json_t *headers = json_object_get(spec, "headers");
    bool has_type = false;
    const char *key;
    json_t *value;
    json_object_foreach(headers, key, value) {
        char line[512];
        snprintf(line, sizeof line, "%s: %s", key, json_string_value(value));
        one->headers = curl_slist_append(one->headers, line);
        has_type = has_type || strcasecmp(key, "Content-Type") == 0;
    }
    if (one->body != NULL && !has_type) {
        one->headers = curl_slist_append(one->headers, "Content-Type: application/json");
    }
    one->fields = json_incref(fields);
    return true;
}

size_t replay_load(const char *cases_dir, replay_case **cases)
{
    *cases = NULL;
    DIR *dir = opendir(cases_dir);
    if (dir == NULL) {
        return 0;
    }
    char **names = NULL;
    size_t name_count = 0;
    struct dirent *entry;
    while ((entry = readdir(dir)) != NULL) {
        size_t n = strlen(entry->d_name);
        if (n > 5 && strcmp(entry->d_name + n - 5, ".json") == 0) {
            char **grown = realloc(names, (name_count + 1) * sizeof *names);
            if (grown == NULL) {
                break;
            }
            names = grown;
            names[name_count++] = strdup(entry->d_name);
        }
    }
    closedir(dir);
    qsort(names, name_count, sizeof *names, by_name);
    replay_case *chosen = calloc(name_count > 0 ? name_count : 1, sizeof *chosen);
    size_t count = 0;
    for (size_t i = 0; i < name_count; i++) {
        char path[1024];
        snprintf(path, sizeof path, "%s/%s", cases_dir, names[i]);
        json_t *spec = json_load_file(path, 0, NULL);
        if (chosen != NULL && spec != NULL && take_case(spec, names[i], &chosen[count])) {
            count++;
        }
        json_decref(spec);
        free(names[i]);
    }
    free(names);
    *cases = chosen;
    return count;
}

bool replay_check(const replay_case *one, long status, const char *body, size_t length,
                  report_text *report)
{
    size_t before = report->length;
    if (status != 200) {
        report_text_printf(report, "  %s: status %ld, expected 200\n", one->name, status);
        return false;
    }
    json_t *answer = json_loadb(body, length, 0, NULL);
    if (answer == NULL) {
        report_text_printf(report, "  %s: the body is not JSON\n", one->name);
        return false;
    }
    const char *pointer;
    json_t *expected;
    json_object_foreach(one->fields, pointer, expected) {
        char where[300];
        snprintf(where, sizeof where, "%s %s", one->name, pointer);
        json_expect_match(where, expected, json_expect_pointer(answer, pointer), report);
    }
    json_decref(answer);
    return report->length == before;
}

void replay_free_one(replay_case *one)
{
    free(one->path);
    free(one->body);
    curl_slist_free_all(one->headers);
    json_decref(one->fields);
    memset(one, 0, sizeof *one);
}

void replay_free(replay_case *cases, size_t count)
{
    for (size_t i = 0; i < count; i++) {
        replay_free_one(&cases[i]);
    }
    free(cases);
}
