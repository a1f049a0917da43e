"""Single-layer boundary elements for the linearised meniscus ∇²h = h in plan, kernel K₀.

Scaled variables: plan lengths in capillary lengths l_c.

The free-space Green function of −∇²h + h = δ in the plane is G(r) = K₀(r)/(2π). A source
density q on straight panels (piecewise constant) gives

.. math:: h(x) = \\sum_j q_j \\int_{\\Gamma_j} G(|x - y|)\\, ds_y ,

which solves ∇²h = h off the panels, decays far away, and is regular on both sides of every
panel. Across a panel the normal slope jumps by −q, so on the side its normal points to

.. math:: \\partial_n h = -\\tfrac12 q_i + \\mathrm{PV}\\sum_j q_j \\int_{\\Gamma_j}
          \\partial_{n_x} G(|x - y|)\\, ds_y .

Panel integrals: the logarithmic parts of K₀ (−(1 + r²/4) ln r) and the 1/r + (r/2) ln r
part of K₁ are integrated in closed form over each straight panel; the smooth remainders by
two 6-point Gauss–Legendre rules split at the foot of the perpendicular. This handles
near-singular pairs (the two sides of a thin rod, adjacent panels) to about 1e-8 (checked
against adaptive quadrature); pairs farther apart use 4- and 2-point Gauss rules and, beyond
12 l_c, the midpoint rule with the asymptotic series of K₀ and K₁ (see :func:`panel_matrices`).

References
----------
.. [1] C. A. Brebbia, J. C. F. Telles, L. C. Wrobel, Boundary Element Techniques, Springer
   (1984) (single-layer potentials, collocation, singular panel integrals).
"""

from __future__ import annotations

import numpy as np

_GX, _GW = np.polynomial.legendre.leggauss(6)
_GX = 0.5 * (_GX + 1.0)
_GW = 0.5 * _GW
TWO_PI = 2.0 * np.pi


def _flog(xi, eta):
    """∫ ln sqrt(ξ² + η²) dξ = ξ ln r − ξ + η atan(ξ/η) (continuous as η → 0)."""
    r2 = xi * xi + eta * eta
    with np.errstate(divide="ignore", invalid="ignore"):
        a = np.where(r2 > 0, 0.5 * xi * np.log(np.where(r2 > 0, r2, 1.0)), 0.0)
        b = np.where(np.abs(eta) > 1e-300, eta * np.arctan(xi / np.where(eta != 0, eta, 1.0)), 0.0)
    return a - xi + b


def _fr2log(xi, eta):
    """∫ r² ln r dξ with r² = ξ² + η² (closed form)."""
    q2 = xi * xi + eta * eta
    with np.errstate(divide="ignore", invalid="ignore"):
        lq = np.where(q2 > 0, np.log(np.where(q2 > 0, q2, 1.0)), 0.0)
        at = np.where(np.abs(eta) > 1e-300, np.arctan(xi / np.where(eta != 0, eta, 1.0)), 0.0)
    e2 = eta * eta
    return 0.5 * (xi ** 3 / 3.0 * lq - (2.0 / 3.0) * (xi ** 3 / 3.0 - e2 * xi + e2 * eta * at)) + e2 * _flog(xi, eta)


