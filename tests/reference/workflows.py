#!/usr/bin/python3
"""Reference vectors for the workflow functions: emissivity from a reference
measurement, two-colour (ratio) temperature, Monte Carlo propagation and
spectral grids.

Every expected value is computed with mpmath at WORKING_DIGITS significant
digits from the exact SI values h = 6.62607015e-34 J s, c = 299792458 m/s and
k = 1.380649e-23 J/K (CODATA 2018; exact since the 2019 SI).  Inputs are
doubles taken at their exact binary value.  Deliberately a second witness
beside generate.py: band radiances here come from tanh-sinh quadrature of
Planck's law (mpmath.quad), not from the blackbody-fraction closed forms, and
every derivative from mpmath.diff of the solved quantity, not from a formula.

    workflows.py           rewrite tests/reference/vectors/workflows_*.tsv
    workflows.py --check   regenerate every row and compare it with the
                           committed files (inputs as text, outputs to 1e-15
                           relative); prints "workflows reference: N passed,
                           N failed" and exits 1 on any drift.

Sources of the scenarios: worked examples A and B and the two-colour example
of /work/shared/REFERENCES.md; the rest are invented test scenes.
"""

import argparse
import functools
import math
import os
import sys

import mpmath
from mpmath import mp, mpf

WORKING_DIGITS = 30
PRINTED_DIGITS = 20
CHECK_RELATIVE_TOLERANCE = mpf('1e-15')

VECTORS = os.path.join(os.path.dirname(os.path.abspath(__file__)), 'vectors')

mp.dps = WORKING_DIGITS

H = mpf('6.62607015e-34')
C = mpf('299792458')
K = mpf('1.380649e-23')
C1L_UM = 2 * H * C ** 2 * mpf(10) ** 24  # W m^-2 sr^-1 um^4
C2_UM = H * C / K * mpf(10) ** 6  # um K
SIGMA = 2 * mp.pi ** 5 * K ** 4 / (15 * H ** 3 * C ** 2)

# The band solver's search range, core/band.h.
SOLVER_T_MIN = mpf('0.1')
SOLVER_T_MAX = mpf('1e6')


def double(text):
    """The exact value of the double a C test parses from `text`."""
    return mpf(float(text))


def fmt(value):
    if value is None:
        return 'nan'
    if isinstance(value, str):
        return value
    if value == 0:
        return '0'
    return mpmath.nstr(mpf(value), PRINTED_DIGITS, min_fixed=1, max_fixed=0, strip_zeros=False)


# ----------------------------------------------------------------------------
# Planck's law and flat-band radiance by quadrature
# ----------------------------------------------------------------------------

def spectral_radiance(wavelength_um, t):
    """Planck's law per um, W m^-2 sr^-1 um^-1."""
    return C1L_UM / wavelength_um ** 5 / mp.expm1(C2_UM / (wavelength_um * t))


def wavelength_limits(band):
    """A flat band in wavenumber covers the same spectrum as one in wavelength, and
    a flat weight integrates to the same band radiance in either coordinate."""
    kind, lower, upper = band
    if kind == 'wavenumber':
        return mpf(10) ** 4 / double(upper), mpf(10) ** 4 / double(lower)
    return double(lower), double(upper)


@functools.lru_cache(maxsize=None)
def _band_radiance(band, t, precision):
    with mp.workprec(precision):
        if band[0] == 'total':
            return SIGMA * t ** 4 / mp.pi
        lower, upper = wavelength_limits(band)
        return mp.quad(lambda w: spectral_radiance(w, t), [lower, upper])


def band_radiance(band, t):
    return _band_radiance(band, mpf(t), mp.prec)


def band_temperature(band, radiance, guess):
    return mp.findroot(lambda t: band_radiance(band, t) - radiance, mpf(guess))


def term_radiance(band, kind, value):
    return band_radiance(band, value) if kind == 'temperature' else value


