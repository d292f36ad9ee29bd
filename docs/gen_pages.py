"""Regenerate the parts of the documentation pages that are made from the code.

    python3 docs/gen_pages.py            # rewrite them
    python3 docs/gen_pages.py --check    # exit 1 naming each page that is out of date

Each generated page (study-file.md, outputs.md, python-api.md) has a hand-written head and,
after the MARKER line, a part written by its generator (docs/gen_study_reference.py,
docs/gen_outputs_reference.py, docs/gen_api_reference.py) from the code's own tables:
config.py's allowed keys and defaults, columns.py's columns and units, the chart registry's
captions, the public docstrings. Edit the head by hand; change the generated part in the
code or the generator, then run this script. tests/test_docs.py fails while a committed page
differs from what its generator gives.
"""
from __future__ import annotations

import importlib.util
import sys
from collections.abc import Callable
from pathlib import Path
from types import ModuleType

DOCS = Path(__file__).resolve().parent
#: The line after which a page is generated; everything above it is hand-written.
MARKER = "<!-- Generated from the code below this line by docs/gen_pages.py: edit the generator, not this part. -->"


def _module(name: str) -> ModuleType:
    """A generator module of this folder, loaded by its path (docs/ is not a package)."""
    if name not in sys.modules:
        spec = importlib.util.spec_from_file_location(name, DOCS / f"{name}.py")
        assert spec is not None and spec.loader is not None, f"docs/{name}.py is missing"
        module = importlib.util.module_from_spec(spec)
        sys.modules[name] = module
        spec.loader.exec_module(module)
    return sys.modules[name]


def generators() -> dict[str, Callable[[], str]]:
    """Page (relative to docs/) -> the function that renders its generated part."""
    modules = [_module(n) for n in ("gen_study_reference", "gen_outputs_reference", "gen_api_reference")]
    return {m.PAGE: m.render for m in modules}


def expected(page: str, generated: str) -> str:
    """The page's text with its generated part replaced by ``generated``."""
    text = (DOCS / page).read_text(encoding="utf-8")
    head, found, _ = text.partition(MARKER)
    if not found:
        raise SystemExit(f"docs/{page} has no marker line; put this line where its generated part starts:\n{MARKER}")
    return head + MARKER + "\n\n" + generated.strip() + "\n"


def stale_pages() -> list[str]:
    """The generated pages whose committed text differs from what the code gives now."""
    return [page for page, render in generators().items()
            if (DOCS / page).read_text(encoding="utf-8") != expected(page, render())]


def main(argv: list[str]) -> int:
    if "--check" in argv:
        stale = stale_pages()
        for page in stale:
            print(f"docs/{page} is out of date with the code: run python3 docs/gen_pages.py", file=sys.stderr)
        return 1 if stale else 0
    for page, render in generators().items():
        new = expected(page, render())
        if (DOCS / page).read_text(encoding="utf-8") != new:
            (DOCS / page).write_text(new, encoding="utf-8")
            print(f"wrote docs/{page}")
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
