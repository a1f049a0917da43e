"""Least support mass (or fewest legs) of a set of long rod legs for a payload and safety factor.

Design variables: leg count n (whole number), radius R, wetted length L of each leg, and the
centre spacing S of a level row, each within bounds. Requirement (static, clean surface):

.. math::

    F_{max}(n, R, L, S) \\ge k\\, g\\, (M_p + m_s), \\qquad m_s = n \\rho_s \\pi R^2 L,

with k the safety factor, M_p the payload mass and m_s the mass of the legs. With the legs far
apart :math:`F_{max} = n L \\sigma f^*(R/l_c, \\theta)` (exact 2D rod law,
:mod:`floatcalc.core.rod2d`), so for given n and R the least length is explicit,

.. math:: L^*(R) = \\frac{k g M_p}{n\\,(\\sigma f^*(R/l_c,\\theta) - k \\rho_s g \\pi R^2)},

and the mass :math:`m_s(R) = n\\rho_s\\pi R^2 \\max(L^*, L_{min})` is a function of R alone.
It is minimised for every count by a vectorised log-spaced scan of R, a second scan around
the best point, and either :func:`scipy.optimize.minimize_scalar` (interior minimum) or
:func:`scipy.optimize.brentq` on :math:`L^*(R) = L_{max}` (minimum on the edge of the
feasible region). Counts are enumerated; ties in mass go to fewer legs.

Spacing: when spacing bounds are given and n > 1, the chosen design is re-evaluated with the
exact 2D meniscus of a level row of parallel rods (:mod:`floatcalc.core.parallel2d`) at a few
spacings in the bounds; the best spacing is kept and the length re-solved for it (the radius
stays the far-apart optimum, which is said in the notes). Without spacing bounds the legs are
taken far apart (≥ 4 l_c) and a note says so.

Validity: that of the rod model (long rigid rods, L ≳ 20 l_c, static, clean liquid). Frame
mass and the legs' end effects are not included.

References
----------
.. [1] D. Vella, D.-G. Lee, H.-Y. Kim, Langmuir 22, 5979 (2006).

Examples
--------
>>> r = optimise_rods("2 g", safety_factor=2, contact_angle="150 deg",
...                   radius=("0.1 mm", "0.5 mm"), length=("10 mm", "60 mm"), count=(1, 12))
>>> r.count, round(r.radius.to("mm").magnitude, 3), round(r.length.to("mm").magnitude, 2)
(5, 0.1, 53.22)
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

import numpy as np

from .. import _validate as v
from ..core import rod2d
from ..errors import input_error
from ..liquids import Liquid
from ..results import Result, field, qfield
from ..units import Q_
from .models import STEEL

SCAN = 401
REFERENCES = ("Vella, Lee & Kim, Langmuir 22, 5979 (2006): 2D rod law and pairs of rods",)


@dataclass(frozen=True, kw_only=True)
class OptimiseResult(Result):
    """Best design found by :func:`optimise_rods` and why it is where it is."""

    objective: str = field(default="mass")
    count: int = field(default=1)
    radius: Any = qfield("m")
    length: Any = qfield("m")
    spacing: Any = qfield("m", default=None)
    support_mass: Any = qfield("kg")
    payload_mass: Any = qfield("kg")
    max_force: Any = qfield("N")
    total_load: Any = qfield("N")
    safety_factor: float = field(default=0.0)
    required_safety_factor: float = field(default=1.0)
    spare_payload: Any = qfield("kg")
    binding: tuple[str, ...] = field(default=())
    explanation: tuple[str, ...] = field(default=())
    per_count: tuple[dict, ...] = field(default=())
    warnings: tuple[str, ...] = field(default=())
    cautions: tuple[str, ...] = field(default=())
    references: tuple[str, ...] = field(default=REFERENCES)


def _bounds(value: Any, kind: str, name: str) -> tuple[float, float]:
    if isinstance(value, str) and ":" in value:
        value = tuple(value.split(":"))
    if not isinstance(value, (tuple, list)) or len(value) != 2:
        raise input_error(name, "must be a pair LOW:HIGH, e.g. 0.05mm:0.5mm", repr(value))
    if kind == "count":
        lo, hi = (v.count(x, name) for x in value)
    else:
        lo, hi = (v.length(x, name) for x in value)
    if lo > hi:
        raise input_error(name, "lower bound must not exceed upper bound", f"{value[0]}:{value[1]}")
    return lo, hi


class _Problem:
    """Scaled pieces of the least-mass problem for one angle, liquid and material."""

    def __init__(self, Mp, k, theta, liq, rho_s, L_lo, L_hi):
        self.Mp, self.k, self.theta, self.liq, self.rho_s = Mp, k, theta, liq, rho_s
        self.L_lo, self.L_hi = L_lo, L_hi
        self.g = liq.g

    def q(self, R):
        """Net capacity per unit total leg length after the legs' own weight × k [N/m]."""
        f = rod2d.limit_force(np.asarray(R) / self.liq.lc, self.theta)["force"]
        return self.liq.sigma * f - self.k * self.rho_s * self.g * math.pi * np.asarray(R) ** 2

    def lstar(self, R, n, factor=1.0):
        q = self.q(R) if factor == 1.0 else (self.q(R) + self.k * self.rho_s * self.g * math.pi * np.asarray(R) ** 2) * factor \
            - self.k * self.rho_s * self.g * math.pi * np.asarray(R) ** 2
        with np.errstate(divide="ignore", invalid="ignore"):
            return np.where(q > 0, self.k * self.g * self.Mp / (n * np.where(q > 0, q, 1.0)), np.inf)

    def mass(self, R, n):
        Ls = self.lstar(R, n)
        L = np.maximum(Ls, self.L_lo)
        m = n * self.rho_s * math.pi * np.asarray(R) ** 2 * L
        return np.where(Ls <= self.L_hi * (1 + 1e-12), m, np.inf), L


