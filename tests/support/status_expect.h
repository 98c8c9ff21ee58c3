/*
 * status_expect.h — status checks shared by the core unit tests.
 *
 * Vector files name expected statuses by their enum identifier
 * ("GB_ERR_NOT_FINITE"), spelled out here from status.h rather than taken from
 * gb_status_name(), so that the tests do not borrow the code's own strings.
 */
#ifndef GREYBODY_TEST_STATUS_EXPECT_H
#define GREYBODY_TEST_STATUS_EXPECT_H

#include "status.h"

/* The status an identifier names; fails the test for an unknown identifier. */
gb_status status_from_identifier(const char *identifier);
/* "GB_ERR_NOT_FINITE" for GB_ERR_NOT_FINITE; "(unknown)" out of range. */
const char *status_identifier(gb_status status);

/* Fails the test, naming both statuses and `what`, unless got == expected. */
void assert_status(gb_status got, gb_status expected, const char *what);

/* Out-pointers must be left untouched on failure (status.h): a sentinel to preset them with. */
#define UNTOUCHED_SENTINEL (-12345.678)

#endif
