/*
 * Temperature scales and spectral coordinates (core/units.h).
 *
 * Expected values: tests/reference/vectors/units.tsv, exact conversions of
 * each double input by mpmath via tests/reference/generate.py, using the
 * ITS-90 relations t/C = T/K - 273.15 and t/F = 1.8 t/C + 32 and the exact SI
 * speed of light (CODATA 2018); the literal rows below follow from those same
 * definitions.
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
#include "status_expect.h"
#include "units.h"
#include "vector_table.h"

/* units.h: spectral conversions are within 2 ulp relative. */
#define SPECTRAL_CLAIM (2.0 * DBL_EPSILON)
/*
 * Temperatures with an offset cannot be good to 2 ulp *relative* near 0 K:
 * 273.15 itself is not a double.  The bound here is 2 ulp of the largest
 * operand (no claim in units.h).
 */
#define OFFSET_ROUNDINGS (2.0 * DBL_EPSILON)
#define LARGEST_OFFSET_K 273.15

enum conversion_id {
    TO_KELVIN,
    FROM_KELVIN,
    DIFFERENCE_TO_KELVIN,
    DIFFERENCE_FROM_KELVIN,
    TO_MICROMETRES,
    WAVENUMBER_TO_WAVELENGTH,
    WAVELENGTH_TO_WAVENUMBER,
    FREQUENCY_TO_WAVELENGTH,
    WAVELENGTH_TO_FREQUENCY
};

/* Every conversion of units.h behind one signature; `unit` is ignored where there is none. */
static gb_status convert(enum conversion_id id, double value, int unit, double *result)
{
    switch (id) {
    case TO_KELVIN: return gb_temperature_to_kelvin(value, (gb_temperature_unit)unit, result);
    case FROM_KELVIN: return gb_temperature_from_kelvin(value, (gb_temperature_unit)unit, result);
    case DIFFERENCE_TO_KELVIN:
        return gb_temperature_difference_to_kelvin(value, (gb_temperature_unit)unit, result);
    case DIFFERENCE_FROM_KELVIN:
        return gb_temperature_difference_from_kelvin(value, (gb_temperature_unit)unit, result);
    case TO_MICROMETRES:
        return gb_wavelength_to_micrometres(value, (gb_wavelength_unit)unit, result);
    case WAVENUMBER_TO_WAVELENGTH: return gb_wavenumber_to_wavelength(value, result);
    case WAVELENGTH_TO_WAVENUMBER: return gb_wavelength_to_wavenumber(value, result);
    case FREQUENCY_TO_WAVELENGTH: return gb_frequency_to_wavelength(value, result);
    case WAVELENGTH_TO_FREQUENCY: break;
    }
    return gb_wavelength_to_frequency(value, result);
}

struct conversion {
    const char *name; /* as in units.tsv */
    enum conversion_id id;
    int has_offset;   /* an absolute temperature: judged by OFFSET_ROUNDINGS */
    accuracy_record accuracy;
};

static struct conversion conversions[] = {
    {"temperature_to_kelvin", TO_KELVIN, 1,
     ACCURACY_RECORD("gb_temperature_to_kelvin (in 2 ulp of the largest operand)", 1.0)},
    {"temperature_from_kelvin", FROM_KELVIN, 1,
     ACCURACY_RECORD("gb_temperature_from_kelvin (in 2 ulp of the largest operand)", 1.0)},
    {"difference_to_kelvin", DIFFERENCE_TO_KELVIN, 0,
     ACCURACY_RECORD("gb_temperature_difference_to_kelvin", SPECTRAL_CLAIM)},
    {"difference_from_kelvin", DIFFERENCE_FROM_KELVIN, 0,
     ACCURACY_RECORD("gb_temperature_difference_from_kelvin", SPECTRAL_CLAIM)},
    {"wavelength_to_micrometres", TO_MICROMETRES, 0,
     ACCURACY_RECORD("gb_wavelength_to_micrometres", SPECTRAL_CLAIM)},
    {"wavenumber_to_wavelength", WAVENUMBER_TO_WAVELENGTH, 0,
     ACCURACY_RECORD("gb_wavenumber_to_wavelength", SPECTRAL_CLAIM)},
    {"wavelength_to_wavenumber", WAVELENGTH_TO_WAVENUMBER, 0,
     ACCURACY_RECORD("gb_wavelength_to_wavenumber", SPECTRAL_CLAIM)},
    {"frequency_to_wavelength", FREQUENCY_TO_WAVELENGTH, 0,
     ACCURACY_RECORD("gb_frequency_to_wavelength", SPECTRAL_CLAIM)},
    {"wavelength_to_frequency", WAVELENGTH_TO_FREQUENCY, 0,
     ACCURACY_RECORD("gb_wavelength_to_frequency", SPECTRAL_CLAIM)},
};

