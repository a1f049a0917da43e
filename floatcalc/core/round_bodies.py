"""Force laws of round support elements on an axisymmetric meniscus, in scaled variables.

Lengths in capillary lengths l_c, forces in σ l_c, volumes in l_c³ (so a volume V weighs
ρ g l_c³ V = σ l_c V: volumes are forces in these units). ``d`` denotes the depth of the contact
line below z = 0 (d = −z_c), from :func:`floatcalc.core.axisym.contact_height` (outer menisci)
or :func:`floatcalc.core.axisym.solve` with ``side="inner"`` (inside a ring). Conventions as in
:mod:`floatcalc.core.rod2d`: φ is the contact position on a circular section measured from its
lowest point, ψ = φ + θ − π the interface inclination there (positive when depressed).

Force on a body = vertical surface-tension pull along each contact line (2π r_c sin ψ) plus the
hydrostatic pressure (gauge −z, scaled) integrated over the wetted surface.

* **Ball** (sphere of radius R, contact at φ): r_c = R sin φ, depth of the lowest point
  D = d + R(1 − cos φ). Pressure on the wetted cap, by the divergence theorem over the cap
  closed by the disc z = z_c: F_p = V_cap + π r_c² d, with
  V_cap = (π/3) R³ (1 − cos φ)² (2 + cos φ) — the weight of liquid that would fill the space
  between the wetted cap and the plane z = 0.
* **Flat pad** (radius a, thickness t, sharp 90° edges): the line pins at the bottom edge while
  θ − π ≤ ψ ≤ θ − π/2 (Gibbs' inequality: at an edge of solid angle α the interface turns
  through π − α), climbs the side at ψ = θ − π/2, then pins at the top edge for
  θ − π/2 ≤ ψ ≤ θ; beyond ψ = θ liquid floods the top face. Pressure acts on the bottom face
  only: F = 2π a sin ψ + π a² D.
* **Vertical pin** (radius b, flat tip at depth D): a pad of unbounded thickness.
* **Ring footpad** (wire radius b on a circle of radius R_r): an outer contact line at φ_o and
  an inner one at φ_i, both with the same lowest-point depth D; the inner meniscus is the
  enclosed, centre-regular one. Pressure on the toroidal wetted surface (exact integral, see
  :func:`torus_pressure`).

References
----------
.. [1] J. B. Keller, Phys. Fluids 10, 3009 (1998).
.. [2] D. Vella, D.-G. Lee, H.-Y. Kim, Langmuir 22, 5979 (2006) (force law of a rod section).
.. [3] J. W. Gibbs, The Scientific Papers, vol. 1, p. 326 (1906); J. F. Oliver, C. Huh,
   S. G. Mason, J. Colloid Interface Sci. 59, 568 (1977) (pinning at sharp edges).
"""

from __future__ import annotations

import numpy as np

from ..errors import ConvergenceError
from . import axisym

PI = np.pi


def depth_outer(rc, psi):
    """Contact-line depth d = −z_c [l_c] of an outer meniscus (table with direct fallback)."""
    return -axisym.contact_height(rc, psi)


# ---------------------------------------------------------------------------------------------
# Ball


def sphere_cap_volume(R, phi):
    """Volume of the spherical cap below the contact circle at φ: (π/3)R³(1 − cos φ)²(2 + cos φ)."""
    c = np.cos(phi)
    return PI / 3.0 * R**3 * (1.0 - c) ** 2 * (2.0 + c)


def ball_state(phi, R, theta):
    """Contact radius, inclination, depths and force parts of a sphere at contact position φ.

    Returns dict of arrays: ``rc``, ``psi``, ``d`` (contact-line depth), ``depth`` (of the
    lowest point), ``surface_tension``, ``pressure``, ``force``.

    >>> s = ball_state(np.array([np.pi / 2]), 1e-3, np.pi)   # tiny ball, θ = 180°, φ = 90°
    >>> float(np.round(s["force"][0] / (2 * np.pi * 1e-3), 4))  # ψ = 90°: pull 2πR, pressure ≪
    1.0
    """
    phi = np.asarray(phi, dtype=float)
    rc = R * np.sin(phi)
    psi = phi + theta - PI
    d = np.zeros_like(phi)
    ok = rc > 0
    d[ok] = depth_outer(rc[ok], psi[ok])
    f_st = 2.0 * PI * rc * np.sin(psi)
    f_p = sphere_cap_volume(R, phi) + PI * rc**2 * d
    return {"phi": phi, "rc": rc, "psi": psi, "d": d, "depth": d + R * (1.0 - np.cos(phi)),
            "surface_tension": f_st, "pressure": f_p, "force": f_st + f_p}


