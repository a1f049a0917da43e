"""Axisymmetric meniscus core: convergence, independent re-solves, table accuracy, invariants."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy.integrate import solve_ivp
from scipy.optimize import brentq
from scipy.special import i0e, i1e, k0e, k1e

from floatcalc.core import axisym as ax
from floatcalc.core import axisym_table as tab

RNG = np.random.default_rng(20261201)


@pytest.mark.slow
def test_far_field_start_and_steps_do_not_matter():
    """Moving the far-field start (ψ_s 1e-6 → 1e-7) or doubling the steps changes nothing at
    the stated tolerance (1e-10 relative): the start is 'far enough away'."""
    r = np.exp(RNG.uniform(np.log(1e-4), np.log(100.0), 40))
    p = RNG.uniform(0.01, 3.1, 40)
    base = ax.solve(r, p)["height"]
    moved = ax.solve(r, p, psi_s=1e-7)["height"]
    finer = ax.solve(r, p, steps=2 * ax.STEPS)["height"]
    assert np.max(np.abs(moved / base - 1)) < 1e-10
    assert np.max(np.abs(finer / base - 1)) < 1e-10


def _graph_outer(rc, psi, r_far=None):
    """Independent solve: z(r) as a graph, d/dr of (z, z') with scipy solve_ivp (LSODA/DOP853),
    integrated inward from a K0 far field placed at r_far, amplitude found by brentq so that the
    slope at r_c is tan ψ. Applies where the interface is a graph (|ψ| < 90°)."""
    r_far = rc + 14.0 if r_far is None else r_far

    def rhs(r, y):
        z, zp = y
        q = 1.0 + zp * zp
        return [zp, z * q**1.5 - zp * q / r]

    def slope_at_rc(logA):
        A = math.exp(logA)
        y0 = [-A * k0e(r_far) * math.exp(-r_far), A * k1e(r_far) * math.exp(-r_far)]
        sol = solve_ivp(rhs, (r_far, rc), y0, method="DOP853", rtol=1e-12, atol=1e-16)
        return sol.y[:, -1]

    g = lambda la: slope_at_rc(la)[1] - math.tan(psi)  # noqa: E731
    la0 = math.log(math.tan(psi) / (k1e(rc) * math.exp(-rc)))  # linear-theory amplitude
    la = brentq(g, la0 - 3.0, la0 + 3.0, xtol=1e-14)
    return slope_at_rc(la)[0]


def _graph_inner(rc, psi):
    """Independent interior solve as a graph: from the centre (series z0 + z0 r²/4), solve_ivp
    outward, brentq on the centre height so the slope at r_c is −tan ψ (depressed interior)."""

    def rhs(r, y):
        z, zp = y
        q = 1.0 + zp * zp
        return [zp, z * q**1.5 - zp * q / r]

    def end(z0):
        r0 = 1e-6 * rc
        y0 = [z0 * (1 + r0 * r0 / 4), z0 * r0 / 2]
        sol = solve_ivp(rhs, (r0, rc), y0, method="DOP853", rtol=1e-12, atol=1e-16)
        return sol.y[:, -1]

    z0 = brentq(lambda z0: end(z0)[1] + math.tan(psi), -50.0, -1e-12, xtol=1e-15)
    return end(z0)[0]


@pytest.mark.parametrize("rc,psi", [(0.05, 0.3), (0.5, 0.8), (2.0, 1.0), (8.0, 0.4), (1.0, -0.7)])
def test_direct_matches_independent_graph_solve_outer(rc, psi):
    """Direct (arclength, batch RK4) vs an independent scipy solve_ivp shooting in r (small to
    moderate slopes, where both formulations apply). Tolerance 1e-8: solve_ivp at rtol 1e-12."""
    ours = float(ax.contact_height_direct(rc, psi))
    ref = _graph_outer(rc, abs(psi)) * (1 if psi >= 0 else -1)
    assert ours == pytest.approx(ref, rel=1e-8)


@pytest.mark.parametrize("rc,psi", [(0.3, 0.5), (1.0, 1.0), (5.0, 0.3)])
def test_direct_matches_independent_graph_solve_inner(rc, psi):
    """Interior (I0-regular) solution vs independent solve_ivp from the centre; 1e-7 (inner
    shots are converged to about 1e-9)."""
    ours = float(ax.contact_height_direct(rc, psi, side="inner"))
    ref = _graph_inner(rc, psi)
    assert ours == pytest.approx(ref, rel=1e-7)


def test_overhanging_profile_satisfies_arclength_equations():
    """An overhanging exterior meniscus (ψ = 150°): integrate the arclength form with solve_ivp
    from the returned contact state over one capillary length and compare with the returned
    profile (independent integrator; outward integration is accurate over this short span)."""
    rc, psi = 0.5, math.radians(150)
    prof = ax.profile(rc, psi)
    zc = prof["height"]
    y0 = [rc, zc, psi]  # tangent angle ψ_o = ψ = 150°: the interface leaves inward-upward
    sol = solve_ivp(ax.arclength_rhs, (0, 1.0), y0, method="DOP853", rtol=1e-12, atol=1e-14,
                    dense_output=True)
    s = np.linspace(0, 1.0, 50)
    r_s, z_s, _ = sol.sol(s)
    assert np.min(r_s) < rc  # it does overhang
    # distance of each integrated point to the returned polyline
    pts = np.column_stack([prof["r"], prof["z"]])
    dist = [np.min(np.hypot(pts[:, 0] - a, pts[:, 1] - b)) for a, b in zip(r_s, z_s)]
    seg = np.max(np.hypot(np.diff(pts[:, 0]), np.diff(pts[:, 1])))
    assert max(dist) < seg  # within one polyline segment everywhere
    assert max(dist) < 5e-3


def test_keller_volume_equals_contact_line_force():
    """Keller (1998): weight of the meniscus volume equals the vertical surface-tension force
    2π r_c sin ψ. Volume by the trapezoid rule on the returned profile (outer: out to where the
    K0 tail is negligible; inner: centre to contact line), force from the contact line."""
    for rc, psi, side in [(0.2, 1.2, "outer"), (3.0, 2.0, "outer"), (1.0, 0.6, "inner"), (4.0, 1.8, "inner")]:
        p = ax.profile(rc, psi, side=side, extent=25.0)
        # signed dr along the curve: overhanging parts (r running backwards) subtract correctly
        vol = np.trapezoid(2 * np.pi * p["r"] * (-p["z"]), p["r"])
        assert vol == pytest.approx(2 * np.pi * rc * math.sin(psi), rel=2e-4)
        assert p["volume"] == pytest.approx(2 * np.pi * rc * math.sin(psi), rel=1e-9)


def test_linear_limit_small_inclination():
    """Small slope: the linearised solution z = −tan ψ K0(r)/K1(r) (textbook Bessel solution of
    ∇²z = z), error O(ψ²)."""
    rc = np.array([0.01, 0.3, 3.0])
    psi = 1e-3
    z = ax.contact_height_direct(rc, psi)
    lin = -math.tan(psi) * k0e(rc) / k1e(rc)
    assert np.allclose(z, lin, rtol=5e-6)
    zi = ax.contact_height_direct(rc, psi, side="inner")
    assert np.allclose(zi, -math.tan(psi) * i0e(rc) / i1e(rc), rtol=5e-6)


def test_table_matches_direct_on_random_points():
    """Table vs direct tight-tolerance solve, ≤ 1e-6 relative on seeded random off-grid points
    across the table's whole range (both signs of ψ)."""
    n = 300
    r = np.exp(RNG.uniform(np.log(tab.R_MIN), np.log(tab.R_MAX), n))
    p = RNG.uniform(-tab.PSI_TABLE, tab.PSI_TABLE, n)
    # add the corners and edges of the range
    r = np.concatenate([r, [tab.R_MIN, tab.R_MAX, tab.R_MIN, tab.R_MAX, 0.5]])
    p = np.concatenate([p, [tab.PSI_TABLE, tab.PSI_TABLE, 0.01, -0.01, 3.05]])
    assert np.all(tab.in_table(r, p))
    err = np.abs(ax.contact_height(r, p) / ax.contact_height_direct(r, p) - 1)
    assert err.max() <= 1e-6


def test_fallback_outside_table_is_direct():
    r, p = np.array([200.0, 5e-5, 0.7]), np.array([1.0, 0.5, 3.13])
    assert not np.any(tab.in_table(r, p))
    assert np.allclose(ax.contact_height(r, p), ax.contact_height_direct(r, p), rtol=1e-12)


def test_table_file_small():
    assert tab.TABLE_PATH.stat().st_size < 1_000_000


@settings(max_examples=200, deadline=None)
@given(lnr=st.floats(math.log(1e-4), math.log(100.0)), psi=st.floats(0.01, 1.5))
def test_depth_bounded_by_2d_and_monotone(lnr, psi):
    """Invariants (table): 0 < depth < 2D value 2 sin(ψ/2) (azimuthal curvature only lowers
    it), depth rises with ψ and with r_c, and z_c is odd in ψ."""
    r = math.exp(lnr)
    d = -float(ax.contact_height(r, psi))
    assert 0 < d < 2 * math.sin(psi / 2)
    assert -float(ax.contact_height(r, psi + 0.01)) > d
    assert -float(ax.contact_height(r * 1.01, psi)) > d
    assert float(ax.contact_height(r, -psi)) == pytest.approx(d, rel=1e-12)


def test_shooting_restarts_a_collapsed_secant():
    """A coarse shot that lands exactly on the target (f = 0) made the next secant step zero, so
    the two iterates coincided and the fine iterations never moved (ConvergenceError). Found
    through a small ring footpad (R_r = 0.01, b = 0.005 l_c, θ = 150°), whose inner line sits
    here. At ψ ≈ 3e-5 the linearised interior solution z = −tan ψ I0(r)/I1(r) (textbook Bessel
    solution of ∇²z = z, regular at the centre) is exact to O(ψ²) ≈ 1e-9 relative."""
    rc, psi = 0.007500142130666311, 3.2823360376355026e-05
    z = float(ax.solve(rc, psi, side="inner", steps=300)["height"])
    assert z == pytest.approx(-math.tan(psi) * i0e(rc) / i1e(rc), rel=1e-8)


def test_shooting_near_psi_pi_accepts_the_round_off_floor():
    """Inside a tiny ring at ψ → π (r_c = 2e-4, clamped to π − 1e-6) the shooting residual
    stalls at round-off (~3e-12 in ln r) above the 1e-13 tolerance, and the solver raised
    ConvergenceError at some step counts (so ring("0.0002 l_c", "0.0001 l_c", 180°) failed).
    Reference: an independent shooting in the arclength form from the centre (series start
    z ≈ z0 (1 + r²/4)), scipy DOP853 at rtol 1e-13 up to the event ψ_o = −(π − 1e-6), brentq on
    ln(−z0) so that r there is r_c. Tolerance 1e-7: the Richardson pair at 1000 steps agrees
    with the 4000-step one to ~1e-9 here."""
    rc, target = 2e-4, math.pi - 1e-6

    def at_event(z0):
        r0 = 1e-6 / abs(z0)
        y0 = [r0, z0 * (1 + r0 * r0 / 4), z0 * r0 / 2]
        ev = lambda s, y: y[2] + target  # noqa: E731
        ev.terminal = True
        sol = solve_ivp(ax.arclength_rhs, (0, 50), y0, method="DOP853", rtol=1e-13, atol=1e-15, events=ev)
        return sol.y_events[0][0]

    lz = brentq(lambda lz: at_event(-math.exp(lz))[0] - rc, 4.0, 5.5, xtol=1e-13)
    ref = at_event(-math.exp(lz))[1]
    for steps in (1000, 2000):
        assert float(ax.solve(rc, math.pi, side="inner", steps=steps)["height"]) == pytest.approx(ref, rel=1e-7)
    coarse = float(ax.solve(rc, math.pi, side="inner", steps=300, tight=False)["height"])  # ring's first guesses
    assert coarse == pytest.approx(ref, rel=1e-3)
