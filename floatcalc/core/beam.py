"""Flexible wire leg: elastica on a nonlinear capillary foundation, in scaled variables.

Lengths are in capillary lengths l_c, forces per unit length in σ, forces in σ l_c, bending
stiffness in σ l_c³ (so ``B = E I / (σ l_c³)`` with ``I = π R⁴ / 4``).

Model
-----
A leg of length ``L`` is clamped at the body end (arclength s = 0) at a prescribed depth
``D_c`` of its lowest point and at slope ``α`` below the horizontal. Its unstressed shape may
curve (an upturned toe): the natural slope is ``θ₀(s)``. Along the leg the liquid pushes up
with the local force per unit length of the exact 2D rod law, ``f(y)``, evaluated at the local
depth ``y(s)`` of the leg's lowest point (:mod:`floatcalc.core.rod2d`); the leg's own weight
``w`` per length pulls down. With θ the slope below the horizontal, ``M`` the bending moment
that the loads beyond s exert, and ``V`` the net upward load carried beyond s, the elastica
(arclength form, no small-slope assumption in the beam itself) reads

.. math::

    \\theta' = \\theta_0' - M/B, \\qquad M' = -V\\cos\\theta, \\qquad
    V' = -(f(y) - w), \\qquad y' = \\sin\\theta,

with ``θ(0) = α``, ``y(0) = D_c`` at a fixed clamp (or ``M(0) = 0`` at a hinge) and a free tip
``M(L) = V(L) = 0``. The supporting force of the leg is ``V(0)``, the vertical force at the
clamp. The two-point boundary value problem is discretised with the trapezoidal rule (second
order) on a uniform grid and solved by Newton's method with a banded Jacobian
(:func:`scipy.linalg.solve_banded`); the natural slope enters through its exact differences, so
a toe's curvature jump costs no accuracy.

Foundation: ``f(y)`` is a cubic-spline interpolant of :func:`floatcalc.core.rod2d.force_depth_curve`
(exact force against exact depth, both functions of the contact position φ). Shallower than the
first-contact depth ``D₀ = −2 cos(θ/2)`` (φ = 0 of the rod law) the leg is out of the liquid
and ``f = 0``. The jump from ``f(D₀) = −2 sin θ`` to 0 is spread over a depth ``0.05 l_c`` above
``D₀`` so that Newton's method sees a continuous load. Where a leg leaves the liquid the real
meniscus is three-dimensional over about a capillary length and the 2D law does not hold
there anyway; the ramp lies well inside that region. Halving it changes the limit of a stiff
leg that enters the liquid from above by about 1 % (see the tests) and leaves legs that lie
wholly in the liquid unchanged; the public API warns when a leg crosses the surface. The leg reaches its limit when its deepest point reaches the depth of the rod law's
limit, ``D_lim``: deeper than that the local meniscus cannot hold.

Validity: slender leg (R ≪ L), elastic, static, clean surface; the 2D law is applied locally,
so the wetted part should be nearly flat (slopes below about 20°) and the leg should bend
gently on the scale of l_c; end effects at the tip are not included.

References
----------
.. [1] D. Vella, D.-G. Lee, H.-Y. Kim, Langmuir 22, 5979 (2006): 2D rod law.
.. [2] M. Hetényi, Beams on Elastic Foundation, University of Michigan Press (1946).
.. [3] L. D. Landau, E. M. Lifshitz, Theory of Elasticity, §17–19 (elastica of thin rods).
"""

from __future__ import annotations

import math

import numpy as np

from . import rod2d
from ..errors import ConvergenceError

DRY_RAMP = 0.05  # l_c: depth over which the load falls from f(D0) to 0 above first contact
_BAND = 5        # lower and upper bandwidth of the interleaved (θ, M, V, y) Jacobian