def parse_band(text):
    """'total', 'wavelength:8:14' or 'wavenumber:700:1250'."""
    parts = text.split(':')
    return (parts[0], parts[1], parts[2]) if len(parts) == 3 else (parts[0], '0', '0')


def derivative(function, point):
    return mp.diff(function, mpf(point))


def refused(status, columns):
    """The row of a call that must fail: every value undefined, and the status."""
    outputs = {column: None for column in columns}
    outputs['status'] = status
    return outputs


# ----------------------------------------------------------------------------
# Emissivity from a reference measurement (the ASTM E1933 reference-temperature
# procedures): S = tau [eps L(T) + (1 - eps) L_refl] + A solved for eps.
# ----------------------------------------------------------------------------

SCENE_COLUMNS = ['signal_kind', 'signal', 'reflected_kind', 'reflected', 'transmittance',
                 'atmosphere_kind', 'atmosphere']
EMISSIVITY_INPUTS = ['case', 'band'] + SCENE_COLUMNS + ['surface_temperature_k',
                                                         'generating_emissivity']
EMISSIVITY_OUTPUTS = ['emissivity', 'd_surface_temperature', 'd_signal', 'd_reflected',
                      'd_transmittance', 'd_atmosphere', 'status']
# Derivative columns in the order of gb_emissivity_input.
EMISSIVITY_VARIED = [('d_surface_temperature', 'surface_temperature_k'), ('d_signal', 'signal'),
                     ('d_reflected', 'reflected'), ('d_transmittance', 'transmittance'),
                     ('d_atmosphere', 'atmosphere')]

FLAT_8_14 = 'wavelength:8:14'
T, R = 'temperature', 'radiance'

# (case, band, kinds of signal/reflected/atmosphere, signal or None to generate it, reflected,
#  tau, atmosphere ('nan' when not given), surface temperature, emissivity that generates S).
EMISSIVITY_CASES = [
    # Worked examples A and B of REFERENCES.md: the true temperatures they print belong to
    # eps = 0.95, but only to their printed digits, so they are no round trips.
    ('example_a', FLAT_8_14, (T, T, T), '308.15', '293.15', '1', 'nan', '308.886829188', None),
    ('example_a_atmosphere_given', FLAT_8_14, (T, T, T), '308.15', '293.15', '1', '288.15',
     '308.886829188', None),
    ('example_b', FLAT_8_14, (T, T, T), '308.15', '293.15', '0.9', '288.15', '310.995305', None),
    # Round trips: the signal is built here from a known emissivity.
    ('round_trip_lwir', FLAT_8_14, (T, T, T), None, '295', '1', 'nan', '330', '0.87'),
    ('round_trip_atmosphere', FLAT_8_14, (T, T, T), None, '290', '0.85', '280', '350', '0.62'),
    ('round_trip_cold_surface', FLAT_8_14, (T, T, T), None, '300', '1', 'nan', '260', '0.8'),
    ('round_trip_mwir', 'wavelength:3:5', (T, T, T), None, '350', '0.9', '300', '700', '0.4'),
    ('round_trip_wavenumber', 'wavenumber:700:1250', (T, T, T), None, '291', '0.8', '283', '333',
     '0.91'),
    ('round_trip_total', 'total', (T, T, T), None, '300', '0.95', '290', '500', '0.9'),
    ('round_trip_radiances', 'wavelength:10.5:11.5', (R, R, R), None, '2.2', '0.85', '1.3',
     '299.5', '0.97'),
    ('round_trip_mixed', FLAT_8_14, (T, R, T), None, '40', '0.95', '285', '312', '0.9'),
    ('round_trip_path_radiance', FLAT_8_14, (T, T, R), None, '280', '0.8', '6.5', '320', '0.75'),
    # Boundaries and inconsistent data.
    ('emissivity_one', FLAT_8_14, (T, T, T), '310', '293.15', '1', 'nan', '310', None),
    ('emissivity_zero', FLAT_8_14, (T, T, T), '293.15', '293.15', '1', 'nan', '310', None),
    ('emissivity_above_one', FLAT_8_14, (T, T, T), '320', '293.15', '1', 'nan', '310', None),
    ('emissivity_negative', FLAT_8_14, (T, T, T), '290', '293.15', '1', 'nan', '310', None),
    ('undetermined', FLAT_8_14, (T, T, T), '300', '300', '1', 'nan', '300', None),
    ('undetermined_total', 'total', (T, T, T), '300', '300', '0.9', '250', '300', None),
]


