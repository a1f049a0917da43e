"""Shared output helpers for CLI commands: JSON and aligned text tables."""

from __future__ import annotations

import contextlib
import json
import math
import re
import sys
import unicodedata
from typing import Any, Iterable, Iterator


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


_PLAIN = re.compile(r"[\n\t\x20-\x7e]*")


def _terminal_safe(text: str) -> str:
    """``text`` with the characters that act on a terminal escaped: C0/C1 controls other than
    newline and tab (ESC, CR, BEL, CSI ``\\x9b``), format characters such as bidi overrides,
    line and paragraph separators, and lone surrogates (which could not even be encoded)."""
    if _PLAIN.fullmatch(text):  # fast path: plain ASCII lines
        return text
    return "".join(
        c if c in "\n\t" or unicodedata.category(c) not in ("Cc", "Cf", "Cs", "Zl", "Zp")
        else repr(c)[1:-1] for c in text)


class _SafeWriter:
    """A stdout stand-in that passes text on through :func:`_terminal_safe`."""

    def __init__(self, stream):
        self._stream = stream

    def write(self, text: str) -> int:
        self._stream.write(_terminal_safe(text))
        return len(text)

    def writelines(self, lines) -> None:
        for line in lines:
            self.write(line)

    def __getattr__(self, name):  # flush, fileno, isatty, encoding, ...
        return getattr(self._stream, name)


@contextlib.contextmanager
def terminal_safe_stdout() -> Iterator[None]:
    """While active, everything a command prints on stdout is passed through
    :func:`_terminal_safe`, so text from a design file or the command line (element names,
    descriptions, notes) cannot clear the screen or retitle the terminal, whichever module
    prints it."""
    real = sys.stdout
    sys.stdout = _SafeWriter(real)
    try:
        yield
    finally:
        sys.stdout = real


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
