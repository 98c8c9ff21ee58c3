#!/usr/bin/python3
"""Reference vectors for greybody's unit tests.

Every expected value is computed with mpmath at WORKING_DIGITS significant
digits from the exact SI values h = 6.62607015e-34 J s, c = 299792458 m/s and
k = 1.380649e-23 J/K (CODATA 2018; exact since the 2019 SI) and printed with
20 significant digits.  Every input is a double and is taken at its exact
binary value, so a vector measures the error a C function makes on exactly the
number it was given, not the rounding of a decimal.

    generate.py           rewrite tests/reference/vectors/*.tsv
    generate.py --check   recompute a fixed sample of rows of every vector file,
                          and the derived constants of core/constants.h, and
                          compare them with what is committed (1e-15 relative)

Methods (all independent of the C code):
  Planck's law evaluated directly; the blackbody fraction in closed form with
  polylogarithms, int_x^inf t^3/(e^t - 1) dt = sum over s of Li_s(e^-x) terms,
  cross-checked by tanh-sinh quadrature when the vectors are written; response
  bands by quadrature of each linear piece; the measurement equation solved
  with findroot and its sensitivities taken by mpmath.diff of that solution.
The response tables written here are synthetic, invented for these tests.
"""

import argparse
import functools
import os
import random
import re
import sys

import mpmath
from mpmath import mp, mpf

WORKING_DIGITS = 50
PRINTED_DIGITS = 20
CHECK_SAMPLE_ROWS = 40
CHECK_SEED = 1901  # fixed: the sample must not change from run to run
CHECK_RELATIVE_TOLERANCE = mpf('1e-15')

HERE = os.path.dirname(os.path.abspath(__file__))
VECTORS = os.path.join(HERE, 'vectors')
CONSTANTS_HEADER = os.path.join(HERE, '..', '..', 'core', 'constants.h')

mp.dps = WORKING_DIGITS

# CODATA 2018, exact by the 2019 SI definitions.
H = mpf('6.62607015e-34')
C = mpf('299792458')
K = mpf('1.380649e-23')


def c1l():
    return 2 * H * C ** 2


def c2():
    return H * C / K


def sigma():
    return 2 * mp.pi ** 5 * K ** 4 / (15 * H ** 3 * C ** 2)


def sigma_photon():
    return 4 * mp.pi * mp.zeta(3) * K ** 3 / (H ** 3 * C ** 2)


def wien_root(power):
    """Root of x = q (1 - e^-x), the peak of t^q / (e^t - 1)."""
    q = mpf(power)
    return q + mp.lambertw(-q * mp.exp(-q)).real


def fmt(value):
    if value is None:
        return 'nan'
    if isinstance(value, str):
        return value
    value = mpf(value)
    if value == 0:
        return '0'
    return mpmath.nstr(value, PRINTED_DIGITS, min_fixed=1, max_fixed=0, strip_zeros=False)


def double(text_or_number):
    """The exact value of a double, as mpmath sees it."""
    return mpf(float(text_or_number))


# ----------------------------------------------------------------------------
# Planck's law in each spectral coordinate
# ----------------------------------------------------------------------------

def planck_terms(coordinate, s):
    """(x T in K, c1' s^p in the coordinate's radiance unit, photon energy in J)."""
    if coordinate == 'wavelength':  # um; radiance per um
        return c2() * mpf(10) ** 6 / s, c1l() * mpf(10) ** 24 / s ** 5, H * C * mpf(10) ** 6 / s
    if coordinate == 'wavenumber':  # cm^-1; radiance per cm^-1
        return c2() * 100 * s, c1l() * mpf(10) ** 8 * s ** 3, H * C * 100 * s
    if coordinate == 'frequency':  # Hz; radiance per Hz
        return H * s / K, 2 * H * s ** 3 / C ** 2, H * s
    raise ValueError(coordinate)


def planck(coordinate, position, t):
    """(x, L, photon radiance, dL/dT) of a blackbody."""
    exponent_times_t, prefactor, photon_energy = planck_terms(coordinate, position)
    x = exponent_times_t / t
    radiance = prefactor / mp.expm1(x)
    derivative = radiance * x / (t * -mp.expm1(-x))
    return x, radiance, radiance / photon_energy, derivative


def brightness_temperature(coordinate, position, radiance, emissivity):
    exponent_times_t, prefactor, _ = planck_terms(coordinate, position)
    return exponent_times_t / mp.log1p(emissivity * prefactor / radiance)


# ----------------------------------------------------------------------------
# Blackbody fractions: G_q(x) = int_x^inf t^q / (e^t - 1) dt, normalised
# ----------------------------------------------------------------------------

def tail_integral(power, x):
    """int_x^inf t^power / (e^t - 1) dt = sum_j power!/(power-j)! x^(power-j) Li_(j+1)(e^-x)."""
    z = mp.exp(-x)
    total = mpf(0)
    coefficient = mpf(1)
    for j in range(power + 1):
        if j > 0:
            coefficient *= power - j + 1
        order = j + 1
        if order > 1:
            polylog = mp.polylog(order, z)
        else:  # Li_1(z) = -ln(1 - z), without cancellation at either end
            polylog = -mp.log(-mp.expm1(-x)) if x < 1 else -mp.log1p(-z)
        total += coefficient * x ** (power - j) * polylog
    return total


