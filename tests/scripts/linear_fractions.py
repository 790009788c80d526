"""Exact linear solves for the reference scripts (not a check itself: CTest
runs only check_*.py).

Gauss-Jordan elimination over `fractions.Fraction` (Python's standard
library; the textbook elimination, e.g. Golub and Van Loan, Matrix
Computations, section 3.2, from memory) on sparse rows. Every script under
tests/scripts/ that needs an exact linear solve imports it from here rather
than keeping its own copy.
"""
from fractions import Fraction


def gauss_jordan(rows, size):
    """Solves the square system held in `rows`: one dict per equation, mapping
    the columns 0..size-1 to the coefficients of the unknowns and the columns
    size, size+1, ... to right-hand sides (several solved at once). Returns,
    per unknown, a dict {right-hand side k: value}; missing entries are 0.
    The rows are consumed. Raises StopIteration on a singular system."""
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
