"""Study model of one round support element (ball foot or flat pad), for sweeps and Monte Carlo.

Each point calls :func:`floatcalc.ball` or :func:`floatcalc.pad` (axisymmetric Young–Laplace
meniscus, :mod:`floatcalc.round`) and reads its limit: ``max_force`` [N], ``own_weight`` [N],
``payload`` = max_force − own_weight [N], ``payload_mass`` [kg], ``spare_payload`` = payload − weight of
the design ``payload_mass`` [N] and ``depth_at_max`` [m]. Inputs: ``radius`` [m], ``thickness``
[m] (pads), ``contact_angle`` [rad], ``surface_tension`` [N/m], ``material_density`` [kg/m³],
``payload_mass`` [kg]. Scalar (``vectorised=False``): a fraction of a second per point.
Validity: that of :mod:`floatcalc.round` (static, clean surface, no neighbour within a few l_c).

>>> m = element_model("ball", radius=1e-3, contact_angle=2.1)
>>> sorted(m.inputs)[:2]
['contact_angle', 'material_density']
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

from ..errors import input_error
from ..liquids import Liquid
from .models import STEEL, Model, Quantity

_COMMON = {
    "radius": Quantity("length", "mm", "element radius", hi=0.1, positive=True),
    "contact_angle": Quantity("angle", "deg", "advancing contact angle", lo=0.0, hi=math.pi),
    "surface_tension": Quantity("surface_tension", "mN/m", "liquid surface tension", lo=1e-3, hi=1.0),
    "material_density": Quantity("density", "kg/m**3", "element material density", lo=1.0, hi=25000.0),
    "payload_mass": Quantity("mass", "g", "mass carried besides the element", lo=0.0, hi=1e3),
}
_PAD = {**_COMMON, "thickness": Quantity("length", "mm", "pad thickness", hi=0.1, positive=True)}
OUTPUTS = {
    "max_force": Quantity("force", "mN", "limit force"),
    "own_weight": Quantity("force", "mN", "weight of the element"),
    "payload": Quantity("force", "mN", "limit force minus own weight"),
    "payload_mass": Quantity("mass", "g", "payload as a mass"),
    "spare_payload": Quantity("force", "mN", "payload minus the weight of payload_mass"),
    "depth_at_max": Quantity("length", "mm", "depth of the lowest point at the limit"),
}


@dataclass(frozen=True)
class _ElementFunc:
    kind: str
    liquid: Liquid

    def __call__(self, x: dict[str, float]) -> dict[str, float]:
        from .. import round as rnd

        liq = self.liquid if x["surface_tension"] == self.liquid.sigma else replace(self.liquid, sigma=x["surface_tension"])
        if self.kind == "ball":
            r = rnd.ball(x["radius"], x["contact_angle"], liquid=liq, material_density=x["material_density"])
        else:
            r = rnd.pad(x["radius"], x["thickness"], x["contact_angle"], liquid=liq,
                        material_density=x["material_density"])
        F, W = r.max_force.to("N").magnitude, r.own_weight.to("N").magnitude
        return {"max_force": F, "own_weight": W, "payload": F - W, "payload_mass": (F - W) / liq.g,
                "spare_payload": F - W - x["payload_mass"] * liq.g, "depth_at_max": r.depth_at_max.to("m").magnitude}


def element_model(kind: str, liquid: Liquid | None = None, **base: float) -> Model:
    """Model of a ``"ball"`` or ``"pad"`` with SI base values (defaults: radius 1 mm, thickness
    0.5 mm, 120°, steel 7850 kg/m³ (common practice), no payload)."""
    if kind not in ("ball", "pad"):
        raise input_error("element", "must be ball or pad", repr(kind))
    from ..liquids import as_liquid

    liq = as_liquid(liquid)
    inputs = _PAD if kind == "pad" else _COMMON
    b = {"radius": 1e-3, "contact_angle": math.radians(120.0), "surface_tension": liq.sigma,
         "material_density": STEEL, "payload_mass": 0.0}
    if kind == "pad":
        b["thickness"] = 0.5e-3
    for k, v in base.items():
        if k not in inputs:
            raise input_error("input", f"unknown {kind} input; known: {', '.join(inputs)}", repr(k))
        b[k] = float(v)
    from ..round import REFERENCES

    return Model(name=kind, func=_ElementFunc(kind, liq), inputs=inputs, outputs=OUTPUTS, base=b,
                 vectorised=False, limit_output="spare_payload", references=tuple(REFERENCES), cautions=liq.cautions)
