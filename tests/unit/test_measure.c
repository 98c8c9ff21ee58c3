/*
 * The measurement equation (core/measure.h): from what a radiometer saw to
 * the surface temperature, for flat, whole-spectrum and response bands, with
 * temperature and radiance terms.
 *
 * Expected values: tests/reference/vectors/measure.tsv, solved at 50 digits
 * with mpmath.findroot via tests/reference/generate.py (Planck's law with the
 * exact SI h, c, k of CODATA 2018).  Worked examples A and B and their
 * intermediate radiances are quoted from /work/shared/REFERENCES.md (mpmath,
 * 30 digits).
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
#include "band.h"
#include "band_fixture.h"
#include "measure.h"
#include "scene_fixture.h"
#include "status_expect.h"
#include "vector_table.h"

/* band.h: the band inversion is good to 1e-12 relative. */
#define CLAIM_INVERSION 1e-12
/* T L''(T) / L'(T) stays below this in the scenes of measure.tsv (x < 20 at every band edge). */
#define CURVATURE_BOUND 20.0

/*
 * measure.h: the inversion's 1e-12 "amplified by the conditioning of the
 * subtraction": each band radiance term carries the band's claimed relative
 * error, and L(T) = [S - tau (1 - eps) L_refl - A] / (tau eps) passes the sum
 * of their sizes on to T through 1 / L'(T).
 */
static double temperature_bound(const vector_table *table, size_t row, double band_claim)
{
    double eps = vector_table_number(table, row, "emissivity");
    double tau = vector_table_number(table, row, "transmittance");
    double terms = fabs(vector_table_number(table, row, "signal_radiance")) +
                   tau * (1.0 - eps) * fabs(vector_table_number(table, row, "reflected_radiance")) +
                   fabs(vector_table_number(table, row, "atmosphere_part"));
    double derivative = vector_table_number(table, row, "surface_derivative");
    double temperature = vector_table_number(table, row, "temperature_k");
    return CLAIM_INVERSION + band_claim * terms / (tau * eps * derivative * temperature);
}

struct measured_field {
    const char *column;
    size_t offset; /* in gb_measurement */
};

static const struct measured_field known_terms[] = {
    {"signal_radiance", offsetof(gb_measurement, signal_radiance)},
    {"reflected_radiance", offsetof(gb_measurement, reflected_radiance)},
    {"atmosphere_part", offsetof(gb_measurement, atmosphere_part)},
};

static double field(const gb_measurement *measurement, size_t offset)
{
    double value;
    memcpy(&value, (const char *)measurement + offset, sizeof value);
    return value;
}

static void test_solutions_against_mpmath(void **state)
{
    accuracy_record temperature = ACCURACY_RECORD("gb_measure_solve T (error / bound)", 1.0);
    accuracy_record surface = ACCURACY_RECORD("gb_measure_solve L(T), L'(T) (error / bound)", 1.0);
    accuracy_record terms = ACCURACY_RECORD("gb_measure_solve S, L_refl, A (error / bound)", 1.0);
    accuracy_record relative = ACCURACY_RECORD("gb_measure_solve T (relative)", INFINITY);
    vector_table *table = vector_table_load("measure.tsv");
    (void)state;
    for (size_t row = 0; row < vector_table_rows(table); ++row) {
        measure_case c;
        gb_measurement measurement;
        double claim, bound;
        measure_case_from_row(&c, table, row);
        claim = band_fixture_claim(&c.band);
        memset(&measurement, 0, sizeof measurement);
        measurement.temperature_k = UNTOUCHED_SENTINEL;
        assert_status(gb_measure_solve(&c.band.band, &c.scene, &measurement), c.expected, c.name);
        if (c.expected != GB_OK) {
            assert_true(measurement.temperature_k == UNTOUCHED_SENTINEL);
            continue;
        }
        bound = temperature_bound(table, row, claim);
        accuracy_observe_in_units(&temperature, measurement.temperature_k,
                                  vector_table_number(table, row, "temperature_k"), bound, "%s",
                                  c.name);
        accuracy_observe(&relative, measurement.temperature_k,
                         vector_table_number(table, row, "temperature_k"), "%s", c.name);
        accuracy_observe_in_units(&surface, measurement.surface_radiance,
                                  vector_table_number(table, row, "surface_radiance"),
                                  claim + bound, "%s L(T)", c.name);
        accuracy_observe_in_units(&surface, measurement.surface_derivative,
                                  vector_table_number(table, row, "surface_derivative"),
                                  claim + CURVATURE_BOUND * bound, "%s L'(T)", c.name);
        for (size_t t = 0; t < sizeof known_terms / sizeof known_terms[0]; ++t) {
            accuracy_observe_in_units(&terms, field(&measurement, known_terms[t].offset),
                                      vector_table_number(table, row, known_terms[t].column),
                                      claim + 2.0 * DBL_EPSILON, "%s %s", c.name,
                                      known_terms[t].column);
        }
    }
    vector_table_free(table);
    accuracy_report(&temperature);
    accuracy_report(&relative);
    accuracy_report(&surface);
    accuracy_report(&terms);
    accuracy_assert_claim(&temperature);
    accuracy_assert_claim(&surface);
    accuracy_assert_claim(&terms);
}

