#!/usr/bin/python3
"""SIGKILL a checkpointing hunt at random moments; no work is lost.

Usage: check_kill_resume.py BINARY SOURCE_DIR

A hunt with --checkpoint is killed with SIGKILL (no chance to clean up) at
several random moments, each time resumed with --resume. After every kill,
every file the hunt writes must be absent, unchanged (the old file) or
complete: the checkpoint is parsed by an independent reader of the format in
src/hunt/checkpoint.hpp and must hold at least the records of the one before
it, and the result file is either absent or the full JSON document. The last
resume runs to the end; its result must equal an uninterrupted run byte for
byte. The checkpoint is saved about every 5 s, so the hunt is sized to run
longer than that; the kill moments are drawn from the CPU time of the
uninterrupted run (seeded, so the moments are the same run to run relative to
it), and a run is killed once it has used that much CPU: on a machine loaded
by other work the clock stretches from run to run, CPU time much less.
"""
import json
import os
import random
import signal
import struct
import subprocess
import sys
import tempfile
import time

BINARY = sys.argv[1]
HUNT = ["hunt", "dice(count=1..5, sides=4,6,8,10,12)", "--lengths", "10..3000", "--threads", "1", "--json"]


def fail(msg):
    print("FAIL:", msg)
    sys.exit(1)


def read_checkpoint(path):
    """Parses a checkpoint (format of src/hunt/checkpoint.hpp); returns
    (lengths, {(variant, a, b): bytes of the record}) or fails."""
    data = open(path, "rb").read()
    pos = 0
    header = []
    for _ in range(4):
        nl = data.find(b"\n", pos)
        if nl < 0:
            fail(f"{path}: header cut short ({len(data)} bytes)")
        header.append(data[pos:nl].decode("ascii", "replace"))
        pos = nl + 1
    if header[0] != "overshoot hunt checkpoint 2":
        fail(f"{path}: unknown header {header[0]!r}")
    if not header[1].startswith("fingerprint ") or not header[2].startswith("lengths ") \
            or not header[3].startswith("records "):
        fail(f"{path}: malformed header {header!r}")
    lengths = int(header[2].split()[1])
    records = int(header[3].split()[1])
    out = {}
    for k in range(records):
        if len(data) - pos < 20:
            fail(f"{path}: record {k} cut short")
        v, a, b, first, count = struct.unpack_from("<IIIII", data, pos)
        if first + count > lengths:
            fail(f"{path}: record {k} holds lengths {first}..{first + count - 1} of {lengths}")
        end = pos + 20 + 16 * count
        if end > len(data):
            fail(f"{path}: record {k} cut short")
        values = struct.unpack_from(f"<{2 * count}d", data, pos + 20)
        if not a < b:
            fail(f"{path}: record {k} names pair {a},{b}")
        if any(x != x for x in values):
            fail(f"{path}: record {k} holds NaN")
        # This hunt uses only the all-lengths engine: every record is whole.
        if first != 0 or count != lengths:
            fail(f"{path}: record {k} is partial ({first}, {count})")
        out[(v, a, b)] = data[pos:end]
        pos = end
    if pos != len(data):
        fail(f"{path}: {len(data) - pos} bytes after the last record")
    return lengths, out


def cpu_seconds(pid):
    """User plus system seconds of a running process (/proc/PID/stat), or None once it is gone."""
    try:
        fields = open(f"/proc/{pid}/stat").read().rsplit(")", 1)[1].split()
    except OSError:
        return None
    return (int(fields[11]) + int(fields[12])) / os.sysconf("SC_CLK_TCK")


