#!/usr/bin/python3
"""Optimal policies of `overshoot policy --json` against a brute force here.

References: Python's standard library (`fractions.Fraction` for exact
arithmetic, plain floats otherwise) and nothing else; the rules are written
from DESIGN.md ("Semantics, exactly") and share no code with the C++ engine.

  * floats, small boards: value iteration (Bellman, 1957, Dynamic
    Programming, Princeton) from 0 until nothing moves by more than 1e-15,
    over one round (simultaneous) or one move (alternating: A to move, B to
    move). Iterating from 0 reaches the least fixed point, the optimum of a
    reach-the-goal problem (Puterman, 1994, Markov Decision Processes,
    section 7.2, from memory). Every state's value must agree with
    `--state-values` within 1e-9, and the binary's choice must be the earliest
    option of the menu among those within 1e-9 of the best.
  * fractions, tiny boards: the binary's policies are evaluated exactly here by
    Gauss-Jordan elimination over Fractions and must give its exact fractions;
    then every option at every state is tried against those values: none may
    do better (Bellman's optimality equations hold exactly). For the win goal
    the values are non-negative and the evaluated policy attains them, so
    this proves the optimum (a non-negative solution of v >= T v bounds the
    least fixed point from above; Puterman 1994, theorem 7.2.2, from memory).
  * alone: the same two checks for P(finish) and the expected rounds.
  * boards where pieces move backward (bounce, backward jumps; the binary
    iterates there and proves an interval): the exact optimum by policy
    iteration over Fractions (Howard, 1960) must lie in the binary's proven
    interval, its choices must be exactly optimal and its found policy's
    exact outcomes within its error bound; the alternating game's choices are
    evaluated exactly and pass the same Bellman checks.

Usage: check_policy_fractions.py BINARY SOURCE_DIR
"""
import json
import os
import subprocess
import sys
from fractions import Fraction

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
from check_duel_fractions import add, fair, one_turn, to_prob  # noqa: E402
from script_support import gauss_jordan  # noqa: E402

FAIL = []


# Each spec used here with its distribution written out by hand.
OPTIONS = {
    "1d2": fair([1, 2]),
    "1d3": fair([1, 2, 3]),
    "1d4": fair([1, 2, 3, 4]),
    "2d2": add(fair([1, 2]), fair([1, 2])),
    "2d3": add(fair([1, 2, 3]), fair([1, 2, 3])),
    "1d6": fair(range(1, 7)),
    "2d6": add(fair(range(1, 7)), fair(range(1, 7))),
    "[0,2]": fair([0, 2]),
    "[1,1,3]": fair([1, 1, 3]),
    "[2,3]": fair([2, 3]),
    "[1,4,0,5]": fair([1, 4, 0, 5]),
    "[1,1]": fair([1, 1]),
    "[4,1]": fair([4, 1]),
    "[4,0,5,2]": fair([4, 0, 5, 2]),
    "[1,1,4]": fair([1, 1, 4]),
    "[2,2,5]": fair([2, 2, 5]),
    "[1,4]": fair([1, 4]),
    "[4,1,2]": fair([4, 1, 2]),
    "[1,5]": fair([1, 5]),
}


def moves(spec, n, rule, jumps):
    """rows[s] = {destination: probability} for squares 0..n-1; n is the finish."""
    return one_turn(n, rule, jumps, to_prob(OPTIONS[spec]))


def run(binary, args):
    out = subprocess.run([binary, "policy", "--json", *args], capture_output=True, text=True)
    if out.returncode != 0:
        FAIL.append(f"{args}: exit {out.returncode}: {out.stderr.strip()}")
        return None
    return json.loads(out.stdout)


def check(ok, what):
    if not ok:
        FAIL.append(what)


# ---------------------------------------------------------------- duels

