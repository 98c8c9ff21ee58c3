/*
 * Monte Carlo propagation through the measurement equation
 * (core/montecarlo.h, JCGM 101:2008).
 *
 * Expected values: mpmath at 30 digits, tests/reference/workflows.py,
 * tests/reference/vectors/workflows_montecarlo.tsv: the GUM (JCGM 100:2008)
 * combined standard uncertainty from mpmath.diff sensitivities; and, where one
 * input alone varies, the exact law of the output (T is monotonic in that
 * input, so its quantiles are T at the input's quantiles), with the range a
 * Monte Carlo estimate from the row's draw count may take (5 sampling
 * standard deviations).  Every run uses a fixed seed, so results are
 * deterministic; the tolerances say what any seed should meet.
 */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <cmocka.h>

#include "vector_table.h"

#include "montecarlo.h"

static size_t workflow_row(const vector_table *table, const char *column, const char *value)
{
    for (size_t r = 0; r < vector_table_rows(table); ++r) {
        if (strcmp(vector_table_text(table, r, column), value) == 0) {
            return r;
        }
    }
    fail_msg("no row with %s = %s in the vectors", column, value);
    return 0;
}

#define SEED 20240917u
#define DRAWS 100000
/* JCGM 101 section 8 idea: in a near-linear case MC must reproduce the GUM. */
#define GUM_SD_AGREEMENT 0.02
#define GUM_HALF_WIDTH_AGREEMENT 0.03
#define NORMAL_95_FACTOR 1.959963984540054 /* the 97.5 % point of the standard normal */

static double workspace[DRAWS];

static const char *const input_name[GB_INPUT_COUNT] = {"emissivity", "reflected",
                                                       "transmittance", "atmosphere", "signal"};

typedef struct mc_case {
    gb_band band;
    gb_scene scene;
    gb_monte_carlo_input input;
    size_t draws;
} mc_case;

static gb_term temperature_term(double value_k)
{
    gb_term term;
    term.kind = GB_TERM_TEMPERATURE;
    term.value = value_k;
    return term;
}

/* Worked example A (REFERENCES.md): flat 8-14 um, T_app 308.15 K, eps 0.95, T_refl 293.15 K. */
static mc_case example_a(void)
{
    mc_case c;
    memset(&c, 0, sizeof c);
    c.band.kind = GB_BAND_WAVELENGTH;
    c.band.lower = 8.0;
    c.band.upper = 14.0;
    c.scene.signal = temperature_term(308.15);
    c.scene.emissivity = 0.95;
    c.scene.reflected = temperature_term(293.15);
    c.scene.transmittance = 1.0;
    c.scene.atmosphere = temperature_term(NAN);
    c.draws = DRAWS;
    return c;
}

static gb_distribution law_named(const char *text)
{
    if (strcmp(text, "normal") == 0) {
        return GB_DISTRIBUTION_NORMAL;
    }
    return strcmp(text, "rectangular") == 0 ? GB_DISTRIBUTION_RECTANGULAR : GB_DISTRIBUTION_NONE;
}

/* The row of `case_name` (every row is an 8-14 um scene with temperature terms). */
static mc_case case_of_row(const vector_table *table, const char *case_name)
{
    mc_case c = example_a();
    size_t r = workflow_row(table, "case", case_name);
    assert_string_equal(vector_table_text(table, r, "band"), "wavelength:8:14");
    c.scene.signal.value = vector_table_number(table, r, "signal");
    c.scene.emissivity = vector_table_number(table, r, "emissivity");
    c.scene.reflected.value = vector_table_number(table, r, "reflected");
    c.scene.transmittance = vector_table_number(table, r, "transmittance");
    c.scene.atmosphere.value = vector_table_number(table, r, "atmosphere");
    c.draws = (size_t)vector_table_number(table, r, "draws");
    assert_true(c.draws <= DRAWS);
    for (int i = 0; i < GB_INPUT_COUNT; ++i) {
        char column[64];
        snprintf(column, sizeof column, "%s_law", input_name[i]);
        c.input.distribution[i] = law_named(vector_table_text(table, r, column));
        snprintf(column, sizeof column, "%s_u", input_name[i]);
        c.input.standard_uncertainty[i] = vector_table_number(table, r, column);
    }
    return c;
}

