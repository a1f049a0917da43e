"""End effects of a horizontal rod of finite length L: the meniscus wraps round the ends.

Scaled variables: lengths in l_c, forces in σ l_c (per length in σ). Conventions as in
:mod:`floatcalc.core.rod2d`.

Model
-----
Along the straight part the exact 2D solution holds. At each end the contact line turns round
the end of the rod; we take its plan shape as a half-circle of radius equal to the contact
half-width :math:`w = R\\sin\\phi`, so the footprint is a stadium. Outside the contact line the
meniscus is small a few l_c away and obeys the linearised equation ∇²h = h. On the straight
sides it decays as :math:`h_0 e^{-(|y|-w)}`; round each end (half-plane beyond the end) as the
axisymmetric :math:`h_0 K_0(r)/K_0(w)`, with h_0 the contact-line depth.

By Keller's theorem [2]_ the vertical surface-tension force equals the weight of the liquid
displaced by the meniscus outside the contact line. Per unit length of a straight side the
displaced area is ∫ h_0 e^{-y} dy = h_0 (in the exact 2D solution: sin ψ). Round one end, over
a half-disc,

.. math:: A_{end} = \\int_w^\\infty \\frac{h_0 K_0(r)}{K_0(w)}\\,\\pi r\\,dr
          = \\pi h_0\\, \\frac{w K_1(w)}{K_0(w)} .

So one end adds the surface-tension force of a straight piece of rod of length
:math:`\\ell_e = (\\pi/2)\\, w K_1(w)/K_0(w)` (both sides of a straight piece give 2 h_0 per
length). The end faces are vertical, so they add no vertical pressure force. Using the exact
2D surface-tension part :math:`f_{st} = 2\\sin\\psi` in place of 2 h_0:

.. math:: F(L) = f_{2D}\\,L + 2 F_{end}, \\qquad F_{end} = \\min(0, \\ell_e(w)\\, 2\\sin\\psi) .

Limits: for w → 0, ℓ_e → (π/2)/(ln(2/w) − γ_E), a slowly vanishing end; for w ≫ 1, ℓ_e → πw/2
(the half-circle's perimeter πw behaves as a straight edge, and a straight piece of rod has two
sides). The relative correction is 2ℓ_e f_st/(f_2D L), falling as 1/L, and the long-rod limit
F → f_2D L is recovered as L → ∞.

Safe side (what the rod law uses): the cap above is an upper estimate that exceeds the
contact-line bound of thin rods several times, and the solved 3D ends of
:mod:`floatcalc.core.interactions` come out negative at the limit; :func:`end_force` clips the
end term to [−2w, 0], so a depressed rod carries f_2D L (see :func:`end_force` for the
remaining overstatement against the solved ends, at most about 0.06 σ l_c per end).

Validity: ends independent of each other (L ≳ 2 l_c), L ≫ w, rod horizontal, contact line at
the 2D position all round (the end cap's own contact position shift is neglected), small end
meniscus slope (linearised outer region). Checked in the tests against a finite-difference
solution of ∇²h = h round a stadium: the end term agrees within 0.2 % at w = 0.5 l_c and 4 %
at w = 0.2 l_c (grid staircase included); the test allows 8 %.

References
----------
.. [1] D. Vella, D.-G. Lee, H.-Y. Kim, Langmuir 22, 5979 (2006) (2D rod).
.. [2] J. B. Keller, "Surface tension force on a partly submerged body", Phys. Fluids 10,
   3009 (1998).
"""

from __future__ import annotations

import numpy as np

from . import rod2d

#: Shortest length [l_c] for which the two ends are taken as independent.
MIN_LENGTH = 2.0


def end_length(w):
    """Equivalent extra length ℓ_e(w) = (π/2) w K₁(w)/K₀(w) [l_c] that one end adds.

    Parameters
    ----------
    w : array_like [l_c]
        Contact half-width R sin φ, > 0.

    >>> round(float(end_length(50.0)) / (np.pi * 50 / 2), 2)   # wide: half the half-circle
    1.01
    """
    from scipy.special import k0e, k1e

    w = np.maximum(np.asarray(w, dtype=float), 1e-300)
    return 0.5 * np.pi * w * k1e(w) / k0e(w)


def force_parts(phi, R, theta, L):
    """Force [σ l_c] of a rod of length L at contact position φ, split into parts.

    Returns
    -------
    f_2d, f_end, depth : ndarray
        The 2D force times L, the two end terms 2 F_end, and the lowest-point depth [l_c].
    """
    f_st, f_p, depth = rod2d.force_parts(phi, R, theta)
    return (f_st + f_p) * L, 2.0 * end_force(phi, R, f_st), depth


