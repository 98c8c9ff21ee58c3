"""`make bench`: one table of ratios measured side by side in one run, printed and written to
build/bench.md.

  core    bench_core (C, one core) and bench_numpy.py (NumPy/SciPy) on the same 1 M inputs, run
          alternately ROUNDS times each, best time per row; plus the floor, one exp() per element.
  HTTP    greybodyd (a pool of one worker thread per core, and thread per connection) answering a
          small POST /v1/radiance, and nginx (our own temporary configuration) serving a static
          file with the same JSON bytes, both driven by wrk -t2 -c64 for the same bounded time.
  frames  one 640 x 512 frame of apparent temperatures with an emissivity map: in the core alone
          (from bench_core) and end to end over loopback HTTP (wrk, one connection).
  memory  greybodyd's resident set idle and at the end of its HTTP run (VmRSS, and the peak VmHWM).

Usage: /usr/bin/python3 tools/bench/bench.py BUILD_DIR   (run by `make bench`)
Absolute times drift on a shared machine; the ratios are what the targets judge.
"""
import datetime
import os
import re
import shutil
import signal
import socket
import struct
import subprocess
import sys
import time
import urllib.request

import numpy as np

ROUNDS = 3          # per side and alternation
ALTERNATIONS = 2
WRK_SECONDS = 8
WRK_WARMUP_SECONDS = 2
FRAME_SECONDS = 6
FRAME_WIDTH, FRAME_HEIGHT = 640, 512
GOLDEN = 0.6180339887498949
SMALL_BODY = b'{"temperature": 300, "wavelength": 10}'
HERE = os.path.dirname(os.path.abspath(__file__))
ROOT = os.path.dirname(os.path.dirname(HERE))


def free_port():
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


def wait_http(url, seconds=10.0):
    deadline = time.monotonic() + seconds
    while time.monotonic() < deadline:
        try:
            with urllib.request.urlopen(url, timeout=1) as answer:
                return answer.read()
        except OSError:
            time.sleep(0.05)
    raise RuntimeError("no answer from " + url)


def parse_table(text):
    rows = {}
    for line in text.splitlines():
        parts = line.split("\t")
        if len(parts) == 3:
            rows[parts[0]] = float(parts[1])
    return rows


def core_rows(build, out):
    """Alternates the C and NumPy sides; best per row over every round."""
    best = {}
    for _ in range(ALTERNATIONS):
        for command in ([os.path.join(build, "bench", "bench_core"), out, str(ROUNDS)],
                        [sys.executable, os.path.join(HERE, "bench_numpy.py"), out, str(ROUNDS)]):
            side = "core" if command[0].endswith("bench_core") else "numpy"
            text = subprocess.run(command, check=True, capture_output=True, text=True).stdout
            for row, value in parse_table(text).items():
                key = (side, row)
                best[key] = value if row.startswith("agree_") else min(best.get(key, value), value)
    return best


def rss_kib(pid):
    fields = {}
    with open("/proc/%d/status" % pid) as status:
        for line in status:
            name, _, value = line.partition(":")
            if name in ("VmRSS", "VmHWM"):
                fields[name] = int(value.split()[0])
    return fields


def run_wrk(url, connections, threads, seconds, script=None):
    command = ["wrk", "-t%d" % threads, "-c%d" % connections, "-d%ds" % seconds, "--latency"]
    if script:
        command += ["-s", script]
    text = subprocess.run(command + [url], check=True, capture_output=True, text=True,
                          timeout=seconds + 30).stdout
    result = {"text": text}
    match = re.search(r"Requests/sec:\s+([\d.]+)", text)
    result["rps"] = float(match.group(1)) if match else 0.0
    for percentile in ("50", "99"):
        match = re.search(r"^\s+%s%%\s+([\d.]+)(us|ms|s)\b" % percentile, text, re.M)
        scale = {"us": 1e-3, "ms": 1.0, "s": 1e3}
        result["p" + percentile] = float(match.group(1)) * scale[match.group(2)] if match else None
    errors = 0
    match = re.search(r"Socket errors: connect (\d+), read (\d+), write (\d+), timeout (\d+)", text)
    if match:
        errors += sum(int(g) for g in match.groups())
    match = re.search(r"Non-2xx or 3xx responses: (\d+)", text)
    if match:
        errors += int(match.group(1))
    match = re.search(r"(\d+) requests in", text)
    result["requests"] = int(match.group(1)) if match else 0
    result["errors"] = errors
    return result


