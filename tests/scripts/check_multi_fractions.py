#!/usr/bin/python3
"""Three-piece races against an independent reference: exact rational
arithmetic (Python's fractions module, standard library) by brute-force
dynamic programming over every triple of squares on tiny boards.

Usage: check_multi_fractions.py OVERSHOOT_BINARY SOURCE_DIR

The reference enumerates every combination of the three pieces' moves in a
round (no per-piece series, no end zones, no closure): for forward-only boards
it solves the triangular system square-triple by square-triple (each triple's
self-loop solved exactly), for bounce boards by Gauss-Jordan elimination over
the reachable triples. The C++ probabilities must lie within their reported
error bound (plus 1e-15 for printing doubles) of the exact fractions.
"""
import itertools
import json
import subprocess
import sys
from fractions import Fraction

BIN = sys.argv[1]


def dice(n, s):
    dist = {0: Fraction(1)}
    for _ in range(n):
        nxt = {}
        for m, p in dist.items():
            for f in range(1, s + 1):
                nxt[m + f] = nxt.get(m + f, 0) + p / s
        dist = nxt
    return dist


def faces(fs):
    dist = {}
    for f in fs:
        dist[f] = dist.get(f, 0) + Fraction(1, len(fs))
    return dist


class Board:
    def __init__(self, n, rule, jumps):
        self.n, self.rule, self.jumps = n, rule, dict(jumps)

    def resolve(self, s):
        while s in self.jumps:
            s = self.jumps[s]
        return s

    def dest(self, s, m):
        n, t = self.n, s + m
        if t < n:
            return self.resolve(t)
        if t == n:
            return n
        if self.rule == "stay":
            return s
        if self.rule == "pass":
            return n
        e = t - n
        return self.resolve(0) if e > n else self.resolve(n - e)

    def forward(self):
        return self.rule != "bounce" and all(t > f for f, t in self.jumps.items())


def one_round(board, dists, state, seated):
    """{outcome: probability} where outcome is ('end', frozenset) or ('go', state)."""
    n = board.n
    out = {}
    per_piece = [[(board.dest(s, m), p) for m, p in d.items()] for s, d in zip(state, dists)]
    for combo in itertools.product(*per_piece):
        p = Fraction(1)
        for _, q in combo:
            p *= q
        dests = [d for d, _ in combo]
        fin = [i for i, d in enumerate(dests) if d == n]
        if seated and fin:
            key = ("end", frozenset([fin[0]]))  # the first in listed order lands first
        elif fin:
            key = ("end", frozenset(fin))
        else:
            key = ("go", tuple(dests))
        out[key] = out.get(key, 0) + p
    return out


def solve(board, dists, start, seated):
    """Exact {frozenset of first finishers: probability} from `start`."""
    # Reachable triples (never containing the finish).
    seen, stack, rounds = {start}, [start], {}
    while stack:
        st = stack.pop()
        rounds[st] = one_round(board, dists, st, seated)
        for (kind, v) in rounds[st]:
            if kind == "go" and v not in seen:
                seen.add(v)
                stack.append(v)
    states = sorted(seen)
    outcomes = sorted({v for r in rounds.values() for (k, v) in r if k == "end"}, key=lambda s: sorted(s))
    if board.forward():
        value = {}
        for st in sorted(states, reverse=True):  # successors are larger tuples
            r = rounds[st]
            self_p = r.get(("go", st), Fraction(0))
            val = {o: r.get(("end", o), Fraction(0)) for o in outcomes}
            for (kind, v), p in r.items():
                if kind == "go" and v != st:
                    for o in outcomes:
                        val[o] += p * value[v][o]
            if self_p == 1:
                value[st] = {o: Fraction(0) for o in outcomes}
            else:
                value[st] = {o: x / (1 - self_p) for o, x in val.items()}
        return value[start]
    # Gauss-Jordan on (I - Q) X = R over the reachable triples.
    idx = {s: i for i, s in enumerate(states)}
    m = len(states)
    rows = []
    for st in states:
        row = [Fraction(0)] * m + [Fraction(0)] * len(outcomes)
        row[idx[st]] += 1
        for (kind, v), p in rounds[st].items():
            if kind == "go":
                row[idx[v]] -= p
            else:
                row[m + outcomes.index(v)] += p
        rows.append(row)
    for c in range(m):
        piv = next(r for r in range(c, m) if rows[r][c] != 0)
        rows[c], rows[piv] = rows[piv], rows[c]
        inv = 1 / rows[c][c]
        rows[c] = [x * inv for x in rows[c]]
        for r in range(m):
            if r != c and rows[r][c] != 0:
                f = rows[r][c]
                rows[r] = [x - f * y for x, y in zip(rows[r], rows[c])]
    i = idx[start]
    return {o: rows[i][m + k] for k, o in enumerate(outcomes)}


