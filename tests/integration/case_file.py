"""Helpers shared by the scripts that write tests/integration/cases/: one case file per request,
with the expected numbers computed elsewhere (oracle.py, tests/reference/workflows.py)."""
import json
import os

OUT = os.path.join(os.path.dirname(os.path.abspath(__file__)), "cases")
MP = "mpmath 30 digits, CODATA 2018 constants (tests/integration/oracle.py)"
REF = "/work/shared/REFERENCES.md spot checks (mpmath 30 digits, CODATA 2018)"
JSON = "application/json"
PROBLEM = "application/problem+json"
FLAT = ("wavelength", 8, 14)
written = []


def ap(v, rel=1e-9):
    return {"approx": float(v), "rel": rel}


def write(file, name, method, path, expect, body=None, headers=None, source=None, **extra):
    case = {"name": name}
    if source:
        case["source"] = source
    case["method"] = method
    case["path"] = path
    if headers:
        case["headers"] = headers
    if body is not None:
        case["body"] = body
    case.update(extra)
    case["expect"] = expect
    with open(os.path.join(OUT, file + '.json'), 'w') as f:
        json.dump(case, f, indent=2, ensure_ascii=False)
        f.write('\n')
    written.append(file)


def ok(fields, absent=None, **more):
    e = {"status": 200, "content_type": JSON, "fields": fields}
    if absent:
        e["absent"] = absent
    e.update(more)
    return e


def problem(status, code, field=False, **more):
    f = {"/status": status, "/code": code, "/type": "https://greybody.dev/problems/" + code}
    if field is not False:
        f["/field"] = field
    e = {"status": status, "content_type": PROBLEM, "fields": f}
    e.update(more)
    return e
