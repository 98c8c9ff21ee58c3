#!/usr/bin/python3
"""Writes the case files of the practitioner workflows -- /v1/emissivity, /v1/ratio-temperature,
"method": "monte-carlo" on /v1/sensitivity, /v1/spectrum and the band presets -- with every
expected number computed outside the server: oracle.py and tests/reference/workflows.py (mpmath,
30 digits, CODATA 2018 constants, band integrals by quadrature), or quoted from
/work/shared/REFERENCES.md.  Scenes named after places are invented for the tests.

Like write_cases.py it rewrites only the files it names; run it with Debian's interpreter
(python3-mpmath) and review the diff:
  /usr/bin/python3 tests/integration/write_workflow_cases.py
It also prints the request/response examples of api-docs/openapi.yaml for these endpoints.
"""
import os
import sys

from case_file import FLAT, MP, REF, ap, ok, problem, write, written
from oracle import (band_quantities, corrected, from_kelvin, kelvin, mp, peaks,
                    radiance_at_wavelength, radiance_at_wavenumber)

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "reference"))
import workflows  # noqa: E402  (the second mpmath witness: quadrature, mpmath.diff)

WF = "mpmath 30 digits (tests/reference/workflows.py: quadrature band radiances, mpmath.diff derivatives)"
ASTM = ("ASTM E1933 (reference-temperature procedures: contact probe or known-emissivity patch); "
        "values: " + WF + "; u(eps): JCGM 100:2008 eq. (10)")
WORKFLOW_BAND = "wavelength:8:14"
T3 = ("temperature", "temperature", "temperature")


def k_text(value, unit="K"):
    """A request temperature as the kelvin text the reference functions take."""
    return mp.nstr(kelvin(value, unit), 25)


# ---------------------------------------------------------------- /v1/emissivity

def contact_emissivity(surface, signal, reflected, u, tau="1", atmosphere="nan", band=WORKFLOW_BAND,
                       kinds=T3):
    """eps and u(eps) of the contact form: workflows.emissivity_compute (mpmath.diff partials).
    `u` maps surface_temperature_k, signal, reflected, transmittance, atmosphere to kelvin-sized
    standard uncertainties."""
    row = {"band": band, "signal_kind": kinds[0], "signal": signal, "reflected_kind": kinds[1],
           "reflected": reflected, "transmittance": tau, "atmosphere_kind": kinds[2],
           "atmosphere": atmosphere, "surface_temperature_k": surface}
    out = workflows.emissivity_compute(row)
    columns = {"surface_temperature_k": "d_surface_temperature", "signal": "d_signal",
               "reflected": "d_reflected", "transmittance": "d_transmittance",
               "atmosphere": "d_atmosphere"}
    partial = {name: out[column] or 0 for name, column in columns.items()}
    u_eps = mp.sqrt(sum((partial[name] * mp.mpf(value)) ** 2 for name, value in u.items()))
    return out["emissivity"], u_eps, partial


def patch_emissivity(values, u, tau=None, atmosphere=None):
    """The reference-patch form: the patch's temperature solved by oracle.corrected, then eps;
    every sensitivity is mpmath.diff of the whole chain.  `values`: reference (K), eps_ref,
    signal (K), reflected (K)."""
    names = list(values)

    def eps(**moved):
        x = {name: mp.mpf(moved.get(name, values[name])) for name in names}
        air = ("temperature", atmosphere) if atmosphere is not None else None
        surface = corrected(FLAT, ("temperature", x["reference"]), x["eps_ref"],
                            ("temperature", x["reflected"]), tau or 1, air)
        numerator, contrast = workflows.emissivity_of(
            workflows.parse_band(WORKFLOW_BAND), T3,
            {"signal": x["signal"], "reflected": x["reflected"], "transmittance": mp.mpf(tau or 1),
             "surface_temperature_k": surface,
             "atmosphere": mp.mpf(atmosphere) if atmosphere is not None else mp.nan})
        return numerator / contrast, surface

    value, surface = eps()
    partial = {name: mp.diff(lambda t, name=name: eps(**{name: t})[0], mp.mpf(values[name]))
               for name in names}
    u_eps = mp.sqrt(sum((partial[name] * mp.mpf(u.get(name, 0))) ** 2 for name in names))
    return value, u_eps, partial, surface


def budget_fields(rows, partial, rel, u=None):
    """Expected budget rows: (quantity, partial key) in the server's order, with the
    contribution |c u| when the uncertainties `u` are given."""
    fields = {}
    for index, (quantity, name) in enumerate(rows):
        if quantity is None:
            continue
        fields["/budget/%d/quantity" % index] = quantity
        fields["/budget/%d/sensitivity" % index] = ap(partial[name], rel)
        if u is not None:
            fields["/budget/%d/contribution" % index] = ap(abs(partial[name]) * mp.mpf(u[name]), rel)
    return fields


