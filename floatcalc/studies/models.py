"""Study models: callables over a dict of named SI inputs, returning a dict of named SI outputs.

A :class:`Model` bundles the callable with a catalogue of its inputs (unit kind, display
unit, how to check a value) and outputs (kind and display unit), base values, validity
warnings, references and the liquid's cautions. Studies (sweep, optimiser, Monte Carlo) only
ever call ``model.evaluate(values)``, so any element or device can be studied once it has a
model. ``vectorised=True`` means the callable accepts broadcastable arrays; otherwise the
study layer loops over points (in chunks, on the chosen executor). ``costly=True`` marks a
vectorised model whose points still cost a good fraction of a second each (a device with
flexible legs: each distinct point solves an elastica): studies chunk and spread it over
workers as they do a point-by-point model, and hand each chunk to it as arrays.

:func:`rod_model` is the vectorised model of ``count`` long horizontal rods far apart
(exact 2D meniscus, :func:`floatcalc.core.rod2d.limit_force`; Vella, Lee & Kim 2006):

.. math::

    F_{max} = n L \\sigma f^*(R/l_c, \\theta), \\qquad W_{own} = n \\rho_s \\pi R^2 L g,
    \\qquad \\text{payload} = F_{max} - W_{own},

with :math:`f^*` the largest force per length in units of σ and
:math:`l_c = \\sqrt{\\sigma/(\\rho g)}`. Safety factor :math:`F_{max}/(W_{own} + m_p g)`
for a carried mass :math:`m_p`.

>>> m = rod_model()
>>> out = m.evaluate({"radius": np.array([1e-4, 2e-4])})
>>> bool(np.all(np.diff(out["max_force"]) > 0))
True
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Any, Callable

import numpy as np

from ..errors import input_error
from ..liquids import Liquid

#: Default leg material: steel, 7850 kg/m³ (common practice), as in :mod:`floatcalc.rod`.
STEEL = 7850.0


@dataclass(frozen=True)
class Quantity:
    """Catalogue entry of one model input or output."""

    kind: str          # a floatcalc.units kind, or "count" / "ratio"
    unit: str          # display unit, e.g. "mm"
    help: str = ""
    lo: float | None = None   # allowed range in SI (inclusive); None = unbounded
    hi: float | None = None
    positive: bool = False


@dataclass(frozen=True)
class Model:
    """A study model (see module docstring)."""

    name: str
    func: Callable[[dict[str, Any]], dict[str, Any]]
    inputs: dict[str, Quantity]
    outputs: dict[str, Quantity]
    base: dict[str, float]
    vectorised: bool = True
    costly: bool = False
    limit_output: str = "spare_payload"
    validity: Callable[[dict[str, Any]], list[str]] | None = None
    references: tuple[str, ...] = ()
    cautions: tuple[str, ...] = ()
    notes: tuple[str, ...] = field(default=())

    def axis_catalogue(self) -> dict[str, tuple[str, str]]:
        """Input name -> (kind, display unit), for :func:`floatcalc.studies.ranges.parse_axis`."""
        return {k: (q.kind, q.unit) for k, q in self.inputs.items()}

    def merged(self, values: dict[str, Any]) -> dict[str, Any]:
        """Base values overridden by ``values`` (checked), as float arrays."""
        for k in values:
            if k not in self.inputs:
                raise input_error("input", f"unknown for model '{self.name}'; known: {', '.join(sorted(self.inputs))}", repr(k))
        x = {**self.base, **values}
        missing = [k for k in self.inputs if k not in x]
        if missing:
            raise input_error("input", f"model '{self.name}' needs {', '.join(missing)}", "nothing")
        out = {}
        for k, val in x.items():
            arr = np.asarray(val, dtype=float)
            check_value(k, self.inputs[k], arr)
            out[k] = arr
        return out

    def evaluate(self, values: dict[str, Any]) -> dict[str, np.ndarray]:
        """Outputs for ``values`` (SI, broadcastable) merged over the base values."""
        x = self.merged(values)
        if self.vectorised:
            out = self.func(x)
            shape = np.broadcast_shapes(*(np.shape(a) for a in x.values()))
            return {k: np.broadcast_to(np.asarray(v, dtype=float), shape).copy() for k, v in out.items()}
        return evaluate_pointwise(self.func, x)

    def warnings(self, values: dict[str, Any]) -> list[str]:
        return list(self.validity(self.merged(values))) if self.validity else []


def evaluate_pointwise(func, x: dict[str, np.ndarray]) -> dict[str, np.ndarray]:
    """Call a scalar model at every broadcast point of ``x`` (for non-vectorised models)."""
    arrays = np.broadcast_arrays(*x.values())
    shape = arrays[0].shape if arrays else ()
    keys = list(x)
    flat = [a.ravel() for a in arrays]
    results: dict[str, list[float]] = {}
    for i in range(flat[0].size if flat else 1):
        point = {k: float(f[i]) for k, f in zip(keys, flat)}
        for k, v in func(point).items():
            results.setdefault(k, []).append(float(v))
    return {k: np.asarray(v).reshape(shape) for k, v in results.items()}


def check_value(name: str, q: Quantity, arr: np.ndarray) -> None:
    """Raise InputError if any entry of ``arr`` is outside the input's allowed range."""
    if not np.all(np.isfinite(arr)):
        raise input_error(name, "must be finite", "nan or inf")
    if q.kind == "count" and np.any(arr != np.round(arr)):
        raise input_error(name, "must be a whole number", f"{arr[arr != np.round(arr)].flat[0]:g}")
    shown = _shown(q)
    if q.positive and np.any(arr <= 0):
        raise input_error(name, "must be positive", shown(arr[arr <= 0].flat[0]))
    if q.lo is not None and np.any(arr < q.lo):
        raise input_error(name, f"must be at least {shown(q.lo)}", shown(arr[arr < q.lo].flat[0]))
    if q.hi is not None and np.any(arr > q.hi):
        raise input_error(name, f"must be at most {shown(q.hi)}", shown(arr[arr > q.hi].flat[0]))