def write_lua(path, method, body_file=None, body=None, content_type="application/json"):
    with open(path, "w") as lua:
        lua.write('wrk.method = "%s"\n' % method)
        lua.write('wrk.headers["Content-Type"] = "%s"\n' % content_type)
        if body_file:
            lua.write('local f = io.open("%s", "rb")\nwrk.body = f:read("*a")\nf:close()\n'
                      % body_file)
        elif body is not None:
            lua.write("wrk.body = '%s'\n" % body.decode())


def start_greybodyd(build, port, threads):
    command = [os.path.join(build, "greybodyd"), "--listen", "127.0.0.1:%d" % port,
               "--threads", str(threads)]
    server = subprocess.Popen(command, cwd=ROOT, stdout=subprocess.DEVNULL,
                              stderr=subprocess.DEVNULL)
    wait_http("http://127.0.0.1:%d/healthz" % port)
    return server


def stop(process):
    if process.poll() is None:
        process.send_signal(signal.SIGTERM)
        try:
            process.wait(timeout=15)
        except subprocess.TimeoutExpired:
            process.kill()
            process.wait()


def start_nginx(folder, port, body):
    www = os.path.join(folder, "www", "v1")
    os.makedirs(www, exist_ok=True)
    os.makedirs(os.path.join(folder, "tmp"), exist_ok=True)
    with open(os.path.join(www, "radiance"), "wb") as static:
        static.write(body)
    user = "user root;\n" if os.geteuid() == 0 else ""
    temp = os.path.join(folder, "tmp")
    config = os.path.join(folder, "nginx.conf")
    with open(config, "w") as conf:
        conf.write(
            "%sworker_processes %d;\ndaemon off;\npid %s/nginx.pid;\nerror_log %s/error.log warn;\n"
            "events { worker_connections 1024; }\n"
            "http {\n  access_log /dev/null;\n  keepalive_requests 1000000;\n"
            "  client_body_temp_path %s; proxy_temp_path %s; fastcgi_temp_path %s;\n"
            "  uwsgi_temp_path %s; scgi_temp_path %s;\n"
            "  server {\n    listen 127.0.0.1:%d;\n    root %s/www;\n"
            "    location / { default_type application/json; }\n  }\n}\n"
            % (user, os.cpu_count() or 1, folder, folder, temp, temp, temp, temp, temp, port,
               folder))
    process = subprocess.Popen(["nginx", "-p", folder, "-c", config], stdout=subprocess.DEVNULL,
                               stderr=subprocess.DEVNULL)
    wait_http("http://127.0.0.1:%d/v1/radiance" % port)
    return process


def frame_body(path):
    """The bench_core frame: the first 640 x 512 of its inputs, then the emissivity map."""
    i = np.arange(FRAME_WIDTH * FRAME_HEIGHT, dtype=np.float64)
    apparent = (250.0 + 150.0 * np.mod(i * GOLDEN, 1.0)).astype("<f4")
    emissivity = (0.80 + 0.18 * np.mod(i * GOLDEN * GOLDEN, 1.0)).astype("<f4")
    with open(path, "wb") as out:
        out.write(apparent.tobytes() + emissivity.tobytes())
    return apparent, emissivity


