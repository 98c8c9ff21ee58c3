/*
 * Tabulated band radiance and inverse (core/bandtable.h) against the exact
 * band functions of core/band.h, which test_band.c checks against 30-digit
 * mpmath.  The claims tested are the header's: relative error in L and T over
 * each stated range, end points, and the out-of-range statuses.
 */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>

#include <cmocka.h>

#include "bandtable.h"

static gb_band_table table;

struct range_claim {
    double t_min, t_max;
    double radiance_tolerance, temperature_tolerance; /* relative, core/bandtable.h */
};

static const struct range_claim claims[] = {
    {150.0, 2000.0, 1e-10, 1e-10},
    {100.0, 10000.0, 1e-8, 1e-11},
    {10.0, 1000.0, 1e-8, 1e-8},
};

static void test_claimed_accuracy_over_each_range(void **state)
{
    const gb_band band = {GB_BAND_WAVELENGTH, 8.0, 14.0, NULL, NULL, 0};
    (void)state;
    for (size_t c = 0; c < sizeof claims / sizeof claims[0]; ++c) {
        const struct range_claim *claim = &claims[c];
        double worst_radiance = 0.0, worst_temperature = 0.0;
        assert_int_equal(gb_band_table_build(&band, claim->t_min, claim->t_max, &table), GB_OK);
        /* 30 011 temperatures, evenly spaced in ln T and off the table's nodes. */
        for (int i = 0; i <= 30010; ++i) {
            double temperature = claim->t_min * pow(claim->t_max / claim->t_min, i / 30010.0);
            double exact, derivative, tabulated, inverted;
            assert_int_equal(gb_band_radiance(&band, temperature, &exact, &derivative), GB_OK);
            assert_int_equal(gb_band_table_radiance(&table, temperature, &tabulated), GB_OK);
            assert_int_equal(gb_band_table_temperature(&table, exact, &inverted), GB_OK);
            worst_radiance = fmax(worst_radiance, fabs(tabulated / exact - 1.0));
            worst_temperature = fmax(worst_temperature, fabs(inverted / temperature - 1.0));
        }
        print_message("bandtable %g-%g K: worst relative error L %.2e, T %.2e\n", claim->t_min,
                      claim->t_max, worst_radiance, worst_temperature);
        assert_true(worst_radiance <= claim->radiance_tolerance);
        assert_true(worst_temperature <= claim->temperature_tolerance);
    }
}

static void test_response_band_round_trip(void **state)
{
    /* A synthetic response curve of our own (no instrument). */
    static const double wavelength[] = {7.0, 8.0, 10.0, 12.0, 14.0};
    static const double value[] = {0.0, 0.8, 1.0, 0.7, 0.0};
    const gb_band band = {GB_BAND_RESPONSE, 0.0, 0.0, wavelength, value, 5};
    double worst = 0.0;
    (void)state;
    assert_int_equal(gb_band_table_build(&band, 200.0, 1500.0, &table), GB_OK);
    for (int i = 0; i <= 5000; ++i) {
        double temperature = 200.0 + 1300.0 * i / 5000.0, exact, inverted;
        assert_int_equal(gb_band_radiance(&band, temperature, &exact, NULL), GB_OK);
        assert_int_equal(gb_band_table_temperature(&table, exact, &inverted), GB_OK);
        worst = fmax(worst, fabs(inverted / temperature - 1.0));
    }
    print_message("bandtable response 200-1500 K: worst relative error T %.2e\n", worst);
    assert_true(worst <= 1e-10);
}

static void test_outside_the_range(void **state)
{
    const gb_band band = {GB_BAND_WAVELENGTH, 8.0, 14.0, NULL, NULL, 0};
    double low, high, out;
    (void)state;
    assert_int_equal(gb_band_table_build(&band, 200.0, 400.0, &table), GB_OK);
    assert_int_equal(gb_band_radiance(&band, 199.0, &low, NULL), GB_OK);
    assert_int_equal(gb_band_radiance(&band, 401.0, &high, NULL), GB_OK);
    assert_int_equal(gb_band_table_temperature(&table, low, &out), GB_ERR_RADIANCE_OUT_OF_RANGE);
    assert_int_equal(gb_band_table_temperature(&table, high, &out), GB_ERR_RADIANCE_OUT_OF_RANGE);
    assert_int_equal(gb_band_table_temperature(&table, 0.0, &out), GB_ERR_RADIANCE_DOMAIN);
    assert_int_equal(gb_band_table_temperature(&table, NAN, &out), GB_ERR_NOT_FINITE);
    assert_int_equal(gb_band_table_radiance(&table, 199.0, &out), GB_ERR_TEMPERATURE_DOMAIN);
    assert_int_equal(gb_band_table_radiance(&table, NAN, &out), GB_ERR_NOT_FINITE);
    /* The end points themselves are inside. */
    assert_int_equal(gb_band_radiance(&band, 200.0, &low, NULL), GB_OK);
    assert_int_equal(gb_band_table_temperature(&table, low, &out), GB_OK);
    assert_true(fabs(out / 200.0 - 1.0) < 1e-12);
}

static void test_build_statuses(void **state)
{
    const gb_band band = {GB_BAND_WAVELENGTH, 8.0, 14.0, NULL, NULL, 0};
    const gb_band reversed = {GB_BAND_WAVELENGTH, 14.0, 8.0, NULL, NULL, 0};
    (void)state;
    assert_int_equal(gb_band_table_build(&band, 400.0, 200.0, &table), GB_ERR_TEMPERATURE_DOMAIN);
    assert_int_equal(gb_band_table_build(&band, 0.01, 200.0, &table), GB_ERR_TEMPERATURE_DOMAIN);
    assert_int_equal(gb_band_table_build(&band, NAN, 200.0, &table), GB_ERR_NOT_FINITE);
    assert_int_equal(gb_band_table_build(&reversed, 200.0, 400.0, &table), GB_ERR_BAND_REVERSED);
    /* 8-14 um at 1 K underflows: the table cannot start there. */
    assert_int_equal(gb_band_table_build(&band, 1.0, 400.0, &table), GB_ERR_TEMPERATURE_DOMAIN);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_claimed_accuracy_over_each_range),
        cmocka_unit_test(test_response_band_round_trip),
        cmocka_unit_test(test_outside_the_range),
        cmocka_unit_test(test_build_statuses),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
