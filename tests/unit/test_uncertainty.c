/*
 * Sensitivities of the corrected temperature, the GUM budget and the exact
 * emissivity-error curve (core/uncertainty.h).
 *
 * Expected values: tests/reference/vectors/measure.tsv, where
 * tests/reference/generate.py solves the measurement equation at 50 digits
 * with mpmath.findroot and differentiates the solved T with mpmath.diff (no
 * use of the implicit formulas the core uses).  Worked example A and its
 * budget, u_c = 0.614 K, are quoted from /work/shared/REFERENCES.md; the
 * budget arithmetic is JCGM 100:2008 (GUM) eq. (10), with k = 2 (GUM 6.2-6.3).
 */
#include <float.h>
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdio.h>
#include <string.h>

#include <cmocka.h>

#include "accuracy.h"
#include "band_fixture.h"
#include "measure.h"
#include "scene_fixture.h"
#include "status_expect.h"
#include "uncertainty.h"
#include "vector_table.h"

/*
 * uncertainty.h states no accuracy for the partials.  This test's bound: band
 * radiances good to 1e-12 (band.h), amplified by the subtractions
 * (L_refl - L(T) and the like) by less than 10 in the scenes of measure.tsv.
 */
#define SENSITIVITY_BOUND 1e-11
/* T(eps + delta) - T(eps): two solutions each good to 1e-12 relative (band.h), T < 2000 K. */
#define EMISSIVITY_ERROR_KELVIN 1e-8

static const char *const partial_column[GB_INPUT_COUNT] = {
    [GB_INPUT_EMISSIVITY] = "d_emissivity",       [GB_INPUT_REFLECTED] = "d_reflected",
    [GB_INPUT_TRANSMITTANCE] = "d_transmittance", [GB_INPUT_ATMOSPHERE] = "d_atmosphere",
    [GB_INPUT_SIGNAL] = "d_signal",
};

static void test_sensitivities_against_mpmath(void **state)
{
    accuracy_record records[GB_INPUT_COUNT] = {
        ACCURACY_RECORD("gb_measure_sensitivity dT/d emissivity", SENSITIVITY_BOUND),
        ACCURACY_RECORD("gb_measure_sensitivity dT/d reflected", SENSITIVITY_BOUND),
        ACCURACY_RECORD("gb_measure_sensitivity dT/d transmittance", SENSITIVITY_BOUND),
        ACCURACY_RECORD("gb_measure_sensitivity dT/d atmosphere", SENSITIVITY_BOUND),
        ACCURACY_RECORD("gb_measure_sensitivity dT/d signal", SENSITIVITY_BOUND),
    };
    vector_table *table = vector_table_load("measure.tsv");
    (void)state;
    for (size_t row = 0; row < vector_table_rows(table); ++row) {
        measure_case c;
        gb_sensitivity sensitivity;
        measure_case_from_row(&c, table, row);
        memset(&sensitivity, 0, sizeof sensitivity);
        sensitivity.temperature_k = UNTOUCHED_SENTINEL;
        assert_status(gb_measure_sensitivity(&c.band.band, &c.scene, &sensitivity), c.expected,
                      c.name);
        if (c.expected != GB_OK) {
            assert_true(sensitivity.temperature_k == UNTOUCHED_SENTINEL);
            continue;
        }
        assert_close(sensitivity.temperature_k, vector_table_number(table, row, "temperature_k"),
                     SENSITIVITY_BOUND, c.name);
        for (int input = 0; input < GB_INPUT_COUNT; ++input) {
            if (!sensitivity.defined[input]) {
                fail_msg("%s: dT/d %s is reported undefined although every input was given",
                         c.name, gb_input_name((gb_input)input));
            }
            accuracy_observe(&records[input], sensitivity.partial[input],
                             vector_table_number(table, row, partial_column[input]), "%s", c.name);
        }
    }
    vector_table_free(table);
    for (int input = 0; input < GB_INPUT_COUNT; ++input) {
        accuracy_report(&records[input]);
    }
    for (int input = 0; input < GB_INPUT_COUNT; ++input) {
        accuracy_assert_claim(&records[input]);
    }
}

