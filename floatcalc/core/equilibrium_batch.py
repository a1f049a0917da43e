"""Capacity of many devices at once: the heave/pitch/roll balance of :mod:`.equilibrium`,
vectorised over samples.

Scaled variables as in :mod:`floatcalc.core.equilibrium` (lengths in l_c, forces in σ l_c).

Every sample s is a device of the same layout (the same m force points, owners and table
rows) with its own positions, offsets, tables and coupling. The point law is exactly that of
:class:`~floatcalc.core.equilibrium.Support`: each table resampled on a uniform depth grid of
its own, read by linear interpolation, zero before first contact and held at the limit
beyond it; the neighbours' superposed menisci enter through the same three fixed-point
sweeps :math:`s \\leftarrow C\\,\\bar h(d - s)` starting from s = 0.

Capacity at the centre of mass
------------------------------
With the payload at the centre of mass (x_G, y_G), the total load W + P acts at (x_G, y_G)
whatever P is. The capacity is the load at which the first point reaches its limit depth, so
instead of a root search on P with an equilibrium solve at every step (the scalar
:func:`~floatcalc.core.equilibrium.capacity`), the conditions are solved together for
(z, p, q):

.. math::

    \\max_j (e_j - e_{lim,j}) = 0,\\qquad \\sum_j F_j (x_j - x_G) = 0,\\qquad
    \\sum_j F_j (y_j - y_G) = 0,

and then :math:`P = \\sum_j F_j - W`. It is the same root as the scalar one: there, P solves
g(P) = max_j(e_j − e_lim,j) = 0 where (z, p, q) balance W + P at (x_G, y_G), which are these
equations. Newton's method on (z, p, q), batched with :func:`numpy.linalg.solve` on (S, 3, 3),
uses the exact Jacobian of the piecewise-linear point law *including* the three coupling
sweeps (forward-mode derivatives through them), so it converges in a few steps; a step
limit (no point moves more than 0.25 l_c), step halving on the residual and the slope floor
of the scalar solver (force slopes of at least 10⁻³ of their mean) guard it. Past its limit
a point's force is held, but its slope in the Jacobian is that of the table's last segment:
a symmetric device puts all its points past their limits at once, where held forces alone
would leave the moments without a derivative. It starts level,
half-way down to the shallowest limit.

A device too heavy for its legs gives P < 0 from the same equations (the scalar solver finds
that root by lightening the device). Samples that do not converge, or whose legs carry less
than a thousandth of the own weight at capacity, are reported in ``ok`` so that the caller
can hand them to the scalar solver.

Validity: that of :mod:`floatcalc.core.equilibrium`.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np


@dataclass
class BatchSupport:
    """Force points of S devices of one layout (see module docstring).

    Attributes
    ----------
    x, y, offset : ndarray (S, m) [l_c]
    d0, step : ndarray (S, m) [l_c]
        First depth and spacing of each point's resampled table.
    n : ndarray (S, m) int
        Number of points of each point's table (2 ≤ n ≤ width).
    force, contact : ndarray (S, r, width)
        Resampled force [σ l_c] and contact-depth [l_c] tables, one per row.
    row : ndarray (m,) int
        Table row of each point (shared by all samples).
    limit_depth, limit_force : ndarray (S, m)
        Last depth and force of each point's original table.
    owner : ndarray (m,) int
    coupling : ndarray (S, m, E)
        Outer field of element e at point j per unit contact depth (zero for own points).
    """

    x: np.ndarray
    y: np.ndarray
    offset: np.ndarray
    d0: np.ndarray
    step: np.ndarray
    n: np.ndarray
    force: np.ndarray
    contact: np.ndarray
    row: np.ndarray
    limit_depth: np.ndarray
    limit_force: np.ndarray
    owner: np.ndarray
    coupling: np.ndarray
    coupling_iters: int = 3

    def __post_init__(self):
        n_el = self.coupling.shape[2]
        m = self.x.shape[1]
        counts = np.bincount(self.owner, minlength=n_el).astype(float)
        A = np.zeros((n_el, m))
        A[self.owner, np.arange(m)] = 1.0 / counts[self.owner]
        self._A = A
        self._coupled = bool(np.any(self.coupling))
        self._setup(np.stack([self.force, self.contact]))

    def _setup(self, FH):
        """Force and contact tables together, (2, S, r, w), and the flat lookup indices."""
        _, S, r, w = FH.shape
        self.force, self.contact = FH[0], FH[1]
        # flat index of (sample, row, 0) for every point
        self._base = (np.arange(S)[:, None] * r + self.row[None, :]) * w
        self._FH = FH.reshape(2, -1)
        self._nf = self.n.astype(float)

    @property
    def samples(self) -> int:
        return self.x.shape[0]

    def take(self, idx) -> "BatchSupport":
        """The sub-batch of samples ``idx`` (tables copied once, element averaging reused)."""
        sub = object.__new__(BatchSupport)
        for k in ("x", "y", "offset", "d0", "step", "n", "limit_depth", "limit_force", "coupling"):
            setattr(sub, k, getattr(self, k)[idx])
        sub.row, sub.owner, sub.coupling_iters = self.row, self.owner, self.coupling_iters
        sub._A, sub._coupled = self._A, self._coupled
        sub._setup(self._FH.reshape((2,) + self.force.shape)[:, idx])
        return sub

    def lookup(self, e, extend: bool = False):
        """Force F, contact depth H and their slopes dF/de, dH/de at effective depths e (S, m).

        The same piecewise-linear law as :meth:`floatcalc.core.equilibrium.Support.lookup`.
        With ``extend`` the force slope past the limit is that of the table's last segment
        (for steering Newton's method back from beyond the limit; F itself stays clamped).
        """
        at = self._segment(e)
        F, dF = self._read(self._FH[0], at, extend)
        H, dH = self._read(self._FH[1], at, False)
        return F, H, dF, dH

    def _segment(self, e):
        """Where the depths e (S, m) fall in each point's table: (fraction t, flat index of
        the segment's first entry, touching, inside the table)."""
        u = (e - self.d0) / self.step
        u = np.minimum(np.maximum(np.where(u == u, u, -1.0), -1.0), self._nf)
        k = np.minimum(np.maximum(u.astype(np.int64), 0), self.n - 2)
        t = np.minimum(np.maximum(u - k, 0.0), 1.0)
        on = u >= 0.0
        return t, self._base + k, on, on & (u < self._nf - 1.0)

    def _read(self, T, at, extend):
        """One table (force or contact, flat) and its slope at the segments ``at`` of
        :meth:`_segment`: the arithmetic of :meth:`lookup` (the coupling sweeps need only the
        contact depth, so they read only that table)."""
        t, flat, on, inside = at
        T0 = T.take(flat)
        T1 = T.take(flat + 1)
        return (T0 + t * (T1 - T0)) * on, (T1 - T0) / self.step * (on if extend else inside)

    def _spread(self, h):
        """C · (mean of h over each element's points), for h of shape (S, m) or (S, m, k)."""
        if h.ndim == 2:
            he = h @ self._A.T                           # (S, E)
            return np.matmul(self.coupling, he[..., None])[..., 0]
        return np.matmul(self.coupling, np.matmul(self._A, h))

    def state(self, z, p, q, derivatives: bool = False):
        """Depths d, effective depths e, forces F (and with ``derivatives`` de/du and dF/du
        with respect to u = (z, p, q), shape (S, m, 3)), for z, p, q of shape (S,)."""
        d = z[:, None] + p[:, None] * self.x + q[:, None] * self.y + self.offset
        if derivatives:
            dd = np.stack([np.ones_like(self.x), self.x, self.y], axis=-1)
        if not self._coupled:
            F, dF = self._read(self._FH[0], self._segment(d), derivatives)
            if derivatives:
                return d, d, F, dd, _floored(dF)[..., None] * dd
            return d, d, F
        s = np.zeros_like(d)
        ds = np.zeros(d.shape + (3,)) if derivatives else None
        for _ in range(self.coupling_iters):
            h, dh = self._read(self._FH[1], self._segment(d - s), False)
            if derivatives:
                ds = self._spread(dh[..., None] * (dd - ds))
            s = self._spread(h)
        e = d - s
        F, dF = self._read(self._FH[0], self._segment(e), derivatives)
        if derivatives:
            de = dd - ds
            return d, e, F, de, _floored(dF)[..., None] * de
        return d, e, F


def _floored(k):
    """Force slopes with the floor of :func:`floatcalc.core.equilibrium.solve` (10⁻³ of the mean
    slope): points past their limit or not yet touching have none, and the force is stationary
    at the limit; the floor keeps the Jacobian regular (it only steers the iteration)."""
    return np.maximum(k, 1e-3 * np.maximum(np.mean(np.abs(k), axis=1, keepdims=True), 1e-12))


def from_supports(sups) -> BatchSupport:
    """Stack scalar :class:`~floatcalc.core.equilibrium.Support` objects of one layout
    (same number of points and owners) into a :class:`BatchSupport`."""
    sups = list(sups)
    m = sups[0].x.size
    width = max(s._n for s in sups)
    S = len(sups)
    F = np.zeros((S, m, width))
    H = np.zeros((S, m, width))
    for i, s in enumerate(sups):
        F[i, :, : s._n] = s._F
        H[i, :, : s._n] = s._H
    return BatchSupport(
        x=np.stack([s.x for s in sups]), y=np.stack([s.y for s in sups]),
        offset=np.stack([s.offset for s in sups]), d0=np.stack([s._d0 for s in sups]),
        step=np.stack([s._step for s in sups]),
        n=np.array([[s._n] * m for s in sups], dtype=np.int64), force=F, contact=H, row=np.arange(m),
        limit_depth=np.stack([s.limit_depth for s in sups]), limit_force=np.stack([s.limit_force for s in sups]),
        owner=sups[0].owner, coupling=np.stack([s.coupling for s in sups]),
        coupling_iters=sups[0].coupling_iters,
    )


def _residual(bs: BatchSupport, u, W, xg, yg, derivatives=False):
    st = bs.state(u[:, 0], u[:, 1], u[:, 2], derivatives=derivatives)
    e, F = st[1], st[2]
    gap = e - bs.limit_depth
    j = np.argmax(gap, axis=1)
    rows = np.arange(gap.shape[0])
    ax = bs.x - xg[:, None]
    ay = bs.y - yg[:, None]
    r = np.stack([gap[rows, j], (F * ax).sum(axis=1) / W, (F * ay).sum(axis=1) / W], axis=1)
    if not derivatives:
        return r, F
    de, dF = st[3], st[4]
    J = np.stack([de[rows, j, :], np.matmul(ax[:, None, :], dF)[:, 0] / W[:, None],
                  np.matmul(ay[:, None, :], dF)[:, 0] / W[:, None]], axis=1)
    return r, F, J


def capacity_at_centre(bs: BatchSupport, W, xg, yg, *, tol: float = 1e-12, max_iter: int = 60):
    """Largest extra load P [σ l_c] at the centre of mass of each sample before its first point
    reaches its limit (see module docstring).

    Parameters
    ----------
    bs : BatchSupport
    W, xg, yg : ndarray (S,)
        Own weight [σ l_c] and centre of mass [l_c] of each sample.
    tol : float
        Convergence: every residual (depth gap [l_c], moments / W [l_c]) below ``tol``.

    Returns
    -------
    P : ndarray (S,)
        Capacity, negative for a device that sinks under its own weight (NaN where not ``ok``).
    u : ndarray (S, 3)
        (z, p, q) at capacity.
    ok : ndarray (S,) bool
        Converged with P + W > 10⁻³ W; the other samples need the scalar solver.

    Four linear springs of limit force 2 at depth 1 (as in the example of
    :func:`floatcalc.core.equilibrium.solve`): centred, they carry 8 in all; with the centre
    of mass at x = 0.5 the two springs at x = +1 reach their limits first, at a total of 16/3.

    >>> from floatcalc.core.equilibrium import Support
    >>> D = np.tile(np.linspace(0.0, 1.0, 11), (4, 1))
    >>> sup = Support(x=np.array([1., -1, 1, -1]), y=np.array([1., 1, -1, -1]), offset=np.zeros(4),
    ...               depth=D, force=2.0 * D, contact=D, owner=np.arange(4), coupling=np.zeros((4, 4)))
    >>> P, u, ok = capacity_at_centre(from_supports([sup, sup]), np.array([1.0, 1.0]), np.array([0.0, 0.5]),
    ...                               np.zeros(2))
    >>> [round(float(v), 9) for v in P + 1.0], bool(ok.all())
    ([8.0, 5.333333333], True)
    """
    W = np.asarray(W, dtype=float)
    xg = np.asarray(xg, dtype=float)
    yg = np.asarray(yg, dtype=float)
    S = bs.samples
    # level start half-way to the shallowest limit: every touching point still has a slope
    # (the force is stationary at the limit, so a start there gives a singular Jacobian)
    u = np.zeros((S, 3))
    u[:, 0] = np.min(0.5 * (bs.d0 + bs.limit_depth) - bs.offset, axis=1)
    P = np.full(S, np.nan)
    ok = np.zeros(S, dtype=bool)
    idx = np.arange(S)
    sub = bs
    ua, Wa, xa, ya = u, W, xg, yg
    r, F, J = _residual(sub, ua, Wa, xa, ya, derivatives=True)
    for _ in range(max_iter):
        nr = np.max(np.abs(r), axis=1)
        done = nr < tol
        if done.any():
            ok[idx[done]] = True
            P[idx[done]] = F[done].sum(axis=1) - Wa[done]
            u[idx[done]] = ua[done]
            keep = ~done
            if not keep.any():
                break
            idx = idx[keep]
            sub = sub.take(keep)
            ua, Wa, xa, ya, r, J, nr = ua[keep], Wa[keep], xa[keep], ya[keep], r[keep], J[keep], nr[keep]
        bad = ~(np.abs(np.linalg.det(J)) > 1e-280)
        if bad.any():
            J = J.copy()
            J[bad] += 1e-9 * np.eye(3)
        step = np.linalg.solve(J, -r[..., None])[..., 0]
        move = np.max(np.abs(step[:, :1] + step[:, 1:2] * sub.x + step[:, 2:3] * sub.y), axis=1)
        lam = np.where(move > 0.25, 0.25 / np.maximum(move, 1e-300), 1.0)
        un = ua + lam[:, None] * step
        rn, Fn, Jn = _residual(sub, un, Wa, xa, ya, derivatives=True)
        for _ in range(12):  # step halving where the residual did not fall
            worse = ~(np.max(np.abs(rn), axis=1) < nr * (1.0 - 1e-4 * lam))
            if not worse.any():
                break
            lam = np.where(worse, 0.5 * lam, lam)
            w = np.flatnonzero(worse)
            part = sub.take(w)
            ut = ua[w] + lam[w, None] * step[w]
            rw, Fw, Jw = _residual(part, ut, Wa[w], xa[w], ya[w], derivatives=True)
            un[w], rn[w], Fn[w], Jn[w] = ut, rw, Fw, Jw
        ua, r, F, J = un, rn, Fn, Jn
    ok &= P + W > 1e-3 * W   # a device that carries next to nothing: leave it to the scalar solver
    P = np.where(ok, P, np.nan)
    return P, u, ok
