#!/usr/bin/python3
"""Reference vectors for the calibration of a radiation thermometer (core/calibration.h):
fits of the Sakuma-Hattori equation S = C / (exp(c2 / (A T + B)) - 1) and of the band model
S = gain L_band(T) + offset to calibration points, and the application of a fit to signals.

Two outside witnesses for every fit:
- scipy.optimize.curve_fit (Debian's python3-scipy), method 'lm' with the analytic Jacobian
  and ftol = xtol = gtol = 1e-15: unweighted (its default, covariance scaled by SSR / (n - p)),
  or sigma = u(S) with absolute_sigma=True when the points carry uncertainties.  When some
  u(T) > 0 the effective variance u(S)^2 + (dS/dT u(T))^2 depends on the fit, so curve_fit is
  repeated with the sigmas of its previous result until they hold still (J. Orear, Am. J.
  Phys. 50, 912 (1982), from memory);
- mpmath at WORKING_DIGITS digits: Gauss-Newton from curve_fit's answer to the exact
  minimum (or fixed point) and the covariance (J^T W J)^-1 there.
Band radiances come from workflows.py (tanh-sinh quadrature of Planck's law with the exact
CODATA 2018 constants), c2 = hc/k likewise.

Every data set is INVENTED for the tests: "exact" sets are made with the model itself from
chosen parameters (the fit must recover them), "noisy" sets add a fixed, invented list of
errors to such signals (rounded to 10 significant digits, the text is the data).

    calibration.py           rewrite tests/reference/vectors/calibration_*.tsv
    calibration.py --check   regenerate every row and compare with the committed files;
                             prints "calibration reference: N passed, N failed", exit 1 on drift.
"""

import argparse
import os
import sys

import numpy
from mpmath import mp, mpf
from scipy.optimize import curve_fit

import workflows
from workflows import C2_UM, band_radiance, band_temperature, fmt

WORKING_DIGITS = 40
NOISY_DIGITS = 10

# (name, model, band, source emissivity, truth parameters, temperatures K,
#  signal errors (None: exact), u(T) K per point or None, u(S) rule or None).
SH, BAND = 'sakuma-hattori', 'band'
NARROW_T = ['1073.15', '1173.15', '1273.15', '1373.15', '1473.15', '1573.15', '1673.15',
            '1773.15']
HANDHELD_T = ['253.15', '273.15', '323.15', '373.15', '473.15', '623.15', '773.15']
LWIR_T = ['263.15', '283.15', '303.15', '323.15', '348.15', '373.15']
MWIR_T = ['323.15', '373.15', '423.15', '473.15', '573.15', '673.15']
NARROW_ERRORS = [3.1e-4, -2.2e-4, 1.4e-4, -4.0e-4, 2.7e-4, -0.9e-4, 1.8e-4, -3.3e-4]  # relative
HANDHELD_ERRORS = [1.7, -2.4, 0.8, 3.1, -1.9, 2.6, -3.4]  # counts
LWIR_ERRORS = [2.2, -1.6, -0.7, 2.9, -2.5, 1.1]  # counts
MWIR_ERRORS = [0.9, -1.2, 2.0, -0.4, -1.7, 1.5]  # counts
README_T = ['323.15', '373.15', '423.15', '473.15', '573.15', '773.15']
README_COUNTS = ['1160', '2083', '3299', '4759', '8350', '17337']
README_UT = ['0.15', '0.15', '0.2', '0.2', '0.3', '0.5']
HANDHELD_UT = ['0.05', '0.05', '0.08', '0.1', '0.15', '0.25', '0.4']
MWIR_UT = ['0.1', '0.1', '0.15', '0.2', '0.3', '0.4']

