"""Meniscus at a flat vertical wall: contact height, profile and the wall's vertical pull.

Public API over :mod:`floatcalc.core.wall2d`. Useful for the side walls of a floating platform,
the flat plates of a test rig, and for checking a measured contact angle from the rise of the
liquid on a plate.

References
----------
.. [1] P.-G. de Gennes, F. Brochard-Wyart, D. Quéré, Capillarity and Wetting Phenomena,
   Springer (2004), ch. 1.
.. [2] L. Wilhelmy, Ann. Phys. 195, 177 (1863) (pull of a wetted plate, σ cos θ per length).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

from . import _validate as v
from .core import wall2d
from .liquids import Liquid
from .results import Result, field, qfield
from .units import Q_

REFERENCES = (
    "de Gennes, Brochard-Wyart & Quéré, Capillarity and Wetting Phenomena (2004): "
    "rise at a vertical wall h = l_c sqrt(2(1 - sin θ))",
    "Landau & Lifshitz, Fluid Mechanics §61: closed-form 2D meniscus profile",
    "Wilhelmy (1863): vertical pull σ cos θ per unit length of wetted wall",
)


@dataclass(frozen=True, kw_only=True)
class WallMeniscusResult(Result):
    """Result of :func:`wall_meniscus` (per unit length of wall, one side)."""

    contact_angle: Any = qfield("deg")
    contact_height: Any = qfield("m")
    inclination_at_wall: Any = qfield("deg")
    force_per_length: Any = qfield("N/m")
    capillary_length: Any = qfield("m")
    profile: dict | None = field(default=None, json=False)
    liquid: Liquid | None = field(default=None, json=False)
    warnings: tuple[str, ...] = field(default=())
    cautions: tuple[str, ...] = field(default=())
    references: tuple[str, ...] = field(default=REFERENCES)


def wall_meniscus(contact_angle: Any, liquid: Liquid | None = None) -> WallMeniscusResult:
    """Height of the contact line and profile of a 2D meniscus at a flat vertical wall.

    .. math::

        h = 2 l_c \\sin\\frac{\\psi_w}{2} = \\operatorname{sign}(\\cos\\theta)\\, l_c \\sqrt{2(1-\\sin\\theta)},
        \\qquad \\psi_w = \\frac{\\pi}{2} - \\theta

    Parameters
    ----------
    contact_angle : [rad]
        Contact angle on the wall, 0–180° (through the liquid).
    liquid : Liquid, optional
        Default water at 20 °C.

    Returns
    -------
    WallMeniscusResult
        ``contact_height`` [m] (positive: liquid climbs the wall), ``inclination_at_wall``
        [deg] (interface angle above the horizontal at the wall), ``force_per_length`` [N/m]
        (downward pull of the meniscus on the wall, σ cos θ; negative means a push up), and
        ``profile`` (``x_m``, ``z_m`` arrays: distance from the wall and height).

    Notes
    -----
    Valid for a wall wide compared with l_c (no end effects), liquid deep compared with l_c,
    static, clean surface; |h| ≤ √2 l_c.

    Examples
    --------
    >>> r = wall_meniscus("0 deg")          # perfectly wetting plate in water at 20 °C
    >>> round(r.contact_height.to("mm").magnitude, 3)
    3.855
    """
    from .liquids import as_liquid

    liq = as_liquid(liquid)
    th = v.angle(contact_angle, "contact_angle")
    lc = liq.lc
    h = float(wall2d.contact_height(th)) * lc
    x, z = wall2d.profile(th)
    return WallMeniscusResult(
        contact_angle=Q_(math.degrees(th), "deg"),
        contact_height=Q_(h, "m"),
        inclination_at_wall=Q_(90.0 - math.degrees(th), "deg"),
        force_per_length=Q_(liq.sigma * math.cos(th), "N/m"),
        capillary_length=Q_(lc, "m"),
        profile={"x_m": x * lc, "z_m": z * lc},
        liquid=liq,
        cautions=liq.cautions,
    )
