#include "calibration.h"

#include <math.h>
#include <string.h>

#include "constants.h"
#include "planck.h"

#define MAX_ITERATIONS 200
#define MAX_ROUNDS 60
#define INITIAL_DAMPING 1e-3
#define MIN_DAMPING 1e-15
#define MAX_DAMPING 1e16
/*
 * The fit ends when the Gauss-Newton step would improve the sum of squares by
 * less than RELATIVE_IMPROVEMENT of it, or move the fitted signals by less
 * than STEP_TOLERANCE of their size (the rounding floor of data without noise).
 */
#define RELATIVE_IMPROVEMENT 1e-20
#define STEP_TOLERANCE 1e-15
/*
 * Below this predicted share of the sum of squares, rounding in the sum can
 * hide a real improvement: Gauss-Newton steps are then taken without the
 * test (at most MAX_POLISH of them), as the quadratic model is exact enough.
 */
#define POLISH_SHARE 1e-10
#define MAX_POLISH 5
/* Effective-variance weights that move less than this (relative) between rounds are final. */
#define WEIGHT_TOLERANCE 1e-13
/* Relative size below which a diagonal element of R counts as zero (rank deficiency). */
#define RANK_TOLERANCE 1e-13
/* Rounding allowed in a covariance matrix given back to us (symmetry, correlations). */
#define COVARIANCE_TOLERANCE 1e-9

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
 * sizes (A ~ 1 um, C ~ 1e9 counts) do not ruin the pivots.  Returns 0 when M
 * is singular.
 */
static int solve_scaled(size_t n, matrix m, const double *v, double damping, double *x)
{
    double scale[GB_CALIBRATION_MAX_PARAMETERS];
    double a[GB_CALIBRATION_MAX_PARAMETERS][GB_CALIBRATION_MAX_PARAMETERS + 1];
    for (size_t i = 0; i < n; ++i) {
        if (!(m[i][i] > 0.0)) {
            return 0;
        }
        scale[i] = sqrt(m[i][i]);
    }
    for (size_t i = 0; i < n; ++i) {
        for (size_t j = 0; j < n; ++j) {
            a[i][j] = m[i][j] / (scale[i] * scale[j]) + (i == j ? damping : 0.0);
        }
        a[i][n] = v[i] / scale[i];
    }
    for (size_t col = 0; col < n; ++col) {
        size_t pivot = col;
        for (size_t row = col + 1; row < n; ++row) {
            if (fabs(a[row][col]) > fabs(a[pivot][col])) {
                pivot = row;
            }
        }
        if (!(fabs(a[pivot][col]) > 1e-300)) {
            return 0;
        }
        for (size_t k = 0; k <= n; ++k) {
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
            for (size_t k = col; k <= n; ++k) {
                a[row][k] -= factor * a[col][k];
            }
        }
    }
    for (size_t i = 0; i < n; ++i) {
        x[i] = a[i][n] / a[i][i] / scale[i];
        if (!isfinite(x[i])) {
            return 0;
        }
    }
    return 1;
}

struct fit_state {
    const gb_calibration_point *points;
    size_t count;
    double emissivity;
    int weighted;
    int weights_move; /* effective variance with some u(T) > 0: weights depend on the fit */
    double weight[GB_CALIBRATION_MAX_POINTS];
};

/*
 * Fixes the weights at the calibration's parameters: 1, or 1 / (u(S)^2 +
 * (dS/dT u(T))^2) (effective variance).  *largest_change receives the largest
 * relative change of a weight against the weights held before.
 */
static gb_status set_weights(struct fit_state *fit, const gb_calibration *c, int first,
                             double *largest_change)
{
    double change = 0.0;
    for (size_t i = 0; i < fit->count; ++i) {
        const gb_calibration_point *p = &fit->points[i];
        double weight = 1.0;
        if (fit->weighted) {
            double signal, derivative, spread, variance;
            double gradient[GB_CALIBRATION_MAX_PARAMETERS];
            gb_status status =
                model_at(c, fit->emissivity, p->temperature_k, &signal, gradient, &derivative);
            if (status != GB_OK) {
                return status;
            }
            spread = derivative * p->u_temperature_k;
            variance = p->u_signal * p->u_signal + spread * spread;
            weight = 1.0 / variance;
            if (!(weight > 0.0) || !isfinite(weight)) {
                return GB_ERR_CALIBRATION_NO_FIT;
            }
        }
        if (!first) {
            change = fmax(change, fabs(weight / fit->weight[i] - 1.0));
        }
        fit->weight[i] = weight;
    }
    *largest_change = first ? INFINITY : change;
    return GB_OK;
}