def _near(px, py, pnx, pny, ax, ay, L, ex, ey):
    """S and K of panel/point pairs (flat arrays): closed-form log parts plus Gauss remainders."""
    from scipy.special import k0, k1

    vx, vy = -ey, ex
    dx = px - ax
    dy = py - ay
    pxi = dx * ex + dy * ey
    eta = dx * vx + dy * vy
    x1, x2 = -pxi, L - pxi
    s_sing = -(_flog(x2, eta) - _flog(x1, eta))
    en = pnx * ex + pny * ey
    vn = pnx * vx + pny * vy
    with np.errstate(divide="ignore", invalid="ignore"):
        ln_part = 0.5 * (np.log(x2 * x2 + eta * eta) - np.log(x1 * x1 + eta * eta))
        at = np.where(np.abs(eta) > 1e-13, np.arctan(x2 / eta) - np.arctan(x1 / eta), 0.0)
    ln_part = np.where(np.isfinite(ln_part), ln_part, 0.0)
    # ∫ (−ξ en + η vn)/r² dξ
    k_sing = -en * ln_part + vn * at
    # two 6-point rules split at the foot of the perpendicular (clipped to the panel)
    x0 = np.clip(0.0, x1, x2)
    xi = np.concatenate([x1[..., None] + (x0 - x1)[..., None] * _GX,
                         x0[..., None] + (x2 - x0)[..., None] * _GX], axis=-1)
    wts = np.concatenate([(x0 - x1)[..., None] * _GW, (x2 - x0)[..., None] * _GW], axis=-1)
    r = np.sqrt(xi * xi + eta[..., None] ** 2)
    lr = np.log(r)
    # K0 = −ln r − (r²/4) ln r + smooth (to r⁴ ln r): both log terms in closed form
    s_reg = np.sum((k0(r) + lr + 0.25 * r * r * lr) * wts, axis=-1)
    s_reg -= 0.25 * (_fr2log(x2, eta) - _fr2log(x1, eta))
    proj = -xi * en[..., None] + eta[..., None] * vn[..., None]
    # (K1 − 1/r)/r = ½ ln r + smooth: the ½ ln r · (x − y)·n term in closed form too
    k_reg = np.sum(((k1(r) - 1.0 / r) / r - 0.5 * lr) * proj * wts, axis=-1)

    def _g(t):
        q2 = t * t + eta * eta
        with np.errstate(divide="ignore", invalid="ignore"):
            return np.where(q2 > 0, 0.25 * (q2 * np.log(np.where(q2 > 0, q2, 1.0)) - q2), 0.0)

    k_reg += 0.5 * (-en * (_g(x2) - _g(x1)) + eta * vn * (_flog(x2, eta) - _flog(x1, eta)))
    return (s_sing + s_reg) / TWO_PI, -(k_sing + k_reg) / TWO_PI


_FX, _FW = np.polynomial.legendre.leggauss(4)
_FX = 0.5 * (_FX + 1.0)
_FW = 0.5 * _FW
_EX, _EW = np.polynomial.legendre.leggauss(8)
_EX = 0.5 * (_EX + 1.0)
_EW = 0.5 * _EW
_TX, _TW = np.polynomial.legendre.leggauss(2)
_TX = 0.5 * (_TX + 1.0)
_TW = 0.5 * _TW
NEAR = 1.5  # pairs nearer than NEAR panel lengths (point to panel midpoint): singular subtraction
FAR = 4.0  # ... farther than NEAR: 8-point rule; farther than FAR panel lengths: 4-point rule
FARTHER = 16.0  # ... farther than FARTHER panel lengths: 2-point rule
VERY_FAR = 12.0  # [l_c] pairs farther than this plus the panel length: midpoint rule
TWO_POINT_LC = 8.0  # [l_c] ... farther than this plus the panel length: 2-point rule at most
_ASYMPTOTIC_TERMS = 8
PAIRS_IN_HALVES = 50_000  # point–panel pairs from which the rows are split over two threads


def k0_k1_large(r):
    """K₀(r) and K₁(r) for r ≥ 12 by their asymptotic series (Abramowitz & Stegun 9.7.2).

    K_ν(r) ~ √(π/2r) e^{−r} Σ_k a_k(ν)/r^k, a_k = Π_{j≤k} (4ν² − (2j − 1)²)/(8j); for real
    r > 0 the remainder after k ≥ ν − ½ terms is smaller than the first term left out
    (A&S 9.7.2, remark on real arguments): with 8 terms below 1.4e-8 of K₀ and 2.6e-8 of K₁
    at r = 12, and less farther out. About ten times faster than scipy.special.k0/k1.
    (Smaller r give finite but inaccurate values; r = 0 gives inf.)

    >>> from scipy.special import k0, k1
    >>> r = np.array([12.0, 20.0, 60.0])
    >>> a0, a1 = k0_k1_large(r)
    >>> bool(np.all(np.abs(a0 / k0(r) - 1) < 2e-8) and np.all(np.abs(a1 / k1(r) - 1) < 3e-8))
    True
    """
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        u = 1.0 / (8.0 * r)
        s0 = np.full_like(r, _A0[-1])
        s1 = np.full_like(r, _A1[-1])
        for c0, c1 in zip(_A0[-2::-1], _A1[-2::-1]):   # Horner in u
            s0 *= u
            s0 += c0
            s1 *= u
            s1 += c1
        pre = np.exp(-r)
        pre *= np.sqrt(np.pi / 2.0 / r)
        s0 *= pre
        s1 *= pre
    return s0, s1


