"""Whole devices: static equilibrium, capacity, first element to give way, tilt stiffness.

:func:`solve_device` takes a :class:`~floatcalc.device.design.Design` (or a path to a design
file) and an optional payload, builds each element's force–depth law once (vectorised, through
the element adapters of :mod:`floatcalc.device.elements`), and solves heave, pitch and roll with
:mod:`floatcalc.core.equilibrium` in scaled variables.

.. math::

    \\sum_j F_j(e_j) = W,\\quad \\sum_j F_j x_j = W x_G,\\quad \\sum_j F_j y_j = W y_G,\\qquad
    e_j = z + x_j\\tan\\vartheta + y_j\\tan\\varphi + o_j - s_j

with s_j the depression of the surface at point j by its neighbours' linearised menisci
(superposed, ∇²h = h/l_c²). Pitch ϑ is positive when the +x side goes down, roll φ when the +y
side goes down. Elements within 2.5 l_c of each other are solved together by the interaction
model (:mod:`floatcalc.device.interact`): their tables are scaled by its shielding factors, and
a rod takes no superposed depression from a member of its cluster within that reach (the solved
meniscus has it; :meth:`Device.solved_pairs`). Checked: parallel rods against the exact shared
meniscus, and the tilted twelve-leg skimmer at its capacity against the solved meniscus of all
its legs at the same depths (+0.3 %; tests/reference/test_device_neighbours.py).

Validity: rigid device, small tilts (a warning above 10°), static loads, clean liquid; near each
element its own nonlinear law, between elements farther apart than 2.5 l_c superposition of
linearised menisci; close round elements keep superposition (a warning gives its error).

References
----------
.. [1] D. Vella, D.-G. Lee, H.-Y. Kim, Langmuir 22, 5979 (2006) (rod law, pairs of rods).
.. [2] J. B. Keller, Phys. Fluids 10, 3009 (1998) (meniscus force = displaced liquid weight).
.. [3] J. W. M. Bush, D. L. Hu, Annu. Rev. Fluid Mech. 38, 339 (2006) (Baudoin number).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from pathlib import Path
from typing import Any

import numpy as np

from ..core._threads import single_blas_thread
from ..errors import ConvergenceError, input_error
from ..results import Result, field, qfield
from ..units import Q_
from ..design import Design, load_design
from ..dimensionless import baudoin
from ..elements import get_kind
from .assess import cautions_for
from .geometry import convex_hull, inside_convex, polygons_overlap

REFERENCES = (
    "Vella, Lee & Kim, Langmuir 22, 5979 (2006): 2D rod law and pairs of rods",
    "Keller, Phys. Fluids 10, 3009 (1998): meniscus force equals displaced liquid weight",
    "Bush & Hu, Annu. Rev. Fluid Mech. 38, 339 (2006): Baudoin number",
)
TILT_WARN_DEG = 10.0


@dataclass(frozen=True)
class Device:
    """A design with its element models built for its liquid (SI arrays)."""

    design: Design
    models: tuple
    names: tuple
    #: device-level warnings of the model (shared menisci of close elements)
    notes: tuple = ()
    #: shielding factor of each element (its limit with neighbours over its table's limit)
    shielding: tuple = ()
    #: clusters solved together by the interaction model (element indices): a rod takes no
    #: superposition coupling from a member within reach (device.interact: the solved meniscus
    #: has it)
    groups: tuple = ()

    @property
    def liquid(self):
        return self.design.liquid

    @classmethod
    def from_design(cls, design: Design | str | Path, shielding=None, *, superposition_only: bool = False) -> "Device":
        """The device of a design; ``shielding`` reuses known shielding factors (one per
        element, e.g. those of the nominal design in a study) instead of solving them.
        ``superposition_only`` builds the previous model for comparison (benchmarks): no
        shielding, superposed linear menisci between all elements."""
        if isinstance(design, Device):
            return design
        if not isinstance(design, Design):
            if not isinstance(design, (str, Path)):
                raise input_error("design", "must be a Design (from load_design), a Device or a path",
                                  type(design).__name__)
            design = load_design(design)
        liq = design.liquid
        models = []
        names = []
        for p in design.elements:
            models.append(get_kind(p["kind"]).model(p, liq))
            names.append(p["name"])
        from .geometry import near_pairs

        for i, j in near_pairs([m.footprint for m in models]):
            if polygons_overlap(models[i].footprint, models[j].footprint):
                raise input_error(f"{_path(design, i)} and {_path(design, j)}",
                                      "footprints overlap; move or turn one of them, or set a larger "
                                      "layout_radius or spacing", f"'{names[i]}' and '{names[j]}'")
        from .interact import shielding as _shield
        from .interact import solved_groups

        shielding_given, shielding = shielding, _shield
        kinds = [p["kind"] for p in design.elements]
        groups: list = []
        if superposition_only:
            factors, notes = np.ones(len(models)), []
        elif shielding_given is None:
            factors, notes = shielding(models, kinds, liq, names, groups_out=groups)
        else:
            factors, notes = np.asarray(shielding_given, dtype=float), []
            groups = solved_groups(models, kinds, liq.lc)
        for m, f in zip(models, factors):
            if f < 1.0:
                m.force = m.force * f
        hull = convex_hull(np.vstack([m.footprint for m in models]))
        xg, yg = design.body["centre_of_mass"]
        if not inside_convex(hull, (xg, yg)):
            raise input_error("body.centre_of_mass", "must lie inside the support polygon (the convex "
                              "outline of all elements)", f"[{xg * 1e3:.4g} mm, {yg * 1e3:.4g} mm]")
        return cls(design=design, models=tuple(models), names=tuple(names), notes=tuple(notes),
                   shielding=tuple(float(f) for f in factors), groups=tuple(tuple(g) for g in groups))

    # -- numeric core input -------------------------------------------------------------
    def support(self):
        """Scaled :class:`~floatcalc.core.equilibrium.Support` of all force points."""
        from ..core.equilibrium import Support

        lc, s = self.liquid.lc, self.liquid.sigma
        pts = np.vstack([m.points for m in self.models]) / lc
        owner = np.concatenate([np.full(len(m.points), i) for i, m in enumerate(self.models)])
        C = np.zeros((len(pts), len(self.models)))
        for e, m in enumerate(self.models):
            f = m.field(pts[:, 0] * lc, pts[:, 1] * lc)
            f = np.where(owner == e, 0.0, f)
            C[:, e] = f
        pairs = self.solved_pairs()
        if pairs.any():  # the solved meniscus replaces superposition between close cluster members
            C[pairs[owner]] = 0.0
        depth, force, contact = _common_tables(self.models)
        return Support(
            x=pts[:, 0], y=pts[:, 1],
            offset=np.concatenate([m.offsets for m in self.models]) / lc,
            depth=depth / lc,
            force=force / (s * lc),
            contact=contact / lc,
            owner=owner, coupling=C,
        )

    def solved_pairs(self) -> np.ndarray:
        """(E, E) bool: rod i takes no superposition coupling from element e (both in one
        cluster solved by the interaction model, footprints within its reach)."""
        n = len(self.models)
        out = np.zeros((n, n), dtype=bool)
        if not self.groups:
            return out
        cached = self.__dict__.get("_pairs")
        if cached is not None:
            return cached.copy()
        from .interact import REACH_LC, close_pairs

        member = np.full(n, -1)
        for k, g in enumerate(self.groups):
            member[list(g)] = k
        rod = np.array([p["kind"] == "rod" for p in self.design.elements])
        for i, j in close_pairs([m.footprint for m in self.models], REACH_LC * self.liquid.lc):
            if member[i] >= 0 and member[i] == member[j]:
                out[i, j] = rod[i]
                out[j, i] = rod[j]
        object.__setattr__(self, "_pairs", out)   # geometry only: computed once per device
        return out.copy()

    @property
    def weight(self) -> float:
        """Weight of body and elements [N]."""
        return self.design.body["mass"] * self.liquid.g + sum(m.own_weight for m in self.models)

    @property
    def centre_of_mass(self) -> tuple[float, float]:
        """Plan centre of mass of body and elements together [m]."""
        g = self.liquid.g
        wb = self.design.body["mass"] * g
        xb, yb = self.design.body["centre_of_mass"]
        wx, wy, w = wb * xb, wb * yb, wb
        for m in self.models:
            c = m.points.mean(axis=0)
            wx += m.own_weight * c[0]
            wy += m.own_weight * c[1]
            w += m.own_weight
        if w <= 0:
            return xb, yb
        return wx / w, wy / w

    @property
    def perimeter(self) -> float:
        """Total contact perimeter [m] of all elements at their limits (the Baudoin number's P)."""
        return float(sum(m.perimeter for m in self.models))

    def meniscus_depth(self, x, y, contact_depths) -> np.ndarray:
        """Superposed linearised meniscus depth [m] at plan points, given each element's contact depth [m]."""
        out = np.zeros(np.broadcast(np.asarray(x), np.asarray(y)).shape)
        for m, h in zip(self.models, contact_depths):
            out = out + h * m.field(x, y)
        return out


def _path(design: Design, i: int) -> str:
    p = design.elements[i]
    g = p.get("group", i)
    return f"elements[{g}]" + (f" (copy {p.get('index', 0) + 1})" if p.get("count", 1) > 1 else "")


@dataclass(frozen=True, kw_only=True)
class ElementState(Result):
    """One element at equilibrium.

    ``utilisation`` is the element's force over its limit force (0–1; 1: at its limit);
    ``broken`` says whether it has broken through at this load, ``breakthrough_order`` (1, 2,
    …) and ``breakthrough_payload`` when it does as the payload grows (None: it never does
    before the device sinks).
    """

    name: str = field()
    kind: str = field()
    force: Any = qfield("N")
    depth: Any = qfield("m")
    share: float = field(default=0.0)
    utilisation: float = field(default=0.0)
    limit_force: Any = qfield("N")
    limit_depth: Any = qfield("m")
    depth_to_limit: Any = qfield("m")
    own_weight: Any = qfield("N")
    contact_perimeter: Any = qfield("m")
    broken: bool = field(default=False)
    breakthrough_order: int | None = field(default=None)
    breakthrough_payload: Any = qfield("N", default=None)
    warnings: tuple[str, ...] = field(default=())


@dataclass(frozen=True, kw_only=True)
class DeviceResult(Result):
    """Result of :func:`solve_device` (see :meth:`to_dict` for the JSON layout).

    Vocabulary (README glossary): ``weight`` is the device's own weight (body and elements);
    ``applied_payload`` the payload put on it; ``load`` = weight + payload; ``capacity`` the
    largest load it carries with every element intact; ``max_payload`` = capacity − weight
    (payload at the centre of mass, or where it sits); ``sinking_payload`` the largest payload
    before it sinks, elements breaking through one by one; ``safety_factor`` = capacity / load
    (achieved), against ``required_safety_factor``; ``verdict`` one of :data:`VERDICTS`.
    """

    description: str = field(default="")
    verdict: str = field(default="floats")
    below_required_safety_factor: bool = field(default=False)
    weight: Any = qfield("N")
    applied_payload: Any = qfield("N")
    load: Any = qfield("N")
    capacity: Any = qfield("N")
    safety_factor: float = field(default=0.0)
    required_safety_factor: float = field(default=1.0)
    shortfall: Any = qfield("N", default=None)
    heave: Any = qfield("m")
    pitch: Any = qfield("deg")
    roll: Any = qfield("deg")
    elements: tuple = field(default=())
    max_payload: Any = qfield("N")
    max_payload_mass: Any = qfield("kg")
    max_payload_position: Any = qfield("m")
    sinking_payload: Any = qfield("N")
    first_to_fail: str = field(default="")
    broken_through: tuple = field(default=())
    best_payload: Any = qfield("N")
    best_payload_position: Any = qfield("m")
    stiffness_heave: Any = qfield("N/m")
    stiffness_pitch: Any = qfield("N*m/rad")
    stiffness_roll: Any = qfield("N*m/rad")
    tipping: tuple = field(default=())
    tipping_payload: Any = qfield("N")
    baudoin_number: float = field(default=0.0)
    contact_perimeter: Any = qfield("m")
    device: Device | None = field(default=None, json=False)
    contact_depths: Any = field(default=None, json=False)
    warnings: tuple[str, ...] = field(default=())
    cautions: tuple[str, ...] = field(default=())
    references: tuple[str, ...] = field(default=REFERENCES)

    @property
    def payload(self):
        """The applied payload (quantity); the JSON key is ``applied_payload_N``."""
        return self.applied_payload

    def to_dict(self) -> dict[str, Any]:
        d = super().to_dict()
        d["equilibrium"] = {"heave_m": d.pop("heave_m"), "pitch_deg": d.pop("pitch_deg"),
                            "roll_deg": d.pop("roll_deg")}
        d["tipping"] = [dict(t) for t in self.tipping]
        d["broken_through"] = list(self.broken_through)
        if self.device is not None:
            d["liquid"] = self.device.liquid.summary()
        return d


def _common_tables(models):
    """Stack every force point's force–depth table on a common number of points.

    Elements of different size or coating have tables of different length (each is cut at its
    own first contact). :class:`~floatcalc.core.equilibrium.Support` resamples every row onto a
    uniform grid of its own depth range and interpolates linearly, so resampling each table here
    onto that same kind of grid, with as many points as the longest table, changes nothing but
    the array shape.
    """
    rows = [(d, f, h) for m in models for d, f, h in zip(np.atleast_2d(m.depth), np.atleast_2d(m.force),
                                                          np.atleast_2d(m.contact))]
    n = max(len(d) for d, _, _ in rows)
    out_d, out_f, out_h = [], [], []
    for d, f, h in rows:
        if len(d) == n:
            out_d.append(d), out_f.append(f), out_h.append(h)
            continue
        g = np.linspace(d[0], d[-1], n)
        out_d.append(g), out_f.append(np.interp(g, d, f)), out_h.append(np.interp(g, d, h))
    return np.vstack(out_d), np.vstack(out_f), np.vstack(out_h)


def _as_device(design) -> Device:
    return Device.from_design(design)


@single_blas_thread
def solve_device(design, payload: Any | None = None, payload_position: Any | None = None, *,
                 safety_factor: Any | None = None, placement: bool = True) -> DeviceResult:
    """Equilibrium, capacity, progressive failure and verdict of a device.

    Parameters
    ----------
    design : Design, Device, or path of a design file
    payload : [kg], optional
        Extra mass (e.g. ``"0.5 g"``); default the design file's ``[load] payload``.
    payload_position : pair of [m], optional
        Plan position of the payload, e.g. ``("3 mm", "0 mm")``; default the file's
        ``payload_position``, else the centre of mass.
    safety_factor : float, optional
        Required safety factor (default the file's, else 1).
    placement : bool
        Also search the best payload position and the tipping offsets (about half the cost of a
        solve); ``False`` leaves ``best_payload`` at the centre-of-mass value and ``tipping``
        empty (the page, which shows neither).

    Returns
    -------
    DeviceResult
        ``verdict`` is one of :data:`floatcalc.device.assess.VERDICTS`: ``"floats"`` (every
        element intact), ``"floats with elements broken through"``, ``"capsizes"`` (negative
        tilt stiffness: the centre of mass is too high) or ``"sinks"`` (no equilibrium: the
        shortfall is reported and the state shown is the last one before sinking).
        ``below_required_safety_factor`` flags a safety factor under the required one.

    Examples
    --------
    >>> from floatcalc.design import example
    >>> r = solve_device(example("skimmer"))
    >>> r.verdict, r.max_payload.to("mN").magnitude > 0
    ('floats', True)
    """
    from ..core import equilibrium as eq
    from ..units import to_si
    from .assess import safety_factor as check_sf
    from .assess import verdict as decide

    if not isinstance(placement, (bool, np.bool_)):
        raise input_error("placement", "must be True or False", repr(placement)[:80])
    if payload_position is not None and (isinstance(payload_position, (str, bytes, dict))
                                         or not hasattr(payload_position, "__len__")
                                         or len(payload_position) != 2):
        raise input_error("payload_position", "must be two lengths (x, y), e.g. (\"3 mm\", \"0 mm\")",
                          repr(payload_position)[:80])
    dev = _as_device(design)
    liq = dev.liquid
    lc, s, g = liq.lc, liq.sigma, liq.g
    fs = s * lc  # force scale
    sup = dev.support()
    W = dev.weight
    xg, yg = dev.centre_of_mass
    dload = dev.design.load
    mp = dload["payload"] if payload is None else to_si(payload, "mass", "payload")
    if mp < 0 or mp > 100.0:
        raise input_error("payload", "must be from 0 to 100 kg", f"{mp * 1e3:g} g")
    sf_req = dload["safety_factor"] if safety_factor is None else check_sf(safety_factor)
    pos = dload["payload_position"] if payload_position is None else payload_position
    if pos is None:
        px, py = xg, yg
    else:
        try:
            px, py = (c if isinstance(c, float) and payload_position is None else to_si(c, "length", "payload_position")
                      for c in pos)
        except TypeError:
            raise input_error("payload_position", "must be two lengths (x, y)", repr(pos)[:80]) from None
        if not (abs(px) <= 1.0 and abs(py) <= 1.0):
            raise input_error("payload_position", "must be within 1 m of the origin", f"({px:g} m, {py:g} m)")
    at_com = pos is None
    P = mp * g
    Ws, xs, ys, pxs, pys = W / fs, xg / lc, yg / lc, px / lc, py / lc

    first = eq.capacity(sup, Ws, xs, ys, pxs, pys)
    Pcap, u_cap, e_cap, j_first = first
    broken_force = np.array([m.broken_force for m in dev.models]) / fs
    steps, sinking = eq.progressive(sup, Ws, xs, ys, pxs, pys, broken_force, first=first)
    order = {int(el): (k + 1, lvl) for k, (el, lvl) in enumerate(steps)}
    first_name = dev.names[int(sup.owner[j_first])]
    broken_now = [el for el, lvl in steps if lvl < P / fs - 1e-12 * max(1.0, abs(lvl))]
    warnings: list[str] = []

    # the state to show: at the payload (elements broken through at it), or just before sinking
    sinks = P / fs > sinking
    load_shown = min(P / fs, sinking) if sinks else P / fs
    if sinks:
        broken_now = [el for el, lvl in steps if lvl < sinking - 1e-12 * max(1.0, abs(sinking))]
    cur = eq.with_broken(sup, broken_now, broken_force)
    Wt = Ws + max(load_shown, -Ws * (1 - 1e-9))
    xt = (Ws * xs + load_shown * pxs) / Wt
    yt = (Ws * ys + load_shown * pys) / Wt
    try:
        u, e = eq.solve(cur, Wt, xt, yt)
    except ConvergenceError:
        u, e = u_cap, e_cap
    _, e, F, h = eq.point_state(cur, *u)
    shortfall = (P - sinking * fs) if sinks else None
    if sinks:
        warnings.append("the payload is beyond what the device carries: the state shown is the last one before "
                        "it sinks")

    # per element
    states = []
    n_el = len(dev.models)
    Fe = np.bincount(sup.owner, weights=F, minlength=n_el)
    counts = np.bincount(sup.owner, minlength=n_el)
    contact_depths = np.bincount(sup.owner, weights=h, minlength=n_el) / counts
    for i, m in enumerate(dev.models):
        sel = sup.owner == i
        dmax = float(np.max(e[sel])) * lc
        dm = float(np.min(sup.limit_depth[sel] - e[sel])) * lc
        flim = m.limit_force
        k, lvl = order.get(i, (None, None))
        states.append(ElementState(
            name=dev.names[i], kind=dev.design.elements[i]["kind"],
            force=Q_(Fe[i] * fs, "N"), depth=Q_(dmax, "m"),
            share=float(Fe[i] / max(F.sum(), 1e-300)),
            utilisation=float(Fe[i] * fs / flim) if flim > 0 else 0.0, limit_force=Q_(flim, "N"),
            limit_depth=Q_(m.limit_depth, "m"), depth_to_limit=Q_(dm, "m"),
            own_weight=Q_(m.own_weight, "N"), contact_perimeter=Q_(m.perimeter, "m"),
            broken=i in broken_now, breakthrough_order=k,
            breakthrough_payload=None if lvl is None or lvl > sinking + 1e-12 else Q_(lvl * fs, "N"),
            warnings=tuple(m.warnings),
        ))
        for w in m.warnings:
            warnings.append(f"{dev.names[i]}: {w}")

    # best place for a payload, stiffness, tipping (of the intact device)
    if placement:
        Pbest, bx, by = eq.best_capacity(sup, Ws, xs, ys, at_centre=first if at_com else None)
    else:
        Pbest, bx, by = Pcap, pxs, pys
    kz, kp, kq = eq.stiffness(cur, u, xt, yt)
    zg = dev.design.body.get("centre_of_mass_height", 0.0) / lc
    kp -= Wt * zg
    kq -= Wt * zg
    tol = 1e-9 * max(1.0, Wt)  # a line of supports is neutral about its own axis, not capsizing
    capsizes = (kp < -tol or kq < -tol) and not sinks
    if capsizes:
        warnings.append("negative restoring stiffness in tilt: the centre of mass is too high, the device "
                        "capsizes")
    P_ref = P / fs if (not sinks and not broken_now and P > 0) else 0.5 * max(Pcap, 0.0)
    tipping = []
    if P_ref > 0 and placement:
        span = float(np.max(np.hypot(sup.x - xs, sup.y - ys))) * 2.0
        at_zero: dict = {}   # the state at zero offset, the same in every direction
        for label, (dx, dy) in (("+x", (1, 0)), ("-x", (-1, 0)), ("+y", (0, 1)), ("-y", (0, -1))):
            t = _tip_offset(eq, sup, Ws, xs, ys, P_ref, dx, dy, span, at_zero)
            tipping.append({"direction": label,
                            "offset_m": None if t is None else t * lc,
                            "position_m": None if t is None else [(xs + t * dx) * lc, (ys + t * dy) * lc]})
    pitch = math.degrees(math.atan(u[1]))
    roll = math.degrees(math.atan(u[2]))
    if max(abs(pitch), abs(roll)) > TILT_WARN_DEG:
        warnings.append(f"tilt above {TILT_WARN_DEG:g}°: small-angle moment arms lose accuracy")
    warnings += list(dev.notes)
    capacity = W + Pcap * fs
    load = W + P
    sf = capacity / load if load > 0 else math.inf
    word = decide(P, Pcap * fs, sinking * fs, capsizes)
    perim = dev.perimeter
    return DeviceResult(
        description=dev.design.description, verdict=word,
        below_required_safety_factor=bool(sf < sf_req),
        weight=Q_(W, "N"), applied_payload=Q_(P, "N"), load=Q_(load, "N"), capacity=Q_(capacity, "N"),
        safety_factor=float(sf), required_safety_factor=float(sf_req),
        shortfall=None if shortfall is None else Q_(shortfall, "N"),
        heave=Q_(u[0] * lc, "m"), pitch=Q_(pitch, "deg"), roll=Q_(roll, "deg"),
        elements=tuple(states),
        max_payload=Q_(max(Pcap, 0.0) * fs, "N"), max_payload_mass=Q_(max(Pcap, 0.0) * fs / g, "kg"),
        max_payload_position=Q_(np.array([px, py]), "m"),
        sinking_payload=Q_(max(sinking, 0.0) * fs, "N"),
        first_to_fail=first_name, broken_through=tuple(dev.names[i] for i in broken_now),
        best_payload=Q_(max(Pbest, 0.0) * fs, "N"), best_payload_position=Q_(np.array([bx, by]) * lc, "m"),
        stiffness_heave=Q_(kz * s, "N/m"), stiffness_pitch=Q_(kp * s * lc * lc, "N*m/rad"),
        stiffness_roll=Q_(kq * s * lc * lc, "N*m/rad"),
        tipping=tuple(tipping), tipping_payload=Q_(P_ref * fs, "N"),
        baudoin_number=baudoin(load, s, perim), contact_perimeter=Q_(perim, "m"),
        device=dev, contact_depths=contact_depths * lc,
        warnings=tuple(warnings), cautions=cautions_for(dev.design),
    )


def _tip_offset(eq, sup, Ws, xs, ys, P, dx, dy, span, at_zero=None):
    """Offset [l_c] along (dx, dy) from the centre of mass where payload P first fails an element.

    The margin g(t) = max_j (e_j − e_lim,j) rises with the offset t; its root is found by
    :func:`floatcalc.core.equilibrium.newton_crossing`, the slope from the equilibrium's
    sensitivity (moving P by dt changes the balance's moments by P (dx, dy) dt), each step at
    most twice the offset reached (far past the crossing the device has no equilibrium, and
    finding that out costs a dozen solves), to a Newton step under 1e-5 l_c (tens of
    nanometres). ``None`` if no element fails within ``span``.

    ``at_zero`` (a dict shared by the directions) keeps the margin, slope and state at zero
    offset: the state is the same in every direction."""
    last = [None]
    Wt = Ws + P

    def state(t):
        """Margin, its slope (None where unknown; margin 1 where no balance exists), the
        equilibrium and the critical point at offset t."""
        args = (sup, Wt, (Ws * xs + P * (xs + t * dx)) / Wt, (Ws * ys + P * (ys + t * dy)) / Wt)
        try:
            u, e = eq.solve(*args, start=last[0])
        except ConvergenceError:
            try:
                u, e = eq.solve(*args)
            except ConvergenceError:
                return 1.0, None, None, None
        last[0] = u
        over = e - sup.limit_depth
        j = int(np.argmax(over))
        return float(over[j]), slope(u, j), u, j

    def slope(u, j):
        rates = eq.depth_rates(sup, u, (0.0, P * dx, P * dy))
        return None if rates is None else float(rates[j])

    if at_zero:
        g0, u0, j0 = at_zero["g"], at_zero["u"], at_zero["j"]
        last[0] = u0
        s0 = None if u0 is None else slope(u0, j0)
    else:
        g0, s0, u0, j0 = state(0.0)
        if at_zero is not None:
            at_zero.update(g=g0, u=u0, j=j0)
    if g0 >= 0:
        return 0.0
    # the load's line of action cannot pass the outermost force point along (dx, dy): beyond
    # it no balance exists (a line of supports tips at once across itself)
    reach = float(np.max((sup.x - xs) * dx + (sup.y - ys) * dy)) * Wt / P
    if reach <= 1e-9:
        return 0.0
    hi = min(span, reach)
    t, _, _ = eq.newton_crossing(lambda t: state(t)[:2], g0, s0, xtol=1e-5, hi=hi,
                                 probe=lambda a, ga: a + hi / 8.0,
                                 cap=lambda a, t: min(t, max(2.0 * a, hi / 8.0)))
    if t is None and hi < span:   # every element holds up to the edge: it tips there
        return hi
    return t
