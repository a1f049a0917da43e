"""Tabulated contact-line heights for ring footpads: the enclosed (inner) meniscus, and the
outer meniscus beyond the range of :mod:`floatcalc.core.axisym_table`.

Inside a closed ring the meniscus is regular at the centre (linear solution ∝ I₀(r), see
:mod:`floatcalc.core.axisym`), so its contact-line height, like the exterior one, depends only
on the contact radius r_c [l_c] and the inclination ψ [rad] at the line. The table stores

.. math::

    Q_\\text{in}(r_c, \\psi) = \\frac{-z_c(r_c, \\psi)}{2\\sin(\\psi/2)\\; I_0(r_c)/I_1(r_c)},

which tends to 1 as ψ → 0 (linear meniscus) and as r_c → ∞ (2D first integral), to
cos(ψ/2) for a small ring (a spherical cap of curvature 2 sin ψ / r_c), and is even in ψ.
Grid: 121 nodes in ln r_c over 0.01 … 300 l_c × 121 nodes in ψ over 0 … π − 10⁻⁶ (denser
towards π), tensor-product quintic spline, z_c odd in ψ.

The exterior part extends :mod:`floatcalc.core.axisym_table` (which stops at r_c = 100 and
|ψ| = 3.1) to r_c = 300 with the same transformed quantity on 25 × 121 nodes over
50 … 300 l_c, |ψ| ≤ 3.1 (large rings: the outer contact radius reaches 1.5 × 100 l_c), and,
for the ends of ring, ball and pad curves (θ within 2.4° of 0 or 180°), a cap over 3.05 ≤ |ψ| ≤ π − 10⁻⁶,
r_c = 5e-5 … 300 on 191 × 61 nodes in (ln r_c, sqrt(π − 10⁻⁶ − |ψ|)), where z_c of a thin body
falls steeply to zero; used from r_c = 1e-4 (measured ≤ 5e-7 l_c absolute from the direct
solver, below the solver's own uncertainty there of up to 5e-5 l_c (see
:func:`floatcalc.core.axisym.solve`); relative errors reach 6e-3 only where z_c → 0, within
1e-4 rad of π for r_c ≲ 0.5; 1.4e-8 relative for r_c = 1e-4 … 0.02, |ψ| ≤ 3.14).

Both tables are built by ``scripts/build_ring_table.py`` with the direct solver
(:func:`floatcalc.core.axisym.solve`, tight tolerance) and shipped as
``floatcalc/data/ring_table.npz``; the script checks them against fresh direct solves on
seeded random off-grid points and prints the largest relative error (≤ 1e-6 required).
Outside their ranges :func:`inner_height` and :func:`outer_height` fall back to the direct
solver.
"""

from __future__ import annotations

import functools
from pathlib import Path

import numpy as np

from . import axisym_table

IN_R_MIN, IN_R_MAX = 0.01, 300.0
IN_PSI = np.pi - 1e-6
OUT_R_MIN, OUT_R_MAX = 50.0, 300.0
CAP_R_MIN, CAP_R_USE, CAP_PSI_LO = 5e-5, 1e-4, 3.05
PSI_MAX = np.pi - 1e-6  # the direct solver solves inclinations closer to π at this value
TABLE_PATH = Path(__file__).resolve().parent.parent / "data" / "ring_table.npz"


def inner_grid(n_r: int = 121, n_psi: int = 121):
    """Nodes of the inner table: ln r_c uniform; ψ = ψ_T sin(πj/(2N)) (denser towards π)."""
    lnr = np.linspace(np.log(IN_R_MIN), np.log(IN_R_MAX), n_r)
    psi = IN_PSI * np.sin(0.5 * np.pi * np.arange(n_psi) / (n_psi - 1))
    return lnr, psi


def outer_grid(n_r: int = 25, n_psi: int = 121):
    """Nodes of the exterior extension (ψ nodes those of :mod:`floatcalc.core.axisym_table`)."""
    lnr = np.linspace(np.log(OUT_R_MIN), np.log(OUT_R_MAX), n_r)
    return lnr, axisym_table.grid(2, n_psi)[1]


def cap_grid(n_r: int = 191, n_v: int = 61):
    """Nodes of the exterior cap table: ln r_c uniform over 5e-5 … 300; v = sqrt(ψ_max − ψ)
    uniform over ψ = 3.05 … π − 10⁻⁶ (nodes crowd towards π, where z_c of a thin body falls
    steeply to zero)."""
    lnr = np.linspace(np.log(CAP_R_MIN), np.log(OUT_R_MAX), n_r)
    v = np.linspace(0.0, np.sqrt(PSI_MAX - CAP_PSI_LO), n_v)
    return lnr, v


def inner_ratio(rc, psi, height):
    """Q_in from an inner contact height (module docstring)."""
    from scipy.special import i0e, i1e

    a = np.abs(psi)
    return -np.sign(np.where(psi == 0, 1.0, psi)) * height / (2.0 * np.sin(0.5 * a) * i0e(rc) / i1e(rc))


