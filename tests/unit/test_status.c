/*
 * The status type (core/status.h): every status has a stable, distinct,
 * snake_case name and a sentence, and no value, however wrong, gives NULL.
 *
 * Expected values: status.h itself (its documented example name, GB_OK = 0,
 * "Never NULL"); nothing is copied from status.c.
 */
#include <ctype.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <string.h>

#include <cmocka.h>

#include "status.h"
#include "status_expect.h"

static int is_snake_case(const char *text)
{
    if (!islower((unsigned char)text[0])) {
        return 0;
    }
    for (const char *c = text; *c != '\0'; ++c) {
        if (!(islower((unsigned char)*c) || isdigit((unsigned char)*c) || *c == '_')) {
            return 0;
        }
    }
    return text[strlen(text) - 1] != '_';
}

static int is_sentence(const char *text)
{
    size_t length = strlen(text);
    return length > 1 && isupper((unsigned char)text[0]) && text[length - 1] == '.';
}

static void test_every_status_has_a_snake_case_name_and_a_sentence(void **state)
{
    (void)state;
    for (int status = 0; status < GB_STATUS_COUNT; ++status) {
        const char *name = gb_status_name((gb_status)status);
        const char *text = gb_status_text((gb_status)status);
        assert_non_null(name);
        assert_non_null(text);
        if (!is_snake_case(name)) {
            fail_msg("%s has name '%s', not snake_case", status_identifier((gb_status)status),
                     name);
        }
        if (!is_sentence(text)) {
            fail_msg("%s has text '%s', not a sentence", status_identifier((gb_status)status),
                     text);
        }
    }
}

/* The server uses the name as the problem `code`: two statuses must never share one. */
static void test_names_and_texts_are_distinct(void **state)
{
    (void)state;
    for (int first = 0; first < GB_STATUS_COUNT; ++first) {
        for (int second = first + 1; second < GB_STATUS_COUNT; ++second) {
            if (strcmp(gb_status_name((gb_status)first), gb_status_name((gb_status)second)) == 0 ||
                strcmp(gb_status_text((gb_status)first), gb_status_text((gb_status)second)) == 0) {
                fail_msg("%s and %s share a name or a text", status_identifier((gb_status)first),
                         status_identifier((gb_status)second));
            }
        }
    }
}

/* Source: status.h, "e.g. emissivity_out_of_range", and GB_OK = 0. */
static void test_documented_values(void **state)
{
    (void)state;
    assert_int_equal(GB_OK, 0);
    assert_string_equal(gb_status_name(GB_ERR_EMISSIVITY_DOMAIN), "emissivity_out_of_range");
}

/* status.h: "Never NULL", also for a value that is no status at all. */
static void test_values_outside_the_enum_still_give_text(void **state)
{
    static const int outside[] = {GB_STATUS_COUNT, GB_STATUS_COUNT + 1, -1, 1000000};
    (void)state;
    for (size_t i = 0; i < sizeof outside / sizeof outside[0]; ++i) {
        const char *name = gb_status_name((gb_status)outside[i]);
        const char *text = gb_status_text((gb_status)outside[i]);
        assert_non_null(name);
        assert_non_null(text);
        assert_true(strlen(name) > 0 && strlen(text) > 0);
        for (int status = 0; status < GB_STATUS_COUNT; ++status) {
            if (strcmp(name, gb_status_name((gb_status)status)) == 0) {
                fail_msg("the invalid value %d is named like %s", outside[i],
                         status_identifier((gb_status)status));
            }
        }
    }
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_every_status_has_a_snake_case_name_and_a_sentence),
        cmocka_unit_test(test_names_and_texts_are_distinct),
        cmocka_unit_test(test_documented_values),
        cmocka_unit_test(test_values_outside_the_enum_still_give_text),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
