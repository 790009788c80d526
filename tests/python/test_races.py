"""overshoot.race, certify and check against the command line's JSON; a
certificate written from Python is re-checked by the CLI and by Python, and a
tampered one fails."""
import json

import numpy as np
import pytest

import overshoot
from conftest import cli, cli_json, same_bytes


def test_race_matches_cli():
    r = overshoot.race("1d6", "2d6", "3d6", length=60)
    doc = cli_json("race", "1d6", "2d6", "3d6", "--length", 60)
    assert same_bytes(r, doc)
    assert isinstance(r.p_wins, np.ndarray) and r.p_wins.shape == (3,)
    assert abs(r.p_wins.sum() + r.p_tie + r.p_neither - 1) < 1e-9


def test_seated_race_with_starts_matches_cli():
    r = overshoot.race("1d6", "2d6", length=40, order="seated", starts=[0, 5])
    doc = cli_json("race", "1d6", "2d6", "--length", 40, "--order", "seated", "--start", 0, "--start", 5)
    assert same_bytes(r, doc)


def test_certificate_written_and_checked(tmp):
    # 1d6 and 2d6 cross over at 116 squares (fact of the trade, no published
    # source; tests/scripts/check_certificates.py certifies the same).
    c = overshoot.certify("crossover", "1d6", "2d6", at=116)
    path = tmp / "x.json"
    c.write(str(path))
    cli_path = tmp / "cli.json"
    p = cli("certify", "crossover", "1d6", "2d6", "--at", 116, "-o", cli_path)
    assert p.returncode == 0, p.stderr
    assert path.read_bytes() == cli_path.read_bytes()
    assert json.dumps(c.to_dict(), sort_keys=True) == json.dumps(json.loads(cli_path.read_text()), sort_keys=True)
    report = overshoot.check(str(path))
    assert report.holds and report and report.failure == ""
    assert same_bytes(report, cli_json("check", path))
    # One changed digit in an exact fraction: the check fails, saying why.
    text = path.read_text()
    bad = tmp / "bad.json"
    i = text.index('"p_a_wins"')
    j = text.index("/", i)
    digit = text[j - 1]
    bad.write_text(text[:j - 1] + ("3" if digit == "7" else "7") + text[j:])
    report = overshoot.check(str(bad))
    assert not report.holds and not report and report.failure
    p = cli("check", bad)
    assert p.returncode == 1 and report.failure in p.stderr


def test_false_claim_raises():
    d = overshoot.duel("1d6", "2d6", length=30)
    assert d.a_beats_b or d.b_beats_a
    loser, winner = ("1d6", "2d6") if d.b_beats_a else ("2d6", "1d6")
    with pytest.raises(overshoot.ClaimFailure):
        overshoot.certify("winner", loser, winner, length=30)
    assert overshoot.certify("winner", winner, loser, length=30).kind == "winner"


def test_unreadable_certificate_is_a_value_error(tmp):
    with pytest.raises(ValueError):
        overshoot.check(str(tmp / "missing.json"))