SETS = [
    ('sh_narrow_exact', SH, 'none', '1', ('0.6523', '41.7', '5e11'), NARROW_T, None, None, None),
    ('sh_handheld_exact', SH, 'none', '0.995', ('9.6', '120', '1e5'), HANDHELD_T, None, None,
     None),
    ('sh_narrow_noisy', SH, 'none', '1', ('0.6523', '41.7', '5e11'), NARROW_T,
     ('relative', NARROW_ERRORS), None, None),
    ('sh_handheld_noisy', SH, 'none', '0.995', ('9.6', '120', '1e5'), HANDHELD_T,
     ('counts', HANDHELD_ERRORS), None, None),
    ('sh_handheld_weighted', SH, 'none', '0.995', ('9.6', '120', '1e5'), HANDHELD_T,
     ('counts', HANDHELD_ERRORS), None, ('1.5', '0.0002')),
    ('sh_handheld_effective_variance', SH, 'none', '0.995', ('9.6', '120', '1e5'), HANDHELD_T,
     ('counts', HANDHELD_ERRORS), HANDHELD_UT, ('1.5', '0.0002')),
    ('band_lwir_exact', BAND, 'wavelength:8:14', '0.98', ('850', '1200'), LWIR_T, None, None,
     None),
    ('band_lwir_noisy', BAND, 'wavelength:8:14', '0.98', ('850', '1200'), LWIR_T,
     ('counts', LWIR_ERRORS), None, None),
    ('band_mwir_effective_variance', BAND, 'wavelength:3:5', '1', ('2100', '35'), MWIR_T,
     ('counts', MWIR_ERRORS), MWIR_UT, ('1', '0.001')),
    # The worked example of README.md and api-docs: a handheld thermometer's raw counts against
    # a cavity (emissivity 0.995) at six setpoints, 50 to 500 C, read to whole counts.
    ('readme_handheld_cavity', SH, 'none', '0.995', ('9.6', '120', '1e5'), README_T,
     ('given', README_COUNTS), README_UT, ('3', '0')),
]

PARAMETERS = 3
FIT_INPUTS = ['set', 'model', 'band', 'source_emissivity', 'truth_p0', 'truth_p1', 'truth_p2']
COVARIANCE_CELLS = [(0, 0), (0, 1), (0, 2), (1, 1), (1, 2), (2, 2)]
FIT_OUTPUTS = (['p%d' % j for j in range(PARAMETERS)] +
               ['cov%d%d' % cell for cell in COVARIANCE_CELLS] +
               ['mp_p%d' % j for j in range(PARAMETERS)] +
               ['mp_cov%d%d' % cell for cell in COVARIANCE_CELLS] +
               ['rms_residual_k', 'chi_squared', 'degrees_of_freedom', 'weighted'])
POINT_INPUTS = ['set', 'temperature_k', 'signal', 'u_temperature_k', 'u_signal']
POINT_OUTPUTS = ['residual_k']
APPLY_INPUTS = ['set', 'signal', 'u_signal']
APPLY_OUTPUTS = ['temperature_k', 'u_temperature_k']


def parse_band(text):
    parts = text.split(':')
    return (parts[0], parts[1], parts[2])


# ----------------------------------------------------------------------------
# The models, in mpmath (exact) and numpy (for curve_fit)
# ----------------------------------------------------------------------------

def model_mp(model, band, p, t, eps=1):
    """The signal of a source of emissivity eps at T (the source emits eps L)."""
    if model == SH:
        return eps * p[2] / mp.expm1(C2_UM / (p[0] * t + p[1]))
    return p[0] * eps * band_radiance(band, t) + p[1]


def gradient_mp(model, band, p, t, eps):
    """dS/dp (analytic) and dS/dT (numeric, mpmath.diff)."""
    if model == SH:
        effective = p[0] * t + p[1]
        x = C2_UM / effective
        denominator = mp.expm1(x)
        dsdx = -eps * p[2] * mp.exp(x) / denominator ** 2
        grad = [dsdx * (-x * t / effective), dsdx * (-x / effective), eps / denominator]
    else:
        grad = [eps * band_radiance(band, t), mpf(1)]
    return grad, mp.diff(lambda u: model_mp(model, band, p, u, eps), t)


