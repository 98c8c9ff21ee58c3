/*
 * Calibration of a radiation thermometer (core/calibration.h): Sakuma-Hattori
 * and band-model fits, their covariance, and applying a fit to signals.
 *
 * Expected values: tests/reference/calibration.py, which writes
 * tests/reference/vectors/calibration_{fits,points,apply}.tsv from two outside
 * witnesses on the same (invented) data: scipy.optimize.curve_fit (Debian's
 * python3-scipy, method 'lm', analytic Jacobian, tolerances 1e-15; unweighted
 * by default, sigma = u(S) with absolute_sigma=True when the points carry
 * uncertainties, re-weighted to the effective-variance fixed point when some
 * u(T) > 0), and an mpmath Gauss-Newton solution at 40 digits with its
 * covariance (J^T W J)^-1.  Band radiances in the generator come from
 * quadrature of Planck's law with the exact CODATA 2018 constants.
 * The "exact" data sets were made with the model from chosen parameters, so
 * the fit must give those parameters back and zero residuals.
 * Expected statuses follow the contract in calibration.h.
 */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <cmocka.h>

#include "accuracy.h"
#include "calibration.h"
#include "status_expect.h"
#include "vector_table.h"

/* Measured worst figures (printed by the tests) are below these claims. */
#define CLAIM_TRUTH_PARAMETERS 1e-11   /* exact data: fitted / chosen parameters - 1 */
#define CLAIM_EXACT_RESIDUAL_K 1e-10   /* exact data: residuals and applied temperatures, K */
#define CLAIM_PARAMETERS 1e-10         /* noisy data: against mpmath */
#define CLAIM_COVARIANCE 1e-9          /* noisy data: covariance entry error / sqrt(V_jj V_kk) */
/* scipy's curve_fit itself stands 3e-9 from the mpmath minimum on the effective-variance set. */
#define CLAIM_SCIPY_PARAMETERS 1e-8
#define CLAIM_SCIPY_COVARIANCE 1e-8
#define CLAIM_RESIDUAL_K 1e-10         /* noisy data: residuals and applied temperatures, K */
#define CLAIM_APPLIED_U 1e-9           /* relative, applied standard uncertainty */

#define MAX_SET_POINTS 16

typedef struct data_set {
    char name[64];
    gb_calibration_model model;
    gb_band band;
    double emissivity;
    size_t count;
    gb_calibration_point points[MAX_SET_POINTS];
    double expected_residual[MAX_SET_POINTS];
    int exact;
} data_set;

static gb_band band_from_text(const char *text)
{
    gb_band band;
    char kind[32];
    double lower = 0.0, upper = 0.0;
    memset(&band, 0, sizeof band);
    if (sscanf(text, "%31[a-z]:%lf:%lf", kind, &lower, &upper) == 3) {
        band.kind = strcmp(kind, "wavenumber") == 0 ? GB_BAND_WAVENUMBER : GB_BAND_WAVELENGTH;
        band.lower = lower;
        band.upper = upper;
    }
    return band;
}

static void load_set(const vector_table *fits, size_t row, const vector_table *points,
                     data_set *set)
{
    memset(set, 0, sizeof *set);
    snprintf(set->name, sizeof set->name, "%s", vector_table_text(fits, row, "set"));
    set->model = strcmp(vector_table_text(fits, row, "model"), "band") == 0
                     ? GB_CALIBRATION_BAND
                     : GB_CALIBRATION_SAKUMA_HATTORI;
    set->band = band_from_text(vector_table_text(fits, row, "band"));
    set->emissivity = vector_table_number(fits, row, "source_emissivity");
    set->exact = strstr(set->name, "_exact") != NULL;
    for (size_t i = 0; i < vector_table_rows(points); ++i) {
        gb_calibration_point *p;
        if (strcmp(vector_table_text(points, i, "set"), set->name) != 0) {
            continue;
        }
        assert_true(set->count < MAX_SET_POINTS);
        p = &set->points[set->count];
        p->temperature_k = vector_table_number(points, i, "temperature_k");
        p->signal = vector_table_number(points, i, "signal");
        p->u_temperature_k = vector_table_number(points, i, "u_temperature_k");
        p->u_signal = vector_table_number(points, i, "u_signal");
        set->expected_residual[set->count] = vector_table_number(points, i, "residual_k");
        set->count++;
    }
    assert_true(set->count > 0);
}

