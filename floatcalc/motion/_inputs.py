"""Input checks of the motion models (times, and the SI helpers of :mod:`floatcalc._validate`).

:mod:`floatcalc.units` has no ``time`` kind yet; :func:`duration` converts a time the same
way (quantity, SI float in seconds, or a string such as ``"20 ms"``) without changing that
shared module.
"""

from __future__ import annotations

import math
from typing import Any

from ..errors import input_error


def duration(value: Any, field: str, *, lo: float = 1e-6, hi: float = 60.0) -> float:
    """A time [s] between ``lo`` and ``hi`` seconds.

    >>> duration("20 ms", "push_time")
    0.02
    >>> duration(0.5, "push_time")
    0.5
    """
    from ..units import _is_quantity, _parse_string, registry

    if isinstance(value, bool) or value is None:
        raise input_error(field, "must be a time (e.g. '20 ms')", repr(value))
    if isinstance(value, str) or _is_quantity(value):
        q = _parse_string(value, "length", field) if isinstance(value, str) else value
        if not _is_quantity(q) or not hasattr(q, "dimensionality"):
            raise input_error(field, "must be a time (e.g. '20 ms')", repr(value))
        if getattr(q, "_REGISTRY", None) is not registry():
            q = registry().Quantity(float(q.magnitude), str(q.units))
        if q.dimensionality != registry().Quantity(1, "s").dimensionality:
            raise input_error(field, "must be a time (e.g. '20 ms')", repr(value))
        t = float(q.to("s").magnitude)
    else:
        try:
            t = float(value)
        except (TypeError, ValueError):
            raise input_error(field, "must be a time (e.g. '20 ms')", repr(value)) from None
    if not math.isfinite(t):
        raise input_error(field, "must be a finite time", repr(value))
    if not (lo <= t <= hi):
        raise input_error(field, f"must be between {lo * 1e3:g} ms and {hi:g} s", f"{t * 1e3:.6g} ms")
    return float(f"{t:.12g}")


def nonnegative(value: Any, kind: str, field: str, show: str) -> float:
    """An SI value of ``kind`` that must be zero or positive."""
    from ..units import to_si

    x = to_si(value, kind, field)
    if x < 0:
        raise input_error(field, "must be zero or positive", f"{x:g} (SI)")
    return float(x)
