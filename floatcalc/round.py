"""Round support elements: vertical pin, ball foot, flat circular pad and ring footpad.

Public API over :mod:`floatcalc.core.round_bodies` and :mod:`floatcalc.core.axisym`: inputs are
converted once (quantities, SI floats or strings), scaled by the capillary length, and the
results come back as frozen :class:`~floatcalc.results.Result` records with units.

Model: the axisymmetric Young–Laplace meniscus (arclength form, K₀ far field outside a body,
I₀-regular centre inside a ring), whose contact-line height is tabulated once as a universal
function of (contact radius / l_c, inclination ψ). Force = vertical surface-tension pull along
each contact line + hydrostatic pressure on the wetted surface (conventions in ``PHYSICS.md``:
z = 0 undisturbed, z up, θ through the liquid, φ from the lowest point, ψ = φ + θ − π).

* :func:`pin` — a vertical pin or fibre dipped through the surface: meniscus height and
  vertical force (Wilhelmy pull −σ·2πb·cos θ plus the pressure on its flat tip).
* :func:`ball` — a sphere: force over the contact position, limit = maximum.
* :func:`pad` — a flat disc with sharp edges: bottom-edge pinning, climbing the side, top-edge
  pinning (Gibbs' inequality), stages labelled on the curve.
* :func:`ring` — a closed wire loop: outer meniscus to the far field, inner enclosed meniscus
  (regular at the centre) whose depressed liquid weighs on the ring through the inner line.

Validity: static, clean surface, rigid axisymmetric bodies, vertical axis, no neighbour
within a few capillary lengths; contact radii from 1e-4 to 300 l_c; 0 ≤ θ ≤ 180°.

For device models
-----------------
Every result carries ``curve``, a :class:`RoundForceCurve` (SI arrays: depth of the element's
lowest point, force and its parts, stage labels). ``result.curve.force_at_depth(depths)`` is a
cheap vectorised interpolant (monotone cubic through the computed points, ≲ 1e-4 relative
between points) of the upward force at given lowest-point depths [m], valid from above the
surface (zero force when not touching) to the end of the curve (the top face floods, or the
contact line reaches the top of a ball or ring); beyond that it raises :class:`InputError`.
``result.depth_at_max`` and ``result.max_force`` mark the load limit: under a dead load the
element sinks once the load exceeds ``max_force``. Compute the element once per design
(about 1 ms for a ball or pad, a few seconds for a ring) and call ``force_at_depth`` in the
device solver loop.

>>> b = ball("1 mm", "150 deg")
>>> f = b.curve.force_at_depth([0.0, 1e-3])
>>> f.units
<Unit('newton')>

References
----------
.. [1] D. F. James, J. Fluid Mech. 63, 657 (1974) (meniscus on a thin fibre).
.. [2] A. Scheludko, B. V. Toshev, D. T. Bojadjiev, J. Chem. Soc. Faraday Trans. 1, 72, 2815
   (1976); H. C. Nutt, Chem. Eng. Sci. 12, 133 (1960) (flotation of small spheres).
.. [3] J. B. Keller, Phys. Fluids 10, 3009 (1998).
.. [4] J. F. Oliver, C. Huh, S. G. Mason, J. Colloid Interface Sci. 59, 568 (1977) (pinning of
   contact lines at sharp edges, Gibbs' inequality).
.. [5] L. Wilhelmy, Ann. Phys. 195, 177 (1863) (plate method: F = σ P cos θ).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

import numpy as np

from . import _validate as v
from .core import round_bodies as rb
from .dimensionless import baudoin
from .errors import InputError, input_error
from .liquids import Liquid
from .results import Result, field, qfield
from .rods import DEFAULT_MATERIAL_DENSITY, ForceDepthCurve
from .units import Q_, to_si

MIN_RADIUS_LC = 1e-4  # smallest contact radius of the table, in l_c
MAX_RADIUS_LC = 300.0  # largest radius accepted, in l_c

REFERENCES = (
    "axisymmetric Young-Laplace meniscus, arclength form; tabulated contact height (floatcalc.core.axisym)",
    "Keller, Phys. Fluids 10, 3009 (1998): surface-tension force equals displaced meniscus weight",
    "James, J. Fluid Mech. 63, 657 (1974): meniscus on a thin fibre (check)",
    "Scheludko et al. (1976), Nutt (1960): small-sphere limit 2 pi R sigma sin^2(theta/2) (check)",
    "Gibbs' inequality at sharp edges (Oliver, Huh & Mason, J. Colloid Interface Sci. 59, 568, 1977)",
)


@dataclass(frozen=True, kw_only=True)
class RoundForceCurve(ForceDepthCurve):
    """Force against depth of the element's lowest point, with :meth:`force_at_depth`."""

    def force_at_depth(self, depths: Any):
        """Upward force [N] at lowest-point depths [m] (array), by monotone cubic interpolation.

        Depths above the first point of the curve (element above the surface) give zero force;
        depths beyond the last point raise :class:`~floatcalc.errors.InputError`.
        """
        from scipy.interpolate import PchipInterpolator

        D = np.atleast_1d(np.asarray(to_si(depths, "length", "depth", array=True), dtype=float))
        x = self.depth.to("m").magnitude
        y = self.force.to("N").magnitude
        if np.any(D > x[-1] * (1 + 1e-12) + 1e-15):
            bad = float(D[D > x[-1]].flat[0])
            raise input_error("depth", f"must be at most {x[-1] * 1e3:.4g} mm (end of the force-depth curve)",
                              f"{bad * 1e3:.4g} mm")
        out = np.zeros_like(D)
        inside = D >= x[0]
        if np.any(inside):
            out[inside] = PchipInterpolator(x, y)(np.minimum(D[inside], x[-1]))
        return Q_(out, "N")


