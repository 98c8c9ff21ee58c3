#!/usr/bin/python3
"""Writes the case files of tests/integration/cases/ that this script owns, with every expected
number computed by oracle.py (mpmath, 30 digits) or quoted from /work/shared/REFERENCES.md.

Hand-written case files are welcome too: this script only rewrites the files it names, so run it
after changing the oracle or a case below, and review the diff.  Needs Debian's python3-mpmath:
  /usr/bin/python3 tests/integration/write_cases.py
"""
from case_file import FLAT, JSON, MP, OUT, PROBLEM, REF, ap, ok, problem, write, written
from oracle import (KELVIN_AT_ZERO_CELSIUS, band_quantities, band_radiance, band_temperature,
                    brightness_temperature, corrected, difference_scale, emissivity_error, from_kelvin, kelvin,
                    mp, peaks, radiance_at_frequency, radiance_at_wavelength, radiance_at_wavenumber,
                    sensitivities, wien_temperature)

def unit_fields(per):
    return {"/radiance_unit": "W m-2 sr-1 " + per, "/exitance_unit": "W m-2 " + per,
            "/photon_radiance_unit": "photons s-1 m-2 sr-1 " + per}


def rad_fields(pair, per, ref_radiance=None):
    r, p = pair
    f = {"/radiance": ap(ref_radiance, 1e-8) if ref_radiance else ap(r),
         "/exitance": ap(mp.pi * r), "/photon_radiance": ap(p)}
    f.update(unit_fields(per))
    return f

# ---------------- /v1/radiance
write("radiance-get-10um-300K", "radiance: GET 10 um, 300 K (published spot check)", "GET",
      "/v1/radiance?temperature=300&wavelength=10",
      ok(rad_fields(radiance_at_wavelength(10, 300), "um-1", "9.92403333")),
      source=REF + "; exitance and photon radiance: " + MP)
write("radiance-post-celsius", "radiance: POST 26.85 C is 300 K", "POST", "/v1/radiance",
      ok(rad_fields(radiance_at_wavelength(10, kelvin("26.85", "C")), "um-1")),
      body={"temperature": 26.85, "temperature_unit": "C", "wavelength": 10}, source=MP)
write("radiance-post-fahrenheit", "radiance: POST 80.33 F is 300 K", "POST", "/v1/radiance",
      ok(rad_fields(radiance_at_wavelength(10, kelvin("80.33", "F")), "um-1")),
      body={"temperature": 80.33, "temperature_unit": "F", "wavelength": 10}, source=MP)
write("radiance-get-nanometre", "radiance: GET wavelength in nm gives densities per nm", "GET",
      "/v1/radiance?temperature=300&wavelength=10000&wavelength_unit=nm",
      ok(rad_fields(radiance_at_wavelength(10000, 300, unit="nm"), "nm-1")), source=MP)
write("radiance-post-metre", "radiance: POST wavelength in m gives densities per m", "POST", "/v1/radiance",
      ok(rad_fields(radiance_at_wavelength("1e-5", 300, unit="m"), "m-1")),
      body={"temperature": 300, "wavelength": 1e-5, "wavelength_unit": "m"}, source=MP)
write("radiance-get-wavenumber", "radiance: GET wavenumber 1000 cm-1 gives densities per cm-1", "GET",
      "/v1/radiance?temperature=300&wavenumber=1000",
      ok(rad_fields(radiance_at_wavenumber(1000, 300), "(cm-1)-1")), source=MP)
write("radiance-post-frequency", "radiance: POST frequency 30 THz gives densities per Hz", "POST", "/v1/radiance",
      ok(rad_fields(radiance_at_frequency(30, 300), "Hz-1")),
      body={"temperature": 300, "frequency": 30}, source=MP)
write("radiance-post-rooftop-condenser", "radiance: POST rooftop condenser housing, 45 C, eps 0.9 (demo scenario)",
      "POST", "/v1/radiance",
      ok(rad_fields(radiance_at_wavelength(10, kelvin(45, "C"), "0.9"), "um-1")),
      body={"temperature": 45, "temperature_unit": "C", "wavelength": 10, "emissivity": 0.9}, source=MP)
kiln = [radiance_at_wavelength("9.5", kelvin(c, "C"), "0.85") for c in (180, 215, 240)]
write("radiance-post-broadcast-scalars", "radiance: POST temperature array, scalar wavelength and emissivity broadcast",
      "POST", "/v1/radiance",
      ok({"/radiance": [ap(r) for r, _ in kiln], "/exitance": [ap(mp.pi * r) for r, _ in kiln],
          "/photon_radiance": [ap(p) for _, p in kiln], "/radiance_unit": "W m-2 sr-1 um-1"},
         absent=["/element_errors/0"]),
      body={"temperature": [180, 215, 240], "temperature_unit": "C", "wavelength": 9.5, "emissivity": 0.85},
      source=MP)
paired = [radiance_at_wavelength(8, 300), radiance_at_wavelength(12, 310)]
write("radiance-post-paired-arrays", "radiance: POST equal-length arrays pair element-wise", "POST", "/v1/radiance",
      ok({"/radiance": [ap(r) for r, _ in paired]}),
      body={"temperature": [300, 310], "wavelength": [8, 12]}, source=MP)
write("radiance-post-element-errors", "radiance: POST out-of-domain elements give null and element_errors",
      "POST", "/v1/radiance",
      ok({"/radiance": [ap(radiance_at_wavelength(10, 300, "0.9")[0]), None, None],
          "/exitance/1": None, "/photon_radiance/2": None,
          "/element_errors/0/index": 1, "/element_errors/0/code": "temperature_out_of_range",
          "/element_errors/0/field": "temperature",
          "/element_errors/1/index": 2, "/element_errors/1/code": "emissivity_out_of_range",
          "/element_errors/1/field": "emissivity"}, absent=["/element_errors/2"]),
      body={"temperature": [300, -5, 310], "wavelength": 10, "emissivity": [0.9, 0.9, 1.2]}, source=MP)
