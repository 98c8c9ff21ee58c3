#!/usr/bin/python3
"""Writes the case files of /v1/calibration/fit, /v1/calibration/apply and the text/csv batches,
with every expected number computed outside the server: tests/reference/calibration.py (mpmath
at 40 digits: the least-squares minimum, or the effective-variance fixed point, and its
covariance; the calibration applied by implicit differentiation; cross-checked there against
scipy.optimize.curve_fit), or quoted from /work/shared/REFERENCES.md.  The calibration data are
the invented sets of tests/reference/calibration.py; "readme_handheld_cavity" is the worked
example of README.md.

Like write_cases.py it rewrites only the files it names; run it with Debian's interpreter and
review the diff:
  /usr/bin/python3 tests/integration/write_calibration_cases.py
It also prints the apply example of api-docs/openapi.yaml (mpmath values).
"""
import json
import os
import sys
import urllib.parse

from case_file import PROBLEM, REF, ap, ok, problem, write, written

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "reference"))
import calibration  # noqa: E402
from calibration import BAND, SH, mp, mpf  # noqa: E402

CAL = ("mpmath 40 digits, tests/reference/calibration.py (least-squares minimum and covariance by "
       "Gauss-Newton; agrees with scipy.optimize.curve_fit)")
CSV = "text/csv"
NAMES = {SH: ["A_um", "B_um_K", "C"], BAND: ["gain", "offset"]}
APPLY_CAL = CAL.replace("least-squares minimum and covariance by Gauss-Newton",
                        "the calibration applied exactly, u(T) by implicit differentiation")


def entry_named(name):
    return next(e for e in calibration.SETS if e[0] == name)


def reference(name):
    """(fit row, points, entry) of a data set, from the generator."""
    entry = entry_named(name)
    fit, points, _ = calibration.compute_set(entry)
    return fit, points, entry


def parameters(fit, model):
    return [float(fit['mp_p%d' % j]) for j in range(len(NAMES[model]))]


def covariance(fit, model):
    k = len(NAMES[model])
    cell = {}
    for a, b in calibration.COVARIANCE_CELLS:
        if a < k and b < k:
            cell[(a, b)] = cell[(b, a)] = float(fit['mp_cov%d%d' % (a, b)])
    return [[cell[(a, b)] for b in range(k)] for a in range(k)]


def to_unit(kelvin_text, unit):
    t = mpf(kelvin_text)
    if unit == 'C':
        return float(t - mpf('273.15'))
    if unit == 'F':
        return float((t - mpf('273.15')) * mpf('1.8') + 32)
    return float(t)


def per_kelvin(unit):
    return mpf('1.8') if unit == 'F' else mpf(1)


def fit_body(points, entry, unit):
    model, band, eps = entry[1], entry[2], entry[3]
    body = {"points": []}
    for r in points:
        point = {"temperature": to_unit(r['temperature_k'], unit), "signal": float(r['signal'])}
        if mpf(r['u_temperature_k']) > 0:
            point["u_temperature"] = float(mpf(r['u_temperature_k']) * per_kelvin(unit))
        if mpf(r['u_signal']) > 0:
            point["u_signal"] = float(r['u_signal'])
        body["points"].append(point)
    if model == BAND:
        body["model"] = "band"
        kind, lo, hi = band.split(':')
        body["band"] = {kind: [float(lo), float(hi)]}
    if eps != '1':
        body["source_emissivity"] = float(eps)
    if unit != 'K':
        body["temperature_unit"] = unit
    return body


