"""Calibration: contact angles (advancing and receding), surface tension, depth zero and tare from force–depth data.

An element (a long rod, a row of rods, a ball foot, a flat pad, a ring footpad or a vertical
pin) is pushed into the liquid and pulled out again while a balance records the force F
against the depth d of its lowest point. The model of reading i is

.. math:: F_i = f_k\\big(d_i - \\delta;\\ \\theta_{b(i)},\\ \\sigma\\big) + T + \\varepsilon_i,

with f_k the element kind's force–depth law (one table, :data:`KINDS`: the exact 2D rod law of
Vella, Lee & Kim 2006 read through :mod:`floatcalc.studies._rodcurve`, the row-of-rods law of
:mod:`floatcalc.core.parallel2d`, and the axisymmetric curves of :mod:`floatcalc.round`), θ the
advancing angle on push-in rows and the receding angle on pull-out rows (b(i), from a
``direction`` column or the sign of the depth change), δ the depth reading at which the lowest
point is at the undisturbed surface (first touch), T the balance reading at zero liquid force
(tare), and ε_i the force error. Push-in rows above the surface (d − δ < 0) carry no liquid
force; pull-out rows above the law's first state have detached (force zero) for kinds whose law
reaches detachment.

Estimation: weighted least squares, minimising :math:`S = \\sum_i r_i^2`,
:math:`r_i = (F_i - \\hat F_i)/u_i` (:func:`scipy.optimize.least_squares`, trust-region
reflective, own central-difference Jacobian; forward differences for the laws built per angle),
after a coarse scan of each angle for the start.
Error models, each giving u_i:

* stated absolute uncertainty a (``"0.1 mN"``) or a per-row column ``force uncertainty [unit]``:
  u_i known, covariance :math:`C = (J^T J)^{-1}` and normal quantiles (``absolute_sigma``);
* stated proportional (``"2%"``) or combined (``"0.01 mN + 1%"``) uncertainty,
  :math:`u_i^2 = a^2 + (p \\hat F_i)^2` with :math:`\\hat F_i` the fitted reading, by iteratively
  reweighted least squares to its fixed point (quasi-likelihood; McCullagh & Nelder 1989), then
  as for known u_i;
* nothing stated: u_i = s for all rows with :math:`s^2 = S/(N-p)` estimated from the residuals,
  :math:`C = s^2 (J^T J)^{-1}` and Student-t quantiles with N − p degrees of freedom.

Intervals (Bates & Watts 1988): the Jacobian (Wald) interval
:math:`\\hat\\beta_j \\pm q\\sqrt{C_{jj}}` and the profile-likelihood interval
:math:`\\{\\beta_j : \\tilde S(\\beta_j) - \\hat S \\le q^2 c\\}` with :math:`\\tilde S` minimised
over the other parameters (c = 1 for known u_i, c = s² otherwise), which follows the curvature
of a nonlinear model. The profile interval is shown unless ``intervals="wald"``; both are in the
result (``interval_method`` says which is shown). Hysteresis θ_a − θ_r gets the Wald interval
from the covariance.

Validity: that of each law (static, clean surface, rigid element; long rods L ≳ 20 l_c), the
contact line moving (a pinned stretch just after the push turns into a pull follows neither
angle: leave those rows out or mark them), and independent force errors.

Examples
--------
>>> r = demo_fit()
>>> lo, hi = r.contact_angle_ci.magnitude
>>> bool(lo < r.contact_angle.magnitude < hi), r.points
(True, 40)
"""

from __future__ import annotations

import math
import re
from collections.abc import Callable
from dataclasses import dataclass
from importlib import resources
from typing import Any

import numpy as np

from .. import _validate as v
from ..errors import ConvergenceError, InputError, input_error
from ..liquids import Liquid, water
from ..results import Result, field, qfield
from ..units import Q_
from . import _rodcurve

REFERENCES = (
    "Vella, Lee & Kim, Langmuir 22, 5979 (2006): force-depth law of a floating rod and of rods side by side",
    "Bates & Watts, Nonlinear Regression Analysis and Its Applications, Wiley (1988): Jacobian and profile intervals",
    "McCullagh & Nelder, Generalized Linear Models, 2nd ed., Chapman & Hall (1989): iteratively reweighted least squares",
)

#: The shipped invented data sets and the (invented) rigs they pretend to come from.
DEMO_FILE = "demo_force_depth.csv"
DEMO_RIG = {"radius": "0.25 mm", "length": "60 mm", "liquid": "water", "temperature": "20 degC"}
DEMO_CYCLE_FILE = "demo_push_pull.csv"

#: Parameters a fit can estimate, their SI unit and a readable name.
PARAMETERS = {
    "contact_angle": ("deg", "advancing contact angle"),
    "receding_angle": ("deg", "receding contact angle"),
    "surface_tension": ("N/m", "surface tension"),
    "depth_offset": ("m", "depth offset (reading at first touch)"),
    "tare": ("N", "force tare (reading at zero liquid force)"),
}
_PUSH_WORDS = {"push", "in", "down", "advancing", "a"}
_PULL_WORDS = {"pull", "out", "up", "receding", "r"}


# ---------------------------------------------------------------------------------------------
# One table of element kinds: geometry inputs and the force-depth law (vectorised over depth)


@dataclass(frozen=True)
class Kind:
    """An element kind the fit knows: its geometry inputs and a builder of its force–depth law.

    ``build(geometry_si, liquid, depth_span)`` returns ``law(D, theta, sigma) -> (F, lo, hi)``:
    force [N] at lowest-point depths D [m] (array; clamped to the law's range), for contact
    angle θ [rad] and surface tension σ [N/m], and the law's depth range [lo, hi] [m].
    """

    name: str
    geometry: dict[str, tuple[str, str]]  # key -> (unit kind: "length" | "count", help text)
    optional: dict[str, Any]               # key -> default (None: not needed)
    build: Callable
    detaches: bool                         # law's first state is detachment (pull-off)
    slow: bool                             # each (θ, σ) builds a curve (cached)
    summary: str


_PHI_GRID = np.linspace(0.0, math.pi, 65)


def rod_force_at_depth(D, R, theta):
    """Force per length [σ] of a long rod at lowest-point depths D [l_c] (array), clamped to the law's range.

    Same law as :func:`floatcalc.studies._rodcurve.force_at_depth` (depth
    :math:`D(\\phi) = 2\\sin(\\psi/2) + R(1-\\cos\\phi)`, force :func:`floatcalc.core.rod2d.force`),
    with φ(D) found faster for the fit: linear interpolation on 65 states, then Newton steps on
    :math:`dD/d\\phi = \\cos(\\psi/2) + R\\sin\\phi \\ge 0`, safeguarded to [0, π].

    >>> f = rod_force_at_depth(np.array([0.2, 0.5]), 0.1, math.radians(120))
    >>> from floatcalc.studies import _rodcurve
    >>> bool(np.allclose(f, _rodcurve.force_at_depth(np.array([0.2, 0.5]), 0.1, math.radians(120))[0], atol=1e-13))
    True
    """
    from ..core import rod2d

    D = np.asarray(D, dtype=float)
    grid = _rodcurve.depth(_PHI_GRID, R, theta)
    Dc = np.clip(D, grid[0], grid[-1])
    phi = np.interp(Dc, grid, _PHI_GRID)
    for _ in range(4):
        half = 0.5 * (phi + theta - math.pi)
        g = 2.0 * np.sin(half) + R * (1.0 - np.cos(phi)) - Dc
        dg = np.cos(half) + R * np.sin(phi)
        step = np.where(dg > 1e-300, g / np.where(dg > 1e-300, dg, 1.0), 0.0)
        phi = np.clip(phi - step, 0.0, math.pi)
    return rod2d.force(phi, R, theta)


