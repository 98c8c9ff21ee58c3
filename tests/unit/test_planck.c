/*
 * Planck's law, brightness temperature, Wien's displacement law and the
 * Stefan-Boltzmann law (core/planck.h).
 *
 * Expected values: mpmath at 50 digits via tests/reference/generate.py, from
 * the exact SI h, c, k (CODATA 2018): tests/reference/vectors/planck.tsv,
 * brightness.tsv, wien.tsv and stefan_boltzmann.tsv.  Spot checks quote
 * /work/shared/REFERENCES.md, itself mpmath at 30 digits.
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
#include "planck.h"
#include "status_expect.h"
#include "vector_table.h"

/* planck.h: <= (x + |ln L| + 4) 2.2e-16 relative wherever the result is a normal double. */
#define CLAIM_PER_EXPONENT 2.2e-16
#define CLAIM_EXPONENT_OFFSET 4.0
/* At the Wien peak x = 4.965 (REFERENCES.md x5). */
#define CLAIM_AT_PEAK ((4.965 + CLAIM_EXPONENT_OFFSET + 10.0) * CLAIM_PER_EXPONENT)
/* planck.h: brightness temperature <= 4e-15; the round trip T -> L -> T "tested to 1e-13". */
#define CLAIM_BRIGHTNESS 4e-15
#define CLAIM_ROUND_TRIP 1e-13
/* planck.h: Wien positions and sigma T^4 exitance exact to rounding, <= 2 ulp. */
#define CLAIM_TWO_ULP (2.0 * DBL_EPSILON)

/* CODATA 2018 (exact SI h, c, k), REFERENCES.md: c2 in um K and cm K, and k/h in Hz/K. */
#define C2_UM_K 14387.768775039338
#define C2_CM_K 1.4387768775039338
#define K_OVER_H_HZ_PER_K 20836619123.327576

static gb_spectral_coordinate coordinate_from_text(const char *text)
{
    if (strcmp(text, "wavelength") == 0) {
        return GB_WAVELENGTH;
    }
    if (strcmp(text, "wavenumber") == 0) {
        return GB_WAVENUMBER;
    }
    if (strcmp(text, "frequency") != 0) {
        fail_msg("unknown spectral coordinate '%s'", text);
    }
    return GB_FREQUENCY;
}

/* The position where a blackbody at `temperature` has exponent x (any position is valid). */
static double position_for(gb_spectral_coordinate coordinate, double x, double temperature)
{
    switch (coordinate) {
    case GB_WAVELENGTH: return C2_UM_K / (x * temperature);
    case GB_WAVENUMBER: return x * temperature / C2_CM_K;
    case GB_FREQUENCY: break;
    }
    return x * temperature * K_OVER_H_HZ_PER_K;
}

typedef gb_status (*spectral_function)(gb_spectral_coordinate coordinate, double position,
                                       double temperature_k, double emissivity, double *out);

static gb_status blackbody_derivative(gb_spectral_coordinate coordinate, double position,
                                      double temperature_k, double emissivity, double *out)
{
    (void)emissivity; /* dL/dT is of the blackbody (planck.h) */
    return gb_planck_radiance_derivative(coordinate, position, temperature_k, out);
}

/*
 * planck.h claims accuracy only for normal results; for a true value below
 * DBL_MIN the test asks only that the result be right to a millionth of
 * DBL_MIN (a sanity bound of this test, not a claim of the header).
 */
#define SUBNORMAL_SANITY 1e-6

enum { TIER_NORMAL, TIER_SUBNORMAL, TIER_COUNT };

static int tier_of(double expected)
{
    return fabs(expected) < DBL_MIN ? TIER_SUBNORMAL : TIER_NORMAL;
}

struct spectral_quantity {
    const char *column; /* in planck.tsv */
    spectral_function function;
    accuracy_record tier[TIER_COUNT];
};

#define TIERS(name)                                                                  \
    {ACCURACY_RECORD(name " (error / ((x + |ln L| + 4) 2.2e-16))", 1.0),              \
     ACCURACY_RECORD(name " (true value subnormal)", SUBNORMAL_SANITY)}

