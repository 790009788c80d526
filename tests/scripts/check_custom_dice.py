#!/usr/bin/python3
"""Families by constraint (`overshoot family`) against an enumeration in Python.

Reference: Python's itertools.combinations_with_replacement (a fair die is a
multiset of faces) and fractions.Fraction for means, written here
independently of the C++ enumeration. For each family the script lists every
multiset of the wanted size over the wanted values, keeps those with the wanted
sum or mean, forms each die's (or each sum of N copies') distribution, merges
equal distributions keeping the first, and compares with the binary: the
number of options, the number merged, and the distributions themselves, in
order.

Efron's four dice (M. Gardner, "The paradox of the nontransitive dice",
Scientific American 223(6), 1970: faces 4,4,4,4,0,0 / 3,3,3,3,3,3 /
6,6,2,2,2,2 / 5,5,5,1,1,1) are six-sided dice with faces in 0..6, so each
must be a member of custom(faces=6, values=0..6).

Usage: check_custom_dice.py BINARY SOURCE_DIR
"""
import itertools
import json
import subprocess
import sys
from fractions import Fraction

BINARY = sys.argv[1]
failures = []


def check(cond, what):
    if not cond:
        failures.append(what)


def family(text):
    p = subprocess.run([BINARY, "family", text, "--json"], capture_output=True, text=True)
    if p.returncode != 0:
        raise SystemExit(f"FAIL: overshoot family {text}: {p.stderr.strip()}")
    return json.loads(p.stdout)


def distribution(faces, count):
    d = {0: Fraction(1)}
    one = {}
    for f in faces:
        one[f] = one.get(f, 0) + Fraction(1, len(faces))
    for _ in range(count):
        nd = {}
        for a, p in d.items():
            for f, q in one.items():
                nd[a + f] = nd.get(a + f, 0) + p * q
        d = nd
    return tuple(sorted((m, p) for m, p in d.items() if p))


def reference(sizes, values, sum_=None, mean=None, counts=(1,)):
    out, seen, merged = [], set(), 0
    for c in counts:
        for f in sizes:
            for faces in itertools.combinations_with_replacement(values, f):
                if sum_ is not None and sum(faces) != sum_:
                    continue
                if mean is not None and Fraction(sum(faces), f) != mean:
                    continue
                d = distribution(faces, c)
                if d in seen:
                    merged += 1
                    continue
                seen.add(d)
                out.append(d)
    return out, merged


def binary_distributions(doc):
    out = []
    for o in doc["options"]:
        den = o["denominator"]
        out.append(tuple(sorted((int(m), Fraction(w, den)) for m, w in o["weights"].items() if w)))
    return out


CASES = [
    ("custom(faces=3, values=0..4)", dict(sizes=[3], values=range(0, 5))),
    ("custom(faces=4, values=1..4, sum=10)", dict(sizes=[4], values=range(1, 5), sum_=10)),
    # Proper dice (faces 1..n summing to n(n+1)/2; Conrey, Gabbard, Grant, Liu
    # and Morrison, Math. Mag. 89 (2016) 133-143), six sides.
    ("custom(faces=6, values=1..6, sum=21)", dict(sizes=[6], values=range(1, 7), sum_=21)),
    ("custom(faces=2..4, values=0..3)", dict(sizes=[2, 3, 4], values=range(0, 4))),
    ("custom(faces=4..6, values=0,2,5, mean=5/2)", dict(sizes=[4, 5, 6], values=[0, 2, 5], mean=Fraction(5, 2))),
    ("custom(faces=3, values=0..3, count=1..2)", dict(sizes=[3], values=range(0, 4), counts=(1, 2))),
    ("spinner(sectors=2..4, moves=1..3)", dict(sizes=[2, 3, 4], values=range(1, 4))),
]

for text, kw in CASES:
    ref, merged = reference(**kw)
    doc = family(text)
    check(doc["size"] == len(ref), f"{text}: {doc['size']} options, Python enumerates {len(ref)}")
    check(doc["merged"] == merged, f"{text}: {doc['merged']} merged, Python merges {merged}")
    check(binary_distributions(doc) == ref, f"{text}: the distributions differ from Python's (or their order)")

efron = [[4, 4, 4, 4, 0, 0], [3, 3, 3, 3, 3, 3], [6, 6, 2, 2, 2, 2], [5, 5, 5, 1, 1, 1]]
members = set(binary_distributions(family("custom(faces=6, values=0..6)")))
for die in efron:
    check(distribution(die, 1) in members, f"Efron's die {die} is not in custom(faces=6, values=0..6)")

if failures:
    print("\n".join(failures))
    sys.exit(1)
print(f"ok: {len(CASES)} constraint families equal Python's enumeration; Efron's four dice are members")
