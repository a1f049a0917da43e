"""Assess a whole design (scenario), and write it up as a PDF report and CSV curves.

This module holds no meniscus physics: it calls the public API (:func:`floatcalc.liquid`,
:func:`floatcalc.rod`, :mod:`floatcalc.dimensionless`) for each element group of a scenario (see
:mod:`floatcalc.examples` for the scenario format) and adds up the results.

Verdict (a design rule, stated here once and used by the page, the CLI and the report):

.. math:: m = \\frac{F_{limit}}{W_{body} + W_{payload} + W_{elements}}

with F_limit the sum of the limit forces of all element groups [N] and W the weights [N].
With safety factor SF: m ≥ SF → "floats with margin"; 1 ≤ m < SF → "marginal"; m < 1 →
"sinks". The shortfall is the extra limit force needed to reach SF (marginal) or to float at
all (sinks) [N].

Load sharing: with one element group the whole load acts on it. With several groups and no
device equilibrium model the load is shared in proportion to each group's limit force (all
reach their limit together); a warning says so.

The operating point of a group is the first point of its force–depth curve (from the API) where
the force reaches the group's share, found by linear interpolation along the curve.

>>> from floatcalc.examples import example
>>> a = assess(example("robot"))
>>> a.verdict in VERDICTS
True
>>> a.margin > 1
True
"""

from __future__ import annotations

import csv
import io
import math
import textwrap
import zipfile
from dataclasses import dataclass
from typing import Any

import numpy as np

from . import _validate as v
from .errors import input_error
from .results import Result, field, qfield
from .units import Q_, to_si

VERDICTS = ("floats with margin", "marginal", "sinks")

#: Lab cautions shown with every result, beside the liquid's own cautions.
LAB_CAUTIONS = (
    "Electronics near water: keep batteries, chargers and mains-powered instruments away from "
    "the bath, and dry a robot's electronics before powering it after it has been in the liquid.",
)
HOT_CAUTION = "Hot liquid: risk of scalds and of vapour; handle the bath with care."

BAUDOIN_REFERENCE = ("Bush & Hu, Annu. Rev. Fluid Mech. 38, 339 (2006): Baudoin number "
                     "(weight over the largest surface-tension force)")
VERDICT_RULE = ("margin = limit force / (body + payload + element weight); floats with margin if "
                "margin ≥ safety factor, marginal if 1 ≤ margin < safety factor, sinks if margin < 1")


def verdict(margin: float, safety_factor: float) -> str:
    """Verdict word for a load margin and safety factor (thresholds in the module docstring).

    >>> verdict(2.5, 2.0), verdict(1.2, 2.0), verdict(0.7, 2.0)
    ('floats with margin', 'marginal', 'sinks')
    """
    if not (math.isfinite(margin) or margin == math.inf):
        raise input_error("margin", "must be a number", margin)
    if margin >= safety_factor:
        return VERDICTS[0]
    if margin >= 1.0:
        return VERDICTS[1]
    return VERDICTS[2]


# ------------------------------------------------------------------------------------------------
# Input checks for single fields (the page shows the message beside the field)

def _mass(value: Any, name: str) -> float:
    m = to_si(value, "mass", name)
    if not (0.0 <= m <= 10.0):
        raise input_error(name, "must be from 0 to 10 kg", f"{m * 1e3:.4g} g")
    return m


def safety_factor(value: Any) -> float:
    """Safety factor, a number from 1 to 100."""
    try:
        sf = float(value)
    except (TypeError, ValueError):
        raise input_error("safety_factor", "must be a number from 1 to 100", repr(value)) from None
    if not (math.isfinite(sf) and 1.0 <= sf <= 100.0):
        raise input_error("safety_factor", "must be a number from 1 to 100", repr(value))
    return sf


def material_density(value: Any) -> Any:
    """Density [kg/m³] of a leg material named in :mod:`floatcalc.materials`, or the density given."""
    from .materials import leg_material

    if isinstance(value, str) and not any(ch.isdigit() for ch in value):
        return leg_material(value).rho
    v.density(value, "material")
    return value


def _density_si(material: Any) -> float:
    """Density [kg/m³] of a material name or density text."""
    rho = material_density(material)
    return float(v.density(rho, "material") if isinstance(rho, str) else rho)


_FIELD_CHECKS = {
    "radius": lambda x: v.length(x, "radius"),
    "thickness": lambda x: v.length(x, "thickness"),
    "ring_radius": lambda x: v.length(x, "ring_radius"),
    "wire_radius": lambda x: v.length(x, "wire_radius"),
    "length": lambda x: v.length(x, "length"),
    "count": lambda x: v.count(x, "count"),
    "advancing_angle": lambda x: v.angle(x, "advancing_angle"),
    "receding_angle": lambda x: v.angle(x, "receding_angle"),
    "material": material_density,
    "body_mass": lambda x: _mass(x, "body_mass"),
    "payload": lambda x: _mass(x, "payload"),
    "safety_factor": safety_factor,
    "temperature": lambda x: to_si(x, "temperature", "temperature"),
    "salinity": lambda x: to_si(x, "salinity", "salinity"),
    "surface_tension": lambda x: to_si(x, "surface_tension", "surface_tension"),
}


def check_field(name: str, value: Any) -> str | None:
    """The one-line problem with a single input value, or None if the API accepts it.

    >>> check_field("radius", "0.2 mm") is None
    True
    >>> check_field("radius", "-1 mm")
    'radius: must be positive, got -1 mm'
    """
    from .errors import InputError

    if name not in _FIELD_CHECKS:
        raise KeyError(name)
    try:
        _FIELD_CHECKS[name](value)
    except InputError as exc:
        return str(exc)
    return None


