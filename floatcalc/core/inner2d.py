"""Inner–outer map of a locally 1D nonlinear meniscus onto "virtual" linear contact data.

Scaled variables: lengths in capillary lengths l_c, depth h below the undisturbed surface
(positive down), inclination ψ positive for a depressed meniscus (the interface rises moving
away from the body), n the horizontal distance from the contact line, away from the body.

The 1D meniscus
---------------
Along the normal to a straight contact line the exact 2D Young–Laplace equation in arclength
form is dh/ds = −sin ψ, dn/ds = cos ψ, dψ/ds = −h. It has the first integral

.. math:: E = 2(1 - \\cos\\psi) - h^2 ,

conserved along the whole profile: E = 0 for a meniscus that flattens far away
(|h| = 2 sin(ψ/2), Vella, Lee & Kim [1]_), E = −h_m² across a gap whose interface has a
turning point (ψ = 0) of depth h_m, E > 0 for a profile that crosses the undisturbed level
(h = 0) at a finite distance. The linearised equation h'' = h conserves h'² − h², the small-
slope limit of E.

The map
-------
The linear 1D solution is h = a e^{−n} + b e^{n} (a: the amplitude that decays away from the
body, b: the growing one; E_lin = h'² − h² = −4ab). To a true contact state (h, ψ) we attach
the linear solution with the same invariant and the same distance N to the turning point
(E < 0) or to the zero crossing (E > 0); for E = 0 it is the far-field tail of the isolated
profile. With t = sin(ψ'/2), T = sin(ψ/2), s = −E/4 and the distance integral of the
turning-point first integral (as in :func:`floatcalc.core.parallel2d.gap_distance`), all
cases reduce to one closed expression (for ψ ≥ 0; the map is odd under (h, ψ) → (−h, −ψ)):

.. math::

    2a = (h + 2T)\\, e^{\\varepsilon I},\\qquad 2b = (h - 2T)\\, e^{-\\varepsilon I},\\qquad
    \\varepsilon = \\operatorname{sign} h,\\qquad
    I = \\int_{t_0}^{T} \\frac{f(t)\\,dt}{\\sqrt{t^2 + s}},\\quad
    f(t) = \\frac{1 - 2t^2}{\\sqrt{1 - t^2}} - 1,

with t₀ = 0 for s ≥ 0 and t₀ = √(−s) for s < 0 (the integral is the nonlinear excess of the
distance N over its linear value). Small slopes give a + b = h, b − a = −ψ (the linear data).
For the isolated meniscus (E = 0) the decaying amplitude is

.. math:: a = A = 4\\tan(\\psi/4)\\, e^{2\\cos(\\psi/2) - 2},

which follows from the closed-form profile x(ψ) = −ln tan(ψ/4) − 2 cos(ψ/2) + const; the tests
check the quadrature against it.

Exactness: an outer *linear* solution fed with these virtual data reproduces the exact 2D
nonlinear solution at any gap, because in every gap between two contact lines it has the same
invariant and the same turning point as the true interface (E < 0: h = h_m cosh(n − N)), and
on an open side it has the same tail. The virtual data can be carried to any nearby station
n = δ by the linear solution (exact in 1D):
h_v = a e^{−δ} + b e^{δ}, ∂ₙh_v = −a e^{−δ} + b e^{δ}.

The map is continuous but not smooth at E = 0: the excess integral I has an s ln|s| term
(s = −E/4), so its slope is log-singular at the isolated state (a resonant saddle of the
phase plane). Solvers should difference it over a finite step there.

Validity: any |ψ| ≤ π and any h (the quadrature, 64-point Gauss–Legendre, is good to about
1e-12 for |ψ| ≤ 150°, with 16 nodes 2e-8, and degrades to about 1e-6 as |ψ| → 180°, where f
has an integrable end singularity). In 3D it holds where the meniscus is locally 1D across a
contact-line panel.

References
----------
.. [1] D. Vella, D.-G. Lee, H.-Y. Kim, "The load supported by small floating objects",
   Langmuir 22, 5979 (2006).
"""

from __future__ import annotations

import numpy as np

_RULES: dict[int, tuple[np.ndarray, np.ndarray]] = {}