static void fit_set(const data_set *set, gb_calibration *fitted, gb_fit_summary *summary,
                    double *residual)
{
    gb_status status = gb_calibration_fit(set->model, &set->band, set->emissivity, set->points,
                                          set->count, fitted, summary, residual);
    if (status != GB_OK) {
        fail_msg("%s: fit failed with %s", set->name, status_identifier(status));
    }
}

static const char *const parameter_names[2][3] = {{"A", "B", "C"}, {"gain", "offset", ""}};

typedef struct fit_accuracy {
    accuracy_record truth, exact_residual, scipy_parameters, mp_parameters, scipy_covariance,
        mp_covariance, residual;
} fit_accuracy;

/* Covariance entry error relative to sqrt(V_jj V_kk): what matters for propagated uncertainty. */
static void observe_covariance(accuracy_record *record, const gb_calibration *fitted,
                               const vector_table *fits, size_t row, const char *prefix,
                               const char *set)
{
    size_t n = fitted->parameter_count;
    for (size_t j = 0; j < n; ++j) {
        for (size_t k = j; k < n; ++k) {
            char column[80];
            double expected, scale;
            snprintf(column, sizeof column, "%scov%zu%zu", prefix, j, k);
            expected = vector_table_number(fits, row, column);
            snprintf(column, sizeof column, "%scov%zu%zu", prefix, j, j);
            scale = vector_table_number(fits, row, column);
            snprintf(column, sizeof column, "%scov%zu%zu", prefix, k, k);
            scale = sqrt(scale * vector_table_number(fits, row, column));
            accuracy_observe_error(record, fabs(fitted->covariance[j][k] - expected) / scale,
                                   fitted->covariance[j][k], expected, "%s V[%zu][%zu]", set, j,
                                   k);
        }
    }
}

static void test_fits_against_references(void **state)
{
    vector_table *fits = vector_table_load("calibration_fits.tsv");
    vector_table *points = vector_table_load("calibration_points.tsv");
    fit_accuracy a = {
        ACCURACY_RECORD("exact data: parameters vs the chosen ones", CLAIM_TRUTH_PARAMETERS),
        ACCURACY_RECORD("exact data: residual (K)", CLAIM_EXACT_RESIDUAL_K),
        ACCURACY_RECORD("noisy data: parameters vs scipy curve_fit", CLAIM_SCIPY_PARAMETERS),
        ACCURACY_RECORD("noisy data: parameters vs mpmath", CLAIM_PARAMETERS),
        ACCURACY_RECORD("noisy data: covariance vs scipy curve_fit", CLAIM_SCIPY_COVARIANCE),
        ACCURACY_RECORD("noisy data: covariance vs mpmath", CLAIM_COVARIANCE),
        ACCURACY_RECORD("noisy data: residual vs mpmath (K)", CLAIM_RESIDUAL_K),
    };
    (void)state;
    assert_true(vector_table_rows(fits) >= 9);
    for (size_t row = 0; row < vector_table_rows(fits); ++row) {
        data_set set;
        gb_calibration fitted;
        gb_fit_summary summary;
        double residual[MAX_SET_POINTS];
        load_set(fits, row, points, &set);
        fit_set(&set, &fitted, &summary, residual);
        assert_int_equal(fitted.parameter_count, set.model == GB_CALIBRATION_BAND ? 2 : 3);
        assert_int_equal(summary.degrees_of_freedom,
                         (size_t)vector_table_number(fits, row, "degrees_of_freedom"));
        assert_int_equal(summary.weighted, (int)vector_table_number(fits, row, "weighted"));
        for (size_t j = 0; j < fitted.parameter_count; ++j) {
            char column[40];
            const char *name = parameter_names[set.model == GB_CALIBRATION_BAND][j];
            double got = fitted.parameter[j];
            if (set.exact) {
                snprintf(column, sizeof column, "truth_p%zu", j);
                accuracy_observe(&a.truth, got, vector_table_number(fits, row, column), "%s %s",
                                 set.name, name);
                continue;
            }
            snprintf(column, sizeof column, "p%zu", j);
            accuracy_observe(&a.scipy_parameters, got, vector_table_number(fits, row, column),
                             "%s %s", set.name, name);
            snprintf(column, sizeof column, "mp_p%zu", j);
            accuracy_observe(&a.mp_parameters, got, vector_table_number(fits, row, column),
                             "%s %s", set.name, name);
        }
        for (size_t i = 0; i < set.count; ++i) {
            accuracy_observe_absolute(set.exact ? &a.exact_residual : &a.residual, residual[i],
                                      set.exact ? 0.0 : set.expected_residual[i],
                                      "%s point %zu", set.name, i);
        }
        if (set.exact) {
            assert_true(summary.rms_residual_k <= CLAIM_EXACT_RESIDUAL_K);
            continue; /* the covariance of data without noise is rounding only */
        }
        observe_covariance(&a.scipy_covariance, &fitted, fits, row, "", set.name);
        observe_covariance(&a.mp_covariance, &fitted, fits, row, "mp_", set.name);
        assert_close(summary.rms_residual_k, vector_table_number(fits, row, "rms_residual_k"),
                     1e-7, "rms residual");
        assert_close(summary.chi_squared, vector_table_number(fits, row, "chi_squared"), 1e-7,
                     "chi squared");
    }
    accuracy_record *records[] = {&a.truth, &a.exact_residual, &a.scipy_parameters,
                                  &a.mp_parameters, &a.scipy_covariance, &a.mp_covariance,
                                  &a.residual};
    for (size_t r = 0; r < sizeof records / sizeof records[0]; ++r) {
        accuracy_report(records[r]);
    }
    for (size_t r = 0; r < sizeof records / sizeof records[0]; ++r) {
        accuracy_assert_claim(records[r]);
    }
    vector_table_free(fits);
    vector_table_free(points);
}

