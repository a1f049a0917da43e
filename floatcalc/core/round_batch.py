"""Batched force laws of ball, pad and pin for many designs at once, in scaled variables.

The same laws as :mod:`floatcalc.core.round_bodies` (same φ / ψ grids, the same branch
cuts, the same bounded-Brent refinement of the limit), evaluated for arrays of designs in
one pass over the universal contact-height table (:mod:`floatcalc.core.axisym_table`).
Lengths in capillary lengths l_c, forces in σ l_c. Conventions as in
:mod:`floatcalc.core.round_bodies`: φ the contact position from the lowest point of a
sphere, ψ = φ + θ − π the inclination at the contact line (positive when depressed), D the
depth of the element's lowest point (bottom face of a pad, tip of a pin).

Force laws (see :mod:`floatcalc.core.round_bodies` for the derivations):

.. math::

    F_\\text{ball}(\\phi) = 2\\pi r_c\\sin\\psi + \\tfrac{\\pi}{3}R^3(1-\\cos\\phi)^2(2+\\cos\\phi)
        + \\pi r_c^2 d,\\quad r_c = R\\sin\\phi,

    F_\\text{pad, pin} = 2\\pi a\\sin\\psi + \\pi a^2 D,

with d = −z_c(r_c, ψ) the contact-line depth from the table. For every design the functions
return the limit (largest force on the push-down branch, refined by a vectorised port of
SciPy's bounded Brent minimiser with the scalar path's tolerance) and the element table that
a device interpolates: ``points`` depths evenly spaced from first contact (depth 0, or the
start of the curve if deeper) to the limit depth, with force, surface-tension part and
contact-line depth h₀ from Keller's theorem for the linearised outer meniscus
(F_st = 2π r_c h₀ K₁(r_c)/K₀(r_c)), exactly the construction of the device's round-element
adapter (cut at the limit, :func:`from_first_contact`, linear resampling).

Accuracy: equal to the scalar path (:func:`floatcalc.core.round_bodies.ball_limit`,
:func:`~floatcalc.core.round_bodies.pad_limit`, :func:`~floatcalc.core.round_bodies.pad_curve`)
to round-off (tests/test_round_batch.py: ≤ 1e-8 relative on seeded random designs); the
table itself is within 1e-6 of the direct solver (:mod:`floatcalc.core.axisym_table`).

Validity: that of the scalar laws: static, clean surface, rigid axisymmetric bodies, contact
radii 1e-4 to 300 l_c (points outside the table fall back to the direct solver, as in the
scalar path), 0 ≤ θ ≤ π.

>>> out = ball_laws([0.01, 0.3], np.radians([150.0, 150.0]))
>>> small = 2 * np.pi * 0.01 * np.sin(np.radians(75.0)) ** 2   # Scheludko / Nutt small-sphere limit
>>> round(float(out["max_force"][0] / small), 2)
1.0

References
----------
.. [1] A. Scheludko, B. V. Toshev, D. T. Bojadjiev, J. Chem. Soc. Faraday Trans. 1, 72, 2815
   (1976); H. C. Nutt, Chem. Eng. Sci. 12, 133 (1960) (small-sphere limit).
.. [2] J. B. Keller, Phys. Fluids 10, 3009 (1998).
.. [3] R. P. Brent, Algorithms for Minimization without Derivatives, Prentice-Hall (1973)
   (the bounded minimiser, as in ``scipy.optimize.fminbound``).
"""

from __future__ import annotations

import math

import numpy as np

from . import axisym

PI = np.pi
#: Points of every device table (as floatcalc.device.elements.TABLE_POINTS).
TABLE_POINTS = 241


def _depth(rc, psi):
    return -axisym.contact_height(rc, psi)


def _depth_cap(rc, psi):
    from .ring_table import outer_height

    return -outer_height(rc, psi)


def _depth_fn(edges: str):
    """Contact-depth law: ``"direct"`` the scalar path's (shipped table, direct shooting for
    |ψ| > 3.1, ~10–100 ms a point), ``"table"`` with the cap table of
    :mod:`floatcalc.core.ring_table` there (r_c ≥ 1e-4; ≤ 5e-7 l_c from the direct solver)."""
    if edges == "direct":
        return _depth
    if edges == "table":
        return _depth_cap
    raise ValueError(f"edges must be 'direct' or 'table', got {edges!r}")


# ---------------------------------------------------------------------------------------------
# Helpers on ragged rows stored as padded 2-D arrays


