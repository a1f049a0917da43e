"""Force of a long rod as a function of the depth of its lowest point (scaled, core layer).

Bare floats and arrays, no units: lengths in capillary lengths l_c, force per unit length in
σ. Conventions and the force law as in :mod:`floatcalc.core.rod2d` (Vella, Lee & Kim 2006):
the depth of the lowest point at contact position φ is

.. math:: D(\\phi) = 2\\sin(\\psi/2) + R(1 - \\cos\\phi), \\qquad \\psi = \\phi + \\theta - \\pi,

and :math:`dD/d\\phi = \\cos(\\psi/2) + R\\sin\\phi \\ge 0` on 0 ≤ φ ≤ π (|ψ| ≤ π), so D is
monotone and can be inverted by bisection, vectorised over all depths. The force at depth D
is then :func:`floatcalc.core.rod2d.force` at φ(D).

Outside [D(0), D(π)] the law is undefined (no contact yet, or the rod already engulfed);
there φ is clamped to the end of the range and a mask says so.

>>> import numpy as np
>>> phi, out = phi_at_depth(np.array([0.3]), 0.1, np.radians(120))
>>> bool(abs(depth(phi, 0.1, np.radians(120))[0] - 0.3) < 1e-12), bool(out[0])
(True, False)
"""

from __future__ import annotations

import numpy as np

from ..core import rod2d

PI = np.pi


def depth(phi, R, theta):
    """Depth [l_c] of the rod's lowest point below the undisturbed surface at contact position φ."""
    phi = np.asarray(phi, dtype=float)
    return 2.0 * np.sin(0.5 * (phi + theta - PI)) + R * (1.0 - np.cos(phi))


def phi_at_depth(D, R, theta, iters: int = 60):
    """Contact position φ with D(φ) = D, by vectorised bisection; clamped outside the range.

    Returns
    -------
    phi : ndarray [rad]
    outside : ndarray of bool
        True where D lies outside [D(0), D(π)].
    """
    D = np.asarray(D, dtype=float)
    D, R, theta = np.broadcast_arrays(D, np.asarray(R, dtype=float), np.asarray(theta, dtype=float))
    lo = np.zeros(D.shape)
    hi = np.full(D.shape, PI)
    d_lo, d_hi = depth(lo, R, theta), depth(hi, R, theta)
    outside = (D < d_lo) | (D > d_hi)
    for _ in range(iters):  # 60 halvings of π: below 3e-18 rad
        mid = 0.5 * (lo + hi)
        below = depth(mid, R, theta) < D
        lo = np.where(below, mid, lo)
        hi = np.where(below, hi, mid)
    phi = 0.5 * (lo + hi)
    phi = np.where(D <= d_lo, 0.0, np.where(D >= d_hi, PI, phi))
    return phi, outside


def force_at_depth(D, R, theta):
    """Upward force per length [σ] at depth D [l_c], and the outside-range mask."""
    phi, outside = phi_at_depth(D, R, theta)
    return rod2d.force(phi, R, theta), outside