def _rod_law(g, liq, span):
    R, L, n = g["radius"], g["length"], g["count"]
    rg = liq.rho * liq.g

    def law(D, th, sigma):
        lc = math.sqrt(sigma / rg)
        f = rod_force_at_depth(np.asarray(D) / lc, R / lc, th)
        lo = _rodcurve.depth(0.0, R / lc, th) * lc
        hi = _rodcurve.depth(math.pi, R / lc, th) * lc
        return n * L * sigma * f, float(lo), float(hi)

    return law


def _cached(make):
    """Wrap ``make(theta, sigma) -> (depth array, force array)`` into a cached, interpolated law."""
    from scipy.interpolate import PchipInterpolator

    cache: dict = {}

    def law(D, th, sigma):
        key = (round(float(th), 12), round(float(sigma), 15))
        if key not in cache:
            if len(cache) > 256:
                cache.clear()
            x, y = make(min(max(float(th), 0.0), math.pi), float(sigma))
            keep = np.concatenate([[True], np.diff(x) > 0])  # strictly rising depths for the interpolant
            cache[key] = (PchipInterpolator(x[keep], y[keep]), float(x[0]), float(x[-1]))
        p, lo, hi = cache[key]
        return p(np.clip(D, lo, hi)), lo, hi

    return law


def _liq_sigma(liq, sigma):
    import dataclasses

    return liq if sigma == liq.sigma else dataclasses.replace(liq, sigma=sigma)


def _row_law(g, liq, span):
    from ..core import parallel2d

    R, L, n, S = g["radius"], g["length"], g["count"], g["spacing"]
    if S <= 2 * R:
        raise input_error("spacing", f"must exceed twice the radius ({2 * R * 1e3:.4g} mm): the rods would overlap",
                          f"{S * 1e3:.4g} mm")

    def make(th, sigma):
        lc = math.sqrt(sigma / (liq.rho * liq.g))
        c = parallel2d.row_curve(R / lc, th, S / lc, n)
        return c["depth"] * lc, c["force"] * sigma * L

    return _cached(make)


def _round_law(kind):
    def build(g, liq, span):
        from .. import round as rnd

        def make(th, sigma):
            lq = _liq_sigma(liq, sigma)
            if kind == "ball":
                r = rnd.ball(g["radius"], th, liquid=lq)
            elif kind == "pad":
                r = rnd.pad(g["radius"], g["thickness"], th, liquid=lq)
            elif kind == "ring":
                # the tabulated ring (core.ring_batch: same curve as round.ring to 1e-9, in ms
                # instead of a second of direct inner solves per angle)
                from ..core import ring_batch

                lc = lq.lc
                c = ring_batch.ring_laws(np.array([g["ring_radius"] / lc]), np.array([g["wire_radius"] / lc]),
                                         np.array([float(th)]))["curve"]
                n = int(c["n"][0])
                return c["depth"][0, :n] * lc, c["force"][0, :n] * lq.sigma * lc
            else:
                r = rnd.pin(g["radius"], th, liquid=lq, length=g.get("length") or max(2.0 * span, 1e-3))
            return r.curve.depth.to("m").magnitude, r.curve.force.to("N").magnitude

        return _cached(make)

    return build


_R = ("length", "radius of the element's circular section, e.g. 0.25mm")
KINDS: dict[str, Kind] = {
    "rod": Kind("rod", {"radius": ("length", "rod radius, e.g. 0.25mm"),
                        "length": ("length", "wetted length of each rod, e.g. 60mm"),
                        "count": ("count", "identical rods measured together, far apart (default 1)")},
                {"count": 1}, _rod_law, True, False, "long horizontal rod(s), exact 2D law"),
    "rod_row": Kind("rod_row", {"radius": ("length", "rod radius"), "length": ("length", "wetted length of each rod"),
                                "count": ("count", "rods in the row (default 1)"),
                                "spacing": ("length", "centre-to-centre spacing of the rods, e.g. 1mm")},
                    {"count": 1}, _row_law, True, True, "row of parallel rods sharing their menisci"),
    "ball": Kind("ball", {"radius": ("length", "ball radius")}, {}, _round_law("ball"), True, True,
                 "ball foot (sphere), axisymmetric meniscus"),
    "pad": Kind("pad", {"radius": ("length", "pad radius"), "thickness": ("length", "pad thickness, e.g. 0.5mm")},
                {}, _round_law("pad"), False, True, "flat circular pad with sharp edges"),
    "ring": Kind("ring", {"ring_radius": ("length", "ring radius to the wire centre, e.g. 3mm"),
                          "wire_radius": ("length", "wire radius of the ring, e.g. 0.2mm")},
                 {}, _round_law("ring"), True, True, "ring footpad (closed wire loop)"),
    "pin": Kind("pin", {"radius": ("length", "pin radius"),
                        "length": ("length", "pin length (optional; the curve reaches the deepest row)")},
                {"length": None}, _round_law("pin"), False, True, "vertical pin (fibre), flat tip first"),
}


def _geometry(kind: str, geometry: dict | None) -> tuple[Kind, dict]:
    if kind not in KINDS:
        raise input_error("element", f"must be one of {', '.join(KINDS)}", repr(kind))
    k = KINDS[kind]
    g = dict(geometry or {})
    unknown = [key for key in g if key not in k.geometry]
    if unknown:
        raise input_error(f"geometry.{unknown[0]}", f"is not an input of a {kind} (inputs: "
                          f"{', '.join(k.geometry)})", repr(g[unknown[0]]))
    out: dict[str, Any] = {}
    for key, (unit, _) in k.geometry.items():
        val = g.get(key)
        if val is None:
            val = k.optional.get(key, "required")
        if isinstance(val, str) and val == "required":
            raise input_error(key, f"is required for a {kind}", "nothing")
        if val is None:
            out[key] = None
        elif unit == "count":
            out[key] = v.count(val, key)
        else:
            out[key] = v.length(val, key)
    return k, out


def force_depth_law(kind: str, geometry: dict, liquid: Liquid | None = None, depth_span: float = 5e-3):
    """The force–depth law the fit uses for an element kind, as ``law(D [m], θ [rad], σ [N/m])``.

    Returns a function giving ``(F [N] array, lo [m], hi [m])``: the force at lowest-point
    depths D clamped to the law's depth range [lo, hi] at that angle and surface tension.

    >>> law = force_depth_law("rod", {"radius": "0.25 mm", "length": "60 mm"})
    >>> F, lo, hi = law(np.array([0.5e-3]), math.radians(120), 0.0728)
    >>> bool(F[0] > 0 and lo < 0 < 0.5e-3 < hi)
    True
    """
    k, g = _geometry(kind, geometry)
    return k.build(g, water() if liquid is None else liquid, float(depth_span))


