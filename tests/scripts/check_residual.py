#!/usr/bin/python3
"""End-to-end tests of residual certificates (docs/certificate.md) through the
command line, against Python's fractions module.

1. On small general boards (bounce, backward jumps; every turn order)
   `overshoot certify winner --residual` writes residual certificates; each
   duel is solved exactly here with fractions.Fraction (Gauss-Jordan
   elimination of the product chain, the referee's solver) and every exact
   value must lie in its recorded interval. `overshoot check` and
   tools/referee.py must both accept.
2. Random tamperings (one value of x~ or h moved by one unit in its last
   digit, or a state dropped): `check` and the referee must agree, a dropped
   state must be refused, and whatever is still accepted must still be true
   (the exact values lie in the recorded intervals, checked in 1).
3. A hand-made certificate of a false claim (the loser named the winner,
   with a correct residual proof of the swapped duel) is refused by both.
4. The example docs/examples/cycle-bounce-100.json holds for both and is
   written again byte for byte (certificates are deterministic).
5. Exact lifting (p-adic, beyond the 12 squares of exact elimination) gives
   the fractions of the Python fractions solve on a 13-square board.

Source of the exact values: Python `fractions` (standard library).

Usage: check_residual.py BINARY SOURCE_DIR
"""
import copy
import json
import os
import random
import subprocess
import sys
import tempfile
from fractions import Fraction

binary, source = sys.argv[1], sys.argv[2]
sys.path.insert(0, os.path.join(source, "tools"))
import referee  # noqa: E402  (the Python fractions solver of the referee's checker)

failures = []
tmp = tempfile.mkdtemp()


def check(what, ok, detail=""):
    print(("ok   " if ok else "FAIL ") + what + ("" if ok else f": {detail}"))
    if not ok:
        failures.append(what)


def save(name, doc):
    p = os.path.join(tmp, name)
    with open(p, "w") as f:
        json.dump(doc, f)
    return p


def both_checkers(path):
    c = subprocess.run([binary, "check", path], capture_output=True, text=True)
    r = subprocess.run([sys.executable, os.path.join(source, "tools", "referee.py"), path],
                       capture_output=True, text=True)
    return c.returncode, r.returncode, c.stderr.strip() + " | " + r.stderr.strip()


def certify(length, rule, jumps, order, a, b):
    """A residual certificate of whichever of 'a wins' and 'b wins' holds (None if neither)."""
    for x, y in ((a, b), (b, a)):
        out = os.path.join(tmp, "c.json")
        args = [binary, "certify", "winner", x, y, "--length", str(length), "--overshoot", rule,
                "--order", order, "--residual", "-o", out]
        for f, t in jumps:
            args += ["--jump", f"{f}:{t}"]
        if subprocess.run(args, capture_output=True, text=True).returncode == 0:
            with open(out) as f:
                return json.load(f)
    return None


CASES = [
    (9, "bounce", [(6, 2)], "simultaneous", "1d6", "2d6"),
    (10, "bounce", [], "a-first", "1d4", "[0,2,3]"),
    (8, "stay", [(6, 1)], "b-first", "1d3", "[1,1,4]"),
    (9, "pass", [(5, 0), (3, 7)], "coin", "2d3", "1d6"),
    (11, "bounce", [(8, 3)], "coin", "1d6", "[0,1,5]"),
]

docs = []
for length, rule, jumps, order, a, b in CASES:
    doc = certify(length, rule, jumps, order, a, b)
    what = f"{a} vs {b} on {length} squares, {rule}, {order}, jumps {jumps}"
    if doc is None:
        check(what + ": one orientation is certified", False, "neither 'A wins' nor 'B wins' was certified")
        continue
    d = doc["duels"][0]
    moves = {o["name"]: [tuple(m) for m in o["moves"]] for o in doc["options"]}
    exact = referee.duel(length, rule, jumps, moves[d["a"]], moves[d["b"]], order)
    inside = all(Fraction(d[k]["interval"][0]) <= exact[k] <= Fraction(d[k]["interval"][1]) for k in exact)
    widths = max(d[k]["interval"][1] - d[k]["interval"][0] for k in exact)
    check(what + f": exact fractions inside the residual intervals (widest {widths:.2g})", inside,
          {k: (str(exact[k]), d[k]["interval"]) for k in exact})
    c, r, err = both_checkers(save("ok.json", doc))
    check(what + ": check and referee accept", c == 0 and r == 0, err)
    docs.append(doc)