def unique(names):
    out, seen = [], {}
    for n in names:
        seen[n] = seen.get(n, 0) + 1
        out.append(n if seen[n] == 1 else f"{n}#{seen[n]}")
    return out


# Invented tiny boards and options (our own); each case: length, rule, jumps,
# option specs with their distributions, start squares, order.
D = {"1d4": dice(1, 4), "2d3": dice(2, 3), "1d3": dice(1, 3), "[0,2,3]": faces([0, 2, 3]),
     "2d2": dice(2, 2), "[1,1,4]": faces([1, 1, 4])}
CASES = [
    (9, "stay", [], ["1d4", "2d3", "1d3"], [0, 0, 0], "simultaneous"),
    (9, "stay", [], ["1d4", "2d3", "1d3"], [0, 0, 0], "seated"),
    (10, "stay", [(3, 7)], ["[0,2,3]", "1d4", "1d4"], [0, 2, 5], "simultaneous"),
    (8, "pass", [(2, 5)], ["2d2", "1d3", "[1,1,4]"], [1, 0, 3], "seated"),
    (11, "stay", [], ["2d3", "2d3", "2d3"], [0, 0, 0], "simultaneous"),
    (5, "bounce", [], ["1d4", "2d2", "1d3"], [0, 0, 0], "simultaneous"),
    (5, "bounce", [(3, 1)], ["1d4", "[0,2,3]", "1d3"], [0, 0, 2], "seated"),
    (6, "stay", [(4, 1)], ["1d3", "2d2", "1d4"], [0, 0, 0], "simultaneous"),
]

failures = 0
for length, rule, jumps, specs, starts, order in CASES:
    board = Board(length, rule, jumps)
    exact = solve(board, [D[s] for s in specs], tuple(board.resolve(s) for s in starts), order == "seated")
    cmd = [BIN, "race", *specs, "--length", str(length), "--overshoot", rule, "--order", order, "--json"]
    for f, t in jumps:
        cmd += ["--jump", f"{f}:{t}"]
    for s in starts:
        cmd += ["--start", str(s)]
    got = json.loads(subprocess.run(cmd, check=True, capture_output=True, text=True).stdout)
    names = unique(specs)
    tol = got["error_bound"] + 1e-15
    label = f"length {length} {rule} jumps {jumps} {specs} starts {starts} {order}"
    checks = []
    for i, name in enumerate(names):
        checks.append((f"p_wins[{name}]", got["p_wins"][name], exact.get(frozenset([i]), Fraction(0))))
    tie = sum((p for o, p in exact.items() if len(o) >= 2), Fraction(0))
    checks.append(("p_tie", got["p_tie"], tie))
    checks.append(("p_neither", got["p_neither"], 1 - sum(exact.values(), Fraction(0))))
    shared = {frozenset(names.index(x) for x in s["pieces"]): s["p"] for s in got["shared_finishes"]}
    for o, p in exact.items():
        if len(o) >= 2:
            checks.append((f"shared {sorted(o)}", shared.get(o, 0.0), p))
    for what, value, ref in checks:
        if abs(value - float(ref)) > tol:
            failures += 1
            print(f"FAIL {label}: {what} = {value!r}, exact {ref} = {float(ref)!r}, bound {tol:.3g}")
    if order == "seated" and got["p_tie"] != 0:
        failures += 1
        print(f"FAIL {label}: seated order reports a shared finish")
    print(f"ok {label}" if not failures else f"checked {label}")

if failures:
    print(f"{failures} mismatches")
    sys.exit(1)
print("all three-piece races match the exact fractions")