/* gb_measure_terms gives the known terms alone and leaves the surface fields 0. */
static void test_terms_alone(void **state)
{
    vector_table *table = vector_table_load("measure.tsv");
    (void)state;
    for (size_t row = 0; row < vector_table_rows(table); ++row) {
        measure_case c;
        gb_measurement measurement;
        measure_case_from_row(&c, table, row);
        memset(&measurement, 0xff, sizeof measurement);
        assert_status(gb_measure_terms(&c.band.band, &c.scene, &measurement), GB_OK, c.name);
        assert_true(measurement.temperature_k == 0.0 && measurement.surface_radiance == 0.0 &&
                    measurement.surface_derivative == 0.0);
        for (size_t t = 0; t < sizeof known_terms / sizeof known_terms[0]; ++t) {
            double expected = vector_table_number(table, row, known_terms[t].column);
            if (!isnan(expected)) { /* mpmath gives no terms where there is no solution */
                assert_close(field(&measurement, known_terms[t].offset), expected,
                             band_fixture_claim(&c.band) + 2.0 * DBL_EPSILON,
                             known_terms[t].column);
            }
        }
    }
    vector_table_free(table);
}

/* REFERENCES.md, worked examples A and B (mpmath, 30 digits), to half a unit of the last digit. */
static void test_worked_examples(void **state)
{
    static const struct {
        const char *what;
        int total_band;
        double emissivity, transmittance, temperature;
    } rows[] = {
        {"A, 8-14 um", 0, 0.95, 1.0, 308.886829},
        {"A, sigma T^4", 1, 0.95, 1.0, 308.881071},
        {"A at eps 0.5, 8-14 um", 0, 0.5, 1.0, 321.438243},
        {"A at eps 0.5, sigma T^4", 1, 0.5, 1.0, 321.232860},
        {"B, 8-14 um", 0, 0.95, 0.9, 310.995305},
        {"B, sigma T^4", 1, 0.95, 0.9, 310.965985},
    };
    (void)state;
    for (size_t i = 0; i < sizeof rows / sizeof rows[0]; ++i) {
        band_fixture fixture;
        gb_scene scene = scene_fixture_temperatures(308.15, rows[i].emissivity, 293.15,
                                                    rows[i].transmittance, 288.15);
        gb_measurement measurement;
        if (rows[i].total_band) {
            band_fixture_total(&fixture);
        } else {
            band_fixture_flat(&fixture, GB_BAND_WAVELENGTH, 8.0, 14.0);
        }
        assert_status(gb_measure_solve(&fixture.band, &scene, &measurement), GB_OK, rows[i].what);
        assert_within(measurement.temperature_k, rows[i].temperature, 5e-7, rows[i].what);
        if (i == 0) {
            assert_within(measurement.signal_radiance, 62.0157802011, 5e-11, "A: L(T_app)");
            assert_within(measurement.reflected_radiance, 49.3728947817, 5e-11, "A: L(T_r)");
            assert_within(measurement.surface_radiance, 62.6811952232, 5e-11, "A: L_o");
        }
    }
}