def _compact_index(mask):
    """Flat source indices of :func:`_compact`: (count per row, (S*W,) indices into the
    row-major (S, W) arrays): kept entries in order, then the row's last kept entry (its first
    entry when it keeps none)."""
    S, W = mask.shape
    cs = np.cumsum(mask, axis=1, dtype=np.int32)
    n = cs[:, -1].astype(np.intp) if W else np.zeros(S, dtype=np.intp)
    f = np.flatnonzero(mask)
    rowstart = np.arange(S) * W
    lastf = np.where(n > 0, f[np.maximum(np.cumsum(n) - 1, 0)] if f.size else 0, rowstart)
    src = np.repeat(lastf, W)
    src[np.repeat(rowstart, n) + (cs.ravel()[f] - 1)] = f
    return n, src


def _compact(mask, *arrays):
    """Move the entries where ``mask`` holds to the front of each row (order kept); pad each
    row with its last kept entry. Returns (count per row, *compacted arrays)."""
    S, W = mask.shape
    if mask.all():   # nothing moves
        return (np.full(S, W, dtype=np.intp), *(np.array(np.broadcast_to(a, (S, W))) for a in arrays))
    n, flat = _compact_index(mask)
    return (n, *(np.take(np.broadcast_to(a, (S, W)).reshape(-1), flat).reshape(S, W) for a in arrays))


def _rising(depth, n):
    """Per row: (start, stop) of the first run of increasing depth (as
    :func:`floatcalc.core.round_bodies._rising_branch`) over the first ``n`` entries."""
    S, W = depth.shape
    up = np.diff(depth, axis=1) > 0
    up &= np.arange(W - 1)[None, :] < (n - 1)[:, None]
    i0 = np.where(up.any(axis=1), np.argmax(up, axis=1), 0)
    col = np.arange(W - 1)[None, :]
    fall = (~up) & (col >= i0[:, None])
    # first non-rising step at or after i0 (there is always one: padding counts as falling,
    # unless the row fills the whole width)
    has = fall.any(axis=1)
    m = np.where(has, np.argmax(fall, axis=1) + 1, W)
    return i0, np.minimum(m, n)


def _interp_rows(xq, X, Y, n):
    """Row-wise :func:`numpy.interp` of Y over X (first ``n`` entries of each row, increasing)
    at xq (same rows); queries are clamped to the row's range, as numpy.interp does. ``Y`` may
    be a tuple of tables on the same X (one search serves them all; a tuple comes back)."""
    S, W = X.shape
    tables = Y if isinstance(Y, tuple) else (Y,)
    if xq.shape[1] > 1 and S and n.min() >= 1 and all(T.shape == X.shape for T in tables) and np.isfinite(xq).all() \
            and np.isfinite(X).all() and all(np.isfinite(T).all() for T in tables) \
            and np.all((X[:, 1:] > X[:, :-1]) | (np.arange(1, W)[None, :] >= n[:, None])):
        # finite rows, strictly increasing: numpy.interp itself, row by row (its search, and
        # its arithmetic: slope (y1 - y0) / (x1 - x0) times (x - x0) plus y0, the end values
        # outside and at the ends: the same numbers as the general path below, which repeated
        # nodes or non-finite values take)
        out = tuple(np.empty(xq.shape) for _ in tables)
        for i in range(S):
            k = n[i]
            for o, T in zip(out, tables):
                o[i] = np.interp(xq[i], X[i, :k], T[i, :k])
        return out if isinstance(Y, tuple) else out[0]
    last = (n - 1)[:, None]
    if xq.shape[1] == 1:
        # one query a row: the count of nodes <= xq is np.searchsorted(side="right"), exactly
        valid = np.arange(W)[None, :] < n[:, None]
        lo = np.sum(valid & (X <= xq), axis=1, keepdims=True) - 1
        lo = np.where(np.isnan(xq), last, lo)
    else:
        lo = np.empty(xq.shape, dtype=np.intp)
        for i in range(S):  # last node <= xq (np.searchsorted per row: exact, and cheaper than
            lo[i] = np.searchsorted(X[i, :n[i]], xq[i], side="right") - 1   # a lockstep search)
    j = np.clip(lo, 0, np.maximum(last - 1, 0))
    j1 = np.minimum(j + 1, last)
    base = (np.arange(S) * W)[:, None]
    fj, fj1 = base + j, base + j1          # flat indices (as T[r, j], T[r, j1])
    first, fl = base[:, 0], base[:, 0] + n - 1
    Xf = np.ascontiguousarray(X).reshape(-1)
    x0, x1 = Xf.take(fj), Xf.take(fj1)
    below = xq <= Xf.take(first)[:, None]
    above = xq >= Xf.take(fl)[:, None]
    out = []
    for T in (Y if isinstance(Y, tuple) else (Y,)):
        if T.shape != X.shape:   # a wider table: its own flat indices
            T = T[:, :W]
        Tf = np.ascontiguousarray(T).reshape(-1)
        y0, y1 = Tf.take(fj), Tf.take(fj1)
        with np.errstate(divide="ignore", invalid="ignore"):
            slope = (y1 - y0) / (x1 - x0)
            o = slope * (xq - x0) + y0
        o = np.where(below, Tf.take(first)[:, None], o)
        o = np.where(above, Tf.take(fl)[:, None], o)
        out.append(np.where(np.isfinite(o), o, y0))
    return tuple(out) if isinstance(Y, tuple) else out[0]