def solve_gauss_newton(model, band, eps, temperatures, signals, u_t, u_s, start):
    """The exact minimum (fixed point of the effective-variance weights) and its covariance."""
    p = [mpf(float(v)) for v in start]
    n, k = len(temperatures), len(p)
    weighted = u_s_given(u_s, u_t)
    for _ in range(60):
        weights, jacobian, residuals = [], [], []
        for t, s, ut, us in zip(temperatures, signals, u_t, u_s):
            grad, slope = gradient_mp(model, band, p, t, eps)
            weights.append(1 / (us ** 2 + (slope * ut) ** 2) if weighted else mpf(1))
            jacobian.append(grad)
            residuals.append(s - model_mp(model, band, p, t, eps))
        normal = mp.matrix(k, k)
        gradient = mp.matrix(k, 1)
        for w, row, r in zip(weights, jacobian, residuals):
            for a in range(k):
                gradient[a] += w * row[a] * r
                for b in range(k):
                    normal[a, b] += w * row[a] * row[b]
        step = mp.lu_solve(normal, gradient)
        p = [p[a] + step[a] for a in range(k)]
        if max(abs(step[a] / p[a]) for a in range(k)) < mpf(10) ** (4 - WORKING_DIGITS):
            break
    else:
        raise RuntimeError('Gauss-Newton did not converge')
    ssr = sum(w * r ** 2 for w, r in zip(weights, residuals))
    covariance = mp.inverse(normal)
    if not weighted:
        covariance *= ssr / (n - k)
    return p, covariance, ssr


def u_s_given(u_s, u_t):
    return any(v > 0 for v in u_s) or any(v > 0 for v in u_t)


def numpy_model(model, band, eps, temperatures):
    """The model, its Jacobian and dS/dT as curve_fit wants them (numpy arrays of T)."""
    if model == SH:
        def parts(t, a, b, c):
            effective = a * t + b
            x = C2 / effective
            denominator = numpy.expm1(x)
            return effective, x, denominator, -eps * c * numpy.exp(x) / denominator ** 2

        def f(t, a, b, c):
            return eps * c / numpy.expm1(C2 / (a * t + b))

        def jac(t, a, b, c):
            effective, x, denominator, dsdx = parts(t, a, b, c)
            return numpy.column_stack([dsdx * (-x * t / effective), dsdx * (-x / effective),
                                       eps / denominator])

        def slope(t, a, b, c):
            effective, x, _, dsdx = parts(t, a, b, c)
            return dsdx * (-x * a / effective)
        return f, jac, slope
    radiance = {float(t): float(band_radiance(band, mpf(t))) for t in temperatures}
    derivative = {float(t): float(mp.diff(lambda u: band_radiance(band, u), mpf(t)))
                  for t in temperatures}

    def table(values, t):
        return numpy.array([values[v] for v in t])

    def f_band(t, gain, offset):
        return gain * eps * table(radiance, t) + offset

    def jac_band(t, gain, offset):
        del gain, offset
        return numpy.column_stack([eps * table(radiance, t), numpy.ones(len(t))])

    def slope_band(t, gain, offset):
        del offset
        return gain * eps * table(derivative, t)
    return f_band, jac_band, slope_band


C2 = float(C2_UM)


def start_values(model, eps, t, s):
    if model == BAND:
        return [1.0, 0.0]
    slope, intercept = numpy.polyfit(1 / t, numpy.log(s / eps), 1)
    return [-C2 / slope, 0.0, float(numpy.exp(intercept))]


def scipy_fit(model, band, eps, temperatures, signals, u_t, u_s, weighted):
    t = numpy.array([float(v) for v in temperatures])
    s = numpy.array([float(v) for v in signals])
    ut = numpy.array([float(v) for v in u_t])
    us = numpy.array([float(v) for v in u_s])
    f, jac, dsdt = numpy_model(model, band, float(eps), temperatures)
    options = dict(method='lm', jac=jac, ftol=1e-15, xtol=1e-15, gtol=1e-15, maxfev=100000)
    p = numpy.array(start_values(model, float(eps), t, s))
    if not weighted:
        return curve_fit(f, t, s, p0=p, **options)
    sigma = us
    for _ in range(100):
        p, covariance = curve_fit(f, t, s, p0=p, sigma=sigma, absolute_sigma=True, **options)
        new_sigma = numpy.sqrt(us ** 2 + (dsdt(t, *p) * ut) ** 2)
        if numpy.max(numpy.abs(new_sigma / sigma - 1)) < 1e-12:
            return p, covariance
        sigma = new_sigma
    raise RuntimeError('effective-variance weights did not settle')