def atmosphere_part(band, kind, value, tau):
    if kind == 'radiance':
        return value
    if mp.isnan(value):
        return mpf(0)
    return (1 - tau) * band_radiance(band, value)


def emissivity_of(band, kinds, values):
    """(numerator, contrast) of eps; `values` maps input names to mpf."""
    signal = term_radiance(band, kinds[0], values['signal'])
    reflected = term_radiance(band, kinds[1], values['reflected'])
    tau = values['transmittance']
    surface = band_radiance(band, values['surface_temperature_k'])
    atmosphere = atmosphere_part(band, kinds[2], values['atmosphere'], tau)
    return signal - atmosphere - tau * reflected, tau * (surface - reflected)


def generated_signal(band, kinds, reflected, tau, atmosphere, t, eps):
    """The signal a surface of emissivity eps at T gives, as the kind of its column."""
    radiance = tau * (eps * band_radiance(band, t) + (1 - eps) * term_radiance(band, kinds[1],
                                                                               reflected))
    radiance += atmosphere_part(band, kinds[2], atmosphere, tau)
    if kinds[0] == 'radiance':
        return radiance
    return band_temperature(band, radiance, t)


def emissivity_rows():
    rows = []
    for case, band_text, kinds, signal, reflected, tau, atmosphere, t, eps in EMISSIVITY_CASES:
        if signal is None:
            value = generated_signal(parse_band(band_text), kinds, double(reflected), double(tau),
                                     double(atmosphere), double(t), mpf(eps))
            signal = repr(float(value))
        rows.append({'case': case, 'band': band_text, 'signal_kind': kinds[0], 'signal': signal,
                     'reflected_kind': kinds[1], 'reflected': reflected, 'transmittance': tau,
                     'atmosphere_kind': kinds[2], 'atmosphere': atmosphere,
                     'surface_temperature_k': t, 'generating_emissivity': eps or 'nan'})
    return rows


def emissivity_compute(row):
    band = parse_band(row['band'])
    kinds = (row['signal_kind'], row['reflected_kind'], row['atmosphere_kind'])
    values = {name: double(row[name]) for _, name in EMISSIVITY_VARIED}
    numerator, contrast = emissivity_of(band, kinds, values)
    if contrast == 0:
        return refused('GB_ERR_EMISSIVITY_UNDETERMINED', EMISSIVITY_OUTPUTS)
    eps = numerator / contrast
    if not 0 < eps <= 1:
        return refused('GB_ERR_EMISSIVITY_DOMAIN', EMISSIVITY_OUTPUTS)
    outputs = {'emissivity': eps}
    for column, name in EMISSIVITY_VARIED:
        if mp.isnan(values[name]):
            outputs[column] = mpf(0)  # absent only when tau = 1, where A = (1 - tau) L(Ta) = 0
            continue

        def varied(x, name=name):
            moved = dict(values)
            moved[name] = x
            top, bottom = emissivity_of(band, kinds, moved)
            return top / bottom
        outputs[column] = derivative(varied, values[name])
    if mp.isnan(values['atmosphere']) and kinds[2] == 'temperature':
        outputs['d_transmittance'] = None  # tau = 1 with no atmosphere: not defined
    outputs['status'] = 'GB_OK'
    return outputs


