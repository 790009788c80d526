#!/usr/bin/python3
"""A hunt on a board with jumps against `overshoot tournament` at every length.

Reference: the project's own tournament command, run once per length on the
board the hunt describes (the jumps anchored to the start or to the finish as
docs/sweep.md says: a jump FROM:TO given on the longest board sits at
FROM - (HI - L) : TO - (HI - L) on a board of length L when anchored to the
finish; jumps that leave the board are left out). This is a consistency
check between two routes through the library (board by board duels in the
hunt, the all-pairs matrix in the tournament): the 3-cycles found at each
length, and their strengths, must agree.

Usage: check_hunt_board.py BINARY SOURCE_DIR
"""
import sys

from script_support import Checks, run_json

BINARY = sys.argv[1]
check = Checks()


def run(args):
    return run_json(BINARY, args)


def anchored(jumps, anchor, hi, length):
    out = []
    for f, t in jumps:
        if anchor == "finish":
            f, t = length - (hi - f), length - (hi - t)
        if 1 <= f <= length - 1 and 0 <= t <= length and f != t:
            out.append((f, t))
    return out


FAMILY = "1..3d4;[0,3,3,5];1d6;[1,1,4];[2,2,3]"
SPECS = ["1d4", "2d4", "3d4", "[0,3,3,5]", "1d6", "[1,1,4]", "[2,2,3]"]


def case(lo, hi, jumps, anchor, rule, order):
    label = f"lengths {lo}..{hi} jumps {jumps} anchor {anchor} {rule} {order}"
    args = ["hunt", FAMILY, "--lengths", f"{lo}..{hi}", "--anchor", anchor, "--overshoot", rule, "--order", order,
            "--json", "--list", "1000"]
    for f, t in jumps:
        args += ["--jump", f"{f}:{t}"]
    hunt = run(args)
    check(hunt["complete"], f"{label}: the hunt did not complete")
    found = {}  # (length, cycle) -> strength
    for c in hunt["cycles"]:
        for a, b in c["lengths"]:
            for length in range(a, b + 1):
                found[(length, tuple(c["options"]))] = None
    expected = {}
    for length in range(lo, hi + 1):
        targs = ["tournament", *SPECS, "--length", str(length), "--overshoot", rule, "--order", order, "--json",
                 "--max-cycle-length", "3"]
        for f, t in anchored(jumps, anchor, hi, length):
            targs += ["--jump", f"{f}:{t}"]
        t = run(targs)
        for c in t["cycles"]:
            if len(c["options"]) == 3:
                expected[(length, tuple(c["options"]))] = c["strength"]
    check(set(found) == set(expected),
          f"{label}: hunt-only {sorted(set(found) - set(expected))}, tournament-only {sorted(set(expected) - set(found))}")
    # The strongest length of each cycle and its strength.
    for c in hunt["cycles"]:
        s = expected.get((c["strongest_length"], tuple(c["options"])))
        check(s is not None and abs(s - c["strength"]) < 1e-9,
              f"{label}: {c['options']} at {c['strongest_length']}: hunt {c['strength']}, tournament {s}")
    return len(expected)


total = 0
total += case(12, 40, [(4, 9), (13, 2)], "start", "stay", "simultaneous")
total += case(12, 40, [(30, 35), (38, 20)], "finish", "stay", "coin")
total += case(12, 30, [(5, 11), (17, 3)], "start", "bounce", "simultaneous")
total += case(12, 30, [(6, 10)], "finish", "pass", "simultaneous")
check(total > 0, "no cycle at any length: the check compared nothing")

check.finish(f"ok: hunts on boards with jumps = tournament at every length ({total} cycle instances)")
