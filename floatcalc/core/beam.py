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

Foundation (:class:`Foundation`): ``f(y)`` is a cubic-spline table of the exact rod law
(force against depth, both functions of the contact position φ), chosen per section by its
wetting history along the load path:

* at or below the undisturbed surface (``y ≥ 0``) the advancing-angle law: the leg is pushed
  down, its contact lines advance;
* above it (``y < 0``), for a section wetted earlier on the path, the receding-angle law: a
  rising contact line recedes (between the two it could stay pinned; for a thin wire the
  pinned, receding and advancing branches give nearly the same force at the same height,
  ``f ≈ 2 sin ψ`` with ``y ≈ 2 sin(ψ/2)``, and differ mainly in how high the liquid clings,
  up to ``2 cos(θ_r/2)`` l_c; the receding branch pulls down at least as hard as the pinned
  one, see the tests). A wetted section lifted beyond that reach lets go and is dry again;
* above it, for a section that has never touched the liquid, nothing: a leg set down on the
  liquid from above is dry until it reaches the surface.

Smoothing, for Newton's method only: a dry section meets the snap-in value ``f(0)`` of the
advancing law over ``SNAP_RAMP`` above the surface, a lifted wetted one passes from that
value to the receding law over ``BLEND``, and each law falls to 0 over ``DRY_RAMP`` above its
first contact (φ = 0, depth ``−2 cos(θ/2)``). Halving all three changes the limit of a stiff
leg that enters the liquid from above by about 1e-5 (see the tests). Where a leg leaves the
liquid the real meniscus is three-dimensional over about a capillary length and the 2D law
does not hold there anyway; the public API warns when a leg crosses the surface.

Limit (:func:`limit`): the clamp is pushed down from first touch by continuation in ``D_c``.
A section deeper than the rod law's limit depth ``D_lim`` follows the law's descending
branch: its maximum is the limit of a section under a dead load, while a section of a leg
has its depth imposed by its neighbours, and the static 2D meniscus exists past the maximum
until the two menisci meet above the wire (:func:`breakthrough`, depth ``d_b``), where the
liquid closes over it. The leg's limit is the largest clamp force ``V(0)`` along the path: an
interior maximum (``dV/dD_c = 0``, where a dead load makes the leg snap through) or, if the
force still rises, the clamp depth at which the deepest section reaches ``d_b`` (no force
beyond local breakthrough is claimed: the film over the wire would spread along it). Earlier
versions stopped where the deepest point reached ``D_lim``; that support is returned too.

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



DRY_RAMP = 0.05   # l_c: depth over which a law's load falls from its first-contact value to 0
SNAP_RAMP = 0.02  # l_c: height above the surface over which a dry section meets the snap-in value
BLEND = 0.02      # l_c: height over which a lifted wetted section passes to the receding law
SURFACE_STEP = 0.05  # l_c: largest move per continuation step of a section near the surface
_BAND = 5         # lower and upper bandwidth of the interleaved (θ, M, V, y) Jacobian


def _smoothstep(y, lo, width):
    """S = t²(3 − 2t), t = (y − lo)/width clipped to [0, 1], and dS/dy."""
    t = np.clip((np.asarray(y, dtype=float) - lo) / width, 0.0, 1.0)
    return t * t * (3.0 - 2.0 * t), 6.0 * t * (1.0 - t) / width


def breakthrough(R: float, theta: float) -> float:
    """Contact position φ_b [rad] at which the two menisci of a rod meet above it.

    Past ψ = π/2 the interface leaving a contact line first runs back over the rod; from the
    closed-form profile of the 2D first integral, ``x − x₀ = F(ψ₀) − F(ψ)`` with
    ``F(ψ) = ln tan(ψ/4) + 2 cos(ψ/2)`` (:func:`floatcalc.core.rod2d.free_meniscus`), its
    innermost point (where it is vertical, ψ = π/2) lies at ``x = R sin φ − (F(π/2) − F(ψ₀))``.
    The menisci of the two sides touch on the symmetry plane when that reaches 0: the liquid
    closes over the section, which has broken through locally. When ψ ≤ π/2 up to φ = π (a
    wetting rod, θ ≤ 90°) the contact lines meet on top instead, φ_b = π.

    >>> round(math.degrees(breakthrough(0.04, math.radians(150.0))), 1)
    136.7
    """
    from scipy.optimize import brentq

    R, theta = float(R), float(theta)
    half = 0.5 * math.pi
    f_half = float(rod2d._x_of_psi(half))

    def gap(phi):
        psi = phi + theta - math.pi
        reach = f_half - float(rod2d._x_of_psi(min(psi, math.pi))) if psi > half else 0.0
        return R * math.sin(phi) - reach

    lo = float(rod2d.limit(R, theta))
    if gap(math.pi) >= 0.0 or lo >= math.pi:
        return math.pi
    if gap(lo) <= 0.0:  # pragma: no cover - not met for any R, θ tried (the limit comes first)
        return lo
    return float(brentq(gap, lo, math.pi, xtol=1e-13))


