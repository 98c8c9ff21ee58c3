#include "calibration.h"

#include <math.h>
#include <string.h>

#include "constants.h"
#include "planck.h"

#define MAX_ITERATIONS 200
#define INITIAL_DAMPING 1e-3
#define MAX_DAMPING 1e16
#define RELATIVE_IMPROVEMENT 1e-14
#define RELATIVE_STEP 1e-13

enum { SH_A = 0, SH_B = 1, SH_C = 2 };
enum { BAND_GAIN = 0, BAND_OFFSET = 1 };

typedef double matrix[GB_CALIBRATION_MAX_PARAMETERS][GB_CALIBRATION_MAX_PARAMETERS];

/* Model signal, its gradient with respect to the parameters, and dS/dT. */
static gb_status model_at(const gb_calibration *c, double emissivity, double temperature_k,
                          double *signal, double gradient[GB_CALIBRATION_MAX_PARAMETERS],
                          double *derivative)
{
    if (c->model == GB_CALIBRATION_SAKUMA_HATTORI) {
        double a = c->parameter[SH_A], b = c->parameter[SH_B], scale = c->parameter[SH_C];
        double effective = a * temperature_k + b;
        double x, denominator, dsdx;
        if (!(effective > 0.0)) {
            return GB_ERR_SIGNAL_OUT_OF_RANGE;
        }
        x = GB_C2_UM / effective;
        denominator = expm1(x);
        if (!(denominator > 0.0) || !isfinite(denominator)) {
            return GB_ERR_SIGNAL_OUT_OF_RANGE;
        }
        *signal = emissivity * scale / denominator;
        dsdx = -*signal * (denominator + 1.0) / denominator;
        gradient[SH_A] = dsdx * (-x * temperature_k / effective);
        gradient[SH_B] = dsdx * (-x / effective);
        gradient[SH_C] = emissivity / denominator;
        *derivative = dsdx * (-x * a / effective);
        return GB_OK;
    }
    {
        double radiance, slope;
        gb_status status = gb_band_radiance(&c->band, temperature_k, &radiance, &slope);
        if (status != GB_OK) {
            return status;
        }
        *signal = c->parameter[BAND_GAIN] * emissivity * radiance + c->parameter[BAND_OFFSET];
        gradient[BAND_GAIN] = emissivity * radiance;
        gradient[BAND_OFFSET] = 1.0;
        *derivative = c->parameter[BAND_GAIN] * emissivity * slope;
        return GB_OK;
    }
}

/*
 * Solves (M + damping diag(M)) x = v for a symmetric positive semi-definite
 * M, scaled to unit diagonal first so that parameters of very different
 * sizes (A ~ 1 um, C ~ 1e9 counts) do not ruin the pivots.  With `inverse`
 * not NULL and damping 0, also writes M^-1.  Returns 0 when M is singular.
 */
static int solve_scaled(size_t n, matrix m, const double *v, double damping, double *x,
                        matrix inverse)
{
    double scale[GB_CALIBRATION_MAX_PARAMETERS];
    double a[GB_CALIBRATION_MAX_PARAMETERS][2 * GB_CALIBRATION_MAX_PARAMETERS + 1];
    size_t width = 2 * n + 1;
    for (size_t i = 0; i < n; ++i) {
        if (!(m[i][i] > 0.0)) {
            return 0;
        }
        scale[i] = sqrt(m[i][i]);
    }
    for (size_t i = 0; i < n; ++i) {
        for (size_t j = 0; j < n; ++j) {
            a[i][j] = m[i][j] / (scale[i] * scale[j]) + (i == j ? damping : 0.0);
            a[i][n + j] = i == j ? 1.0 : 0.0;
        }
        a[i][2 * n] = v[i] / scale[i];
    }
    for (size_t col = 0; col < n; ++col) {
        size_t pivot = col;
        for (size_t row = col + 1; row < n; ++row) {
            if (fabs(a[row][col]) > fabs(a[pivot][col])) {
                pivot = row;
            }
        }
        if (!(fabs(a[pivot][col]) > 1e-14)) {
            return 0;
        }
        for (size_t k = 0; k < width; ++k) {
            double swap = a[col][k];
            a[col][k] = a[pivot][k];
            a[pivot][k] = swap;
        }
        for (size_t row = 0; row < n; ++row) {
            double factor;
            if (row == col) {
                continue;
            }
            factor = a[row][col] / a[col][col];
            for (size_t k = col; k < width; ++k) {
                a[row][k] -= factor * a[col][k];
            }
        }
    }
    for (size_t i = 0; i < n; ++i) {
        x[i] = a[i][2 * n] / a[i][i] / scale[i];
        if (inverse != NULL) {
            for (size_t j = 0; j < n; ++j) {
                inverse[i][j] = a[i][n + j] / a[i][i] / (scale[i] * scale[j]);
            }
        }
    }
    return 1;
}

