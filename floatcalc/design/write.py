"""Writing designs back to TOML, keeping the comments of the file they came from.

:func:`design_text` gives the schema-2 text of a design. When the design was read from text
(``Design.source_text``), that text is updated in place with :mod:`tomlkit` (a style-preserving
TOML library), so comments, including the line that marks an example as invented, survive a
save; the header comments of an older-format file survive an upgrade. Reading stays with
:mod:`tomllib` (:mod:`floatcalc.design.read`).
"""

from __future__ import annotations

import json
import math
from pathlib import Path

from ..errors import input_error


def _leading_comments(text: str) -> list[str]:
    out = []
    for line in text.splitlines():
        s = line.strip()
        if s.startswith("#"):
            out.append(s)
        elif s:
            break
    return out


def _plain(v):
    """Data as plain TOML-able values (tuples to lists; non-finite numbers refused)."""
    if isinstance(v, float) and not math.isfinite(v):
        raise input_error("design", "cannot write a non-finite number", repr(v))
    if isinstance(v, (list, tuple)):
        return [_plain(x) for x in v]
    if isinstance(v, dict):
        return {str(k): _plain(x) for k, x in v.items()}
    if v is None or isinstance(v, (bool, int, float, str)):
        return v
    raise input_error("design", "cannot write this value to a design file", type(v).__name__)


def _sync(doc, data):
    """Update tomlkit container ``doc`` to equal ``data``, keeping the comments of kept keys."""
    import tomlkit

    for k in [k for k in doc if k not in data]:
        del doc[k]
    for k, v in data.items():
        old = doc.get(k)
        if isinstance(v, dict) and isinstance(old, dict) and not isinstance(old, tomlkit.items.InlineTable):
            _sync(old, v)
        elif isinstance(v, dict) and isinstance(old, tomlkit.items.InlineTable):
            doc[k] = _inline(v)
        elif (isinstance(v, list) and isinstance(old, tomlkit.items.AoT) and len(old) == len(v)
              and all(isinstance(x, dict) for x in v)):
            for t, x in zip(old, v):
                _sync(t, x)
        elif old is None or old != v:
            doc[k] = _item(k, v)


def _inline(d):
    import tomlkit

    t = tomlkit.inline_table()
    for k, v in d.items():
        t[k] = v
    return t


def _item(key, v):
    import tomlkit

    if isinstance(v, list) and v and all(isinstance(x, dict) for x in v):
        aot = tomlkit.aot()
        for x in v:
            t = tomlkit.table()
            for k, y in x.items():
                t[k] = _inline(y) if isinstance(y, dict) else y
            aot.append(t)
        return aot
    if isinstance(v, dict):
        t = tomlkit.table()
        for k, y in v.items():
            t[k] = _item(k, y)
        return t
    return v


def _order(data: dict) -> dict:
    first = ["schema_version", "description", "invented", "liquid", "body", "load", "elements", "alternatives"]
    return {**{k: data[k] for k in first if k in data}, **{k: v for k, v in data.items() if k not in first}}


def design_text(design) -> str:
    """Schema-2 TOML text of a design (a :class:`~floatcalc.design.schema.Design` or its data).

    >>> from floatcalc.design import load_design, example_text
    >>> d = load_design(text=example_text("twin_rod"))
    >>> design_text(d).startswith("# Invented example")
    True
    """
    import tomlkit

    from .migrate import detect
    from .schema import Design

    if design is None or not isinstance(design, (Design, dict)):
        raise input_error("design", "must be a Design (from load_design) or its data dict",
                          type(design).__name__)
    data = _order(_plain(design.data if isinstance(design, Design) else design))
    src = design.source_text if isinstance(design, Design) else None
    if src is not None:
        try:
            doc = tomlkit.parse(src)
        except Exception:  # tomllib read it; a tomlkit quirk must not lose the design
            doc = None
        if doc is not None and detect(json.loads(json.dumps(doc.unwrap()))) == "schema 2":
            _sync(doc, data)
            return tomlkit.dumps(doc)
    doc = tomlkit.document()
    for c in _leading_comments(src or ""):
        doc.add(tomlkit.comment(c.lstrip("# ").rstrip()))
    for k, v in data.items():
        doc[k] = _item(k, v)
    return tomlkit.dumps(doc)


def save_design(design, path) -> None:
    """Write a design to ``path`` in schema 2 (comments of its source kept).

    A data dict is validated first (the file written must load again); ``path`` must be a
    path (``str`` or ``os.PathLike``).
    """
    if isinstance(path, bytes) or not isinstance(path, str) and not hasattr(path, "__fspath__"):
        raise input_error("path", "must be a file path such as 'design.toml'", type(path).__name__)
    if not str(path).strip():
        raise input_error("path", "must be a file path such as 'design.toml'", "an empty string")
    if isinstance(design, dict):
        from .schema import design_from_data

        design_from_data(design)  # refuse what could not be read back
    text = design_text(design)
    try:
        Path(path).write_text(text, encoding="utf-8")
    except OSError as exc:
        raise input_error(str(path), f"cannot be written ({exc.strerror or 'write error'})") from None