def _best_radius(P: _Problem, n: int, R_lo: float, R_hi: float):
    """Least-mass radius for count n, or None if no radius in bounds works."""
    from scipy.optimize import brentq, minimize_scalar

    if R_lo == R_hi:
        m, L = P.mass(np.array([R_lo]), n)
        return (R_lo, float(L[0]), float(m[0])) if np.isfinite(m[0]) else None
    R = np.geomspace(R_lo, R_hi, SCAN)
    m, _ = P.mass(R, n)
    if not np.any(np.isfinite(m)):
        return None
    for _ in range(2):  # second scan between the neighbours of the best point
        k = int(np.argmin(m))
        a, b = R[max(k - 1, 0)], R[min(k + 1, R.size - 1)]
        R = np.geomspace(a, b, SCAN)
        m, _ = P.mass(R, n)
    k = int(np.argmin(m))
    Rb = float(R[k])
    edge = lambda r: float(P.lstar(np.array([r]), n)[0]) - P.L_hi  # noqa: E731
    if 0 < k and not np.isfinite(m[k - 1]) and edge(R[k - 1]) > 0:   # on the feasibility edge
        Rb = brentq(edge, float(R[k - 1]), float(R[k]), xtol=1e-15, rtol=1e-13)
        if edge(Rb) > 0:
            Rb = float(R[k])
    elif k < R.size - 1 and not np.isfinite(m[k + 1]) and edge(R[k + 1]) > 0:
        Rb2 = brentq(edge, float(R[k]), float(R[k + 1]), xtol=1e-15, rtol=1e-13)
        if edge(Rb2) <= 0 and P.mass(np.array([Rb2]), n)[0][0] < m[k]:
            Rb = Rb2
    elif 0 < k < R.size - 1:
        fun = lambda lr: float(P.mass(np.array([math.exp(lr)]), n)[0][0])  # noqa: E731
        res = minimize_scalar(fun, bounds=(math.log(R[k - 1]), math.log(R[k + 1])), method="bounded",
                              options={"xatol": 1e-12})
        if np.isfinite(res.fun) and res.fun <= m[k]:
            Rb = math.exp(float(res.x))
    mb, Lb = P.mass(np.array([Rb]), n)
    if not np.isfinite(mb[0]):  # pragma: no cover - guarded above
        return None
    return Rb, float(Lb[0]), float(mb[0])


