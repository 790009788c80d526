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

A duel that carries a residual certificate (general boards beyond exact
elimination; docs/certificate.md, "Residual duels") is verified instead in
integers: the live states reachable from the start by graph search, the
bound h >= 1 + Q h on the remaining rounds, and the exact residuals, which
prove |x - x~| <= max|rho| h; every recorded interval must contain the proven
one and the verdicts must follow from the proven margins. This is fast (about
half a second per 10,000 states), so such duels are always re-derived. Exact
fractions such a duel carries (p-adic lifting) must lie in the proven
intervals; --force also re-derives them by elimination (slow).

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


class Wrong(Exception):
    """A number or the claim is wrong (exit 1)."""


def rows(length, rule, jumps, moves):
    """For each square s < length, {destination: probability}; `length` is the finish."""
    total = sum(w for _, w in moves)
    return [{d: Fraction(w, total) for d, w in r.items()} for r in weight_rows(length, rule, jumps, moves)]


def weight_rows(length, rule, jumps, moves):
    """For each square s < length, {destination: integer weight}; `length` is the finish."""
    jump = {f: t for f, t in jumps}

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
            r[d] = r.get(d, 0) + w
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


def outcome(first, fa, fb):
    """One round in which A finishes (fa) and B finishes (fb): 0 A wins, 1 B wins, 2 tie, 3 goes on.
    With an alternating order the first mover's finish ends the round before the other moves."""
    if first == "both":
        return 2 if fa and fb else 0 if fa else 1 if fb else 3
    if first == "a":
        return 0 if fa else 1 if fb else 3
    return 1 if fb else 0 if fa else 3


def can_finish(n, rw):
    ok = [False] * n + [True]
    grown = True
    while grown:
        grown = False
        for s in range(n):
            if not ok[s] and any(ok[d] for d in rw[s]):
                ok[s] = grown = True
    return ok


def scaled(text, digits, where):
    """The integer text * 10^digits of a decimal with exactly `digits` places."""
    whole, dot, frac = text.partition(".")
    if not (whole.isdigit() and len(frac) == digits and (frac.isdigit() or digits == 0) and (dot or digits == 0)):
        raise Malformed(f"{where}: '{text[:40]}' is not a decimal with exactly {digits} places")
    return int(whole + frac)


def residual_part(n, wa, wb, da_total, db_total, part, rounds_digits, where):
    """Verifies one product chain of a residual certificate exactly; returns (centres, radii) at the start
    for p_a_wins, p_b_wins, p_tie, p_neither, margin, or raises Wrong."""
    first, digits = part["first"], part["digits"]
    ties = first == "both"
    states = [tuple(s) for s in part["states"]]
    m = len(states)
    vec = {k: [scaled(v, digits, f"{where}: {k}") for v in part[k]] for k in ("p_a_wins", "p_b_wins")}
    vec["p_tie"] = [scaled(v, digits, f"{where}: p_tie") for v in part["p_tie"]] if ties else [0] * m
    vec["rounds"] = [scaled(v, rounds_digits, f"{where}: rounds") for v in part["rounds"]]
    if any(len(v) != m for v in vec.values()):
        raise Wrong(f"{where}: a list of values does not have one value per state")
    fa, fb = can_finish(n, wa), can_finish(n, wb)

    def live(a, b):
        return fa[a] or fb[b]

    # The live states reachable from the start, by graph search.
    seen = {(0, 0)} if live(0, 0) else set()
    todo = list(seen)
    while todo:
        a, b = todo.pop()
        for da in wa[a]:
            for db in wb[b]:
                if outcome(first, da == n, db == n) == 3 and live(da, db) and (da, db) not in seen:
                    seen.add((da, db))
                    todo.append((da, db))
    if states != sorted(seen):
        extra = sorted(set(states) - seen)
        missing = sorted(seen - set(states))
        raise Wrong(f"{where}: the states are not the live states reachable from the start, in increasing order"
                    f" (listed but not such: {extra[:3]}; missing: {missing[:3]})")
    if m == 0:
        return [Fraction(0), Fraction(0), Fraction(0), Fraction(1), Fraction(0)], [Fraction(0)] * 5
    index = {s: i for i, s in enumerate(states)}
    full, scale, hscale = da_total * db_total, 10 ** digits, 10 ** rounds_digits
    xa, xb, xt, h = vec["p_a_wins"], vec["p_b_wins"], vec["p_tie"], vec["rounds"]
    worst = [0] * 5
    for i, (a, b) in enumerate(states):
        ra, rb, rt, rh = full * xa[i], full * xb[i], full * xt[i], full * h[i]
        for da, pa in wa[a].items():
            for db, pb in wb[b].items():
                w = pa * pb
                o = outcome(first, da == n, db == n)
                if o == 0:
                    ra -= scale * w
                elif o == 1:
                    rb -= scale * w
                elif o == 2:
                    rt -= scale * w
                elif live(da, db):
                    j = index[(da, db)]
                    ra -= w * xa[j]
                    rb -= w * xb[j]
                    rt -= w * xt[j]
                    rh -= w * h[j]
        if rh < full * hscale:
            raise Wrong(f"{where}: rounds: h >= 1 + Q h fails at state ({a}, {b})")
        for c, r in enumerate((ra, rb, rt, ra + rb + rt, ra - rb)):
            worst[c] = max(worst[c], abs(r))
    ca, cb, ct = Fraction(xa[0], scale), Fraction(xb[0], scale), Fraction(xt[0], scale)
    centres = [ca, cb, ct, 1 - ca - cb - ct, ca - cb]
    radii = [Fraction(r * h[0], full * scale * hscale) for r in worst]
    return centres, radii


