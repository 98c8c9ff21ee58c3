/*
 * Band radiance, its derivative, photon exitance and fraction, and the band
 * inversion (core/band.h).
 *
 * Expected values: mpmath at 50 digits via tests/reference/generate.py:
 * tests/reference/vectors/band.tsv (flat bands, closed forms in
 * polylogarithms cross-checked by quadrature) and response.tsv (synthetic
 * response tables response_*.tsv, integrated piece by piece with
 * mpmath.quad).  Stefan-Boltzmann's sigma: CODATA 2018, REFERENCES.md.
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
#include "status_expect.h"
#include "vector_table.h"

/*
 * band.h: flat bands <= 1e-13 relative where x = c2/(lambda_short T) <= 100 and
 * <= (x + 4) 1e-15 beyond (T in [1, 1e6] K, limits in [1e-3, 1e5] um).
 */
#define CLAIM_FLAT 1e-13
#define CLAIM_FLAT_PER_EXPONENT 1e-15
#define CLAIM_FLAT_EXPONENT_OFFSET 4.0
#define C2_UM_K 14387.768775039338 /* CODATA 2018 (exact SI), REFERENCES.md */
/* band.h: response bands <= 1e-12 relative (publicly "claimed 1e-9"). */
#define CLAIM_RESPONSE 1e-12
/* band.h: the inversion is good to 1e-12 relative and 1 uK up to 1e5 K. */
#define CLAIM_INVERSION 1e-12
#define CLAIM_INVERSION_KELVIN 1e-6
/* No claim for a result below DBL_MIN: a sanity bound of this test. */
#define SUBNORMAL_SANITY 1e-6

/* CODATA 2018 (exact SI), REFERENCES.md. */
#define SIGMA 5.670374419184429454e-8
#define PI 3.14159265358979323846

/* The quantities band.tsv and response.tsv hold, and where gb_band_evaluate puts them. */
enum { RADIANCE, DERIVATIVE, PHOTON_EXITANCE, FRACTION, QUANTITY_COUNT };
static const char *const quantity_column[QUANTITY_COUNT] = {"radiance", "radiance_derivative",
                                                            "photon_exitance", "fraction"};

static double evaluated(const gb_band_quantities *q, int quantity)
{
    switch (quantity) {
    case RADIANCE: return q->radiance;
    case DERIVATIVE: return q->radiance_derivative;
    case PHOTON_EXITANCE: return q->photon_exitance;
    default: break;
    }
    return q->fraction;
}

struct band_accuracy {
    accuracy_record claimed[QUANTITY_COUNT];
    accuracy_record subnormal[QUANTITY_COUNT];
};

#define CLAIMED(prefix, claim)                                                           \
    {ACCURACY_RECORD(prefix " radiance", claim), ACCURACY_RECORD(prefix " dL/dT", claim), \
     ACCURACY_RECORD(prefix " photon exitance", claim),                                  \
     ACCURACY_RECORD(prefix " fraction", claim)}
#define SUBNORMAL(prefix)                                                     \
    {ACCURACY_RECORD(prefix " radiance (subnormal)", SUBNORMAL_SANITY),      \
     ACCURACY_RECORD(prefix " dL/dT (subnormal)", SUBNORMAL_SANITY),         \
     ACCURACY_RECORD(prefix " photon exitance (subnormal)", SUBNORMAL_SANITY), \
     ACCURACY_RECORD(prefix " fraction (subnormal)", SUBNORMAL_SANITY)}

/* gb_band_evaluate at eps = 1 and 0.6 and gb_band_radiance, against one vector row. */
/*
 * Errors are recorded in units of `bound` (the claim for this row), against a
 * claim of 1.
 */