def _shown(q: Quantity):
    if q.kind in ("count", "ratio") or not q.unit:
        return lambda x: f"{float(x):g}"
    from ..units import format_si

    return lambda x: format_si(float(x), q.kind, q.unit)


# --------------------------------------------------------------------------------------------
# Long rods

ROD_INPUTS = {
    "radius": Quantity("length", "mm", "leg radius", hi=1.0, positive=True),
    "length": Quantity("length", "mm", "wetted length of each leg", hi=10.0, positive=True),
    "contact_angle": Quantity("angle", "deg", "advancing contact angle", lo=0.0, hi=math.pi),
    "count": Quantity("count", "", "number of legs (far apart)", lo=1, hi=10000),
    "material_density": Quantity("density", "kg/m**3", "leg material density", lo=1.0, hi=25000.0),
    "surface_tension": Quantity("surface_tension", "mN/m", "liquid surface tension", lo=1e-3, hi=1.0),
    "liquid_density": Quantity("density", "kg/m**3", "liquid density", lo=100.0, hi=25000.0),
    "payload_mass": Quantity("mass", "g", "mass carried besides the legs", lo=0.0, hi=1e3),
}

ROD_OUTPUTS = {
    "max_force": Quantity("force", "mN", "limit force of all legs"),
    "own_weight": Quantity("force", "mN", "weight of the legs"),
    "payload": Quantity("force", "mN", "limit force minus own weight"),
    "payload_mass": Quantity("mass", "g", "payload as a mass"),
    "spare_payload": Quantity("force", "mN", "payload minus the weight of payload_mass"),
    "safety_factor": Quantity("ratio", "", "limit force / (own weight + payload weight)"),
    "support_mass": Quantity("mass", "g", "mass of the legs"),
    "depth_at_max": Quantity("length", "mm", "depth of the lowest point at the limit"),
}

ROD_REFERENCES = (
    "Vella, Lee & Kim, Langmuir 22, 5979 (2006): 2D meniscus and force on a floating rod",
)


