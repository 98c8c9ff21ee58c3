#!/usr/bin/python3
"""Horizontal scale on one machine: three greybodyd instances behind nginx (the shipped
deploy/nginx/greybody.conf with loopback addresses), load from wrk through nginx.

1. Throughput through the balancer with one, two and three instances (printed, not asserted:
   speed belongs to `make bench`); every answer must be the right one and every instance must
   take a share of the load.
2. Failover: under load, one instance is killed (SIGKILL) mid-run.  No request may fail: nginx
   must retry on another instance (proxy_next_upstream), and the retries must show in its log.

Every request is POST /v1/radiance {"temperature": 300, "wavelength": 10}; the answer must hold
L(10 µm, 300 K) = 9.92403333 W m-2 sr-1 um-1 (/work/shared/REFERENCES.md, CODATA 2018).
Bounded: about 25 s of load in all.  Logs and figures go to build/tests/scale/.

Run: make test-scale (or /usr/bin/python3 tests/deploy/test_scale.py from the project root).
"""
import os
import pathlib
import re
import subprocess
import sys
import threading
import time

HERE = pathlib.Path(__file__).resolve().parent
ROOT = HERE.parent.parent
sys.dont_write_bytecode = True  # no __pycache__ beside the sources
sys.path.insert(0, str(ROOT / "tests" / "support"))
sys.path.insert(0, str(HERE))
from greybodyd_process import Greybodyd  # noqa: E402
from nginx_harness import Nginx, free_port, site_for  # noqa: E402
from suite_report import SuiteReport  # noqa: E402

OUTPUT = ROOT / "build" / "tests" / "scale"
WRK = os.environ.get("WRK", "/usr/bin/wrk")
WRK_THREADS = 2
WRK_CONNECTIONS = 32
PHASE_SECONDS = 4
FAILOVER_SECONDS = 6
KILL_AFTER_SECONDS = 2.0
INSTANCES = 3
START_ATTEMPTS = 3

# The expected answer's leading digits: 9.92403333 to REFERENCES.md's 9 significant digits.
WRK_SCRIPT = """\
wrk.method = "POST"
wrk.body = '{"temperature": 300, "wavelength": 10}'
wrk.headers["Content-Type"] = "application/json"
local threads = {}
function setup(thread) table.insert(threads, thread) end
function init(args) wrong = 0 end
function response(status, headers, body)
  if status ~= 200 or not string.find(body, '"radiance":9.92403333', 1, true) then
    wrong = wrong + 1
  end
end
function done(summary, latency, requests)
  local total = 0
  for _, thread in ipairs(threads) do total = total + thread:get("wrong") end
  io.write(string.format("wrong_answers %d\\n", total))
end
"""


class LoadResult:
    def __init__(self, output):
        self.output = output
        self.requests = int(self._find(r"(\d+) requests in", 0))
        self.per_second = float(self._find(r"Requests/sec:\s+([\d.]+)", 0.0))
        self.non_2xx = int(self._find(r"Non-2xx or 3xx responses: (\d+)", 0))
        self.socket_errors = sum(int(n) for n in re.findall(
            r"(?:connect|read|write|timeout) (\d+)",
            self._find(r"Socket errors: ([^\n]*)", "")))
        self.wrong = int(self._find(r"wrong_answers (\d+)", -1))

    def _find(self, pattern, default):
        match = re.search(pattern, self.output)
        return match.group(1) if match else default

    def problems(self):
        found = []
        if self.requests == 0:
            found.append("no request completed:\n" + self.output)
        if self.wrong != 0:
            found.append(f"{self.wrong} answers were not 200 with L = 9.92403333 "
                         f"(wrk output:\n{self.output})")
        if self.non_2xx:
            found.append(f"{self.non_2xx} responses were not 2xx")
        if self.socket_errors:
            found.append(f"{self.socket_errors} socket errors (connect/read/write/timeout)")
        return found


def run_load(port, seconds, script):
    result = subprocess.run(
        [WRK, f"-t{WRK_THREADS}", f"-c{WRK_CONNECTIONS}", f"-d{seconds}s", "--timeout", "5s",
         "-s", str(script), f"http://127.0.0.1:{port}/v1/radiance"],
        capture_output=True, text=True, check=False, timeout=seconds + 30)
    return LoadResult(result.stdout + result.stderr)