def _rule(n: int):
    """Gauss–Legendre nodes and weights on [0, 1] (cached)."""
    if n not in _RULES:
        x, w = np.polynomial.legendre.leggauss(n)
        _RULES[n] = (0.5 * (x + 1.0), 0.5 * w)
    return _RULES[n]


def excess_integral(h, psi, nodes: int = 64):
    """Nonlinear distance excess I(h, ψ) of the module docstring, for ψ ≥ 0 (vectorised).

    >>> abs(float(excess_integral(0.0, 1.0)))   # h = 0: the zero crossing is at the contact line
    0.0
    """
    _X, _W = _rule(nodes)
    h = np.asarray(h, dtype=float)
    psi = np.asarray(psi, dtype=float)
    h, psi = np.broadcast_arrays(h, psi)
    T = np.sin(0.5 * psi)
    s = 0.25 * h * h - T * T
    out = np.zeros(h.shape)
    pos = s >= 0.0
    if np.any(pos):  # t = sin u, u in [0, ψ/2]: (cos 2u − cos u)/sqrt(sin² u + s) du
        U = 0.5 * psi[pos]
        u = U[..., None] * _X
        su = np.sin(u)
        g = (np.cos(2.0 * u) - np.cos(u)) / np.sqrt(su * su + s[pos][..., None])
        g = np.where(u > 0, g, 0.0)
        out[pos] = U * np.sum(g * _W, axis=-1)
    neg = ~pos
    if np.any(neg):  # t = sqrt(w² + t0²), w in [0, |h|/2]: f(t)/t dw
        t0sq = -s[neg]
        Wd = 0.5 * np.abs(h[neg])
        w = Wd[..., None] * _X
        t = np.sqrt(w * w + t0sq[..., None])
        t = np.minimum(t, 1.0 - 1e-16)
        f = (1.0 - 2.0 * t * t) / np.sqrt(1.0 - t * t) - 1.0
        out[neg] = Wd * np.sum(f / t * _W, axis=-1)
    return out


def amplitudes(h, psi, nodes: int = 64):
    """Decaying and growing amplitudes (a, b) of the virtual linear solution at the contact line.

    Parameters
    ----------
    h : array_like [l_c]
        Contact-line depth below the undisturbed surface (positive down).
    psi : array_like [rad]
        Interface inclination at the contact line, positive for a depressed meniscus.

    Returns
    -------
    a, b : ndarray [l_c]
        h_v(n) = a e^{−n} + b e^{n} near the contact line (n outward).

    >>> a, b = amplitudes(2 * np.sin(0.5), 1.0)      # isolated meniscus at ψ = 1 rad: b = 0
    >>> bool(abs(a - 4 * np.tan(0.25) * np.exp(2 * np.cos(0.5) - 2)) < 1e-12), bool(abs(b) < 1e-15)
    (True, True)
    """
    h = np.asarray(h, dtype=float)
    psi = np.asarray(psi, dtype=float)
    h, psi = np.broadcast_arrays(h, psi)
    sg = np.where(psi < 0.0, -1.0, 1.0)
    hh, pp = sg * h, sg * psi
    T = np.sin(0.5 * pp)
    eps = np.where(hh >= 0.0, 1.0, -1.0)
    ex = np.exp(eps * excess_integral(hh, pp, nodes))
    a = 0.5 * (hh + 2.0 * T) * ex
    b = 0.5 * (hh - 2.0 * T) / ex
    return sg * a, sg * b


def virtual_data(h, psi, offset=0.0):
    """Virtual linear depth and outward normal slope (h_v, ∂ₙh_v) at n = ``offset`` [l_c].

    >>> hv, gv = virtual_data(0.01, 0.01)   # small slope: the linear data themselves
    >>> bool(abs(hv - 0.01) < 1e-6 and abs(gv + 0.01) < 1e-6)
    True
    """
    a, b = amplitudes(h, psi)
    em = np.exp(-np.asarray(offset, dtype=float))
    ep = 1.0 / em
    return a * em + b * ep, -a * em + b * ep


def isolated_amplitude(psi):
    """Far-field amplitude A of the isolated 2D meniscus, h ≈ A e^{−n} (closed form).

    >>> round(float(isolated_amplitude(np.pi / 2)), 6)
    0.922318
    """
    psi = np.asarray(psi, dtype=float)
    return 4.0 * np.tan(0.25 * psi) * np.exp(2.0 * np.cos(0.5 * psi) - 2.0)
