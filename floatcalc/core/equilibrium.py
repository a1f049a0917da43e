"""Static equilibrium of a floating device in heave, pitch and roll, on bare numbers.

Scaled variables: lengths in l_c, forces in σ l_c, moments in σ l_c².

Model
-----
The device is rigid. Its support is represented by m force points j at plan positions
(x_j, y_j), each with a tabulated force–depth law F_j(e) from first contact to its own limit
(precomputed once by the element adapters, interpolated here). With heave z (depth at the
origin), pitch slope p = tan(pitch) and roll slope q = tan(roll), the depth of point j below the
undisturbed surface is

.. math:: d_j = z + p\\,x_j + q\\,y_j + o_j,

with o_j a fixed offset (mounting height, tilt of a rod along its axis). Neighbouring elements
share the surface: far from each element the meniscus obeys the linearised equation
∇²h = h, so the depressions of separate elements superpose. Point j therefore feels the
local surface lowered by s_j = Σ_e C_je h_e, where h_e is the contact-line depth of element e
(mean over its points) and C_je the element's outer field at point j per unit contact depth
(zero for the element's own points). The force is taken at the effective depth e_j = d_j − s_j;
the fixed point s = C h(e) is found by a few iterations (the coupling is a contraction for
elements that do not overlap).

Equilibrium: Σ F_j = W, Σ F_j x_j = W x_G, Σ F_j y_j = W y_G (small-angle moment arms), solved
by Newton's method on (z, p, q) from a level start (regula falsi on the heave), with the
Jacobian of the balance through the coupling iteration (exact within a table segment) and step
halving.

Validity: rigid device, small tilts (|p|, |q| ≪ 1), static, forces vertical; each element's
own nonlinear law near it, linear superposition between elements (approximate for elements
closer than about one l_c).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..errors import ConvergenceError


@dataclass
class Support:
    """Force points of a device (scaled arrays). See module docstring."""

    x: np.ndarray            # (m,) plan position [l_c]
    y: np.ndarray            # (m,)
    offset: np.ndarray       # (m,) depth offset [l_c]
    depth: np.ndarray        # (m, n) table depths (increasing) [l_c]
    force: np.ndarray        # (m, n) table forces [σ l_c]
    contact: np.ndarray      # (m, n) contact-line depth on the same grid [l_c]
    owner: np.ndarray        # (m,) element index of each point
    coupling: np.ndarray     # (m, E) field of element e at point j per unit contact depth
    coupling_iters: int = 3

    def __post_init__(self):
        # Resample every table on a uniform depth grid of its own (same number of points), so
        # that interpolation needs no search: index = (e − d0) / step.
        m, n = self.depth.shape
        self._d0 = self.depth[:, 0].copy()
        self._step = (self.depth[:, -1] - self._d0) / (n - 1)
        grid = self._d0[:, None] + self._step[:, None] * np.arange(n)
        self._F = np.array([np.interp(grid[j], self.depth[j], self.force[j]) for j in range(m)])
        self._H = np.array([np.interp(grid[j], self.depth[j], self.contact[j]) for j in range(m)])
        self._rows = np.arange(m)
        self._n = n
        self._FH = np.stack([self._F, self._H])
        # flat tables for the lookup: value at the segment start and its increment, indexed by
        # row * n + k (one gather per quantity instead of fancy indexing over two axes)
        self._base = self._rows * n
        dF = np.zeros_like(self._F)
        dH = np.zeros_like(self._H)
        dF[:, :-1] = self._F[:, 1:] - self._F[:, :-1]
        dH[:, :-1] = self._H[:, 1:] - self._H[:, :-1]
        self._Ff, self._dFf = self._F.ravel(), dF.ravel()
        self._Hf, self._dHf = self._H.ravel(), dH.ravel()
        self._inv_step = 1.0 / self._step
        # coupling C (m × E) times the averaging over each element's points (E × m)
        n_el = self.coupling.shape[1]
        counts = np.bincount(self.owner, minlength=n_el).astype(float)
        A = np.zeros((n_el, m))
        A[self.owner, np.arange(m)] = 1.0 / counts[self.owner]
        self._CA = self.coupling @ A
        self._coupled = bool(np.any(self.coupling))
        # the same product factored, C · (means over each element's runs of points), where the
        # points come element by element (as a device lists them): m·E instead of m² operations,
        # about 3x faster for 48 rods of 5 points (see :meth:`couple`); below ~120 points the
        # full product's single call is the faster (60 points: 2.8 against 4.0 µs)
        self._runs = None
        if m >= 120 and np.all(np.diff(self.owner) >= 0):
            starts = np.flatnonzero(np.r_[True, self.owner[1:] != self.owner[:-1]])
            els = self.owner[starts]
            if els.size < m:
                self._runs = (starts, 1.0 / counts[els], np.ascontiguousarray(self.coupling[:, els]))

    def couple(self, v):
        """``C · A · v`` (the product ``_CA @ v``): the coupling field at every point from each
        element's mean of ``v`` over its points (``v`` one value per point, or columns of them)."""
        if self._runs is None:
            return self._CA @ v
        starts, inv, C = self._runs
        red = np.add.reduceat(v, starts, axis=0)
        red *= inv if red.ndim == 1 else inv[:, None]
        return C @ red

    def _where(self, e):
        """Flat table index, fraction within the segment and the touching mask at depths e."""
        u = np.subtract(e, self._d0)
        u /= self._step
        np.fmax(u, -0.5, out=u)                    # before first contact, or NaN: not touching
        np.minimum(u, float(self._n), out=u)
        k = u.astype(np.intp)                      # u >= −0.5 truncates to k >= 0
        np.minimum(k, self._n - 2, out=k)
        t = u - k
        np.minimum(t, 1.0, out=t)                  # t < 0 only where u < 0 (masked by the caller)
        k += self._base
        return k, t, u

    def lookup(self, e, slopes: bool = False):
        """Force and contact depth of every point at effective depths e (linear, clamped at the
        limit, zero before first contact); with ``slopes`` also dF/de."""
        i, t, u = self._where(e)
        on = u >= 0.0
        F = (self._Ff[i] + t * self._dFf[i]) * on
        H = (self._Hf[i] + t * self._dHf[i]) * on
        if slopes:
            inside = on & (u < self._n - 1)
            return F, H, self._dFf[i] / self._step * inside
        return F, H

    def contact_and_slope(self, e):
        """Contact depth (as :meth:`lookup_contact`) and its slope dh/de (zero outside)."""
        i, t, u = self._where(e)
        on = u >= 0.0
        return (self._Hf[i] + t * self._dHf[i]) * on, self._dHf[i] / self._step * (on & (u < self._n - 1))

    def lookup_contact(self, e):
        """Contact depth only (as :meth:`lookup`), for the coupling iterations."""
        i, t, u = self._where(e)
        return (self._Hf[i] + t * self._dHf[i]) * (u >= 0.0)

    @property
    def limit_depth(self) -> np.ndarray:
        return self.depth[:, -1]

    @property
    def limit_force(self) -> np.ndarray:
        return self.force[:, -1]