def fminbound_many(func, lo, hi, xatol: float = 1e-10, maxfun: int = 500):
    """Vectorised bounded Brent minimiser: SciPy's ``minimize_scalar(method="bounded")``
    step for step on arrays of independent intervals [lo, hi].

    ``func(x, rows)`` evaluates the objectives of the rows ``rows`` (an index array) at x.
    Returns (x, f) at the minima. The scalar path of :mod:`floatcalc.core.round_bodies`
    uses the scalar original with the same tolerance, so both stop at the same point up to
    round-off.

    >>> x, f = fminbound_many(lambda x, r: (x - np.array([0.3, 0.7])[r]) ** 2, np.zeros(2), np.ones(2))
    >>> np.round(x, 6).tolist()
    [0.3, 0.7]
    """
    sqrt_eps = math.sqrt(2.2e-16)
    golden_mean = 0.5 * (3.0 - math.sqrt(5.0))
    a = np.array(lo, dtype=float, copy=True)
    b = np.array(hi, dtype=float, copy=True)
    rows_all = np.arange(a.size)
    fulc = a + golden_mean * (b - a)
    nfc, xf = fulc.copy(), fulc.copy()
    rat = np.zeros_like(a)
    e = np.zeros_like(a)
    fx = np.asarray(func(xf, rows_all), dtype=float).copy()
    ffulc, fnfc = fx.copy(), fx.copy()
    xm = 0.5 * (a + b)
    tol1 = sqrt_eps * np.abs(xf) + xatol / 3.0
    tol2 = 2.0 * tol1
    num = 1
    while True:
        act = np.abs(xf - xm) > (tol2 - 0.5 * (b - a))
        if not act.any() or num >= maxfun:
            break
        w = np.flatnonzero(act)
        A, B, XF, FX, NFC, FNFC, FULC, FFULC = a[w], b[w], xf[w], fx[w], nfc[w], fnfc[w], fulc[w], ffulc[w]
        E, RAT, T1, T2, XM = e[w], rat[w], tol1[w], tol2[w], xm[w]
        golden = np.ones(w.size, dtype=bool)
        para = np.abs(E) > T1
        r_ = (XF - NFC) * (FX - FFULC)
        q_ = (XF - FULC) * (FX - FNFC)
        p_ = (XF - FULC) * q_ - (XF - NFC) * r_
        q_ = 2.0 * (q_ - r_)
        p_ = np.where(q_ > 0.0, -p_, p_)
        q_ = np.abs(q_)
        r_old = E
        E = np.where(para, RAT, E)
        ok = para & (np.abs(p_) < np.abs(0.5 * q_ * r_old)) & (p_ > q_ * (A - XF)) & (p_ < q_ * (B - XF))
        with np.errstate(divide="ignore", invalid="ignore"):
            rat_p = (p_ + 0.0) / q_
        x_p = XF + rat_p
        near = ((x_p - A) < T2) | ((B - x_p) < T2)
        si = np.sign(XM - XF) + ((XM - XF) == 0)
        rat_p = np.where(near, T1 * si, rat_p)
        RAT = np.where(ok, rat_p, RAT)
        golden = ~ok
        eg = np.where(XF >= XM, A - XF, B - XF)
        E = np.where(golden, eg, E)
        RAT = np.where(golden, golden_mean * eg, RAT)
        si = np.sign(RAT) + (RAT == 0)
        X = XF + si * np.maximum(np.abs(RAT), T1)
        FU = np.asarray(func(X, w), dtype=float)
        num += 1
        better = FU <= FX
        # accepted: the new point becomes the best
        A2 = np.where(better, np.where(X >= XF, XF, A), np.where(X < XF, X, A))
        B2 = np.where(better, np.where(X >= XF, B, XF), np.where(X < XF, B, X))
        c1 = ~better & ((FU <= FNFC) | (NFC == XF))
        c2 = ~better & ~c1 & ((FU <= FFULC) | (FULC == XF) | (FULC == NFC))
        FULC2 = np.where(better | c1, NFC, np.where(c2, X, FULC))
        FFULC2 = np.where(better | c1, FNFC, np.where(c2, FU, FFULC))
        NFC2 = np.where(better, XF, np.where(c1, X, NFC))
        FNFC2 = np.where(better, FX, np.where(c1, FU, FNFC))
        XF2 = np.where(better, X, XF)
        FX2 = np.where(better, FU, FX)
        a[w], b[w], xf[w], fx[w] = A2, B2, XF2, FX2
        nfc[w], fnfc[w], fulc[w], ffulc[w] = NFC2, FNFC2, FULC2, FFULC2
        e[w], rat[w] = E, RAT
        xm[w] = 0.5 * (A2 + B2)
        tol1[w] = sqrt_eps * np.abs(XF2) + xatol / 3.0
        tol2[w] = 2.0 * tol1[w]
    return xf, fx