static void test_applying_a_fit(void **state)
{
    vector_table *fits = vector_table_load("calibration_fits.tsv");
    vector_table *points = vector_table_load("calibration_points.tsv");
    vector_table *applied = vector_table_load("calibration_apply.tsv");
    accuracy_record setpoints =
        ACCURACY_RECORD("exact data: applied T vs setpoint (K)", CLAIM_EXACT_RESIDUAL_K);
    accuracy_record temperatures =
        ACCURACY_RECORD("applied T vs mpmath (K)", CLAIM_RESIDUAL_K);
    accuracy_record uncertainties =
        ACCURACY_RECORD("applied u(T) vs mpmath", CLAIM_APPLIED_U);
    (void)state;
    for (size_t row = 0; row < vector_table_rows(fits); ++row) {
        data_set set;
        gb_calibration fitted;
        gb_fit_summary summary;
        load_set(fits, row, points, &set);
        fit_set(&set, &fitted, &summary, NULL);
        for (size_t i = 0; i < vector_table_rows(applied); ++i) {
            double signal, u_signal, t = UNTOUCHED_SENTINEL, u = UNTOUCHED_SENTINEL;
            if (strcmp(vector_table_text(applied, i, "set"), set.name) != 0) {
                continue;
            }
            signal = vector_table_number(applied, i, "signal");
            u_signal = vector_table_number(applied, i, "u_signal");
            assert_status(gb_calibration_apply(&fitted, signal, u_signal, &t, &u), GB_OK,
                          set.name);
            if (set.exact) {
                accuracy_observe_absolute(&setpoints, t,
                                          vector_table_number(applied, i, "temperature_k"),
                                          "%s S=%g", set.name, signal);
                continue; /* no uncertainty to speak of */
            }
            accuracy_observe_absolute(&temperatures, t,
                                      vector_table_number(applied, i, "temperature_k"),
                                      "%s S=%g", set.name, signal);
            accuracy_observe(&uncertainties, u,
                             vector_table_number(applied, i, "u_temperature_k"),
                             "%s S=%g u(S)=%g", set.name, signal, u_signal);
        }
    }
    accuracy_report(&setpoints);
    accuracy_report(&temperatures);
    accuracy_report(&uncertainties);
    accuracy_assert_claim(&setpoints);
    accuracy_assert_claim(&temperatures);
    accuracy_assert_claim(&uncertainties);
    vector_table_free(fits);
    vector_table_free(points);
    vector_table_free(applied);
}

