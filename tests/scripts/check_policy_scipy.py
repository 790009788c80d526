#!/usr/bin/python3
"""Optimal policies of `overshoot policy --json` against linear programmes
solved by SciPy (`scipy.optimize.linprog`, HiGHS).

  * Against a fixed option, the decision process written as the standard
    linear programme of an absorbing Markov decision process (d'Epenoux,
    1963, Management Science 10:98-108; Puterman, 1994, Markov Decision
    Processes, section 7.2.7, from memory): minimise the sum of v(s) subject
    to v(s) >= r(s, i) + sum P(s' | s, i) v(s') for every option i, v >= 0.
    Its optimum is the least non-negative solution of v >= T v, the value;
    every state must agree with `--state-values` within 1e-8.
  * The same on boards where pieces move backward (bounce, backward jumps),
    where the binary iterates: the LP's start value must also lie in the
    binary's proven interval.
  * The simultaneous game of two menus: at every state the matrix game
    M(i, j) = the expected value after one round with options i and j, using
    the binary's own state values (the state itself included, as in Shapley,
    1953, PNAS 39:1095-1100) is solved here by linprog; its value must be the
    binary's value of the state, and the binary's mixed (or pure) choices must
    be optimal in it, within 1e-8.

The rules of the race come from check_policy_fractions.py (written from
DESIGN.md, sharing no code with the engine).

Usage: check_policy_scipy.py BINARY SOURCE_DIR
"""
import json
import os
import subprocess
import sys

import numpy as np
from scipy.optimize import linprog

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
from check_policy_fractions import Duel, finish  # noqa: E402

FAIL = []


def check(ok, what):
    if not ok:
        FAIL.append(what)


def policy_json(binary, args):
    out = subprocess.run([binary, "policy", "--json", "--state-values", *args], capture_output=True, text=True)
    if out.returncode != 0:
        FAIL.append(f"{args}: exit {out.returncode}: {out.stderr.strip()}")
        return None
    return json.loads(out.stdout)


def board_args(rule, jumps):
    args = ["--overshoot", rule]
    for f, t in jumps:
        args += ["--jump", f"{f}:{t}"]
    return args


def lp_case(binary, n, menu, against, order, rule="stay", jumps=()):
    j = policy_json(binary, ["--length", str(n), "--order", order, "--menu", ",".join(menu), "--against", against,
                             *board_args(rule, jumps)])
    if j is None:
        return
    d = Duel(n, rule, list(jumps), menu, [against], order, "win")
    resting = set(range(n)) - {f for f, _ in jumps}
    index = {s: k for k, s in enumerate(d.states)}
    m = len(d.states)
    a_ub, b_ub = [], []
    for s in d.states:
        # B's move in an alternating order has one option: the same inequality.
        for i in d.actions(s):
            row = np.zeros(m)
            row[index[s]] -= 1
            r = 0.0
            for p, t in (d.outcomes(s, i, 0) if s[0] == "r" else d.outcomes(s, i)):
                if isinstance(t, tuple):
                    row[index[t]] += float(p)
                else:
                    r += float(p) * t
            a_ub.append(row)
            b_ub.append(-r)
    res = linprog(np.ones(m), A_ub=np.array(a_ub), b_ub=np.array(b_ub), bounds=[(0, None)] * m, method="highs")
    check(res.status == 0, f"LP {menu} vs {against} {order}: status {res.status}")
    if res.status != 0:
        return
    pol = j["policy"]
    for s in d.states:
        kind, a, b = s
        if a not in resting or b not in resting:
            continue
        key = "values" if kind in "ra" else "values_b"
        got = pol[key][n - a - 1][n - b - 1]
        check(abs(got - res.x[index[s]]) < 1e-8,
              f"LP {menu} vs {against} {order} {rule} {jumps} at {s}: {got} vs {res.x[index[s]]}")
    # The LP's optimum from the start lies in the binary's proven interval
    # (within the LP solver's own tolerance, 1e-9).
    start = {"simultaneous": ("r", 0, 0), "a-first": ("a", 0, 0), "b-first": ("b", 0, 0)}[order]
    x0 = res.x[index[start]]
    check(j["value"]["low"] - 1e-9 <= x0 <= j["value"]["high"] + 1e-9, f"LP {menu} vs {against} {order}: start")