/* REFERENCES.md, worked examples A and B (mpmath, 30 digits), half a unit of the last digit. */
static void test_worked_example_sensitivities(void **state)
{
    band_fixture fixture;
    gb_scene example_a = scene_fixture_temperatures(308.15, 0.95, 293.15, 1.0, 288.15);
    gb_scene example_b = scene_fixture_temperatures(308.15, 0.95, 293.15, 0.9, 288.15);
    gb_sensitivity a, b;
    (void)state;
    band_fixture_flat(&fixture, GB_BAND_WAVELENGTH, 8.0, 14.0);
    assert_status(gb_measure_sensitivity(&fixture.band, &example_a, &a), GB_OK, "example A");
    assert_within(a.partial[GB_INPUT_EMISSIVITY], -15.463693, 5e-7, "A: dT/deps");
    assert_within(a.partial[GB_INPUT_REFLECTED], -0.0456521, 5e-8, "A: dT/dT_r");
    assert_within(a.partial[GB_INPUT_SIGNAL], 1.0460498, 5e-8, "A: dT/dT_app");
    assert_status(gb_measure_sensitivity(&fixture.band, &example_b, &b), GB_OK, "example B");
    assert_within(b.temperature_k, 310.995305, 5e-7, "B: T");
    assert_within(b.partial[GB_INPUT_EMISSIVITY], -17.391552, 5e-7, "B: dT/deps");
    assert_within(b.partial[GB_INPUT_TRANSMITTANCE], -23.2214, 5e-5, "B: dT/dtau");
    assert_within(b.partial[GB_INPUT_ATMOSPHERE], -0.0948873, 5e-8, "B: dT/dT_a");
    assert_within(b.partial[GB_INPUT_SIGNAL], 1.141829, 5e-7, "B: dT/dT_app");
}

/* Each partial against a central difference of gb_measure_temperature itself. */
static void test_sensitivities_agree_with_finite_differences(void **state)
{
    vector_table *table = vector_table_load("measure.tsv");
    (void)state;
    for (size_t row = 0; row < vector_table_rows(table); ++row) {
        measure_case c;
        gb_sensitivity sensitivity;
        double *inputs[GB_INPUT_COUNT];
        measure_case_from_row(&c, table, row);
        inputs[GB_INPUT_EMISSIVITY] = &c.scene.emissivity;
        inputs[GB_INPUT_REFLECTED] = &c.scene.reflected.value;
        inputs[GB_INPUT_TRANSMITTANCE] = &c.scene.transmittance;
        inputs[GB_INPUT_ATMOSPHERE] = &c.scene.atmosphere.value;
        inputs[GB_INPUT_SIGNAL] = &c.scene.signal.value;
        if (gb_measure_sensitivity(&c.band.band, &c.scene, &sensitivity) != GB_OK) {
            continue; /* no solution: the error rows are checked above */
        }
        for (int input = 0; input < GB_INPUT_COUNT; ++input) {
            int fraction_of_one = input == GB_INPUT_EMISSIVITY || input == GB_INPUT_TRANSMITTANCE;
            double saved = *inputs[input], h = 1e-6 * fmax(fabs(saved), 1.0);
            double lower = saved - h, upper = saved + h, above = NAN, below = NAN;
            char what[120];
            if (fraction_of_one && upper > 1.0) {
                upper = saved; /* one-sided at the end of (0, 1] */
            }
            *inputs[input] = lower;
            assert_status(gb_measure_temperature(&c.band.band, &c.scene, &below), GB_OK, c.name);
            *inputs[input] = upper;
            assert_status(gb_measure_temperature(&c.band.band, &c.scene, &above), GB_OK, c.name);
            *inputs[input] = saved;
            snprintf(what, sizeof what, "%s: dT/d %s", c.name, gb_input_name((gb_input)input));
            if (sensitivity.partial[input] == 0.0) {
                assert_true(above == below);
            } else {
                assert_close(sensitivity.partial[input], (above - below) / (upper - lower), 1e-4,
                             what);
            }
        }
    }
    vector_table_free(table);
}

/*
 * Worked example A: u(eps) = 0.02, u(T_r) = 2 K, u(T_app) = 0.5 K gives
 * u_c = 0.614 K (REFERENCES.md; JCGM 100:2008 eq. 10), and exactly
 * sqrt(sum (c_i u_i)^2) of the mpmath sensitivities.
 */