def _interp_rows(xq, X, Y, left):
    """Row-wise linear interpolation of Y(X) at xq (one query per row), clamped at the right."""
    m, n = X.shape
    rows = np.arange(m)
    k = np.clip(np.count_nonzero(X < xq[:, None], axis=1), 1, n - 1)
    x0, x1 = X[rows, k - 1], X[rows, k]
    y0, y1 = Y[rows, k - 1], Y[rows, k]
    t = np.clip((xq - x0) / np.where(x1 > x0, x1 - x0, 1.0), 0.0, 1.0)
    out = y0 + t * (y1 - y0)
    return np.where(xq < X[:, 0], left, out)


def point_state(sup: Support, z: float, p: float, q: float):
    """Depths d, effective depths e, forces F and contact depths h of every point."""
    d = z + p * sup.x + q * sup.y + sup.offset
    if not sup._coupled:
        F, h = sup.lookup(d)
        return d, d, F, h
    # Fixed point s = C · mean_e h(d − s) by direct iteration (the coupling is weak: a
    # contraction with factor about max_j Σ_e C_je ≲ 0.3 for elements a capillary length apart).
    s = np.zeros_like(d)
    for _ in range(sup.coupling_iters):
        s = sup.couple(sup.lookup_contact(d - s))
    e = d - s
    F, h = sup.lookup(e)
    return d, e, F, h


