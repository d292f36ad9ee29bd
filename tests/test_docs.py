"""The documentation site (mkdocs.yml, docs/): it builds in strict mode, a broken link fails that
build, the pages generated from the code are up to date with it, and the study files the pages
show are valid studies.

mkdocs is in the [test] extra, so these tests run wherever the README's test command runs; without
it they fail (never skip) and say how to install it.
"""
from __future__ import annotations

import importlib.util
import re
import shutil
import subprocess
import sys
from pathlib import Path

import pytest

from flamecharts.config import study_from_toml

ROOT = Path(__file__).resolve().parent.parent
DOCS = ROOT / "docs"


def _require_mkdocs() -> None:
    if importlib.util.find_spec("mkdocs") is None:
        pytest.fail("mkdocs is not installed: it is in the test extra (pip install -e '.[test]'), or pip install -e "
                    "'.[docs]'; the documentation tests must not be skipped")


def _build(config: Path, site: Path) -> subprocess.CompletedProcess:
    return subprocess.run([sys.executable, "-m", "mkdocs", "build", "--strict", "-f", str(config),
                           "-d", str(site)], capture_output=True, text=True, timeout=120)


def _nav_pages() -> list[str]:
    """The pages mkdocs.yml's nav lists."""
    import yaml  # PyYAML comes with mkdocs

    nav = yaml.safe_load((ROOT / "mkdocs.yml").read_text(encoding="utf-8"))["nav"]
    return [page for entry in nav for page in entry.values()]


def test_the_site_builds_in_strict_mode_with_every_page(tmp_path):
    _require_mkdocs()
    site = tmp_path / "site"
    done = _build(ROOT / "mkdocs.yml", site)
    assert done.returncode == 0, f"mkdocs build --strict failed:\n{done.stdout}\n{done.stderr}"
    pages = _nav_pages()
    assert {"index.md", "getting-started.md", "study-file.md", "outputs.md", "python-api.md", "changelog.md",
            "benchmarks.md", "limits.md", "references.md", "research/premixer-sources.md", "sweeps.md",
            "indicators.md", "premixers.md", "flame-response.md", "emissions.md", "error-bars.md", "run-time.md",
            "cluster.md", "guarantees.md"} <= set(pages)
    for page in pages:  # use_directory_urls is off: page.md -> page.html
        assert (site / page.replace(".md", ".html")).is_file(), page
    # the changelog page is CHANGELOG.md at the root, rendered at build time
    newest = next(line for line in (ROOT / "CHANGELOG.md").read_text(encoding="utf-8").splitlines()
                  if line.startswith("### "))[4:]
    words = re.findall(r"[A-Za-z]{4,}", newest)[:4]
    changelog = (site / "changelog.html").read_text(encoding="utf-8")
    assert all(w in changelog for w in words), f"the changelog page lacks CHANGELOG.md's newest heading {newest!r}"
    # the front page carries the cautions and its picture
    index = (site / "index.html").read_text(encoding="utf-8")
    assert "not certification" in index and "confirm every margin by test" in index
    assert (site / "demo_flame_speed.png").is_file() and 'src="demo_flame_speed.png"' in index


def test_the_readme_is_a_front_page_whose_links_resolve():
    """README.md (which the strict build does not see) links every page of the site's nav by its
    path in docs/, the changelog and DEVELOPERS.md, and each relative link it has reaches a file
    and, with #anchor, a heading there."""
    _require_mkdocs()
    from markdown.extensions.toc import slugify  # Markdown comes with mkdocs

    readme = (ROOT / "README.md").read_text(encoding="utf-8")
    links = re.findall(r"\]\(([^)\s]+)\)", readme)
    targets = {link.partition("#")[0] for link in links if "://" not in link}
    # the site's own front page (index.md) stands for the README there; the changelog is CHANGELOG.md
    pages = {f"docs/{page}" for page in _nav_pages() if page not in ("index.md", "changelog.md")}
    assert pages | {"CHANGELOG.md", "DEVELOPERS.md"} <= targets
    for link in links:
        if "://" in link:
            continue
        path, _, anchor = link.partition("#")
        assert (ROOT / path).is_file(), f"README links {link}: no such file"
        if anchor:
            headings = re.findall(r"^#+ (.+)$", (ROOT / path).read_text(encoding="utf-8"), re.M)
            assert anchor in {slugify(h.strip(), "-") for h in headings}, f"README links {link}: no such heading"