static void test_gum_budget_of_example_a(void **state)
{
    const double uncertainty[GB_INPUT_COUNT] = {[GB_INPUT_EMISSIVITY] = 0.02,
                                                [GB_INPUT_REFLECTED] = 2.0,
                                                [GB_INPUT_SIGNAL] = 0.5};
    /* measure.tsv, case example_a (mpmath.diff at 50 digits). */
    vector_table *table = vector_table_load("measure.tsv");
    band_fixture fixture;
    gb_scene scene = scene_fixture_temperatures(308.15, 0.95, 293.15, 1.0, 288.15);
    gb_sensitivity sensitivity;
    gb_budget budget;
    double sum = 0.0;
    size_t row = 0;
    (void)state;
    while (strcmp(vector_table_text(table, row, "case"), "example_a") != 0) {
        ++row;
    }
    band_fixture_flat(&fixture, GB_BAND_WAVELENGTH, 8.0, 14.0);
    assert_status(gb_measure_sensitivity(&fixture.band, &scene, &sensitivity), GB_OK, "A");
    assert_status(gb_gum_budget(&sensitivity, uncertainty, &budget), GB_OK, "A budget");
    for (int input = 0; input < GB_INPUT_COUNT; ++input) {
        double contribution =
            fabs(vector_table_number(table, row, partial_column[input])) * uncertainty[input];
        assert_close(budget.contribution[input], contribution, SENSITIVITY_BOUND,
                     gb_input_name((gb_input)input));
        assert_true(budget.standard_uncertainty[input] == uncertainty[input]);
        sum += contribution * contribution;
    }
    vector_table_free(table);
    printf("accuracy: example A budget u_c = %.9f K (REFERENCES.md: 0.614 K)\n",
           budget.combined_standard_uncertainty);
    assert_close(budget.combined_standard_uncertainty, sqrt(sum), SENSITIVITY_BOUND, "u_c");
    assert_within(budget.combined_standard_uncertainty, 0.614, 5e-4, "u_c = 0.614 K");
    assert_true(budget.coverage_factor == 2.0);
    assert_close(budget.expanded_uncertainty, 2.0 * budget.combined_standard_uncertainty,
                 DBL_EPSILON, "U = k u_c");
}

/* GUM eq. (10) on sensitivities chosen so that the sums are exact: 3-4-5 and 5-12-13. */
static void test_gum_budget_arithmetic(void **state)
{
    static const struct {
        double partial[GB_INPUT_COUNT], uncertainty[GB_INPUT_COUNT], combined;
    } rows[] = {
        {{3.0, 4.0, 0.0, 0.0, 0.0}, {1.0, 1.0, 0.0, 0.0, 0.0}, 5.0},
        {{-12.0, 0.0, 0.0, 0.0, 0.5}, {1.0, 0.0, 0.0, 0.0, 10.0}, 13.0},
        {{-1.5, -2.0, 7.0, 0.25, 1.0}, {2.0, 0.0, 0.0, 0.0, 0.0}, 3.0},
        {{-1.5, -2.0, 7.0, 0.25, 1.0}, {0.0, 0.0, 0.0, 0.0, 0.0}, 0.0},
    };
    (void)state;
    for (size_t i = 0; i < sizeof rows / sizeof rows[0]; ++i) {
        gb_sensitivity sensitivity;
        gb_budget budget;
        memset(&sensitivity, 0, sizeof sensitivity);
        sensitivity.temperature_k = 300.0;
        for (int input = 0; input < GB_INPUT_COUNT; ++input) {
            sensitivity.partial[input] = rows[i].partial[input];
            sensitivity.defined[input] = 1;
        }
        assert_status(gb_gum_budget(&sensitivity, rows[i].uncertainty, &budget), GB_OK, "budget");
        assert_true(budget.combined_standard_uncertainty == rows[i].combined);
        assert_true(budget.expanded_uncertainty == 2.0 * rows[i].combined);
        for (int input = 0; input < GB_INPUT_COUNT; ++input) {
            assert_true(budget.contribution[input] ==
                        fabs(rows[i].partial[input]) * rows[i].uncertainty[input]);
        }
    }
}

