"""Exact 2D meniscus of N long parallel rods at equal centre spacing, held at one depth.

Scaled variables: lengths in capillary lengths l_c, forces per unit rod length in σ.
Conventions as in :mod:`floatcalc.core.rod2d`: φ is the contact position from the lowest point
of a rod's section, ψ = φ + θ − π the interface inclination at the contact line (positive for a
depressed meniscus), h the depth below the undisturbed surface.

Model
-----
The rods (radius R, contact angle θ, spacing S between centres) are held by a rigid frame with
their centres at one depth c (a level device). Each rod has two contact lines:

* an **outer** side facing open liquid, where the meniscus flattens far away and the 2D first
  integral gives :math:`h_o = 2\\sin(\\psi_o/2)` (as for a single rod);
* **inner** sides facing a neighbour. By symmetry the meniscus in each gap has a turning point
  (ψ = 0) at mid-gap, of depth :math:`h_m`, and the first integral of the 2D Young–Laplace
  equation :math:`d\\psi/ds = h,\\; dh/ds = \\sin\\psi` gives

  .. math:: h_i^2 - h_m^2 = 2(1 - \\cos\\psi_i),

  while the horizontal distance from the contact line to mid-gap is

  .. math:: X(\\psi_i, h_m) = \\int_0^{\\psi_i} \\frac{\\cos\\psi\\,d\\psi}{\\sqrt{h_m^2 + 2(1-\\cos\\psi)}}
            = S/2 - R\\sin\\phi_i .

Rigidity ties both sides to the centre depth: :math:`h = c + R\\cos\\phi` on each side. All gaps
of a level row are alike, so the total force per unit length of N rods is

.. math:: f_N(c) = 2 f_{side}(\\phi_o) + 2(N-1) f_{side}(\\phi_i),\\qquad
          f_{side}(\\phi) = \\sin\\psi + R c \\sin\\phi + R^2(\\phi/2 + \\sin 2\\phi / 4),

the vertical surface-tension pull of that contact line plus the hydrostatic pressure on the
wetted arc from the lowest point to it. With N = 1 this is the single-rod law of Vella, Lee &
Kim (2006) [1]_, who also treat a pair of rods. The limit is the maximum of f_N over c, up to
φ = π on either side or the gap closing (S/2 − R sin φ_i → 0).

Validity: long rigid rods (end effects excluded), all at one depth, identical radius and
contact angle, S > 2R, static, clean surface. The net horizontal force on the outer rods
(their two sides differ) is taken by the frame.

References
----------
.. [1] D. Vella, D.-G. Lee, H.-Y. Kim, "The load supported by small floating objects",
   Langmuir 22, 5979 (2006).
"""

from __future__ import annotations

import numpy as np

from . import rod2d

PI = np.pi
_GL_X, _GL_W = np.polynomial.legendre.leggauss(48)


def gap_distance(psi, h_m):
    """Distance X(ψ, h_m) [l_c] from a contact line of inclination |ψ| to the gap's turning point.

    Evaluated by Gauss–Legendre quadrature after the substitutions t = sin(ψ'/2),
    t = (h_m/2) sinh v, which remove the near-singularity at small h_m:
    X = ∫_0^V (1 − 2t²)/√(1 − t²) dv with V = asinh(2 sin(ψ/2)/h_m).

    >>> round(float(gap_distance(1e-3, 1e-3)), 5)  # small slope: X ≈ asinh(ψ/h_m)
    0.88137
    """
    a = np.abs(np.asarray(psi, dtype=float))
    hm = np.maximum(np.asarray(h_m, dtype=float), 1e-300)
    a, hm = np.broadcast_arrays(a, hm)
    T = np.sin(0.5 * a)
    V = np.arcsinh(2.0 * T / hm)
    v = 0.5 * V[..., None] * (_GL_X + 1.0)
    t = np.minimum(0.5 * hm[..., None] * np.sinh(v), 1.0)
    g = (1.0 - 2.0 * t * t) / np.sqrt(np.maximum(1.0 - t * t, 1e-300))
    return 0.5 * V * np.sum(g * _GL_W, axis=-1)


def turning_depth(psi, half_gap, *, iters: int = 56):
    """Turning-point depth |h_m| [l_c] for which X(ψ, h_m) equals ``half_gap`` (> 0).

    X falls monotonically from ∞ (h_m → 0) to 0 (h_m → ∞); bisection on log h_m, vectorised.
    """
    a = np.abs(np.asarray(psi, dtype=float))
    g = np.asarray(half_gap, dtype=float)
    a, g = np.broadcast_arrays(a, g)
    lo = np.full(a.shape, -40.0)
    hi = np.full(a.shape, 12.0)
    for _ in range(iters):
        mid = 0.5 * (lo + hi)
        too_far = gap_distance(a, np.exp(mid)) > g  # X too large -> h_m must grow
        lo = np.where(too_far, mid, lo)
        hi = np.where(too_far, hi, mid)
    return np.exp(0.5 * (lo + hi))


