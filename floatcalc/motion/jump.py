"""Jumping off the surface: a push through the legs against the quasi-static meniscus limit.

Model
-----
The device (total mass m = W/g, body weight W_b, element weight W_l = W − W_b) rests on the
liquid, its elements carrying W. During the push (duration T) the body pushes against its
elements with the push force P(t); the elements press into the surface and, being light and
slow on the meniscus time scale, are taken as quasi-static: the liquid's force on them equals
P(t) + W_l and sets their depth through the device's force–depth law F(z) (heave law from
:func:`floatcalc.motion._device.heave_law`):

.. math::

    F\\bigl(z(t)\\bigr) = P(t) + W_l,\\qquad
    m_b\\,\\dot v_b = P(t) - W_b .

At the end of the push the body lifts the elements off (an inelastic jerk); the momentum of the
whole device is then, by Newton's second law for body plus elements,

.. math::

    m\\,v_\\text{off} = \\int_0^T \\bigl(F(z(t)) - W\\bigr)\\,dt = \\int_0^T \\bigl(P(t) - W_b\\bigr)\\,dt .

Push profiles: ``constant`` P = P_pk on 0 ≤ t ≤ T; ``half-sine``
P = W_b + (P_pk − W_b) sin(π t/T), which rises from the resting push. The surface holds while
F ≤ F_lim at every instant (Koh et al. 2015 [1]_), F_lim the limit force of the heave law
(first element at its limit depth). Hence the largest take-off speed in a push time T is

.. math::

    v_\\max = \\Bigl(\\frac{F_\\text{lim}}{m} - g\\Bigr) T\\ \\text{(constant)},\\qquad
    v_\\max = \\Bigl(\\frac{F_\\text{lim}}{m} - g\\Bigr) \\frac{2T}{\\pi}\\ \\text{(half-sine)},

and the jump height of the centre of mass is v²/(2g) (air drag neglected).

Validity: quasi-static meniscus. The meniscus responds on the capillary time √(l_c/g) (about
17 ms for water) and, around a leg of radius R, on the capillary-wave time √(ρR³/σ); shorter
pushes get a warning (dynamic meniscus forces are not modelled: the limit may then be higher
or lower, by an unknown amount). Leg speeds with a Weber number ρU²R/σ above 1 also get one.
Vertical push, level device, elements light compared with the body, no snap-off adhesion.

References
----------
.. [1] J.-S. Koh et al., "Jumping on water: surface tension-dominated jumping of water striders
   and robotic insects", Science 349, 517 (2015).
.. [2] E. Yang, J. H. Son, S.-I. Lee, P. G. Jablonski, H.-Y. Kim, "Water striders adjust leg
   movement speed to optimize takeoff velocity for their morphology", Nat. Commun. 7, 13698
   (2016).
"""

from __future__ import annotations

import dataclasses
import math
from dataclasses import dataclass
from typing import Any

import numpy as np

from ..errors import input_error
from ..results import field, qfield
from ..units import Q_
from ._result import MotionResult

REFERENCES = (
    "Koh et al., Science 349, 517 (2015): leg force below the surface-tension limit throughout the push",
    "Yang et al., Nat. Commun. 7, 13698 (2016): take-off speed against leg speed and push duration",
)
PROFILES = ("constant", "half-sine")
#: mean of the profile shape over the push (constant: 1; half-sine: 2/π)
_MEAN_SHAPE = {"constant": 1.0, "half-sine": 2.0 / math.pi}
TIME_POINTS = 2001
#: below this fraction of the limit force, a demanded push is taken to hold (rounding only)
_HOLD_RTOL = 1e-9


