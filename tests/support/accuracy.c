#include "accuracy.h"

#include <float.h>
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stdio.h>

#include <cmocka.h>

/* Rounding to the subnormal grid costs up to one step per operation; two are allowed. */
#define SUBNORMAL_SLACK (2.0 * DBL_TRUE_MIN)

double accuracy_error(double got, double expected)
{
    double difference, scale;
    if (isnan(got) || isnan(expected)) {
        return (isnan(got) && isnan(expected)) ? 0.0 : INFINITY;
    }
    if (got == expected) {
        return 0.0;
    }
    if ((got < 0.0) != (expected < 0.0) && got != 0.0 && expected != 0.0) {
        return INFINITY;
    }
    difference = fabs(got - expected);
    scale = fabs(expected);
    if (scale < DBL_MIN) {
        difference = difference > SUBNORMAL_SLACK ? difference - SUBNORMAL_SLACK : 0.0;
        scale = DBL_MIN;
    }
    return difference / scale;
}

static void observe(accuracy_record *record, double error, double got, double expected,
                    const char *case_format, va_list args)
{
    record->count++;
    record->over_claim += !(error <= record->claim);
    if (error > record->worst || (record->count == 1 && error == 0.0)) {
        vsnprintf(record->worst_case, sizeof record->worst_case, case_format, args);
        record->worst = error;
        record->worst_got = got;
        record->worst_expected = expected;
    }
}

void accuracy_observe(accuracy_record *record, double got, double expected,
                      const char *case_format, ...)
{
    va_list args;
    va_start(args, case_format);
    observe(record, accuracy_error(got, expected), got, expected, case_format, args);
    va_end(args);
}

void accuracy_observe_in_units(accuracy_record *record, double got, double expected, double unit,
                               const char *case_format, ...)
{
    va_list args;
    va_start(args, case_format);
    observe(record, accuracy_error(got, expected) / unit, got, expected, case_format, args);
    va_end(args);
}

void accuracy_observe_error(accuracy_record *record, double error, double got, double expected,
                            const char *case_format, ...)
{
    va_list args;
    va_start(args, case_format);
    observe(record, error, got, expected, case_format, args);
    va_end(args);
}

void accuracy_observe_absolute(accuracy_record *record, double got, double expected,
                               const char *case_format, ...)
{
    va_list args;
    double error = isnan(got) || isnan(expected) ? INFINITY : fabs(got - expected);
    va_start(args, case_format);
    observe(record, error, got, expected, case_format, args);
    va_end(args);
}

void accuracy_report(const accuracy_record *record)
{
    char claim[32] = "no claim", over[40] = "";
    if (isfinite(record->claim)) {
        snprintf(claim, sizeof claim, "claim %.0e", record->claim);
    }
    if (record->over_claim > 0) {
        snprintf(over, sizeof over, ", %zu over the claim", record->over_claim);
    }
    printf("accuracy: %-44s worst error %.2e (%s, %zu values%s) at %s: got %.17g, "
           "expected %.17g\n",
           record->function, record->worst, claim, record->count, over, record->worst_case,
           record->worst_got, record->worst_expected);
}

void accuracy_assert_claim(const accuracy_record *record)
{
    if (record->count == 0) {
        fail_msg("%s: no values were measured", record->function);
    }
    if (!(record->worst <= record->claim)) {
        fail_msg("%s: worst error %.3e exceeds the claimed %.1e at %s (got %.17g, expected %.17g)",
                 record->function, record->worst, record->claim, record->worst_case,
                 record->worst_got, record->worst_expected);
    }
}

void assert_close(double got, double expected, double bound, const char *what)
{
    double error = accuracy_error(got, expected);
    if (!(error <= bound)) {
        fail_msg("%s: got %.17g, expected %.17g: error %.3e > %.1e", what, got, expected, error,
                 bound);
    }
}

void assert_within(double got, double expected, double absolute, const char *what)
{
    if (!(fabs(got - expected) <= absolute)) {
        fail_msg("%s: got %.17g, expected %.17g within %.1e", what, got, expected, absolute);
    }
}