def emissivity_cases():
    # A round trip of workflows.py: the signal was built from eps = 0.87 at 330 K before 295 K.
    rows = {row["case"]: row for row in workflows.emissivity_rows()}
    lwir = rows["round_trip_lwir"]
    u = {"surface_temperature_k": "0.5", "signal": "0.3", "reflected": "2"}
    eps, u_eps, partial = contact_emissivity(lwir["surface_temperature_k"], lwir["signal"],
                                             lwir["reflected"], u)
    write("emissivity-get-contact-round-trip",
          "emissivity: GET contact probe, the signal of a surface of eps 0.87 (ASTM E1933 contact form)",
          "GET", "/v1/emissivity?surface_temperature=330&apparent_temperature=%s"
          "&reflected_temperature=295&u_surface_temperature=0.5&u_apparent_temperature=0.3"
          "&u_reflected_temperature=2" % lwir["signal"],
          ok({"/emissivity": ap(eps), "/u_emissivity": ap(u_eps, 1e-8),
              "/expanded_uncertainty": ap(2 * u_eps, 1e-8), "/coverage_factor": 2,
              "/surface_temperature": ap(330), "/temperature_unit": "K",
              "/budget/0/quantity": "surface_temperature",
              "/budget/0/sensitivity": ap(partial["surface_temperature_k"], 1e-8),
              "/budget/0/contribution": ap(abs(partial["surface_temperature_k"]) * mp.mpf("0.5"), 1e-8),
              "/budget/1/quantity": "apparent_temperature",
              "/budget/1/sensitivity": ap(partial["signal"], 1e-8),
              "/budget/2/quantity": "reflected_temperature",
              "/budget/2/sensitivity": ap(partial["reflected"], 1e-8),
              "/budget/3/quantity": "transmittance", "/budget/3/sensitivity": None,
              "/budget/4/quantity": "atmosphere_temperature"},
             absent=["/budget/5"]),
          source=ASTM, note="the signal was generated from eps = 0.87 (workflows.py row round_trip_lwir)")

    # Invented: the Marsh Lane depot roof, a condenser housing probed at 41.8 C, read at 38.1 C,
    # reflecting a sky-and-parapet background of 4 C, through 1 % of air loss.
    body = {"surface_temperature": 41.8, "apparent_temperature": 38.1, "reflected_temperature": 4,
            "transmittance": 0.99, "atmosphere_temperature": 24, "temperature_unit": "C",
            "u_surface_temperature": 0.4, "u_apparent_temperature": 0.5,
            "u_reflected_temperature": 3, "u_transmittance": 0.01, "u_atmosphere_temperature": 2}
    u = {"surface_temperature_k": "0.4", "signal": "0.5", "reflected": "3", "transmittance": "0.01",
         "atmosphere": "2"}
    eps, u_eps, partial = contact_emissivity(k_text(41.8, "C"), k_text(38.1, "C"), k_text(4, "C"), u,
                                             tau="0.99", atmosphere=k_text(24, "C"))
    fields = {"/emissivity": ap(eps), "/u_emissivity": ap(u_eps, 1e-8),
              "/surface_temperature": ap(41.8), "/temperature_unit": "C"}
    fields.update(budget_fields([("surface_temperature", "surface_temperature_k"),
                                 ("apparent_temperature", "signal"),
                                 ("reflected_temperature", "reflected"),
                                 ("transmittance", "transmittance"),
                                 ("atmosphere_temperature", "atmosphere")], partial, 1e-8, u))
    write("emissivity-post-rooftop-contact-celsius",
          "emissivity: POST rooftop condenser housing, contact probe, air on the path, in C (demo scenario)",
          "POST", "/v1/emissivity", ok(fields), body=body, source=ASTM)
    print_example("EmissivityRooftopContact", body, {
        "emissivity": eps, "u_emissivity": u_eps, "expanded_uncertainty": 2 * u_eps,
        "coverage_factor": 2, "surface_temperature": mp.mpf("41.8"), "temperature_unit": "C"})

    # The reference-patch form: black tape of eps 0.95 beside the bare spot (invented scene).
    values = {"reference": "328.4", "eps_ref": "0.95", "signal": "321.7", "reflected": "293.15"}
    u = {"reference": "0.3", "eps_ref": "0.01", "signal": "0.3", "reflected": "1.5"}
    eps, u_eps, partial, surface = patch_emissivity(values, u)
    body = {"reference_apparent_temperature": 328.4, "reference_emissivity": 0.95,
            "apparent_temperature": 321.7, "reflected_temperature": 293.15,
            "u_reference_apparent_temperature": 0.3, "u_reference_emissivity": 0.01,
            "u_apparent_temperature": 0.3, "u_reflected_temperature": 1.5}
    fields = {"/emissivity": ap(eps), "/u_emissivity": ap(u_eps, 1e-7),
              "/surface_temperature": ap(surface)}
    fields.update(budget_fields([("reference_apparent_temperature", "reference"),
                                 ("reference_emissivity", "eps_ref"),
                                 ("apparent_temperature", "signal"),
                                 ("reflected_temperature", "reflected")], partial, 1e-7))
    write("emissivity-post-reference-patch",
          "emissivity: POST reference patch of eps 0.95 on the same surface (ASTM E1933 patch form)",
          "POST", "/v1/emissivity", ok(fields), body=body,
          source=ASTM + "; the reflected temperature's sensitivity is the total derivative "
                        "through the patch's temperature (mpmath.diff of the whole chain)")
    print_example("EmissivityReferencePatch", body,
                  {"emissivity": eps, "u_emissivity": u_eps, "surface_temperature": surface})

    # The remote-sensing form: radiances for the signal, the downwelling and the path.
    row = rows["round_trip_radiances"]
    u = {"signal": "0.05", "reflected": "0.2", "atmosphere": "0.1"}
    eps, u_eps, partial = contact_emissivity(row["surface_temperature_k"], row["signal"],
                                             row["reflected"], u, tau=row["transmittance"],
                                             atmosphere=row["atmosphere"], band=row["band"],
                                             kinds=("radiance", "radiance", "radiance"))
    write("emissivity-post-radiance-form",
          "emissivity: POST measured, reflected and path radiances name their own budget rows",
          "POST", "/v1/emissivity",
          ok(dict({"/emissivity": ap(eps), "/u_emissivity": ap(u_eps, 1e-8)},
                  **budget_fields([(None, None), ("measured_radiance", "signal"),
                                   ("reflected_radiance", "reflected"),
                                   ("transmittance", "transmittance"),
                                   ("path_radiance", "atmosphere")], partial, 1e-8))),
          body={"surface_temperature": float(row["surface_temperature_k"]),
                "measured_radiance": float(row["signal"]), "reflected_radiance": float(row["reflected"]),
                "transmittance": float(row["transmittance"]), "path_radiance": float(row["atmosphere"]),
                "band": {"wavelength": [10.5, 11.5]}, "u_measured_radiance": 0.05,
                "u_reflected_radiance": 0.2, "u_path_radiance": 0.1},
          source=ASTM, note="the signal was generated from eps = %s (workflows.py row round_trip_radiances)"
          % row["generating_emissivity"])

    # Fahrenheit: the sensitivity to a temperature is per degree F (a K-sized partial / 1.8).
    eps_f, u_f, partial_f = contact_emissivity("330", lwir["signal"], "295", {"surface_temperature_k": "1"})
    write("emissivity-post-fahrenheit",
          "emissivity: POST in F: u and sensitivities per degree F", "POST", "/v1/emissivity",
          ok({"/emissivity": ap(eps_f), "/u_emissivity": ap(u_f, 1e-8),
              "/budget/0/standard_uncertainty": ap(1.8),
              "/budget/0/sensitivity": ap(partial_f["surface_temperature_k"] / mp.mpf("1.8"), 1e-8),
              "/surface_temperature": ap(from_kelvin(mp.mpf(330), "F")), "/temperature_unit": "F"}),
          body={"surface_temperature": float(from_kelvin(mp.mpf(330), "F")),
                "apparent_temperature": float(from_kelvin(mp.mpf(lwir["signal"]), "F")),
                "reflected_temperature": float(from_kelvin(mp.mpf(295), "F")),
                "temperature_unit": "F", "u_surface_temperature": 1.8}, source=ASTM)

    # Arrays: a scan of three spots probed at one temperature; the last one reads like its background.
    spots = [("325", "0.5"), ("318", "0.5"), ("295", "0.5")]
    expected = []
    for signal, _ in spots[:2]:
        value, u_value, _ = contact_emissivity("330", signal, "295.5", {"signal": "0.5"})
        expected.append((value, u_value))
    write("emissivity-post-array-element-errors",
          "emissivity: POST three readings, one no hotter than the background (element_errors)",
          "POST", "/v1/emissivity",
          ok({"/emissivity": [ap(expected[0][0]), ap(expected[1][0]), None],
              "/u_emissivity": [ap(expected[0][1], 1e-8), ap(expected[1][1], 1e-8), None],
              "/surface_temperature": [ap(330), ap(330), None],
              "/element_errors/0/index": 2, "/element_errors/0/code": "emissivity_out_of_range",
              "/element_errors/0/field": "apparent_temperature"},
             absent=["/element_errors/1", "/budget"]),
          body={"surface_temperature": 330, "apparent_temperature": [325, 318, 295],
                "reflected_temperature": 295.5, "u_apparent_temperature": 0.5},
          source=ASTM, note="295 K read before a 295.5 K background gives eps < 0")
    write("emissivity-get-422-undetermined",
          "emissivity: GET surface at its background's temperature: no emissivity can be read",
          "GET", "/v1/emissivity?surface_temperature=300&apparent_temperature=300&reflected_temperature=300",
          problem(422, "emissivity_undetermined", "reflected_temperature",
                  body_contains=["does not depend on the emissivity"]),
          note="L(T) = L(T_r): the measurement equation does not contain eps (ASTM E1933 asks for a "
               "surface well away from its background's temperature)")
    write("emissivity-get-422-above-one",
          "emissivity: GET a reading hotter than a blackbody at the probe's temperature",
          "GET", "/v1/emissivity?surface_temperature=300&apparent_temperature=310&reflected_temperature=290",
          problem(422, "emissivity_out_of_range", "apparent_temperature",
                  body_contains=["no emissivity in (0, 1]"]))
    write("emissivity-get-400-no-surface", "emissivity: GET without a surface temperature or reference patch",
          "GET", "/v1/emissivity?apparent_temperature=310&reflected_temperature=290",
          problem(400, "missing_field", "surface_temperature"))
    write("emissivity-post-400-patch-without-emissivity",
          "emissivity: POST a reference patch reading without its emissivity", "POST", "/v1/emissivity",
          problem(400, "missing_field", "reference_emissivity"),
          body={"reference_apparent_temperature": 328, "apparent_temperature": 321,
                "reflected_temperature": 293})
    write("emissivity-post-400-mixed-forms",
          "emissivity: POST a contact temperature with a patch's emissivity", "POST", "/v1/emissivity",
          problem(400, "conflicting_fields", "reference_emissivity"),
          body={"surface_temperature": 330, "reference_emissivity": 0.95, "apparent_temperature": 321,
                "reflected_temperature": 293})
    write("emissivity-post-422-reference-emissivity",
          "emissivity: POST a reference patch emissivity above 1", "POST", "/v1/emissivity",
          problem(422, "emissivity_out_of_range", "reference_emissivity"),
          body={"reference_apparent_temperature": 328, "reference_emissivity": 1.3,
                "apparent_temperature": 321, "reflected_temperature": 293})