def start_nginx(prefix, ports):
    last_error = None
    for _ in range(START_ATTEMPTS):  # the probed port may be taken before nginx binds it
        listen = free_port()
        try:
            return Nginx(prefix, site_for(ports, listen)).start(listen)
        except RuntimeError as error:
            last_error = error
    raise last_error


# 499: wrk closed a connection with a request in flight when its time was up.  A client that gave
# up early would also count as a wrk timeout, which fails the run.
CLIENT_CLOSED = 499


def failed_at_nginx(entries):
    return [e for e in entries if e[1] not in (200, CLIENT_CLOSED)]


def served_by(entries, address):
    return sum(1 for _, _, tried, _ in entries if address in tried)


def throughput_phase(instances, count, script, figures):
    ports = [server.port for server in instances[:count]]
    nginx = start_nginx(OUTPUT / f"nginx-{count}", ports)
    try:
        load = run_load(nginx.port, PHASE_SECONDS, script)
    finally:
        nginx.stop()
    figures[count] = load.per_second
    problems = load.problems()
    entries = nginx.access_log()
    for port in ports:
        if served_by(entries, f"127.0.0.1:{port}") == 0:
            problems.append(f"instance on port {port} took no request")
    problems += [f"nginx answered {status}" for status in sorted({e[1] for e in failed_at_nginx(entries)})]
    return problems


def failover_phase(instances, script, outcome):
    ports = [server.port for server in instances]
    nginx = start_nginx(OUTPUT / "nginx-failover", ports)
    victim = instances[1]
    killed_at = []

    def kill_one():
        time.sleep(KILL_AFTER_SECONDS)
        killed_at.append(time.time())
        victim.kill()

    killer = threading.Thread(target=kill_one)
    try:
        killer.start()
        load = run_load(nginx.port, FAILOVER_SECONDS, script)
        killer.join()
    finally:
        nginx.stop()
    outcome["load"] = load
    problems = load.problems()
    entries = nginx.access_log()
    victim_address = f"127.0.0.1:{victim.port}"
    before = [e for e in entries if e[0] < killed_at[0]]
    after = [e for e in entries if e[0] > killed_at[0] + 0.5]
    retried = [e for e in entries if len(e[2]) > 1]
    outcome["retried"] = len(retried)
    if served_by(before, victim_address) == 0:
        problems.append("the killed instance took no request before it was killed")
    if not retried:
        problems.append("no request was retried on another instance after the kill")
    problems += [f"a retried request ended with {e[1]} ({e[2]} {e[3]})"
                 for e in failed_at_nginx(retried)]
    for server in instances:
        if server is not victim and served_by(after, f"127.0.0.1:{server.port}") == 0:
            problems.append(f"surviving instance on port {server.port} took no request after the kill")
    if failed_at_nginx(entries):
        problems.append(f"{len(failed_at_nginx(entries))} requests failed at nginx")
    return problems


def main():
    report = SuiteReport("scale")
    OUTPUT.mkdir(parents=True, exist_ok=True)
    script = OUTPUT / "radiance.lua"
    script.write_text(WRK_SCRIPT, encoding="utf-8")
    instances = [Greybodyd(OUTPUT / f"greybodyd-{i + 1}.log") for i in range(INSTANCES)]
    figures = {}
    outcome = {}
    try:
        for server in instances:
            server.start()
        for count in range(1, INSTANCES + 1):
            report.check(f"load through nginx, {count} instance(s): right answers, shared",
                         throughput_phase, instances, count, script, figures)
        report.check("one instance killed under load: no failed request",
                     failover_phase, instances, script, outcome)
    finally:
        for server in instances:
            server.stop()
    cores = os.cpu_count()
    lines = [f"throughput through nginx (wrk -t{WRK_THREADS} -c{WRK_CONNECTIONS}, "
             f"{PHASE_SECONDS} s each, POST /v1/radiance, {cores} cores shared by wrk, nginx "
             f"and the instances):"]
    lines += [f"  {count} instance(s): {figures[count]:9.0f} requests/s" for count in sorted(figures)]
    if "load" in outcome:
        load = outcome["load"]
        lines.append(f"failover: {load.requests} requests in {FAILOVER_SECONDS} s, one instance "
                     f"killed after {KILL_AFTER_SECONDS:.0f} s, {outcome.get('retried', 0)} retried "
                     f"by nginx, {load.wrong} wrong or failed")
    text = "\n".join(lines)
    print(text)
    (OUTPUT / "figures.txt").write_text(text + "\n", encoding="utf-8")
    report.exit()


if __name__ == "__main__":
    main()