def head_integral(power, x):
    """int_0^x t^power / (e^t - 1) dt, directly, so that small complements keep their digits."""
    return mp.quad(lambda t: t ** power / mp.expm1(t), mp.linspace(0, x, 4))


def energy_normaliser():
    return 15 / mp.pi ** 4


def photon_normaliser():
    return 1 / (2 * mp.zeta(3))


def fractions(x):
    """(F, 1 - F, F_photon, 1 - F_photon) below the wavelength c2 / (x T)."""
    below = energy_normaliser() * tail_integral(3, x)
    photon_below = photon_normaliser() * tail_integral(2, x)
    return below, 1 - below, photon_below, 1 - photon_below


# ----------------------------------------------------------------------------
# Bands
# ----------------------------------------------------------------------------

def band_exponents(kind, lo, hi, t):
    """(a, b), a < b: the exponents x at the long- and short-wavelength ends."""
    if kind == 'wavelength':
        return c2() * mpf(10) ** 6 / (hi * t), c2() * mpf(10) ** 6 / (lo * t)
    if kind == 'wavenumber':
        return c2() * 100 * lo / t, c2() * 100 * hi / t
    raise ValueError(kind)


def flat_band(kind, lower, upper, t):
    """(radiance, dL/dT, photon exitance, fraction) of a blackbody in a flat band."""
    if kind == 'total':
        return (sigma() * t ** 4 / mp.pi, 4 * sigma() * t ** 3 / mp.pi, sigma_photon() * t ** 3,
                mpf(1))
    a, b = band_exponents(kind, lower, upper, t)
    share = energy_normaliser() * (tail_integral(3, a) - tail_integral(3, b))
    photon_share = photon_normaliser() * (tail_integral(2, a) - tail_integral(2, b))
    edge = energy_normaliser() * (a ** 4 / mp.expm1(a) - b ** 4 / mp.expm1(b))
    return (sigma() * t ** 4 / mp.pi * share, sigma() * t ** 3 / mp.pi * (4 * share + edge),
            sigma_photon() * t ** 3 * photon_share, share)


def flat_band_by_quadrature(kind, lower, upper, t):
    """The share by tanh-sinh quadrature, on pieces short enough for e^-u to be resolved."""
    a, b = band_exponents(kind, lower, upper, t)
    steps = [mpf(2) ** k for k in range(-6, 2)] + [mpf(4) * j for j in range(1, 200)]
    nodes = [a] + [a + step for step in steps if a + step < b] + [b]
    # mpmath's quadrature stops on an absolute error, so the integrand is scaled by e^a.
    scaled = mp.quad(lambda u: u ** 3 * mp.exp(a - u) / -mp.expm1(-u), nodes)
    return energy_normaliser() * mp.exp(-a) * scaled


@functools.lru_cache(maxsize=None)
def read_response(name):
    path = os.path.join(VECTORS, 'response_%s.tsv' % name)
    points = []
    with open(path) as stream:
        for line in stream:
            if line.startswith('#') or line.startswith('wavelength_um'):
                continue
            wavelength, value = line.split('\t')
            points.append((double(wavelength), double(value)))
    return points


def response_pieces(points):
    """Linear pieces split so that each spans a wavelength ratio of at most 1.05."""
    for (left, r_left), (right, r_right) in zip(points, points[1:]):
        slope = (r_right - r_left) / (right - left)
        count = int(mp.ceil(mp.log(right / left) / mp.log(mpf('1.05'))))
        nodes = [left * (right / left) ** (mpf(i) / count) for i in range(count)] + [right]
        yield (lambda w, l0=left, r0=r_left, s=slope: r0 + s * (w - l0)), nodes


def response_integral(points, integrand):
    total = mpf(0)
    for response, nodes in response_pieces(points):
        for left, right in zip(nodes, nodes[1:]):
            # mpmath's quadrature stops on an absolute error: integrate a scaled integrand.
            scale = abs(integrand((left + right) / 2))
            total += scale * mp.quad(lambda w, r=response: r(w) * integrand(w) / scale,
                                     [left, right])
    return total


def response_band(name, t):
    """(radiance, dL/dT, photon exitance pi int R L_q, fraction) for a response band."""
    points = read_response(name)

    def spectral(w, column):
        return planck('wavelength', w, t)[column]

    radiance = response_integral(points, lambda w: spectral(w, 1))
    derivative = response_integral(points, lambda w: spectral(w, 3))
    photons = mp.pi * response_integral(points, lambda w: spectral(w, 2))
    return radiance, derivative, photons, radiance / (sigma() * t ** 4 / mp.pi)


# The response tables are synthetic: shapes invented for these tests, not any instrument's.
SYNTHETIC_RESPONSES = {
    'synthetic_lwir': [(7.0, 0.0), (7.5, 0.2), (8.0, 0.7), (9.0, 0.95), (10.0, 1.0), (11.0, 0.98),
                       (12.0, 0.9), (13.0, 0.75), (14.0, 0.4), (14.5, 0.05), (15.0, 0.0)],
    'synthetic_mwir': [(3.0, 0.0), (3.4, 0.6), (4.2, 1.0), (4.9, 0.85), (5.1, 0.0)],
    'synthetic_notched': [(0.9, 0.1), (1.1, 0.5), (1.3, 0.0), (1.5, 0.0), (1.55, 2.0), (1.6, 0.0),
                          (2.5, 0.3)],
    'synthetic_visible': [(0.38, 0.0), (0.45, 0.4), (0.55, 1.0), (0.65, 0.6), (0.75, 0.0)],
    'synthetic_flat_8_14': [(8.0, 1.0), (14.0, 1.0)],
}


