#include "http_client.h"

#include <stdio.h>
#include <string.h>
#include <strings.h>

static size_t collect_body(char *data, size_t size, size_t count, void *user)
{
    report_text_append(user, data, size * count);
    return size * count;
}

static size_t collect_header(char *data, size_t size, size_t count, void *user)
{
    report_text *headers = user;
    /* A new status line (after 100 Continue) starts the headers over. */
    if (size * count >= 5 && strncmp(data, "HTTP/", 5) == 0) {
        report_text_clear(headers);
    }
    report_text_append(headers, data, size * count);
    return size * count;
}

bool http_response_header(const http_response *response, const char *name, char *out,
                          size_t size)
{
    size_t name_length = strlen(name);
    const char *line = response->headers.data;
    while (line != NULL && *line != '\0') {
        const char *end = strstr(line, "\r\n");
        size_t line_length = end != NULL ? (size_t)(end - line) : strlen(line);
        if (line_length > name_length && strncasecmp(line, name, name_length) == 0
            && line[name_length] == ':') {
            const char *value = line + name_length + 1;
            const char *value_end = line + line_length;
            while (value < value_end && (*value == ' ' || *value == '\t')) {
                value++;
            }
            while (value_end > value && (value_end[-1] == ' ' || value_end[-1] == '\t')) {
                value_end--;
            }
            snprintf(out, size, "%.*s", (int)(value_end - value), value);
            return true;
        }
        line = end != NULL ? end + 2 : NULL;
    }
    return false;
}

void http_response_free(http_response *response)
{
    report_text_free(&response->body);
    report_text_free(&response->headers);
}

bool http_client_exchange(CURL *client, const char *url, const char *method,
                          struct curl_slist *headers, const char *body, size_t body_length,
                          const http_options *options, http_response *response, char *error,
                          size_t error_size)
{
    memset(response, 0, sizeof *response);
    curl_easy_reset(client);
    curl_easy_setopt(client, CURLOPT_URL, url);
    curl_easy_setopt(client, CURLOPT_WRITEFUNCTION, collect_body);
    curl_easy_setopt(client, CURLOPT_WRITEDATA, &response->body);
    curl_easy_setopt(client, CURLOPT_HEADERFUNCTION, collect_header);
    curl_easy_setopt(client, CURLOPT_HEADERDATA, &response->headers);
    curl_easy_setopt(client, CURLOPT_HTTPHEADER, headers);
    curl_easy_setopt(client, CURLOPT_NOPROXY, "*");
    curl_easy_setopt(client, CURLOPT_TIMEOUT,
                     options != NULL && options->timeout_seconds > 0 ? options->timeout_seconds
                                                                     : 60L);
    if (options != NULL && options->ca_file != NULL) {
        curl_easy_setopt(client, CURLOPT_CAINFO, options->ca_file);
    }
    if (strcmp(method, "HEAD") == 0) {
        curl_easy_setopt(client, CURLOPT_NOBODY, 1L);
    } else if (strcmp(method, "GET") != 0) {
        curl_easy_setopt(client, CURLOPT_CUSTOMREQUEST, method);
    }
    if (body != NULL) {
        curl_easy_setopt(client, CURLOPT_POSTFIELDS, body);
        curl_easy_setopt(client, CURLOPT_POSTFIELDSIZE_LARGE, (curl_off_t)body_length);
    }
    CURLcode result = curl_easy_perform(client);
    if (result != CURLE_OK) {
        snprintf(error, error_size, "%.16s %.300s: %.150s", method, url,
                 curl_easy_strerror(result));
        http_response_free(response);
        return false;
    }
    curl_easy_getinfo(client, CURLINFO_RESPONSE_CODE, &response->status);
    if (response->body.data == NULL) {
        report_text_append(&response->body, "", 0);
    }
    return true;
}

