"""An analysis is its package and one line of the registry (flamecharts.analyses).

Two checks of that promise: the rest of the package names no registered analysis (no attribute,
function, variable or string literal equal to an analysis's table name or to one of its extra
solves), and a process whose registry is emptied before anything else loads runs a study, writes
its outputs without the analyses' columns, and refuses their tables as unknown keys.
"""
from __future__ import annotations

import ast
import subprocess
import sys
import textwrap
from pathlib import Path

import flamecharts
from flamecharts.analyses import ANALYSES, parts
from flamecharts.columns import COLUMNS

from conftest import write_h2_study

PACKAGE = Path(flamecharts.__file__).parent


def _names_of_analyses() -> set[str]:
    """Every registered analysis's table name and the names of its extra solves (per point, per study)."""
    names = set(ANALYSES) | {m.TABLE.name for m in parts("table")}
    return names | {p.name for m in parts("solve") for p in (*getattr(m, "PER_POINT", ()), *getattr(m, "PER_STUDY", ()))}


def _docstrings(tree: ast.AST) -> set[int]:
    """ids of the docstring nodes of a module, its classes and functions (prose may name an analysis)."""
    out = set()
    for node in ast.walk(tree):
        if isinstance(node, (ast.Module, ast.ClassDef, ast.FunctionDef, ast.AsyncFunctionDef)) and node.body:
            first = node.body[0]
            if isinstance(first, ast.Expr) and isinstance(first.value, ast.Constant):
                out.add(id(first.value))
    return out


def test_nothing_outside_an_analysis_names_it():
    names = _names_of_analyses()
    assert {"emissions", "flame_response", "zeldovich", "equal_tad", "stretch", "strain_ladders"} <= names
    found = []
    for path in PACKAGE.rglob("*.py"):
        rel = path.relative_to(PACKAGE)
        if rel.parts[0] == "analyses" or rel.parts[0] in ("physics", "chemistry"):  # science is shared
            continue
        tree = ast.parse(path.read_text())
        docs = _docstrings(tree)
        for node in ast.walk(tree):
            word = (node.attr if isinstance(node, ast.Attribute) else node.id if isinstance(node, ast.Name)
                    else node.name if isinstance(node, (ast.FunctionDef, ast.ClassDef))
                    else node.value if isinstance(node, ast.Constant) and id(node) not in docs else None)
            if isinstance(word, str) and word in names:
                found.append(f"{rel}:{getattr(node, 'lineno', '?')} {word}")
    assert not found, found


def test_an_analysis_uses_only_public_names_of_the_core():
    """An analysis's parts import what the core offers (no ``_private`` name from outside their
    own package): the core may then change its internals without breaking an analysis."""
    found = []
    for path in (PACKAGE / "analyses").rglob("*.py"):
        package = path.relative_to(PACKAGE / "analyses").parts[0]
        for node in ast.walk(ast.parse(path.read_text())):
            own = isinstance(node, ast.ImportFrom) and node.level == 1 and package != "__init__.py"
            if isinstance(node, ast.ImportFrom) and not own:
                found += [f"{path.relative_to(PACKAGE)}:{node.lineno} {a.name}" for a in node.names
                          if a.name.startswith("_") and a.name != "__future__"]
    assert not found, found


EMPTY_REGISTRY = textwrap.dedent("""
    import sys
    import flamecharts.analyses as registry
    registry.ANALYSES = ()
    import flamecharts
    from flamecharts.errors import ConfigError
    res = flamecharts.run(sys.argv[1], out=sys.argv[2], jobs=1)
    header = open(sys.argv[2] + "/results.csv").readline()
    print("columns", len(header.split(",")), "nox" in header, "zeldovich_number" in header)
    try:
        flamecharts.load_study(sys.argv[3])
    except ConfigError as exc:
        print("refused", exc)
""")


def test_a_run_without_any_registered_analysis(tmp_path):
    """The registry emptied: a plain study runs and writes its outputs; [flame_response] is then
    an unknown key, as any table of a removed analysis is."""
    plain = write_h2_study(tmp_path, "plain", fractions="[0.0]", phis="[1.0]")
    plain.write_text('resolution = "coarse"\n' + plain.read_text())
    asking = write_h2_study(tmp_path, "asking", fractions="[0.0]", phis="[1.0]")
    asking.write_text(asking.read_text() + "\n[flame_response]\n")
    done = subprocess.run([sys.executable, "-c", EMPTY_REGISTRY, str(plain), str(tmp_path / "out"), str(asking)],
                          capture_output=True, text=True, timeout=600)
    assert done.returncode == 0, done.stderr[-2000:]
    lines = dict(line.split(" ", 1) for line in done.stdout.splitlines())
    n, nox, ze = lines["columns"].split()
    assert (nox, ze) == ("False", "True")  # the Lewis and Zeldovich columns are the core's, filled or not
    assert int(n) == len(COLUMNS) - sum(len(m.POINT_COLUMNS) for m in parts("columns"))
    assert lines["refused"].startswith("unknown key 'flame_response'")
    assert (tmp_path / "out" / "report.html").is_file()
