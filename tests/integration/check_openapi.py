#!/usr/bin/python3
"""Static checks of the contract api-docs/openapi.yaml (no server needed).

- the YAML parses and declares OpenAPI 3.1;
- every `$ref` resolves inside the document;
- every path the service must answer is declared, at two-space indent under `paths:`;
- operationIds are unique; every operation has a 2xx response;
- the ProblemCode enum lists exactly the codes the server can answer with (server/problem.c);
- api-docs/openapi.json is what tools/openapi-json.py makes of the YAML.
Prints one line per failed check and a closing "N passed, N failed"; exit 1 on any failure.
Run with Debian's interpreter (python3-yaml): /usr/bin/python3 tests/integration/check_openapi.py
"""
import pathlib
import re
import subprocess
import sys

import yaml

ROOT = pathlib.Path(__file__).resolve().parent.parent.parent
CONTRACT = ROOT / "api-docs" / "openapi.yaml"
REQUIRED_PATHS = [
    "/v1/radiance", "/v1/brightness-temperature", "/v1/peak", "/v1/band",
    "/v1/band-temperature", "/v1/corrected-temperature", "/v1/sensitivity",
    "/v1/emissivity", "/v1/ratio-temperature", "/v1/spectrum", "/v1/presets",
    "/healthz", "/readyz", "/version", "/metrics", "/openapi.json",
]
HTTP_METHODS = {"get", "put", "post", "delete", "options", "head", "patch", "trace"}


def walk_refs(node, where="#"):
    if isinstance(node, dict):
        for key, value in node.items():
            if key == "$ref" and isinstance(value, str):
                yield where, value
            else:
                yield from walk_refs(value, f"{where}/{key}")
    elif isinstance(node, list):
        for index, value in enumerate(node):
            yield from walk_refs(value, f"{where}/{index}")


def resolve(document, reference):
    if not reference.startswith("#/"):
        raise KeyError("only local references are used in this contract")
    node = document
    for token in reference[2:].split("/"):
        token = token.replace("~1", "/").replace("~0", "~")
        node = node[int(token)] if isinstance(node, list) else node[token]
    return node


def check_refs(document):
    for where, reference in walk_refs(document):
        try:
            resolve(document, reference)
        except (KeyError, IndexError, ValueError, TypeError) as error:
            yield f"{where}: $ref {reference} does not resolve ({error})"


def check_paths(document, text):
    declared = document.get("paths", {})
    indented = set(re.findall(r"^  (/[^:\s]*):\s*$", text, flags=re.MULTILINE))
    for path in REQUIRED_PATHS:
        if path not in declared:
            yield f"path {path} is not declared"
        if path not in indented:
            yield f"path {path} is not written as '  {path}:' under paths"


def check_operations(document):
    seen = {}
    for path, item in document.get("paths", {}).items():
        for method, operation in item.items():
            if method not in HTTP_METHODS:
                continue
            responses = operation.get("responses", {})
            if not any(str(code).startswith("2") for code in responses):
                yield f"{method.upper()} {path} has no 2xx response"
            operation_id = operation.get("operationId")
            if operation_id is not None and operation_id in seen and seen[operation_id] != (path, method):
                yield f"operationId {operation_id} is used twice"
            seen.setdefault(operation_id, (path, method))


def server_problem_codes():
    """Every code the server can put in a problem: its own table and the core statuses it maps."""
    problem_source = (ROOT / "server" / "problem.c").read_text(encoding="utf-8")
    status_source = (ROOT / "core" / "status.c").read_text(encoding="utf-8")
    status_names = dict(re.findall(r'\[(GB_\w+)\]\s*=\s*\{\s*"([a-z_]+)"', status_source))
    mapped = re.findall(r'\[(GB_\w+)\]\s*=\s*\{\s*(\d{3})\s*,', problem_source)
    codes = {status_names[name] for name, http in mapped if name in status_names and http != "200"}
    codes |= set(re.findall(r'\[GB_PROBLEM_\w+\]\s*=\s*\{\s*"([a-z_]+)"', problem_source))
    unmapped = sorted(set(status_names) - {name for name, _ in mapped})
    return codes, [status_names[name] for name in unmapped]


def check_problem_codes(document):
    documented = set(resolve(document, "#/components/schemas/ProblemCode")["enum"])
    if not (ROOT / "server" / "problem.c").exists():
        yield "server/problem.c is missing: cannot compare problem codes"
        return
    emitted, unmapped = server_problem_codes()
    for code in sorted(emitted - documented):
        yield f"the server can answer with code {code}, which ProblemCode does not list"
    for code in sorted(documented - emitted):
        yield f"ProblemCode lists {code}, which the server never answers with"
    for code in unmapped:
        print(f"note: core status {code} has no HTTP mapping in server/problem.c")


def check_generated_json():
    result = subprocess.run([sys.executable, str(ROOT / "tools" / "openapi-json.py"), "--check"],
                            capture_output=True, text=True, check=False)
    if result.returncode != 0:
        yield (result.stderr or result.stdout).strip() or "tools/openapi-json.py --check failed"


def main():
    text = CONTRACT.read_text(encoding="utf-8")
    document = yaml.safe_load(text)
    checks = [
        ("openapi 3.1", lambda: [] if str(document.get("openapi", "")).startswith("3.1")
         else ["openapi is not 3.1.x"]),
        ("references resolve", lambda: check_refs(document)),
        ("required paths", lambda: check_paths(document, text)),
        ("operations", lambda: check_operations(document)),
        ("problem codes", lambda: check_problem_codes(document)),
        ("openapi.json up to date", check_generated_json),
    ]
    passed = failed = 0
    for name, check in checks:
        problems = list(check())
        for problem in problems:
            print(f"FAIL {name}: {problem}")
        if problems:
            failed += 1
        else:
            passed += 1
            print(f"ok   {name}")
    print(f"{passed} passed, {failed} failed")
    return 1 if failed else 0


if __name__ == "__main__":
    sys.exit(main())
