#!/usr/bin/python3
"""A hunt run as MPI ranks gives the bytes of a one-process run; a rank killed
mid-run fails the whole run cleanly, and --resume completes it.

Usage: check_mpi_hunt.py BINARY MPIEXEC

Checks (issue: hunts beyond one machine):
- `mpirun -np 1`, `-np 2` and `-np 3` (oversubscribed on this 2-core machine)
  print byte-identical JSON and text to the plain run of the same hunt, on a
  hunt with an all-lengths variant (shards of pairs) and a bounce variant
  (shards of length blocks);
- `--plan-only` under `-np 3` lists shards for all three ranks and computes
  nothing (no output file, well under the run's time);
- bad input prints one line once; a rank over its memory limit ends the job
  with its own line and leaves no output file;
- SIGKILL of rank 1 once it has saved its checkpoint: mpirun exits non-zero,
  no output file is left, the rank files hold the finished work; the same
  command with --resume (on 2 ranks, then again from scratch on 3 ranks to
  show the checkpoints do not depend on the rank count) redoes only what is
  missing and prints exactly the plain run's bytes; the rank files are gone
  after a finished run.
The reference is the plain one-process run of the same binary: the MPI path
must not change a single byte (common practice for parallel reductions, no
published source).
"""
import json
import os
import signal
import subprocess
import sys
import tempfile
import time

BINARY, MPIEXEC = sys.argv[1], sys.argv[2]
ENV = dict(os.environ, OMPI_ALLOW_RUN_AS_ROOT="1", OMPI_ALLOW_RUN_AS_ROOT_CONFIRM="1",
           OMPI_MCA_rmaps_base_oversubscribe="1")
SHORT = ["hunt", "dice(count=1..3, sides=4,6,8)", "--lengths", "10..180", "--overshoot", "stay,bounce,pass", "--threads", "1"]
# Long enough that rank 1 saves a checkpoint (every 2 s) well before it ends:
# about 7 s of CPU in one process, so each of two ranks runs past 3 s.
LONG = ["hunt", "dice(count=1..6, sides=4,6,8,10,12,20)", "--lengths", "10..2000", "--threads", "1", "--json"]


def fail(msg):
    print("FAIL:", msg)
    sys.exit(1)


# Under the sanitizer build (tools/sanitize.sh) the ranks keep AddressSanitizer
# and UBSan but not the leak check: Open MPI 4.1 leaves allocations of its own
# at MPI_Finalize, some in components it has already unloaded, which no
# suppression can name. Plain runs keep the leak check.
MPI_ENV = dict(ENV)
if "detect_leaks=1" in MPI_ENV.get("ASAN_OPTIONS", ""):
    MPI_ENV["ASAN_OPTIONS"] = MPI_ENV["ASAN_OPTIONS"].replace("detect_leaks=1", "detect_leaks=0")


def mpi(np, args):
    return [MPIEXEC, "--oversubscribe", "-np", str(np), BINARY] + args


def run(cmd, cwd, timeout=600):
    env = MPI_ENV if cmd[0] == MPIEXEC else ENV
    p = subprocess.run(cmd, cwd=cwd, env=env, capture_output=True, timeout=timeout)
    return p.returncode, p.stdout, p.stderr.decode(errors="replace")


def same_output(d):
    for fmt in (["--json"], []):
        st, ref, err = run([BINARY] + SHORT + fmt, d)
        if st != 0:
            fail(f"plain run: exit {st}: {err}")
        if fmt:
            doc = json.loads(ref)
            if not doc["complete"] or doc["totals"]["distinct_sets"] == 0:
                fail("the reference hunt should be complete and find cycles")
        for np in ((1, 2, 3) if fmt else (2,)):
            st, out, err = run(mpi(np, SHORT + fmt), d)
            if st != 0:
                fail(f"-np {np}: exit {st}: {err}")
            if out != ref:
                fail(f"-np {np} {' '.join(fmt)}: output differs from the plain run")
            print(f"-np {np} {' '.join(fmt) or '(text)'}: {len(out)} bytes, identical to the plain run")


# A board with jumps (board by board, in blocks of lengths), anchored to the
# finish, with a custom-dice family: the same bytes from every rank count.
JUMPS = ["hunt", "dice(count=1..3, sides=4,6); custom(faces=3, values=0..5, sum=7)", "--lengths", "12..60",
         "--jump", "40:47,55:30", "--anchor", "finish", "--order", "simultaneous,coin", "--threads", "1", "--json"]


def same_output_with_jumps(d):
    st, ref, err = run([BINARY] + JUMPS, d)
    if st != 0:
        fail(f"plain run with jumps: exit {st}: {err}")
    doc = json.loads(ref)
    if not doc["complete"] or doc["jumps"] != [[40, 47], [55, 30]] or not doc["cycles"]:
        fail("the hunt with jumps should be complete, carry its jumps and find cycles")
    for np in (2, 3):
        st, out, err = run(mpi(np, JUMPS), d)
        if st != 0:
            fail(f"-np {np} with jumps: exit {st}: {err}")
        if out != ref:
            fail(f"-np {np} with jumps: output differs from the plain run")
        print(f"-np {np} with jumps: {len(out)} bytes, identical to the plain run")