static void test_spectral_quantities_against_mpmath(void **state)
{
    struct spectral_quantity quantities[] = {
        {"radiance", gb_planck_radiance, TIERS("gb_planck_radiance")},
        {"photon_radiance", gb_planck_photon_radiance, TIERS("gb_planck_photon_radiance")},
        {"radiance_derivative", blackbody_derivative, TIERS("gb_planck_radiance_derivative")},
    };
    const size_t count = sizeof quantities / sizeof quantities[0];
    vector_table *table = vector_table_load("planck.tsv");
    (void)state;
    for (size_t row = 0; row < vector_table_rows(table); ++row) {
        const char *coordinate_text = vector_table_text(table, row, "coordinate");
        gb_spectral_coordinate coordinate = coordinate_from_text(coordinate_text);
        double position = vector_table_number(table, row, "position");
        double temperature = vector_table_number(table, row, "temperature_k");
        double emissivity = vector_table_number(table, row, "emissivity");
        double x = vector_table_number(table, row, "x");
        for (size_t q = 0; q < count; ++q) {
            double expected = vector_table_number(table, row, quantities[q].column);
            double got = NAN;
            char what[160];
            snprintf(what, sizeof what, "%s(%s %.17g, T %.17g, eps %g)", quantities[q].column,
                     coordinate_text, position, temperature, emissivity);
            assert_status(quantities[q].function(coordinate, position, temperature, emissivity,
                                                 &got),
                          GB_OK, what);
            if (tier_of(expected) == TIER_NORMAL) {
                accuracy_observe_in_units(&quantities[q].tier[TIER_NORMAL], got, expected,
                                          (x + fabs(log(expected)) + CLAIM_EXPONENT_OFFSET) *
                                              CLAIM_PER_EXPONENT,
                                          "%s", what);
            } else {
                accuracy_observe(&quantities[q].tier[TIER_SUBNORMAL], got, expected, "%s", what);
            }
        }
    }
    vector_table_free(table);
    for (size_t q = 0; q < count; ++q) {
        for (int tier = 0; tier < TIER_COUNT; ++tier) {
            accuracy_report(&quantities[q].tier[tier]);
        }
    }
    for (size_t q = 0; q < count; ++q) {
        for (int tier = 0; tier < TIER_COUNT; ++tier) {
            accuracy_assert_claim(&quantities[q].tier[tier]);
        }
    }
}

static void test_brightness_temperature_against_mpmath(void **state)
{
    accuracy_record accuracy = ACCURACY_RECORD("gb_brightness_temperature", CLAIM_BRIGHTNESS);
    vector_table *table = vector_table_load("brightness.tsv");
    (void)state;
    for (size_t row = 0; row < vector_table_rows(table); ++row) {
        const char *coordinate_text = vector_table_text(table, row, "coordinate");
        double position = vector_table_number(table, row, "position");
        double radiance = vector_table_number(table, row, "radiance");
        double emissivity = vector_table_number(table, row, "emissivity");
        gb_status expected = status_from_identifier(vector_table_text(table, row, "status"));
        double temperature = UNTOUCHED_SENTINEL;
        char what[160];
        snprintf(what, sizeof what, "brightness(%s %.17g, L %.17g, eps %g)", coordinate_text,
                 position, radiance, emissivity);
        assert_status(gb_brightness_temperature(coordinate_from_text(coordinate_text), position,
                                                radiance, emissivity, &temperature),
                      expected, what);
        if (expected == GB_OK) {
            accuracy_observe(&accuracy, temperature,
                             vector_table_number(table, row, "temperature_k"), "%s", what);
        } else {
            assert_true(temperature == UNTOUCHED_SENTINEL);
        }
    }
    vector_table_free(table);
    accuracy_report(&accuracy);
    accuracy_assert_claim(&accuracy);
}

