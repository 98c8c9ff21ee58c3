/*
 * Spectral grids (core/spectrum.h): exact end points, the accuracy the header
 * claims for inner points (3 ulp linear; 2 + |ln(upper/lower)| ulp logarithmic),
 * count limits and argument statuses.
 *
 * Expected positions: mpmath at 30 digits, tests/reference/workflows.py,
 * tests/reference/vectors/workflows_spectrum.tsv (each exact position given as
 * its nearest double plus the remainder in ulps of that double).
 */
#include <float.h>
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <cmocka.h>

#include "vector_table.h"

#include "spectrum.h"

static double grid[GB_SPECTRUM_MAX_POINTS + 1];

static gb_grid_spacing spacing_named(const char *name)
{
    return strcmp(name, "linear") == 0 ? GB_GRID_LINEAR : GB_GRID_LOGARITHMIC;
}

/* Error of `got` in ulps of the nearest double to the exact position. */
static double ulps_from_exact(double got, double nearest, double rest_ulp)
{
    return fabs((got - nearest) / (nextafter(nearest, INFINITY) - nearest) - rest_ulp);
}

/* The accuracy core/spectrum.h states for a grid, in ulps. */
static double claimed_ulps(gb_grid_spacing spacing, double lower, double upper)
{
    if (spacing == GB_GRID_LINEAR) {
        return 3.0;
    }
    if (isfinite(upper / lower)) {
        return 2.0 + fabs(log(upper / lower));
    }
    return 2.0 + fabs(log(lower)) + fabs(log(upper));
}

/* The worst error of the points of one spacing that the mpmath table lists, as a share of
 * the claimed accuracy (1 = exactly at the claim). */
static double worst_ulps(gb_grid_spacing wanted)
{
    vector_table *table;
    double worst = 0.0;
    size_t over_claim = 0, worst_row = 0, rows = 0;
    table = vector_table_load("workflows_spectrum.tsv");
    for (size_t r = 0; r < vector_table_rows(table); ++r) {
        double error;
        /* A quotient upper/lower beyond a double has its own test, below. */
        if (spacing_named(vector_table_text(table, r, "spacing")) != wanted ||
            !isfinite(vector_table_number(table, r, "upper") / vector_table_number(table, r, "lower"))) {
            continue;
        }
        rows++;
        assert_int_equal(gb_spectral_grid(vector_table_number(table, r, "lower"),
                                          vector_table_number(table, r, "upper"),
                                          (size_t)vector_table_number(table, r, "count"), wanted,
                                          grid),
                         GB_OK);
        error = ulps_from_exact(grid[(size_t)vector_table_number(table, r, "index")],
                                vector_table_number(table, r, "nearest"),
                                vector_table_number(table, r, "rest_ulp"));
        error /= claimed_ulps(wanted, vector_table_number(table, r, "lower"),
                              vector_table_number(table, r, "upper"));
        over_claim += error > 1.0;
        if (!(error <= worst)) {
            worst = error;
            worst_row = r;
        }
    }
    print_message("spectrum: %s grids: worst %.3f of the claimed ulps at %s..%s n=%s point %s; "
                  "%zu of %zu points over the claim\n",
                  wanted == GB_GRID_LINEAR ? "linear" : "logarithmic", worst,
                  vector_table_text(table, worst_row, "lower"),
                  vector_table_text(table, worst_row, "upper"),
                  vector_table_text(table, worst_row, "count"),
                  vector_table_text(table, worst_row, "index"), over_claim, rows);
    vector_table_free(table);
    return worst;
}

static void test_linear_points_against_mpmath(void **state)
{
    (void)state;
    assert_true(worst_ulps(GB_GRID_LINEAR) <= 1.0);
}

static void test_logarithmic_points_against_mpmath(void **state)
{
    (void)state;
    assert_true(worst_ulps(GB_GRID_LOGARITHMIC) <= 1.0);
}

/*
 * 1e-200 to 1e200 in five ratios of 1e100: every position is an ordinary double, though
 * upper/lower is not (mpmath: 1e-100, 1, 1e100 within 0.33 ulp, workflows_spectrum.tsv).
 * Claimed accuracy there: 2 + |ln 1e-200| + |ln 1e200| = 923 ulp, about 1e-13 relative.
 */
static void test_logarithmic_grid_over_a_huge_span(void **state)
{
    (void)state;
    assert_int_equal(gb_spectral_grid(1e-200, 1e200, 5, GB_GRID_LOGARITHMIC, grid), GB_OK);
    print_message("spectrum: 1e-200..1e200 logarithmic: %g %g %g %g %g\n", grid[0], grid[1],
                  grid[2], grid[3], grid[4]);
    assert_true(fabs(grid[1] / 1e-100 - 1.0) < 923 * DBL_EPSILON);
    assert_true(fabs(grid[2] - 1.0) < 923 * DBL_EPSILON);
    assert_true(fabs(grid[3] / 1e100 - 1.0) < 923 * DBL_EPSILON);
}

