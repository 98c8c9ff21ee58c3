"""Starting and stopping build/greybodyd (or an installed one) for Python tests.

The server is started on 127.0.0.1:0 and reports the port the kernel gave it
in its "listening" log line, so there is no race for a free port.  Its JSON
log lines go to a file the caller names.  Every wait is bounded.
"""
import json
import os
import pathlib
import signal
import subprocess
import time
import urllib.error
import urllib.request

ROOT = pathlib.Path(__file__).resolve().parent.parent.parent
START_SECONDS = 15
STOP_SECONDS = 15


def default_binary():
    return pathlib.Path(os.environ.get("GREYBODYD") or ROOT / "build" / "greybodyd")


class Greybodyd:
    def __init__(self, log_path, binary=None, extra_args=(), cwd=None):
        self.binary = pathlib.Path(binary) if binary else default_binary()
        self.log_path = pathlib.Path(log_path)
        self.log_path.parent.mkdir(parents=True, exist_ok=True)
        self.extra_args = list(extra_args)
        self.cwd = cwd
        self.process = None
        self.port = None

    def start(self):
        with open(self.log_path, "wb") as log:
            self.process = subprocess.Popen(
                [str(self.binary), "--listen", "127.0.0.1:0", *self.extra_args],
                stdin=subprocess.DEVNULL, stdout=log, stderr=log, cwd=self.cwd)
        deadline = time.monotonic() + START_SECONDS
        while time.monotonic() < deadline:
            if self.process.poll() is not None:
                raise RuntimeError(f"{self.binary} exited with {self.process.returncode}; "
                                   f"see {self.log_path}")
            self.port = self._reported_port()
            if self.port:
                return self
            time.sleep(0.02)
        self.kill()
        raise RuntimeError(f"{self.binary} did not report a port within {START_SECONDS} s")

    def _reported_port(self):
        for line in self.log_path.read_text(encoding="utf-8", errors="replace").splitlines():
            try:
                event = json.loads(line)
            except ValueError:
                continue
            if event.get("event") == "listening":
                marker = "(port "
                message = event.get("message", "")
                if marker in message:
                    return int(message.split(marker, 1)[1].split(")", 1)[0])
        return None

    @property
    def url(self):
        return f"http://127.0.0.1:{self.port}"

    def get(self, path, timeout=10):
        """(status, headers, body bytes) of a GET; HTTP errors are answers too."""
        try:
            with urllib.request.urlopen(self.url + path, timeout=timeout) as response:
                return response.status, dict(response.headers), response.read()
        except urllib.error.HTTPError as error:
            return error.code, dict(error.headers), error.read()

    def stop(self):
        """SIGTERM, wait for the drain; the exit status (None if it had to be killed)."""
        if self.process is None or self.process.poll() is not None:
            return None if self.process is None else self.process.returncode
        self.process.send_signal(signal.SIGTERM)
        try:
            return self.process.wait(timeout=STOP_SECONDS)
        except subprocess.TimeoutExpired:
            self.kill()
            return None

    def kill(self):
        if self.process is not None and self.process.poll() is None:
            self.process.kill()
            self.process.wait(timeout=STOP_SECONDS)

    def __enter__(self):
        return self.start()

    def __exit__(self, *exc):
        self.stop()