class Foundation:
    """Net upward load per unit length ``q(y) = f(y) − w`` of a rod of radius ``R`` [l_c].

    Parameters
    ----------
    R : float [l_c]
        Wire radius.
    theta : float [rad]
        Advancing contact angle.
    weight : float [σ]
        Own weight per unit length, ``ρ_s g π R²`` / σ.
    n : int
        Table points from first contact to beyond the limit.

    Attributes
    ----------
    d0, d_lim, f_lim : float
        First-contact depth [l_c], depth at the rod-law limit [l_c], limit force per length [σ].

    >>> fd = Foundation(0.04, np.pi)
    >>> q, dq = fd(np.array([fd.d_lim]))
    >>> bool(abs(q[0] - fd.f_lim) < 1e-9 and abs(dq[0]) < 1e-3)
    True
    """

    def __init__(self, R: float, theta: float, weight: float = 0.0, n: int = 600):
        from scipy.interpolate import CubicSpline

        self.R, self.theta, self.weight = float(R), float(theta), float(weight)
        lim = rod2d.limit_force(self.R, self.theta)
        self.phi_lim = float(lim["phi"])
        self.d_lim = float(lim["depth"])
        self.f_lim = float(lim["force"])
        phi_end = self.phi_lim + 0.5 * (math.pi - self.phi_lim)
        # Cluster table points towards first contact and the limit (cosine spacing in φ).
        u = 0.5 * (1.0 - np.cos(np.linspace(0.0, math.pi, n)))
        phi = u * phi_end
        f_st, f_p, depth = rod2d.force_parts(phi, self.R, self.theta)
        self.d0 = float(depth[0])
        self.f0 = float(f_st[0] + f_p[0])
        self.d_end = float(depth[-1])
        self._spline = CubicSpline(depth, f_st + f_p)
        self._dspline = self._spline.derivative()
        self._phi = CubicSpline(depth, phi)
        self.f_end = float(f_st[-1] + f_p[-1])

    def parts(self, y):
        """Surface-tension and pressure parts [σ] of f at depths ``y`` (0 out of the liquid)."""
        y = np.asarray(y, dtype=float)
        phi = self._phi(np.clip(y, self.d0, self.d_end))
        f_st, f_p, _ = rod2d.force_parts(phi, self.R, self.theta)
        wet = y >= self.d0
        return np.where(wet, f_st, 0.0), np.where(wet, f_p, 0.0)

    def force(self, y):
        """Upward liquid force per length f(y) [σ] and df/dy, without the own weight."""
        y = np.asarray(y, dtype=float)
        inside = (y >= self.d0) & (y <= self.d_end)
        yc = np.clip(y, self.d0, self.d_end)
        f = np.where(inside, self._spline(yc), 0.0)
        df = np.where(inside, self._dspline(yc), 0.0)
        deep = y > self.d_end
        f = np.where(deep, self.f_end, f)
        ramp = (y < self.d0) & (y > self.d0 - DRY_RAMP)
        if np.any(ramp):
            t = (y - (self.d0 - DRY_RAMP)) / DRY_RAMP
            f = np.where(ramp, self.f0 * t * t * (3.0 - 2.0 * t), f)
            df = np.where(ramp, self.f0 * 6.0 * t * (1.0 - t) / DRY_RAMP, df)
        return f, df

    def contact_depth(self, y):
        """Contact-line depth 2 sin(ψ/2) [l_c] of the rod law at depths ``y`` (0 when dry)."""
        y = np.asarray(y, dtype=float)
        phi = self._phi(np.clip(y, self.d0, self.d_end))
        d = 2.0 * np.sin(0.5 * (phi + self.theta - math.pi))
        return np.where(y >= self.d0, d, 0.0)

    def __call__(self, y):
        """Net load q = f − w [σ] and dq/dy at depths ``y`` [l_c]."""
        f, df = self.force(y)
        return f - self.weight, df

    def floating_depth(self) -> float:
        """Depth [l_c] at which the liquid carries exactly the own weight, f = w."""
        from scipy.optimize import brentq

        if self.weight >= self.f_lim:
            raise ValueError("own weight per length exceeds the rod-law limit")
        g = lambda p: rod2d.force(p, self.R, self.theta) - self.weight  # noqa: E731
        lo = 0.0
        if g(lo) >= 0.0:  # θ = 180°: f(0) = 0 = w only for a weightless leg
            return float(rod2d.force_parts(lo, self.R, self.theta)[2])
        p = brentq(g, lo, self.phi_lim, xtol=1e-14)
        return float(rod2d.force_parts(p, self.R, self.theta)[2])

    def stiffness(self, y: float) -> float:
        """Tangent foundation stiffness df/dy [σ / l_c] at depth ``y``."""
        return float(self.force(np.array([y]))[1][0])