@dataclass(frozen=True, kw_only=True)
class JumpResult(MotionResult):
    """Result of :func:`jump` (SI JSON keys via :meth:`to_dict`)."""

    profile: str = field()
    push_time: Any = qfield("s")
    max_takeoff_speed: Any = qfield("m/s")
    max_jump_height: Any = qfield("m")
    takeoff_speed: Any = qfield("m/s", default=None)
    jump_height: Any = qfield("m", default=None)
    breaks_surface: bool = field(default=False)
    break_time: Any = qfield("s", default=None)
    peak_force: Any = qfield("N")
    peak_push_force: Any = qfield("N")
    limit_force: Any = qfield("N")
    weight: Any = qfield("N")
    body_weight: Any = qfield("N")
    first_to_fail: str = field(default="")
    leg_stroke: Any = qfield("m", default=None)
    leg_depth_change: Any = qfield("m", default=None)
    max_leg_speed: Any = qfield("m/s", default=None)
    leg_weber_number: float | None = field(default=None)
    capillary_time: Any = qfield("s")
    leg_wave_time: Any = qfield("s")
    coating: tuple = field(default=())
    coating_elements: tuple = field(default=())
    floods_on_landing: bool | None = field(default=None)
    time: Any = field(default=None, json=False)
    meniscus_force: Any = field(default=None, json=False)
    leg_depth: Any = field(default=None, json=False)
    body_speed: Any = field(default=None, json=False)
    warnings: tuple[str, ...] = field(default=())
    cautions: tuple[str, ...] = field(default=())
    references: tuple[str, ...] = field(default=REFERENCES)


def shape(profile: str, t, T: float):
    """Profile shape s(t) on 0 ≤ t ≤ T: 1 (constant) or sin(π t/T) (half-sine)."""
    t = np.asarray(t, dtype=float)
    if profile == "constant":
        return np.ones_like(t)
    return np.sin(np.pi * np.clip(t / T, 0.0, 1.0))


def max_takeoff_speed(limit_force: float, mass: float, push_time: float, profile: str = "constant",
                      g: float = 9.80665) -> float:
    """Largest take-off speed [m/s] with the liquid force kept at or below ``limit_force`` [N].

    .. math:: v_\\max = (F_\\text{lim}/m - g)\\,T\\,\\bar s,\\qquad \\bar s = 1\\ \\text{or}\\ 2/\\pi

    (momentum of the whole device, mass [kg], push time [s]; see the module docstring).

    >>> round(max_takeoff_speed(2e-3, 1e-4, 0.02), 4)
    0.2039
    """
    return max((limit_force / mass - g) * push_time * _MEAN_SHAPE[profile], 0.0)


def jump(design, push_time: Any, *, takeoff_speed: Any | None = None, push_force: Any | None = None,
         profile: str = "constant", texture: dict | None = None) -> JumpResult:
    """Take-off of a device pushing off the liquid surface in ``push_time``.

    Parameters
    ----------
    design : Design or path of a design file
    push_time : [s]
        Duration T of the push.
    takeoff_speed : [m/s], optional
        Demanded take-off speed of the device's centre of mass.
    push_force : [N], optional
        Demanded peak push force between body and elements (the constant value, or the peak of
        the half-sine). Give at most one of ``takeoff_speed`` and ``push_force``; with neither,
        the largest push that keeps the surface whole is used.
    profile : ``"constant"`` or ``"half-sine"``
    texture : dict, optional
        Texture of every element's coating (keys of :mod:`floatcalc.motion.coating`). The
        pressure under each element at its limit depth plus ½ρU² at the largest leg speed of
        the push is checked against its Cassie-to-Wenzel pressure (flooded elements take the
        Wenzel angle), and again for the landing at the take-off speed (``floods_on_landing``).

    Returns
    -------
    JumpResult
        ``max_takeoff_speed`` (largest speed without any element breaking through),
        ``takeoff_speed`` and ``jump_height`` of the demanded push (None if it breaks through),
        ``breaks_surface``, ``peak_force`` (largest liquid force on the elements during the
        push), ``limit_force``, time series (``time``, ``meniscus_force``, ``leg_depth``,
        ``body_speed``; not in the JSON), warnings.

    Examples
    --------
    >>> from floatcalc.device import example
    >>> r = jump(example("skimmer"), "40 ms")
    >>> r.breaks_surface, round(r.max_takeoff_speed.to("m/s").magnitude, 2)
    (False, 0.74)
    """
    from .. import _validate as v
    from ._inputs import duration
    from .coating import design_texture, textured_heave_law

    T = duration(push_time, "push_time")
    if texture is None:
        texture = design_texture(design)   # a texture given in the design file
    if profile not in PROFILES:
        raise input_error("profile", f"must be one of {', '.join(PROFILES)}", repr(profile))
    if takeoff_speed is not None and push_force is not None:
        raise input_error("push", "give a take-off speed or a push force, not both", "both")
    law, states, notes = textured_heave_law(design, texture, 0.0)
    r = _on_law(law, T, profile, takeoff_speed, push_force, v)
    if texture is not None and r["u_leg"] is not None and r["u_leg"] > 0:
        law2, states2, notes2 = textured_heave_law(design, texture, r["u_leg"])
        if law2.limit_force != law.limit_force:
            law, states, notes = law2, states2, notes2
            r = _on_law(law, T, profile, takeoff_speed, push_force, v)
    landing = None
    if texture is not None:
        v_land = r["v_take"] if r["v_take"] is not None else r["v_max"]
        _, st_land, _ = textured_heave_law(design, texture, v_land)
        landing = any(st.floods for st in st_land)
        if landing and not any(st.floods for st in states):
            notes.append(f"landing at {v_land:.3g} m/s (the take-off speed, no drag) floods the textured coating: "
                         "afterwards the elements keep the Wenzel angle and carry less")
    if texture is not None and profile == "constant":
        notes.append("constant push: the legs' speed at the start is not defined (a step); the coating check of the "
                     "push uses the hydrostatic pressure only")
    res = r["result"]
    return dataclasses.replace(res, coating=tuple(states), coating_elements=tuple(law.element_names) if states else (),
                               floods_on_landing=landing, warnings=tuple(notes) + res.warnings)