def _rod_eval(x: dict[str, np.ndarray], g: float) -> dict[str, np.ndarray]:
    from ..core import finite_rod

    R, L, th, n = x["radius"], x["length"], x["contact_angle"], x["count"]
    sigma, rho_l, rho_s = x["surface_tension"], x["liquid_density"], x["material_density"]
    lc = np.sqrt(sigma / (rho_l * g))
    # the one rod law with its bounded ends, as floatcalc.rod and a rod in a device
    phi = finite_rod.limit_many(R / lc, th, L / lc)
    f2d, f_end, depth = finite_rod.force_parts(phi, R / lc, th, L / lc)
    F = n * sigma * lc * (f2d + f_end)
    W = n * rho_s * math.pi * R**2 * L * g
    load = W + x["payload_mass"] * g
    payload = F - W
    return {
        "max_force": F, "own_weight": W, "payload": payload, "payload_mass": payload / g,
        "spare_payload": payload - x["payload_mass"] * g, "safety_factor": F / load,
        "support_mass": W / g, "depth_at_max": depth * lc,
    }


@dataclass(frozen=True)
class _RodFunc:
    """Picklable rod model callable (gravity fixed by the liquid)."""

    g: float

    def __call__(self, x):
        return _rod_eval(x, self.g)


@dataclass(frozen=True)
class _RodValidity:
    g: float

    def __call__(self, x):
        out = []
        lc = np.sqrt(x["surface_tension"] / (x["liquid_density"] * self.g))
        shape = np.broadcast_shapes(*(np.shape(a) for a in x.values()))
        short = np.broadcast_to(x["length"] < 20.0 * lc, shape)
        if np.any(short):
            n_short, n_all = int(np.count_nonzero(short)), short.size
            out.append(f"{n_short} of {n_all} {'design has' if n_all == 1 else 'designs have'} legs shorter than 20 "
                       "capillary lengths: their ends are bounded by σ × the contact line across each end face "
                       "(floatcalc.core.finite_rod)")
        if np.any(x["count"] > 1):
            out.append(f"legs are treated as far apart (several capillary lengths, ≳ {4e3 * float(np.min(lc)):.2g} mm): "
                       "no shared meniscus")
        return out


def _si(name: str, value: Any, q: "Quantity") -> float:
    """A base value in SI: a quantity, an SI number or text with a unit (one-line InputError)."""
    from ..units import KINDS, to_si

    if q.kind in KINDS:
        return float(to_si(value, q.kind, name))
    try:
        return float(value)
    except (TypeError, ValueError):
        raise input_error(name, "must be a plain number", repr(value)) from None


def rod_model(liquid: Liquid | None = None, **base: Any) -> Model:
    """Vectorised model of ``count`` long rods far apart (see module docstring).

    Parameters
    ----------
    liquid : Liquid, optional
        Gives the base ``surface_tension`` [N/m], ``liquid_density`` [kg/m³], gravity and the
        cautions. Default water at 20 °C.
    **base : SI floats
        Base values of any input (``radius`` [m], ``length`` [m], ``contact_angle`` [rad],
        ``count``, ``material_density`` [kg/m³], ``payload_mass`` [kg]). Defaults: an invented
        leg, radius 0.2 mm, length 40 mm, 150°, 1 leg, steel, no payload.

    Validity: as :func:`floatcalc.rod`: long rigid rods, static, clean surface, legs several
    capillary lengths apart; a warning is produced for legs under 20 l_c long.

    >>> m = rod_model(count=4.0)
    >>> round(float(m.evaluate({})["max_force"]) * 1e3, 2)  # four invented 40 mm legs
    25.53
    """
    from ..liquids import as_liquid

    liq = as_liquid(liquid)
    b = {"radius": 2e-4, "length": 0.04, "contact_angle": math.radians(150.0), "count": 1.0,
         "material_density": STEEL, "surface_tension": liq.sigma, "liquid_density": liq.rho,
         "payload_mass": 0.0}
    for k, v in base.items():
        if k not in ROD_INPUTS:
            raise input_error("input", f"unknown rod input; known: {', '.join(ROD_INPUTS)}", repr(k))
        b[k] = _si(k, v, ROD_INPUTS[k])
    return Model(name="rod", func=_RodFunc(liq.g), inputs=ROD_INPUTS, outputs=ROD_OUTPUTS, base=b,
                 vectorised=True, limit_output="spare_payload", validity=_RodValidity(liq.g),
                 references=ROD_REFERENCES, cautions=liq.cautions)


def list_models() -> list[str]:
    """Names of the built-in study models.

    >>> "rod" in list_models()
    True
    """
    return ["rod"]