# ---------------------------------------------------------------------------------------------
# Device tables


def device_table(D, F, Fst, n, d_lim, rc, points: int = TABLE_POINTS, min_contact_radius: float = 1e-9):
    """Element table of the device's round-element adapter, for many rows at once.

    Cut each curve (D increasing over its first ``n`` entries) at the limit depth ``d_lim``
    (keep D < d_lim, append the interpolated limit point), then start it at depth 0 when it
    crosses the surface (:func:`floatcalc.device.elements.from_first_contact`: keep D > 0,
    prepend the value interpolated at 0), resample linearly on ``points`` evenly spaced
    depths, and give the contact-line depth from Keller's theorem,
    h₀ = F_st K₀(r_c) / (2π r_c K₁(r_c)), r_c = max(rc, ``min_contact_radius``).

    Returns dict of (S, points) arrays ``depth``, ``force``, ``surface_tension``, ``contact``.
    """
    from scipy.special import k0e, k1e

    S, W = D.shape
    col = np.arange(W)[None, :]
    d_lim = np.asarray(d_lim, dtype=float)[:, None]
    valid = col < n[:, None]
    f_lim, s_lim = _interp_rows(d_lim, D, (F, Fst), n)
    keep = valid & (D < d_lim)
    m2 = np.concatenate([keep, np.ones((S, 1), dtype=bool)], axis=1)
    p = keep.sum(axis=1)
    if np.array_equal(keep, col < p[:, None]):
        # D increasing: the kept depths are a prefix of each row, then the limit point (what
        # _compact of m2 gives, without its sort and gathers)
        n2 = p + 1
        short = col < p[:, None]
        D2 = np.concatenate([np.where(short, D, d_lim), d_lim], axis=1)
        F2 = np.concatenate([np.where(short, F, f_lim), f_lim], axis=1)
        S2 = np.concatenate([np.where(short, Fst, s_lim), s_lim], axis=1)
    else:
        D2 = np.concatenate([D, np.broadcast_to(d_lim, (S, 1))], axis=1)
        F2 = np.concatenate([F, f_lim], axis=1)
        S2 = np.concatenate([Fst, s_lim], axis=1)
        n2, D2, F2, S2 = _compact(m2, D2, F2, S2)
    # from first contact
    first = D2[:, 0]
    lastd = D2[np.arange(S), n2 - 1]
    cut = (first < 0.0) & (lastd > 0.0)
    zero = np.zeros((S, 1))
    f0, s0 = _interp_rows(zero, D2, (F2, S2), n2)
    colw = np.arange(D2.shape[1])[None, :]
    m3 = np.concatenate([cut[:, None], np.where(cut[:, None], D2 > 0.0, True) & (colw < n2[:, None])], axis=1)
    D3 = np.concatenate([zero, D2], axis=1)
    F3 = np.concatenate([f0, F2], axis=1)
    S3 = np.concatenate([s0, S2], axis=1)
    # rows that cross the surface keep the prepended 0 and a suffix of their depths (> 0),
    # the others their depths: with D increasing one gather per table does what _compact does
    z = np.where(cut, n2 - m3[:, 1:].sum(axis=1) + 1, 1)    # first kept column of D3 after column 0
    n3 = np.where(cut, 1 + n2 - (z - 1), n2)
    W3 = D3.shape[1]
    c3 = np.arange(W3)[None, :]
    upto = c3 <= n2[:, None]
    expect = np.where(cut[:, None], (c3 == 0) | ((c3 >= z[:, None]) & upto), (c3 >= 1) & upto)
    if np.array_equal(m3, expect):
        src = np.where(cut[:, None], np.where(c3 == 0, 0, c3 - 1 + z[:, None]), c3 + 1)
        src = np.minimum(src, n2[:, None])                   # padding: the last kept entry
        flat = (src + (np.arange(S) * W3)[:, None]).ravel()
        D3, F3, S3 = (np.take(a.reshape(-1), flat).reshape(S, W3) for a in (D3, F3, S3))
    else:
        n3, D3, F3, S3 = _compact(m3, D3, F3, S3)
    d0, d1 = D3[:, :1], D3[np.arange(S), n3 - 1][:, None]
    grid = _linspace(d0[:, 0], d1[:, 0], points)  # np.linspace per row, as the adapter
    Fg, Sg = _interp_rows(grid, D3, (F3, S3), n3)
    r = np.maximum(np.asarray(rc, dtype=float), min_contact_radius)[:, None]
    h0 = Sg / (2.0 * PI * r * k1e(r) / k0e(r))
    return {"depth": grid, "force": Fg, "surface_tension": Sg, "contact": h0}