class Duel:
    """States: ('r', a, b) round start (simultaneous); ('a', a, b) A to move and
    ('b', a, b) B to move (alternating). A maximises, B minimises the goal:
    win pays 1, loss 0 (goal win) or -1 (goal margin), tie and never 0."""

    def __init__(self, n, rule, jumps, menu, against, order, goal):
        self.n, self.order = n, order
        self.A = [moves(s, n, rule, jumps) for s in menu]
        self.B = [moves(s, n, rule, jumps) for s in against]
        self.loss = 0 if goal == "win" else -1
        if order == "simultaneous":
            self.states = [("r", a, b) for a in range(n) for b in range(n)]
        else:
            self.states = [(p, a, b) for p in "ab" for a in range(n) for b in range(n)]

    def actions(self, st):
        return range(len(self.A)) if st[0] in "ra" else range(len(self.B))

    def maximiser(self, st):
        return st[0] in "ra"

    def outcomes(self, st, i, j=None):
        """[(probability, terminal payoff or next state)] of one step. In a
        simultaneous round `i` is A's option and `j` B's."""
        n = self.n
        kind, a, b = st
        out = []
        if kind == "r":
            for a2, p in self.A[i][a].items():
                for b2, q in self.B[j][b].items():
                    if a2 == n and b2 == n:
                        out.append((p * q, 0))
                    elif a2 == n:
                        out.append((p * q, 1))
                    elif b2 == n:
                        out.append((p * q, self.loss))
                    else:
                        out.append((p * q, ("r", a2, b2)))
        elif kind == "a":
            for a2, p in self.A[i][a].items():
                out.append((p, 1) if a2 == n else (p, ("b", a2, b)))
        else:
            for b2, q in self.B[i][b].items():
                out.append((q, self.loss) if b2 == n else (q, ("a", a, b2)))
        return out

    def q(self, st, v, i, j=None):
        return sum(p * (v[t] if isinstance(t, tuple) else t) for p, t in self.outcomes(st, i, j))


def value_iteration(d):
    """Floats from 0. Simultaneous rounds need one side with one option."""
    v = {s: 0.0 for s in d.states}
    for _ in range(400000):
        delta = 0.0
        new = {}
        for s in d.states:
            if s[0] == "r":
                if len(d.B) == 1:
                    x = max(float(d.q(s, v, i, 0)) for i in range(len(d.A)))
                else:
                    x = min(float(d.q(s, v, 0, j)) for j in range(len(d.B)))
            elif d.maximiser(s):
                x = max(float(d.q(s, v, i)) for i in d.actions(s))
            else:
                x = min(float(d.q(s, v, j)) for j in d.actions(s))
            delta = max(delta, abs(x - v[s]))
            new[s] = x
        v = new
        if delta < 1e-15:
            return v
    raise RuntimeError("value iteration did not settle")


def solve_exact(d, choice):
    """Exact values of fixed pure choices (choice[state] = option; simultaneous
    rounds take (i, j)): Gauss-Jordan elimination over Fractions, after setting
    to 0 the states that can never end (a loop pays 0)."""
    succ = {}
    for s in d.states:
        c = choice[s]
        succ[s] = d.outcomes(s, *c) if isinstance(c, tuple) else d.outcomes(s, c)
    ends = set()
    changed = True
    while changed:
        changed = False
        for s in d.states:
            if s in ends:
                continue
            if any(p > 0 and (not isinstance(t, tuple) or t in ends) for p, t in succ[s]):
                ends.add(s)
                changed = True
    live = [s for s in d.states if s in ends]
    index = {s: k for k, s in enumerate(live)}
    m = len(live)
    rows = []
    for s in live:
        row = {index[s]: Fraction(1), m: Fraction(0)}
        for p, t in succ[s]:
            if isinstance(t, tuple):
                if t in index:
                    row[index[t]] = row.get(index[t], 0) - p
            else:
                row[m] += p * t
        rows.append(row)
    x = gauss_jordan(rows, m)
    v = {s: Fraction(0) for s in d.states}
    for s in live:
        v[s] = x[index[s]].get(0, Fraction(0))
    return v


def frac(text):
    num, den = text.split("/")
    return Fraction(int(num), int(den))


def start_value(d, v):
    if d.order == "simultaneous":
        return v[("r", 0, 0)]
    if d.order == "a-first":
        return v[("a", 0, 0)]
    if d.order == "b-first":
        return v[("b", 0, 0)]
    return (v[("a", 0, 0)] + v[("b", 0, 0)]) / 2


