#include "json_expect.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

json_t *json_expect_pointer(json_t *root, const char *pointer)
{
    if (pointer[0] == '\0') {
        return root;
    }
    if (pointer[0] != '/') {
        return NULL;
    }
    json_t *node = root;
    const char *cursor = pointer + 1;
    for (;;) {
        char token[256];
        size_t length = 0;
        while (*cursor != '\0' && *cursor != '/' && length + 1 < sizeof token) {
            if (cursor[0] == '~' && (cursor[1] == '0' || cursor[1] == '1')) {
                token[length++] = cursor[1] == '0' ? '~' : '/';
                cursor += 2;
            } else {
                token[length++] = *cursor++;
            }
        }
        token[length] = '\0';
        if (json_is_object(node)) {
            node = json_object_get(node, token);
        } else if (json_is_array(node)) {
            char *end = NULL;
            unsigned long index = strtoul(token, &end, 10);
            node = (length > 0 && *end == '\0') ? json_array_get(node, index) : NULL;
        } else {
            node = NULL;
        }
        if (node == NULL || *cursor == '\0') {
            return node;
        }
        cursor++;
    }
}

bool json_expect_is_approx(const json_t *expected)
{
    return json_is_object(expected) && json_object_get(expected, "approx") != NULL;
}

void json_expect_describe(const json_t *value, char *out, size_t size)
{
    char *dump = value != NULL
                     ? json_dumps(value, JSON_ENCODE_ANY | JSON_COMPACT | JSON_REAL_PRECISION(17))
                     : NULL;
    snprintf(out, size, "%s", dump != NULL ? dump : "(absent)");
    free(dump);
}

void json_expect_match(const char *where, json_t *expected, json_t *actual, report_text *report)
{
    char shown_expected[512];
    char shown_actual[512];
    if (json_expect_is_approx(expected)) {
        double target = json_number_value(json_object_get(expected, "approx"));
        json_t *rel = json_object_get(expected, "rel");
        json_t *abs = json_object_get(expected, "abs");
        double tolerance = fmax(fabs(target) * (rel != NULL ? json_number_value(rel) : 1e-9),
                                abs != NULL ? json_number_value(abs) : 0.0);
        if (!json_is_number(actual)) {
            json_expect_describe(actual, shown_actual, sizeof shown_actual);
            report_text_printf(report, "  %s: expected a number near %.17g, got %s\n", where,
                               target, shown_actual);
        } else if (!(fabs(json_number_value(actual) - target) <= tolerance)) {
            double got = json_number_value(actual);
            report_text_printf(
                report, "  %s: expected %.17g within %.3g, got %.17g (relative error %.3g)\n",
                where, target, tolerance, got,
                target != 0.0 ? fabs(got - target) / fabs(target) : fabs(got));
        }
        return;
    }
    if (json_is_array(expected)) {
        if (!json_is_array(actual) || json_array_size(actual) != json_array_size(expected)) {
            json_expect_describe(actual, shown_actual, sizeof shown_actual);
            report_text_printf(report, "  %s: expected an array of %zu, got %s\n", where,
                               json_array_size(expected), shown_actual);
            return;
        }
        size_t index;
        json_t *item;
        json_array_foreach(expected, index, item) {
            char child[256];
            snprintf(child, sizeof child, "%s/%zu", where, index);
            json_expect_match(child, item, json_array_get(actual, index), report);
        }
        return;
    }
    if (json_is_object(expected)) {
        if (!json_is_object(actual)) {
            json_expect_describe(actual, shown_actual, sizeof shown_actual);
            report_text_printf(report, "  %s: expected an object, got %s\n", where, shown_actual);
            return;
        }
        const char *key;
        json_t *item;
        json_object_foreach(expected, key, item) {
            char child[256];
            snprintf(child, sizeof child, "%s/%s", where, key);
            json_expect_match(child, item, json_object_get(actual, key), report);
        }
        return;
    }
    bool same =
        json_is_number(expected)
            ? json_is_number(actual) && json_number_value(actual) == json_number_value(expected)
            : actual != NULL && json_equal(expected, actual);
    if (!same) {
        json_expect_describe(expected, shown_expected, sizeof shown_expected);
        json_expect_describe(actual, shown_actual, sizeof shown_actual);
        report_text_printf(report, "  %s: expected %s, got %s\n", where, shown_expected,
                           shown_actual);
    }
}