/* T -> L -> T in every coordinate, from deep Wien to deep Rayleigh-Jeans. */
static void test_round_trip_through_radiance(void **state)
{
    /* Not 1e9 K itself: a round trip may land an ulp above the domain's end. */
    static const double temperatures[] = {0.01, 1.0, 77.0, 300.0, 5778.0, 1e5, 1e8, 9e8};
    static const double exponents[] = {1e-5, 0.1, 1.0, 4.965, 10.0, 100.0, 600.0};
    static const double emissivities[] = {1.0, 0.37};
    accuracy_record accuracy = ACCURACY_RECORD("T -> gb_planck_radiance -> T", CLAIM_ROUND_TRIP);
    (void)state;
    for (int c = GB_WAVELENGTH; c <= GB_FREQUENCY; ++c) {
        for (size_t t = 0; t < sizeof temperatures / sizeof temperatures[0]; ++t) {
            for (size_t x = 0; x < sizeof exponents / sizeof exponents[0]; ++x) {
                for (size_t e = 0; e < 2; ++e) {
                    gb_spectral_coordinate coordinate = (gb_spectral_coordinate)c;
                    double position = position_for(coordinate, exponents[x], temperatures[t]);
                    double radiance = 0.0, back = 0.0;
                    assert_status(gb_planck_radiance(coordinate, position, temperatures[t],
                                                     emissivities[e], &radiance),
                                  GB_OK, "round trip radiance");
                    assert_status(gb_brightness_temperature(coordinate, position, radiance,
                                                            emissivities[e], &back),
                                  GB_OK, "round trip temperature");
                    accuracy_observe(&accuracy, back, temperatures[t],
                                     "coordinate %d position %.17g T %.17g eps %g", c, position,
                                     temperatures[t], emissivities[e]);
                }
            }
        }
    }
    accuracy_report(&accuracy);
    accuracy_assert_claim(&accuracy);
}

/* dL/dT against a central difference of L (truncation ~ h^2, rounding ~ eps / h). */
static void test_derivative_agrees_with_finite_difference(void **state)
{
    static const double temperatures[] = {2.0, 300.0, 1500.0, 1e6};
    static const double exponents[] = {1e-3, 0.5, 3.0, 10.0, 40.0};
    const double step = 1e-6, tolerance = 1e-8;
    (void)state;
    for (int c = GB_WAVELENGTH; c <= GB_FREQUENCY; ++c) {
        for (size_t t = 0; t < sizeof temperatures / sizeof temperatures[0]; ++t) {
            for (size_t x = 0; x < sizeof exponents / sizeof exponents[0]; ++x) {
                gb_spectral_coordinate coordinate = (gb_spectral_coordinate)c;
                double temperature = temperatures[t], h = step * temperature;
                double position = position_for(coordinate, exponents[x], temperature);
                double above = 0.0, below = 0.0, derivative = 0.0;
                char what[120];
                assert_status(gb_planck_radiance(coordinate, position, temperature + h, 1.0,
                                                 &above),
                              GB_OK, "L(T + h)");
                assert_status(gb_planck_radiance(coordinate, position, temperature - h, 1.0,
                                                 &below),
                              GB_OK, "L(T - h)");
                assert_status(gb_planck_radiance_derivative(coordinate, position, temperature,
                                                            &derivative),
                              GB_OK, "dL/dT");
                snprintf(what, sizeof what, "dL/dT coordinate %d x %g T %g", c, exponents[x],
                         temperature);
                assert_close(derivative, (above - below) / (2.0 * h), tolerance, what);
            }
        }
    }
}