static struct conversion *conversion_named(const char *name)
{
    for (size_t i = 0; i < sizeof conversions / sizeof conversions[0]; ++i) {
        if (strcmp(conversions[i].name, name) == 0) {
            return &conversions[i];
        }
    }
    fail_msg("units.tsv names an unknown conversion '%s'", name);
    return NULL;
}

/* The unit column of units.tsv: K C F for temperatures, um nm m for wavelengths, - for none. */
static int unit_from_text(const char *text)
{
    static const struct {
        const char *text;
        int unit;
    } units[] = {{"K", GB_KELVIN}, {"C", GB_CELSIUS}, {"F", GB_FAHRENHEIT}, {"um", GB_MICROMETRE},
                 {"nm", GB_NANOMETRE}, {"m", GB_METRE}, {"-", 0}};
    for (size_t i = 0; i < sizeof units / sizeof units[0]; ++i) {
        if (strcmp(units[i].text, text) == 0) {
            return units[i].unit;
        }
    }
    fail_msg("units.tsv names an unknown unit '%s'", text);
    return 0;
}

static void test_conversions_against_mpmath(void **state)
{
    vector_table *table = vector_table_load("units.tsv");
    (void)state;
    for (size_t row = 0; row < vector_table_rows(table); ++row) {
        struct conversion *conversion =
            conversion_named(vector_table_text(table, row, "conversion"));
        const char *unit_text = vector_table_text(table, row, "unit");
        double input = vector_table_number(table, row, "input");
        double expected = vector_table_number(table, row, "expected");
        gb_status expected_status =
            status_from_identifier(vector_table_text(table, row, "status"));
        double result = UNTOUCHED_SENTINEL;
        char what[160];
        snprintf(what, sizeof what, "units.tsv row %zu: %s(%.17g %s)", row, conversion->name,
                 input, unit_text);
        assert_status(convert(conversion->id, input, unit_from_text(unit_text), &result),
                      expected_status, what);
        if (expected_status != GB_OK) {
            assert_true(result == UNTOUCHED_SENTINEL);
            continue;
        }
        if (conversion->has_offset) {
            double largest = fmax(fabs(input), fmax(fabs(expected), LARGEST_OFFSET_K));
            accuracy_observe_error(&conversion->accuracy,
                                   fabs(result - expected) / (OFFSET_ROUNDINGS * largest), result,
                                   expected, "%s", what);
        } else {
            accuracy_observe(&conversion->accuracy, result, expected, "%s", what);
        }
    }
    for (size_t i = 0; i < sizeof conversions / sizeof conversions[0]; ++i) {
        accuracy_report(&conversions[i].accuracy);
    }
    for (size_t i = 0; i < sizeof conversions / sizeof conversions[0]; ++i) {
        accuracy_assert_claim(&conversions[i].accuracy);
    }
    vector_table_free(table);
}

/* Fixed points of the ITS-90 relations (exact by definition), to 2 ulp. */
static void test_fixed_points(void **state)
{
    static const struct {
        double value;
        gb_temperature_unit unit;
        double kelvin;
    } rows[] = {
        {0.0, GB_CELSIUS, 273.15},     {100.0, GB_CELSIUS, 373.15},
        {32.0, GB_FAHRENHEIT, 273.15}, {212.0, GB_FAHRENHEIT, 373.15},
        {-40.0, GB_FAHRENHEIT, 233.15}, {-40.0, GB_CELSIUS, 233.15},
        {300.0, GB_KELVIN, 300.0},
    };
    (void)state;
    for (size_t i = 0; i < sizeof rows / sizeof rows[0]; ++i) {
        double kelvin = 0.0, back = 0.0;
        assert_status(gb_temperature_to_kelvin(rows[i].value, rows[i].unit, &kelvin), GB_OK,
                      "fixed point");
        assert_close(kelvin, rows[i].kelvin, 2.0 * DBL_EPSILON, "fixed point to kelvin");
        assert_status(gb_temperature_from_kelvin(rows[i].kelvin, rows[i].unit, &back), GB_OK,
                      "fixed point back");
        assert_true(fabs(back - rows[i].value) <= 2.0 * DBL_EPSILON * LARGEST_OFFSET_K * 1.8);
    }
}

