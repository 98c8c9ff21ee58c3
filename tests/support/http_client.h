/*
 * http_client.h — one HTTP exchange with libcurl for the tests: status,
 * body and the final response's headers collected, header look-up by name.
 *
 * Ownership: an http_response owns its texts; http_response_free() releases
 * them (also after a failed exchange, where they are empty).
 */
#ifndef GREYBODY_TEST_HTTP_CLIENT_H
#define GREYBODY_TEST_HTTP_CLIENT_H

#include <curl/curl.h>
#include <stdbool.h>
#include <stddef.h>

#include "report_text.h"

typedef struct http_response {
    long status;
    report_text body;
    report_text headers; /* the final response's header lines, "Name: value\r\n" each */
} http_response;

/* Optional settings of an exchange; NULL means 60 s, plain verification of TLS peers. */
typedef struct http_options {
    long timeout_seconds; /* 0: 60 */
    const char *ca_file;  /* PEM file of the certificate authority to trust for https */
} http_options;

/*
 * `method` to `url` on `client` (reset first); `headers` may be NULL; a body
 * is sent when `body` is not NULL.  HEAD asks for no body.  false with
 * `error` filled when the transfer itself failed (no answer).
 */
bool http_client_exchange(CURL *client, const char *url, const char *method,
                          struct curl_slist *headers, const char *body, size_t body_length,
                          const http_options *options, http_response *response, char *error,
                          size_t error_size);

/* Value of header `name` (case-insensitive) copied into `out`; false when absent. */
bool http_response_header(const http_response *response, const char *name, char *out,
                          size_t size);

void http_response_free(http_response *response);

#endif
