"""The same conversions as tools/bench/bench_core.c, written the way a practitioner would with
NumPy and SciPy (Debian's python3-numpy / python3-scipy), on the same inputs (the same formulas),
timed best of ROUNDS runs.  Prints `row <TAB> seconds per element <TAB> elements` and, for each row
the core also wrote a sample of, `agree_<row> <TAB> largest relative difference`.

Usage: /usr/bin/python3 bench_numpy.py OUTPUT_DIR [ROUNDS]

Constants: CODATA 2018 (h, c, k exact; sigma derived).  Band radiance: the blackbody-fraction
series of Widger & Woodall, Bull. Amer. Meteor. Soc. 57(10), 1976 (15 terms: below 1e-16 for
x >= 2.5, which covers 250-400 K in 8-14 um); its inverse: Newton's method on ln L with the
closed-form dL/dT, to a relative step of 1e-13.
"""
import math
import os
import sys
import time

import numpy as np

PLANCK = 6.62607015e-34
LIGHT = 299792458.0
BOLTZMANN = 1.380649e-23
C1L_UM = 2 * PLANCK * LIGHT ** 2 * 1e24          # W m^-2 sr^-1 um^4
C2_UM_K = PLANCK * LIGHT / BOLTZMANN * 1e6       # um K
SIGMA = 2 * math.pi ** 5 * BOLTZMANN ** 4 / (15 * PLANCK ** 3 * LIGHT ** 2)
FIFTEEN_OVER_PI4 = 15 / math.pi ** 4
SERIES_TERMS = 15

ELEMENTS = 1_000_000
FRAME_PIXELS = 640 * 512
SAMPLE_STRIDE = 997
GOLDEN = 0.6180339887498949
WAVELENGTH_UM = 10.0
BAND = (8.0, 14.0)
REFLECTED_K = 293.15


def inputs():
    """The inputs of bench_core.c, by the same formulas."""
    i = np.arange(ELEMENTS, dtype=np.float64)
    temperature = 250.0 + 150.0 * np.mod(i * GOLDEN, 1.0)
    emissivity = (0.80 + 0.18 * np.mod(i * GOLDEN * GOLDEN, 1.0)).astype(np.float32)
    return temperature, emissivity


def planck(temperature):
    return C1L_UM / (WAVELENGTH_UM ** 5 * np.expm1(C2_UM_K / (WAVELENGTH_UM * temperature)))


def brightness(radiance):
    return C2_UM_K / (WAVELENGTH_UM * np.log1p(C1L_UM / (WAVELENGTH_UM ** 5 * radiance)))


def fraction_above(x):
    """Share of sigma T^4 emitted at wavelengths below c2 / (x T) (the series in x)."""
    total = np.zeros_like(x)
    for n in range(1, SERIES_TERMS + 1):
        nx = n * x
        total += np.exp(-nx) * (((nx + 3) * nx + 6) * nx + 6) / n ** 4
    return FIFTEEN_OVER_PI4 * total


def band_radiance(temperature):
    x_short = C2_UM_K / (BAND[0] * temperature)
    x_long = C2_UM_K / (BAND[1] * temperature)
    return SIGMA / math.pi * temperature ** 4 * (fraction_above(x_long) - fraction_above(x_short))


def band_radiance_and_slope(temperature):
    x_short = C2_UM_K / (BAND[0] * temperature)
    x_long = C2_UM_K / (BAND[1] * temperature)
    share = fraction_above(x_long) - fraction_above(x_short)
    cube = SIGMA / math.pi * temperature ** 3
    radiance = cube * temperature * share
    slope = cube * (4 * share + FIFTEEN_OVER_PI4 * (x_long ** 4 / np.expm1(x_long)
                                                    - x_short ** 4 / np.expm1(x_short)))
    return radiance, slope


def band_temperature(radiance):
    """Newton on ln L(T) = ln radiance, from the brightness temperature at the band's centre."""
    centre = math.sqrt(BAND[0] * BAND[1])
    width = BAND[1] - BAND[0]
    temperature = C2_UM_K / (centre * np.log1p(C1L_UM / (centre ** 5 * radiance / width)))
    target = np.log(radiance)
    for _ in range(20):
        value, slope = band_radiance_and_slope(temperature)
        step = (np.log(value) - target) / (slope / value)
        temperature = temperature - step
        if np.max(np.abs(step / temperature)) < 1e-13:
            break
    return temperature


def corrected(apparent, emissivity):
    signal = band_radiance(apparent.astype(np.float64))
    reflected = band_radiance(np.array([REFLECTED_K]))[0]
    eps = emissivity.astype(np.float64)
    surface = (signal - (1 - eps) * reflected) / eps
    return band_temperature(surface).astype(np.float32)


def best_of(rounds, function, *arguments):
    best = math.inf
    result = None
    for _ in range(rounds):
        started = time.perf_counter()
        result = function(*arguments)
        best = min(best, time.perf_counter() - started)
    return best, result


def agreement(folder, row, values):
    path = os.path.join(folder, "core_%s.f64" % row)
    if not os.path.exists(path):
        return None
    core = np.fromfile(path, dtype=np.float64)
    ours = np.asarray(values, dtype=np.float64)[::SAMPLE_STRIDE][: core.size]
    return float(np.max(np.abs(core / ours - 1)))


def main():
    folder = sys.argv[1]
    rounds = int(sys.argv[2]) if len(sys.argv) > 2 else 5
    temperature, emissivity = inputs()
    spectral = planck(temperature)
    band = band_radiance(temperature)
    apparent = temperature.astype(np.float32)
    exponent = -C2_UM_K / (WAVELENGTH_UM * temperature)

    rows = [
        ("numpy_exp", np.exp, (exponent,)),
        ("planck_radiance", planck, (temperature,)),
        ("brightness_temperature", brightness, (spectral,)),
        ("band_radiance", band_radiance, (temperature,)),
        ("band_temperature", band_temperature, (band,)),
        ("corrected_temperature", corrected, (apparent, emissivity)),
    ]
    for row, function, arguments in rows:
        seconds, result = best_of(rounds, function, *arguments)
        print("%s\t%.6e\t%d" % (row, seconds / ELEMENTS, ELEMENTS))
        agree = agreement(folder, row, result)
        if agree is not None:
            print("agree_%s\t%.3e\t0" % (row, agree))
    seconds, _ = best_of(rounds, corrected, apparent[:FRAME_PIXELS], emissivity[:FRAME_PIXELS])
    print("frame_numpy\t%.6e\t%d" % (seconds, FRAME_PIXELS))
    sys.stdout.flush()


if __name__ == "__main__":
    main()
