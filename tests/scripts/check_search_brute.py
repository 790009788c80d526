#!/usr/bin/python3
"""`overshoot search` (one added jump, exhaustive) against a brute force in Python.

Reference: an independent computation written here with the Python standard
library only. For every board with at most one added jump, each option's
finishing-time distribution is stepped turn by turn from square 0 (overshoot
rule and jumps as in docs/guide.md; squares from which the finish cannot be
reached are found by a fixed point and their mass set aside as never
finishing). In simultaneous order P(A wins) = sum_t P(T_A = t) P(T_B > t)
(DESIGN.md, "Semantics"); the margin is P(A wins) - P(B wins). The series
stops once the live mass is below 1e-15, so every margin here is within about
1e-14 of the truth.

Head starts (`--head-starts H --jumps 0`): the same series from each option's
start square (a start on a jump source takes the jump), over every
assignment of a start square 0..H to every option.

Checks:
  * the five best boards and their scores equal the brute force's five best;
  * the reported strength of the best cycle equals `overshoot tournament` on
    the printed board (the same margins, to the last bit: the same engine);
  * the scenario file written for the best board gives the same tournament.

Usage: check_search_brute.py BINARY SOURCE_DIR
"""
import itertools
import json
import shlex
import os
import subprocess
import sys
import tempfile

BINARY = sys.argv[1]
failures = []


def check(cond, what):
    if not cond:
        failures.append(what)


def dist(spec):
    """The few option specs used here: NdS and [faces]."""
    if spec.startswith("["):
        faces = [int(x) for x in spec[1:-1].split(",")]
        d = {}
        for f in faces:
            d[f] = d.get(f, 0) + 1 / len(faces)
        return d
    n, s = spec.split("d")
    d = {0: 1.0}
    for _ in range(int(n)):
        nd = {}
        for a, p in d.items():
            for f in range(1, int(s) + 1):
                nd[a + f] = nd.get(a + f, 0) + p / int(s)
        d = nd
    return d


def step_square(s, m, length, rule, jump):
    t = s + m
    if t > length:
        if rule == "stay":
            t = s
        elif rule == "pass":
            t = length
        else:  # bounce
            t = length - (t - length)
            if t < 0:
                t = 0
    while t in jump:
        t = jump[t]
    return t


def track(d, length, rule, jumps, start=0):
    jump = dict(jumps)
    moves = {s: {} for s in range(length)}
    for s in range(length):
        for m, p in d.items():
            t = step_square(s, m, length, rule, jump)
            moves[s][t] = moves[s].get(t, 0) + p
    can = {length}
    changed = True
    while changed:
        changed = False
        for s in range(length):
            if s not in can and any(t in can for t, p in moves[s].items() if p > 0):
                can.add(s)
                changed = True
    while start in jump:
        start = jump[start]
    alive = {start: 1.0}
    stuck = 0.0
    if start not in can:
        return [], 1.0
    f, surv = [], []
    t = 0
    while sum(alive.values()) > 1e-15 and t < 200000:
        new = {}
        fin = 0.0
        for s, p in alive.items():
            for u, q in moves[s].items():
                if u == length:
                    fin += p * q
                elif u in can:
                    new[u] = new.get(u, 0) + p * q
                else:
                    stuck += p * q
        alive = new
        f.append(fin)
        surv.append(sum(alive.values()) + stuck)
        t += 1
    return f, surv


def wins(ta, tb):
    fa, sa = ta
    fb, sb = tb
    w = 0.0
    for t in range(len(fa)):
        w += fa[t] * (sb[t] if t < len(sb) else (sb[-1] if sb else 1.0))
    return w


def margins(specs, length, rule, jumps, starts=None):
    starts = starts or [0] * len(specs)
    tr = [track(dist(s), length, rule, jumps, h) for s, h in zip(specs, starts)]
    n = len(specs)
    m = [[0.0] * n for _ in range(n)]
    for i in range(n):
        for j in range(n):
            if i != j:
                m[i][j] = wins(tr[i], tr[j]) - wins(tr[j], tr[i])
    return m


def score(target, m, cycle):
    n = len(m)
    if target == "cycle":
        return min(m[cycle[k]][cycle[(k + 1) % len(cycle)]] for k in range(len(cycle)))
    if target == "no-winner":
        return min(max(m[j][i] for j in range(n) if j != i) for i in range(n))
    if target == "fair":
        return -max(abs(m[i][j]) for i in range(n) for j in range(n) if i != j)
    raise ValueError(target)


def loops(length, jumps):
    jump = dict(jumps)
    for s in jump:
        seen, t = set(), s
        while t in jump:
            if t in seen:
                return True
            seen.add(t)
            t = jump[t]
    return False


def run(args):
    p = subprocess.run([BINARY, *args], capture_output=True, text=True)
    if p.returncode != 0:
        raise SystemExit(f"FAIL: overshoot {' '.join(args)}: {p.stderr.strip()}")
    return p.stdout


