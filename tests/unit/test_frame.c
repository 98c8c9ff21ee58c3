/*
 * Whole frames (core/frame.h), the band table's array forms (core/bandtable.h)
 * and the prepared spectral position (core/planck.h) against the exact scalar
 * functions of measure.h, band.h and planck.h, which test_measure.c, test_band.c
 * and test_planck.c check against 30-digit mpmath.  The claims tested: every
 * answered pixel is the exact temperature rounded to float32 within one float32
 * step, inside and outside the table's range; pixels without an answer hold
 * absolute zero in the frame's unit with their status; in place works; array
 * lookups and prepared positions give bit-for-bit the scalar results.
 * The calibration form is checked against the mpmath vectors of
 * tests/reference/vectors/calibration_apply.tsv instead (exact data sets,
 * whose signals the generator made from the invented true parameters).
 */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stdbool.h>
#include <stddef.h>
#include <string.h>

#include <cmocka.h>

#include "constants.h"
#include "frame.h"

#define PIXELS 3000
#define FLOAT_STEP 1.1920928955078125e-7 /* 2^-23 */

static gb_band_table table;
static float signal[PIXELS], emissivity[PIXELS], answer[PIXELS];
static unsigned char statuses[PIXELS];

static const gb_band long_wave = {GB_BAND_WAVELENGTH, 8.0, 14.0, NULL, NULL, 0};

/* Apparent temperatures 120-2600 K: below, across and above a 150-2000 K table. */
static void fill_scene(void)
{
    for (size_t i = 0; i < PIXELS; i++) {
        signal[i] = (float)(120.0 * pow(2600.0 / 120.0, (double)i / (PIXELS - 1)));
        emissivity[i] = (float)(0.3 + 0.7 * fmod((double)i * 0.6180339887498949, 1.0));
    }
    emissivity[7] = 0.0f;  /* out of domain */
    emissivity[11] = 1.5f; /* out of domain */
    signal[13] = 150.0f;   /* with emissivity 0.3 and a 400 K surround: no net signal */
    emissivity[13] = 0.3f;
}

static void expect_pixel(size_t i, gb_status status, double exact_k, gb_temperature_unit unit)
{
    double want = 0.0;
    assert_int_equal(statuses[i], status);
    if (status != GB_OK) {
        assert_int_equal(gb_temperature_from_kelvin(0.0, unit, &want), GB_OK);
        assert_true(answer[i] == (float)want);
        return;
    }
    assert_int_equal(gb_temperature_from_kelvin(exact_k, unit, &want), GB_OK);
    if (!(fabs(answer[i] - want) <= FLOAT_STEP * fabs(want))) {
        fail_msg("pixel %zu: %.9g, exact %.12g", i, (double)answer[i], want);
    }
}

static void run_measure_case(const gb_band_table *frame_table, gb_temperature_unit unit,
                             double surround_k)
{
    gb_scene scene = {{GB_TERM_TEMPERATURE, 0.0}, 1.0, {GB_TERM_TEMPERATURE, surround_k}, 0.9,
                      {GB_TERM_TEMPERATURE, 280.0}};
    gb_frame_terms terms;
    size_t unresolved = 0;
    float in_unit[PIXELS];
    for (size_t i = 0; i < PIXELS; i++) {
        double value;
        assert_int_equal(gb_temperature_from_kelvin(signal[i], unit, &value), GB_OK);
        in_unit[i] = (float)value;
    }
    gb_frame frame = {PIXELS, in_unit, GB_TERM_TEMPERATURE, 1.0, emissivity, 1.0, unit, answer,
                      statuses, 0};
    assert_int_equal(gb_frame_prepare(&long_wave, &scene, &terms), GB_OK);
    assert_int_equal(gb_frame_measure_temperature(&long_wave, frame_table, &terms, &frame), GB_OK);
    for (size_t i = 0; i < PIXELS; i++) {
        double kelvin_in, exact = 0.0;
        gb_scene pixel = scene;
        assert_int_equal(gb_temperature_to_kelvin(in_unit[i], unit, &kelvin_in), GB_OK);
        pixel.signal.value = kelvin_in;
        pixel.emissivity = emissivity[i];
        gb_status status = gb_measure_temperature(&long_wave, &pixel, &exact);
        unresolved += status != GB_OK;
        expect_pixel(i, status, exact, unit);
    }
    assert_int_equal(frame.unresolved, unresolved);
    assert_true(unresolved >= 3);
}