/*
 * eps = 1 and tau = 1 leave the apparent temperature unchanged; so does any
 * eps when the surroundings are at the surface's own temperature (Kirchhoff:
 * an isothermal enclosure radiates as a blackbody).  Both to the inversion's
 * claim, 1e-12 relative.
 */
static void test_identities_return_the_apparent_temperature(void **state)
{
    static const double apparent[] = {40.0, 250.0, 308.15, 1200.0, 5000.0};
    band_fixture fixtures[4];
    (void)state;
    band_fixture_flat(&fixtures[0], GB_BAND_WAVELENGTH, 8.0, 14.0);
    band_fixture_flat(&fixtures[1], GB_BAND_WAVENUMBER, 2000.0, 3333.3);
    band_fixture_total(&fixtures[2]);
    band_fixture_response(&fixtures[3], "synthetic_lwir");
    for (size_t b = 0; b < 4; ++b) {
        for (size_t t = 0; t < sizeof apparent / sizeof apparent[0]; ++t) {
            const gb_scene scenes[] = {
                scene_fixture_temperatures(apparent[t], 1.0, 150.0, 1.0, 288.15),
                scene_fixture_temperatures(apparent[t], 0.3, apparent[t], 1.0, 288.15),
                scene_fixture_temperatures(apparent[t], 0.6, apparent[t], 0.7, apparent[t]),
            };
            for (size_t s = 0; s < sizeof scenes / sizeof scenes[0]; ++s) {
                double temperature = NAN;
                char what[160];
                snprintf(what, sizeof what, "%s, T_app %g, scene %zu", fixtures[b].description,
                         apparent[t], s);
                assert_status(gb_measure_temperature(&fixtures[b].band, &scenes[s], &temperature),
                              GB_OK, what);
                assert_close(temperature, apparent[t], CLAIM_INVERSION, what);
            }
        }
    }
}

/* gb_measure_temperature is gb_measure_solve's temperature. */
static void test_temperature_matches_solve(void **state)
{
    vector_table *table = vector_table_load("measure.tsv");
    (void)state;
    for (size_t row = 0; row < vector_table_rows(table); ++row) {
        measure_case c;
        gb_measurement measurement;
        double temperature = UNTOUCHED_SENTINEL;
        gb_status solved, alone;
        measure_case_from_row(&c, table, row);
        solved = gb_measure_solve(&c.band.band, &c.scene, &measurement);
        alone = gb_measure_temperature(&c.band.band, &c.scene, &temperature);
        assert_status(alone, solved, c.name);
        assert_true(solved != GB_OK ? temperature == UNTOUCHED_SENTINEL
                                    : temperature == measurement.temperature_k);
    }
    vector_table_free(table);
}

/* measure.h: at tau = 1 an atmosphere temperature does not matter and may be NaN. */
static void test_atmosphere_not_given_at_unit_transmittance(void **state)
{
    band_fixture fixture;
    gb_scene given = scene_fixture_temperatures(308.15, 0.95, 293.15, 1.0, 288.15);
    gb_scene not_given = scene_fixture_temperatures(308.15, 0.95, 293.15, 1.0, NAN);
    gb_scene hazy = scene_fixture_temperatures(308.15, 0.95, 293.15, 0.9, NAN);
    double with_atmosphere = NAN, without = NAN, hazy_result = UNTOUCHED_SENTINEL;
    (void)state;
    band_fixture_flat(&fixture, GB_BAND_WAVELENGTH, 8.0, 14.0);
    assert_status(gb_measure_temperature(&fixture.band, &given, &with_atmosphere), GB_OK,
                  "tau 1, atmosphere 288.15 K");
    assert_status(gb_measure_temperature(&fixture.band, &not_given, &without), GB_OK,
                  "tau 1, atmosphere NaN");
    assert_true(with_atmosphere == without);
    assert_status(gb_measure_temperature(&fixture.band, &hazy, &hazy_result), GB_ERR_NOT_FINITE,
                  "tau 0.9, atmosphere NaN");
    assert_true(hazy_result == UNTOUCHED_SENTINEL);
}

