"""The one place where :mod:`floatcalc.motion` reads a device: its quasi-static heave law.

Everything the jump and stroke models need of a design goes through :func:`heave_law` (and,
for a textured coating that floods, :func:`with_coating`, which rebuilds the design with another
coating and hands it back to :func:`heave_law`). When the device model changes, only this
module has to follow.

Today the law is built from :class:`floatcalc.device.Device`: the device is held level and
pushed down in heave; at each heave z the effective depths, forces and contact depths of every
force point come from :func:`floatcalc.core.equilibrium.point_state` (neighbours' menisci
superposed), and the total force is their sum. The law ends at the first heave at which any
force point reaches its own limit depth (``Support.limit_depth``): the first element to break
through. Forces there are in σ l_c and depths in l_c; they are scaled back to SI here (force
scale σ l_c, length scale l_c, as in :func:`floatcalc.device.solve.solve_device`).
"""

from __future__ import annotations

from typing import Any, NamedTuple

import numpy as np

#: Number of heave samples from first contact to the limit.
LAW_POINTS = 401


class HeaveLaw(NamedTuple):
    """Quasi-static force–depth law of a level device (SI).

    Attributes
    ----------
    depth : ndarray [m]
        Heave (depth of the device's reference plane below the undisturbed surface), increasing,
        from first contact to ``limit_depth``.
    force : ndarray [N]
        Total upward force of the liquid on all elements at each heave (rises with depth).
    limit_depth : float [m]
        Heave at which the first element reaches its limit depth (breaks through).
    limit_force : float [N]
        Total force at ``limit_depth``: the largest vertical force the device can take, the
        smallest of the level device's limit, the static capacity with the load at the centre of
        mass (which lets the device tilt) and the contact-line bound; the law is cut there.
    weight : float [N]
        Weight of body and legs.
    body_weight : float [N]
        Weight of the body alone (without the elements).
    liquid : Liquid
    first_to_fail : str
        Name of the element that reaches its limit first.
    element_names : tuple of str
    element_depths : ndarray [m]
        Depth of each element's deepest point below the undisturbed surface at the limit (for
        the hydrostatic pressure there).
    element_sizes : ndarray [m]
        Cross-section radius of each element (wire or foot radius; for the Weber number).
    element_perimeters : ndarray [m]
        Contact perimeter of each element at its limit.
    element_angles : ndarray [rad]
        Effective advancing contact angle of each element (after its texture model).
    level_limit_force : float [N]
        Limit of the level device (first element at its limit depth), before the caps below.
    capacity_at_centre_of_mass : float [N]
        Weight plus the largest payload at the centre of mass (static, the device may tilt).
    contact_line_bound : float [N]
        PHYSICS.md bound at the level limit: Σ σ P_i + ρ g D_i A_i (contact line P_i, deepest
        depth D_i, plan area A_i of each element). ``limit_force`` never exceeds it.
    element_force : ndarray (elements, samples) [N]
        Force of each element at each heave of ``depth`` (level device); the columns sum to
        ``force`` (before the monotone nudge).
    """

    depth: np.ndarray
    force: np.ndarray
    limit_depth: float
    limit_force: float
    weight: float
    body_weight: float
    liquid: Any
    first_to_fail: str
    element_names: tuple
    element_depths: np.ndarray
    element_sizes: np.ndarray
    element_perimeters: np.ndarray
    element_angles: np.ndarray
    level_limit_force: float
    element_force: np.ndarray
    capacity_at_centre_of_mass: float
    contact_line_bound: float