def plan_only(d):
    t0 = time.monotonic()
    st, out, err = run(mpi(3, SHORT + ["--plan-only", "--json"]), d)
    if st != 0:
        fail(f"--plan-only: exit {st}: {err}")
    plan = json.loads(out)
    ranks = {s["rank"] for s in plan["shards"]}
    if plan["ranks"] != 3 or ranks != {0, 1, 2}:
        fail(f"--plan-only on 3 ranks: ranks {plan['ranks']}, shards on {sorted(ranks)}")
    methods = {s["method"] for s in plan["shards"]}
    if "board" not in methods:
        fail(f"the bounce variant should be split into length blocks: methods {methods}")
    covered = sum(len(s["pairs"]) for s in plan["shards"] if s["method"] != "board")
    if covered != 2 * 36:  # two all-lengths variants (stay, pass) of 36 pairs each
        fail(f"the all-lengths shards cover {covered} pairs, expected 72")
    print(f"--plan-only: {len(plan['shards'])} shards over 3 ranks in {time.monotonic() - t0:.1f} s")


def rank_pids(mpirun_pid):
    """Pids of the ranks started by this mpirun, by rank."""
    out = {}
    for pid in os.listdir("/proc"):
        if not pid.isdigit():
            continue
        try:
            with open(f"/proc/{pid}/stat") as f:
                ppid = int(f.read().rsplit(")", 1)[1].split()[1])
            if ppid != mpirun_pid:
                continue
            with open(f"/proc/{pid}/environ", "rb") as f:
                env = dict(e.split(b"=", 1) for e in f.read().split(b"\0") if b"=" in e)
            if b"OMPI_COMM_WORLD_RANK" in env:
                out[int(env[b"OMPI_COMM_WORLD_RANK"])] = int(pid)
        except (OSError, ValueError, IndexError):
            continue
    return out


def kill_and_resume(d):
    st, ref, err = run([BINARY] + LONG, d)
    if st != 0:
        fail(f"plain long run: exit {st}: {err}")
    ck = os.path.join(d, "hunt.ckpt")
    out = os.path.join(d, "out.json")
    args = LONG + ["--checkpoint", ck, "--output", out]
    p = subprocess.Popen(mpi(2, args), cwd=d, env=MPI_ENV, stdout=subprocess.PIPE, stderr=subprocess.PIPE)
    t0 = time.monotonic()
    while not os.path.exists(ck + ".rank1"):
        if p.poll() is not None:
            fail(f"the hunt ended (exit {p.returncode}) before rank 1 saved a checkpoint: make it longer")
        if time.monotonic() - t0 > 120:
            p.kill()
            fail("rank 1 saved no checkpoint within 120 s")
        time.sleep(0.05)
    pids = rank_pids(p.pid)
    if 1 not in pids:
        p.kill()
        fail(f"cannot find rank 1 among the children of mpirun: {pids}")
    os.kill(pids[1], signal.SIGKILL)
    killed_at = time.monotonic() - t0
    try:
        _, err = p.communicate(timeout=60)
    except subprocess.TimeoutExpired:
        p.kill()
        fail("mpirun did not end within 60 s of a rank's death")
    err = err.decode(errors="replace")
    if p.returncode == 0:
        fail("the run with a killed rank exited 0")
    if os.path.exists(out):
        fail("the run with a killed rank left an output file")
    leftovers = [f for f in os.listdir(d) if f.startswith("out.json")]
    if leftovers:
        fail(f"temporary output files left: {leftovers}")
    print(f"rank 1 killed at {killed_at:.1f} s: mpirun exit {p.returncode}, no output file")
    if "unfinished shards" in err:
        print("  rank 0 said: " + next(l for l in err.splitlines() if "unfinished shards" in l))
    # Resume on 3 ranks: only what is missing is planned.
    st, _, err = run(mpi(3, args + ["--resume", "--plan"]), d)
    if st != 0:
        fail(f"resume: exit {st}: {err}")
    known = [l for l in err.splitlines() if "pairs already known" in l]
    if not known or known[0].split(";")[1].strip().startswith("0 of"):
        fail(f"the resumed run should start from the saved pairs: {known}")
    print("  resume: " + known[0].split(";")[1].strip())
    if open(out, "rb").read() != ref:
        fail("the resumed run's output differs from the plain run")
    rank_files = [f for f in os.listdir(d) if ".rank" in f]
    if rank_files:
        fail(f"rank files left after a finished run: {rank_files}")
    print("  resumed output identical to the plain run; rank files merged and removed")


def errors(d):
    """Bad input: one line, once. A rank that fails: its line, the whole job ends, no output."""
    # A bad argument, a bad family and a bad board: each said once, by rank 0.
    for args, line in [
            (["hunt", "dice(count=1..3, sides=4,6)", "--lengths", "10..20", "--cycle-length", "2"],
             "overshoot: error: --cycle-length 2 is outside 3..1000 (see --help)"),
            (["hunt", "1..3q{4,6}", "--lengths", "10..20"], None),
            (["hunt", "dice(count=1..3, sides=4,6)", "--lengths", "10..20", "--require", "nosuch"], None)]:
        st, _, err = run(mpi(2, args), d)
        lines = [l for l in err.splitlines() if l.startswith("overshoot:")]
        if st == 0 or len(lines) != 1 or (line is not None and lines[0] != line):
            fail(f"bad input under 2 ranks ({' '.join(args)}): exit {st}, lines {lines}")
    out = os.path.join(d, "limit.txt")
    st, _, err = run(mpi(2, ["hunt", "dice(count=1..6, sides=4,20)", "--lengths", "10..2000", "--memory-limit", "2",
                             "--threads", "1", "--output", out]), d)
    if st == 0 or "overshoot: error: rank" not in err or "memory limit" not in err:
        fail(f"a rank over its memory limit: exit {st}, stderr {err!r}")
    if os.path.exists(out):
        fail("a failed run left an output file")
    print("errors: bad input said once; a failing rank ends the job with its reason")


def main():
    with tempfile.TemporaryDirectory(prefix="overshoot-mpi-") as d:
        same_output(d)
        same_output_with_jumps(d)
        plan_only(d)
        errors(d)
        kill_and_resume(d)
    print("PASS")


main()
