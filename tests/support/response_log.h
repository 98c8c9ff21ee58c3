/*
 * response_log.h — a record of the answers an HTTP test received, for
 * tests/spec/check_responses.py to validate against the contract's schemas.
 *
 * When the environment variable GREYBODY_RESPONSE_LOG names a file, each call
 * appends one JSON line {"method", "path", "status", "content_type", "body"}
 * to it (the body as text); otherwise it does nothing.  Failing to write is
 * reported on stderr once and does not fail the test that called it: the
 * checker then finds the record incomplete.
 */
#ifndef GREYBODY_TEST_RESPONSE_LOG_H
#define GREYBODY_TEST_RESPONSE_LOG_H

#include "http_client.h"

void response_log_append(const char *method, const char *path, const http_response *response);

#endif