static void check_band_row(const band_fixture *fixture, const vector_table *table, size_t row,
                           double bound, struct band_accuracy *accuracy)
{
    static const double emissivities[] = {1.0, 0.6};
    double temperature = vector_table_number(table, row, "temperature_k");
    double expected[QUANTITY_COUNT], radiance = NAN, derivative = NAN;
    char what[160];
    snprintf(what, sizeof what, "%s at %.17g K", fixture->description, temperature);
    for (int q = 0; q < QUANTITY_COUNT; ++q) {
        expected[q] = vector_table_number(table, row, quantity_column[q]);
    }
    for (size_t e = 0; e < 2; ++e) {
        gb_band_quantities quantities;
        double eps = emissivities[e];
        memset(&quantities, 0, sizeof quantities);
        assert_status(gb_band_evaluate(&fixture->band, temperature, eps, &quantities), GB_OK,
                      what);
        for (int q = 0; q < QUANTITY_COUNT; ++q) {
            double scaled = q == FRACTION ? expected[q] : eps * expected[q];
            /* band.h: every quantity is derived from the band radiance, so where that is
             * subnormal (a 2 K body at 10 um) all of them carry its lost digits. */
            accuracy_record *records = fabs(scaled) < DBL_MIN ||
                                               fabs(eps * expected[RADIANCE]) < DBL_MIN
                                           ? accuracy->subnormal
                                           : accuracy->claimed;
            accuracy_observe_in_units(&records[q], evaluated(&quantities, q), scaled,
                                      records == accuracy->claimed ? bound : 1.0, "%s eps %g",
                                      what, eps);
        }
        /* band.h: exitance is pi x radiance (Lambertian); total exitance eps sigma T^4. */
        assert_close(quantities.exitance, PI * quantities.radiance, 2.0 * DBL_EPSILON, what);
        assert_close(quantities.total_exitance,
                     eps * SIGMA * temperature * temperature * temperature * temperature,
                     8.0 * DBL_EPSILON, what);
    }
    assert_status(gb_band_radiance(&fixture->band, temperature, &radiance, &derivative), GB_OK,
                  what);
    if (fabs(expected[RADIANCE]) < DBL_MIN) {
        accuracy_observe(&accuracy->subnormal[RADIANCE], radiance, expected[RADIANCE],
                         "%s (gb_band_radiance)", what);
    } else {
        accuracy_observe_in_units(&accuracy->claimed[RADIANCE], radiance, expected[RADIANCE],
                                  bound, "%s (gb_band_radiance)", what);
    }
    if (fabs(expected[DERIVATIVE]) < DBL_MIN) {
        accuracy_observe(&accuracy->subnormal[DERIVATIVE], derivative, expected[DERIVATIVE],
                         "%s (gb_band_radiance)", what);
    } else {
        accuracy_observe_in_units(&accuracy->claimed[DERIVATIVE], derivative,
                                  expected[DERIVATIVE], bound, "%s (gb_band_radiance)", what);
    }
}

static void report_and_assert(const struct band_accuracy *accuracy)
{
    for (int q = 0; q < QUANTITY_COUNT; ++q) {
        accuracy_report(&accuracy->claimed[q]);
        if (accuracy->subnormal[q].count > 0) {
            accuracy_report(&accuracy->subnormal[q]);
        }
    }
    for (int q = 0; q < QUANTITY_COUNT; ++q) {
        accuracy_assert_claim(&accuracy->claimed[q]);
        if (accuracy->subnormal[q].count > 0) {
            accuracy_assert_claim(&accuracy->subnormal[q]);
        }
    }
}

static void test_flat_bands_against_mpmath(void **state)
{
    struct band_accuracy accuracy = {CLAIMED("flat band (error / claim)", 1.0),
                                     SUBNORMAL("flat band")};
    vector_table *table = vector_table_load("band.tsv");
    (void)state;
    for (size_t row = 0; row < vector_table_rows(table); ++row) {
        band_fixture fixture;
        double shortest_um, x;
        band_fixture_from_row(&fixture, table, row);
        shortest_um = fixture.band.kind == GB_BAND_WAVENUMBER ? 1e4 / fixture.band.upper
                                                              : fixture.band.lower;
        x = C2_UM_K / (shortest_um * vector_table_number(table, row, "temperature_k"));
        check_band_row(&fixture, table, row,
                       fmax(CLAIM_FLAT, (x + CLAIM_FLAT_EXPONENT_OFFSET) * CLAIM_FLAT_PER_EXPONENT),
                       &accuracy);
    }
    vector_table_free(table);
    report_and_assert(&accuracy);
}