def write_responses():
    for name, points in SYNTHETIC_RESPONSES.items():
        with open(os.path.join(VECTORS, 'response_%s.tsv' % name), 'w') as stream:
            stream.write('# synthetic relative spectral response, invented for greybody tests\n')
            stream.write('wavelength_um\tresponse\n')
            for wavelength, value in points:
                stream.write('%r\t%r\n' % (wavelength, value))


def wavelength_moment(power, left, right, t):
    """int lambda^power L dlambda over [left, right] um and its T-derivative, in closed form.

    With X = c2 / T and x = X / lambda the integral is c1L X^(power - 4) times
    int x^(3 - power) / (e^x - 1) dx, whose tails are tail_integral's.
    """
    scale = c2() * mpf(10) ** 6 / t
    a, b = scale / right, scale / left
    p = 3 - power
    factor = c1l() * mpf(10) ** 24 * scale ** (power - 4)
    difference = tail_integral(p, a) - tail_integral(p, b)
    edges = a ** (p + 1) / mp.expm1(a) - b ** (p + 1) / mp.expm1(b)
    return factor * difference, factor / t * ((4 - power) * difference + edges)


def response_band_closed_form(name, t):
    """(L, dL/dT): a linear piece r0 + s lambda weights the zeroth and first moments."""
    radiance = derivative = mpf(0)
    points = read_response(name)
    for (left, r_left), (right, r_right) in zip(points, points[1:]):
        slope = (r_right - r_left) / (right - left)
        intercept = r_left - slope * left
        zeroth, first = wavelength_moment(0, left, right, t), wavelength_moment(1, left, right, t)
        radiance += intercept * zeroth[0] + slope * first[0]
        derivative += intercept * zeroth[1] + slope * first[1]
    return radiance, derivative


def band_radiance(band, t):
    """(L, dL/dT) of a band given as (kind, lower, upper, response name)."""
    kind, lower, upper, response = band
    if kind == 'response':
        return response_band_closed_form(response, t)
    return flat_band(kind, lower, upper, t)[:2]


# ----------------------------------------------------------------------------
# The measurement equation
# ----------------------------------------------------------------------------

def band_temperature(band, radiance):
    """The T with L_band(T) = radiance: bracket by doubling, then Anderson-Bjorck."""
    target = mp.log(radiance)

    def residual(t):
        return mp.log(band_radiance(band, t)[0]) - target

    low = mpf('0.5')
    while residual(low) > 0:
        low /= 2
    high = low * 2
    while residual(high) < 0:
        low, high = high, high * 2
    return mp.findroot(residual, (low, high), solver='anderson')


def term_radiance(band, kind, value):
    if kind == 'radiance':
        return mpf(value)
    return band_radiance(band, value)[0]


def measurement_terms(band, inputs):
    """(S, L_refl, A) of S = tau [eps L(T) + (1 - eps) L_refl] + A."""
    signal = term_radiance(band, inputs['signal_kind'], inputs['signal'])
    reflected = term_radiance(band, inputs['reflected_kind'], inputs['reflected'])
    if inputs['atmosphere_kind'] == 'radiance':
        atmosphere = mpf(inputs['atmosphere'])
    else:
        atmosphere = (1 - inputs['transmittance']) * band_radiance(band, inputs['atmosphere'])[0]
    return signal, reflected, atmosphere


def measured_temperature(band, inputs):
    """T from the measurement equation; None when no surface radiance is left."""
    tau, eps = inputs['transmittance'], inputs['emissivity']
    signal, reflected, atmosphere = measurement_terms(band, inputs)
    surface = (signal - tau * (1 - eps) * reflected - atmosphere) / (tau * eps)
    if surface <= 0:
        return None
    return band_temperature(band, surface)


SENSITIVITY_INPUTS = [('d_emissivity', 'emissivity'), ('d_reflected', 'reflected'),
                      ('d_transmittance', 'transmittance'), ('d_atmosphere', 'atmosphere'),
                      ('d_signal', 'signal')]


def measure_case(band, exact):
    temperature = measured_temperature(band, exact)
    if temperature is None:
        return None
    outputs = {'temperature_k': temperature}
    surface, surface_derivative = band_radiance(band, temperature)
    outputs['surface_radiance'] = surface
    outputs['surface_derivative'] = surface_derivative
    terms = measurement_terms(band, exact)
    outputs.update(zip(('signal_radiance', 'reflected_radiance', 'atmosphere_part'), terms))
    for column, name in SENSITIVITY_INPUTS:
        def solved(value, varied=name):
            changed = dict(exact)
            changed[varied] = value
            return measured_temperature(band, changed)
        outputs[column] = mp.diff(solved, exact[name])
    shifted = dict(exact)
    shifted['emissivity'] = exact['emissivity'] + exact['delta']
    outputs['emissivity_error_k'] = measured_temperature(band, shifted) - temperature
    return outputs


