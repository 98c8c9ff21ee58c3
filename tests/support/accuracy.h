/*
 * accuracy.h — measures a core function's error against reference values and
 * compares the worst one with the accuracy its header claims.
 *
 * Errors are relative, |got - expected| / |expected|, except that values
 * below the smallest normal double are measured against DBL_MIN (the headers
 * claim accuracy only for normal results) after allowing two subnormal steps.
 * A NaN or a result of the wrong sign is an infinite error.
 *
 * Use: observe every value, print the worst with accuracy_report(), then
 * accuracy_assert_claim() fails the test when the worst exceeds the claim.
 * Reporting before asserting prints the figure even when the claim fails.
 */
#ifndef GREYBODY_TEST_ACCURACY_H
#define GREYBODY_TEST_ACCURACY_H

#include <stddef.h>

typedef struct accuracy_record {
    const char *function; /* what was measured, as printed */
    double claim;         /* the header's bound on the relative error */
    double worst;         /* worst error seen */
    size_t count;         /* values observed */
    size_t over_claim;    /* how many of them exceed the claim */
    double worst_got, worst_expected;
    char worst_case[200]; /* the inputs of the worst value */
} accuracy_record;

#define ACCURACY_RECORD(function_name, claimed_bound) \
    {(function_name), (claimed_bound), 0.0, 0, 0, 0.0, 0.0, ""}

/* The error as defined above. */
double accuracy_error(double got, double expected);

/* Records one value; `case_format` describes its inputs (printf style). */
void accuracy_observe(accuracy_record *record, double got, double expected,
                      const char *case_format, ...) __attribute__((format(printf, 4, 5)));

/*
 * The same, recording accuracy_error(got, expected) / unit: for bounds that
 * vary from value to value, observed in units of the bound against a claim of 1.
 */
void accuracy_observe_in_units(accuracy_record *record, double got, double expected, double unit,
                               const char *case_format, ...) __attribute__((format(printf, 5, 6)));

/* The same, recording an error the caller measured in its own way. */
void accuracy_observe_error(accuracy_record *record, double error, double got, double expected,
                            const char *case_format, ...) __attribute__((format(printf, 5, 6)));

/* The same, recording the absolute error |got - expected| (for claims in kelvin). */
void accuracy_observe_absolute(accuracy_record *record, double got, double expected,
                               const char *case_format, ...) __attribute__((format(printf, 4, 5)));

/* Prints "accuracy: <function> worst error <e> (claim <c>, <n> values[, <k> over]) at <case>". */
void accuracy_report(const accuracy_record *record);

/* Fails the test unless values were observed and the worst error is within the claim. */
void accuracy_assert_claim(const accuracy_record *record);

/* Fails the test unless accuracy_error(got, expected) <= bound, naming `what`. */
void assert_close(double got, double expected, double bound, const char *what);

/*
 * Fails the test unless |got - expected| <= absolute.  For values quoted to a
 * fixed number of digits: the bound is half a unit in the last quoted digit.
 */
void assert_within(double got, double expected, double absolute, const char *what);

#endif