static void test_wien_peaks_against_mpmath(void **state)
{
    accuracy_record positions = ACCURACY_RECORD("gb_wien_peaks_at positions", CLAIM_TWO_ULP);
    accuracy_record peak_radiance = ACCURACY_RECORD("gb_wien_peaks_at radiance", CLAIM_AT_PEAK);
    accuracy_record inverse = ACCURACY_RECORD("gb_wien_temperature", CLAIM_TWO_ULP);
    vector_table *table = vector_table_load("wien.tsv");
    (void)state;
    for (size_t row = 0; row < vector_table_rows(table); ++row) {
        double temperature = vector_table_number(table, row, "temperature_k");
        double peak_wavelength = vector_table_number(table, row, "wavelength_um");
        double back = 0.0;
        gb_wien_peaks peaks;
        assert_status(gb_wien_peaks_at(temperature, &peaks), GB_OK, "wien peaks");
        accuracy_observe(&positions, peaks.wavelength_um, peak_wavelength, "T %.17g wavelength",
                         temperature);
        accuracy_observe(&positions, peaks.wavenumber_cm,
                         vector_table_number(table, row, "wavenumber_cm"), "T %.17g wavenumber",
                         temperature);
        accuracy_observe(&positions, peaks.frequency_hz,
                         vector_table_number(table, row, "frequency_hz"), "T %.17g frequency",
                         temperature);
        accuracy_observe(&positions, peaks.photon_wavelength_um,
                         vector_table_number(table, row, "photon_wavelength_um"),
                         "T %.17g photon wavelength", temperature);
        accuracy_observe(&peak_radiance, peaks.radiance_at_peak,
                         vector_table_number(table, row, "radiance_at_peak"), "T %.17g",
                         temperature);
        if (temperature < 1e9) { /* at the domain's end T may come back an ulp above it */
            assert_status(gb_wien_temperature(peak_wavelength, &back), GB_OK, "inverse Wien");
            /* peak_wavelength is b / T rounded once, so T comes back within 2 ulp. */
            accuracy_observe(&inverse, back, temperature, "peak at %.17g um", peak_wavelength);
        }
    }
    vector_table_free(table);
    accuracy_report(&positions);
    accuracy_report(&peak_radiance);
    accuracy_report(&inverse);
    accuracy_assert_claim(&positions);
    accuracy_assert_claim(&peak_radiance);
    accuracy_assert_claim(&inverse);
}

/* Spot checks, REFERENCES.md (mpmath, 30 digits), to half a unit of the last quoted digit. */
static void test_wien_spot_checks(void **state)
{
    gb_wien_peaks sun, body;
    (void)state;
    assert_status(gb_wien_peaks_at(5778.0, &sun), GB_OK, "5778 K");
    assert_status(gb_wien_peaks_at(310.0, &body), GB_OK, "310 K");
    assert_within(sun.wavelength_um, 0.501518165, 5e-10, "5778 K peak 0.501518165 um");
    assert_within(sun.photon_wavelength_um, 0.63511645, 5e-9, "5778 K photon peak 0.63511645 um");
    assert_within(body.wavelength_um, 9.34765147, 5e-9, "310 K peak 9.34765147 um");
}

/* Each peak is a maximum of its own curve: the curve is lower 0.1 % either side. */
static void test_wien_peaks_are_maxima(void **state)
{
    static const double temperatures[] = {0.5, 300.0, 5778.0, 1e6, 1e9};
    const double offset = 1e-3;
    (void)state;
    for (size_t t = 0; t < sizeof temperatures / sizeof temperatures[0]; ++t) {
        gb_wien_peaks peaks;
        const struct {
            const char *what;
            spectral_function function;
            gb_spectral_coordinate coordinate;
        } curves[] = {
            {"radiance per wavelength", gb_planck_radiance, GB_WAVELENGTH},
            {"radiance per wavenumber", gb_planck_radiance, GB_WAVENUMBER},
            {"radiance per frequency", gb_planck_radiance, GB_FREQUENCY},
            {"photon radiance per wavelength", gb_planck_photon_radiance, GB_WAVELENGTH},
        };
        double positions[4];
        assert_status(gb_wien_peaks_at(temperatures[t], &peaks), GB_OK, "peaks");
        positions[0] = peaks.wavelength_um;
        positions[1] = peaks.wavenumber_cm;
        positions[2] = peaks.frequency_hz;
        positions[3] = peaks.photon_wavelength_um;
        for (size_t c = 0; c < 4; ++c) {
            double at_peak = 0.0, left = 0.0, right = 0.0;
            assert_status(curves[c].function(curves[c].coordinate, positions[c], temperatures[t],
                                             1.0, &at_peak),
                          GB_OK, curves[c].what);
            assert_status(curves[c].function(curves[c].coordinate, positions[c] * (1.0 - offset),
                                             temperatures[t], 1.0, &left),
                          GB_OK, curves[c].what);
            assert_status(curves[c].function(curves[c].coordinate, positions[c] * (1.0 + offset),
                                             temperatures[t], 1.0, &right),
                          GB_OK, curves[c].what);
            if (!(left < at_peak && right < at_peak)) {
                fail_msg("%s at %g K: %.17g either side of %.17g is not lower (%.17g, %.17g)",
                         curves[c].what, temperatures[t], positions[c], at_peak, left, right);
            }
        }
        if (peaks.radiance_at_peak != 0.0) {
            double at_peak = 0.0;
            assert_status(gb_planck_radiance(GB_WAVELENGTH, peaks.wavelength_um, temperatures[t],
                                             1.0, &at_peak),
                          GB_OK, "radiance at peak");
            assert_close(peaks.radiance_at_peak, at_peak, CLAIM_AT_PEAK, "radiance_at_peak");
        }
    }
}

