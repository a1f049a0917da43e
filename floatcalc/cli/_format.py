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


def print_json(data: dict[str, Any]) -> None:
    """Print ``data`` as indented JSON on stdout."""
    json.dump(_clean(data), sys.stdout, indent=2, ensure_ascii=False)
    sys.stdout.write("\n")


def print_table(title: str, rows: Iterable[tuple[str, str]], notes: Iterable[str] = ()) -> None:
    """Print a two-column table of (label, value) with a title and trailing notes."""
    rows = list(rows)
    width = max((len(r[0]) for r in rows), default=0)
    print(title)
    print("-" * max(len(title), 20))
    for label, value in rows:
        print(f"  {label:<{width}}  {value}")
    notes = list(notes)
    if notes:
        print()
        for n in notes:
            print(f"  note: {n}")


def add_json_flag(p) -> None:
    p.add_argument("--json", action="store_true", help="print SI values as JSON (keys end in their unit)")