/* Weighted least-squares line y = intercept + slope x (w NULL: all weights 1). */
static int fit_line(const double *x, const double *y, const double *w, size_t n, double *slope,
                    double *intercept)
{
    double total = 0.0, mean_x = 0.0, mean_y = 0.0, sxx = 0.0, sxy = 0.0;
    for (size_t i = 0; i < n; ++i) {
        double weight = w != NULL ? w[i] : 1.0;
        total += weight;
        mean_x += weight * x[i];
        mean_y += weight * y[i];
    }
    mean_x /= total;
    mean_y /= total;
    for (size_t i = 0; i < n; ++i) {
        double weight = w != NULL ? w[i] : 1.0;
        sxx += weight * (x[i] - mean_x) * (x[i] - mean_x);
        sxy += weight * (x[i] - mean_x) * (y[i] - mean_y);
    }
    if (!(sxx > 0.0)) {
        return 0;
    }
    *slope = sxy / sxx;
    *intercept = mean_y - *slope * mean_x;
    return isfinite(*slope) && isfinite(*intercept);
}

/*
 * Variable projection (Golub and Pereyra, 1973): the parameters the model is
 * linear in (C; gain and offset) are set to their weighted least-squares
 * values for the others, so the iteration only moves A and B and never
 * crawls along the long A-B-C valley of the Sakuma-Hattori fit.
 */
static gb_status project_linear(const struct fit_state *fit, gb_calibration *c)
{
    double basis[GB_CALIBRATION_MAX_POINTS], signal_of[GB_CALIBRATION_MAX_POINTS];
    double numerator = 0.0, denominator = 0.0;
    for (size_t i = 0; i < fit->count; ++i) {
        double signal, derivative, gradient[GB_CALIBRATION_MAX_PARAMETERS];
        gb_status status = model_at(c, fit->emissivity, fit->points[i].temperature_k, &signal,
                                    gradient, &derivative);
        if (status != GB_OK) {
            return status;
        }
        basis[i] = gradient[c->model == GB_CALIBRATION_SAKUMA_HATTORI ? SH_C : BAND_GAIN];
        signal_of[i] = fit->points[i].signal;
        numerator += fit->weight[i] * basis[i] * signal_of[i];
        denominator += fit->weight[i] * basis[i] * basis[i];
    }
    if (c->model == GB_CALIBRATION_BAND) {
        return fit_line(basis, signal_of, fit->weight, fit->count, &c->parameter[BAND_GAIN],
                        &c->parameter[BAND_OFFSET])
                   ? GB_OK
                   : GB_ERR_CALIBRATION_DEGENERATE;
    }
    c->parameter[SH_C] = numerator / denominator;
    return c->parameter[SH_C] > 0.0 && isfinite(c->parameter[SH_C]) ? GB_OK
                                                                      : GB_ERR_SIGNAL_OUT_OF_RANGE;
}