static void test_stefan_boltzmann_against_mpmath(void **state)
{
    struct {
        const char *column;
        gb_status (*function)(double temperature_k, double emissivity, double *out);
        accuracy_record accuracy;
    } laws[] = {
        {"exitance", gb_total_exitance, ACCURACY_RECORD("gb_total_exitance", CLAIM_TWO_ULP)},
        /* No claim in planck.h for these two; sigma/pi and sigma_q are one more rounding. */
        {"radiance", gb_total_radiance,
         ACCURACY_RECORD("gb_total_radiance", 2.0 * CLAIM_TWO_ULP)},
        {"photon_exitance", gb_total_photon_exitance,
         ACCURACY_RECORD("gb_total_photon_exitance", 2.0 * CLAIM_TWO_ULP)},
    };
    vector_table *table = vector_table_load("stefan_boltzmann.tsv");
    (void)state;
    for (size_t row = 0; row < vector_table_rows(table); ++row) {
        double temperature = vector_table_number(table, row, "temperature_k");
        double emissivity = vector_table_number(table, row, "emissivity");
        for (size_t law = 0; law < 3; ++law) {
            double got = 0.0;
            assert_status(laws[law].function(temperature, emissivity, &got), GB_OK,
                          laws[law].column);
            accuracy_observe(&laws[law].accuracy, got,
                             vector_table_number(table, row, laws[law].column), "T %.17g eps %g",
                             temperature, emissivity);
        }
    }
    vector_table_free(table);
    for (size_t law = 0; law < 3; ++law) {
        accuracy_report(&laws[law].accuracy);
    }
    for (size_t law = 0; law < 3; ++law) {
        accuracy_assert_claim(&laws[law].accuracy);
    }
}

/* REFERENCES.md spot checks (mpmath, 30 digits), to half a unit of the last quoted digit. */
static void test_reference_spot_checks(void **state)
{
    double exitance = 0.0, radiance = 0.0, temperature = 0.0;
    (void)state;
    assert_status(gb_total_exitance(300.0, 1.0, &exitance), GB_OK, "sigma 300^4");
    assert_within(exitance, 459.300328, 5e-7, "sigma (300 K)^4 = 459.300328 W m-2");
    assert_status(gb_planck_radiance(GB_WAVELENGTH, 10.0, 300.0, 1.0, &radiance), GB_OK, "L");
    assert_within(radiance, 9.92403333, 5e-9, "L(10 um, 300 K) = 9.92403333");
    assert_status(gb_brightness_temperature(GB_WAVELENGTH, 11.0, 10.0, 1.0, &temperature), GB_OK,
                  "brightness");
    assert_within(temperature, 302.991746, 5e-7, "T_b(10 W m-2 sr-1 um-1 at 11 um) = 302.991746 K");
    assert_status(gb_planck_radiance(GB_WAVELENGTH, 0.9, 1500.0, 1.0, &radiance), GB_OK, "L");
    assert_within(radiance, 4744.444883, 5e-7, "L(0.9 um, 1500 K) = 4744.444883");
    assert_status(gb_planck_radiance(GB_WAVELENGTH, 1.05, 1500.0, 1.0, &radiance), GB_OK, "L");
    assert_within(radiance, 10062.54938, 5e-6, "L(1.05 um, 1500 K) = 10062.54938");
    assert_status(gb_brightness_temperature(GB_WAVELENGTH, 11.0, 9.51352334748, 1.0,
                                            &temperature),
                  GB_OK, "brightness");
    assert_within(temperature, 299.575947, 5e-7, "T(B = 9.51352334748 at 11 um) = 299.575947 K");
}

