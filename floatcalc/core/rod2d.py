"""Exact 2D meniscus around a long horizontal rod, in scaled variables.

Lengths are in capillary lengths l_c = sqrt(σ/(ρg)); forces per unit rod length in σ.

Geometry and conventions (see ``PHYSICS.md`` of the project): undisturbed surface z = 0, z up.
The rod of radius ``R`` has its contact lines at angular position ``phi`` measured from the
lowest point of the section; the contact angle ``theta`` is measured through the liquid. The
interface leaves the contact line at inclination

.. math:: \\psi = \\phi + \\theta - \\pi,

positive for a depressed meniscus. The 2D first integral of Young–Laplace for a meniscus that
flattens far away gives the contact-line depth below z = 0 as :math:`d = 2\\sin(\\psi/2)`, and the
upward force per unit length (Vella, Lee & Kim, Langmuir 22, 5979, 2006) is

.. math::

    f = \\underbrace{2\\sin\\psi}_{\\text{surface tension}}
      + \\underbrace{R^2(\\phi - \\sin\\phi\\cos\\phi) + 2R\\sin\\phi\\,d}_{\\text{pressure}}.

The depth of the rod's lowest point is :math:`D = d + R(1 - \\cos\\phi)`, which grows
monotonically with φ on 0 ≤ φ ≤ π, so φ parametrises the force–depth curve.

Validity: a long rigid rod (end effects neglected), static, a meniscus free to flatten on both
sides (no neighbour closer than a few l_c), 0 ≤ θ ≤ π, any R > 0.
"""

from __future__ import annotations

import numpy as np

PI = np.pi


def contact_inclination(phi, theta):
    """Interface inclination ψ = φ + θ − π at the contact line [rad]."""
    return np.asarray(phi) + np.asarray(theta) - PI


def force_parts(phi, R, theta):
    """Surface-tension and pressure parts of the force per length, and the depth.

    Parameters
    ----------
    phi : array_like [rad]
        Contact-line position from the lowest point, 0 ≤ φ ≤ π.
    R : array_like [l_c]
        Rod radius.
    theta : array_like [rad]
        Contact angle.

    Returns
    -------
    f_st, f_p, depth : ndarray
        Surface-tension part [σ], pressure part [σ] and depth of the lowest point [l_c].

    >>> f_st, f_p, D = force_parts(np.pi, 0.0, np.pi / 2)
    >>> float(round(f_st, 12)), float(round(D, 12))
    (2.0, 1.414213562373)
    """
    phi = np.asarray(phi, dtype=float)
    R = np.asarray(R, dtype=float)
    half = 0.5 * (phi + theta - PI)
    s2, c2 = np.sin(half), np.cos(half)
    sp, cp = np.sin(phi), np.cos(phi)
    d = 2.0 * s2
    f_st = 4.0 * s2 * c2
    f_p = R * R * (phi - sp * cp) + 2.0 * R * sp * d
    depth = d + R * (1.0 - cp)
    return f_st, f_p, depth


def force(phi, R, theta):
    """Total upward force per unit length [σ] at contact position φ (see module docstring)."""
    f_st, f_p, _ = force_parts(phi, R, theta)
    return f_st + f_p


def _dforce(phi, R, theta):
    """df/dφ and d²f/dφ² (analytic)."""
    half = 0.5 * (phi + theta - PI)
    s2, c2 = np.sin(half), np.cos(half)
    sp, cp = np.sin(phi), np.cos(phi)
    cpsi = 1.0 - 2.0 * s2 * s2
    spsi = 2.0 * s2 * c2
    d1 = 2.0 * cpsi + 2.0 * R * R * sp * sp + 4.0 * R * cp * s2 + 2.0 * R * sp * c2
    d2 = -2.0 * spsi + 4.0 * R * R * sp * cp - 5.0 * R * sp * s2 + 4.0 * R * cp * c2
    return d1, d2


