/*
 * json_expect.h — checks a JSON answer against an expectation, as the
 * integration case files write them (tests/integration/README.md):
 * strings, booleans and null exactly; numbers exactly; {"approx": x,
 * "rel": r, "abs": a} within max(r·|x|, a) (r defaults to 1e-9); arrays
 * element by element; objects member by member (members the expectation
 * does not name are not checked).  Places are named by JSON pointers
 * (RFC 6901).
 */
#ifndef GREYBODY_TEST_JSON_EXPECT_H
#define GREYBODY_TEST_JSON_EXPECT_H

#include <jansson.h>
#include <stdbool.h>
#include <stddef.h>

#include "report_text.h"

/* The value at `pointer` ("" is the root), or NULL when it does not resolve. */
json_t *json_expect_pointer(json_t *root, const char *pointer);

/* true for an {"approx": ...} matcher. */
bool json_expect_is_approx(const json_t *expected);

/* Compact text of `value` (17 digits) or "(absent)" for NULL. */
void json_expect_describe(const json_t *value, char *out, size_t size);

/* Compares; each difference is one line in `report`, starting with `where`. */
void json_expect_match(const char *where, json_t *expected, json_t *actual, report_text *report);

#endif
