#!/usr/bin/python3
"""The digraph side of `overshoot tournament --json` against NetworkX.

Reference: NetworkX (Debian python3-networkx): strongly_connected_components,
simple_cycles (NetworkX 2.8 has no length bound, so cycles are filtered by
length here), condensation (for the Smith set). The script rebuilds the
dominance digraph itself from the win matrix (margin = P(i beats j) -
P(j beats i), an arc when the margin exceeds the error bound) and compares
arcs, components, top cycle, the cycle list, the strongest cycles, the
Condorcet winner and the counters, on random matrices read with --matrix and
on random race tournaments.

Usage: check_tournament_networkx.py BINARY SOURCE_DIR
"""
import os
import random
import sys

from script_support import Checks, run_json
import tempfile

import networkx as nx

BINARY = sys.argv[1]
check = Checks()


def run(args):
    return run_json(BINARY, ["tournament", *args, "--json"])


def canonical(cycle):
    k = cycle.index(min(cycle))
    return tuple(cycle[k:] + cycle[:k])


def compare(doc, margin, bound, max_length, label):
    names = doc["options"]
    n = len(names)
    idx = {name: i for i, name in enumerate(names)}
    arcs = {(i, j) for i in range(n) for j in range(n) if i != j and margin[i][j] > bound[i][j]}
    got_arcs = {(idx[a["from"]], idx[a["to"]]) for a in doc["arcs"]}
    check(got_arcs == arcs, f"{label}: arcs {sorted(got_arcs)} != {sorted(arcs)}")
    for a in doc["arcs"]:
        check(a["margin"] == margin[idx[a["from"]]][idx[a["to"]]], f"{label}: margin of {a}")
    g = nx.DiGraph()
    g.add_nodes_from(range(n))
    g.add_edges_from(arcs)

    sccs = {frozenset(c) for c in nx.strongly_connected_components(g)}
    got = {frozenset(idx[x] for x in c) for c in doc["components"]}
    check(got == sccs, f"{label}: components {got} != {sccs}")

    # Smith set with undecided pairs as ties: the source component of the
    # condensation of "i -> j unless j beats i".
    weak = nx.DiGraph()
    weak.add_nodes_from(range(n))
    weak.add_edges_from((i, j) for i in range(n) for j in range(n) if i != j and (j, i) not in arcs)
    cond = nx.condensation(weak)
    sources = [c for c in cond.nodes if cond.in_degree(c) == 0]
    check(len(sources) == 1, f"{label}: condensation has {len(sources)} sources")
    smith = set(cond.nodes[sources[0]]["members"])
    check({idx[x] for x in doc["top_cycle"]} == smith, f"{label}: top cycle {doc['top_cycle']} != {smith}")

    winners = [i for i in range(n) if g.out_degree(i) == n - 1 and n > 1]
    want = names[winners[0]] if winners else None
    check(doc["condorcet_winner"] == want, f"{label}: Condorcet winner {doc['condorcet_winner']} != {want}")

    def strength(c):
        return min(margin[c[k]][c[(k + 1) % len(c)]] for k in range(len(c)))

    every = [canonical(c) for c in nx.simple_cycles(g)]
    wanted = {c for c in every if len(c) <= max_length}
    listed = [tuple(idx[x] for x in c["options"]) for c in doc["cycles"]]
    check(not doc["cycle_search"]["cap_hit"], f"{label}: cap hit")
    check(len(listed) == len(set(listed)), f"{label}: a cycle listed twice")
    check(set(listed) == wanted, f"{label}: cycles {sorted(set(listed))} != {sorted(wanted)}")
    for c, entry in zip(listed, doc["cycles"]):
        check(entry["strength"] == strength(c), f"{label}: strength of {c}")
    strengths = [e["strength"] for e in doc["cycles"]]
    check(strengths == sorted(strengths, reverse=True), f"{label}: cycles not strongest first")

    best = max((strength(c) for c in every), default=None)
    sc = doc["strongest_cycle"]
    check((sc is None) == (best is None), f"{label}: strongest cycle presence")
    if sc is not None and best is not None:
        check(sc["strength"] == best, f"{label}: strongest cycle {sc['strength']} != {best}")
        c = [idx[x] for x in sc["options"]]
        check(all((c[k], c[(k + 1) % len(c)]) in arcs for k in range(len(c))), f"{label}: strongest cycle not a cycle")
    for v in range(n):
        through = max((strength(c) for c in every if v in c), default=None)
        entry = doc["strongest_cycle_through"][names[v]]
        check((entry is None) == (through is None), f"{label}: through {names[v]} presence")
        if entry is not None and through is not None:
            check(entry["strength"] == through and names[v] in entry["options"], f"{label}: through {names[v]}")

    for j in range(n):
        preds = [i for i in range(n) if (i, j) in arcs]
        best_i = None
        for i in preds:  # input order: the first of equal margins stays
            if best_i is None or margin[i][j] > margin[best_i][j]:
                best_i = i
        c = doc["counters"][names[j]]
        check(c["counter"] == (names[best_i] if best_i is not None else None), f"{label}: counter of {names[j]}")
    return len(every)


def random_matrices(rng, rounds):
    total = 0
    with tempfile.TemporaryDirectory() as tmp:
        for r in range(rounds):
            n = rng.randint(2, 8)
            names = [f"opt{i}" for i in range(n)]
            w = [[0.0] * n for _ in range(n)]
            for i in range(n):
                for j in range(i + 1, n):
                    tie = 0.2 * rng.random()
                    p = (1 - tie) * rng.random()
                    if rng.random() < 0.1:
                        p = (1 - tie) / 2
                    w[i][j], w[j][i] = p, 1 - tie - p
            tol = rng.choice([0.0, 0.0, 0.0, 0.05])
            max_length = rng.randint(3, max(3, n))
            path = os.path.join(tmp, f"m{r}.csv")
            with open(path, "w") as f:
                f.write("option," + ",".join(names) + "\n")
                for i in range(n):
                    f.write(names[i] + "," + ",".join("-" if i == j else repr(w[i][j]) for j in range(n)) + "\n")
            doc = run(["--matrix", path, "--tolerance", repr(tol), "--max-cycle-length", str(max_length)])
            margin = [[w[i][j] - w[j][i] for j in range(n)] for i in range(n)]
            bound = [[tol] * n for _ in range(n)]
            total += compare(doc, margin, bound, max_length, f"matrix round {r}")
    return total


def random_races(rng, rounds):
    total = 0
    for r in range(rounds):
        specs = set()
        while len(specs) < rng.randint(3, 6):
            if rng.random() < 0.5:
                specs.add(f"{rng.randint(1, 4)}d{rng.randint(2, 8)}")
            else:
                specs.add("[" + ",".join(str(rng.randint(0, 7)) for _ in range(rng.randint(2, 4))) + ",1]")
        length = rng.randint(10, 70)
        args = [*sorted(specs), "--length", str(length), "--overshoot", rng.choice(["stay", "pass"]),
                "--order", rng.choice(["simultaneous", "coin"])]
        doc = run(args)
        n = len(doc["options"])
        wins = doc["wins"]
        margin = [[0.0 if i == j else wins[i][j] - wins[j][i] for j in range(n)] for i in range(n)]
        total += compare(doc, margin, doc["error_bounds"], 6, f"race {' '.join(args)}")
    return total


rng = random.Random(20261201)
cycles = random_matrices(rng, 120) + random_races(rng, 25)
check(cycles > 100, f"only {cycles} cycles compared: the check is too weak")
check.finish(f"ok: components, top cycles, {cycles} cycles, strongest cycles and counters agree with NetworkX")