/* The model itself: the exact sets' signals were computed by mpmath from the chosen parameters. */
static void test_model_signal_against_mpmath(void **state)
{
    vector_table *fits = vector_table_load("calibration_fits.tsv");
    vector_table *points = vector_table_load("calibration_points.tsv");
    accuracy_record record = ACCURACY_RECORD("model signal vs mpmath", 1e-13);
    (void)state;
    for (size_t row = 0; row < vector_table_rows(fits); ++row) {
        data_set set;
        gb_calibration truth;
        load_set(fits, row, points, &set);
        if (!set.exact) {
            continue;
        }
        memset(&truth, 0, sizeof truth);
        truth.model = set.model;
        truth.band = set.band;
        truth.parameter_count = set.model == GB_CALIBRATION_BAND ? 2 : 3;
        for (size_t j = 0; j < truth.parameter_count; ++j) {
            char column[40];
            snprintf(column, sizeof column, "truth_p%zu", j);
            truth.parameter[j] = vector_table_number(fits, row, column);
        }
        for (size_t i = 0; i < set.count; ++i) {
            double signal, slope, expected = set.points[i].signal;
            assert_status(gb_calibration_signal(&truth, set.points[i].temperature_k, &signal,
                                                &slope),
                          GB_OK, set.name);
            /* The data came from a source of emissivity eps: blackbody signal is S/eps (S-H)
             * or (S - offset)/eps + offset (band). */
            if (set.model == GB_CALIBRATION_SAKUMA_HATTORI) {
                expected /= set.emissivity;
            } else {
                expected = (expected - truth.parameter[1]) / set.emissivity + truth.parameter[1];
            }
            accuracy_observe(&record, signal, expected, "%s T=%g", set.name,
                             set.points[i].temperature_k);
            assert_true(slope > 0.0);
        }
    }
    accuracy_report(&record);
    accuracy_assert_claim(&record);
    vector_table_free(fits);
    vector_table_free(points);
}

/* ---------------------------------------------------------------- statuses ---- */

/* Four points on the Sakuma-Hattori curve A = 9.6 um, B = 120 um K, C = 1e5 (invented). */
static const gb_calibration_point good_points[] = {
    {273.15, 1.0, 0.0, 0.0}, {323.15, 2.0, 0.0, 0.0}, {373.15, 3.5, 0.0, 0.0},
    {473.15, 7.0, 0.0, 0.0}};

typedef struct fit_case {
    const char *what;
    gb_calibration_model model;
    double emissivity;
    gb_calibration_point points[6];
    size_t count;
    gb_status expected;
} fit_case;

#define P(t, s, ut, us) {t, s, ut, us}