# ----------------------------------------------------------------------------
# Tables: input columns, output columns, the input rows and how to compute a row
# ----------------------------------------------------------------------------

class Table:
    def __init__(self, name, inputs, outputs, rows, compute):
        self.name, self.inputs, self.outputs = name, inputs, outputs
        self.rows, self.compute = rows, compute

    def path(self):
        return os.path.join(VECTORS, self.name + '.tsv')


def geometric(first, last, count):
    return [float(mpf(first) * (mpf(last) / first) ** (mpf(i) / (count - 1))) for i in range(count)]


def rounded(value, digits=6):
    return float('%.*g' % (digits, value))


# ---- units (ITS-90 relation t/C = T/K - 273.15; t/F = 1.8 t/C + 32; exact SI c) ----

CELSIUS_OFFSET = mpf('273.15')
FAHRENHEIT_PER_KELVIN = mpf('1.8')


def units_compute(row):
    conversion, unit, value = row['conversion'], row['unit'], double(row['input'])
    offset_celsius = {'K': 0, 'C': CELSIUS_OFFSET}
    if conversion == 'temperature_to_kelvin':
        if unit == 'F':
            result = (value - 32) / FAHRENHEIT_PER_KELVIN + CELSIUS_OFFSET
        else:
            result = value + offset_celsius[unit]
        if result <= 0 or result > mpf('1e9'):
            return {'expected': None, 'status': 'GB_ERR_TEMPERATURE_DOMAIN'}
    elif conversion == 'temperature_from_kelvin':
        if unit == 'F':
            result = (value - CELSIUS_OFFSET) * FAHRENHEIT_PER_KELVIN + 32
        else:
            result = value - offset_celsius[unit]
    elif conversion == 'difference_to_kelvin':
        result = value / FAHRENHEIT_PER_KELVIN if unit == 'F' else value
    elif conversion == 'difference_from_kelvin':
        result = value * FAHRENHEIT_PER_KELVIN if unit == 'F' else value
    elif conversion == 'wavelength_to_micrometres':
        result = value / {'um': 1, 'nm': mpf(1000), 'm': mpf('1e-6')}[unit]
    elif conversion in ('wavenumber_to_wavelength', 'wavelength_to_wavenumber'):
        result = mpf(10) ** 4 / value
    elif conversion in ('frequency_to_wavelength', 'wavelength_to_frequency'):
        result = C * mpf(10) ** 6 / value
    else:
        raise ValueError(conversion)
    return {'expected': result, 'status': 'GB_OK'}


def units_rows():
    rows = []
    for unit, values in (('K', [1e-300, 0.001, 1.0, 273.16, 300.0, 1e9]),
                         ('C', [-273.0, -40.0, -17.5, 0.0, 25.0, 36.6, 1084.62, 5504.85]),
                         ('F', [-459.0, -40.0, 0.0, 32.0, 98.6, 451.0, 3000.5])):
        rows += [('temperature_to_kelvin', unit, v) for v in values]
        rows += [('temperature_to_kelvin', unit, v) for v in (-500.0, 2e9)]
    for unit in ('K', 'C', 'F'):
        rows += [('temperature_from_kelvin', unit, v) for v in (0.5, 233.15, 273.15, 310.15, 2e4)]
        rows += [(d, unit, v) for d in ('difference_to_kelvin', 'difference_from_kelvin')
                 for v in (-3.7, 0.0, 0.02, 1.0, 2.5, 1800.0)]
    for unit, values in (('um', [1e-3, 0.55, 10.0, 1e5]), ('nm', [0.1, 550.0, 10600.0, 3e7]),
                         ('m', [1e-9, 5.5e-7, 1.06e-5, 1.0])):
        rows += [('wavelength_to_micrometres', unit, v) for v in values]
    for conversion in ('wavenumber_to_wavelength', 'wavelength_to_wavenumber',
                       'frequency_to_wavelength', 'wavelength_to_frequency'):
        rows += [(conversion, '-', v) for v in (1e-200, 0.3, 3.0, 10.0, 714.2857, 1e12, 1e200)]
    return [{'conversion': c, 'unit': u, 'input': repr(v)} for c, u, v in rows]


# ---- Planck, brightness temperature, Wien, Stefan-Boltzmann ----

PLANCK_TEMPERATURES = [0.001, 1.0, 77.0, 300.0, 1500.0, 5778.0, 1e5, 1e9]
PLANCK_EXPONENTS = [1e-6, 1e-4, 1e-2, 0.1, 0.5, 1.0, 2.0, 2.8214, 3.9207, 4.9651, 8.0, 15.0,
                    30.0, 60.0, 100.0, 200.0, 400.0, 600.0, 699.0, 701.0, 720.0, 740.0, 760.0,
                    800.0, 2000.0]
COORDINATES = ['wavelength', 'wavenumber', 'frequency']


def position_for(coordinate, exponent, temperature):
    """A round spectral position where the blackbody at `temperature` has about this x."""
    exponent_times_t, _, _ = planck_terms(coordinate, mpf(1))
    if coordinate == 'wavelength':
        return rounded(float(exponent_times_t / (exponent * temperature)))
    return rounded(float(exponent * temperature / exponent_times_t))