def side_force(phi, R, theta, c):
    """Force per length [σ] of one side of a rod: sin ψ plus pressure on its half of the arc."""
    psi = phi + theta - PI
    return np.sin(psi) + R * c * np.sin(phi) + R * R * (0.5 * phi + 0.25 * np.sin(2.0 * phi))


def outer_side(R: float, theta: float, n: int = 1201):
    """Outer side tabulated on φ ∈ [0, π]: centre depth c(φ) and the side force."""
    phi = np.linspace(0.0, PI, n)
    psi = phi + theta - PI
    h = 2.0 * np.sin(0.5 * psi)
    c = h - R * np.cos(phi)
    return phi, c, side_force(phi, R, theta, c)


def inner_side(R: float, theta: float, S: float, n: int = 1201):
    """Inner side tabulated on the φ for which the gap stays open: c(φ), force, h_m.

    The table keeps the branch on which the centre depth c(φ) rises through ψ = 0 and stops at
    the gap closing (S/2 − R sin φ → 0) or at the maximum of c(φ), beyond which no deeper
    static inner meniscus exists.
    """
    phi = np.linspace(0.0, PI, n)
    half_gap = 0.5 * S - R * np.sin(phi)
    ok = half_gap > 1e-9
    phi = phi[ok]
    half_gap = half_gap[ok]
    psi = phi + theta - PI
    hm = turning_depth(psi, half_gap)
    sign = np.where(psi >= 0.0, 1.0, -1.0)
    h = sign * np.sqrt(hm * hm + 4.0 * np.sin(0.5 * psi) ** 2)
    c = h - R * np.cos(phi)
    # Keep the branch on which c(φ) rises through the flat-contact point ψ = 0: beyond its
    # maximum no deeper static inner meniscus exists (not reachable by pushing down), and
    # before its minimum lie capillary-rise states unreachable from first contact.
    i0 = int(np.argmin(np.abs(psi)))
    up = np.diff(c) > 0.0
    start = i0
    while start > 0 and up[start - 1]:
        start -= 1
    end = i0
    while end < up.size and up[end]:
        end += 1
    sl = slice(start, end + 1)
    return phi[sl], c[sl], side_force(phi[sl], R, theta, c[sl]), (sign * hm)[sl]


def row_curve(R: float, theta: float, S: float, N: int, n: int = 1201):
    """Force–depth curve of a level row of N rods up to its limit.

    Returns
    -------
    dict with arrays ``depth`` (of the lowest point of the rods [l_c]), ``force`` (all rods,
    per unit length [σ]), ``phi_outer``, ``phi_inner``, ``h_mid`` (turning-point depth) and the
    scalar index ``i_max`` of the limit in those arrays.
    """
    po, co, fo = outer_side(R, theta, n)
    if N == 1:
        c = co
        f = 2.0 * fo
        pi_ = po
        hm = np.full_like(c, np.nan)
    else:
        pi_t, ci, fi, hmi = inner_side(R, theta, S, n)
        # Common centre-depth range; both c(φ) increase with φ.
        lo = max(co[0], ci[0])
        hi = min(co[-1], ci[-1])
        c = np.linspace(lo, hi, n)
        fo_c = np.interp(c, co, fo)
        fi_c = np.interp(c, ci, fi)
        f = 2.0 * fo_c + 2.0 * (N - 1) * fi_c
        pi_ = np.interp(c, ci, pi_t)
        po = np.interp(c, co, po)
        hm = np.interp(c, ci, hmi)
    k = int(np.argmax(f))
    return {"depth": c + R, "force": f, "phi_outer": po,
            "phi_inner": pi_, "h_mid": hm, "i_max": k}