static const fit_case fit_cases[] = {
    {"three points for three parameters", GB_CALIBRATION_SAKUMA_HATTORI, 1.0,
     {P(300, 1, 0, 0), P(400, 2, 0, 0), P(500, 3, 0, 0)}, 3, GB_ERR_CALIBRATION_TOO_FEW_POINTS},
    {"two points for the band model", GB_CALIBRATION_BAND, 1.0, {P(300, 1, 0, 0), P(400, 2, 0, 0)},
     2, GB_ERR_CALIBRATION_TOO_FEW_POINTS},
    {"no points", GB_CALIBRATION_BAND, 1.0, {P(300, 1, 0, 0)}, 0,
     GB_ERR_CALIBRATION_TOO_FEW_POINTS},
    {"all at one temperature", GB_CALIBRATION_SAKUMA_HATTORI, 1.0,
     {P(500, 1, 0, 0), P(500, 1.1, 0, 0), P(500, 0.9, 0, 0), P(500, 1.05, 0, 0)}, 4,
     GB_ERR_CALIBRATION_DEGENERATE},
    {"two temperatures for three parameters", GB_CALIBRATION_SAKUMA_HATTORI, 1.0,
     {P(500, 1, 0, 0), P(500, 1.1, 0, 0), P(600, 3, 0, 0), P(600, 3.1, 0, 0)}, 4,
     GB_ERR_CALIBRATION_DEGENERATE},
    {"band model at one temperature", GB_CALIBRATION_BAND, 1.0,
     {P(350, 10, 0, 0), P(350, 11, 0, 0), P(350, 12, 0, 0)}, 3, GB_ERR_CALIBRATION_DEGENERATE},
    {"signal falls between two points", GB_CALIBRATION_SAKUMA_HATTORI, 1.0,
     {P(300, 1, 0, 0), P(400, 2, 0, 0), P(500, 1.5, 0, 0), P(600, 4, 0, 0)}, 4,
     GB_ERR_CALIBRATION_NOT_MONOTONIC},
    {"equal signals at two temperatures", GB_CALIBRATION_BAND, 1.0,
     {P(300, 1, 0, 0), P(400, 2, 0, 0), P(500, 2, 0, 0)}, 3, GB_ERR_CALIBRATION_NOT_MONOTONIC},
    {"uncertainties for some points only", GB_CALIBRATION_SAKUMA_HATTORI, 1.0,
     {P(300, 1, 0, 0.01), P(400, 2, 0, 0.01), P(500, 3, 0, 0), P(600, 4, 0, 0.01)}, 4,
     GB_ERR_UNCERTAINTY_PARTIAL},
    {"zero signal under Sakuma-Hattori", GB_CALIBRATION_SAKUMA_HATTORI, 1.0,
     {P(300, 0, 0, 0), P(400, 2, 0, 0), P(500, 3, 0, 0), P(600, 4, 0, 0)}, 4,
     GB_ERR_SIGNAL_OUT_OF_RANGE},
    {"negative u(S)", GB_CALIBRATION_BAND, 1.0,
     {P(300, 1, 0, 0.1), P(400, 2, 0, -0.1), P(500, 3, 0, 0.1)}, 3, GB_ERR_UNCERTAINTY_DOMAIN},
    {"negative u(T)", GB_CALIBRATION_BAND, 1.0,
     {P(300, 1, -0.1, 0), P(400, 2, 0.1, 0), P(500, 3, 0.1, 0)}, 3, GB_ERR_UNCERTAINTY_DOMAIN},
    {"temperature of 0 K", GB_CALIBRATION_BAND, 1.0,
     {P(0, 1, 0, 0), P(400, 2, 0, 0), P(500, 3, 0, 0)}, 3, GB_ERR_TEMPERATURE_DOMAIN},
    {"signal not finite", GB_CALIBRATION_BAND, 1.0,
     {P(300, 1, 0, 0), P(400, INFINITY, 0, 0), P(500, 3, 0, 0)}, 3, GB_ERR_NOT_FINITE},
    /* The line through these three misses the coldest point so far that its signal lies
     * below the fitted offset: the calibration cannot convert its own point. */
    {"a point below the fitted offset", GB_CALIBRATION_BAND, 1.0,
     {P(100, 1, 0, 0), P(300, 1000, 0, 0), P(400, 1001, 0, 0)}, 3, GB_ERR_CALIBRATION_NO_FIT},
    {"source emissivity 0", GB_CALIBRATION_BAND, 0.0,
     {P(300, 1, 0, 0), P(400, 2, 0, 0), P(500, 3, 0, 0)}, 3, GB_ERR_EMISSIVITY_DOMAIN},
    {"source emissivity above 1", GB_CALIBRATION_SAKUMA_HATTORI, 1.01,
     {P(300, 1, 0, 0), P(400, 2, 0, 0), P(500, 3, 0, 0), P(600, 4, 0, 0)}, 4,
     GB_ERR_EMISSIVITY_DOMAIN},
};