static void test_domain_errors_leave_the_result_untouched(void **state)
{
    static const struct {
        const char *what;
        enum conversion_id id;
        double value;
        int unit;
        gb_status expected;
    } rows[] = {
        {"NaN kelvin", TO_KELVIN, NAN, GB_KELVIN, GB_ERR_NOT_FINITE},
        {"-inf Celsius", TO_KELVIN, -INFINITY, GB_CELSIUS, GB_ERR_NOT_FINITE},
        {"0 K", TO_KELVIN, 0.0, GB_KELVIN, GB_ERR_TEMPERATURE_DOMAIN},
        {"-1 K", TO_KELVIN, -1.0, GB_KELVIN, GB_ERR_TEMPERATURE_DOMAIN},
        /* -273.15 C and -459.67 F are absolute zero: outside (0, 1e9] K. */
        {"-273.15 C", TO_KELVIN, -273.15, GB_CELSIUS, GB_ERR_TEMPERATURE_DOMAIN},
        {"-459.67 F", TO_KELVIN, -459.67, GB_FAHRENHEIT, GB_ERR_TEMPERATURE_DOMAIN},
        {"just above 1e9 K", TO_KELVIN, 1.0000000000000002e9, GB_KELVIN,
         GB_ERR_TEMPERATURE_DOMAIN},
        {"unknown temperature unit", TO_KELVIN, 300.0, 7, GB_ERR_INVALID_ARGUMENT},
        {"from kelvin NaN", FROM_KELVIN, NAN, GB_CELSIUS, GB_ERR_NOT_FINITE},
        {"difference +inf", DIFFERENCE_TO_KELVIN, INFINITY, GB_FAHRENHEIT, GB_ERR_NOT_FINITE},
        {"difference unknown unit", DIFFERENCE_FROM_KELVIN, 1.0, -1, GB_ERR_INVALID_ARGUMENT},
        {"wavelength 0 nm", TO_MICROMETRES, 0.0, GB_NANOMETRE, GB_ERR_SPECTRAL_DOMAIN},
        {"wavelength -10 um", TO_MICROMETRES, -10.0, GB_MICROMETRE, GB_ERR_SPECTRAL_DOMAIN},
        {"wavelength NaN m", TO_MICROMETRES, NAN, GB_METRE, GB_ERR_NOT_FINITE},
        {"unknown wavelength unit", TO_MICROMETRES, 10.0, 9, GB_ERR_INVALID_ARGUMENT},
        {"wavenumber 0", WAVENUMBER_TO_WAVELENGTH, 0.0, 0, GB_ERR_SPECTRAL_DOMAIN},
        {"wavenumber +inf", WAVENUMBER_TO_WAVELENGTH, INFINITY, 0, GB_ERR_NOT_FINITE},
        {"frequency negative", FREQUENCY_TO_WAVELENGTH, -3e14, 0, GB_ERR_SPECTRAL_DOMAIN},
        {"wavelength NaN to frequency", WAVELENGTH_TO_FREQUENCY, NAN, 0, GB_ERR_NOT_FINITE},
        {"wavelength -1 to wavenumber", WAVELENGTH_TO_WAVENUMBER, -1.0, 0,
         GB_ERR_SPECTRAL_DOMAIN},
    };
    (void)state;
    for (size_t i = 0; i < sizeof rows / sizeof rows[0]; ++i) {
        double result = UNTOUCHED_SENTINEL;
        assert_status(convert(rows[i].id, rows[i].value, rows[i].unit, &result), rows[i].expected,
                      rows[i].what);
        if (result != UNTOUCHED_SENTINEL) {
            fail_msg("%s: the out-pointer was written on failure", rows[i].what);
        }
        assert_status(convert(rows[i].id, 1.0, GB_KELVIN, NULL), GB_ERR_INVALID_ARGUMENT,
                      "NULL out-pointer");
    }
}

/* Boundaries of (0, 1e9] K, and units.h: from_kelvin "fails only for non-finite input". */
static void test_temperature_boundaries(void **state)
{
    double kelvin = 0.0, celsius = 0.0;
    (void)state;
    assert_status(gb_temperature_to_kelvin(1e9, GB_KELVIN, &kelvin), GB_OK, "1e9 K");
    assert_true(kelvin == 1e9);
    assert_status(gb_temperature_to_kelvin(DBL_TRUE_MIN, GB_KELVIN, &kelvin), GB_OK,
                  "smallest positive kelvin");
    assert_true(kelvin == DBL_TRUE_MIN);
    assert_status(gb_temperature_from_kelvin(-1.0, GB_CELSIUS, &celsius), GB_OK,
                  "from kelvin accepts any finite value");
    assert_close(celsius, -274.15, 2.0 * DBL_EPSILON, "-1 K in Celsius");
}