struct scene_error_row {
    const char *what;
    gb_scene scene;
    gb_status expected;
    int scene_only; /* gb_scene_validate sees it too (it needs no band) */
};

#define TEMPERATURE_TERM(value) {GB_TERM_TEMPERATURE, value}
#define RADIANCE_TERM(value) {GB_TERM_RADIANCE, value}
#define SCENE(signal, eps, reflected, tau, atmosphere) {signal, eps, reflected, tau, atmosphere}
#define T_APP TEMPERATURE_TERM(308.15)
#define T_REFL TEMPERATURE_TERM(293.15)
#define T_ATM TEMPERATURE_TERM(288.15)
#define UNKNOWN_KIND_TERM {(gb_term_kind)7, 300.0}

static const struct scene_error_row scene_error_rows[] = {
    {"emissivity 0", SCENE(T_APP, 0.0, T_REFL, 1.0, T_ATM), GB_ERR_EMISSIVITY_DOMAIN, 1},
    {"emissivity above 1", SCENE(T_APP, 1.05, T_REFL, 1.0, T_ATM), GB_ERR_EMISSIVITY_DOMAIN, 1},
    {"NaN emissivity", SCENE(T_APP, NAN, T_REFL, 1.0, T_ATM), GB_ERR_NOT_FINITE, 1},
    {"transmittance 0", SCENE(T_APP, 0.95, T_REFL, 0.0, T_ATM), GB_ERR_TRANSMITTANCE_DOMAIN, 1},
    {"transmittance above 1", SCENE(T_APP, 0.95, T_REFL, 1.2, T_ATM),
     GB_ERR_TRANSMITTANCE_DOMAIN, 1},
    {"-inf transmittance", SCENE(T_APP, 0.95, T_REFL, -INFINITY, T_ATM), GB_ERR_NOT_FINITE, 1},
    {"NaN apparent temperature", SCENE(TEMPERATURE_TERM(NAN), 0.95, T_REFL, 1.0, T_ATM),
     GB_ERR_NOT_FINITE, 1},
    {"apparent temperature 0 K", SCENE(TEMPERATURE_TERM(0.0), 0.95, T_REFL, 1.0, T_ATM),
     GB_ERR_TEMPERATURE_DOMAIN, 1},
    {"reflected temperature above 1e9 K", SCENE(T_APP, 0.95, TEMPERATURE_TERM(2e9), 1.0, T_ATM),
     GB_ERR_TEMPERATURE_DOMAIN, 1},
    {"infinite reflected radiance", SCENE(T_APP, 0.95, RADIANCE_TERM(INFINITY), 1.0, T_ATM),
     GB_ERR_NOT_FINITE, 1},
    {"negative reflected radiance", SCENE(T_APP, 0.95, RADIANCE_TERM(-1.0), 1.0, T_ATM),
     GB_ERR_RADIANCE_DOMAIN, 1},
    {"negative path radiance", SCENE(T_APP, 0.95, T_REFL, 0.9, RADIANCE_TERM(-0.5)),
     GB_ERR_RADIANCE_DOMAIN, 1},
    {"signal radiance 0", SCENE(RADIANCE_TERM(0.0), 0.95, T_REFL, 1.0, T_ATM),
     GB_ERR_RADIANCE_DOMAIN, 1},
    {"unknown term kind", SCENE(UNKNOWN_KIND_TERM, 0.95, T_REFL, 1.0, T_ATM),
     GB_ERR_INVALID_ARGUMENT, 1},
    /* A band radiance of 1e300 needs a body far hotter than the band solver's 1e6 K. */
    {"huge signal radiance", SCENE(RADIANCE_TERM(1e300), 0.95, T_REFL, 1.0, T_ATM),
     GB_ERR_RADIANCE_OUT_OF_RANGE, 0},
    /* Common practice: a cold target before a hot background at low emissivity leaves nothing. */
    {"background outshines the surface", SCENE(TEMPERATURE_TERM(200.0), 0.5, T_REFL, 1.0, T_ATM),
     GB_ERR_NET_SIGNAL_NOT_POSITIVE, 0},
    {"path radiance above the signal", SCENE(RADIANCE_TERM(5.0), 0.9, RADIANCE_TERM(0.0), 0.8,
                                             RADIANCE_TERM(6.0)),
     GB_ERR_NET_SIGNAL_NOT_POSITIVE, 0},
};

