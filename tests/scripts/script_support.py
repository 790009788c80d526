"""What the reference scripts share: running the binary for its JSON, collecting
failed checks, the exit status, and exact linear solves over Fractions. Not a
test itself (CTest runs check_*.py)."""
import json
import subprocess
import sys
from fractions import Fraction


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


# Gauss-Jordan elimination over `fractions.Fraction` (Python's standard
# library; the textbook elimination, e.g. Golub and Van Loan, Matrix
# Computations, section 3.2, from memory) on sparse rows: every script that
# needs an exact linear solve uses this one.
def gauss_jordan(rows, size):
    """Solves the square system held in `rows`: one dict per equation, mapping
    the columns 0..size-1 to the coefficients of the unknowns and the columns
    size, size+1, ... to right-hand sides (several solved at once). Returns,
    per unknown, a dict {right-hand side k: value}; missing entries are 0.
    The rows are left as they are. Raises StopIteration on a singular system."""
    m = [{k: Fraction(v) for k, v in r.items() if v != 0} for r in rows]
    for col in range(size):
        pivot = next(r for r in range(col, size) if m[r].get(col, 0) != 0)
        m[col], m[pivot] = m[pivot], m[col]
        inv = Fraction(1) / m[col][col]
        prow = {k: v * inv for k, v in m[col].items()}
        m[col] = prow
        for r in range(size):
            f = m[r].get(col, 0) if r != col else 0
            if f != 0:
                row = m[r]
                for k, v in prow.items():
                    nv = row.get(k, 0) - f * v
                    if nv != 0:
                        row[k] = nv
                    else:
                        row.pop(k, None)
    return [{k - size: v for k, v in m[i].items() if k >= size} for i in range(size)]