def duel_case(binary, n, rule, jumps, menu, against, order, exact, loops=False):
    """`exact`: the binary's --exact fractions are checked; `loops` (a board
    where pieces move backward, no --exact there): the binary's choices are
    evaluated exactly here instead and must meet its proven interval."""
    goal = "win" if len(against) == 1 else "margin"
    args = ["--length", str(n), "--overshoot", rule, "--order", order, "--menu", ",".join(menu), "--state-values"]
    for f, t in jumps:
        args += ["--jump", f"{f}:{t}"]
    args += ["--against", against[0]] if len(against) == 1 else ["--against-menu", ",".join(against)]
    if exact:
        args.append("--exact")
    j = run(binary, args)
    if j is None:
        return
    name = f"{menu} vs {against} n={n} {rule} {order}"
    d = Duel(n, rule, jumps, menu, against, order, goal)
    pol = j["policy"]
    resting = set(range(n)) - {f for f, _ in jumps}

    def cpp(kind, a, b):
        key = "values" if kind in "ra" else "values_b"
        return pol[key][n - a - 1][n - b - 1]

    def cpp_choice(kind, a, b):
        return pol["a" if kind in "ra" else "b"][n - a - 1][n - b - 1]

    # Floats: value iteration.
    v = value_iteration(d)
    for s in d.states:
        kind, a, b = s
        if a not in resting or b not in resting:
            continue
        check(abs(v[s] - cpp(kind, a, b)) < 1e-9, f"{name}: value at {s}: {cpp(kind, a, b)} vs {v[s]}")
        if kind == "b" and len(d.B) == 1:
            continue
        if kind == "r" and len(d.A) == 1:
            continue
        if kind == "r":
            qs = [float(d.q(s, v, i, 0)) for i in range(len(d.A))]
            best = max(qs)
        elif d.maximiser(s):
            qs = [float(d.q(s, v, i)) for i in d.actions(s)]
            best = max(qs)
        else:
            qs = [float(d.q(s, v, i)) for i in d.actions(s)]
            best = min(qs)
        near = [k for k, x in enumerate(qs) if abs(x - best) < 1e-9]
        # A choice that stays put forever ties in the equations with the best
        # one when the state is worth nothing either way; the binary then takes
        # a choice that moves, so only require that it is as good.
        check(cpp_choice(kind, a, b) in near, f"{name}: choice at {s}: {cpp_choice(kind, a, b)} not in {near}")
        if len(near) == 1:
            check(cpp_choice(kind, a, b) == near[0], f"{name}: choice at {s}")
    check(abs(start_value(d, v) - j["value"]["value"]) < 1e-9, f"{name}: start value")
    if loops:
        check(j["method"] == "iteration", f"{name}: method {j['method']}")
    if not exact and not loops:
        return
    # Fractions: evaluate the binary's choices exactly, then Bellman's equations.
    choice = {}
    for s in d.states:
        kind, a, b = s
        if kind == "r":
            on = a in resting and b in resting
            choice[s] = (cpp_choice("r", a, b) if on else 0,
                         pol["b"][n - a - 1][n - b - 1] if on and len(d.B) > 1 else 0)
        elif kind == "a":
            choice[s] = cpp_choice("a", a, b) if a in resting and b in resting else 0
        else:
            choice[s] = cpp_choice("b", a, b) if len(d.B) > 1 and a in resting and b in resting else 0
    ev = solve_exact(d, choice)
    if exact:
        e = j["exact"]
        check(start_value(d, ev) == frac(e["value"]), f"{name}: exact value {e['value']} vs {start_value(d, ev)}")
    else:
        # Floats convert to Fractions exactly: the proven interval must hold
        # the exact value of the binary's own policies (optimal by the
        # Bellman checks below).
        lo, hi = Fraction(j["value"]["low"]), Fraction(j["value"]["high"])
        check(lo <= start_value(d, ev) <= hi, f"{name}: exact value {float(start_value(d, ev))} outside [{lo}, {hi}]")
    for s in d.states:
        kind, a, b = s
        if a not in resting or b not in resting:
            continue
        if kind == "r":
            # One side has one option in a simultaneous round (pure choices).
            for i in range(len(d.A)):
                check(d.q(s, ev, i, choice[s][1]) <= ev[s], f"{name}: option {i} beats the policy at {s}")
            for j in range(len(d.B)):
                check(d.q(s, ev, choice[s][0], j) >= ev[s], f"{name}: B's option {j} beats B's policy at {s}")
        elif d.maximiser(s):
            for i in d.actions(s):
                check(d.q(s, ev, i) <= ev[s], f"{name}: option {i} beats the policy at {s}")
        else:
            for i in d.actions(s):
                check(d.q(s, ev, i) >= ev[s], f"{name}: B's option {i} beats B's policy at {s}")


# ---------------------------------------------------------------- alone