def fit_fields(fit, points, entry, unit):
    model = entry[1]
    names = NAMES[model]
    k = len(names)
    p, cov = parameters(fit, model), covariance(fit, model)
    fields = {"/model": model, "/temperature_unit": unit,
              "/degrees_of_freedom": len(points) - k, "/weighted": fit['weighted'] == '1',
              "/covariance/parameters": names, "/calibration/model": model,
              "/calibration/covariance/parameters": names,
              "/rms_residual": ap(mpf(fit['rms_residual_k']) * per_kelvin(unit), 1e-8),
              "/chi_squared": ap(fit['chi_squared'], 1e-8)}
    for j, name in enumerate(names):
        fields["/parameters/" + name] = ap(p[j], 1e-9)
        fields["/calibration/parameters/" + name] = ap(p[j], 1e-9)
        fields["/parameter_uncertainties/" + name] = ap(mp.sqrt(cov[j][j]), 1e-8)
        for i in range(k):
            fields["/covariance/matrix/%d/%d" % (j, i)] = ap(cov[j][i], 1e-8)
    for i, r in enumerate(points):
        residual = mpf(r['residual_k']) * per_kelvin(unit)
        fields["/residuals_temperature/%d" % i] = {"approx": float(residual), "rel": 0,
                                                   "abs": 1e-9}
    return fields


def write_fit_case(file, title, name, unit):
    fit, points, entry = reference(name)
    body = fit_body(points, entry, unit)
    fields = fit_fields(fit, points, entry, unit)
    absent = None
    if entry[1] == BAND:
        fields["/calibration/band"] = body["band"]
    else:
        absent = ["/calibration/band"]
    write(file, title, "POST", "/v1/calibration/fit", ok(fields, absent), body=body,
          source=CAL + "; invented data set " + name)
    return fit, entry


def calibration_object(fit, entry):
    model = entry[1]
    names = NAMES[model]
    cal = {"model": model}
    if model == BAND:
        kind, lo, hi = entry[2].split(':')
        cal["band"] = {kind: [float(lo), float(hi)]}
    cal["parameters"] = dict(zip(names, parameters(fit, model)))
    cal["covariance"] = {"parameters": names, "matrix": covariance(fit, model)}
    return cal


def applied(fit, entry, signal, u_signal, unit):
    """T and u(T) in `unit` from the calibration exactly as it is sent (doubles)."""
    model = entry[1]
    band = calibration.parse_band(entry[2]) if model == BAND else None
    p = [mpf(v) for v in parameters(fit, model)]
    cov = [[mpf(v) for v in row] for row in covariance(fit, model)]
    t, u = calibration.applied(model, band, p, cov, mpf(signal), mpf(u_signal))
    if unit == 'C':
        t -= mpf('273.15')
    return t, u * per_kelvin(unit)


# ------------------------------------------------------------------------- fit

