#!/usr/bin/python3
"""The contract is checked, not only written:

- api-docs/openapi.yaml passes a standard OpenAPI 3.1 validator (@seriousme/openapi-schema-validator
  from npm, installed in this folder by `make test-spec`);
- every example in the document matches the schema it illustrates;
- every answer the HTTP integration suite received matches the document's schema for its path,
  method, status and media type (recorded by tests/integration/test_http run with
  GREYBODY_RESPONSE_LOG; see tests/support/response_log.h).  A problem answer on a path or status
  the document does not list must still be a `Problem`;
- /metrics passes `promtool check metrics` (Debian's prometheus package).

Run: make test-spec.  Environment: GREYBODY_RESPONSE_LOG (default
build/tests/spec/responses.jsonl), PROMTOOL (default /usr/bin/promtool).
"""
import json
import os
import pathlib
import subprocess
import sys
import urllib.parse

import jsonschema
import yaml

HERE = pathlib.Path(__file__).resolve().parent
ROOT = HERE.parent.parent
sys.dont_write_bytecode = True  # no __pycache__ beside the sources
sys.path.insert(0, str(ROOT / "tests" / "support"))
from greybodyd_process import Greybodyd  # noqa: E402
from suite_report import SuiteReport  # noqa: E402

CONTRACT = ROOT / "api-docs" / "openapi.yaml"
RESPONSES = pathlib.Path(os.environ.get("GREYBODY_RESPONSE_LOG") or
                         ROOT / "build" / "tests" / "spec" / "responses.jsonl")
VALIDATOR = HERE / "node_modules" / ".bin" / "validate-api"
PROMTOOL = os.environ.get("PROMTOOL", "/usr/bin/promtool")
HTTP_METHODS = ("get", "put", "post", "delete", "options", "head", "patch", "trace")
SHOWN_PER_KIND = 5


def load_contract():
    return yaml.safe_load(CONTRACT.read_text(encoding="utf-8"))


def follow(document, node):
    """The node itself, or what its local $ref points at (repeatedly)."""
    while isinstance(node, dict) and set(node) >= {"$ref"} and isinstance(node["$ref"], str):
        target = document
        for token in node["$ref"][2:].split("/"):
            target = target[token.replace("~1", "/").replace("~0", "~")]
        node = target
    return node


def media_type(text):
    return text.split(";")[0].strip().lower()


class Contract:
    def __init__(self, document):
        self.document = document
        self.resolver = jsonschema.RefResolver.from_schema(document, id_of=lambda _: "")

    def problems_with(self, schema, value):
        validator = jsonschema.Draft202012Validator(schema, resolver=self.resolver)
        return [f"{'/'.join(str(p) for p in error.absolute_path) or '(root)'}: {error.message}"
                for error in validator.iter_errors(value)]

    def response_schema(self, path, method, status, content_type):
        """(schema, None) to validate with, (None, reason) when it cannot be found."""
        item = self.document.get("paths", {}).get(path)
        operation = (item or {}).get("get" if method == "head" else method)
        responses = (operation or {}).get("responses", {})
        response = (responses.get(str(status)) or responses.get(f"{str(status)[0]}XX") or
                    responses.get("default"))
        if response is None:
            return None, f"status {status} is not documented for {method.upper()} {path}"
        content = follow(self.document, response).get("content", {})
        for documented, entry in content.items():
            if media_type(documented) == media_type(content_type):
                return entry.get("schema", {}), None
        return None, (f"{method.upper()} {path} {status}: media type {content_type!r} is not "
                      f"documented ({', '.join(content) or 'no body'})")

    @property
    def problem_schema(self):
        return {"$ref": "#/components/schemas/Problem"}


def check_standard_validator():
    if not VALIDATOR.exists():
        return [f"{VALIDATOR} is missing: run `make test-spec` (npm ci in tests/spec)"]
    result = subprocess.run(["node", str(VALIDATOR), str(CONTRACT)], capture_output=True,
                            text=True, check=False)
    try:
        verdict = json.loads(result.stdout)
    except ValueError:
        return [f"validate-api printed no verdict: {result.stdout}{result.stderr}"]
    if verdict.get("valid") is True:
        return []
    return [f"{e.get('instancePath')}: {e.get('message')}" for e in verdict.get("errors", [])][:20]


