"""The pass/fail report of a Python test script.

Each check is a named function that returns a list of problems (empty: it
passed) or raises; the report prints one `ok` or `FAIL` line per check and a
closing `<suite>: N passed, M failed` line, the form tools/test-all.sh adds up.
A check may instead be skipped with a reason, which is printed and counted apart:
only for a tool that cannot run in this environment, never for a wrong answer.
"""
import sys
import traceback


class Skip(Exception):
    """Raised by a check that cannot run here; the message says why."""


class SuiteReport:
    def __init__(self, suite):
        self.suite = suite
        self.passed = 0
        self.failed = 0
        self.skipped = 0

    def check(self, name, function, *args):
        try:
            problems = list(function(*args) or [])
        except Skip as reason:
            self.skipped += 1
            print(f"skip {name}: {reason}", flush=True)
            return
        except Exception:  # a crash in a check is a failed check, reported in full
            problems = ["raised:\n" + traceback.format_exc()]
        if problems:
            self.failed += 1
            for problem in problems:
                print(f"FAIL {name}: {problem}", flush=True)
        else:
            self.passed += 1
            print(f"ok   {name}", flush=True)

    def finish(self):
        skipped = f", {self.skipped} skipped" if self.skipped else ""
        print(f"{self.suite}: {self.passed} passed, {self.failed} failed{skipped}", flush=True)
        return 1 if self.failed else 0

    def exit(self):
        sys.exit(self.finish())