def fit_cases():
    write_fit_case("calibration-fit-sakuma-hattori", "calibration fit: Sakuma-Hattori, unweighted "
                   "(covariance scaled by SSR/(n-p)), source emissivity 0.995",
                   "sh_handheld_noisy", 'K')
    write_fit_case("calibration-fit-weighted-celsius", "calibration fit: the README bench, "
                   "effective-variance weights, Celsius", "readme_handheld_cavity", 'C')
    write_fit_case("calibration-fit-band-model", "calibration fit: band model 8-14 um, "
                   "source emissivity 0.98", "band_lwir_noisy", 'K')
    write_fit_case("calibration-fit-band-fahrenheit", "calibration fit: band model 3-5 um, u(T) in "
                   "Fahrenheit degrees, residuals in F", "band_mwir_effective_variance", 'F')

    def points(*pairs, **extra):
        return [dict({"temperature": t, "signal": s}, **extra) for t, s in pairs]

    four = points((300, 1), (400, 2), (500, 3.5), (600, 6))
    post = "/v1/calibration/fit"
    write("calibration-fit-422-too-few-points", "calibration fit: three points for three "
          "parameters", "POST", post, problem(422, "calibration_too_few_points", "points"),
          body={"points": four[:3]})
    write("calibration-fit-422-one-temperature", "calibration fit: every point at one "
          "temperature", "POST", post, problem(422, "calibration_degenerate", "points"),
          body={"points": points((500, 1), (500, 1.1), (500, 0.9), (500, 1.05))})
    write("calibration-fit-422-not-monotonic", "calibration fit: the signal falls between two "
          "points, named in the detail", "POST", post,
          problem(422, "calibration_not_monotonic", "points",
                  body_contains=["points[1] is cooler than points[2]"]),
          body={"points": points((300, 1), (400, 2), (500, 1.5), (600, 4))})
    partial = points((300, 1), (400, 2), (500, 3.5), (600, 6))
    partial[0]["u_signal"] = 0.01
    write("calibration-fit-422-partial-uncertainties", "calibration fit: u_signal for one point "
          "only", "POST", post, problem(422, "uncertainty_partial", "points"),
          body={"points": partial})
    write("calibration-fit-422-no-fit", "calibration fit: the band line leaves its coldest "
          "point below the offset", "POST", post, problem(422, "calibration_no_fit", "points"),
          body={"model": "band", "points": points((100, 1), (300, 1000), (400, 1001))})
    write("calibration-fit-422-zero-signal", "calibration fit: a zero signal under "
          "Sakuma-Hattori names the point", "POST", post,
          problem(422, "signal_out_of_range", "points[0].signal"),
          body={"points": points((300, 0), (400, 2), (500, 3.5), (600, 6))})
    write("calibration-fit-422-below-absolute-zero", "calibration fit: -300 C names the point",
          "POST", post, problem(422, "temperature_out_of_range", "points[2].temperature"),
          body={"temperature_unit": "C",
                "points": points((20, 1), (50, 2), (-300, 3.5), (80, 6))})
    write("calibration-fit-422-negative-u-temperature", "calibration fit: a negative "
          "u_temperature", "POST", post,
          problem(422, "uncertainty_negative", "points[0].u_temperature"),
          body={"points": points((300, 1), (400, 2), (500, 3.5), (600, 6), u_temperature=-0.1)})
    write("calibration-fit-422-source-emissivity", "calibration fit: source emissivity above 1",
          "POST", post, problem(422, "emissivity_out_of_range", "source_emissivity"),
          body={"points": four, "source_emissivity": 1.2})
    write("calibration-fit-400-unknown-point-member", "calibration fit: an unknown member of a "
          "point", "POST", post, problem(400, "unknown_field", "points[1].reading"),
          body={"points": [four[0], dict(four[1], reading=3), four[2], four[3]]})
    write("calibration-fit-400-missing-signal", "calibration fit: a point without its signal",
          "POST", post, problem(400, "missing_field", "points[0].signal"),
          body={"points": [{"temperature": 300}] + four[1:]})
    write("calibration-fit-400-points-not-array", "calibration fit: points as an object", "POST",
          post, problem(400, "wrong_type", "points"), body={"points": {"temperature": 300}})
    write("calibration-fit-400-band-with-sakuma-hattori", "calibration fit: a band belongs to the "
          "band model only", "POST", post, problem(400, "conflicting_fields", "band"),
          body={"points": four, "band": {"wavelength": [8, 14]}})
    write("calibration-fit-400-unknown-model", "calibration fit: an unknown model", "POST", post,
          problem(400, "wrong_type", "model"), body={"points": four, "model": "polynomial"})
    write("calibration-fit-413-too-many-points", "calibration fit: 1001 points where 1000 are "
          "accepted", "POST", post, problem(413, "array_too_long", "points"),
          body={"points": []},
          fill={"pointer": "/points", "count": 1001, "value": {"temperature": 300, "signal": 1}})
    write("calibration-fit-405-get", "calibration fit: GET is not allowed (points need a body)",
          "GET", post, problem(405, "method_not_allowed",
                               header={"Allow": {"tokens": ["POST", "OPTIONS"]}}))


# ----------------------------------------------------------------------- apply

