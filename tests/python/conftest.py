"""Shared fixtures of the Python module's tests (pytest, Debian's python3-pytest).

CTest runs each tests/python/test_*.py with PYTHONPATH=build/python and
OVERSHOOT_BINARY naming the command-line program, whose --json output is what
every result's to_dict() must equal byte for byte after json.dumps(sort_keys=True).
"""
import json
import os
import subprocess

import pytest

BINARY = os.environ.get("OVERSHOOT_BINARY", "build/overshoot")
SOURCE = os.environ.get("OVERSHOOT_SOURCE", os.path.join(os.path.dirname(__file__), "..", ".."))


def cli(*args):
    """Runs the command line; returns the CompletedProcess."""
    return subprocess.run([BINARY, *map(str, args)], capture_output=True, text=True)


def cli_json(*args):
    """The --json document of one command, parsed."""
    p = cli(*args, "--json")
    assert p.returncode == 0, p.stderr
    return json.loads(p.stdout)


def cli_error(*args):
    """The one-line message of a refused command, without the program's prefix."""
    p = cli(*args)
    assert p.returncode == 2, (p.returncode, p.stdout, p.stderr)
    line = p.stderr.strip()
    assert "\n" not in line
    prefix = "overshoot: error: "
    assert line.startswith(prefix), line
    return line[len(prefix):]


def same_bytes(result, document):
    """to_dict() of a result against the CLI's document, as the issue asks."""
    return json.dumps(result.to_dict(), sort_keys=True) == json.dumps(document, sort_keys=True)


def data(name):
    return os.path.join(SOURCE, "data", name)


@pytest.fixture
def tmp(tmp_path):
    return tmp_path