# ---------------------------------------------------------------------------------------------
# Result


@dataclass(frozen=True, kw_only=True)
class FitResult(Result):
    """Fitted parameters with their intervals, correlation, goodness of fit and residuals.

    Intervals shown (``*_ci``) follow ``interval_method``; ``wald_ci`` and ``profile_ci`` hold
    both kinds for every fitted parameter (keys ``<name>_<unit>``), ``standard_errors`` the
    square roots of the covariance diagonal, ``correlation`` the correlation matrix.
    """

    element: str = field(default="rod")
    geometry: dict = field(default_factory=dict)
    contact_angle: Any = qfield("deg", default=None)
    contact_angle_ci: Any = qfield("deg", default=None)
    receding_angle: Any = qfield("deg", default=None)
    receding_angle_ci: Any = qfield("deg", default=None)
    hysteresis: Any = qfield("deg", default=None)
    hysteresis_ci: Any = qfield("deg", default=None)
    confidence: float = field(default=0.95)
    interval_method: str = field(default="")
    surface_tension: Any = qfield("N/m", default=None)
    surface_tension_ci: Any = qfield("N/m", default=None)
    surface_tension_fitted: bool = field(default=False)
    depth_offset: Any = qfield("m", default=None)
    depth_offset_ci: Any = qfield("m", default=None)
    tare: Any = qfield("N", default=None)
    tare_ci: Any = qfield("N", default=None)
    fitted: tuple[str, ...] = field(default=())
    standard_errors: dict = field(default_factory=dict)
    wald_ci: dict = field(default_factory=dict)
    profile_ci: dict = field(default_factory=dict)
    correlation: dict = field(default_factory=dict)
    error_model: str = field(default="")
    force_uncertainty_known: bool = field(default=False)
    chi_squared: float | None = field(default=None)
    chi_squared_p_value: float | None = field(default=None)
    residual_scale: Any = qfield("N", default=None)
    radius: Any = qfield("m", default=None)
    length: Any = qfield("m", default=None)
    count: int = field(default=1)
    points: int = field(default=0)
    push_points: int = field(default=0)
    pull_points: int = field(default=0)
    points_before_contact: int = field(default=0)
    degrees_of_freedom: int = field(default=0)
    residual_rms: Any = qfield("N")
    depth: Any = qfield("m", json=False)
    force: Any = qfield("N", json=False)
    fitted_force: Any = qfield("N", json=False)
    residuals: Any = qfield("N", json=False)
    weighted_residuals: Any = field(default=None, json=False)
    force_uncertainty: Any = qfield("N", default=None, json=False)
    pull: Any = field(default=None, json=False)
    lines: Any = field(default=None, json=False)
    warnings: tuple[str, ...] = field(default=())
    cautions: tuple[str, ...] = field(default=())
    references: tuple[str, ...] = field(default=REFERENCES)


# ---------------------------------------------------------------------------------------------
# Error models


@dataclass(frozen=True)
class _Errors:
    kind: str           # "estimated" | "known" | "proportional"
    absolute: Any       # float or array [N]
    relative: float     # fraction
    text: str


_PCT = re.compile(r"^\s*([0-9.eE+-]+)\s*%\s*$")


def _error_model(spec: Any, n: int) -> _Errors:
    if spec is None:
        return _Errors("estimated", 0.0, 0.0, "estimated from the residuals (equal for all rows)")
    if isinstance(spec, str):
        parts = [p for p in spec.replace(" + ", "+").split("+") if p.strip()] if "%" in spec else [spec]
        a, p = 0.0, 0.0
        for part in parts:
            m = _PCT.match(part)
            if m:
                try:
                    p = float(m.group(1)) / 100.0
                except ValueError:
                    p = -1.0
                if not (math.isfinite(p) and 0.0 < p < 1.0):
                    raise input_error("force_uncertainty", "a proportional part must be between 0 % and 100 %",
                                      repr(spec))
            else:
                a = _positive_force(part.strip(), spec)
        if p > 0:
            text = f"stated: {p * 100:g} % of the reading" + (f" + {a * 1e3:.4g} mN" if a else "")
            return _Errors("proportional", a, p, text)
        return _Errors("known", a, 0.0, f"stated: {a * 1e3:.4g} mN on every row")
    arr = np.asarray(v.to_si(spec, "force", "force_uncertainty", array=True), dtype=float)
    if arr.ndim == 0 or arr.size == 1:
        a = float(arr.ravel()[0])
        if not (math.isfinite(a) and a > 0):
            raise input_error("force_uncertainty", "must be a positive force, a percentage or one value per row",
                              repr(spec))
        return _Errors("known", a, 0.0, f"stated: {a * 1e3:.4g} mN on every row")
    arr = arr.ravel()
    if arr.size != n:
        raise input_error("force_uncertainty", "needs one value per row", f"{arr.size} for {n} rows")
    if not np.all(np.isfinite(arr) & (arr > 0)):
        i = int(np.argmax(~(np.isfinite(arr) & (arr > 0))))
        raise input_error("force_uncertainty", f"must be positive and finite on every row (row {i + 1})",
                          f"{arr[i]:g} N")
    return _Errors("known", arr, 0.0, "per row (force uncertainty column)")


def _positive_force(text, spec):
    try:
        a = float(v.to_si(text, "force", "force_uncertainty"))
    except InputError:
        raise input_error("force_uncertainty", "must be a force such as '0.1 mN', a percentage such as '2%', or "
                          "both as '0.01 mN + 1%'", repr(spec)) from None
    if not (math.isfinite(a) and a > 0):
        raise input_error("force_uncertainty", "must be positive", repr(spec))
    return a


# ---------------------------------------------------------------------------------------------
# Data checks and branches


def _directions(direction, D) -> tuple[np.ndarray, list[str]]:
    """Boolean mask of pull-out rows, from ``direction`` or the sign of the depth change."""
    notes: list[str] = []
    if direction is None or (isinstance(direction, str) and direction == "auto"):
        dd = np.diff(D)
        s = np.sign(dd)
        nz = s[s != 0]
        first = nz[0] if nz.size else 1.0
        sign = np.empty(D.size)
        sign[0] = first
        for i in range(1, D.size):
            sign[i] = s[i - 1] if s[i - 1] != 0 else sign[i - 1]
        pull = sign < 0
        turns = int(np.count_nonzero(np.diff(pull.astype(int))))
        if turns > 3:
            notes.append(f"depth changes direction {turns} times: rows were split into push and pull by the "
                         "sign of the depth change; if the rows are not in recording order, add a direction column")
        return pull, notes
    if isinstance(direction, str):
        words = [direction] * D.size
    else:
        words = [str(w) for w in direction]
        if len(words) != D.size:
            raise input_error("direction", "needs one value per row", f"{len(words)} for {D.size} rows")
    pull = np.zeros(D.size, dtype=bool)
    for i, w in enumerate(words):
        w = w.strip().lower()
        if w in _PULL_WORDS:
            pull[i] = True
        elif w not in _PUSH_WORDS:
            raise input_error("direction", "must be push or pull (also in/out, advancing/receding)",
                              f"{w!r} on row {i + 1}")
    return pull, notes


