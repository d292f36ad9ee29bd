"""MkDocs hook: the project's CHANGELOG.md (at the repository root) becomes the page changelog.md.

The changelog stays one file at the root, where contributors edit it; the site renders it as
it is at build time, so the page cannot drift from it. Links into docs/ are made relative to
the docs folder.
"""
from __future__ import annotations

from pathlib import Path

from mkdocs.structure.files import File, Files

#: the page's path in the site's sources
PAGE = "changelog.md"


def changelog_markdown(root: Path) -> str:
    """CHANGELOG.md with its links into docs/ made relative to the docs folder."""
    return (root / "CHANGELOG.md").read_text(encoding="utf-8").replace("](docs/", "](")


def on_files(files: Files, config) -> Files:
    root = Path(config.config_file_path).parent
    files.append(File.generated(config, PAGE, content=changelog_markdown(root)))
    return files