write("radiance-get-422-negative-kelvin", "radiance: GET scalar temperature below 0 K is 422", "GET",
      "/v1/radiance?temperature=-5&wavelength=10", problem(422, "temperature_out_of_range", "temperature"))
write("radiance-get-422-below-absolute-zero-celsius", "radiance: GET -300 C is below absolute zero", "GET",
      "/v1/radiance?temperature=-300&temperature_unit=C&wavelength=10",
      problem(422, "temperature_out_of_range", "temperature"))
write("radiance-get-422-emissivity", "radiance: GET emissivity above 1 is 422", "GET",
      "/v1/radiance?temperature=300&wavelength=10&emissivity=1.5",
      problem(422, "emissivity_out_of_range", "emissivity"))
write("radiance-get-422-wavelength", "radiance: GET negative wavelength is 422", "GET",
      "/v1/radiance?temperature=300&wavelength=-3",
      problem(422, "spectral_position_out_of_range", "wavelength"))

# ---------------- /v1/brightness-temperature


def bt_wl(radiance, wl, eps=1, unit="um"):
    return brightness_temperature(lambda t: radiance_at_wavelength(wl, t, eps, unit)[0], radiance)


write("brightness-get-11um", "brightness temperature: GET 10 W m-2 sr-1 um-1 at 11 um (published spot check)",
      "GET", "/v1/brightness-temperature?radiance=10&wavelength=11",
      ok({"/temperature": ap("302.991746", 1e-8), "/temperature_unit": "K"}), source=REF)
write("brightness-post-celsius", "brightness temperature: POST answer in C", "POST", "/v1/brightness-temperature",
      ok({"/temperature": ap(from_kelvin(bt_wl(10, 11), "C")), "/temperature_unit": "C"}),
      body={"radiance": 10, "wavelength": 11, "temperature_unit": "C"}, source=MP)
write("brightness-post-fahrenheit", "brightness temperature: POST answer in F", "POST", "/v1/brightness-temperature",
      ok({"/temperature": ap(from_kelvin(bt_wl(10, 11), "F")), "/temperature_unit": "F"}),
      body={"radiance": 10, "wavelength": 11, "temperature_unit": "F"}, source=MP)
write("brightness-post-coastal-channel", "brightness temperature: POST coastal survey 11 um channel (demo scenario)",
      "POST", "/v1/brightness-temperature",
      ok({"/temperature": ap(bt_wl("9.2", 11))}), body={"radiance": 9.2, "wavelength": 11},
      source=MP + "; agrees with REFERENCES.md (297.322439 K)")
write("brightness-post-emissivity", "brightness temperature: POST grey body eps 0.97", "POST",
      "/v1/brightness-temperature", ok({"/temperature": ap(bt_wl("9.2", 11, "0.97"))}),
      body={"radiance": 9.2, "wavelength": 11, "emissivity": 0.97}, source=MP)
write("brightness-post-nanometre", "brightness temperature: POST radiance per nm at 11000 nm", "POST",
      "/v1/brightness-temperature", ok({"/temperature": ap("302.991746", 1e-8)}),
      body={"radiance": 0.01, "wavelength": 11000, "wavelength_unit": "nm"}, source=REF)
write("brightness-get-wavenumber", "brightness temperature: GET radiance per cm-1 at 1000 cm-1", "GET",
      "/v1/brightness-temperature?radiance=0.1&wavenumber=1000",
      ok({"/temperature": ap(brightness_temperature(lambda t: radiance_at_wavenumber(1000, t)[0], "0.1"))}),
      source=MP)
write("brightness-post-frequency", "brightness temperature: POST radiance per Hz at 30 THz", "POST",
      "/v1/brightness-temperature",
      ok({"/temperature": ap(brightness_temperature(lambda t: radiance_at_frequency(30, t)[0], "3e-12"))}),
      body={"radiance": 3e-12, "frequency": 30}, source=MP)
write("brightness-post-element-errors", "brightness temperature: POST array with a negative radiance", "POST",
      "/v1/brightness-temperature",
      ok({"/temperature": [ap(bt_wl(5, 11)), ap(bt_wl(10, 11)), None],
          "/element_errors/0/index": 2, "/element_errors/0/code": "radiance_out_of_range",
          "/element_errors/0/field": "radiance"}),
      body={"radiance": [5, 10, -1], "wavelength": 11}, source=MP)
write("brightness-get-422-zero-radiance", "brightness temperature: GET zero radiance is 422", "GET",
      "/v1/brightness-temperature?radiance=0&wavelength=11", problem(422, "radiance_out_of_range", "radiance"))
write("brightness-get-422-unreachable", "brightness temperature: GET radiance needing more than 1e9 K", "GET",
      "/v1/brightness-temperature?radiance=1e10&wavelength=11", problem(422, "radiance_unreachable"),
      note="L(11 um, 1e9 K) is about 5.65e8 W m-2 sr-1 um-1 (mpmath), so 1e10 needs T > 1e9 K")
write("brightness-get-very-hot", "brightness temperature: GET 1e7 W m-2 sr-1 um-1 at 11 um is about 1.8e7 K", "GET",
      "/v1/brightness-temperature?radiance=1e7&wavelength=11", ok({"/temperature": ap(bt_wl("1e7", 11))}), source=MP)

# ---------------- /v1/peak


def peak_fields(t, unit="K", ref=False):
    p = peaks(t)
    f = {k: ap(v) for k, v in p.items()}
    f = {"/" + k: v for k, v in f.items()}
    if ref:
        f["/peak_wavelength"] = ap("0.501518165", 1e-8)
    f["/peak_radiance_unit"] = "W m-2 sr-1 um-1"
    return f


write("peak-get-5778K", "peak: GET Wien peaks of a 5778 K body (published spot check)", "GET",
      "/v1/peak?temperature=5778", ok(peak_fields(5778, ref=True)),
      source=REF + " (peak wavelength 0.501518165 um, photon peak 0.63511645 um); other peaks: " + MP)