def natural_slope(s, alpha: float, toe_angle: float = 0.0, toe_length: float = 0.0):
    """Unstressed slope θ₀(s) [rad]: ``alpha`` up to the toe, then turning up by ``toe_angle``.

    The toe is a circular arc over the last ``toe_length`` of the leg (s measured from the
    clamp; the leg length is implied by ``s[-1]``).
    """
    s = np.asarray(s, dtype=float)
    if toe_angle == 0.0 or toe_length <= 0.0:
        return np.full_like(s, alpha)
    start = s[-1] - toe_length
    return alpha - toe_angle * np.clip((s - start) / toe_length, 0.0, 1.0)


def _assemble(U, h, B, th0, q_fn, alpha, D_c, end):
    """Residual and banded Jacobian of the trapezoidal discretisation."""
    th, M, V, y = U[0::4], U[1::4], U[2::4], U[3::4]
    n = th.size - 1
    q, dq = q_fn(y)
    c, s = np.cos(th), np.sin(th)
    # F = (θ0' − M/B, −V cos θ, −q, sin θ); θ0' handled by exact differences of θ0.
    F1 = -V * c
    F2 = -q
    F3 = s
    res = np.empty(4 * (n + 1))
    res[0] = (th[0] - alpha) if end == "clamped" else M[0]
    res[1] = y[0] - D_c
    hh = 0.5 * h
    r = res[2:4 * n + 2].reshape(n, 4)
    r[:, 0] = th[1:] - th[:-1] - (th0[1:] - th0[:-1]) + hh * (M[1:] + M[:-1]) / B
    r[:, 1] = M[1:] - M[:-1] - hh * (F1[1:] + F1[:-1])
    r[:, 2] = V[1:] - V[:-1] - hh * (F2[1:] + F2[:-1])
    r[:, 3] = y[1:] - y[:-1] - hh * (F3[1:] + F3[:-1])
    res[4 * n + 2] = M[-1]
    res[4 * n + 3] = V[-1]

    N = 4 * (n + 1)
    ab = np.zeros((2 * _BAND + 1, N))

    def put(rows, cols, vals):
        ab[_BAND + rows - cols, cols] += vals

    if end == "clamped":
        put(np.array([0]), np.array([0]), 1.0)
    else:
        put(np.array([0]), np.array([1]), 1.0)
    put(np.array([1]), np.array([3]), 1.0)
    put(np.array([4 * n + 2]), np.array([4 * n + 1]), 1.0)
    put(np.array([4 * n + 3]), np.array([4 * n + 2]), 1.0)
    i = np.arange(n)
    base = 2 + 4 * i
    for side, sign in ((0, -1.0), (1, 1.0)):
        col = 4 * (i + side)
        k = i + side
        # identity parts
        for cc in range(4):
            put(base + cc, col + cc, sign * np.ones(n))
        # −h/2 J
        put(base + 0, col + 1, np.full(n, hh / B))                 # dθ-eq/dM
        put(base + 1, col + 0, -hh * (V[k] * s[k]))                 # dM-eq/dθ : −hh·d(−V cos)/dθ
        put(base + 1, col + 2, hh * c[k])                           # dM-eq/dV
        put(base + 2, col + 3, hh * dq[k])                          # dV-eq/dy
        put(base + 3, col + 0, -hh * c[k])                          # dy-eq/dθ
    return res, ab