static void test_fit_statuses(void **state)
{
    gb_band band = {GB_BAND_WAVELENGTH, 8.0, 14.0, NULL, NULL, 0};
    (void)state;
    for (size_t i = 0; i < sizeof fit_cases / sizeof fit_cases[0]; ++i) {
        const fit_case *c = &fit_cases[i];
        gb_calibration calibration;
        gb_fit_summary summary;
        double residual[6] = {UNTOUCHED_SENTINEL};
        memset(&calibration, 0, sizeof calibration);
        calibration.parameter[0] = UNTOUCHED_SENTINEL;
        summary.rms_residual_k = UNTOUCHED_SENTINEL;
        assert_status(gb_calibration_fit(c->model, &band, c->emissivity, c->points, c->count,
                                         &calibration, &summary, residual),
                      c->expected, c->what);
        assert_true(calibration.parameter[0] == UNTOUCHED_SENTINEL);
        assert_true(summary.rms_residual_k == UNTOUCHED_SENTINEL);
        assert_true(residual[0] == UNTOUCHED_SENTINEL);
    }
}

static void test_reversal_names_the_points(void **state)
{
    const gb_calibration_point points[] = {
        P(300, 1, 0, 0), P(400, 2, 0, 0), P(500, 1.5, 0, 0), P(600, 4, 0, 0)};
    size_t cooler = 99, warmer = 99;
    (void)state;
    assert_status(gb_calibration_find_reversal(points, 4, &cooler, &warmer),
                  GB_ERR_CALIBRATION_NOT_MONOTONIC, "reversal");
    assert_int_equal(cooler, 1); /* 400 K gives 2, more than 500 K's 1.5 */
    assert_int_equal(warmer, 2);
    assert_status(gb_calibration_find_reversal(good_points, 4, &cooler, &warmer), GB_OK,
                  "rising signal");
}

/* A well-formed Sakuma-Hattori calibration (invented numbers). */
static gb_calibration sample_calibration(void)
{
    gb_calibration c;
    memset(&c, 0, sizeof c);
    c.model = GB_CALIBRATION_SAKUMA_HATTORI;
    c.parameter_count = 3;
    c.parameter[0] = 9.6;
    c.parameter[1] = 120.0;
    c.parameter[2] = 1e5;
    c.covariance[0][0] = 1e-4;
    c.covariance[1][1] = 1.0;
    c.covariance[2][2] = 1e4;
    c.covariance[0][1] = c.covariance[1][0] = -0.009; /* correlation -0.9 */
    return c;
}