write("peak-post-kiln-celsius", "peak: POST ceramics kiln at 1200 C (demo scenario)", "POST", "/v1/peak",
      ok(peak_fields(kelvin(1200, "C"))), body={"temperature": 1200, "temperature_unit": "C"}, source=MP)
write("peak-post-kiln-fahrenheit", "peak: POST 2192 F is the same kiln", "POST", "/v1/peak",
      ok(peak_fields(kelvin(2192, "F"))), body={"temperature": 2192, "temperature_unit": "F"}, source=MP)
write("peak-get-inverse-310K", "peak: GET temperature of a 9.34765147 um peak is 310 K", "GET",
      "/v1/peak?peak_wavelength=9.34765147",
      ok({"/temperature": ap(310, 1e-8), "/temperature_unit": "K"}, absent=["/peak_wavenumber"]), source=REF)
write("peak-post-inverse-celsius", "peak: POST glaze spectrometer peak at 2.1 um, answer in C (demo scenario)",
      "POST", "/v1/peak",
      ok({"/temperature": ap(from_kelvin(wien_temperature("2.1"), "C")), "/temperature_unit": "C"}),
      body={"peak_wavelength": 2.1, "temperature_unit": "C"}, source=MP)
write("peak-post-element-errors", "peak: POST temperature array with a zero", "POST", "/v1/peak",
      ok({"/peak_wavelength": [ap(peaks(5778)["peak_wavelength"]), ap(peaks(310)["peak_wavelength"]), None],
          "/peak_radiance/2": None,
          "/element_errors/0/index": 2, "/element_errors/0/code": "temperature_out_of_range",
          "/element_errors/0/field": "temperature"}),
      body={"temperature": [5778, 310, 0]}, source=MP)
write("peak-post-400-both", "peak: POST temperature and peak_wavelength together", "POST", "/v1/peak",
      problem(400, "conflicting_fields"), body={"temperature": 300, "peak_wavelength": 10})
write("peak-get-400-neither", "peak: GET without temperature or peak_wavelength", "GET", "/v1/peak",
      problem(400, "missing_field"))

# ---------------- /v1/band


def band_fields(band, t, eps=1, ref_radiance=None):
    q = band_quantities(band, t, eps)
    f = {"/" + k: ap(v) for k, v in q.items()}
    if ref_radiance:
        f["/radiance"] = ap(ref_radiance, 1e-8)
    f.update({"/radiance_unit": "W m-2 sr-1", "/exitance_unit": "W m-2", "/photon_exitance_unit": "photons s-1 m-2",
              "/total_exitance_unit": "W m-2", "/radiance_derivative_unit": "W m-2 sr-1 K-1"})
    return f


write("band-get-8-14um", "band: GET 8-14 um at 308.15 K (published example A signal)", "GET",
      "/v1/band?temperature=308.15&band=8,14", ok(band_fields(FLAT, "308.15", ref_radiance="62.0157802011")),
      source=REF + " (L = 62.0157802011 W m-2 sr-1); other quantities: " + MP + ", by quadrature of Planck's law")
write("band-get-default-band", "band: GET without band uses 8-14 um", "GET", "/v1/band?temperature=308.15",
      ok({"/radiance": ap(band_radiance(FLAT, "308.15"))}), source=MP)
write("band-post-cavity-celsius", "band: POST 50 C cavity source on a calibration bench (demo scenario)", "POST",
      "/v1/band", ok(band_fields(FLAT, kelvin(50, "C"))),
      body={"temperature": 50, "temperature_unit": "C", "band": {"wavelength": [8, 14]}}, source=MP)
WN = ("wavenumber", 700, 1250)
write("band-get-wavenumber", "band: GET band_wavenumber=700,1250 at 300 K", "GET",
      "/v1/band?temperature=300&band_wavenumber=700,1250", ok(band_fields(WN, 300)), source=MP)
write("band-post-wavenumber", "band: POST wavenumber band 700-1250 cm-1, eps 0.9", "POST", "/v1/band",
      ok(band_fields(WN, 300, "0.9")),
      body={"temperature": 300, "emissivity": 0.9, "band": {"wavenumber": [700, 1250]}}, source=MP)
RESP = ("response", ["7.5", 8, 13, 14], [0, 1, 1, 0])
write("band-post-response", "band: POST trapezoid spectral response 7.5-8-13-14 um", "POST", "/v1/band",
      ok(band_fields(RESP, 300)),
      body={"temperature": 300, "band": {"response": {"wavelength": [7.5, 8, 13, 14], "value": [0, 1, 1, 0]}}},
      source=MP)
TOTAL = ("total",)
tf = band_fields(TOTAL, 300)
tf["/exitance"] = ap("459.300328", 1e-8)
tf["/total_exitance"] = ap("459.300328", 1e-8)
tf["/fraction"] = ap(1, 1e-12)
write("band-post-total", "band: POST whole spectrum is Stefan-Boltzmann", "POST", "/v1/band", ok(tf),
      body={"temperature": 300, "band": {"total": True}},
      source=REF + " (sigma 300^4 = 459.300328 W m-2); photon exitance and derivative: " + MP)
write("band-get-total", "band: GET band=total", "GET", "/v1/band?temperature=300&band=total",
      ok({"/exitance": ap("459.300328", 1e-8), "/fraction": ap(1, 1e-12)}), source=REF)
write("band-post-emissivity-array", "band: POST emissivity array scales radiance, not fraction", "POST", "/v1/band",
      ok({"/radiance": [ap(band_radiance(FLAT, 300) / 2), ap(band_radiance(FLAT, 300))],
          "/fraction": [ap(band_quantities(FLAT, 300)["fraction"])] * 2}),
      body={"temperature": 300, "emissivity": [0.5, 1], "band": {"wavelength": [8, 14]}}, source=MP)