static gb_monte_carlo_result run(const mc_case *c, uint64_t seed)
{
    gb_monte_carlo_result result;
    assert_int_equal(gb_monte_carlo(&c->band, &c->scene, &c->input, c->draws, seed, workspace,
                                    &result),
                     GB_OK);
    assert_int_equal(result.used_draws + result.unsolvable_draws, c->draws);
    return result;
}

static void print_result(const char *name, const gb_monte_carlo_result *result, double gum)
{
    print_message("montecarlo: %s: mean %.6f K, sd %.6f K, 95 %% [%.6f, %.6f] K "
                  "(below mean %.4f, above %.4f), GUM u_c %.6f K (sd/u_c %.4f), "
                  "%zu used, %zu unsolvable\n",
                  name, result->mean_k, result->standard_deviation_k, result->coverage_low_k,
                  result->coverage_high_k, result->mean_k - result->coverage_low_k,
                  result->coverage_high_k - result->mean_k, gum,
                  result->standard_deviation_k / gum, result->used_draws,
                  result->unsolvable_draws);
}

/* Near-linear: worked example A, u(eps) = 0.02, u(T_r) = 2 K, u(T_app) = 0.5 K, all normal. */
static void test_near_linear_case_reproduces_gum(void **state)
{
    vector_table *table;
    mc_case c;
    gb_monte_carlo_result result;
    double gum, half_width, centre;
    size_t r;
    (void)state;
    table = vector_table_load("workflows_montecarlo.tsv");
    c = case_of_row(table, "gum_example_a");
    r = workflow_row(table, "case", "gum_example_a");
    gum = vector_table_number(table, r, "gum_standard_uncertainty_k");
    centre = vector_table_number(table, r, "temperature_k");
    vector_table_free(table);
    /* REFERENCES.md: u_c = 0.614 K for this case (JCGM 100 eq. 10); mpmath agrees to 3 digits. */
    assert_true(fabs(gum - 0.614) < 0.0005);
    result = run(&c, SEED);
    half_width = (result.coverage_high_k - result.coverage_low_k) / 2.0;
    print_result("worked example A", &result, gum);
    print_message("montecarlo: worked example A: half-width %.5f K vs 1.96 u_c %.5f K (%+.2f %%); "
                  "JCGM 101 8.1 endpoint differences |y - U - y_low| %.5f K, "
                  "|y + U - y_high| %.5f K\n",
                  half_width, NORMAL_95_FACTOR * gum,
                  100.0 * (half_width / (NORMAL_95_FACTOR * gum) - 1.0),
                  fabs(centre - NORMAL_95_FACTOR * gum - result.coverage_low_k),
                  fabs(centre + NORMAL_95_FACTOR * gum - result.coverage_high_k));
    assert_true(fabs(result.standard_deviation_k / gum - 1.0) <= GUM_SD_AGREEMENT);
    assert_true(fabs(half_width / (NORMAL_95_FACTOR * gum) - 1.0) <= GUM_HALF_WIDTH_AGREEMENT);
    /* Truncation at eps = 1 and curvature move the mean by ~0.01 K; sampling by 0.002 K. */
    assert_true(fabs(result.mean_k - centre) < 0.1 * gum);
}

/* One varying input: the output's quantiles (and sd, where given) against the exact law. */
static void check_against_exact_law(const char *case_name, gb_monte_carlo_result *out,
                                    double *gum_out)
{
    vector_table *table;
    mc_case c;
    size_t r;
    double sd_min, sd_max;
    table = vector_table_load("workflows_montecarlo.tsv");
    c = case_of_row(table, case_name);
    r = workflow_row(table, "case", case_name);
    *out = run(&c, SEED);
    *gum_out = vector_table_number(table, r, "gum_standard_uncertainty_k");
    print_result(case_name, out, *gum_out);
    print_message("montecarlo: %s: exact 95 %% [%.6f, %.6f] K, exact sd %s K\n", case_name,
                  vector_table_number(table, r, "exact_low_k"),
                  vector_table_number(table, r, "exact_high_k"),
                  vector_table_text(table, r, "exact_standard_deviation_k"));
    assert_true(out->coverage_low_k >= vector_table_number(table, r, "low_min_k"));
    assert_true(out->coverage_low_k <= vector_table_number(table, r, "low_max_k"));
    assert_true(out->coverage_high_k >= vector_table_number(table, r, "high_min_k"));
    assert_true(out->coverage_high_k <= vector_table_number(table, r, "high_max_k"));
    sd_min = vector_table_number(table, r, "standard_deviation_min_k");
    sd_max = vector_table_number(table, r, "standard_deviation_max_k");
    if (!isnan(sd_min)) {
        assert_true(out->standard_deviation_k >= sd_min && out->standard_deviation_k <= sd_max);
    }
    vector_table_free(table);
}

