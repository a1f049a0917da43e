"""Study model of a whole device (design file), for sweeps and Monte Carlo runs.

Wraps :mod:`floatcalc.device`: each point perturbs the design, rebuilds the element laws and
finds the largest payload at the centre of mass with
:func:`floatcalc.core.equilibrium.capacity`, the same call :func:`floatcalc.device.solve_device`
makes for its ``max_payload`` (the rest of that solve, tipping and stiffness, is skipped here
because a study needs only the capacity). Inputs, applied to every element at once:

* ``contact_angle_shift`` [rad] added to each advancing angle (result kept in 0–180°; a
  receding angle is kept no larger than the advancing one) – a coating worse than hoped;
* ``surface_tension`` [N/m] of the liquid – a contaminated surface;
* ``radius_factor``, ``length_factor`` – multiply each element's radius / length (tolerances);
* ``body_mass`` [kg] and ``payload_mass`` [kg] (the design payload, placed at the centre of mass).

Outputs: ``max_payload`` [N], its mass ``payload_mass`` [kg], ``spare_payload`` = max_payload −
payload weight [N] (negative: sinks), and total ``weight`` [N] of body and legs.

For designs whose elements are of the kinds in
:data:`floatcalc.studies.device_batch.BATCH_KINDS` (every kind: rods, rod rows, ball feet,
pads, pins, rings, flexible legs) the model is vectorised (``vectorised=True``):
:class:`floatcalc.studies.device_batch.DeviceBatchFunc` builds the element laws and solves the
capacity for whole arrays of points at once, with the same numbers as the scalar path (to
1e-8 relative, tests/test_device_batch_mixed.py and tests/test_device_batch_flexleg.py).
Designs with a flexible leg are also ``costly``: each distinct point still solves the leg's
elastica (tens of milliseconds), so studies chunk them as point-by-point models (the same
chunks and seeded samples as before) and each chunk is evaluated as arrays. Validity: that of
:func:`floatcalc.device.solve_device`.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from typing import Any

from .models import Model, Quantity

DEVICE_INPUTS = {
    "contact_angle_shift": Quantity("angle", "deg", "added to every advancing angle", lo=-math.pi, hi=math.pi),
    "surface_tension": Quantity("surface_tension", "mN/m", "liquid surface tension", lo=1e-3, hi=1.0),
    "radius_factor": Quantity("ratio", "", "multiplies every element radius", lo=0.1, hi=10.0),
    "length_factor": Quantity("ratio", "", "multiplies every element length", lo=0.1, hi=10.0),
    "body_mass": Quantity("mass", "g", "body mass (legs excluded)", lo=0.0, hi=1e3),
    "payload_mass": Quantity("mass", "g", "design payload at the centre of mass", lo=0.0, hi=1e3),
}
DEVICE_OUTPUTS = {
    "max_payload": Quantity("force", "mN", "largest payload at the centre of mass"),
    "payload_mass": Quantity("mass", "g", "largest payload as a mass"),
    "spare_payload": Quantity("force", "mN", "largest payload minus the design payload weight"),
    "weight": Quantity("force", "mN", "weight of body and legs"),
}


def perturbed_element(p: dict, x: dict[str, float]) -> dict:
    """Element ``p`` (a design element dict, SI) with the study inputs ``x`` applied: the
    contact-angle shift on its advancing angle (kept in 0–180°, a receding angle kept no larger),
    the radius and length factors on its ``radius`` and ``length`` (the one place the study
    perturbs an element; :mod:`floatcalc.studies.device_batch` calls it for flexible legs)."""
    q = dict(p)
    if isinstance(p.get("coating"), dict):
        c = dict(p["coating"])
        if c.get("advancing") is not None:
            c["advancing"] = min(max(c["advancing"] + x["contact_angle_shift"], 0.0), math.pi)
            if c.get("receding") is not None:
                c["receding"] = min(c["receding"], c["advancing"])
        q["coating"] = c
    if "radius" in q:
        q["radius"] = q["radius"] * x["radius_factor"]
    if "length" in q:
        q["length"] = q["length"] * x["length_factor"]
    return q


@dataclass(frozen=True)
class _DeviceFunc:
    design: Any
    shielding: tuple | None = None

    def __call__(self, x: dict[str, float]) -> dict[str, float]:
        from ..core import equilibrium as eq
        from ..device.solve import Device

        d = self.design
        legs = [perturbed_element(p, x) for p in d.elements]
        liq = d.liquid if x["surface_tension"] == d.liquid.sigma else replace(d.liquid, sigma=x["surface_tension"])
        body = {**d.body, "mass": x["body_mass"]}
        # neighbours' shielding factors of the nominal layout (solved once, not per sample)
        dev = Device.from_design(replace(d, liquid=liq, body=body, elements=tuple(legs)), shielding=self.shielding)
        lc, fs, g = liq.lc, liq.sigma * liq.lc, liq.g
        sup = dev.support()
        xg, yg = dev.centre_of_mass
        P, _, _, _ = eq.capacity(sup, dev.weight / fs, xg / lc, yg / lc, xg / lc, yg / lc)
        Pn = P * fs
        return {"max_payload": Pn, "payload_mass": Pn / g, "spare_payload": Pn - x["payload_mass"] * g,
                "weight": dev.weight}


def device_model(design: Any) -> Model:
    """Study model of a device design (a :class:`~floatcalc.device.Design`, a path or an example name).

    >>> m = device_model("skimmer")
    >>> sorted(m.inputs)[:3]
    ['body_mass', 'contact_angle_shift', 'length_factor']
    """
    from .. import design as dd

    if isinstance(design, str) and design in dd.example_names():
        design = dd.example(design)
    elif not isinstance(design, dd.Design):
        design = dd.load_design(design)
    base = {"contact_angle_shift": 0.0, "surface_tension": design.liquid.sigma, "radius_factor": 1.0,
            "length_factor": 1.0, "body_mass": float(design.body["mass"]), "payload_mass": 0.0}
    from ..device.solve import REFERENCES

    from .device_batch import DeviceBatchFunc, batchable

    label = design.description.split(",")[0][:70] or "design"
    fast = batchable(design)
    from ..device.solve import Device

    shield = Device.from_design(design).shielding
    costly = any(p["kind"] == "flexible_leg" for p in design.elements)
    func = DeviceBatchFunc(design, shielding=shield) if fast else _DeviceFunc(design, shielding=shield)
    if fast and costly:   # build the nominal layout now: each chunk sent to a worker then has it
        func = func.prepared()
    return Model(name=f"device: {label}", func=func,
                 inputs=DEVICE_INPUTS, outputs=DEVICE_OUTPUTS, base=base, vectorised=fast,
                 costly=costly, limit_output="spare_payload",
                 validity=_NominalWarnings(design), references=REFERENCES, cautions=design.liquid.cautions)


@dataclass(frozen=True)
class _NominalWarnings:
    """Validity warnings of the nominal design, from :func:`floatcalc.device.solve_device`."""

    design: Any

    def __call__(self, x) -> list[str]:
        from ..device.solve import solve_device

        return [f"nominal design: {w}" for w in solve_device(self.design).warnings]