static void test_check_and_apply_statuses(void **state)
{
    gb_calibration c = sample_calibration();
    double t = UNTOUCHED_SENTINEL, u = UNTOUCHED_SENTINEL;
    (void)state;
    assert_status(gb_calibration_check(&c), GB_OK, "well formed");
    assert_status(gb_calibration_check(NULL), GB_ERR_INVALID_ARGUMENT, "NULL");

    c = sample_calibration();
    c.parameter[0] = -9.6;
    assert_status(gb_calibration_check(&c), GB_ERR_INVALID_ARGUMENT, "A below 0");
    assert_status(gb_calibration_apply(&c, 10.0, 0.0, &t, &u), GB_ERR_INVALID_ARGUMENT,
                  "apply with A below 0");
    c = sample_calibration();
    c.parameter[2] = 0.0;
    assert_status(gb_calibration_check(&c), GB_ERR_INVALID_ARGUMENT, "C of 0");
    c = sample_calibration();
    c.parameter_count = 2;
    assert_status(gb_calibration_check(&c), GB_ERR_INVALID_ARGUMENT, "two parameters for S-H");
    assert_status(gb_calibration_apply(&c, 10.0, 0.0, &t, &u), GB_ERR_INVALID_ARGUMENT,
                  "apply with two parameters for S-H");
    c = sample_calibration();
    c.parameter[1] = NAN;
    assert_status(gb_calibration_check(&c), GB_ERR_NOT_FINITE, "B not finite");
    c = sample_calibration();
    c.covariance[1][1] = -1.0;
    assert_status(gb_calibration_check(&c), GB_ERR_UNCERTAINTY_DOMAIN, "negative variance");
    c = sample_calibration();
    c.covariance[1][0] = 0.009;
    assert_status(gb_calibration_check(&c), GB_ERR_UNCERTAINTY_DOMAIN, "not symmetric");
    c = sample_calibration();
    c.covariance[0][1] = c.covariance[1][0] = -0.0101; /* correlation -1.01 */
    assert_status(gb_calibration_check(&c), GB_ERR_UNCERTAINTY_DOMAIN, "correlation beyond 1");
    c = sample_calibration();
    /* Pairwise correlations 0.9, 0.9 and -0.9 cannot hold together (determinant < 0). */
    c.covariance[0][1] = c.covariance[1][0] = 0.9 * sqrt(1e-4 * 1.0);
    c.covariance[0][2] = c.covariance[2][0] = 0.9 * sqrt(1e-4 * 1e4);
    c.covariance[1][2] = c.covariance[2][1] = -0.9 * sqrt(1.0 * 1e4);
    assert_status(gb_calibration_check(&c), GB_ERR_UNCERTAINTY_DOMAIN, "not semi-definite");

    c = sample_calibration();
    c.model = GB_CALIBRATION_BAND;
    c.parameter_count = 2;
    c.band.kind = GB_BAND_WAVELENGTH;
    c.band.lower = 14.0;
    c.band.upper = 8.0;
    assert_status(gb_calibration_check(&c), GB_ERR_BAND_REVERSED, "band reversed");

    c = sample_calibration();
    t = u = UNTOUCHED_SENTINEL;
    assert_status(gb_calibration_apply(&c, 0.0, 0.0, &t, &u), GB_ERR_SIGNAL_OUT_OF_RANGE,
                  "zero signal");
    assert_status(gb_calibration_apply(&c, 10.0, -1.0, &t, &u), GB_ERR_UNCERTAINTY_DOMAIN,
                  "negative u(S)");
    assert_status(gb_calibration_apply(&c, NAN, 0.0, &t, &u), GB_ERR_NOT_FINITE, "NaN signal");
    assert_true(t == UNTOUCHED_SENTINEL && u == UNTOUCHED_SENTINEL);

    c.model = GB_CALIBRATION_BAND;
    c.parameter_count = 2;
    c.band.kind = GB_BAND_WAVELENGTH;
    c.band.lower = 8.0;
    c.band.upper = 14.0;
    c.parameter[0] = 850.0;
    c.parameter[1] = 1200.0;
    assert_status(gb_calibration_apply(&c, 1200.0, 0.0, &t, &u), GB_ERR_SIGNAL_OUT_OF_RANGE,
                  "band signal at the offset");
    assert_status(gb_calibration_apply(&c, 900.0, 0.0, &t, &u), GB_ERR_SIGNAL_OUT_OF_RANGE,
                  "band signal below the offset");
    assert_true(t == UNTOUCHED_SENTINEL && u == UNTOUCHED_SENTINEL);
}

/*
 * Closed form of the Sakuma-Hattori inverse and its uncertainty, by hand:
 * with A = 9.6, B = 120, C = 1e5 and S = C / (e^5 - 1), T = (c2 / 5 - B) / A
 * (c2 = 14387.768775039338 um K, CODATA 2018), and with only u(B) = 1 um K,
 * u(T) = u(B) / A exactly.
 */
static void test_sakuma_hattori_inverse_by_hand(void **state)
{
    const double c2 = 14387.768775039338;
    gb_calibration c;
    double t, u;
    (void)state;
    memset(&c, 0, sizeof c);
    c.model = GB_CALIBRATION_SAKUMA_HATTORI;
    c.parameter_count = 3;
    c.parameter[0] = 9.6;
    c.parameter[1] = 120.0;
    c.parameter[2] = 1e5;
    c.covariance[1][1] = 1.0;
    assert_status(gb_calibration_apply(&c, 1e5 / expm1(5.0), 0.0, &t, &u), GB_OK, "by hand");
    assert_close(t, (c2 / 5.0 - 120.0) / 9.6, 1e-14, "T by hand");
    assert_close(u, 1.0 / 9.6, 1e-14, "u(T) from u(B) alone");
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_fits_against_references),
        cmocka_unit_test(test_applying_a_fit),
        cmocka_unit_test(test_model_signal_against_mpmath),
        cmocka_unit_test(test_fit_statuses),
        cmocka_unit_test(test_reversal_names_the_points),
        cmocka_unit_test(test_check_and_apply_statuses),
        cmocka_unit_test(test_sakuma_hattori_inverse_by_hand),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