/* Rectangular u(eps) = 0.02, i.e. eps uniform on 0.95 -+ 0.0346: sd and interval exact. */
static void test_rectangular_emissivity(void **state)
{
    gb_monte_carlo_result result;
    double gum;
    (void)state;
    check_against_exact_law("rectangular_emissivity", &result, &gum);
    /* Near-linear, so the GUM standard uncertainty holds as well. */
    assert_true(fabs(result.standard_deviation_k / gum - 1.0) < 0.01);
}

/* Normal u(eps) = 0.1 about 0.95: a third of the draws exceed 1 and must be redrawn. */
static void test_truncated_emissivity(void **state)
{
    gb_monte_carlo_result result;
    double gum;
    (void)state;
    check_against_exact_law("truncated_emissivity", &result, &gum);
}

/* The interval against the mean, and the sd against the GUM; asserts both depart. */
static void check_departure_from_gum(const char *name, const gb_monte_carlo_result *result,
                                     double gum)
{
    double below = result->mean_k - result->coverage_low_k;
    double above = result->coverage_high_k - result->mean_k;
    print_message("montecarlo: %s: the interval reaches %.2f K above the mean and %.2f K below "
                  "(ratio %.2f); the GUM gives -+%.2f K; sd/u_c = %.3f\n",
                  name, above, below, above / below, NORMAL_95_FACTOR * gum,
                  result->standard_deviation_k / gum);
    assert_true(above > 1.5 * below);
    assert_true(fabs(result->standard_deviation_k / gum - 1.0) > 0.10);
}

/*
 * eps = 0.3, u(eps) = 0.1 (normal) on a 340 K apparent surface before a 293.15 K
 * background: a small emissivity error at a large surface-background contrast gives a
 * large temperature error (common practice), here a strongly skewed one the GUM cannot
 * describe.  Draws near eps = 0 give very hot answers, so the sd is ruled by a few draws
 * (T has no finite mean below the solver's 1e6 K cap); the interval is robust.
 */
static void test_nonlinear_normal_case_departs_from_gum(void **state)
{
    gb_monte_carlo_result result;
    double gum;
    (void)state;
    check_against_exact_law("nonlinear_low_emissivity", &result, &gum);
    check_departure_from_gum("non-linear, normal", &result, gum);
}

/* The same scene with eps rectangular: T's exact sd is 22.6 % above the GUM's u_c (mpmath). */
static void test_nonlinear_rectangular_case_departs_from_gum(void **state)
{
    gb_monte_carlo_result result;
    double gum;
    (void)state;
    check_against_exact_law("nonlinear_rectangular", &result, &gum);
    check_departure_from_gum("non-linear, rectangular", &result, gum);
}

static void test_seed_reproducibility(void **state)
{
    mc_case c = example_a();
    gb_monte_carlo_result first, again, other;
    (void)state;
    c.input.distribution[GB_INPUT_EMISSIVITY] = GB_DISTRIBUTION_NORMAL;
    c.input.standard_uncertainty[GB_INPUT_EMISSIVITY] = 0.02;
    c.input.distribution[GB_INPUT_SIGNAL] = GB_DISTRIBUTION_RECTANGULAR;
    c.input.standard_uncertainty[GB_INPUT_SIGNAL] = 0.5;
    c.draws = 2000;
    first = run(&c, 7);
    again = run(&c, 7);
    other = run(&c, 8);
    assert_memory_equal(&first, &again, sizeof first);
    assert_true(first.mean_k != other.mean_k);
    assert_true(first.standard_deviation_k != other.standard_deviation_k);
    assert_true(first.coverage_low_k != other.coverage_low_k ||
                first.coverage_high_k != other.coverage_high_k);
}

