#!/usr/bin/python3
"""Duels of `overshoot duel --json` against exact fractions computed here.

Reference: Python's standard library `fractions.Fraction` (exact rational
arithmetic) and nothing else. The duel is written from the rules in
DESIGN.md ("Semantics, exactly"), sharing no code with the C++ engine:

  * one round from the pair of squares (a, b): simultaneous, both pieces
    move; A alone finishing is a win, B alone a loss, both a tie. With A
    moving first, A finishing wins at once, otherwise B moves and B
    finishing is a loss. `b-first` is `a-first` with the seats swapped,
    `coin` the mean of the two alternating orders.
  * boards where pieces never move back (no backward jump, rule stay or
    pass): dynamic programming over pairs of squares from the finish
    backwards, the self-loop of each pair solved in closed form.
  * other boards (bounce, backward jumps): Gauss-Jordan elimination of the
    same one-round equations over Fractions.
On forward-only boards both ways are run and must agree exactly; the
binary's doubles must then agree within 1e-12.

Head starts (`--head-start NAME:SQUARE`): the same equations read at the pair
of start squares instead of (0, 0) (a start on a jump source takes the jump);
for those cases the binary's `--exact` fractions must equal these exactly.

Usage: check_duel_fractions.py BINARY SOURCE_DIR
"""
import json
import os
import subprocess
import sys
from fractions import Fraction

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
from script_support import gauss_jordan  # noqa: E402

TOLERANCE = 1e-12


# ---------------------------------------------------------------- options

def fair(faces):
    """A fair die with the listed faces: {move: weight}."""
    w = {}
    for f in faces:
        w[f] = w.get(f, 0) + 1
    return w


def add(x, y):
    """Distribution of the sum of two independent moves."""
    w = {}
    for m, a in x.items():
        for n, b in y.items():
            w[m + n] = w.get(m + n, 0) + a * b
    return w


def to_prob(w):
    total = sum(w.values())
    return {m: Fraction(c, total) for m, c in w.items()}


# Each spec of the binary's grammar with its distribution written out by hand.
OPTIONS = {
    "1d3": fair([1, 2, 3]),
    "2d2": add(fair([1, 2]), fair([1, 2])),
    "1d4": fair([1, 2, 3, 4]),
    "2d3": add(fair([1, 2, 3]), fair([1, 2, 3])),
    "[0,1,3]": fair([0, 1, 3]),
    "[2,2,5]": fair([2, 2, 5]),
    "{1:2,2:1}": {1: 2, 2: 1},
    "{0:1,3:4}": {0: 1, 3: 4},
    "1d2+[0,2]": add(fair([1, 2]), fair([0, 2])),
    # A heavy tail: at distance 4 only 1+1+1+1 finishes, one roll in 8^4 = 4096.
    "4d8": add(add(fair(range(1, 9)), fair(range(1, 9))), add(fair(range(1, 9)), fair(range(1, 9)))),
}


# ---------------------------------------------------------------- one piece

def one_turn(length, rule, jumps, prob):
    """rows[s] = {destination: probability} for s < length; length = finished."""
    jump = dict(jumps)

    def follow(t):
        hops = 0
        while t in jump:
            t = jump[t]
            hops += 1
            assert hops <= len(jump), "jump loop"
        return t

    rows = []
    for s in range(length):
        r = {}
        for m, p in prob.items():
            t = s + m
            if t < length:
                d = follow(t)
            elif t == length:
                d = length
            elif rule == "stay":
                d = s
            elif rule == "pass":
                d = length
            else:  # bounce: walk the excess back; an excess beyond N stops on 0
                excess = t - length
                d = follow(0) if excess > length else follow(length - excess)
            r[d] = r.get(d, 0) + p
        rows.append(r)
    return rows


def can_finish(rows, length):
    """Squares from which the finish is reachable (reverse search)."""
    back = {d: set() for d in range(length + 1)}
    for s, r in enumerate(rows):
        for d in r:
            back[d].add(s)
    seen, todo = {length}, [length]
    while todo:
        d = todo.pop()
        for s in back[d]:
            if s not in seen:
                seen.add(s)
                todo.append(s)
    return seen


# ---------------------------------------------------------------- one round

def round_terms(ra, rb, a, b, n, a_first):
    """(constant outcome vector, {(a', b'): probability}) of one round from (a, b).

    Outcome vectors are (win, loss, tie) for A."""
    const = [Fraction(0)] * 3
    moves = {}
    for da, pa in ra[a].items():
        if a_first and da == n:
            const[0] += pa  # A lands first and wins before B moves
            continue
        for db, pb in rb[b].items():
            p = pa * pb
            if da == n and db == n:
                const[2] += p
            elif da == n:
                const[0] += p
            elif db == n:
                const[1] += p
            else:
                moves[(da, db)] = moves.get((da, db), 0) + p
    return const, moves