def _liquid(liq: Liquid | None) -> Liquid:
    from .liquids import as_liquid

    return as_liquid(liq)


def _density(material_density, warnings: list[str]) -> float:
    if material_density is None:
        warnings.append(f"material density not given: steel {DEFAULT_MATERIAL_DENSITY:g} kg/m³ assumed for own weight")
        return DEFAULT_MATERIAL_DENSITY
    return v.density(material_density, "material_density")


def _radius(value, field_name: str, lc: float, lo: float = MIN_RADIUS_LC) -> float:
    R = v.length(value, field_name)
    if R / lc < lo * (1 - 1e-12) or R / lc > MAX_RADIUS_LC:
        raise input_error(field_name, f"must be between {lo * lc * 1e3:.3g} mm and {MAX_RADIUS_LC * lc * 1e3:.4g} mm "
                          f"({lo:g} to {MAX_RADIUS_LC:g} capillary lengths)", f"{R * 1e3:.4g} mm")
    return R


def _curve(cur: dict, lc: float, s: float, stage_names=None) -> RoundForceCurve:
    fs = s * lc
    stage = () if stage_names is None else tuple(stage_names)
    return RoundForceCurve(depth=Q_(cur["depth"] * lc, "m"), force=Q_(cur["force"] * fs, "N"),
                           surface_tension=Q_(cur["surface_tension"] * fs, "N"),
                           pressure=Q_(cur["pressure"] * fs, "N"), stage=stage)


def _meniscus(rc: float, psi: float, lc: float, side: str = "outer") -> dict:
    from .core import axisym

    p = axisym.profile(rc, psi, side=side)
    return {"r_m": p["r"] * lc, "z_m": p["z"] * lc}


# ---------------------------------------------------------------------------------------------
# Pin


@dataclass(frozen=True, kw_only=True)
class PinResult(Result):
    """Result of :func:`pin`."""

    radius: Any = qfield("m")
    contact_angle: Any = qfield("deg")
    depth: Any = qfield("m", default=None)
    meniscus_height: Any = qfield("m")
    contact_inclination: Any = qfield("deg")
    vertical_force: Any = qfield("N")
    surface_tension_part: Any = qfield("N")
    pressure_part: Any = qfield("N")
    wilhelmy_force: Any = qfield("N")
    meniscus_volume: Any = qfield("m**3")
    own_weight: Any = qfield("N")
    payload: Any = qfield("N")
    stage: str = field(default="")
    contact_perimeter: Any = qfield("m", default=None)
    bond_number: float = field(default=0.0)
    bond_length: Any = qfield("m", default=None)
    baudoin_number: float = field(default=0.0)
    liquid: Liquid | None = field(default=None, json=False)
    curve: RoundForceCurve | None = field(default=None, json=False)
    profile: dict | None = field(default=None, json=False)
    warnings: tuple[str, ...] = field(default=())
    cautions: tuple[str, ...] = field(default=())
    references: tuple[str, ...] = field(default=REFERENCES)