write("band-post-rayleigh-jeans-tail", "band: POST a 1e6 K body seen in 1-1e5 um holds a tiny fraction", "POST",
      "/v1/band", ok(band_fields(("wavelength", 1, "1e5"), "1e6")),
      body={"temperature": 1e6, "band": {"wavelength": [1, 1e5]}}, source=MP)
write("band-get-fahrenheit", "band: GET temperature in F; the derivative stays per kelvin", "GET",
      "/v1/band?temperature=300&temperature_unit=F&band=8,14",
      ok(dict(band_fields(FLAT, kelvin(300, "F")), **{"/temperature_unit": "F"})), source=MP)
write("band-get-422-reversed", "band: GET band=14,8 is reversed", "GET", "/v1/band?temperature=300&band=14,8",
      problem(422, "band_reversed", "band"))
write("band-get-422-zero-limit", "band: GET band=0,14 has a zero limit", "GET", "/v1/band?temperature=300&band=0,14",
      problem(422, "band_limit_out_of_range", "band"))
write("band-get-400-one-limit", "band: GET band=8 is not two limits", "GET", "/v1/band?temperature=300&band=8",
      problem(400, "invalid_band", "band"))
write("band-get-400-both-band-forms", "band: GET band and band_wavenumber together", "GET",
      "/v1/band?temperature=300&band=8,14&band_wavenumber=700,1250", problem(400, "conflicting_fields"))
write("band-post-400-band-as-string", "band: POST band as a string", "POST", "/v1/band",
      problem(400, "wrong_type", "band"), body={"temperature": 300, "band": "8,14"})
write("band-post-400-unknown-band-kind", "band: POST band with an unknown member", "POST", "/v1/band",
      problem(400, "unknown_field"), body={"temperature": 300, "band": {"wavelengths": [8, 14]}})


def resp_case(file, name, w, v, code):
    write(file, name, "POST", "/v1/band", problem(422, code, "band"),
          body={"temperature": 300, "band": {"response": {"wavelength": w, "value": v}}})
resp_case("band-post-422-response-unsorted", "band: POST response wavelengths not increasing", [8, 12, 10], [1, 1, 1],
          "response_unsorted")
resp_case("band-post-422-response-negative", "band: POST negative response value", [8, 10, 12], [1, -0.5, 1],
          "response_negative")
resp_case("band-post-422-response-too-short", "band: POST response of one point", [10], [1], "response_too_short")
resp_case("band-post-422-response-all-zero", "band: POST response all zero", [8, 10, 12], [0, 0, 0],
          "response_all_zero")

# ---------------- /v1/band-temperature
LA = band_radiance(FLAT, "308.15")
write("band-temperature-post-radiance", "band temperature: POST 8-14 um radiance of 308.15 K", "POST",
      "/v1/band-temperature", ok({"/temperature": ap("308.15"), "/temperature_unit": "K"}),
      body={"radiance": float(LA), "band": {"wavelength": [8, 14]}},
      source="inverse of REFERENCES.md example A: L(308.15 K) = 62.0157802011 W m-2 sr-1; " + MP)
write("band-temperature-get-exitance", "band temperature: GET exitance form", "GET",
      "/v1/band-temperature?exitance=%.17g&band=8,14" % float(mp.pi * LA), ok({"/temperature": ap("308.15")}),
      source=MP)
write("band-temperature-post-fan-deck", "band temperature: POST cooling-tower fan deck, 7.5-13 um, eps 0.96 (demo scenario)",
      "POST", "/v1/band-temperature",
      ok({"/temperature": ap(band_temperature(("wavelength", "7.5", 13), "45.2", "0.96"))}),
      body={"radiance": 45.2, "band": {"wavelength": [7.5, 13]}, "emissivity": 0.96}, source=MP)
write("band-temperature-post-celsius", "band temperature: POST answer in C", "POST", "/v1/band-temperature",
      ok({"/temperature": ap(mp.mpf("308.15") - KELVIN_AT_ZERO_CELSIUS), "/temperature_unit": "C"}),
      body={"radiance": float(LA), "band": {"wavelength": [8, 14]}, "temperature_unit": "C"}, source=MP)
write("band-temperature-post-total", "band temperature: POST total exitance sigma 300^4", "POST",
      "/v1/band-temperature", ok({"/temperature": ap(300, 1e-8)}),
      body={"exitance": 459.300328, "band": {"total": True}}, source=REF)
write("band-temperature-post-element-errors", "band temperature: POST array with a negative radiance", "POST",
      "/v1/band-temperature",
      ok({"/temperature": [ap("308.15"), None], "/element_errors/0/index": 1,
          "/element_errors/0/code": "radiance_out_of_range", "/element_errors/0/field": "radiance"}),
      body={"radiance": [float(LA), -1]}, source=MP)
write("band-temperature-get-default-band", "band temperature: GET without band uses 8-14 um", "GET",
      "/v1/band-temperature?radiance=62.0157802011269532", ok({"/temperature": ap("308.15")}), source=MP)
write("band-temperature-get-400-both", "band temperature: GET radiance and exitance together", "GET",
      "/v1/band-temperature?radiance=62&exitance=194", problem(400, "conflicting_fields"))
write("band-temperature-get-422-unreachable", "band temperature: GET radiance needing more than 1e6 K", "GET",
      "/v1/band-temperature?radiance=1e30&band=8,14", problem(422, "radiance_unreachable"))

# ---------------- /v1/corrected-temperature
TA = ("temperature", "308.15")
TR = ("temperature", "293.15")
write("corrected-get-example-a", "corrected: GET example A (flat 8-14 um, eps 0.95)", "GET",
      "/v1/corrected-temperature?apparent_temperature=308.15&emissivity=0.95&reflected_temperature=293.15",
      ok({"/temperature": ap("308.886829", 1e-8), "/total_model_temperature": ap("308.881071", 1e-8),
          "/model": "band", "/temperature_unit": "K"}), source=REF + ", worked example A")