# ----------------------------------------------------------------------------
# Two-colour (ratio) temperature: R = r_eps L1(T) / L2(T)
# ----------------------------------------------------------------------------

RATIO_INPUTS = ['case', 'first', 'second', 'temperature_k', 'true_emissivity_ratio',
                'signal_ratio', 'emissivity_ratio']
RATIO_OUTPUTS = ['model_ratio', 'solved_temperature_k', 'wien_temperature_k',
                 'emissivity_ratio_sensitivity', 'status']

NEAR_IR = ('wl:0.9', 'wl:1.05')
BANDS = ('band:0.8:0.9', 'band:1.0:1.1')

# (case, first, second, temperature that generates the signal ratio, true eps1/eps2,
#  signal ratio or None to generate it, the eps1/eps2 given to the solver).
RATIO_CASES = [
    ('reference_example', NEAR_IR[0], NEAR_IR[1], '1500', '1', '0.471495314349', '1'),
    ('grey_1500', NEAR_IR[0], NEAR_IR[1], '1500', '1', None, '1'),
    ('non_grey_ignored', NEAR_IR[0], NEAR_IR[1], '1500', '1.02', None, '1'),
    ('non_grey_known', NEAR_IR[0], NEAR_IR[1], '1500', '1.02', None, '1.02'),
    ('grey_700', NEAR_IR[0], NEAR_IR[1], '700', '1', None, '1'),
    ('grey_3500', NEAR_IR[0], NEAR_IR[1], '3500', '1', None, '1'),
    ('grey_100000', NEAR_IR[0], NEAR_IR[1], '100000', '1', None, '1'),
    ('red_green', 'wl:0.55', 'wl:0.65', '2800', '0.97', None, '0.97'),
    ('bands_1000', BANDS[0], BANDS[1], '1000', '1', None, '1'),
    ('bands_1800', BANDS[0], BANDS[1], '1800', '1', None, '1'),
    ('bands_3000_non_grey', BANDS[0], BANDS[1], '3000', '0.95', None, '0.95'),
    ('band_and_wavelength', 'wl:0.65', BANDS[1], '2000', '1', None, '1'),
    ('near_solver_limit', NEAR_IR[0], NEAR_IR[1], '800000', '1', None, '1'),
    # A ratio of 1e-66: each radiance underflows a double at 15 K, their ratio does not.
    ('deep_cold', NEAR_IR[0], NEAR_IR[1], '15', '1', None, '1'),
    # (1.05/0.9)^4 = 1.8526 is the Rayleigh-Jeans limit of the ratio as T grows: 2 is never reached,
    # and 1.8515 lies above the ratio at the solver's 1e6 K (1.8505).
    ('unreachable_high', NEAR_IR[0], NEAR_IR[1], '1500', '1', '2', '1'),
    ('unreachable_beyond_solver_range', NEAR_IR[0], NEAR_IR[1], '1500', '1', '1.8515', '1'),
    ('unreachable_bands_reversed', BANDS[1], BANDS[0], '1500', '1', '0.5', '1'),
]


def channel_radiance(channel, t):
    parts = channel.split(':')
    if parts[0] == 'wl':
        return spectral_radiance(double(parts[1]), t)
    return band_radiance(('wavelength', parts[1], parts[2]), t)


def model_ratio(first, second, t, emissivity_ratio):
    return emissivity_ratio * channel_radiance(first, t) / channel_radiance(second, t)


def solve_ratio(first, second, signal_ratio, emissivity_ratio, guess):
    """T by Newton on ln R against 1/T (the log keeps the step well scaled)."""
    target = mp.log(signal_ratio / emissivity_ratio)
    inverse = mp.findroot(
        lambda u: mp.log(model_ratio(first, second, 1 / u, 1)) - target, 1 / mpf(guess))
    return 1 / inverse


