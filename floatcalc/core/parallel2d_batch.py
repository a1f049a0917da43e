"""Rows of long parallel rods (:mod:`floatcalc.core.parallel2d`) for many designs at once.

The same model, grids and branch rules as :mod:`floatcalc.core.parallel2d` and the device's
rod-row adapter (:class:`floatcalc.elements.rod_row.RodRowKind`), evaluated on arrays of
designs (radius R, contact angle θ, spacing S in capillary lengths l_c; forces per unit length
in σ):

* the outer side on φ = linspace(0, π, n): :math:`h_o = 2\\sin(\\psi/2)`, c = h − R cos φ;
* the inner side on the φ of that grid where the gap stays open (S/2 − R sin φ > 10⁻⁹), the
  turning-point depth h_m solving X(ψ, h_m) = S/2 − R sin φ with X the quadrature of
  :func:`floatcalc.core.parallel2d.gap_distance`, the branch on which c(φ) rises through
  ψ = 0;
* the row curve on 2401 centre depths and its largest force (the row limit), and the table
  of the adapter on 241 depths from first contact to that limit, outer and inner rods apart.

Only the root finder differs: :func:`floatcalc.core.parallel2d.turning_depth` bisects 56
times on ln h_m over [−40, 12]; :func:`turning_depth` bisects 10 times on the same bracket
and then takes 6 Illinois (modified regula falsi) steps inside the bracket left, on the same
monotone function, and :func:`grid_turning_depth` solves every eighth point of a φ grid so
and the others in narrow brackets about the interpolated root (checked, with a fallback).
They give the same root to about 1e-13 relative (tests/test_device_batch_mixed.py checks
1e-12 on seeded random rows) with about a sixth of the quadratures; and the 1201-point sides
of the adapter reuse the roots of the 2401-point row curve (the coarse grid is every other
point of the fine one, exactly).

Validity: that of :mod:`floatcalc.core.parallel2d` (long rigid rods at one depth, S > 2R).

References
----------
.. [1] D. Vella, D.-G. Lee, H.-Y. Kim, Langmuir 22, 5979 (2006).
.. [2] M. Dowell, P. Jarratt, BIT 11, 168 (1971) (the Illinois method).
"""

from __future__ import annotations

import numpy as np

from .parallel2d import gap_distance, side_force

PI = np.pi


def _illinois(a, g, lo, hi, flo, fhi, steps):
    """Illinois steps on f(u) = X(ψ, e^u) − g inside brackets [lo, hi] (f(lo) > 0 ≥ f(hi)):
    the end with the smaller |f| and that |f|."""
    kept = np.zeros(a.shape)
    for _ in range(steps):
        den = flo - fhi
        x = np.where(den > 0, lo + flo * (hi - lo) / np.where(den > 0, den, 1.0), 0.5 * (lo + hi))
        x = np.minimum(np.maximum(x, lo), hi)
        fx = gap_distance(a, np.exp(x)) - g
        pos = fx > 0
        # Illinois: when the same end is kept twice, halve its function value
        flo, fhi = (np.where(pos, fx, np.where(kept == -1, 0.5 * flo, flo)),
                    np.where(pos, np.where(kept == 1, 0.5 * fhi, fhi), fx))
        lo, hi = np.where(pos, x, lo), np.where(pos, hi, x)
        kept = np.where(pos, 1.0, -1.0)
    return np.where(np.abs(flo) < np.abs(fhi), lo, hi), np.minimum(np.abs(flo), np.abs(fhi))


def turning_depth(psi, half_gap, *, bisections: int = 10, steps: int = 6):
    """|h_m| [l_c] with X(ψ, h_m) = ``half_gap`` (> 0), as :func:`floatcalc.core.parallel2d.turning_depth`.

    >>> from floatcalc.core import parallel2d
    >>> psi, g = np.array([0.3, 1.2, 2.5]), np.array([0.05, 0.4, 2.0])
    >>> bool(np.allclose(turning_depth(psi, g), parallel2d.turning_depth(psi, g), rtol=1e-13, atol=0))
    True
    """
    a = np.abs(np.asarray(psi, dtype=float))
    g = np.asarray(half_gap, dtype=float)
    a, g = np.broadcast_arrays(a, g)
    lo = np.full(a.shape, -40.0)
    hi = np.full(a.shape, 12.0)
    for _ in range(bisections):
        mid = 0.5 * (lo + hi)
        too_far = gap_distance(a, np.exp(mid)) > g
        lo = np.where(too_far, mid, lo)
        hi = np.where(too_far, hi, mid)
    flo = gap_distance(a, np.exp(lo)) - g        # > 0 (X too large at lo)
    fhi = gap_distance(a, np.exp(hi)) - g        # ≤ 0
    return np.exp(_illinois(a, g, lo, hi, flo, fhi, steps)[0])