write("corrected-post-example-b", "corrected: POST example B (tau 0.9, air 288.15 K)", "POST",
      "/v1/corrected-temperature",
      ok({"/temperature": ap("310.995305", 1e-8), "/total_model_temperature": ap("310.965985", 1e-8)}),
      body={"apparent_temperature": 308.15, "emissivity": 0.95, "reflected_temperature": 293.15,
            "transmittance": 0.9, "atmosphere_temperature": 288.15}, source=REF + ", worked example B")
write("corrected-post-rooftop-celsius", "corrected: POST rooftop compressor housing in C (demo scenario)", "POST",
      "/v1/corrected-temperature",
      ok({"/temperature": ap(corrected(FLAT, TA, "0.95", TR) - KELVIN_AT_ZERO_CELSIUS),
          "/total_model_temperature": ap(corrected(TOTAL, TA, "0.95", TR) - KELVIN_AT_ZERO_CELSIUS),
          "/temperature_unit": "C"}),
      body={"apparent_temperature": 35, "emissivity": 0.95, "reflected_temperature": 20, "temperature_unit": "C"},
      source=MP + "; example A of REFERENCES.md in C")
write("corrected-post-fahrenheit", "corrected: POST example A in F", "POST", "/v1/corrected-temperature",
      ok({"/temperature": ap(from_kelvin(corrected(FLAT, TA, "0.95", TR), "F")), "/temperature_unit": "F"}),
      body={"apparent_temperature": 95, "emissivity": 0.95, "reflected_temperature": 68, "temperature_unit": "F"},
      source=MP)
write("corrected-post-model-total", "corrected: POST model total is the sigma T^4 answer", "POST",
      "/v1/corrected-temperature",
      ok({"/temperature": ap("308.881071", 1e-8), "/model": "total"}, absent=["/total_model_temperature"]),
      body={"apparent_temperature": 308.15, "emissivity": 0.95, "reflected_temperature": 293.15, "model": "total"},
      source=REF + ", worked example A (sigma T^4 model)")
write("corrected-get-low-emissivity", "corrected: GET eps 0.5, band and sigma T^4 answers 0.205 K apart", "GET",
      "/v1/corrected-temperature?apparent_temperature=308.15&emissivity=0.5&reflected_temperature=293.15",
      ok({"/temperature": ap("321.438243", 1e-8), "/total_model_temperature": ap("321.232860", 1e-8)}),
      source=REF + ", worked example A at eps 0.5")
write("corrected-post-element-errors", "corrected: POST emissivity array with one out of range", "POST",
      "/v1/corrected-temperature",
      ok({"/temperature": [ap("308.886829", 1e-8), None, ap("321.438243", 1e-8)],
          "/total_model_temperature": [ap("308.881071", 1e-8), None, ap("321.232860", 1e-8)],
          "/element_errors/0/index": 1, "/element_errors/0/code": "emissivity_out_of_range",
          "/element_errors/0/field": "emissivity"}, absent=["/element_errors/1"]),
      body={"apparent_temperature": 308.15, "emissivity": [0.95, 1.5, 0.5], "reflected_temperature": 293.15},
      source=REF + ", worked example A")
write("corrected-post-radiance-form", "corrected: POST measured and reflected radiances of example A", "POST",
      "/v1/corrected-temperature",
      ok({"/temperature": ap("308.886829", 1e-8), "/model": "band"}, absent=["/total_model_temperature"]),
      body={"measured_radiance": 62.0157802011, "emissivity": 0.95, "reflected_radiance": 49.3728947817},
      source=REF + ", worked example A (L(T_app), L(T_r) as given there)")
PATH_CASE = corrected(FLAT, ("radiance", 60), "0.95", ("radiance", "49.37"), "0.9", ("radiance", 5))
write("corrected-post-path-radiance", "corrected: POST single-channel form with a path radiance", "POST",
      "/v1/corrected-temperature", ok({"/temperature": ap(PATH_CASE)}),
      body={"measured_radiance": 60, "emissivity": 0.95, "reflected_radiance": 49.37, "transmittance": 0.9,
            "path_radiance": 5}, source=MP)
write("corrected-get-wavenumber-band", "corrected: GET example A inputs in a 700-1250 cm-1 band", "GET",
      "/v1/corrected-temperature?apparent_temperature=308.15&emissivity=0.95&reflected_temperature=293.15"
      "&band_wavenumber=700,1250", ok({"/temperature": ap(corrected(WN, TA, "0.95", TR))}), source=MP)
write("corrected-post-response-band", "corrected: POST example A inputs with a trapezoid response", "POST",
      "/v1/corrected-temperature", ok({"/temperature": ap(corrected(RESP, TA, "0.95", TR))}),
      body={"apparent_temperature": 308.15, "emissivity": 0.95, "reflected_temperature": 293.15,
            "band": {"response": {"wavelength": [7.5, 8, 13, 14], "value": [0, 1, 1, 0]}}}, source=MP)
write("corrected-get-400-atmosphere-missing", "corrected: GET transmittance below 1 without the air temperature",
      "GET", "/v1/corrected-temperature?apparent_temperature=308.15&emissivity=0.95&reflected_temperature=293.15"
      "&transmittance=0.9", problem(400, "missing_field", "atmosphere_temperature"))
write("corrected-post-400-atmosphere-and-path", "corrected: POST atmosphere temperature and path radiance together",
      "POST", "/v1/corrected-temperature", problem(400, "conflicting_fields"),
      body={"apparent_temperature": 308.15, "emissivity": 0.95, "reflected_temperature": 293.15,
            "transmittance": 0.9, "atmosphere_temperature": 288.15, "path_radiance": 2})
write("corrected-get-400-emissivity-missing", "corrected: GET without emissivity", "GET",
      "/v1/corrected-temperature?apparent_temperature=308.15&reflected_temperature=293.15",
      problem(400, "missing_field", "emissivity"))
write("corrected-get-400-model-unknown", "corrected: GET model=grey is not a model", "GET",
      "/v1/corrected-temperature?apparent_temperature=308.15&emissivity=0.95&reflected_temperature=293.15&model=grey",
      {"status": 400, "content_type": PROBLEM, "fields": {"/field": "model"}})