static void test_end_points_are_exact(void **state)
{
    /* Awkward decimal limits, none a power of two, so no rounding can land on them by luck. */
    static const double limits[][2] = {{0.3, 0.7}, {0.1, 1000.0}, {1e-3, 1e5}, {7.9, 14.1}};
    static const size_t counts[] = {2, 3, 17, 1000, GB_SPECTRUM_MAX_POINTS};
    (void)state;
    for (size_t l = 0; l < sizeof limits / sizeof limits[0]; ++l) {
        for (size_t c = 0; c < sizeof counts / sizeof counts[0]; ++c) {
            for (int s = GB_GRID_LINEAR; s <= GB_GRID_LOGARITHMIC; ++s) {
                assert_int_equal(gb_spectral_grid(limits[l][0], limits[l][1], counts[c],
                                                  (gb_grid_spacing)s, grid),
                                 GB_OK);
                assert_true(grid[0] == limits[l][0]);
                assert_true(grid[counts[c] - 1] == limits[l][1]);
            }
        }
    }
}

/* Rising positions and, on a linear grid, equal steps to within the rounding of the points. */
static void test_points_rise_with_even_spacing(void **state)
{
    const double lower = 0.1, upper = 1000.0;
    const size_t count = 4001;
    const double step = (upper - lower) / (double)(count - 1);
    double worst_step = 0.0;
    (void)state;
    assert_int_equal(gb_spectral_grid(lower, upper, count, GB_GRID_LINEAR, grid), GB_OK);
    for (size_t i = 1; i < count; ++i) {
        assert_true(grid[i] > grid[i - 1]);
        worst_step = fmax(worst_step, fabs((grid[i] - grid[i - 1]) / step - 1.0));
    }
    /* Two positions near 1000 each round by up to 2 ulp = 2.3e-13: 1e-12 of a 0.25 step. */
    print_message("spectrum: linear step worst relative deviation %.3g\n", worst_step);
    assert_true(worst_step < 1e-11);
    assert_int_equal(gb_spectral_grid(lower, upper, count, GB_GRID_LOGARITHMIC, grid), GB_OK);
    for (size_t i = 1; i < count; ++i) {
        assert_true(grid[i] > grid[i - 1]);
    }
}

static void test_two_points_are_the_limits(void **state)
{
    (void)state;
    assert_int_equal(gb_spectral_grid(8.0, 14.0, 2, GB_GRID_LOGARITHMIC, grid), GB_OK);
    assert_true(grid[0] == 8.0 && grid[1] == 14.0);
}

static void test_count_limits(void **state)
{
    (void)state;
    grid[0] = -1.0;
    assert_int_equal(gb_spectral_grid(8.0, 14.0, 0, GB_GRID_LINEAR, grid),
                     GB_ERR_INVALID_ARGUMENT);
    assert_int_equal(gb_spectral_grid(8.0, 14.0, 1, GB_GRID_LINEAR, grid),
                     GB_ERR_INVALID_ARGUMENT);
    assert_int_equal(gb_spectral_grid(8.0, 14.0, GB_SPECTRUM_MAX_POINTS + 1, GB_GRID_LINEAR, grid),
                     GB_ERR_INVALID_ARGUMENT);
    assert_true(grid[0] == -1.0); /* status.h: out-pointers untouched on failure */
    assert_int_equal(gb_spectral_grid(8.0, 14.0, GB_SPECTRUM_MAX_POINTS, GB_GRID_LINEAR, grid),
                     GB_OK);
    assert_true(grid[GB_SPECTRUM_MAX_POINTS - 1] == 14.0);
}

static void test_limit_statuses(void **state)
{
    static const struct {
        double lower, upper;
        gb_status expected;
    } cases[] = {
        {14.0, 8.0, GB_ERR_BAND_REVERSED}, {8.0, 8.0, GB_ERR_BAND_REVERSED},
        {0.0, 8.0, GB_ERR_BAND_LIMITS},    {-1.0, 8.0, GB_ERR_BAND_LIMITS},
        {8.0, 0.0, GB_ERR_BAND_REVERSED},  {NAN, 8.0, GB_ERR_NOT_FINITE},
        {8.0, NAN, GB_ERR_NOT_FINITE},     {8.0, INFINITY, GB_ERR_NOT_FINITE},
    };
    (void)state;
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; ++i) {
        for (int s = GB_GRID_LINEAR; s <= GB_GRID_LOGARITHMIC; ++s) {
            grid[0] = -1.0;
            assert_int_equal(gb_spectral_grid(cases[i].lower, cases[i].upper, 10,
                                              (gb_grid_spacing)s, grid),
                             cases[i].expected);
            assert_true(grid[0] == -1.0);
        }
    }
}

static void test_argument_statuses(void **state)
{
    (void)state;
    assert_int_equal(gb_spectral_grid(8.0, 14.0, 10, GB_GRID_LINEAR, NULL),
                     GB_ERR_INVALID_ARGUMENT);
    assert_int_equal(gb_spectral_grid(8.0, 14.0, 10, (gb_grid_spacing)2, grid),
                     GB_ERR_INVALID_ARGUMENT);
    assert_int_equal(gb_spectral_grid(8.0, 14.0, 10, (gb_grid_spacing)-1, grid),
                     GB_ERR_INVALID_ARGUMENT);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_linear_points_against_mpmath),
        cmocka_unit_test(test_logarithmic_points_against_mpmath),
        cmocka_unit_test(test_logarithmic_grid_over_a_huge_span),
        cmocka_unit_test(test_end_points_are_exact),
        cmocka_unit_test(test_points_rise_with_even_spacing),
        cmocka_unit_test(test_two_points_are_the_limits),
        cmocka_unit_test(test_count_limits),
        cmocka_unit_test(test_limit_statuses),
        cmocka_unit_test(test_argument_statuses),
    };
    return cmocka_run_group_tests_name("spectrum", tests, NULL, NULL);
}