def http_rows(build, out):
    rows = {}
    small_lua = os.path.join(out, "small.lua")
    write_lua(small_lua, "POST", body=SMALL_BODY)
    for label, threads in (("pool", os.cpu_count() or 1), ("per-connection", 0)):
        port = free_port()
        server = start_greybodyd(build, port, threads)
        try:
            idle = rss_kib(server.pid)
            url = "http://127.0.0.1:%d/v1/radiance" % port
            request = urllib.request.Request(url, data=SMALL_BODY,
                                             headers={"Content-Type": "application/json"})
            with urllib.request.urlopen(request) as answer:
                rows["small_body"] = answer.read()
            run_wrk(url, 64, 2, WRK_WARMUP_SECONDS, small_lua)
            result = run_wrk(url, 64, 2, WRK_SECONDS, small_lua)
            result["rss_idle"] = idle["VmRSS"]
            end = rss_kib(server.pid)
            result["rss_end"] = end["VmRSS"]
            result["rss_peak"] = end["VmHWM"]
            result["threads"] = threads
            rows["greybodyd_" + label] = result
            if label == "pool":
                rows["frame_http"] = frame_http(out, port)
        finally:
            stop(server)
    if shutil.which("nginx"):
        folder = os.path.join(out, "nginx")
        port = free_port()
        nginx = start_nginx(folder, port, rows["small_body"])
        try:
            url = "http://127.0.0.1:%d/v1/radiance" % port
            run_wrk(url, 64, 2, WRK_WARMUP_SECONDS)
            rows["nginx"] = run_wrk(url, 64, 2, WRK_SECONDS)
        finally:
            stop(nginx)
    return rows


def frame_http(out, port):
    path = os.path.join(out, "frame.bin")
    apparent, _ = frame_body(path)
    url = ("http://127.0.0.1:%d/v1/corrected-temperature?emissivity=map"
           "&reflected_temperature=293.15&width=%d&height=%d" % (port, FRAME_WIDTH, FRAME_HEIGHT))
    with open(path, "rb") as body:
        request = urllib.request.Request(url, data=body.read(),
                                         headers={"Content-Type": "application/octet-stream"})
    with urllib.request.urlopen(request) as answer:
        unresolved = answer.headers.get("Greybody-Unresolved-Pixels")
        temperatures = np.frombuffer(answer.read(), dtype="<f4")
    if temperatures.size != apparent.size or unresolved != "0":
        raise RuntimeError("frame answer: %d values, %s unresolved" % (temperatures.size, unresolved))
    lua = os.path.join(out, "frame.lua")
    write_lua(lua, "POST", body_file=path, content_type="application/octet-stream")
    result = run_wrk(url, 1, 1, FRAME_SECONDS, lua)
    return result


def verdict(ok):
    return "met" if ok else "**not met**"