def _residual(sup, u, W, xg, yg):
    _, e, F, _ = point_state(sup, *u)
    return np.array([F.sum() - W, F @ sup.x - W * xg, F @ sup.y - W * yg]) / W, e


def _state_and_sensitivity(sup: Support, u, X):
    """Effective depths e, forces F, table slopes dF/de and de/du · (columns of Xᵀ) at u, in one
    pass: the coupling iteration of :func:`point_state` (s₀ = 0, s_{k+1} = C·A·h(d − s_k);
    the same e and F, bit for bit) carries its derivative along,
    ∂s_{k+1} = C·A·diag(h′(d − s_k))·(∂d − ∂s_k)."""
    Xt = X.T
    d = u[0] + u[1] * sup.x + u[2] * sup.y + sup.offset
    if not sup._coupled:
        F, _, k = sup.lookup(d, slopes=True)
        return d, F, k, Xt
    s = np.zeros_like(d)
    V = np.zeros_like(Xt)
    for _ in range(sup.coupling_iters):
        h, hp = sup.contact_and_slope(d - s)
        V = sup.couple(hp[:, None] * (Xt - V))
        s = sup.couple(h)
    e = d - s
    F, _, k = sup.lookup(e, slopes=True)
    return e, F, k, Xt - V


def solve(sup: Support, W: float, xg: float, yg: float, *, tol: float = 1e-10, max_iter: int = 80,
          start=None):
    """Heave, pitch and roll slopes (z, p, q) that carry weight W [σ l_c] at (x_G, y_G) [l_c].

    Points past their own limit are held at their limit force, so the solve still converges;
    the caller decides from the returned effective depths whether an element has given way.

    Method: a level start (heave alone, Illinois regula falsi on the total force, which rises
    with heave), then Newton's method on (z, p, q) with the Jacobian of the force and moment
    balance through the coupling iteration (:func:`_state_and_sensitivity`; the tables are linear
    between their points, so Newton is exact within a table segment) and step halving.

    Returns
    -------
    u : ndarray (3,)
        (z, p, q).
    e : ndarray (m,)
        Effective depths of the points at equilibrium.

    Raises
    ------
    ConvergenceError
        If no balance is reached (for example W beyond what the points can carry at any depth).

    >>> import numpy as np
    >>> D = np.tile(np.linspace(0.0, 1.0, 11), (4, 1)); F = 2.0 * D   # linear springs
    >>> sup = Support(x=np.array([1., -1, 1, -1]), y=np.array([1., 1, -1, -1]), offset=np.zeros(4),
    ...               depth=D, force=F, contact=D, owner=np.arange(4), coupling=np.zeros((4, 4)))
    >>> u, e = solve(sup, 4.0, 0.0, 0.0)
    >>> [round(float(v), 9) for v in u]
    [0.5, 0.0, 0.0]
    """
    if W >= float(sup.limit_force.sum()):
        raise ConvergenceError("the load exceeds the sum of all element limits")
    if start is None:
        u0 = np.array([_level_heave(sup, W), 0.0, 0.0])
    else:
        u0 = np.asarray(start, dtype=float).copy()
    X = np.stack([np.ones_like(sup.x), sup.x, sup.y])
    bal = np.array([W, W * xg, W * yg])
    # The Jacobian through the coupling converges fastest; next to a kink of the tables (points
    # at their limits) it can stall, and the Jacobian of the uncoupled balance (it only steers
    # the iteration; the residual is the coupled one) then still reaches the balance.
    best = None
    for coupled in (True, False):
        u, r, e = _newton(sup, u0, X, bal, W, tol, max_iter, coupled)
        nr = float(np.linalg.norm(r))
        if nr < tol:
            return u, e
        if best is None or nr < best[0]:
            best = (nr, u, e)
    if best[0] < 1e-7:
        return best[1], best[2]
    raise ConvergenceError(
        f"device equilibrium did not converge (force/moment residual {best[0]:.2g} of the weight)"
    )