def matrix_game(mat):
    """Value and an optimal mix of the row player (maximiser), by linprog."""
    rows, cols = mat.shape
    # Variables x_1..x_rows, u: maximise u with x^T M >= u, sum x = 1.
    c = np.zeros(rows + 1)
    c[-1] = -1
    a_ub = np.hstack([-mat.T, np.ones((cols, 1))])
    a_eq = np.hstack([np.ones((1, rows)), np.zeros((1, 1))])
    res = linprog(c, A_ub=a_ub, b_ub=np.zeros(cols), A_eq=a_eq, b_eq=[1],
                  bounds=[(0, None)] * rows + [(None, None)], method="highs")
    assert res.status == 0
    return res.x[-1]


def game_case(binary, n, menu, against, want_mixed, rule="stay", jumps=()):
    j = policy_json(binary, ["--length", str(n), "--menu", ",".join(menu), "--against-menu", ",".join(against),
                             *board_args(rule, jumps)])
    if j is None:
        return
    name = f"game {menu} vs {against} n={n} {rule} {jumps}"
    d = Duel(n, rule, list(jumps), menu, against, "simultaneous", "margin")
    resting = set(range(n)) - {f for f, _ in jumps}
    pol = j["policy"]
    v = {("r", a, b): pol["values"][n - a - 1][n - b - 1] for a in range(n) for b in range(n)}
    mixes = {(n - x["a_distance"], n - x["b_distance"]): x for x in pol["mixed"]}
    check(len(mixes) >= want_mixed, f"{name}: {len(mixes)} mixed states, expected at least {want_mixed}")
    for s in d.states:
        _, a, b = s
        if a not in resting or b not in resting:
            continue
        mat = np.array([[float(d.q(s, v, i, jj)) for jj in range(len(against))] for i in range(len(menu))])
        value = matrix_game(mat)
        check(abs(value - v[s]) < 1e-8, f"{name}: state {s}: linprog value {value} vs {v[s]}")
        if (a, b) in mixes:
            x = np.array([mixes[(a, b)]["a_mix"].get(o, 0.0) for o in menu])
            y = np.array([mixes[(a, b)]["b_mix"].get(o, 0.0) for o in against])
        else:
            x = np.eye(len(menu))[pol["a"][n - a - 1][n - b - 1]]
            y = np.eye(len(against))[pol["b"][n - a - 1][n - b - 1]]
        check(min(x @ mat) >= v[s] - 1e-8, f"{name}: A's choice at {s} is not optimal")
        check(max(mat @ y) <= v[s] + 1e-8, f"{name}: B's choice at {s} is not optimal")
    lo, hi = j["value"]["low"], j["value"]["high"]
    check(lo <= v[("r", 0, 0)] <= hi, f"{name}: value outside its proven interval")


def main():
    binary = sys.argv[1]
    for order in ["simultaneous", "a-first", "b-first"]:
        lp_case(binary, 10, ["1d6", "2d6"], "1d3", order)
        lp_case(binary, 9, ["1d2", "[0,2]", "2d3"], "2d2", order)
    # A board where a few states have no saddle point (found by a search over small dice).
    game_case(binary, 10, ["[2,3]", "[1,4,0,5]"], ["[1,1]", "[4,1]", "[4,0,5,2]"], 1)
    game_case(binary, 9, ["1d6", "2d6"], ["1d6", "2d6"], 0)
    # Boards where pieces move backward (the binary iterates there).
    for order in ["simultaneous", "a-first", "b-first"]:
        lp_case(binary, 10, ["1d6", "2d6"], "1d3", order, "bounce")
        lp_case(binary, 9, ["1d2", "[0,2]", "2d3"], "2d2", order, "stay", [(7, 2)])
        lp_case(binary, 11, ["1d3", "2d3", "1d6"], "1d4", order, "bounce", [(3, 8), (9, 4)])
    # A bounce board with a state that has no saddle point (found by a search
    # over small dice).
    game_case(binary, 8, ["[2,3]", "[1,1,4]"], ["2d2", "[2,2,5]"], 1, "bounce")
    game_case(binary, 8, ["[1,4]", "[4,1,2]"], ["1d3", "[1,5]"], 1, "bounce")
    game_case(binary, 9, ["1d6", "2d6", "1d3"], ["1d6", "2d6"], 0, "stay", [(7, 3)])
    finish(FAIL, "policies agree with SciPy's linear programmes")


if __name__ == "__main__":
    main()