def check_ring(ring_radius: Any, wire_radius: Any) -> str | None:
    """The one-line problem with a ring footpad's two radii together, or None.

    The ring radius (of the wire's centre line) must be at least twice the wire radius, as
    :func:`floatcalc.ring` requires; each value alone is checked by :func:`check_field`.

    >>> check_ring("5 mm", "0.2 mm") is None
    True
    >>> check_ring("0.3 mm", "0.2 mm")
    'ring_radius: must be at least twice the wire radius (0.4 mm), got 0.3 mm'
    """
    from .errors import InputError

    try:
        R = v.length(ring_radius, "ring_radius")
        b = v.length(wire_radius, "wire_radius")
    except InputError as exc:
        return str(exc)
    if R < 2.0 * b:
        return str(input_error("ring_radius", f"must be at least twice the wire radius ({2 * b * 1e3:.4g} mm)",
                               f"{R * 1e3:.4g} mm"))
    return None


# ------------------------------------------------------------------------------------------------
# Evaluation

@dataclass(frozen=True, kw_only=True)
class ElementOutcome(Result):
    """One element group of a design: the API result, its load share and operating point."""

    label: str = field(default="")
    kind: str = field(default="rod")
    spec: dict = field(default_factory=dict, json=False)
    result: Any = field(default=None, json=False)
    #: The result's curve is for one element of ``per_element`` identical ones (1: whole group).
    per_element: int = field(default=1)
    max_force: Any = qfield("N")
    own_weight: Any = qfield("N")
    load_share: Any = qfield("N")
    operating_depth: Any = qfield("m", default=None)
    depth_at_max: Any = qfield("m")
    contact_perimeter: Any = qfield("m")
    bond_number: float = field(default=0.0)
    bond_reading: str = field(default="")
    warnings: tuple[str, ...] = field(default=())


@dataclass(frozen=True, kw_only=True)
class Assessment(Result):
    """A whole design: totals, margin, verdict, groups, warnings, cautions and references."""

    title: str = field(default="")
    invented: bool = field(default=False)
    scenario: dict = field(default_factory=dict, json=False)
    liquid: Any = field(default=None, json=False)
    elements: tuple[ElementOutcome, ...] = field(default=())
    limit_force: Any = qfield("N")
    element_weight: Any = qfield("N")
    body_weight: Any = qfield("N")
    payload_weight: Any = qfield("N")
    total_load: Any = qfield("N")
    spare_payload: Any = qfield("N")
    margin: float = field(default=0.0)
    safety_factor: float = field(default=1.5)
    verdict: str = field(default="")
    shortfall: Any = qfield("N", default=None)
    baudoin_number: float = field(default=0.0)
    baudoin_reading: str = field(default="")
    warnings: tuple[str, ...] = field(default=())
    cautions: tuple[str, ...] = field(default=())
    references: tuple[str, ...] = field(default=())

    def to_dict(self) -> dict[str, Any]:
        d = super().to_dict()
        if self.liquid is not None:
            d["liquid"] = self.liquid.summary()
        d["verdict_rule"] = VERDICT_RULE
        return d


def make_liquid(spec: dict[str, Any]):
    """The :class:`~floatcalc.liquids.Liquid` described by a scenario's ``liquid`` table."""
    from .liquids import contaminated, liquid

    sal = spec.get("salinity") or None
    liq = liquid(spec.get("name", "water"), spec.get("temperature", "20 degC"), sal)
    if spec.get("surface_tension"):
        liq = contaminated(liq, surface_tension=spec["surface_tension"])
    return liq


def element_label(spec: dict[str, Any]) -> str:
    """Short description of an element group in words, from its inputs."""
    kind = spec.get("kind", "rod")
    if kind in ("ball", "pad"):
        n = int(spec.get("count", 1))
        what = {"ball": "ball foot", "pad": "pad"}[kind] + ("" if n == 1 else "s")
        extra = f", thickness {spec.get('thickness')}" if kind == "pad" else ""
        return (f"{n} {what}, radius {spec.get('radius')}{extra}, {spec.get('material', 'steel')}, "
                f"{spec.get('coating', 'custom')} ({spec.get('advancing_angle')} advancing)")
    if kind in ("ring", "pin"):
        n = int(spec.get("count", 1))
        if kind == "ring":
            geo = f"ring footpad{'' if n == 1 else 's'}, ring radius {spec.get('ring_radius')}, " \
                  f"wire radius {spec.get('wire_radius')}"
        else:
            geo = f"vertical pin{'' if n == 1 else 's'}, radius {spec.get('radius')}, length {spec.get('length')}"
        return (f"{n} {geo}, {spec.get('material', 'steel')}, {spec.get('coating', 'custom')} "
                f"({spec.get('advancing_angle')} advancing)")
    if kind == "rod":
        n = int(spec.get("count", 1))
        legs = "leg" if n == 1 else "legs"
        return (f"{n} {legs}, radius {spec.get('radius')}, length {spec.get('length')}, "
                f"{spec.get('material', 'steel')}, {spec.get('coating', 'custom')} "
                f"({spec.get('advancing_angle')} advancing)")
    return str(spec.get("kind"))