def ball_curve(R: float, theta: float, n: int = 241):
    """Force–depth curve of a sphere for φ from 0 to π (contact radii below the table's
    lower end are skipped; φ = 0 and φ = π are added exactly), cut where the lowest-point
    depth stops increasing."""
    from .axisym_table import R_MIN

    phi = np.linspace(0.0, PI, n)[1:-1]
    phi = phi[R * np.sin(phi) >= R_MIN]
    st = ball_state(phi, R, theta)
    v_all = 4.0 / 3.0 * PI * R**3
    ends = {"phi": (0.0, PI), "rc": (0.0, 0.0), "psi": (theta - PI, theta), "d": (0.0, 0.0),
            "depth": (0.0, 2.0 * R), "surface_tension": (0.0, 0.0), "pressure": (0.0, v_all),
            "force": (0.0, v_all)}
    cur = {k: np.concatenate([[ends[k][0]], st[k], [ends[k][1]]]) for k in st}
    # Keep the branch on which the lowest-point depth increases with φ, the one followed by
    # pushing down: a non-wetting ball first touching has a raised neck (ψ < 0) and is drawn
    # in (depth falling below zero as φ grows), and a thin ball near full immersion can rise
    # again as φ → π. States where depth falls with φ are unstable under depth control.
    sl = _rising_branch(cur["depth"])
    return {k: val[sl] for k, val in cur.items()}


def _rising_branch(depth):
    """Slice of the first run of increasing depth (from its first rise to its first fall)."""
    up = np.diff(depth) > 0
    i0 = int(np.argmax(up)) if up.any() else 0
    rest = up[i0:]
    m = depth.size if rest.all() else i0 + int(np.argmin(rest)) + 1
    return slice(i0, m)


def ball_limit(R: float, theta: float, n: int = 241):
    """Largest upward force over φ: dense curve, then golden-section refinement.

    Returns (state dict at the maximum, curve dict).
    """
    from scipy.optimize import minimize_scalar

    cur = ball_curve(R, theta, n)
    k = int(np.argmax(cur["force"]))
    phi_k = cur["phi"][k]
    last = cur["phi"].size - 1
    # also refine when the maximum is the last point of a curve cut where the depth turns back
    # (not at full immersion, φ = π): the peak may lie between the last two points
    if 0 < k < last or (0 < k == last and cur["phi"][k] < PI - 1e-9):
        lo, hi = cur["phi"][k - 1], cur["phi"][min(k + 1, last)]
        res = minimize_scalar(lambda p: -float(ball_state(np.array([p]), R, theta)["force"][0]),
                              bounds=(lo, hi), method="bounded", options={"xatol": 1e-10})
        if -res.fun >= cur["force"][k]:
            phi_k = float(res.x)
        st = ball_state(np.array([phi_k]), R, theta)
        best = {key: float(val[0]) for key, val in st.items()}
    else:
        best = {key: float(val[k]) for key, val in cur.items()}
    return best, cur


# ---------------------------------------------------------------------------------------------
# Flat pad and pin (a pad of unbounded thickness)

STAGES = ("pinned at bottom edge", "contact line on the side", "pinned at top edge")


def _psi_at_depth(a, d_target, lo, hi):
    """ψ in [lo, hi] with depth_outer(a, ψ) = d_target (bisection, vectorised, to 1e-13)."""
    lo = np.full_like(np.asarray(d_target, dtype=float), lo)
    hi = np.full_like(lo, hi)
    for _ in range(60):
        mid = 0.5 * (lo + hi)
        above = depth_outer(a, mid) < d_target
        lo, hi = np.where(above, mid, lo), np.where(above, hi, mid)
    return 0.5 * (lo + hi)