def grid_turning_depth(psi, half_gap, ok, *, stride: int = 8, steps: int = 5):
    """Turning depths (S, n) on rows of a fine φ grid (1 where not ``ok``): every
    ``stride``-th point by :func:`turning_depth`, the others by Illinois steps in a narrow
    bracket about the linear interpolation of ln h_m between them; a point whose bracket does
    not hold the root or whose residual stays above 1e-13 of its gap is solved by
    :func:`turning_depth` (so the answer is the same root, to about 1e-13)."""
    S, n = psi.shape
    a = np.abs(psi)
    u = np.zeros((S, n))
    cols = np.arange(n)
    coarse = (cols % stride == 0) | (cols == n - 1)
    cm = ok & coarse[None, :]
    u[cm] = np.log(turning_depth(psi[cm], half_gap[cm]))
    j0 = (cols // stride) * stride
    j1 = np.minimum(j0 + stride, n - 1)
    fine = ok & ~coarse[None, :] & ok[:, j0] & ok[:, j1]
    u0, u1 = u[:, j0], u[:, j1]
    w = (cols - j0) / np.maximum(j1 - j0, 1)
    r, c = np.nonzero(fine)
    af, gf = a[r, c], half_gap[r, c]
    gu = (u0 + w[None, :] * (u1 - u0))[r, c]
    dl = (1e-3 + 0.5 * np.abs(u1 - u0))[r, c]
    lo, hi = gu - dl, gu + dl
    flo = gap_distance(af, np.exp(lo)) - gf
    fhi = gap_distance(af, np.exp(hi)) - gf
    good = (flo > 0) & (fhi <= 0)
    res = np.empty(af.size)
    x, fr = _illinois(af[good], gf[good], lo[good], hi[good], flo[good], fhi[good], steps)
    idx = np.flatnonzero(good)
    conv = fr <= 1e-13 * gf[good]
    res[idx[conv]] = x[conv]
    good[idx[~conv]] = False
    res[~good] = np.log(turning_depth(psi[r[~good], c[~good]], gf[~good]))
    u[r, c] = res
    rest = ok & ~coarse[None, :] & ~fine
    u[rest] = np.log(turning_depth(psi[rest], half_gap[rest]))
    return np.where(ok, np.exp(u), 1.0)


def _interp(xq, X, Y, n):
    from .round_batch import _interp_rows

    return _interp_rows(xq, X, Y, n)


def _compact(mask, *arrays):
    from .round_batch import _compact as c

    return c(mask, *arrays)


def outer_side(R, theta, n: int = 1201):
    """Outer side on φ = linspace(0, π, n) for each design: φ, c(φ), side force (S, n)."""
    phi = np.linspace(0.0, PI, n)[None, :]
    Rc, tc = R[:, None], theta[:, None]
    psi = phi + tc - PI
    h = 2.0 * np.sin(0.5 * psi)
    c = h - Rc * np.cos(phi)
    return np.broadcast_to(phi, c.shape), c, side_force(phi, Rc, tc, c)


def _gap_roots(R, theta, S, n):
    """Turning depths h_m (S, n) on φ = linspace(0, π, n) where the gap is open (else 1),
    with the open mask. linspace(0, π, 2401)[::2] is linspace(0, π, 1201) exactly (the step
    halves exactly), so one solve on the fine grid serves both grids."""
    phi = np.broadcast_to(np.linspace(0.0, PI, n)[None, :], (R.size, n))
    half_gap = 0.5 * S[:, None] - R[:, None] * np.sin(phi)
    ok = half_gap > 1e-9
    psi = phi + theta[:, None] - PI
    return phi, ok, grid_turning_depth(psi, half_gap, ok)


def inner_side(R, theta, S, n: int = 1201, roots=None):
    """Inner side of each design (as :func:`floatcalc.core.parallel2d.inner_side`): φ, c,
    side force and signed h_m (S, n) valid over their first ``count`` (S,) entries.
    ``roots``: the (φ, open, h_m) of :func:`_gap_roots` on this grid, if already solved."""
    phi, ok, hm = _gap_roots(R, theta, S, n) if roots is None else roots
    cnt, phi, hm = _compact(ok, phi, hm)
    valid = np.arange(n)[None, :] < cnt[:, None]
    psi = phi + theta[:, None] - PI
    sign = np.where(psi >= 0.0, 1.0, -1.0)
    h = sign * np.sqrt(hm * hm + 4.0 * np.sin(0.5 * psi) ** 2)
    c = h - R[:, None] * np.cos(phi)
    # the branch on which c rises through ψ = 0 (parallel2d.inner_side's two while loops)
    i0 = np.argmin(np.where(valid, np.abs(psi), np.inf), axis=1)
    up = (np.diff(c, axis=1) > 0.0) & (np.arange(n - 1)[None, :] < (cnt - 1)[:, None])
    col = np.arange(n - 1)[None, :]
    below = ~up & (col < i0[:, None])             # a non-rising step before i0 stops the way back
    start = np.where(below.any(axis=1), n - 2 - np.argmax(below[:, ::-1], axis=1) + 1, 0)
    after = ~up & (col >= i0[:, None])
    end = np.where(after.any(axis=1), np.argmax(after, axis=1), n - 1)
    col = np.arange(n)[None, :]
    br = (col >= start[:, None]) & (col <= end[:, None])
    f = side_force(phi, R[:, None], theta[:, None], c)
    count, phi_b, c_b, f_b, hm_b = _compact(br, phi, c, f, sign * hm)
    return phi_b, c_b, f_b, hm_b, count


def row_limit_depth(R, theta, S, N, n: int = 2401, roots=None):
    """Centre depth c of each level row of N rods at its limit (the largest force of
    :func:`floatcalc.core.parallel2d.row_curve` on ``n`` centre depths)."""
    _, co, fo = outer_side(R, theta, n)
    _, ci, fi, _, ni = inner_side(R, theta, S, n, roots)
    rows = np.arange(R.size)
    lo = np.maximum(co[:, 0], ci[:, 0])
    hi = np.minimum(co[:, -1], ci[rows, ni - 1])
    c = np.linspace(lo, hi, n, axis=-1)
    full = np.full(R.size, n)
    fo_c = _interp(c, co, fo, full)
    fi_c = _interp(c, ci, fi, ni)
    f = 2.0 * fo_c + 2.0 * (N - 1) * fi_c
    k = np.argmax(f, axis=1)
    return (c[rows, k] + R) - R


def row_tables(R, theta, S, N, L, segments, points: int = 241):
    """The rod-row adapter's tables for each design (as
    :meth:`floatcalc.elements.rod_row.RodRowKind.model`), scaled: depth D of the rods' lowest
    points from first contact to the limit, force of one segment (length L / ``segments``) of
    an outer and of an inner rod [σ l_c], outer contact-line depth [l_c], (S, points) valid
    over their first n (S,) entries.

    >>> from floatcalc.core import parallel2d
    >>> t = row_tables(np.array([0.07]), np.radians([120.0]), np.array([1.1]), 3, np.array([18.0]), 5)
    >>> lim = parallel2d.row_limit(0.07, np.radians(120.0), 1.1, 3)
    >>> n = int(t["n"][0]) - 1
    >>> # at the limit the tables carry the row limit (read from 1201-point sides: to ~1e-6)
    >>> bool(abs((2 * t["outer"][0, n] + t["inner"][0, n]) * 5 / 18.0 / lim["force"] - 1) < 1e-5)
    True
    """
    R, theta, S, L = (np.asarray(a, dtype=float) for a in (R, theta, S, L))
    M = R.size
    roots = _gap_roots(R, theta, S, 2401)
    c_lim = row_limit_depth(R, theta, S, N, 2401, roots)
    po, co, fo = outer_side(R, theta, 1201)
    _, ci, fi, _, ni = inner_side(R, theta, S, 1201, tuple(np.ascontiguousarray(a[:, ::2]) for a in roots))
    c0 = np.maximum(np.maximum(co[:, 0], ci[:, 0]), -R)
    c = np.linspace(c0, c_lim, points, axis=-1)
    full = np.full(M, 1201)
    f_out = _interp(c, co, fo, full)
    f_in = _interp(c, ci, fi, ni)
    psi_o = _interp(c, co, po, full) + theta[:, None] - PI
    h_out = 2.0 * np.sin(0.5 * psi_o)
    D = c + R[:, None]
    # from_first_contact: keep depths > 0 and prepend the values interpolated at depth 0
    cut = (D[:, 0] < 0.0) & (D[:, -1] > 0.0)
    full = np.full(M, points)
    at0 = _interp(np.zeros((M, 1)), D, (h_out, f_out, f_in), full)
    keep = np.where(cut[:, None], D > 0.0, True)
    n, D, h_out, f_out, f_in = _compact(keep, D, h_out, f_out, f_in)
    lead = np.where(cut[:, None], np.arange(points)[None, :] == 0, False)
    out = {}
    for name, T, v0 in (("depth", D, np.zeros((M, 1))), ("contact", h_out, at0[0]), ("f_out", f_out, at0[1]),
                        ("f_in", f_in, at0[2])):
        shifted = np.where(cut[:, None], np.concatenate([v0, T[:, :-1]], axis=1), T)
        out[name] = np.where(lead, v0, shifted)
    n = np.where(cut, n + 1, n)
    seg = (L / segments)[:, None]
    return {"depth": out["depth"], "outer": (out["f_out"] + out["f_in"]) * seg, "inner": 2.0 * out["f_in"] * seg,
            "contact": out["contact"], "n": n}
