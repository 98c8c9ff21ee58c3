#!/usr/bin/python3
"""Independent 30-digit witness for the expected values in tests/integration/cases/.

Every formula here is written from the published law, not from greybody's
code: Planck's law (M. Planck, 1901), Wien's displacement law, the
Stefan-Boltzmann law, the band-limited measurement equation and the GUM
propagation of JCGM 100:2008 eq. (10), with the exact CODATA 2018 constants.
Band integrals are done by mpmath's tanh-sinh quadrature, not by the
blackbody-fraction series the server uses, so the two methods check each other.

Run with Debian's interpreter (python3-mpmath): /usr/bin/python3.
  /usr/bin/python3 tests/integration/oracle.py     prints the published spot checks
"""
import mpmath as mp

mp.mp.dps = 30

PLANCK = mp.mpf("6.62607015e-34")      # J s, exact (CODATA 2018)
LIGHT = mp.mpf("299792458")            # m s^-1, exact
BOLTZMANN = mp.mpf("1.380649e-23")     # J K^-1, exact
STEFAN = 2 * mp.pi**5 * BOLTZMANN**4 / (15 * PLANCK**3 * LIGHT**2)
SECOND_RADIATION = PLANCK * LIGHT / BOLTZMANN  # c2, m K
KELVIN_AT_ZERO_CELSIUS = mp.mpf("273.15")

# Per-metre spectral quantities scaled to the unit the API writes.
PER_WAVELENGTH_UNIT = {"um": mp.mpf("1e-6"), "nm": mp.mpf("1e-9"), "m": mp.mpf(1)}
METRES_PER_WAVELENGTH_UNIT = PER_WAVELENGTH_UNIT


def kelvin(value, unit="K"):
    value = mp.mpf(value)
    if unit == "C":
        return value + KELVIN_AT_ZERO_CELSIUS
    if unit == "F":
        return (value - 32) / mp.mpf("1.8") + KELVIN_AT_ZERO_CELSIUS
    return value


def from_kelvin(value, unit="K"):
    if unit == "C":
        return value - KELVIN_AT_ZERO_CELSIUS
    if unit == "F":
        return (value - KELVIN_AT_ZERO_CELSIUS) * mp.mpf("1.8") + 32
    return value


def difference_scale(unit):
    """How many `unit` degrees make one kelvin-sized step."""
    return mp.mpf("1.8") if unit == "F" else mp.mpf(1)


# ---- one spectral position -------------------------------------------------

def spectral_radiance_per_metre(wavelength_m, temperature_k, emissivity=1):
    x = SECOND_RADIATION / (wavelength_m * temperature_k)
    return mp.mpf(emissivity) * 2 * PLANCK * LIGHT**2 / wavelength_m**5 / mp.expm1(x)


def radiance_at_wavelength(wavelength, temperature_k, emissivity=1, unit="um"):
    """W m^-2 sr^-1 per `unit` of wavelength; also photon radiance."""
    metres = mp.mpf(wavelength) * METRES_PER_WAVELENGTH_UNIT[unit]
    per_metre = spectral_radiance_per_metre(metres, temperature_k, emissivity)
    radiance = per_metre * PER_WAVELENGTH_UNIT[unit]
    photon = radiance / (PLANCK * LIGHT / metres)
    return radiance, photon


def radiance_at_wavenumber(wavenumber_cm, temperature_k, emissivity=1):
    """W m^-2 sr^-1 (cm^-1)^-1: L_nu~ = 2 h c^2 nu~^3 / expm1(h c nu~ / k T)."""
    per_metre_wavenumber = mp.mpf(wavenumber_cm) * 100
    x = PLANCK * LIGHT * per_metre_wavenumber / (BOLTZMANN * temperature_k)
    per_m_inverse = mp.mpf(emissivity) * 2 * PLANCK * LIGHT**2 * per_metre_wavenumber**3 / mp.expm1(x)
    radiance = per_m_inverse * 100
    photon = radiance / (PLANCK * LIGHT * per_metre_wavenumber)
    return radiance, photon


def radiance_at_frequency(frequency_thz, temperature_k, emissivity=1):
    """W m^-2 sr^-1 Hz^-1: L_nu = 2 h nu^3 / c^2 / expm1(h nu / k T)."""
    hertz = mp.mpf(frequency_thz) * mp.mpf("1e12")
    x = PLANCK * hertz / (BOLTZMANN * temperature_k)
    radiance = mp.mpf(emissivity) * 2 * PLANCK * hertz**3 / LIGHT**2 / mp.expm1(x)
    photon = radiance / (PLANCK * hertz)
    return radiance, photon


def solve_increasing(radiance_of, radiance, lowest=mp.mpf("1e-2"), highest=mp.mpf("1e12")):
    """T with radiance_of(T) = radiance, for a radiance that grows with T: a bracketed
    root-finder on ln L against ln T, which is smooth and nearly linear."""
    target = mp.log(mp.mpf(radiance))
    return mp.exp(mp.findroot(lambda u: mp.log(radiance_of(mp.exp(u))) - target,
                              (mp.log(lowest), mp.log(highest)), solver="illinois"))


