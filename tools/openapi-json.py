#!/usr/bin/python3
"""Writes api-docs/openapi.json (served at GET /openapi.json) from api-docs/openapi.yaml.

The YAML is the one contract; the JSON is generated, committed, and must not be edited by hand.
Needs Debian's python3-yaml (run with /usr/bin/python3).
  tools/openapi-json.py           regenerate api-docs/openapi.json
  tools/openapi-json.py --check   exit 1 when api-docs/openapi.json is not what the YAML gives
"""
import json
import pathlib
import sys

import yaml

ROOT = pathlib.Path(__file__).resolve().parent.parent
SOURCE = ROOT / "api-docs" / "openapi.yaml"
TARGET = ROOT / "api-docs" / "openapi.json"


def render(source=SOURCE):
    """The JSON text for the YAML document: document order, UTF-8, YAML anchors expanded."""
    with open(source, encoding="utf-8") as handle:
        document = yaml.safe_load(handle)
    return json.dumps(document, indent=2, ensure_ascii=False) + "\n"


def main(arguments):
    text = render()
    if arguments[1:] == ["--check"]:
        current = TARGET.read_text(encoding="utf-8") if TARGET.exists() else None
        if current != text:
            print(f"{TARGET.relative_to(ROOT)} is stale: run tools/openapi-json.py", file=sys.stderr)
            return 1
        return 0
    if arguments[1:]:
        print(__doc__, file=sys.stderr)
        return 2
    TARGET.write_text(text, encoding="utf-8")
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