def heave_law(design) -> HeaveLaw:
    """Quasi-static total force against heave of a level device, up to the first breakthrough.

    Parameters
    ----------
    design : Design or path of a design file

    Returns
    -------
    HeaveLaw
        ``depth`` [m], ``force`` [N], ``limit_depth`` [m], ``limit_force`` [N], ``weight`` [N]
        and the per-element data listed in :class:`HeaveLaw`.

    Examples
    --------
    >>> from floatcalc.device import example
    >>> law = heave_law(example("skimmer"))
    >>> bool(law.limit_force > law.weight), bool(np.all(np.diff(law.depth) > 0))
    (True, True)
    """
    from scipy.optimize import brentq

    from ..core.equilibrium import capacity, point_state
    from ..device import Device
    from ..device.elements import effective_angle

    dev = Device.from_design(as_design(design))
    liq = dev.liquid
    lc, s = liq.lc, liq.sigma
    fs = s * lc
    sup = dev.support()
    lim = sup.limit_depth

    def margin(z):
        _, e, _, _ = point_state(sup, z, 0.0, 0.0)
        return float(np.max(e - lim))

    # first contact: the shallowest heave at which a point reaches the start of its table
    z0 = float(np.min(sup.depth[:, 0] - sup.offset))
    hi = float(np.max(lim - sup.offset)) + 1.0
    lo = z0
    if margin(lo) >= 0.0:  # pragma: no cover - an element starts at its own limit
        z_lim = lo
    else:
        while margin(hi) < 0.0:  # pragma: no cover - coupling pulls the surface down strongly
            hi += 1.0
        z_lim = brentq(margin, lo, hi, xtol=1e-12, rtol=1e-12)
    z = np.linspace(z0, z_lim, LAW_POINTS)
    n_el = len(dev.models)

    def per_element(zs):
        return np.array([np.bincount(sup.owner, weights=point_state(sup, zz, 0.0, 0.0)[2], minlength=n_el)
                         for zz in zs]).T

    Fe = per_element(z)
    F = Fe.sum(axis=0)
    # The tables are piecewise linear; keep the law strictly monotone for inversion (a flat
    # step, e.g. before the last points touch, is nudged by a relative 1e-12, far below any
    # printed digit).
    F = np.maximum.accumulate(F)
    F = F + np.arange(len(F)) * 1e-12 * max(float(F[-1]), 1e-300)
    level_limit = float(F[-1])
    # Safe side (1): a push through an off-centre centre of mass tilts the device and an element
    # gives way earlier; take the static capacity at the centre of mass if it is smaller.
    W = dev.weight / fs
    xg, yg = (c / lc for c in dev.centre_of_mass)
    P, u_cap, _, j_cap = capacity(sup, W, xg, yg, xg, yg)
    cap = W + P
    # Safe side (2): the contact-line bound (PHYSICS.md): surface tension at most σ × contact
    # line, pressure at most ρ g × deepest depth × plan area, element by element.
    perim = np.array([m.perimeter for m in dev.models]) / lc
    area = np.array([_polygon_area(m.footprint) for m in dev.models]) / lc**2

    def bound_at(zz, d=None):
        d = point_state(sup, zz, 0.0, 0.0)[0] if d is None else d
        deep = np.array([float(np.max(d[sup.owner == i])) for i in range(n_el)])
        return float(np.sum(perim) + np.sum(np.maximum(deep, 0.0) * area))  # σ l_c (ρ g l_c³ = σ l_c)

    bound = bound_at(z_lim)
    final = min(level_limit, cap, bound)
    j_level = int(np.argmax(point_state(sup, z_lim, 0.0, 0.0)[1] - lim))
    if final < level_limit:
        if bound <= cap:  # the law crosses the bound B(z) (rising with depth) first: find where
            zb = brentq(lambda zz: point_state(sup, zz, 0.0, 0.0)[2].sum() - bound_at(zz), z0, z_lim,
                        xtol=1e-12) if point_state(sup, z0, 0.0, 0.0)[2].sum() < bound_at(z0) else z0
            final = min(float(point_state(sup, zb, 0.0, 0.0)[2].sum()), final) if zb > z0 else final
        def excess(zz):
            return point_state(sup, zz, 0.0, 0.0)[2].sum() - final

        # (final within rounding of the level law's end, e.g. a centred device whose capacity
        # is its level limit: excess(z_lim) may be a hair below zero; keep z_lim then)
        if excess(z0) >= 0.0:
            z_lim = z0
        elif excess(z_lim) > 0.0:
            z_lim = brentq(excess, z0, z_lim, xtol=1e-13)
        z = np.linspace(z0, z_lim, LAW_POINTS)
        Fe = per_element(z)
        F = np.maximum.accumulate(Fe.sum(axis=0))
        F = F + np.arange(len(F)) * 1e-12 * max(float(F[-1]), 1e-300)
    d_lim = point_state(sup, z_lim, 0.0, 0.0)[0]
    j = j_level
    if cap < level_limit and cap <= bound:
        d_lim = point_state(sup, *u_cap)[0]  # the tilted device at its capacity
        j = int(j_cap)
    # depth below the undisturbed surface (not the effective depth below the neighbours'
    # depressed surface): it sets the hydrostatic pressure at the element's lowest point
    el_depth = np.array([float(np.max(d_lim[sup.owner == i])) for i in range(n_el)]) * lc
    sizes = np.array([float(p.get("radius", p.get("wire_radius", 0.0)) or 0.0) for p in dev.design.legs])
    angles = np.array([effective_angle(p["coating"]["advancing"], p["coating"]) for p in dev.design.legs])
    return HeaveLaw(
        depth=z * lc, force=F * fs, limit_depth=float(z_lim * lc), limit_force=float(F[-1] * fs),
        weight=float(dev.weight), body_weight=float(dev.design.body["mass"] * liq.g), liquid=liq,
        first_to_fail=dev.names[int(sup.owner[j])], element_names=tuple(dev.names),
        element_depths=el_depth, element_sizes=sizes,
        element_perimeters=perim * lc, element_angles=angles,
        level_limit_force=level_limit * fs, element_force=Fe * fs,
        capacity_at_centre_of_mass=cap * fs, contact_line_bound=bound * fs,
    )


