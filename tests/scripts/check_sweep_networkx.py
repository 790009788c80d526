#!/usr/bin/python3
"""Cycles of sweeps and hunts against NetworkX.

Reference: NetworkX (Debian's python3-networkx), nx.simple_cycles on the
dominance digraph that the sweep itself reports (its arcs per length). Checks
that (1) every length's listed cycles are exactly NetworkX's elementary cycles,
(2) every sweep cycle's intervals are exactly the lengths where NetworkX finds
it, and (3) a hunt for 3-cycles over the same options and lengths lists exactly
the 3-cycles NetworkX finds, each with the lengths where it holds.
Usage: check_sweep_networkx.py BINARY SOURCE_DIR
"""
import json
import subprocess
import sys

import networkx as nx

BIN = sys.argv[1]
OPTS = ["1d4", "1d6", "2d4", "2d6", "3d4", "1d8"]
LENGTHS = "20..160"


def run(args):
    out = subprocess.run([BIN, *args], capture_output=True, text=True)
    if out.returncode != 0:
        sys.exit(f"{args[0]} failed: {out.stderr}")
    return json.loads(out.stdout)


def canon(cycle, order):
    # Rotate to start from the option that comes first in the input.
    k = min(range(len(cycle)), key=lambda i: order.index(cycle[i]))
    return tuple(cycle[k:] + cycle[:k])


sweep = run(["sweep", *OPTS, "--lengths", LENGTHS, "--json", "--max-cycle-length", "6"])
failures = 0
held = {}  # cycle -> set of lengths (NetworkX)
for per in sweep["per_length"]:
    g = nx.DiGraph()
    g.add_nodes_from(OPTS)
    for a in per["arcs"]:
        g.add_edge(a["from"], a["to"])
    ref = {canon(c, OPTS) for c in nx.simple_cycles(g)}
    got = {tuple(c["options"]) for c in per["cycles"]}
    if ref != got:
        failures += 1
        print(f"length {per['length']}: NetworkX {sorted(ref)} sweep {sorted(got)}")
    for c in ref:
        held.setdefault(c, set()).add(per["length"])


def expand(runs):
    out = set()
    for lo, hi in runs:
        out.update(range(lo, hi + 1))
    return out


for c in sweep["cycles"]:
    if expand(c["lengths"]) != held.get(tuple(c["options"]), set()):
        failures += 1
        print(f"cycle {c['options']}: intervals {c['lengths']} differ from NetworkX")
if len(sweep["cycles"]) != len(held):
    failures += 1
    print(f"sweep lists {len(sweep['cycles'])} cycles, NetworkX finds {len(held)}")

hunt = run(["hunt", ";".join(OPTS), "--lengths", LENGTHS, "--json", "--list", "100000"])
ref3 = {c: ls for c, ls in held.items() if len(c) == 3}
got3 = {tuple(c["options"]): expand(c["lengths"]) for c in hunt["cycles"]}
if ref3 != got3:
    failures += 1
    print(f"hunt 3-cycles differ: NetworkX {len(ref3)} sets, hunt {len(got3)}")
strengths = [c["strength"] for c in hunt["cycles"]]
if strengths != sorted(strengths, reverse=True):
    failures += 1
    print("hunt cycles are not ranked by strength")
print(f"{len(sweep['per_length'])} lengths, {len(held)} cycles, {len(ref3)} 3-cycles; {failures} failures")
sys.exit(1 if failures or not held else 0)