def end_force(phi, R, f_st):
    """Vertical surface-tension force of ONE end [σ l_c], on the safe side of the solved ends.

    The linearised cap above gives ℓ_e(w) f_st, several times the contact-line bound for thin
    rods (ℓ_e f_st ≈ 1 against 2w ≈ 0.1 for w = 0.05 l_c). The solved 3D meniscus of
    :mod:`floatcalc.core.interactions` (flat end face with Young's angle on it and pinning at
    its rim; checked against the independent finite-element reference in the linear range,
    tests/reference/test_interactions_vs_fem.py) finds the ends of a depressed rod at its limit
    *negative*, −0.01 to −0.05 σ l_c per end for R = 0.02–0.4 l_c, θ = 100–150°: near an end the
    meniscus spreads in 3D and the near-end sections pass their optimum at a shallower depth.
    The end term is therefore clipped to [−2w, 0] (w = R sin φ; the lower edge is the contact
    line across the end face, PHYSICS.md): a depressed rod's ends add nothing, and the rod law
    exceeds the solved limit by the solved ends' deficit only, at most 0.06 σ l_c per end in the
    cases measured (0.1–0.5 % of rods 7–37 l_c long, about 1.5 % at 2 l_c;
    tests/core/test_interactions.py). Rods in a device that come within reach of a neighbour
    carry the solved value itself (:mod:`floatcalc.device.interact`).

    >>> float(end_force(np.pi / 2, 0.05, 2.0))
    0.0
    >>> float(end_force(np.pi / 2, 0.05, -2.0)) >= -2 * 0.05
    True
    """
    w, f_st = np.broadcast_arrays(np.asarray(R) * np.sin(phi), np.asarray(f_st, dtype=float))
    out = np.zeros(w.shape)
    # where f_st >= 0 the clipped term is 0 (ℓ_e ≥ 0): the Bessel functions only where it is not
    need = ~(f_st >= 0.0)
    if need.all():
        return np.clip(end_length(w) * f_st, -2.0 * w, 0.0)
    if need.any():
        wn = w[need]
        out[need] = np.clip(end_length(wn) * f_st[need], -2.0 * wn, 0.0)
    return out


def limit(R: float, theta: float, L: float, n: int = 4001):
    """Largest force [σ l_c] of a finite rod and its contact position and depth.

    The maximum of F(φ) = f_2D L + 2 F_end over 0 ≤ φ ≤ π, found on a dense grid and refined
    by a parabola through the best three points.

    >>> R, th = 0.1, np.radians(120)
    >>> long = limit(R, th, 1e4)["force"] / 1e4
    >>> bool(abs(long / rod2d.limit_force(R, th)["force"] - 1) < 1e-3)
    True
    """
    phi = np.linspace(0.0, np.pi, n)
    a, b, _ = force_parts(phi, R, theta, L)
    F = a + b
    k = int(np.argmax(F))
    if 0 < k < n - 1:
        f0, f1, f2 = F[k - 1], F[k], F[k + 1]
        den = f0 - 2 * f1 + f2
        dk = 0.5 * (f0 - f2) / den if den < 0 else 0.0
        p = phi[k] + dk * (phi[1] - phi[0])
    else:
        p = phi[k]
    a, b, d = force_parts(p, R, theta, L)
    return {"phi": float(p), "force": float(a + b), "end_part": float(b), "depth": float(d)}


def limit_many(R, theta, L, n: int = 4001, stride: int = 40):
    """Contact position φ of :func:`limit` for arrays of rods at once (same grid, same result).

    :func:`limit` takes the largest F(φ) on the grid ``linspace(0, π, n)`` and refines it by a
    parabola. F has one maximum on [0, π] (it rises, then falls), so the grid maximum lies
    within one coarse step of the maximum over every ``stride``-th grid point; only that
    window of the fine grid is evaluated here, and the same parabola is taken.

    Parameters
    ----------
    R, theta, L : array_like (broadcast together)
        Radius [l_c], contact angle [rad], length [l_c].

    Returns
    -------
    phi : ndarray [rad]

    >>> R, th, L = np.array([0.05, 0.1]), np.radians([115.0, 150.0]), np.array([7.0, 20.0])
    >>> bool(np.allclose(limit_many(R, th, L), [limit(*a)["phi"] for a in zip(R, th, L)], rtol=0, atol=1e-14))
    True
    """
    R, theta, L = np.broadcast_arrays(*(np.asarray(a, dtype=float) for a in (R, theta, L)))
    shape = R.shape
    R, theta, L = (a.reshape(-1, 1) for a in (R, theta, L))
    grid = np.linspace(0.0, np.pi, n)

    def F(i):
        a, b, _ = force_parts(grid[i], R, theta, L)
        return a + b

    coarse = np.unique(np.r_[np.arange(0, n, stride), n - 1])
    kc = coarse[np.argmax(F(coarse[None, :]), axis=1)]
    win = np.clip(kc[:, None] + np.arange(-stride - 8, stride + 9), 0, n - 1)
    k = win[np.arange(win.shape[0]), np.argmax(F(win), axis=1)]
    inner = (k > 0) & (k < n - 1)
    kk = np.clip(k, 1, n - 2)[:, None] + np.array([-1, 0, 1])
    f = F(kk)
    f0, f1, f2 = f[:, 0], f[:, 1], f[:, 2]
    den = f0 - 2 * f1 + f2
    with np.errstate(divide="ignore", invalid="ignore"):
        dk = np.where(den < 0, 0.5 * (f0 - f2) / np.where(den < 0, den, -1.0), 0.0)
    p = np.where(inner, grid[k] + dk * (grid[1] - grid[0]), grid[k])
    return p.reshape(shape)