struct fit_state {
    const gb_calibration_point *points;
    size_t count;
    double emissivity;
    int weighted;
};

/* Weighted sum of squares and the normal equations at the calibration's parameters. */
static gb_status normal_equations(const struct fit_state *fit, const gb_calibration *c,
                                  double *sum_of_squares, matrix m, double *v)
{
    size_t n = c->parameter_count;
    double total = 0.0;
    memset(m, 0, sizeof(matrix));
    memset(v, 0, n * sizeof v[0]);
    for (size_t i = 0; i < fit->count; ++i) {
        const gb_calibration_point *point = &fit->points[i];
        double signal, derivative, residual, weight = 1.0;
        double gradient[GB_CALIBRATION_MAX_PARAMETERS];
        gb_status status =
            model_at(c, fit->emissivity, point->temperature_k, &signal, gradient, &derivative);
        if (status != GB_OK) {
            return status;
        }
        if (fit->weighted) {
            double spread = derivative * point->u_temperature_k;
            weight = 1.0 / (point->u_signal * point->u_signal + spread * spread);
        }
        residual = point->signal - signal;
        total += weight * residual * residual;
        for (size_t j = 0; j < n; ++j) {
            v[j] += weight * gradient[j] * residual;
            for (size_t k = 0; k < n; ++k) {
                m[j][k] += weight * gradient[j] * gradient[k];
            }
        }
    }
    if (!isfinite(total)) {
        return GB_ERR_CALIBRATION_NO_FIT;
    }
    *sum_of_squares = total;
    return GB_OK;
}

static gb_status levenberg_marquardt(const struct fit_state *fit, gb_calibration *c,
                                     double *sum_of_squares, int *iterations)
{
    size_t n = c->parameter_count;
    double damping = INITIAL_DAMPING, current;
    matrix m;
    double v[GB_CALIBRATION_MAX_PARAMETERS];
    gb_status status = normal_equations(fit, c, &current, m, v);
    if (status != GB_OK) {
        return GB_ERR_CALIBRATION_NO_FIT;
    }
    for (int iteration = 1; iteration <= MAX_ITERATIONS; ++iteration) {
        double step[GB_CALIBRATION_MAX_PARAMETERS], trial_sum;
        matrix trial_m;
        double trial_v[GB_CALIBRATION_MAX_PARAMETERS];
        gb_calibration trial = *c;
        int small_step = 1;
        *iterations = iteration;
        if (!solve_scaled(n, m, v, damping, step, NULL)) {
            return GB_ERR_CALIBRATION_DEGENERATE;
        }
        for (size_t j = 0; j < n; ++j) {
            trial.parameter[j] += step[j];
            small_step &= fabs(step[j]) <= RELATIVE_STEP * (fabs(c->parameter[j]) + 1e-300);
        }
        status = normal_equations(fit, &trial, &trial_sum, trial_m, trial_v);
        if (status == GB_OK && trial_sum <= current) {
            int converged = small_step || current - trial_sum <= RELATIVE_IMPROVEMENT * current;
            *c = trial;
            current = trial_sum;
            memcpy(m, trial_m, sizeof(matrix));
            memcpy(v, trial_v, sizeof v);
            damping = fmax(damping / 10.0, 1e-15);
            if (converged) {
                break;
            }
        } else {
            damping *= 10.0;
            if (damping > MAX_DAMPING || small_step) {
                break; /* no step improves the fit: we are at the minimum */
            }
        }
    }
    *sum_of_squares = current;
    return GB_OK;
}

