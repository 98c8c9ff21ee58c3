/*
 * The blackbody fraction F(x) and its complement, energy and photons
 * (core/fraction.h).
 *
 * Expected values: mpmath at 50 digits via tests/reference/generate.py
 * (closed forms in polylogarithms, cross-checked there by quadrature):
 * tests/reference/vectors/fraction.tsv and fraction_at.tsv.  Table values of
 * /work/shared/REFERENCES.md are quoted where named: its mpmath column, and a
 * textbook blackbody-function table recalled "from memory".
 */
#include <float.h>
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdio.h>

#include <cmocka.h>

#include "accuracy.h"
#include "fraction.h"
#include "status_expect.h"
#include "vector_table.h"

/* fraction.h: F and Q each within 1e-15 relative for x in [1e-4, 700]. */
#define CLAIM_FRACTION 1e-15
#define CLAIM_LOWEST_X 1e-4
#define CLAIM_HIGHEST_X 700.0
/* Beyond 700 the header promises only a graceful underflow: a sanity bound of this test. */
#define BEYOND_CLAIM_SANITY 1e-6
/* CODATA 2018 (exact SI): c2 in um K, REFERENCES.md. */
#define C2_UM_K 14387.768775039338

typedef gb_status (*fraction_function)(double argument, gb_fraction *fraction);

struct fraction_side {
    const char *column;
    int above;               /* Q rather than F */
    accuracy_record claimed; /* x in [1e-4, 700] */
    accuracy_record beyond;  /* x > 700 */
};

#define SIDE(column, above, name)                                                  \
    {column, above, ACCURACY_RECORD(name, CLAIM_FRACTION),                         \
     ACCURACY_RECORD(name " (x > 700)", BEYOND_CLAIM_SANITY)}

static void check_fraction_columns(fraction_function function, struct fraction_side sides[2],
                                   const vector_table *table)
{
    for (size_t row = 0; row < vector_table_rows(table); ++row) {
        double x = vector_table_number(table, row, "x");
        gb_fraction fraction = {NAN, NAN};
        char what[64];
        snprintf(what, sizeof what, "x = %.17g", x);
        assert_status(function(x, &fraction), GB_OK, what);
        for (int s = 0; s < 2; ++s) {
            double got = sides[s].above ? fraction.above : fraction.below;
            double expected = vector_table_number(table, row, sides[s].column);
            accuracy_record *record = x <= CLAIM_HIGHEST_X ? &sides[s].claimed : &sides[s].beyond;
            assert_true(x >= CLAIM_LOWEST_X);
            accuracy_observe(record, got, expected, "%s", what);
        }
        /* F and Q are computed apart, so their sum is a check of its own (two roundings). */
        assert_close(fraction.below + fraction.above, 1.0, 2.0 * DBL_EPSILON, what);
    }
    for (int s = 0; s < 2; ++s) {
        accuracy_report(&sides[s].claimed);
        accuracy_report(&sides[s].beyond);
    }
    for (int s = 0; s < 2; ++s) {
        accuracy_assert_claim(&sides[s].claimed);
        accuracy_assert_claim(&sides[s].beyond);
    }
}

/* Energy and photon fractions, each with F and 1 - F, against the same rows. */
static void test_fractions_against_mpmath(void **state)
{
    struct {
        fraction_function function;
        struct fraction_side sides[2];
    } kinds[] = {
        {gb_blackbody_fraction,
         {SIDE("below", 0, "gb_blackbody_fraction F"),
          SIDE("above", 1, "gb_blackbody_fraction 1 - F")}},
        {gb_blackbody_photon_fraction,
         {SIDE("photon_below", 0, "gb_blackbody_photon_fraction F"),
          SIDE("photon_above", 1, "gb_blackbody_photon_fraction 1 - F")}},
    };
    vector_table *table = vector_table_load("fraction.tsv");
    (void)state;
    for (size_t k = 0; k < sizeof kinds / sizeof kinds[0]; ++k) {
        check_fraction_columns(kinds[k].function, kinds[k].sides, table);
    }
    vector_table_free(table);
}

/*
 * F(lambda T) first rounds x = c2 / (lambda T), and F amplifies a relative
 * error of x by its condition number kappa = x |F'(x)| / F.  The bound is the
 * header's 1e-15 plus kappa times the two roundings of x.
 */
static double argument_condition(double x, double value)
{
    double density = 0.153989733820265 * x * x * x / expm1(x); /* 15/pi^4 x^3/(e^x - 1) */
    return x * density / value;
}