def pad_curve(a: float, t: float, theta: float, n: int = 120, depth_max: float | None = None):
    """Force–depth curve of a flat pad through its three stages, up to flooding of the top face.

    Parameters
    ----------
    a : float [l_c]
        Pad radius.
    t : float [l_c]
        Pad thickness (``np.inf`` for a pin: no top edge).
    depth_max : float [l_c], optional
        For a pin (t = ∞): depth at which the curve stops (default: the side stage runs
        max(2, 4a) beyond its start).
    theta : float [rad]
        Advancing contact angle.

    Returns
    -------
    dict of arrays ``depth``, ``psi``, ``d``, ``surface_tension``, ``pressure``, ``force`` and
    ``stage`` (index into :data:`STAGES`).
    """
    psi_side = theta - 0.5 * PI
    d_side = float(depth_outer(a, psi_side))
    parts = []
    if psi_side > 0:  # stage 1: pinned at the bottom edge, ψ from 0 to ψ_side
        psi1 = np.linspace(0.0, psi_side, n)
        parts.append((psi1, depth_outer(a, psi1), 0))
    D_top = t + d_side  # depth at which the line reaches the top edge
    D2_lo = max(0.0, d_side)
    if D_top > D2_lo:
        D2_hi = D_top if np.isfinite(t) else (
            max(depth_max, D2_lo + 1e-6) if depth_max is not None else D2_lo + max(2.0, 4.0 * a))
        D2 = np.linspace(D2_lo, D2_hi, n)
        parts.append((np.full_like(D2, psi_side), D2, 1))
    if np.isfinite(t):
        if D_top >= 0:
            psi_start = psi_side
        else:  # thin wetted pad: at touch-down the line is already at the top edge
            psi_start = float(_psi_at_depth(a, np.array([-t]), psi_side, theta)[0])
        psi3 = np.linspace(psi_start, theta, n)
        parts.append((psi3, t + depth_outer(a, psi3), 2))
    psi = np.concatenate([p[0] for p in parts])
    D = np.concatenate([p[1] for p in parts])
    stage = np.concatenate([np.full(p[0].size, p[2]) for p in parts])
    keep = np.concatenate([[True], np.diff(D) > 0])  # drop repeated stage-boundary points
    psi, D, stage = psi[keep], D[keep], stage[keep]
    f_st = 2.0 * PI * a * np.sin(psi)
    f_p = PI * a * a * D
    d = np.where(stage == 0, D, np.where(stage == 1, d_side, D - (t if np.isfinite(t) else 0.0)))
    return {"depth": D, "psi": psi, "d": d, "surface_tension": f_st, "pressure": f_p,
            "force": f_st + f_p, "stage": stage}


def pad_limit(a: float, t: float, theta: float, n: int = 120):
    """Largest upward force of a pad (reached while pinned at the top edge); (state, curve)."""
    from scipy.optimize import minimize_scalar

    cur = pad_curve(a, t, theta, n)
    k = int(np.argmax(cur["force"]))

    def f(p):
        return 2.0 * PI * a * np.sin(p) + PI * a * a * (t + float(depth_outer(a, np.array([p]))[0]))

    best = {key: float(val[k]) for key, val in cur.items()}
    if cur["stage"][k] == 2 and 0 < k < cur["psi"].size - 1 and cur["stage"][k - 1] == 2:
        res = minimize_scalar(lambda p: -f(p), bounds=(cur["psi"][k - 1], cur["psi"][k + 1]),
                              method="bounded", options={"xatol": 1e-10})
        if -res.fun >= best["force"]:
            p = float(res.x)
            D = t + float(depth_outer(a, np.array([p]))[0])
            best.update(psi=p, depth=D, d=D - t, surface_tension=2 * PI * a * np.sin(p),
                        pressure=PI * a * a * D, force=-float(res.fun))
    return best, cur


def pin_state(b: float, theta: float, depth: float):
    """Contact inclination, contact-line depth and force parts of a pin with tip at ``depth``.

    The line sits on the side (ψ = θ − π/2) unless the tip is shallower than that meniscus
    (non-wetting pin just touching), where it pins at the tip edge.
    """
    psi_side = theta - 0.5 * PI
    d_side = float(depth_outer(b, psi_side))
    if depth >= d_side:
        psi, d, stage = psi_side, d_side, 1
    else:
        psi = float(_psi_at_depth(b, np.array([depth]), 0.0, psi_side)[0])
        d, stage = depth, 0
    f_st = 2.0 * PI * b * np.sin(psi)
    f_p = PI * b * b * depth
    return {"psi": psi, "d": d, "stage": stage, "surface_tension": f_st, "pressure": f_p,
            "force": f_st + f_p, "depth": depth}