static void test_gum_budget_errors(void **state)
{
    static const struct {
        const char *what;
        double uncertainty;
        int input_defined;
        gb_status expected;
    } rows[] = {
        {"negative uncertainty", -0.1, 1, GB_ERR_UNCERTAINTY_DOMAIN},
        {"NaN uncertainty", NAN, 1, GB_ERR_NOT_FINITE},
        {"infinite uncertainty", INFINITY, 1, GB_ERR_NOT_FINITE},
        {"uncertainty for an undefined partial", 0.01, 0, GB_ERR_INVALID_ARGUMENT},
        {"zero uncertainty for an undefined partial", 0.0, 0, GB_OK},
    };
    (void)state;
    for (size_t i = 0; i < sizeof rows / sizeof rows[0]; ++i) {
        gb_sensitivity sensitivity;
        gb_budget budget;
        double uncertainty[GB_INPUT_COUNT] = {0.02, 2.0, 0.0, 0.0, 0.5};
        memset(&sensitivity, 0, sizeof sensitivity);
        for (int input = 0; input < GB_INPUT_COUNT; ++input) {
            sensitivity.partial[input] = 1.0;
            sensitivity.defined[input] = 1;
        }
        sensitivity.defined[GB_INPUT_TRANSMITTANCE] = (unsigned char)rows[i].input_defined;
        uncertainty[GB_INPUT_TRANSMITTANCE] = rows[i].uncertainty;
        budget.combined_standard_uncertainty = UNTOUCHED_SENTINEL;
        assert_status(gb_gum_budget(&sensitivity, uncertainty, &budget), rows[i].expected,
                      rows[i].what);
        if (rows[i].expected != GB_OK) {
            assert_true(budget.combined_standard_uncertainty == UNTOUCHED_SENTINEL);
        }
    }
}

/* measure.h / uncertainty.h: at tau = 1 with no atmosphere temperature dT/dtau is undefined. */
static void test_transmittance_partial_undefined_without_atmosphere(void **state)
{
    band_fixture fixture;
    gb_scene scene = scene_fixture_temperatures(308.15, 0.95, 293.15, 1.0, NAN);
    const double with_tau[GB_INPUT_COUNT] = {0.02, 2.0, 0.01, 0.0, 0.5};
    gb_sensitivity sensitivity;
    gb_budget budget;
    (void)state;
    band_fixture_flat(&fixture, GB_BAND_WAVELENGTH, 8.0, 14.0);
    assert_status(gb_measure_sensitivity(&fixture.band, &scene, &sensitivity), GB_OK,
                  "atmosphere not given");
    assert_true(sensitivity.defined[GB_INPUT_TRANSMITTANCE] == 0);
    assert_true(sensitivity.defined[GB_INPUT_EMISSIVITY] && sensitivity.defined[GB_INPUT_SIGNAL]);
    assert_status(gb_gum_budget(&sensitivity, with_tau, &budget), GB_ERR_INVALID_ARGUMENT,
                  "u(tau) with dT/dtau undefined");
}

static void test_emissivity_error(void **state)
{
    accuracy_record against_mpmath =
        ACCURACY_RECORD("gb_emissivity_error vs mpmath (K)", EMISSIVITY_ERROR_KELVIN);
    vector_table *table = vector_table_load("measure.tsv");
    (void)state;
    for (size_t row = 0; row < vector_table_rows(table); ++row) {
        double delta = vector_table_number(table, row, "delta");
        double error = NAN, base = NAN, second = NAN;
        measure_case c;
        gb_scene shifted;
        measure_case_from_row(&c, table, row);
        if (c.expected != GB_OK) {
            continue;
        }
        shifted = c.scene;
        assert_status(gb_emissivity_error(&c.band.band, &c.scene, delta, &error), GB_OK, c.name);
        accuracy_observe_absolute(&against_mpmath, error,
                                  vector_table_number(table, row, "emissivity_error_k"),
                                  "%s, delta %g", c.name, delta);
        /* A direct second solve at eps + delta. */
        shifted.emissivity = c.scene.emissivity + delta;
        assert_status(gb_measure_temperature(&c.band.band, &c.scene, &base), GB_OK, c.name);
        assert_status(gb_measure_temperature(&c.band.band, &shifted, &second), GB_OK, c.name);
        assert_within(error, second - base, 1e-9, c.name);
    }
    vector_table_free(table);
    accuracy_report(&against_mpmath);
    accuracy_assert_claim(&against_mpmath);
}