def ratio_reachable(first, second, signal_ratio, emissivity_ratio):
    """The documented contract: a model ratio that rises with T, and R inside its range."""
    low = model_ratio(first, second, SOLVER_T_MIN, emissivity_ratio)
    high = model_ratio(first, second, SOLVER_T_MAX, emissivity_ratio)
    return low < signal_ratio < high


def ratio_rows():
    rows = []
    for case, first, second, t, true_ratio, signal, given_ratio in RATIO_CASES:
        if signal is None:
            signal = repr(float(model_ratio(first, second, double(t), double(true_ratio))))
        rows.append(dict(zip(RATIO_INPUTS, (case, first, second, t, true_ratio, signal,
                                            given_ratio))))
    return rows


def ratio_compute(row):
    first, second = row['first'], row['second']
    t, signal, given = (double(row[name]) for name in ('temperature_k', 'signal_ratio',
                                                          'emissivity_ratio'))
    outputs = {'model_ratio': model_ratio(first, second, t, double(row['true_emissivity_ratio']))}
    if not ratio_reachable(first, second, signal, given):
        outputs.update(refused('GB_ERR_RATIO_UNREACHABLE', RATIO_OUTPUTS[1:]))
        return outputs
    outputs['solved_temperature_k'] = solve_ratio(first, second, signal, given, t)
    outputs['emissivity_ratio_sensitivity'] = derivative(
        lambda r: solve_ratio(first, second, signal, r, t), given)
    outputs['wien_temperature_k'] = None
    if first.startswith('wl:') and second.startswith('wl:'):
        l1, l2 = double(first[3:]), double(second[3:])
        outputs['wien_temperature_k'] = C2_UM * (1 / l1 - 1 / l2) / (
            mp.log(given) + 5 * mp.log(l2 / l1) - mp.log(signal))
    outputs['status'] = 'GB_OK'
    return outputs


# ----------------------------------------------------------------------------
# Monte Carlo (JCGM 101:2008) against the GUM (JCGM 100:2008) and, where only
# one input varies, against the exact distribution of the output: T = g(x) is
# monotonic in that input, so T's quantiles are g at the input's quantiles and
# its moments are one-dimensional integrals.
# ----------------------------------------------------------------------------

INPUT_NAMES = ['emissivity', 'reflected', 'transmittance', 'atmosphere', 'signal']
MC_INPUTS = (['case', 'band'] + ['signal', 'emissivity', 'reflected', 'transmittance',
                                 'atmosphere', 'draws']
             + ['%s_%s' % (name, part) for name in INPUT_NAMES for part in ('law', 'u')])
MC_OUTPUTS = ['temperature_k', 'gum_standard_uncertainty_k', 'exact_standard_deviation_k',
              'standard_deviation_min_k', 'standard_deviation_max_k', 'exact_low_k', 'low_min_k',
              'low_max_k', 'exact_high_k', 'high_min_k', 'high_max_k']
COVERAGE = mpf('0.95')
# Tolerances from the sampling distribution of the Monte Carlo estimates: a quantile's
# probability has standard deviation sqrt(p (1 - p) / M), a sample standard deviation
# sqrt((mu4 - sigma^4) / (4 sigma^2 M)); SAMPLING_SIGMAS of these bound what a seed may give.
SAMPLING_SIGMAS = 5
# Enough Gauss-Legendre nodes that doubling them changes no moment in its 12th digit.
MOMENT_NODES = 24

