"""Ranges of one input for a sweep: ``radius=0.05mm:0.5mm:50`` (linear) or ``...:50:log``.

>>> a = parse_axis("radius=0.05mm:0.5mm:4:log", {"radius": ("length", "mm")})
>>> (a.values * 1e3).round(4).tolist(), a.unit, a.log
([0.05, 0.1077, 0.2321, 0.5], 'mm', True)
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..errors import input_error
from ..units import KINDS, Q_, to_si

MAX_POINTS = 2000  # per axis


@dataclass(frozen=True)
class Axis:
    """One swept input: ``values`` in SI, shown in ``unit``; ``log`` spacing if requested."""

    name: str
    kind: str
    unit: str
    values: np.ndarray
    log: bool = False

    def shown(self) -> np.ndarray:
        """Values in the display unit."""
        if self.kind in ("count", "ratio") or not self.unit:
            return np.asarray(self.values, dtype=float)
        return np.asarray(Q_(self.values, KINDS[self.kind][1]).to(self.unit).magnitude, dtype=float)


def parse_axis(text: str, inputs: dict[str, tuple[str, str]], field: str = "vary") -> Axis:
    """Parse ``NAME=START:STOP:N[:log|:lin]``.

    Parameters
    ----------
    text : str
    inputs : dict
        Input name -> (unit kind, display unit). Kind ``"count"`` means a whole number, and
        its values are rounded and de-duplicated.
    """
    if not isinstance(text, str) or "=" not in text:
        raise input_error(field, "must look like NAME=START:STOP:N or NAME=START:STOP:N:log", repr(text))
    name, spec = (s.strip() for s in text.split("=", 1))
    name = name.replace("-", "_").lower()
    if name not in inputs:
        raise input_error(field, f"unknown input; can vary {', '.join(sorted(inputs))}", repr(name))
    parts = [p.strip() for p in spec.split(":")]
    log = False
    if len(parts) == 4:
        if parts[3].lower() not in ("log", "lin", "linear"):
            raise input_error(field, "spacing must be 'log' or 'lin'", repr(parts[3]))
        log = parts[3].lower() == "log"
        parts = parts[:3]
    if len(parts) != 3:
        raise input_error(field, "must look like NAME=START:STOP:N or NAME=START:STOP:N:log", repr(text))
    try:
        n = int(parts[2])
    except ValueError:
        raise input_error(field, f"number of points must be a whole number 2 to {MAX_POINTS}", repr(parts[2])) from None
    if not 2 <= n <= MAX_POINTS:
        raise input_error(field, f"number of points must be a whole number 2 to {MAX_POINTS}", n)
    kind, unit = inputs[name]
    if kind in ("count", "ratio"):
        what = "whole numbers" if kind == "count" else "plain numbers"
        try:
            a, b = float(parts[0]), float(parts[1])
        except ValueError:
            raise input_error(f"{field} {name}", f"start and stop must be {what}", repr(spec)) from None
        if not (np.isfinite(a) and np.isfinite(b)):
            raise input_error(f"{field} {name}", f"start and stop must be finite {what}", repr(spec))
        if kind == "count" and (min(a, b) < 1 or max(a, b) > 10000):
            raise input_error(f"{field} {name}", "start and stop must be whole numbers 1 to 10000", repr(spec))
    else:
        a = to_si(parts[0], kind, f"{field} {name} start")
        b = to_si(parts[1], kind, f"{field} {name} stop")
    if a == b:
        raise input_error(f"{field} {name}", "start and stop must differ", repr(spec))
    if log:
        if a <= 0 or b <= 0:
            raise input_error(f"{field} {name}", "log spacing needs positive start and stop", repr(spec))
        vals = np.geomspace(a, b, n)
    else:
        vals = np.linspace(a, b, n)
    if kind == "count":
        vals = np.unique(np.round(vals)).astype(float)
        if vals.size < 2:
            raise input_error(f"{field} {name}", "needs at least two different whole numbers", repr(spec))
    return Axis(name=name, kind=kind, unit=unit, values=vals, log=log)
