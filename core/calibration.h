/*
 * calibration.h — a radiation thermometer's calibration: fitted from
 * reference-source points, then applied to the instrument's signals.
 *
 * Models (signal S in the instrument's own units, T in K):
 *   GB_CALIBRATION_SAKUMA_HATTORI  S = C / (exp(c2 / (A T + B)) - 1)
 *       (F. Sakuma and S. Hattori, 1982, the interpolation equation of
 *       radiation thermometry; from memory: Temperature, Its Measurement and
 *       Control in Science and Industry, vol. 5, pp. 421-427); A in um,
 *       B in um K, C in signal units; c2 = hc/k (CODATA 2018).
 *   GB_CALIBRATION_BAND            S = gain L_band(T) + offset, with the exact
 *       band or response-curve radiance of band.h; gain in signal units per
 *       W m^-2 sr^-1, offset in signal units.
 * During the fit the source's emissivity eps_s multiplies the radiance term
 * (the source emits eps_s L); the fitted calibration describes the
 * instrument seeing a blackbody, so applying it gives blackbody-equivalent
 * temperatures.
 *
 * Fit: weighted least squares in the signal, sum of w_i (S_i - S(T_i))^2.
 * Levenberg-Marquardt (Marquardt, 1963) with the Jacobian in closed form,
 * steps scaled by the diagonal of the normal matrix, and variable projection
 * (Golub and Pereyra, 1973): the parameters the model is linear in (C; gain
 * and offset) are re-solved exactly after every step, which removes the long
 * curved A-B-C valley that makes plain Levenberg-Marquardt crawl on
 * Sakuma-Hattori data.  The band model is linear, so its fit is direct.
 * Starting values: Sakuma-Hattori from a straight line of ln S against 1/T
 * (Wien's approximation) for A and C, B = 0.  The fit ends when an accepted
 * near-Gauss-Newton step improves the sum of squares by less than 1e-14 of
 * it, or no step improves it at all; 200 iterations without that is
 * GB_ERR_CALIBRATION_NO_FIT.
 * Weights and covariance:
 *   - no point has an uncertainty: w_i = 1 and the covariance is
 *     (J^T J)^-1 s^2 with s^2 = SSR / (n - p), as scipy.optimize.curve_fit
 *     does by default;
 *   - every point has one (u(S_i) > 0 or u(T_i) > 0): effective variance,
 *     w_i = 1 / (u(S_i)^2 + (dS/dT u(T_i))^2) (J. Orear, Am. J. Phys. 50,
 *     912, 1982; from memory), and the covariance (J^T W J)^-1, uncertainties
 *     taken as absolute (curve_fit's absolute_sigma=True).  When some u(T_i)
 *     > 0 the weights depend on the fit: it is repeated with the weights of
 *     the previous result until no weight moves by more than 1e-10 (at most
 *     60 rounds, else GB_ERR_CALIBRATION_NO_FIT);
 *   - some points have one and others not: GB_ERR_UNCERTAINTY_PARTIAL (a zero
 *     uncertainty counts as not given).
 * The covariance comes from a Householder QR factorization of the scaled
 * Jacobian (R^-1 R^-T), not from inverting J^T J.
 * Measured in tests/unit/test_calibration.c on invented data sets (tests/
 * reference/calibration.py): against 40-digit mpmath solutions, parameters to
 * 1.3e-12 relative, covariance entries to 5.5e-12 of sqrt(V_jj V_kk),
 * residuals and applied temperatures to 2.2e-12 K, applied u(T) to 8e-11
 * relative; against scipy.optimize.curve_fit (analytic Jacobian, tolerances
 * 1e-15), 3.0e-9 and 9.2e-10, which is curve_fit's own distance from the
 * mpmath answer; parameters of points made with the exact model come back to
 * 1.9e-13 relative and their residuals are below 1.2e-12 K.
 *
 * Apply: S -> T in closed form for Sakuma-Hattori (T = (c2 / ln(1 + C/S) - B)/A),
 * by band inversion for the band model; u(T)^2 = (dT/dS)^2 u(S)^2 +
 * g^T V g, g = dT/dparameters, V the fitted covariance (GUM 5.2, JCGM
 * 100:2008, correlated inputs).
 */
#ifndef GREYBODY_CALIBRATION_H
#define GREYBODY_CALIBRATION_H

#include <stddef.h>

#include "band.h"
#include "status.h"

#define GB_CALIBRATION_MAX_POINTS 1000
#define GB_CALIBRATION_MAX_PARAMETERS 3

typedef enum gb_calibration_model {
    GB_CALIBRATION_SAKUMA_HATTORI = 0,
    GB_CALIBRATION_BAND
} gb_calibration_model;