static void test_measure_with_table_matches_exact_solver(void **state)
{
    (void)state;
    fill_scene();
    assert_int_equal(gb_band_table_build(&long_wave, 150.0, 2000.0, &table), GB_OK);
    run_measure_case(&table, GB_KELVIN, 400.0);
    run_measure_case(&table, GB_CELSIUS, 400.0);
    run_measure_case(&table, GB_FAHRENHEIT, 400.0);
}

static void test_measure_without_table_matches_exact_solver(void **state)
{
    (void)state;
    fill_scene();
    run_measure_case(NULL, GB_KELVIN, 400.0);
}

static void test_radiance_frame_in_place(void **state)
{
    /* band-temperature form: radiances (exitance, scale 1/pi), nothing reflected. */
    static const gb_frame_terms nothing = {0.0, 1.0, 0.0};
    float frame_pixels[64];
    (void)state;
    assert_int_equal(gb_band_table_build(&long_wave, 150.0, 2000.0, &table), GB_OK);
    for (size_t i = 0; i < 64; i++) {
        frame_pixels[i] = (float)(0.5 * pow(4000.0, (double)i / 63.0)); /* W m^-2 */
    }
    frame_pixels[5] = -1.0f;
    float original[64];
    memcpy(original, frame_pixels, sizeof original);
    gb_frame frame = {64, frame_pixels, GB_TERM_RADIANCE, 1.0 / GB_PI, NULL, 0.9, GB_KELVIN,
                      frame_pixels, statuses, 0};
    assert_int_equal(gb_frame_measure_temperature(&long_wave, &table, &nothing, &frame), GB_OK);
    for (size_t i = 0; i < 64; i++) {
        double exact = 0.0;
        gb_status status = gb_band_temperature(&long_wave, original[i] / GB_PI, 0.9, &exact);
        answer[i] = frame_pixels[i];
        expect_pixel(i, status, exact, GB_KELVIN);
    }
    assert_int_equal(frame.unresolved, 1);
}

static void test_brightness_frame_matches_scalar(void **state)
{
    gb_planck_position position;
    float radiance[32];
    (void)state;
    assert_int_equal(gb_planck_prepare(GB_WAVELENGTH, 11.0, &position), GB_OK);
    for (size_t i = 0; i < 32; i++) {
        radiance[i] = (float)(1e-3 * pow(1e6, (double)i / 31.0));
    }
    radiance[3] = 0.0f;
    gb_frame frame = {32, radiance, GB_TERM_RADIANCE, 1.0, NULL, 0.97, GB_CELSIUS, answer,
                      statuses, 0};
    assert_int_equal(gb_frame_brightness_temperature(&position, &frame), GB_OK);
    for (size_t i = 0; i < 32; i++) {
        double exact = 0.0;
        gb_status status = gb_brightness_temperature(GB_WAVELENGTH, 11.0, radiance[i], 0.97, &exact);
        expect_pixel(i, status, exact, GB_CELSIUS);
    }
    assert_int_equal(frame.unresolved, 1);
}

static void test_array_lookups_equal_scalar_lookups(void **state)
{
    double temperature[500], radiance[500], back[500];
    gb_status status[500], back_status[500];
    (void)state;
    assert_int_equal(gb_band_table_build(&long_wave, 200.0, 400.0, &table), GB_OK);
    for (size_t i = 0; i < 500; i++) {
        temperature[i] = 150.0 + 300.0 * (double)i / 499.0; /* crosses both ends */
    }
    assert_int_equal(gb_band_table_radiance_array(&table, 500, temperature, radiance, status),
                     GB_OK);
    assert_int_equal(gb_band_table_temperature_array(&table, 500, radiance, back, back_status),
                     GB_OK);
    for (size_t i = 0; i < 500; i++) {
        double scalar = -1.0;
        assert_int_equal(status[i], gb_band_table_radiance(&table, temperature[i], &scalar));
        assert_true(status[i] == GB_OK ? radiance[i] == scalar : radiance[i] == 0.0);
        if (status[i] == GB_OK) {
            assert_int_equal(back_status[i], GB_OK);
            assert_int_equal(gb_band_table_temperature(&table, radiance[i], &scalar), GB_OK);
            assert_true(back[i] == scalar);
        }
    }
    assert_int_equal(status[0], GB_ERR_TEMPERATURE_DOMAIN);
    assert_int_equal(status[499], GB_ERR_TEMPERATURE_DOMAIN);
    assert_int_equal(gb_band_table_radiance_array(&table, 0, temperature, radiance, status),
                     GB_ERR_INVALID_ARGUMENT);
}