def run_hunt(extra, cwd, kill_after=None):
    """Runs the hunt; with kill_after, SIGKILLs it once it has used that many
    seconds of CPU (CPU time, not the clock: a machine loaded by other work
    stretches the clock, and a moment drawn from one run's clock would often
    fall after the end of the next). Returns (exit status or None when killed, stderr)."""
    p = subprocess.Popen([BINARY] + HUNT + extra, cwd=cwd, stdout=subprocess.DEVNULL,
                         stderr=subprocess.PIPE)
    if kill_after is None:
        _, err = p.communicate()
        return p.returncode, err.decode()
    while p.poll() is None:
        used = cpu_seconds(p.pid)
        if used is not None and used >= kill_after:
            p.send_signal(signal.SIGKILL)
            p.communicate()
            return None, ""
        time.sleep(0.02)
    _, err = p.communicate()
    return p.returncode, err.decode()  # finished before the kill


def main():
    with tempfile.TemporaryDirectory(prefix="overshoot-kill-") as d:
        # The uninterrupted result, and how much CPU it takes.
        before = os.times()
        st, err = run_hunt(["--output", "ref.json"], d)
        after = os.times()
        duration = (after.children_user - before.children_user) + (after.children_system - before.children_system)
        if st != 0:
            fail(f"uninterrupted hunt: exit {st}: {err}")
        ref = open(os.path.join(d, "ref.json"), "rb").read()
        total = json.loads(ref)["totals"]["pairs"]  # a complete document
        if duration < 6:
            print(f"note: the hunt took only {duration:.1f} s of CPU; kills may land before the first checkpoint")

        rng = random.Random(20261201)
        cp = os.path.join(d, "hunt.ckpt")
        out = os.path.join(d, "out.json")
        previous = None  # (bytes, records) of the checkpoint after the last kill
        kills = 0
        finished = False
        for attempt in range(3):
            extra = ["--checkpoint", "hunt.ckpt", "--output", "out.json"]
            if os.path.exists(cp):
                extra.append("--resume")
            # A moment within what is left to do (the resumed run skips the
            # pairs in the checkpoint), so that most kills land.
            left = 1 - (len(previous[1]) / total if previous else 0)
            moment = rng.uniform(0.3, 0.9) * duration * max(left, 0.15)
            st, err = run_hunt(extra, d, kill_after=moment)
            if st is not None:
                if st != 0:
                    fail(f"run {attempt} (not killed): exit {st}: {err}")
                finished = True
                break
            kills += 1
            # The result file: absent, or complete (it is written once, at the end).
            if os.path.exists(out):
                body = open(out, "rb").read()
                try:
                    json.loads(body)
                except ValueError:
                    fail(f"kill {kills} at {moment:.2f} s left a partial result file ({len(body)} bytes)")
                if body != ref:
                    fail(f"kill {kills}: the result file differs from the uninterrupted one")
            # The checkpoint: absent (never written yet), the old one, or a complete new one.
            if os.path.exists(cp):
                body = open(cp, "rb").read()
                _, recs = read_checkpoint(cp)
                if previous is not None and body != previous[0]:
                    lost = set(previous[1]) - set(recs)
                    if lost:
                        fail(f"kill {kills}: the new checkpoint lost {len(lost)} finished pairs")
                    changed = [k for k in previous[1] if previous[1][k] != recs[k]]
                    if changed:
                        fail(f"kill {kills}: the checkpoint changed the results of {len(changed)} pairs")
                previous = (body, recs)
            elif previous is not None:
                fail(f"kill {kills}: the checkpoint disappeared")
            print(f"kill {kills} at {moment:.2f} s of CPU of {duration:.2f} s: checkpoint "
                  f"{len(previous[1]) if previous else 0} pairs")
        if not finished:
            st, err = run_hunt(["--checkpoint", "hunt.ckpt", "--output", "out.json"] +
                               (["--resume"] if os.path.exists(cp) else []), d)
            if st != 0:
                fail(f"final resume: exit {st}: {err}")
        got = open(out, "rb").read()
        if got != ref:
            fail("the resumed result differs from the uninterrupted one")
        if kills < 2:
            fail(f"only {kills} kill(s) landed before the hunt ended; the hunt is too short to test")
        print(f"ok: {kills} kills, resumed result identical to the uninterrupted run ({len(ref)} bytes)")


main()
