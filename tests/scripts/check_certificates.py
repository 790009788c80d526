#!/usr/bin/python3
"""End-to-end tests of `overshoot certify` and `overshoot check` through the
command line, including tampering: one changed digit in a fraction, two
options swapped in a cycle, a changed board length, a missing field. Each
must make `check` fail with the documented exit status (1: a claim or
number fails, 2: unreadable) and name the failing item. The referee's
checker tools/referee.py (Python standard library) is run on a small
certificate as well.

Facts of the trade, no published source: 1d6 and 2d6 cross over at 116
squares, and 2d6 > 1d6 > 3d6 > 2d6 is a cycle on 600 squares (the latter
certificate is docs/examples/cycle-600.json, written by `overshoot certify`).

Usage: check_certificates.py BINARY SOURCE_DIR
"""
import json
import os
import subprocess
import sys
import tempfile

binary, source = sys.argv[1], sys.argv[2]
failures = []


def run(*args):
    return subprocess.run([binary, *args], capture_output=True, text=True)


def expect(what, proc, status, needle=None):
    ok = proc.returncode == status and (needle is None or needle in proc.stderr + proc.stdout)
    print(("ok   " if ok else "FAIL ") + f"{what}: exit {proc.returncode}"
          + (f", wanted {status}" if proc.returncode != status else "")
          + ("" if ok or needle is None else f", output lacks '{needle}': {proc.stderr.strip()[:200]}"))
    if not ok:
        failures.append(what)


def tamper_digit(s):
    i = len(s) // 3
    while not s[i].isdigit():
        i += 1
    return s[:i] + ("3" if s[i] == "7" else "7") + s[i + 1:]


with tempfile.TemporaryDirectory() as tmp:
    def path(name):
        return os.path.join(tmp, name)

    def save(name, doc):
        with open(path(name), "w") as f:
            json.dump(doc, f)
        return path(name)

    # A fresh crossover certificate and its check.
    expect("certify crossover at 116", run("certify", "crossover", "1d6", "2d6", "--at", "116", "-o", path("x.json")), 0)
    expect("check crossover", run("check", path("x.json")), 0, "certificate holds")
    with open(path("x.json")) as f:
        cross = json.load(f)
    # A false crossover is refused and writes nothing.
    expect("certify a false crossover", run("certify", "crossover", "1d6", "2d6", "--at", "117", "-o", path("no.json")), 1,
           "does not hold")
    if os.path.exists(path("no.json")):
        print("FAIL a refused claim left a file")
        failures.append("refused claim wrote a file")
    # One changed digit in each kind of fraction.
    for key in ("p_a_wins", "p_b_wins", "p_tie", "margin"):
        doc = json.loads(json.dumps(cross))
        doc["duels"][1][key]["exact"] = tamper_digit(doc["duels"][1][key]["exact"])
        expect(f"one digit changed in {key}", run("check", save("t.json", doc)), 1, key)
    # The board length changed.
    doc = json.loads(json.dumps(cross))
    doc["board"]["length"] = 115
    expect("board length changed", run("check", save("t.json", doc)), 1)
    # A missing field, and a file that is not JSON.
    doc = json.loads(json.dumps(cross))
    del doc["duels"][0]["p_neither"]
    expect("missing field", run("check", save("t.json", doc)), 2, "duels[0].p_neither")
    with open(path("bad.json"), "w") as f:
        f.write("{ not json")
    expect("not JSON", run("check", path("bad.json")), 2, "not valid JSON")
    expect("no such file", run("check", path("absent.json")), 2)
    # Markdown and LaTeX renderings.
    expect("certify md", run("certify", "crossover", "1d6", "2d6", "--at", "116", "--format", "md", "-o", path("x.md")), 0)
    with open(path("x.md")) as f:
        md = f.read()
    if "2d6 beats 1d6" not in md:
        print("FAIL the Markdown table lacks the verdict")
        failures.append("md verdict")
    expect("certify latex", run("certify", "crossover", "1d6", "2d6", "--at", "116", "--format", "latex"), 0, "\\toprule")

    # The 600-square cycle of docs/examples: holds; swapping two options breaks it.
    example = os.path.join(source, "docs", "examples", "cycle-600.json")
    expect("check docs/examples/cycle-600.json", run("check", example), 0, "certificate holds")
    with open(example) as f:
        cyc = json.load(f)
    doc = json.loads(json.dumps(cyc))
    o = doc["claim"]["options"]
    o[0], o[1] = o[1], o[0]
    expect("two options swapped in the cycle", run("check", save("c.json", doc)), 1, "claim")
    doc = json.loads(json.dumps(cyc))
    doc["board"]["length"] = 599
    expect("cycle board length changed", run("check", save("c.json", doc)), 1)
    doc = json.loads(json.dumps(cyc))
    doc["duels"][2]["p_neither"]["exact"] = tamper_digit(doc["duels"][2]["p_neither"]["exact"])
    expect("cycle: one digit changed in p_neither", run("check", save("c.json", doc)), 1, "p_neither")

    # The referee's checker (Python standard library) on a small certificate.
    referee = os.path.join(source, "tools", "referee.py")
    expect("certify winner on 30 squares",
           run("certify", "winner", "1d6", "2d6", "--length", "30", "-o", path("w.json")), 0)
    r = subprocess.run([sys.executable, referee, path("w.json")], capture_output=True, text=True)
    expect("referee on the winner certificate", r, 0, "certificate holds")
    with open(path("w.json")) as f:
        doc = json.load(f)
    doc["duels"][0]["p_a_wins"]["exact"] = tamper_digit(doc["duels"][0]["p_a_wins"]["exact"])
    r = subprocess.run([sys.executable, referee, save("w2.json", doc)], capture_output=True, text=True)
    expect("referee on a tampered certificate", r, 1, "p_a_wins")

sys.exit(1 if failures else 0)