def evaluate_element(spec: dict[str, Any], liq) -> tuple[Any, float]:
    """API result of one element group, and its contact-line length [m] (for the Baudoin number)."""
    kind = spec.get("kind", "rod")
    if kind == "rod":
        from .rods import rod

        rec = spec.get("receding_angle") or None
        r = rod(spec["radius"], spec["length"], spec["advancing_angle"], receding_angle=rec,
                liquid=liq, material_density=material_density(spec.get("material", "steel")),
                count=spec.get("count", 1))
        # Two contact lines along each leg.
        return r, 2.0 * r.length.to("m").magnitude * r.count
    if kind in ("ball", "pad"):
        import floatcalc as fc

        rho = material_density(spec.get("material", "steel"))
        if kind == "ball":
            r = fc.ball(spec["radius"], spec["advancing_angle"], liquid=liq, material_density=rho)
        else:
            r = fc.pad(spec["radius"], spec["thickness"], spec["advancing_angle"], liquid=liq,
                       material_density=rho)
        rc = r.contact_radius_at_max.to("m").magnitude
        return r, 2.0 * math.pi * rc * int(spec.get("count", 1))
    if kind == "ring":
        import floatcalc as fc

        r = fc.ring(spec["ring_radius"], spec["wire_radius"], spec["advancing_angle"], liquid=liq,
                    material_density=material_density(spec.get("material", "steel")))
        # Two contact lines: outside and inside the loop.
        d = r.details
        Rr, b = r.profile["ring_radius_m"], r.profile["wire_radius_m"]
        r_in = Rr - b * math.sin(math.radians(d["contact_position_inner_deg"]))
        rc = r.contact_radius_at_max.to("m").magnitude
        return r, 2.0 * math.pi * (rc + r_in) * int(spec.get("count", 1))
    if kind == "pin":
        from .round import pin_limit

        r = pin_limit(spec["radius"], spec["length"], spec["advancing_angle"], liq,
                      material_density(spec.get("material", "steel")))
        b = r.contact_radius_at_max.to("m").magnitude
        return r, 2.0 * math.pi * b * int(spec.get("count", 1))
    raise input_error("kind", "must be one of rod, ball, pad, ring, pin", repr(kind))


def _operating_depth(curve, share: float) -> float | None:
    depth = curve.depth.to("m").magnitude
    force = curve.force.to("N").magnitude
    above = np.flatnonzero(force >= share)
    if above.size == 0:
        return None
    k = int(above[0])
    if k == 0:
        return float(depth[0])
    f0, f1 = force[k - 1], force[k]
    t = (share - f0) / (f1 - f0) if f1 != f0 else 1.0
    return float(depth[k - 1] + t * (depth[k] - depth[k - 1]))


def assess(scenario: dict[str, Any], evaluate=None) -> Assessment:
    """Evaluate every element group of ``scenario`` and the design's margin and verdict.

    ``evaluate(spec, liquid)`` replaces :func:`evaluate_element` (same return value), e.g. a
    cached version of it for the slower element kinds (a ring takes a second or two).

    Raises :class:`~floatcalc.errors.InputError` with the field named for any bad value.
    """
    from .dimensionless import baudoin_number, bond_number

    liq = make_liquid(scenario.get("liquid", {}))
    load = scenario.get("load", {})
    g = liq.g
    W_body = _mass(load.get("body_mass", "0 g"), "body_mass") * g
    W_pay = _mass(load.get("payload", "0 g"), "payload") * g
    sf = safety_factor(load.get("safety_factor", 1.5))
    specs = scenario.get("elements") or []
    if not specs:
        raise input_error("elements", "a design needs at least one support element", "none")

    raw = [(evaluate or evaluate_element)(s, liq) for s in specs]
    # Rod results are totals over their legs; round results are for one element of the group.
    per = [1 if s.get("kind", "rod") == "rod" else int(s.get("count", 1)) for s in specs]
    F = np.array([n * r.max_force.to("N").magnitude for n, (r, _) in zip(per, raw)])
    W_el = float(sum(n * r.own_weight.to("N").magnitude for n, (r, _) in zip(per, raw)))
    F_lim = float(F.sum())
    W_tot = W_body + W_pay + W_el
    margin = F_lim / W_tot if W_tot > 0 else math.inf
    word = verdict(margin, sf)
    short = None
    if word == "marginal":
        short = Q_(sf * W_tot - F_lim, "N")
    elif word == "sinks":
        short = Q_(W_tot - F_lim, "N")

    warnings: list[str] = []
    if len(raw) > 1:
        warnings.append("several element groups: the load is shared in proportion to each group's "
                        "limit force (no device equilibrium or shared meniscus)")
    outcomes = []
    for spec, (r, perim), n in zip(specs, raw, per):
        fi = n * r.max_force.to("N").magnitude
        share = W_tot * fi / F_lim if F_lim > 0 else 0.0
        op = _operating_depth(r.curve, share / n) if r.curve is not None else None
        kind = spec.get("kind", "rod")
        if kind == "rod":
            radius, what = r.radius.to("m").magnitude, "leg radius"
        elif kind == "ring":
            radius, what = v.length(spec["wire_radius"], "wire_radius"), "ring wire radius"
        else:
            radius, what = v.length(spec["radius"], "radius"), f"{kind} radius"
        bo = bond_number(liq, radius, what)
        label = element_label(spec)
        outcomes.append(ElementOutcome(
            label=label, kind=kind, spec=dict(spec), result=r, per_element=n,
            max_force=Q_(fi, "N"), own_weight=r.own_weight * n, load_share=Q_(share, "N"),
            operating_depth=None if op is None else Q_(op, "m"), depth_at_max=r.depth_at_max,
            contact_perimeter=Q_(perim, "m"), bond_number=bo.value, bond_reading=bo.reading,
            warnings=tuple(r.warnings),
        ))
        warnings += [f"{label}: {w}" for w in r.warnings]
    perimeter = sum(o.contact_perimeter.to("m").magnitude for o in outcomes)
    ba = baudoin_number(liq, W_tot, perimeter)

    cautions = list(liq.cautions)
    if liq.T - 273.15 > 50.0 and not any(c.lower().startswith("hot") for c in cautions):
        cautions.append(HOT_CAUTION)
    cautions += [c for c in LAB_CAUTIONS if c not in cautions]
    refs: list[str] = []
    for r, _ in raw:
        refs += [x for x in getattr(r, "references", ()) if x not in refs]
    refs += [f"surface tension: {liq.sigma_source}", f"density: {liq.rho_source}", BAUDOIN_REFERENCE]

    return Assessment(
        title=scenario.get("title", "Design"), invented=bool(scenario.get("invented", False)),
        scenario=scenario, liquid=liq, elements=tuple(outcomes),
        limit_force=Q_(F_lim, "N"), element_weight=Q_(W_el, "N"), body_weight=Q_(W_body, "N"),
        payload_weight=Q_(W_pay, "N"), total_load=Q_(W_tot, "N"),
        spare_payload=Q_(F_lim / sf - W_tot, "N"),
        margin=margin, safety_factor=sf, verdict=word, shortfall=short,
        baudoin_number=ba.value, baudoin_reading=ba.reading,
        warnings=tuple(warnings), cautions=tuple(cautions), references=tuple(refs),
    )