write("corrected-get-422-net-signal", "corrected: GET surroundings hotter than the reading at eps 0.1", "GET",
      "/v1/corrected-temperature?apparent_temperature=280&emissivity=0.1&reflected_temperature=300",
      problem(422, "net_signal_not_positive"),
      note="L(280 K) < 0.9 L(300 K) in 8-14 um, so nothing is left for the surface")
write("corrected-get-422-transmittance", "corrected: GET transmittance above 1", "GET",
      "/v1/corrected-temperature?apparent_temperature=308.15&emissivity=0.95&reflected_temperature=293.15"
      "&transmittance=1.5&atmosphere_temperature=288.15", problem(422, "transmittance_out_of_range", "transmittance"))

# ---------------- /v1/sensitivity


def sens_fields(band, signal, eps, reflected, tau=1, atm=None, u=None, unit="K", deltas=None, scale_inputs=None):
    s = sensitivities(band, signal, eps, reflected, tau, atm)
    t = s.pop("temperature")
    k = difference_scale(unit)
    f = {"/temperature": ap(from_kelvin(t, unit)), "/temperature_unit": unit, "/model": "band" if band != TOTAL else "total"}
    # per-unit-of-input scaling: temperatures in and out scale alike; others scale with output only
    scaled = {}
    for name, v in s.items():
        if v is None:  # unknown (dT/dtau without an atmosphere): the server writes null
            scaled[name] = None
            f["/sensitivity/" + name] = None
            continue
        scaled[name] = v if name.endswith("_temperature") else v * k
        f["/sensitivity/" + name] = ap(scaled[name]) if v != 0 else 0
    order = list(s.keys())
    if u is not None:
        for i, name in enumerate(order):
            ui = mp.mpf(u.get(name, 0))
            f[f"/budget/{i}/quantity"] = name
            f[f"/budget/{i}/standard_uncertainty"] = float(ui)
            f[f"/budget/{i}/sensitivity"] = f["/sensitivity/" + name]
            known = scaled[name] is not None
            f[f"/budget/{i}/contribution"] = ap(abs(scaled[name]) * ui) if known and scaled[name] * ui != 0 else 0
        uc = mp.sqrt(sum((scaled[n] * mp.mpf(u.get(n, 0)))**2 for n in order if scaled[n] is not None))
        f["/combined_standard_uncertainty"] = ap(uc)
        f["/expanded_uncertainty"] = ap(2 * uc)
        f["/coverage_factor"] = 2
    if deltas is not None:
        errs = [emissivity_error(band, signal, eps, reflected, d, tau, atm) for d in deltas]
        f["/emissivity_error/delta"] = [float(mp.mpf(d)) for d in deltas]
        f["/emissivity_error/temperature_error"] = [None if e is None else ap(e * k) for e in errs]
    return f


DEFAULT_DELTAS = ["-0.05", "-0.02", "-0.01", "0.01", "0.02", "0.05"]
UA = {"emissivity": "0.02", "reflected_temperature": 2, "apparent_temperature": "0.5"}
write("sensitivity-post-example-a", "sensitivity: POST example A budget and default emissivity-error curve", "POST",
      "/v1/sensitivity", ok(sens_fields(FLAT, TA, "0.95", TR, u=UA, deltas=DEFAULT_DELTAS)),
      body={"apparent_temperature": 308.15, "emissivity": 0.95, "reflected_temperature": 293.15,
            "u_emissivity": 0.02, "u_reflected_temperature": 2, "u_apparent_temperature": 0.5},
      source=MP + "; GUM (JCGM 100:2008 eq. 10); agrees with REFERENCES.md example A (dT/deps = -15.463693 K, u_c = 0.614 K)")
write("sensitivity-get-example-a", "sensitivity: GET example A with emissivity_errors=-0.05,0.05", "GET",
      "/v1/sensitivity?apparent_temperature=308.15&emissivity=0.95&reflected_temperature=293.15"
      "&u_emissivity=0.02&u_reflected_temperature=2&u_apparent_temperature=0.5&emissivity_errors=-0.05,0.05",
      ok(sens_fields(FLAT, TA, "0.95", TR, u=UA, deltas=["-0.05", "0.05"])),
      source=MP + "; GUM (JCGM 100:2008 eq. 10)")
UB = {"emissivity": "0.02", "reflected_temperature": 2, "transmittance": "0.02", "atmosphere_temperature": 2,
      "apparent_temperature": "0.5"}
write("sensitivity-post-example-b", "sensitivity: POST example B with every uncertainty", "POST", "/v1/sensitivity",
      ok(sens_fields(FLAT, TA, "0.95", TR, "0.9", ("temperature", "288.15"), u=UB)),
      body={"apparent_temperature": 308.15, "emissivity": 0.95, "reflected_temperature": 293.15,
            "transmittance": 0.9, "atmosphere_temperature": 288.15, "u_emissivity": 0.02,
            "u_reflected_temperature": 2, "u_transmittance": 0.02, "u_atmosphere_temperature": 2,
            "u_apparent_temperature": 0.5},
      source=MP + "; agrees with REFERENCES.md example B (dT/dtau = -23.2214, dT/dT_a = -0.0948873)")
UF = {"emissivity": "0.02", "reflected_temperature": "3.6", "apparent_temperature": "0.9"}
write("sensitivity-post-fahrenheit", "sensitivity: POST example A in F (differences scale by 1.8)", "POST",
      "/v1/sensitivity", ok(sens_fields(FLAT, TA, "0.95", TR, u=UF, unit="F", deltas=DEFAULT_DELTAS)),
      body={"apparent_temperature": 95, "emissivity": 0.95, "reflected_temperature": 68, "temperature_unit": "F",
            "u_emissivity": 0.02, "u_reflected_temperature": 3.6, "u_apparent_temperature": 0.9}, source=MP)