def apply_cases():
    fit, _, entry = reference("readme_handheld_cavity")
    cal = calibration_object(fit, entry)
    signals, u = [1500, 4200, 9000], [3, 3, 0]
    results = [applied(fit, entry, s, v, 'C') for s, v in zip(signals, u)]
    write("calibration-apply-post-array-celsius", "calibration apply: the README bench's "
          "calibration, three field readings, Celsius", "POST", "/v1/calibration/apply",
          ok({"/temperature": [ap(t, 1e-10) for t, _ in results], "/temperature_unit": "C",
              "/u_temperature": [ap(v, 1e-8) for _, v in results], "/model": SH},
             absent=["/element_errors"]),
          body={"signal": signals, "u_signal": u, "temperature_unit": "C", "calibration": cal},
          source=APPLY_CAL)
    t, v = applied(fit, entry, 4200, 3, 'K')
    query = urllib.parse.urlencode({"signal": 4200, "u_signal": 3,
                                    "calibration": json.dumps(cal, separators=(',', ':'))})
    write("calibration-apply-get-query", "calibration apply: GET with the calibration's JSON in "
          "the query", "GET", "/v1/calibration/apply?" + query,
          ok({"/temperature": ap(t, 1e-10), "/u_temperature": ap(v, 1e-8),
              "/temperature_unit": "K"}), source=APPLY_CAL)
    write("calibration-apply-element-errors", "calibration apply: a negative signal has no "
          "temperature; the others do", "POST", "/v1/calibration/apply",
          ok({"/temperature/0": None, "/temperature/1": ap(applied(fit, entry, 4200, 0, 'K')[0],
                                                             1e-10),
              "/element_errors/0/index": 0, "/element_errors/0/code": "signal_out_of_range",
              "/element_errors/0/field": "signal"}),
          body={"signal": [-5, 4200], "calibration": cal}, source=APPLY_CAL)
    band_fit, _, band_entry = reference("band_lwir_noisy")
    band_cal = calibration_object(band_fit, band_entry)
    band_signals = [25000, 40000]
    band_results = [applied(band_fit, band_entry, s, 2, 'K') for s in band_signals]
    write("calibration-apply-band", "calibration apply: a band-model calibration of 8-14 um",
          "POST", "/v1/calibration/apply",
          ok({"/temperature": [ap(t, 1e-10) for t, _ in band_results],
              "/u_temperature": [ap(v, 1e-8) for _, v in band_results], "/model": "band"}),
          body={"signal": band_signals, "u_signal": 2, "calibration": band_cal},
          source=APPLY_CAL)

    path = "/v1/calibration/apply"

    def changed(**members):
        c = json.loads(json.dumps(cal))
        for key, value in members.items():
            if value is None:
                c.pop(key)
            else:
                c[key] = value
        return c

    write("calibration-apply-422-zero-signal", "calibration apply: a zero signal", "POST", path,
          problem(422, "signal_out_of_range", "signal"), body={"signal": 0, "calibration": cal})
    write("calibration-apply-422-negative-u-signal", "calibration apply: a negative u_signal",
          "POST", path, problem(422, "uncertainty_negative", "u_signal"),
          body={"signal": 4200, "u_signal": -1, "calibration": cal})
    write("calibration-apply-400-missing-calibration", "calibration apply: no calibration",
          "POST", path, problem(400, "missing_field", "calibration"), body={"signal": 4200})
    no_c = dict(cal["parameters"])
    no_c.pop("C")
    write("calibration-apply-400-missing-parameter", "calibration apply: C is missing", "POST",
          path, problem(400, "missing_field", "calibration.parameters.C"),
          body={"signal": 4200, "calibration": changed(parameters=no_c)})
    write("calibration-apply-400-foreign-parameter", "calibration apply: gain is no parameter of "
          "Sakuma-Hattori", "POST", path,
          problem(400, "unknown_field", "calibration.parameters.gain"),
          body={"signal": 4200, "calibration": changed(parameters=dict(cal["parameters"],
                                                                       gain=1))})
    write("calibration-apply-400-unknown-member", "calibration apply: an unknown member of the "
          "calibration", "POST", path, problem(400, "unknown_field", "calibration.slope"),
          body={"signal": 4200, "calibration": changed(slope=1)})
    write("calibration-apply-400-negative-a", "calibration apply: A below 0 is outside the "
          "model's domain", "POST", path,
          problem(400, "invalid_argument", "calibration.parameters"),
          body={"signal": 4200, "calibration": changed(parameters=dict(cal["parameters"],
                                                                       A_um=-9.6))})
    bad = [row[:] for row in cal["covariance"]["matrix"]]
    bad[1][1] = -bad[1][1]
    write("calibration-apply-422-covariance", "calibration apply: a negative variance",
          "POST", path, problem(422, "uncertainty_negative", "calibration.covariance"),
          body={"signal": 4200, "calibration": changed(
              covariance={"parameters": NAMES[SH], "matrix": bad})})
    write("calibration-apply-400-covariance-order", "calibration apply: covariance names in "
          "another order", "POST", path,
          problem(400, "wrong_type", "calibration.covariance.parameters"),
          body={"signal": 4200, "calibration": changed(covariance={
              "parameters": ["B_um_K", "A_um", "C"], "matrix": cal["covariance"]["matrix"]})})
    write("calibration-apply-400-band-with-sakuma-hattori", "calibration apply: a band on a "
          "Sakuma-Hattori calibration", "POST", path,
          problem(400, "conflicting_fields", "calibration.band"),
          body={"signal": 4200, "calibration": changed(band={"wavelength": [8, 14]})})
    write("calibration-apply-400-query-not-json", "calibration apply: a calibration query "
          "parameter that is not JSON", "GET", path + "?signal=4200&calibration=%7Bmodel",
          problem(400, "malformed_json", "calibration"))
    return fit, entry, cal