static void test_response_bands_against_mpmath(void **state)
{
    struct band_accuracy accuracy = {CLAIMED("response band (error / claim)", 1.0),
                                     SUBNORMAL("response band")};
    vector_table *table = vector_table_load("response.tsv");
    (void)state;
    for (size_t row = 0; row < vector_table_rows(table); ++row) {
        band_fixture fixture;
        band_fixture_response(&fixture, vector_table_text(table, row, "response"));
        check_band_row(&fixture, table, row, CLAIM_RESPONSE, &accuracy);
    }
    vector_table_free(table);
    report_and_assert(&accuracy);
}

/* The band 1e-3..1e7 um (and 1e-3..1e7 cm^-1) holds all but < 1e-14 of sigma T^4 / pi here. */
static void test_whole_spectrum_is_stefan_boltzmann(void **state)
{
    static const double temperatures[] = {30.0, 300.0, 3000.0, 1e4, 5e4};
    accuracy_record accuracy = ACCURACY_RECORD("band 1e-3..1e7 vs sigma T^4 / pi", CLAIM_FLAT);
    (void)state;
    for (size_t t = 0; t < sizeof temperatures / sizeof temperatures[0]; ++t) {
        for (int kind = GB_BAND_TOTAL; kind <= GB_BAND_WAVENUMBER; ++kind) {
            band_fixture fixture;
            double radiance = NAN, temperature = temperatures[t];
            double squared = temperature * temperature;
            if (kind == GB_BAND_TOTAL) {
                band_fixture_total(&fixture);
            } else {
                band_fixture_flat(&fixture, (gb_band_kind)kind, 1e-3, 1e7);
            }
            assert_status(gb_band_radiance(&fixture.band, temperature, &radiance, NULL), GB_OK,
                          fixture.description);
            accuracy_observe(&accuracy, radiance, SIGMA * squared * squared / PI, "%s at %g K",
                             fixture.description, temperature);
        }
    }
    accuracy_report(&accuracy);
    accuracy_assert_claim(&accuracy);
}

/* A two-point flat response 8..14 um is the flat band 8..14 um. */
static void test_flat_response_equals_flat_band(void **state)
{
    static const double temperatures[] = {50.0, 300.0, 3000.0, 1e5};
    band_fixture response, flat;
    (void)state;
    band_fixture_response(&response, "synthetic_flat_8_14");
    band_fixture_flat(&flat, GB_BAND_WAVELENGTH, 8.0, 14.0);
    for (size_t t = 0; t < sizeof temperatures / sizeof temperatures[0]; ++t) {
        double from_response[2], from_flat[2];
        assert_status(gb_band_radiance(&response.band, temperatures[t], &from_response[0],
                                       &from_response[1]),
                      GB_OK, "response");
        assert_status(gb_band_radiance(&flat.band, temperatures[t], &from_flat[0], &from_flat[1]),
                      GB_OK, "flat");
        assert_close(from_response[0], from_flat[0], CLAIM_RESPONSE + CLAIM_FLAT, "radiance");
        assert_close(from_response[1], from_flat[1], CLAIM_RESPONSE + CLAIM_FLAT, "dL/dT");
    }
}

/* dL/dT against a central difference (h = 1e-6 T; error ~ 1e-13 / 1e-6 from L's own error). */
static void test_derivative_agrees_with_finite_difference(void **state)
{
    static const double temperatures[] = {40.0, 300.0, 2000.0, 1e5};
    band_fixture fixtures[4];
    (void)state;
    band_fixture_flat(&fixtures[0], GB_BAND_WAVELENGTH, 8.0, 14.0);
    band_fixture_flat(&fixtures[1], GB_BAND_WAVENUMBER, 2000.0, 3333.3);
    band_fixture_response(&fixtures[2], "synthetic_lwir");
    band_fixture_total(&fixtures[3]);
    for (size_t b = 0; b < 4; ++b) {
        for (size_t t = 0; t < sizeof temperatures / sizeof temperatures[0]; ++t) {
            double temperature = temperatures[t], h = 1e-6 * temperature;
            double above = NAN, below = NAN, radiance = NAN, derivative = NAN;
            assert_status(gb_band_radiance(&fixtures[b].band, temperature + h, &above, NULL),
                          GB_OK, "L(T + h)");
            assert_status(gb_band_radiance(&fixtures[b].band, temperature - h, &below, NULL),
                          GB_OK, "L(T - h)");
            assert_status(gb_band_radiance(&fixtures[b].band, temperature, &radiance,
                                           &derivative),
                          GB_OK, "dL/dT");
            assert_close(derivative, (above - below) / (2.0 * h), 1e-6, fixtures[b].description);
        }
    }
}