def _dforce_psi(psi, R, sth, cth):
    """df/dφ and d²f/dφ² as :func:`_dforce`, at inclination ψ with sin θ, cos θ given.

    Uses φ = π − θ + ψ, so sin φ = sin θ cos ψ − cos θ sin ψ and cos φ = −(cos θ cos ψ +
    sin θ sin ψ): two transcendental calls per point instead of four (the search's hot loop).
    """
    s2, c2 = np.sin(0.5 * psi), np.cos(0.5 * psi)
    spsi = 2.0 * s2 * c2
    cpsi = 1.0 - 2.0 * s2 * s2
    Rsp = R * (sth * cpsi - cth * spsi)
    Rcp = -R * (cth * cpsi + sth * spsi)
    d1 = 2.0 * cpsi + 2.0 * Rsp * Rsp + 4.0 * Rcp * s2 + 2.0 * Rsp * c2
    d2 = -2.0 * spsi + 4.0 * Rsp * Rcp - 5.0 * Rsp * s2 + 4.0 * Rcp * c2
    return d1, d2


def limit(R, theta, *, tol: float = 1e-10, max_iter: int = 60):
    """Contact position of the largest upward force, for arrays of designs at once.

    The force f(φ) has at most one interior maximum on [0, π] (its derivative changes sign at
    most as − + −), and df/dφ > 0 at ψ = 0 (φ = π − θ). So the maximum is either at φ = π
    (when df/dφ ≥ 0 there) or the unique root of df/dφ in [π − θ, π], found here by Newton's
    method safeguarded by bisection, vectorised over all designs.

    Iteration stops when the Newton step falls below ``tol``; since Newton converges
    quadratically the position is then good to about tol², and the force, stationary there, to
    round-off.

    Parameters
    ----------
    R : array_like [l_c]
        Rod radius, > 0.
    theta : array_like [rad]
        Advancing contact angle, 0 ≤ θ ≤ π.

    Returns
    -------
    phi_max : ndarray [rad]
        Contact position at the limit.

    >>> float(limit(1e-6, np.pi) / np.pi * 180)  # tiny rod, θ = 180°: ψ = 90° at the limit
    90.00...
    """
    R, theta = np.broadcast_arrays(np.asarray(R, dtype=float), np.asarray(theta, dtype=float))
    shape = R.shape
    R = R.ravel()
    theta = theta.ravel()
    # df/dφ at φ = π (sin φ = 0, cos φ = −1, ψ = θ), in closed form.
    d_hi = 2.0 * np.cos(theta) - 4.0 * R * np.sin(0.5 * theta)
    x = np.full_like(R, PI)  # designs whose force still rises at φ = π keep the limit there
    idx = np.flatnonzero(d_hi < 0.0)
    r, t = R[idx], theta[idx]
    sth, cth = np.sin(t), np.cos(t)
    # Iterate on ψ = φ + θ − π in the bracket [0, θ] (that is φ in [π − θ, π]).
    lo, hi = np.zeros_like(r), t.copy()
    # Start from the small-rod optimum ψ = π/2 where it lies inside the bracket.
    xa = np.minimum(0.5 * PI, t)
    for _ in range(max_iter):
        if idx.size == 0:
            break
        g, gp = _dforce_psi(xa, r, sth, cth)
        pos = g > 0.0
        lo = np.where(pos, xa, lo)
        hi = np.where(pos, hi, xa)
        newton = xa - g / np.where(gp < 0.0, gp, -1.0)
        ok = (gp < 0.0) & (newton >= lo) & (newton <= hi)
        xn = np.where(ok, newton, 0.5 * (lo + hi))
        going = np.abs(xn - xa) > tol
        x[idx] = xn + (PI - t)
        if not going.all():  # drop converged designs from the working set
            idx, r, t, sth, cth, lo, hi, xn = (a[going] for a in (idx, r, t, sth, cth, lo, hi, xn))
        xa = xn
    else:  # pragma: no cover - never seen; the bracket halves at least every other step
        from ..errors import ConvergenceError

        raise ConvergenceError(f"rod limit search did not converge in {max_iter} iterations")
    return x.reshape(shape)