def pin(radius: Any, contact_angle: Any, *, depth: Any | None = None, length: Any | None = None,
        liquid: Liquid | None = None, material_density: Any | None = None) -> PinResult:
    """Meniscus height and vertical force on a vertical pin (fibre) dipped through the surface.

    .. math::

        F = 2\\pi b\\,\\sigma \\sin\\psi + \\rho g\\, \\pi b^2 D, \\qquad \\psi = \\theta - \\pi/2
        \\;(\\text{so } 2\\pi b\\sigma\\sin\\psi = -\\sigma P\\cos\\theta,\\ P = 2\\pi b)

    with the contact line on the side and the meniscus height h = z_c(b/l_c, ψ)·l_c from the
    axisymmetric solution. If the flat tip is shallower than that meniscus (a non-wetting pin
    just touching), the line pins at the tip edge (Gibbs) and ψ follows from h = −D.

    Parameters
    ----------
    radius : [m]
        Pin radius b.
    contact_angle : [rad]
        Advancing contact angle θ (pushing down).
    depth : [m], optional
        Depth of the flat tip below the undisturbed surface (≥ 0). If not given, the tip is
        taken as far below and ``vertical_force`` is the surface-tension force only (the
        ``curve`` still includes the pressure on the tip at each of its depths).
    length : [m], optional
        Pin length, for its own weight (omitted, with a warning, if not given).
    liquid : Liquid, optional
        Default water at 20 °C.
    material_density : [kg/m³], optional
        Default steel 7850 kg/m³ (common practice).

    Returns
    -------
    PinResult
        ``meniscus_height`` signed (positive above the undisturbed level), ``vertical_force``
        upward (negative: the liquid pulls the pin down), its parts, the Wilhelmy force
        σ P cos θ, meniscus volume, own weight, payload, profile, and ``curve``: force against
        tip depth from first contact to the pin length (if given; else max(2 l_c, 4b) past
        the start of the side stage, or the tip depth if that is deeper).

    Notes
    -----
    Validity: b from 1e-4 to 300 l_c, static, clean surface, vertical pin far from walls.

    References
    ----------
    .. [1] D. F. James, J. Fluid Mech. 63, 657 (1974).
    .. [2] L. Wilhelmy, Ann. Phys. 195, 177 (1863).

    Examples
    --------
    >>> r = pin("0.1 mm", "60 deg")
    >>> round(r.meniscus_height.to("mm").magnitude, 3), round(float(r.vertical_force.to("mN").magnitude), 4)
    (0.175, -0.0229)
    """
    liq = _liquid(liquid)
    s, lc = liq.sigma, liq.lc
    b = _radius(radius, "radius", lc)
    th = v.angle(contact_angle, "contact_angle")
    warnings: list[str] = []
    D = None
    if depth is not None:
        D = to_si(depth, "length", "depth")
        if D < 0:
            raise input_error("depth", "must be zero or positive (tip below the undisturbed surface)", f"{D * 1e3:.4g} mm")
    L = None
    if length is not None:
        L = v.length(length, "length")
        if D is not None and D > L:
            raise input_error("depth", f"must not exceed the pin length {L * 1e3:.4g} mm", f"{D * 1e3:.4g} mm")
    rho_s = _density(material_density, warnings) if L is not None else (
        DEFAULT_MATERIAL_DENSITY if material_density is None else v.density(material_density, "material_density"))
    bs = b / lc
    if D is None:
        st = rb.pin_state(bs, th, math.inf)
        st["pressure"], st["force"] = 0.0, st["surface_tension"]
        warnings.append("tip depth not given: contact line taken on the side; the vertical force is the "
                        "surface-tension pull only (no pressure on the tip), the force-depth curve includes "
                        "the tip pressure at each depth")
    else:
        st = rb.pin_state(bs, th, D / lc)
    if L is None:
        warnings.append("pin length not given: own weight not included (payload = vertical force)")
        weight = 0.0
    else:
        weight = rho_s * math.pi * b * b * L * liq.g
    cur = rb.pad_curve(bs, math.inf, th, depth_max=None if L is None else L / lc)
    if L is None and D is not None and cur["depth"][-1] < D / lc:  # reach the given tip depth
        cur = rb.pad_curve(bs, math.inf, th, depth_max=D / lc)
    stage_names = [rb.STAGES[int(k)] for k in cur["stage"]]
    h = -st["d"]
    from .core import axisym

    vol = float(axisym.solve(bs, st["psi"])["volume"])
    F = st["force"] * s * lc
    prof = _meniscus(bs, st["psi"], lc)
    prof.update(body="cylinder", radius_m=b, tip_z_m=None if D is None else -D)
    return PinResult(
        radius=Q_(b, "m"), contact_angle=Q_(math.degrees(th), "deg"),
        depth=None if D is None else Q_(D, "m"),
        meniscus_height=Q_(h * lc, "m"), contact_inclination=Q_(math.degrees(st["psi"]), "deg"),
        vertical_force=Q_(F, "N"), surface_tension_part=Q_(st["surface_tension"] * s * lc, "N"),
        pressure_part=Q_(st["pressure"] * s * lc, "N"),
        wilhelmy_force=Q_(s * 2 * math.pi * b * math.cos(th), "N"),
        meniscus_volume=Q_(vol * lc**3, "m**3"),
        own_weight=Q_(weight, "N"), payload=Q_(F - weight, "N"),
        stage=rb.STAGES[st["stage"]], bond_number=bs**2, bond_length=Q_(b, "m"),
        contact_perimeter=Q_(2 * math.pi * b, "m"), baudoin_number=baudoin(weight, s, 2 * math.pi * b), liquid=liq,
        curve=_curve(cur, lc, s, stage_names), profile=prof,
        warnings=tuple(warnings), cautions=liq.cautions,
    )


# ---------------------------------------------------------------------------------------------
# Ball, pad, ring