def _newton(sup: Support, u, X, bal, W, tol, max_iter, coupled: bool):
    """Damped Newton iterations of :func:`solve` from u; returns (u, residual, e) at the end."""

    def full(uu):
        e_, F_, k_, dE_ = _state_and_sensitivity(sup, uu, X)
        return (X @ F_ - bal) / W, e_, k_, (dE_ if coupled else X.T)

    u = np.asarray(u, dtype=float).copy()
    r, e, k, dE = full(u)
    history = []
    for it in range(max_iter):
        nr = np.linalg.norm(r)
        if nr < tol:
            break
        # stalled: not a tenth of the residual gone in ten steps (no balance exists, e.g. an
        # element past its limit and the rest unable to hold the moment). A converging solve
        # takes at most about seven evaluations on these piecewise-linear tables.
        history.append(nr)
        if it >= 10 and nr > 0.1 * history[it - 10]:
            break
        # points past their limit or not yet touching have zero slope; a small floor keeps
        # the Jacobian regular (it only steers the iteration)
        kf = np.maximum(k, 1e-3 * max(float(np.mean(np.abs(k))), 1e-12))
        J = (X * kf) @ dE / W
        try:
            step = np.linalg.solve(J, -r)
        except np.linalg.LinAlgError:
            step = np.linalg.lstsq(J, -r, rcond=None)[0]
        # trust region: no point moves more than a quarter capillary length in one step
        move = float(np.max(np.abs(step[0] + step[1] * sup.x + step[2] * sup.y)))
        lam = min(1.0, 0.25 / move) if move > 0 else 1.0
        for _ in range(12):
            un = u + lam * step
            nxt = full(un)
            if np.linalg.norm(nxt[0]) < nr * (1.0 - 1e-4 * lam):
                break
            lam *= 0.5
        else:
            break
        u = un
        r, e, k, dE = nxt
    return u, r, e


def depth_rates(sup: Support, u, dbal):
    """Rate of change of every point's effective depth along a load path, at equilibrium u.

    ``dbal`` is the rate of the balance (total load, its x-moment, its y-moment) per unit of the
    path's parameter [σ l_c, σ l_c²]. With the balance Σ F_j (1, x_j, y_j) = bal held, the
    equilibrium moves by du = J⁻¹ dbal, J the Jacobian of the balance through the coupling
    (:func:`_state_and_sensitivity`; exact within a table segment), and the depths by
    de = (∂e/∂u) du. Where J is singular (points in a line: the roll about that line is free),
    the least-norm du (the tilt the balance does not fix stays). ``None`` where no slope is
    defined (every point at its limit or not touching)."""
    X = np.stack([np.ones_like(sup.x), sup.x, sup.y])
    _, _, k, dE = _state_and_sensitivity(sup, np.asarray(u, dtype=float), X)
    J = (X * k) @ dE
    if not np.any(k > 0):
        return None
    du, *_ = np.linalg.lstsq(J, np.asarray(dbal, dtype=float), rcond=1e-12)
    return dE @ du if np.all(np.isfinite(du)) else None