def solve(L: float, B: float, alpha: float, D_c: float, foundation, *, n: int = 200,
          th0=None, end: str = "clamped", guess=None, tol: float = 1e-11, max_iter: int = 40):
    """Equilibrium of the leg with its clamp at depth ``D_c`` [l_c].

    Parameters
    ----------
    L : float [l_c]
        Leg length.
    B : float [σ l_c³]
        Bending stiffness E I / (σ l_c³).
    alpha : float [rad]
        Clamp slope below the horizontal (ignored, except in the natural shape, for a hinge).
    D_c : float [l_c]
        Depth of the leg's lowest point at the clamp.
    foundation : callable
        ``q, dq/dy = foundation(y)``: net upward load per length [σ]; a :class:`Foundation`.
    n : int
        Number of intervals.
    th0 : ndarray, optional
        Natural slope at the n + 1 nodes (default straight at ``alpha``).
    end : {"clamped", "hinged"}
        Condition at s = 0: slope fixed at ``alpha`` or moment-free.
    guess : ndarray, optional
        Starting state (interleaved θ, M, V, y), e.g. a neighbouring solution.

    Returns
    -------
    dict with ``s``, ``theta``, ``M``, ``V``, ``y`` arrays, ``U`` (interleaved state) and
    ``iterations``.

    Raises
    ------
    ConvergenceError
        Newton's method did not reach ``tol`` within ``max_iter`` damped steps.

    Examples
    --------
    A weightless leg floating with no load stays straight at the depth where f = 0:

    >>> fd = Foundation(0.05, np.radians(150))
    >>> d = fd.floating_depth()
    >>> out = solve(20.0, 1.0, 0.0, d, fd)
    >>> bool(np.max(np.abs(out["y"] - d)) < 1e-9 and abs(out["V"][0]) < 1e-9)
    True
    """
    from scipy.linalg import solve_banded

    s = np.linspace(0.0, L, n + 1)
    h = L / n
    if th0 is None:
        th0 = np.full(n + 1, alpha)
    if guess is None:
        y0 = D_c + np.concatenate([[0.0], np.cumsum(0.5 * h * (np.sin(th0[1:]) + np.sin(th0[:-1])))])
        U = np.zeros(4 * (n + 1))
        U[0::4], U[3::4] = th0, y0
    else:
        U = np.array(guess, dtype=float)
    res, ab = _assemble(U, h, B, th0, foundation, alpha, D_c, end)
    norm = np.max(np.abs(res))
    for it in range(1, max_iter + 1):
        dU = solve_banded((_BAND, _BAND), ab, -res, check_finite=False)
        if not np.all(np.isfinite(dU)):
            break
        step = np.max(np.abs(dU))
        scale = 1.0 + np.max(np.abs(U))
        if step < tol * scale and norm < 1e-9 * scale:
            return _unpack(U + dU, s, it)
        # Damping only against blow-up: Newton may raise the residual on its way in.
        lam = 1.0
        while True:
            Un = U + lam * dU
            res_n, ab_n = _assemble(Un, h, B, th0, foundation, alpha, D_c, end)
            norm_n = np.max(np.abs(res_n))
            if (np.isfinite(norm_n) and norm_n < 10.0 * norm + 1e-3) or lam < 1e-2:
                break
            lam *= 0.5
        U, res, ab, norm = Un, res_n, ab_n, norm_n
    raise ConvergenceError(
        f"flexible-leg equilibrium did not converge (clamp depth {D_c:.4g} l_c, residual {norm:.2g})"
    )


def _unpack(U, s, it):
    return {"s": s, "theta": U[0::4].copy(), "M": U[1::4].copy(), "V": U[2::4].copy(),
            "y": U[3::4].copy(), "U": U, "iterations": it}


def _solve_from_stiff(L, B, alpha, D_c, foundation, *, n, th0, end):
    """:func:`solve`, falling back on a homotopy in stiffness from a nearly rigid leg.

    A very stiff leg keeps its natural shape, which is then an excellent first guess; the
    stiffness is lowered step by step (each solution starting the next) down to ``B``.
    """
    try:
        return solve(L, B, alpha, D_c, foundation, n=n, th0=th0, end=end)
    except ConvergenceError:
        pass
    B_k = B * 1e6
    sol = solve(L, B_k, alpha, D_c, foundation, n=n, th0=th0, end=end)
    factor = 10.0
    while B_k > B:
        B_next = max(B, B_k / factor)
        try:
            sol = solve(L, B_next, alpha, D_c, foundation, n=n, th0=th0, end=end, guess=sol["U"])
        except ConvergenceError:
            factor = math.sqrt(factor)
            if factor < 1.01:
                raise
            continue
        B_k = B_next
        factor = min(factor * 2.0, 10.0)
    return sol


