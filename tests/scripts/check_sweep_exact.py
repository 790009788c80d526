#!/usr/bin/python3
"""Sweep figures against exact fractions.

Reference: Python's fractions module (exact rational arithmetic) solving the
absorbing-chain equations of the race from every pair of distances (a, b):
V(a, b) = sum over both moves of P(moves) V(a', b'), the self-loop solved
exactly. Every probability the sweep prints must lie within its error bound of
the exact value, on every length of the range, for several options and orders.
Usage: check_sweep_exact.py BINARY SOURCE_DIR
"""
import csv
import io
import subprocess
import sys
from fractions import Fraction

BIN = sys.argv[1]


def dice(n, s):
    dist = {0: Fraction(1)}
    for _ in range(n):
        nxt = {}
        for k, p in dist.items():
            for f in range(1, s + 1):
                nxt[k + f] = nxt.get(k + f, 0) + p / s
        dist = nxt
    return dist


def faces(lst):
    dist = {}
    for f in lst:
        dist[f] = dist.get(f, 0) + Fraction(1, len(lst))
    return dist


def step(dist, d, rule):
    """Distance after one turn from distance d: dict of next distance -> prob."""
    out = {}
    for m, p in dist.items():
        if m < d:
            nd = d - m
        elif m == d or rule == "pass":
            nd = 0
        else:
            nd = d  # stay: the turn is lost
        out[nd] = out.get(nd, 0) + p
    return out


def race(A, B, L, rule, a_first):
    """Exact (win, loss, tie) from (d, d) for d = 1..L."""
    V = {}
    for a in range(0, L + 1):
        for b in range(0, L + 1):
            if a == 0 or b == 0:
                continue
            ta, tb = step(A, a, rule), step(B, b, rule)
            sa, sb = ta.get(a, 0), tb.get(b, 0)
            acc = [Fraction(0)] * 3
            self_p = Fraction(0)
            for na, pa in ta.items():
                if a_first and na == 0:
                    acc[0] += pa
                    continue
                for nb, pb in tb.items():
                    p = pa * pb
                    if na == 0 and nb == 0:
                        acc[2] += p
                    elif na == 0:
                        acc[0] += p
                    elif nb == 0:
                        acc[1] += p
                    elif na == a and nb == b:
                        self_p += p
                    else:
                        v = V[(na, nb)]
                        for i in range(3):
                            acc[i] += p * v[i]
            if self_p == 1:
                V[(a, b)] = (Fraction(0), Fraction(0), Fraction(0))
            else:
                V[(a, b)] = tuple(x / (1 - self_p) for x in acc)
    return {d: V[(d, d)] for d in range(1, L + 1)}


def sweep(specs, L, rule, order, method):
    out = subprocess.run([BIN, "sweep", *specs, "--lengths", f"1..{L}", "--overshoot", rule, "--order", order,
                          "--csv", "--method", method], capture_output=True, text=True)
    if out.returncode != 0:
        sys.exit(f"sweep failed: {out.stderr}")
    return list(csv.DictReader(io.StringIO(out.stdout)))


CASES = [
    (("1d6", dice(1, 6)), ("2d6", dice(2, 6)), 24, "stay", "simultaneous"),
    (("1d4", dice(1, 4)), ("[0,1,3]", faces([0, 1, 3])), 20, "stay", "a-first"),
    (("2d4", dice(2, 4)), ("1d6", dice(1, 6)), 18, "pass", "simultaneous"),
    (("3d6", dice(3, 6)), ("2d6", dice(2, 6)), 20, "stay", "b-first"),
    # Lengths long enough for the zone tail (docs/method.md, section 4.6) to take over from the series.
    (("1d2", dice(1, 2)), ("3d6", dice(3, 6)), 30, "stay", "simultaneous"),
    (("3d6", dice(3, 6)), ("1d2", dice(1, 2)), 30, "stay", "a-first"),
    (("[1,1,2]", faces([1, 1, 2])), ("2d4", dice(2, 4)), 34, "stay", "b-first"),
    (("1d2", dice(1, 2)), ("2d6", dice(2, 6)), 64, "pass", "simultaneous"),
]
failures = 0
checked = 0
tail_rows = 0
for (na, A), (nb, B), L, rule, order in CASES:
    if order == "b-first":
        ex = {d: (l, w, t) for d, (w, l, t) in race(B, A, L, rule, True).items()}
    else:
        ex = race(A, B, L, rule, order == "a-first")
    for method in ("series", "pairs", "zone-tail"):
        for row in sweep([na, nb], L, rule, order, method):
            d = int(row["length"])
            tail_rows += row["method"] == "zone-tail"
            w, l, t = ex[d]
            bound = float(row["error_bound"]) / 2  # the margin's bound is twice each probability's
            for name, exact in (("p_a_wins", w), ("p_b_wins", l), ("p_tie", t)):
                got = float(row[name])
                checked += 1
                if abs(got - float(exact)) > bound + 1e-16:
                    failures += 1
                    print(f"{na} vs {nb} {rule} {order} {method} length {d}: {name} {got!r} exact {float(exact)!r} "
                          f"bound {bound}")
print(f"checked {checked} probabilities against exact fractions ({tail_rows} lengths by the zone tail), "
      f"{failures} outside their bound")
sys.exit(1 if failures or checked == 0 or tail_rows == 0 else 0)