# ---------------------------------------------------------------------------------------------
# Ring footpad


def torus_pressure(Rr, b, D, phi_o, phi_i):
    """Upward hydrostatic force [σ l_c] on the wetted part of a torus wire section.

    The section (radius b, centre at radius Rr and height b − D) is wetted from α = −φ_i (inner
    side) to α = φ_o (outer side), α measured from its lowest point. With gauge pressure −z,

    .. math::

        F_p = 2\\pi b \\int_{-\\phi_i}^{\\phi_o} (D - b + b\\cos\\alpha)\\cos\\alpha
              \\,(R_r + b\\sin\\alpha)\\, d\\alpha

    evaluated in closed form.

    >>> round(float(torus_pressure(1e6, 1.0, 1.0, np.pi / 2, np.pi / 2) / (2 * np.pi * 1e6)), 6)
    1.570796
    """
    c0 = np.asarray(D, dtype=float) - b

    def prim(x):
        return (Rr * (c0 * np.sin(x) + b * (0.5 * x + 0.25 * np.sin(2 * x)))
                + b * (0.5 * c0 * np.sin(x) ** 2 - b * np.cos(x) ** 3 / 3.0))

    return 2.0 * PI * b * (prim(np.asarray(phi_o)) - prim(-np.asarray(phi_i)))


RING_STEPS = 300  # inner-meniscus RK4 steps (Richardson-extrapolated: ~1e-8 relative depth)


def _inner_depth(Rr, b, theta, phi_i, tight=True, start=None, full=False):
    rci = Rr - b * np.sin(phi_i)
    psi = phi_i + theta - PI
    out = axisym.solve(rci, psi, side="inner", tight=tight, steps=RING_STEPS, warm_start=start)
    if full:
        return -out["height"], out["volume"], out["start"]
    return -out["height"], out["volume"]


def _ring_inverse(Rr, b, theta, n):
    """Inner side on a φ_i grid: cubic-spline inverse D → φ_i over the part where the
    lowest-point depth rises with φ_i, its depth range, and whether it stops rising early."""
    from scipy.interpolate import CubicSpline

    phi = np.linspace(0.0, PI, n)
    d_i, _ = _inner_depth(Rr, b, theta, phi, tight=False)  # first guesses only: Newton polishes
    Di = d_i + b * (1.0 - np.cos(phi))
    # longest run of rising depth (a wetting ring's raised start and a flooding end can fall)
    up = np.diff(Di) > 0
    best, run, start, bstart = 0, 0, 0, 0
    for k, u in enumerate(up):
        run, start = (run + 1, start) if u else (0, k + 1)
        if run > best:
            best, bstart = run, start
    if best < 3:
        raise ConvergenceError("ring footpad: no rising branch of the inner meniscus depth found")
    sl = slice(bstart, bstart + best + 1)
    return CubicSpline(Di[sl], phi[sl]), Di[sl][0], Di[sl][-1], best + 1 < Di.size