def _checked(depth, force, confidence):
    D = np.asarray(v.to_si(depth, "length", "depth", array=True), dtype=float).ravel()
    F = np.asarray(v.to_si(force, "force", "force", array=True), dtype=float).ravel()
    try:
        c = float(confidence)
    except (TypeError, ValueError):
        raise input_error("confidence", "must be a number from 0.5 to 0.999", repr(confidence)) from None
    if not 0.5 <= c <= 0.999:
        raise input_error("confidence", "must be a number from 0.5 to 0.999", repr(confidence))
    if D.size != F.size:
        raise input_error("data", "depth and force need the same number of points", f"{D.size} and {F.size}")
    if not (np.all(np.isfinite(D)) and np.all(np.isfinite(F))):
        raise input_error("data", "depths and forces must be finite numbers", "NaN or infinity")
    if D.size and np.ptp(D) <= 0:
        raise input_error("data", "depths must not all be equal", f"{D[0]:g} m")
    return D, F, c


# ---------------------------------------------------------------------------------------------
# The estimation problem


class _Problem:
    """Weighted least squares over the free parameters, in scaled variables u (θ in deg,
    σ in mN/m, δ in mm, T in units of the largest |force|)."""

    def __init__(self, law, kind: Kind, d, F, pull, free, fixed, Fscale):
        self.law, self.kind, self.d, self.F, self.pull = law, kind, d, F, pull
        self.push = ~pull
        self.free = list(free)
        self.fixed = dict(fixed)
        self.scale = {"contact_angle": 1.0, "receding_angle": 1.0, "surface_tension": 1e-3, "depth_offset": 1e-3,
                      "tare": Fscale}
        step = 1e-3 if kind.slow else 1e-5
        self.step = {"contact_angle": step, "receding_angle": step, "surface_tension": step * 10,
                     "depth_offset": step * 0.1, "tare": 1.0}
        self.u = None  # uncertainties u_i [N]

    def values(self, x, free=None) -> dict:
        vals = dict(self.fixed)
        for name, xi in zip(free or self.free, x):
            vals[name] = float(xi) * self.scale[name]
        return vals

    def predict(self, vals):
        """Model readings [N], and masks: outside the law's range, before first contact."""
        D = self.d - vals["depth_offset"]
        m = np.zeros_like(D)
        outside = np.zeros(D.size, dtype=bool)
        before = np.zeros(D.size, dtype=bool)
        sig = vals["surface_tension"]
        for mask, name in ((self.push, "contact_angle"), (self.pull, "receding_angle")):
            if not np.any(mask):
                continue
            Db = D[mask]
            f, lo, hi = self.law(Db, math.radians(min(max(vals[name], 0.0), 180.0)), sig)
            f = np.array(f, dtype=float)
            if name == "contact_angle":
                air = Db < 0.0          # push-in: not touching yet
                out = (~air & (Db < lo)) | (Db > hi)
            else:
                air = (Db < lo) if self.kind.detaches else np.zeros(Db.size, dtype=bool)  # detached
                out = (~air & (Db < lo)) | (Db > hi)
            f[air] = 0.0
            m[mask], outside[mask], before[mask] = f, out, air
        return m + vals["tare"], outside, before

    def resid(self, x, free=None):
        m, _, _ = self.predict(self.values(x, free))
        return (self.F - m) / self.u

    def jac(self, x, free=None):
        free = free or self.free
        J = np.empty((self.F.size, len(free)))
        r0 = self.resid(x, free) if self.kind.slow else None
        for j, name in enumerate(free):
            if name == "tare":
                J[:, j] = -self.scale["tare"] / self.u
                continue
            h = self.step[name]
            xp, xm = np.array(x, dtype=float), np.array(x, dtype=float)
            xp[j] += h
            xm[j] -= h
            if r0 is not None:  # slow laws: forward differences (one new curve per parameter)
                _, hi = self.bounds(free)
                if xp[j] > hi[j]:
                    J[:, j] = (r0 - self.resid(xm, free)) / h
                else:
                    J[:, j] = (self.resid(xp, free) - r0) / h
            else:
                J[:, j] = (self.resid(xp, free) - self.resid(xm, free)) / (2 * h)
        return J

    def bounds(self, free=None):
        lo, hi = [], []
        span = (float(np.max(np.abs(self.d))) + 0.05) / 1e-3  # mm
        for name in free or self.free:
            lo.append({"contact_angle": 0.0, "receding_angle": 0.0, "surface_tension": 1.0,
                       "depth_offset": -span, "tare": -np.inf}[name])
            hi.append({"contact_angle": 180.0, "receding_angle": 180.0, "surface_tension": 1000.0,
                       "depth_offset": span, "tare": np.inf}[name])
        return np.array(lo), np.array(hi)

    def solve(self, x0, free=None, strict=True, tol=1e-15):
        from scipy.optimize import least_squares

        free = free or self.free
        lo, hi = self.bounds(free)
        x0 = np.clip(np.asarray(x0, dtype=float), lo, hi)
        xs = [{"contact_angle": 10.0, "receding_angle": 10.0, "surface_tension": 10.0, "depth_offset": 0.1,
               "tare": 0.1}[n] for n in free]
        res = least_squares(self.resid, x0, jac=self.jac, bounds=(lo, hi), method="trf", x_scale=xs,
                            xtol=tol, ftol=1e-15, gtol=1e-15, max_nfev=1000, args=(free,), kwargs={})
        if strict and res.status <= 0:
            raise ConvergenceError(f"contact-angle fit did not converge: {res.message}")
        return res.x, float(np.sum(res.fun ** 2))


def _start(prob: _Problem, sig0, fit_tare, slow):
    """Coarse scan of each angle (tare solved in closed form at each trial) for the start:
    every 20° for laws built per angle; every 5° then every 1° around the best for fast ones."""
    start = {}
    base = dict(prob.fixed)
    for name, mask in (("contact_angle", prob.push), ("receding_angle", prob.pull)):
        if name not in prob.free:
            continue

        def cost(t, name=name, mask=mask):
            vals = dict(base, **{name: float(t)})
            m, _, _ = prob.predict(vals)
            r = (prob.F - m + vals["tare"])[mask] / prob.u[mask]
            if fit_tare:
                w = 1.0 / prob.u[mask] ** 2
                r = r - float(np.sum(r * prob.u[mask] * w) / np.sum(w)) / prob.u[mask]
            return float(np.sum(r ** 2))

        grid = np.arange(10.0, 180.0, 20.0) if slow else np.arange(2.5, 180.0, 5.0)
        costs = [cost(t) for t in grid]
        i = int(np.argmin(costs))
        arg = float(grid[i])
        if slow and 0 < i < grid.size - 1:  # vertex of the parabola through the best three
            c0, c1, c2 = costs[i - 1], costs[i], costs[i + 1]
            den = c0 - 2.0 * c1 + c2
            if den > 0:
                arg = float(np.clip(arg + 0.5 * (grid[1] - grid[0]) * (c0 - c2) / den, grid[i - 1], grid[i + 1]))
        if not slow:
            fine = np.arange(max(arg - 4.0, 0.5), min(arg + 4.5, 179.6), 1.0)
            arg = float(fine[int(np.argmin([cost(t) for t in fine]))])
        start[name] = arg
        base[name] = arg
    x0 = []
    for name in prob.free:
        if name in start:
            x0.append(start[name])
        elif name == "surface_tension":
            x0.append(sig0 / 1e-3)
        else:
            x0.append(0.0)
    if fit_tare:  # tare at the scanned angles, in closed form
        m, _, _ = prob.predict(prob.values(np.array(x0)))
        w = 1.0 / prob.u ** 2
        x0[prob.free.index("tare")] = float(np.sum((prob.F - m) * w) / np.sum(w)) / prob.scale["tare"]
    return np.array(x0, dtype=float)


