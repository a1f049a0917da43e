"""Shared output helpers for CLI commands: JSON and aligned text tables."""

from __future__ import annotations

import json
import math
import sys
from typing import Any, Iterable


def _clean(obj: Any) -> Any:
    """Make ``obj`` JSON-safe: NumPy scalars to Python, non-finite floats refused."""
    if isinstance(obj, dict):
        return {str(k): _clean(v) for k, v in obj.items()}
    if isinstance(obj, (list, tuple)):
        return [_clean(v) for v in obj]
    if hasattr(obj, "item") and not isinstance(obj, (str, bytes)):
        try:
            obj = obj.item()
        except (ValueError, AttributeError):
            obj = obj.tolist()
    if isinstance(obj, float) and not math.isfinite(obj):
        raise ValueError(f"non-finite value {obj} in output")  # a bug, never user input
    return obj


def one_line(text: Any) -> str:
    """``text`` with every control, format and line-break character escaped (``\\x1b``, ``\\n``,
    ``\\u2028``, ...), so that text echoed from user input cannot move the cursor, clear the
    terminal or start a new line.

    >>> one_line("leg\\x1b[2J\\nnext")
    'leg\\\\x1b[2J\\\\nnext'
    """
    return "".join(c if c.isprintable() else repr(c)[1:-1] for c in str(text))


def _json_escape(text: str) -> str:
    """Escape, as JSON ``\\uXXXX``, the non-printable characters ``json.dumps`` leaves raw with
    ``ensure_ascii=False`` (C1 controls such as ``\\x9b``, ``\\u2028``, bidi overrides). Outside
    strings JSON text has only spaces and newlines, which are kept."""
    out = []
    for c in text:
        if c.isprintable() or c == "\n":
            out.append(c)
        elif ord(c) > 0xFFFF:  # a surrogate pair, as JSON writes characters beyond the BMP
            v = ord(c) - 0x10000
            out.append(f"\\u{0xD800 + (v >> 10):04x}\\u{0xDC00 + (v & 0x3FF):04x}")
        else:
            out.append(f"\\u{ord(c):04x}")
    return "".join(out)


def print_json(data: dict[str, Any]) -> None:
    """Print ``data`` as indented JSON on stdout (non-printable characters escaped)."""
    sys.stdout.write(_json_escape(json.dumps(_clean(data), indent=2, ensure_ascii=False)))
    sys.stdout.write("\n")


def print_table(title: str, rows: Iterable[tuple[str, str]], notes: Iterable[str] = ()) -> None:
    """Print a two-column table of (label, value) with a title and trailing notes.

    Every text is passed through :func:`one_line`: labels, values and notes may hold element
    names or descriptions from a design file.
    """
    rows = [(one_line(label), one_line(value)) for label, value in rows]
    title = one_line(title)
    width = max((len(r[0]) for r in rows), default=0)
    print(title)
    print("-" * max(len(title), 20))
    for label, value in rows:
        print(f"  {label:<{width}}  {value}")
    notes = [one_line(n) for n in notes]
    if notes:
        print()
        for n in notes:
            print(f"  note: {n}")


def add_json_flag(p) -> None:
    p.add_argument("--json", action="store_true", help="print SI values as JSON (keys end in their unit)")