# ---------------------------------------------------------------- /v1/ratio-temperature

def ratio(first, second, signal_ratio, emissivity_ratio="1", guess="1500"):
    return workflows.ratio_compute({"first": first, "second": second, "temperature_k": guess,
                                    "signal_ratio": signal_ratio, "emissivity_ratio": emissivity_ratio,
                                    "true_emissivity_ratio": "1"})


def ratio_cases():
    out = ratio("wl:0.9", "wl:1.05", "0.471495314349")
    write("ratio-get-reference-example",
          "ratio temperature: GET 0.9/1.05 um, R = 0.471495314349 is 1500 K (published example)",
          "GET", "/v1/ratio-temperature?wavelengths=0.9,1.05&signal_ratio=0.471495314349",
          ok({"/temperature": ap(1500, 1e-8), "/wien_temperature": ap("1499.916952", 1e-8),
              "/emissivity_ratio_sensitivity": ap(out["emissivity_ratio_sensitivity"], 1e-8),
              "/temperature_unit": "K"}),
          source=REF + " (two-colour example: exact 1500 K, Wien 1499.916952 K); dT/d(eps1/eps2): " + WF)
    true_ratio = workflows.model_ratio("wl:0.9", "wl:1.05", mp.mpf(1500), mp.mpf("1.02"))
    signal = repr(float(true_ratio))
    grey = ratio("wl:0.9", "wl:1.05", signal)
    known = ratio("wl:0.9", "wl:1.05", signal, "1.02")
    write("ratio-post-non-grey-read-as-grey",
          "ratio temperature: POST a non-grey body (eps1/eps2 = 1.02) read as grey, and with its ratio",
          "POST", "/v1/ratio-temperature",
          ok({"/temperature": [ap(grey["solved_temperature_k"]), ap(known["solved_temperature_k"])],
              "/wien_temperature": [ap(grey["wien_temperature_k"]), ap(known["wien_temperature_k"])],
              "/emissivity_ratio_sensitivity": [ap(grey["emissivity_ratio_sensitivity"], 1e-8),
                                                ap(known["emissivity_ratio_sensitivity"], 1e-8)]}),
          body={"wavelengths": [0.9, 1.05], "signal_ratio": float(true_ratio),
                "emissivity_ratio": [1, 1.02]},
          source=WF, note="REFERENCES.md prints 1519.68 K for the grey reading; mpmath gives "
                          "%s K, which is asserted here" % mp.nstr(grey["solved_temperature_k"], 15))
    print_example("RatioFurnaceTube", {"wavelengths": [0.9, 1.05], "signal_ratio": float(true_ratio),
                                       "emissivity_ratio": 1.02},
                  {"temperature": known["solved_temperature_k"], "temperature_unit": "K",
                   "wien_temperature": known["wien_temperature_k"],
                   "emissivity_ratio_sensitivity": known["emissivity_ratio_sensitivity"]})

    # Bands, one of them a preset (narrow-1.0 is 0.95-1.05 um), answers in C; the last ratio is
    # beyond the grey model's reach at any temperature.
    results = [ratio("band:0.8:0.9", "band:0.95:1.05", r) for r in ("0.35", "0.55")]
    write("ratio-post-bands-preset-celsius",
          "ratio temperature: POST two bands (one a preset), answers in C, an unreachable ratio",
          "POST", "/v1/ratio-temperature",
          ok({"/temperature": [ap(from_kelvin(o["solved_temperature_k"], "C")) for o in results] + [None],
              "/emissivity_ratio_sensitivity": [ap(o["emissivity_ratio_sensitivity"], 1e-8)
                                                for o in results] + [None],
              "/temperature_unit": "C", "/element_errors/0/index": 2,
              "/element_errors/0/code": "ratio_unreachable", "/element_errors/0/field": "signal_ratio"},
             absent=["/wien_temperature", "/element_errors/1"]),
          body={"bands": [{"wavelength": [0.8, 0.9]}, {"preset": "narrow-1.0"}],
                "signal_ratio": [0.35, 0.55, 3], "temperature_unit": "C"}, source=WF)
    write("ratio-get-bands-query",
          "ratio temperature: GET bands=0.8,0.9;preset:narrow-1.0", "GET",
          "/v1/ratio-temperature?bands=0.8,0.9;preset:narrow-1.0&signal_ratio=0.35",
          ok({"/temperature": ap(results[0]["solved_temperature_k"])}, absent=["/wien_temperature"]),
          source=WF)
    write("ratio-get-422-reversed", "ratio temperature: GET the longer wavelength first", "GET",
          "/v1/ratio-temperature?wavelengths=1.05,0.9&signal_ratio=2",
          problem(422, "band_reversed", "wavelengths"))
    write("ratio-get-422-unreachable",
          "ratio temperature: GET a ratio above the Rayleigh-Jeans limit (1.05/0.9)^4 = 1.8526",
          "GET", "/v1/ratio-temperature?wavelengths=0.9,1.05&signal_ratio=2",
          problem(422, "ratio_unreachable", "signal_ratio"), source=REF)
    write("ratio-get-422-zero-ratio", "ratio temperature: GET a signal ratio of 0", "GET",
          "/v1/ratio-temperature?wavelengths=0.9,1.05&signal_ratio=0",
          problem(422, "ratio_unreachable", "signal_ratio"))
    write("ratio-post-400-both-channels", "ratio temperature: POST wavelengths and bands together",
          "POST", "/v1/ratio-temperature", problem(400, "conflicting_fields", "bands"),
          body={"wavelengths": [0.9, 1.05], "bands": [{"wavelength": [0.8, 0.9]},
                                                      {"wavelength": [1, 1.1]}], "signal_ratio": 0.5})
    write("ratio-post-400-unknown-preset", "ratio temperature: POST a band preset that does not exist",
          "POST", "/v1/ratio-temperature", problem(400, "invalid_band", "bands"),
          body={"bands": [{"preset": "no-such-band"}, {"wavelength": [1, 1.1]}], "signal_ratio": 0.5})


