r"""A rowing stroke: demanded horizontal and extra vertical leg force against the meniscus.

Model
-----
During a stroke of duration T the legs push on the liquid with a horizontal force F_x (the
thrust) while carrying the weight W plus an extra vertical force F_e (for example the reaction
of a leg swung down), both constant over the stroke (quasi-static). The vertical load is shared
as the level device shares it: element i carries F_i, its force at the heave where the device's
quasi-static heave law (:func:`floatcalc.motion._device.heave_law`) gives F_z = W + F_e. Two
conditions keep every element on the surface:

1. vertical: F_z ≤ F_lim, the heave law's limit (first element at its limit depth);
2. resultant: the surface-tension force on a contact line of length P_i is at most σ P_i in
   any direction (the contact-line bound; Hu, Chan & Bush [1]_ give σP as the maximum curvature
   force of a strider), and on a leg of advancing angle θ_i the interface on each side cannot
   turn past θ_i. For thin legs this gives each element's largest thrust, and the device's is
   their sum (the legs share the thrust as their capacities allow):

   .. math:: F_{x,\max} = \sum_i \sigma P_i\; h\!\left(\frac{F_i}{\sigma P_i},\ \theta_i\right)

   with h from :func:`floatcalc.core.meniscus_thrust.max_thrust`. The whole vertical load of an
   element is charged to surface tension (its pressure part would leave more of σP_i for
   thrust), so the bound is on the safe side.

The thrust is passed on to the liquid as momentum (vortices shed by the legs [1]_, waves above
c_min [2]_); the device gains F_x T / m of speed per stroke (drag neglected).

Dimensionless checks: Weber number We = ρU²R/σ of the leg (leg speed U, leg radius R;
:func:`floatcalc.dimensionless.weber_number`), We ≥ 1 warns that inertia can break the meniscus before
the static limit; leg speed against the minimum capillary–gravity wave speed
c_min = (4gσ/ρ)^{1/4} ≈ 0.23 m/s (:func:`floatcalc.dimensionless.min_wave_speed`) — a bound for steady,
straight motion only: accelerating or curved strokes radiate waves below it. Stroke times
shorter than the capillary time √(l_c/g) (about 17 ms for water) warn that the meniscus is not
quasi-static. With a textured coating the pressure under each element at its limit depth plus
½ρU² is checked against the texture's Cassie-to-Wenzel pressure (:mod:`floatcalc.motion.coating`).

References
----------
.. [1] D. L. Hu, B. Chan, J. W. M. Bush, Nature 424, 663 (2003).
.. [2] D. L. Hu, J. W. M. Bush, J. Fluid Mech. 644, 5 (2010).
.. [3] P.-G. de Gennes, F. Brochard-Wyart, D. Quéré, Capillarity and Wetting Phenomena,
   Springer (2004) (c_min).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

import numpy as np

from ..errors import input_error
from ..results import field, qfield
from ..units import Q_
from ._result import MotionResult

REFERENCES = (
    "Hu, Chan & Bush, Nature 424, 663 (2003): strider propulsion by the meniscus; maximum curvature force σP",
    "Hu & Bush, J. Fluid Mech. 644, 5 (2010): curvature-force propulsion above the capillary wave speed",
    "de Gennes, Brochard-Wyart & Quéré, Capillarity and Wetting Phenomena (2004): c_min = (4gσ/ρ)^(1/4)",
)
WAVE_CAVEAT = ("c_min holds for steady, straight motion; accelerating or curved strokes radiate capillary "
               "waves below it")


@dataclass(frozen=True, kw_only=True)
class StrokeResult(MotionResult):
    """Result of :func:`stroke` (SI JSON keys via :meth:`to_dict`)."""

    stroke_time: Any = qfield("s")
    thrust: Any = qfield("N")
    extra_vertical: Any = qfield("N")
    vertical_force: Any = qfield("N")
    breaks_surface: bool = field(default=False)
    breaks_by: str = field(default="")
    max_thrust: Any = qfield("N")
    max_thrust_at_rest_load: Any = qfield("N")
    max_extra_vertical: Any = qfield("N")
    limit_force: Any = qfield("N")
    contact_line_force: Any = qfield("N")
    weight: Any = qfield("N")
    first_to_fail: str = field(default="")
    speed_gain: Any = qfield("m/s")
    leg_speed: Any = qfield("m/s")
    leg_speed_source: str = field(default="")
    weber_number: float = field(default=0.0)
    min_wave_speed: Any = qfield("m/s")
    above_min_wave_speed: bool = field(default=False)
    wave_caveat: str = field(default=WAVE_CAVEAT)
    capillary_time: Any = qfield("s")
    coating: tuple = field(default=())
    coating_elements: tuple = field(default=())
    element_names: tuple = field(default=())
    element_max_thrust: Any = qfield("N", default=None)
    warnings: tuple[str, ...] = field(default=())
    cautions: tuple[str, ...] = field(default=())
    references: tuple[str, ...] = field(default=REFERENCES)


def stroke(design, stroke_time: Any, thrust: Any, *, extra_vertical: Any = 0.0, leg_speed: Any | None = None,
           texture: dict | None = None) -> StrokeResult:
    """Does a rowing stroke break through the surface, and what thrust could it give at most?

    Parameters
    ----------
    design : Design or path of a design file
    stroke_time : [s]
        Duration T of the stroke.
    thrust : [N]
        Demanded horizontal force of all legs together (≥ 0).
    extra_vertical : [N]
        Extra downward force of the legs on the liquid during the stroke (≥ 0).
    leg_speed : [m/s], optional
        Speed of the legs through the liquid; default: the speed the device gains, F_x T/m
        (a rough lower estimate; say so in the result).
    texture : dict, optional
        Texture of every element's coating (keys of :mod:`floatcalc.motion.coating`).

    Returns
    -------
    StrokeResult
        ``breaks_surface`` and ``breaks_by`` (``"vertical"``, ``"thrust"`` or ``""``),
        ``max_thrust`` at the demanded vertical load, ``max_extra_vertical``, ``weber_number``,
        ``min_wave_speed`` with ``wave_caveat``, ``coating`` states, warnings.

    Examples
    --------
    >>> from floatcalc.device import example
    >>> r = stroke(example("twin_rod"), "50 ms", "2 mN")
    >>> r.breaks_surface, round(r.max_thrust.to("mN").magnitude, 2)
    (False, 12.3)
    """
    from .. import dimensionless as groups
    from ..core import meniscus_thrust
    from ..units import to_si
    from ._inputs import duration
    from .coating import textured_heave_law

    T = duration(stroke_time, "stroke_time")
    Fx = to_si(thrust, "force", "thrust")
    if Fx < 0:
        raise input_error("thrust", "must be zero or positive", f"{Fx * 1e3:g} mN")
    Fe = to_si(extra_vertical, "force", "extra_vertical")
    if Fe < 0:
        raise input_error("extra_vertical", "must be zero or positive", f"{Fe * 1e3:g} mN")
    from ._device import heave_law

    law0 = heave_law(design)
    liq = law0.liquid
    g, s = liq.g, liq.sigma
    m = law0.weight / g
    if leg_speed is None:
        U = Fx * T / m
        source = "estimate: speed the device gains in the stroke, F_x T/m (give the leg speed for a real value)"
    else:
        U = to_si(leg_speed, "speed", "leg_speed")
        if U < 0:
            raise input_error("leg_speed", "must be zero or positive", f"{U:g} m/s")
        source = "given"
    if texture is None:
        from .coating import design_texture

        texture = design_texture(design)   # a texture given in the design file
    if texture is None:
        law, states, notes = law0, [], []
    else:
        law, states, notes = textured_heave_law(design, texture, U)
    W, Flim = law.weight, law.limit_force
    Fz = W + Fe
    P = float(np.sum(law.element_perimeters))
    sP = s * P
    sP_i = s * law.element_perimeters

    def capacities(Fv):
        """Thrust capacity of each element [N] when the level device carries Fv [N]."""
        if Fv > Flim * (1 + 1e-9):
            return np.zeros(len(sP_i))
        F_i = np.array([np.interp(Fv, law.force, row) for row in law.element_force])
        return meniscus_thrust.max_thrust(F_i / sP_i, law.element_angles) * sP_i

    caps = capacities(Fz)
    h_dem = float(caps.sum())
    h_rest = float(capacities(W).sum())
    if Fz > Flim * (1 + 1e-9):
        breaks_by = "vertical"
    elif Fx > h_dem * (1 + 1e-9):
        breaks_by = "thrust"
    else:
        breaks_by = ""
    warnings = list(notes)
    if breaks_by == "vertical":
        warnings.append(f"the vertical load {Fz * 1e3:.4g} mN exceeds the limit {Flim * 1e3:.4g} mN: "
                        f"'{law.first_to_fail}' breaks through")
    elif breaks_by == "thrust":
        warnings.append(f"the thrust {Fx * 1e3:.4g} mN exceeds what the menisci can pass on at this vertical load "
                        f"({h_dem * 1e3:.4g} mN): the legs break through")
    if breaks_by != "vertical" and np.any(caps == 0.0):
        warnings.append("on some elements the vertical load exceeds σ × their contact line (the pressure part carries "
                        "the rest): no thrust capacity is credited to them (safe side)")
    R = float(np.max(law.element_sizes)) if len(law.element_sizes) else 0.0
    if R > 0.3 * liq.lc:
        warnings.append(f"leg radius {R * 1e3:.3g} mm is not small against l_c = {liq.lc * 1e3:.3g} mm: the thin-leg "
                        "thrust bound neglects the pressure part's share")
    we = groups.weber_number(liq, U, R).value if R > 0 else 0.0
    if we >= 1.0:
        warnings.append(f"Weber number {we:.3g} ≥ 1: inertia can break the meniscus before the static limit")
    c_min = groups.min_wave_speed(liq).to("m/s").magnitude
    t_cap = math.sqrt(liq.lc / g)
    if T < t_cap:
        warnings.append(f"stroke time {T * 1e3:.3g} ms is shorter than the capillary time √(l_c/g) = "
                        f"{t_cap * 1e3:.3g} ms: the meniscus is not quasi-static (dynamic forces not modelled)")
    from ._device import limit_notes

    warnings.extend(limit_notes(law))
    warnings.append("thrust shared by all elements as their capacities allow; if only some legs row, give a "
                    "design of those legs")
    return StrokeResult(
        stroke_time=Q_(T, "s"), thrust=Q_(Fx, "N"), extra_vertical=Q_(Fe, "N"), vertical_force=Q_(Fz, "N"),
        breaks_surface=bool(breaks_by), breaks_by=breaks_by,
        max_thrust=Q_(h_dem, "N"), max_thrust_at_rest_load=Q_(h_rest, "N"),
        max_extra_vertical=Q_(max(Flim - W, 0.0), "N"), limit_force=Q_(Flim, "N"),
        contact_line_force=Q_(sP, "N"), weight=Q_(W, "N"), first_to_fail=law.first_to_fail,
        speed_gain=Q_(Fx * T / m, "m/s"), leg_speed=Q_(U, "m/s"), leg_speed_source=source,
        weber_number=float(we), min_wave_speed=Q_(c_min, "m/s"), above_min_wave_speed=bool(U > c_min),
        capillary_time=Q_(t_cap, "s"), coating=tuple(states),
        coating_elements=tuple(law.element_names) if states else (),
        element_names=tuple(law.element_names), element_max_thrust=Q_(caps, "N"),
        warnings=tuple(warnings), cautions=tuple(liq.cautions),
    )