# ---------------------------------------------------------------------------------------------
# Ball


def _ball_parts(phi, R, theta, dep=_depth):
    """Force parts of spheres at contact positions φ (arrays of one shape; rc ≥ R_MIN)."""
    rc = R * np.sin(phi)
    psi = phi + theta - PI
    d = dep(rc, psi)
    c = np.cos(phi)
    f_st = 2.0 * PI * rc * np.sin(psi)
    f_p = PI / 3.0 * R**3 * (1.0 - c) ** 2 * (2.0 + c) + PI * rc**2 * d
    return rc, psi, d, d + R * (1.0 - c), f_st, f_p


def ball_laws(radius, contact_angle, *, n: int = 241, points: int = TABLE_POINTS,
              min_contact_radius: float = 1e-9, edges: str = "direct") -> dict:
    """Limit and device table of spheres (ball feet) for arrays of designs.

    Parameters
    ----------
    radius : array_like [l_c]
        Sphere radius R (1e-3 to 300 l_c, as :func:`floatcalc.round.ball`).
    contact_angle : array_like [rad]
        Advancing contact angle θ (0 to π). Broadcast against ``radius``.
    n : int
        Contact positions of the coarse curve, φ = linspace(0, π, n) (as the scalar path).
    points : int
        Points of the device table.
    min_contact_radius : float or array_like [l_c]
        Floor of the contact radius in the Keller contact depth of the table (one value per
        design allowed; the device adapter floors at 1e-9 m, i.e. 1e-9 / l_c here).
    edges : {"direct", "table"}
        Contact depths at inclinations |ψ| > 3.1 (θ within 2.4° of 0 or 180°): ``"direct"``
        shoots them as the scalar path does (same numbers, 10–100 ms a point); ``"table"``
        takes them from the cap table of :mod:`floatcalc.core.ring_table` where r_c ≥ 1e-4
        (≤ 5e-7 l_c from the direct solver; much faster for such designs).

    Returns
    -------
    dict of arrays (shape of the broadcast inputs, tables with a trailing ``points`` axis):
    ``max_force`` [σ l_c], ``depth_at_max`` [l_c] (lowest point), ``surface_tension_at_max``,
    ``pressure_at_max`` [σ l_c], ``phi_at_max``, ``psi_at_max`` [rad],
    ``contact_radius_at_max`` [l_c], ``submerged`` (the force rises until φ = π: buoyancy
    alone, no capillary limit), ``table`` (dict ``depth``, ``force``, ``surface_tension``,
    ``contact`` as :func:`device_table`), ``limit_force`` and ``limit_depth`` (its last point).

    >>> out = ball_laws(0.37, np.radians(150))
    >>> out["table"]["depth"].shape, bool(out["limit_force"] == out["table"]["force"][-1])
    ((241,), True)
    """
    from .axisym_table import R_MIN

    R, th = np.broadcast_arrays(np.asarray(radius, dtype=float), np.asarray(contact_angle, dtype=float))
    shape = R.shape
    R, th = R.ravel(), th.ravel()
    S = R.size
    dep = _depth_fn(edges)
    phi = np.broadcast_to(np.linspace(0.0, PI, n), (S, n))
    inner = np.zeros((S, n), dtype=bool)
    inner[:, 1:-1] = True
    ok = inner & (R[:, None] * np.sin(phi) >= R_MIN)
    Rb, tb = np.broadcast_to(R[:, None], (S, n)), np.broadcast_to(th[:, None], (S, n))
    rc, psi, d, D, fst, fp = (np.zeros((S, n)) for _ in range(6))
    if ok[:, 1:-1].all():   # every inner point (the usual case): on the slice, no gathers
        out = _ball_parts(phi[:, 1:-1], R[:, None], th[:, None], dep)
        for arr, val in zip((rc, psi, d, D, fst, fp), out):
            arr[:, 1:-1] = val
    else:
        out = _ball_parts(phi[ok], Rb[ok], tb[ok], dep)
        for arr, val in zip((rc, psi, d, D, fst, fp), out):
            arr[ok] = val
    # exact ends: φ = 0 (touching) and φ = π (fully under)
    v_all = 4.0 / 3.0 * PI * R**3
    psi[:, 0], psi[:, -1] = th - PI, th
    D[:, -1] = 2.0 * R
    fp[:, -1] = v_all
    keep = ok.copy()
    keep[:, 0] = keep[:, -1] = True
    F = fst + fp
    # the kept points compacted, then the rising branch (entries i0 .. i1-1 of each compacted
    # row) compacted again: one composed gather, and of rc, ψ, d and the pressure part only the
    # entry at the maximum is needed
    W = n
    cnt, src = _compact_index(keep)
    flat = lambda a: np.broadcast_to(a, (S, W)).reshape(-1)  # noqa: E731
    i0, i1 = _rising(flat(D).take(src).reshape(S, W), cnt)
    col = np.arange(W)[None, :]
    onb = (col >= i0[:, None]) & (col < i1[:, None])
    nb, src2 = _compact_index(onb)
    src = src.take(src2)
    phi_b, D_b, st_b, F_b = (flat(a).take(src).reshape(S, W) for a in (phi, D, fst, F))
    Fm = np.where(col < nb[:, None], F_b, -np.inf)
    k = np.argmax(Fm, axis=1)
    rows = np.arange(S)
    last = nb - 1
    at_k = src.reshape(S, W)[rows, k]
    best = {key: arr[rows, k].copy() for key, arr in
            (("phi", phi_b), ("depth", D_b), ("surface_tension", st_b), ("force", F_b))}
    best.update({key: flat(arr).take(at_k) for key, arr in (("rc", rc), ("psi", psi), ("d", d), ("pressure", fp))})
    refine = ((k > 0) & (k < last)) | ((k > 0) & (k == last) & (phi_b[rows, k] < PI - 1e-9))
    w = np.flatnonzero(refine)
    if w.size:
        lo = phi_b[w, k[w] - 1]
        hi = phi_b[w, np.minimum(k[w] + 1, last[w])]
        Rw, tw = R[w], th[w]

        def neg_force(x, r):
            _, _, _, _, a, b = _ball_parts(x, Rw[r], tw[r], dep)
            return -(a + b)

        x, fneg = fminbound_many(neg_force, lo, hi)
        use = -fneg >= F_b[w, k[w]]
        phi_k = np.where(use, x, phi_b[w, k[w]])
        rc_k, psi_k, d_k, D_k, st_k, p_k = _ball_parts(phi_k, Rw, tw, dep)
        for key, val in (("phi", phi_k), ("rc", rc_k), ("psi", psi_k), ("d", d_k), ("depth", D_k),
                         ("surface_tension", st_k), ("pressure", p_k), ("force", st_k + p_k)):
            best[key][w] = val
    tab = device_table(D_b, F_b, st_b, nb, best["depth"], best["rc"], points, min_contact_radius)
    res = {"max_force": best["force"], "depth_at_max": best["depth"],
           "surface_tension_at_max": best["surface_tension"], "pressure_at_max": best["pressure"],
           "phi_at_max": best["phi"], "psi_at_max": best["psi"], "contact_radius_at_max": best["rc"],
           "submerged": best["phi"] >= PI - 1e-9}
    return _finish(res, tab, shape, {"depth": D_b, "force": F_b, "surface_tension": st_b, "phi": phi_b, "n": nb})