def _polygon_area(pts) -> float:
    """Area [m²] of a plan polygon (shoelace formula)."""
    x, y = np.asarray(pts, dtype=float).T
    return 0.5 * abs(float(np.dot(x, np.roll(y, -1)) - np.dot(y, np.roll(x, -1))))


def as_design(design):
    """A :class:`~floatcalc.device.Design` from a design or the path of a design file."""
    from ..device import Design, load_design

    return design if isinstance(design, Design) else load_design(design)


def intrinsic_angles(design) -> np.ndarray:
    """Advancing angle [rad] of each element's coating material, before any texture model."""
    return np.array([float(p["coating"]["advancing"]) for p in as_design(design).legs])


def with_coating(design, models):
    """The same design with each element's coating replaced by a texture model.

    ``models`` holds one ``(texture, value)`` per element (or a single pair for all):
    ``("wenzel", r)`` with roughness r, ``("cassie", f)`` with solid fraction f. Each element
    keeps its own advancing (and receding) angle as the intrinsic angle of its coating
    material. Roughness is capped at 10, the design-file limit (beyond, r cos θ is clipped to
    complete (non-)wetting anyway for |cos θ| ≥ 0.1).
    """
    import copy

    from ..device.design import design_from_data

    data = copy.deepcopy(as_design(design).data)
    if isinstance(models, tuple) and len(models) == 2 and isinstance(models[0], str):
        models = [models] * len(data["elements"])
    for leg, (texture, value) in zip(data["elements"], models):
        c = dict(leg["coating"])
        for key in ("roughness", "solid_fraction", "post_size", "pitch", "post_height"):
            c.pop(key, None)
        c["texture"] = texture
        if texture == "wenzel":
            c["roughness"] = float(min(max(value, 1.0), 10.0))
        elif texture == "cassie":
            c["solid_fraction"] = float(min(max(value, 1e-6), 1.0))
        leg["coating"] = c
    return design_from_data(data, "design")


def limit_notes(law: HeaveLaw) -> list[str]:
    """Warnings that say which cap set the law's limit force (see :class:`HeaveLaw`)."""
    notes = []
    model = min(law.level_limit_force, law.capacity_at_centre_of_mass)
    if law.capacity_at_centre_of_mass < law.level_limit_force * (1 - 1e-6) and \
            law.capacity_at_centre_of_mass <= law.contact_line_bound:
        notes.append("the centre of mass is off the centre of support: a push tilts the device, and the limit is its "
                     f"capacity at the centre of mass ({law.capacity_at_centre_of_mass * 1e3:.4g} mN instead of "
                     f"{law.level_limit_force * 1e3:.4g} mN level)")
    if law.limit_force < model * (1 - 1e-6) and law.contact_line_bound < model:
        notes.append(f"the device model's limit {model * 1e3:.4g} mN exceeds the contact-line bound (σ × contact line "
                     "+ ρ g × depth × plan area, PHYSICS.md) by "
                     f"{(model / law.limit_force - 1) * 100:.3g} %; the limit is capped at "
                     f"{law.limit_force * 1e3:.4g} mN (safe side; for rods the end-cap model is the likely cause)")
    return notes