def row_limit(R: float, theta: float, S: float, N: int):
    """Limit of a level row of N rods: force per length [σ] (all rods), depth [l_c], parts.

    The curve is tabulated densely (2401 centre depths) and its largest value taken; the force
    is stationary there, so the tabulation error of the limit force is second order (≲ 1e-6).

    >>> lim = row_limit(0.1, np.radians(120), 200.0, 2)   # far apart: twice one rod
    >>> one = rod2d.limit_force(0.1, np.radians(120))
    >>> bool(abs(lim["force"] / (2 * one["force"]) - 1) < 1e-4)
    True
    """
    if N < 1:
        raise ValueError("N must be at least 1")
    if N == 1:
        lim = rod2d.limit_force(R, theta)
        return {"force": float(lim["force"]), "depth": float(lim["depth"]), "phi_outer": float(lim["phi"]),
                "phi_inner": float(lim["phi"]), "h_mid": float("nan")}
    fine = row_curve(R, theta, S, N, n=2401)
    k = fine["i_max"]
    return {"force": float(fine["force"][k]), "depth": float(fine["depth"][k]),
            "phi_outer": float(fine["phi_outer"][k]), "phi_inner": float(fine["phi_inner"][k]),
            "h_mid": float(fine["h_mid"][k])}


def row_profile(R: float, theta: float, S: float, N: int, extent: float = 3.0, n: int = 160, lim=None):
    """Cross-section of a level row of N rods at its limit, for drawing: rod centres, the outer
    menisci and the shared meniscus of every gap, in capillary lengths.

    Coordinates: row centre at x = 0, undisturbed surface at z = 0, z up (z = −h). The state is
    that of :func:`row_limit`. Outer sides follow the closed-form free meniscus
    (:func:`floatcalc.core.rod2d.free_meniscus`). Each gap is drawn from the first integral, as
    a function of the inclination ψ from the contact value ψ_i down to 0 at mid-gap:

    .. math:: h(\\psi) = \\pm\\sqrt{h_m^2 + 4\\sin^2(\\psi/2)},\\qquad
              x(\\psi) = x_{mid} \\mp X(\\psi, |h_m|)

    (:func:`gap_distance`), mirrored about mid-gap. For N = 1 this is the single-rod profile of
    :func:`floatcalc.core.rod2d.profile`.

    Returns
    -------
    dict with ``centres_x`` (N,), ``centre_z``, ``outer_right`` and ``outer_left`` ((x, z) of
    each outer meniscus), ``gaps`` (list of N − 1 (x, z) arrays, left contact to right contact),
    ``contacts`` ((x, z) arrays of all 2N contact points, left to right), ``phi_outer``,
    ``phi_inner`` (contact positions [rad]), ``psi_outer``, ``psi_inner``, ``h_mid``
    (signed turning-point depth, NaN for N = 1), ``depth`` (of the lowest point) [l_c].
    ``lim`` may pass the :func:`row_limit` of the same row (not solved again).

    >>> p = row_profile(0.1, np.radians(120), 1.0, 3)
    >>> len(p["gaps"]), p["contacts"][0].size
    (2, 6)
    """
    lim = row_limit(R, theta, S, N) if lim is None else lim
    c = lim["depth"] - R  # centre depth below the surface
    po, pi_ = lim["phi_outer"], lim["phi_inner"] if N > 1 else lim["phi_outer"]
    psi_o, psi_i = po + theta - PI, pi_ + theta - PI
    xs = (np.arange(N) - 0.5 * (N - 1)) * S
    x0 = xs[-1] + R * np.sin(po)
    xr, zr = rod2d.free_meniscus(psi_o, x0, extent=extent, n=n)
    gaps = []
    hm = lim["h_mid"]
    if N > 1:
        sign = 1.0 if psi_i >= 0 else -1.0
        a = abs(psi_i)
        psi = np.linspace(a, 0.0, n)
        half = gap_distance(psi, abs(hm)) if a > 0 else np.zeros(n)
        h = sign * np.sqrt(hm * hm + 4.0 * np.sin(0.5 * psi) ** 2)
        for k in range(N - 1):
            xm = 0.5 * (xs[k] + xs[k + 1])
            gx = np.concatenate([xm - half, (xm + half[::-1])[1:]])
            gz = np.concatenate([-h, -h[::-1][1:]])
            gaps.append((gx, gz))
    cx, cz = [], []
    for k, x in enumerate(xs):
        left = po if k == 0 else pi_
        right = po if k == N - 1 else pi_
        cx += [x - R * np.sin(left), x + R * np.sin(right)]
        cz += [-(c + R * np.cos(left)), -(c + R * np.cos(right))]
    return {
        "centres_x": xs, "centre_z": -c,
        "outer_right": (xr, zr), "outer_left": (-xr, zr),
        "gaps": gaps, "contacts": (np.array(cx), np.array(cz)),
        "phi_outer": po, "phi_inner": pi_, "psi_outer": psi_o, "psi_inner": psi_i,
        "h_mid": hm, "depth": lim["depth"],
    }