/* Inverting the mpmath radiance of every row gives the row's temperature back. */
static void check_inversion_rows(const char *file_name, int from_response,
                                 accuracy_record *relative, double *worst_kelvin)
{
    vector_table *table = vector_table_load(file_name);
    for (size_t row = 0; row < vector_table_rows(table); ++row) {
        band_fixture fixture;
        double temperature = vector_table_number(table, row, "temperature_k");
        double radiance = vector_table_number(table, row, "radiance");
        if (radiance < DBL_MIN || !(temperature > GB_BAND_TEMPERATURE_MIN &&
                                    temperature < GB_BAND_TEMPERATURE_MAX)) {
            continue; /* nothing to invert, or not inside the solver's range */
        }
        if (from_response) {
            band_fixture_response(&fixture, vector_table_text(table, row, "response"));
        } else {
            band_fixture_from_row(&fixture, table, row);
        }
        for (int e = 0; e < 2; ++e) {
            double eps = e ? 0.25 : 1.0, solved = NAN;
            char what[160];
            snprintf(what, sizeof what, "%s, L %.17g, eps %g", fixture.description,
                     eps * radiance, eps);
            assert_status(gb_band_temperature(&fixture.band, eps * radiance, eps, &solved), GB_OK,
                          what);
            accuracy_observe(relative, solved, temperature, "%s", what);
            if (temperature <= 1e5) {
                *worst_kelvin = fmax(*worst_kelvin, fabs(solved - temperature));
            }
        }
    }
    vector_table_free(table);
}

static void test_inversion_against_mpmath(void **state)
{
    accuracy_record relative = ACCURACY_RECORD("gb_band_temperature", CLAIM_INVERSION);
    double worst_kelvin = 0.0;
    (void)state;
    check_inversion_rows("band.tsv", 0, &relative, &worst_kelvin);
    check_inversion_rows("response.tsv", 1, &relative, &worst_kelvin);
    accuracy_report(&relative);
    printf("accuracy: gb_band_temperature worst |error| up to 1e5 K: %.2e K (claim 1e-6 K)\n",
           worst_kelvin);
    accuracy_assert_claim(&relative);
    assert_true(worst_kelvin <= CLAIM_INVERSION_KELVIN);
}

/* T -> L -> T over 1 K .. 1e5 K (geometric, 61 points) must hold to 1 uK. */
static void test_inversion_round_trip_to_a_microkelvin(void **state)
{
    band_fixture fixtures[4];
    double lowest[4] = {1.0, 1.0, 20.0, 30.0}; /* below these the band radiance underflows */
    double worst = 0.0;
    (void)state;
    band_fixture_total(&fixtures[0]);
    band_fixture_flat(&fixtures[1], GB_BAND_WAVELENGTH, 0.1, 1000.0);
    band_fixture_flat(&fixtures[2], GB_BAND_WAVELENGTH, 8.0, 14.0);
    band_fixture_response(&fixtures[3], "synthetic_lwir");
    for (size_t b = 0; b < 4; ++b) {
        for (int i = 0; i <= 60; ++i) {
            double temperature = pow(10.0, 5.0 * i / 60.0), radiance = NAN, solved = NAN;
            char what[160];
            if (temperature < lowest[b]) {
                continue;
            }
            snprintf(what, sizeof what, "%s at %.17g K", fixtures[b].description, temperature);
            assert_status(gb_band_radiance(&fixtures[b].band, temperature, &radiance, NULL),
                          GB_OK, what);
            assert_status(gb_band_temperature(&fixtures[b].band, radiance, 1.0, &solved), GB_OK,
                          what);
            worst = fmax(worst, fabs(solved - temperature));
            if (!(fabs(solved - temperature) <= CLAIM_INVERSION_KELVIN)) {
                fail_msg("%s: came back as %.17g K", what, solved);
            }
        }
    }
    printf("accuracy: band round trip T -> L -> T, 1 K .. 1e5 K: worst %.2e K (claim 1e-6 K)\n",
           worst);
}

