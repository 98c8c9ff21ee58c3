/*
 * Emissivity from a reference measurement (core/emissivity.h), following the
 * reference-temperature procedures of ASTM E1933 (standard practice for
 * measuring and compensating for emissivity using infrared imaging
 * radiometers): the surface's true temperature is known, the measurement
 * equation is solved for eps.
 *
 * Expected values: mpmath at 30 digits, tests/reference/workflows.py,
 * tests/reference/vectors/workflows_emissivity.tsv (band radiances by
 * mpmath.quad of Planck's law with CODATA 2018 exact h, c, k; partial
 * derivatives by mpmath.diff), and worked examples A and B of
 * /work/shared/REFERENCES.md where named.
 */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <cmocka.h>

#include "vector_table.h"

#include "emissivity.h"

static gb_status workflow_status(const vector_table *table, size_t row, const char *column)
{
    const char *text = vector_table_text(table, row, column);
    if (strcmp(text, "GB_ERR_EMISSIVITY_DOMAIN") == 0) {
        return GB_ERR_EMISSIVITY_DOMAIN;
    }
    if (strcmp(text, "GB_ERR_EMISSIVITY_UNDETERMINED") == 0) {
        return GB_ERR_EMISSIVITY_UNDETERMINED;
    }
    assert_string_equal(text, "GB_OK");
    return GB_OK;
}

/* Round trips must give back the emissivity that built the signal. */
#define ROUND_TRIP_TOLERANCE 1e-10
/*
 * eps against mpmath on the same doubles: the header's 1e-13 rounding of band radiances
 * times L/|L - L_refl|, below 5 in these rows.
 */
#define EMISSIVITY_TOLERANCE 1e-11
#define PARTIAL_TOLERANCE 1e-7

static const char *const partial_column[GB_EMISSIVITY_INPUT_COUNT] = {
    "d_surface_temperature", "d_signal", "d_reflected", "d_transmittance", "d_atmosphere"};

static gb_band flat_band(gb_band_kind kind, double lower, double upper)
{
    gb_band band = {0};
    band.kind = kind;
    band.lower = lower;
    band.upper = upper;
    return band;
}

/* "total", "wavelength:8:14" or "wavenumber:700:1250", as workflows.py writes them. */
static gb_band band_named(const char *text)
{
    double lower, upper;
    if (sscanf(text, "wavelength:%lf:%lf", &lower, &upper) == 2) {
        return flat_band(GB_BAND_WAVELENGTH, lower, upper);
    }
    if (sscanf(text, "wavenumber:%lf:%lf", &lower, &upper) == 2) {
        return flat_band(GB_BAND_WAVENUMBER, lower, upper);
    }
    assert_string_equal(text, "total");
    return flat_band(GB_BAND_TOTAL, 0.0, 0.0);
}

static gb_term term_named(const vector_table *table, size_t row, const char *column,
                          const char *kind_column)
{
    gb_term term;
    term.kind = strcmp(vector_table_text(table, row, kind_column), "radiance") == 0
                    ? GB_TERM_RADIANCE
                    : GB_TERM_TEMPERATURE;
    term.value = vector_table_number(table, row, column);
    return term;
}

static gb_scene scene_of_row(const vector_table *table, size_t row)
{
    gb_scene scene;
    scene.signal = term_named(table, row, "signal", "signal_kind");
    scene.emissivity = 1.0; /* not used: the unknown */
    scene.reflected = term_named(table, row, "reflected", "reflected_kind");
    scene.transmittance = vector_table_number(table, row, "transmittance");
    scene.atmosphere = term_named(table, row, "atmosphere", "atmosphere_kind");
    return scene;
}

/* Worked example A: flat 8-14 um, T_app = 308.15 K, T_refl = 293.15 K, tau = 1. */
static gb_scene example_a(void)
{
    gb_scene scene;
    scene.signal.kind = GB_TERM_TEMPERATURE;
    scene.signal.value = 308.15;
    scene.emissivity = 1.0;
    scene.reflected.kind = GB_TERM_TEMPERATURE;
    scene.reflected.value = 293.15;
    scene.transmittance = 1.0;
    scene.atmosphere.kind = GB_TERM_TEMPERATURE;
    scene.atmosphere.value = NAN;
    return scene;
}

/* Worst errors seen within tolerance: eps against mpmath, round trip, partials (relative). */
typedef struct emissivity_worst {
    double emissivity, round_trip, partial;
} emissivity_worst;

static int partial_failures(const vector_table *table, size_t r,
                            const gb_emissivity_estimate *estimate, double *worst)
{
    int failures = 0;
    for (int i = 0; i < GB_EMISSIVITY_INPUT_COUNT; ++i) {
        double expected = vector_table_number(table, r, partial_column[i]);
        double got = estimate->partial[i], error;
        if (isnan(expected)) { /* tau = 1 and no atmosphere temperature: d eps/dtau unknowable */
            failures += estimate->defined[i] != 0;
            continue;
        }
        error = expected == 0.0 ? fabs(got) : fabs(got / expected - 1.0);
        if (estimate->defined[i] && error <= PARTIAL_TOLERANCE) {
            *worst = fmax(*worst, error);
            continue;
        }
        print_message("emissivity: %s: %s = %.17g (defined %d), mpmath %.17g\n",
                      vector_table_text(table, r, "case"), partial_column[i], got,
                      estimate->defined[i], expected);
        failures++;
    }
    return failures;
}

