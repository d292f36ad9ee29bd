"""Shared fixtures: small hydrogen (h2o2.yaml) studies that solve in seconds, and a CLI runner."""
from __future__ import annotations

import subprocess
import sys
import textwrap
from pathlib import Path

import pytest

H2_STUDY = """
title = "Test rig: hydrogen and diluted hydrogen in air"
mechanism = "h2o2.yaml"
transport = "mixture-averaged"

[fuels]
diluted = {{ H2 = 0.6, N2 = 0.4 }}
hydrogen = {{ H2 = 1.0 }}

[oxidizers]
air = {{ O2 = 1.0, N2 = 3.76 }}

[sweep]
fuel = ["diluted"]
oxidizer = ["air"]
blend = {{ with = "hydrogen", fraction = {fractions} }}
equivalence_ratio = {phis}
pressure_bar = {pressures}
unburned_temperature_K = [300.0]
"""


def write_h2_study(folder: Path, name: str = "h2rig", fractions="[0.0, 0.5]", phis="[0.7, 1.0, 1.3]",
                   pressures="[1.0]", extra: str = "") -> Path:
    """Write a small h2o2 study config and return its path."""
    text = textwrap.dedent(H2_STUDY.format(fractions=fractions, phis=phis, pressures=pressures))
    if extra:
        head, sep, tail = text.partition("[fuels]")
        text = head + extra.strip() + "\n\n" + sep + tail
    path = Path(folder) / f"{name}.toml"
    path.write_text(text)
    return path


@pytest.fixture
def h2_config(tmp_path):
    return write_h2_study(tmp_path)


def run_cli(*args, cwd=None, timeout=600):
    """Run ``python -m flamecharts ARGS``; returns the CompletedProcess (text)."""
    return subprocess.run([sys.executable, "-m", "flamecharts", *map(str, args)], cwd=cwd,
                          capture_output=True, text=True, timeout=timeout)


#: The test files that take longest (GRI-Mech 3.0 studies, strained-flame ladders), run first. The suite
#: runs on two processes, a whole file each (pytest-xdist, --dist loadfile, which hands out files in
#: collection order): a long file started last would leave one process working alone at the end.
LONGEST_FIRST = ("test_validation.py", "test_stretch.py", "test_skeletal.py", "test_faults.py", "test_charts.py",
                 "test_limits.py", "test_run.py", "test_flame_response.py", "test_mechanisms.py", "test_emissions.py",
                 "test_uncertainty.py", "test_cluster.py", "test_emissions_core.py")


def pytest_collection_modifyitems(session, config, items):
    """Collection order with LONGEST_FIRST's files ahead, each file's tests in their own order (a stable
    sort: every process computes the same order, as xdist requires)."""
    rank = {name: i for i, name in enumerate(LONGEST_FIRST)}
    items.sort(key=lambda item: rank.get(item.path.name, len(rank)))


#: Command-line marks of worker processes: loky's, and a local Dask cluster's (multiprocessing spawn).
WORKER_MARKS = ("LokyProcess", "spawn_main")


def run_workers(pid: int) -> list:
    """The worker processes (psutil) of the run with this pid, loky or local Dask, named by
    their command line (not the resource trackers, nor a child between fork and exec,
    which still shows the parent's command line)."""
    import psutil

    try:
        kids = psutil.Process(pid).children(recursive=True)
    except psutil.NoSuchProcess:
        return []
    out = []
    for kid in kids:
        try:
            if any(mark in " ".join(kid.cmdline()) for mark in WORKER_MARKS):
                out.append(kid)
        except psutil.Error:
            pass
    return out


@pytest.fixture
def cli():
    return run_cli