def fit(kind: str, depth: Any, force: Any, *, geometry: dict | None = None, liquid: Liquid | None = None,
        force_uncertainty: Any = None, direction: Any = None, fit: tuple[str, ...] | list[str] = ("contact_angle",),
        confidence: float = 0.95, intervals: str = "profile", lines: Any = None,
        warnings: tuple[str, ...] = ()) -> FitResult:
    """Fit contact angles (and optionally σ, depth offset, tare) of any element kind to force–depth data.

    .. math:: F_i = f_k(d_i - \\delta;\\ \\theta_{b(i)},\\ \\sigma) + T + \\varepsilon_i

    (see the module docstring for the laws, the error models and the intervals).

    Parameters
    ----------
    kind : {"rod", "rod_row", "ball", "pad", "ring", "pin"}
        Element kind (:data:`KINDS`).
    depth : array [m]
        Depth reading of the element's lowest point (positive down).
    force : array [N]
        Balance reading (upward force of the liquid plus the tare).
    geometry : dict
        The kind's inputs (quantities, strings or SI floats): rod ``radius, length, count``;
        rod_row ``radius, length, count, spacing``; ball ``radius``; pad ``radius, thickness``;
        ring ``ring_radius, wire_radius``; pin ``radius`` (``length`` optional).
    liquid : Liquid, optional
        Gives ρ, g and (unless fitted) σ; default water at 20 °C.
    force_uncertainty : None, force, str or array [N]
        None: estimated from the residuals. A force (``"0.1 mN"``), a percentage of the
        reading (``"2%"``), both (``"0.01 mN + 1%"``) or one value per row: weighted fit with
        known uncertainties.
    direction : None, "push", "pull" or array of them
        Branch of each row; None infers it from the sign of the depth change (rows in recording
        order). Push-in rows set the advancing angle, pull-out rows the receding angle.
    fit : names
        Parameters to estimate, from :data:`PARAMETERS`: ``"contact_angle"`` (always, when there
        are push rows), ``"receding_angle"`` (always, when there are pull rows),
        ``"surface_tension"``, ``"depth_offset"``, ``"tare"``.
    confidence : float
        Confidence level of the intervals, 0.5–0.999.
    intervals : {"profile", "wald"}
        Which interval is shown (both are computed, except profiles with ``"wald"``).

    Returns
    -------
    FitResult
        Frozen; ``to_dict()`` gives the JSON keys (``contact_angle_deg``, ``contact_angle_ci_deg``,
        ``receding_angle_deg``, ``depth_offset_m``, ``tare_N``, ``correlation``, ...).

    Raises
    ------
    InputError
        Bad data or options (one line naming the field).
    ConvergenceError
        The optimiser failed or the data do not determine a parameter.

    Examples
    --------
    >>> import floatcalc as fc
    >>> law = force_depth_law("rod", {"radius": "0.25 mm", "length": "60 mm"})
    >>> D = np.linspace(0.1e-3, 1.2e-3, 12)
    >>> F = law(D, math.radians(120), water().sigma)[0] + 1e-6 * (-1.0) ** np.arange(12)
    >>> r = fit("rod", D, F, geometry={"radius": "0.25 mm", "length": "60 mm"})
    >>> round(r.contact_angle.magnitude, 1), r.interval_method
    (120.0, 'profile likelihood')
    """
    from scipy import stats

    liq = water() if liquid is None else liquid
    k, g = _geometry(kind, geometry)
    D, F, c = _checked(depth, force, confidence)
    if intervals not in ("profile", "wald"):
        raise input_error("intervals", "must be profile or wald", repr(intervals))
    names = [fit] if isinstance(fit, str) else list(fit)
    for n_ in names:
        if n_ not in PARAMETERS:
            raise input_error("fit", f"names parameters from {', '.join(PARAMETERS)}", repr(n_))
    pull, notes = _directions(direction, D)
    warn = list(warnings) + notes
    if "receding_angle" in names and not np.any(pull):
        raise input_error("fit", "receding_angle needs pull-out rows (a direction column, --direction pull, or "
                          "rows in recording order whose depth decreases)", "push-in rows only")
    free = [p for p in PARAMETERS if p in names or (p == "contact_angle" and np.any(~pull))
            or (p == "receding_angle" and np.any(pull))]
    if not np.any(~pull):
        free = [p for p in free if p != "contact_angle"]
    if not np.any(pull):
        free = [p for p in free if p != "receding_angle"]
    p = len(free)
    if D.size < p + 3:
        raise input_error("data", f"needs at least {p + 3} points to fit {p} parameter(s) with an interval", D.size)
    for name, mask in (("push-in", ~pull), ("pull-out", pull)):
        if 0 < np.count_nonzero(mask) < 3:
            raise input_error("data", f"needs at least 3 {name} rows to fit that branch's angle",
                              int(np.count_nonzero(mask)))
    err = _error_model(force_uncertainty, D.size)
    Fscale = max(float(np.max(np.abs(F))), 1e-12)
    law = k.build(g, liq, float(np.max(np.abs(D))))
    fixed = {"contact_angle": 90.0, "receding_angle": 90.0, "surface_tension": liq.sigma, "depth_offset": 0.0,
             "tare": 0.0}
    prob = _Problem(law, k, D, F, pull, free, fixed, Fscale)
    fit_tare = "tare" in free

    # --- estimate (IRLS to the fixed point for proportional errors) ---
    if err.kind == "estimated":
        prob.u = np.ones(D.size)
    elif err.kind == "known":
        prob.u = np.broadcast_to(np.asarray(err.absolute, dtype=float), D.size).astype(float)
    else:
        prob.u = _prop_u(err, F, warn=None)
    x0 = _start(prob, liq.sigma, fit_tare, k.slow)
    tol = 1e-8 if k.slow else 1e-15  # laws built per angle: each evaluation costs a curve
    x, S = prob.solve(x0, tol=tol)
    floored = 0
    if err.kind == "proportional":
        for _ in range(60):
            m, _, _ = prob.predict(prob.values(x))
            prob.u, floored = _prop_u(err, m, warn=True)
            x_new, S = prob.solve(x, tol=tol)
            done = np.all(np.abs(x_new - x) <= 1e-11 * np.maximum(1.0, np.abs(x)))
            x = x_new
            if done:
                break
        else:
            raise ConvergenceError("reweighted fit for the proportional force uncertainty did not settle in 60 rounds")
        m, _, _ = prob.predict(prob.values(x))
        prob.u, floored = _prop_u(err, m, warn=True)
        S = float(np.sum(prob.resid(x) ** 2))
    if floored:
        warn.append(f"{floored} row(s) have a modelled force near zero: their proportional uncertainty was raised "
                    "to a floor of 0.1 % of the largest force times the stated fraction; state an absolute part "
                    "as well, e.g. '0.01 mN + 1%'")

    # --- covariance ---
    dof = D.size - p
    J = prob.jac(x)
    JTJ = J.T @ J
    known = err.kind != "estimated"
    if not np.all(np.isfinite(JTJ)):
        raise ConvergenceError("the data do not determine the fitted parameter(s): the model is not finite there")
    dscale = np.sqrt(np.diag(JTJ))
    if np.any(dscale == 0):
        bad = free[int(np.argmin(dscale))]
        raise ConvergenceError(f"the data do not determine the {PARAMETERS[bad][1]}: the force does not change with it")
    Rn = JTJ / np.outer(dscale, dscale)
    if np.linalg.cond(Rn) > 1e12:
        raise ConvergenceError("the data do not determine the fitted parameters separately (they are almost "
                               f"perfectly correlated: {', '.join(free)}); fix one of them or add rows that tell them apart")
    cov_u = np.linalg.inv(JTJ)
    s2 = S / dof if dof > 0 else float("nan")
    if not known:
        cov_u = cov_u * s2
        q = float(stats.t.ppf(0.5 * (1.0 + c), dof))
        thresh = q * q * s2
    else:
        q = float(stats.norm.ppf(0.5 * (1.0 + c)))
        thresh = q * q
    sc = np.array([prob.scale[n_] for n_ in free])
    cov = cov_u * np.outer(sc, sc)
    se = np.sqrt(np.diag(cov))
    est = x * sc
    wald = {n_: (est[j] - q * se[j], est[j] + q * se[j]) for j, n_ in enumerate(free)}
    prof: dict[str, tuple[float, float]] = {}
    if intervals == "profile":
        for j, n_ in enumerate(free):
            prof[n_], open_end = _profile(prob, x, S, j, thresh, q * np.sqrt(cov_u[j, j]))
            if open_end:
                warn.append(f"the profile interval of the {PARAMETERS[n_][1]} reaches the end of its allowed range")
    for n_, (pl, ph) in prof.items():
        wl, wh = wald[n_]
        half = 0.5 * (wh - wl)
        if half > 0 and max(abs(pl - wl), abs(ph - wh)) > 0.1 * half:
            warn.append(f"the model is visibly nonlinear over the interval of the {PARAMETERS[n_][1]}: the profile "
                        f"interval ends differ from the Wald ones by up to {100 * max(abs(pl - wl), abs(ph - wh)) / half:.0f} % "
                        "of its half-width (the profile interval is the one to trust)")
    shown = prof if intervals == "profile" else wald
    method = "profile likelihood" if intervals == "profile" else "Wald (Jacobian)"
    for n_ in ("contact_angle", "receding_angle"):
        if n_ in shown:
            lo, hi = shown[n_]
            if lo < 0.0 or hi > 180.0:
                warn.append(f"{PARAMETERS[n_][1]} interval reaches 0° or 180°: clipped")
                shown[n_] = (max(lo, 0.0), min(hi, 180.0))
            if est[free.index(n_)] <= 0.01 or est[free.index(n_)] >= 179.99:
                warn.append(f"fitted {PARAMETERS[n_][1]} sits on the 0°/180° bound")
    corr = cov / np.outer(se, se)
    for i in range(p):
        for j in range(i + 1, p):
            if abs(corr[i, j]) > 0.95:
                warn.append(f"{free[i]} and {free[j]} are strongly correlated in this fit (r = {corr[i, j]:.3f}): "
                            "their separate intervals are wide; fix one of them if it is known")

    vals = prob.values(x)
    Fm, outside, before = prob.predict(vals)
    r = F - Fm
    rw = r / prob.u
    air = before & ~pull
    if np.count_nonzero(air) >= 2 and "depth_offset" not in free:
        scale_i = prob.u[air] if known else np.full(np.count_nonzero(air), math.sqrt(s2))
        z = float(np.sum(r[air] / scale_i ** 2) / math.sqrt(np.sum(1.0 / scale_i ** 2)))
        if abs(z) > 3.0:
            warn.append(f"{int(np.count_nonzero(air))} push-in row(s) above the surface (depth < 0, taken as not yet "
                        "touching) read a force beyond their noise: the zero of depth may be off; fit the depth "
                        "offset (--fit-depth-offset)")
    if fit_tare and not np.any(before):
        warn.append("the tare is fitted without rows at zero liquid force (before first touch or after pull-off): "
                    "it is then hard to tell from the angle; record some baseline rows")
    if np.any(outside):
        warn.append(f"{int(np.count_nonzero(outside))} point(s) lie outside the depth range of the model at the "
                    "fitted angle (before contact or past its last state) and were clamped to its ends")
    chi2 = chi2p = None
    if known:
        chi2 = float(S)
        chi2p = float(stats.chi2.sf(S, dof)) if dof > 0 else None
        if chi2p is not None and chi2p < 1e-3:
            warn.append(f"residuals are larger than the stated force uncertainty (chi-squared {S:.4g} for {dof} "
                        f"degrees of freedom, p = {chi2p:.2g}): the uncertainty is understated or the model misses "
                        "something, so the intervals are too narrow")
        elif chi2p is not None and chi2p > 0.999:
            warn.append(f"residuals are smaller than the stated force uncertainty (chi-squared {S:.4g} for {dof} "
                        f"degrees of freedom): the intervals are probably too wide")
    elif D.size >= 10:
        rho_s, pval = stats.spearmanr(np.abs(Fm - vals["tare"]), np.abs(r))
        if np.isfinite(rho_s) and rho_s > 0 and pval < 0.01:
            warn.append(f"residuals grow with the force (rank correlation {rho_s:.2f}, p = {pval:.1g}): the noise "
                        "is probably proportional, and an unweighted interval is then wrong; state it, e.g. "
                        "--force-uncertainty 1%")
    if np.any(pull) and "contact_angle" in free:
        ia, ir = free.index("contact_angle"), free.index("receding_angle")
        if est[ir] > est[ia] + q * math.sqrt(max(cov[ia, ia] + cov[ir, ir] - 2 * cov[ia, ir], 0.0)):
            warn.append("the receding angle exceeds the advancing angle: push and pull rows may be mislabelled")
    if k.name in ("rod", "rod_row") and g["length"] < 20 * math.sqrt(vals["surface_tension"] / (liq.rho * liq.g)):
        warn.append(f"length {g['length'] * 1e3:.3g} mm is under 20 capillary lengths: end effects not included")
    return _result(k, g, free, est, se, wald, prof, shown, corr, vals, method, err, known, c, chi2, chi2p, s2, D, F,
                   Fm, r, rw, prob.u, pull, before, dof, liq, warn, lines, q, cov)


