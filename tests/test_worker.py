"""The worker task's fingerprint covers the code a worker runs, and only that code."""
import shutil
import subprocess
import sys
from pathlib import Path

import flamecharts
from flamecharts.sweep.worker import WORKER_CODE, code_fingerprint

PACKAGE = Path(flamecharts.__file__).parent


def _fingerprint_of(copy: Path) -> str:
    r = subprocess.run([sys.executable, "-c", "from flamecharts.sweep.worker import code_fingerprint; "
                        "print(code_fingerprint())"], env={"PYTHONPATH": str(copy)}, cwd=copy, capture_output=True,
                       text=True, check=True)
    return r.stdout.strip()


def test_the_fingerprint_follows_the_solver_and_ignores_the_parent_loop_and_charts(tmp_path):
    copy = tmp_path / "pkg"
    shutil.copytree(PACKAGE, copy / "flamecharts", ignore=shutil.ignore_patterns("__pycache__"))
    assert _fingerprint_of(copy) == code_fingerprint()
    for name in ("sweep/run.py", "outputs/charts/phi_charts.py", "cli/run.py", "pipeline.py"):
        with open(copy / "flamecharts" / name, "a") as fh:
            fh.write("\n# an edit outside the worker's code\n")
    assert _fingerprint_of(copy) == code_fingerprint()
    with open(copy / "flamecharts" / "chemistry" / "flame.py", "a") as fh:
        fh.write("\n# an edit of the solver\n")
    assert _fingerprint_of(copy) != code_fingerprint()


def test_every_file_the_worker_runs_is_fingerprinted():
    assert all((PACKAGE / name).is_file() for name in WORKER_CODE)
    assert {"chemistry/flame.py", "chemistry/mechanism.py", "sweep/worker.py"} <= set(WORKER_CODE)


def test_a_worker_loads_no_chart_or_table_library():
    """Workers import the worker task only: matplotlib, xarray, pandas and scipy stay out of
    every worker process (start-up time and memory; the package's public names load lazily)."""
    code = ("import sys, flamecharts, flamecharts.sweep.worker; "
            "print(sorted(m for m in ('matplotlib', 'xarray', 'pandas', 'scipy') if m in sys.modules))")
    r = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert r.stdout.strip() == "[]"
    r = subprocess.run([sys.executable, "-c", "import flamecharts; print(flamecharts.run.__module__)"],
                       capture_output=True, text=True, check=True)
    assert r.stdout.strip() == "flamecharts.pipeline"