# ---------------------------------------------------------------- Monte Carlo

def mc_row(case, draws="100000"):
    row = {r["case"]: r for r in workflows.mc_rows()}[case]
    row = dict(row, draws=draws)
    return row, workflows.mc_compute(row)


def within(low, centre, high):
    """An approx matcher that accepts [low, high] (the range a Monte Carlo estimate may take)."""
    return {"approx": float(centre), "rel": 0, "abs": float(max(centre - low, high - centre))}


def montecarlo_cases():
    mc_source = ("JCGM 101:2008 against JCGM 100:2008; GUM u_c and exact output laws: " + WF +
                 "; tolerances: 5 sampling standard deviations for the draw count")
    row, out = mc_row("gum_example_a")
    u_c = out["gum_standard_uncertainty_k"]
    t = out["temperature_k"]
    body = {"apparent_temperature": 308.15, "emissivity": 0.95, "reflected_temperature": 293.15,
            "u_emissivity": 0.02, "u_reflected_temperature": 2, "u_apparent_temperature": 0.5,
            "method": "monte-carlo"}
    write("sensitivity-post-monte-carlo-example-a",
          "sensitivity: POST Monte Carlo on example A agrees with the GUM (near-linear model)",
          "POST", "/v1/sensitivity",
          ok({"/combined_standard_uncertainty": ap(u_c, 1e-8), "/temperature": ap(t),
              "/monte_carlo/standard_deviation": ap(u_c, 0.03),
              "/monte_carlo/mean": {"approx": float(t), "rel": 0, "abs": float(0.03 * u_c)},
              "/monte_carlo/coverage_probability": 0.95, "/monte_carlo/draws": 100000,
              "/monte_carlo/seed": 1, "/monte_carlo/unsolvable_draws": 0,
              "/monte_carlo/distributions/emissivity": "normal",
              "/monte_carlo/distributions/apparent_temperature": "normal"},
             absent=["/monte_carlo/distributions/transmittance"]),
          body=body, heavy=True, source=mc_source + "; REFERENCES.md: u_c = 0.614 K",
          note="near-linear: the Monte Carlo standard deviation is the GUM u_c within 3 %")
    # Non-linear: a hot surface of eps 0.3 +- 0.1 before a cool background.
    row, out = mc_row("nonlinear_low_emissivity")
    t = out["temperature_k"]
    u_c = out["gum_standard_uncertainty_k"]
    write("sensitivity-post-monte-carlo-nonlinear",
          "sensitivity: POST Monte Carlo at eps 0.3, u(eps) 0.1: an asymmetric interval, unlike the GUM's",
          "POST", "/v1/sensitivity",
          ok({"/temperature": ap(t), "/combined_standard_uncertainty": ap(u_c, 1e-8),
              "/monte_carlo/coverage_interval/0": within(out["low_min_k"], out["exact_low_k"], out["low_max_k"]),
              "/monte_carlo/coverage_interval/1": within(out["high_min_k"], out["exact_high_k"], out["high_max_k"]),
              "/monte_carlo/draws": 100000}),
          body={"apparent_temperature": 340, "emissivity": 0.3, "reflected_temperature": 293.15,
                "u_emissivity": 0.1, "method": "monte-carlo"},
          heavy=True, source=mc_source,
          note="exact 95 %% interval [%s, %s] K about T = %s K (%s below, %s above); the GUM's "
               "T +- 2 u_c = +- %s K is symmetric and would fail both bounds"
               % tuple(mp.nstr(v, 6) for v in (out["exact_low_k"], out["exact_high_k"], t,
                                                 t - out["exact_low_k"], out["exact_high_k"] - t, 2 * u_c)))
    row, out = mc_row("nonlinear_rectangular")
    write("sensitivity-post-monte-carlo-rectangular",
          "sensitivity: POST Monte Carlo with a rectangular emissivity law: spread and interval",
          "POST", "/v1/sensitivity",
          ok({"/monte_carlo/standard_deviation": within(out["standard_deviation_min_k"],
                                                        out["exact_standard_deviation_k"],
                                                        out["standard_deviation_max_k"]),
              "/monte_carlo/coverage_interval/0": within(out["low_min_k"], out["exact_low_k"], out["low_max_k"]),
              "/monte_carlo/coverage_interval/1": within(out["high_min_k"], out["exact_high_k"], out["high_max_k"]),
              "/monte_carlo/distributions/emissivity": "rectangular"}),
          body={"apparent_temperature": 340, "emissivity": 0.3, "reflected_temperature": 293.15,
                "u_emissivity": 0.1, "method": "monte-carlo", "distributions": {"emissivity": "rectangular"}},
          heavy=True, source=mc_source)
    row, out = mc_row("nonlinear_rectangular", draws="2000")
    write("sensitivity-get-monte-carlo-seeded",
          "sensitivity: GET Monte Carlo, 2000 draws, seed 7, rectangular emissivity (query form)", "GET",
          "/v1/sensitivity?apparent_temperature=340&emissivity=0.3&reflected_temperature=293.15"
          "&u_emissivity=0.1&method=monte-carlo&draws=2000&seed=7&distributions=emissivity:rectangular",
          ok({"/monte_carlo/draws": 2000, "/monte_carlo/seed": 7,
              "/monte_carlo/distributions/emissivity": "rectangular",
              "/monte_carlo/coverage_interval/0": within(out["low_min_k"], out["exact_low_k"], out["low_max_k"]),
              "/monte_carlo/coverage_interval/1": within(out["high_min_k"], out["exact_high_k"], out["high_max_k"])}),
          source=mc_source)
    base = "/v1/sensitivity?apparent_temperature=308.15&emissivity=0.95&reflected_temperature=293.15&u_emissivity=0.02"
    write("sensitivity-get-422-too-few-draws", "sensitivity: GET Monte Carlo with 50 draws", "GET",
          base + "&method=monte-carlo&draws=50", problem(422, "draw_count_out_of_range", "draws"))
    write("sensitivity-get-422-too-many-draws",
          "sensitivity: GET Monte Carlo above the server's --max-draws (default 200000)", "GET",
          base + "&method=monte-carlo&draws=200001", problem(422, "draw_count_out_of_range", "draws"))
    write("sensitivity-get-400-draws-without-method", "sensitivity: GET draws without method=monte-carlo",
          "GET", base + "&draws=1000", problem(400, "conflicting_fields", "draws"))
    write("sensitivity-post-400-unknown-law", "sensitivity: POST a distribution that is not offered",
          "POST", "/v1/sensitivity", problem(400, "distribution_unknown", "distributions.emissivity"),
          body={"apparent_temperature": 308.15, "emissivity": 0.95, "reflected_temperature": 293.15,
                "u_emissivity": 0.02, "method": "monte-carlo", "distributions": {"emissivity": "triangular"}})
    write("sensitivity-post-400-law-of-other-form",
          "sensitivity: POST a distribution keyed by an input form not given", "POST", "/v1/sensitivity",
          problem(400, "unknown_field", "distributions.reflected_radiance"),
          body={"apparent_temperature": 308.15, "emissivity": 0.95, "reflected_temperature": 293.15,
                "method": "monte-carlo", "distributions": {"reflected_radiance": "normal"}})
    write("sensitivity-get-400-draws-fraction", "sensitivity: GET a draw count that is not whole", "GET",
          base + "&method=monte-carlo&draws=1000.5", problem(400, "wrong_type", "draws"))
    write("sensitivity-get-400-method-unknown", "sensitivity: GET an unknown method", "GET",
          base + "&method=bootstrap", problem(400, "wrong_type", "method"))


