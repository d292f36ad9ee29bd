"""The report's HTML building blocks, shared by outputs.report and the analyses' report parts.

escape        text as HTML
html_table    a plain table (header, rows, right-aligned number columns)
first_rows    at most MAX_TABLE_ROWS rows of a long table, and the note naming the CSV with all
optional      a value formatted, or '' when it is None
"""
from __future__ import annotations

import html
from collections.abc import Callable, Sequence, Set
from typing import Any, TypeVar

T = TypeVar("T")

#: Most rows any table of the report lists but the points appendix (the rest are in the CSV it
#: names): a 100,000-point study keeps a report of a few MB.
MAX_TABLE_ROWS = 60


def escape(x: object) -> str:
    """``x`` as text safe inside HTML."""
    return html.escape(str(x))


def optional(v: Any, fmt: str) -> str:
    """``v`` formatted with ``fmt``, or '' when it is None (a blank table cell)."""
    return "" if v is None else format(v, fmt)


def first_rows(items: Sequence[T], where: str, order: Callable[[T], Any] | None = None) -> tuple[list[T], str]:
    """At most MAX_TABLE_ROWS of ``items`` (those first by ``order`` when some are left out)
    and the note saying so, naming ``where`` all are ('' when all are listed)."""
    if len(items) <= MAX_TABLE_ROWS:
        return list(items), ""
    which = "first"
    if order is not None:
        items, which = sorted(items, key=order), "most critical"
    return list(items[:MAX_TABLE_ROWS]), (f"<p class='muted'>The {which} {MAX_TABLE_ROWS} of {len(items)} are listed; "
                                          f"all are in {escape(where)}.</p>")


def html_table(header: list[str], rows: list[list], num_cols: Set[int] = frozenset(), cls: str = "") -> str:
    """A table: ``header`` (no head row when all are empty), ``rows`` of cells, the columns
    ``num_cols`` right-aligned as numbers, the CSS class ``cls``."""
    head = "".join(f"<th>{escape(h)}</th>" for h in header) if any(header) else ""
    body = "".join("<tr>" + "".join(
        f"<td class='num'>{escape(c)}</td>" if i in num_cols else f"<td>{escape(c)}</td>" for i, c in enumerate(r))
        + "</tr>" for r in rows)
    thead = f"<thead><tr>{head}</tr></thead>" if head else ""
    return f"<table{f' class={cls!r}' if cls else ''}>{thead}<tbody>{body}</tbody></table>"