def newton_crossing(state, g0: float, s0, *, xtol: float, hi: float, probe, cap=None, max_iter: int = 60):
    """Smallest t > 0 where a margin g(t), rising from g(0) = g0 < 0, reaches zero.

    ``state(t)`` returns (g(t), g'(t)), the slope ``None`` where unknown (then g = 1 marks a
    state without balance, past the crossing). Newton's method from the last state, kept inside
    the bracket found so far (bisection when a step leaves it); while no loaded end is known, a
    step that Newton cannot predict goes to ``probe(a, g(a))``, and a step to t from the
    unloaded end a goes to ``cap(a, t)`` instead (default t), never past ``hi``. Stops when
    the Newton step, or the bracket, is under ``xtol``.

    Returns (t, bracket, settled): bracket = (a, b) with g(a) < 0 <= g(b), settled False when
    ``max_iter`` ran out (t is then the bracket's middle); (None, None, True) if g stays negative
    up to ``hi``. The root returned is on its safe side (:func:`_below`). A margin convex in t
    (depths grow faster as an element nears its limit) is overshot by the first Newton step and
    then approached from the loaded side, quadratically: about four evaluations where Brent's
    method takes ten to a tight tolerance.
    """
    a, ga, b = 0.0, g0, None
    t, g, s = 0.0, g0, s0
    b_bare = False   # the loaded end is a state without balance (costly to find again)
    for _ in range(max_iter):
        tn = t - g / s if (s is not None and s > 0) else None
        if b is None:
            if tn is None or tn <= a:
                tn = probe(a, ga)
            tn = min(tn, hi) if cap is None else min(cap(a, tn), hi)
        elif tn is None or not (a < tn < b):
            tn = 0.5 * (a + b)
        elif b_bare and t == a:
            # from the unloaded side towards an end without balance: at most halfway (a convex
            # margin's Newton step overshoots, and past the crossing there may be no balance)
            tn = min(tn, 0.5 * (a + b))
        gn, sn = state(tn)
        if gn >= 0:
            b, b_bare = tn, sn is None
        else:
            a, ga = tn, gn
        if (b is not None and b - a <= xtol) or (sn is not None and sn > 0 and abs(gn) <= sn * xtol):
            if gn < 0:
                return tn, (a, b if b is not None else tn), True
            return _below(tn, gn, sn, a, xtol), (a, tn), True
        if b is None and tn >= hi:
            return None, None, True
        if sn is not None:
            t, g, s = tn, gn, sn
        else:   # no balance at tn: predict again from the bracket's unloaded end
            t, g = a, ga
    return (0.5 * (a + b), (a, b), False) if b is not None else (None, None, True)


def _below(t, g, s, a, xtol):
    """The safe side of a crossing found at t with g(t) >= 0: the Newton estimate of the root
    less 1e-3 xtol (its error is of the order of the last step squared), or, without a slope,
    the bracket's unloaded end a (within xtol). No new evaluation: below the last step the
    margin is at the resolution of the equilibrium solve (1e-10 of the load), which a further
    step back does not move."""
    if s is not None and s > 0:
        return max(a, t - g / s - 1e-3 * xtol)
    return a


def _level_heave(sup: Support, W: float) -> float:
    """Heave at which the level device carries W: Illinois regula falsi on the total force
    (non-decreasing in heave) over the whole table range, to 1e-9 of that range or of W (a
    start for Newton's method, which takes the balance to its own tolerance: near the sum of
    the limits the total force flattens, and 1e-13 took 56 evaluations there, 10 elsewhere)."""
    lo = float(np.min(sup.depth[:, 0] - sup.offset)) - 1.0
    hi = float(np.max(sup.limit_depth - sup.offset)) + 1.0

    def f(z):
        return float(point_state(sup, z, 0.0, 0.0)[2].sum()) - W

    flo, fhi = f(lo), f(hi)
    if not (flo < 0.0 <= fhi):
        return 0.5 * (lo + hi)
    span = hi - lo
    side = 0
    for _ in range(100):
        z = hi - fhi * (hi - lo) / (fhi - flo) if fhi != flo else 0.5 * (lo + hi)
        if not (lo < z < hi):
            z = 0.5 * (lo + hi)
        fz = f(z)
        if fz < 0.0:
            lo, flo = z, fz
            if side == -1:
                fhi *= 0.5
            side = -1
        else:
            hi, fhi = z, fz
            if side == 1:
                flo *= 0.5
            side = 1
        if hi - lo < 1e-9 * span or abs(fz) < 1e-9 * max(W, 1e-300):
            break
    return 0.5 * (lo + hi) if hi - lo < 1e-9 * span else z


