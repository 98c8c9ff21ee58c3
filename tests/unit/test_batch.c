/*
 * Array forms (core/batch.h): every element equals the scalar function's answer
 * bit for bit (the scalar functions are checked against mpmath in their own
 * tests), stride 0 broadcasts, failed elements get their own status and 0.0,
 * and the argument checks.
 */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>

#include <cmocka.h>

#include "batch.h"

#define COUNT 7

/* Temperatures with two bad elements: 0 K (out of range) and NaN. */
static const double temperatures[COUNT] = {300.0, 0.0, 1500.0, NAN, 77.0, 5778.0, 310.15};
static const double wavelengths[COUNT] = {10.0, 10.0, 1.0, 4.0, 8.0, 0.5, 9.5};

static void test_planck_radiance_matches_scalar_and_broadcasts(void **state)
{
    const double emissivity = 0.9;
    double radiance[COUNT];
    gb_status status[COUNT];
    (void)state;
    assert_int_equal(gb_batch_planck_radiance(GB_WAVELENGTH, COUNT, GB_ARRAY(wavelengths),
                                              GB_ARRAY(temperatures), GB_BROADCAST(&emissivity),
                                              radiance, status),
                     GB_OK);
    for (size_t i = 0; i < COUNT; ++i) {
        double expected = 0.0;
        gb_status scalar = gb_planck_radiance(GB_WAVELENGTH, wavelengths[i], temperatures[i],
                                              emissivity, &expected);
        assert_int_equal(status[i], scalar);
        assert_true(radiance[i] == (scalar == GB_OK ? expected : 0.0));
    }
    assert_int_equal(status[1], GB_ERR_TEMPERATURE_DOMAIN);
    assert_int_equal(status[3], GB_ERR_NOT_FINITE);
}

static void test_brightness_temperature_round_trip(void **state)
{
    const double one = 1.0, position = 11.0;
    double radiance[COUNT], recovered[COUNT];
    gb_status status[COUNT], back[COUNT];
    (void)state;
    assert_int_equal(gb_batch_planck_radiance(GB_WAVELENGTH, COUNT, GB_BROADCAST(&position),
                                              GB_ARRAY(temperatures), GB_BROADCAST(&one),
                                              radiance, status),
                     GB_OK);
    assert_int_equal(gb_batch_brightness_temperature(GB_WAVELENGTH, COUNT,
                                                     GB_BROADCAST(&position), GB_ARRAY(radiance),
                                                     GB_BROADCAST(&one), recovered, back),
                     GB_OK);
    for (size_t i = 0; i < COUNT; ++i) {
        if (status[i] == GB_OK) {
            assert_int_equal(back[i], GB_OK);
            assert_true(fabs(recovered[i] / temperatures[i] - 1.0) < 1e-13);
        } else {
            /* The failed element's radiance is 0, which has no brightness temperature. */
            assert_int_equal(back[i], GB_ERR_RADIANCE_DOMAIN);
            assert_true(recovered[i] == 0.0);
        }
    }
}

static void test_band_radiance_and_temperature(void **state)
{
    const gb_band band = {GB_BAND_WAVELENGTH, 8.0, 14.0, NULL, NULL, 0};
    const double emissivities[COUNT] = {1.0, 1.0, 0.5, 1.0, 0.95, 1.2, 0.98};
    double radiance[COUNT], recovered[COUNT];
    gb_status status[COUNT], back[COUNT];
    (void)state;
    assert_int_equal(gb_batch_band_radiance(&band, COUNT, GB_ARRAY(temperatures),
                                            GB_ARRAY(emissivities), radiance, status),
                     GB_OK);
    assert_int_equal(status[5], GB_ERR_EMISSIVITY_DOMAIN);
    assert_int_equal(gb_batch_band_temperature(&band, COUNT, GB_ARRAY(radiance),
                                               GB_ARRAY(emissivities), recovered, back),
                     GB_OK);
    for (size_t i = 0; i < COUNT; ++i) {
        gb_band_quantities expected;
        gb_status scalar = gb_band_evaluate(&band, temperatures[i], emissivities[i], &expected);
        assert_int_equal(status[i], scalar);
        if (scalar == GB_OK) {
            assert_true(radiance[i] == expected.radiance);
            assert_int_equal(back[i], GB_OK);
            assert_true(fabs(recovered[i] / temperatures[i] - 1.0) < 1e-12);
        }
    }
}

static void test_measure_worked_example_a_with_an_emissivity_map(void **state)
{
    /* REFERENCES.md worked example A (flat 8-14 um, T_app 308.15 K, T_r 293.15 K, tau 1):
     * T = 308.886829 K at eps 0.95 and 321.438243 K at eps 0.5 (mpmath, 30 digits). */
    const gb_band band = {GB_BAND_WAVELENGTH, 8.0, 14.0, NULL, NULL, 0};
    const double apparent = 308.15, reflected = 293.15, transmittance = 1.0, absent = NAN;
    const double emissivity_map[3] = {0.95, 0.5, 0.0};
    gb_batch_scene scene = {GB_TERM_TEMPERATURE, GB_BROADCAST(&apparent), GB_ARRAY(emissivity_map),
                            GB_TERM_TEMPERATURE, GB_BROADCAST(&reflected),
                            GB_BROADCAST(&transmittance), GB_TERM_TEMPERATURE,
                            GB_BROADCAST(&absent)};
    double temperature[3];
    gb_status status[3];
    (void)state;
    assert_int_equal(gb_batch_measure_temperature(&band, 3, &scene, temperature, status), GB_OK);
    assert_int_equal(status[0], GB_OK);
    assert_true(fabs(temperature[0] - 308.886829) < 5e-7);
    assert_int_equal(status[1], GB_OK);
    assert_true(fabs(temperature[1] - 321.438243) < 5e-7);
    assert_int_equal(status[2], GB_ERR_EMISSIVITY_DOMAIN);
    assert_true(temperature[2] == 0.0);
}

static void test_argument_checks(void **state)
{
    const gb_band reversed = {GB_BAND_WAVELENGTH, 14.0, 8.0, NULL, NULL, 0};
    const double one = 1.0;
    double out[1];
    gb_status status[1];
    (void)state;
    assert_int_equal(gb_batch_planck_radiance(GB_WAVELENGTH, 0, GB_BROADCAST(&one),
                                              GB_BROADCAST(&one), GB_BROADCAST(&one), out, status),
                     GB_ERR_INVALID_ARGUMENT);
    assert_int_equal(gb_batch_planck_radiance(GB_WAVELENGTH, 1, GB_BROADCAST(&one),
                                              GB_BROADCAST(&one), GB_BROADCAST(&one), NULL, status),
                     GB_ERR_INVALID_ARGUMENT);
    assert_int_equal(gb_batch_planck_radiance(GB_WAVELENGTH, 1, GB_BROADCAST(NULL),
                                              GB_BROADCAST(&one), GB_BROADCAST(&one), out, status),
                     GB_ERR_INVALID_ARGUMENT);
    assert_int_equal(gb_batch_band_radiance(&reversed, 1, GB_BROADCAST(&one), GB_BROADCAST(&one),
                                            out, status),
                     GB_ERR_BAND_REVERSED);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_planck_radiance_matches_scalar_and_broadcasts),
        cmocka_unit_test(test_brightness_temperature_round_trip),
        cmocka_unit_test(test_band_radiance_and_temperature),
        cmocka_unit_test(test_measure_worked_example_a_with_an_emissivity_map),
        cmocka_unit_test(test_argument_checks),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
