"""overshoot.sweep and hunt against the command line's JSON; per-length
results as NumPy arrays; a hunt's progress callback; Ctrl-C (SIGINT sent to the
process running a hunt) stops it cleanly with its checkpoint written, and a
resumed hunt gives what an uninterrupted one gives."""
import json
import os
import signal
import subprocess
import sys
import time

import numpy as np
import pytest

import overshoot
from conftest import cli_json, same_bytes


def test_sweep_matches_cli():
    s = overshoot.sweep("1d6", "2d6", "3d6", lengths=(10, 300))
    doc = cli_json("sweep", "1d6", "2d6", "3d6", "--lengths", "10..300")
    assert same_bytes(s, doc)
    v = s.variants[0]
    assert isinstance(v.margin, np.ndarray) and v.margin.shape == (3, 291)
    assert np.array_equal(s.lengths, np.arange(10, 301))
    # margin(a, b) is row (a, b) of the matrix, and its negative the other way round.
    assert np.array_equal(s.margin("1d6", "2d6"), v.margin[v.pairs.index((0, 1))])
    assert np.array_equal(s.margin(1, 0), -v.margin[v.pairs.index((0, 1))])


def test_sweep_variants_step_and_jumps_match_cli():
    # The CLI crosses --overshoot with --order, rules outer: the same four variants.
    variants = [(r, o) for r in ("stay", "bounce") for o in ("simultaneous", "coin")]
    s = overshoot.sweep("1d6", "2d6", lengths=range(20, 121, 5), jumps=["7:3"], variants=variants)
    doc = cli_json("sweep", "1d6", "2d6", "--lengths", "20..120", "--step", 5, "--jump", "7:3",
                   "--overshoot", "stay,bounce", "--order", "simultaneous,coin")
    assert same_bytes(s, doc)
    assert [(v.overshoot, v.order) for v in s.variants] == variants
    assert list(s.lengths) == list(range(20, 121, 5))


def test_sweep_errors():
    with pytest.raises(ValueError):
        overshoot.sweep("1d6", "2d6", lengths=(10, 5))
    with pytest.raises(ValueError, match="listed twice"):
        overshoot.sweep("1d6", "2d6", lengths=(10, 20), variants=[("stay", "coin"), ("stay", "coin")])


def test_hunt_matches_cli():
    seen = []
    h = overshoot.hunt("dice(count=1..3, sides=4,6)", lengths=(10, 60), progress=lambda d, t: seen.append((d, t)))
    doc = cli_json("hunt", "dice(count=1..3, sides=4,6)", "--lengths", "10..60")
    assert same_bytes(h, doc)
    assert h.complete and len(h.cycles) == len(doc["cycles"])
    # The last report says every cell is done.
    assert seen and seen[-1][0] == seen[-1][1]


CHILD = r"""
import sys, overshoot
def progress(done, total):
    if done:
        print("running", flush=True)
overshoot.hunt("dice(count=1..4, sides=4,6,8,10,12)", lengths=(10, 1500), checkpoint=sys.argv[1], threads=1, progress=progress)
print("finished", flush=True)
"""


def test_sigint_stops_a_hunt_cleanly(tmp):
    ckpt = str(tmp / "hunt.ckpt")
    child = subprocess.Popen([sys.executable, "-c", CHILD, ckpt], stdout=subprocess.PIPE, stderr=subprocess.PIPE,
                             text=True, env=os.environ)
    try:
        assert child.stdout.readline().strip() == "running"
        child.send_signal(signal.SIGINT)
        sent = time.monotonic()
        out, err = child.communicate(timeout=120)
    finally:
        if child.poll() is None:
            child.kill()
    assert "finished" not in out
    assert child.returncode != 0
    last = err.strip().splitlines()[-1]
    assert last.startswith("KeyboardInterrupt: hunt interrupted:") and "resume=True" in last, err
    assert time.monotonic() - sent < 60
    assert os.path.getsize(ckpt) > 0
    # Resuming from the checkpoint finishes the work (that a resumed hunt gives
    # the uninterrupted hunt's bytes is tests/scripts/check_kill_resume.py's check).
    resumed = overshoot.hunt("dice(count=1..4, sides=4,6,8,10,12)", lengths=(10, 1500), checkpoint=ckpt, resume=True)
    assert resumed.complete and resumed.pairs_known == resumed.pairs_total