def utilisation(sup: Support, e) -> np.ndarray:
    """Depth of each point as a fraction of its limit depth, measured from first contact."""
    d0 = sup.depth[:, 0]
    return (e - d0) / (sup.limit_depth - d0)


def _root(f, a: float, b: float, *, rtol: float, xtol: float) -> float:
    """Root of f on [a, b] with f(a) < 0 <= f(b) as first evaluated: Brent's method, or, when f
    evaluated again no longer changes sign there (the equilibrium behind f is followed from the
    previous load, so near a fold it can depend on the path), bisection on the sign of f, which
    keeps the bracket as evaluated and returns its loaded (f >= 0) end's neighbour on the safe side."""
    from scipy.optimize import brentq

    try:
        return brentq(f, a, b, rtol=rtol, xtol=xtol)
    except ValueError:
        pass
    for _ in range(200):
        if b - a <= xtol + rtol * abs(b):
            break
        m = 0.5 * (a + b)
        a, b = (m, b) if f(m) < 0.0 else (a, m)
    return a


def capacity(sup: Support, W: float, xg: float, yg: float, px: float, py: float, *, rtol: float = 1e-8):
    """Largest extra load P [σ l_c] at (px, py) before the first point reaches its limit.

    The margin g(P) = max_j (e_j − e_lim,j) rises with P; :func:`newton_crossing` finds its
    root on the safe side (slope from :func:`depth_rates`), Brent's method if Newton does not
    settle in 40 steps.

    Returns
    -------
    P, u, e, j : float, ndarray, ndarray, int
        Load, equilibrium at that load, effective depths, index of the first point to give way.
        P < 0 means the device already fails under its own weight (then the shortfall is −P).
    """
    last = [None]
    seen: dict = {}

    def g(P):
        if P not in seen:
            seen[P] = _margin(P)
        return seen[P]

    def _margin(P):
        Wt = W + P
        xt = (W * xg + P * px) / Wt
        yt = (W * yg + P * py) / Wt
        try:
            u, e = solve(sup, Wt, xt, yt, start=last[0])
        except ConvergenceError:
            try:
                u, e = solve(sup, Wt, xt, yt)
            except ConvergenceError:
                return 1.0, None, None
        last[0] = u
        return float(np.max(e - sup.limit_depth)), u, e

    def state(P):
        """Margin and its slope dg/dP (the balance grows by (1, px, py) per unit load)."""
        m, u, e = g(P)
        if u is None:
            return m, None
        rates = depth_rates(sup, u, (1.0, px, py))
        return m, None if rates is None else float(rates[int(np.argmax(e - sup.limit_depth))])

    g0, u0, e0 = g(0.0)  # g0 = 1 if no balance exists under the own weight (too heavy)
    if g0 >= 0.0:  # fails under its own weight: how much lighter would it have to be
        hi = 0.0
        for k in range(1, 25):  # lighten step by step until a balance within all limits exists
            lo = -W * (1.0 - 0.5**k)
            if g(lo)[0] < 0.0:
                break
            hi = lo
        else:
            raise ConvergenceError("no static equilibrium found even for a nearly weightless device "
                                   "(check the element layout and the centre of mass)")
        P = _root(lambda P: g(P)[0], lo, hi, rtol=rtol, xtol=1e-12 * W)
    else:
        # Newton on the margin (newton_crossing); where it cannot predict, a stiffness-based
        # step out. Brent's method between the bracket's ends if Newton does not settle.
        kz = max(float(np.sum((sup._F[:, 1:] - sup._F[:, :-1]).max(axis=1) / sup._step)), 1e-12)
        total = float(sup.limit_force.sum()) - W
        # A step that Newton puts past the sum of all limits: first try just short of it once
        # (elements alike, centred, all reach their limits together there); after that, steps
        # at most halfway to it (near it no balance may exist: an element past its limit and the
        # rest unable to hold the moment).
        xtol = rtol * 1e-2 * max(total, 1e-12)
        tried = []

        def cap(a, t):
            if t >= total and not tried:
                tried.append(t)
                return total - 0.5 * xtol
            return min(t, a + 0.5 * (total - a))

        P, bracket, settled = newton_crossing(
            state, g0, state(0.0)[1], xtol=xtol, hi=total,
            probe=lambda a, ga: a + max(-ga * kz * 1.5, 1e-6 * max(total, 1e-12)), cap=cap, max_iter=40)
        if P is None:
            P = total
        elif not settled:
            P = _root(lambda P: g(P)[0], bracket[0], bracket[1], rtol=rtol, xtol=1e-12 * max(total, 1.0))
    _, u, e = g(P)
    if u is None:
        raise ConvergenceError("device equilibrium did not converge near its capacity")
    j = int(np.argmax(e - sup.limit_depth))
    return P, u, e, j


