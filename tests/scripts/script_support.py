"""What the reference scripts share: running the binary for its JSON, collecting
failed checks, and the exit status. Not a test itself (CTest runs check_*.py)."""
import json
import subprocess
import sys


class Checks:
    """check(cond, what) records `what` when cond is false; finish() exits 1 after
    printing the first failures, or prints the summary."""

    def __init__(self):
        self.failures = []

    def __call__(self, cond, what):
        if not cond:
            self.failures.append(what)

    def finish(self, summary, most=20):
        if self.failures:
            for f in self.failures[:most]:
                print("FAIL:", f)
            if len(self.failures) > most:
                print(f"... and {len(self.failures) - most} more")
            sys.exit(1)
        print(summary)


def run_json(binary, args):
    """The binary's JSON output for args; a non-zero exit ends the script."""
    p = subprocess.run([binary, *args], capture_output=True, text=True)
    if p.returncode != 0:
        raise SystemExit(f"FAIL: overshoot {' '.join(args)}: {p.stderr.strip()}")
    return json.loads(p.stdout)
