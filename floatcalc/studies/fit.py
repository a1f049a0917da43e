"""Calibration: effective advancing contact angle (and optionally surface tension) from force–depth data.

A long rod (leg) of known radius R and wetted length L is pushed into the liquid and the
upward force F is recorded against the depth D of its lowest point below the undisturbed
surface. The model is the exact 2D force–depth law (Vella, Lee & Kim 2006; see
:mod:`floatcalc.studies._rodcurve`)

.. math:: F(D; \\theta, \\sigma) = n L \\sigma\\, f\\big(\\phi(D/l_c),\\, R/l_c,\\, \\theta\\big),
          \\qquad l_c = \\sqrt{\\sigma/(\\rho g)},

with φ(D) the contact position at that depth. The angle (and σ if asked) is fitted by
least squares (:func:`scipy.optimize.least_squares`, trust-region reflective, 3-point
Jacobian) after a coarse scan of θ for the starting point. The confidence interval is the
Jacobian (Wald) interval

.. math:: \\hat\\theta \\pm t_{(1+c)/2,\\,N-p}\\sqrt{s^2 [(J^T J)^{-1}]_{\\theta\\theta}},
          \\qquad s^2 = \\frac{\\sum r_i^2}{N - p},

which assumes independent, equal-variance force errors and a model near linear over the
interval (Bates & Watts, Nonlinear Regression Analysis and Its Applications, Wiley 1988).

Ball feet and flat pads (:func:`fit_element`) use the axisymmetric force–depth curves of
:mod:`floatcalc.round` in the same way.

Validity: that of the rod law (long rigid rod, L ≳ 20 l_c, static, clean surface) and the
advancing branch (the rod is pushed down, so the contact line advances). Points deeper than
the model allows at the fitted angle (the rod would be engulfed) are clamped to the deepest
state and reported; points on the falling branch past the maximum force are fine for a
displacement-controlled rig.

Examples
--------
>>> r = demo_fit()
>>> lo, hi = r.contact_angle_ci.magnitude
>>> bool(lo < r.contact_angle.magnitude < hi), r.points
(True, 40)
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from importlib import resources
from typing import Any

import numpy as np

from .. import _validate as v
from ..errors import ConvergenceError, input_error
from ..liquids import Liquid, water
from ..results import Result, field, qfield
from ..units import Q_
from . import _rodcurve

REFERENCES = (
    "Vella, Lee & Kim, Langmuir 22, 5979 (2006): force-depth law of a floating rod",
    "Bates & Watts, Nonlinear Regression Analysis and Its Applications, Wiley (1988): Jacobian intervals",
)

#: The shipped invented data set and the (invented) rig it pretends to come from.
DEMO_FILE = "demo_force_depth.csv"
DEMO_RIG = {"radius": "0.25 mm", "length": "60 mm", "liquid": "water", "temperature": "20 degC"}


@dataclass(frozen=True, kw_only=True)
class FitResult(Result):
    """Fitted parameters, their confidence intervals, and residuals for plotting."""

    element: str = field(default="rod")
    contact_angle: Any = qfield("deg")
    contact_angle_ci: Any = qfield("deg")
    confidence: float = field(default=0.95)
    surface_tension: Any = qfield("N/m")
    surface_tension_ci: Any = qfield("N/m", default=None)
    surface_tension_fitted: bool = field(default=False)
    radius: Any = qfield("m")
    length: Any = qfield("m", default=None)
    count: int = field(default=1)
    points: int = field(default=0)
    degrees_of_freedom: int = field(default=0)
    residual_rms: Any = qfield("N")
    depth: Any = qfield("m", json=False)
    force: Any = qfield("N", json=False)
    fitted_force: Any = qfield("N", json=False)
    residuals: Any = qfield("N", json=False)
    lines: Any = field(default=None, json=False)
    warnings: tuple[str, ...] = field(default=())
    cautions: tuple[str, ...] = field(default=())
    references: tuple[str, ...] = field(default=REFERENCES)


def _model(D, R, L, n, rho, g, theta_deg, sigma):
    lc = math.sqrt(sigma / (rho * g))
    f, outside = _rodcurve.force_at_depth(np.asarray(D) / lc, R / lc, math.radians(theta_deg))
    return n * L * sigma * f, outside


def fit_rod(depth: Any, force: Any, *, radius: Any, length: Any, liquid: Liquid | None = None,
            count: int = 1, fit_surface_tension: bool = False, confidence: float = 0.95,
            lines: Any = None, warnings: tuple[str, ...] = ()) -> FitResult:
    """Fit the effective advancing contact angle of a rod from force–depth data.

    Parameters
    ----------
    depth : array [m]
        Depth of the rod's lowest point below the undisturbed surface (positive down).
    force : array [N]
        Upward force the liquid exerts on the rod(s).
    radius, length : [m]
        Rod radius and wetted length of each rod.
    liquid : Liquid, optional
        Gives ρ, g and (unless fitted) σ; default water at 20 °C.
    count : int
        Number of identical rods measured together (far apart).
    fit_surface_tension : bool
        Fit σ too (e.g. a surface of unknown cleanliness).
    confidence : float
        Confidence level of the intervals, 0.5–0.999.

    Returns
    -------
    FitResult

    Raises
    ------
    InputError
        Too few points, mismatched arrays, bad parameters.
    ConvergenceError
        The optimiser failed or the data do not determine the parameters.
    """
    liq = water() if liquid is None else liquid
    R = v.length(radius, "radius")
    L = v.length(length, "length")
    n = v.count(count)
    D, F, c = _data(depth, force, confidence, 2 if fit_surface_tension else 1)
    rho, g, sig0 = liq.rho, liq.g, liq.sigma

    def model(theta_deg, sigma):
        return _model(D, R, L, n, rho, g, theta_deg, sigma)

    def scan(grid):
        lc0 = math.sqrt(sig0 / (rho * g))
        f_grid, _ = _rodcurve.force_at_depth(D[None, :] / lc0, R / lc0, np.radians(grid)[:, None])
        return np.sum((n * L * sig0 * f_grid - F[None, :]) ** 2, axis=1)

    warn = list(warnings)
    out = _fit(D, F, model, scan, np.arange(1.0, 180.0, 1.0), sig0, fit_surface_tension, c, warn)
    lc = math.sqrt(out["sigma"] / (rho * g))
    if L < 20 * lc:
        warn.append(f"length {L * 1e3:.3g} mm is under 20 capillary lengths: end effects not included")
    return _result(out, D, F, c, fit_surface_tension, liq, warn, lines, element="rod", radius=R, length=L, count=n)


def fit_element(element: str, depth: Any, force: Any, *, radius: Any, thickness: Any | None = None,
                liquid: Liquid | None = None, fit_surface_tension: bool = False, confidence: float = 0.95,
                lines: Any = None, warnings: tuple[str, ...] = ()) -> FitResult:
    """Fit the effective advancing contact angle of a ball foot or flat pad from force–depth data.

    The model is the element's force–depth curve from :func:`floatcalc.ball` or
    :func:`floatcalc.pad` (axisymmetric Young–Laplace meniscus; see :mod:`floatcalc.round`),
    read at the measured depths with its ``force_at_depth`` interpolant; depths past the end
    of the curve at a trial angle are clamped to its end and reported. The fit and the
    interval are as for :func:`fit_rod`. Each trial angle builds the element once (a fraction
    of a second), so the starting scan is coarse (every 10°).

    Parameters
    ----------
    element : {"ball", "pad"}
    depth, force : arrays [m], [N]
    radius : [m]
    thickness : [m]
        Pad thickness (pads only).
    liquid, fit_surface_tension, confidence
        As for :func:`fit_rod`.
    """
    import dataclasses

    from .. import round as rnd

    if element not in ("ball", "pad"):
        raise input_error("element", "must be rod, ball or pad", repr(element))
    liq = water() if liquid is None else liquid
    R = v.length(radius, "radius")
    T = v.length(thickness, "thickness") if element == "pad" else None
    if element == "pad" and thickness is None:
        raise input_error("thickness", "is required for a pad", "nothing")
    D, F, c = _data(depth, force, confidence, 2 if fit_surface_tension else 1)
    cache: dict = {}

    def model(theta_deg, sigma):
        key = (round(float(theta_deg), 12), round(float(sigma), 15))
        if key not in cache:
            lq = liq if sigma == liq.sigma else dataclasses.replace(liq, sigma=sigma)
            th = math.radians(min(max(theta_deg, 0.0), 180.0))
            r = rnd.ball(R, th, liquid=lq) if element == "ball" else rnd.pad(R, T, th, liquid=lq)
            end = float(r.curve.depth.to("m").magnitude[-1])
            Dc = np.minimum(D, end)
            cache[key] = (r.curve.force_at_depth(Dc).to("N").magnitude, D > end * (1 + 1e-12))
        return cache[key]

    def scan(grid):
        return np.array([np.sum((model(t, liq.sigma)[0] - F) ** 2) for t in grid])

    warn = list(warnings)
    out = _fit(D, F, model, scan, np.arange(10.0, 180.0, 10.0), liq.sigma, fit_surface_tension, c, warn)
    return _result(out, D, F, c, fit_surface_tension, liq, warn, lines, element=element, radius=R, length=None,
                   count=1)


def _data(depth, force, confidence, p):
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
    if D.size < p + 3:
        raise input_error("data", f"needs at least {p + 3} points to fit {p} parameter(s) with an interval", D.size)
    if np.ptp(D) <= 0:
        raise input_error("data", "depths must not all be equal", f"{D[0]:g} m")
    return D, F, c


def _fit(D, F, model, scan, grid, sig0, fit_sigma, c, warn):
    """Least squares for θ [deg] (and σ [mN/m]) with Jacobian intervals; see module docstring."""
    from scipy import stats
    from scipy.optimize import least_squares

    p = 2 if fit_sigma else 1
    scale = max(float(np.max(np.abs(F))), 1e-12)
    t0 = float(grid[int(np.argmin(scan(grid)))])

    def resid(x):
        sigma = x[1] * 1e-3 if fit_sigma else sig0
        return (model(x[0], sigma)[0] - F) / scale

    x0 = [t0, sig0 * 1e3] if fit_sigma else [t0]
    lb = [0.0, 1.0] if fit_sigma else [0.0]
    ub = [180.0, 1000.0] if fit_sigma else [180.0]
    res = least_squares(resid, x0, bounds=(lb, ub), method="trf", jac="3-point", diff_step=1e-6,
                        x_scale=[10.0, 10.0][:p], xtol=1e-12, ftol=1e-12, gtol=1e-12, max_nfev=2000)
    if not res.success:
        raise ConvergenceError(f"contact-angle fit did not converge: {res.message}")
    x = res.x
    r = res.fun * scale
    dof = D.size - p
    s2 = float(np.sum(r**2)) / dof
    J = res.jac * scale
    JTJ = J.T @ J
    if not np.all(np.isfinite(JTJ)) or np.linalg.cond(JTJ) > 1e14:
        raise ConvergenceError("the data do not determine the fitted parameter(s): force hardly changes with them")
    cov = s2 * np.linalg.inv(JTJ)
    tq = float(stats.t.ppf(0.5 * (1.0 + c), dof))
    half = tq * np.sqrt(np.diag(cov))
    th_lo, th_hi = x[0] - half[0], x[0] + half[0]
    if th_lo < 0.0 or th_hi > 180.0:
        warn.append("contact-angle interval reaches 0° or 180°: clipped, and the Wald interval is unreliable there")
        th_lo, th_hi = max(th_lo, 0.0), min(th_hi, 180.0)
    if x[0] <= 0.01 or x[0] >= 179.99:
        warn.append("fitted angle sits on the 0°/180° bound")
    sigma_hat = x[1] * 1e-3 if fit_sigma else sig0
    Fm, outside = model(x[0], sigma_hat)
    if np.any(outside):
        warn.append(f"{int(np.count_nonzero(outside))} point(s) lie outside the depth range of the model at the "
                    "fitted angle (before contact or past its last state) and were clamped to its ends")
    s_ci = None
    if fit_sigma:
        s_ci = np.array([x[1] - half[1], x[1] + half[1]]) * 1e-3
        corr = cov[0, 1] / math.sqrt(cov[0, 0] * cov[1, 1])
        if abs(corr) > 0.95:
            warn.append(f"angle and surface tension are strongly correlated in this fit (r = {corr:.3f}): "
                        "their separate intervals are wide; fix σ if it is known")
    return {"theta": float(x[0]), "ci": (th_lo, th_hi), "sigma": sigma_hat, "sigma_ci": s_ci, "fitted": Fm,
            "residuals": r, "dof": dof}


def _result(out, D, F, c, fit_sigma, liq, warn, lines, *, element, radius, length, count) -> FitResult:
    r = out["residuals"]
    return FitResult(
        element=element,
        contact_angle=Q_(out["theta"], "deg"), contact_angle_ci=Q_(np.array(out["ci"]), "deg"),
        confidence=c, surface_tension=Q_(out["sigma"], "N/m"),
        surface_tension_ci=None if out["sigma_ci"] is None else Q_(out["sigma_ci"], "N/m"),
        surface_tension_fitted=bool(fit_sigma), radius=Q_(radius, "m"),
        length=None if length is None else Q_(length, "m"), count=count,
        points=int(D.size), degrees_of_freedom=int(out["dof"]), residual_rms=Q_(math.sqrt(float(np.mean(r**2))), "N"),
        depth=Q_(D, "m"), force=Q_(F, "N"), fitted_force=Q_(out["fitted"], "N"), residuals=Q_(r, "N"), lines=lines,
        warnings=tuple(warn), cautions=liq.cautions,
    )


def fit_rod_csv(path: Any, *, skip_bad_rows: bool = False, **kwargs) -> FitResult:
    """:func:`fit_rod` on a CSV with columns ``depth [unit]`` and ``force [unit]``."""
    t = _table(path, skip_bad_rows)
    return fit_rod(t.columns["depth"], t.columns["force"], lines=t.lines, warnings=t.warnings, **kwargs)


def fit_element_csv(element: str, path: Any, *, skip_bad_rows: bool = False, **kwargs) -> FitResult:
    """:func:`fit_element` on a CSV with columns ``depth [unit]`` and ``force [unit]``."""
    t = _table(path, skip_bad_rows)
    return fit_element(element, t.columns["depth"], t.columns["force"], lines=t.lines, warnings=t.warnings, **kwargs)


def _table(path, skip_bad_rows):
    from .csvio import read_table

    return read_table(path, {"depth": "length", "force": "force"}, skip_bad_rows=skip_bad_rows, min_rows=1)


def demo_path():
    """Path of the shipped invented data set."""
    return resources.files("floatcalc").joinpath("data", DEMO_FILE)


def demo_fit(**kwargs) -> FitResult:
    """Fit the shipped invented data set with its invented rig (:data:`DEMO_RIG`)."""
    from ..liquids import liquid

    liq = liquid(DEMO_RIG["liquid"], DEMO_RIG["temperature"])
    with demo_path().open("r", encoding="utf-8") as fh:
        return fit_rod_csv(fh, radius=DEMO_RIG["radius"], length=DEMO_RIG["length"], liquid=liq, **kwargs)