def examples_of(document):
    """(where, schema, example value) for every example beside a schema in paths."""
    for path, item in document.get("paths", {}).items():
        for method, operation in item.items():
            if method not in HTTP_METHODS:
                continue
            bodies = [("request", follow(document, operation.get("requestBody", {})))]
            bodies += [(f"response {status}", follow(document, response))
                       for status, response in operation.get("responses", {}).items()]
            for label, body in bodies:
                for media, entry in body.get("content", {}).items():
                    schema = entry.get("schema")
                    if schema is None:
                        continue
                    where = f"{method.upper()} {path} {label} {media}"
                    if "example" in entry:
                        yield where, schema, entry["example"]
                    for name, example in entry.get("examples", {}).items():
                        yield f"{where} example {name}", schema, follow(document, example).get("value")


def check_examples(contract):
    problems = []
    count = 0
    for where, schema, value in examples_of(contract.document):
        count += 1
        problems += [f"{where}: {p}" for p in contract.problems_with(schema, value)]
    if count == 0:
        problems.append("the document has no examples beside its schemas")
    return problems


def recorded_responses():
    if not RESPONSES.exists():
        return []
    return [json.loads(line) for line in RESPONSES.read_text(encoding="utf-8").splitlines() if line]


def check_recorded_responses(contract):
    records = recorded_responses()
    if len(records) < 50:
        return [f"only {len(records)} answers recorded in {RESPONSES}: run the integration suite "
                f"with GREYBODY_RESPONSE_LOG set (make test-spec does)"]
    failures = {}
    validated = 0
    for record in records:
        method = record["method"].lower()
        path = urllib.parse.urlsplit(record["path"]).path
        status = record["status"]
        body_text = record["body"]
        if method == "options" or status == 204 or (method == "head" and not body_text):
            continue
        is_json = media_type(record["content_type"]).endswith("json")
        schema, reason = contract.response_schema(path, method, status, record["content_type"])
        if schema is None and media_type(record["content_type"]) == "application/problem+json":
            schema, reason = contract.problem_schema, None  # undocumented status: still a Problem
        if schema is None:
            failures.setdefault(reason, []).append(record["path"])
            continue
        if not is_json:
            continue  # text bodies (metrics, page, CSV) are strings by schema
        try:
            body = json.loads(body_text)
        except (TypeError, ValueError):
            failures.setdefault(f"{record['method']} {path} {status}: body is not JSON", []).append(
                record["path"])
            continue
        validated += 1
        for problem in contract.problems_with(schema, body):
            failures.setdefault(f"{record['method']} {path} {status}: {problem}", []).append(
                record["path"])
    print(f"     {validated} JSON answers validated of {len(records)} recorded")
    return [f"{reason} (e.g. {', '.join(paths[:SHOWN_PER_KIND])})"
            for reason, paths in sorted(failures.items())]


def check_metrics_with_promtool():
    log = ROOT / "build" / "tests" / "spec" / "greybodyd-metrics.log"
    with Greybodyd(log) as server:
        # Traffic of several kinds first, so that counters and histograms have series.
        for path in ["/v1/radiance?temperature=300&wavelength=10", "/v1/radiance?temperature=-1",
                     "/healthz", "/no-such-path", "/"]:
            server.get(path)
        status, headers, body = server.get("/metrics")
    if status != 200:
        return [f"/metrics answered {status}"]
    result = subprocess.run([PROMTOOL, "check", "metrics"], input=body, capture_output=True,
                            check=False)
    output = (result.stdout + result.stderr).decode(errors="replace").strip()
    if result.returncode != 0 or output:
        return [f"promtool check metrics (exit {result.returncode}): {output}"]
    return []


def main():
    report = SuiteReport("spec")
    contract = Contract(load_contract())
    report.check("OpenAPI 3.1 validator (npm @seriousme/openapi-schema-validator)",
                 check_standard_validator)
    report.check("examples match their schemas", check_examples, contract)
    report.check("integration answers match the contract", check_recorded_responses, contract)
    report.check("/metrics passes promtool check metrics", check_metrics_with_promtool)
    report.exit()


if __name__ == "__main__":
    main()