def brightness_temperature(radiance_of, radiance):
    return solve_increasing(radiance_of, radiance)


def wien_root(q):
    """x solving x = q (1 - e^-x): x = q + W0(-q e^-q)."""
    return q + mp.lambertw(-q * mp.e**(-q)).real


def peaks(temperature_k):
    t = mp.mpf(temperature_k)
    peak_wavelength_m = PLANCK * LIGHT / (wien_root(5) * BOLTZMANN * t)
    return {
        "peak_wavelength": peak_wavelength_m * 1e6,
        "peak_wavenumber": wien_root(3) * BOLTZMANN * t / (PLANCK * LIGHT) / 100,
        "peak_frequency": wien_root(3) * BOLTZMANN * t / PLANCK / mp.mpf("1e12"),
        "peak_photon_wavelength": PLANCK * LIGHT / (wien_root(4) * BOLTZMANN * t) * 1e6,
        "peak_radiance": spectral_radiance_per_metre(peak_wavelength_m, t) * mp.mpf("1e-6"),
    }


def wien_temperature(peak_wavelength_um):
    return PLANCK * LIGHT / (wien_root(5) * BOLTZMANN * mp.mpf(peak_wavelength_um) * mp.mpf("1e-6"))


# ---- bands -----------------------------------------------------------------
# A band is ("total",), ("wavelength", lo_um, hi_um), ("wavenumber", lo_cm, hi_cm)
# or ("response", [wavelength_um...], [value...]).

def _planck_um(wavelength_um, temperature_k):
    return spectral_radiance_per_metre(wavelength_um * mp.mpf("1e-6"), temperature_k) * mp.mpf("1e-6")


def _planck_um_derivative(wavelength_um, temperature_k):
    x = SECOND_RADIATION / (wavelength_um * mp.mpf("1e-6") * temperature_k)
    return _planck_um(wavelength_um, temperature_k) * x / (temperature_k * -mp.expm1(-x))


def _weighted_integral(band, integrand):
    kind = band[0]
    if kind == "wavelength":
        return mp.quad(integrand, [mp.mpf(band[1]), mp.mpf(band[2])])
    if kind == "wavenumber":
        return mp.quad(integrand, [10000 / mp.mpf(band[2]), 10000 / mp.mpf(band[1])])
    if kind == "response":
        wavelengths = [mp.mpf(w) for w in band[1]]
        values = [mp.mpf(v) for v in band[2]]
        total = mp.mpf(0)
        for i in range(len(wavelengths) - 1):
            lo, hi, r_lo, r_hi = wavelengths[i], wavelengths[i + 1], values[i], values[i + 1]

            def weighted(w, lo=lo, hi=hi, r_lo=r_lo, r_hi=r_hi):
                return (r_lo + (r_hi - r_lo) * (w - lo) / (hi - lo)) * integrand(w)
            total += mp.quad(weighted, [lo, hi])
        return total
    raise ValueError(kind)


def band_radiance(band, temperature_k):
    t = mp.mpf(temperature_k)
    if band[0] == "total":
        return STEFAN * t**4 / mp.pi
    return _weighted_integral(band, lambda w: _planck_um(w, t))


def band_radiance_derivative(band, temperature_k):
    t = mp.mpf(temperature_k)
    if band[0] == "total":
        return 4 * STEFAN * t**3 / mp.pi
    return _weighted_integral(band, lambda w: _planck_um_derivative(w, t))


def band_quantities(band, temperature_k, emissivity=1):
    t = mp.mpf(temperature_k)
    eps = mp.mpf(emissivity)
    radiance = band_radiance(band, t)
    if band[0] == "total":
        sigma_photon = 4 * mp.pi * mp.zeta(3) * BOLTZMANN**3 / (PLANCK**3 * LIGHT**2)
        photon_exitance = sigma_photon * t**3
    else:
        photon_exitance = mp.pi * _weighted_integral(
            band, lambda w: _planck_um(w, t) * w * mp.mpf("1e-6") / (PLANCK * LIGHT))
    return {
        "radiance": eps * radiance,
        "exitance": mp.pi * eps * radiance,
        "photon_exitance": eps * photon_exitance,
        "fraction": radiance / (STEFAN * t**4 / mp.pi),
        "total_exitance": eps * STEFAN * t**4,
        "radiance_derivative": eps * band_radiance_derivative(band, t),
    }


def band_temperature(band, radiance, emissivity=1):
    return solve_increasing(lambda t: band_radiance(band, t), mp.mpf(radiance) / mp.mpf(emissivity),
                            mp.mpf(10), mp.mpf(1e5))


# ---- measurement equation and GUM -----------------------------------------

def _term_radiance(band, term):
    kind, value = term
    return band_radiance(band, value) if kind == "temperature" else mp.mpf(value)


def _term_derivative(band, term):
    kind, value = term
    return band_radiance_derivative(band, value) if kind == "temperature" else mp.mpf(0)


