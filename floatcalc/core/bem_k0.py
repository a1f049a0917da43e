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
against adaptive quadrature); pairs more than four panel lengths apart use a plain 4-point
rule.

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
FAR = 4.0  # pairs farther than FAR panel lengths (point to panel midpoint): plain 4-point rule
VERY_FAR = 12.0  # [l_c] pairs farther than this plus the panel length: midpoint rule


def panel_matrices(px, py, pnx, pny, ax, ay, bx, by, block: int = 256):
    """Single-layer and normal-derivative influence matrices.

    Parameters
    ----------
    px, py : (m,) arrays [l_c]
        Collocation points.
    pnx, pny : (m,) arrays
        Unit normals at the collocation points (the derivative direction).
    ax, ay, bx, by : (n,) arrays [l_c]
        Panel end points.

    Returns
    -------
    S, K : (m, n) arrays
        S_ij = ∫_j G(|x_i − y|) ds_y, K_ij = PV ∫_j ∂_{n_i} G ds_y (the jump −q/2 is not
        included; the principal value of a straight panel at its own midpoint is 0).

    Pairs farther than :data:`FAR` panel lengths use a plain 4-point Gauss rule (relative
    error below about 1e-7 there); nearer pairs the singular-part subtraction; pairs farther
    than :data:`VERY_FAR` l_c (plus the panel length) the midpoint rule (absolute error below
    L³ K₀(12)/(48π) ≈ 2e-8 L³, where K₀ has fallen to 2e-6).

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
    gx = ax[:, None] + (bx - ax)[:, None] * _FX      # (n, 4) far-rule nodes
    gy = ay[:, None] + (by - ay)[:, None] * _FX
    wl = L[:, None] * _FW / TWO_PI
    for i0 in range(0, m, block):
        sl = slice(i0, min(m, i0 + block))
        dist = np.hypot(px[sl, None] - mx, py[sl, None] - my)
        # very far pairs (every point of the panel beyond VERY_FAR l_c): midpoint rule, error
        # below L³ K₀''/24 ≈ 2e-8 L³ of an entry of order 1 on the diagonal
        dxm = px[sl, None] - mx
        dym = py[sl, None] - my
        wm = L[None, :] / TWO_PI
        with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
            Sb = k0(dist) * wm
            Kb = -k1(dist) / dist * (dxm * pnx[sl, None] + dym * pny[sl, None]) * wm
        fi, fj = np.nonzero(dist < VERY_FAR + L[None, :])
        if fi.size:
            dx = px[sl][fi, None] - gx[fj]
            dy = py[sl][fi, None] - gy[fj]
            r = np.sqrt(dx * dx + dy * dy)
            with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
                Sb[fi, fj] = np.einsum("ij,ij->i", k0(r), wl[fj])
                proj = dx * pnx[sl][fi, None] + dy * pny[sl][fi, None]
                Kb[fi, fj] = -np.einsum("ij,ij->i", k1(r) / r * proj, wl[fj])
        ii, jj = np.nonzero(dist < FAR * L[None, :])
        if ii.size:
            gi = ii + i0
            sn, kn = _near(px[gi], py[gi], pnx[gi], pny[gi], ax[jj], ay[jj], L[jj], ex[jj], ey[jj])
            Sb[ii, jj] = sn
            Kb[ii, jj] = kn
        S[sl] = Sb
        K[sl] = Kb
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