def max_depth(y):
    """Deepest point of a discretised shape [l_c], refined by a parabola through the top nodes."""
    k = int(np.argmax(y))
    if 0 < k < y.size - 1:
        a, b, c = y[k - 1], y[k], y[k + 1]
        den = a - 2.0 * b + c
        if den < 0.0:
            return float(b - 0.125 * (c - a) ** 2 / den)
    return float(y[k])


def limit(L: float, B: float, alpha: float, foundation: Foundation, *, n: int = 200, th0=None,
          end: str = "clamped", tol: float = 1e-10, max_steps: int = 200):
    """Clamp depth and state at which the deepest point of the leg reaches ``foundation.d_lim``.

    The clamp is pushed down from a start where the leg barely touches the liquid, by
    continuation in the clamp depth (each step starts Newton from the previous state, with a
    secant estimate of the next depth), and the crossing of ``max y = D_lim`` is then found by
    the Illinois variant of regula falsi.

    Returns
    -------
    dict as :func:`solve` plus ``clamp_depth`` [l_c] and ``steps`` (equilibria solved).
    """
    s = np.linspace(0.0, L, n + 1)
    h = L / n
    if th0 is None:
        th0 = np.full(n + 1, alpha)
    y_nat = np.concatenate([[0.0], np.cumsum(0.5 * h * (np.sin(th0[1:]) + np.sin(th0[:-1])))])
    d_lim = foundation.d_lim
    try:
        d_start = foundation.floating_depth()
    except ValueError:
        d_start = foundation.d0
    d_start = min(d_start, d_lim - 0.05)
    Dc = d_start - max_depth(y_nat)
    span = d_lim - d_start
    sol = _solve_from_stiff(L, B, alpha, Dc, foundation, n=n, th0=th0, end=end)
    g = max_depth(sol["y"]) - d_lim
    steps = 1
    hist = [(Dc, g, sol["U"])]
    step_cap = 0.25 * span
    snaps = 0
    while g < 0.0:
        if steps >= max_steps:
            raise ConvergenceError("flexible-leg limit search took too many continuation steps")
        if len(hist) >= 2:
            (d1, g1, _), (d2, g2, _) = hist[-2], hist[-1]
            slope = (g2 - g1) / (d2 - d1) if d2 != d1 else 1.0
            slope = min(max(slope, 0.05), 1.0)
        else:
            slope = 1.0
        dD = min(-g / slope * 1.02 + 1e-9, step_cap)
        guess = hist[-1][2]
        if len(hist) >= 2:  # linear predictor along the branch
            (d1, _, U1), (d2, _, U2) = hist[-2], hist[-1]
            guess = U2 + (U2 - U1) * (dD / (d2 - d1))
        try:
            sol = solve(L, B, alpha, Dc + dD, foundation, n=n, th0=th0, end=end, guess=guess)
        except ConvergenceError:
            step_cap = 0.5 * min(step_cap, dD)
            if step_cap >= 1e-3 * span:
                continue
            # No neighbouring equilibrium: the branch folds (typically the tip snapping off the
            # surface where the adhesive pull of the rod law fades). Jump ahead onto the
            # branch that continues, starting from a nearly rigid leg.
            for jump in (0.005, 0.02, 0.05):
                try:
                    sol = _solve_from_stiff(L, B, alpha, Dc + jump * span, foundation, n=n, th0=th0, end=end)
                    break
                except ConvergenceError:
                    continue
            else:
                raise
            snaps += 1
            Dc += jump * span
            g = max_depth(sol["y"]) - d_lim
            hist = [(Dc, g, sol["U"])]
            step_cap = 0.05 * span
            steps += 1
            continue
        step_cap = min(2.0 * step_cap, 0.25 * span)
        steps += 1
        Dc += dD
        g = max_depth(sol["y"]) - d_lim
        hist.append((Dc, g, sol["U"]))
    if len(hist) < 2 and g > tol:
        # Landed beyond the limit right after a jump: walk back along the new branch until the
        # deepest point is above the limit depth again, which brackets the crossing.
        back, Ub = 0.01 * span, sol["U"]
        for _ in range(30):
            c = Dc - back
            s_c = solve(L, B, alpha, c, foundation, n=n, th0=th0, end=end, guess=Ub)
            steps += 1
            gc = max_depth(s_c["y"]) - d_lim
            if gc < 0.0:
                hist = [(c, gc, s_c["U"]), (Dc, g, sol["U"])]
                break
            Dc, g, sol, Ub = c, gc, s_c, s_c["U"]
            back *= 2.0
        else:
            raise ConvergenceError("flexible-leg limit search could not return to the limit after a snap")
    if abs(g) <= tol or len(hist) < 2:
        sol.update(clamp_depth=float(sol["y"][0]), steps=steps, snaps=snaps)
        return sol
    # Bracket with g(a) < 0 <= g(b); Illinois variant of regula falsi.
    a, ga, Ua = hist[-2]
    b, gb, Ub = hist[-1]
    best = sol
    for _ in range(60):
        if abs(gb) < tol or abs(b - a) < tol:
            break
        c = b - gb * (b - a) / (gb - ga)
        w = (c - a) / (b - a)
        try:
            best = solve(L, B, alpha, c, foundation, n=n, th0=th0, end=end, guess=Ua + w * (Ub - Ua))
        except ConvergenceError:
            best = _solve_from_stiff(L, B, alpha, c, foundation, n=n, th0=th0, end=end)
        steps += 1
        gc = max_depth(best["y"]) - d_lim
        if gc * gb < 0.0:
            a, ga, Ua = b, gb, Ub
        else:
            ga *= 0.5
        b, gb, Ub = c, gc, best["U"]
    else:  # pragma: no cover - regula falsi with the Illinois fix converges superlinearly
        raise ConvergenceError("flexible-leg limit search did not converge")
    best.update(clamp_depth=float(best["y"][0]), steps=steps, snaps=snaps)
    return best