def _asymptotic_coefficients(nu, n):
    out, a = [1.0], 1.0
    for j in range(1, n + 1):
        a *= (4.0 * nu * nu - (2 * j - 1) ** 2) / j
        out.append(a)
    return out


_A0 = _asymptotic_coefficients(0, _ASYMPTOTIC_TERMS)   # coefficients of u = 1/(8r)
_A1 = _asymptotic_coefficients(1, _ASYMPTOTIC_TERMS)


def panel_matrices(px, py, pnx, pny, ax, ay, bx, by, block: int = 256, skip=None):
    """Single-layer and normal-derivative influence matrices.

    Parameters
    ----------
    px, py : (m,) arrays [l_c]
        Collocation points.
    pnx, pny : (m,) arrays
        Unit normals at the collocation points (the derivative direction).
    ax, ay, bx, by : (n,) arrays [l_c]
        Panel end points.
    skip : (row_groups, col_groups), optional
        Integer labels of points and panels: the entries of pairs with equal labels are left
        to the caller (undefined here), e.g. a body's own block filled from a cache.

    Returns
    -------
    S, K : (m, n) arrays
        S_ij = ∫_j G(|x_i − y|) ds_y, K_ij = PV ∫_j ∂_{n_i} G ds_y (the jump −q/2 is not
        included; the principal value of a straight panel at its own midpoint is 0).

    Quadrature by distance d from the point to the panel midpoint, in panel lengths L: nearer
    than :data:`NEAR` L the singular-part subtraction; Gauss–Legendre rules beyond, whose
    error is about ρ^(−2n) for n points, with ρ the Bernstein-ellipse parameter of the
    integrand's nearest singularity (the collocation point; ρ ≥ 5.8 at 1.5 L, ≈ 4d/L far
    off): 8 points up to :data:`FAR` L (about 1e-12), 4 points up to :data:`FARTHER` L or
    :data:`TWO_POINT_LC` l_c beyond the panel (about 1e-9), 2 points beyond (below 3e-10
    absolute on the twelve-leg and 48-leg benchmark layouts, measured against adaptive
    quadrature); and where every point of the panel lies beyond :data:`VERY_FAR` l_c
    the midpoint rule (absolute error below L³ K₀(12)/(48π) ≈ 2e-8 L³, where K₀ has fallen
    to 2e-6) with K₀, K₁ from their asymptotic series (:func:`k0_k1_large`).

    >>> from scipy.integrate import quad
    >>> from scipy.special import k0
    >>> S, K = panel_matrices(np.array([0.0]), np.array([0.0]), np.array([0.0]), np.array([1.0]),
    ...                       np.array([-0.25]), np.array([0.0]), np.array([0.25]), np.array([0.0]))
    >>> ref = quad(lambda s: k0(abs(s)) / (2 * np.pi), -0.25, 0.25, points=[0.0])[0]
    >>> bool(abs(S[0, 0] - ref) < 1e-10), abs(float(K[0, 0]))   # own panel: principal value 0
    (True, 0.0)

    Panels should be shorter than about 2 l_c (the subtracted r² ln r term is integrated
    numerically as part of the remainder).
    """
    from scipy.special import k0, k1

    m, n = px.size, ax.size
    S = np.empty((m, n))
    K = np.empty((m, n))
    L = np.hypot(bx - ax, by - ay)
    ex, ey = (bx - ax) / L, (by - ay) / L
    mx, my = 0.5 * (ax + bx), 0.5 * (ay + by)
    rules = []
    for X, Wt in ((_EX, _EW), (_FX, _FW), (_TX, _TW)):
        gx = ax[:, None] + (bx - ax)[:, None] * X      # (n, k) rule nodes
        gy = ay[:, None] + (by - ay)[:, None] * X
        rules.append((gx, gy, L[:, None] * Wt / TWO_PI))
    wm = L / TWO_PI

    def rows(r0, r1):
        for i0 in range(r0, r1, block):
            _rows(slice(i0, min(r1, i0 + block)), i0)

    def _rows(sl, i0):
        dxm = px[sl, None] - mx
        dym = py[sl, None] - my
        dist = np.hypot(dxm, dym)
        # the midpoint rule with the asymptotic K₀, K₁ on the whole block (dense arrays, no
        # gathers), then the nearer pairs overwritten by their rules below
        a0, a1 = k0_k1_large(dist)
        Sb, Kb = S[sl], K[sl]       # views: the rules below write into S and K
        np.multiply(a0, wm[None, :], out=Sb)
        with np.errstate(divide="ignore", invalid="ignore"):
            a1 /= dist
            a1 *= -wm[None, :]
            np.multiply(dxm, pnx[sl, None], out=Kb)
            dym *= pny[sl, None]
            Kb += dym
            Kb *= a1
        vf = dist >= VERY_FAR + L[None, :]
        near = dist < FAR * L[None, :]
        if skip is not None:
            own = skip[0][sl, None] == skip[1][None, :]
            vf |= own      # left to the caller
            near &= ~own
        mid = ~vf & ~near
        two = mid & ((dist >= FARTHER * L[None, :]) | (dist >= TWO_POINT_LC + L[None, :]))
        eight = near & (dist >= NEAR * L[None, :])
        near &= ~eight
        for mask, (gx, gy, wl) in ((eight, rules[0]), (mid & ~two, rules[1]), (two, rules[2])):
            fi, fj = np.nonzero(mask)
            if fi.size:
                dx = px[sl][fi, None] - gx[fj]
                dy = py[sl][fi, None] - gy[fj]
                r = np.sqrt(dx * dx + dy * dy)
                with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
                    Sb[fi, fj] = np.einsum("ij,ij->i", k0(r), wl[fj])
                    proj = dx * pnx[sl][fi, None] + dy * pny[sl][fi, None]
                    Kb[fi, fj] = -np.einsum("ij,ij->i", k1(r) / r * proj, wl[fj])
        ii, jj = np.nonzero(near)
        if ii.size:
            gi = ii + i0
            sn, kn = _near(px[gi], py[gi], pnx[gi], pny[gi], ax[jj], ay[jj], L[jj], ex[jj], ey[jj])
            Sb[ii, jj] = sn
            Kb[ii, jj] = kn
    # two halves of the rows side by side on a large layout (:func:`floatcalc.core._threads.in_halves`)
    from ._threads import in_halves

    if m * n >= PAIRS_IN_HALVES:
        in_halves(rows, m, at_least=2)
    else:
        rows(0, m)
    return S, K


def field(x, y, ax, ay, bx, by, q, block: int = 4096):
    """Field h(x, y) of panel source densities q at plan points (same quadrature as S)."""
    x = np.asarray(x, dtype=float)
    y = np.asarray(y, dtype=float)
    shape = x.shape
    xf, yf = x.ravel(), y.ravel()
    out = np.empty(xf.size)
    zero = np.zeros(1)
    for i0 in range(0, xf.size, block):
        sl = slice(i0, min(xf.size, i0 + block))
        S, _ = panel_matrices(xf[sl], yf[sl], zero.repeat(xf[sl].size), zero.repeat(xf[sl].size) + 1.0,
                              ax, ay, bx, by, block=block)
        out[sl] = S @ q
    return out.reshape(shape)
