"""The package's layers: nothing imports upward, no import cycles (a static check of every module)."""
import ast
from pathlib import Path

import flamecharts

PACKAGE = Path(flamecharts.__file__).parent

#: Lowest first. A module may import from its own layer and the layers below, never above.
LAYERS = (
    ("_version", "errors", "columns", "outcome", "numerics", "facts", "analyses"),  # names, units, status words, errors,
    # grid settings, what a run keeps of its mechanism
    ("physics",),      # pure functions with cited sources
    ("chemistry",),    # the only code that imports Cantera
    ("config",),       # TOML -> validated Study
    ("store",),        # SQLite store, migrations, run lock
    ("sweep",),        # points, warm-start tree, scheduler, worker task, backends, run loop
    ("design",),       # indicators, margins, verdicts, warnings from stored flames
    ("results", "record_tables"),  # rows and the labelled table (xarray); the limits and ladders as tables
    ("admissible",),   # limit searches: admissible blend fraction, equivalence-ratio window
    ("outputs",),      # CSV, netCDF, charts, report
    ("pipeline",),     # run(), open_results()
    ("cli", "__init__", "__main__"),
)
RANK = {name: i for i, names in enumerate(LAYERS) for name in names}
#: An analysis's package (flamecharts/analyses/NAME/) holds one module per part, each in the layer
#: its file name says; the package's __init__ and the registry (analyses/__init__.py) are the lowest.
PART_LAYERS = {"columns": "columns", "table": "config", "solve": "sweep", "task": "sweep", "readout": "design",
               "dataset": "results", "report": "outputs", "charts": "outputs", "console": "cli"}


def _modules() -> dict[str, Path]:
    return {".".join(p.relative_to(PACKAGE).with_suffix("").parts): p for p in PACKAGE.rglob("*.py")}


def _imports(name: str, path: Path) -> set[str]:
    """Modules of the package that ``name`` imports (absolute dotted names below flamecharts)."""
    pkg = name.split(".")[:-1]  # the package the module sits in (for __init__: the package itself)
    out = set()
    for node in ast.walk(ast.parse(path.read_text())):
        if isinstance(node, ast.ImportFrom):
            if node.level:
                base = pkg[:len(pkg) - node.level + 1] if node.level > 1 else pkg
                target = base + (node.module.split(".") if node.module else [])
            elif node.module and node.module.startswith("flamecharts"):
                target = node.module.split(".")[1:]
            else:
                continue
            for alias in node.names:  # "from . import x" names a module; "from .m import f" names m
                out.add(".".join(target + [alias.name]))
            if node.module:
                out.add(".".join(target))
        elif isinstance(node, ast.Import):
            out |= {a.name.split(".", 1)[1] for a in node.names if a.name.startswith("flamecharts.")}
    mods = _modules()
    found = {m if m in mods else m + ".__init__" for m in out if m in mods or m + ".__init__" in mods}
    return found - {name}


def _top(name: str) -> str:
    """The layer name of module ``name`` (an analysis's part: the layer of its file name)."""
    parts = name.split(".")
    if parts[0] == "analyses" and len(parts) == 3 and parts[2] != "__init__":
        return PART_LAYERS[parts[2]]
    return parts[0]


def test_every_module_has_a_layer():
    assert {_top(m) for m in _modules()} <= set(RANK), {_top(m) for m in _modules()} - set(RANK)


def test_nothing_imports_a_higher_layer():
    bad = []
    for name, path in _modules().items():
        for target in _imports(name, path):
            if RANK[_top(target)] > RANK[_top(name)]:
                bad.append(f"{name} -> {target}")
    assert not bad, bad


def test_no_import_cycles():
    graph = {}
    mods = _modules()
    for name, path in mods.items():
        graph[name] = _imports(name, path)
    state: dict[str, int] = {}
    cycles = []

    def visit(n, stack):
        state[n] = 1
        for m in sorted(graph.get(n, ())):
            if state.get(m) == 1:
                cycles.append(stack[stack.index(m):] + [m])
            elif m not in state:
                visit(m, stack + [m])
        state[n] = 2

    for n in sorted(graph):
        if n not in state:
            visit(n, [n])
    assert not cycles, cycles


def test_the_check_sees_a_wrong_import(tmp_path):
    """The checker itself finds an upward import (so the tests above can fail)."""
    fake = tmp_path / "m.py"
    fake.write_text("from ..cli import main\nfrom ..physics import mixtures\n")
    assert _imports("physics.m", fake) >= {"cli.__init__", "physics.mixtures"}


def test_the_read_side_does_not_import_the_chemistry_layer():
    """Design read-out, results, limits and outputs (CSV, netCDF, charts, report) import nothing
    of the chemistry layer, anywhere in their code: what they need of the mechanism was stored
    by the run (facts.MechanismFacts, sweep.worker.mixture_properties); tests/test_read_side.py
    runs them with the mechanism moved away and checks Cantera is never imported."""
    mods = _modules()
    for name, path in mods.items():
        if _top(name) in ("design", "results", "admissible", "outputs"):
            assert not {m for m in _imports(name, path) if _top(m) == "chemistry"}, name


def test_public_functions_and_those_taking_a_study_are_annotated():
    """Every public function, and every function with a ``study`` parameter, has annotations on
    its parameters and its return (mypy checks them in .ci/run)."""
    bare = []
    for name, path in _modules().items():
        for node in ast.walk(ast.parse(path.read_text())):
            if not isinstance(node, (ast.FunctionDef, ast.AsyncFunctionDef)):
                continue
            params = [a for a in node.args.posonlyargs + node.args.args + node.args.kwonlyargs
                      if a.arg not in ("self", "cls")]
            if node.name.startswith("_") and not any(a.arg == "study" for a in params):
                continue
            if node.returns is None or any(a.annotation is None for a in params):
                bare.append(f"{name}.{node.name}")
    assert not bare, bare