# ---------------------------------------------------------------- /v1/spectrum

def spectrum_cases():
    lower, upper, count = mp.mpf(1), mp.mpf(30), 5
    grid = [lower * (upper / lower) ** (mp.mpf(i) / (count - 1)) for i in range(count)]
    fields = {"/wavelength": [ap(x, 1e-14) for x in grid], "/wavelength_unit": "um",
              "/spacing": "logarithmic", "/radiance_unit": "W m-2 sr-1 um-1"}
    for index, t in enumerate((300, 1000)):
        p = peaks(t)
        fields["/curves/%d/temperature" % index] = t
        fields["/curves/%d/radiance" % index] = [ap(radiance_at_wavelength(x, t)[0]) for x in grid]
        fields["/curves/%d/peak_wavelength" % index] = ap(p["peak_wavelength"])
        fields["/curves/%d/peak_radiance" % index] = ap(p["peak_radiance"])
        fields["/curves/%d/band_fraction" % index] = ap(band_quantities(FLAT, t)["fraction"])
    write("spectrum-get-log-grid-band-preset",
          "spectrum: GET two curves on a logarithmic 1-30 um grid, fraction in the 8-14 um preset",
          "GET", "/v1/spectrum?temperatures=300,1000&wavelength_range=1,30&points=5"
          "&spacing=logarithmic&band=preset:longwave-8-14",
          ok(fields, absent=["/curves/2", "/wavelength/5"]), source=MP + "; grid: lower (upper/lower)^(i/(n-1))")
    # Wavenumbers, a linear grid, C, a grey body of 0.9 (invented: a glazing kiln's door at 650-900 C).
    grid = [mp.mpf(500) + (mp.mpf(3000) - 500) * i / 3 for i in range(4)]
    fields = {"/wavenumber": [ap(x, 1e-14) for x in grid], "/wavenumber_unit": "cm-1",
              "/radiance_unit": "W m-2 sr-1 (cm-1)-1", "/temperature_unit": "C", "/emissivity": 0.9}
    for index, c in enumerate((650, 900)):
        t = kelvin(c, "C")
        p = peaks(t)
        fields["/curves/%d/temperature" % index] = c
        fields["/curves/%d/radiance" % index] = [ap(radiance_at_wavenumber(x, t, "0.9")[0]) for x in grid]
        fields["/curves/%d/peak_wavenumber" % index] = ap(p["peak_wavenumber"])
        fields["/curves/%d/peak_radiance" % index] = ap(radiance_at_wavenumber(p["peak_wavenumber"], t, "0.9")[0])
    body = {"temperatures": [650, 900], "temperature_unit": "C", "wavenumber_range": [500, 3000],
            "points": 4, "emissivity": 0.9}
    write("spectrum-post-wavenumber-celsius",
          "spectrum: POST kiln door curves per wavenumber, linear grid, eps 0.9, in C (demo scenario)",
          "POST", "/v1/spectrum", ok(fields, absent=["/curves/0/band_fraction", "/wavelength"]),
          body=body, source=MP)
    print_example("SpectrumKilnDoor", body, None)
    write("spectrum-get-400-too-many-points", "spectrum: GET more points than --max-spectrum-points", "GET",
          "/v1/spectrum?temperatures=300&wavelength_range=1,30&points=10001",
          problem(400, "wrong_type", "points"))
    write("spectrum-post-413-too-many-curves", "spectrum: POST 17 temperatures (default limit 16)", "POST",
          "/v1/spectrum", problem(413, "array_too_long", "temperatures"),
          body={"temperatures": list(range(300, 317)), "wavelength_range": [1, 30]})
    write("spectrum-get-422-reversed-range", "spectrum: GET a wavelength range high to low", "GET",
          "/v1/spectrum?temperatures=300&wavelength_range=30,1", problem(422, "band_reversed", "wavelength_range"))
    write("spectrum-get-422-temperature", "spectrum: GET a temperature below absolute zero", "GET",
          "/v1/spectrum?temperatures=300,-10&wavelength_range=1,30",
          problem(422, "temperature_out_of_range", "temperatures", body_contains=["temperatures[1]"]))
    write("spectrum-get-400-no-temperatures", "spectrum: GET without temperatures", "GET",
          "/v1/spectrum?wavelength_range=1,30", problem(400, "missing_field", "temperatures"))