/* planck.h: results that underflow come out as a correct 0 rather than NaN (T -> 0). */
static void test_near_absolute_zero_gives_zero(void **state)
{
    static const double temperatures[] = {DBL_TRUE_MIN, 1e-300, 1e-6};
    static const double positions[] = {10.0, 1000.0, 3e13}; /* per coordinate */
    (void)state;
    for (int c = GB_WAVELENGTH; c <= GB_FREQUENCY; ++c) {
        for (size_t t = 0; t < sizeof temperatures / sizeof temperatures[0]; ++t) {
            double radiance = NAN, photons = NAN, derivative = NAN;
            gb_spectral_coordinate coordinate = (gb_spectral_coordinate)c;
            assert_status(gb_planck_radiance(coordinate, positions[c], temperatures[t], 1.0,
                                             &radiance),
                          GB_OK, "L near 0 K");
            assert_status(gb_planck_photon_radiance(coordinate, positions[c], temperatures[t],
                                                    1.0, &photons),
                          GB_OK, "L_q near 0 K");
            assert_status(gb_planck_radiance_derivative(coordinate, positions[c],
                                                        temperatures[t], &derivative),
                          GB_OK, "dL/dT near 0 K");
            assert_true(radiance == 0.0 && photons == 0.0 && derivative == 0.0);
        }
    }
}

struct planck_domain_row {
    const char *what;
    int coordinate;
    double position, temperature, emissivity;
    gb_status expected;
};

/* Each row breaks one argument; planck.h and status.h give the status. */
static const struct planck_domain_row planck_domain_rows[] = {
    {"NaN position", GB_WAVELENGTH, NAN, 300.0, 1.0, GB_ERR_NOT_FINITE},
    {"+inf position", GB_WAVENUMBER, INFINITY, 300.0, 1.0, GB_ERR_NOT_FINITE},
    {"NaN temperature", GB_FREQUENCY, 3e13, NAN, 1.0, GB_ERR_NOT_FINITE},
    {"-inf temperature", GB_WAVELENGTH, 10.0, -INFINITY, 1.0, GB_ERR_NOT_FINITE},
    {"zero position", GB_WAVELENGTH, 0.0, 300.0, 1.0, GB_ERR_SPECTRAL_DOMAIN},
    {"negative position", GB_FREQUENCY, -3e13, 300.0, 1.0, GB_ERR_SPECTRAL_DOMAIN},
    {"0 K", GB_WAVELENGTH, 10.0, 0.0, 1.0, GB_ERR_TEMPERATURE_DOMAIN},
    {"negative temperature", GB_WAVENUMBER, 1000.0, -5.0, 1.0, GB_ERR_TEMPERATURE_DOMAIN},
    {"above 1e9 K", GB_WAVELENGTH, 10.0, 1.0000000000000002e9, 1.0, GB_ERR_TEMPERATURE_DOMAIN},
    {"unknown coordinate", 3, 10.0, 300.0, 1.0, GB_ERR_INVALID_ARGUMENT},
};

/* Emissivity is an argument of radiance and photon radiance only. */
static const struct planck_domain_row emissivity_domain_rows[] = {
    {"NaN emissivity", GB_WAVELENGTH, 10.0, 300.0, NAN, GB_ERR_NOT_FINITE},
    {"emissivity 0", GB_WAVELENGTH, 10.0, 300.0, 0.0, GB_ERR_EMISSIVITY_DOMAIN},
    {"emissivity above 1", GB_WAVELENGTH, 10.0, 300.0, 1.0000000000000002,
     GB_ERR_EMISSIVITY_DOMAIN},
    {"negative emissivity", GB_WAVENUMBER, 1000.0, 300.0, -0.5, GB_ERR_EMISSIVITY_DOMAIN},
};