def build(chunk: int = 2000, log=None):
    """Both tables with the direct solver; returns a dict of arrays for ``np.savez``."""
    from .axisym import solve

    out = {}
    lnr_c, v_c = cap_grid()
    for name, (lnr, psi), side, ratio in (("inner", inner_grid(), "inner", inner_ratio),
                                          ("outer", outer_grid(), "outer", axisym_table.ratio),
                                          ("cap", (lnr_c, PSI_MAX - v_c**2), "outer", axisym_table.ratio)):
        L, P = np.meshgrid(lnr, psi, indexing="ij")
        rc, ps = np.exp(L).ravel(), P.ravel()
        q = np.ones_like(rc)
        pos = np.flatnonzero(ps > 0)
        for k in range(0, pos.size, chunk):
            sel = pos[k:k + chunk]
            q[sel] = ratio(rc[sel], ps[sel], solve(rc[sel], ps[sel], side=side)["height"])
            if log:
                log(f"{name}: {min(k + chunk, pos.size)}/{pos.size}")
        out[f"{name}_ln_r"], out[f"{name}_psi"], out[f"{name}_q"] = lnr, psi, q.reshape(L.shape)
    out["cap_psi"] = v_c  # the cap is stored against v = sqrt(ψ_max − ψ)
    return out


@functools.cache
def _splines():
    from scipy.interpolate import RectBivariateSpline

    with np.load(TABLE_PATH) as d:
        return {k: RectBivariateSpline(d[f"{k}_ln_r"], d[f"{k}_psi"], d[f"{k}_q"], kx=5, ky=5, s=0)
                for k in ("inner", "outer", "cap")}


def inner_height(rc, psi):
    """Contact-line height z_c [l_c] of the enclosed meniscus inside a ring, for arrays of
    contact radius r_c [l_c] and inclination ψ [rad] (table; direct solver outside it).

    >>> round(float(inner_height(1.0, 1.0)), 6)   # the direct solver gives -1.961773
    -1.961773
    """
    from scipy.special import i0e, i1e

    rc, psi = np.broadcast_arrays(np.asarray(rc, dtype=float), np.asarray(psi, dtype=float))
    shape = rc.shape
    rc, psi = rc.ravel(), psi.ravel()
    a = np.abs(psi)
    out = np.empty_like(rc)
    inside = (rc >= IN_R_MIN) & (rc <= IN_R_MAX) & (a <= IN_PSI)
    if np.any(inside):
        r_i, a_i = rc[inside], a[inside]
        q = _splines()["inner"].ev(np.log(r_i), a_i)
        out[inside] = -np.sign(psi[inside]) * q * 2.0 * np.sin(0.5 * a_i) * i0e(r_i) / i1e(r_i)
    if not np.all(inside):
        from .axisym import solve

        out[~inside] = solve(rc[~inside], psi[~inside], side="inner")["height"]
    return out.reshape(shape)


def outer_height(rc, psi):
    """Contact-line height z_c [l_c] outside a body: :func:`floatcalc.core.axisym_table.evaluate`
    up to r_c = 100 and |ψ| ≤ 3.1, this module's extension from there to 300 l_c, its cap
    table for 3.1 < |ψ| ≤ π at r_c ≥ 1e-4 (inclinations within 1e-6 of π taken at π − 1e-6, as
    the direct solver does), the direct solver elsewhere.

    >>> round(float(outer_height(200.0, 1.0)), 5)   # close to the 2D value −2 sin(1/2) = −0.95885
    -0.9566
    """
    from scipy.special import k0e, k1e

    rc, psi = np.broadcast_arrays(np.asarray(rc, dtype=float), np.asarray(psi, dtype=float))
    shape = rc.shape
    rc, psi = rc.ravel(), psi.ravel()
    a = np.abs(psi)
    out = np.empty_like(rc)
    ext = (rc > axisym_table.R_MAX) & (rc <= OUT_R_MAX) & (a <= axisym_table.PSI_TABLE)
    if np.any(ext):
        r_e, a_e = rc[ext], a[ext]
        q = _splines()["outer"].ev(np.log(r_e), a_e)
        out[ext] = -np.sign(psi[ext]) * q * 2.0 * np.sin(0.5 * a_e) * k0e(r_e) / k1e(r_e)
    cap = (rc >= CAP_R_USE) & (rc <= OUT_R_MAX) & (a > axisym_table.PSI_TABLE)
    if np.any(cap):
        r_c, a_c = rc[cap], np.minimum(a[cap], PSI_MAX)
        q = _splines()["cap"].ev(np.log(r_c), np.sqrt(PSI_MAX - a_c))
        out[cap] = -np.sign(psi[cap]) * q * 2.0 * np.sin(0.5 * a_c) * k0e(r_c) / k1e(r_c)
    rest = ~(ext | cap)
    if np.any(rest):
        out[rest] = axisym_table.evaluate(rc[rest], psi[rest])
    return out.reshape(shape)
