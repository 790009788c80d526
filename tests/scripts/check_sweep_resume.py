#!/usr/bin/python3
"""Ctrl-C and --resume on a real hunt process.

Common practice, no published source: an interrupted long run must leave a
valid partial result and a checkpoint, and resuming must give exactly the bytes
of an uninterrupted run. Sends SIGINT to a running hunt, checks the exit status
(130), the partial output and the checkpoint, resumes, and compares bytes with
an uninterrupted run (and with --stop-after-pairs, the deterministic variant).
Usage: check_sweep_resume.py BINARY SOURCE_DIR
"""
import os
import signal
import subprocess
import sys
import tempfile
import time

BIN = sys.argv[1]
ARGS = ["hunt", "dice(count=1..4, sides=4,6,8,10)", "--lengths", "10..700", "--threads", "2"]
# The interrupted run needs a hunt that is still computing a second after it
# starts, on an idle machine too (about 2 s of CPU here), so that Ctrl-C lands
# mid-run rather than racing the end of the run.
SLOW = ["hunt", "dice(count=1..5, sides=4,6,8,10,12)", "--lengths", "10..1500", "--threads", "1"]
failures = 0


def check(cond, what):
    global failures
    if not cond:
        failures += 1
        print("FAIL:", what)


with tempfile.TemporaryDirectory() as tmp:
    whole = subprocess.run([BIN, *SLOW], capture_output=True, text=True)
    check(whole.returncode == 0, f"uninterrupted hunt exit {whole.returncode}: {whole.stderr}")

    ck = os.path.join(tmp, "hunt.ckpt")
    p = subprocess.Popen([BIN, *SLOW, "--checkpoint", ck], stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True)
    time.sleep(1.0)
    p.send_signal(signal.SIGINT)
    out, err = p.communicate(timeout=600)
    check(p.returncode != 0, "the hunt finished before the signal arrived: the interrupt path was not exercised "
          "(make SLOW longer)")
    check(p.returncode == 130, f"interrupted hunt exit {p.returncode}: {err}")
    check("INTERRUPTED" in out, "the partial result does not say it is partial")
    check(os.path.exists(ck), "no checkpoint after Ctrl-C")
    check(not [f for f in os.listdir(tmp) if ".tmp." in f], "a temporary file was left behind")
    resumed = subprocess.run([BIN, *SLOW, "--checkpoint", ck, "--resume"], capture_output=True, text=True)
    check(resumed.returncode == 0, f"resumed hunt exit {resumed.returncode}: {resumed.stderr}")
    check(resumed.stdout == whole.stdout, "resumed output differs from the uninterrupted run")

    ck2 = os.path.join(tmp, "batch.ckpt")
    part = subprocess.run([BIN, *ARGS, "--checkpoint", ck2, "--stop-after-pairs", "40", "--json"],
                          capture_output=True, text=True)
    check(part.returncode == 130, f"--stop-after-pairs exit {part.returncode}")
    check('"complete": false' in part.stdout, "a stopped hunt must say complete: false")
    again = subprocess.run([BIN, *ARGS, "--checkpoint", ck2, "--resume", "--json"], capture_output=True, text=True)
    full = subprocess.run([BIN, *ARGS, "--json"], capture_output=True, text=True)
    check(again.returncode == 0 and again.stdout == full.stdout, "resumed JSON differs from the uninterrupted JSON")
    bad = subprocess.run([BIN, "hunt", "1..3d6", "--lengths", "10..20", "--checkpoint", ck2, "--resume"],
                         capture_output=True, text=True)
    check(bad.returncode == 2 and "different hunt" in bad.stderr, "a foreign checkpoint must be refused (exit 2)")
print(f"{failures} failures")
sys.exit(1 if failures else 0)