# All with temperature terms, tau = 1 and no atmosphere temperature; laws 'normal',
# 'rectangular' or '-' (held fixed).
MC_CASES = [
    # Worked example A with the uncertainties of REFERENCES.md: the GUM-validation case.
    ('gum_example_a', '308.15', '0.95', '293.15',
     {'emissivity': ('normal', '0.02'), 'reflected': ('normal', '2'), 'signal': ('normal', '0.5')}),
    ('rectangular_emissivity', '308.15', '0.95', '293.15',
     {'emissivity': ('rectangular', '0.02')}),
    # u(eps) = 0.1 about 0.95: three draws in ten land above 1 and are redrawn.
    ('truncated_emissivity', '308.15', '0.95', '293.15', {'emissivity': ('normal', '0.1')}),
    # A hot low-emissivity surface before a cool background: strongly non-linear in eps.
    ('nonlinear_low_emissivity', '340', '0.3', '293.15', {'emissivity': ('normal', '0.1')}),
    # The same with a rectangular law: bounded away from eps = 0, so T has a finite spread
    # to compare (a normal law reaches eps -> 0, where T grows without bound).
    ('nonlinear_rectangular', '340', '0.3', '293.15', {'emissivity': ('rectangular', '0.1')}),
]
MC_DRAWS = '100000'


def scene_temperature(band, signal, eps, reflected):
    """T of the measurement equation with tau = 1 (worked-example form)."""
    surface = (band_radiance(band, signal) - (1 - eps) * band_radiance(band, reflected)) / eps
    return band_temperature(band, surface, signal)


def mc_rows():
    rows = []
    for case, signal, eps, reflected, laws in MC_CASES:
        row = {'case': case, 'band': FLAT_8_14, 'signal': signal, 'emissivity': eps,
               'reflected': reflected, 'transmittance': '1', 'atmosphere': 'nan',
               'draws': MC_DRAWS}
        for name in INPUT_NAMES:
            law, u = laws.get(name, ('-', '0'))
            row[name + '_law'], row[name + '_u'] = law, u
        rows.append(row)
    return rows


class OneInput:
    """The output's law when a single input x varies: T = g(x), x rectangular or a normal
    truncated to the input's domain (redrawn outside it, JCGM 101 6.4.1)."""

    def __init__(self, law, centre, u, domain):
        self.law, self.centre, self.u = law, centre, u
        if law == 'rectangular':
            half = mp.sqrt(3) * u
            self.low, self.high = max(domain[0], centre - half), min(domain[1], centre + half)
        else:
            self.low, self.high = domain
        self.mass_below_low = mp.ncdf((self.low - centre) / u) if law == 'normal' else 0
        self.mass = (mp.ncdf((self.high - centre) / u) - self.mass_below_low
                     if law == 'normal' else 1)

    def quantile(self, p):
        if self.law == 'rectangular':
            return self.low + p * (self.high - self.low)
        q = self.mass_below_low + p * self.mass
        return self.centre + self.u * mp.sqrt(2) * mp.erfinv(2 * q - 1)

    def density(self, x):
        if self.law == 'rectangular':
            return 1 / (self.high - self.low)
        return mp.npdf(x, self.centre, self.u) / self.mass


def quantile_bounds(one, output, p, draws):
    """T's p-quantile and the range a Monte Carlo estimate of it may take."""
    spread = SAMPLING_SIGMAS * mp.sqrt(p * (1 - p) / draws)
    values = [output(one.quantile(q)) for q in (p, p - spread, p + spread)]
    return values[0], min(values[1:]), max(values[1:])


def moments(one, output):
    """Mean, standard deviation and 4th central moment of T over a rectangular law, by
    Gauss-Legendre quadrature (T is analytic on the interval)."""
    with mp.workdps(20):
        abscissas, weights = mp.gauss_quadrature(MOMENT_NODES, 'legendre')
        nodes = [(one.low + (one.high - one.low) * (x + 1) / 2, w / 2)
                 for x, w in zip(abscissas, weights)]
        values = [(output(x), w) for x, w in nodes]
        mean = sum(v * w for v, w in values)
        variance = sum((v - mean) ** 2 * w for v, w in values)
        fourth = sum((v - mean) ** 4 * w for v, w in values)
    return mean, mp.sqrt(variance), fourth


