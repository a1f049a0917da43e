"""Long horizontal rod (leg) on a liquid surface: exact 2D meniscus, force–depth curve, limit.

Public API over :mod:`floatcalc.core.rod2d`: converts inputs once, scales by the capillary length,
calls the core, and returns a :class:`RodResult` with units.

Model (Vella, Lee & Kim, Langmuir 22, 5979, 2006; conventions in the module docstring of
:mod:`floatcalc.core.rod2d`): per unit length, the upward force is the vertical surface-tension
pull 2σ sin ψ plus the hydrostatic pressure on the wetted surface. The limit is its maximum over
the contact position; pushing the rod deeper than that sinks it. A rod of finite length L is L
times the per-length result (end effects not included; a warning says so when L < 20 l_c).

Validity: static, clean surface, rigid rod, neighbours several capillary lengths away,
advancing angle 0–180°.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

import numpy as np

from . import _validate as v
from .core import rod2d
from .liquids import Liquid
from .results import Result, field, qfield
from .units import Q_
from .dimensionless import baudoin

#: Default leg material when none is given: steel, 7850 kg/m³ (common practice).
DEFAULT_MATERIAL_DENSITY = 7850.0
END_EFFECT_LIMIT = 20.0  # rod lengths below this many capillary lengths get a warning
MIN_CONTINUUM_RADIUS = 1e-6  # m; below this the continuum model gets a warning (common practice)

REFERENCES = (
    "Vella, Lee & Kim, Langmuir 22, 5979 (2006): 2D meniscus and force on a floating rod",
    "Keller, Phys. Fluids 10, 3009 (1998): surface-tension force equals displaced meniscus weight",
)


@dataclass(frozen=True, kw_only=True)
class ForceDepthCurve(Result):
    """Force against the depth of the element's lowest point (arrays, SI units)."""

    depth: Any = qfield("m")
    force: Any = qfield("N")
    surface_tension: Any = qfield("N")
    pressure: Any = qfield("N")
    stage: tuple[str, ...] = field(default=())
    warnings: tuple[str, ...] = field(default=())

    def rows(self):
        """Rows (depth m, force N, surface-tension part N, pressure part N) for CSV."""
        return np.column_stack([self.depth.to("m").magnitude, self.force.to("N").magnitude,
                                self.surface_tension.to("N").magnitude, self.pressure.to("N").magnitude])


@dataclass(frozen=True, kw_only=True)
class RodResult(Result):
    """Result of :func:`rod`. Forces are totals over ``count`` legs of length ``length``."""

    radius: Any = qfield("m")
    length: Any = qfield("m")
    count: int = field(default=1)
    contact_angle: Any = qfield("deg")
    max_force: Any = qfield("N")
    max_force_per_length: Any = qfield("N/m")
    depth_at_max: Any = qfield("m")
    contact_position_at_max: Any = qfield("deg")
    inclination_at_max: Any = qfield("deg")
    surface_tension_part: Any = qfield("N")
    pressure_part: Any = qfield("N")
    end_part: Any = qfield("N", default=None)
    own_weight: Any = qfield("N")
    payload: Any = qfield("N")
    payload_mass: Any = qfield("kg")
    contact_perimeter: Any = qfield("m", default=None)
    bond_number: float = field(default=0.0)
    bond_length: Any = qfield("m", default=None)
    baudoin_number: float = field(default=0.0)
    receding_angle: Any = qfield("deg", default=None)
    receding_max_force: Any = qfield("N", default=None)
    pull_off_force: Any = qfield("N", default=None)
    liquid: Liquid | None = field(default=None, json=False)
    curve: ForceDepthCurve | None = field(default=None, json=False)
    profile: dict | None = field(default=None, json=False)
    warnings: tuple[str, ...] = field(default=())
    cautions: tuple[str, ...] = field(default=())
    references: tuple[str, ...] = field(default=REFERENCES)

    def to_dict(self) -> dict[str, Any]:
        d = super().to_dict()
        if self.liquid is not None:
            d["liquid"] = self.liquid.summary()
        return d


def _liquid(liq: Liquid | None) -> Liquid:
    from .liquids import as_liquid

    return as_liquid(liq)