/* One row: status, eps, the round trip where the row built its signal, the partials. */
static int row_failures(const vector_table *table, size_t r, emissivity_worst *worst)
{
    const char *name = vector_table_text(table, r, "case");
    gb_band band = band_named(vector_table_text(table, r, "band"));
    gb_scene scene = scene_of_row(table, r);
    gb_emissivity_estimate estimate;
    double expected = vector_table_number(table, r, "emissivity");
    double generating = vector_table_number(table, r, "generating_emissivity");
    gb_status status = gb_emissivity_from_reference(
        &band, &scene, vector_table_number(table, r, "surface_temperature_k"), &estimate);
    if (status != workflow_status(table, r, "status")) {
        print_message("emissivity: %s: status %s, mpmath %s\n", name, gb_status_name(status),
                      vector_table_text(table, r, "status"));
        return 1;
    }
    if (status != GB_OK) {
        return 0;
    }
    if (fabs(estimate.emissivity - expected) > EMISSIVITY_TOLERANCE ||
        (!isnan(generating) && fabs(estimate.emissivity - generating) > ROUND_TRIP_TOLERANCE)) {
        print_message("emissivity: %s: eps %.17g, mpmath %.17g, built from %g\n", name,
                      estimate.emissivity, expected, generating);
        return 1;
    }
    worst->emissivity = fmax(worst->emissivity, fabs(estimate.emissivity - expected));
    if (!isnan(generating)) {
        worst->round_trip = fmax(worst->round_trip, fabs(estimate.emissivity - generating));
    }
    return partial_failures(table, r, &estimate, &worst->partial);
}

static void test_rows_against_mpmath(void **state)
{
    vector_table *table;
    emissivity_worst worst = {0.0, 0.0, 0.0};
    int failures = 0;
    (void)state;
    table = vector_table_load("workflows_emissivity.tsv");
    for (size_t r = 0; r < vector_table_rows(table); ++r) {
        failures += row_failures(table, r, &worst);
    }
    print_message("emissivity: %zu rows, %d failed checks; worst of the rest: |d eps| %.3g, "
                  "round trip |d eps| %.3g, partials %.3g relative\n",
                  vector_table_rows(table), failures, worst.emissivity, worst.round_trip, worst.partial);
    vector_table_free(table);
    assert_int_equal(failures, 0);
}

/* Worked example A (REFERENCES.md): T = 308.886829188 K is the true temperature for eps = 0.95. */
static void test_worked_example_a(void **state)
{
    gb_band band = flat_band(GB_BAND_WAVELENGTH, 8.0, 14.0);
    gb_scene scene = example_a();
    gb_emissivity_estimate estimate;
    (void)state;
    assert_int_equal(gb_emissivity_from_reference(&band, &scene, 308.886829188, &estimate), GB_OK);
    /* T is printed to 1e-9 K and d eps/dT = -0.065/K (mpmath): eps to better than 1e-10. */
    assert_true(fabs(estimate.emissivity - 0.95) <= 1e-10);
    /* Reciprocity with REFERENCES.md's dT/deps = -15.463693 K: d eps/dT = 1/(dT/deps). */
    assert_true(fabs(estimate.partial[GB_EMISSIVITY_BY_SURFACE_TEMPERATURE] * -15.463693 - 1.0) <
                1e-6);
    /* tau = 1 with no atmosphere temperature: d eps/dtau cannot be known (measure.h). */
    assert_int_equal(estimate.defined[GB_EMISSIVITY_BY_TRANSMITTANCE], 0);
}

/* Worked example B (REFERENCES.md): tau = 0.9, T_atm = 288.15 K; T = 310.995305 K at eps = 0.95. */
static void test_worked_example_b(void **state)
{
    gb_band band = flat_band(GB_BAND_WAVELENGTH, 8.0, 14.0);
    gb_scene scene = example_a();
    gb_emissivity_estimate estimate;
    (void)state;
    scene.transmittance = 0.9;
    scene.atmosphere.value = 288.15;
    assert_int_equal(gb_emissivity_from_reference(&band, &scene, 310.995305, &estimate), GB_OK);
    /* T is printed to 1e-6 K and d eps/dT = -0.0575/K (mpmath): eps to 3e-8. */
    assert_true(fabs(estimate.emissivity - 0.95) <= 3e-8);
    assert_int_equal(estimate.defined[GB_EMISSIVITY_BY_TRANSMITTANCE], 1);
    /*
     * With T held, d eps/dtau = -(dT/dtau)/(dT/deps) (implicit function theorem), from
     * REFERENCES.md's dT/dtau = -23.2214 K and dT/deps = -17.391552 K (6 digits).
     */
    assert_true(fabs(estimate.partial[GB_EMISSIVITY_BY_TRANSMITTANCE] /
                         (-(-23.2214) / -17.391552) -
                     1.0) < 1e-5);
}