def planck_rows():
    rows = []
    for coordinate in COORDINATES:
        for t in PLANCK_TEMPERATURES:
            for x in PLANCK_EXPONENTS:
                rows.append((coordinate, position_for(coordinate, x, t), t, 1.0))
        for position, t in ((10.0, 300.0), (4.0, 1000.0)):
            rows += [(coordinate, position, t, e) for e in (0.95, 0.5, 1e-3)]
    # Far ends: positions whose powers overflow or underflow a double.
    rows += [('wavelength', p, t, 1.0) for p in (1e-62, 1e-10, 1e10, 1e62, 1e70)
             for t in (0.001, 300.0, 1e9)]
    rows += [('wavenumber', p, t, 1.0) for p in (1e-120, 1e-30, 1e30, 1e110) for t in (1.0, 1e9)]
    rows += [('frequency', p, t, 1.0) for p in (1e-110, 1.0, 1e25) for t in (1.0, 1e9)]
    return [{'coordinate': c, 'position': repr(p), 'temperature_k': repr(t), 'emissivity': repr(e)}
            for c, p, t, e in rows]


def planck_compute(row):
    x, radiance, photons, derivative = planck(row['coordinate'], double(row['position']),
                                              double(row['temperature_k']))
    eps = double(row['emissivity'])
    return {'x': x, 'radiance': eps * radiance, 'photon_radiance': eps * photons,
            'radiance_derivative': derivative}


BRIGHTNESS_TEMPERATURES = [0.001, 0.5, 10.0, 77.3, 300.0, 1000.0, 5778.0, 1e5, 1e7, 9e8]
BRIGHTNESS_EXPONENTS = [1e-6, 1e-2, 1.0, 5.0, 30.0, 200.0, 600.0, 700.0]


def brightness_rows():
    rows = []
    for coordinate in COORDINATES:
        for t in BRIGHTNESS_TEMPERATURES:
            for x in BRIGHTNESS_EXPONENTS:
                position = position_for(coordinate, x, t)
                for eps in (1.0, 0.9):
                    radiance = float(eps * planck(coordinate, double(position), double(t))[1])
                    if 0.0 < radiance < float('inf'):
                        rows.append((coordinate, position, radiance, eps))
    # Radiances far outside what (0, 1e9] K can give, and the smallest doubles.
    rows += [('wavelength', 10.0, r, 1.0) for r in (1e30, 1e300, 1.7e308, 5e-324, 1e-300)]
    rows += [('wavenumber', 1000.0, r, 0.5) for r in (1e20, 5e-324)]
    rows += [('frequency', 3e13, r, 1.0) for r in (1e-3, 1e-200)]
    return [{'coordinate': c, 'position': repr(p), 'radiance': repr(r), 'emissivity': repr(e)}
            for c, p, r, e in rows]


def brightness_compute(row):
    t = brightness_temperature(row['coordinate'], double(row['position']),
                               double(row['radiance']), double(row['emissivity']))
    if t > mpf('1e9'):
        return {'temperature_k': None, 'status': 'GB_ERR_RADIANCE_OUT_OF_RANGE'}
    return {'temperature_k': t, 'status': 'GB_OK'}


def wien_rows():
    return [{'temperature_k': repr(t)}
            for t in (1e-6, 0.5, 1.0, 77.0, 310.0, 1000.0, 5778.0, 1e4, 1e6, 1e9)]


def wien_compute(row):
    t = double(row['temperature_k'])
    c2_um, c2_cm = c2() * mpf(10) ** 6, c2() * 100
    peak = c2_um / wien_root(5) / t
    return {'wavelength_um': peak, 'wavenumber_cm': wien_root(3) / c2_cm * t,
            'frequency_hz': wien_root(3) * K / H * t,
            'photon_wavelength_um': c2_um / wien_root(4) / t,
            'radiance_at_peak': planck('wavelength', peak, t)[1]}


def stefan_boltzmann_rows():
    return [{'temperature_k': repr(t), 'emissivity': repr(e)}
            for t in (1e-3, 0.1, 1.0, 77.0, 300.0, 310.15, 1234.5, 5778.0, 1e6, 1e9)
            for e in (1.0, 0.95, 0.123)]


def stefan_boltzmann_compute(row):
    t, eps = double(row['temperature_k']), double(row['emissivity'])
    return {'exitance': eps * sigma() * t ** 4, 'radiance': eps * sigma() * t ** 4 / mp.pi,
            'photon_exitance': eps * sigma_photon() * t ** 3}


# ---- blackbody fractions ----

def fraction_rows():
    xs = geometric(1e-4, 700.0, 71)
    xs += [1.0, 2.0, 2.9999999999, 3.0, 3.0000000001, 6.283185307179586, 10.0, 36.0,
           720.0, 745.0, 800.0, 1000.0]
    xs += [float(c2() * mpf(10) ** 6 / lt) for lt in (1000, 2000, 3000, 4000, 6000, 10000, 20000)]
    return [{'x': repr(x)} for x in sorted(set(xs))]


def fraction_compute(row):
    below, above, photon_below, photon_above = fractions(double(row['x']))
    return {'below': below, 'above': above, 'photon_below': photon_below,
            'photon_above': photon_above}


def fraction_at_rows():
    products = [1e-3, 1.0, 100.0, 500.0, 1000.0, 2000.0, 2897.771955185172661, 3000.0, 4000.0,
                4107.24848771, 5000.0, 6000.0, 6104.88556837, 8000.0, 1e4, 2e4, 1e5, 1e7, 1e9]
    return [{'wavelength_temperature_um_k': repr(p)} for p in products]


