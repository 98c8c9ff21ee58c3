#!/usr/bin/python3
"""`make install PREFIX=<temporary folder>`, then use what was installed the way an integrator
would: build tests/install/planck_check.c with nothing but `pkg-config --cflags --libs greybody`
(shared library) and once more against the static library, run both and compare what they print
with published values; compile every installed header on its own; start the installed server
from an unrelated working directory and check that it serves its contract and its page.

Run: make test-install (or /usr/bin/python3 tests/install/test_install.py from the project root).
"""
import json
import os
import pathlib
import shlex
import subprocess
import sys
import tempfile

HERE = pathlib.Path(__file__).resolve().parent
ROOT = HERE.parent.parent
sys.dont_write_bytecode = True  # no __pycache__ beside the sources
sys.path.insert(0, str(ROOT / "tests" / "support"))
from greybodyd_process import Greybodyd  # noqa: E402
from suite_report import SuiteReport  # noqa: E402

WARNINGS = ["-std=c11", "-Wall", "-Wextra", "-Werror", "-Wpedantic", "-Wshadow",
            "-Wstrict-prototypes", "-Wmissing-prototypes", "-Wcast-qual", "-Wvla"]
INTERNAL_HEADERS = {"quadrature.h", "solver.h"}

# Published values (/work/shared/REFERENCES.md, "Spot checks"; exact CODATA 2018 constants),
# 9 significant digits there, so compared to 1e-8 relative.
EXPECTED = {
    "radiance_10um_300K": 9.92403333,    # L(10 µm, 300 K), W m-2 sr-1 um-1
    "brightness_11um_10": 302.991746,    # T_b of 10 W m-2 sr-1 um-1 at 11 µm, K
    "exitance_300K": 459.300328,         # sigma (300 K)^4, W m-2
}
RELATIVE = 1e-8


def run(command, **options):
    return subprocess.run(command, capture_output=True, text=True, check=False, **options)


class Installed:
    def __init__(self, prefix):
        self.prefix = pathlib.Path(prefix)
        self.env = dict(os.environ, PKG_CONFIG_PATH=str(self.prefix / "lib" / "pkgconfig"))

    def pkg_config(self, *arguments):
        result = run(["pkg-config", *arguments, "greybody"], env=self.env)
        if result.returncode != 0:
            raise RuntimeError(f"pkg-config {' '.join(arguments)} greybody: {result.stderr.strip()}")
        return shlex.split(result.stdout)


def check_layout(installed):
    prefix = installed.prefix
    expected = ["bin/greybodyd", "lib/libgreybody.a", "lib/libgreybody.so.0", "lib/libgreybody.so",
                "lib/pkgconfig/greybody.pc", "share/greybody/api-docs/openapi.yaml",
                "share/greybody/api-docs/openapi.json"]
    problems = [f"{name} is not installed" for name in expected if not (prefix / name).exists()]
    if not os.access(prefix / "bin/greybodyd", os.X_OK):
        problems.append("bin/greybodyd is not executable")
    public = {p.name for p in (ROOT / "core").glob("*.h")} - INTERNAL_HEADERS
    headers = {p.name for p in (prefix / "include/greybody").glob("*.h")}
    problems += [f"public header {name} is not installed" for name in sorted(public - headers)]
    problems += [f"{name} is installed but is not a public header" for name in
                 sorted(headers - public)]
    return problems


def check_headers_stand_alone(installed):
    cflags = installed.pkg_config("--cflags")
    problems = []
    for header in sorted((installed.prefix / "include/greybody").glob("*.h")):
        # The typedef keeps a header of macros only from being an empty translation unit.
        source = f"#include <greybody/{header.name}>\ntypedef int translation_unit_not_empty;\n"
        result = run(["cc", *WARNINGS, *cflags, "-fsyntax-only", "-x", "c", "-"], input=source)
        if result.returncode != 0:
            problems.append(f"{header.name} does not compile on its own:\n{result.stderr}")
    return problems


def compare_output(text):
    problems = []
    values = {}
    for line in text.splitlines():
        name, status, *rest = line.split()
        values[name] = (status, float(rest[0]) if rest else None)
    for name, reference in EXPECTED.items():
        status, value = values.get(name, ("missing", None))
        if status != "ok":
            problems.append(f"{name}: status {status}")
        elif abs(value - reference) > RELATIVE * abs(reference):
            problems.append(f"{name}: {value!r}, published {reference}")
    if values.get("radiance_minus_5K", ("missing",))[0] != "temperature_out_of_range":
        problems.append(f"-5 K gave {values.get('radiance_minus_5K')}, not temperature_out_of_range")
    return problems