def case(specs, length, rule, base_jumps, target, cycle_names=None):
    label = f"{specs} length {length} {rule} jumps {base_jumps} target {target}"
    cycle = [specs.index(c) for c in cycle_names] if cycle_names else None
    brute = []
    taken = {f for f, _ in base_jumps}
    boards = [[]] + [[(f, t)] for f in range(1, length) if f not in taken for t in range(length + 1) if t != f]
    for added in boards:
        js = base_jumps + added
        if loops(length, js):
            continue
        brute.append((score(target, margins(specs, length, rule, js), cycle), added))
    # Best first; ties: fewer added jumps, then the jumps in order (the search's rule).
    brute.sort(key=lambda x: (-x[0], len(x[1]), x[1]))
    args = ["search", *specs, "--length", str(length), "--overshoot", rule, "--target", target, "--keep", "5", "--json"]
    for f, t in base_jumps:
        args += ["--jump", f"{f}:{t}"]
    if cycle_names:
        args += ["--cycle", " > ".join(cycle_names + [cycle_names[0]])]
    with tempfile.TemporaryDirectory() as tmp:
        scen = os.path.join(tmp, "best.toml")
        doc = json.loads(run(args))
        run([a for a in args if a != "--json"] + ["--format", "scenario", "-o", scen])
        got = [(b["score"], [tuple(j) for j in b["added_jumps"]]) for b in doc["best"]]
        check(len(got) == 5, f"{label}: {len(got)} boards listed, expected 5")
        for k, (s, added) in enumerate(got):
            check(abs(s - brute[k][0]) < 1e-12, f"{label}: board {k + 1} scores {s}, brute force's {k + 1}th best {brute[k][0]}")
            mine = [b for b in brute if b[1] == added]
            check(mine and abs(mine[0][0] - s) < 1e-12, f"{label}: board {added}: score {s}, brute force {mine}")
        # The printed board, given to `tournament` as flags and as the scenario file.
        best = doc["best"][0]
        flags = shlex.split(best["flags"])
        t1 = json.loads(run(["tournament", *specs, *flags, "--json"]))
        t2 = json.loads(run(["tournament", "--scenario", scen, "--json"]))
        check(t1["wins"] == t2["wins"], f"{label}: the scenario file and the flags race differently")
        w = t1["wins"]
        n = len(specs)
        m = [[w[i][j] - w[j][i] if i != j else 0.0 for j in range(n)] for i in range(n)]
        check(score(target, m, cycle) == best["score"],
              f"{label}: tournament on the printed board scores {score(target, m, cycle)}, the search {best['score']}")
        if target == "cycle" and best["holds"]:
            names = [specs[i] for i in cycle]
            found = [c for c in t1["cycles"] if c["options"] == names]
            check(found and found[0]["strength"] == best["score"],
                  f"{label}: the cycle's strength in tournament {found} differs from {best['score']}")


def head_start_case(specs, length, rule, jumps, target, most, cycle_names=None):
    """Every assignment of start squares 0..most, no added jump."""
    label = f"{specs} length {length} {rule} jumps {jumps} head starts 0..{most} target {target}"
    cycle = [specs.index(c) for c in cycle_names] if cycle_names else None
    jump = dict(jumps)
    brute = []
    for starts in itertools.product(range(most + 1), repeat=len(specs)):
        if any(rest(h, jump) >= length for h in starts):
            continue  # a start whose jump leads to the finish
        changes = sum(1 for h in starts if h)
        brute.append((score(target, margins(specs, length, rule, jumps, list(starts)), cycle), changes, list(starts)))
    # Best first; ties: fewer changes, then the start squares in order (the search's rule).
    brute.sort(key=lambda x: (-x[0], x[1], x[2]))
    args = ["search", *specs, "--length", str(length), "--overshoot", rule, "--target", target, "--keep", "5",
            "--jumps", "0", "--head-starts", str(most), "--json"]
    for f, t in jumps:
        args += ["--jump", f"{f}:{t}"]
    if cycle_names:
        args += ["--cycle", " > ".join(cycle_names + [cycle_names[0]])]
    doc = json.loads(run(args))
    check(doc["exhaustive"] and doc["start_grid"], f"{label}: not searched as a grid")
    got = doc["best"]
    check(len(got) == 5, f"{label}: {len(got)} boards listed, expected 5")
    for k, b in enumerate(got):
        starts = [b["board"].get("head_starts", {}).get(sp, 0) for sp in specs]
        check(abs(b["score"] - brute[k][0]) < 1e-12,
              f"{label}: board {k + 1} scores {b['score']}, brute force's {k + 1}th best {brute[k][0]}")
        mine = [x for x in brute if x[2] == starts]
        check(mine and abs(mine[0][0] - b["score"]) < 1e-12, f"{label}: starts {starts}: score {b['score']}, brute force {mine}")
    best = got[0]
    t1 = json.loads(run(["tournament", *specs, *shlex.split(best["flags"]), "--json"]))
    w = t1["wins"]
    n = len(specs)
    m = [[w[i][j] - w[j][i] if i != j else 0.0 for j in range(n)] for i in range(n)]
    check(score(target, m, cycle) == best["score"],
          f"{label}: tournament on the printed board scores {score(target, m, cycle)}, the search {best['score']}")


def rest(square, jump):
    while square in jump:
        square = jump[square]
    return square


case(["1d3", "2d2", "[1,1,4]"], 11, "stay", [], "cycle", ["1d3", "2d2", "[1,1,4]"])
case(["1d3", "2d2", "[1,1,4]"], 10, "bounce", [(7, 2)], "no-winner")
case(["1d4", "[0,2,3]"], 9, "pass", [], "fair")
head_start_case(["1d3", "2d2", "1d4"], 12, "stay", [(5, 9)], "cycle", 3, ["1d3", "2d2", "1d4"])
head_start_case(["1d3", "2d2", "[1,1,4]"], 10, "bounce", [(7, 2), (3, 10)], "fair", 4)

if failures:
    print("\n".join(failures))
    sys.exit(1)
print("ok: one-jump and head-start board searches equal the Python brute force")