static void expect_spectral_failure(spectral_function function, const char *name,
                                    const struct planck_domain_row *row)
{
    double out = UNTOUCHED_SENTINEL;
    char what[120];
    snprintf(what, sizeof what, "%s: %s", name, row->what);
    assert_status(function((gb_spectral_coordinate)row->coordinate, row->position,
                           row->temperature, row->emissivity, &out),
                  row->expected, what);
    if (out != UNTOUCHED_SENTINEL) {
        fail_msg("%s: the out-pointer was written on failure", what);
    }
}

static void test_domain_errors(void **state)
{
    const struct {
        const char *name;
        spectral_function function;
        int takes_emissivity;
    } functions[] = {
        {"gb_planck_radiance", gb_planck_radiance, 1},
        {"gb_planck_photon_radiance", gb_planck_photon_radiance, 1},
        {"gb_planck_radiance_derivative", blackbody_derivative, 0},
    };
    (void)state;
    for (size_t f = 0; f < 3; ++f) {
        for (size_t i = 0; i < sizeof planck_domain_rows / sizeof planck_domain_rows[0]; ++i) {
            expect_spectral_failure(functions[f].function, functions[f].name,
                                    &planck_domain_rows[i]);
        }
        for (size_t i = 0; functions[f].takes_emissivity &&
                           i < sizeof emissivity_domain_rows / sizeof emissivity_domain_rows[0];
             ++i) {
            expect_spectral_failure(functions[f].function, functions[f].name,
                                    &emissivity_domain_rows[i]);
        }
        assert_status(functions[f].function(GB_WAVELENGTH, 10.0, 300.0, 1.0, NULL),
                      GB_ERR_INVALID_ARGUMENT, "NULL out-pointer");
    }
}

static void test_brightness_domain_errors(void **state)
{
    static const struct {
        const char *what;
        double position, radiance, emissivity;
        gb_status expected;
    } rows[] = {
        {"zero radiance", 10.0, 0.0, 1.0, GB_ERR_RADIANCE_DOMAIN},
        {"negative radiance", 10.0, -1.0, 1.0, GB_ERR_RADIANCE_DOMAIN},
        {"NaN radiance", 10.0, NAN, 1.0, GB_ERR_NOT_FINITE},
        {"+inf radiance", 10.0, INFINITY, 1.0, GB_ERR_NOT_FINITE},
        {"emissivity 0", 10.0, 5.0, 0.0, GB_ERR_EMISSIVITY_DOMAIN},
        {"NaN emissivity", 10.0, 5.0, NAN, GB_ERR_NOT_FINITE},
        {"zero position", 0.0, 5.0, 1.0, GB_ERR_SPECTRAL_DOMAIN},
        {"NaN position", NAN, 5.0, 1.0, GB_ERR_NOT_FINITE},
        /* Rayleigh-Jeans: L(10 um, 1e9 K) is about 8.3e8, so 1e20 needs far more than 1e9 K. */
        {"radiance beyond 1e9 K", 10.0, 1e20, 1.0, GB_ERR_RADIANCE_OUT_OF_RANGE},
        {"largest double", 10.0, DBL_MAX, 1.0, GB_ERR_RADIANCE_OUT_OF_RANGE},
    };
    (void)state;
    for (size_t i = 0; i < sizeof rows / sizeof rows[0]; ++i) {
        double temperature = UNTOUCHED_SENTINEL;
        assert_status(gb_brightness_temperature(GB_WAVELENGTH, rows[i].position, rows[i].radiance,
                                                rows[i].emissivity, &temperature),
                      rows[i].expected, rows[i].what);
        assert_true(temperature == UNTOUCHED_SENTINEL);
    }
    assert_status(gb_brightness_temperature(GB_WAVELENGTH, 10.0, 5.0, 1.0, NULL),
                  GB_ERR_INVALID_ARGUMENT, "NULL out-pointer");
}