static gb_status check_points(gb_calibration_model model, const gb_calibration_point *points,
                              size_t count, size_t parameters, int *weighted)
{
    size_t with_uncertainty = 0, distinct = 0;
    if (points == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    if (count < parameters + 1) {
        return GB_ERR_CALIBRATION_TOO_FEW_POINTS;
    }
    if (count > GB_CALIBRATION_MAX_POINTS) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    for (size_t i = 0; i < count; ++i) {
        const gb_calibration_point *p = &points[i];
        int seen = 0;
        gb_status status = gb_check_temperature(p->temperature_k);
        if (status != GB_OK) {
            return status;
        }
        if (!isfinite(p->signal) || !isfinite(p->u_signal) || !isfinite(p->u_temperature_k)) {
            return GB_ERR_NOT_FINITE;
        }
        if (model == GB_CALIBRATION_SAKUMA_HATTORI && !(p->signal > 0.0)) {
            return GB_ERR_SIGNAL_OUT_OF_RANGE;
        }
        if (p->u_signal < 0.0 || p->u_temperature_k < 0.0) {
            return GB_ERR_UNCERTAINTY_DOMAIN;
        }
        with_uncertainty += (p->u_signal > 0.0 || p->u_temperature_k > 0.0);
        for (size_t j = 0; j < count; ++j) {
            const gb_calibration_point *q = &points[j];
            if (p->temperature_k < q->temperature_k && !(p->signal < q->signal)) {
                return GB_ERR_CALIBRATION_NOT_MONOTONIC;
            }
            seen |= j < i && q->temperature_k == p->temperature_k;
        }
        distinct += !seen;
    }
    if (distinct < parameters) {
        return GB_ERR_CALIBRATION_DEGENERATE;
    }
    if (with_uncertainty != 0 && with_uncertainty != count) {
        return GB_ERR_UNCERTAINTY_PARTIAL;
    }
    *weighted = with_uncertainty == count;
    return GB_OK;
}

/* Least squares line y = intercept + slope x, unweighted. */
static int fit_line(const double *x, const double *y, size_t n, double *slope, double *intercept)
{
    double mean_x = 0.0, mean_y = 0.0, sxx = 0.0, sxy = 0.0;
    for (size_t i = 0; i < n; ++i) {
        mean_x += x[i] / (double)n;
        mean_y += y[i] / (double)n;
    }
    for (size_t i = 0; i < n; ++i) {
        sxx += (x[i] - mean_x) * (x[i] - mean_x);
        sxy += (x[i] - mean_x) * (y[i] - mean_y);
    }
    if (!(sxx > 0.0)) {
        return 0;
    }
    *slope = sxy / sxx;
    *intercept = mean_y - *slope * mean_x;
    return 1;
}

static gb_status starting_values(const struct fit_state *fit, gb_calibration *c)
{
    double x[GB_CALIBRATION_MAX_POINTS], y[GB_CALIBRATION_MAX_POINTS], slope, intercept;
    for (size_t i = 0; i < fit->count; ++i) {
        const gb_calibration_point *p = &fit->points[i];
        if (c->model == GB_CALIBRATION_SAKUMA_HATTORI) {
            /* Wien: ln(S/eps) = ln C - c2 / (A T). */
            x[i] = 1.0 / p->temperature_k;
            y[i] = log(p->signal / fit->emissivity);
        } else {
            double radiance;
            gb_status status = gb_band_radiance(&c->band, p->temperature_k, &radiance, NULL);
            if (status != GB_OK) {
                return status;
            }
            x[i] = fit->emissivity * radiance;
            y[i] = p->signal;
        }
    }
    if (!fit_line(x, y, fit->count, &slope, &intercept)) {
        return GB_ERR_CALIBRATION_DEGENERATE;
    }
    if (c->model == GB_CALIBRATION_SAKUMA_HATTORI) {
        if (!(slope < 0.0)) {
            return GB_ERR_CALIBRATION_NO_FIT;
        }
        c->parameter[SH_A] = -GB_C2_UM / slope;
        c->parameter[SH_B] = 0.0;
        c->parameter[SH_C] = exp(intercept);
    } else {
        c->parameter[BAND_GAIN] = slope;
        c->parameter[BAND_OFFSET] = intercept;
    }
    return GB_OK;
}

/* The signal the instrument would give for a blackbody at the point's temperature. */
static double blackbody_signal(const gb_calibration *c, double signal, double emissivity)
{
    if (c->model == GB_CALIBRATION_SAKUMA_HATTORI) {
        return signal / emissivity;
    }
    return (signal - c->parameter[BAND_OFFSET]) / emissivity + c->parameter[BAND_OFFSET];
}

gb_status gb_calibration_fit(gb_calibration_model model, const gb_band *band,
                             double source_emissivity, const gb_calibration_point *points,
                             size_t count, gb_calibration *calibration, gb_fit_summary *summary,
                             double *residual_k)
{
    gb_calibration c;
    gb_fit_summary result = {0};
    struct fit_state fit = {points, count, source_emissivity, 0};
    double sum_of_squares, rms = 0.0, no_step[GB_CALIBRATION_MAX_PARAMETERS];
    matrix m, inverse;
    double v[GB_CALIBRATION_MAX_PARAMETERS];
    gb_status status;
    if (calibration == NULL || summary == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    memset(&c, 0, sizeof c);
    c.model = model;
    if (model == GB_CALIBRATION_SAKUMA_HATTORI) {
        c.parameter_count = 3;
    } else if (model == GB_CALIBRATION_BAND) {
        c.parameter_count = 2;
        status = gb_band_validate(band);
        if (status != GB_OK) {
            return status;
        }
        c.band = *band;
    } else {
        return GB_ERR_INVALID_ARGUMENT;
    }
    status = gb_check_emissivity(source_emissivity);
    if (status == GB_OK) {
        status = check_points(model, points, count, c.parameter_count, &fit.weighted);
    }
    if (status == GB_OK) {
        status = starting_values(&fit, &c);
    }
    if (status == GB_OK) {
        status = levenberg_marquardt(&fit, &c, &sum_of_squares, &result.iterations);
    }
    if (status == GB_OK) {
        status = normal_equations(&fit, &c, &sum_of_squares, m, v);
    }
    if (status != GB_OK) {
        return status == GB_ERR_SIGNAL_OUT_OF_RANGE ? GB_ERR_CALIBRATION_NO_FIT : status;
    }
    if (!solve_scaled(c.parameter_count, m, v, 0.0, no_step, inverse)) {
        return GB_ERR_CALIBRATION_DEGENERATE;
    }
    result.degrees_of_freedom = count - c.parameter_count;
    result.chi_squared = sum_of_squares;
    result.weighted = fit.weighted;
    for (size_t j = 0; j < c.parameter_count; ++j) {
        for (size_t k = 0; k < c.parameter_count; ++k) {
            c.covariance[j][k] =
                inverse[j][k] *
                (fit.weighted ? 1.0 : sum_of_squares / (double)result.degrees_of_freedom);
        }
    }
    for (size_t i = 0; i < count; ++i) {
        double fitted, unused, residual;
        if (gb_calibration_apply(&c, blackbody_signal(&c, points[i].signal, source_emissivity),
                                 0.0, &fitted, &unused) != GB_OK) {
            return GB_ERR_CALIBRATION_NO_FIT;
        }
        residual = fitted - points[i].temperature_k;
        rms += residual * residual;
        if (residual_k != NULL) {
            residual_k[i] = residual;
        }
    }
    result.rms_residual_k = sqrt(rms / (double)count);
    *calibration = c;
    *summary = result;
    return GB_OK;
}

gb_status gb_calibration_signal(const gb_calibration *calibration, double temperature_k,
                                double *signal, double *derivative)
{
    double gradient[GB_CALIBRATION_MAX_PARAMETERS], slope;
    gb_status status;
    if (calibration == NULL || signal == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    status = gb_check_temperature(temperature_k);
    if (status == GB_OK) {
        status = model_at(calibration, 1.0, temperature_k, signal, gradient, &slope);
    }
    if (status == GB_OK && derivative != NULL) {
        *derivative = slope;
    }
    return status;
}

gb_status gb_calibration_apply(const gb_calibration *calibration, double signal,
                               double u_signal, double *temperature_k, double *u_temperature_k)
{
    double temperature, by_signal, variance = 0.0;
    double by_parameter[GB_CALIBRATION_MAX_PARAMETERS] = {0};
    const gb_calibration *c = calibration;
    if (c == NULL || temperature_k == NULL || u_temperature_k == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    if (!isfinite(signal) || !isfinite(u_signal)) {
        return GB_ERR_NOT_FINITE;
    }
    if (u_signal < 0.0) {
        return GB_ERR_UNCERTAINTY_DOMAIN;
    }
    if (c->model == GB_CALIBRATION_SAKUMA_HATTORI) {
        double a = c->parameter[SH_A], b = c->parameter[SH_B], scale = c->parameter[SH_C];
        double x, dtdx;
        if (!(signal > 0.0) || !(scale > 0.0) || !(a > 0.0)) {
            return GB_ERR_SIGNAL_OUT_OF_RANGE;
        }
        x = log1p(scale / signal);
        temperature = (GB_C2_UM / x - b) / a;
        dtdx = -GB_C2_UM / (a * x * x);
        by_signal = dtdx * (-scale / (signal * (signal + scale)));
        by_parameter[SH_A] = -temperature / a;
        by_parameter[SH_B] = -1.0 / a;
        by_parameter[SH_C] = dtdx / (signal + scale);
    } else {
        double gain = c->parameter[BAND_GAIN], radiance, check, slope;
        gb_status status;
        if (!(gain > 0.0)) {
            return GB_ERR_SIGNAL_OUT_OF_RANGE;
        }
        radiance = (signal - c->parameter[BAND_OFFSET]) / gain;
        if (!(radiance > 0.0)) {
            return GB_ERR_SIGNAL_OUT_OF_RANGE;
        }
        status = gb_band_temperature(&c->band, radiance, 1.0, &temperature);
        if (status == GB_OK) {
            status = gb_band_radiance(&c->band, temperature, &check, &slope);
        }
        if (status != GB_OK) {
            return status == GB_ERR_RADIANCE_OUT_OF_RANGE ? GB_ERR_SIGNAL_OUT_OF_RANGE : status;
        }
        by_signal = 1.0 / (gain * slope);
        by_parameter[BAND_GAIN] = -radiance / (gain * slope);
        by_parameter[BAND_OFFSET] = -1.0 / (gain * slope);
    }
    if (!(temperature > 0.0) || !isfinite(temperature)) {
        return GB_ERR_SIGNAL_OUT_OF_RANGE;
    }
    variance = by_signal * by_signal * u_signal * u_signal;
    for (size_t j = 0; j < c->parameter_count; ++j) {
        for (size_t k = 0; k < c->parameter_count; ++k) {
            variance += by_parameter[j] * c->covariance[j][k] * by_parameter[k];
        }
    }
    if (!isfinite(variance)) {
        return GB_ERR_RESULT_OVERFLOW;
    }
    *temperature_k = temperature;
    *u_temperature_k = sqrt(fmax(variance, 0.0));
    return GB_OK;
}