class _Law:
    """Cubic-spline table of one rod law, force per length f [σ] against depth y [l_c].

    Above the first-contact depth (φ = 0) the load falls smoothly to 0 over ``DRY_RAMP``;
    deeper than the last table point it stays constant (only Newton iterates go there).
    """

    def __init__(self, R: float, theta: float, phi):
        from scipy.interpolate import CubicSpline

        self.R, self.theta = float(R), float(theta)
        f_st, f_p, depth = rod2d.force_parts(phi, self.R, self.theta)
        self.d_lo, self.d_hi = float(depth[0]), float(depth[-1])
        self.f_lo, self.f_hi = float(f_st[0] + f_p[0]), float(f_st[-1] + f_p[-1])
        self._f = CubicSpline(depth, f_st + f_p)
        self._phi = CubicSpline(depth, phi)
        self._x, self._c = self._f.x, self._f.c

    def _eval(self, yc):
        """Spline value and slope at depths inside the table (one interval search for both)."""
        k = np.clip(np.searchsorted(self._x, yc, side="right") - 1, 0, self._x.size - 2)
        t = yc - self._x[k]
        c0, c1, c2, c3 = self._c[0, k], self._c[1, k], self._c[2, k], self._c[3, k]
        return ((c0 * t + c1) * t + c2) * t + c3, (3.0 * c0 * t + 2.0 * c1) * t + c2

    def __call__(self, y):
        y = np.asarray(y, dtype=float)
        yc = np.clip(y, self.d_lo, self.d_hi)
        f, df = self._eval(yc)
        deep = y > self.d_hi
        if np.any(deep):
            f = np.where(deep, self.f_hi, f)
            df = np.where(deep, 0.0, df)
        above = y < self.d_lo
        if np.any(above):
            S, dS = _smoothstep(y, self.d_lo - DRY_RAMP, DRY_RAMP)
            f = np.where(above, self.f_lo * S, f)
            df = np.where(above, self.f_lo * dS, df)
        return f, df

    def phi(self, y):
        return self._phi(np.clip(np.asarray(y, dtype=float), self.d_lo, self.d_hi))

    def parts(self, y):
        """Surface-tension and pressure parts [σ] (the ramp scales both)."""
        y = np.asarray(y, dtype=float)
        f_st, f_p, _ = rod2d.force_parts(self.phi(y), self.R, self.theta)
        S, _ = _smoothstep(y, self.d_lo - DRY_RAMP, DRY_RAMP)
        w = np.where(y < self.d_lo, S, 1.0)
        return f_st * w, f_p * w