def fraction_at_compute(row):
    x = c2() * mpf(10) ** 6 / double(row['wavelength_temperature_um_k'])
    below, above, _, _ = fractions(x)
    return {'below': below, 'above': above}


# ---- bands ----

FLAT_BANDS = [('wavelength', 8.0, 14.0), ('wavelength', 3.0, 5.0), ('wavelength', 10.0, 10.001),
              ('wavelength', 7.5, 7.5000001), ('wavelength', 0.1, 1000.0),
              ('wavelength', 1e-3, 1e5), ('wavelength', 0.4, 0.7), ('wavelength', 1000.0, 1e5),
              ('wavenumber', 700.0, 1250.0), ('wavenumber', 2000.0, 3333.3),
              ('wavenumber', 1000.0, 1000.1), ('wavenumber', 0.1, 1e7), ('total', 0.0, 0.0)]
BAND_TEMPERATURES = [1.0, 2.0, 5.0, 10.0, 30.0, 77.0, 200.0, 300.0, 310.15, 500.0, 1000.0,
                     3000.0, 5778.0, 1e4, 3e4, 1e5, 3e5, 1e6]


def band_rows():
    return [{'band_kind': kind, 'band_lower': repr(lo), 'band_upper': repr(hi),
             'temperature_k': repr(t)} for kind, lo, hi in FLAT_BANDS for t in BAND_TEMPERATURES]


def band_compute(row):
    radiance, derivative, photons, share = flat_band(
        row['band_kind'], double(row['band_lower']), double(row['band_upper']),
        double(row['temperature_k']))
    return {'radiance': radiance, 'radiance_derivative': derivative, 'photon_exitance': photons,
            'fraction': share}


RESPONSE_TEMPERATURES = {
    'synthetic_lwir': [50.0, 200.0, 300.0, 500.0, 1000.0, 1e4, 1e6],
    'synthetic_mwir': [100.0, 300.0, 600.0, 1500.0, 1e5],
    'synthetic_notched': [300.0, 1000.0, 2500.0, 1e4],
    'synthetic_visible': [1000.0, 3000.0, 5778.0, 1e5],
    'synthetic_flat_8_14': [77.0, 300.0, 3000.0],
}


def response_rows():
    return [{'response': name, 'temperature_k': repr(t)}
            for name, temperatures in RESPONSE_TEMPERATURES.items() for t in temperatures]


def response_compute(row):
    radiance, derivative, photons, share = response_band(row['response'],
                                                         double(row['temperature_k']))
    return {'radiance': radiance, 'radiance_derivative': derivative, 'photon_exitance': photons,
            'fraction': share}


# ---- measurement equation (worked examples A and B are from /work/shared/REFERENCES.md) ----

FLAT_8_14 = ('wavelength', 8.0, 14.0, '-')
TOTAL = ('total', 0.0, 0.0, '-')


def scene(signal, eps, reflected, tau, atmosphere, delta, kinds=('temperature',) * 3):
    return {'signal_kind': kinds[0], 'signal': signal, 'emissivity': eps,
            'reflected_kind': kinds[1], 'reflected': reflected, 'transmittance': tau,
            'atmosphere_kind': kinds[2], 'atmosphere': atmosphere, 'delta': delta}


MEASURE_CASES = [
    ('example_a', FLAT_8_14, scene(308.15, 0.95, 293.15, 1.0, 288.15, -0.02)),
    ('example_a_total', TOTAL, scene(308.15, 0.95, 293.15, 1.0, 288.15, -0.02)),
    ('example_a_half', FLAT_8_14, scene(308.15, 0.5, 293.15, 1.0, 288.15, 0.05)),
    ('example_a_half_total', TOTAL, scene(308.15, 0.5, 293.15, 1.0, 288.15, 0.05)),
    ('example_b', FLAT_8_14, scene(308.15, 0.95, 293.15, 0.9, 288.15, 0.03)),
    ('example_b_total', TOTAL, scene(308.15, 0.95, 293.15, 0.9, 288.15, 0.03)),
    ('hot_mwir', ('wavelength', 3.0, 5.0, '-'), scene(900.0, 0.8, 400.0, 0.95, 300.0, -0.1)),
    ('wavenumber_band', ('wavenumber', 700.0, 1250.0, '-'),
     scene(330.0, 0.9, 290.0, 0.8, 280.0, 0.05)),
    ('low_emissivity', FLAT_8_14, scene(300.0, 0.1, 293.15, 1.0, 293.15, 0.01)),
    ('cold_sky', FLAT_8_14, scene(250.0, 0.9, 230.0, 1.0, 230.0, -0.05)),
    ('furnace_total', TOTAL, scene(1200.0, 0.85, 900.0, 0.97, 400.0, -0.05)),
    ('response_lwir', ('response', 0.0, 0.0, 'synthetic_lwir'),
     scene(308.15, 0.95, 293.15, 0.9, 288.15, -0.02)),
    ('radiance_signal', FLAT_8_14,
     scene(62.0, 0.95, 49.37, 0.9, 3.1, -0.03, ('radiance', 'radiance', 'radiance'))),
    ('remote_sensing_band', ('wavelength', 10.5, 11.5, '-'),
     scene(9.2, 0.97, 2.2, 0.85, 1.3, -0.01, ('radiance', 'radiance', 'radiance'))),
    ('mixed_terms', FLAT_8_14,
     scene(310.0, 0.9, 40.0, 0.95, 285.0, 0.02, ('temperature', 'radiance', 'temperature'))),
    ('net_signal_negative', FLAT_8_14, scene(200.0, 0.5, 300.0, 1.0, 288.15, 0.0)),
    ('net_signal_negative_total', TOTAL, scene(250.0, 0.2, 320.0, 0.9, 300.0, 0.0)),
]