static void test_other_domain_errors(void **state)
{
    gb_wien_peaks peaks;
    double out = UNTOUCHED_SENTINEL;
    (void)state;
    memset(&peaks, 0, sizeof peaks);
    assert_status(gb_wien_peaks_at(0.0, &peaks), GB_ERR_TEMPERATURE_DOMAIN, "peaks at 0 K");
    assert_status(gb_wien_peaks_at(NAN, &peaks), GB_ERR_NOT_FINITE, "peaks at NaN");
    assert_true(peaks.wavelength_um == 0.0);
    assert_status(gb_wien_peaks_at(300.0, NULL), GB_ERR_INVALID_ARGUMENT, "peaks NULL");
    assert_status(gb_wien_temperature(0.0, &out), GB_ERR_SPECTRAL_DOMAIN, "Wien at 0 um");
    assert_status(gb_wien_temperature(NAN, &out), GB_ERR_NOT_FINITE, "Wien at NaN");
    /* A peak at 1e-300 um needs T far above GB_TEMPERATURE_MAX: not a temperature we accept. */
    assert_true(gb_wien_temperature(1e-300, &out) != GB_OK);
    assert_true(out == UNTOUCHED_SENTINEL);
    assert_status(gb_total_exitance(0.0, 1.0, &out), GB_ERR_TEMPERATURE_DOMAIN, "sigma at 0 K");
    assert_status(gb_total_radiance(300.0, 0.0, &out), GB_ERR_EMISSIVITY_DOMAIN, "eps 0");
    assert_status(gb_total_photon_exitance(INFINITY, 1.0, &out), GB_ERR_NOT_FINITE, "inf K");
    assert_true(out == UNTOUCHED_SENTINEL);
    assert_status(gb_total_exitance(300.0, 1.0, NULL), GB_ERR_INVALID_ARGUMENT, "sigma NULL");
}

/* The shared checks every module reports alike: (0, 1e9] K and (0, 1]. */
static void test_shared_argument_checks(void **state)
{
    static const struct {
        double value;
        gb_status temperature, emissivity;
    } rows[] = {
        {DBL_TRUE_MIN, GB_OK, GB_OK},
        {1.0, GB_OK, GB_OK},
        {1.0000000000000002, GB_OK, GB_ERR_EMISSIVITY_DOMAIN},
        {1e9, GB_OK, GB_ERR_EMISSIVITY_DOMAIN},
        {1.0000000000000002e9, GB_ERR_TEMPERATURE_DOMAIN, GB_ERR_EMISSIVITY_DOMAIN},
        {0.0, GB_ERR_TEMPERATURE_DOMAIN, GB_ERR_EMISSIVITY_DOMAIN},
        {-0.0, GB_ERR_TEMPERATURE_DOMAIN, GB_ERR_EMISSIVITY_DOMAIN},
        {-1.0, GB_ERR_TEMPERATURE_DOMAIN, GB_ERR_EMISSIVITY_DOMAIN},
        {NAN, GB_ERR_NOT_FINITE, GB_ERR_NOT_FINITE},
        {INFINITY, GB_ERR_NOT_FINITE, GB_ERR_NOT_FINITE},
    };
    (void)state;
    for (size_t i = 0; i < sizeof rows / sizeof rows[0]; ++i) {
        char what[64];
        snprintf(what, sizeof what, "check of %.17g", rows[i].value);
        assert_status(gb_check_temperature(rows[i].value), rows[i].temperature, what);
        assert_status(gb_check_emissivity(rows[i].value), rows[i].emissivity, what);
    }
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_spectral_quantities_against_mpmath),
        cmocka_unit_test(test_brightness_temperature_against_mpmath),
        cmocka_unit_test(test_round_trip_through_radiance),
        cmocka_unit_test(test_derivative_agrees_with_finite_difference),
        cmocka_unit_test(test_wien_peaks_against_mpmath),
        cmocka_unit_test(test_wien_spot_checks),
        cmocka_unit_test(test_wien_peaks_are_maxima),
        cmocka_unit_test(test_stefan_boltzmann_against_mpmath),
        cmocka_unit_test(test_reference_spot_checks),
        cmocka_unit_test(test_near_absolute_zero_gives_zero),
        cmocka_unit_test(test_domain_errors),
        cmocka_unit_test(test_brightness_domain_errors),
        cmocka_unit_test(test_other_domain_errors),
        cmocka_unit_test(test_shared_argument_checks),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
