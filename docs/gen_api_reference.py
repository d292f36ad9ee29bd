"""The Python API reference (the generated part of docs/python-api.md) from the public docstrings.

Signatures come from ``inspect.signature``, texts from the docstrings (numpydoc sections and
Sphinx roles turned into Markdown), the fields of the result classes from their dataclass
fields. What is documented is the package's public surface, ``flamecharts.__all__``, in the
order of API below; a public name this script does not place stops it with a message.

Run ``python3 docs/gen_pages.py`` after changing a public docstring; tests/test_docs.py checks the page.
"""
from __future__ import annotations

import dataclasses
import inspect
import re
import sys

import flamecharts
from flamecharts.analyses import parts

PAGE = "python-api.md"

#: (name in flamecharts, heading) in the page's order; every name of flamecharts.__all__ but __version__.
API = [
    ("run", "Functions"), ("open_results", None), ("load_study", None), ("run_study", None),
    ("Results", "Classes"), ("RunSummary", None), ("Study", None),
    ("FlamechartsError", "Errors"), ("ConfigError", None), ("MechanismError", None), ("StoreError", None),
    ("RunInterrupted", None),
]
#: Classes documented with their dataclass fields (a Study has dozens, described on the study-file page instead).
WITH_FIELDS = {"Results", "RunSummary", "Progress"}
#: Public members of classes shown besides the fields.
MEMBERS = {"Results": ("dataset", "limits_dataset", "stretch", "ladders_dataset", "to_dataframe", "mechanism_comparison",
                       "extra_table", "counts"),
           "RunSummary": ("worker_utilisation", "stretch", "stretch_ladders"), "Progress": ("remaining_s",),
           "Study": ("n_points",)}


#: A sentence added after a docstring, where the reader needs a pointer the docstring cannot give.
NOTES = {"Study": "`load_study` makes one from a study file; every key it holds is described on the "
                  "[study file](study-file.md) page."}


def markdown(doc: str) -> str:
    """A numpydoc docstring as Markdown: sections in bold, parameters as a list, Sphinx roles as code."""
    doc = re.sub(r":(?:func|class|meth|attr|mod|data):`~?([\w.]+)`",
                 lambda m: "`" + (m.group(1).rsplit(".", 1)[-1] if m.group(0).find("~") >= 0 else m.group(1)) + "`",
                 doc)
    doc = doc.replace("``", "`")
    lines, out = doc.splitlines(), []
    in_list = False  # inside a section's list of "name : text" entries
    i = 0
    while i < len(lines):
        line = lines[i]
        if i + 1 < len(lines) and lines[i + 1].strip() and set(lines[i + 1].strip()) == {"-"}:  # a numpydoc section
            out += ["", f"**{line.strip()}**", ""]
            in_list, i = True, i + 2
            continue
        if in_list and line and not line.startswith(" "):
            name, sep, rest = line.partition(" : ")  # an entry, continued on indented lines
            out.append(f"- `{name.strip()}`: {rest.strip()}" if sep else f"- {line.strip()}")
        elif in_list and line.startswith(" "):
            out[-1] += " " + line.strip()
        else:  # a blank line ends the section's list: what follows is a paragraph
            in_list = False
            out.append(line)
        i += 1
    return "\n".join(out).strip()


def parameter(p: inspect.Parameter) -> str:
    """``name: annotation = default`` as written in the source (annotations are strings there)."""
    text = p.name + ("" if p.annotation is inspect.Parameter.empty else f": {p.annotation}")
    return text + ("" if p.default is inspect.Parameter.empty else f" = {p.default!r}")


def signature(name: str, obj) -> str:
    sig = inspect.signature(obj)
    params = [parameter(p) for p in sig.parameters.values()]
    ret = "" if sig.return_annotation is inspect.Signature.empty else f" -> {sig.return_annotation}"
    one = f"flamecharts.{name}({', '.join(params)}){ret}"
    if len(one) <= 100:
        return f"```python\n{one}\n```"
    return "```python\nflamecharts." + name + "(\n" + "".join(f"    {p},\n" for p in params) + ")" + ret + "\n```"