# ------------------------------------------------------------------------------------------------
# Whole devices (floatcalc.device): equilibrium, capacity and the same verdict rule

@dataclass(frozen=True, kw_only=True)
class DeviceAssessment(Result):
    """A device design solved by :func:`floatcalc.device.solve_device`, with margin and verdict.

    ``limit_force`` is the largest total weight the device carries with the payload at the
    centre of mass (own weight + capacity); ``margin`` = limit_force / (weight + payload).
    ``elements`` holds one :class:`ElementOutcome` for the most loaded rod leg, computed alone
    with :func:`floatcalc.rod` (its curve and cross-section are drawn), with the device's
    equilibrium force on that leg as its load.
    """

    title: str = field(default="")
    invented: bool = field(default=False)
    data: dict = field(default_factory=dict, json=False)
    result: Any = field(default=None, json=False)
    liquid: Any = field(default=None, json=False)
    elements: tuple[ElementOutcome, ...] = field(default=(), json=False)
    limit_force: Any = qfield("N")
    weight: Any = qfield("N")
    payload_weight: Any = qfield("N")
    total_load: Any = qfield("N")
    spare_payload: Any = qfield("N")
    margin: float = field(default=0.0)
    safety_factor: float = field(default=1.5)
    verdict: str = field(default="")
    shortfall: Any = qfield("N", default=None)
    baudoin_number: float = field(default=0.0)
    baudoin_reading: str = field(default="")
    warnings: tuple[str, ...] = field(default=())
    cautions: tuple[str, ...] = field(default=())
    references: tuple[str, ...] = field(default=())

    def to_dict(self) -> dict[str, Any]:
        d = super().to_dict()
        d["device"] = self.result.to_dict() if self.result is not None else None
        d["verdict_rule"] = VERDICT_RULE
        return d


def is_device_data(data: dict[str, Any]) -> bool:
    """True for a device design file (``floatcalc.device`` format), False for a scenario."""
    return isinstance(data, dict) and ("schema_version" in data or "legs" in data)


def assess_device(data: dict[str, Any], payload: Any = "0 g", safety_factor_value: Any = 1.5) -> DeviceAssessment:
    """Solve a device design (parsed TOML dict of the device format) and apply the verdict rule."""
    from .device import solve_device
    from .device.design import design_from_data
    from .device.elements import effective_angle
    from .dimensionless import baudoin_number
    from .rods import rod

    sf = safety_factor(safety_factor_value)
    mp = _mass(payload, "payload")
    design = design_from_data(data)
    res = solve_device(design, payload=f"{mp} kg")
    liq = design.liquid
    W = res.weight.to("N").magnitude
    P = mp * liq.g
    cap = W + res.max_payload.to("N").magnitude
    margin = cap / (W + P)
    word = verdict(margin, sf)
    short = None
    if word == "marginal":
        short = Q_(sf * (W + P) - cap, "N")
    elif word == "sinks":
        short = Q_(W + P - cap, "N")

    outcomes = []
    rods = [i for i, p in enumerate(design.legs) if p["kind"] == "rod"]
    if rods:
        i = max(rods, key=lambda j: res.elements[j].force.to("N").magnitude / res.elements[j].limit_force.to("N").magnitude)
        p = design.legs[i]
        th = effective_angle(p["coating"]["advancing"], p["coating"])
        rec = p["coating"].get("receding")
        r = rod(p["radius"], p["length"], th, receding_angle=None if rec is None or rec > th else rec,
                liquid=liq, material_density=p["density"])
        st = res.elements[i]
        share = st.force.to("N").magnitude
        op = _operating_depth(r.curve, share)
        from .dimensionless import bond_number

        bo = bond_number(liq, p["radius"], "leg radius")
        outcomes.append(ElementOutcome(
            label=f"{st.name} (most loaded rod leg, computed alone)", kind="rod", spec=dict(p), result=r,
            max_force=r.max_force, own_weight=r.own_weight, load_share=Q_(share, "N"),
            operating_depth=None if op is None else Q_(op, "m"), depth_at_max=r.depth_at_max,
            contact_perimeter=Q_(2 * p["length"], "m"), bond_number=bo.value, bond_reading=bo.reading,
            warnings=tuple(r.warnings)))
    perim = sum(m.perimeter for m in res.device.models)
    ba = baudoin_number(liq, W + P, perim)
    cautions = list(res.cautions)
    if liq.T - 273.15 > 50.0 and not any(c.lower().startswith("hot") for c in cautions):
        cautions.append(HOT_CAUTION)
    cautions += [c for c in LAB_CAUTIONS if c not in cautions]
    refs = list(res.references)
    for o in outcomes:
        refs += [x for x in o.result.references if x not in refs]
    refs += [f"surface tension: {liq.sigma_source}", f"density: {liq.rho_source}"]
    desc = str(data.get("description", "Device design"))
    return DeviceAssessment(
        title=desc, invented=desc.lower().startswith("invented"), data=data, result=res, liquid=liq,
        elements=tuple(outcomes), limit_force=Q_(cap, "N"), weight=Q_(W, "N"), payload_weight=Q_(P, "N"),
        total_load=Q_(W + P, "N"), spare_payload=Q_(cap / sf - (W + P), "N"), margin=margin,
        safety_factor=sf, verdict=word, shortfall=short, baudoin_number=ba.value, baudoin_reading=ba.reading,
        warnings=tuple(res.warnings), cautions=tuple(cautions), references=tuple(refs))