def build_and_run(installed, work, name, link_arguments, run_env):
    program = work / name
    result = run(["cc", *WARNINGS, *installed.pkg_config("--cflags"), str(HERE / "planck_check.c"),
                  *link_arguments, "-o", str(program)])
    if result.returncode != 0:
        return None, [f"building against the installed library failed:\n{result.stderr}"]
    result = run([str(program)], env=run_env)
    if result.returncode != 0:
        return None, [f"{name} exited {result.returncode}: {result.stderr}"]
    return program, compare_output(result.stdout)


def check_shared_link(installed, work):
    libdir = installed.prefix / "lib"
    program, problems = build_and_run(installed, work, "planck_check_shared",
                                      installed.pkg_config("--libs"),
                                      dict(os.environ, LD_LIBRARY_PATH=str(libdir)))
    if program is not None:
        ldd = run(["ldd", str(program)], env=dict(os.environ, LD_LIBRARY_PATH=str(libdir))).stdout
        if str(libdir / "libgreybody.so.0") not in ldd:
            problems.append(f"not linked to the installed libgreybody.so.0:\n{ldd}")
    return problems


def check_static_link(installed, work):
    # A static-only integrator names the archive; Libs.private brings what it needs (-lm).
    archive = str(installed.prefix / "lib" / "libgreybody.a")
    arguments = [archive if a == "-lgreybody" else a for a in installed.pkg_config("--static", "--libs")]
    program, problems = build_and_run(installed, work, "planck_check_static", arguments,
                                      dict(os.environ))
    if program is not None and "libgreybody" in run(["ldd", str(program)]).stdout:
        problems.append("the static build still loads libgreybody.so")
    return problems


def check_installed_server(installed, work):
    contract = json.loads((installed.prefix / "share/greybody/api-docs/openapi.json").read_text())
    problems = []
    # From "/", the checkout is out of reach: the files must come from PREFIX/share/greybody.
    with Greybodyd(work / "greybodyd.log", binary=installed.prefix / "bin" / "greybodyd",
                   cwd="/") as server:
        status, _, body = server.get("/openapi.json")
        if status != 200 or json.loads(body) != contract:
            problems.append(f"/openapi.json: {status}, not the installed contract")
        status, headers, body = server.get("/")
        if status != 200 or not headers.get("Content-Type", "").startswith("text/html"):
            problems.append(f"/: {status} {headers.get('Content-Type')}")
        elif b"<title>greybody" not in body:
            problems.append("/ is not the built-in page")
        status, _, body = server.get("/version")
        version = json.loads(body) if status == 200 else {}
        if version.get("api") != contract["info"]["version"]:
            problems.append(f"/version api {version.get('api')!r}, contract "
                            f"{contract['info']['version']!r}")
    return problems


def main():
    report = SuiteReport("install")
    with tempfile.TemporaryDirectory(prefix="greybody-install-") as temporary:
        work = pathlib.Path(temporary)
        prefix = work / "prefix"
        result = run(["make", "--no-print-directory", "install", f"PREFIX={prefix}"], cwd=ROOT)
        report.check("make install", lambda: [] if result.returncode == 0 else
                     [f"exit {result.returncode}:\n{result.stdout[-3000:]}{result.stderr[-3000:]}"])
        if result.returncode == 0:
            installed = Installed(prefix)
            report.check("installed layout", check_layout, installed)
            report.check("headers compile on their own", check_headers_stand_alone, installed)
            report.check("shared library via pkg-config", check_shared_link, installed, work)
            report.check("static library", check_static_link, installed, work)
            report.check("installed server finds its files", check_installed_server, installed, work)
            result = run(["make", "--no-print-directory", "uninstall", f"PREFIX={prefix}"], cwd=ROOT)
            left = sorted(str(p.relative_to(prefix)) for p in prefix.rglob("*") if p.is_file())
            report.check("make uninstall", lambda: ([] if result.returncode == 0 else
                         [result.stderr]) + [f"left behind: {name}" for name in left])
    report.exit()


if __name__ == "__main__":
    main()