/* Nothing varies: every draw is the central solution, 308.886829188011 K (mpmath, example_a). */
static void test_fixed_inputs_give_the_central_answer(void **state)
{
    mc_case c = example_a();
    gb_monte_carlo_result result;
    (void)state;
    c.input.standard_uncertainty[GB_INPUT_EMISSIVITY] = 0.5; /* law NONE: held fixed */
    c.draws = GB_MONTE_CARLO_MIN_DRAWS;
    result = run(&c, SEED);
    assert_true(fabs(result.mean_k / 308.88682918801138464 - 1.0) < 1e-12);
    assert_true(result.standard_deviation_k < 1e-9);
    assert_true(result.coverage_low_k == result.coverage_high_k);
}

static void test_draw_count_limits(void **state)
{
    mc_case c = example_a();
    gb_monte_carlo_result result;
    static const size_t refused[] = {0, GB_MONTE_CARLO_MIN_DRAWS - 1,
                                     GB_MONTE_CARLO_MAX_DRAWS + 1};
    (void)state;
    c.input.distribution[GB_INPUT_SIGNAL] = GB_DISTRIBUTION_NORMAL;
    c.input.standard_uncertainty[GB_INPUT_SIGNAL] = 0.5;
    for (size_t i = 0; i < sizeof refused / sizeof refused[0]; ++i) {
        assert_int_equal(gb_monte_carlo(&c.band, &c.scene, &c.input, refused[i], SEED, workspace,
                                        &result),
                         GB_ERR_DRAW_COUNT);
    }
    c.draws = GB_MONTE_CARLO_MIN_DRAWS;
    result = run(&c, SEED);
    assert_int_equal(result.used_draws, GB_MONTE_CARLO_MIN_DRAWS);
}

static void test_input_statuses(void **state)
{
    mc_case c = example_a();
    gb_monte_carlo_result result, untouched;
    (void)state;
    memset(&result, 0x5a, sizeof result);
    memcpy(&untouched, &result, sizeof untouched);
    c.input.distribution[GB_INPUT_REFLECTED] = (gb_distribution)3;
    c.input.standard_uncertainty[GB_INPUT_REFLECTED] = 1.0;
    assert_int_equal(gb_monte_carlo(&c.band, &c.scene, &c.input, 1000, SEED, workspace, &result),
                     GB_ERR_DISTRIBUTION_UNKNOWN);
    c.input.distribution[GB_INPUT_REFLECTED] = GB_DISTRIBUTION_NORMAL;
    c.input.standard_uncertainty[GB_INPUT_REFLECTED] = -1.0;
    assert_int_equal(gb_monte_carlo(&c.band, &c.scene, &c.input, 1000, SEED, workspace, &result),
                     GB_ERR_UNCERTAINTY_DOMAIN);
    c.input.standard_uncertainty[GB_INPUT_REFLECTED] = NAN;
    assert_int_equal(gb_monte_carlo(&c.band, &c.scene, &c.input, 1000, SEED, workspace, &result),
                     GB_ERR_NOT_FINITE);
    c.input.standard_uncertainty[GB_INPUT_REFLECTED] = 1.0;
    c.scene.emissivity = 1.5;
    assert_int_equal(gb_monte_carlo(&c.band, &c.scene, &c.input, 1000, SEED, workspace, &result),
                     GB_ERR_EMISSIVITY_DOMAIN);
    c.scene.emissivity = 0.95;
    assert_int_equal(gb_monte_carlo(&c.band, &c.scene, &c.input, 1000, SEED, NULL, &result),
                     GB_ERR_INVALID_ARGUMENT);
    assert_int_equal(gb_monte_carlo(&c.band, &c.scene, NULL, 1000, SEED, workspace, &result),
                     GB_ERR_INVALID_ARGUMENT);
    assert_memory_equal(&result, &untouched, sizeof result); /* status.h: untouched */
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_near_linear_case_reproduces_gum),
        cmocka_unit_test(test_rectangular_emissivity),
        cmocka_unit_test(test_truncated_emissivity),
        cmocka_unit_test(test_nonlinear_normal_case_departs_from_gum),
        cmocka_unit_test(test_nonlinear_rectangular_case_departs_from_gum),
        cmocka_unit_test(test_seed_reproducibility),
        cmocka_unit_test(test_fixed_inputs_give_the_central_answer),
        cmocka_unit_test(test_draw_count_limits),
        cmocka_unit_test(test_input_statuses),
    };
    return cmocka_run_group_tests_name("montecarlo (JCGM 101)", tests, NULL, NULL);
}
