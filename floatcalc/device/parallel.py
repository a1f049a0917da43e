"""N long parallel rods at equal spacing sharing their menisci: public API with units.

Wraps :mod:`floatcalc.core.parallel2d` (exact 2D inner menisci with the turning-point first
integral; Vella, Lee & Kim, Langmuir 22, 5979, 2006, treat a pair).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

from .. import _validate as v
from ..errors import input_error
from ..liquids import Liquid
from ..results import Result, field, qfield
from ..units import Q_

REFERENCES = (
    "Vella, Lee & Kim, Langmuir 22, 5979 (2006): 2D rod law and pairs of floating rods",
)


@dataclass(frozen=True, kw_only=True)
class ParallelRodsResult(Result):
    """Limit of ``count`` parallel rods at centre ``spacing`` (forces over all rods)."""

    radius: Any = qfield("m")
    length: Any = qfield("m")
    count: int = field(default=1)
    spacing: Any = qfield("m")
    contact_angle: Any = qfield("deg")
    max_force: Any = qfield("N")
    per_leg_max_force: Any = qfield("N")
    isolated_per_leg_max_force: Any = qfield("N")
    depth_at_max: Any = qfield("m")
    mid_gap_depth_at_max: Any = qfield("m")
    surface_tension_part: Any = qfield("N")
    pressure_part: Any = qfield("N")
    contact_perimeter: Any = qfield("m")
    bond_number: float = field(default=0.0)
    bond_length: Any = qfield("m")
    baudoin_number: float = field(default=0.0)
    own_weight: Any = qfield("N")
    payload: Any = qfield("N")
    payload_mass: Any = qfield("kg")
    profile: dict | None = field(default=None, json=False)
    liquid: Liquid | None = field(default=None, json=False)
    warnings: tuple[str, ...] = field(default=())
    cautions: tuple[str, ...] = field(default=())
    references: tuple[str, ...] = field(default=REFERENCES)

    def to_dict(self) -> dict[str, Any]:
        d = super().to_dict()
        if self.liquid is not None:
            d["liquid"] = self.liquid.summary()
        return d


def parallel_rods(radius: Any, length: Any, contact_angle: Any, count: int, spacing: Any, *,
                  liquid: Liquid | None = None, material_density: Any | None = None) -> ParallelRodsResult:
    """Limit load of N long parallel rods at centre spacing S, held level by a rigid frame.

    .. math:: F_{max} = L\\,\\max_c\\,[2 f_{side}(\\phi_o) + 2(N-1) f_{side}(\\phi_i)],
              \\quad h_i^2 - h_m^2 = 2 l_c^2 (1 - \\cos\\psi_i)

    (see :mod:`floatcalc.core.parallel2d` for the side forces and the gap condition).

    Parameters
    ----------
    radius, length, spacing : [m]
        Rod radius, wetted length of each rod, centre-to-centre spacing (> 2 radius).
    contact_angle : [rad]
        Advancing contact angle.
    count : int
        Number of rods.
    liquid : Liquid, optional
        Default water at 20 °C.
    material_density : [kg/m³], optional
        Default steel 7850 kg/m³ (common practice).

    Notes
    -----
    Valid for long rigid rods (L ≫ l_c; end effects excluded), all at one depth, static, clean
    surface. Far apart (S ≳ 6 l_c) the result is N times one rod.

    References
    ----------
    .. [1] D. Vella, D.-G. Lee, H.-Y. Kim, Langmuir 22, 5979 (2006).

    Examples
    --------
    >>> r = parallel_rods("0.25 mm", "40 mm", "115 deg", 2, "1 mm")
    >>> bool(r.per_leg_max_force < r.isolated_per_leg_max_force)
    True
    """
    from ..core import parallel2d, rod2d

    from ..liquids import as_liquid

    liq = as_liquid(liquid)
    R = v.length(radius, "radius")
    L = v.length(length, "length")
    S = v.length(spacing, "spacing")
    th = v.angle(contact_angle, "contact_angle")
    n = v.count(count)
    if S <= 2 * R:
        raise input_error("spacing", f"must exceed twice the radius ({2 * R * 1e3:.4g} mm): the rods would "
                          "overlap", f"{S * 1e3:.4g} mm")
    rho_s = 7850.0 if material_density is None else v.density(material_density, "material_density")
    lc, s = liq.lc, liq.sigma
    lim = parallel2d.row_limit(R / lc, th, S / lc, n)
    one = float(rod2d.limit_force(R / lc, th)["force"])
    total = lim["force"] * s * L
    weight = rho_s * math.pi * R * R * L * liq.g * n
    warnings = []
    if L < 20 * lc:
        warnings.append(f"length {L * 1e3:.3g} mm is under 20 capillary lengths: end effects not included")
    if material_density is None:
        warnings.append("material density not given: steel 7850 kg/m³ assumed for own weight")
    hm = lim["h_mid"]
    # vertical surface-tension part: σ sin ψ on each side (2 outer sides, 2(N − 1) inner sides)
    psi_o = lim["phi_outer"] + th - math.pi
    psi_i = lim["phi_inner"] + th - math.pi
    st_len = 2.0 * math.sin(psi_o) + (2.0 * (n - 1) * math.sin(psi_i) if n > 1 else 0.0)
    st_part = st_len * s * L
    perimeter = n * (2.0 * L + 4.0 * R * math.sin(lim["phi_outer"]))
    from ..dimensionless import baudoin

    prof = parallel2d.row_profile(R / lc, th, S / lc, n, lim=lim)
    m = lambda xz: (xz[0] * lc, xz[1] * lc)  # noqa: E731 - [l_c] -> [m]
    profile = {"body": "rod row", "radius_m": R, "centre_z_m": prof["centre_z"] * lc,
               "centres_x_m": prof["centres_x"] * lc, "outer_right_m": m(prof["outer_right"]),
               "outer_left_m": m(prof["outer_left"]), "gaps_m": [m(g) for g in prof["gaps"]],
               "contacts_m": m(prof["contacts"]), "phi_outer": prof["phi_outer"], "phi_inner": prof["phi_inner"],
               "depth_m": prof["depth"] * lc}
    return ParallelRodsResult(profile=profile,
        surface_tension_part=Q_(st_part, "N"), pressure_part=Q_(total - st_part, "N"),
        contact_perimeter=Q_(perimeter, "m"), bond_number=(R / lc) ** 2, bond_length=Q_(R, "m"),
        baudoin_number=baudoin(weight, s, perimeter), liquid=liq,
        radius=Q_(R, "m"), length=Q_(L, "m"), count=n, spacing=Q_(S, "m"),
        contact_angle=Q_(math.degrees(th), "deg"),
        max_force=Q_(total, "N"), per_leg_max_force=Q_(total / n, "N"),
        isolated_per_leg_max_force=Q_(one * s * L, "N"),
        depth_at_max=Q_(lim["depth"] * lc, "m"),
        mid_gap_depth_at_max=None if not math.isfinite(hm) else Q_(hm * lc, "m"),
        own_weight=Q_(weight, "N"), payload=Q_(total - weight, "N"),
        payload_mass=Q_((total - weight) / liq.g, "kg"),
        warnings=tuple(warnings), cautions=liq.cautions,
    )
