"""Tabulated universal contact-line height of an axisymmetric exterior meniscus.

The contact-line height z_c of a meniscus outside a round body depends only on the contact
radius r_c [l_c] and the contact inclination ψ [rad] (see :mod:`floatcalc.core.axisym`). The
table stores the smooth transformed quantity

.. math::

    Q(r_c, \\psi) = \\frac{-z_c(r_c, \\psi)}{2\\sin(\\psi/2)\\; K_0(r_c)/K_1(r_c)},

which tends to 1 both as ψ → 0 (linear K₀ meniscus) and as r_c → ∞ (2D first integral
|z_c| = 2 sin(ψ/2)), and is even in ψ. Q is stored on a 161 × 121 grid in ln r_c × ψ and
interpolated with a tensor-product quintic spline (scipy ``RectBivariateSpline``, kx = ky = 5);
z_c is odd in ψ, which gives raised menisci.

Range of the table: 1e-4 ≤ r_c ≤ 100 and 0 ≤ |ψ| ≤ 3.1 rad (177.6°); the ψ nodes cluster
towards the upper end, where for thin bodies (r_c ≲ 1) the family of solutions changes
character (the meniscus of a thin body whose interface leaves almost horizontally inward
pinches off, so z_c → 0 as ψ → π for r_c ≲ 0.5 but not for thicker bodies, and z_c varies
steeply there). Outside the range, :func:`evaluate` falls back to the direct solver.
Accuracy: at most 1e-6 relative to the direct tight-tolerance solve, anywhere in the range
(tests check random off-grid points; the build script prints the figure).

The table is built by ``scripts/build_axisym_table.py`` and shipped as
``floatcalc/data/axisym_table.npz`` (about 0.1 MB).
"""

from __future__ import annotations

import functools
from pathlib import Path

import numpy as np

R_MIN, R_MAX = 1e-4, 100.0
PSI_TABLE = 3.1
TABLE_PATH = Path(__file__).resolve().parent.parent / "data" / "axisym_table.npz"


def grid(n_r: int = 161, n_psi: int = 121):
    """Nodes of the table: ln r_c uniform; ψ = ψ_T sin(πj/(2N)) (denser towards ψ_T)."""
    lnr = np.linspace(np.log(R_MIN), np.log(R_MAX), n_r)
    j = np.arange(n_psi)
    psi = PSI_TABLE * np.sin(0.5 * np.pi * j / (n_psi - 1))
    return lnr, psi


def ratio(rc, psi, height):
    """Transformed quantity Q from a contact height (module docstring)."""
    from scipy.special import k0e, k1e

    a = np.abs(psi)
    return -np.sign(np.where(psi == 0, 1.0, psi)) * height / (2.0 * np.sin(0.5 * a) * k0e(rc) / k1e(rc))


def build(n_r: int = 161, n_psi: int = 121, chunk: int = 4000):
    """Compute the table with the direct solver (tight tolerance). Returns (ln r, ψ, Q)."""
    from .axisym import solve

    lnr, psi = grid(n_r, n_psi)
    L, P = np.meshgrid(lnr, psi, indexing="ij")
    rc, ps = np.exp(L).ravel(), P.ravel()
    q = np.ones_like(rc)
    pos = np.flatnonzero(ps > 0)
    for k in range(0, pos.size, chunk):
        sel = pos[k:k + chunk]
        h = solve(rc[sel], ps[sel])["height"]
        q[sel] = ratio(rc[sel], ps[sel], h)
    return lnr, psi, q.reshape(L.shape)


@functools.cache
def _spline():
    from scipy.interpolate import RectBivariateSpline

    with np.load(TABLE_PATH) as data:
        lnr, psi, q = data["ln_r"], data["psi"], data["q"]
    return RectBivariateSpline(lnr, psi, q, kx=5, ky=5, s=0)


def evaluate(rc, psi):
    """Contact-line height z_c [l_c] for arrays of r_c [l_c] and ψ [rad] (table + fallback)."""
    from scipy.special import k0e, k1e

    rc, psi = np.asarray(rc, dtype=float), np.asarray(psi, dtype=float)
    if np.all((rc >= R_MIN) & (rc <= R_MAX)) and np.all(np.abs(psi) <= PSI_TABLE):
        # every point in the table: the factors of r_c on r_c's own shape (a row of points of
        # one pad or pin shares one r_c: its Bessel functions once), the same arithmetic
        shape = np.broadcast_shapes(rc.shape, psi.shape)
        a = np.abs(psi)
        q = _spline().ev(np.broadcast_to(np.log(rc), shape), np.broadcast_to(a, shape))
        return np.asarray(-np.sign(psi) * q * 2.0 * np.sin(0.5 * a) * k0e(rc) / k1e(rc)).reshape(shape)
    rc, psi = np.broadcast_arrays(rc, psi)
    shape = rc.shape
    rc, psi = rc.ravel(), psi.ravel()
    a = np.abs(psi)
    out = np.empty_like(rc)
    inside = (rc >= R_MIN) & (rc <= R_MAX) & (a <= PSI_TABLE)
    if np.any(inside):
        r_i, a_i = rc[inside], a[inside]
        q = _spline().ev(np.log(r_i), a_i)
        out[inside] = -np.sign(psi[inside]) * q * 2.0 * np.sin(0.5 * a_i) * k0e(r_i) / k1e(r_i)
    if not np.all(inside):
        out[~inside] = _direct(rc[~inside], psi[~inside])
    return out.reshape(shape)


#: Up to this many points outside the table are solved three at a time (the direct solver's
#: plain-float path, about 4x faster per point than its array path for a few points).
FEW = 64


def _direct(rc, psi):
    """Direct solves of points outside the table; the same answers (to the solver's 1e-13
    shooting tolerance) whichever way they are grouped: every point iterates on its own."""
    from .axisym import solve

    if rc.size > FEW:
        return solve(rc, psi)["height"]
    return np.concatenate([solve(rc[k:k + 3], psi[k:k + 3])["height"] for k in range(0, rc.size, 3)])


def in_table(rc, psi):
    """True where (r_c, ψ) lies inside the table's range."""
    rc, a = np.asarray(rc, dtype=float), np.abs(np.asarray(psi, dtype=float))
    return (rc >= R_MIN) & (rc <= R_MAX) & (a <= PSI_TABLE)