SR = ("radiance", 60)
RR = ("radiance", "49.37")
PR = ("radiance", 5)
URAD = {"emissivity": "0.01", "reflected_radiance": 1, "transmittance": "0.01", "path_radiance": "0.5",
        "measured_radiance": "0.3"}
rf = sens_fields(FLAT, SR, "0.95", RR, "0.9", PR, u=URAD)
write("sensitivity-post-radiance-form", "sensitivity: POST radiance inputs name their own sensitivities", "POST",
      "/v1/sensitivity", ok(rf, absent=["/sensitivity/apparent_temperature", "/sensitivity/reflected_temperature",
                                         "/sensitivity/atmosphere_temperature"]),
      body={"measured_radiance": 60, "emissivity": 0.95, "reflected_radiance": 49.37, "transmittance": 0.9,
            "path_radiance": 5, "u_emissivity": 0.01, "u_reflected_radiance": 1, "u_transmittance": 0.01,
            "u_path_radiance": 0.5, "u_measured_radiance": 0.3}, source=MP)
write("sensitivity-post-model-total", "sensitivity: POST example A with the sigma T^4 model", "POST",
      "/v1/sensitivity", ok(sens_fields(TOTAL, TA, "0.95", TR, u=UA)),
      body={"apparent_temperature": 308.15, "emissivity": 0.95, "reflected_temperature": 293.15, "model": "total",
            "u_emissivity": 0.02, "u_reflected_temperature": 2, "u_apparent_temperature": 0.5},
      source=MP + "; temperature agrees with REFERENCES.md (308.881071 K)")
write("sensitivity-post-unit-transmittance-with-air",
      "sensitivity: POST tau = 1 with an air temperature: dT/dtau is not zero, dT/dT_a is", "POST", "/v1/sensitivity",
      ok(sens_fields(FLAT, TA, "0.95", TR, 1, ("temperature", "288.15"))),
      body={"apparent_temperature": 308.15, "emissivity": 0.95, "reflected_temperature": 293.15,
            "transmittance": 1, "atmosphere_temperature": 288.15}, source=MP)
write("sensitivity-post-error-curve-nulls", "sensitivity: POST emissivity errors outside (0, 1] give null", "POST",
      "/v1/sensitivity", ok(sens_fields(FLAT, TA, "0.95", TR, deltas=["0.1", "-0.1", "-0.95"])),
      body={"apparent_temperature": 308.15, "emissivity": 0.95, "reflected_temperature": 293.15,
            "emissivity_errors": [0.1, -0.1, -0.95]}, source=MP)
write("sensitivity-post-400-array", "sensitivity: POST arrays are not accepted", "POST", "/v1/sensitivity",
      problem(400, "wrong_type", "emissivity"),
      body={"apparent_temperature": 308.15, "emissivity": [0.95, 0.9], "reflected_temperature": 293.15})
write("sensitivity-get-422-negative-uncertainty", "sensitivity: GET a negative standard uncertainty", "GET",
      "/v1/sensitivity?apparent_temperature=308.15&emissivity=0.95&reflected_temperature=293.15&u_emissivity=-0.01",
      problem(422, "uncertainty_negative", "u_emissivity"))

# ---------------- request errors
write("error-malformed-json", "errors: POST a truncated JSON body", "POST", "/v1/radiance",
      problem(400, "malformed_json", None, header={"Cache-Control": "no-store"}), body='{"temperature": 300,')
write("error-not-an-object", "errors: POST a JSON array body", "POST", "/v1/radiance",
      problem(400, "not_an_object", None), body='[300, 10]')
write("error-wrong-type", "errors: POST a string temperature", "POST", "/v1/radiance",
      problem(400, "wrong_type", "temperature"), body={"temperature": "hot", "wavelength": 10})
write("error-missing-field", "errors: POST without temperature", "POST", "/v1/radiance",
      problem(400, "missing_field", "temperature"), body={"wavelength": 10})
write("error-missing-spectral-position", "errors: POST without any spectral position", "POST", "/v1/radiance",
      problem(400, "missing_field"), body={"temperature": 300})
write("error-conflicting-fields", "errors: POST wavelength and wavenumber together", "POST", "/v1/radiance",
      problem(400, "conflicting_fields"), body={"temperature": 300, "wavelength": 10, "wavenumber": 1000})
write("error-unknown-field", "errors: POST a misspelt field", "POST", "/v1/radiance",
      problem(400, "unknown_field", "temprature"), body={"temprature": 300, "wavelength": 10})
write("error-unknown-query-field", "errors: GET an unknown query parameter", "GET",
      "/v1/radiance?temperature=300&wavelength=10&colour=red", problem(400, "unknown_field", "colour"))
write("error-unknown-temperature-unit", "errors: POST temperature_unit R", "POST", "/v1/radiance",
      problem(400, "unknown_unit", "temperature_unit"),
      body={"temperature": 540, "temperature_unit": "R", "wavelength": 10})
write("error-unknown-wavelength-unit", "errors: GET wavelength_unit mm", "GET",
      "/v1/radiance?temperature=300&wavelength=0.01&wavelength_unit=mm", problem(400, "unknown_unit", "wavelength_unit"))
write("error-not-finite-nan", "errors: GET temperature=nan", "GET", "/v1/radiance?temperature=nan&wavelength=10",
      problem(400, "not_finite", "temperature"))
write("error-not-finite-infinity", "errors: GET wavelength=inf", "GET", "/v1/radiance?temperature=300&wavelength=inf",
      problem(400, "not_finite", "wavelength"))
write("error-not-finite-overflow", "errors: POST 1e400 overflows a double", "POST", "/v1/radiance",
      problem(400, "not_finite", "temperature"), body='{"temperature": 1e400, "wavelength": 10}')
write("error-invalid-query-number", "errors: GET temperature=abc", "GET", "/v1/radiance?temperature=abc&wavelength=10",
      problem(400, "invalid_query", "temperature"))