def rod_limit(radius: Any, contact_angle: Any, liquid: Liquid | None = None) -> dict[str, Any]:
    """Vectorised limit of long rods: arrays of radius and advancing angle in, quantities out.

    Parameters
    ----------
    radius : array_like [m] or quantity
    contact_angle : array_like [rad] or quantity
        Advancing contact angle, 0–180°.
    liquid : Liquid, optional
        Default: water at 20 °C.

    Returns
    -------
    dict of quantity arrays: ``max_force_per_length`` [N/m], ``depth_at_max`` [m],
    ``surface_tension_part`` and ``pressure_part`` [N/m].

    >>> r = rod_limit(np.array([1e-4, 2e-4]), np.radians([150, 150]))  # radii in m
    >>> bool(np.all(np.diff(r["max_force_per_length"].magnitude) > 0))
    True
    """
    liq = _liquid(liquid)
    R = v.length(radius, "radius", array=True)
    th = v.angle(contact_angle, "contact_angle", array=True)
    try:
        np.broadcast_shapes(np.shape(R), np.shape(th))
    except ValueError:
        from .errors import input_error

        raise input_error("contact_angle", f"must broadcast with radius (shape {np.shape(R)})",
                          f"shape {np.shape(th)}") from None
    out = rod2d.limit_force(np.asarray(R) / liq.lc, th)
    s, lc = liq.sigma, liq.lc
    return {
        "max_force_per_length": Q_(out["force"] * s, "N/m"),
        "depth_at_max": Q_(out["depth"] * lc, "m"),
        "surface_tension_part": Q_(out["surface_tension"] * s, "N/m"),
        "pressure_part": Q_(out["pressure"] * s, "N/m"),
    }


def rod(radius: Any, length: Any, contact_angle: Any, *, receding_angle: Any | None = None,
        liquid: Liquid | None = None, material_density: Any | None = None, count: int = 1,
        curve_points: int = 200) -> RodResult:
    """Limit load of ``count`` long horizontal rods (legs) far apart, with curve and profile.

    .. math::

        F_{max} = L \\max_{\\phi}\\left[2\\sigma\\sin\\psi + \\rho g\\left(R^2(\\phi - \\sin\\phi\\cos\\phi)
                  + 2R\\sin\\phi\\, h_0\\right)\\right], \\quad h_0 = 2 l_c \\sin(\\psi/2)

    Parameters
    ----------
    radius : [m]
        Rod radius.
    length : [m]
        Wetted length of each rod.
    contact_angle : [rad]
        Advancing contact angle (sets the limit).
    receding_angle : [rad], optional
        Receding angle; gives the conservative limit with a receded line and the pull-off force.
    liquid : Liquid, optional
        Default water at 20 °C.
    material_density : [kg/m³], optional
        Rod material, for its own weight; default steel 7850 kg/m³ (common practice).
    count : int
        Number of identical rods, treated as far apart (no shared meniscus).

    Returns
    -------
    RodResult

    Notes
    -----
    Valid for rods long compared with the capillary length (end effects are ignored: a warning
    is added when L < 20 l_c), rigid, static, on a clean surface.

    References
    ----------
    .. [1] D. Vella, D.-G. Lee, H.-Y. Kim, Langmuir 22, 5979 (2006).

    Examples
    --------
    >>> r = rod("0.25 mm", "40 mm", "150 deg")
    >>> round(r.max_force.to("mN").magnitude, 2)
    6.53
    """
    liq = _liquid(liquid)
    R = v.length(radius, "radius")
    L = v.length(length, "length")
    th = v.angle(contact_angle, "contact_angle")
    th_r = v.hysteresis(th, receding_angle)
    n = v.count(count)
    if isinstance(curve_points, bool) or not isinstance(curve_points, int) or not 2 <= curve_points <= 20000:
        from .errors import input_error

        raise input_error("curve_points", "must be a whole number from 2 to 20000", repr(curve_points))
    rho_s = DEFAULT_MATERIAL_DENSITY if material_density is None else v.density(material_density, "material_density")
    s, lc = liq.sigma, liq.lc
    Rs = R / lc

    from .core import finite_rod

    lim2 = rod2d.limit_force(Rs, th)
    lim = finite_rod.limit(Rs, th, L / lc)      # the one rod law with its ends (device too)
    phi = float(lim["phi"])
    per_len = float(lim2["force"]) * s
    total = lim["force"] * s * lc * n
    weight = rho_s * math.pi * R**2 * L * liq.g * n
    warnings: list[str] = []
    end_share = lim["end_part"] / lim["force"] if lim["force"] else 0.0
    if L < END_EFFECT_LIMIT * lc:
        warnings.append(
            f"length {L * 1e3:.3g} mm is under 20 capillary lengths ({20 * lc * 1e3:.3g} mm): the ends "
            + (f"(meniscus round the rod ends) add {100 * end_share:.2g} % here, bounded by σ × the contact "
               "line across each end face (floatcalc.core.finite_rod)" if end_share > 0 else
               "(rod ends) are taken to add nothing (the solved 3D ends take off up to 0.06 σ l_c each, so the "
               f"limit may be up to {100 * 0.12 * s * lc / max(total / n, 1e-300):.2g} % high; "
               "floatcalc.core.finite_rod)")
        )
    if R < MIN_CONTINUUM_RADIUS:
        warnings.append(
            f"radius {R * 1e6:.3g} µm is below 1 µm: roughness, line tension and coating thickness "
            "are comparable to the leg there, and the continuum meniscus model is not validated "
            "(common practice bound)"
        )
    if n > 1:
        warnings.append(f"{n} legs are treated as far apart (several capillary lengths, "
                        f"≳ {4 * lc * 1e3:.2g} mm): no shared meniscus")
    if material_density is None:
        warnings.append(f"material density not given: steel {DEFAULT_MATERIAL_DENSITY:g} kg/m³ assumed for own weight")
    if th < math.pi / 2:
        warnings.append("wetting leg (contact angle below 90°): the limit is reached as the liquid closes over the top")

    phis = np.linspace(0.0, phi, curve_points)
    f2d, f_end, depth = finite_rod.force_parts(phis, Rs, th, L / lc)
    f_st2, f_p2, _ = rod2d.force_parts(phis, Rs, th)
    scale_f = s * lc * n
    fdc = ForceDepthCurve(
        depth=Q_(depth * lc, "m"),
        force=Q_((f2d + f_end) * scale_f, "N"),
        surface_tension=Q_((f_st2 * L / lc + f_end) * scale_f, "N"),
        pressure=Q_(f_p2 * L / lc * scale_f, "N"),
    )
    prof = rod2d.profile(Rs, th, phi)
    profile = {
        "radius_m": R,
        "centre_z_m": prof["centre_z"] * lc,
        "right_m": (prof["right"][0] * lc, prof["right"][1] * lc),
        "left_m": (prof["left"][0] * lc, prof["left"][1] * lc),
        "contact_m": (prof["contact"][0] * lc, prof["contact"][1] * lc),
        "depth_m": prof["depth"] * lc,
    }
    f_st_lim, f_p_lim, _ = rod2d.force_parts(phi, Rs, th)
    st_part = (float(f_st_lim) * L / lc + lim["end_part"]) * scale_f
    p_part = float(f_p_lim) * L / lc * scale_f
    perimeter = contact_perimeter(R, L, phi) * n

    rec_max = pull = None
    if th_r is not None:
        rec_max = Q_(finite_rod.limit(Rs, th_r, L / lc)["force"] * scale_f, "N")
        pull = Q_(_pull_off(Rs, th_r) * s * L * n, "N")

    payload = total - weight
    return RodResult(
        radius=Q_(R, "m"), length=Q_(L, "m"), count=n, contact_angle=Q_(math.degrees(th), "deg"),
        max_force=Q_(total, "N"), max_force_per_length=Q_(per_len, "N/m"),
        depth_at_max=Q_(float(lim["depth"]) * lc, "m"),
        contact_position_at_max=Q_(math.degrees(phi), "deg"),
        inclination_at_max=Q_(math.degrees(phi + th - math.pi), "deg"),
        surface_tension_part=Q_(st_part, "N"), pressure_part=Q_(p_part, "N"),
        end_part=Q_(lim["end_part"] * scale_f, "N"),
        own_weight=Q_(weight, "N"), payload=Q_(payload, "N"), payload_mass=Q_(payload / liq.g, "kg"),
        contact_perimeter=Q_(perimeter, "m"),
        bond_number=Rs**2, bond_length=Q_(R, "m"),
        baudoin_number=baudoin(weight, s, perimeter),
        receding_angle=None if th_r is None else Q_(math.degrees(th_r), "deg"),
        receding_max_force=rec_max, pull_off_force=pull,
        liquid=liq, curve=fdc, profile=profile,
        warnings=tuple(warnings), cautions=liq.cautions,
    )