def test_a_broken_link_fails_the_strict_build(tmp_path):
    """The strict build is not lenient: a link to a missing page, or to a missing anchor, fails it."""
    _require_mkdocs()
    copy = tmp_path / "project"
    shutil.copytree(DOCS, copy / "docs", ignore=shutil.ignore_patterns("__pycache__"))
    shutil.copy(ROOT / "mkdocs.yml", copy / "mkdocs.yml")
    shutil.copy(ROOT / "CHANGELOG.md", copy / "CHANGELOG.md")
    index = copy / "docs" / "index.md"
    text = index.read_text(encoding="utf-8")
    for broken in ("[a page](no-such-page.md)", "[an anchor](outputs.md#no-such-section)"):
        index.write_text(text + f"\n{broken}\n", encoding="utf-8")
        done = _build(copy / "mkdocs.yml", tmp_path / "site")
        assert done.returncode != 0, f"the strict build passed with {broken}"
        assert broken.split("(")[1].rstrip(")") in done.stdout + done.stderr


def _gen_pages():
    spec = importlib.util.spec_from_file_location("gen_pages", DOCS / "gen_pages.py")
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


def test_the_pages_generated_from_the_code_are_up_to_date():
    """study-file.md (config.py's keys and defaults), outputs.md (columns.py's columns and units, the
    charts) and python-api.md (the public docstrings) are what docs/gen_pages.py gives now."""
    stale = _gen_pages().stale_pages()
    assert not stale, f"out of date with the code: {', '.join(stale)}; run python3 docs/gen_pages.py and commit"


def test_the_generated_references_cover_what_the_code_has():
    from flamecharts import columns
    from flamecharts.config import TOP_KEYS

    study = (DOCS / "study-file.md").read_text(encoding="utf-8")
    assert all(f"`{k}`" in study or f"[{k}]" in study for k in TOP_KEYS)
    outputs = (DOCS / "outputs.md").read_text(encoding="utf-8")
    for col in columns.COLUMNS:
        unit = columns.UNITS[col][0]
        assert re.search(rf"\| `{col}` \| {re.escape({'': 'text'}.get(unit, unit))} \|", outputs), col


def test_what_the_code_adds_and_the_generators_do_not_describe_stops_them(monkeypatch):
    """A new config key, column or column group cannot reach the pages undescribed: the generator stops."""
    gen = _gen_pages()
    study_ref, outputs_ref = gen._module("gen_study_reference"), gen._module("gen_outputs_reference")
    monkeypatch.setattr(study_ref.C, "BURNER_KEYS", study_ref.C.BURNER_KEYS + ("port_count",))
    with pytest.raises(SystemExit, match="port_count"):
        study_ref.render()
    monkeypatch.setattr(outputs_ref.K, "COLUMNS", outputs_ref.K.COLUMNS + ("soot_yield",))
    with pytest.raises(SystemExit, match="soot_yield"):
        outputs_ref.render()
    monkeypatch.undo()
    monkeypatch.setattr(outputs_ref.K, "SOOT_COLUMNS", ("soot_volume_fraction",), raising=False)
    with pytest.raises(SystemExit, match="SOOT_COLUMNS"):
        outputs_ref.render()


def test_the_study_files_the_pages_show_are_valid():
    """Every TOML block of the getting-started and study-file pages is a study the validator accepts."""
    blocks = []
    for page in ("getting-started.md", "study-file.md"):
        blocks += re.findall(r"```toml\n(.*?)```", (DOCS / page).read_text(encoding="utf-8"), re.S)
    assert len(blocks) >= 2
    for text in blocks:
        study = study_from_toml(text, name="page_example")
        assert study.n_points >= 1
