"""Result base of the motion models: :class:`floatcalc.results.Result` plus time fields [s].

:data:`floatcalc.results._SUFFIX` has no entry for seconds yet; quantity fields declared with
unit ``"s"`` are written here under keys ending in ``_s`` (``push_time_s``), the others by the
shared :meth:`Result.to_dict`.
"""

from __future__ import annotations

import dataclasses
from typing import Any

from ..results import Result


class MotionResult(Result):
    """Mixin for frozen dataclass results of :mod:`floatcalc.motion`."""

    def to_dict(self) -> dict[str, Any]:
        times = [f for f in dataclasses.fields(self) if f.metadata.get("unit") == "s"]  # type: ignore[arg-type]
        saved = {}
        for f in times:  # hide them from the shared writer, then add them with their suffix
            saved[f.name] = dict(f.metadata)
        out: dict[str, Any] = {}
        for f in dataclasses.fields(self):  # type: ignore[arg-type]
            if not f.metadata.get("json", True):
                continue
            if f.name in saved:
                q = getattr(self, f.name)
                out[f"{f.name}_s"] = None if q is None else float(q.to("s").magnitude)
                continue
            out.update(_one(self, f))
        return out


def _one(obj, f) -> dict[str, Any]:
    """The shared writer's output for one field (same rules as :meth:`Result.to_dict`)."""
    from ..results import json_key

    value = getattr(obj, f.name)
    unit = f.metadata.get("unit")
    if unit is not None:
        if value is None:
            return {json_key(f.name, unit): None}
        mag = value.to(unit).magnitude
        return {json_key(f.name, unit): mag.tolist() if hasattr(mag, "tolist") else float(mag)}
    if isinstance(value, Result):
        return {f.name: value.to_dict()}
    if isinstance(value, (list, tuple)) and value and isinstance(value[0], Result):
        return {f.name: [v.to_dict() for v in value]}
    if isinstance(value, tuple):
        return {f.name: list(value)}
    return {f.name: value}