class Foundation:
    """Net upward load per unit length ``q = f − w`` of a rod of radius ``R`` [l_c].

    Two laws of the exact 2D rod (:mod:`floatcalc.core.rod2d`) at the local depth ``y`` of a
    section's lowest point: the advancing-angle law where the section is at or below the
    undisturbed surface (``y ≥ 0``: pushed down, the contact line advances), and above it
    (``y < 0``) either the receding-angle law, for a section that has been wetted (a lifted
    contact line recedes), or nothing, for a section that has never touched the liquid. Which
    applies is the history flag ``wet`` per section, carried along the load path by
    :meth:`update_wet`.

    The advancing law runs past its maximum (depth ``d_lim``) on its descending branch to the
    local breakthrough depth ``d_b`` (:func:`breakthrough`) and on, unphysically but smoothly,
    to φ = π for Newton iterates; states beyond ``d_b`` are not accepted by :func:`limit`.

    Smoothing (numerical, sizes in l_c): a dry section within ``SNAP_RAMP`` above the surface
    meets the snap-in value f(0) of the advancing law gradually; a wetted lifted section passes
    from that value to the receding law over ``BLEND``; every law falls to 0 over ``DRY_RAMP``
    above its first-contact depth.

    Parameters
    ----------
    R : float [l_c]
        Wire radius.
    theta : float [rad]
        Advancing contact angle.
    weight : float [σ]
        Own weight per unit length, ``ρ_s g π R²`` / σ.
    n : int
        Table points from first contact to the limit (half as many on to φ = π).
    theta_receding : float [rad], optional
        Receding contact angle (default: the advancing angle).

    Attributes
    ----------
    d0, d_lim, f_lim : float
        First-contact depth [l_c], depth at the rod-law limit [l_c], limit force per length [σ].
    phi_b, d_b : float
        Contact position [rad] and depth [l_c] of local breakthrough.
    d0_r : float
        First-contact depth of the receding law [l_c]: a wetted section higher than this
        (plus ``DRY_RAMP``) has let go of the liquid.

    >>> fd = Foundation(0.04, np.pi)
    >>> q, dq = fd(np.array([fd.d_lim]))
    >>> bool(abs(q[0] - fd.f_lim) < 1e-9 and abs(dq[0]) < 1e-3)
    True
    """

    def __init__(self, R: float, theta: float, weight: float = 0.0, n: int = 600,
                 theta_receding: float | None = None):
        self.R, self.theta, self.weight = float(R), float(theta), float(weight)
        lim = rod2d.limit_force(self.R, self.theta)
        self.phi_lim = float(lim["phi"])
        self.d_lim = float(lim["depth"])
        self.f_lim = float(lim["force"])
        # Cluster table points towards first contact, the limit and φ = π (cosine spacing).
        u = 0.5 * (1.0 - np.cos(np.linspace(0.0, math.pi, n)))
        phi = u * self.phi_lim
        if self.phi_lim < math.pi - 1e-9:
            v = 0.5 * (1.0 - np.cos(np.linspace(0.0, math.pi, max(n // 2, 20))))
            phi = np.concatenate([phi, self.phi_lim + v[1:] * (math.pi - self.phi_lim)])
        self.adv = _Law(self.R, self.theta, phi)
        self.d0, self.f0 = self.adv.d_lo, self.adv.f_lo
        self.d_end, self.f_end = self.adv.d_hi, self.adv.f_hi
        self.phi_b = breakthrough(self.R, self.theta)
        f_st, f_p, d_b = rod2d.force_parts(self.phi_b, self.R, self.theta)
        self.d_b, self.f_b = float(d_b), float(f_st + f_p)
        th_r = self.theta if theta_receding is None else float(theta_receding)
        self.theta_r = th_r
        if abs(th_r - self.theta) < 1e-12:
            self.rec = self.adv
        else:
            from scipy.optimize import brentq

            D = lambda p: float(rod2d.force_parts(p, self.R, th_r)[2])
            p_hi = math.pi if D(math.pi) <= 0.1 else brentq(lambda p: D(p) - 0.1, 0.0, math.pi)
            u = 0.5 * (1.0 - np.cos(np.linspace(0.0, math.pi, max(n // 2, 20))))
            self.rec = _Law(self.R, th_r, u * p_hi)
        self.d0_r = self.rec.d_lo
        self.d_off = self.d0_r - DRY_RAMP
        self.fa0 = float(self.adv(np.array([0.0]))[0][0])
        self.fr0 = float(self.rec(np.array([0.0]))[0][0])

    # -- advancing law everywhere (no history): the law of a section pushed down ------------
    def force(self, y):
        """Advancing-law force per length f(y) [σ] and df/dy, without the own weight."""
        return self.adv(y)

    def __call__(self, y):
        """Net load q = f − w [σ] and dq/dy at depths ``y`` [l_c], advancing law everywhere."""
        f, df = self.adv(y)
        return f - self.weight, df

    # -- with the wetting history ------------------------------------------------------------
    def liquid(self, y, wet):
        """Force per length f [σ] and df/dy of sections at depths ``y`` with history ``wet``."""
        y = np.asarray(y, dtype=float)
        f, df = self.adv(y)
        lift = y < 0.0
        if not np.any(lift):
            return f, df
        S, dS = _smoothstep(y, -SNAP_RAMP, SNAP_RAMP)
        f_dry, df_dry = self.fa0 * S, self.fa0 * dS
        if self.rec is self.adv:
            f_wet, df_wet = f, df
        else:
            fr, dfr = self.rec(y)
            Sb, dSb = _smoothstep(y, -BLEND, BLEND)
            jump = self.fa0 - self.fr0
            f_wet, df_wet = fr + jump * Sb, dfr + jump * dSb
        f = np.where(lift, np.where(wet, f_wet, f_dry), f)
        df = np.where(lift, np.where(wet, df_wet, df_dry), df)
        return f, df

    def load(self, y, wet):
        """Net load q = f − w [σ] and dq/dy with the wetting history ``wet``."""
        f, df = self.liquid(y, wet)
        return f - self.weight, df

    def bind(self, wet):
        """The load ``y -> (q, dq/dy)`` of sections with fixed history flags (for :func:`solve`)."""
        wet = np.asarray(wet, dtype=bool)
        return lambda y: self.load(y, wet)

    def update_wet(self, wet, y):
        """History after a state: wetted once at or below the surface, dry again once let go."""
        y = np.asarray(y, dtype=float)
        return (np.asarray(wet, dtype=bool) | (y >= 0.0)) & (y >= self.d_off)

    def in_contact(self, y, wet):
        """Sections touching the liquid: at or below the surface, or lifted and still wetted."""
        y = np.asarray(y, dtype=float)
        return (y >= 0.0) | (np.asarray(wet, dtype=bool) & (y >= self.d0_r))

    def parts(self, y, wet=None):
        """Surface-tension and pressure parts [σ] of f at depths ``y``.

        Without ``wet``: the advancing law (0 above its first contact, ramp aside).
        """
        y = np.asarray(y, dtype=float)
        st, p = self.adv.parts(y)
        if wet is None:
            return st, p
        lift = y < 0.0
        st0, p0 = self.adv.parts(np.zeros(1))
        S, _ = _smoothstep(y, -SNAP_RAMP, SNAP_RAMP)
        st_w, p_w = st, p
        if self.rec is not self.adv:
            sr, pr = self.rec.parts(y)
            sr0, pr0 = self.rec.parts(np.zeros(1))
            Sb, _ = _smoothstep(y, -BLEND, BLEND)
            st_w, p_w = sr + (st0 - sr0) * Sb, pr + (p0 - pr0) * Sb
        wet = np.asarray(wet, dtype=bool)
        st = np.where(lift, np.where(wet, st_w, st0 * S), st)
        p = np.where(lift, np.where(wet, p_w, p0 * S), p)
        return st, p

    def contact_depth(self, y, wet=None):
        """Contact-line depth 2 sin(ψ/2) [l_c] of the rod law at depths ``y`` (0 when dry)."""
        y = np.asarray(y, dtype=float)
        d_a = 2.0 * np.sin(0.5 * (self.adv.phi(y) + self.theta - math.pi))
        if wet is None:
            return np.where(y >= self.d0, d_a, 0.0)
        d_r = 2.0 * np.sin(0.5 * (self.rec.phi(y) + self.theta_r - math.pi))
        lifted = np.asarray(wet, dtype=bool) & (y < 0.0) & (y >= self.d0_r)
        return np.where(y >= 0.0, d_a, np.where(lifted, d_r, 0.0))

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
        """Tangent foundation stiffness df/dy [σ / l_c] of the advancing law at depth ``y``."""
        return float(self.adv(np.array([y]))[1][0])


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


_PATTERNS: dict = {}


def _jacobian_pattern(n: int, hb: float, end: str):
    """Constant part of the banded Jacobian and the flat indices of its variable entries.

    Rows: 0 and 1 the clamp conditions, 2 + 4i + (0..3) the trapezoidal equations of interval
    i, 4n + 2 and 4n + 3 the free-tip conditions. Cached per grid (a continuation reuses it).
    """
    key = (n, hb, end)
    hit = _PATTERNS.get(key)
    if hit is not None:
        return hit
    N = 4 * (n + 1)
    ab = np.zeros((2 * _BAND + 1, N))

    def at(rows, cols):
        return (_BAND + rows - cols) * N + cols

    ab.flat[at(np.array([0]), np.array([0 if end == "clamped" else 1]))] = 1.0
    ab.flat[at(np.array([1, 4 * n + 2, 4 * n + 3]), np.array([3, 4 * n + 1, 4 * n + 2]))] = 1.0
    i = np.arange(n)
    base = 2 + 4 * i
    var = []
    for side, sign in ((0, -1.0), (1, 1.0)):
        col = 4 * (i + side)
        for cc in range(4):                       # ±identity
            ab.flat[at(base + cc, col + cc)] = sign
        ab.flat[at(base, col + 1)] = hb            # dθ-eq/dM = h/2 / B
        var += [at(base + 1, col + 0),             # dM-eq/dθ = −h/2 · V sin θ
                at(base + 1, col + 2),             # dM-eq/dV = h/2 · cos θ
                at(base + 2, col + 3),             # dV-eq/dy = h/2 · dq/dy
                at(base + 3, col + 0)]             # dy-eq/dθ = −h/2 · cos θ
    if len(_PATTERNS) > 64:
        _PATTERNS.clear()
    _PATTERNS[key] = (ab, np.concatenate(var))
    return _PATTERNS[key]


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

    template, idx = _jacobian_pattern(n, hh / B, end)
    ab = template.copy()
    # variable entries, in the order of _jacobian_pattern: for side 0 then side 1 (node i, i+1)
    lo, hi = slice(0, n), slice(1, n + 1)
    Vs, hc, hdq = -hh * (V * s), hh * c, hh * dq
    ab.flat[idx] = np.concatenate([Vs[lo], hc[lo], hdq[lo], -hc[lo], Vs[hi], hc[hi], hdq[hi], -hc[hi]])
    return res, ab


def solve(L: float, B: float, alpha: float, D_c: float, foundation, *, n: int = 200,
          th0=None, end: str = "clamped", guess=None, tol: float = 1e-11, max_iter: int = 40,
          tangent: bool = False):
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
        ``q, dq/dy = foundation(y)``: net upward load per length [σ]; a :class:`Foundation`
        (advancing law everywhere) or ``Foundation.bind(wet)`` (with the wetting history).
    n : int
        Number of intervals.
    th0 : ndarray, optional
        Natural slope at the n + 1 nodes (default straight at ``alpha``).
    end : {"clamped", "hinged"}
        Condition at s = 0: slope fixed at ``alpha`` or moment-free.
    guess : ndarray, optional
        Starting state (interleaved θ, M, V, y), e.g. a neighbouring solution.
    tangent : bool
        Also return ``dU``, the derivative of the state with respect to ``D_c`` (one more
        banded solve with the Jacobian at the solution: ``J dU/dD_c = e₁``).

    Returns
    -------
    dict with ``s``, ``theta``, ``M``, ``V``, ``y`` arrays, ``U`` (interleaved state),
    ``iterations`` and, with ``tangent``, ``dU``.

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
        try:
            dU = solve_banded((_BAND, _BAND), ab, -res, check_finite=False)
        except np.linalg.LinAlgError:  # singular Jacobian: no convergence (ConvergenceError below)
            break
        if not np.all(np.isfinite(dU)):
            break
        step = np.max(np.abs(dU))
        scale = 1.0 + np.max(np.abs(U))
        if step < tol * scale and norm < 1e-9 * scale:
            out = _unpack(U + dU, s, it)
            if tangent:
                _, ab_t = _assemble(out["U"], h, B, th0, foundation, alpha, D_c, end)
                rhs = np.zeros(U.size)
                rhs[1] = 1.0
                out["dU"] = solve_banded((_BAND, _BAND), ab_t, rhs, check_finite=False)
            return out
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


def _assemble_many(U, h, B, th0, load, alpha, D_c, end):
    """:func:`_assemble` for ``m`` states of one leg at once, entry by entry the same arithmetic.

    ``U`` (m, 4(n + 1)) interleaved states, ``D_c`` (m,) clamp depths, ``load(y, rows)`` the
    net load and its slope at depths ``y`` (k, n + 1) of the systems ``rows``. Returns the
    residuals (m, 4(n + 1)) and the banded Jacobians (m, 2·_BAND + 1, 4(n + 1)).
    """
    rows = np.arange(U.shape[0]) if load.rows is None else load.rows
    th, M, V, y = U[:, 0::4], U[:, 1::4], U[:, 2::4], U[:, 3::4]
    m, n = th.shape[0], th.shape[1] - 1
    q, dq = load(y, rows)
    c, s = np.cos(th), np.sin(th)
    F1 = -V * c
    F2 = -q
    F3 = s
    res = np.empty((m, 4 * (n + 1)))
    res[:, 0] = (th[:, 0] - alpha) if end == "clamped" else M[:, 0]
    res[:, 1] = y[:, 0] - D_c
    hh = 0.5 * h
    r = res[:, 2:4 * n + 2].reshape(m, n, 4)
    r[:, :, 0] = th[:, 1:] - th[:, :-1] - (th0[1:] - th0[:-1]) + hh * (M[:, 1:] + M[:, :-1]) / B
    r[:, :, 1] = M[:, 1:] - M[:, :-1] - hh * (F1[:, 1:] + F1[:, :-1])
    r[:, :, 2] = V[:, 1:] - V[:, :-1] - hh * (F2[:, 1:] + F2[:, :-1])
    r[:, :, 3] = y[:, 1:] - y[:, :-1] - hh * (F3[:, 1:] + F3[:, :-1])
    res[:, 4 * n + 2] = M[:, -1]
    res[:, 4 * n + 3] = V[:, -1]

    template, idx = _jacobian_pattern(n, hh / B, end)
    ab = np.repeat(template[None], m, axis=0)
    lo, hi = slice(0, n), slice(1, n + 1)
    Vs, hc, hdq = -hh * (V * s), hh * c, hh * dq
    ab.reshape(m, -1)[:, idx] = np.concatenate(
        [Vs[:, lo], hc[:, lo], hdq[:, lo], -hc[:, lo], Vs[:, hi], hc[:, hi], hdq[:, hi], -hc[:, hi]], axis=1)
    return res, ab


def _solve_blocks(ab, rhs):
    """Solve the independent banded systems ``ab`` (k, 2·_BAND + 1, N) with right-hand sides
    ``rhs`` (k, N) as one banded system (the blocks stacked along the diagonal: no band entry
    couples two blocks, so partial pivoting stays inside each block)."""
    from scipy.linalg import solve_banded

    k, w, N = ab.shape
    big = np.ascontiguousarray(ab.transpose(1, 0, 2)).reshape(w, k * N)
    try:
        return solve_banded((_BAND, _BAND), big, rhs.reshape(-1), check_finite=False).reshape(k, N)
    except np.linalg.LinAlgError:  # a singular block: solve them one by one, NaN where singular
        out = np.full((k, N), np.nan)
        for i in range(k):
            try:
                out[i] = solve_banded((_BAND, _BAND), ab[i], rhs[i], check_finite=False)
            except np.linalg.LinAlgError:
                pass
        return out


class _Rows:
    """Load of stacked systems with their own history flags: ``q, dq/dy`` at depths (k, n + 1)."""

    def __init__(self, foundation, wet, rows=None):
        self.fd, self.wet, self.rows = foundation, np.asarray(wet, dtype=bool), rows

    def __call__(self, y, rows):
        return self.fd.load(y, self.wet[rows])

    def at(self, rows):
        return _Rows(self.fd, self.wet, rows)


def solve_many(L: float, B: float, alpha: float, D_c, foundation, wet, guess, *, n: int = 200, th0=None,
               end: str = "clamped", tol: float = 1e-11, max_iter: int = 40):
    """Equilibria of one leg at ``m`` clamp depths at once: :func:`solve` system by system.

    Each system ``j`` (clamp depth ``D_c[j]``, history flags ``wet[j]``, starting state
    ``guess[j]``) takes the same Newton steps, the same damping and the same stopping test as
    :func:`solve` with ``foundation.bind(wet[j])`` and ``guess=guess[j]``; the linear solves of
    the systems still iterating are stacked into one banded solve, and a system stops when its
    own test is met. Where :func:`solve` would raise :class:`ConvergenceError` the system is
    marked failed instead (the caller decides what :func:`solve`'s callers do then).

    Parameters
    ----------
    D_c : array (m,) [l_c]
        Clamp depths.
    foundation : Foundation
    wet : bool array (m, n + 1)
        History flags of each system.
    guess : array (m, 4(n + 1))
        Starting states (interleaved θ, M, V, y).

    Other parameters as :func:`solve`.

    Returns
    -------
    U : array (m, 4(n + 1))
        Converged states (rows of failed systems are NaN).
    iterations : int array (m,)
        Newton steps of each system (0 where it failed).
    ok : bool array (m,)

    >>> fd = Foundation(0.05, np.radians(150))
    >>> d = fd.floating_depth()
    >>> g = np.zeros((2, 4 * 41)); g[:, 3::4] = d
    >>> U, its, ok = solve_many(20.0, 1.0, 0.0, [d, d + 0.1], fd, np.ones((2, 41), bool), g, n=40)
    >>> bool(ok.all() and abs(U[0, 2]) < 1e-9 and U[1, 2] > 0.0)
    True
    """
    D_c = np.asarray(D_c, dtype=float).ravel()
    m = D_c.size
    h = L / n
    if th0 is None:
        th0 = np.full(n + 1, alpha)
    load = _Rows(foundation, wet)
    U = np.array(guess, dtype=float).reshape(m, 4 * (n + 1))
    out = np.full_like(U, np.nan)
    its = np.zeros(m, dtype=np.int64)
    ok = np.zeros(m, dtype=bool)
    act = np.arange(m)
    res, ab = _assemble_many(U, h, B, th0, load, alpha, D_c, end)
    norm = np.max(np.abs(res), axis=1)
    for it in range(1, max_iter + 1):
        if act.size == 0:
            break
        dU = _solve_blocks(ab, -res)
        finite = np.all(np.isfinite(dU), axis=1)
        step = np.max(np.abs(dU), axis=1)
        scale = 1.0 + np.max(np.abs(U), axis=1)
        conv = finite & (step < tol * scale) & (norm < 1e-9 * scale)
        if np.any(conv):
            out[act[conv]] = U[conv] + dU[conv]
            its[act[conv]] = it
            ok[act[conv]] = True
        keep = finite & ~conv          # non-finite steps: solve raises, the system has failed
        act, U, dU, norm = act[keep], U[keep], dU[keep], norm[keep]
        if act.size == 0:
            break
        # Damping only against blow-up, system by system as in solve.
        lam = np.ones(act.size)
        Un = U + lam[:, None] * dU
        res_n, ab_n = _assemble_many(Un, h, B, th0, load.at(act), alpha, D_c[act], end)
        norm_n = np.max(np.abs(res_n), axis=1)
        while True:
            bad = ~((np.isfinite(norm_n) & (norm_n < 10.0 * norm + 1e-3)) | (lam < 1e-2))
            if not np.any(bad):
                break
            b = np.flatnonzero(bad)
            lam[b] *= 0.5
            Un[b] = U[b] + lam[b, None] * dU[b]
            r_b, a_b = _assemble_many(Un[b], h, B, th0, load.at(act[b]), alpha, D_c[act[b]], end)
            res_n[b], ab_n[b] = r_b, a_b
            norm_n[b] = np.max(np.abs(r_b), axis=1)
        U, res, ab, norm = Un, res_n, ab_n, norm_n
    return out, its, ok


def _solve_from_stiff(L, B, alpha, D_c, foundation, *, n, th0, end, tangent=False):
    """:func:`solve`, falling back on a homotopy in stiffness from a nearly rigid leg.

    A very stiff leg keeps its natural shape, which is then an excellent first guess; the
    stiffness is lowered step by step (each solution starting the next) down to ``B``.
    """
    try:
        return solve(L, B, alpha, D_c, foundation, n=n, th0=th0, end=end, tangent=tangent)
    except ConvergenceError:
        pass
    B_k = B * 1e6
    sol = solve(L, B_k, alpha, D_c, foundation, n=n, th0=th0, end=end)
    factor = 10.0
    while B_k > B:
        B_next = max(B, B_k / factor)
        try:
            sol = solve(L, B_next, alpha, D_c, foundation, n=n, th0=th0, end=end, guess=sol["U"],
                        tangent=tangent and B_next == B)
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


def natural_depths(th0, L: float):
    """Depth of the unbent leg below its clamp, y(s) − y(0) [l_c], at the nodes of ``th0``."""
    h = L / (len(th0) - 1)
    return np.concatenate([[0.0], np.cumsum(0.5 * h * (np.sin(th0[1:]) + np.sin(th0[:-1])))])


def touch_depth(th0, L: float) -> float:
    """Clamp depth [l_c] at which the unbent leg's deepest point reaches the undisturbed surface."""
    return -max_depth(natural_depths(th0, L))


class _Path:
    """Continuation in clamp depth from first touch, carrying the wetting history.

    Each state holds the clamp depth ``Dc``, the solution, its tangent ``dU = dU/dDc``, the
    history flags after it (``wet``), the clamp force ``V`` and ``dV = dV/dDc``, the deepest
    point ``md`` and its rate ``dmd``.
    """

    def __init__(self, L, B, alpha, fd, n, th0, end):
        self.L, self.B, self.alpha, self.fd, self.n, self.th0, self.end = L, B, alpha, fd, n, th0, end
        self.solves = 0

    def state(self, Dc, wet, guess=None):
        q = self.fd.bind(wet)
        kw = dict(n=self.n, th0=self.th0, end=self.end, tangent=True)
        if guess is None:
            sol = _solve_from_stiff(self.L, self.B, self.alpha, Dc, q, **kw)
        else:
            sol = solve(self.L, self.B, self.alpha, Dc, q, guess=guess, **kw)
        self.solves += 1
        y, dU = sol["y"], sol["dU"]
        k = int(np.argmax(y))
        return {"Dc": float(Dc), "sol": sol, "U": sol["U"], "dU": dU, "wet_in": np.asarray(wet, dtype=bool),
                "wet": self.fd.update_wet(wet, y), "V": float(sol["V"][0]), "dV": float(dU[2]),
                "md": max_depth(y), "dmd": float(dU[3 + 4 * k]), "iterations": sol["iterations"]}

    def near(self, a, Dc):
        """State at ``Dc`` started from state ``a`` (tangent predictor, ``a``'s history)."""
        try:
            return self.state(Dc, a["wet"], guess=a["U"] + a["dU"] * (Dc - a["Dc"]))
        except ConvergenceError:
            return self.state(Dc, a["wet"])

    def near_many(self, bases, depths):
        """Equilibria at ``depths``, each started from its state in ``bases`` as :meth:`near`
        starts it (tangent predictor, that state's history), solved together by
        :func:`solve_many`: the same Newton steps, so the same numbers. A system that does not
        converge that way goes through :meth:`near` (which then starts from a stiff leg).

        Returns a list of (solution dict as :func:`solve` without ``dU``, history flags).
        """
        if not bases:
            return []
        G = np.stack([a["U"] + a["dU"] * (D - a["Dc"]) for a, D in zip(bases, depths)])
        W = np.stack([a["wet"] for a in bases])
        U, its, ok = solve_many(self.L, self.B, self.alpha, depths, self.fd, W, G, n=self.n, th0=self.th0,
                                end=self.end)
        self.solves += int(np.count_nonzero(ok))
        s = np.linspace(0.0, self.L, self.n + 1)
        out = []
        for j, (a, D) in enumerate(zip(bases, depths)):
            if ok[j]:
                out.append((_unpack(U[j], s, int(its[j])), W[j]))
            else:
                st = self.near(a, D)
                out.append((st["sol"], st["wet_in"]))
        return out

    def refine(self, a, b, g, tol):
        """Root of ``g(state)`` between states with g(a) < 0 ≤ g(b): Illinois regula falsi."""
        ga, gb = g(a), g(b)
        best = b
        for _ in range(60):
            if abs(gb) <= tol or abs(b["Dc"] - a["Dc"]) < 1e-10:
                return best
            c_D = b["Dc"] - gb * (b["Dc"] - a["Dc"]) / (gb - ga)
            # Start from the shallower end: its history is the one the load path carries.
            start = a if a["Dc"] <= b["Dc"] else b
            c = self.near(start, c_D)
            gc = g(c)
            if gc * gb < 0.0:
                a, ga = b, gb
            else:
                ga *= 0.5
            b, gb, best = c, gc, c
        raise ConvergenceError("flexible-leg limit refinement did not converge")  # pragma: no cover


def limit(L: float, B: float, alpha: float, foundation: Foundation, *, n: int = 200, th0=None,
          end: str = "clamped", tol: float = 1e-10, max_steps: int = 400, onset: bool = True,
          keep_path: bool = False):
    """Largest clamp force of the leg pushed down from first touch, with its state.

    The clamp is pushed down from where the unbent leg touches the undisturbed surface, by
    continuation in the clamp depth ``D_c`` (a tangent predictor from ``dU/dD_c`` and Newton),
    carrying the wetting history of every section (:class:`Foundation`). Sections deeper than
    the rod law's limit depth follow its descending branch: a section held by its neighbours
    at an imposed depth is a valid static state however far it is past its own maximum (that
    maximum is the limit of a section under a dead load, not under an imposed depth). The leg
    as a whole is at its limit where the clamp force ``V(0)`` is largest along this path:

    * ``"clamp-force maximum"``: dV/dD_c = 0 (with V > 0), found by regula falsi on the
      tangent's dV/dD_c; under a dead load the leg snaps through here;
    * ``"local breakthrough"``: the force still rises when the deepest section reaches the
      breakthrough depth ``d_b``, where the two menisci meet above it and the liquid closes
      over the wire. No force beyond is claimed (the film over the wire would spread along it).

    Folds on the way (usually a tip pulling off the surface) are passed as before: no
    neighbouring equilibrium, so the path jumps ahead onto the branch that continues.

    Returns
    -------
    dict as :func:`solve` plus ``clamp_depth`` [l_c], ``criterion`` (one of the two above),
    ``wet`` (history flags at the limit), ``steps`` (equilibria solved), ``snaps`` (jumps),
    ``drops`` (list of (clamp depth, V before, V after) for jumps that lowered the force; if
    the force before such a jump is never regained, that state is the limit),
    ``onset`` (dict with ``clamp_depth`` and ``V`` where the deepest point first reached
    ``d_lim``, the criterion of earlier versions; None if not reached before the limit) and,
    with ``keep_path``, ``path`` (the continuation states, for curves).
    """
    fd = foundation
    if th0 is None:
        th0 = np.full(n + 1, alpha)
    y_nat = natural_depths(th0, L)
    D0 = -max_depth(y_nat)
    wet0 = (D0 + y_nat) >= -1e-12
    P = _Path(L, B, alpha, fd, n, th0, end)
    a = P.state(D0, wet0)
    path = [a]
    cap, h_min = 0.3, 1e-4  # l_c: largest step in clamp depth; smallest before a fold is assumed
    step = 0.1
    snaps, drops = 0, []
    lim = None
    while lim is None:
        if P.solves >= max_steps:
            raise ConvergenceError("flexible-leg limit search took too many continuation steps")
        dD = step
        # Sections near the surface change their wetting history (wetted sections may let go,
        # dry ones get wetted): let none of them move more than SURFACE_STEP per step, so that
        # none can dip in and out, or rise out and back, unseen.
        ya, dya = a["U"][3::4], np.abs(a["dU"][3::4])
        band = np.where(a["wet"], ya > fd.d_off - 0.1, ya > -SNAP_RAMP - SURFACE_STEP) & (ya < SURFACE_STEP)
        if np.any(band):
            dD = min(dD, SURFACE_STEP / max(float(np.max(dya[band])), 1e-9))
        if a["dmd"] > 1e-9 and a["md"] < fd.d_b:
            dD = min(dD, 1.05 * (fd.d_b - a["md"]) / a["dmd"] + 1e-7)
        if len(path) >= 2 and a["V"] > 0.0:
            p = path[-2]
            if p["dV"] > a["dV"] > 0.0 and a["Dc"] > p["Dc"]:
                dD = min(dD, 1.05 * a["dV"] * (a["Dc"] - p["Dc"]) / (p["dV"] - a["dV"]) + 1e-7)
        try:
            b = P.state(a["Dc"] + dD, a["wet"], guess=a["U"] + a["dU"] * dD)
        except ConvergenceError:
            step = 0.5 * dD
            if step >= h_min:
                continue
            b = _jump(P, a)
            snaps += 1
            if b["V"] < a["V"]:
                drops.append((a, b["V"]))
            if b["md"] >= fd.d_b or (b["dV"] <= 0.0 and b["V"] > 0.0):
                lim = _after_jump(P, a, b, path, fd, tol)
                break
            path.append(b)
            a, step = b, 0.02
            continue
        lim = _event(P, a, b, fd, tol)
        path.append(b)
        a = b
        step = min(cap, 2.0 * dD) if b["iterations"] <= 4 else dD
    pre = [d[0] for d in drops if d[0]["V"] > lim["V"] and d[0]["Dc"] < lim["Dc"]]
    if pre:  # the force fell at a snap and never regained its value before it
        lim = max(pre, key=lambda st: st["V"])
        lim["criterion"] = "clamp-force maximum"
    if lim["Dc"] < path[-1]["Dc"]:
        path = [p for p in path if p["Dc"] < lim["Dc"]] + [lim]
    elif path[-1] is not lim:
        path.append(lim)
    ons = None
    if onset and lim["md"] >= fd.d_lim:
        for p, q in zip(path[:-1], path[1:]):
            if p["md"] < fd.d_lim <= q["md"]:
                c = P.refine(p, q, lambda st: st["md"] - fd.d_lim, tol)
                ons = {"clamp_depth": c["Dc"], "V": c["V"], "y": c["sol"]["y"]}
                break
    out = dict(lim["sol"])
    out.update(clamp_depth=lim["Dc"], criterion=lim["criterion"], wet=lim["wet_in"], steps=P.solves,
               snaps=snaps, drops=[(st["Dc"], st["V"], v) for st, v in drops],
               onset=ons, dV=lim["dV"])
    if keep_path:
        out["path"] = path
    return out


def _event(P, a, b, fd, tol):
    """The limit state if one lies between path states ``a`` and ``b``, else None."""
    brk = b["md"] >= fd.d_b
    mx = a["V"] > 0.0 and a["dV"] > 0.0 and b["dV"] <= 0.0
    if not (brk or mx):
        return None
    vtol = 1e-11 * max(1.0, abs(b["V"]))
    if mx:
        c = P.refine(a, b, lambda st: -st["dV"], vtol)
        if c["md"] <= fd.d_b:
            c["criterion"] = "clamp-force maximum"
            return c
        b = c
    c = P.refine(a, b, lambda st: st["md"] - fd.d_b, tol)
    if c["dV"] < 0.0 and a["dV"] > 0.0 and a["V"] > 0.0:  # the maximum comes first after all
        c = P.refine(a, c, lambda st: -st["dV"], vtol)
        c["criterion"] = "clamp-force maximum"
        return c
    c["criterion"] = "local breakthrough"
    return c


def _jump(P, a):
    """Past a fold: the state a little deeper on the branch that continues (from a stiff leg)."""
    for jump in (0.01, 0.04, 0.1):
        try:
            return P.state(a["Dc"] + jump, a["wet"])
        except ConvergenceError:
            continue
    raise ConvergenceError("flexible-leg limit search could not pass a fold of the load path")


def _after_jump(P, a, b, path, fd, tol):
    """The jump landed past the limit: walk back along the new branch to bracket it."""
    back, cur = 0.005, b
    for _ in range(30):
        D = cur["Dc"] - back
        if D <= a["Dc"]:
            break
        try:
            c = P.near(cur, D)
        except ConvergenceError:
            break
        if c["md"] < fd.d_b and c["dV"] > 0.0:
            lim = _event(P, c, cur, fd, tol)
            if lim is not None:
                return lim
            break
        cur, back = c, 2.0 * back
    # No bracket on the new branch: keep the better of the state before the jump and after it.
    best = a if (a["V"] >= cur["V"] or cur["md"] > fd.d_b) else cur
    best["criterion"] = "clamp-force maximum"
    return best


def rigid_limit(L: float, foundation: Foundation, th0, n_quad: int = 4001, n_scan: int = 64):
    """Limit of the same leg if it were rigid, in its natural shape ``th0`` (slopes at nodes).

    The rigid leg is pushed down from first touch; no section ever rises, so the parts above
    the surface are dry. Its liquid force is ``F(D_c) = ∫ f(D_c + y(s)) ds`` (trapezoidal rule on
    ``n_quad`` points) and the limit is the first maximum of ``F − wL`` with positive support
    (``dF/dD_c = ∫ f'(D_c + y) ds = 0``: located on ``n_scan`` clamp depths, then by Brent's
    method), or the clamp depth where the deepest point reaches the breakthrough depth if the
    force still rises there. A level leg peaks where its whole length is at the rod law's
    limit depth; a tilted one peaks later, with f equal at its deepest and shallowest wetted
    points.

    Returns
    -------
    dict with ``force`` (net, at the clamp) and ``liquid_force`` [σ l_c], ``clamp_depth``
    [l_c], ``criterion`` (as :func:`limit`).
    """
    from scipy.optimize import brentq

    fd = foundation
    s_nodes = np.linspace(0.0, L, len(th0))
    s = np.linspace(0.0, L, n_quad)
    th = np.interp(s, s_nodes, th0)
    ds = s[1] - s[0]
    y = np.concatenate([[0.0], np.cumsum(0.5 * ds * (np.sin(th[1:]) + np.sin(th[:-1])))])
    top = float(np.max(y))
    dry = np.zeros(n_quad, dtype=bool)

    def F(Dc, k=0):
        return float(np.trapezoid(fd.liquid(Dc + y, dry)[k], s))

    grid = np.linspace(-top, fd.d_b - top, n_scan)
    step = max(1, (n_quad - 1) // 500)  # the scan only brackets the maximum: a coarser rule will do
    yc, sc = y[::step], s[::step]
    f, df = fd.liquid(grid[:, None] + yc[None, :], dry[None, ::step])
    Fv, dFv = np.trapezoid(f, sc, axis=1), np.trapezoid(df, sc, axis=1)
    Dc, crit = float(grid[-1]), "local breakthrough"
    for k in range(n_scan - 1):
        if Fv[k] - fd.weight * L > 0.0 and dFv[k] > 0.0 and dFv[k + 1] <= 0.0:
            Dc = float(brentq(lambda D: F(D, 1), grid[k], grid[k + 1], xtol=1e-13))
            crit = "clamp-force maximum"
            break
    fl = F(Dc)
    return {"force": fl - fd.weight * L, "liquid_force": fl, "clamp_depth": Dc, "criterion": crit}


def _positive_length(s, g, strict: bool = False) -> float:
    """Length [l_c] of the leg where the nodal indicator ``g`` is positive, crossings interpolated."""
    a, b = g[:-1], g[1:]
    ds = np.diff(s)
    pa, pb = (a > 0, b > 0) if strict else (a >= 0, b >= 0)
    both = pa & pb
    one = pa ^ pb
    frac = np.where(one, np.maximum(a, b) / np.maximum(np.abs(a) + np.abs(b), 1e-300), 0.0)
    return float(np.sum(ds * both) + np.sum(ds * frac))


def contact_lengths(s, y, wet, foundation: Foundation):
    """Wetted length of the leg and the part of it above the undisturbed surface [l_c].

    A section touches the liquid when it is at or below the surface, or above it but wetted
    before and not yet let go (within the receding law's reach, depth ≥ ``d0_r``).
    """
    g = np.where(np.asarray(wet, dtype=bool), y - foundation.d0_r, y)
    return _positive_length(s, g), _positive_length(s, np.minimum(g, -y), strict=True)


def wetted_length(s, y, d0: float) -> float:
    """Length [l_c] of the leg with ``y ≥ d0``, crossings interpolated (no wetting history)."""
    return _positive_length(s, np.asarray(y, dtype=float) - d0)