# ---------------------------------------------------------------- presets

def presets_cases():
    write("presets-get-list", "presets: GET the band presets and the material table with its warning",
          "GET", "/v1/presets",
          ok({"/bands/0/name": "longwave-8-14", "/bands/0/band/wavelength": [8, 14],
              "/bands/0/synthetic": False, "/materials/0/source": "from memory"},
             body_contains=["starting point, not a measurement", "\"synthetic\":true",
                            "\"name\":\"narrow-3.9\""]),
          source="shared/bands.json and shared/materials.json as committed")
    write("presets-post-405", "presets: POST is not allowed (read-only list)", "POST", "/v1/presets",
          {"status": 405, "header": {"Allow": {"tokens": ["GET", "HEAD", "OPTIONS"]}}}, body={})
    q = band_quantities(("wavelength", 3, 5), 500)
    write("band-post-preset-midwave", "band: POST band {\"preset\": \"midwave-3-5\"} is the 3-5 um band",
          "POST", "/v1/band", ok({"/radiance": ap(q["radiance"]), "/fraction": ap(q["fraction"]),
                                  "/radiance_derivative": ap(q["radiance_derivative"])}),
          body={"temperature": 500, "band": {"preset": "midwave-3-5"}}, source=MP)
    response = ("response", [7.0, 7.5, 8.0, 9.0, 10.0, 11.0, 12.0, 13.0, 13.5, 14.0, 14.5],
                [0.0, 0.35, 0.80, 0.95, 1.00, 0.97, 0.90, 0.75, 0.50, 0.20, 0.0])
    q = band_quantities(response, 300)
    write("band-get-preset-synthetic-response",
          "band: GET band=preset:demo-longwave-camera (a synthetic response curve)", "GET",
          "/v1/band?temperature=300&band=preset:demo-longwave-camera",
          ok({"/radiance": ap(q["radiance"]), "/fraction": ap(q["fraction"])}),
          source=MP + "; the response table of shared/bands.json")
    t = corrected(("wavelength", 3, 5), ("temperature", 600), "0.8", ("temperature", 300))
    write("corrected-post-band-preset", "corrected temperature: POST with a band preset", "POST",
          "/v1/corrected-temperature", ok({"/temperature": ap(t)}),
          body={"apparent_temperature": 600, "emissivity": 0.8, "reflected_temperature": 300,
                "band": {"preset": "midwave-3-5"}}, source=MP)
    write("band-get-400-unknown-preset", "band: GET an unknown band preset", "GET",
          "/v1/band?temperature=300&band=preset:no-such-band", problem(400, "invalid_band", "band"))
    write("band-post-400-preset-not-a-name", "band: POST a preset that is not a string", "POST", "/v1/band",
          problem(400, "invalid_band", "band"), body={"temperature": 300, "band": {"preset": 3}})


# ---------------------------------------------------------------- examples for openapi.yaml

def print_example(name, request, response):
    """The numbers of the contract's examples, for pasting into api-docs/openapi.yaml."""
    print("example %s request %s" % (name, request))
    if response:
        print("example %s response %s" % (name, {k: (mp.nstr(v, 17) if isinstance(v, mp.mpf) else v)
                                                  for k, v in response.items()}))


emissivity_cases()
ratio_cases()
montecarlo_cases()
spectrum_cases()
presets_cases()
print(len(written), "workflow case files written")