# ------------------------------------------------------------------------- csv

def csv_cases(fit, entry, cal):
    # REFERENCES.md worked example A: T = 308.886829 K; u_c from its sensitivities,
    # sqrt((15.463693 * 0.02)^2 + (0.0456521 * 2)^2 + (1.0460498 * 0.5)^2) = 0.6144441.
    header = "apparent_temperature,emissivity,reflected_temperature"
    write("csv-corrected-example-a", "csv: corrected temperature batch, one good row and one "
          "out of domain", "POST", "/v1/corrected-temperature",
          {"status": 200, "content_type": CSV, "body_contains": [
              header + ",temperature,error\r\n", "308.15,0.95,293.15,308.886829",
              "308.15,1.5,293.15,,emissivity_out_of_range (emissivity): "]},
          headers={"Content-Type": "text/csv"},
          body=header + "\r\n308.15,0.95,293.15\r\n308.15,1.5,293.15\r\n",
          source=REF + ", worked example A")
    write("csv-sensitivity-example-a", "csv: sensitivity batch with combined and expanded "
          "uncertainty columns", "POST", "/v1/sensitivity",
          {"status": 200, "content_type": CSV, "body_contains": [
              ",temperature,combined_standard_uncertainty,expanded_uncertainty,error\r\n",
              ",308.886829", ",0.614444", ",1.228888"]},
          headers={"Content-Type": "text/csv; charset=utf-8"},
          body=header + ",u_emissivity,u_reflected_temperature,u_apparent_temperature\n"
          "308.15,0.95,293.15,0.02,2,0.5\n",
          source=REF + ", worked example A (u_c from its sensitivities, JCGM 100:2008 eq. 10)")
    write("csv-corrected-bom-crlf-quotes", "csv: byte-order mark, empty lines, a quoted band "
          "and query parameters for every row", "POST",
          "/v1/corrected-temperature?reflected_temperature=20&temperature_unit=C",
          {"status": 200, "content_type": CSV, "body_contains": [
              "apparent_temperature,emissivity,band,temperature,error\r\n",
              "35,0.95,\"8,14\",35.736829", "35,0.95,,35.736829"]},
          headers={"Content-Type": "text/csv"},
          body="\ufeffapparent_temperature,emissivity,band\r\n\r\n35,0.95,\"8,14\"\r\n\r\n"
          "35 , 0.95 ,\r\n",
          source=REF + ", worked example A in Celsius (the default band is 8-14 um)")
    write("csv-ragged-and-misquoted-rows", "csv: a short row and a misquoted row get their "
          "error; the good row its answer", "POST", "/v1/corrected-temperature",
          {"status": 200, "content_type": CSV, "body_contains": [
              "308.15,0.95,293.15,308.886829",
              "malformed_csv: line 3 has 2 fields; the header has 3.",
              "malformed_csv: line 4, column 9: a quote out of place"]},
          headers={"Content-Type": "text/csv"},
          body=header + "\n308.15,0.95,293.15\n308.15,0.95\n308.15,0\"95,293.15\n",
          source=REF + ", worked example A")
    rows = [1500, 4200]
    expected = [applied(fit, entry, s, 3, 'C') for s in rows]
    query = urllib.parse.urlencode({"temperature_unit": "C",
                                    "calibration": json.dumps(cal, separators=(',', ':'))})
    write("csv-calibration-apply", "csv: a calibration in the query applied to a batch of "
          "signals; a _sample column is carried through", "POST", "/v1/calibration/apply?" + query,
          {"status": 200, "content_type": CSV, "body_contains": [
              "_sample,signal,u_signal,temperature,u_temperature,error\r\n"] + [
              "S-%d,%d,3,%s" % (i, s, mp.nstr(t, 9, strip_zeros=False)[:-1])
              for i, (s, (t, _)) in enumerate(zip(rows, expected))]},
          headers={"Content-Type": "text/csv"},
          body="_sample,signal,u_signal\r\n" + "".join("S-%d,%d,3\r\n" % (i, s)
                                                        for i, s in enumerate(rows)),
          source=APPLY_CAL)
    write("csv-400-unknown-column", "csv: a header naming an unknown input", "POST",
          "/v1/corrected-temperature", problem(400, "unknown_field", "emisivity"),
          headers={"Content-Type": "text/csv"}, body="apparent_temperature,emisivity\r\n300,1\r\n")
    write("csv-400-column-and-query", "csv: an input given as a column and a query parameter",
          "POST", "/v1/corrected-temperature?emissivity=0.9",
          problem(400, "conflicting_fields", "emissivity"), headers={"Content-Type": "text/csv"},
          body="apparent_temperature,emissivity\r\n300,1\r\n")
    write("csv-400-repeated-column", "csv: a column named twice", "POST", "/v1/sensitivity",
          problem(400, "malformed_csv", "emissivity"), headers={"Content-Type": "text/csv"},
          body="emissivity,apparent_temperature,emissivity\r\n0.9,300,0.9\r\n")
    write("csv-400-unterminated-quote", "csv: a quoted field never closed", "POST",
          "/v1/corrected-temperature",
          problem(400, "malformed_csv", None, body_contains=["opened on line 2"]),
          headers={"Content-Type": "text/csv"},
          body="apparent_temperature,band\r\n300,\"8,14\r\n301,8\r\n")
    write("csv-400-empty-body", "csv: no header row", "POST", "/v1/calibration/apply",
          problem(400, "malformed_csv", None), headers={"Content-Type": "text/csv"}, body="\r\n")
    write("csv-415-band-endpoint", "csv: /v1/band takes no CSV", "POST", "/v1/band",
          {"status": 415, "content_type": PROBLEM,
           "fields": {"/code": "unsupported_media_type"}},
          headers={"Content-Type": "text/csv"}, body="temperature\r\n300\r\n")


def main():
    fit, entry, cal = apply_cases()
    fit_cases()
    csv_cases(fit, entry, cal)
    signals = [1500, 4200, 9000]
    print("openapi example (README bench, Celsius):")
    print(json.dumps({"signal": signals, "u_signal": 3, "temperature_unit": "C",
                      "calibration": cal}, indent=1))
    for s in signals:
        t, u = applied(fit, entry, s, 3, 'C')
        print("  signal %d: T = %s C, u = %s" % (s, mp.nstr(t, 17), mp.nstr(u, 17)))
    print("wrote %d case files" % len(written))
    return 0


if __name__ == "__main__":
    sys.exit(main())
