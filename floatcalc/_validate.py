"""Input checks shared by the public API: one helper per kind of value, one-line messages."""

from __future__ import annotations

import math
from typing import Any

import numpy as np

from .errors import input_error
from .units import format_si, to_si


def positive(value: Any, kind: str, field: str, *, show: str, array: bool = False,
             upper: float | None = None) -> Any:
    """SI value that must be > 0 (and ≤ ``upper`` if given); ``show`` is the unit for messages."""
    v = to_si(value, kind, field, array=array)
    arr = np.asarray(v)
    if np.any(arr <= 0):
        bad = float(arr[arr <= 0].flat[0])
        raise input_error(field, "must be positive", format_si(bad, kind, show))
    if upper is not None and np.any(arr > upper):
        bad = float(arr[arr > upper].flat[0])
        raise input_error(field, f"must be at most {format_si(upper, kind, show)}", format_si(bad, kind, show))
    return v


def length(value: Any, field: str, *, array: bool = False, upper: float = 10.0) -> Any:
    """A positive length [m], at most ``upper`` metres."""
    return positive(value, "length", field, show="mm", array=array, upper=upper)


def angle(value: Any, field: str, *, array: bool = False) -> Any:
    """A contact angle [rad] in 0–180°."""
    v = to_si(value, "angle", field, array=array)
    arr = np.asarray(v)
    bad = (arr < 0) | (arr > math.pi * (1 + 1e-12))
    if np.any(bad):
        b = float(arr[bad].flat[0])
        raise input_error(field, "must be between 0 and 180 deg", f"{math.degrees(b):.6g} deg")
    return np.minimum(v, math.pi) if array else min(float(v), math.pi)


def density(value: Any, field: str) -> float:
    """A material density [kg/m³] in 1–25 000 kg/m³."""
    v = to_si(value, "density", field)
    if not (1.0 <= v <= 25000.0):
        raise input_error(field, "must be between 1 and 25000 kg/m³", f"{v:g} kg/m³")
    return v


def count(value: Any, field: str = "count", upper: int = 10000) -> int:
    """A whole number of elements, 1 to ``upper``."""
    try:
        f = float(value)
    except (TypeError, ValueError):
        raise input_error(field, f"must be a whole number from 1 to {upper}", repr(value)) from None
    if not math.isfinite(f) or f != int(f) or not (1 <= f <= upper):
        raise input_error(field, f"must be a whole number from 1 to {upper}", repr(value))
    return int(f)


def name(value: Any, field: str = "name", upper: int = 200) -> str:
    """A name given by the user: a string of at most ``upper`` characters.

    >>> name("my oil")
    'my oil'
    """
    if not isinstance(value, str):
        raise input_error(field, f"must be a text of at most {upper} characters", type(value).__name__)
    if len(value) > upper:
        raise input_error(field, f"must be a text of at most {upper} characters", f"{len(value)} characters")
    return value


def hysteresis(advancing: Any, receding: Any | None, field: str = "receding_angle") -> float | None:
    """Receding angle [rad], checked to be no larger than the advancing angle."""
    if receding is None:
        return None
    r = angle(receding, field)
    if r > advancing + 1e-12:
        raise input_error(
            field, f"must not exceed the advancing angle {math.degrees(advancing):.4g} deg",
            f"{math.degrees(r):.4g} deg",
        )
    return r