def alone_case(binary, n, rule, menu):
    j = run(binary, ["--length", str(n), "--overshoot", rule, "--menu", ",".join(menu), "--exact"])
    if j is None:
        return
    name = f"alone {menu} n={n} {rule}"
    rows = [moves(s, n, rule, []) for s in menu]
    # Value iteration in floats: P(finish) from 0 up, expected rounds from 0 up
    # (rounds of a square that cannot be finished for sure grow without end).
    h = [0.0] * n + [1.0]
    e = [0.0] * (n + 1)
    for _ in range(400000):
        h2 = [max(sum(float(p) * h[d] for d, p in r[s].items()) for r in rows) for s in range(n)] + [1.0]
        e2 = [min(1 + sum(float(p) * e[d] for d, p in r[s].items()) for r in rows) for s in range(n)] + [0.0]
        moved = max(abs(x - y) for x, y in zip(h, h2))
        grew = max(abs(x - y) for x, y in zip(e, e2))
        h, e = h2, e2
        if moved < 1e-15 and (grew < 1e-13 or grew > 0.5):
            break
    policy = {row["distance"]: row for row in j["policy"]}
    for s in range(n):
        row = policy[n - s]
        check(abs(row["p_finish"] - h[s]) < 1e-9, f"{name}: P(finish) at {n - s}")
        if row["expected_rounds"] is not None:
            check(abs(row["expected_rounds"] - e[s]) < 1e-7 * e[s], f"{name}: rounds at {n - s}: {row['expected_rounds']} vs {e[s]}")
        else:
            check(h[s] < 1 - 1e-12 or any(h[d] < 1 - 1e-12 for r in rows for d in r[s]), f"{name}: rounds null at {n - s}")
    # Exactly: the binary's surest policy evaluated here (backward, each
    # square's self-loop solved), and no option doing better anywhere.
    names = list(menu)
    hx = [Fraction(0)] * n + [Fraction(1)]
    for s in range(n - 1, -1, -1):
        r = rows[names.index(policy[n - s]["surest"])][s]
        stay = r.get(s, Fraction(0))
        hx[s] = sum(p * hx[d] for d, p in r.items() if d != s) / (1 - stay) if stay != 1 else Fraction(0)
    check(hx[0] == frac(j["exact"]["p_finish"]), f"{name}: exact P(finish)")
    for s in range(n):
        for r in rows:
            check(sum(p * hx[d] for d, p in r[s].items()) <= hx[s], f"{name}: an option beats the surest policy at {n - s}")


# ---------------------------------------------------------------- boards with loops

def policy_iteration(d):
    """A alone chooses (B has one option): Howard's policy iteration (Howard,
    1960, Dynamic Programming and Markov Processes, MIT Press) over Fractions.
    From option 0 everywhere, each policy is evaluated exactly (solve_exact)
    and a state switches option only where another does strictly better, until
    none does. On the boards used here every policy ends the race for sure or
    pays 0 in a loop that no option can leave better, the values rise at each
    switch and the policies are finitely many, so it ends at a policy meeting
    the optimality equations, whose solution is unique when every policy ends
    the race (Puterman, 1994, Markov Decision Processes, section 7.2.5, from
    memory): the exact optimum."""
    choice = {s: ((0, 0) if s[0] == "r" else 0) for s in d.states}
    while True:
        v = solve_exact(d, choice)
        changed = False
        for s in d.states:
            if not d.maximiser(s):
                continue
            q = [d.q(s, v, i, 0) if s[0] == "r" else d.q(s, v, i) for i in range(len(d.A))]
            cur = choice[s][0] if s[0] == "r" else choice[s]
            best = max(range(len(q)), key=lambda i: (q[i], -i))
            if q[best] > q[cur]:
                choice[s] = (best, 0) if s[0] == "r" else best
                changed = True
        if not changed:
            return v