def _on_law(law, T, profile, takeoff_speed, push_force, v):
    """The jump on a given heave law (see :func:`jump`)."""
    from ..units import to_si

    liq = law.liquid
    g = liq.g
    W, Wb = law.weight, law.body_weight
    Wl = W - Wb
    m, mb = W / g, Wb / g
    Flim = law.limit_force
    sbar = _MEAN_SHAPE[profile]
    P_max = Flim - Wl  # largest push that keeps the liquid force within the limit
    v_max = max_takeoff_speed(Flim, m, T, profile, g)

    if takeoff_speed is not None:
        V = to_si(takeoff_speed, "speed", "takeoff_speed")
        if V <= 0:
            raise input_error("takeoff_speed", "must be positive", f"{V:g} m/s")
        P_pk = Wb + m * V / (T * sbar)
    elif push_force is not None:
        P_pk = v.positive(push_force, "force", "push_force", show="mN")
        if P_pk <= Wb:
            raise input_error("push_force", f"must exceed the body's weight {Wb * 1e3:.4g} mN to lift it",
                              f"{P_pk * 1e3:.4g} mN")
    else:
        P_pk = P_max

    warnings: list[str] = []
    sinks = Flim <= W
    if sinks:
        warnings.append(f"the device cannot carry its own weight ({W * 1e3:.4g} mN against a limit of "
                        f"{Flim * 1e3:.4g} mN): it breaks through at rest, no jump is possible")
        P_pk = Wb

    t = np.linspace(0.0, T, TIME_POINTS)
    P = Wb + (P_pk - Wb) * shape(profile, t, T)
    F = P + Wl  # liquid force on the (quasi-static) elements
    peak = float(F.max())
    breaks = bool(peak > Flim * (1.0 + _HOLD_RTOL)) or sinks
    # depth of the elements from the force–depth law (held at the limit depth once past it)
    z = np.interp(np.minimum(F, Flim), law.force, law.depth)
    # body speed while the elements stand in the surface, then the device's momentum
    acc_b = (P - Wb) / mb
    v_b = np.concatenate([[0.0], np.cumsum(0.5 * (acc_b[1:] + acc_b[:-1]) * np.diff(t))])
    stroke = float(np.sum(0.5 * (v_b[1:] + v_b[:-1]) * np.diff(t)))
    v_off = (P_pk - Wb) * T * sbar / m  # exact integral of the profile
    z_rest = float(np.interp(W, law.force, law.depth))
    if profile == "constant":
        # the push starts as a step: the legs go from the resting depth to the push depth at once
        u_leg = None
    else:
        u_leg = float(np.max(np.abs(np.gradient(z, t))))

    t_break = None
    if sinks:
        t_break = 0.0
    elif breaks:
        k = int(np.argmax(F > Flim * (1.0 + _HOLD_RTOL)))
        if k > 0:  # linear interpolation of the crossing
            t_break = float(t[k - 1] + (Flim - F[k - 1]) / (F[k] - F[k - 1]) * (t[k] - t[k - 1]))
        else:
            t_break = 0.0
        warnings.append(
            f"the demanded push breaks through the surface at t = {t_break * 1e3:.3g} ms: the liquid force "
            f"{peak * 1e3:.4g} mN exceeds the limit {Flim * 1e3:.4g} mN ('{law.first_to_fail}' gives way first); "
            "no take-off speed is given")

    t_cap = math.sqrt(liq.lc / g)
    R = float(np.max(law.element_sizes)) if len(law.element_sizes) else 0.0
    t_wave = math.sqrt(liq.rho * R**3 / liq.sigma) if R > 0 else 0.0
    if T < t_cap:
        warnings.append(
            f"push time {T * 1e3:.3g} ms is shorter than the capillary time √(l_c/g) = {t_cap * 1e3:.3g} ms: the "
            "meniscus is not quasi-static and dynamic meniscus forces (not modelled) change the limit by an "
            "unknown amount")
    if T < t_wave:
        warnings.append(
            f"push time {T * 1e3:.3g} ms is shorter than the capillary-wave time of the legs √(ρR³/σ) = "
            f"{t_wave * 1e3:.3g} ms: not even the meniscus at the leg follows the push")
    we = liq.rho * u_leg**2 * R / liq.sigma if (R > 0 and u_leg is not None) else None
    if profile == "constant":
        warnings.append("a constant push starts as a step: the legs must sink from their resting depth to the push "
                        "depth at once; the quasi-static law holds only if they get there well within the capillary "
                        "time (use the half-sine profile for a smooth push)")
    if we is not None and we > 1.0:
        warnings.append(f"leg speed {u_leg:.3g} m/s gives a Weber number ρU²R/σ = {we:.3g} > 1: inertia can break "
                        "the meniscus earlier than the static limit")
    from ._device import limit_notes

    warnings.extend(limit_notes(law))
    warnings.append("jump height is v²/(2g) of the centre of mass with air drag neglected")
    v_take = None if breaks else v_off
    res = JumpResult(
        profile=profile, push_time=Q_(T, "s"),
        max_takeoff_speed=Q_(v_max, "m/s"), max_jump_height=Q_(v_max**2 / (2 * g), "m"),
        takeoff_speed=None if v_take is None else Q_(v_take, "m/s"),
        jump_height=None if v_take is None else Q_(v_take**2 / (2 * g), "m"),
        breaks_surface=breaks, break_time=None if t_break is None else Q_(t_break, "s"),
        peak_force=Q_(peak, "N"), peak_push_force=Q_(float(P.max()), "N"),
        limit_force=Q_(Flim, "N"), weight=Q_(W, "N"), body_weight=Q_(Wb, "N"),
        first_to_fail=law.first_to_fail,
        leg_stroke=Q_(stroke, "m"), leg_depth_change=Q_(float(z.max() - z_rest), "m"),
        max_leg_speed=None if u_leg is None else Q_(u_leg, "m/s"), leg_weber_number=we,
        capillary_time=Q_(t_cap, "s"), leg_wave_time=Q_(t_wave, "s"),
        time=t, meniscus_force=F, leg_depth=z, body_speed=v_b,
        warnings=tuple(warnings), cautions=tuple(liq.cautions),
    )
    return {"result": res, "u_leg": u_leg, "v_take": v_take, "v_max": v_max}
