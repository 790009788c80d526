"""overshoot.profile, duel and tournament against the command line's JSON, and
exact duels against Python's fractions (the reference of
tests/scripts/check_duel_fractions.py, written from DESIGN.md's rules with
fractions.Fraction and sharing no code with the engine)."""
import os
import sys
import threading
from fractions import Fraction

import numpy as np
import pytest

import overshoot
from conftest import SOURCE, cli_error, cli_json, data, same_bytes

sys.path.insert(0, os.path.join(SOURCE, "tests", "scripts"))
import check_duel_fractions as reference  # noqa: E402


def test_readme_line():
    r = overshoot.duel("1d6", "2d6", length=100)
    assert isinstance(r.margin, float)
    assert r.margin == cli_json("duel", "1d6", "2d6", "--length", 100)["margin"]


@pytest.mark.parametrize("args, flags", [
    (("1d6", "2d6"), dict(length=100)),
    (("2d6", "3d6"), dict(length=60, overshoot="bounce", order="a-first")),
    (("1d6", "[1,2,6]"), dict(length=40, jumps=["5:20", (30, 3)], order="coin")),
    (("steady", "bold"), dict(scenario=data("garden-path.toml"))),
    (("1d6", "2d6"), dict(length=100000)),  # the separated method, no chain built
])
def test_duel_matches_cli(args, flags):
    r = overshoot.duel(*args, **flags)
    words = ["duel", *args]
    for k, v in flags.items():
        if k == "jumps":
            for j in v:
                words += ["--jump", j if isinstance(j, str) else f"{j[0]}:{j[1]}"]
        else:
            words += [f"--{k}", v]
    doc = cli_json(*words)
    assert same_bytes(r, doc)
    for key in ("p_a_wins", "p_b_wins", "p_tie", "p_neither", "margin", "error_bound", "method",
                "probability_error_bound", "bound_proven", "mean_rounds", "median_rounds"):
        assert getattr(r, key) == doc[key], key
    assert r.a_beats_b == (doc["margin"] > doc["error_bound"])


def test_exact_duel_against_fractions():
    # Every board, rule and order of the reference script's table.
    for n, jumps, a, b in reference.BOARDS[:6]:
        for rule in reference.RULES:
            for order in reference.ORDERS:
                want = reference.exact_duel(n, rule, jumps, a, b, order, cross_check=False)
                r = overshoot.duel(a, b, length=n, overshoot=rule, jumps=jumps, order=order, exact=True)
                got = (r.exact.p_a_wins, r.exact.p_b_wins, r.exact.p_tie, r.exact.p_neither)
                assert all(isinstance(x, Fraction) for x in got)
                assert got == want, (n, jumps, a, b, rule, order)
                assert r.exact.margin == want[0] - want[1]


def test_exact_duel_matches_cli():
    r = overshoot.duel("1d6", "2d6", length=30, exact=True)
    doc = cli_json("duel", "1d6", "2d6", "--length", 30, "--exact")
    assert same_bytes(r, doc)
    assert str(r.exact.p_a_wins) == doc["exact"]["p_a_wins"]


def test_profile_matches_cli():
    r = overshoot.profile("1d6", "2d6", "[2,2,5]", length=50, quantiles=[0.9], jumps=["3:40"])
    doc = cli_json("profile", "1d6", "2d6", "[2,2,5]+0", "--length", 50, "--quantile", 0.9, "--jump", "3:40")
    # The CLI needs the +0 spelling of a bracketed die (tests/scripts/check_duel_fractions.py, spelled()).
    for o in doc["options"]:
        if o["spec"] == "[2,2,5]+0":
            o["spec"] = o["name"] = "[2,2,5]"
    assert same_bytes(r, doc)
    assert isinstance(r.p_finish, np.ndarray)
    assert list(r.p_finish) == [o["p_finish"] for o in doc["options"]]
    assert [q[0.5] for q in r.quantiles] == [o["median_turns"] for o in doc["options"]]


def test_tournament_matches_cli():
    r = overshoot.tournament("1d6", "2d6", "3d6", length=600)
    doc = cli_json("tournament", "1d6", "2d6", "3d6", "--length", 600)
    assert same_bytes(r, doc)
    assert r.win.shape == (3, 3) and r.margin.dtype == np.float64
    assert np.array_equal(r.margin, r.win - r.win.T)
    # The cycle 2d6 > 1d6 > 3d6 > 2d6 at 600 squares (fact of the trade, no published source).
    assert r.strongest_cycle is not None and sorted(r.strongest_cycle.options) == [0, 1, 2]
    assert r.condorcet_winner is None and r.beats[1, 0]


