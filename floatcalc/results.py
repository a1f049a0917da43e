"""Base class for result records: pint quantities on the object, SI JSON on demand.

A result is a frozen dataclass whose fields are declared with :func:`qfield` (a quantity with a
unit) or plain ``field``\\ s (numbers, strings, arrays for drawing). :meth:`Result.to_dict`
turns the quantity fields into SI floats under keys that end in their unit, e.g.
``max_force_N`` or ``depth_at_max_m``, which the CLI prints with ``--json``.
"""

from __future__ import annotations

import dataclasses
from typing import Any

_SUFFIX = {
    "N": "N",
    "m": "m",
    "N/m": "N_per_m",
    "kg": "kg",
    "kg/m**3": "kg_per_m3",
    "K": "K",
    "deg": "deg",
    "rad": "rad",
    "m/s": "m_per_s",
    "Pa": "Pa",
    "m**3": "m3",
    "m**2": "m2",
    "N/m**2": "N_per_m2",
    "N*m": "N_m",
    "N/m/rad": "N_per_m_per_rad",
    "N*m/rad": "N_m_per_rad",
    "": "",
}


def qfield(unit: str, *, json: bool = True, **kwargs):
    """Declare a dataclass field holding a pint quantity reported in ``unit`` (SI)."""
    md = {"unit": unit, "json": json}
    return dataclasses.field(metadata=md, **kwargs)


def field(*, json: bool = True, **kwargs):
    """Declare a plain field; ``json=False`` keeps it out of :meth:`Result.to_dict`."""
    return dataclasses.field(metadata={"json": json}, **kwargs)


def json_key(name: str, unit: str) -> str:
    """SI JSON key for a quantity field, e.g. ``json_key('max_force', 'N') == 'max_force_N'``."""
    suffix = _SUFFIX[unit]
    return f"{name}_{suffix}" if suffix else name


class Result:
    """Mixin for frozen dataclass results (see module docstring)."""

    warnings: tuple[str, ...]

    def to_dict(self) -> dict[str, Any]:
        out: dict[str, Any] = {}
        for f in dataclasses.fields(self):  # type: ignore[arg-type]
            if not f.metadata.get("json", True):
                continue
            value = getattr(self, f.name)
            unit = f.metadata.get("unit")
            if unit is not None:
                if value is None:
                    out[json_key(f.name, unit)] = None
                    continue
                mag = value.to(unit).magnitude
                out[json_key(f.name, unit)] = mag.tolist() if hasattr(mag, "tolist") else float(mag)
            elif isinstance(value, Result):
                out[f.name] = value.to_dict()
            elif isinstance(value, (list, tuple)) and value and isinstance(value[0], Result):
                out[f.name] = [v.to_dict() for v in value]
            elif isinstance(value, tuple):
                out[f.name] = list(value)
            else:
                out[f.name] = value
        return out
