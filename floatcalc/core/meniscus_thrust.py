"""Largest horizontal force of a thin leg's meniscus at a given vertical load, on bare numbers.

Scaled variables: forces per unit length of contact line in σ (so a thin leg of wetted length
L, contact line 2L on its two sides, has its forces in units of σ × 2L).

Model
-----
A thin leg (radius ≪ l_c) is held by the surface tension pulling along the interface on its
two sides; the pressure part is negligible. The interface leaves side k at inclination ψ_k
above the horizontal (ψ > 0: depressed), so with the rear (pushed) side L and the front side R
the force per unit contact length is

.. math::

    f_x = \\tfrac12(\\cos\\psi_R - \\cos\\psi_L),\\qquad f_z = \\tfrac12(\\sin\\psi_L + \\sin\\psi_R),

a resultant of at most 1 (the contact-line bound |F| ≤ σ P; Hu, Chan & Bush [1]_ call σ P the
maximum curvature force of a strider's legs). On a leg with advancing angle θ the contact line
may not pass the position where the interface meets the surface at θ: ψ_k ≤ θ (and ψ_k ≥ θ − π).
The largest thrust at vertical load u = f_z maximises f_x on the set
ψ_L, ψ_R ∈ [θ − π, θ] with f_z = u. Its stationary points satisfy sin(ψ_L + ψ_R) = 0 (Lagrange):
ψ_L + ψ_R = 0 gives f_x = 0, ψ_L + ψ_R = π the symmetric optimum

.. math:: h = \\sqrt{1-u^2}\\qquad(\\psi_R = \\arcsin u,\\ \\psi_L = \\pi - \\psi_R \\le \\theta),

which needs u ≥ sin θ on a leg with θ > 90°. Otherwise the optimum lies on the boundary, one side
at θ or at θ − π and the other from the constraint; for θ > 90° and u < sin θ it is

.. math:: h = \\tfrac12\\bigl(\\sqrt{1-(2u-\\sin\\theta)^2} - \\cos\\theta\\bigr)\\qquad(\\psi_L = \\theta).

:func:`max_thrust` evaluates the symmetric point and every boundary candidate (both arcsine
branches) and keeps the largest feasible one; where none is feasible the leg cannot carry u
at all and 0 is returned.

This is a quasi-static bound on what the meniscus can transmit; in a real stroke the force is
passed on to the liquid as momentum (vortices and waves, Hu, Chan & Bush [1]_, Hu & Bush [2]_),
and a static meniscus cannot hold a horizontal force on its own.

Validity: thin legs (pressure part of the force small), the leg's cross-section moving as a
whole across its length, the same angle limit on both sides (hysteresis only widens the front
side's range and does not raise the bound), stroke slow enough for the meniscus to follow.

References
----------
.. [1] D. L. Hu, B. Chan, J. W. M. Bush, "The hydrodynamics of water strider locomotion",
   Nature 424, 663 (2003).
.. [2] D. L. Hu, J. W. M. Bush, "The hydrodynamics of water-walking arthropods",
   J. Fluid Mech. 644, 5 (2010).
"""

from __future__ import annotations

import numpy as np


def max_thrust(u, theta):
    """Largest horizontal force per unit contact length [σ] at vertical load u [σ] (see module).

    Parameters
    ----------
    u : array_like
        Vertical force per unit contact length, in σ (0 ≤ u).
    theta : array_like [rad]
        Advancing contact angle of the leg.

    Returns
    -------
    ndarray or float
        h(u, θ) ≥ 0; 0 where u exceeds what the leg can carry vertically.

    >>> round(float(max_thrust(0.5, np.pi)), 6)          # sqrt(1 − 0.25)
    0.866025
    >>> round(float(max_thrust(0.0, np.radians(120))), 6)  # |cos 120°|
    0.5
    """
    u = np.asarray(u, dtype=float)
    th = np.asarray(theta, dtype=float)
    u, th = np.broadcast_arrays(u, th)
    lo, hi = th - np.pi, th
    tol = 1e-12

    def feasible(x):
        return (x >= lo - tol) & (x <= hi + tol)

    best = np.full(u.shape, -np.inf)

    def offer(a, b, ok):
        nonlocal best
        f = 0.5 * (np.cos(b) - np.cos(a))
        best = np.where(ok & feasible(a) & feasible(b) & (f > best), f, best)

    # interior stationary point psi_L + psi_R = pi
    inside = np.abs(u) <= 1.0
    b = np.arcsin(np.clip(u, -1.0, 1.0))
    offer(np.pi - b, b, inside)
    # one side on a boundary, the other from the constraint (all arcsine branches)
    for fixed in (lo, hi):
        v = 2.0 * u - np.sin(fixed)
        okv = np.abs(v) <= 1.0 + tol
        r = np.arcsin(np.clip(v, -1.0, 1.0))
        for other in (r, np.pi - r, -np.pi - r):
            offer(fixed, other, okv)   # rear side fixed
            offer(other, fixed, okv)   # front side fixed
    out = np.where(np.isfinite(best), np.maximum(best, 0.0), 0.0)
    out = np.where(u < 0, 0.0, out)
    return float(out) if out.ndim == 0 else out


def max_vertical(theta):
    """Largest vertical force per unit contact length [σ] of a thin leg: sin(min(θ, π/2)).

    >>> float(max_vertical(np.radians(150)))
    1.0
    """
    out = np.sin(np.minimum(np.asarray(theta, dtype=float), np.pi / 2))
    return float(out) if out.ndim == 0 else out