@dataclass(frozen=True, kw_only=True)
class RoundResult(Result):
    """Limit load of a ball, pad or ring (see :func:`ball`, :func:`pad`, :func:`ring`)."""

    element: str = field(default="")
    contact_angle: Any = qfield("deg")
    max_force: Any = qfield("N")
    depth_at_max: Any = qfield("m")
    surface_tension_part: Any = qfield("N")
    pressure_part: Any = qfield("N")
    own_weight: Any = qfield("N")
    payload: Any = qfield("N")
    payload_mass: Any = qfield("kg")
    inclination_at_max: Any = qfield("deg")
    contact_radius_at_max: Any = qfield("m")
    contact_perimeter: Any = qfield("m", default=None)
    stage_at_max: str = field(default="")
    bond_number: float = field(default=0.0)
    bond_length: Any = qfield("m", default=None)
    baudoin_number: float = field(default=0.0)
    details: dict = field(default_factory=dict)
    liquid: Liquid | None = field(default=None, json=False)
    curve: RoundForceCurve | None = field(default=None, json=False)
    profile: dict | None = field(default=None, json=False)
    warnings: tuple[str, ...] = field(default=())
    cautions: tuple[str, ...] = field(default=())
    references: tuple[str, ...] = field(default=REFERENCES)

    def to_dict(self) -> dict[str, Any]:
        d = super().to_dict()
        if self.liquid is not None:
            d["liquid"] = self.liquid.summary()
        return d


def _result(element, th, best, cur, weight, liq, Bo, warnings, stage_names=None, stage_at_max="",
            rc=0.0, details=None, profile=None, perimeter=None) -> RoundResult:
    """Result of a round element; ``perimeter`` [l_c] defaults to the outer contact circle 2π r_c."""
    s, lc = liq.sigma, liq.lc
    fs = s * lc
    F = best["force"] * fs
    P = (2.0 * math.pi * rc if perimeter is None else perimeter) * lc
    return RoundResult(
        contact_perimeter=Q_(P, "m"), bond_length=Q_(math.sqrt(Bo) * lc, "m"),
        baudoin_number=baudoin(weight, s, P),
        element=element, contact_angle=Q_(math.degrees(th), "deg"),
        max_force=Q_(F, "N"), depth_at_max=Q_(best["depth"] * lc, "m"),
        surface_tension_part=Q_(best["surface_tension"] * fs, "N"),
        pressure_part=Q_(best["pressure"] * fs, "N"),
        own_weight=Q_(weight, "N"), payload=Q_(F - weight, "N"), payload_mass=Q_((F - weight) / liq.g, "kg"),
        inclination_at_max=Q_(math.degrees(best["psi"] if "psi" in best else best["psi_outer"]), "deg"),
        contact_radius_at_max=Q_(rc * lc, "m"), stage_at_max=stage_at_max, bond_number=Bo,
        details=details or {}, liquid=liq, curve=_curve(cur, lc, s, stage_names), profile=profile,
        warnings=tuple(warnings), cautions=liq.cautions,
    )


def ball(radius: Any, contact_angle: Any, *, liquid: Liquid | None = None,
         material_density: Any | None = None) -> RoundResult:
    """Limit load of a sphere (ball foot) resting in the surface.

    .. math::

        F(\\phi) = 2\\pi r_c\\sigma\\sin\\psi + \\rho g\\left[\\tfrac{\\pi}{3}R^3(1-\\cos\\phi)^2(2+\\cos\\phi)
                   + \\pi r_c^2 d\\right],\\quad r_c = R\\sin\\phi,\\ \\psi = \\phi + \\theta - \\pi

    with d = −z_c(r_c/l_c, ψ) l_c the contact-line depth; the limit is the maximum over φ.
    Lowest-point depth D = d + R(1 − cos φ).

    Parameters
    ----------
    radius : [m]
        Sphere radius R (1e-3 to 300 l_c).
    contact_angle : [rad]
        Advancing contact angle.
    liquid : Liquid, optional
    material_density : [kg/m³], optional
        Default steel 7850 kg/m³ (common practice).

    Returns
    -------
    RoundResult
        ``max_force``, ``depth_at_max``, parts, ``own_weight``, ``payload``; ``details`` holds
        the contact position φ at the limit [deg].

    Notes
    -----
    As R/l_c → 0 the limit tends to 2πRσ sin²(θ/2) (Scheludko et al. 1976; Nutt 1960).

    Examples
    --------
    >>> r = ball("0.2 mm", "150 deg")   # close to 2πRσ sin²(θ/2) = 0.0853 mN at this small Bo
    >>> round(r.max_force.to("mN").magnitude, 4)
    0.0862
    """
    liq = _liquid(liquid)
    s, lc = liq.sigma, liq.lc
    R = _radius(radius, "radius", lc, lo=1e-3)
    th = v.angle(contact_angle, "contact_angle")
    warnings: list[str] = []
    rho_s = _density(material_density, warnings)
    Rs = R / lc
    best, cur = rb.ball_limit(Rs, th)
    if best["phi"] >= math.pi - 1e-9:
        warnings.append("the force rises until the ball is fully submerged: buoyancy alone carries it "
                        "(no capillary limit)")
    weight = rho_s * 4.0 / 3.0 * math.pi * R**3 * liq.g
    prof = _meniscus(best["rc"], best["psi"], lc) if best["rc"] > 0 else {"r_m": np.array([0.0]), "z_m": np.array([0.0])}
    prof.update(body="sphere", radius_m=R, centre_z_m=(-best["depth"] + Rs) * lc)
    return _result("ball", th, best, cur, weight, liq, Rs**2, warnings, rc=best["rc"],
                   details={"contact_position_at_max_deg": math.degrees(best["phi"])}, profile=prof)


