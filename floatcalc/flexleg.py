"""Flexible wire legs: load a thin leg carries when it bends under its own capillary load.

Public API over :mod:`floatcalc.core.beam`. A wire leg (radius R, length L, Young's modulus E)
is clamped to the body at a clamp angle and pushed down by the body; the liquid pushes up along
its wetted length with the local force per unit length of the exact 2D rod law (Vella, Lee &
Kim 2006) at the local depth: the advancing-angle law at or below the undisturbed surface, the
receding-angle law on wetted parts lifted above it, nothing on parts that never touched the
liquid. The leg bends, its tip rises, and past a certain length extra leg adds almost nothing.
:func:`flexible_leg` returns the limit (the largest clamp force as the body pushes the leg down
from first touch, set either by a maximum of that force or by local breakthrough of the deepest
section, ``limit_criterion``), the deflected shape, the load distribution, the lifted and dry
lengths, the same leg if it were rigid, and the curve of limit force against leg length with
its saturation length.

Safe side of the receding angle: at a given shape a smaller receding angle pulls a lifted
wetted part down harder, but a pulled-down tip bends the rest of the leg deeper, which can
raise the clamp force at the limit (observed +0.2 % for a nylon leg two Winkler lengths long).
When the receding angle is not given and part of the leg is lifted and wetted, the advancing
angle is used and the limit is solved again at the bound 0°; the warning gives the difference
with its sign.

Length scales (derived in the docstring of :func:`flexible_leg`): elasto-capillary length
of a wire ``L_ec = (E I / σ)^{1/3}`` (E I / σ is a volume for a rod; the square-root form
belongs to sheets, whose bending stiffness is per unit width); foundation stiffness
``k = df/dD`` of the rod law at the floating depth (about ``2σ / l_c`` for a thin non-wetting
rod); Winkler length ``ℓ_W = (4 E I / k)^{1/4}`` (Hetényi 1946), which for ``k = 2σ/l_c`` is
``(2 E I l_c / σ)^{1/4} = 2^{1/4} (L_ec³ l_c)^{1/4}``.

Validity: elastic slender leg, static, clean surface, nearly flat wetted part (slopes below
about 20°), bending gentle on the scale of l_c, tip end effects not included.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

import numpy as np

from . import _validate as v
from .core import beam
from .errors import input_error
from .liquids import Liquid
from .materials import LegMaterial, leg_material, youngs_modulus as _youngs
from .results import Result, field, qfield
from .units import Q_, to_si

REFERENCES = (
    "Vella, Lee & Kim, Langmuir 22, 5979 (2006): 2D rod law used as the local foundation",
    "Hetényi, Beams on Elastic Foundation, Univ. Michigan Press (1946): Winkler length, linear limit",
    "Landau & Lifshitz, Theory of Elasticity (elastica of thin rods, arclength form)",
)
SLOPE_LIMIT_DEG = 20.0      # local 2D law: wetted part should be nearly flat (common practice)
STRAIN_WARN = 0.005         # bending strain above which many metal wires yield (common practice)
END_EFFECT_LIMIT = 20.0     # as floatcalc.rod: legs shorter than this many l_c get a warning
SATURATION_FRACTION = 0.95  # saturation length: where the limit first reaches 95 % of the largest
#                             value on the length curve (0.2–12 Winkler lengths); common practice
DEFAULT_MATERIAL = "steel"


@dataclass(frozen=True, kw_only=True)
class LengthCurve(Result):
    """Limit of the same leg for a range of lengths (payload = support at the clamp)."""

    length: Any = qfield("m")
    max_force: Any = qfield("N")
    payload: Any = qfield("N")
    rigid_payload: Any = qfield("N")
    warnings: tuple[str, ...] = field(default=())


@dataclass(frozen=True, kw_only=True)
class FlexLegResult(Result):
    """Result of :func:`flexible_leg`. Forces are totals over ``count`` identical legs."""

    radius: Any = qfield("m")
    length: Any = qfield("m")
    count: int = field(default=1)
    contact_angle: Any = qfield("deg")
    material: str = field(default="")
    youngs_modulus: Any = qfield("Pa")
    material_density: Any = qfield("kg/m**3")
    clamp_angle: Any = qfield("deg")
    toe_angle: Any = qfield("deg")
    toe_length: Any = qfield("m")
    max_force: Any = qfield("N")
    max_force_per_length: Any = qfield("N/m")
    depth_at_max: Any = qfield("m")
    contact_position_at_max: Any = qfield("deg")
    inclination_at_max: Any = qfield("deg")
    surface_tension_part: Any = qfield("N")
    pressure_part: Any = qfield("N")
    own_weight: Any = qfield("N")
    payload: Any = qfield("N")
    payload_mass: Any = qfield("kg")
    bond_number: float = field(default=0.0)
    baudoin_number: float = field(default=0.0)
    clamp_depth_at_max: Any = qfield("m")
    tip_depth: Any = qfield("m")
    wetted_length: Any = qfield("m")
    max_slope: Any = qfield("deg")
    max_bending_strain: float = field(default=0.0)
    rigid_max_force: Any = qfield("N")
    rigid_payload: Any = qfield("N")
    flexible_to_rigid: float = field(default=1.0)
    elastocapillary_length: Any = qfield("m")
    foundation_stiffness: Any = qfield("N/m**2")
    winkler_length: Any = qfield("m")
    saturation_length: Any = qfield("m", default=None)
    saturation_to_winkler: float | None = field(default=None)
    long_leg_payload: Any = qfield("N", default=None)
    receding_angle: Any = qfield("deg", default=None)
    receding_max_force: Any = qfield("N", default=None)
    pull_off_force: Any = qfield("N", default=None)
    limit_criterion: str = field(default="")
    lifted_length: Any = qfield("m", default=None)
    dry_lifted_length: Any = qfield("m", default=None)
    past_local_limit_length: Any = qfield("m", default=None)
    local_limit_payload: Any = qfield("N", default=None)
    local_limit_clamp_depth: Any = qfield("m", default=None)
    nodes: int = field(default=0)
    shape: dict | None = field(default=None, json=False)
    length_curve: LengthCurve | None = field(default=None)
    liquid: Liquid | None = field(default=None, json=False)
    warnings: tuple[str, ...] = field(default=())
    cautions: tuple[str, ...] = field(default=())
    references: tuple[str, ...] = field(default=REFERENCES)

    def to_dict(self) -> dict[str, Any]:
        d = super().to_dict()
        if self.liquid is not None:
            d["liquid"] = self.liquid.summary()
        return d


@dataclass(frozen=True)
class _Leg:
    """Scaled inputs of one leg (lengths in l_c, forces in σ)."""

    R: float
    L: float
    B: float
    alpha: float
    toe: float
    toe_len: float
    found: beam.Foundation
    lw: float  # Winkler length [l_c]
    k: float   # foundation stiffness at the floating depth [σ/l_c]
    receding_given: bool = False

    def nodes(self, L: float | None = None, n: int | None = None) -> int:
        L = self.L if L is None else L
        if n is not None:
            return int(n)
        return int(min(4000, max(200, math.ceil(24.0 * L / self.lw))))

    def th0(self, n: int, L: float | None = None):
        L = self.L if L is None else L
        s = np.linspace(0.0, L, n + 1)
        tl = min(self.toe_len, L)
        return beam.natural_slope(s, self.alpha, self.toe, tl)


def _signed_angle(value: Any, field_name: str, lo: float, hi: float) -> float:
    a = to_si(value, "angle", field_name)
    if not (math.radians(lo) - 1e-12 <= a <= math.radians(hi) + 1e-12):
        raise input_error(field_name, f"must be between {lo:g} and {hi:g} deg", f"{math.degrees(a):.6g} deg")
    return a


def _prepare(radius, length, contact_angle, youngs_modulus, material, clamp_angle, toe_angle,
             toe_length, material_density, liquid, receding_angle=None):
    from .liquids import as_liquid

    liq = as_liquid(liquid)
    R = v.length(radius, "radius")
    L = v.length(length, "length")
    th = v.angle(contact_angle, "contact_angle")
    th_r = v.hysteresis(th, receding_angle)
    notes: list[str] = []
    if youngs_modulus is None and material is None:
        raise input_error("youngs_modulus", "give a Young's modulus (e.g. '200 GPa') or a material name",
                          "neither")
    mat: LegMaterial | None = leg_material(material) if material is not None else None
    E = _youngs(youngs_modulus) if youngs_modulus is not None else mat.E
    if material_density is not None:
        rho_s = v.density(material_density, "material_density")
    elif mat is not None:
        rho_s = mat.rho
    else:
        rho_s = leg_material(DEFAULT_MATERIAL).rho
        notes.append(f"material density not given: steel {rho_s:g} kg/m³ assumed for own weight")
    name = mat.name if mat is not None else "custom"
    if mat is not None and youngs_modulus is not None:
        name = f"{mat.name} (Young's modulus given)"
    alpha = _signed_angle(clamp_angle, "clamp_angle", -45.0, 45.0)
    toe = 0.0 if toe_angle is None else _signed_angle(toe_angle, "toe_angle", 0.0, 90.0)
    if toe_length is None:
        toe_len = 0.1 * L
    else:
        toe_len = v.length(toe_length, "toe_length")
        if toe_len > L:
            raise input_error("toe_length", f"must not exceed the leg length {L * 1e3:.4g} mm",
                              f"{toe_len * 1e3:.4g} mm")
    s, lc = liq.sigma, liq.lc
    Rs, Ls = R / lc, L / lc
    inertia = math.pi * R**4 / 4.0
    B = E * inertia / (s * lc**3)
    w = rho_s * liq.g * math.pi * R * R / s
    found = beam.Foundation(Rs, th, weight=w, theta_receding=th_r)
    if w >= found.f_lim:
        raise input_error("radius", "too heavy to float: own weight per length exceeds the rod-law limit "
                          f"{found.f_lim * s * 1e3:.4g} mN/m", f"{w * s * 1e3:.4g} mN/m")
    k = found.stiffness(found.floating_depth())
    if k <= 0:  # pragma: no cover - f rises through the floating depth for every rod
        k = 2.0
    lw = (4.0 * B / k) ** 0.25
    leg = _Leg(Rs, Ls, B, alpha, toe, toe_len / lc, found, lw, k, th_r is not None)
    return liq, R, L, th, E, rho_s, name, leg, notes


def flexible_leg(radius: Any, length: Any, contact_angle: Any, *, youngs_modulus: Any | None = None,
                 material: str | LegMaterial | None = None, clamp_angle: Any = 0.0,
                 toe_angle: Any | None = None, toe_length: Any | None = None,
                 material_density: Any | None = None, liquid: Liquid | None = None, count: int = 1,
                 nodes: int | None = None, length_points: int = 12,
                 receding_angle: Any | None = None) -> FlexLegResult:
    """Limit load of a flexible wire leg clamped to the body, with shape and saturation length.

    The leg (arclength s from the clamp, slope θ below the horizontal, depth y of its lowest
    point) obeys the elastica on the rod-law foundation (:mod:`floatcalc.core.beam`):

    .. math::

        EI\\,(\\theta' - \\theta_0') = -M,\\quad M' = -V\\cos\\theta,\\quad
        V' = -(f(y) - w),\\quad y' = \\sin\\theta,

    clamped at ``θ(0) = α``, ``y(0) = D_c``, free at the tip. ``f`` is the 2D rod law force per
    length at depth y, ``w`` the own weight per length, ``I = π R⁴/4``. Where a section is at
    or below the undisturbed surface f is the advancing-angle law; above it, the
    receding-angle law if the section has been wetted on the way, else 0 (dry). The clamp is
    pushed down from where the leg first touches the liquid; the limit is the largest clamp
    support ``V(0)`` (= liquid force − own weight = ``payload``) along that path: either a
    maximum of the clamp force (``limit_criterion = "clamp-force maximum"``) or, if the force
    still rises, the clamp depth at which the deepest section breaks through locally (the two
    menisci meet above the wire; ``"local breakthrough"``). Sections deeper than the rod law's
    limit depth follow its descending branch. The support when the deepest point first
    reaches that depth (the limit of earlier versions) is ``local_limit_payload``.

    Length scales: linearising f about the floating depth (f = w) gives a Winkler foundation of
    stiffness ``k = df/dy``; the decay length of a beam on it is ``ℓ_W = 1/β = (4EI/k)^{1/4}``
    (Hetényi 1946). For a thin non-wetting rod, f ≈ 2σ sin ψ and y ≈ 2 l_c sin(ψ/2), so
    ``k ≈ 2σ/l_c`` and ``ℓ_W ≈ (2 EI l_c / σ)^{1/4} = 2^{1/4} (L_ec³ l_c)^{1/4}`` with the
    elasto-capillary length of a wire ``L_ec = (EI/σ)^{1/3}``. Legs much longer than ℓ_W bend so that the far part floats with
    almost no load; the saturation length (where the limit reaches 95 % of the long-leg
    value) is reported with its ratio to ℓ_W.

    Parameters
    ----------
    radius : [m]
        Wire radius.
    length : [m]
        Leg length from the clamp to the tip (the part lying on the liquid).
    contact_angle : [rad]
        Advancing contact angle of the leg surface (coating).
    youngs_modulus : [Pa], optional
        Young's modulus; overrides the material's.
    material : str or LegMaterial, optional
        From :func:`floatcalc.materials.leg_material` (gives E and density).
    clamp_angle : [rad]
        Slope of the leg at the clamp below the horizontal, −45° to 45° (positive: pointing
        down into the liquid).
    toe_angle : [rad], optional
        Upturned toe: the unstressed leg turns up by this angle (0–90°) along a circular arc
        over the last ``toe_length`` (default 10 % of the leg).
    material_density : [kg/m³], optional
        Overrides the material's density; default steel when no material is given.
    liquid : Liquid, optional
        Default water at 20 °C.
    count : int
        Number of identical legs, treated as far apart.
    nodes : int, optional
        Grid intervals along the leg (default from the Winkler length, at least 200).
    length_points : int
        Points of the limit-against-length curve (0 skips it and the saturation length).
    receding_angle : [rad], optional
        Receding contact angle (≤ advancing), used on wetted parts lifted above the surface.
        Default: the advancing angle, with a warning when it matters (it is the least
        downward pull of any receding angle, so it errs on the unsafe side).

    Returns
    -------
    FlexLegResult

    Notes
    -----
    Warnings are added when a wetted slope exceeds 20° (local 2D law), the bending strain
    exceeds 0.5 % (elastic limit of many metal wires), the leg is shorter than 20 l_c (tip end
    effects ignored) or thicker than a twentieth of its length (not slender), when part of the
    leg is above the surface at the limit (which law, and by how much it pulls down), and when
    the load path snapped.

    References
    ----------
    .. [1] D. Vella, D.-G. Lee, H.-Y. Kim, Langmuir 22, 5979 (2006).
    .. [2] M. Hetényi, Beams on Elastic Foundation, University of Michigan Press (1946).
    .. [3] L. D. Landau, E. M. Lifshitz, Theory of Elasticity, Pergamon.

    Examples
    --------
    An invented example: a 0.2 mm diameter steel leg, 30 mm long, coated to 150°:

    >>> r = flexible_leg("0.1 mm", "30 mm", "150 deg", material="steel", length_points=0)
    >>> 0.3 < r.flexible_to_rigid < 1.0
    True
    >>> r.limit_criterion in ("clamp-force maximum", "local breakthrough")
    True
    """
    liq, R, L, th, E, rho_s, name, leg, notes = _prepare(
        radius, length, contact_angle, youngs_modulus, material, clamp_angle, toe_angle, toe_length,
        material_density, liquid, receding_angle)
    ncount = v.count(count)
    npts = int(v.count(length_points, "length_points", upper=100)) if length_points else 0
    n = leg.nodes(n=None if nodes is None else v.count(nodes, "nodes", upper=20000))
    s, lc = liq.sigma, liq.lc
    fd = leg.found
    th0 = leg.th0(n)
    sol = beam.limit(leg.L, leg.B, leg.alpha, fd, n=n, th0=th0)
    rig = beam.rigid_limit(leg.L, fd, th0)

    y, ss, theta, wetf = sol["y"], sol["s"], sol["theta"], sol["wet"]
    f, _ = fd.liquid(y, wetf)
    f_st, f_p = fd.parts(y, wetf)
    liquid_force = float(np.trapezoid(f, ss))
    support = float(sol["V"][0])
    wet_mask = fd.in_contact(y, wetf)
    max_slope = float(np.degrees(np.max(np.abs(theta[wet_mask])))) if np.any(wet_mask) else 0.0
    strain = float(leg.R * np.max(np.abs(sol["M"])) / leg.B)
    x = np.concatenate([[0.0], np.cumsum(0.5 * np.diff(ss) * (np.cos(theta[1:]) + np.cos(theta[:-1])))])
    md = beam.max_depth(y)
    phi_md = float(fd.adv.phi(md))
    scale = s * lc * ncount
    lift = _lift_report(leg, sol, scale, lc)

    warnings = list(notes)
    if max_slope > SLOPE_LIMIT_DEG:
        warnings.append(f"wetted part slopes up to {max_slope:.3g}° (> {SLOPE_LIMIT_DEG:g}°): the local "
                        "2D rod law assumes a nearly flat leg")
    warnings += _path_warnings(sol, scale, lc)
    warnings += lift["warnings"]
    if strain > STRAIN_WARN:
        warnings.append(f"bending strain {strain * 100:.3g} % exceeds 0.5 %: many metal wires yield "
                        "before this (polymers and superelastic NiTi tolerate a few per cent)")
    if L < END_EFFECT_LIMIT * lc:
        warnings.append(f"length {L * 1e3:.3g} mm is under 20 capillary lengths ({20 * lc * 1e3:.3g} mm): "
                        "end effects at the tip are not included")
    if R > L / 20:
        warnings.append("leg radius exceeds a twentieth of its length: beam theory for a slender leg is rough")
    if th < math.pi / 2:
        warnings.append("wetting leg (contact angle below 90°): the limit is reached as the liquid closes over the top")
    if ncount > 1:
        warnings.append(f"{ncount} legs are treated as far apart (several capillary lengths): no shared meniscus")

    curve = None
    sat = ratio = long_pay = None
    if npts:
        curve, sat, long_pay = _length_curve(leg, npts, scale, lc)
        ratio = sat / (leg.lw * lc) if sat is not None else None
        if sat is None:
            warnings.append(f"saturation length not found between {0.2 * leg.lw * lc * 1e3:.3g} and "
                            f"{12 * leg.lw * lc * 1e3:.3g} mm (0.2–12 Winkler lengths)")

    lec = (E * math.pi * R**4 / 4.0 / s) ** (1.0 / 3.0)
    weight = fd.weight * leg.L * scale
    ons = sol["onset"]
    past = beam._positive_length(ss, y - fd.d_lim)
    return FlexLegResult(
        radius=Q_(R, "m"), length=Q_(L, "m"), count=ncount, contact_angle=Q_(math.degrees(th), "deg"),
        material=name, youngs_modulus=Q_(E, "Pa"), material_density=Q_(rho_s, "kg/m**3"),
        clamp_angle=Q_(math.degrees(leg.alpha), "deg"), toe_angle=Q_(math.degrees(leg.toe), "deg"),
        toe_length=Q_(leg.toe_len * lc if leg.toe else 0.0, "m"),
        max_force=Q_(liquid_force * scale, "N"), max_force_per_length=Q_(liquid_force * s * lc / L, "N/m"),
        depth_at_max=Q_(md * lc, "m"),
        contact_position_at_max=Q_(math.degrees(phi_md), "deg"),
        inclination_at_max=Q_(math.degrees(phi_md + th - math.pi), "deg"),
        surface_tension_part=Q_(float(np.trapezoid(f_st, ss)) * scale, "N"),
        pressure_part=Q_(float(np.trapezoid(f_p, ss)) * scale, "N"),
        own_weight=Q_(weight, "N"), payload=Q_(support * scale, "N"),
        payload_mass=Q_(support * scale / liq.g, "kg"),
        bond_number=leg.R**2, baudoin_number=weight / (s * 2.0 * L * ncount),
        clamp_depth_at_max=Q_(float(sol["clamp_depth"]) * lc, "m"),
        tip_depth=Q_(float(y[-1]) * lc, "m"), wetted_length=Q_(lift["wetted"] * lc, "m"),
        max_slope=Q_(max_slope, "deg"), max_bending_strain=strain,
        rigid_max_force=Q_(rig["liquid_force"] * scale, "N"), rigid_payload=Q_(rig["force"] * scale, "N"),
        flexible_to_rigid=support / rig["force"] if rig["force"] > 0 else float("inf"),
        elastocapillary_length=Q_(lec, "m"), foundation_stiffness=Q_(leg.k * s / lc, "N/m**2"),
        winkler_length=Q_(leg.lw * lc, "m"),
        saturation_length=None if sat is None else Q_(sat, "m"), saturation_to_winkler=ratio,
        long_leg_payload=None if long_pay is None else Q_(long_pay, "N"),
        receding_angle=Q_(math.degrees(fd.theta_r), "deg"),
        limit_criterion=sol["criterion"],
        lifted_length=Q_(lift["lifted"] * lc, "m"), dry_lifted_length=Q_(lift["dry"] * lc, "m"),
        past_local_limit_length=Q_(past * lc, "m"),
        local_limit_payload=None if ons is None else Q_(ons["V"] * scale, "N"),
        local_limit_clamp_depth=None if ons is None else Q_(ons["clamp_depth"] * lc, "m"),
        nodes=n,
        shape={"s_m": ss * lc, "x_m": x * lc, "depth_m": y * lc, "slope_deg": np.degrees(theta),
               "load_N_per_m": (f - fd.weight) * s, "liquid_load_N_per_m": f * s,
               "wetted": wet_mask, "first_contact_depth_m": fd.d0_r * lc,
               "breakthrough_depth_m": fd.d_b * lc, "local_limit_depth_m": fd.d_lim * lc},
        length_curve=curve, liquid=liq, warnings=tuple(warnings), cautions=liq.cautions,
    )


def _path_warnings(sol: dict, scale: float, lc: float) -> list[str]:
    """Warnings about the load path to the limit (snaps, force drops, breakthrough)."""
    out = []
    if sol.get("snaps"):
        out.append("on the way to the limit the leg snapped to a new shape (a part, usually the tip, "
                   "pulled off the surface): the load path has a jump before the limit")
    for Dc, before, after in sol.get("drops", ()):
        out.append(f"at clamp depth {Dc * lc * 1e3:.3g} mm the snap lowered the clamp force from "
                   f"{before * scale * 1e3:.4g} to {after * scale * 1e3:.4g} mN: under a dead load the leg "
                   f"jumps there (dynamic); if such a jump is not acceptable, take {before * scale * 1e3:.4g} mN "
                   "as the limit")
    if sol.get("criterion") == "local breakthrough":
        out.append("the limit is set by local breakthrough (the liquid closes over the deepest section, "
                   "near the clamp for a level leg) while the clamp force still rises; nothing beyond is "
                   "claimed. Near the clamp the real meniscus is three-dimensional: expect a few per cent")
    return out


def _lift_report(leg: _Leg, sol: dict, scale: float, lc: float) -> dict:
    """Wetted, lifted-and-wetted and lifted-dry lengths [l_c] of a state, with warnings.

    A lifted wetted section pulls down (the receding law gives f < 0 above the surface). Sizes
    in the warnings are estimated on the same shape: the pull of the lifted wetted part, and
    what it (or a lifted dry part) would pull with the bounding receding law.
    """
    fd = leg.found
    y, ss, wet = sol["y"], sol["s"], sol["wet"]
    wetted, lifted = beam.contact_lengths(ss, y, wet, fd)
    dry = beam._positive_length(ss, np.where(wet, -1.0, -y), strict=True)
    out = {"wetted": wetted, "lifted": lifted, "dry": dry, "warnings": []}
    f, _ = fd.liquid(y, wet)
    mask = wet & (y < 0.0) & (y >= fd.d0_r)
    mN = scale * 1e3
    mm = lc * 1e3
    if lifted > 0.0:
        pull = float(np.trapezoid(np.where(mask, f, 0.0), ss))
        th_r = math.degrees(fd.theta_r)
        msg = (f"{lifted * mm:.3g} mm of the leg is lifted above the undisturbed surface but still "
               f"wetted at the limit: the receding-angle law ({th_r:.4g}°) is used there (a rising contact line "
               f"recedes); that part pulls down by {-pull * mN:.3g} mN")
        out["warnings"].append(msg)
        if not leg.receding_given:
            out["warnings"].append(_receding_bound(leg, sol, scale))
    if dry > 0.0:
        fw, _ = fd.liquid(y, np.ones_like(wet))
        would = float(np.trapezoid(np.where((~wet) & (y < 0.0), fw, 0.0), ss))
        msg = (f"{dry * mm:.3g} mm of the leg above the surface is dry at the limit (it never touched the "
               "liquid on the way down, the leg being set down from above, or it let go as it rose)")
        if -would * mN >= 5e-4:
            msg += (f"; had it been wetted before (dunked and raised), the receding law would pull it down by "
                    f"{-would * mN:.3g} mN")
        out["warnings"].append(msg)
    if np.any(~fd.in_contact(y, wet)):
        out["warnings"].append("part of the leg is out of the liquid at the limit: near where it leaves the "
                               "surface (about a capillary length) the 2D law does not hold; expect a few "
                               "per cent uncertainty")
    return out


def _receding_bound(leg: _Leg, sol: dict, scale: float) -> str:
    """Warning for an assumed receding angle, with the limit recomputed at the bound θ_r = 0.

    At the same shape a smaller receding angle pulls a lifted wetted part down harder, but the
    leg responds: a pulled-down tip bends the rest of the leg deeper, which can raise the
    clamp force at the limit. So neither the advancing angle nor 0° is safe for every leg; the
    limit is solved again with θ_r = 0° and the difference reported with its sign.
    """
    fd = leg.found
    n = sol["s"].size - 1
    fd0 = beam.Foundation(leg.R, fd.theta, weight=fd.weight, theta_receding=0.0)
    V = float(sol["V"][0])
    V0 = float(beam.limit(leg.L, leg.B, leg.alpha, fd0, n=n, th0=leg.th0(n), onset=False)["V"][0])
    head = (f"receding angle not given: the advancing angle {math.degrees(fd.theta):.4g}° is assumed on the "
            "lifted wetted part")
    rel = (V0 - V) / abs(V) * 100.0 if V else 0.0
    if V0 < V:
        return (f"{head}; with a receding angle of 0° (the bound) the limit would be {V0 * scale * 1e3:.4g} mN, "
                f"{-rel:.2g} % lower: give the receding angle, this assumption errs on the unsafe side")
    return (f"{head}; with a receding angle of 0° (the bound) the limit would be {V0 * scale * 1e3:.4g} mN, "
            f"{rel:.2g} % higher (the lifted part's pull bends the rest of the leg deeper), so the assumption "
            "is on the safe side here")


def _length_curve(leg: _Leg, npts: int, scale: float, lc: float):
    """Limit payload against leg length, from 0.2 to 12 Winkler lengths (and the leg's own L)."""
    fd = leg.found
    Ls = np.unique(np.concatenate([leg.lw * np.geomspace(0.2, 12.0, npts)]))
    pay, tot, rig = [], [], []
    for Lj in Ls:
        n = leg.nodes(L=Lj)
        th0 = leg.th0(n, L=Lj)
        sol = beam.limit(Lj, leg.B, leg.alpha, fd, n=n, th0=th0, onset=False)
        f, _ = fd.liquid(sol["y"], sol["wet"])
        pay.append(float(sol["V"][0]))
        tot.append(float(np.trapezoid(f, sol["s"])))
        rig.append(beam.rigid_limit(Lj, fd, th0)["force"])
    pay = np.array(pay)
    long_val = pay[-1]
    target = SATURATION_FRACTION * float(np.max(pay))
    sat = None
    above = np.flatnonzero(pay >= target)
    if above.size and above[0] > 0 and target > 0:
        j = above[0]
        # interpolate in log length between the bracketing points
        t = (target - pay[j - 1]) / (pay[j] - pay[j - 1])
        sat = float(np.exp(np.log(Ls[j - 1]) + t * (np.log(Ls[j]) - np.log(Ls[j - 1])))) * lc
    curve = LengthCurve(length=Q_(Ls * lc, "m"), max_force=Q_(np.array(tot) * scale, "N"),
                        payload=Q_(pay * scale, "N"), rigid_payload=Q_(np.array(rig) * scale, "N"))
    return curve, sat, float(long_val * scale)


@dataclass(frozen=True, kw_only=True)
class FlexLegCurve(Result):
    """Force of a flexible leg against the depth of its clamp, up to the limit."""

    clamp_depth: Any = qfield("m")
    max_depth: Any = qfield("m")
    force: Any = qfield("N")
    payload: Any = qfield("N")
    contact_depth: Any = qfield("m")
    own_weight: Any = qfield("N")
    limit_force: Any = qfield("N")
    limit_criterion: str = field(default="")
    lifted_length: Any = qfield("m", default=None)
    warnings: tuple[str, ...] = field(default=())


def flexible_leg_curve(radius: Any, length: Any, contact_angle: Any, *, youngs_modulus: Any | None = None,
                       material: str | LegMaterial | None = None, clamp_angle: Any = 0.0,
                       toe_angle: Any | None = None, toe_length: Any | None = None,
                       material_density: Any | None = None, liquid: Liquid | None = None,
                       points: int = 24, nodes: int | None = None, start: str = "floating",
                       receding_angle: Any | None = None) -> FlexLegCurve:
    """Liquid force and clamp support of one flexible leg against clamp depth, up to its limit.

    Same model and parameters as :func:`flexible_leg`. The clamp depth (of the leg's lowest
    point at the clamp, below the undisturbed surface) runs from where the leg floats (its
    clamp support is zero) to the limit of :func:`flexible_leg` (the largest clamp force on the
    way down, ``limit_criterion``); ``points`` equilibria are solved on the same load path
    (continuation from first touch, with the wetting history). ``force`` is the liquid's
    upward force on the leg; ``payload`` the support at the clamp (force − own weight);
    ``contact_depth`` the rod-law contact-line depth at the clamp section; ``lifted_length``
    the wetted length above the surface at each point. With ``start="touch"`` the curve begins
    where the unbent leg first touches the undisturbed surface (its deepest point at depth 0).
    Both forces rise with clamp depth up to the limit; interpolate them for a device
    equilibrium.

    >>> c = flexible_leg_curve("0.1 mm", "30 mm", "150 deg", material="steel", points=6)
    >>> bool(np.all(np.diff(c.payload.magnitude) > 0))
    True
    """
    liq, R, L, th, E, rho_s, name, leg, notes = _prepare(
        radius, length, contact_angle, youngs_modulus, material, clamp_angle, toe_angle, toe_length,
        material_density, liquid, receding_angle)
    m = v.count(points, "points", upper=400)
    m = max(m, 2)
    n = leg.nodes(n=None if nodes is None else v.count(nodes, "nodes", upper=20000))
    th0 = leg.th0(n)
    fd = leg.found
    if start not in ("floating", "touch"):
        raise input_error("start", "must be 'floating' or 'touch'", repr(start))
    lim = beam.limit(leg.L, leg.B, leg.alpha, fd, n=n, th0=th0, onset=False, keep_path=True)
    path = lim["path"]
    d_to = float(lim["clamp_depth"])
    d_from = path[0]["Dc"]
    if start == "floating":
        for p, q in zip(path[:-1], path[1:]):
            if p["V"] < 0.0 <= q["V"]:
                d_from = p["Dc"] + (q["Dc"] - p["Dc"]) * (-p["V"]) / (q["V"] - p["V"])
                break
    d_from = min(d_from, d_to - 1e-3)
    P = beam._Path(leg.L, leg.B, leg.alpha, fd, n, th0, "clamped")
    depths = np.linspace(d_from, d_to, m)
    cd, md, fo, pa, hc, lifted = [], [], [], [], [], []
    # every point but the last (the limit) from the deepest path state above it, all at once
    bases = [max((p for p in path if p["Dc"] <= D), key=lambda p: p["Dc"], default=path[0]) for D in depths[:-1]]
    states = [*P.near_many(bases, depths[:-1]), (lim, lim["wet"])]
    for D, (sol, wet) in zip(depths, states):
        y = sol["y"]
        f, _ = fd.liquid(y, wet)
        cd.append(D)
        md.append(beam.max_depth(y))
        fo.append(float(np.trapezoid(f, sol["s"])))
        pa.append(float(sol["V"][0]))
        hc.append(float(fd.contact_depth(y[:1], wet[:1])[0]))
        lifted.append(beam.contact_lengths(sol["s"], y, wet, fd)[1])
    s, lc = liq.sigma, liq.lc
    lift = _lift_report(leg, lim, s * lc, lc)
    warnings = [*notes, *_path_warnings(lim, s * lc, lc), *lift["warnings"]]
    return FlexLegCurve(clamp_depth=Q_(np.array(cd) * lc, "m"), max_depth=Q_(np.array(md) * lc, "m"),
                        force=Q_(np.array(fo) * s * lc, "N"), payload=Q_(np.array(pa) * s * lc, "N"),
                        contact_depth=Q_(np.array(hc) * lc, "m"),
                        own_weight=Q_(fd.weight * leg.L * s * lc, "N"), limit_force=Q_(fo[-1] * s * lc, "N"),
                        limit_criterion=lim["criterion"], lifted_length=Q_(np.array(lifted) * lc, "m"),
                        warnings=tuple(warnings))
