#!/usr/bin/python3
"""The equilibrium mix of `overshoot tournament --json` against SciPy's linprog.

Reference: scipy.optimize.linprog (Debian python3-scipy, HiGHS solver), on the
game "both pick an option, payoff = margin": maximise v subject to
sum_i x_i A[i][j] >= v for every j, sum x = 1, x >= 0. The values must agree.
An optimal mix need not be unique, so for every weight the script also finds
its range over all optimal mixes (two more linear programmes per option) and
requires ours to lie inside it; where the range is a single point (the usual
case for random matrices) ours must equal SciPy's. Rock-paper-scissors must
give 1/3 each. Random matrices go through --matrix; random races through specs.

Usage: check_tournament_scipy.py BINARY SOURCE_DIR
"""
import os
import random
import sys

from script_support import Checks, run_json
import tempfile

from scipy.optimize import linprog

BINARY = sys.argv[1]
check = Checks()
TOL = 1e-7



def run(args):
    return run_json(BINARY, ["tournament", *args, "--json"])


def solve(a):
    n = len(a)
    c = [0.0] * n + [-1.0]
    a_ub = [[-a[i][j] for i in range(n)] + [1.0] for j in range(n)]
    res = linprog(c, A_ub=a_ub, b_ub=[0.0] * n, A_eq=[[1.0] * n + [0.0]], b_eq=[1.0],
                  bounds=[(0, None)] * n + [(None, None)], method="highs")
    assert res.status == 0, res.message
    return -res.fun, list(res.x[:n])


def weight_range(a, value, i):
    n = len(a)
    a_ub = [[-a[k][j] for k in range(n)] for j in range(n)]
    b_ub = [-(value - 1e-9)] * n
    out = []
    for sign in (1.0, -1.0):
        c = [0.0] * n
        c[i] = sign
        res = linprog(c, A_ub=a_ub, b_ub=b_ub, A_eq=[[1.0] * n], b_eq=[1.0], bounds=[(0, None)] * n, method="highs")
        assert res.status == 0, res.message
        out.append(sign * res.fun)
    return out[0], out[1]


unique_cases = 0


def compare(doc, a, label):
    global unique_cases
    names = doc["options"]
    n = len(names)
    mine = [doc["equilibrium"][x] for x in names]
    check(abs(sum(mine) - 1) < 1e-12 and min(mine) >= 0, f"{label}: not a mix: {mine}")
    value, theirs = solve(a)
    check(abs(value) < 1e-9, f"{label}: SciPy value {value} of a symmetric game is not 0")
    check(abs(doc["equilibrium_value"] - value) < 1e-9, f"{label}: value {doc['equilibrium_value']} != SciPy {value}")
    for j in range(n):
        g = sum(mine[i] * a[i][j] for i in range(n))
        check(abs(doc["equilibrium_guaranteed"][names[j]] - g) < 1e-12, f"{label}: guaranteed against {names[j]}")
        check(g >= value - 1e-9, f"{label}: the mix loses {g} against {names[j]}")
    unique = True
    for i in range(n):
        lo, hi = weight_range(a, value, i)
        check(lo - TOL <= mine[i] <= hi + TOL, f"{label}: weight of {names[i]} {mine[i]} outside [{lo}, {hi}]")
        if hi - lo > 1e-6:
            unique = False
    if unique:
        unique_cases += 1
        for i in range(n):
            check(abs(mine[i] - theirs[i]) < TOL, f"{label}: weight of {names[i]} {mine[i]} != SciPy {theirs[i]}")


def write_matrix(path, names, w):
    n = len(names)
    with open(path, "w") as f:
        f.write("option," + ",".join(names) + "\n")
        for i in range(n):
            f.write(names[i] + "," + ",".join("-" if i == j else repr(w[i][j]) for j in range(n)) + "\n")


rng = random.Random(1928)  # von Neumann's minimax theorem
with tempfile.TemporaryDirectory() as tmp:
    path = os.path.join(tmp, "rps.csv")
    write_matrix(path, ["rock", "paper", "scissors"], [[0, 0, 1], [1, 0, 0], [0, 1, 0]])
    doc = run(["--matrix", path])
    for x in ("rock", "paper", "scissors"):
        check(abs(doc["equilibrium"][x] - 1 / 3) < 1e-12, f"rock-paper-scissors: {x} {doc['equilibrium'][x]}")
    for r in range(80):
        n = rng.randint(2, 9)
        names = [f"opt{i}" for i in range(n)]
        w = [[0.0] * n for _ in range(n)]
        for i in range(n):
            for j in range(i + 1, n):
                tie = 0.3 * rng.random()
                p = (1 - tie) * rng.random()
                w[i][j], w[j][i] = p, 1 - tie - p
        path = os.path.join(tmp, f"m{r}.csv")
        write_matrix(path, names, w)
        doc = run(["--matrix", path])
        compare(doc, [[w[i][j] - w[j][i] for j in range(n)] for i in range(n)], f"matrix round {r}")

for r in range(15):
    specs = set()
    while len(specs) < rng.randint(3, 6):
        specs.add(f"{rng.randint(1, 4)}d{rng.randint(2, 8)}" if rng.random() < 0.5 else
                  "[" + ",".join(str(rng.randint(0, 7)) for _ in range(rng.randint(2, 4))) + ",1]")
    args = [*sorted(specs), "--length", str(rng.randint(10, 70)), "--order", rng.choice(["simultaneous", "coin"])]
    doc = run(args)
    n = len(doc["options"])
    compare(doc, doc["margins"], f"race {' '.join(args)}")

check(unique_cases >= 40, f"only {unique_cases} cases with a unique mix: the comparison is too weak")
check.finish(f"ok: equilibrium values and mixes agree with SciPy ({unique_cases} unique mixes compared weight by weight)")