static void test_input_statuses(void **state)
{
    static const struct {
        double surface_temperature_k;
        gb_status expected;
    } temperatures[] = {
        {0.0, GB_ERR_TEMPERATURE_DOMAIN},  {-10.0, GB_ERR_TEMPERATURE_DOMAIN},
        {2e9, GB_ERR_TEMPERATURE_DOMAIN},  {NAN, GB_ERR_NOT_FINITE},
        {INFINITY, GB_ERR_NOT_FINITE},
    };
    gb_band band = flat_band(GB_BAND_WAVELENGTH, 8.0, 14.0);
    gb_band reversed = flat_band(GB_BAND_WAVELENGTH, 14.0, 8.0);
    gb_scene scene = example_a();
    gb_emissivity_estimate estimate, untouched;
    (void)state;
    memset(&estimate, 0x5a, sizeof estimate);
    memcpy(&untouched, &estimate, sizeof untouched);
    for (size_t i = 0; i < sizeof temperatures / sizeof temperatures[0]; ++i) {
        assert_int_equal(gb_emissivity_from_reference(&band, &scene,
                                                      temperatures[i].surface_temperature_k,
                                                      &estimate),
                         temperatures[i].expected);
    }
    scene.signal.value = NAN;
    assert_int_equal(gb_emissivity_from_reference(&band, &scene, 310.0, &estimate),
                     GB_ERR_NOT_FINITE);
    scene = example_a();
    scene.reflected.value = 0.0;
    assert_int_equal(gb_emissivity_from_reference(&band, &scene, 310.0, &estimate),
                     GB_ERR_TEMPERATURE_DOMAIN);
    scene = example_a();
    scene.transmittance = 0.0;
    assert_int_equal(gb_emissivity_from_reference(&band, &scene, 310.0, &estimate),
                     GB_ERR_TRANSMITTANCE_DOMAIN);
    scene.transmittance = 1.1;
    assert_int_equal(gb_emissivity_from_reference(&band, &scene, 310.0, &estimate),
                     GB_ERR_TRANSMITTANCE_DOMAIN);
    scene = example_a();
    scene.transmittance = 0.9; /* tau < 1 needs the atmosphere temperature */
    assert_int_equal(gb_emissivity_from_reference(&band, &scene, 310.0, &estimate),
                     GB_ERR_NOT_FINITE);
    scene = example_a();
    scene.signal.kind = GB_TERM_RADIANCE;
    scene.signal.value = 0.0; /* measure.h: the signal radiance must be > 0 */
    assert_int_equal(gb_emissivity_from_reference(&band, &scene, 310.0, &estimate),
                     GB_ERR_RADIANCE_DOMAIN);
    scene = example_a();
    assert_int_equal(gb_emissivity_from_reference(&reversed, &scene, 310.0, &estimate),
                     GB_ERR_BAND_REVERSED);
    assert_int_equal(gb_emissivity_from_reference(&band, NULL, 310.0, &estimate),
                     GB_ERR_INVALID_ARGUMENT);
    assert_memory_equal(&estimate, &untouched, sizeof estimate); /* status.h: untouched */
    assert_int_equal(gb_emissivity_from_reference(&band, &scene, 310.0, NULL),
                     GB_ERR_INVALID_ARGUMENT);
}

/* The scene's emissivity is the unknown: whatever it holds must not matter (emissivity.h). */
static void test_scene_emissivity_is_ignored(void **state)
{
    gb_band band = flat_band(GB_BAND_WAVELENGTH, 8.0, 14.0);
    gb_scene scene = example_a();
    gb_emissivity_estimate reference, other;
    (void)state;
    assert_int_equal(gb_emissivity_from_reference(&band, &scene, 308.886829188, &reference),
                     GB_OK);
    scene.emissivity = NAN;
    assert_int_equal(gb_emissivity_from_reference(&band, &scene, 308.886829188, &other), GB_OK);
    assert_true(other.emissivity == reference.emissivity);
    scene.emissivity = -3.0;
    assert_int_equal(gb_emissivity_from_reference(&band, &scene, 308.886829188, &other), GB_OK);
    assert_true(other.emissivity == reference.emissivity);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_rows_against_mpmath),
        cmocka_unit_test(test_worked_example_a),
        cmocka_unit_test(test_worked_example_b),
        cmocka_unit_test(test_input_statuses),
        cmocka_unit_test(test_scene_emissivity_is_ignored),
    };
    return cmocka_run_group_tests_name("emissivity (ASTM E1933 reference method)", tests, NULL,
                                       NULL);
}