def _ring_states(Rr, b, theta, phi_o, inv):
    """Ring state for outer contact positions φ_o: the inner position φ_i gives the same
    lowest-point depth on both sides (spline inverse, then Newton/secant steps on the exact
    inner solve until the depths agree to 1e-10 l_c, or 1e-10 relative deeper than 1 l_c)."""
    rco = Rr + b * np.sin(phi_o)
    d_o = depth_outer(rco, phi_o + theta - PI)
    D = d_o + b * (1.0 - np.cos(phi_o))
    dinv = inv.derivative()
    x = np.clip(inv(D), 0.0, PI)
    start, x_prev, g_prev = None, None, None
    scale = np.maximum(1.0, np.abs(D))
    for _ in range(8):
        d_i, vol_i, start = _inner_depth(Rr, b, theta, x, start=start, full=True)
        Di = d_i + b * (1 - np.cos(x))
        g = Di - D
        if np.all(np.abs(g) < 1e-10 * scale):
            break
        # slope dφ_i/dD: the spline inverse's at first, then secant through the exact solves
        # (the coarse spline's slope alone converges only linearly, too slowly for thick wires)
        slope = dinv(Di)
        if x_prev is not None:
            dg = g - g_prev
            with np.errstate(divide="ignore", invalid="ignore"):
                sec = (x - x_prev) / np.where(dg != 0, dg, np.inf)
                q = sec / slope
            ok = (q > 0.1) & (q < 10.0)  # guard against round-off in dg
            slope = np.where(ok, sec, slope)
        x_prev, g_prev = x, g
        x = np.clip(x - g * slope, 0.0, PI)
    else:
        if np.any(np.abs(g) > 1e-8 * scale):
            raise ConvergenceError("ring footpad: inner and outer contact positions did not match")
    phi_i = x
    psi_o, psi_i = phi_o + theta - PI, phi_i + theta - PI
    rci = Rr - b * np.sin(phi_i)
    f_st = 2.0 * PI * (rco * np.sin(psi_o) + rci * np.sin(psi_i))
    f_p = torus_pressure(Rr, b, D, phi_o, phi_i)
    return {"depth": D, "phi_outer": phi_o, "phi_inner": phi_i, "psi_outer": psi_o,
            "psi_inner": psi_i, "d_outer": d_o, "d_inner": d_i, "surface_tension": f_st,
            "pressure": f_p, "enclosed": vol_i, "force": f_st + f_p}


def ring_curve(Rr: float, b: float, theta: float, n: int = 61):
    """Force–depth curve of a ring footpad from first contact until one side floods (φ = π)
    or, earlier, the lowest-point depth stops rising with φ_o (end of the push-down branch).

    Returns dict of arrays ``depth``, ``phi_outer``, ``phi_inner``, ``psi_outer``,
    ``psi_inner``, ``d_outer``, ``d_inner``, ``surface_tension`` (both lines), ``pressure``
    (on the wire), ``enclosed`` (weight of the depressed liquid inside the ring, carried by
    the inner line; part of the surface-tension force), ``force``.
    """
    cur, _ = _ring_curve(Rr, b, theta, n)
    return cur


def _ring_curve(Rr, b, theta, n):
    inv, lo, hi, _ = _ring_inverse(Rr, b, theta, 2 * n + 1)
    phi = np.linspace(0.0, PI, n)
    Do = depth_outer(Rr + b * np.sin(phi), phi + theta - PI) + b * (1.0 - np.cos(phi))
    keep = (Do >= lo) & (Do <= hi)
    # as for the ball, follow the push-down branch only: it ends where the depth stops rising
    # (the outer line climbing towards the top of the wire lifts it again; a wetting ring is
    # first drawn in)
    phi, Do = phi[keep], Do[keep]
    return _ring_states(Rr, b, theta, phi[_rising_branch(Do)], inv), inv


def ring_limit(Rr: float, b: float, theta: float, n: int = 61):
    """Largest upward force of a ring footpad; returns (state at the maximum, curve).

    The coarse maximum is refined on 9 sub-points around it and a parabola through the best
    three (force error ≲ 1e-7 relative).
    """
    cur, inv = _ring_curve(Rr, b, theta, n)
    k = int(np.argmax(cur["force"]))
    best = {key: float(val[k]) for key, val in cur.items()}
    if 0 < k < cur["force"].size - 1:
        sub = np.linspace(cur["phi_outer"][k - 1], cur["phi_outer"][k + 1], 9)
        st = _ring_states(Rr, b, theta, sub, inv)
        j = int(np.clip(np.argmax(st["force"]), 1, 7))
        x, y = sub[j - 1:j + 2], st["force"][j - 1:j + 2]
        c2, c1, _ = np.polyfit(x - x[1], y, 2)
        xv = x[1] - c1 / (2 * c2) if c2 < 0 else x[1]
        xv = float(np.clip(xv, x[0], x[2]))
        st = _ring_states(Rr, b, theta, np.array([xv]), inv)
        if st["force"][0] >= best["force"]:
            best = {key: float(val[0]) for key, val in st.items()}
    return best, cur
