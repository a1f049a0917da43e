"""Sweeps of one or two inputs of a study model: a table and the limit crossing or contour.

The model (see :mod:`floatcalc.studies.models`) is evaluated on the grid of the swept inputs,
the other inputs held at their base values. Vectorised models get the whole grid (in chunks
of :data:`CHUNK_POINTS`) as arrays; others are called point by point, in chunks that any
executor can run (:mod:`floatcalc.studies.executors`), with identical results.

The *limit* of a design is where its ``limit_output`` (for rods the ``spare_payload``: payload minus
the weight of the carried mass) crosses zero. A 1D sweep reports the crossings, found by
linear interpolation between grid points (so good to the grid spacing; refine the range to
narrow them); a 2D sweep's plot marks the zero contour.

>>> from floatcalc.studies.models import rod_model
>>> m = rod_model(count=4.0, payload_mass=2.3e-3)  # invented: four 40 mm legs, 2.3 g
>>> s = sweep(m, ["radius=0.05mm:0.5mm:10"])
>>> s.shape, [round(c * 1e3, 3) for c in s.crossings]
((10,), [0.358])
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any, Sequence

import numpy as np

from ..errors import input_error
from ..results import json_key
from ..units import KINDS, Q_
from .executors import run_chunks
from .models import Model
from .ranges import Axis, parse_axis

CHUNK_POINTS = 20000      # grid points per chunk, vectorised models
CHUNK_POINTS_SLOW = 16    # per chunk, point-by-point models
LARGE_POINTS = 400000     # vectorised grids above this use all cores under "auto"
LARGE_POINTS_SLOW = 64


@dataclass(frozen=True, kw_only=True)
class SweepResult:
    """Grid of the swept inputs and every model output on it (SI arrays)."""

    model: str
    axes: tuple[Axis, ...]
    base: dict[str, float]
    outputs: dict[str, np.ndarray]
    output_units: dict[str, tuple[str, str]]
    limit_output: str
    crossings: tuple[float, ...] = ()
    warnings: tuple[str, ...] = ()
    cautions: tuple[str, ...] = ()
    references: tuple[str, ...] = ()
    executor: str = "serial"
    meta: dict[str, Any] = field(default_factory=dict)

    @property
    def shape(self) -> tuple[int, ...]:
        return tuple(a.values.size for a in self.axes)

    def shown(self, name: str) -> np.ndarray:
        """An output in its display unit."""
        kind, unit = self.output_units[name]
        v = self.outputs[name]
        if kind in ("ratio", "count") or not unit:
            return v
        return np.asarray(Q_(v, KINDS[kind][1]).to(unit).magnitude)

    def table(self) -> list[tuple[str, str, np.ndarray]]:
        """Columns (name, display unit, values) for :func:`floatcalc.studies.csvio.write_table`."""
        grids = np.meshgrid(*[a.shown() for a in self.axes], indexing="ij")
        cols = [(a.name, a.unit or "1", g.ravel()) for a, g in zip(self.axes, grids)]
        for name, (kind, unit) in self.output_units.items():
            cols.append((name, unit or "1", self.shown(name).ravel()))
        return cols

    def to_dict(self) -> dict[str, Any]:
        d: dict[str, Any] = {"model": self.model, "shape": list(self.shape), "executor": self.executor}
        d["axes"] = [{"name": a.name, "spacing": "log" if a.log else "linear",
                      json_key("values", KINDS[a.kind][1] if a.kind in KINDS else ""): a.values.tolist()}
                     for a in self.axes]
        d["outputs"] = {json_key(k, KINDS[kind][1] if kind in KINDS else ""): self.outputs[k].tolist()
                        for k, (kind, _) in self.output_units.items()}
        d["limit_output"] = self.limit_output
        if len(self.axes) == 1:
            a = self.axes[0]
            d[json_key("limit_crossings", KINDS[a.kind][1] if a.kind in KINDS else "")] = list(self.crossings)
        d.update(self.meta)
        d["warnings"] = list(self.warnings)
        d["cautions"] = list(self.cautions)
        d["references"] = list(self.references)
        return d


def _eval_chunk(model: Model, fixed: dict[str, Any], chunk: dict[str, np.ndarray]) -> dict[str, np.ndarray]:
    return model.evaluate({**fixed, **chunk})


def sweep(model: Model, axes: Sequence[Axis | str], *, values: dict[str, Any] | None = None,
          executor: str | None = "auto", scheduler: Any = None, workers: int | None = None,
          progress: bool | None = None) -> SweepResult:
    """Evaluate ``model`` over one or two swept inputs.

    Parameters
    ----------
    model : Model
    axes : one or two :class:`~floatcalc.studies.ranges.Axis` or strings ``NAME=START:STOP:N[:log]``
    values : dict, optional
        Base values (SI) overriding the model's, for the inputs not swept.
    executor, scheduler, workers, progress
        See :func:`floatcalc.studies.executors.run_chunks`.

    Returns
    -------
    SweepResult
        ``outputs[name]`` arrays of the grid's shape (first axis first), SI units.

    Validity: that of the model; its validity warnings for the grid are attached.
    """
    if not isinstance(model, Model):
        raise input_error("model", "must be a study model (floatcalc.rod_model or floatcalc.device_model)",
                          type(model).__name__)
    cat = model.axis_catalogue()
    axes = tuple(parse_axis(a, cat) if isinstance(a, str) else a for a in axes)
    if not 1 <= len(axes) <= 2:
        raise input_error("vary", "give one or two inputs to vary", len(axes))
    if len(axes) == 2 and axes[0].name == axes[1].name:
        raise input_error("vary", "the two swept inputs must differ", repr(axes[0].name))
    fixed = dict(values or {})
    for a in axes:
        fixed.pop(a.name, None)
    grids = np.meshgrid(*[a.values for a in axes], indexing="ij")
    flat = {a.name: g.ravel() for a, g in zip(axes, grids)}
    npts = grids[0].size
    # Check everything once, up front, so bad values fail before any work is sent out.
    model.merged({**fixed, **{k: v[:1] for k, v in flat.items()}})
    for a in axes:
        model.merged({**fixed, a.name: a.values})
    cheap = model.vectorised and not model.costly
    per = CHUNK_POINTS if cheap else CHUNK_POINTS_SLOW
    large = npts > (LARGE_POINTS if cheap else LARGE_POINTS_SLOW)
    starts = range(0, npts, per)
    tasks = [(model, fixed, {k: v[s:s + per] for k, v in flat.items()}) for s in starts]
    from .executors import resolve

    kind = resolve(executor, scheduler, large=large, n_chunks=len(tasks), workers=workers)
    parts = run_chunks(_eval_chunk, tasks, executor=kind if kind != "dask" else "auto", scheduler=scheduler,
                       workers=workers, large=large, progress=progress, label="sweep")
    outputs = {k: np.concatenate([p[k] for p in parts]).reshape(grids[0].shape) for k in parts[0]}
    for k, v in outputs.items():
        if not np.all(np.isfinite(v)):  # a model must never hand back NaN silently
            from ..errors import ConvergenceError

            raise ConvergenceError(f"model '{model.name}' returned non-finite {k} at {np.count_nonzero(~np.isfinite(v))} points")
    units = {k: (q.kind, q.unit) for k, q in model.outputs.items() if k in outputs}
    crossings: tuple[float, ...] = ()
    if len(axes) == 1 and model.limit_output in outputs:
        crossings = tuple(_crossings(axes[0], outputs[model.limit_output]))
    warn = model.warnings({**fixed, **flat})
    return SweepResult(model=model.name, axes=axes, base={k: float(np.asarray(v).flat[0]) for k, v in
                                                         model.merged(fixed).items() if k not in flat},
                       outputs=outputs, output_units=units, limit_output=model.limit_output,
                       crossings=crossings, warnings=tuple(warn), cautions=model.cautions,
                       references=model.references, executor=kind)


def _crossings(axis: Axis, y: np.ndarray) -> list[float]:
    """Input values where ``y`` changes sign, interpolated linearly (in log for log axes)."""
    x = np.log(axis.values) if axis.log else axis.values
    out = []
    s = np.sign(y)
    if axis.kind == "count":  # whole numbers: the first count on the carrying side of each change
        return sorted(float(axis.values[i + 1] if y[i] < 0 else axis.values[i])
                      for i in np.flatnonzero(s[:-1] * s[1:] < 0))
    for i in np.flatnonzero(s[:-1] * s[1:] < 0):
        t = y[i] / (y[i] - y[i + 1])
        xc = x[i] + t * (x[i + 1] - x[i])
        out.append(float(np.exp(xc) if axis.log else xc))
    out.extend(float(axis.values[i]) for i in np.flatnonzero(y == 0))
    return sorted(out)