def rigid_limit(L: float, foundation: Foundation, th0, n_quad: int = 4001):
    """Limit of the same leg if it were rigid, in its natural shape ``th0`` (slopes at nodes).

    The rigid leg is lowered until its deepest point reaches ``D_lim``; its net upward force is
    then ``∫ (f(y) − w) ds`` along the shape (trapezoidal rule on ``n_quad`` points).

    Returns
    -------
    dict with ``force`` (net, at the clamp) and ``liquid_force`` [σ l_c], ``clamp_depth``
    [l_c].
    """
    s_nodes = np.linspace(0.0, L, len(th0))
    s = np.linspace(0.0, L, n_quad)
    th = np.interp(s, s_nodes, th0)
    ds = s[1] - s[0]
    y = np.concatenate([[0.0], np.cumsum(0.5 * ds * (np.sin(th[1:]) + np.sin(th[:-1])))])
    Dc = foundation.d_lim - float(np.max(y))
    f, _ = foundation.force(Dc + y)
    fl = float(np.trapezoid(f, s))
    return {"force": fl - foundation.weight * L, "liquid_force": fl, "clamp_depth": Dc}


def wetted_length(s, y, d0: float) -> float:
    """Length [l_c] of the leg in contact with the liquid (y ≥ d0), crossings interpolated."""
    a, b = y[:-1] - d0, y[1:] - d0
    ds = np.diff(s)
    both = (a >= 0) & (b >= 0)
    one = (a >= 0) ^ (b >= 0)
    frac = np.where(one, np.maximum(a, b) / np.maximum(np.abs(a) + np.abs(b), 1e-300), 0.0)
    return float(np.sum(ds * both) + np.sum(ds * frac))