def optimise_rods(payload_mass: Any, *, safety_factor: float = 2.0, contact_angle: Any,
                  radius: Any = ("0.05 mm", "0.5 mm"), length: Any = ("5 mm", "80 mm"),
                  count: Any = (1, 12), spacing: Any | None = None, objective: str = "mass",
                  liquid: Liquid | None = None, material_density: Any | None = None) -> OptimiseResult:
    """Least-mass (or fewest-leg) set of long rod legs carrying ``payload_mass`` with a safety factor.

    Parameters
    ----------
    payload_mass : [kg]
        Mass carried besides the legs, > 0.
    safety_factor : float
        Required ratio of limit force to total weight (legs + payload), 1–100.
    contact_angle : [rad]
        Advancing contact angle of the leg coating.
    radius, length : (low, high) [m]
        Bounds on leg radius and wetted length of each leg.
    count : (low, high)
        Bounds on the number of legs.
    spacing : (low, high) [m], optional
        Bounds on the centre spacing of a level row; without it the legs are far apart.
    objective : {"mass", "count"}
        Least support mass (ties to fewer legs), or fewest legs then least mass.
    liquid : Liquid, optional
        Default water at 20 °C.
    material_density : [kg/m³], optional
        Default steel 7850 kg/m³ (common practice).

    Returns
    -------
    OptimiseResult

    Raises
    ------
    InputError
        If no design within the bounds meets the requirement (the message gives the most the
        bounds allow).
    """
    from ..liquids import as_liquid

    liq = as_liquid(liquid)
    Mp = v.positive(payload_mass, "mass", "payload_mass", show="g", upper=1e3)
    try:
        k = float(safety_factor)
    except (TypeError, ValueError):
        raise input_error("safety_factor", "must be a number from 1 to 100", repr(safety_factor)) from None
    if not (1.0 <= k <= 100.0):
        raise input_error("safety_factor", "must be a number from 1 to 100", repr(safety_factor))
    th = v.angle(contact_angle, "contact_angle")
    R_lo, R_hi = _bounds(radius, "length", "radius")
    L_lo, L_hi = _bounds(length, "length", "length")
    n_lo, n_hi = _bounds(count, "count", "count")
    if n_hi - n_lo > 2000:
        raise input_error("count", "range may span at most 2000 counts", f"{n_lo}:{n_hi}")
    S_b = None if spacing is None else _bounds(spacing, "length", "spacing")
    if objective not in ("mass", "count"):
        raise input_error("objective", "must be 'mass' or 'count'", repr(objective))
    rho_s = STEEL if material_density is None else v.density(material_density, "material_density")
    P = _Problem(Mp, k, th, liq, rho_s, L_lo, L_hi)

    table = []
    for n in range(n_lo, n_hi + 1):
        best = _best_radius(P, n, R_lo, R_hi)
        table.append((n, best))
    feasible = [(n, b) for n, b in table if b is not None]
    if not feasible:
        most = _most_payload(P, R_lo, R_hi, n_hi)
        raise input_error("payload_mass", f"no design within the bounds carries it with safety factor {k:g}; "
                          f"the most they allow is {most * 1e3:.4g} g", f"{Mp * 1e3:.4g} g")
    if objective == "mass":
        mmin = min(b[2] for _, b in feasible)
        tie = lambda t: t[1][2] <= mmin * (1 + 1e-9)  # noqa: E731
        order = sorted(feasible, key=lambda t: (not tie(t), 0.0 if tie(t) else t[1][2], t[0]))
    else:
        order = sorted(feasible, key=lambda t: (t[0], t[1][2]))

    warnings: list[str] = []
    notes: list[str] = []
    chosen = None
    for n, (R, L, m) in order:
        S = None
        factor = 1.0
        if S_b is not None and n > 1:
            S, factor = _best_spacing(R, th, n, S_b, liq)
            Ls = float(P.lstar(np.array([R]), n, factor=factor)[0])
            if Ls > L_hi:
                warnings.append(f"{n} legs: too little capacity at spacing {S * 1e3:.3g} mm (shared meniscus); next design tried")
                continue
            L = max(Ls, L_lo)
            m = n * rho_s * math.pi * R**2 * L
            notes.append(f"spacing {S * 1e3:.4g} mm from the exact parallel-rod meniscus: capacity × {factor:.4f} of "
                         "far-apart legs; radius kept at its far-apart optimum, length re-solved")
        chosen = (n, R, L, m, S, factor)
        break
    if chosen is None:
        raise input_error("spacing", "no count meets the payload at the spacings allowed (shared meniscus)",
                          f"{S_b[0] * 1e3:.4g}:{S_b[1] * 1e3:.4g} mm")
    n, R, L, m, S, factor = chosen
    if S_b is None and n > 1:
        notes.append(f"legs taken far apart (at least 4 capillary lengths, {4 * liq.lc * 1e3:.3g} mm, between centres); "
                     "give spacing bounds for the exact parallel-rod meniscus")
    f1 = float(rod2d.limit_force(R / liq.lc, th)["force"])
    F = n * L * liq.sigma * f1 * factor
    W = (Mp + m) * liq.g
    sf = F / W
    spare = F / (k * liq.g) - m - Mp
    binding, expl = _explain(P, n, R, L, sf, spare, (R_lo, R_hi), (L_lo, L_hi), (n_lo, n_hi), S, S_b, objective)
    if L < 20 * liq.lc:
        warnings.append(f"length {L * 1e3:.3g} mm is under 20 capillary lengths: end effects not included")
    per = tuple({"count": c, "feasible": b is not None,
                 **({} if b is None else {"radius_m": b[0], "length_m": b[1], "support_mass_kg": b[2]})}
                for c, b in table)
    return OptimiseResult(
        objective=objective, count=n, radius=Q_(R, "m"), length=Q_(L, "m"),
        spacing=None if S is None else Q_(S, "m"), support_mass=Q_(m, "kg"), payload_mass=Q_(Mp, "kg"),
        max_force=Q_(F, "N"), total_load=Q_(W, "N"), safety_factor=sf, required_safety_factor=k,
        spare_payload=Q_(spare if spare > 1e-9 * Mp else 0.0, "kg"), binding=tuple(binding), explanation=tuple(expl + notes),
        per_count=per, warnings=tuple(warnings), cautions=liq.cautions,
    )