def fields_table(cls) -> list[str]:
    rows = ["| field | type | default |", "|---|---|---|"]
    for f in dataclasses.fields(cls):
        if f.name.startswith("_"):
            continue
        if f.default is not dataclasses.MISSING:
            default = f"`{f.default!r}`"
        elif f.default_factory is not dataclasses.MISSING:
            default = f"`{f.default_factory()!r}`"
        else:
            default = ""
        rows.append(f"| `{f.name}` | `{f.type}` | {default} |".replace("|`", "| `"))
    return rows


#: The registered analyses' names for their record tables on Results and RunSummary (results.RecordAccess).
ACCESSORS = {name: f for m in parts("dataset") for name, f in getattr(m, "ACCESSORS", {}).items()}


def member(cls, name: str) -> list[str]:
    if name in ACCESSORS and not hasattr(cls, name):  # an analysis's accessor (results.RecordAccess)
        package = ACCESSORS[name].__module__.split(".")[2]
        doc = " ".join(markdown(inspect.getdoc(ACCESSORS[name]) or "").split())
        return [f"- `.{name}` (attribute, from the analysis `{package}`): {doc}"]
    attr = inspect.getattr_static(cls, name)
    if isinstance(attr, property):
        title = f"`.{name}` (property)"
        doc = inspect.getdoc(attr.fget) or ""
    else:
        sig = inspect.signature(attr)
        params = ", ".join(parameter(p) for p in sig.parameters.values() if p.name != "self")
        ret = "" if sig.return_annotation is inspect.Signature.empty else f" -> {sig.return_annotation}"
        title = f"`.{name}({params}){ret}`"
        doc = inspect.getdoc(attr) or ""
    return [f"- {title}: " + " ".join(markdown(doc).split())]


def section(name: str, obj, level: str = "###") -> list[str]:
    out = ["", f"{level} {name}", ""]
    if inspect.isclass(obj):
        bases = [b.__name__ for b in obj.__bases__ if b is not object]
        out += [f"`flamecharts.{name}`" if name in flamecharts.__all__ else f"`{obj.__module__}.{name}`"]
        if bases:
            out[-1] += f" (a subclass of `{'`, `'.join(bases)}`)"
        out += ["", markdown(inspect.getdoc(obj) or "")]
        if name in NOTES:
            out += ["", NOTES[name]]
        if name in WITH_FIELDS:
            out += ["", *fields_table(obj)]
        if MEMBERS.get(name):
            out += [""] + [line for m in MEMBERS[name] for line in member(obj, m)]
    else:
        out += [signature(name, obj), "", markdown(inspect.getdoc(obj) or "")]
    return out


def render() -> str:
    placed = {n for n, _ in API}
    missing = [n for n in flamecharts.__all__ if n != "__version__" and n not in placed]
    if missing:
        raise SystemExit(f"docs/gen_api_reference.py does not place these public names: {', '.join(missing)}")
    results = vars(flamecharts.Results)
    unlisted = [m for m, v in results.items() if not m.startswith("_") and (callable(v) or isinstance(v, property))
                and m not in MEMBERS["Results"]]
    if unlisted:
        raise SystemExit(f"docs/gen_api_reference.py: MEMBERS['Results'] leaves out {', '.join(unlisted)}")
    out = []
    for name, heading in API:
        if heading:
            out += ["", f"## {heading}"]
        out += section(name, getattr(flamecharts, name))
        if name == "run":  # the progress callback's event
            from flamecharts.sweep.run import Progress
            out += section("Progress", Progress, "####")
    return "\n".join(out).strip()


if __name__ == "__main__":
    import gen_pages

    sys.exit(gen_pages.main(sys.argv[1:]))