static void test_prepared_position_equals_scalar(void **state)
{
    static const struct {
        gb_spectral_coordinate coordinate;
        double position;
    } positions[] = {{GB_WAVELENGTH, 10.0}, {GB_WAVELENGTH, 0.5}, {GB_WAVENUMBER, 1000.0},
                     {GB_FREQUENCY, 3e13}, {GB_WAVELENGTH, 1e5}};
    (void)state;
    for (size_t p = 0; p < sizeof positions / sizeof positions[0]; p++) {
        gb_planck_position prepared;
        assert_int_equal(gb_planck_prepare(positions[p].coordinate, positions[p].position,
                                           &prepared),
                         GB_OK);
        for (double t = 3.0; t < 1e5; t *= 1.7) {
            double direct = -1.0, via = -2.0, back_direct = -1.0, back_via = -2.0;
            gb_status s1 = gb_planck_radiance(positions[p].coordinate, positions[p].position, t,
                                              0.8, &direct);
            gb_status s2 = gb_planck_radiance_prepared(&prepared, t, 0.8, &via);
            assert_int_equal(s1, s2);
            if (s1 != GB_OK || direct == 0.0) {
                continue;
            }
            assert_true(direct == via);
            s1 = gb_brightness_temperature(positions[p].coordinate, positions[p].position, direct,
                                           0.8, &back_direct);
            s2 = gb_brightness_temperature_prepared(&prepared, direct, 0.8, &back_via);
            assert_int_equal(s1, s2);
            assert_true(s1 != GB_OK || back_direct == back_via);
        }
    }
    assert_int_equal(gb_planck_prepare(GB_WAVELENGTH, -1.0, &(gb_planck_position){0}),
                     GB_ERR_SPECTRAL_DOMAIN);
}

/* ---- the calibration form ------------------------------------------------------- */

typedef struct calibration_row {
    double signal;        /* instrument units, 17 digits */
    double temperature_k; /* what made the signal */
} calibration_row;

/* calibration_apply.tsv, set sh_narrow_exact: A 0.6523 um, B 41.7 um K, C 5e11 (invented). */
static const calibration_row narrow_rows[] = {
    {1881.6771568976274, 1073.15}, {34250.75532419436, 1273.15},
    {293000.19240981736, 1473.15}, {3052040.7575781923, 1773.15}};
/* Set sh_handheld_exact: A 9.6 um, B 120 um K, C 1e5 (invented). */
static const calibration_row handheld_rows[] = {
    {355.9346739874131, 253.15}, {1163.6887316898185, 323.15}, {4787.026024158625, 473.15},
    {17430.49386573968, 773.15}};
/* Set band_lwir_exact: band 8-14 um, gain 850, offset 1200 (invented). */
static const calibration_row band_rows[] = {
    {25966.752118959765, 263.15}, {50168.91875284315, 303.15}, {117461.5882295673, 373.15}};

#define ROWS(rows) (sizeof rows / sizeof rows[0])

/*
 * Runs `count` rows plus the signals in `refused` (no temperature gives them)
 * through one frame.  Tolerance, in the unit: one float32 step of the kelvin
 * value -- half a step for rounding the answer, and less than half for
 * rounding the signal to float32, which moves T by S |dT/dS| 2^-24 with
 * S |dT/dS| < T / 2 over these sets (largest: 0.45 T, handheld at 773 K).
 */