static void test_fraction_at_wavelength_temperature(void **state)
{
    vector_table *table = vector_table_load("fraction_at.tsv");
    accuracy_record records[2] = {
        ACCURACY_RECORD("gb_blackbody_fraction_at F (error / bound)", 1.0),
        ACCURACY_RECORD("gb_blackbody_fraction_at 1 - F (error / bound)", 1.0),
    };
    (void)state;
    for (size_t row = 0; row < vector_table_rows(table); ++row) {
        double product = vector_table_number(table, row, "wavelength_temperature_um_k");
        double x = C2_UM_K / product;
        gb_fraction fraction = {NAN, NAN};
        char what[64];
        snprintf(what, sizeof what, "lambda T = %.17g um K", product);
        assert_status(gb_blackbody_fraction_at(product, &fraction), GB_OK, what);
        for (int s = 0; s < 2; ++s) {
            double expected = vector_table_number(table, row, s ? "above" : "below");
            double got = s ? fraction.above : fraction.below;
            if (expected < DBL_MIN) { /* F underflows (lambda T = 1e-3 um K) */
                assert_close(got, expected, BEYOND_CLAIM_SANITY, what);
                continue;
            }
            accuracy_observe_in_units(
                &records[s], got, expected,
                CLAIM_FRACTION + argument_condition(x, expected) * 2.0 * DBL_EPSILON, "%s", what);
        }
    }
    vector_table_free(table);
    accuracy_report(&records[0]);
    accuracy_report(&records[1]);
    accuracy_assert_claim(&records[0]);
    accuracy_assert_claim(&records[1]);
}

/* REFERENCES.md, mpmath column (10 significant digits): F(lambda T). */
static void test_reference_table_mpmath_values(void **state)
{
    static const struct {
        double product, energy, photon; /* photon 0: not quoted */
    } rows[] = {
        {1000.0, 3.207697840e-4, 5.580820953e-5}, {2000.0, 6.672994018e-2, 2.129724917e-2},
        {2898.0, 0.2501062937, 0.0},              {3000.0, 0.2732292600, 0.0},
        {4000.0, 0.4808646436, 0.2550146250},     {5000.0, 0.6337258719, 0.0},
        {6000.0, 0.7377894180, 0.4900932760},     {8000.0, 0.8562506936, 0.0},
        {10000.0, 0.9141569709, 0.7396389720},    {20000.0, 0.9855538387, 0.0},
    };
    const double half_unit = 5e-10; /* relative, for 10 quoted digits */
    (void)state;
    for (size_t i = 0; i < sizeof rows / sizeof rows[0]; ++i) {
        gb_fraction energy, photon;
        char what[64];
        snprintf(what, sizeof what, "F(%g um K)", rows[i].product);
        assert_status(gb_blackbody_fraction_at(rows[i].product, &energy), GB_OK, what);
        assert_close(energy.below, rows[i].energy, half_unit, what);
        if (rows[i].photon != 0.0) {
            assert_status(gb_blackbody_photon_fraction(C2_UM_K / rows[i].product, &photon), GB_OK,
                          what);
            assert_close(photon.below, rows[i].photon, half_unit, what);
        }
    }
}

/*
 * The textbook blackbody-function table as recalled in REFERENCES.md ("from
 * memory"; it runs high by up to 5e-5), so no tighter than 1e-4 absolute.
 */
static void test_recalled_textbook_table(void **state)
{
    static const double rows[][2] = {
        {1000.0, 0.000321}, {2000.0, 0.066728}, {2898.0, 0.250108}, {3000.0, 0.273232},
        {4000.0, 0.480877}, {5000.0, 0.633747}, {6000.0, 0.737818}, {8000.0, 0.856288},
        {10000.0, 0.914199}, {20000.0, 0.985602},
    };
    (void)state;
    for (size_t i = 0; i < sizeof rows / sizeof rows[0]; ++i) {
        gb_fraction fraction;
        char what[64];
        snprintf(what, sizeof what, "textbook F(%g um K), from memory", rows[i][0]);
        assert_status(gb_blackbody_fraction_at(rows[i][0], &fraction), GB_OK, what);
        assert_within(fraction.below, rows[i][1], 1e-4, what);
    }
}