def loop_against_case(binary, n, rule, jumps, menu, against, order):
    """Against a fixed option on a board with loops: the exact optimum by
    policy iteration must lie in the binary's proven interval, every state
    value agree within 1e-12, every choice be exactly optimal, and the found
    policy's outcomes (exactly evaluated) be within the error bound."""
    args = ["--length", str(n), "--overshoot", rule, "--order", order, "--menu", ",".join(menu), "--state-values",
            "--against", against]
    for f, t in jumps:
        args += ["--jump", f"{f}:{t}"]
    j = run(binary, args)
    if j is None:
        return
    name = f"loops {menu} vs {against} n={n} {rule} {jumps} {order}"
    d = Duel(n, rule, jumps, menu, [against], order, "win")
    best = policy_iteration(d)
    lo, hi = Fraction(j["value"]["low"]), Fraction(j["value"]["high"])
    check(lo <= start_value(d, best) <= hi, f"{name}: optimum {float(start_value(d, best))} outside [{lo}, {hi}]")
    check(j["method"] == "iteration", f"{name}: method {j['method']}")
    pol = j["policy"]
    resting = set(range(n)) - {f for f, _ in jumps}
    choice = {}
    for s in d.states:
        kind, a, b = s
        on = a in resting and b in resting
        key = "values" if kind in "ra" else "values_b"
        if on:
            got = pol[key][n - a - 1][n - b - 1]
            check(abs(got - best[s]) < 1e-12, f"{name}: value at {s}: {got} vs {float(best[s])}")
        if kind == "b":
            choice[s] = 0
            continue
        i = pol["a"][n - a - 1][n - b - 1] if on else 0
        choice[s] = (i, 0) if kind == "r" else i
        if on:
            q = [d.q(s, best, k, 0) if kind == "r" else d.q(s, best, k) for k in range(len(d.A))]
            check(q[i] == max(q), f"{name}: choice {i} at {s} is not optimal ({[float(x) for x in q]})")
    ev = solve_exact(d, choice)
    check(abs(float(start_value(d, ev)) - j["p_a_wins"]) <= j["error_bound"] + 1e-16,
          f"{name}: P(A wins) {j['p_a_wins']} vs exact {float(start_value(d, ev))} (bound {j['error_bound']})")


def alone_loop_case(binary, n, rule, jumps, menu):
    """Alone on a board with loops: the fewest expected rounds by policy
    iteration over Fractions (Howard, 1960; a stochastic shortest path whose
    option 0 finishes for sure, the start policy: Bertsekas and Tsitsiklis,
    1991, Mathematics of Operations Research 16:580-595, from memory), against
    the binary's expected rounds within its relative bound and its fastest
    choices, exactly optimal; each fixed option evaluated exactly too."""
    args = ["--length", str(n), "--overshoot", rule, "--menu", ",".join(menu)]
    for f, t in jumps:
        args += ["--jump", f"{f}:{t}"]
    j = run(binary, args)
    if j is None:
        return
    name = f"alone loops {menu} n={n} {rule} {jumps}"
    rows = [moves(spec, n, rule, jumps) for spec in menu]

    def rounds(policy, live=None):
        """Expected rounds of a policy that finishes for sure from the squares
        `live` (closed under its moves; default all), exactly."""
        live = sorted(range(n) if live is None else live)
        at = {s: k for k, s in enumerate(live)}
        eq = []
        for s in live:
            row = {at[s]: Fraction(1), len(live): Fraction(1)}
            for dst, p in rows[policy[s]][s].items():
                if dst != n:
                    row[at[dst]] = row.get(at[dst], 0) - p
            eq.append(row)
        x = gauss_jordan(eq, len(live))
        e = [None] * n + [Fraction(0)]
        for s in live:
            e[s] = x[at[s]].get(0, Fraction(0))
        return e

    def q(e, i, s):
        r = rows[i][s]
        if r.get(s, 0) == 1:
            return None  # never leaves: never finishes
        return 1 + sum(p * e[dst] for dst, p in r.items())

    policy = [0] * n  # option 0 finishes surely from every square
    while True:
        e = rounds(policy)
        changed = False
        for s in range(n):
            cand = [(q(e, i, s), i) for i in range(len(menu)) if q(e, i, s) is not None]
            value, i = min(cand, key=lambda c: (c[0], c[1]))
            if value < q(e, policy[s], s):
                policy[s] = i
                changed = True
        if not changed:
            break
    check(j["method"] == "iteration", f"{name}: method {j['method']}")
    rel = j["relative_error_bound"]
    by = {row["distance"]: row for row in j["policy"]}
    for s in range(n):
        if s in dict(jumps):
            continue
        row = by[n - s]
        check(abs(row["p_finish"] - 1) <= j["error_bound"], f"{name}: P(finish) at {n - s}")
        check(abs(row["expected_rounds"] - float(e[s])) <= (rel + 1e-15) * float(e[s]),
              f"{name}: rounds at {n - s}: {row['expected_rounds']} vs {float(e[s])}")
        qs = {menu[i]: q(e, i, s) for i in range(len(menu)) if q(e, i, s) is not None}
        check(qs.get(row["fastest"]) == min(qs.values()), f"{name}: fastest {row['fastest']} at {n - s}: {qs}")
    def finishes_surely(i):
        """Every square reachable from the start reaches the finish under
        option i: a finite chain then finishes with probability 1."""
        reach = {n}
        grew = True
        while grew:
            grew = False
            for s in range(n):
                if s not in reach and any(dst in reach for dst in rows[i][s]):
                    reach.add(s)
                    grew = True
        seen, todo = {0}, [0]
        while todo:
            for dst in rows[i][todo.pop()]:
                if dst != n and dst not in seen:
                    seen.add(dst)
                    todo.append(dst)
        return seen if seen <= reach else None

    for f in j["fixed"]:
        i = menu.index(f["option"])
        live = finishes_surely(i)
        if live is None:
            check(f["expected_rounds"] is None, f"{name}: always {f['option']} should have no finite mean")
        else:
            ex = rounds([i] * n, live)[0]
            check(abs(f["expected_rounds"] - float(ex)) <= (rel + 1e-15) * float(ex),
                  f"{name}: always {f['option']}: {f['expected_rounds']} vs {float(ex)}")


