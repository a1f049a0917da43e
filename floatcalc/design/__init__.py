"""Design files: one format (schema 2) read by every command, the page and Python.

* :mod:`.read` — the one guarded reader (size, UTF-8 and BOM, TOML guards);
* :mod:`.schema` — schema 2, validated from the element registry (:func:`load_design`,
  :class:`Design`, layouts);
* :mod:`.migrate` — schema-1 device files and older quick files, read with a note;
* :mod:`.write` — :func:`design_text` / :func:`save_design`, comments kept (tomlkit);
* built-in examples (``floatcalc/data/examples/*.toml``, all invented), one list shared by every
  command and the page: :func:`list_examples`, :func:`example`.
"""

from __future__ import annotations

import difflib
from pathlib import Path

from ..errors import input_error
from .schema import SCHEMA_VERSION, Design, design_from_data, load_design
from .write import design_text, save_design


def _examples_dir() -> Path:
    return Path(__file__).resolve().parent.parent / "data" / "examples"


def list_examples() -> list[dict[str, str]]:
    """Names and descriptions of the built-in example designs (all invented).

    >>> [e["name"] for e in list_examples()][:2]
    ['classroom', 'compare']
    """
    from .read import parse_toml

    rows = []
    for p in sorted(_examples_dir().glob("*.toml")):
        d = parse_toml(p.read_text(encoding="utf-8"), p.name)
        rows.append({"name": p.stem, "description": str(d.get("description", ""))})
    return rows


def example_names() -> list[str]:
    return sorted(p.stem for p in _examples_dir().glob("*.toml"))


def example_path(name: str) -> Path:
    """Path of a built-in example; an unknown name gives the list and the nearest one."""
    names = example_names()
    if name not in names:
        close = difflib.get_close_matches(str(name), names, n=1)
        hint = f" (did you mean '{close[0]}'?)" if close else ""
        raise input_error("example", f"unknown example{hint}; known: {', '.join(names)}", repr(name))
    return _examples_dir() / f"{name}.toml"


def example_text(name: str) -> str:
    return example_path(name).read_text(encoding="utf-8")


def example(name: str) -> Design:
    """A built-in example design by name (see :func:`list_examples`)."""
    return load_design(text=example_text(name), source=f"example '{name}'")


__all__ = ["SCHEMA_VERSION", "Design", "design_from_data", "load_design", "design_text", "save_design",
           "list_examples", "example_names", "example_path", "example_text", "example"]