/*
 * Below Wien's peak lambda T = b = 2897.771955185 um K lies about a quarter of
 * the exitance (common practice); mpmath 0.250054546823 (REFERENCES.md).  The
 * medians (REFERENCES.md, mpmath): energy at 4107.24848771 um K, photons at
 * 6104.88556837 um K; 12 quoted digits of lambda T leave F uncertain by ~1e-12.
 */
static void test_wien_peak_quarter_and_medians(void **state)
{
    gb_fraction at_peak, energy_median, photon_median;
    (void)state;
    assert_status(gb_blackbody_fraction_at(2897.771955185172661, &at_peak), GB_OK, "F(b)");
    assert_within(at_peak.below, 0.250054546823, 5e-13, "F at Wien's peak (mpmath)");
    assert_within(at_peak.below, 0.25, 1e-3, "about a quarter below the peak (common practice)");
    assert_status(gb_blackbody_fraction_at(4107.24848771, &energy_median), GB_OK, "median");
    assert_within(energy_median.below, 0.5, 1e-11, "energy median");
    assert_status(gb_blackbody_photon_fraction(C2_UM_K / 6104.88556837, &photon_median), GB_OK,
                  "photon median");
    assert_within(photon_median.below, 0.5, 1e-11, "photon median");
}

/* F falls and Q rises as x grows, with no step where the two series meet (x = 3). */
static void test_monotonic_across_the_series_switch(void **state)
{
    const fraction_function functions[] = {gb_blackbody_fraction, gb_blackbody_photon_fraction};
    (void)state;
    for (size_t f = 0; f < 2; ++f) {
        gb_fraction previous;
        double x = 2.9;
        assert_status(functions[f](x, &previous), GB_OK, "x = 2.9");
        for (int step = 0; step < 2000; ++step) {
            gb_fraction next;
            x = nextafter(x, 4.0) + 1e-4;
            assert_status(functions[f](x, &next), GB_OK, "monotonic");
            if (!(next.below <= previous.below && next.above >= previous.above)) {
                fail_msg("fraction %zu not monotonic at x = %.17g", f, x);
            }
            previous = next;
        }
    }
}

static void test_domain(void **state)
{
    static const struct {
        const char *what;
        double x;
        gb_status expected; /* GB_STATUS_COUNT: some error, fraction.h does not say which */
    } rows[] = {
        {"NaN", NAN, GB_ERR_NOT_FINITE},
        {"zero", 0.0, GB_STATUS_COUNT},
        {"negative", -1.0, GB_STATUS_COUNT},
        {"-inf", -INFINITY, GB_STATUS_COUNT},
    };
    const fraction_function functions[] = {gb_blackbody_fraction, gb_blackbody_photon_fraction,
                                           gb_blackbody_fraction_at};
    (void)state;
    for (size_t f = 0; f < 3; ++f) {
        for (size_t i = 0; i < sizeof rows / sizeof rows[0]; ++i) {
            gb_fraction fraction = {UNTOUCHED_SENTINEL, UNTOUCHED_SENTINEL};
            gb_status status = functions[f](rows[i].x, &fraction);
            if (rows[i].expected == GB_STATUS_COUNT) {
                assert_true(status != GB_OK);
            } else {
                assert_status(status, rows[i].expected, rows[i].what);
            }
            assert_true(fraction.below == UNTOUCHED_SENTINEL &&
                        fraction.above == UNTOUCHED_SENTINEL);
        }
        assert_status(functions[f](1.0, NULL), GB_ERR_INVALID_ARGUMENT, "NULL out-pointer");
    }
}

/* fraction.h: x = +inf gives F = 0, Q = 1. */
static void test_infinite_x(void **state)
{
    const fraction_function functions[] = {gb_blackbody_fraction, gb_blackbody_photon_fraction};
    (void)state;
    for (size_t f = 0; f < 2; ++f) {
        gb_fraction fraction = {NAN, NAN};
        assert_status(functions[f](INFINITY, &fraction), GB_OK, "x = +inf");
        assert_true(fraction.below == 0.0 && fraction.above == 1.0);
    }
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_fractions_against_mpmath),
        cmocka_unit_test(test_fraction_at_wavelength_temperature),
        cmocka_unit_test(test_reference_table_mpmath_values),
        cmocka_unit_test(test_recalled_textbook_table),
        cmocka_unit_test(test_wien_peak_quarter_and_medians),
        cmocka_unit_test(test_monotonic_across_the_series_switch),
        cmocka_unit_test(test_domain),
        cmocka_unit_test(test_infinite_x),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