def main():
    binary = sys.argv[1]
    # Tiny boards: exact, every order, the fixed opponent and the game.
    for order in ["simultaneous", "a-first", "b-first", "coin"]:
        duel_case(binary, 4, "stay", [], ["1d2", "[0,2]", "1d3"], ["1d2"], order, True)
        duel_case(binary, 5, "pass", [(2, 4)], ["1d2", "2d2"], ["1d3"], order, True)
        duel_case(binary, 5, "stay", [], ["1d3"], ["1d2", "[1,1,3]"], order, True)
        if order != "simultaneous":
            duel_case(binary, 4, "stay", [], ["1d2", "[0,2]", "1d3"], ["1d2", "[0,2]"], order, True)
    # Small boards: floats.
    duel_case(binary, 8, "stay", [], ["1d4", "2d2", "2d3"], ["1d3"], "simultaneous", False)
    duel_case(binary, 8, "stay", [(3, 6)], ["1d3", "2d3"], ["1d4", "2d2"], "a-first", False)
    duel_case(binary, 7, "stay", [], ["1d6", "2d6"], ["1d6", "2d6"], "coin", False)
    for rule in ["stay", "pass"]:
        alone_case(binary, 9, rule, ["1d3", "2d3", "[0,2]"])
        alone_case(binary, 14, rule, ["1d6", "2d6"])
    # Boards where pieces move backward (the rule bounce, backward jumps):
    # exact optima by policy iteration, the binary's choices evaluated exactly.
    for order in ["simultaneous", "a-first", "b-first", "coin"]:
        loop_against_case(binary, 5, "bounce", [], ["1d2", "[0,2]", "1d3"], "1d2", order)
        loop_against_case(binary, 6, "stay", [(4, 1)], ["1d2", "2d2"], "1d3", order)
        loop_against_case(binary, 6, "bounce", [(2, 4), (5, 1)], ["1d3", "2d2"], "[1,1,3]", order)
        duel_case(binary, 5, "bounce", [], ["1d3"], ["1d2", "[1,1,3]"], order, False, loops=True)
        if order != "simultaneous":
            duel_case(binary, 5, "bounce", [], ["1d2", "1d3"], ["1d2", "[1,1,3]"], order, False, loops=True)
            duel_case(binary, 6, "stay", [(4, 1)], ["1d2", "2d2"], ["1d3", "2d2"], order, False, loops=True)
    duel_case(binary, 8, "bounce", [], ["1d4", "2d2", "2d3"], ["1d3"], "simultaneous", False)
    alone_loop_case(binary, 7, "bounce", [], ["1d3", "2d3", "[0,2]"])
    alone_loop_case(binary, 9, "stay", [(7, 2)], ["1d3", "2d3"])
    alone_loop_case(binary, 12, "bounce", [(5, 9), (10, 3)], ["1d6", "2d6"])
    finish(FAIL, "policies agree with value iteration (floats), exact evaluation and policy iteration (fractions)")


def finish(failures, success):
    """Prints the failures and exits 1, or prints `success`."""
    if failures:
        print(f"{len(failures)} failure(s):")
        for f in failures[:40]:
            print("  " + f)
        sys.exit(1)
    print(success)


if __name__ == "__main__":
    main()