def _prop_u(err: _Errors, m, warn):
    big = float(np.max(np.abs(m))) if np.size(m) else 0.0
    floor = 1e-3 * err.relative * max(big, 1e-300)
    rel = np.maximum(err.relative * np.abs(m), floor)
    u = np.sqrt(err.absolute ** 2 + rel ** 2)
    floored = int(np.count_nonzero(err.relative * np.abs(m) < floor)) if not err.absolute else 0
    return (u, floored) if warn is not None else u


def _profile(prob: _Problem, x, S, j, thresh, half):
    """Profile-likelihood interval of parameter j (scaled units in, SI out), and whether it is open-ended."""
    from scipy.optimize import brentq

    free = prob.free
    others = [n for i, n in enumerate(free) if i != j]
    lo_b, hi_b = prob.bounds()
    sc = prob.scale[free[j]]
    warm = {}

    def excess(b):
        if not others:
            xx = np.array(x, dtype=float)
            xx[j] = b
            return float(np.sum(prob.resid(xx) ** 2)) - S - thresh
        key = b > x[j]
        start = warm.get(key, np.delete(x, j))
        saved = prob.fixed[free[j]]
        prob.fixed[free[j]] = b * sc
        try:
            xo, So = prob.solve(start, others, strict=False, tol=1e-11)
        finally:
            prob.fixed[free[j]] = saved
        warm[key] = xo
        return So - S - thresh

    def secant(sign, bound):
        """Root of the profile t, g(b) = sqrt((S~(b) - S^)/threshold) - 1, which is near linear in b
        (Bates & Watts 1988, sec. 6.1); None if it does not settle (then bracketing is used)."""
        b0, g0 = x[j], -1.0
        b1 = x[j] + sign * max(half, 1e-9)
        for _ in range(10):
            if (b1 - bound) * sign >= 0 or (b1 - x[j]) * sign <= 0:
                return None
            g1 = math.sqrt(max(excess(b1) + thresh, 0.0) / thresh) - 1.0
            if abs(g1) < 1e-5:
                return b1
            if g1 == g0:
                return None
            b0, g0, b1 = b1, g1, b1 - g1 * (b1 - b0) / (g1 - g0)
        return None

    ends = []
    open_end = False
    for sign in (-1.0, 1.0):
        bound = lo_b[j] if sign < 0 else hi_b[j]
        root = secant(sign, bound)
        if root is not None:
            ends.append(root)
            continue
        step = max(half, 1e-9)
        a, b = x[j], x[j] + sign * step
        fb = None
        for _ in range(40):
            if (b - bound) * sign >= 0:
                b = bound
                fb = excess(b)
                break
            fb = excess(b)
            if fb > 0:
                break
            a, b = b, b + sign * step
            step *= 1.6
        if fb is None or fb <= 0:
            ends.append(b)
            open_end = True
            continue
        ends.append(brentq(excess, a, b, xtol=1e-4 * max(half, 1e-9), rtol=1e-10) if a != b else b)
    return (min(ends) * sc, max(ends) * sc), open_end