static void test_inversion_errors(void **state)
{
    static const struct {
        const char *what;
        int band; /* 0: total, 1: 8..14 um */
        double radiance, emissivity;
        gb_status expected;
    } rows[] = {
        {"zero radiance", 1, 0.0, 1.0, GB_ERR_RADIANCE_DOMAIN},
        {"negative radiance", 1, -3.0, 1.0, GB_ERR_RADIANCE_DOMAIN},
        {"NaN radiance", 1, NAN, 1.0, GB_ERR_NOT_FINITE},
        {"+inf radiance", 0, INFINITY, 1.0, GB_ERR_NOT_FINITE},
        {"emissivity 0", 1, 50.0, 0.0, GB_ERR_EMISSIVITY_DOMAIN},
        {"emissivity above 1", 1, 50.0, 1.5, GB_ERR_EMISSIVITY_DOMAIN},
        {"huge radiance in 8..14 um", 1, 1e300, 1.0, GB_ERR_RADIANCE_OUT_OF_RANGE},
        /* sigma (1e6 K)^4 / pi = 1.8e16: 1e20 needs a hotter body than the solver searches. */
        {"above what 1e6 K gives", 0, 1e20, 1.0, GB_ERR_RADIANCE_OUT_OF_RANGE},
        /* sigma (0.1 K)^4 / pi = 1.8e-12: 1e-13 needs a colder body than the solver searches. */
        {"below what 0.1 K gives", 0, 1e-13, 1.0, GB_ERR_RADIANCE_OUT_OF_RANGE},
    };
    band_fixture fixtures[2];
    (void)state;
    band_fixture_total(&fixtures[0]);
    band_fixture_flat(&fixtures[1], GB_BAND_WAVELENGTH, 8.0, 14.0);
    for (size_t i = 0; i < sizeof rows / sizeof rows[0]; ++i) {
        double temperature = UNTOUCHED_SENTINEL;
        assert_status(gb_band_temperature(&fixtures[rows[i].band].band, rows[i].radiance,
                                          rows[i].emissivity, &temperature),
                      rows[i].expected, rows[i].what);
        assert_true(temperature == UNTOUCHED_SENTINEL);
    }
    assert_status(gb_band_temperature(&fixtures[0].band, 1.0, 1.0, NULL),
                  GB_ERR_INVALID_ARGUMENT, "NULL out-pointer");
}

/* A band description broken in one way, and the status band.h and status.h give it. */
struct invalid_band {
    const char *what;
    gb_band band;
    gb_status expected; /* GB_STATUS_COUNT: an error, the headers do not say which */
};

static const double eight_to_twelve[] = {8.0, 10.0, 12.0};
static const double unsorted_wavelengths[] = {8.0, 12.0, 10.0};
static const double repeated_wavelengths[] = {8.0, 10.0, 10.0};
static const double nonpositive_wavelengths[] = {0.0, 10.0, 12.0};
static const double infinite_wavelengths[] = {8.0, 10.0, INFINITY};
static const double plain_values[] = {0.5, 1.0, 0.5};
static const double negative_values[] = {0.5, -0.1, 0.5};
static const double zero_values[] = {0.0, 0.0, 0.0};
static const double nan_values[] = {0.5, NAN, 0.5};

#define FLAT(kind, lower, upper) {kind, lower, upper, NULL, NULL, 0}
#define RESPONSE(wavelengths, values, count) \
    {GB_BAND_RESPONSE, 0.0, 0.0, wavelengths, values, count}

