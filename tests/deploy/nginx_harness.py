"""nginx as the tests run it: Debian's binary, a throw-away prefix, no root paths.

The shipped http-level file deploy/nginx/greybody.conf is used as it is, except for
its addresses: its upstream `server` lines are replaced by the ports under test
(keeping their parameters) and its `listen` by a loopback port.  The main file
written around it keeps everything inside the prefix and logs, per request, the
status, the upstream(s) tried with their statuses, and the time.
"""
import os
import pathlib
import re
import signal
import socket
import subprocess
import time
import urllib.error
import urllib.request

ROOT = pathlib.Path(__file__).resolve().parent.parent.parent
SHIPPED_SITE = ROOT / "deploy" / "nginx" / "greybody.conf"
NGINX = os.environ.get("NGINX", "/usr/sbin/nginx")
WAIT_SECONDS = 10

MAIN_TEMPLATE = """\
daemon off;
worker_processes 2;
pid {prefix}/nginx.pid;
error_log {prefix}/error.log warn;
events {{ worker_connections 1024; }}
http {{
    log_format balancer '$msec $status "$upstream_addr" "$upstream_status"';
    access_log {prefix}/access.log balancer;
    client_body_temp_path {prefix}/client_body;
    proxy_temp_path {prefix}/proxy;
    fastcgi_temp_path {prefix}/fastcgi;
    uwsgi_temp_path {prefix}/uwsgi;
    scgi_temp_path {prefix}/scgi;
    include {prefix}/site.conf;
}}
"""

UPSTREAM_SERVER = re.compile(r"^(\s*)server\s+\S+:\d+(\s[^;]*)?;\s*$", re.MULTILINE)
LISTEN = re.compile(r"^(\s*)listen\s+[^;]+;\s*$", re.MULTILINE)


def free_port():
    with socket.socket() as probe:
        probe.bind(("127.0.0.1", 0))
        return probe.getsockname()[1]


def site_for(upstream_ports, listen_port):
    """The shipped site file with its upstream servers and listen address replaced."""
    text = SHIPPED_SITE.read_text(encoding="utf-8")
    servers = list(UPSTREAM_SERVER.finditer(text))
    listens = list(LISTEN.finditer(text))
    if not servers or len(listens) != 1:
        raise ValueError(f"{SHIPPED_SITE}: expected upstream 'server host:port ...;' lines and one "
                         f"'listen' line, found {len(servers)} and {len(listens)}")
    indent, parameters = servers[0].group(1), servers[0].group(2) or ""
    replacement = "".join(f"{indent}server 127.0.0.1:{port}{parameters};\n"
                          for port in upstream_ports)
    text = text[:servers[0].start()] + replacement.rstrip("\n") + text[servers[-1].end():]
    return LISTEN.sub(lambda m: f"{m.group(1)}listen 127.0.0.1:{listen_port};", text, count=1)


class Nginx:
    def __init__(self, prefix, site_text):
        self.prefix = pathlib.Path(prefix)
        self.prefix.mkdir(parents=True, exist_ok=True)
        # As root, nginx's workers run as nobody and must reach the prefix.
        os.chmod(self.prefix, 0o755)
        for log in ("access.log", "error.log", "stderr.log"):  # nginx appends: start afresh
            (self.prefix / log).unlink(missing_ok=True)
        (self.prefix / "site.conf").write_text(site_text, encoding="utf-8")
        self.config = self.prefix / "nginx.conf"
        self.config.write_text(MAIN_TEMPLATE.format(prefix=self.prefix), encoding="utf-8")
        self.process = None
        self.port = None

    def command(self, *extra):
        return [NGINX, "-p", str(self.prefix), "-c", str(self.config), "-e", "stderr", *extra]

    def test(self):
        """(ok, output) of nginx -t on this configuration."""
        result = subprocess.run(self.command("-t"), capture_output=True, text=True, check=False)
        return result.returncode == 0, (result.stdout + result.stderr).strip()

    def start(self, port):
        self.port = port
        self.process = subprocess.Popen(self.command(), stdin=subprocess.DEVNULL,
                                        stdout=subprocess.DEVNULL,
                                        stderr=open(self.prefix / "stderr.log", "wb"))
        deadline = time.monotonic() + WAIT_SECONDS
        while time.monotonic() < deadline:
            if self.process.poll() is not None:
                raise RuntimeError("nginx exited at start: " +
                                   (self.prefix / "stderr.log").read_text(errors="replace"))
            try:
                with urllib.request.urlopen(f"http://127.0.0.1:{port}/healthz", timeout=2) as answer:
                    if answer.status == 200:
                        return self
            except (urllib.error.URLError, ConnectionError, OSError):
                pass
            time.sleep(0.05)
        self.stop()
        raise RuntimeError(f"nginx did not answer on port {port} within {WAIT_SECONDS} s")

    def stop(self):
        if self.process is not None and self.process.poll() is None:
            self.process.send_signal(signal.SIGQUIT)  # graceful: finish what is in flight
            try:
                self.process.wait(timeout=WAIT_SECONDS)
            except subprocess.TimeoutExpired:
                self.process.kill()
                self.process.wait(timeout=WAIT_SECONDS)

    def access_log(self):
        """[(time, status, [upstream addresses tried], [their statuses])] per request."""
        entries = []
        path = self.prefix / "access.log"
        if not path.exists():
            return entries
        for line in path.read_text(encoding="utf-8").splitlines():
            match = re.match(r'^(\S+) (\d+) "([^"]*)" "([^"]*)"$', line)
            if match:
                entries.append((float(match.group(1)), int(match.group(2)),
                                [a.strip() for a in match.group(3).split(",") if a.strip()],
                                [s.strip() for s in match.group(4).split(",") if s.strip()]))
        return entries