def device_input_rows(a: DeviceAssessment) -> list[tuple[str, str]]:
    """(label, value) rows describing a device's inputs."""
    liq, d = a.liquid, a.data
    rows = [("liquid", f"{liq.name} at {liq.T - 273.15:.1f} °C"),
            ("surface tension", f"{liq.sigma * 1e3:.2f} mN/m ({liq.sigma_source})"),
            ("density", f"{liq.rho:.1f} kg/m³ ({liq.rho_source})"),
            ("capillary length", f"{liq.lc * 1e3:.3f} mm"),
            ("body mass", str(d.get("body", {}).get("mass", ""))),
            ("payload", f"{a.payload_weight.to('N').magnitude / liq.g * 1e3:.4g} g at the centre of mass"),
            ("safety factor", f"{a.safety_factor:g}"),
            ("legs", f"{len(d.get('legs', []))} elements")]
    for leg in d.get("legs", [])[:24]:
        c = leg.get("coating", {})
        rows.append((str(leg.get("name", leg.get("kind"))),
                     f"{leg.get('kind')} at [{', '.join(leg.get('position', []))}], radius {leg.get('radius')}, "
                     f"length {leg.get('length', '-')}, {leg.get('material', leg.get('material_density', ''))}, "
                     f"advancing {c.get('advancing')}" + (f", receding {c['receding']}" if "receding" in c else "")))
    return rows


def device_result_rows(a: DeviceAssessment) -> list[tuple[str, str]]:
    """(label, value) rows of a device's results."""
    r = a.result
    rows = [("verdict", a.verdict + (f" (short by {_mN(a.shortfall)})" if a.shortfall is not None else "")),
            ("margin", f"{a.margin:.3g} (capacity / weight carried; safety factor {a.safety_factor:g})"),
            ("capacity (weight it can carry)", _mN(a.limit_force)),
            ("weight carried", f"{_mN(a.total_load)} (device {_mN(a.weight)}, payload {_mN(a.payload_weight)})"),
            ("payload still allowed at the safety factor",
             f"{_mN(a.spare_payload)} = {a.spare_payload.to('N').magnitude / a.liquid.g * 1e3:.4g} g"),
            ("first element to give way", r.first_to_fail),
            ("equilibrium", f"heave {r.heave.to('mm').magnitude:.3g} mm, pitch {r.pitch.magnitude:.3g}°, "
                            f"roll {r.roll.magnitude:.3g}°"),
            ("Baudoin number", f"{a.baudoin_number:.3g}: {a.baudoin_reading}")]
    for o in a.elements:
        rows.append(("Bond number (leg radius)", f"{o.bond_number:.3g}: {o.bond_reading}"))
    for e in r.elements:
        rows.append((e.name, f"carries {_mN(e.force)} ({100 * e.share:.1f} % of the load) at depth "
                             f"{e.depth.to('mm').magnitude:.3g} mm; limit {_mN(e.limit_force)}"))
    return rows


# ------------------------------------------------------------------------------------------------
# Design study: sweep one input of the first leg group (floatcalc.studies rod model)

STUDY_INPUTS = {"radius": "leg radius", "length": "wetted length of each leg",
                "contact_angle": "advancing contact angle", "count": "number of legs",
                "payload_mass": "mass carried (body + payload)"}


def study_sweep(scenario: dict[str, Any], name: str, start: Any, stop: Any, points: int = 60,
                progress=None, chunks: int = 10):
    """Sweep one input of the scenario's first rod group with :func:`floatcalc.studies.sweep`.

    The other inputs stay at the scenario's values (liquid σ and ρ, material density, and the
    body + payload mass as ``payload_mass``). The sweep runs in ``chunks`` pieces (neighbouring
    pieces share an end point, so no crossing of the limit is lost) and ``progress(fraction)`` is
    called after each, for a progress bar.

    Returns a :class:`~floatcalc.studies.sweep.SweepResult` over the whole range.
    """
    from .studies.models import rod_model

    if name not in STUDY_INPUTS:
        raise input_error("vary", f"must be one of {', '.join(STUDY_INPUTS)}", repr(name))
    try:
        n = int(points)
    except (TypeError, ValueError):
        raise input_error("points", "must be a whole number from 3 to 400", repr(points)) from None
    if not 3 <= n <= 400:
        raise input_error("points", "must be a whole number from 3 to 400", repr(points))
    rods = [e for e in scenario.get("elements", []) if e.get("kind", "rod") == "rod"]
    if not rods:
        raise input_error("vary", "a sweep needs a group of long legs (rods) in the design", "none")
    e = rods[0]
    liq = make_liquid(scenario.get("liquid", {}))
    load = scenario.get("load", {})
    base = {"radius": v.length(e["radius"], "radius"), "length": v.length(e["length"], "length"),
            "contact_angle": v.angle(e["advancing_angle"], "advancing_angle"),
            "count": float(v.count(e.get("count", 1))),
            "material_density": _density_si(e.get("material", "steel")),
            "payload_mass": _mass(load.get("body_mass", "0 g"), "body_mass") + _mass(load.get("payload", "0 g"), "payload")}
    model = rod_model(liquid=liq, **base)
    return _chunked_sweep(model, name, start, stop, n, progress, chunks)


DEVICE_STUDY_INPUTS = {"payload_mass": "payload at the centre of mass", "body_mass": "body mass",
                       "surface_tension": "liquid surface tension (contamination)",
                       "contact_angle_shift": "change of every advancing angle",
                       "radius_factor": "factor on every leg radius", "length_factor": "factor on every leg length"}


def device_study_sweep(data: dict[str, Any], name: str, start: Any, stop: Any, points: int = 16,
                       payload: Any = "0 g", progress=None, chunks: int = 8):
    """Sweep one input of a whole device (:func:`floatcalc.studies.device_model`), in chunks.

    Output ``margin`` [N] is the largest payload at the centre of mass minus the design payload
    (negative: sinks); ``progress(fraction)`` is called after each chunk.
    """
    from .device.design import design_from_data
    from .studies.device_model import device_model

    if name not in DEVICE_STUDY_INPUTS:
        raise input_error("vary", f"must be one of {', '.join(DEVICE_STUDY_INPUTS)}", repr(name))
    try:
        n = int(points)
    except (TypeError, ValueError):
        raise input_error("points", "must be a whole number from 3 to 100", repr(points)) from None
    if not 3 <= n <= 100:
        raise input_error("points", "must be a whole number from 3 to 100", repr(points))
    model = device_model(design_from_data(data))
    mp = _mass(payload, "payload")
    if mp:
        model = dataclasses_replace_base(model, payload_mass=mp)
    return _chunked_sweep(model, name, start, stop, n, progress, chunks)