def _finish(res, tab, shape, curve):
    out = {k: v.reshape(shape) for k, v in res.items()}
    out["table"] = {k: v.reshape(*shape, v.shape[-1]) for k, v in tab.items()}
    out["limit_force"] = out["table"]["force"][..., -1]
    out["limit_depth"] = out["table"]["depth"][..., -1]
    out["curve"] = curve  # flat rows (S, width) padded with each row's last entry; "n" per row
    return out


# ---------------------------------------------------------------------------------------------
# Pad and pin


def _psi_at_depth(a, d_target, lo, hi, dep=_depth):
    """ψ in [lo, hi] with d(a, ψ) = d_target, by the scalar path's 60 bisections, on arrays."""
    lo = np.array(lo, dtype=float, copy=True)
    hi = np.array(hi, dtype=float, copy=True)
    for _ in range(60):
        mid = 0.5 * (lo + hi)
        above = dep(a, mid) < d_target
        lo, hi = np.where(above, mid, lo), np.where(above, hi, mid)
    return 0.5 * (lo + hi)


def _pad_curves(a, t, th, n, depth_max=None, dep=_depth):
    """The curves of :func:`floatcalc.core.round_bodies.pad_curve` for arrays of pads (t may
    be ∞ for pins, with ``depth_max`` then an array or None)."""
    S = a.size
    psi_side = th - 0.5 * PI
    d_side = dep(a, psi_side)
    u = np.linspace(0.0, 1.0, n)[None, :]
    # stage 0: pinned at the bottom edge, ψ from 0 to ψ_side (np.linspace arithmetic)
    has0 = psi_side > 0
    psi0 = np.zeros((S, n))
    D0 = np.zeros((S, n))
    if has0.any():
        w = np.flatnonzero(has0)
        p = _linspace(np.zeros(w.size), psi_side[w], n)
        psi0[w] = p
        D0[w] = dep(a[w, None], p)
    # stage 1: on the side, ψ = ψ_side
    finite = np.isfinite(t)
    D_top = t + d_side
    D2_lo = np.maximum(0.0, d_side)
    has1 = D_top > D2_lo
    if depth_max is None:
        auto_hi = D2_lo + np.maximum(2.0, 4.0 * a)
    else:
        auto_hi = np.maximum(depth_max, D2_lo + 1e-6)
    D2_hi = np.where(finite, D_top, auto_hi)
    D1 = _linspace(D2_lo, np.where(has1, D2_hi, D2_lo + 1.0), n)
    psi1 = np.broadcast_to(psi_side[:, None], (S, n))
    # stage 2: pinned at the top edge, ψ from ψ_start to θ
    psi2 = np.zeros((S, n))
    D2 = np.zeros((S, n))
    if finite.any():
        w = np.flatnonzero(finite)
        start = psi_side[w].copy()
        thin = D_top[w] < 0
        if thin.any():
            v = np.flatnonzero(thin)
            start[v] = _psi_at_depth(a[w][v], -t[w][v], psi_side[w][v], th[w][v], dep)
        p = _linspace(start, th[w], n)
        psi2[w] = p
        D2[w] = t[w, None] + dep(a[w, None], p)
    psi = np.concatenate([psi0, psi1, psi2], axis=1)
    D = np.concatenate([D0, D1, D2], axis=1)
    stage = np.concatenate([np.zeros((S, n)), np.ones((S, n)), np.full((S, n), 2.0)], axis=1)
    present = np.concatenate([np.broadcast_to(has0[:, None], (S, n)), np.broadcast_to(has1[:, None], (S, n)),
                              np.broadcast_to(finite[:, None], (S, n))], axis=1)
    cnt, psi, D, stage = _compact(present, psi, D, stage)
    W = D.shape[1]
    col = np.arange(W)[None, :]
    keep = np.concatenate([np.ones((S, 1), dtype=bool), np.diff(D, axis=1) > 0], axis=1) & (col < cnt[:, None])
    cnt, psi, D, stage = _compact(keep, psi, D, stage)
    f_st = 2.0 * PI * a[:, None] * np.sin(psi)
    f_p = PI * a[:, None] ** 2 * D
    tt = np.where(finite, t, 0.0)[:, None]
    d = np.where(stage == 0, D, np.where(stage == 1, d_side[:, None], D - tt))
    return {"psi": psi, "depth": D, "stage": stage, "surface_tension": f_st, "pressure": f_p,
            "force": f_st + f_p, "d": d, "n": cnt}