static void test_parse_null_arguments(void **state)
{
    gb_wavelength_unit unit = GB_METRE;
    (void)state;
    assert_status(gb_temperature_unit_parse("K", NULL), GB_ERR_INVALID_ARGUMENT, "parse NULL");
    assert_status(gb_temperature_unit_parse(NULL, &(gb_temperature_unit){GB_KELVIN}),
                  GB_ERR_INVALID_ARGUMENT, "parse NULL text");
    assert_status(gb_wavelength_unit_parse(NULL, &unit), GB_ERR_INVALID_ARGUMENT,
                  "parse NULL text");
    assert_int_equal(unit, GB_METRE);
}

static void test_unit_names(void **state)
{
    static const struct {
        const char *text;
        gb_status status;
        gb_temperature_unit unit;
    } temperature_rows[] = {
        {"K", GB_OK, GB_KELVIN},       {"C", GB_OK, GB_CELSIUS},
        {"degC", GB_OK, GB_CELSIUS},   {"F", GB_OK, GB_FAHRENHEIT},
        {"degF", GB_OK, GB_FAHRENHEIT}, {"k", GB_ERR_INVALID_ARGUMENT, GB_KELVIN},
        {"", GB_ERR_INVALID_ARGUMENT, GB_KELVIN}, {"Kelvin", GB_ERR_INVALID_ARGUMENT, GB_KELVIN},
        {"K ", GB_ERR_INVALID_ARGUMENT, GB_KELVIN},
    };
    static const struct {
        const char *text;
        gb_status status;
        gb_wavelength_unit unit;
        double per_micrometre; /* units.h: 1, 1000, 1e-6 */
    } wavelength_rows[] = {
        {"um", GB_OK, GB_MICROMETRE, 1.0},
        {"\xC2\xB5m", GB_OK, GB_MICROMETRE, 1.0}, /* "µm" in UTF-8 */
        {"micrometre", GB_OK, GB_MICROMETRE, 1.0},
        {"nm", GB_OK, GB_NANOMETRE, 1e3},
        {"m", GB_OK, GB_METRE, 1e-6},
        {"mm", GB_ERR_INVALID_ARGUMENT, GB_MICROMETRE, 0.0},
        {"UM", GB_ERR_INVALID_ARGUMENT, GB_MICROMETRE, 0.0},
    };
    static const char *const temperature_symbols[] = {"K", "C", "F"};
    static const char *const wavelength_symbols[] = {"um", "nm", "m"};
    (void)state;
    for (size_t i = 0; i < sizeof temperature_rows / sizeof temperature_rows[0]; ++i) {
        gb_temperature_unit unit = (gb_temperature_unit)99;
        assert_status(gb_temperature_unit_parse(temperature_rows[i].text, &unit),
                      temperature_rows[i].status, temperature_rows[i].text);
        if (temperature_rows[i].status == GB_OK) {
            assert_int_equal(unit, temperature_rows[i].unit);
            assert_string_equal(gb_temperature_unit_symbol(unit), temperature_symbols[unit]);
        } else {
            assert_int_equal(unit, 99);
        }
    }
    for (size_t i = 0; i < sizeof wavelength_rows / sizeof wavelength_rows[0]; ++i) {
        gb_wavelength_unit unit = (gb_wavelength_unit)99;
        assert_status(gb_wavelength_unit_parse(wavelength_rows[i].text, &unit),
                      wavelength_rows[i].status, wavelength_rows[i].text);
        if (wavelength_rows[i].status == GB_OK) {
            assert_int_equal(unit, wavelength_rows[i].unit);
            assert_string_equal(gb_wavelength_unit_symbol(unit), wavelength_symbols[unit]);
            assert_true(gb_wavelength_unit_per_micrometre(unit) ==
                        wavelength_rows[i].per_micrometre);
        } else {
            assert_int_equal(unit, 99);
        }
    }
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_conversions_against_mpmath),
        cmocka_unit_test(test_fixed_points),
        cmocka_unit_test(test_domain_errors_leave_the_result_untouched),
        cmocka_unit_test(test_temperature_boundaries),
        cmocka_unit_test(test_parse_null_arguments),
        cmocka_unit_test(test_unit_names),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