def contact_perimeter(radius: float, length: float, phi: float) -> float:
    """Contact-line length [m] of a rod with flat ends at contact position φ: the two lines along
    its sides and the chord 2 R sin φ across each end face, 2L + 4 R sin φ (the one rule used
    for the Baudoin number of rods, alone or in a device).

    >>> round(contact_perimeter(1e-3, 0.04, math.pi / 2), 6)
    0.084
    """
    return 2.0 * length + 4.0 * radius * math.sin(phi)


def _pull_off(Rs: float, th_r: float) -> float:
    """Largest downward (adhesive) force per length [σ] while the rod is lifted, ≥ 0.

    With the receding angle the force f(φ) is at its most negative either at first contact
    (φ = 0) or at an interior minimum; a dense grid and a local refinement find it.
    """
    from scipy.optimize import minimize_scalar

    grid = np.linspace(0.0, math.pi, 721)
    f = rod2d.force(grid, Rs, th_r)
    k = int(np.argmin(f))
    lo, hi = grid[max(k - 1, 0)], grid[min(k + 1, grid.size - 1)]
    best = float(f[k])
    if hi > lo:
        res = minimize_scalar(lambda p: rod2d.force(p, Rs, th_r), bounds=(lo, hi), method="bounded",
                              options={"xatol": 1e-12})
        best = min(best, float(res.fun))
    return max(0.0, -best)
