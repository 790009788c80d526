#!/usr/bin/env python3
"""A referee's checker for overshoot certificates, in Python's standard library only.

    python3 tools/referee.py CERTIFICATE.json [--max-cells N] [--force]

It trusts nothing but the certificate's board, rules and option
distributions (integer weights). From those it rebuilds, for every duel, the
one-round equations of the product chain over pairs of squares,

    x(a,b) = sum over moves (a->a', b->b') of pA * pB * [outcome, or x(a',b')],

and solves them exactly with fractions.Fraction (back substitution when pieces
never move backward, Gauss-Jordan elimination otherwise). It then compares
every fraction of the certificate digit for digit, checks that the four
outcomes add up to 1, that the margin is P(A wins) - P(B wins), that every
verdict follows from the sign of the margin, and that the verdicts make the
claim (cycle, crossover or winner) true.

It shares no code with overshoot. It is slow on purpose (plain fractions,
reduced at every step): a duel with more than --max-cells pairs of squares
(default 20000, about 140 squares) is not solved; instead the referee times
the same duel on a shorter board and says how long the full one would take
(time grows about as length^3.5: length^2 cells, fractions of about length
digits). --force solves it anyway.

Exit status: 0 every number was re-derived and the claim holds; 1 a number or
the claim is wrong (the first failure is named); 2 the file is unreadable; 3
nothing was found wrong but some duels were too large to re-derive.
"""
import json
import sys
import time
from fractions import Fraction


class Malformed(Exception):
    pass


def rows(length, rule, jumps, moves):
    """For each square s < length, {destination: probability}; `length` is the finish."""
    jump = {f: t for f, t in jumps}
    total = sum(w for _, w in moves)

    def follow(t):
        seen = set()
        while t in jump:
            if t in seen:
                raise Malformed("the jumps form a loop")
            seen.add(t)
            t = jump[t]
        return t

    out = []
    for s in range(length):
        r = {}
        for m, w in moves:
            t = s + m
            if t < length:
                d = follow(t)
            elif t == length:
                d = length
            elif rule == "stay":
                d = s
            elif rule == "pass":
                d = length
            else:  # bounce: walk the excess back; past the start, stop on 0
                ex = t - length
                d = follow(0) if ex > length else follow(length - ex)
            r[d] = r.get(d, 0) + Fraction(w, total)
        out.append(r)
    return out


def ends(a_first, da, db, n):
    """(win, loss, tie) when this round ends the race, else None."""
    if da == n and (a_first or db != n):
        return (1, 0, 0)
    if da == n:
        return (0, 0, 1)
    if db == n:
        return (0, 1, 0)
    return None


def solve(n, ra, rb, a_first, forward):
    if forward:
        x = {}
        for a in range(n - 1, -1, -1):
            for b in range(n - 1, -1, -1):
                acc = [Fraction(0)] * 3
                loop = Fraction(0)
                for da, pa in ra[a].items():
                    for db, pb in rb[b].items():
                        o = ends(a_first, da, db, n)
                        if o is not None:
                            for c in range(3):
                                if o[c]:
                                    acc[c] += pa * pb
                        elif (da, db) == (a, b):
                            loop += pa * pb
                        else:
                            v = x.get((da, db))
                            if v is None:  # square never rested on: cannot happen
                                raise Malformed("internal: a forward move went backward")
                            for c in range(3):
                                acc[c] += pa * pb * v[c]
                x[(a, b)] = [v / (1 - loop) if loop != 1 else Fraction(0) for v in acc]
        return x[(0, 0)]
    states = [(a, b) for a in range(n) for b in range(n)]
    index = {s: i for i, s in enumerate(states)}
    m = len(states)
    mat = [[Fraction(0)] * (m + 3) for _ in range(m)]
    for i, (a, b) in enumerate(states):
        mat[i][i] += 1
        for da, pa in ra[a].items():
            for db, pb in rb[b].items():
                o = ends(a_first, da, db, n)
                if o is not None:
                    for c in range(3):
                        mat[i][m + c] += pa * pb * o[c]
                else:
                    mat[i][index[(da, db)]] -= pa * pb
    # Keep the states from which the race can still end; the others are 0.
    live = {i for i in range(m) if any(mat[i][m + c] for c in range(3))}
    grown = True
    while grown:
        grown = False
        for i in range(m):
            if i not in live and any(mat[i][j] != 0 and j in live for j in range(m) if j != i):
                live.add(i)
                grown = True
    if 0 not in live:
        return [Fraction(0)] * 3
    keep = sorted(live)
    red = [[mat[i][j] for j in keep] + mat[i][m:] for i in keep]
    k = len(keep)
    for col in range(k):
        piv = next(r for r in range(col, k) if red[r][col] != 0)
        red[col], red[piv] = red[piv], red[col]
        pv = red[col][col]
        red[col] = [v / pv for v in red[col]]
        for r in range(k):
            if r != col and red[r][col] != 0:
                f = red[r][col]
                red[r] = [vr - f * vc for vr, vc in zip(red[r], red[col])]
    return red[keep.index(0)][k:]


def duel(n, rule, jumps, ma, mb, order):
    forward = rule != "bounce" and all(t > f for f, t in jumps)
    ra, rb = rows(n, rule, jumps, ma), rows(n, rule, jumps, mb)
    if order == "simultaneous":
        w, l, t = solve(n, ra, rb, False, forward)
    elif order == "a-first":
        w, l, t = solve(n, ra, rb, True, forward)
    elif order == "b-first":
        l, w, t = solve(n, rb, ra, True, forward)
    else:  # coin: the mean of the two alternating orders
        x, y = solve(n, ra, rb, True, forward), solve(n, rb, ra, True, forward)
        w, l, t = (x[0] + y[1]) / 2, (x[1] + y[0]) / 2, Fraction(0)
    return {"p_a_wins": w, "p_b_wins": l, "p_tie": t, "p_neither": 1 - w - l - t, "margin": w - l}