def mc_compute(row):
    band = parse_band(row['band'])
    signal, eps, reflected = (double(row[n]) for n in ('signal', 'emissivity', 'reflected'))
    draws = int(row['draws'])
    centre = scene_temperature(band, signal, eps, reflected)
    outputs = {name: None for name in MC_OUTPUTS}
    outputs['temperature_k'] = centre
    functions = {
        'emissivity': lambda x: scene_temperature(band, signal, x, reflected),
        'reflected': lambda x: scene_temperature(band, signal, eps, x),
        'signal': lambda x: scene_temperature(band, x, eps, reflected),
    }
    centres = {'emissivity': eps, 'reflected': reflected, 'signal': signal}
    varied = [name for name in INPUT_NAMES if row[name + '_law'] != '-']
    variance = 0
    for name in varied:
        variance += (derivative(functions[name], centres[name]) * double(row[name + '_u'])) ** 2
    outputs['gum_standard_uncertainty_k'] = mp.sqrt(variance)
    if len(varied) != 1 or varied[0] != 'emissivity':
        return outputs
    one = OneInput(row['emissivity_law'], eps, double(row['emissivity_u']), (mpf(0), mpf(1)))
    output = functions['emissivity']
    # g falls with eps: T's low quantile is g at eps's high one.
    tail = (1 - COVERAGE) / 2
    high, high_min, high_max = quantile_bounds(one, output, tail, draws)
    low, low_min, low_max = quantile_bounds(one, output, 1 - tail, draws)
    outputs.update(exact_low_k=low, low_min_k=low_min, low_max_k=low_max, exact_high_k=high,
                   high_min_k=high_min, high_max_k=high_max)
    if one.law == 'rectangular':
        _, deviation, fourth = moments(one, output)
        spread = SAMPLING_SIGMAS * mp.sqrt((fourth - deviation ** 4) / (4 * deviation ** 2 * draws))
        outputs.update(exact_standard_deviation_k=deviation,
                       standard_deviation_min_k=deviation - spread,
                       standard_deviation_max_k=deviation + spread)
    return outputs


# ----------------------------------------------------------------------------
# Spectral grids: the exact positions lower + i (upper - lower)/(n - 1) and
# lower (upper/lower)^(i/(n - 1)), given as the nearest double and the rest in
# units in the last place of that double (so a test measures ulps exactly).
# ----------------------------------------------------------------------------

SPECTRUM_INPUTS = ['spacing', 'lower', 'upper', 'count', 'index']
SPECTRUM_OUTPUTS = ['nearest', 'rest_ulp']
SPECTRUM_GRIDS = [
    ('linear', '8', '14', 7, 1),
    ('linear', '0.3', '0.7', 5, 1),
    ('linear', '0.1', '1000', 1001, 10),
    ('linear', '0.001', '100000', 2001, 13),
    # An invented grid found by random search where the rounding reaches 2.06 ulp.
    ('linear', '44.45362772215789', '3237821.8170771385', 2808, 29),
    ('logarithmic', '1', '1024', 11, 1),
    ('logarithmic', '8', '14', 601, 10),
    ('logarithmic', '0.1', '1000', 1001, 10),
    ('logarithmic', '0.001', '100000', 2001, 13),
    # Limits whose quotient upper/lower overflows a double, though every position is modest.
    ('logarithmic', '1e-200', '1e200', 5, 1),
]
SPECTRUM_EXTRA_INDICES = {('linear', '44.45362772215789'): [731],
                          ('logarithmic', '0.1'): [551], ('logarithmic', '0.001'): [1499]}


def spectrum_rows():
    rows = []
    for spacing, lower, upper, count, stride in SPECTRUM_GRIDS:
        indices = set(range(0, count, stride)) | {count - 1}
        indices |= set(SPECTRUM_EXTRA_INDICES.get((spacing, lower), []))
        for index in sorted(indices):
            rows.append({'spacing': spacing, 'lower': lower, 'upper': upper,
                         'count': str(count), 'index': str(index)})
    return rows