def decimal6(q):
    """q rounded to 6 places, ties away from zero, as overshoot writes it."""
    units = (abs(q) * 10 ** 6 * 2 + 1) // 2
    sign = "-" if q < 0 and units != 0 else ""
    return f"{sign}{units // 10 ** 6}.{units % 10 ** 6:06d}"


def residual_duel(n, rule, jumps, ma, mb, order, d, where):
    """Verifies a duel's residual certificate; returns its verdict, or raises Wrong."""
    res = d["residual"]
    firsts = {"simultaneous": ["both"], "a-first": ["a"], "b-first": ["b"], "coin": ["a", "b"]}[order]
    parts = res["parts"]
    if [p["first"] for p in parts] != firsts:
        raise Wrong(f"{where}: the parts do not fit the turn order {order}")
    wa, wb = weight_rows(n, rule, jumps, ma), weight_rows(n, rule, jumps, mb)
    ta, tb = sum(w for _, w in ma), sum(w for _, w in mb)
    centres, radii = [Fraction(0)] * 5, [Fraction(0)] * 5
    for k, p in enumerate(parts):
        c, r = residual_part(n, wa, wb, ta, tb, p, res["rounds_digits"], f"{where}: part {k + 1}")
        centres = [x + y / len(parts) for x, y in zip(centres, c)]
        radii = [x + y / len(parts) for x, y in zip(radii, r)]
    names = ("p_a_wins", "p_b_wins", "p_tie", "p_neither", "margin")
    # Exact fractions (from p-adic lifting) may come along: they must lie in the proven intervals and
    # agree with each other; their exactness is confirmed by `overshoot check` modulo primes.
    exact = {k: fraction(d[k]["exact"], f"{where}: {k}") for k in names} if d.get("exact_method") else None
    for i, k in enumerate(names):
        lo, hi = centres[i] - radii[i], centres[i] + radii[i]
        if exact is not None and not lo <= exact[k] <= hi:
            raise Wrong(f"{where}: {k}: the fraction lies outside the proven interval")
        if k != "margin":
            lo, hi = max(lo, Fraction(0)), min(hi, Fraction(1))
        rlo, rhi = d[k]["interval"]
        if Fraction(rlo) > lo or Fraction(rhi) < hi:
            raise Wrong(f"{where}: {k}: the recorded interval does not contain the proven one "
                        f"[{float(lo)!r}, {float(hi)!r}]")
        if d[k]["decimal"] != decimal6(exact[k] if exact is not None else centres[i]):
            raise Wrong(f"{where}: {k}: the decimal {d[k]['decimal']} is not the value rounded to 6 places")
    if exact is not None and (sum(exact[k] for k in names[:4]) != 1 or exact["margin"] != exact["p_a_wins"] - exact["p_b_wins"]):
        raise Wrong(f"{where}: the fractions do not add up (outcomes to 1, margin to their difference)")
    lo, hi = centres[4] - radii[4], centres[4] + radii[4]
    v = "a beats b" if lo > 0 else "b beats a" if hi < 0 else "undecided"
    if exact is not None and v == "undecided":
        v = None  # only the exact margin decides: not re-derived here
    elif d["verdict"] != v:
        raise Wrong(f"{where}: verdict '{d['verdict']}' but the proven margin says '{v}'")
    return v, float(2 * radii[4])


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
            if d.get("residual") is not None:
                t0 = time.perf_counter()
                v, width = residual_duel(n, rule, jumps, options[a], options[b], order, d, where)
                if v is None:
                    print(f"skipped  {where}: the proven margin interval (width {width:.3g}) does not decide; only the "
                          f"exact fractions do, and they are not re-derived here")
                    skipped.append(where)
                    continue
                verdicts[(a, b, n)] = v
                if d.get("exact_method") and force:  # the lifted fractions, re-derived by elimination
                    ref = duel(n, rule, jumps, options[a], options[b], order)
                    for k, x in ref.items():
                        if fraction(d[k]["exact"], f"{where}: {k}") != x:
                            raise Wrong(f"{where}: {k} is wrong (fractions give {str(x)[:50]}...)")
                    print(f"checked  {where}: 5 fractions re-derived with fractions.Fraction (--force)")
                print(f"checked  {where}: residual certificate verified with integers and fractions.Fraction "
                      f"(margin {d['margin']['decimal']}, proven width {width:.3g}; {time.perf_counter() - t0:.2f} s)"
                      + ("; its exact fractions lie in the proven intervals (--force re-derives them)"
                         if d.get("exact_method") and not force else ""))
                continue
            if d.get("exact_method") is None:
                print(f"skipped  {where}: no exact fractions (proven interval only)")
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
                print(f"skipped  {where}: {n * n} pairs of squares exceed --max-cells {max_cells}; "
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
                print(f"checked  {where}: 5 fractions re-derived with fractions.Fraction "
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
    except Wrong as e:
        print(f"referee: {path}: {e}", file=sys.stderr)
        return 1
    except (KeyError, TypeError, ValueError, Malformed) as e:
        print(f"referee: {path}: unreadable: {e}", file=sys.stderr)
        return 2
    if skipped:
        print(f"nothing wrong found, but {len(skipped)} duel(s) were not re-derived (see above)")
        return 3
    print(f"certificate holds: {claim['statement']}")
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