def pad(radius: Any, thickness: Any, contact_angle: Any, *, liquid: Liquid | None = None,
        material_density: Any | None = None) -> RoundResult:
    """Limit load of a flat circular pad (disc) with sharp 90° edges, pushed into the surface.

    Stages (labelled on the curve): the contact line pins at the bottom edge while
    θ − π ≤ ψ ≤ θ − π/2, climbs the side at ψ = θ − π/2, then pins at the top edge while
    θ − π/2 ≤ ψ ≤ θ (Gibbs' inequality, edges of solid angle α = 90° let the interface turn
    through π − α). Force at each stage

    .. math:: F = 2\\pi a\\sigma\\sin\\psi + \\rho g\\,\\pi a^2 D,

    D the depth of the bottom face. The limit is the largest F, reached while pinned at the top
    edge; beyond ψ = θ the liquid floods the top face.

    Parameters
    ----------
    radius : [m]
        Pad radius a (1e-4 to 300 l_c).
    thickness : [m]
        Pad thickness t.
    contact_angle : [rad]
        Advancing contact angle.
    liquid : Liquid, optional
    material_density : [kg/m³], optional
        Default steel 7850 kg/m³ (common practice).

    Examples
    --------
    >>> r = pad("2 mm", "0.2 mm", "110 deg")
    >>> r.stage_at_max
    'pinned at top edge'
    """
    liq = _liquid(liquid)
    s, lc = liq.sigma, liq.lc
    a = _radius(radius, "radius", lc)
    t = v.length(thickness, "thickness")
    th = v.angle(contact_angle, "contact_angle")
    warnings: list[str] = []
    rho_s = _density(material_density, warnings)
    As, ts = a / lc, t / lc
    best, cur = rb.pad_limit(As, ts, th)
    if th < 1e-9:
        warnings.append("contact angle 0°: the top-edge stage has no range; liquid floods the top at once")
    weight = rho_s * math.pi * a * a * t * liq.g
    names = [rb.STAGES[int(k)] for k in cur["stage"]]
    prof = _meniscus(As, best["psi"], lc)
    prof.update(body="disc", radius_m=a, thickness_m=t, bottom_z_m=-best["depth"] * lc)
    stages, prev_end = {}, None
    for k, name in enumerate(rb.STAGES):  # each stage starts where the previous one ended
        sel = cur["depth"][cur["stage"] == k]
        if sel.size:
            lo = sel.min() if prev_end is None else prev_end
            stages[name] = [float(lo * lc), float(sel.max() * lc)]
            prev_end = sel.max()
    return _result("pad", th, best, cur, weight, liq, As**2, warnings, stage_names=names,
                   stage_at_max=rb.STAGES[int(best["stage"])], rc=As,
                   details={"stage_depth_ranges_m": stages}, profile=prof)