# ----------------------------------------------------------------------------
# One data set: its points, both fits, residuals, and signals to apply
# ----------------------------------------------------------------------------

def set_points(entry):
    name, model, band_text, eps, truth, temps, errors, u_t, u_rule = entry
    band = parse_band(band_text) if model == BAND else None
    p = [mpf(v) for v in truth]
    rows = []
    for i, t_text in enumerate(temps):
        exact = model_mp(model, band, p, mpf(t_text), mpf(eps))
        if errors is None:
            signal = fmt(exact)
        elif errors[0] == 'given':
            signal = errors[1][i]
        else:
            kind, values = errors
            noisy = exact * (1 + mpf(values[i])) if kind == 'relative' else exact + mpf(values[i])
            signal = mp.nstr(noisy, NOISY_DIGITS, min_fixed=1, max_fixed=0, strip_zeros=False)
        if u_rule is not None:
            u_signal = mp.nstr(mpf(u_rule[0]) + mpf(u_rule[1]) * mpf(signal), 6, min_fixed=1,
                               max_fixed=0, strip_zeros=False)
        else:
            u_signal = '0'
        rows.append({'set': name, 'temperature_k': t_text, 'signal': signal,
                     'u_temperature_k': u_t[i] if u_t is not None else '0', 'u_signal': u_signal})
    return rows


def temperature_of(model, band, p, signal):
    """The calibration applied: blackbody-equivalent temperature of a signal (mpmath)."""
    if model == SH:
        return (C2_UM / mp.log1p(p[2] / signal) - p[1]) / p[0]
    radiance = (signal - p[1]) / p[0]
    return band_temperature(band, radiance, 300)


def compute_set(entry):
    name, model, band_text, eps_text, truth, _, _, _, _ = entry
    band = parse_band(band_text) if model == BAND else None
    points = set_points(entry)
    eps = mpf(eps_text)
    temperatures = [double(r['temperature_k']) for r in points]
    signals = [double(r['signal']) for r in points]
    u_t = [double(r['u_temperature_k']) for r in points]
    u_s = [double(r['u_signal']) for r in points]
    weighted = u_s_given(u_s, u_t)
    p_scipy, cov_scipy = scipy_fit(model, band, eps_text, [r['temperature_k'] for r in points],
                                   [r['signal'] for r in points],
                                   [r['u_temperature_k'] for r in points],
                                   [r['u_signal'] for r in points], weighted)
    with mp.workdps(WORKING_DIGITS):
        p_mp, cov_mp, ssr = solve_gauss_newton(model, band, eps, temperatures, signals, u_t, u_s,
                                               p_scipy)
        residuals = []
        for r, t, s in zip(points, temperatures, signals):
            blackbody = s / eps if model == SH else (s - p_mp[1]) / eps + p_mp[1]
            residuals.append(temperature_of(model, band, p_mp, blackbody) - t)
            r['residual_k'] = fmt(residuals[-1])
        rms = mp.sqrt(sum(v ** 2 for v in residuals) / len(residuals))
    k = len(p_mp)
    fit = {'set': name, 'model': model, 'band': band_text, 'source_emissivity': eps_text}
    for j in range(PARAMETERS):
        fit['truth_p%d' % j] = truth[j] if j < k else 'nan'
        fit['p%d' % j] = repr(float(p_scipy[j])) if j < k else 'nan'
        fit['mp_p%d' % j] = fmt(p_mp[j]) if j < k else 'nan'
    for a, b in COVARIANCE_CELLS:
        inside = a < k and b < k
        fit['cov%d%d' % (a, b)] = repr(float(cov_scipy[a][b])) if inside else 'nan'
        fit['mp_cov%d%d' % (a, b)] = fmt(cov_mp[a, b]) if inside else 'nan'
    fit.update({'rms_residual_k': fmt(rms), 'chi_squared': fmt(ssr),
                'degrees_of_freedom': str(len(points) - k), 'weighted': str(int(weighted))})
    cov_rows = [[cov_mp[a, b] for b in range(k)] for a in range(k)]
    return fit, points, apply_rows(entry, model, band, eps, p_mp, cov_rows, points)