def _result(k, g, free, est, se, wald, prof, shown, corr, vals, method, err, known, c, chi2, chi2p, s2, D, F, Fm,
            r, rw, u, pull, before, dof, liq, warn, lines, q, cov) -> FitResult:
    def key(n):
        unit = PARAMETERS[n][0]
        return f"{n}_{ {'deg': 'deg', 'N/m': 'N_per_m', 'm': 'm', 'N': 'N'}[unit]}"

    def q_(n, pair=False):
        unit = PARAMETERS[n][0]
        if n not in free:
            if pair:
                return None
            return Q_(vals[n], unit) if n in ("surface_tension",) else (
                Q_(0.0, unit) if n in ("depth_offset", "tare") else None)
        j = free.index(n)
        return Q_(np.array(shown[n]), unit) if pair else Q_(float(est[j]), unit)

    hyst = hyst_ci = None
    if "contact_angle" in free and "receding_angle" in free:
        ia, ir = free.index("contact_angle"), free.index("receding_angle")
        h = float(est[ia] - est[ir])
        sh = math.sqrt(max(cov[ia, ia] + cov[ir, ir] - 2 * cov[ia, ir], 0.0))
        hyst, hyst_ci = Q_(h, "deg"), Q_(np.array([h - q * sh, h + q * sh]), "deg")
    geo = {}
    for name, (unit, _) in k.geometry.items():
        if g[name] is not None:
            geo[name if unit == "count" else f"{name}_m"] = g[name]
    return FitResult(
        element=k.name, geometry=geo,
        contact_angle=q_("contact_angle"), contact_angle_ci=q_("contact_angle", True),
        receding_angle=q_("receding_angle"), receding_angle_ci=q_("receding_angle", True),
        hysteresis=hyst, hysteresis_ci=hyst_ci, confidence=c, interval_method=method,
        surface_tension=q_("surface_tension"), surface_tension_ci=q_("surface_tension", True),
        surface_tension_fitted="surface_tension" in free,
        depth_offset=q_("depth_offset"), depth_offset_ci=q_("depth_offset", True),
        tare=q_("tare"), tare_ci=q_("tare", True), fitted=tuple(free),
        standard_errors={key(n): float(se[j]) for j, n in enumerate(free)},
        wald_ci={key(n): [float(wald[n][0]), float(wald[n][1])] for n in free},
        profile_ci={key(n): [float(prof[n][0]), float(prof[n][1])] for n in prof},
        correlation={"parameters": list(free), "matrix": [[float(x) for x in row] for row in corr]},
        error_model=err.text, force_uncertainty_known=known, chi_squared=chi2, chi_squared_p_value=chi2p,
        residual_scale=None if known else Q_(math.sqrt(s2), "N"),
        radius=Q_(g["radius"], "m") if g.get("radius") is not None else None,
        length=Q_(g["length"], "m") if g.get("length") is not None else None,
        count=int(g.get("count") or 1),
        points=int(D.size), push_points=int(np.count_nonzero(~pull)), pull_points=int(np.count_nonzero(pull)),
        points_before_contact=int(np.count_nonzero(before)), degrees_of_freedom=int(dof),
        residual_rms=Q_(math.sqrt(float(np.mean(r ** 2))), "N"),
        depth=Q_(D, "m"), force=Q_(F, "N"), fitted_force=Q_(Fm, "N"), residuals=Q_(r, "N"),
        weighted_residuals=rw if known else rw / math.sqrt(s2),
        force_uncertainty=Q_(np.array(u if known else np.full(D.size, math.sqrt(s2))), "N"),
        pull=pull, lines=lines, warnings=tuple(warn), cautions=liq.cautions,
    )


# ---------------------------------------------------------------------------------------------
# Compatibility wrappers, CSV and the demo


def fit_rod(depth: Any, force: Any, *, radius: Any, length: Any, liquid: Liquid | None = None,
            count: int = 1, fit_surface_tension: bool = False, confidence: float = 0.95,
            lines: Any = None, warnings: tuple[str, ...] = (), **kwargs) -> FitResult:
    """:func:`fit` for ``count`` long rods of ``radius`` and wetted ``length`` [m] (kept for compatibility)."""
    names = tuple(kwargs.pop("fit", ("contact_angle",))) + (("surface_tension",) if fit_surface_tension else ())
    return fit("rod", depth, force, geometry={"radius": radius, "length": length, "count": count}, liquid=liquid,
               fit=names, confidence=confidence, lines=lines, warnings=warnings, **kwargs)