def ring(ring_radius: Any, wire_radius: Any, contact_angle: Any, *, liquid: Liquid | None = None,
         material_density: Any | None = None) -> RoundResult:
    """Limit load of a ring footpad: a closed loop of round wire lying flat in the surface.

    Outer contact line at φ_o (r_o = R_r + b sin φ_o) with a meniscus to the far field, inner
    line at φ_i (r_i = R_r − b sin φ_i) with the enclosed meniscus regular at the centre; both
    sides share the wire's lowest-point depth D. Force

    .. math::

        F = 2\\pi\\sigma(r_o\\sin\\psi_o + r_i\\sin\\psi_i)
            + \\rho g\\,2\\pi b\\int_{-\\phi_i}^{\\phi_o}(D - b + b\\cos\\alpha)\\cos\\alpha\\,(R_r + b\\sin\\alpha)\\,d\\alpha

    The inner pull 2πσ r_i sin ψ_i equals the weight of the depressed liquid enclosed by the
    ring (Keller), reported as ``details["enclosed_liquid_force_N"]``. Limit = max over the
    curve, which follows the push-down branch: it ends when either side floods (φ = π) or,
    earlier, where the lowest-point depth stops rising.

    Parameters
    ----------
    ring_radius : [m]
        Radius R_r of the wire's centre line (at least twice the wire radius, at most 300 l_c).
    wire_radius : [m]
        Wire radius b (1e-4 l_c or more).
    contact_angle : [rad]
        Advancing contact angle.
    liquid : Liquid, optional
    material_density : [kg/m³], optional
        Default steel 7850 kg/m³ (common practice).

    Examples
    --------
    >>> r = ring("5 mm", "0.2 mm", "150 deg")
    >>> round(r.max_force.to("mN").magnitude, 2)
    4.49
    """
    liq = _liquid(liquid)
    s, lc = liq.sigma, liq.lc
    b = _radius(wire_radius, "wire_radius", lc)
    Rr = _radius(ring_radius, "ring_radius", lc)
    from .elements.ring import ring_rule

    if ring_rule(Rr, b):
        raise InputError(ring_rule(Rr, b))
    th = v.angle(contact_angle, "contact_angle")
    warnings: list[str] = []
    rho_s = _density(material_density, warnings)
    Rs, bs = Rr / lc, b / lc
    best, cur = rb.ring_limit(Rs, bs, th)
    if cur["depth"][0] > 1e-9:
        warnings.append(f"curve starts at depth {cur['depth'][0] * lc * 1e3:.3g} mm: shallower states have "
                        "no matching inner meniscus on the followed branch")
    weight = rho_s * math.pi * b * b * 2.0 * math.pi * Rr * liq.g
    fs = s * lc
    prof = {"outer": _meniscus(Rs + bs * math.sin(best["phi_outer"]), best["psi_outer"], lc),
            "inner": _meniscus(Rs - bs * math.sin(best["phi_inner"]), best["psi_inner"], lc, side="inner"),
            "body": "torus", "ring_radius_m": Rr, "wire_radius_m": b,
            "wire_centre_z_m": (-best["depth"] + bs) * lc}
    details = {"contact_position_outer_deg": math.degrees(best["phi_outer"]),
               "contact_position_inner_deg": math.degrees(best["phi_inner"]),
               "inclination_inner_deg": math.degrees(best["psi_inner"]),
               "enclosed_liquid_force_N": best["enclosed"] * fs,
               "max_force_per_length_N_per_m": best["force"] * fs / (2 * math.pi * Rr)}
    r_o = Rs + bs * math.sin(best["phi_outer"])
    r_i = Rs - bs * math.sin(best["phi_inner"])
    # two contact lines, outside and inside the loop: the one ring perimeter rule
    return _result("ring", th, best, cur, weight, liq, bs**2, warnings, rc=r_o, details=details, profile=prof,
                   perimeter=2.0 * math.pi * (r_o + r_i))


def pin_limit(radius: Any, length: Any, contact_angle: Any, liq=None, material_density_value: Any = None):
    """Load limit of a vertical pin pushed down into the surface, as a round-element result.

    :func:`floatcalc.pin` gives the force against tip depth from first contact until the pin's
    top end reaches the undisturbed level (tip depth = pin length). The limit is the largest
    upward force on that curve; the pin is solved again at that tip depth for its meniscus
    profile and force parts. Returns a :class:`~floatcalc.round.RoundResult` with
    ``element="pin"`` so that it is assessed and drawn like the other round elements
    (``details`` holds the pin length and the pin's own result at the limit).
    """
    whole = pin(radius, contact_angle, length=length, liquid=liq, material_density=material_density_value)
    c = whole.curve
    depth = c.depth.to("m").magnitude
    force = c.force.to("N").magnitude
    k = int(np.argmax(force))
    at = pin(radius, contact_angle, depth=Q_(float(depth[k]), "m"), length=length, liquid=liq,
                material_density=material_density_value)
    liq = at.liquid
    F = float(force[k])
    L = float(v.length(length, "length"))
    warnings = list(at.warnings)
    if k == force.size - 1:
        warnings.append("the force still rises when the pin's top end reaches the surface: the limit is "
                        "taken there (a longer pin carries more)")
    b = at.radius.to("m").magnitude
    return RoundResult(
        contact_perimeter=Q_(2.0 * math.pi * b, "m"), bond_length=Q_(b, "m"),
        baudoin_number=baudoin(at.own_weight.to("N").magnitude, liq.sigma, 2.0 * math.pi * b),
        element="pin", contact_angle=at.contact_angle, max_force=Q_(F, "N"),
        depth_at_max=Q_(float(depth[k]), "m"),
        surface_tension_part=Q_(float(c.surface_tension.to("N").magnitude[k]), "N"),
        pressure_part=Q_(float(c.pressure.to("N").magnitude[k]), "N"),
        own_weight=at.own_weight, payload=Q_(F - at.own_weight.to("N").magnitude, "N"),
        payload_mass=Q_((F - at.own_weight.to("N").magnitude) / liq.g, "kg"),
        inclination_at_max=at.contact_inclination, contact_radius_at_max=Q_(b, "m"),
        stage_at_max=str(c.stage[k]) if getattr(c, "stage", None) is not None else at.stage,
        bond_number=at.bond_number,
        details={"length_m": L, "meniscus_height_at_max_m": at.meniscus_height.to("m").magnitude,
                 "wilhelmy_force_N": at.wilhelmy_force.to("N").magnitude},
        liquid=liq, curve=c, profile=at.profile, warnings=tuple(warnings), cautions=at.cautions,
        references=at.references,
    )





__all__ = ["pin_limit", "pin", "ball", "pad", "ring", "PinResult", "RoundResult", "RoundForceCurve"]


# ---------------------------------------------------------------------------------------------
# Batched element tables (for device models): many elements of one kind in one call