/* Weighted sum of squares and the normal equations at the calibration's parameters. */
static gb_status normal_equations(const struct fit_state *fit, const gb_calibration *c,
                                  double *sum_of_squares, matrix m, double *v)
{
    size_t n = c->parameter_count;
    double total = 0.0;
    memset(m, 0, sizeof(matrix));
    memset(v, 0, n * sizeof v[0]);
    for (size_t i = 0; i < fit->count; ++i) {
        double signal, derivative, residual, weight = fit->weight[i];
        double gradient[GB_CALIBRATION_MAX_PARAMETERS];
        gb_status status = model_at(c, fit->emissivity, fit->points[i].temperature_k, &signal,
                                    gradient, &derivative);
        if (status != GB_OK) {
            return status;
        }
        residual = fit->points[i].signal - signal;
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

/*
 * Levenberg-Marquardt with the weights held fixed.  Converged when the
 * undamped (Gauss-Newton) step would improve the sum of squares by less than
 * RELATIVE_IMPROVEMENT of it or move the fitted signals by less than
 * STEP_TOLERANCE of their size (weighted RMS), or when no step at all
 * improves the sum (the minimum, to rounding), or after MAX_POLISH final
 * Gauss-Newton steps; running out of iterations is GB_ERR_CALIBRATION_NO_FIT.
 */
static gb_status levenberg_marquardt(const struct fit_state *fit, gb_calibration *c,
                                     double *sum_of_squares, int *iterations)
{
    size_t n = c->parameter_count;
    double damping = INITIAL_DAMPING, current, signal_size = 0.0;
    matrix m;
    double v[GB_CALIBRATION_MAX_PARAMETERS];
    gb_status status = normal_equations(fit, c, &current, m, v);
    if (status != GB_OK) {
        return GB_ERR_CALIBRATION_NO_FIT;
    }
    for (size_t i = 0; i < fit->count; ++i) {
        signal_size += fit->weight[i] * fit->points[i].signal * fit->points[i].signal;
    }
    for (int iteration = 1, polish = 0; iteration <= MAX_ITERATIONS; ++iteration) {
        double step[GB_CALIBRATION_MAX_PARAMETERS], trial_sum = 0.0, predicted = 0.0;
        matrix trial_m;
        double trial_v[GB_CALIBRATION_MAX_PARAMETERS];
        gb_calibration trial = *c;
        int polishing = 0;
        if (solve_scaled(n, m, v, 0.0, step)) {
            for (size_t j = 0; j < n; ++j) {
                predicted += step[j] * v[j]; /* = step^T M step: the signals' move, squared */
            }
            if (predicted <= RELATIVE_IMPROVEMENT * current ||
                predicted <= STEP_TOLERANCE * STEP_TOLERANCE * signal_size ||
                polish == MAX_POLISH) {
                *sum_of_squares = current;
                return GB_OK;
            }
            /* So close that rounding hides the gain in the sum: trust the quadratic model. */
            polishing = predicted <= POLISH_SHARE * current;
        }
        ++*iterations;
        if (!polishing && !solve_scaled(n, m, v, damping, step)) {
            return GB_ERR_CALIBRATION_DEGENERATE;
        }
        for (size_t j = 0; j < n; ++j) {
            trial.parameter[j] += step[j];
        }
        status = project_linear(fit, &trial);
        if (status == GB_OK) {
            status = normal_equations(fit, &trial, &trial_sum, trial_m, trial_v);
        }
        polish += polishing;
        if (status == GB_OK && (trial_sum < current || polishing)) {
            *c = trial;
            current = trial_sum;
            memcpy(m, trial_m, sizeof(matrix));
            memcpy(v, trial_v, sizeof v);
            damping = fmax(damping / 10.0, MIN_DAMPING);
        } else {
            damping *= 10.0;
            if (damping > MAX_DAMPING) {
                *sum_of_squares = current;
                return GB_OK; /* no step improves the fit: this is the minimum */
            }
        }
    }
    return GB_ERR_CALIBRATION_NO_FIT;
}

/*
 * Covariance (J^T W J)^-1 from a Householder QR factorization of the
 * column-scaled weighted Jacobian (R^-1 R^-T), which keeps the condition
 * number of J rather than squaring it as the normal equations would.
 */
static gb_status covariance_of(const struct fit_state *fit, const gb_calibration *c,
                               matrix covariance)
{
    size_t n = c->parameter_count, rows = fit->count;
    double jacobian[GB_CALIBRATION_MAX_POINTS][GB_CALIBRATION_MAX_PARAMETERS];
    double norm[GB_CALIBRATION_MAX_PARAMETERS] = {0};
    matrix r = {{0}}, r_inverse = {{0}};
    double largest = 0.0;
    for (size_t i = 0; i < rows; ++i) {
        double signal, derivative, root = sqrt(fit->weight[i]);
        gb_status status = model_at(c, fit->emissivity, fit->points[i].temperature_k, &signal,
                                    jacobian[i], &derivative);
        if (status != GB_OK) {
            return status;
        }
        for (size_t j = 0; j < n; ++j) {
            jacobian[i][j] *= root;
            norm[j] = hypot(norm[j], jacobian[i][j]);
        }
    }
    for (size_t j = 0; j < n; ++j) {
        if (!(norm[j] > 0.0) || !isfinite(norm[j])) {
            return GB_ERR_CALIBRATION_DEGENERATE;
        }
        for (size_t i = 0; i < rows; ++i) {
            jacobian[i][j] /= norm[j];
        }
    }
    for (size_t k = 0; k < n; ++k) {
        double alpha = 0.0, vnorm2, head;
        for (size_t i = k; i < rows; ++i) {
            alpha = hypot(alpha, jacobian[i][k]);
        }
        if (jacobian[k][k] > 0.0) {
            alpha = -alpha;
        }
        /* Householder vector v = x - alpha e1, kept in column k below the diagonal. */
        head = jacobian[k][k] - alpha;
        vnorm2 = head * head;
        for (size_t i = k + 1; i < rows; ++i) {
            vnorm2 += jacobian[i][k] * jacobian[i][k];
        }
        for (size_t j = k + 1; j < n && vnorm2 > 0.0; ++j) {
            double dot = head * jacobian[k][j];
            for (size_t i = k + 1; i < rows; ++i) {
                dot += jacobian[i][k] * jacobian[i][j];
            }
            dot = 2.0 * dot / vnorm2;
            jacobian[k][j] -= dot * head;
            for (size_t i = k + 1; i < rows; ++i) {
                jacobian[i][j] -= dot * jacobian[i][k];
            }
        }
        r[k][k] = alpha;
        for (size_t j = k + 1; j < n; ++j) {
            r[k][j] = jacobian[k][j];
        }
        largest = fmax(largest, fabs(alpha));
    }
    for (size_t k = 0; k < n; ++k) {
        if (!(fabs(r[k][k]) > RANK_TOLERANCE * largest)) {
            return GB_ERR_CALIBRATION_DEGENERATE;
        }
    }
    for (size_t j = n; j-- > 0;) { /* R^-1, upper triangular, by back substitution */
        r_inverse[j][j] = 1.0 / r[j][j];
        for (size_t i = j; i-- > 0;) {
            double sum = 0.0;
            for (size_t k = i + 1; k <= j; ++k) {
                sum += r[i][k] * r_inverse[k][j];
            }
            r_inverse[i][j] = -sum / r[i][i];
        }
    }
    for (size_t i = 0; i < n; ++i) {
        for (size_t j = 0; j < n; ++j) {
            double sum = 0.0;
            for (size_t k = (i > j ? i : j); k < n; ++k) {
                sum += r_inverse[i][k] * r_inverse[j][k];
            }
            covariance[i][j] = sum / (norm[i] * norm[j]);
        }
    }
    return GB_OK;
}

gb_status gb_calibration_check_point(gb_calibration_model model, const gb_calibration_point *point)
{
    gb_status status;
    if (point == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    status = gb_check_temperature(point->temperature_k);
    if (status != GB_OK) {
        return status;
    }
    if (!isfinite(point->signal) || !isfinite(point->u_signal) ||
        !isfinite(point->u_temperature_k)) {
        return GB_ERR_NOT_FINITE;
    }
    if (model == GB_CALIBRATION_SAKUMA_HATTORI && !(point->signal > 0.0)) {
        return GB_ERR_SIGNAL_OUT_OF_RANGE;
    }
    if (point->u_signal < 0.0 || point->u_temperature_k < 0.0) {
        return GB_ERR_UNCERTAINTY_DOMAIN;
    }
    return GB_OK;
}

gb_status gb_calibration_find_reversal(const gb_calibration_point *points, size_t count,
                                       size_t *cooler, size_t *warmer)
{
    if (points == NULL || cooler == NULL || warmer == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    for (size_t i = 0; i < count; ++i) {
        for (size_t j = 0; j < count; ++j) {
            if (points[i].temperature_k < points[j].temperature_k &&
                !(points[i].signal < points[j].signal)) {
                *cooler = i;
                *warmer = j;
                return GB_ERR_CALIBRATION_NOT_MONOTONIC;
            }
        }
    }
    return GB_OK;
}

static gb_status check_points(gb_calibration_model model, const gb_calibration_point *points,
                              size_t count, size_t parameters, int *weighted, int *weights_move)
{
    size_t with_uncertainty = 0, with_temperature_uncertainty = 0, distinct = 0, cooler, warmer;
    gb_status status;
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
        status = gb_calibration_check_point(model, p);
        if (status != GB_OK) {
            return status;
        }
        with_uncertainty += (p->u_signal > 0.0 || p->u_temperature_k > 0.0);
        with_temperature_uncertainty += p->u_temperature_k > 0.0;
        for (size_t j = 0; j < i && !seen; ++j) {
            seen = points[j].temperature_k == p->temperature_k;
        }
        distinct += !seen;
    }
    status = gb_calibration_find_reversal(points, count, &cooler, &warmer);
    if (status != GB_OK) {
        return status;
    }
    if (distinct < parameters) {
        return GB_ERR_CALIBRATION_DEGENERATE;
    }
    if (with_uncertainty != 0 && with_uncertainty != count) {
        return GB_ERR_UNCERTAINTY_PARTIAL;
    }
    *weighted = with_uncertainty == count;
    *weights_move = *weighted && with_temperature_uncertainty > 0;
    return GB_OK;
}

/* Sakuma-Hattori start: Wien's approximation, ln(S/eps) = ln C - c2 / (A T), with B = 0. */
static gb_status starting_values(const struct fit_state *fit, gb_calibration *c)
{
    double x[GB_CALIBRATION_MAX_POINTS], y[GB_CALIBRATION_MAX_POINTS], slope, intercept;
    if (c->model == GB_CALIBRATION_BAND) {
        return project_linear(fit, c);
    }
    for (size_t i = 0; i < fit->count; ++i) {
        x[i] = 1.0 / fit->points[i].temperature_k;
        y[i] = log(fit->points[i].signal / fit->emissivity);
    }
    if (!fit_line(x, y, NULL, fit->count, &slope, &intercept)) {
        return GB_ERR_CALIBRATION_DEGENERATE;
    }
    if (!(slope < 0.0)) {
        return GB_ERR_CALIBRATION_NO_FIT;
    }
    c->parameter[SH_A] = -GB_C2_UM / slope;
    c->parameter[SH_B] = 0.0;
    c->parameter[SH_C] = exp(intercept);
    return GB_OK;
}

/* Rounds of Levenberg-Marquardt, re-weighting in between until the weights hold still. */
static gb_status fit_rounds(struct fit_state *fit, gb_calibration *c, double *sum_of_squares,
                            int *iterations)
{
    double change;
    gb_status status = set_weights(fit, c, 1, &change);
    for (int round = 1; status == GB_OK && round <= MAX_ROUNDS; ++round) {
        status = project_linear(fit, c);
        if (status == GB_OK) {
            status = levenberg_marquardt(fit, c, sum_of_squares, iterations);
        }
        if (status != GB_OK || !fit->weights_move) {
            return status;
        }
        status = set_weights(fit, c, 0, &change);
        if (status == GB_OK && change <= WEIGHT_TOLERANCE) {
            /* The sum and the covariance belong to these (final) weights. */
            matrix unused_m;
            double unused_v[GB_CALIBRATION_MAX_PARAMETERS];
            return normal_equations(fit, c, sum_of_squares, unused_m, unused_v);
        }
    }
    return status == GB_OK ? GB_ERR_CALIBRATION_NO_FIT : status;
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
    struct fit_state fit;
    double sum_of_squares = 0.0, rms = 0.0;
    matrix inverse;
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
    fit.points = points;
    fit.count = count;
    fit.emissivity = source_emissivity;
    fit.weighted = fit.weights_move = 0;
    for (size_t i = 0; i < count && i < GB_CALIBRATION_MAX_POINTS; ++i) {
        fit.weight[i] = 1.0;
    }
    status = gb_check_emissivity(source_emissivity);
    if (status == GB_OK) {
        status = check_points(model, points, count, c.parameter_count, &fit.weighted,
                              &fit.weights_move);
    }
    if (status != GB_OK) {
        return status;
    }
    status = starting_values(&fit, &c);
    if (status == GB_OK) {
        status = fit_rounds(&fit, &c, &sum_of_squares, &result.iterations);
    }
    if (status == GB_OK) {
        status = covariance_of(&fit, &c, inverse);
    }
    if (status == GB_OK && gb_calibration_check(&c) != GB_OK) {
        status = GB_ERR_CALIBRATION_NO_FIT;
    }
    if (status != GB_OK) {
        /* The points were valid: a model that leaves its domain on the way is no fit. */
        return status == GB_ERR_SIGNAL_OUT_OF_RANGE ? GB_ERR_CALIBRATION_NO_FIT : status;
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

gb_status gb_calibration_check(const gb_calibration *calibration)
{
    const gb_calibration *c = calibration;
    size_t n;
    if (c == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    n = c->parameter_count;
    if (c->model == GB_CALIBRATION_SAKUMA_HATTORI) {
        if (n != 3) {
            return GB_ERR_INVALID_ARGUMENT;
        }
    } else if (c->model == GB_CALIBRATION_BAND) {
        gb_status status = gb_band_validate(&c->band);
        if (status != GB_OK) {
            return status;
        }
        if (n != 2) {
            return GB_ERR_INVALID_ARGUMENT;
        }
    } else {
        return GB_ERR_INVALID_ARGUMENT;
    }
    for (size_t j = 0; j < n; ++j) {
        if (!isfinite(c->parameter[j])) {
            return GB_ERR_NOT_FINITE;
        }
        for (size_t k = 0; k < n; ++k) {
            if (!isfinite(c->covariance[j][k])) {
                return GB_ERR_NOT_FINITE;
            }
        }
    }
    if (c->model == GB_CALIBRATION_SAKUMA_HATTORI
            ? !(c->parameter[SH_A] > 0.0 && c->parameter[SH_C] > 0.0)
            : !(c->parameter[BAND_GAIN] > 0.0)) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    {
        /* Positive semi-definite, to rounding: the correlation matrix's leading minors. */
        double correlation[GB_CALIBRATION_MAX_PARAMETERS][GB_CALIBRATION_MAX_PARAMETERS];
        for (size_t j = 0; j < n; ++j) {
            if (c->covariance[j][j] < 0.0) {
                return GB_ERR_UNCERTAINTY_DOMAIN;
            }
        }
        for (size_t j = 0; j < n; ++j) {
            for (size_t k = 0; k < n; ++k) {
                double scale = sqrt(c->covariance[j][j] * c->covariance[k][k]);
                double a = c->covariance[j][k], b = c->covariance[k][j];
                if (fabs(a - b) > COVARIANCE_TOLERANCE * scale) {
                    return GB_ERR_UNCERTAINTY_DOMAIN;
                }
                correlation[j][k] = scale > 0.0 ? a / scale : (j == k ? 1.0 : 0.0);
                if (scale == 0.0 && a != 0.0) {
                    return GB_ERR_UNCERTAINTY_DOMAIN;
                }
            }
        }
        for (size_t j = 0; j + 1 < n; ++j) {
            for (size_t k = j + 1; k < n; ++k) {
                if (1.0 - correlation[j][k] * correlation[j][k] < -COVARIANCE_TOLERANCE) {
                    return GB_ERR_UNCERTAINTY_DOMAIN;
                }
            }
        }
        if (n == 3) {
            double r01 = correlation[0][1], r02 = correlation[0][2], r12 = correlation[1][2];
            double determinant =
                1.0 + 2.0 * r01 * r02 * r12 - r01 * r01 - r02 * r02 - r12 * r12;
            if (determinant < -COVARIANCE_TOLERANCE) {
                return GB_ERR_UNCERTAINTY_DOMAIN;
            }
        }
    }
    return GB_OK;
}

gb_status gb_calibration_signal(const gb_calibration *calibration, double temperature_k,
                                double *signal, double *derivative)
{
    double gradient[GB_CALIBRATION_MAX_PARAMETERS], value, slope;
    gb_status status;
    if (calibration == NULL || signal == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    status = gb_check_temperature(temperature_k);
    if (status == GB_OK) {
        status = model_at(calibration, 1.0, temperature_k, &value, gradient, &slope);
    }
    if (status == GB_OK && !isfinite(value)) {
        status = GB_ERR_RESULT_OVERFLOW;
    }
    if (status == GB_OK) {
        *signal = value;
        if (derivative != NULL) {
            *derivative = slope;
        }
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
    if (c->parameter_count != (c->model == GB_CALIBRATION_SAKUMA_HATTORI ? 3u : 2u)) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    if (c->model == GB_CALIBRATION_SAKUMA_HATTORI) {
        double a = c->parameter[SH_A], b = c->parameter[SH_B], scale = c->parameter[SH_C];
        double x, dtdx;
        if (!(scale > 0.0) || !(a > 0.0)) {
            return GB_ERR_INVALID_ARGUMENT;
        }
        if (!(signal > 0.0)) {
            return GB_ERR_SIGNAL_OUT_OF_RANGE;
        }
        x = log1p(scale / signal);
        temperature = (GB_C2_UM / x - b) / a;
        dtdx = -GB_C2_UM / (a * x * x);
        by_signal = dtdx * (-scale / (signal * (signal + scale)));
        by_parameter[SH_A] = -temperature / a;
        by_parameter[SH_B] = -1.0 / a;
        by_parameter[SH_C] = dtdx / (signal + scale);
    } else if (c->model == GB_CALIBRATION_BAND) {
        double gain = c->parameter[BAND_GAIN], radiance, check, slope;
        gb_status status;
        if (!(gain > 0.0)) {
            return GB_ERR_INVALID_ARGUMENT;
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
    } else {
        return GB_ERR_INVALID_ARGUMENT;
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