static const struct invalid_band invalid_bands[] = {
    {"lower limit 0", FLAT(GB_BAND_WAVELENGTH, 0.0, 14.0), GB_ERR_BAND_LIMITS},
    {"negative lower limit", FLAT(GB_BAND_WAVENUMBER, -700.0, 1250.0), GB_ERR_BAND_LIMITS},
    {"reversed limits", FLAT(GB_BAND_WAVELENGTH, 14.0, 8.0), GB_ERR_BAND_REVERSED},
    {"equal limits", FLAT(GB_BAND_WAVENUMBER, 1000.0, 1000.0), GB_ERR_BAND_REVERSED},
    {"NaN lower limit", FLAT(GB_BAND_WAVELENGTH, NAN, 14.0), GB_ERR_NOT_FINITE},
    {"infinite upper limit", FLAT(GB_BAND_WAVELENGTH, 8.0, INFINITY), GB_ERR_NOT_FINITE},
    {"unknown kind", FLAT((gb_band_kind)9, 8.0, 14.0), GB_ERR_INVALID_ARGUMENT},
    {"one response point", RESPONSE(eight_to_twelve, plain_values, 1), GB_ERR_RESPONSE_TOO_SHORT},
    {"unsorted response", RESPONSE(unsorted_wavelengths, plain_values, 3),
     GB_ERR_RESPONSE_UNSORTED},
    {"repeated response wavelength", RESPONSE(repeated_wavelengths, plain_values, 3),
     GB_ERR_RESPONSE_UNSORTED},
    {"negative response", RESPONSE(eight_to_twelve, negative_values, 3),
     GB_ERR_RESPONSE_NEGATIVE},
    {"all-zero response", RESPONSE(eight_to_twelve, zero_values, 3), GB_ERR_RESPONSE_ALL_ZERO},
    {"NaN response value", RESPONSE(eight_to_twelve, nan_values, 3), GB_ERR_NOT_FINITE},
    {"infinite response wavelength", RESPONSE(infinite_wavelengths, plain_values, 3),
     GB_ERR_NOT_FINITE},
    {"response wavelength 0", RESPONSE(nonpositive_wavelengths, plain_values, 3),
     GB_STATUS_COUNT},
    {"NULL response arrays", RESPONSE(NULL, NULL, 3), GB_ERR_INVALID_ARGUMENT},
};

static void expect_invalid(gb_status got, const struct invalid_band *row, const char *function)
{
    char what[120];
    snprintf(what, sizeof what, "%s: %s", function, row->what);
    if (row->expected == GB_STATUS_COUNT) {
        if (got == GB_OK) {
            fail_msg("%s: accepted", what);
        }
    } else {
        assert_status(got, row->expected, what);
    }
}

/* Every band function rejects every broken band alike and writes nothing. */
static void test_invalid_bands(void **state)
{
    (void)state;
    for (size_t i = 0; i < sizeof invalid_bands / sizeof invalid_bands[0]; ++i) {
        const struct invalid_band *row = &invalid_bands[i];
        double radiance = UNTOUCHED_SENTINEL, derivative = UNTOUCHED_SENTINEL;
        double temperature = UNTOUCHED_SENTINEL;
        gb_band_quantities quantities;
        memset(&quantities, 0, sizeof quantities);
        quantities.radiance = UNTOUCHED_SENTINEL;
        expect_invalid(gb_band_validate(&row->band), row, "gb_band_validate");
        expect_invalid(gb_band_radiance(&row->band, 300.0, &radiance, &derivative), row,
                       "gb_band_radiance");
        expect_invalid(gb_band_evaluate(&row->band, 300.0, 1.0, &quantities), row,
                       "gb_band_evaluate");
        expect_invalid(gb_band_temperature(&row->band, 10.0, 1.0, &temperature), row,
                       "gb_band_temperature");
        assert_true(radiance == UNTOUCHED_SENTINEL && derivative == UNTOUCHED_SENTINEL);
        assert_true(quantities.radiance == UNTOUCHED_SENTINEL);
        assert_true(temperature == UNTOUCHED_SENTINEL);
    }
}