MEASURE_OUTPUTS = ['temperature_k', 'surface_radiance', 'surface_derivative', 'signal_radiance',
                   'reflected_radiance', 'atmosphere_part', 'd_emissivity',
                   'd_reflected', 'd_transmittance', 'd_atmosphere', 'd_signal',
                   'emissivity_error_k', 'status']


def measure_rows():
    rows = []
    for name, (kind, lower, upper, response), inputs in MEASURE_CASES:
        row = {'case': name, 'band_kind': kind, 'band_lower': repr(lower),
               'band_upper': repr(upper), 'response': response}
        row.update({key: (value if isinstance(value, str) else repr(value))
                    for key, value in inputs.items()})
        rows.append(row)
    return rows


MEASURE_INPUTS = ['case', 'band_kind', 'band_lower', 'band_upper', 'response', 'signal_kind',
                  'signal', 'emissivity', 'reflected_kind', 'reflected', 'transmittance',
                  'atmosphere_kind', 'atmosphere', 'delta']


def measure_compute(row):
    band = (row['band_kind'], double(row['band_lower']), double(row['band_upper']),
            row['response'])
    inputs = {key: (row[key] if key.endswith('_kind') else double(row[key]))
              for key in MEASURE_INPUTS[5:]}
    outputs = measure_case(band, inputs)
    if outputs is None:
        empty = {column: None for column in MEASURE_OUTPUTS}
        empty['status'] = 'GB_ERR_NET_SIGNAL_NOT_POSITIVE'
        return empty
    outputs['status'] = 'GB_OK'
    return outputs


TABLES = [
    Table('units', ['conversion', 'unit', 'input'], ['expected', 'status'], units_rows,
          units_compute),
    Table('planck', ['coordinate', 'position', 'temperature_k', 'emissivity'],
          ['x', 'radiance', 'photon_radiance', 'radiance_derivative'], planck_rows, planck_compute),
    Table('brightness', ['coordinate', 'position', 'radiance', 'emissivity'],
          ['temperature_k', 'status'], brightness_rows, brightness_compute),
    Table('wien', ['temperature_k'],
          ['wavelength_um', 'wavenumber_cm', 'frequency_hz', 'photon_wavelength_um',
           'radiance_at_peak'], wien_rows, wien_compute),
    Table('stefan_boltzmann', ['temperature_k', 'emissivity'],
          ['exitance', 'radiance', 'photon_exitance'], stefan_boltzmann_rows,
          stefan_boltzmann_compute),
    Table('fraction', ['x'], ['below', 'above', 'photon_below', 'photon_above'], fraction_rows,
          fraction_compute),
    Table('fraction_at', ['wavelength_temperature_um_k'], ['below', 'above'], fraction_at_rows,
          fraction_at_compute),
    Table('band', ['band_kind', 'band_lower', 'band_upper', 'temperature_k'],
          ['radiance', 'radiance_derivative', 'photon_exitance', 'fraction'], band_rows,
          band_compute),
    Table('response', ['response', 'temperature_k'],
          ['radiance', 'radiance_derivative', 'photon_exitance', 'fraction'], response_rows,
          response_compute),
    Table('measure', MEASURE_INPUTS, MEASURE_OUTPUTS, measure_rows, measure_compute),
]


# ----------------------------------------------------------------------------
# Writing, cross-checking and checking
# ----------------------------------------------------------------------------

def write_table(table):
    with open(table.path(), 'w') as stream:
        stream.write('\t'.join(table.inputs + table.outputs) + '\n')
        for row in table.rows():
            outputs = table.compute(row)
            cells = [row[column] for column in table.inputs]
            cells += [fmt(outputs[column]) for column in table.outputs]
            stream.write('\t'.join(cells) + '\n')