def _linspace(lo, hi, n):
    """np.linspace(lo[i], hi[i], n) for each row, with numpy's own arithmetic."""
    return np.linspace(np.asarray(lo, dtype=float), np.asarray(hi, dtype=float), n, axis=-1)


def pad_laws(radius, thickness, contact_angle, *, n: int = 120, points: int = TABLE_POINTS,
             min_contact_radius: float = 1e-9, edges: str = "direct") -> dict:
    """Limit and device table of flat pads with sharp edges for arrays of designs.

    Parameters
    ----------
    radius : array_like [l_c]
        Pad radius a (1e-4 to 300 l_c).
    thickness : array_like [l_c]
        Pad thickness t (> 0).
    contact_angle : array_like [rad]
        Advancing contact angle θ (0 to π). The three inputs broadcast together.
    n : int
        Points per stage of the curve (as the scalar path).
    edges : {"direct", "table"}
        As :func:`ball_laws` (a pad reaches |ψ| > 3.1 when θ > 3.1 rad).

    Returns
    -------
    dict as :func:`ball_laws` with ``psi_at_max``, ``stage_at_max`` (index into
    :data:`floatcalc.core.round_bodies.STAGES`) and ``contact_radius_at_max`` (= a).

    >>> out = pad_laws(0.74, 0.074, np.radians(110))
    >>> int(out["stage_at_max"])   # pinned at the top edge
    2
    """
    a, t, th = np.broadcast_arrays(*(np.asarray(x, dtype=float) for x in (radius, thickness, contact_angle)))
    shape = a.shape
    a, t, th = a.ravel(), t.ravel(), th.ravel()
    S = a.size
    dep = _depth_fn(edges)
    cur = _pad_curves(a, t, th, n, dep=dep)
    nb = cur["n"]
    W = cur["depth"].shape[1]
    col = np.arange(W)[None, :]
    rows = np.arange(S)
    k = np.argmax(np.where(col < nb[:, None], cur["force"], -np.inf), axis=1)
    best = {key: cur[key][rows, k].copy() for key in ("psi", "depth", "d", "surface_tension", "pressure",
                                                      "force", "stage")}
    st = cur["stage"]
    refine = (st[rows, k] == 2) & (k > 0) & (k < nb - 1) & (st[rows, np.maximum(k - 1, 0)] == 2)
    w = np.flatnonzero(refine)
    if w.size:
        aw, tw = a[w], t[w]

        def neg_force(x, r):
            return -(2.0 * PI * aw[r] * np.sin(x) + PI * aw[r] * aw[r] * (tw[r] + dep(aw[r], x)))

        x, fneg = fminbound_many(neg_force, cur["psi"][w, k[w] - 1], cur["psi"][w, k[w] + 1])
        use = -fneg >= best["force"][w]
        v = w[use]
        p = x[use]
        Dv = t[v] + dep(a[v], p)
        best["psi"][v], best["depth"][v], best["d"][v] = p, Dv, Dv - t[v]
        best["surface_tension"][v] = 2 * PI * a[v] * np.sin(p)
        best["pressure"][v] = PI * a[v] * a[v] * Dv
        best["force"][v] = -fneg[use]
    tab = device_table(cur["depth"], cur["force"], cur["surface_tension"], nb, best["depth"], a, points,
                       min_contact_radius)
    res = {"max_force": best["force"], "depth_at_max": best["depth"],
           "surface_tension_at_max": best["surface_tension"], "pressure_at_max": best["pressure"],
           "psi_at_max": best["psi"], "stage_at_max": best["stage"].astype(int), "contact_radius_at_max": a.copy()}
    return _finish(res, tab, shape, cur)