def fraction(text, where):
    try:
        num, den = text.split("/")
        return Fraction(int(num), int(den))
    except (ValueError, ZeroDivisionError):
        raise Malformed(f"{where}: '{text[:40]}' is not a fraction num/den")


def needed(claim, length):
    o, kind = claim["options"], claim["kind"]
    if kind == "cycle":
        return [(o[i], o[(i + 1) % len(o)], length, "a beats b") for i in range(len(o))]
    if kind == "winner":
        return [(o[0], x, length, "a beats b") for x in o[1:]]
    if kind == "crossover":
        return [(o[0], o[1], claim["at"] - 1, None), (o[0], o[1], claim["at"], None)]
    raise Malformed(f"claim.kind '{kind}' is unknown")


def main(argv):
    args = [a for a in argv[1:] if not a.startswith("--")]
    force = "--force" in argv
    max_cells = 20000
    for i, a in enumerate(argv):
        if a == "--max-cells" and i + 1 < len(argv):
            max_cells = int(argv[i + 1])
            args = [x for x in args if x != argv[i + 1]]
    if len(args) != 1:
        print(__doc__.strip().splitlines()[2], file=sys.stderr)
        return 2
    path = args[0]
    try:
        with open(path) as f:
            cert = json.load(f)
        if cert.get("schema") != "overshoot.certificate/1":
            raise Malformed("schema is not overshoot.certificate/1")
        board, claim = cert["board"], cert["claim"]
        rule, order, jumps = board["overshoot"], board["order"], [tuple(j) for j in board["jumps"]]
        options = {}
        for o in cert["options"]:
            moves = [tuple(m) for m in o["moves"]]
            if sum(w for _, w in moves) != o["denominator"]:
                raise Malformed(f"option {o['name']}: the weights do not sum to the denominator")
            options[o["name"]] = moves
        duels = {(d["a"], d["b"], d["length"]): d for d in cert["duels"]}
    except (OSError, ValueError, KeyError, TypeError, Malformed) as e:
        print(f"referee: {path}: unreadable: {e}", file=sys.stderr)
        return 2

    skipped = []
    verdicts = {}
    try:
        for (a, b, n), d in duels.items():
            where = f"duel {a} vs {b} on {n} squares"
            if d.get("exact_method") is None:
                print(f"skip {where}: no exact fractions (proven interval only)")
                skipped.append(where)
                continue
            claimed = {k: fraction(d[k]["exact"], f"{where}: {k}") for k in
                       ("p_a_wins", "p_b_wins", "p_tie", "p_neither", "margin")}
            if n * n > max_cells and not force:
                cal = min(n, 24)
                t0 = time.perf_counter()
                duel(cal, rule, [j for j in jumps if max(j) < cal], options[a], options[b], order)
                t = time.perf_counter() - t0
                est = t * (n / cal) ** 3.5
                print(f"skip {where}: {n * n} pairs of squares exceed --max-cells {max_cells}; "
                      f"this duel would take about {est / 3600:.1f} hours here (timed {t:.2f} s on {cal} squares, "
                      f"scaled by length^3.5); --force runs it")
                skipped.append(where)
            else:
                t0 = time.perf_counter()
                ref = duel(n, rule, jumps, options[a], options[b], order)
                for k, v in ref.items():
                    if claimed[k] != v:
                        print(f"referee: {path}: {where}: {k} is wrong (fractions give {str(v)[:50]}...)",
                              file=sys.stderr)
                        return 1
                print(f"ok   {where}: 5 fractions re-derived with fractions.Fraction "
                      f"({time.perf_counter() - t0:.2f} s)")
            if sum(claimed[k] for k in ("p_a_wins", "p_b_wins", "p_tie", "p_neither")) != 1:
                print(f"referee: {path}: {where}: the outcomes do not add up to 1", file=sys.stderr)
                return 1
            if claimed["margin"] != claimed["p_a_wins"] - claimed["p_b_wins"]:
                print(f"referee: {path}: {where}: margin is not P(A wins) - P(B wins)", file=sys.stderr)
                return 1
            m = claimed["margin"]
            v = "a beats b" if m > 0 else "b beats a" if m < 0 else "undecided"
            if d["verdict"] != v:
                print(f"referee: {path}: {where}: verdict '{d['verdict']}' but the margin says '{v}'", file=sys.stderr)
                return 1
            verdicts[(a, b, n)] = v
        need = needed(claim, board["length"])
        for a, b, n, want in need:
            if (a, b, n) not in duels:
                print(f"referee: {path}: the claim needs duel {a} vs {b} on {n} squares, which is missing",
                      file=sys.stderr)
                return 1
            got = verdicts.get((a, b, n))
            if want and got is not None and got != want:
                print(f"referee: {path}: claim: {a} vs {b} on {n} squares is '{got}'", file=sys.stderr)
                return 1
        if claim["kind"] == "crossover":
            x, y = (verdicts.get(k[:3]) for k in need)
            if x is not None and y is not None and (x == y or "undecided" in (x, y)):
                print(f"referee: {path}: claim: the preference does not change", file=sys.stderr)
                return 1
    except (KeyError, TypeError, Malformed) as e:
        print(f"referee: {path}: unreadable: {e}", file=sys.stderr)
        return 2
    if skipped:
        print(f"nothing wrong found, but {len(skipped)} duel(s) were not re-derived (see above)")
        return 3
    print(f"certificate holds: {claim['statement']}")
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