def table(core, http, conditions):
    lines = ["# greybody benchmark", "", conditions, "",
             "## Core array functions (1 M elements, one core; ns per element)", "",
             "| function | greybody core | NumPy/SciPy | faster than NumPy | x exp() floor | "
             "agreement (max rel. diff.) | target | met |",
             "|---|---|---|---|---|---|---|---|"]
    floor = core[("core", "exp_floor")]
    named = [("planck_radiance", "Planck radiance (10 um)", 3.0),
             ("brightness_temperature", "brightness temperature (10 um)", 3.0),
             ("band_radiance", "band radiance 8-14 um (table)", 3.0),
             ("band_temperature", "band -> temperature 8-14 um (table)", 4.0),
             ("corrected_temperature", "corrected temperature, band model, emissivity map "
              "(float32)", 3.0)]
    for row, label, floor_target in named:
        ours = core[("core", row)]
        theirs = core[("numpy", row)]
        agree = core.get(("numpy", "agree_" + row))
        speedup = theirs / ours
        over_floor = ours / floor
        ok = speedup >= 3.0 and over_floor <= floor_target
        lines.append("| %s | %.2f | %.2f | %.2fx | %.2fx | %s | >=3x NumPy, <=%gx floor | %s |" % (
            label, ours * 1e9, theirs * 1e9, speedup, over_floor,
            "%.1e" % agree if agree is not None else "-", floor_target, verdict(ok)))
    lines.append("| floor: one exp() per element (C, project flags) | %.2f | np.exp %.2f | | 1x "
                 "| | | |" % (floor * 1e9, core[("numpy", "numpy_exp")] * 1e9))
    lines.append("| band table build (once per band and range, cached) | %.2f ms | | | | | | |"
                 % (core[("core", "table_build")] * 1e3))
    lines += ["", "## Frames: 640 x 512 apparent temperatures + emissivity map, corrected "
              "temperature (band model)", "",
              "| path | time per frame | target | met |", "|---|---|---|---|"]
    frame_core = core[("core", "frame_core")] * 1e3
    lines.append("| core alone, one core | %.2f ms | <= 15 ms | %s |" % (frame_core,
                                                                       verdict(frame_core <= 15)))
    lines.append("| NumPy/SciPy, same mathematics | %.1f ms | | |"
                 % (core[("numpy", "frame_numpy")] * 1e3))
    frame = http.get("frame_http")
    if frame:
        lines.append("| end to end over loopback HTTP (2.6 MB up, 1.3 MB back), p50 / p99 | "
                     "%.2f / %.2f ms (%d frames, %d errors) | <= 40 ms | %s |" % (
                         frame["p50"], frame["p99"], frame["requests"], frame["errors"],
                         verdict(frame["p50"] <= 40 and frame["errors"] == 0)))
    lines += ["", "## Small requests: POST /v1/radiance (%d-byte JSON answer), wrk -t2 -c64, "
              "%d s" % (len(http["small_body"]), WRK_SECONDS), "",
              "| server | requests/s | p50 | p99 | errors | vs nginx | target | met |",
              "|---|---|---|---|---|---|---|---|"]
    nginx = http.get("nginx")
    for label in ("pool", "per-connection"):
        result = http["greybodyd_" + label]
        ratio = result["rps"] / nginx["rps"] if nginx else float("nan")
        ok = nginx is not None and ratio >= 0.5 and result["p99"] <= 5 and result["errors"] == 0
        name = ("greybodyd --threads %d (pool, one per core)" % result["threads"]
                if label == "pool" else "greybodyd --threads 0 (thread per connection)")
        lines.append("| %s | %.0f | %.2f ms | %.2f ms | %d | %.0f%% | >=50%% nginx, p99 <= 5 ms, "
                     "0 errors | %s |" % (name, result["rps"], result["p50"], result["p99"],
                                          result["errors"], 100 * ratio, verdict(ok)))
    if nginx:
        lines.append("| nginx static file, same bytes (GET) | %.0f | %.2f ms | %.2f ms | %d | 100%% "
                     "| | |" % (nginx["rps"], nginx["p50"], nginx["p99"], nginx["errors"]))
    lines += ["", "## Memory: greybodyd resident set", "",
              "| server | idle | end of HTTP run | peak | target | met |",
              "|---|---|---|---|---|---|"]
    for label in ("pool", "per-connection"):
        result = http["greybodyd_" + label]
        peak = result["rss_peak"] / 1024
        lines.append("| %s | %.1f MiB | %.1f MiB | %.1f MiB | < 32 MiB | %s |" % (
            label, result["rss_idle"] / 1024, result["rss_end"] / 1024, peak,
            verdict(peak < 32)))
    return "\n".join(lines) + "\n"


def conditions():
    model = "unknown CPU"
    with open("/proc/cpuinfo") as info:
        for line in info:
            if line.startswith("model name"):
                model = line.split(":", 1)[1].strip()
                break
    load = os.getloadavg()
    return ("Run %s on %s, %d CPUs, load average %.2f %.2f %.2f at the start; wrk shares the CPUs "
            "with the server; NumPy %s.  Ratios are measured side by side in this run."
            % (datetime.datetime.now().strftime("%Y-%m-%d %H:%M"), model, os.cpu_count(),
               load[0], load[1], load[2], np.__version__))


def main():
    build = os.path.abspath(sys.argv[1] if len(sys.argv) > 1 else "build")
    out = os.path.join(build, "bench")
    os.makedirs(out, exist_ok=True)
    for tool in ("wrk", "nginx"):
        if shutil.which(tool) is None:
            sys.exit("bench: %s is missing (make bench installs it: tools/deps.sh)" % tool)
    started = conditions()
    core = core_rows(build, out)
    http = http_rows(build, out)
    text = table(core, http, started + " Load average at the end: %.2f %.2f %.2f."
                 % os.getloadavg())
    with open(os.path.join(build, "bench.md"), "w") as report:
        report.write(text)
    sys.stdout.write(text)


if __name__ == "__main__":
    main()
