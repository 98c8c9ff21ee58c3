/*
 * calibration.h — a radiation thermometer's calibration: fitted from
 * reference-source points, then applied to the instrument's signals.
 *
 * Models (signal S in the instrument's own units, T in K):
 *   GB_CALIBRATION_SAKUMA_HATTORI  S = C / (exp(c2 / (A T + B)) - 1)
 *       (F. Sakuma and S. Hattori, 1982, the interpolation equation of
 *       radiation thermometry); A in um, B in um K, C in signal units.
 *   GB_CALIBRATION_BAND            S = gain L_band(T) + offset, with the exact
 *       band or response-curve radiance of band.h; gain in signal units per
 *       W m^-2 sr^-1, offset in signal units.
 * During the fit the source's emissivity eps_s multiplies the radiance term
 * (the source emits eps_s L); the fitted calibration describes the
 * instrument seeing a blackbody, so applying it gives blackbody-equivalent
 * temperatures.
 *
 * Fit: weighted least squares by Levenberg-Marquardt (Marquardt, 1963) with
 * the Jacobian in closed form and parameters scaled by the diagonal of the
 * normal matrix.  Starting values: for Sakuma-Hattori a straight-line fit of
 * ln S against 1/T (Wien's approximation) for A and C, B = 0; for the band
 * model the unweighted linear solution.  Weights: when every point has an
 * uncertainty, sigma_i^2 = u(S_i)^2 + (dS/dT u(T_i))^2 (effective variance,
 * updated as the fit moves) and the covariance is (J^T W J)^-1 (uncertainties
 * taken as absolute); when no point has one, all weights are 1 and the
 * covariance is (J^T J)^-1 s^2 with s^2 = SSR / (n - p), as scipy's
 * curve_fit does by default.
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
    int iterations;
} gb_fit_summary;

/*
 * Fits `model` to `count` points.  residual_k (may be NULL) receives, for each
 * point, T_fit(S_i) - T_i.  Statuses: GB_ERR_CALIBRATION_TOO_FEW_POINTS
 * (count < p + 1), GB_ERR_CALIBRATION_DEGENERATE (fewer than p distinct
 * temperatures), GB_ERR_CALIBRATION_NOT_MONOTONIC, GB_ERR_UNCERTAINTY_PARTIAL,
 * GB_ERR_CALIBRATION_NO_FIT, and the usual domain statuses for a point
 * (temperature, signal finite and > 0 for Sakuma-Hattori, u >= 0) or the
 * emissivity.  `band` is used by the band model only (may be NULL otherwise).
 */
gb_status gb_calibration_fit(gb_calibration_model model, const gb_band *band,
                             double source_emissivity, const gb_calibration_point *points,
                             size_t count, gb_calibration *calibration, gb_fit_summary *summary,
                             double *residual_k);

/* Signal -> blackbody-equivalent temperature and its standard uncertainty. */
gb_status gb_calibration_apply(const gb_calibration *calibration, double signal,
                               double u_signal, double *temperature_k, double *u_temperature_k);

/* The model's signal at T (blackbody source), and dS/dT; for tests and plots. */
gb_status gb_calibration_signal(const gb_calibration *calibration, double temperature_k,
                                double *signal, double *derivative);

#endif