def solve_dp(ra, rb, n, a_first, start=(0, 0)):
    """Forward-only boards: pairs from the finish backwards."""
    x = {}
    for a in range(n - 1, -1, -1):
        for b in range(n - 1, -1, -1):
            const, moves = round_terms(ra, rb, a, b, n, a_first)
            self_loop = moves.pop((a, b), Fraction(0))
            value = list(const)
            for (da, db), p in moves.items():
                assert da >= a and db >= b, "not a forward-only board"
                for k in range(3):
                    value[k] += p * x[(da, db)][k]
            if self_loop == 1:
                x[(a, b)] = [Fraction(0)] * 3  # both pieces stay for ever
            else:
                x[(a, b)] = [v / (1 - self_loop) for v in value]
    return x[start]


def solve_elimination(ra, rb, n, a_first, start=(0, 0)):
    """Any board: Gauss-Jordan over Fractions on pairs where a finish is possible."""
    fa, fb = can_finish(ra, n), can_finish(rb, n)
    states = [(a, b) for a in range(n) for b in range(n) if a in fa or b in fb]
    if start not in states:
        return [Fraction(0)] * 3
    index = {s: i for i, s in enumerate(states)}
    size = len(states)
    # Sparse rows of [I - P | c]: columns 0..size-1 the unknowns, size..size+2
    # the three outcomes (win, loss, tie) solved at once.
    m = []
    for (a, b) in states:
        const, moves = round_terms(ra, rb, a, b, n, a_first)
        row = {size + k: v for k, v in enumerate(const) if v != 0}
        row[index[(a, b)]] = row.get(index[(a, b)], 0) + 1
        for s, p in moves.items():
            if s in index:  # pairs where both are stuck are worth 0
                row[index[s]] = row.get(index[s], 0) - p
        m.append({k: v for k, v in row.items() if v != 0})
    x = gauss_jordan(m, size)
    return [x[index[start]].get(k, Fraction(0)) for k in range(3)]


def rest_square(square, jumps):
    """Where a piece placed on `square` rests: a jump source takes the jump."""
    jump = dict(jumps)
    while square in jump:
        square = jump[square]
    return square


def exact_duel(n, rule, jumps, spec_a, spec_b, order, cross_check=True, starts=(0, 0)):
    """(P(A wins), P(B wins), P(tie), P(neither)) as Fractions."""
    ra = one_turn(n, rule, jumps, to_prob(OPTIONS[spec_a]))
    rb = one_turn(n, rule, jumps, to_prob(OPTIONS[spec_b]))
    forward = rule != "bounce" and all(t > f for f, t in jumps)
    sa, sb = rest_square(starts[0], jumps), rest_square(starts[1], jumps)

    def seated(x, y, a_first, start):
        if forward and not cross_check:
            return solve_dp(x, y, n, a_first, start)
        if forward:
            dp = solve_dp(x, y, n, a_first, start)
            el = solve_elimination(x, y, n, a_first, start)
            assert dp == el, f"reference methods disagree: {dp} vs {el}"
            return dp
        return solve_elimination(x, y, n, a_first, start)

    if order == "simultaneous":
        w, l, t = seated(ra, rb, False, (sa, sb))
    elif order == "a-first":
        w, l, t = seated(ra, rb, True, (sa, sb))
    elif order == "b-first":
        l, w, t = seated(rb, ra, True, (sb, sa))
    else:  # coin
        w1, l1, _ = seated(ra, rb, True, (sa, sb))
        l2, w2, _ = seated(rb, ra, True, (sb, sa))
        w, l, t = (w1 + w2) / 2, (l1 + l2) / 2, Fraction(0)
    return w, l, t, 1 - w - l - t


# ---------------------------------------------------------------- the check

