"""Solved 3D meniscus interaction model (floatcalc.core.interactions, floatcalc.core.inner2d).

Independent references named beside each check:

* exact 2D shared meniscus of parallel rods, turning-point first integral (Vella, Lee & Kim,
  Langmuir 22, 5979, 2006), as implemented in floatcalc.core.parallel2d (itself checked there
  against a direct solve_ivp integration of Young–Laplace);
* direct integration of the 2D Young–Laplace equation in arclength form with scipy's solve_ivp
  (independent of both quadratures);
* the closed-form 2D profile x(ψ) = −ln tan(ψ/4) − 2 cos(ψ/2) + const (far-field amplitude);
* the exact 2D single-rod law (floatcalc.core.rod2d, Vella, Lee & Kim 2006);
* the exact axisymmetric laws of floatcalc.core.round_bodies (shooting on Young–Laplace);
* Keller's theorem (Phys. Fluids 10, 3009, 1998) and the bounds of PHYSICS.md.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.integrate import solve_ivp

from floatcalc.core import inner2d, parallel2d, rod2d

# ---------------------------------------------------------------------------------------------
# The inner map (pure 1D/2D)


@pytest.mark.parametrize("psi", [0.05, 0.7, 1.5707963, 2.4, 3.0])
def test_isolated_amplitude_matches_closed_form_profile(psi):
    # Source: closed-form isolated 2D profile x(ψ) = −ln tan(ψ/4) − 2 cos(ψ/2) + const with
    # h = 2 sin(ψ/2) (first integral, Vella, Lee & Kim 2006). Far away h·e^{x − x_c} → A: the
    # check evaluates the profile itself at ψ = 1e-7 (tolerance: the O(ψ²) tail, 1e-12).
    h_c = 2 * math.sin(psi / 2)
    a, b = inner2d.amplitudes(h_c, psi)
    p_far = 1e-7
    x_far = (-math.log(math.tan(p_far / 4)) - 2 * math.cos(p_far / 2)) - (
        -math.log(math.tan(psi / 4)) - 2 * math.cos(psi / 2))
    A_profile = 2 * math.sin(p_far / 2) * math.exp(x_far)
    assert float(a) == pytest.approx(A_profile, rel=1e-9)
    assert abs(float(b)) < 1e-14


def _ode_distance(h0, psi0, stop):
    """Integrate dh/ds = −sin ψ, dn/ds = cos ψ, dψ/ds = −h from the contact state outward to
    the event ``stop`` ("turn": ψ = 0, "cross": h = 0). Returns (n, h, ψ) there."""
    def rhs(s, y):
        h, n, p = y
        return [-math.sin(p), math.cos(p), -h]

    ev = (lambda s, y: y[2]) if stop == "turn" else (lambda s, y: y[0])
    ev.terminal = True
    sol = solve_ivp(rhs, (0, 50), [h0, 0.0, psi0], events=ev, rtol=1e-12, atol=1e-14)
    return sol.y_events[0][0]


@pytest.mark.parametrize("h0,psi0", [(1.3, 0.9), (0.4, 0.2), (0.25, 1.2), (0.05, 0.6), (1.8, 2.5)])
def test_virtual_data_reproduce_turning_point_or_crossing(h0, psi0):
    # Independent method: solve_ivp on the 2D Young–Laplace equation in arclength form gives the
    # distance N to the turning point (E < 0) or to the zero crossing (E > 0) and the state
    # there; the virtual linear solution a e^{−n} + b e^{n} must have the same turning point
    # (h_m at n = N, zero slope) or the same zero crossing, and the same invariant.
    E = 2 * (1 - math.cos(psi0)) - h0 * h0
    a, b = (float(v) for v in inner2d.amplitudes(h0, psi0))
    if E < 0:
        h, n, p = _ode_distance(h0, psi0, "turn")
        assert n == pytest.approx(0.5 * math.log(a / b), abs=1e-8)          # turning point at N
        assert 2 * math.sqrt(a * b) == pytest.approx(h, rel=1e-8)         # of depth h_m
    else:
        h, n, p = _ode_distance(h0, psi0, "cross")
        assert n == pytest.approx(0.5 * math.log(-a / b), abs=1e-8)        # zero crossing at N
        assert 2 * math.sqrt(-a * b) == pytest.approx(math.sqrt(E), rel=1e-8)


@pytest.mark.parametrize("R,theta_deg,S", [(0.09, 115.0, 1.0), (0.3, 150.0, 1.5), (0.05, 100.0, 0.7),
                                           (0.2, 125.0, 3.0)])
def test_inner_map_exact_in_a_gap(R, theta_deg, S):
    # Source: exact shared meniscus of two parallel rods (turning-point first integral, Vella,
    # Lee & Kim 2006; floatcalc.core.parallel2d.turning_depth). In the gap the outer linear
    # solution is h_m cosh(n − N): the virtual data carried to the panel line at distance R from
    # the rod axis must be h_m cosh(S/2 − R) and −h_m sinh(S/2 − R). Tolerance 1e-6 (brief);
    # both quadratures are good to about 1e-10.
    th = math.radians(theta_deg)
    phis = np.linspace(math.pi - th + 0.05, math.pi - 0.05, 7)
    phis = phis[0.5 * S - R * np.sin(phis) > 1e-3]
    psi = phis + th - math.pi
    hm = parallel2d.turning_depth(psi, 0.5 * S - R * np.sin(phis))
    h = np.sqrt(hm * hm + 4 * np.sin(0.5 * psi) ** 2)
    hv, gv = inner2d.virtual_data(h, psi, R * (1 - np.sin(phis)))
    assert np.max(np.abs(hv - hm * np.cosh(0.5 * S - R))) < 1e-6
    assert np.max(np.abs(gv + hm * np.sinh(0.5 * S - R))) < 1e-6


def test_inner_map_small_slope_is_identity():
    # Linear limit (h'' = h): the virtual data are the data themselves to O(ψ³).
    h = np.array([1e-4, -2e-4, 3e-5])
    psi = np.array([2e-4, 1e-4, -3e-4])
    hv, gv = inner2d.virtual_data(h, psi)
    assert np.allclose(hv, h, rtol=0, atol=1e-10)
    assert np.allclose(gv, -psi, rtol=0, atol=1e-10)