def limit_force(R, theta):
    """Largest upward force per length [σ] and its parts and depth, for arrays of designs.

    Returns
    -------
    dict with ndarray entries ``phi``, ``force``, ``surface_tension``, ``pressure``, ``depth``.
    """
    phi = limit(R, theta)
    f_st, f_p, depth = force_parts(phi, R, theta)
    return {"phi": phi, "force": f_st + f_p, "surface_tension": f_st, "pressure": f_p, "depth": depth}


def force_depth_curve(R: float, theta: float, n: int = 200, phi_end: float | None = None):
    """Force–depth curve from first contact (φ = 0) to ``phi_end`` (default: the limit).

    Returns a dict of arrays ``phi``, ``depth`` [l_c], ``surface_tension``, ``pressure``,
    ``force`` [σ]. Points are spaced evenly in φ.
    """
    if phi_end is None:
        phi_end = float(limit(R, theta))
    phi = np.linspace(0.0, phi_end, n)
    f_st, f_p, depth = force_parts(phi, R, theta)
    return {"phi": phi, "depth": depth, "surface_tension": f_st, "pressure": f_p, "force": f_st + f_p}


def _x_of_psi(psi):
    """Horizontal-distance potential F(ψ) = ln tan(ψ/4) + 2 cos(ψ/2) for 0 < ψ ≤ π."""
    return np.log(np.tan(0.25 * psi)) + 2.0 * np.cos(0.5 * psi)


def free_meniscus(psi0: float, x0: float, extent: float = 6.0, n: int = 200):
    """Closed-form profile of a 2D meniscus that flattens far away, on the side x > x0.

    The interface leaves (x0, −2 sin(ψ0/2)) at inclination ψ0 (positive: depressed) and
    flattens as x → ∞. From the first integral, ``z = −2 sin(ψ/2)`` and
    ``x − x0 = F(|ψ0|) − F(|ψ|)`` with ``F(ψ) = ln tan(ψ/4) + 2 cos(ψ/2)``; the profile is
    parametrised by ψ, so overhanging interfaces (|ψ0| > π/2) come out right.

    Returns
    -------
    x, z : ndarray [l_c]
        From the contact point out to ``x0 + extent`` (the last point lies on z ≈ 0 or at the
        extent).
    """
    a = abs(float(psi0))
    sign = 1.0 if psi0 >= 0 else -1.0
    if a < 1e-12:
        x = np.linspace(x0, x0 + extent, 2)
        return x, np.zeros_like(x)
    # Smallest ψ still inside the extent: F(a) − F(ψ_end) = extent.
    F0 = _x_of_psi(a)
    # F(ψ) ≈ ln(ψ/4) + 2 for small ψ; solve approximately then clip.
    psi_end = min(a, 4.0 * np.exp(F0 - extent - 2.0))
    psi = np.concatenate([np.linspace(a, min(a, 0.5), n // 2, endpoint=False),
                          np.geomspace(min(a, 0.5), max(psi_end, 1e-12), n - n // 2)])
    x = x0 + F0 - _x_of_psi(psi)
    z = -sign * 2.0 * np.sin(0.5 * psi)
    return x, z


def profile(R: float, theta: float, phi: float, extent: float = 6.0, n: int = 200):
    """Rod section and meniscus on both sides at contact position φ, for drawing.

    Coordinates have the rod centre at x = 0 and the undisturbed surface at z = 0.

    Returns
    -------
    dict with ``right`` and ``left`` (x, z arrays of each meniscus), ``centre_z``,
    ``contact`` ((x, z) of the right contact point), ``depth`` of the lowest point [l_c].
    """
    psi = phi + theta - PI
    d = 2.0 * np.sin(0.5 * psi)
    xc = R * np.sin(phi)
    xr, zr = free_meniscus(psi, xc, extent=extent, n=n)
    return {
        "right": (xr, zr),
        "left": (-xr, zr),
        "centre_z": -d + R * np.cos(phi),
        "contact": (xc, -d),
        "depth": d + R * (1.0 - np.cos(phi)),
        "psi": psi,
    }