BOARDS = [
    # (length, jumps, option A, option B), jumps forward and backward
    (5, [], "1d3", "2d2"),
    (6, [(2, 4)], "1d4", "[0,1,3]"),
    (7, [(5, 1)], "{1:2,2:1}", "2d3"),
    (8, [(3, 6), (6, 2)], "[2,2,5]", "1d3"),
    (6, [(4, 6)], "{0:1,3:4}", "1d2+[0,2]"),
    (9, [(1, 7), (8, 3)], "2d2", "[0,1,3]"),
    (4, [], "2d3", "1d3"),
    (7, [(2, 5), (5, 0)], "1d2+[0,2]", "1d4"),
    (8, [], "[2,2,5]", "{1:2,2:1}"),
    (8, [(2, 3)], "[2,2,5]", "2d2"),  # both can be stuck one short of the finish
]
# Head starts: (length, jumps, option A, option B, start A, start B); every rule and order.
HEAD_STARTS = [
    (7, [], "1d3", "2d2", 2, 0),
    (8, [(3, 6)], "1d4", "[0,1,3]", 0, 3),  # B's start is a jump source: it rests on 6
    (9, [(6, 1)], "2d2", "{1:2,2:1}", 4, 2),
    (8, [(2, 5), (6, 0)], "[2,2,5]", "1d3", 5, 1),
]
RULES = ["stay", "bounce", "pass"]
ORDERS = ["simultaneous", "a-first", "b-first", "coin"]
# Heavy-tailed cases, too large for elimination over Fractions: DP only.
HEAVY = [
    (24, [], "4d8", "1d4", "stay", ["simultaneous", "a-first"]),
    (24, [(5, 13)], "1d4", "4d8", "stay", ["b-first"]),
]


def spelled(spec):
    """The spec as passed on the command line. CLI11 2.1 splits a positional
    of the form "[...]" into a list (tests/test_cli.cpp has the [!mayfail]
    test of that bug), so such a die is passed as the same die plus 0."""
    return spec + "+0" if spec.startswith("[") and spec.endswith("]") else spec


def main():
    binary = sys.argv[1]
    failures, checked, nonzero_neither = [], 0, 0
    cases = [(n, jumps, a, b, rule, order, True, (0, 0)) for n, jumps, a, b in BOARDS for rule in RULES for order in ORDERS]
    cases += [(n, jumps, a, b, rule, order, False, (0, 0)) for n, jumps, a, b, rule, orders in HEAVY for order in orders]
    cases += [(n, jumps, a, b, rule, order, True, (ha, hb))
              for n, jumps, a, b, ha, hb in HEAD_STARTS for rule in RULES for order in ORDERS]
    exact_checked = 0
    for n, jumps, a, b, rule, order, cross_check, starts in cases:
        args = [binary, "duel", spelled(a), spelled(b), "--length", str(n), "--overshoot", rule, "--order", order, "--json"]
        for f, t in jumps:
            args += ["--jump", f"{f}:{t}"]
        for spec, square in zip((a, b), starts):
            if square:
                args += ["--head-start", f"{spelled(spec)}:{square}"]
        if any(starts):
            args.append("--exact")
        run = subprocess.run(args, capture_output=True, text=True)
        where = " ".join(args[1:])
        if run.returncode != 0:
            failures.append(f"{where}: exit {run.returncode}: {run.stderr.strip()}")
            continue
        got = json.loads(run.stdout)
        want = exact_duel(n, rule, jumps, a, b, order, cross_check, starts)
        if "exact" in got:
            exact_checked += 1
            for key, value in zip(["p_a_wins", "p_b_wins", "p_tie", "p_neither"], want):
                if Fraction(got["exact"][key]) != value:
                    failures.append(f"{where}: exact {key} = {got['exact'][key]}, the reference {value}")
        if want[3] > 0:
            nonzero_neither += 1
        for key, value in zip(["p_a_wins", "p_b_wins", "p_tie", "p_neither"], want):
            checked += 1
            if abs(got[key] - float(value)) > TOLERANCE:
                failures.append(f"{where}: {key} = {got[key]!r}, exact {value} = {float(value)!r}")
            # A proven bound must hold: the error, measured exactly, may exceed
            # the stated bound only by the rounding to a double (2^-53 relative).
            error = abs(Fraction(got[key]) - value)
            allowed = Fraction(got["probability_error_bound"]) + Fraction(got[key]) * Fraction(1, 2**53)
            if got.get("bound_proven", False) and error > allowed:
                failures.append(f"{where}: {key} is off by {float(error):.3g}, above its proven bound "
                                f"{got['probability_error_bound']:.3g}")
        if abs(got["margin"] - float(want[0] - want[1])) > TOLERANCE:
            failures.append(f"{where}: margin {got['margin']!r} vs {float(want[0] - want[1])!r}")
        if got["error_bound"] > TOLERANCE:
            failures.append(f"{where}: error_bound {got['error_bound']} above {TOLERANCE}")
    # The boards must exercise pieces that can get stuck, or the check is weak.
    if nonzero_neither == 0:
        failures.append("no case with P(neither) > 0: the boards do not exercise stuck pieces")
    if exact_checked != len(HEAD_STARTS) * len(RULES) * len(ORDERS):
        failures.append(f"only {exact_checked} head-start duels gave exact fractions")
    for f in failures:
        print("FAIL", f)
    print(f"{checked} probabilities checked against exact fractions ({exact_checked} head-start duels exactly), "
          f"{len(failures)} failures")
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