def _best_spacing(R, th, n, S_b, liq):
    """Spacing in the bounds with the most row capacity, and capacity ÷ far-apart capacity."""
    from ..core import parallel2d

    Rs = R / liq.lc
    lo, hi = max(S_b[0] / liq.lc, 2 * Rs * 1.0001), S_b[1] / liq.lc
    if hi <= 2 * Rs:
        raise input_error("spacing", f"upper bound must exceed the leg diameter {2 * R * 1e3:.4g} mm",
                          f"{S_b[1] * 1e3:.4g} mm")
    one = float(rod2d.limit_force(Rs, th)["force"])
    cands = np.unique(np.clip(np.geomspace(lo, hi, 5) if hi > lo else np.array([hi]), lo, hi))
    best = max(cands, key=lambda S: parallel2d.row_limit(Rs, th, float(S), n)["force"])
    f = parallel2d.row_limit(Rs, th, float(best), n)["force"]
    return float(best) * liq.lc, f / (n * one)


def _most_payload(P: _Problem, R_lo, R_hi, n_hi) -> float:
    R = np.geomspace(R_lo, R_hi, SCAN) if R_hi > R_lo else np.array([R_lo])
    cap = n_hi * P.L_hi * P.q(R) / (P.k * P.g)
    return float(max(np.max(cap), 0.0))