@dataclass(frozen=True)
class ElementTables:
    """Force–depth tables of many round elements of one kind (SI, one row per element).

    Built by :func:`element_tables`; the rows are what a device interpolates: ``points``
    depths of the element's lowest point evenly spaced from first contact to the limit
    (``depth_m``), the upward force there (``force_N``) and its surface-tension part, and the
    contact-line depth that drives the neighbours' coupling (``contact_depth_m``, from the
    surface-tension part by Keller's theorem for the linearised outer meniscus, with the outer
    contact radius ``contact_radius_m``).
    """

    kind: str
    depth_m: np.ndarray
    force_N: np.ndarray
    surface_tension_N: np.ndarray
    contact_depth_m: np.ndarray
    limit_force_N: np.ndarray
    limit_depth_m: np.ndarray
    max_force_N: np.ndarray
    depth_at_max_m: np.ndarray
    contact_radius_m: np.ndarray
    perimeter_m: np.ndarray
    own_weight_N: np.ndarray
    warnings: tuple[tuple[str, ...], ...]


def _si_array(x, name: str, positive: bool = True) -> np.ndarray:
    a = np.atleast_1d(np.asarray(x, dtype=float))
    bad = ~np.isfinite(a) | ((a <= 0) if positive else (a < 0))
    if np.any(bad):
        raise input_error(name, "must be a positive finite number in SI units" if positive else
                          "must be a finite number, zero or more, in SI units", f"{a[bad][0]:g}")
    return a