def dataclasses_replace_base(model, **base):
    """The study model with some base values replaced (SI)."""
    import dataclasses

    return dataclasses.replace(model, base={**model.base, **base})


def _chunked_sweep(model, name: str, start: Any, stop: Any, n: int, progress, chunks: int):
    import dataclasses

    from .studies.ranges import parse_axis
    from .studies.sweep import sweep

    cat = model.axis_catalogue()
    for what, txt in (("start", start), ("stop", stop)):
        if not isinstance(txt, str) or not txt.strip() or ":" in txt or "=" in txt:
            raise input_error(what, "must be a value with a unit, e.g. '0.1 mm'", repr(txt))
    axis = parse_axis(f"{name}={start.replace(' ', '')}:{stop.replace(' ', '')}:{n}", cat)
    vals = axis.values
    k = max(1, min(chunks, vals.size - 1))
    edges = np.linspace(0, vals.size - 1, k + 1).round().astype(int)
    parts = []
    for j in range(k):
        sub = dataclasses.replace(axis, values=vals[edges[j]:edges[j + 1] + 1])
        parts.append(sweep(model, [sub], executor="serial"))
        if progress is not None:
            progress((j + 1) / k)
    outputs = {key: np.concatenate([parts[0].outputs[key]] + [p.outputs[key][1:] for p in parts[1:]])
               for key in parts[0].outputs}
    cross = sorted({round(c, 15) for p in parts for c in p.crossings})
    warn = []
    for p in parts:
        warn += [w for w in p.warnings if w not in warn]
    return dataclasses.replace(parts[0], axes=(axis,), outputs=outputs, crossings=tuple(cross),
                               warnings=tuple(warn))


# ------------------------------------------------------------------------------------------------
# Text summaries shared by the report and the CLI

def _mN(q) -> str:
    return f"{q.to('mN').magnitude:.4g} mN"


def input_rows(a: Assessment) -> list[tuple[str, str]]:
    """(label, value) rows describing the inputs of an assessment."""
    liq = a.liquid
    s = a.scenario
    lspec = s.get("liquid", {})
    rows = [("liquid", f"{liq.name} at {liq.T - 273.15:.1f} °C"
                       + (f", salinity {lspec['salinity']}" if lspec.get("salinity") else "")),
            ("surface tension", f"{liq.sigma * 1e3:.2f} mN/m ({liq.sigma_source})"),
            ("density", f"{liq.rho:.1f} kg/m³ ({liq.rho_source})"),
            ("capillary length", f"{liq.lc * 1e3:.3f} mm")]
    load = s.get("load", {})
    rows += [("body mass", str(load.get("body_mass", "0 g"))), ("payload", str(load.get("payload", "0 g"))),
             ("safety factor", f"{a.safety_factor:g}")]
    for i, o in enumerate(a.elements, 1):
        sp = o.spec
        rows.append((f"element group {i}", o.label))
        if sp.get("receding_angle"):
            rows.append(("", f"receding angle {sp['receding_angle']}"))
    return rows


def result_rows(a: Assessment) -> list[tuple[str, str]]:
    """(label, value) rows of the results of an assessment."""
    rows = [("verdict", a.verdict + (f" (short by {_mN(a.shortfall)})" if a.shortfall is not None else "")),
            ("margin", f"{a.margin:.3g} (limit force / total weight; safety factor {a.safety_factor:g})"),
            ("limit force, all elements", _mN(a.limit_force)),
            ("total weight carried", f"{_mN(a.total_load)} (body {_mN(a.body_weight)}, payload "
                                     f"{_mN(a.payload_weight)}, elements {_mN(a.element_weight)})"),
            ("payload still allowed at the safety factor",
             f"{_mN(a.spare_payload)} = {a.spare_payload.to('N').magnitude / a.liquid.g * 1e3:.4g} g")]
    for i, o in enumerate(a.elements, 1):
        r = o.result
        rows.append((f"group {i} limit force", f"{_mN(o.max_force)} (surface tension "
                     f"{_mN(r.surface_tension_part * o.per_element)}, pressure {_mN(r.pressure_part * o.per_element)})"))
        rows.append((f"group {i} depth at limit", f"{o.depth_at_max.to('mm').magnitude:.3g} mm"))
        od = "beyond the limit (sinks)" if o.operating_depth is None else f"{o.operating_depth.to('mm').magnitude:.3g} mm"
        rows.append((f"group {i} load and depth", f"{_mN(o.load_share)} at depth {od}"))
        rows.append((f"group {i} Bond number", f"{o.bond_number:.3g}: {o.bond_reading} (L = element radius)"))
    rows.append(("Baudoin number", f"{a.baudoin_number:.3g}: {a.baudoin_reading}"))
    return rows


def comparison_rows(items: list[tuple[str, Assessment]]) -> list[dict[str, str]]:
    """One row per design: name, limit force, load, margin, verdict, depth at limit."""
    out = []
    for name, a in items:
        out.append({
            "design": name,
            "limit force [mN]": f"{a.limit_force.to('mN').magnitude:.4g}",
            "total weight [mN]": f"{a.total_load.to('mN').magnitude:.4g}",
            "margin [-]": f"{a.margin:.3g}",
            "verdict": a.verdict,
            "deepest limit depth [mm]": f"{max(o.depth_at_max.to('mm').magnitude for o in a.elements):.3g}",
            "Baudoin number [-]": f"{a.baudoin_number:.3g}",
        })
    return out