static void run_calibration_case(const gb_calibration *calibration, const calibration_row *rows,
                                 size_t count, const float *refused, size_t refused_count,
                                 gb_temperature_unit unit, bool in_place)
{
    float pixels[8];
    size_t total = count + refused_count;
    double per_kelvin = unit == GB_FAHRENHEIT ? 1.8 : 1.0;
    assert_true(total <= 8);
    for (size_t i = 0; i < count; i++) {
        pixels[i] = (float)rows[i].signal;
    }
    memcpy(pixels + count, refused, refused_count * sizeof *refused);
    memset(statuses, 0xff, sizeof statuses);
    gb_frame frame = {total, pixels, GB_TERM_RADIANCE, 1.0, NULL, 1.0, unit,
                      in_place ? pixels : answer, statuses, 99};
    assert_int_equal(gb_frame_calibration_apply(calibration, &frame), GB_OK);
    const float *out = in_place ? pixels : answer;
    for (size_t i = 0; i < count; i++) {
        double want = 0.0;
        assert_int_equal(statuses[i], GB_OK);
        assert_int_equal(gb_temperature_from_kelvin(rows[i].temperature_k, unit, &want), GB_OK);
        double tolerance = FLOAT_STEP * rows[i].temperature_k * per_kelvin;
        if (!(fabs(out[i] - want) <= tolerance)) {
            fail_msg("pixel %zu: %.9g, expected %.12g +- %.2g", i, (double)out[i], want,
                     tolerance);
        }
    }
    double absolute_zero = 0.0;
    assert_int_equal(gb_temperature_from_kelvin(0.0, unit, &absolute_zero), GB_OK);
    for (size_t i = count; i < total; i++) {
        assert_int_equal(statuses[i], GB_ERR_SIGNAL_OUT_OF_RANGE);
        assert_true(out[i] == (float)absolute_zero);
    }
    assert_int_equal(frame.unresolved, refused_count);
}

static void test_calibration_frame_matches_reference_vectors(void **state)
{
    static const float not_positive[] = {0.0f, -3.0f};
    static const float below_offset[] = {1199.0f};
    gb_calibration narrow = {GB_CALIBRATION_SAKUMA_HATTORI, {0}, 3, {0.6523, 41.7, 5e11}, {{0}}};
    gb_calibration handheld = {GB_CALIBRATION_SAKUMA_HATTORI, {0}, 3, {9.6, 120.0, 1e5}, {{0}}};
    gb_calibration lwir = {GB_CALIBRATION_BAND, long_wave, 2, {850.0, 1200.0}, {{0}}};
    (void)state;
    run_calibration_case(&narrow, narrow_rows, ROWS(narrow_rows), not_positive, 2, GB_CELSIUS,
                         false);
    run_calibration_case(&handheld, handheld_rows, ROWS(handheld_rows), not_positive, 2,
                         GB_KELVIN, true);
    run_calibration_case(&lwir, band_rows, ROWS(band_rows), below_offset, 1, GB_FAHRENHEIT,
                         false);
}

static void test_calibration_frame_refuses_what_cannot_apply(void **state)
{
    float pixels[2] = {100.0f, 200.0f};
    gb_frame frame = {2, pixels, GB_TERM_RADIANCE, 1.0, NULL, 1.0, GB_KELVIN, answer, NULL, 0};
    gb_calibration negative_scale = {GB_CALIBRATION_SAKUMA_HATTORI, {0}, 3, {9.6, 120.0, -1e5},
                                     {{0}}};
    gb_calibration handheld = {GB_CALIBRATION_SAKUMA_HATTORI, {0}, 3, {9.6, 120.0, 1e5}, {{0}}};
    (void)state;
    assert_int_equal(gb_frame_calibration_apply(&negative_scale, &frame),
                     GB_ERR_INVALID_ARGUMENT);
    assert_int_equal(gb_frame_calibration_apply(NULL, &frame), GB_ERR_INVALID_ARGUMENT);
    assert_int_equal(gb_frame_calibration_apply(&handheld, NULL), GB_ERR_INVALID_ARGUMENT);
    frame.count = 0;
    assert_int_equal(gb_frame_calibration_apply(&handheld, &frame), GB_ERR_INVALID_ARGUMENT);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_measure_with_table_matches_exact_solver),
        cmocka_unit_test(test_measure_without_table_matches_exact_solver),
        cmocka_unit_test(test_radiance_frame_in_place),
        cmocka_unit_test(test_brightness_frame_matches_scalar),
        cmocka_unit_test(test_array_lookups_equal_scalar_lookups),
        cmocka_unit_test(test_prepared_position_equals_scalar),
        cmocka_unit_test(test_calibration_frame_matches_reference_vectors),
        cmocka_unit_test(test_calibration_frame_refuses_what_cannot_apply),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