static void test_scene_errors_leave_results_untouched(void **state)
{
    band_fixture fixture;
    (void)state;
    band_fixture_flat(&fixture, GB_BAND_WAVELENGTH, 8.0, 14.0);
    for (size_t i = 0; i < sizeof scene_error_rows / sizeof scene_error_rows[0]; ++i) {
        const struct scene_error_row *row = &scene_error_rows[i];
        gb_measurement measurement;
        double temperature = UNTOUCHED_SENTINEL;
        memset(&measurement, 0, sizeof measurement);
        measurement.temperature_k = UNTOUCHED_SENTINEL;
        assert_status(gb_measure_solve(&fixture.band, &row->scene, &measurement), row->expected,
                      row->what);
        assert_status(gb_measure_temperature(&fixture.band, &row->scene, &temperature),
                      row->expected, row->what);
        assert_status(gb_scene_validate(&row->scene), row->scene_only ? row->expected : GB_OK,
                      row->what);
        assert_true(measurement.temperature_k == UNTOUCHED_SENTINEL);
        assert_true(temperature == UNTOUCHED_SENTINEL);
    }
}

static void test_bad_band_and_null_arguments(void **state)
{
    band_fixture reversed, flat;
    gb_scene scene = scene_fixture_temperatures(308.15, 0.95, 293.15, 1.0, 288.15);
    gb_measurement measurement;
    double temperature = UNTOUCHED_SENTINEL;
    (void)state;
    band_fixture_flat(&reversed, GB_BAND_WAVELENGTH, 14.0, 8.0);
    band_fixture_flat(&flat, GB_BAND_WAVELENGTH, 8.0, 14.0);
    assert_status(gb_measure_temperature(&reversed.band, &scene, &temperature),
                  GB_ERR_BAND_REVERSED, "reversed band");
    assert_true(temperature == UNTOUCHED_SENTINEL);
    assert_status(gb_measure_temperature(NULL, &scene, &temperature), GB_ERR_INVALID_ARGUMENT,
                  "NULL band");
    assert_status(gb_measure_temperature(&flat.band, NULL, &temperature), GB_ERR_INVALID_ARGUMENT,
                  "NULL scene");
    assert_status(gb_measure_temperature(&flat.band, &scene, NULL), GB_ERR_INVALID_ARGUMENT,
                  "NULL temperature");
    assert_status(gb_measure_terms(&flat.band, &scene, NULL), GB_ERR_INVALID_ARGUMENT,
                  "NULL terms");
    assert_status(gb_scene_validate(NULL), GB_ERR_INVALID_ARGUMENT, "NULL scene");
    assert_status(gb_measure_solve(NULL, &scene, &measurement), GB_ERR_INVALID_ARGUMENT,
                  "NULL band");
    assert_true(temperature == UNTOUCHED_SENTINEL);
    /* Last: status.h makes a NULL out-pointer GB_ERR_INVALID_ARGUMENT, never a crash. */
    assert_status(gb_measure_solve(&flat.band, &scene, NULL), GB_ERR_INVALID_ARGUMENT,
                  "NULL measurement");
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_solutions_against_mpmath),
        cmocka_unit_test(test_terms_alone),
        cmocka_unit_test(test_worked_examples),
        cmocka_unit_test(test_identities_return_the_apparent_temperature),
        cmocka_unit_test(test_temperature_matches_solve),
        cmocka_unit_test(test_atmosphere_not_given_at_unit_transmittance),
        cmocka_unit_test(test_scene_errors_leave_results_untouched),
        cmocka_unit_test(test_bad_band_and_null_arguments),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