static void test_emissivity_error_domain(void **state)
{
    static const struct {
        const char *what;
        double delta;
        gb_status expected;
    } rows[] = {
        {"eps + delta above 1", 0.06, GB_ERR_EMISSIVITY_DOMAIN},
        {"eps + delta = 0", -0.95, GB_ERR_EMISSIVITY_DOMAIN},
        {"eps + delta below 0", -2.0, GB_ERR_EMISSIVITY_DOMAIN},
        {"NaN delta", NAN, GB_ERR_NOT_FINITE},
    };
    band_fixture fixture;
    gb_scene scene = scene_fixture_temperatures(308.15, 0.95, 293.15, 1.0, 288.15);
    double none = NAN;
    (void)state;
    band_fixture_flat(&fixture, GB_BAND_WAVELENGTH, 8.0, 14.0);
    for (size_t i = 0; i < sizeof rows / sizeof rows[0]; ++i) {
        double error = UNTOUCHED_SENTINEL;
        assert_status(gb_emissivity_error(&fixture.band, &scene, rows[i].delta, &error),
                      rows[i].expected, rows[i].what);
        assert_true(error == UNTOUCHED_SENTINEL);
    }
    assert_status(gb_emissivity_error(&fixture.band, &scene, 0.0, &none), GB_OK, "delta 0");
    assert_true(none == 0.0);
    assert_status(gb_emissivity_error(&fixture.band, &scene, 0.01, NULL), GB_ERR_INVALID_ARGUMENT,
                  "NULL out-pointer");
}

/* uncertainty.h: the stable input names. */
static void test_input_names(void **state)
{
    static const char *const names[GB_INPUT_COUNT] = {"emissivity", "reflected", "transmittance",
                                                      "atmosphere", "signal"};
    (void)state;
    for (int input = 0; input < GB_INPUT_COUNT; ++input) {
        assert_string_equal(gb_input_name((gb_input)input), names[input]);
    }
    assert_non_null(gb_input_name(GB_INPUT_COUNT));
}

static void test_sensitivity_arguments(void **state)
{
    band_fixture fixture;
    gb_scene scene = scene_fixture_temperatures(308.15, 0.0, 293.15, 1.0, 288.15);
    gb_sensitivity sensitivity;
    (void)state;
    band_fixture_flat(&fixture, GB_BAND_WAVELENGTH, 8.0, 14.0);
    sensitivity.temperature_k = UNTOUCHED_SENTINEL;
    assert_status(gb_measure_sensitivity(&fixture.band, &scene, &sensitivity),
                  GB_ERR_EMISSIVITY_DOMAIN, "emissivity 0");
    assert_true(sensitivity.temperature_k == UNTOUCHED_SENTINEL);
    scene.emissivity = 0.95;
    assert_status(gb_measure_sensitivity(&fixture.band, &scene, NULL), GB_ERR_INVALID_ARGUMENT,
                  "NULL sensitivity");
    assert_status(gb_measure_sensitivity(NULL, &scene, &sensitivity), GB_ERR_INVALID_ARGUMENT,
                  "NULL band");
    assert_status(gb_gum_budget(NULL, NULL, NULL), GB_ERR_INVALID_ARGUMENT, "NULL budget");
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_sensitivities_against_mpmath),
        cmocka_unit_test(test_worked_example_sensitivities),
        cmocka_unit_test(test_sensitivities_agree_with_finite_differences),
        cmocka_unit_test(test_gum_budget_of_example_a),
        cmocka_unit_test(test_gum_budget_arithmetic),
        cmocka_unit_test(test_gum_budget_errors),
        cmocka_unit_test(test_transmittance_partial_undefined_without_atmosphere),
        cmocka_unit_test(test_emissivity_error),
        cmocka_unit_test(test_emissivity_error_domain),
        cmocka_unit_test(test_input_names),
        cmocka_unit_test(test_sensitivity_arguments),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