def corrected(band, signal, emissivity, reflected, transmittance=1, atmosphere=None):
    """Surface temperature in K.  Terms are ("temperature", K) or ("radiance", W m^-2 sr^-1);
    atmosphere ("temperature", K) means (1 - tau) L(T_a), ("radiance", L) a path radiance."""
    eps, tau = mp.mpf(emissivity), mp.mpf(transmittance)
    signal_radiance = _term_radiance(band, signal)
    reflected_radiance = _term_radiance(band, reflected)
    if atmosphere is None:
        atmosphere_part = mp.mpf(0)
    elif atmosphere[0] == "temperature":
        atmosphere_part = (1 - tau) * band_radiance(band, atmosphere[1])
    else:
        atmosphere_part = mp.mpf(atmosphere[1])
    surface = (signal_radiance - tau * (1 - eps) * reflected_radiance - atmosphere_part) / (tau * eps)
    return band_temperature(band, surface)


def sensitivities(band, signal, emissivity, reflected, transmittance=1, atmosphere=None):
    """Partial derivatives of T (K per input unit), keyed by the input names of the form given."""
    eps, tau = mp.mpf(emissivity), mp.mpf(transmittance)
    t = corrected(band, signal, emissivity, reflected, transmittance, atmosphere)
    surface, slope = band_radiance(band, t), band_radiance_derivative(band, t)
    reflected_radiance = _term_radiance(band, reflected)
    result = {"temperature": t}
    result["emissivity"] = (reflected_radiance - surface) / (eps * slope)
    if reflected[0] == "temperature":
        result["reflected_temperature"] = -(1 - eps) * _term_derivative(band, reflected) / (eps * slope)
    else:
        result["reflected_radiance"] = -(1 - eps) / (eps * slope)
    atmosphere_radiance = mp.mpf(0)
    if atmosphere is not None and atmosphere[0] == "temperature":
        atmosphere_radiance = band_radiance(band, atmosphere[1])
    result["transmittance"] = (atmosphere_radiance - eps * surface - (1 - eps) * reflected_radiance) / (tau * eps * slope)
    if atmosphere is None:
        # tau = 1 and no atmosphere: dT/dtau needs the atmosphere's radiance -> unknown (null)
        result["transmittance"] = result["transmittance"] if tau != 1 else None
        result["atmosphere_temperature"] = mp.mpf(0)
    elif atmosphere[0] == "temperature":
        result["atmosphere_temperature"] = -(1 - tau) * _term_derivative(band, atmosphere) / (tau * eps * slope)
    else:
        result["transmittance"] = (-eps * surface - (1 - eps) * reflected_radiance) / (tau * eps * slope)
        result["path_radiance"] = -1 / (tau * eps * slope)
    if signal[0] == "temperature":
        result["apparent_temperature"] = _term_derivative(band, signal) / (tau * eps * slope)
    else:
        result["measured_radiance"] = 1 / (tau * eps * slope)
    return result


def combined_uncertainty(partials, uncertainties):
    """JCGM 100:2008 eq. (10), uncorrelated inputs."""
    return mp.sqrt(sum((partials[name] * mp.mpf(u))**2 for name, u in uncertainties.items()))


def emissivity_error(band, signal, emissivity, reflected, delta, transmittance=1, atmosphere=None):
    """T(eps + delta) - T(eps), both solved in full; None outside (0, 1]."""
    shifted = mp.mpf(emissivity) + mp.mpf(delta)
    if not 0 < shifted <= 1:
        return None
    return (corrected(band, signal, shifted, reflected, transmittance, atmosphere)
            - corrected(band, signal, emissivity, reflected, transmittance, atmosphere))


def _spot_checks():
    flat = ("wavelength", 8, 14)
    print("L(10 um, 300 K)      ", radiance_at_wavelength(10, 300)[0], "(REFERENCES: 9.92403333)")
    print("T_b(10 at 11 um)     ", brightness_temperature(
        lambda t: radiance_at_wavelength(11, t)[0], 10), "(REFERENCES: 302.991746)")
    print("Wien peak 5778 K     ", peaks(5778)["peak_wavelength"], "(REFERENCES: 0.501518165)")
    print("sigma 300^4          ", STEFAN * 300**4, "(REFERENCES: 459.300328)")
    print("L_band(308.15 K)     ", band_radiance(flat, "308.15"), "(REFERENCES: 62.0157802011)")
    example_a = (flat, ("temperature", "308.15"), "0.95", ("temperature", "293.15"))
    print("example A T          ", corrected(*example_a), "(REFERENCES: 308.886829)")
    partials = sensitivities(*example_a)
    print("example A dT/deps    ", partials["emissivity"], "(REFERENCES: -15.463693)")
    print("example A u_c        ", combined_uncertainty(partials, {
        "emissivity": "0.02", "reflected_temperature": 2, "apparent_temperature": "0.5"}),
        "(REFERENCES: 0.614)")
    print("example B T          ", corrected(flat, ("temperature", "308.15"), "0.95",
                                             ("temperature", "293.15"), "0.9",
                                             ("temperature", "288.15")), "(REFERENCES: 310.995305)")


if __name__ == "__main__":
    _spot_checks()