/* status.h says both "zero length" (invalid argument) and "fewer than 2 points" (too short). */
static void test_empty_response(void **state)
{
    gb_band band = RESPONSE(eight_to_twelve, plain_values, 0);
    gb_status status = gb_band_validate(&band);
    (void)state;
    if (status != GB_ERR_RESPONSE_TOO_SHORT && status != GB_ERR_INVALID_ARGUMENT) {
        fail_msg("empty response: %s", status_identifier(status));
    }
    assert_status(gb_band_validate(NULL), GB_ERR_INVALID_ARGUMENT, "NULL band");
}

static void test_temperature_and_emissivity_domain(void **state)
{
    static const struct {
        const char *what;
        double temperature, emissivity;
        gb_status expected;
    } rows[] = {
        {"0 K", 0.0, 1.0, GB_ERR_TEMPERATURE_DOMAIN},
        {"negative temperature", -1.0, 1.0, GB_ERR_TEMPERATURE_DOMAIN},
        {"above 1e9 K", 2e9, 1.0, GB_ERR_TEMPERATURE_DOMAIN},
        {"NaN temperature", NAN, 1.0, GB_ERR_NOT_FINITE},
        {"emissivity 0", 300.0, 0.0, GB_ERR_EMISSIVITY_DOMAIN},
        {"emissivity above 1", 300.0, 1.01, GB_ERR_EMISSIVITY_DOMAIN},
        {"NaN emissivity", 300.0, NAN, GB_ERR_NOT_FINITE},
    };
    band_fixture fixture;
    (void)state;
    band_fixture_flat(&fixture, GB_BAND_WAVELENGTH, 8.0, 14.0);
    for (size_t i = 0; i < sizeof rows / sizeof rows[0]; ++i) {
        gb_band_quantities quantities;
        memset(&quantities, 0, sizeof quantities);
        quantities.fraction = UNTOUCHED_SENTINEL;
        assert_status(gb_band_evaluate(&fixture.band, rows[i].temperature, rows[i].emissivity,
                                       &quantities),
                      rows[i].expected, rows[i].what);
        assert_true(quantities.fraction == UNTOUCHED_SENTINEL);
        if (rows[i].emissivity == 1.0) {
            double radiance = UNTOUCHED_SENTINEL;
            assert_status(gb_band_radiance(&fixture.band, rows[i].temperature, &radiance, NULL),
                          rows[i].expected, rows[i].what);
            assert_true(radiance == UNTOUCHED_SENTINEL);
        }
    }
    assert_status(gb_band_radiance(&fixture.band, 300.0, NULL, NULL), GB_ERR_INVALID_ARGUMENT,
                  "NULL radiance");
    assert_status(gb_band_evaluate(&fixture.band, 300.0, 1.0, NULL), GB_ERR_INVALID_ARGUMENT,
                  "NULL quantities");
}

/* band.h: a band whose radiance underflows at a very low temperature gives 0, not an error. */
static void test_underflow_gives_zero(void **state)
{
    band_fixture fixture;
    double radiance = NAN, derivative = NAN;
    (void)state;
    band_fixture_flat(&fixture, GB_BAND_WAVELENGTH, 3.0, 5.0); /* x > 2800 at 1 K */
    assert_status(gb_band_radiance(&fixture.band, 1.0, &radiance, &derivative), GB_OK, "1 K");
    assert_true(radiance == 0.0 && derivative == 0.0);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_flat_bands_against_mpmath),
        cmocka_unit_test(test_response_bands_against_mpmath),
        cmocka_unit_test(test_whole_spectrum_is_stefan_boltzmann),
        cmocka_unit_test(test_flat_response_equals_flat_band),
        cmocka_unit_test(test_derivative_agrees_with_finite_difference),
        cmocka_unit_test(test_inversion_against_mpmath),
        cmocka_unit_test(test_inversion_round_trip_to_a_microkelvin),
        cmocka_unit_test(test_inversion_errors),
        cmocka_unit_test(test_invalid_bands),
        cmocka_unit_test(test_empty_response),
        cmocka_unit_test(test_temperature_and_emissivity_domain),
        cmocka_unit_test(test_underflow_gives_zero),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