def cross_check_by_quadrature():
    """Witness for the closed forms: each must agree with tanh-sinh quadrature."""
    worst = mpf(0)
    for x in (mpf('1e-4'), mpf('0.3'), mpf(3), mpf(50)):
        above = energy_normaliser() * head_integral(3, x)
        worst = max(worst, abs(above / fractions(x)[1] - 1))
        photon_above = photon_normaliser() * head_integral(2, x)
        worst = max(worst, abs(photon_above / fractions(x)[3] - 1))
    for kind, lower, upper in FLAT_BANDS:
        if kind == 'total':
            continue
        for t in (2.0, 300.0, 1e6):
            limits = double(lower), double(upper), double(t)
            share = flat_band(kind, *limits)[3]
            if share > mpf('1e-300'):
                worst = max(worst, abs(flat_band_by_quadrature(kind, *limits) / share - 1))
    for t in (mpf(200), mpf(10000)):
        analytic = flat_band('wavelength', mpf(8), mpf(14), t)[1]
        numeric = mp.diff(lambda v: flat_band('wavelength', mpf(8), mpf(14), v)[0], t)
        worst = max(worst, abs(numeric / analytic - 1))
    for name, temperatures in RESPONSE_TEMPERATURES.items():
        for t in temperatures:
            by_quadrature = response_band(name, double(t))
            closed = response_band_closed_form(name, double(t))
            for quadrature_value, closed_value in zip(by_quadrature, closed):
                worst = max(worst, abs(closed_value / quadrature_value - 1))
        for t in (77.0, 300.0, 3000.0):
            flat = flat_band('wavelength', mpf(8), mpf(14), double(t))
            as_response = response_band('synthetic_flat_8_14', double(t))
            worst = max(worst, max(abs(r / f - 1) for r, f in zip(as_response, flat)))
    if worst > mpf('1e-25'):
        sys.exit('generate.py: closed forms and quadrature disagree by %s' % fmt(worst))
    return worst


def read_table(path):
    with open(path) as stream:
        lines = [line.rstrip('\n') for line in stream if not line.startswith('#')]
    header = lines[0].split('\t')
    return header, [dict(zip(header, line.split('\t'))) for line in lines[1:]]


def values_agree(committed, recomputed):
    if recomputed is None or isinstance(recomputed, str):
        return committed == fmt(recomputed)
    expected = mpf(committed)
    if expected == 0:
        return recomputed == 0
    return abs(mpf(recomputed) / expected - 1) <= CHECK_RELATIVE_TOLERANCE


def check_table(table, generator):
    path = table.path()
    if not os.path.exists(path):
        print('reference: %s is missing' % path)
        return 0, 1
    header, rows = read_table(path)
    if header != table.inputs + table.outputs:
        print('reference: %s has columns %s' % (path, header))
        return 0, 1
    sample = rows if len(rows) <= CHECK_SAMPLE_ROWS else generator.sample(rows, CHECK_SAMPLE_ROWS)
    passed = failed = 0
    for row in sample:
        outputs = table.compute(row)
        bad = [c for c in table.outputs if not values_agree(row[c], outputs[c])]
        if bad:
            failed += 1
            print('reference: %s drifted at %s: %s' % (
                table.name, {c: row[c] for c in table.inputs},
                ', '.join('%s committed %s recomputed %s' % (c, row[c], fmt(outputs[c]))
                          for c in bad)))
        else:
            passed += 1
    return passed, failed


def derived_constants():
    """What core/constants.h must hold, each rounded to the nearest double."""
    return {
        'GB_PLANCK_H': H, 'GB_SPEED_OF_LIGHT': C, 'GB_BOLTZMANN_K': K,
        'GB_C1L': c1l(), 'GB_C1L_UM': c1l() * mpf(10) ** 24,
        'GB_C2': c2(), 'GB_C2_UM': c2() * mpf(10) ** 6,
        'GB_SIGMA': sigma(), 'GB_SIGMA_PHOTON': sigma_photon(),
        'GB_WIEN_X5': wien_root(5), 'GB_WIEN_X4': wien_root(4), 'GB_WIEN_X3': wien_root(3),
        'GB_WIEN_X2': wien_root(2),
        'GB_WIEN_WAVELENGTH_UM_K': c2() * mpf(10) ** 6 / wien_root(5),
        'GB_WIEN_PHOTON_WAVELENGTH_UM_K': c2() * mpf(10) ** 6 / wien_root(4),
        'GB_WIEN_FREQUENCY_HZ_PER_K': wien_root(3) * K / H,
        'GB_WIEN_WAVENUMBER_CM_PER_K': wien_root(3) / (c2() * 100),
        'GB_FIFTEEN_OVER_PI4': energy_normaliser(), 'GB_HALF_INVERSE_ZETA3': photon_normaliser(),
        'GB_PI': +mp.pi,
    }


def check_constants():
    with open(CONSTANTS_HEADER) as stream:
        defined = dict(re.findall(r'#define\s+(GB_\w+)\s+([-+0-9.eE]+)', stream.read()))
    passed = failed = 0
    for name, exact in derived_constants().items():
        if name in defined and float(defined[name]) == float(exact):
            passed += 1
        else:
            failed += 1
            print('reference: constants.h %s = %s, nearest double to the exact value is %r' % (
                name, defined.get(name, '(missing)'), float(exact)))
    return passed, failed


def main():
    parser = argparse.ArgumentParser(description=__doc__.split('\n')[0])
    parser.add_argument('--check', action='store_true',
                        help='recompute a fixed sample and compare with the committed vectors')
    arguments = parser.parse_args()
    if arguments.check:
        generator = random.Random(CHECK_SEED)
        passed, failed = check_constants()
        for table in TABLES:
            table_passed, table_failed = check_table(table, generator)
            passed, failed = passed + table_passed, failed + table_failed
        print('reference: %d passed, %d failed' % (passed, failed))
        return 1 if failed else 0
    os.makedirs(VECTORS, exist_ok=True)
    write_responses()
    print('quadrature cross-check: worst relative disagreement %s' %
          fmt(cross_check_by_quadrature()))
    for table in TABLES:
        write_table(table)
        print('wrote %s' % table.path())
    return 0


if __name__ == '__main__':
    sys.exit(main())