typedef struct gb_calibration_point {
    double temperature_k;
    double signal;
    double u_temperature_k; /* 0 when not known */
    double u_signal;        /* 0 when not known */
} gb_calibration_point;

typedef struct gb_calibration {
    gb_calibration_model model;
    gb_band band; /* GB_CALIBRATION_BAND: the band (its response arrays stay the caller's) */
    size_t parameter_count;                    /* 3 (A, B, C) or 2 (gain, offset) */
    double parameter[GB_CALIBRATION_MAX_PARAMETERS];
    double covariance[GB_CALIBRATION_MAX_PARAMETERS][GB_CALIBRATION_MAX_PARAMETERS];
} gb_calibration;

typedef struct gb_fit_summary {
    double rms_residual_k;       /* root mean square of the residuals in kelvin */
    double chi_squared;          /* weighted sum of squared signal residuals */
    size_t degrees_of_freedom;   /* n - p */
    int weighted;                /* 1 when point uncertainties were used */
    int iterations;              /* Levenberg-Marquardt steps tried, all rounds */
} gb_fit_summary;

/*
 * Fits `model` to `count` points.  residual_k (may be NULL) receives, for each
 * point, T_fit(S_i) - T_i, with S_i taken back to a blackbody source.
 * Statuses, in the order they are checked: the emissivity's domain;
 * GB_ERR_CALIBRATION_TOO_FEW_POINTS (count < p + 1: one degree of freedom at
 * least); a point's own statuses (gb_calibration_check_point);
 * GB_ERR_CALIBRATION_NOT_MONOTONIC (the signal does not rise strictly with
 * temperature between two points); GB_ERR_CALIBRATION_DEGENERATE (fewer than
 * p distinct temperatures, or a rank-deficient Jacobian);
 * GB_ERR_UNCERTAINTY_PARTIAL; GB_ERR_CALIBRATION_NO_FIT (no convergence, a
 * result outside the model's domain, or a point whose signal the result
 * cannot convert back, such as one below the fitted offset); GB_ERR_INVALID_ARGUMENT for NULL
 * pointers or more than GB_CALIBRATION_MAX_POINTS points.  `band` is used by
 * the band model only (may be NULL otherwise).
 */
gb_status gb_calibration_fit(gb_calibration_model model, const gb_band *band,
                             double source_emissivity, const gb_calibration_point *points,
                             size_t count, gb_calibration *calibration, gb_fit_summary *summary,
                             double *residual_k);

/*
 * One point's own domain: temperature (gb_check_temperature), finite signal
 * and uncertainties (GB_ERR_NOT_FINITE), signal > 0 for Sakuma-Hattori
 * (GB_ERR_SIGNAL_OUT_OF_RANGE), uncertainties >= 0 (GB_ERR_UNCERTAINTY_DOMAIN).
 */
gb_status gb_calibration_check_point(gb_calibration_model model, const gb_calibration_point *point);

/*
 * GB_OK when the signal rises strictly with temperature between every two
 * points; otherwise GB_ERR_CALIBRATION_NOT_MONOTONIC with the indices of a
 * cooler point whose signal is not below that of a warmer one.
 */
gb_status gb_calibration_find_reversal(const gb_calibration_point *points, size_t count,
                                       size_t *cooler, size_t *warmer);

/*
 * Whether a calibration not made by gb_calibration_fit (one read back from a
 * file or a request) can be applied: GB_ERR_INVALID_ARGUMENT for an unknown
 * model, a parameter count other than 3 or 2, or parameters outside the
 * model's domain (A > 0 and C > 0; gain > 0); GB_ERR_NOT_FINITE; the band's
 * statuses (gb_band_validate); GB_ERR_UNCERTAINTY_DOMAIN for a covariance
 * that is not symmetric positive semi-definite to a rounding of 1e-9 (a
 * negative variance, a correlation beyond +-1, a negative determinant of the
 * correlation matrix).
 */
gb_status gb_calibration_check(const gb_calibration *calibration);

/*
 * Signal -> blackbody-equivalent temperature and its standard uncertainty.
 * GB_ERR_SIGNAL_OUT_OF_RANGE when no temperature gives the signal (S <= 0 for
 * Sakuma-Hattori, S <= offset or beyond the band solver's range for the band
 * model); GB_ERR_INVALID_ARGUMENT for parameters outside the model's domain
 * (check a calibration of unknown origin with gb_calibration_check first).
 */
gb_status gb_calibration_apply(const gb_calibration *calibration, double signal,
                               double u_signal, double *temperature_k, double *u_temperature_k);

/* The model's signal at T (blackbody source), and dS/dT (may be NULL); for tests and plots. */
gb_status gb_calibration_signal(const gb_calibration *calibration, double temperature_k,
                                double *signal, double *derivative);

#endif
