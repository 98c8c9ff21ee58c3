#!/usr/bin/env python3
"""Writes the fuzz seed corpus from the integration case files.

tests/fuzz/corpus/fuzz_body/<case>   "<path>\\n<body>" for every POST case with a body
tests/fuzz/corpus/fuzz_query/<case>  "<path>?<query>" for every GET case with a query
Cases that pad or fill their bodies (413 cases) are left out: seeds stay small.
Run with /usr/bin/python3 from the project root after adding case files; existing seeds whose case
is gone are kept (libFuzzer may have been fed them on purpose).
"""
import json
import pathlib

ROOT = pathlib.Path(__file__).resolve().parents[2]
CASES = ROOT / "tests" / "integration" / "cases"
CORPUS = ROOT / "tests" / "fuzz" / "corpus"
SEED_MAX_BYTES = 2048


def main():
    body_dir = CORPUS / "fuzz_body"
    query_dir = CORPUS / "fuzz_query"
    body_dir.mkdir(parents=True, exist_ok=True)
    query_dir.mkdir(parents=True, exist_ok=True)
    written = 0
    for case_file in sorted(CASES.glob("*.json")):
        case = json.loads(case_file.read_text())
        if "fill" in case or "pad_body_to" in case:
            continue
        path, _, query = case["path"].partition("?")
        if not path.startswith("/v1/"):
            continue
        if case["method"] == "POST" and "body" in case:
            body = case["body"]
            text = body if isinstance(body, str) else json.dumps(body, separators=(",", ":"))
            seed = f"{path}\n{text}".encode()
            target = body_dir / case_file.stem
        elif case["method"] == "GET" and query:
            seed = f"{path}?{query}".encode()
            target = query_dir / case_file.stem
        else:
            continue
        if len(seed) <= SEED_MAX_BYTES:
            target.write_bytes(seed)
            written += 1
    print(f"fuzz seeds: {written} written under {CORPUS.relative_to(ROOT)}")


if __name__ == "__main__":
    main()