# 2. Tampering: both checkers must agree; dropped states are refused.
rng = random.Random(20261202)
agree = dropped_refused = accepted = 0
for trial in range(40):
    doc = copy.deepcopy(rng.choice(docs))
    part = rng.choice(doc["duels"][0]["residual"]["parts"])
    s = rng.randrange(len(part["states"]))
    drop = trial % 4 == 0
    if drop:
        for k in ("states", "p_a_wins", "p_b_wins", "p_tie", "rounds"):
            if k in part:
                del part[k][s]
    else:
        field = rng.choice([k for k in ("p_a_wins", "p_b_wins", "p_tie", "rounds") if k in part])
        whole, _, frac = part[field][s].partition(".")
        units = int(whole + frac) + rng.choice([-1, 1]) if int(whole + frac) > 0 else 1
        text = str(units).rjust(len(frac) + 1, "0")
        part[field][s] = text[:-len(frac)] + "." + text[-len(frac):]
    c, r, err = both_checkers(save("t.json", doc))
    agree += c == r
    if drop:
        dropped_refused += c == 1 and r == 1
    accepted += c == 0
check(f"tampering: check and referee agree on all 40 ({accepted} still proving)", agree == 40)
check("tampering: all 10 dropped states refused by both", dropped_refused == 10)

# 3. A false claim, hand-made from a correct proof of the swapped duel.
doc = docs[0]
d = doc["duels"][0]
part = d["residual"]["parts"][0]  # simultaneous: swapping the pieces swaps the squares
order = sorted(range(len(part["states"])), key=lambda i: tuple(reversed(part["states"][i])))
swapped = {"first": "both", "digits": part["digits"], "states": [list(reversed(part["states"][i])) for i in order],
           "p_a_wins": [part["p_b_wins"][i] for i in order], "p_b_wins": [part["p_a_wins"][i] for i in order],
           "p_tie": [part["p_tie"][i] for i in order], "rounds": [part["rounds"][i] for i in order]}
bad = copy.deepcopy(doc)
x, y = d["a"], d["b"]
bad["claim"]["options"] = [y, x]
bad["claim"]["statement"] = doc["claim"]["statement"].replace(f"{x} beats {y}", f"{y} beats {x}")
bad["options"] = list(reversed(doc["options"]))
e = bad["duels"][0]
e["a"], e["b"] = y, x
e["p_a_wins"], e["p_b_wins"] = d["p_b_wins"], d["p_a_wins"]
e["margin"] = {"decimal": "-" + d["margin"]["decimal"], "interval": [-d["margin"]["interval"][1], -d["margin"]["interval"][0]]}
e["residual"]["parts"] = [swapped]
e["exact_method"] = None  # a residual proof alone (exact lifting also fits this board)
for k in ("p_a_wins", "p_b_wins", "p_tie", "p_neither", "margin"):
    e[k].pop("exact", None)
e["verdict"] = "a beats b"
c, r, err = both_checkers(save("false.json", bad))
check("a false claim with a false verdict is refused by check and referee", c == 1 and r == 1, err)
e["verdict"] = "b beats a"
c, r, err = both_checkers(save("false2.json", bad))
check("a false claim with the true verdict is refused by check and referee", c == 1 and r == 1, err)

# 5. Exact lifting beyond exact elimination (13 squares > 12): the certificate's fractions are the
#    Python fractions solve's, digit for digit.
doc = certify(13, "bounce", [(9, 2)], "simultaneous", "1d6", "[0,1,5]")
d = doc["duels"][0] if doc else {}
if doc and d.get("exact_method") == "exact lifting":
    moves = {o["name"]: [tuple(m) for m in o["moves"]] for o in doc["options"]}
    exact = referee.duel(13, "bounce", [(9, 2)], moves[d["a"]], moves[d["b"]], "simultaneous")
    same = all(referee.fraction(d[k]["exact"], k) == exact[k] for k in exact)
    check("exact lifting on 13 squares equals the Python fractions solve", same)
    c, r, err = both_checkers(save("lift.json", doc))
    check("exact lifting on 13 squares: check and referee accept", c == 0 and r == 0, err)
else:
    check("exact lifting on 13 squares", False, "no certificate with exact lifting was written")

# 4. The example of docs/examples: both checkers accept it, and certify writes the same bytes.
example = os.path.join(source, "docs", "examples", "cycle-bounce-100.json")
c, r, err = both_checkers(example)
check("docs/examples/cycle-bounce-100.json: check and referee accept", c == 0 and r == 0, err)
again = os.path.join(tmp, "again.json")
args = [binary, "certify", "cycle", "[2,6,6,8]", "1d6", "[4,9,12]", "--length", "100", "--overshoot", "bounce",
        "-o", again]
for j in ("9:11", "12:46", "23:94", "29:77", "34:77", "87:39"):
    args += ["--jump", j]
p = subprocess.run(args, capture_output=True, text=True)
with open(example, "rb") as f, open(again, "rb") if p.returncode == 0 else open(os.devnull, "rb") as g:
    check("docs/examples/cycle-bounce-100.json is written again byte for byte", f.read() == g.read(), p.stderr)

if failures:
    print(f"{len(failures)} failure(s)")
    sys.exit(1)
print("all residual certificate checks passed")