def element_tables(kind: str, *, contact_angle: Any, liquid: Liquid | None = None,
                   surface_tension: Any | None = None, material_density: Any = DEFAULT_MATERIAL_DENSITY,
                   radius: Any = None, thickness: Any = None, length: Any = None, ring_radius: Any = None,
                   wire_radius: Any = None, points: int = 241, edges: str = "direct") -> ElementTables:
    """Limit and device force–depth table of many balls, pads, pins or rings in one call.

    The same laws and numbers as :func:`ball`, :func:`pad`, :func:`pin` and :func:`ring`
    followed by the device's round-element adapter (curve cut at the limit, started at first
    contact, resampled on ``points`` even depths), without the meniscus profile for drawing,
    vectorised over elements by :mod:`floatcalc.core.round_batch` and
    :mod:`floatcalc.core.ring_batch` (agreement to 1e-8 relative for ball, pad and pin; rings
    use tabulated enclosed menisci, 1e-8 from the direct path in the limit force).

    Parameters
    ----------
    kind : {"ball", "pad", "pin", "ring"}
    contact_angle : array_like [rad]
        Advancing (effective) contact angle of each element, 0 to π.
    liquid : Liquid, optional
        Default water at 20 °C.
    surface_tension : array_like [N/m], optional
        Per-element surface tension overriding the liquid's (contaminated samples); the
        capillary length follows as sqrt(σ/(ρ g)).
    material_density : array_like [kg/m³]
        For the own weight (default steel 7850 kg/m³, common practice).
    radius, thickness, length, ring_radius, wire_radius : array_like [m]
        Geometry of the kind: ball ``radius``; pad ``radius``, ``thickness``; pin ``radius``,
        ``length`` (protrusion below the body: the table runs to tip depth = length); ring
        ``ring_radius``, ``wire_radius``. All inputs broadcast together (1-D).
    points : int
        Points of each table.
    edges : {"direct", "table"}
        Balls and pads with θ within 2.4° of 0 or 180° meet contact inclinations beyond the
        shipped table: ``"direct"`` shoots them as :func:`ball` and :func:`pad` do (same
        numbers, 10–100 ms a point), ``"table"`` reads a cap table instead (≤ 5e-7 l_c from the
        direct solver); see :func:`floatcalc.core.round_batch.ball_laws`.

    Returns
    -------
    ElementTables

    Examples
    --------
    >>> t = element_tables("ball", radius=[0.5e-3, 1e-3], contact_angle=np.radians(150))
    >>> t.depth_m.shape, bool(np.all(t.limit_force_N > 0))
    ((2, 241), True)
    """
    from scipy.special import k0e, k1e

    liq = _liquid(liquid)
    if kind not in ("ball", "pad", "pin", "ring"):
        raise input_error("kind", "must be one of ball, pad, pin, ring", repr(kind))
    th = np.atleast_1d(np.asarray(contact_angle, dtype=float))
    if np.any(~np.isfinite(th) | (th < 0) | (th > math.pi)):
        raise input_error("contact_angle", "must be between 0 and 180 deg (in radians here)",
                          f"{th[~np.isfinite(th) | (th < 0) | (th > math.pi)][0]:g} rad")
    sig = liq.sigma if surface_tension is None else _si_array(surface_tension, "surface_tension")
    rho_s = _si_array(material_density, "material_density")
    need = {"ball": ("radius",), "pad": ("radius", "thickness"), "pin": ("radius", "length"),
            "ring": ("ring_radius", "wire_radius")}[kind]
    given = {"radius": radius, "thickness": thickness, "length": length, "ring_radius": ring_radius,
             "wire_radius": wire_radius}
    geo = {}
    for name in need:
        if given[name] is None:
            raise input_error(name, f"required for a {kind}", "nothing")
        geo[name] = _si_array(given[name], name)
    arrs = np.broadcast_arrays(th, np.atleast_1d(np.asarray(sig, dtype=float)), rho_s, *geo.values())
    th, sig, rho_s = (a.ravel() for a in arrs[:3])
    geo = {k: a.ravel() for k, a in zip(geo, arrs[3:])}
    lc = np.sqrt(sig / (liq.rho * liq.g))
    fs = sig * lc
    lo = 1e-3 if kind == "ball" else MIN_RADIUS_LC
    for name in ("radius", "ring_radius", "wire_radius"):
        if name in geo:
            s = geo[name] / lc
            bad = (s < (lo if name != "ring_radius" else MIN_RADIUS_LC) * (1 - 1e-12)) | (s > MAX_RADIUS_LC)
            if np.any(bad):
                k = int(np.flatnonzero(bad)[0])
                raise input_error(name, f"must be between {lo:g} and {MAX_RADIUS_LC:g} capillary lengths",
                                  f"{geo[name][k] * 1e3:.4g} mm")
    if kind == "ring" and np.any(geo["ring_radius"] < 2.0 * geo["wire_radius"]):
        k = int(np.flatnonzero(geo["ring_radius"] < 2.0 * geo["wire_radius"])[0])
        raise input_error("ring_radius", "must be at least twice the wire radius", f"{geo['ring_radius'][k] * 1e3:.4g} mm")
    from .core import ring_batch, round_batch

    warn: list[list[str]] = [[] for _ in th]
    if kind == "ball":
        R = geo["radius"]
        out = round_batch.ball_laws(R / lc, th, points=points, edges=edges)
        rc = out["contact_radius_at_max"] * lc
        weight = rho_s * 4.0 / 3.0 * math.pi * R**3 * liq.g
        per = 2.0 * math.pi * np.maximum(rc, 1e-9)
        for i in np.flatnonzero(out["submerged"]):
            warn[i].append("the force rises until the ball is fully submerged: buoyancy alone carries it "
                           "(no capillary limit)")
    elif kind == "pad":
        a, t = geo["radius"], geo["thickness"]
        out = round_batch.pad_laws(a / lc, t / lc, th, points=points, edges=edges)
        rc, weight, per = a, rho_s * math.pi * a * a * t * liq.g, 2.0 * math.pi * a
        for i in np.flatnonzero(th < 1e-9):
            warn[i].append("contact angle 0°: the top-edge stage has no range; liquid floods the top at once")
    elif kind == "pin":
        b, L = geo["radius"], geo["length"]
        out = round_batch.pin_laws(b / lc, L / lc, th, points=points)
        rc, weight, per = b, rho_s * math.pi * b * b * L * liq.g, 2.0 * math.pi * b
        out["max_force"], out["depth_at_max"] = out["limit_force"], out["limit_depth"]
    else:
        Rr, b = geo["ring_radius"], geo["wire_radius"]
        out = ring_batch.ring_laws(Rr / lc, b / lc, th, points=points)
        rc, weight = Rr + b, rho_s * math.pi * b * b * 2.0 * math.pi * Rr * liq.g
        # the one ring perimeter rule (as ring()): outer and inner contact lines at the limit
        per = 2.0 * math.pi * (2.0 * Rr + b * (np.sin(out["phi_outer_at_max"]) - np.sin(out["phi_inner_at_max"])))
        for i in np.flatnonzero(out["curve"]["depth"][:, 0] > 1e-9):
            warn[i].append(f"curve starts at depth {out['curve']['depth'][i, 0] * lc[i] * 1e3:.3g} mm: shallower "
                           "states have no matching inner meniscus on the followed branch")
    tab = out["table"]
    lcc, fsc = lc[:, None], fs[:, None]
    # the contact depth again with the device's floor of 1e-9 m on the contact radius
    r = np.maximum(rc, 1e-9)[:, None]
    h0 = tab["surface_tension"] * fsc * lcc / (sig[:, None] * 2.0 * math.pi * r * k1e(r / lcc) / k0e(r / lcc))
    return ElementTables(
        kind=kind, depth_m=tab["depth"] * lcc, force_N=tab["force"] * fsc,
        surface_tension_N=tab["surface_tension"] * fsc, contact_depth_m=h0,
        limit_force_N=out["limit_force"] * fs, limit_depth_m=out["limit_depth"] * lc,
        max_force_N=out["max_force"] * fs, depth_at_max_m=out["depth_at_max"] * lc,
        contact_radius_m=np.asarray(rc, dtype=float) * np.ones_like(lc), perimeter_m=per * np.ones_like(lc),
        own_weight_N=weight * np.ones_like(lc), warnings=tuple(tuple(w) for w in warn))


__all__ += ["element_tables", "ElementTables"]