def spectrum_compute(row):
    lower, upper = double(row['lower']), double(row['upper'])
    share = mpf(int(row['index'])) / (int(row['count']) - 1)
    if row['spacing'] == 'linear':
        exact = lower + share * (upper - lower)
    else:
        exact = lower * (upper / lower) ** share
    nearest = float(exact)
    return {'nearest': repr(nearest), 'rest_ulp': (exact - mpf(nearest)) / mpf(math.ulp(nearest))}


# ----------------------------------------------------------------------------
# Writing and checking
# ----------------------------------------------------------------------------

TABLES = [
    ('workflows_emissivity', EMISSIVITY_INPUTS, EMISSIVITY_OUTPUTS, emissivity_rows,
     emissivity_compute),
    ('workflows_ratio', RATIO_INPUTS, RATIO_OUTPUTS, ratio_rows, ratio_compute),
    ('workflows_montecarlo', MC_INPUTS, MC_OUTPUTS, mc_rows, mc_compute),
    ('workflows_spectrum', SPECTRUM_INPUTS, SPECTRUM_OUTPUTS, spectrum_rows, spectrum_compute),
]


def table_lines(inputs, outputs, rows, compute):
    lines = ['\t'.join(inputs + outputs)]
    for row in rows():
        results = compute(row)
        lines.append('\t'.join([row[c] for c in inputs] + [fmt(results[c]) for c in outputs]))
    return lines


def cells_agree(committed, regenerated):
    if committed == regenerated:
        return True
    try:
        expected, got = mpf(committed), mpf(regenerated)
    except (ValueError, TypeError):
        return False
    if expected == 0 or mp.isnan(expected):
        return False
    return abs(got / expected - 1) <= CHECK_RELATIVE_TOLERANCE


def check(name, inputs, lines):
    """(passed, failed) rows; inputs must match as text, outputs to the tolerance."""
    path = os.path.join(VECTORS, name + '.tsv')
    if not os.path.exists(path):
        print('workflows reference: %s is missing' % path)
        return 0, 1
    with open(path) as stream:
        committed = stream.read().splitlines()
    if committed[:1] != lines[:1] or len(committed) != len(lines):
        print('workflows reference: %s differs in its header or row count' % name)
        return 0, 1
    passed = failed = 0
    for old, new in zip(committed[1:], lines[1:]):
        old_cells, new_cells = old.split('\t'), new.split('\t')
        agree = (old_cells[:len(inputs)] == new_cells[:len(inputs)] and
                 all(cells_agree(a, b) for a, b in zip(old_cells, new_cells)))
        if agree:
            passed += 1
        else:
            failed += 1
            print('workflows reference: %s drifted\n  committed   %s\n  regenerated %s'
                  % (name, old, new))
    return passed, failed


def regenerate_all():
    """(name, input columns, lines) of every table, computed afresh."""
    return [(name, inputs, table_lines(inputs, outputs, rows, compute))
            for name, inputs, outputs, rows, compute in TABLES]


def main():
    parser = argparse.ArgumentParser(description=__doc__.split('\n')[0])
    parser.add_argument('--check', action='store_true',
                        help='regenerate every row and compare with the committed vectors')
    checking = parser.parse_args().check
    tables = regenerate_all()
    if not checking:
        os.makedirs(VECTORS, exist_ok=True)
        for name, _, lines in tables:
            with open(os.path.join(VECTORS, name + '.tsv'), 'w') as stream:
                stream.write('\n'.join(lines) + '\n')
            print('workflows reference: wrote %s (%d rows)' % (name, len(lines) - 1))
        return 0
    counts = [check(name, inputs, lines) for name, inputs, lines in tables]
    passed, failed = sum(c[0] for c in counts), sum(c[1] for c in counts)
    print('workflows reference: %d passed, %d failed' % (passed, failed))
    return 1 if failed else 0


if __name__ == '__main__':
    sys.exit(main())