def _explain(P, n, R, L, sf, spare, Rb, Lb, nb, S, S_b, objective):
    rel = lambda a, b: abs(a - b) <= 1e-7 * max(abs(b), 1e-30)  # noqa: E731
    binding, expl = [], []
    if rel(sf, P.k) or spare <= 1e-9 * P.Mp:
        binding.append("load")
        expl.append(f"load binds: the limit force is exactly {P.k:g} × the total weight")
    else:
        expl.append(f"load does not bind: safety factor {sf:.4g} against {P.k:g} required, "
                    f"{spare * 1e3:.4g} g of payload to spare")
    for name, val, (lo, hi), unit, scale in (("radius", R, Rb, "mm", 1e3), ("length", L, Lb, "mm", 1e3)):
        if rel(val, lo):
            binding.append(f"{name} lower bound")
            expl.append(f"{name} sits on its lower bound {lo * scale:.4g} {unit}")
        elif rel(val, hi):
            binding.append(f"{name} upper bound")
            expl.append(f"{name} sits on its upper bound {hi * scale:.4g} {unit}")
    if n == nb[0] and nb[0] != nb[1]:
        binding.append("count lower bound")
        expl.append(f"count sits on its lower bound {nb[0]}")
    elif n == nb[1] and nb[0] != nb[1]:
        binding.append("count upper bound")
        expl.append(f"count sits on its upper bound {nb[1]}")
    if S is not None and S_b is not None:
        if rel(S, S_b[1]):
            binding.append("spacing upper bound")
        elif rel(S, S_b[0]):
            binding.append("spacing lower bound")
    if "radius lower bound" in binding and "load" in binding:
        expl.append("thinner legs would be lighter for the same load: the radius bound sets the mass")
    if n > nb[0]:
        fewer = _most_payload(P, Rb[0], Rb[1], n - 1)
        expl.append(f"{n - 1} legs carry at most {fewer * 1e3:.4g} g within the bounds")
    if objective == "mass":
        expl.append("counts that reach the same least mass tie; the fewest legs are chosen")
    return binding, expl


@dataclass(frozen=True, kw_only=True)
class DeviceScaleResult(Result):
    """Least common scale of the elements of a device that carries a payload (see
    :func:`optimise_device_scale`)."""

    input: str = field(default="length_factor")
    factor: float = field(default=1.0)
    payload_mass: Any = qfield("kg")
    max_payload_mass: Any = qfield("kg")
    weight: Any = qfield("N")
    safety_factor: float = field(default=1.0)
    required_safety_factor: float = field(default=1.0)
    binding: tuple[str, ...] = field(default=())
    explanation: tuple[str, ...] = field(default=())
    warnings: tuple[str, ...] = field(default=())
    cautions: tuple[str, ...] = field(default=())
    references: tuple[str, ...] = field(default=())