write("error-invalid-query-duplicate", "errors: GET temperature given twice", "GET",
      "/v1/radiance?temperature=300&temperature=310&wavelength=10", problem(400, "invalid_query", "temperature"))
write("error-invalid-query-list", "errors: GET a list where a scalar is expected", "GET",
      "/v1/radiance?temperature=300,310&wavelength=10", problem(400, "invalid_query", "temperature"))
write("error-array-length-mismatch", "errors: POST arrays of 2 and 3", "POST", "/v1/radiance",
      problem(400, "array_length_mismatch"), body={"temperature": [300, 310], "wavelength": [8, 10, 12]})
write("error-empty-array", "errors: POST an empty temperature array", "POST", "/v1/radiance",
      problem(400, "empty_array", "temperature"), body={"temperature": [], "wavelength": 10})
write("error-array-too-long", "errors: POST an array above --max-array 1000", "POST", "/v1/radiance",
      problem(413, "array_too_long", "temperature"), body={"temperature": [], "wavelength": 10},
      fill={"pointer": "/temperature", "count": 1001, "value": 300})
write("error-body-too-large", "errors: POST a body above --max-body-bytes 65536", "POST", "/v1/radiance",
      problem(413, "body_too_large", None), body={"temperature": 300, "wavelength": 10}, pad_body_to=70000)
write("error-unsupported-media-type", "errors: POST JSON sent as text/plain", "POST", "/v1/radiance",
      problem(415, "unsupported_media_type", None), body={"temperature": 300, "wavelength": 10},
      headers={"Content-Type": "text/plain"})
write("error-json-with-charset", "errors: application/json with a charset parameter is accepted", "POST",
      "/v1/radiance", ok({"/radiance": ap("9.92403333", 1e-8)}), body={"temperature": 300, "wavelength": 10},
      headers={"Content-Type": "application/json; charset=utf-8"}, source=REF)
write("error-not-found", "errors: GET an unknown path", "GET", "/v1/irradiance", problem(404, "not_found", None))
write("error-not-found-trailing-slash", "errors: paths match exactly, without a trailing slash", "GET",
      "/v1/radiance/?temperature=300&wavelength=10", problem(404, "not_found"))
write("error-method-not-allowed", "errors: DELETE on a /v1 path", "DELETE", "/v1/radiance",
      problem(405, "method_not_allowed", None, header={"Allow": {"tokens": ["GET", "POST"]}}))
write("error-method-not-allowed-ops", "errors: POST on /healthz", "POST", "/healthz",
      problem(405, "method_not_allowed", header={"Allow": {"tokens": ["GET"]}}), body={})
write("error-detail-names-field", "errors: a problem has a title and a detail", "GET",
      "/v1/radiance?temperature=300&wavelength=10&emissivity=0",
      {"status": 422, "content_type": PROBLEM, "fields": {"/code": "emissivity_out_of_range", "/field": "emissivity"},
       "body_contains": ['"title":', '"detail":']})

# ---------------- CORS
ORIGIN = "http://dash.example"
write("cors-preflight", "cors: OPTIONS preflight from the allowed origin", "OPTIONS", "/v1/corrected-temperature",
      {"status": 204, "header": {"Access-Control-Allow-Origin": ORIGIN,
                                 "Access-Control-Allow-Methods": {"tokens": ["GET", "POST"]},
                                 "Access-Control-Allow-Headers": {"tokens": ["Content-Type"]}}},
      headers={"Origin": ORIGIN, "Access-Control-Request-Method": "POST",
               "Access-Control-Request-Headers": "content-type"})
write("cors-preflight-other-origin", "cors: OPTIONS preflight from another origin gets no CORS headers", "OPTIONS",
      "/v1/radiance", {"status": 204, "header": {"Access-Control-Allow-Origin": None,
                                                  "Access-Control-Allow-Methods": None}},
      headers={"Origin": "http://elsewhere.example", "Access-Control-Request-Method": "POST"})
write("cors-get-allowed-origin", "cors: GET from the allowed origin carries Access-Control-Allow-Origin", "GET",
      "/v1/peak?temperature=5778", ok({"/peak_wavelength": ap("0.501518165", 1e-8)},
                                      header={"Access-Control-Allow-Origin": ORIGIN}),
      headers={"Origin": ORIGIN}, source=REF)
write("cors-get-other-origin", "cors: GET from another origin has no Access-Control-Allow-Origin", "GET",
      "/v1/peak?temperature=5778", {"status": 200, "header": {"Access-Control-Allow-Origin": None}},
      headers={"Origin": "http://elsewhere.example"})
write("cors-error-allowed-origin", "cors: an error response carries Access-Control-Allow-Origin too", "GET",
      "/v1/radiance?temperature=-5&wavelength=10",
      problem(422, "temperature_out_of_range", header={"Access-Control-Allow-Origin": ORIGIN}),
      headers={"Origin": ORIGIN})

# ---------------- operations
write("ops-healthz", "ops: GET /healthz", "GET", "/healthz", ok({"/status": "ok"}))
write("ops-healthz-head", "ops: HEAD /healthz", "HEAD", "/healthz", {"status": 200})
write("ops-readyz", "ops: GET /readyz while serving", "GET", "/readyz", ok({"/status": "ready"}))
write("ops-version", "ops: GET /version", "GET", "/version", ok({"/name": "greybody"}), )
write("ops-metrics", "ops: GET /metrics in the Prometheus text format", "GET", "/metrics",
      {"status": 200, "content_type": "text/plain; version=0.0.4", "prometheus": True,
       "body_contains": ["# HELP greybody_", "# TYPE greybody_", " counter\n", " histogram\n", "le=\"+Inf\""]})
write("ops-openapi", "ops: GET /openapi.json", "GET", "/openapi.json",
      ok({"/openapi": "3.1.0", "/paths/~1v1~1radiance/get/operationId": "getRadiance",
          "/paths/~1v1~1sensitivity/post/operationId": "postSensitivity"}))

print(len(written), "case files written to", OUT)