# ------------------------------------------------------------------------------------------------
# CSV

def _slug(text: str) -> str:
    keep = "".join(c.lower() if c.isalnum() else "-" for c in text)
    return "-".join(p for p in keep.split("-") if p)[:40] or "design"


def curve_tables(a: Assessment, prefix: str = "") -> dict[str, str]:
    """CSV text of every curve of an assessment, keyed by a file name.

    Force–depth curves: depth_m, force_N, surface_tension_part_N, pressure_part_N.
    Meniscus profiles: x_m, z_m (left branch, then right; the solid section is listed as
    solid_x_m, solid_z_m in its own file).
    """
    out: dict[str, str] = {}
    p = prefix or ""
    for i, o in enumerate(a.elements, 1):
        r = o.result
        buf = io.StringIO()
        w = csv.writer(buf, lineterminator="\n")
        w.writerow(["depth_m", "force_N", "surface_tension_part_N", "pressure_part_N"])
        for row in r.curve.rows():
            w.writerow([f"{x:.9g}" for x in row])
        out[f"{p}group{i}_force_depth.csv"] = buf.getvalue()
        prof = getattr(r, "profile", None)
        if prof and "right_m" in prof:
            buf = io.StringIO()
            w = csv.writer(buf, lineterminator="\n")
            w.writerow(["side", "x_m", "z_m"])
            for side in ("left_m", "right_m"):
                xs, zs = prof[side]
                for x, z in zip(xs, zs):
                    w.writerow([side[:-2], f"{x:.9g}", f"{z:.9g}"])
            out[f"{p}group{i}_meniscus.csv"] = buf.getvalue()
        elif prof and "r_m" in prof:
            buf = io.StringIO()
            w = csv.writer(buf, lineterminator="\n")
            w.writerow(["r_m", "z_m"])
            for x, z in zip(prof["r_m"], prof["z_m"]):
                w.writerow([f"{x:.9g}", f"{z:.9g}"])
            out[f"{p}group{i}_meniscus.csv"] = buf.getvalue()
    return out


def device_element_table(a: DeviceAssessment) -> str:
    """CSV of a device's elements at equilibrium (name, plan position, force, share, depths, limit)."""
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    w.writerow(["element", "kind", "x_m", "y_m", "force_N", "share", "depth_m", "limit_force_N",
                "limit_depth_m", "depth_margin_m"])
    for e, m in zip(a.result.elements, a.result.device.models):
        c = m.footprint.mean(axis=0)
        w.writerow([e.name, e.kind, f"{c[0]:.9g}", f"{c[1]:.9g}", f"{e.force.to('N').magnitude:.9g}",
                    f"{e.share:.6g}", f"{e.depth.to('m').magnitude:.9g}", f"{e.limit_force.to('N').magnitude:.9g}",
                    f"{e.limit_depth.to('m').magnitude:.9g}", f"{e.depth_margin.to('m').magnitude:.9g}"])
    return buf.getvalue()


def csv_zip(tables: dict[str, str]) -> bytes:
    """A zip archive (bytes) of CSV tables."""
    buf = io.BytesIO()
    with zipfile.ZipFile(buf, "w", zipfile.ZIP_DEFLATED) as z:
        for name, text in tables.items():
            z.writestr(name, text)
    return buf.getvalue()


def write_csv_dir(a: Assessment, directory: str, others: list[tuple[str, Assessment]] = ()) -> list[str]:
    """Write every curve as CSV into ``directory`` (created if needed); returns the paths."""
    import os

    os.makedirs(directory, exist_ok=True)
    paths = []
    tables = dict(curve_tables(a))
    for k, (name, b) in enumerate(others, 2):
        tables.update(curve_tables(b, prefix=f"design{k}_"))
    if isinstance(a, DeviceAssessment):
        tables["device_elements.csv"] = device_element_table(a)
    for name, text in tables.items():
        path = os.path.join(directory, name)
        with open(path, "w", encoding="utf-8", newline="") as f:
            f.write(text)
        paths.append(path)
    return paths


# ------------------------------------------------------------------------------------------------
# PDF

_PAGE = (8.27, 11.69)  # A4 portrait [inch]


class _TextPage:
    """Flowing text on A4 pages (matplotlib only)."""

    def __init__(self, pdf, heading: str):
        self.pdf, self.heading = pdf, heading
        self.fig = None
        self.y = 0.0
        self._new()

    def _new(self, cont: bool = False):
        from matplotlib.figure import Figure

        if self.fig is not None:
            self.pdf.savefig(self.fig)
        self.fig = Figure(figsize=_PAGE)
        self.fig.text(0.07, 0.955, self.heading + (" (continued)" if cont else ""), fontsize=15,
                      weight="bold", color="#1f3b4d")
        self.fig.text(0.07, 0.03, "floatcalc report: static estimate on a clean liquid surface",
                      fontsize=7, color="#666666")
        self.y = 0.92

    def line(self, text: str, size: float = 9.0, bold: bool = False, indent: float = 0.0,
             color: str = "#222222", width: int = 100):
        for k, part in enumerate(textwrap.wrap(text, width=width) or [""]):
            if self.y < 0.06:
                self._new(cont=True)
            self.fig.text(0.07 + indent + (0.02 if k else 0.0), self.y, part, fontsize=size,
                          weight="bold" if bold else "normal", color=color, va="top")
            self.y -= 0.0165 * size / 9.0
        return self

    def rows(self, rows, width: int = 70):
        for label, value in rows:
            lines = textwrap.wrap(value, width=width) or [""]
            for k, part in enumerate(lines):
                if self.y < 0.06:
                    self._new(cont=True)
                if k == 0 and label:
                    self.fig.text(0.07, self.y, label, fontsize=8.5, color="#1f3b4d", va="top")
                self.fig.text(0.40, self.y, part, fontsize=8.5, color="#222222", va="top")
                self.y -= 0.0155
        return self

    def gap(self, h: float = 0.012):
        self.y -= h
        return self

    def close(self):
        self.pdf.savefig(self.fig)
        self.fig = None