def best_capacity(sup: Support, W: float, xg: float, yg: float, at_centre=None):
    """Largest total load over all heave/pitch/roll with every point within its limit.

    Maximises Σ F_j(e_j) subject to e_j ≤ e_lim,j. For a given tilt (p, q) the best heave is the
    deepest one at which no point passes its limit (bisection, the effective depths rise with
    heave); the tilt is then optimised by Nelder–Mead. The payload that can be added is
    P = ΣF − W, and it must sit at x = (Σ F_j x_j − W x_G)/P (likewise y).

    ``at_centre`` may pass the result of :func:`capacity` at the centre of mass to save a solve.

    Returns
    -------
    P, px, py : float
    """
    from scipy.optimize import minimize

    P0, u0, _, _ = capacity(sup, W, xg, yg, xg, yg) if at_centre is None else at_centre

    sag = [0.0]   # the coupling's correction at the last tilt: nearby tilts sag alike

    def best_heave(p, q):
        # Without coupling e is linear in heave: the deepest admissible heave is explicit.
        # Coupling makes the surface sag a little with depth; a few corrections converge.
        z0 = float(np.min(sup.limit_depth - p * sup.x - q * sup.y - sup.offset))
        z = z0 + sag[0]
        for _ in range(6):
            st = point_state(sup, z, p, q)
            gap = float(np.min(sup.limit_depth - st[1]))
            if abs(gap) < 1e-9:
                sag[0] = z - z0
                return z, st
            z += gap
        return z, point_state(sup, z, p, q)

    def neg(t):
        return -float(best_heave(*t)[1][2].sum())

    t0 = np.asarray(u0[1:], dtype=float)
    span = max(float(np.ptp(sup.x)), float(np.ptp(sup.y)), 1e-3)
    d = 0.05 / span  # initial simplex: tilts that move the far points by 0.05 l_c
    simplex = np.array([t0, t0 + [d, 0.0], t0 + [0.0, d]])
    res = minimize(neg, t0, method="Nelder-Mead",
                   options={"xatol": 1e-4 / span, "fatol": 1e-7 * max(W, 1e-12), "maxiter": 150,
                            "initial_simplex": simplex})
    t = res.x if -res.fun >= P0 + W else u0[1:]
    _, (_, _, F, _) = best_heave(*t)
    if F.sum() - W < P0:  # never report less than the load at the centre of mass
        _, _, F, _ = point_state(sup, *u0)
    P = float(F.sum() - W)
    if P <= 0:
        return P, xg, yg
    return P, float((F @ sup.x - W * xg) / P), float((F @ sup.y - W * yg) / P)


def stiffness(sup: Support, u, xg: float, yg: float, *, step: float = 1e-6):
    """Restoring stiffness in heave [σ], pitch and roll [σ l_c² per rad] at equilibrium u.

    Central differences of the force and of the moments about (x_G, y_G) with respect to heave,
    pitch and roll, with the tilt slopes taken as angles (small tilts).
    """
    z, p, q = u

    def fm(zz, pp, qq):
        _, _, F, _ = point_state(sup, zz, pp, qq)
        return F.sum(), F @ (sup.x - xg), F @ (sup.y - yg)

    kz = (fm(z + step, p, q)[0] - fm(z - step, p, q)[0]) / (2 * step)
    kp = (fm(z, p + step, q)[1] - fm(z, p - step, q)[1]) / (2 * step)
    kq = (fm(z, p, q + step)[2] - fm(z, p, q - step)[2]) / (2 * step)
    return float(kz), float(kp), float(kq)