def fit_element(element: str, depth: Any, force: Any, *, radius: Any = None, thickness: Any | None = None,
                liquid: Liquid | None = None, fit_surface_tension: bool = False, confidence: float = 0.95,
                lines: Any = None, warnings: tuple[str, ...] = (), **kwargs) -> FitResult:
    """:func:`fit` for a ball foot or flat pad (kept for compatibility)."""
    if element not in ("ball", "pad"):
        raise input_error("element", "must be ball or pad here (use fit() for the other kinds)", repr(element))
    geo = {"radius": radius} if element == "ball" else {"radius": radius, "thickness": thickness}
    if element == "pad" and thickness is None:
        raise input_error("thickness", "is required for a pad", "nothing")
    names = tuple(kwargs.pop("fit", ("contact_angle",))) + (("surface_tension",) if fit_surface_tension else ())
    return fit(element, depth, force, geometry=geo, liquid=liquid, fit=names, confidence=confidence, lines=lines,
               warnings=warnings, **kwargs)


def read_force_depth(path: Any, *, skip_bad_rows: bool = False):
    """Read a force–depth CSV: ``depth [unit]``, ``force [unit]``, optional ``force uncertainty [unit]``
    and ``direction`` (push/pull). Any other column is refused by name."""
    from .csvio import read_table

    return read_table(path, {"depth": "length", "force": "force"}, optional={"force uncertainty": "force"},
                      text_columns=("direction",), allow_extra=False, skip_bad_rows=skip_bad_rows, min_rows=1)


def fit_csv(kind: str, path: Any, *, skip_bad_rows: bool = False, force_uncertainty: Any = None,
            direction: Any = None, **kwargs) -> FitResult:
    """:func:`fit` on a CSV read by :func:`read_force_depth`.

    A ``force uncertainty`` column gives per-row uncertainties (then ``force_uncertainty`` must
    not also be given); a ``direction`` column gives the branch of each row (then ``direction``
    must not also be given).
    """
    t = read_force_depth(path, skip_bad_rows=skip_bad_rows)
    if "force uncertainty" in t.columns:
        if force_uncertainty is not None:
            raise input_error("force_uncertainty", "the file has a force uncertainty column: give one or the other",
                              repr(force_uncertainty))
        force_uncertainty = t.columns["force uncertainty"]
    if "direction" in t.text:
        if direction is not None and direction != "auto":
            raise input_error("direction", "the file has a direction column: give one or the other", repr(direction))
        direction = t.text["direction"]
    try:
        return fit(kind, t.columns["depth"], t.columns["force"], force_uncertainty=force_uncertainty,
                   direction=direction, lines=t.lines, warnings=t.warnings, **kwargs)
    except InputError as exc:
        msg = str(exc)
        if msg.startswith("direction:") and "on row" in msg and len(t.lines):
            row = int(msg.rsplit("on row", 1)[1].split()[0])
            raise InputError(msg.replace(f"on row {row}", f"on line {int(t.lines[row - 1])}")) from None
        raise


def fit_rod_csv(path: Any, *, skip_bad_rows: bool = False, **kwargs) -> FitResult:
    """:func:`fit_rod` on a CSV (see :func:`read_force_depth`)."""
    geo = {n: kwargs.pop(n) for n in ("radius", "length", "count") if n in kwargs}
    names = tuple(kwargs.pop("fit", ("contact_angle",))) + (
        ("surface_tension",) if kwargs.pop("fit_surface_tension", False) else ())
    return fit_csv("rod", path, skip_bad_rows=skip_bad_rows, geometry=geo, fit=names, **kwargs)


def fit_element_csv(element: str, path: Any, *, skip_bad_rows: bool = False, **kwargs) -> FitResult:
    """:func:`fit_element` on a CSV (see :func:`read_force_depth`)."""
    if element not in ("ball", "pad"):
        raise input_error("element", "must be ball or pad here (use fit_csv() for the other kinds)", repr(element))
    geo = {n: kwargs.pop(n) for n in ("radius", "thickness") if n in kwargs}
    if element == "ball":
        geo.pop("thickness", None)
    names = tuple(kwargs.pop("fit", ("contact_angle",))) + (
        ("surface_tension",) if kwargs.pop("fit_surface_tension", False) else ())
    return fit_csv(element, path, skip_bad_rows=skip_bad_rows, geometry=geo, fit=names, **kwargs)


def demo_path(name: str = DEMO_FILE):
    """Path of a shipped invented data set."""
    return resources.files("floatcalc").joinpath("data", name)


def demo_fit(cycle: bool = False, **kwargs) -> FitResult:
    """Fit a shipped invented data set with its invented rig (:data:`DEMO_RIG`).

    ``cycle=True`` fits the push-in/pull-out file (with a force uncertainty and a direction
    column) for both angles, the depth offset and the tare.
    """
    from ..liquids import liquid

    liq = liquid(DEMO_RIG["liquid"], DEMO_RIG["temperature"])
    geo = {"radius": DEMO_RIG["radius"], "length": DEMO_RIG["length"]}
    names = kwargs.pop("fit", ("contact_angle", "depth_offset", "tare") if cycle else ("contact_angle",))
    if kwargs.pop("fit_surface_tension", False):
        names = tuple(names) + ("surface_tension",)
    with demo_path(DEMO_CYCLE_FILE if cycle else DEMO_FILE).open("r", encoding="utf-8") as fh:
        return fit_csv("rod", fh, geometry=geo, liquid=liq, fit=names, **kwargs)


# ---------------------------------------------------------------------------------------------
# Plot


def fit_plot(result: FitResult):
    """Readings and fitted law against depth by branch, and the weighted residuals below.

    Weighted residual = (reading − fit) / u_i with u_i the stated uncertainty, or the residual
    scale s when the noise was estimated; about 95 % should lie within ±2 if the error model holds.
    """
    from matplotlib.figure import Figure

    fig = Figure(figsize=(6.4, 5.4), layout="constrained")
    ax, axr = fig.subplots(2, 1, sharex=True, height_ratios=[3, 1.5])
    D = result.depth.to("mm").magnitude
    F = result.force.to("mN").magnitude
    Fm = result.fitted_force.to("mN").magnitude
    pull = np.asarray(result.pull, dtype=bool)
    for mask, label, colour, angle in ((~pull, "push-in", "#1f5fa8", result.contact_angle),
                                       (pull, "pull-out", "#c2571a", result.receding_angle)):
        if not np.any(mask):
            continue
        o = np.argsort(D[mask])
        ax.plot(D[mask], F[mask], "o", ms=3.5, color=colour, alpha=0.75, label=f"{label} data")
        ax.plot(D[mask][o], Fm[mask][o], "-", lw=1.6, color=colour,
                label=f"fit: θ = {angle.magnitude:.2f}°" if angle is not None else "fit")
        axr.plot(D[mask], result.weighted_residuals[mask], "o", ms=3.5, color=colour)
    ax.set_ylabel("force reading [mN]")
    ax.legend(fontsize=8)
    for y, ls in ((0.0, "-"), (2.0, ":"), (-2.0, ":")):
        axr.axhline(y, color="0.5", lw=0.8, ls=ls)
    axr.set_xlabel("depth reading of the lowest point [mm]")
    axr.set_ylabel("weighted residual" if result.force_uncertainty_known else "residual / s")
    return fig