def optimise_device_scale(design: Any, payload_mass: Any, *, safety_factor: float = 2.0,
                          input: str = "length_factor", bounds: tuple[float, float] = (0.25, 4.0),
                          scan: int = 9) -> DeviceScaleResult:
    """Least common factor on every element's length (or radius) for a device to carry a payload.

    Requirement, with W the weight of body and legs (it changes with the factor) and P the
    payload weight placed at the centre of mass:

    .. math:: W + P_{max}(s) \\ge k\\,(W + P),

    i.e. the largest total load the device carries is at least k times its loaded weight.
    :math:`P_{max}` comes from the device equilibrium (:mod:`floatcalc.studies.device_model`).
    The factor s is scanned at ``scan`` log-spaced points in ``bounds``; the least feasible
    one is refined with :func:`scipy.optimize.brentq` between it and the infeasible point
    below (so if the requirement is not monotone in s, the answer is the least feasible
    factor to the scan resolution).

    Validity: that of :func:`floatcalc.device.solve_device` at every factor.
    """
    from scipy.optimize import brentq

    from .device_model import device_model

    if input not in ("length_factor", "radius_factor"):
        raise input_error("input", "must be length_factor or radius_factor", repr(input))
    Mp = v.positive(payload_mass, "mass", "payload_mass", show="g", upper=1e3)
    try:
        k = float(safety_factor)
    except (TypeError, ValueError):
        raise input_error("safety_factor", "must be a number from 1 to 100", repr(safety_factor)) from None
    if not 1.0 <= k <= 100.0:
        raise input_error("safety_factor", "must be a number from 1 to 100", repr(safety_factor))
    scan = v.count(scan, "scan", upper=200)  # log-spaced device solves before the root search
    try:
        lo, hi = (float(b) for b in bounds)
    except (TypeError, ValueError):
        raise input_error("bounds", "must be two numbers (low, high) with 0.1 ≤ low < high ≤ 10", repr(bounds)) from None
    if not (0.1 <= lo < hi <= 10.0):
        raise input_error("bounds", "must satisfy 0.1 ≤ low < high ≤ 10", f"{lo:g}:{hi:g}")
    m = device_model(design)
    g = 9.80665 if not hasattr(m.func, "design") else m.func.design.liquid.g

    from ..errors import InputError

    unbuildable: list[float] = []

    def slack(s):
        try:
            out = m.evaluate({input: s, "payload_mass": Mp})
        except InputError:  # e.g. scaled elements overlap: not a design, so not feasible
            unbuildable.append(float(s))
            return -math.inf, math.nan, math.nan
        W, Pmax = float(out["weight"]), float(out["max_payload"])
        return W + Pmax - k * (W + Mp * g), W, Pmax

    grid = np.geomspace(lo, hi, scan)
    vals = [slack(s)[0] for s in grid]
    ok = [i for i, val in enumerate(vals) if val >= 0]
    note = ([f"{input} {min(unbuildable):.3g} and above (some) give no valid design (elements overlap); "
             "treated as infeasible"] if unbuildable else [])
    if not ok:
        finite = [i for i, val in enumerate(vals) if math.isfinite(val)]
        if not finite:
            raise input_error(input, f"no factor in {lo:g}–{hi:g} gives a valid design", f"{lo:g}:{hi:g}")
        best = float(grid[max(finite, key=lambda i: vals[i])])
        _, W, Pmax = slack(best)
        raise input_error("payload_mass", f"no {input} in {lo:g}–{hi:g} carries it with safety factor {k:g}; "
                          f"the best ({best:.3g}) gives {(W + Pmax) / (W + Mp * g):.3g}", f"{Mp * 1e3:.4g} g")
    i = ok[0]
    binding = ["load"]
    if i == 0:
        s = lo
        binding = [f"{input} lower bound"]
    elif not math.isfinite(vals[i - 1]):
        s = float(grid[i])
        binding = []
        note.append(f"the factor below ({grid[i - 1]:.3g}) gives no valid design: answer good to the scan step only")
    else:
        s = brentq(lambda t: slack(t)[0], float(grid[i - 1]), float(grid[i]), xtol=1e-6, rtol=1e-8)
        if slack(s)[0] < 0:  # land on the feasible side of the root
            s = s * (1 + 1e-7)
    val, W, Pmax = slack(s)
    sf = (W + Pmax) / (W + Mp * g)
    expl = [f"{input} {s:.5g}: the device carries {(W + Pmax) / g * 1e3:.4g} g in all against "
            f"{(W + Mp * g) / g * 1e3:.4g} g loaded, safety factor {sf:.4g} (required {k:g})"]
    if binding == ["load"]:
        expl.append(f"load binds: a smaller {input} would fall below the required safety factor")
    elif binding:
        expl.append(f"{input} sits on its lower bound; the load does not bind")
    expl.extend(note)
    return DeviceScaleResult(
        input=input, factor=float(s), payload_mass=Q_(Mp, "kg"), max_payload_mass=Q_(Pmax / g, "kg"),
        weight=Q_(W, "N"), safety_factor=sf, required_safety_factor=k, binding=tuple(binding),
        explanation=tuple(expl), warnings=tuple(m.warnings({input: s})), cautions=m.cautions,
        references=m.references,
    )