def apply_rows(entry, model, band, eps, p, covariance, points):
    """Signals to convert: each point's signal taken back to a blackbody (for the exact sets the
    answer is then the setpoint itself), and a few between, with and without u(S)."""
    name, exact = entry[0], entry[6] is None
    rows = []
    for r in points:
        s = double(r['signal'])
        blackbody = s / eps if model == SH else (s - p[1]) / eps + p[1]
        text = repr(float(blackbody))
        rows.append((text, '0', r['temperature_k'] if exact else None))
    first, last = double(points[0]['signal']), double(points[-1]['signal'])
    for share, u in (('0.3', '0'), ('0.5', '2.5'), ('0.9', '0.75')):
        between = first + mpf(share) * (last - first)
        rows.append((mp.nstr(between, 12, min_fixed=1, max_fixed=0, strip_zeros=False), u, None))
    out = []
    for signal_text, u_text, setpoint in rows:
        t, u = applied(model, band, p, covariance, double(signal_text), double(u_text))
        out.append({'set': name, 'signal': signal_text, 'u_signal': u_text,
                    'temperature_k': setpoint if setpoint is not None else fmt(t),
                    'u_temperature_k': fmt(u)})
    return out


def applied(model, band, p, covariance, signal, u_signal):
    """A calibration applied to one signal: T (K) and u(T), GUM with correlated parameters."""
    k = len(p)
    t = temperature_of(model, band, p, signal)
    # Implicit differentiation of S(T, p) = signal: dT/dS = 1/S_T, dT/dp = -S_p/S_T.
    grad, slope = gradient_mp(model, band, p, t, 1)
    variance = (u_signal / slope) ** 2
    for a in range(k):
        for b in range(k):
            variance += grad[a] * covariance[a][b] * grad[b] / slope ** 2
    return t, mp.sqrt(variance)


def double(text):
    return workflows.double(text)


def all_tables():
    fits, points, applied = [], [], []
    for entry in SETS:
        fit, set_rows, apply = compute_set(entry)
        fits.append(fit)
        points.extend(set_rows)
        applied.extend(apply)
    return [('calibration_fits', FIT_INPUTS, FIT_INPUTS + FIT_OUTPUTS, fits),
            ('calibration_points', POINT_INPUTS, POINT_INPUTS + POINT_OUTPUTS, points),
            ('calibration_apply', APPLY_INPUTS, APPLY_INPUTS + APPLY_OUTPUTS, applied)]


def lines_of(columns, rows):
    return ['\t'.join(columns)] + ['\t'.join(row[c] for c in columns) for row in rows]


def main():
    parser = argparse.ArgumentParser(description=__doc__.split('\n')[0])
    parser.add_argument('--check', action='store_true',
                        help='regenerate every row and compare with the committed vectors')
    checking = parser.parse_args().check
    tables = [(name, inputs, lines_of(columns, rows)) for name, inputs, columns, rows in
              all_tables()]
    if not checking:
        os.makedirs(workflows.VECTORS, exist_ok=True)
        for name, _, lines in tables:
            with open(os.path.join(workflows.VECTORS, name + '.tsv'), 'w') as stream:
                stream.write('\n'.join(lines) + '\n')
            print('calibration reference: wrote %s (%d rows)' % (name, len(lines) - 1))
        return 0
    counts = [workflows.check(name, inputs, lines) for name, inputs, lines in tables]
    passed, failed = sum(c[0] for c in counts), sum(c[1] for c in counts)
    print('calibration reference: %d passed, %d failed' % (passed, failed))
    return 1 if failed else 0


if __name__ == '__main__':
    sys.exit(main())