def test_exact_tournament_matches_cli():
    r = overshoot.tournament("1d4", "2d3", "1d6", length=24, exact=True)
    doc = cli_json("tournament", "1d4", "2d3", "1d6", "--length", 24, "--exact")
    assert same_bytes(r, doc)
    assert r.exact_win[0][1] == Fraction(doc["exact"]["wins"][0][1])
    assert r.exact_win[1][1] is None


def test_option_and_board_objects():
    o = overshoot.Option("2d6", name="pair")
    assert o.probability(7) == Fraction(1, 6) and o.probability(1) == 0 and o.mean == 7
    b = overshoot.Board(50, overshoot="bounce", jumps=["4:30"])
    r = overshoot.duel(o, "1d6", board=b)
    assert r.a.name == "pair"
    assert r.margin == overshoot.duel("2d6", "1d6", length=50, overshoot="bounce", jumps=[(4, 30)]).margin
    s = overshoot.setup(scenario=data("garden-path.toml"))
    assert [x.name for x in s.options] and s.board.length > 0


@pytest.mark.parametrize("call, words", [
    (lambda: overshoot.duel("1d6", "2x6", length=100), ["duel", "1d6", "2x6", "--length", 100]),
    (lambda: overshoot.duel("1d6", "2d6"), ["duel", "1d6", "2d6"]),
    (lambda: overshoot.duel("1d6", "2d6", length=9, jumps=["3:3"]), ["duel", "1d6", "2d6", "--length", 9, "--jump", "3:3"]),
    (lambda: overshoot.tournament("1d6", "1d6", length=9), ["tournament", "1d6", "1d6", "--length", 9]),
    (lambda: overshoot.duel("steady", "nobody", scenario=data("garden-path.toml")),
     ["duel", "steady", "nobody", "--scenario", data("garden-path.toml")]),
    (lambda: overshoot.profile("1d6", scenario="/nonexistent.toml"), ["profile", "1d6", "--scenario", "/nonexistent.toml"]),
])
def test_errors_are_the_cli_message(call, words):
    with pytest.raises(ValueError) as e:
        call()
    assert str(e.value) == cli_error(*words)
    assert not isinstance(e.value, overshoot.LimitError)


def test_board_errors_are_the_library_message():
    # The CLI refuses --length 0 in its flag check; the library's own message is one line too.
    with pytest.raises(ValueError) as e:
        overshoot.duel("1d6", "2d6", length=0)
    assert "length" in str(e.value) and "\n" not in str(e.value)
    with pytest.raises(TypeError):
        overshoot.duel("1d6", 6, length=10)


def test_limits_raise_their_own_type():
    # Exact mode refuses general boards past its elimination size (docs/exact.md).
    with pytest.raises(overshoot.LimitError) as e:
        overshoot.duel("1d6", "2d6", length=60, overshoot="bounce", exact=True)
    assert isinstance(e.value, ValueError)
    assert str(e.value) == cli_error("duel", "1d6", "2d6", "--length", 60, "--overshoot", "bounce", "--exact")
    before = overshoot.memory_limit()
    overshoot.set_memory_limit(1)
    try:
        with pytest.raises(overshoot.LimitError) as e:
            overshoot.tournament("1d6", "2d6", length=900000)
        assert str(e.value) == cli_error("tournament", "1d6", "2d6", "--length", 900000, "--memory-limit", 1)
    finally:
        overshoot.set_memory_limit(before)


def test_duels_from_several_threads():
    specs = [("1d6", "2d6", 100 + k) for k in range(8)]
    alone = [overshoot.duel(a, b, length=n).to_dict() for a, b, n in specs]
    for d in alone:
        d.pop("verdict_basis", None)
    together = [None] * len(specs)
    errors = []

    def run(k):
        try:
            for _ in range(3):
                a, b, n = specs[k]
                together[k] = overshoot.duel(a, b, length=n, exact=(k % 2 == 0)).to_dict()
                together[k].pop("exact", None)
                together[k].pop("verdict_basis", None)  # "exact" with exact=True, "bound" without
        except Exception as e:  # pragma: no cover - reported below
            errors.append(e)

    threads = [threading.Thread(target=run, args=(k,)) for k in range(len(specs))]
    for t in threads:
        t.start()
    for t in threads:
        t.join()
    assert not errors
    assert together == alone