HEADINGS = ("Design summary", "Drawings", "Comparison of designs", "Warnings, cautions and models")


def write_pdf(a: Assessment, target: Any, others: list[tuple[str, Assessment]] = ()) -> None:
    """Write the PDF report of ``a`` (and a comparison with ``others``) to a path or file object.

    Pages: "Design summary" (inputs, results, verdict), "Drawings" (for a device first its plan
    view; then the meniscus cross-section and force–depth curve of each element group, or of a
    device's most loaded leg), "Comparison of designs" (only with ``others``), "Warnings,
    cautions and models". ``a`` is an :class:`Assessment` or a :class:`DeviceAssessment`.
    """
    from matplotlib.backends.backend_pdf import PdfPages
    from matplotlib.figure import Figure

    from . import plotting

    with PdfPages(target, metadata={"Title": f"floatcalc report: {a.title}", "Creator": "floatcalc"}) as pdf:
        page = _TextPage(pdf, HEADINGS[0])
        page.line(a.title, size=11, bold=True)
        if a.invented:
            page.line("This is an invented example scenario, not a measured design.", color="#8a4b08")
        page.gap()
        page.line(f"Verdict: {a.verdict.upper()}", size=13, bold=True,
                  color=plotting.VERDICT_COLOURS[a.verdict])
        page.line(f"margin {a.margin:.3g} against safety factor {a.safety_factor:g}"
                  + (f"; short by {_mN(a.shortfall)}" if a.shortfall is not None else ""))
        page.gap()
        dev = isinstance(a, DeviceAssessment)
        page.line("Inputs", size=11, bold=True).rows(device_input_rows(a) if dev else input_rows(a)).gap()
        page.line("Results", size=11, bold=True).rows(device_result_rows(a) if dev else result_rows(a)).gap()
        page.line("Verdict rule: " + VERDICT_RULE, size=8, color="#444444")
        page.close()

        if dev:
            fig = Figure(figsize=_PAGE)
            fig.text(0.07, 0.955, HEADINGS[1] + " (plan view)", fontsize=15, weight="bold", color="#1f3b4d")
            plotting.plan_view(a.result, ax=fig.add_axes([0.1, 0.3, 0.85, 0.6]))
            fig.text(0.07, 0.24, "Numbers on the elements: share of the total load carried at equilibrium. "
                     "Contours: superposed linearised meniscus depth.", fontsize=8.5)
            pdf.savefig(fig)
        for i, o in enumerate(a.elements, 1):
            fig = Figure(figsize=_PAGE)
            fig.text(0.07, 0.955, HEADINGS[1] + (f" (element group {i})" if len(a.elements) > 1 else ""),
                     fontsize=15, weight="bold", color="#1f3b4d")
            fig.text(0.07, 0.93, o.label, fontsize=8.5)
            ax1 = fig.add_axes([0.12, 0.67, 0.8, 0.24])
            plotting.meniscus_section(o.result, ax=ax1)
            ax3 = fig.add_axes([0.12, 0.40, 0.8, 0.19])
            plotting.meniscus_section(o.result, ax=ax3, zoom=True)
            ax2 = fig.add_axes([0.12, 0.07, 0.8, 0.26])
            plotting.force_depth(o.result, ax=ax2, load=o.load_share / o.per_element,
                                 operating_depth=o.operating_depth)
            pdf.savefig(fig)

        if others:
            items = [("design 1: " + a.title, a)] + [(f"design {k}: {n}", b) for k, (n, b) in enumerate(others, 2)]
            fig = Figure(figsize=_PAGE)
            fig.text(0.07, 0.955, HEADINGS[2], fontsize=15, weight="bold", color="#1f3b4d")
            y = 0.92
            for row in comparison_rows(items):
                for part in textwrap.wrap(row["design"], 95):
                    fig.text(0.07, y, part, fontsize=8.5, weight="bold", va="top")
                    y -= 0.016
                text = "; ".join(f"{k} {val}" for k, val in row.items() if k != "design")
                for part in textwrap.wrap(text, 105):
                    fig.text(0.09, y, part, fontsize=8, va="top")
                    y -= 0.015
                y -= 0.012
            ax = fig.add_axes([0.12, 0.08, 0.8, max(0.25, min(0.55, y - 0.16))])
            plotting.compare_curves([(f"design {k}", b) for k, (_, b) in enumerate(items, 1)], ax=ax)
            pdf.savefig(fig)

        page = _TextPage(pdf, HEADINGS[3])
        page.line("Warnings from the models", size=11, bold=True)
        for w in a.warnings or ("none: every input lies inside the models' stated validity ranges",):
            page.line("• " + w, indent=0.01)
        page.gap().line("Cautions", size=11, bold=True)
        for c in a.cautions:
            page.line("• " + c, indent=0.01)
        page.gap().line("Models and references", size=11, bold=True)
        for r in a.references:
            page.line("• " + r, indent=0.01)
        page.close()


def pdf_bytes(a: Assessment, others: list[tuple[str, Assessment]] = ()) -> bytes:
    """The PDF report as bytes (for a download button)."""
    buf = io.BytesIO()
    write_pdf(a, buf, others)
    return buf.getvalue()


__all__ = ["VERDICTS", "VERDICT_RULE", "LAB_CAUTIONS", "verdict", "check_field", "check_ring", "assess", "Assessment",
           "DeviceAssessment", "assess_device", "device_element_table", "is_device_data", "device_input_rows", "device_result_rows",
           "ElementOutcome", "make_liquid", "curve_tables", "csv_zip", "write_csv_dir", "write_pdf",
           "pdf_bytes", "study_sweep", "STUDY_INPUTS", "device_study_sweep", "DEVICE_STUDY_INPUTS", "input_rows", "result_rows", "comparison_rows", "HEADINGS"]