def pin_laws(radius, length, contact_angle, *, n: int = 120, points: int = TABLE_POINTS,
             min_contact_radius: float = 1e-9) -> dict:
    """Device table of vertical pins dipped tip-first, for arrays of designs.

    A pin does not sink by meniscus failure: its force keeps rising until the body reaches the
    surface, so the table runs from first contact to tip depth = ``length`` (the device's pin
    adapter), over the curve of :func:`floatcalc.core.round_bodies.pad_curve` with t = ∞ and
    ``depth_max`` = length.

    Parameters
    ----------
    radius : array_like [l_c]
        Pin radius b (1e-4 to 300 l_c).
    length : array_like [l_c]
        Protrusion of the pin below the body (> 0).
    contact_angle : array_like [rad]
        Advancing contact angle θ.

    Returns
    -------
    dict with ``limit_force`` [σ l_c], ``limit_depth`` [l_c] (= length), ``table`` (as
    :func:`ball_laws`), ``meniscus_height`` [l_c] (contact line on the side, z_c at
    ψ = θ − π/2), ``side_force`` [σ l_c] (the Wilhelmy pull 2πb sin(θ − π/2) = −2πb cos θ).

    >>> out = pin_laws(0.037, 1.1, np.radians(60))
    >>> round(float(out["side_force"] / (-2 * np.pi * 0.037 * np.cos(np.radians(60)))), 12)
    1.0
    """
    b, L, th = np.broadcast_arrays(*(np.asarray(x, dtype=float) for x in (radius, length, contact_angle)))
    shape = b.shape
    b, L, th = b.ravel(), L.ravel(), th.ravel()
    cur = _pad_curves(b, np.full(b.size, np.inf), th, n, depth_max=L)
    nb = cur["n"]
    d_lim = np.minimum(L, cur["depth"][np.arange(b.size), nb - 1])
    tab = device_table(cur["depth"], cur["force"], cur["surface_tension"], nb, d_lim, b, points, min_contact_radius)
    psi_side = th - 0.5 * PI
    res = {"meniscus_height": axisym.contact_height(b, psi_side), "side_force": 2.0 * PI * b * np.sin(psi_side)}
    return _finish(res, tab, shape, cur)