#: Depth range [l_c] of the constant table of a broken-through element (never reached).
_BROKEN_RANGE = 50.0


def with_broken(sup: Support, broken, broken_force) -> Support:
    """The support with the elements in ``broken`` through the surface.

    A broken-through element no longer has a meniscus: its points carry a constant upward
    force (``broken_force[e]`` [σ l_c] for element e, shared equally by its points: the
    buoyancy of the submerged body), never reach a limit, and no longer depress their
    neighbours' surface.
    """
    broken = np.asarray(sorted(set(int(b) for b in broken)), dtype=int)
    if broken.size == 0:
        return sup
    m, n = sup.depth.shape
    rows = np.isin(sup.owner, broken)
    counts = np.bincount(sup.owner, minlength=sup.coupling.shape[1]).astype(float)
    depth = sup.depth.copy()
    force = sup.force.copy()
    contact = sup.contact.copy()
    depth[rows] = np.linspace(-_BROKEN_RANGE, _BROKEN_RANGE, n)
    force[rows] = (np.asarray(broken_force, dtype=float)[sup.owner[rows]] / counts[sup.owner[rows]])[:, None]
    contact[rows] = 0.0
    C = sup.coupling.copy()
    C[:, broken] = 0.0
    return Support(x=sup.x, y=sup.y, offset=sup.offset, depth=depth, force=force, contact=contact,
                   owner=sup.owner, coupling=C, coupling_iters=sup.coupling_iters)


def progressive(sup: Support, W: float, xg: float, yg: float, px: float, py: float, broken_force,
                first=None):
    """Progressive failure under a payload growing at (px, py) [l_c].

    When an element reaches its limit it breaks through and then carries only
    ``broken_force[e]`` [σ l_c]; the device re-settles on the rest. If the rest carries the
    current load, the load rises to their next capacity; otherwise the next element fails at
    the same load (a cascade). The device sinks when no equilibrium remains.

    ``first`` may pass the result of :func:`capacity` for the intact device.

    Returns
    -------
    steps : list of (element, load) — breakthrough order and the payload [σ l_c] at which
        each element broke through;
    sinking : float — the largest payload [σ l_c] carried before the device sinks (an
        equilibrium with some elements intact exists up to it).
    """
    n_el = int(sup.owner.max()) + 1
    P, u, e, j = capacity(sup, W, xg, yg, px, py) if first is None else first
    level = P
    steps = []
    broken: list[int] = []
    cur = sup
    nxt = [int(cur.owner[j])]
    while True:
        for b in nxt:  # elements past their limit at the same load break together
            broken.append(b)
            steps.append((b, level))
        if len(broken) == n_el:
            return steps, level
        cur = with_broken(sup, broken, broken_force)
        live = ~np.isin(cur.owner, broken)
        Wt = W + level
        try:
            u, e = solve(cur, Wt, (W * xg + level * px) / Wt, (W * yg + level * py) / Wt)
            over = np.where(live, e - cur.limit_depth, -np.inf)
        except ConvergenceError:
            return steps + [(int(i), level) for i in range(n_el) if i not in broken], level
        if float(over.max()) < 0.0:   # the rest holds: load up to its capacity
            try:
                P, u, e, j = capacity(cur, W, xg, yg, px, py)
            except ConvergenceError:
                return steps + [(int(i), level) for i in range(n_el) if i not in broken], level
            if P < level:  # (rounding at the switch) treat as a cascade
                P = level
            level = P
            over = np.where(live, e - cur.limit_depth, -np.inf)
        if float(over.max()) > 0.0:   # a cascade: every element already past its limit, deepest first
            per = np.full(n_el, -np.inf)
            np.maximum.at(per, cur.owner, over)
            nxt = [int(e) for e in np.argsort(-per) if per[e] > 0.0]
        else:
            nxt = [int(cur.owner[int(np.argmax(over))])]
