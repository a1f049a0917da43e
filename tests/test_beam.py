"""Checks of the flexible-leg core (floatcalc.core.beam) against independent solutions.

Sources: Hetényi, Beams on Elastic Foundation (1946) for the linear Winkler beam; the exact 2D
rod law of floatcalc.core.rod2d (Vella, Lee & Kim 2006) integrated with scipy.integrate.quad
for rigid legs; a closed-form linear finite-beam solution built here from the general solution
e^{±βs}(cos βs, sin βs) of EI y'''' + k y = 0.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.integrate import quad
from scipy.optimize import brentq

from floatcalc.core import beam, rod2d

R = 0.04            # wire radius [l_c] (about 0.11 mm in water)
THETA = math.radians(150.0)


def _zero_force_depth_and_stiffness(R, theta):
    """Depth where the rod law gives f = 0 and df/dD there, by a central finite difference of
    rod2d.force and rod2d.force_parts in the contact position φ (independent of beam.Foundation)."""
    p0 = brentq(lambda p: rod2d.force(p, R, theta), 0.0, rod2d.limit(R, theta), xtol=1e-15)
    D0 = rod2d.force_parts(p0, R, theta)[2]
    h = 1e-5
    fp, fm = rod2d.force(p0 + h, R, theta), rod2d.force(p0 - h, R, theta)
    Dp, Dm = rod2d.force_parts(p0 + h, R, theta)[2], rod2d.force_parts(p0 - h, R, theta)[2]
    return float(D0), float((fp - fm) / (Dp - Dm))


def test_small_rod_stiffness_matches_analytic_expansion():
    # Analytic small-depth expansion (thin non-wetting rod, R → 0, θ = 180°): f = 2 sin ψ,
    # D = 2 sin(ψ/2), so df/dD → 2 at D = 0. The finite difference must approach it.
    _, k = _zero_force_depth_and_stiffness(1e-6, math.pi)
    assert k == pytest.approx(2.0, rel=1e-4)


@pytest.mark.parametrize("end, factor", [("hinged", 2.0), ("clamped", 1.0)])
def test_linear_limit_matches_hetenyi_semi_infinite_beam(end, factor):
    """Hetényi (1946), semi-infinite beam on a Winkler foundation, end load P:
    free (moment-free) end deflects y0 = 2 P β / k; an end held horizontal deflects y0 = P β / k
    (general end-load-and-moment solution with zero end slope). β = (k / 4EI)^(1/4)."""
    D_float, k = _zero_force_depth_and_stiffness(R, THETA)
    fd = beam.Foundation(R, THETA)          # weightless leg: it floats where f = 0
    B = 1.0
    beta = (k / (4.0 * B)) ** 0.25
    L = 12.0 / beta                          # e^{-12}: semi-infinite for this purpose
    y0 = 1e-3                                # small push: f'' y0 / (2k) ~ 1e-3 nonlinearity
    out = beam.solve(L, B, 0.0, D_float + y0, fd, n=400, end=end)
    P_hetenyi = k * y0 / (factor * beta)
    # Tolerance 0.2 %: the remaining foundation nonlinearity at y0 = 1e-3 l_c and the O(h²)
    # discretisation error are both well below it.
    assert out["V"][0] == pytest.approx(P_hetenyi, rel=2e-3)


@pytest.mark.parametrize("beta_L", [0.8, 2.0, 3.5])
def test_linear_finite_leg_matches_closed_form(beta_L):
    """Finite clamped leg on a linear foundation (small push y0) against the closed-form solution
    of EI y'''' + k y = 0 with y(0) = y0, y'(0) = 0, y''(L) = y'''(L) = 0 (Hetényi 1946, ch. on
    beams of finite length; the 4×4 system is solved here numerically)."""
    D_float, k = _zero_force_depth_and_stiffness(R, THETA)
    fd = beam.Foundation(R, THETA)
    B = 1.0
    beta = (k / (4.0 * B)) ** 0.25
    L = beta_L / beta
    y0 = 1e-3

    def basis(x, d):
        # d-th derivative of the four functions e^{±βx} cos βx, e^{±βx} sin βx
        out = []
        for sgn in (1.0, -1.0):
            z = complex(sgn * beta, beta)        # e^{zx}: real part -> cos, imag -> sin
            val = z**d * np.exp(z * x)
            out += [val.real, val.imag]
        return np.array(out)

    A = np.array([basis(0.0, 0), basis(0.0, 1), basis(L, 2), basis(L, 3)])
    c = np.linalg.solve(A, np.array([y0, 0.0, 0.0, 0.0]))
    # Shear at the clamp, y measured downward: y'' = -M/EI and M' = -V give V = EI y'''.
    P_closed = B * float(basis(0.0, 3) @ c)
    out = beam.solve(L, B, 0.0, D_float + y0, fd, n=400)
    assert out["V"][0] == pytest.approx(P_closed, rel=2e-3)


def test_stiff_horizontal_leg_matches_rigid_rod_law():
    # A horizontal clamp with huge stiffness keeps the leg flat: limit = L × rod-law limit
    # (rod2d.limit_force: Vella, Lee & Kim 2006). Weightless, so the clamp force is the
    # liquid force. Residual bending is q L^4 / (8 B) ~ 1e-9 l_c: tolerance 1e-7.
    fd = beam.Foundation(R, THETA)
    L = 10.0
    out = beam.limit(L, 1e12, 0.0, fd, n=100)
    expected = L * float(rod2d.limit_force(R, THETA)["force"])
    assert out["V"][0] == pytest.approx(expected, rel=1e-7)


def test_stiff_tilted_leg_peaks_where_its_ends_carry_equal_force():
    # Rigid straight leg tilted down by α, wholly wetted: with D its deepest point and
    # H = L sin α, V(D) = (1/sin α) ∫_{D−H}^{D} f dD', so dV/dD = (f(D) − f(D − H)) / sin α and
    # the maximum has f equal at both ends, the deep end on the descending branch of the rod law
    # (derived here; independent of the continuation). The ends are found with brentq and the
    # integral with scipy.integrate.quad over the contact position φ on the exact law
    # (rod2d, Vella, Lee & Kim 2006), not the spline. The deepest point then lies past the rod
    # law's limit depth but short of breakthrough.
    fd = beam.Foundation(R, THETA)
    L, alpha = 5.0, math.radians(5.0)
    H = L * math.sin(alpha)
    lim = rod2d.limit_force(R, THETA)
    p_lim = float(lim["phi"])
    depth = lambda p: float(rod2d.force_parts(p, R, THETA)[2])  # noqa: E731
    force = lambda p: float(rod2d.force(p, R, THETA))  # noqa: E731

    def p_top(p_bot):
        return brentq(lambda p: depth(p) - (depth(p_bot) - H), 0.0, p_bot, xtol=1e-15)

    p_bot = brentq(lambda p: force(p) - force(p_top(p)), p_lim, 0.5 * (p_lim + math.pi), xtol=1e-15)

    def integrand(p):
        f_st, f_p, _ = rod2d.force_parts(p, R, THETA)
        dD = math.cos(0.5 * (p + THETA - math.pi)) + R * math.sin(p)  # dD/dφ, differentiated by hand
        return (f_st + f_p) * dD

    expected = quad(integrand, p_top(p_bot), p_bot, epsabs=1e-13)[0] / math.sin(alpha)
    assert depth(p_top(p_bot)) > 0.0                  # wholly wetted, as the derivation assumes
    assert float(lim["depth"]) < depth(p_bot) < fd.d_b  # past the local limit, short of breakthrough
    out = beam.limit(L, 1e12, alpha, fd, n=200)
    assert out["criterion"] == "clamp-force maximum"
    assert out["V"][0] == pytest.approx(expected, rel=1e-6)
    assert beam.max_depth(out["y"]) == pytest.approx(depth(p_bot), abs=1e-5)
    rig = beam.rigid_limit(L, fd, np.full(201, alpha))
    assert rig["force"] == pytest.approx(expected, rel=1e-6)
    # the limit of earlier versions (deepest point at the local limit depth) is lower
    assert out["onset"]["V"] < out["V"][0]


def test_limit_converges_under_grid_refinement():
    """Limit force of a flexible leg (βL ≈ 6, strongly bent) at N, 2N, 4N intervals.

    Observed: the differences shrink by about 4 per doubling (second order, as the trapezoidal
    rule should give), and the change from N = 400 to 800 is below 1e-4 relative."""
    fd = beam.Foundation(R, THETA, weight=0.03)
    L, B = 10.0, 1.0
    F = [beam.limit(L, B, 0.0, fd, n=n)["V"][0] for n in (200, 400, 800)]
    d1, d2 = abs(F[1] - F[0]), abs(F[2] - F[1])
    order = math.log2(d1 / d2)
    assert 1.7 < order < 2.3
    assert d2 / abs(F[2]) < 1e-4


def test_smoothing_widths_change_a_crossing_leg_little():
    # Numerical choices, not physics: the heights over which a dry section meets the liquid
    # (SNAP_RAMP), a lifted wetted one passes to the receding law (BLEND) and a law's load
    # falls to 0 above its first contact (DRY_RAMP). A stiff leg entering the liquid from above
    # at 30° crosses the surface at its limit; halving all three changes its limit by less
    # than 1e-3 (observed 1e-5: the part above the surface is dry, only the snap-in band is
    # affected). A leg lying wholly in the liquid is not affected beyond round-off.
    fd = beam.Foundation(R, THETA, weight=0.03, theta_receding=math.radians(120.0))
    alpha = math.radians(30.0)
    old = beam.DRY_RAMP, beam.SNAP_RAMP, beam.BLEND
    try:
        crossing = beam.limit(12.0, 3000.0, alpha, fd, n=300)
        wet = beam.limit(12.0, 1e5, 0.0, fd, n=100)
        beam.DRY_RAMP, beam.SNAP_RAMP, beam.BLEND = (w / 2 for w in old)
        crossing_half = beam.limit(12.0, 3000.0, alpha, fd, n=300)
        wet_half = beam.limit(12.0, 1e5, 0.0, fd, n=100)
    finally:
        beam.DRY_RAMP, beam.SNAP_RAMP, beam.BLEND = old
    assert crossing["y"][0] < -old[1]   # the clamp is out of the liquid: the leg crosses
    assert crossing_half["V"][0] == pytest.approx(crossing["V"][0], rel=1e-3)
    assert np.min(wet["y"]) > 0.0
    assert wet_half["V"][0] == pytest.approx(wet["V"][0], rel=1e-9)


def _scan(L, B, alpha, fd, n, step):
    """Brute force: clamp pushed down from first touch in fixed steps with the plain solver,
    each state started from the last; history flags updated by the rule stated in
    Foundation (wetted once at or below the surface, dry again once let go). Returns the clamp
    depths, clamp forces and deepest points, stopping at the first state past breakthrough."""
    th0 = np.full(n + 1, alpha)
    y_nat = beam.natural_depths(th0, L)
    Dc = -beam.max_depth(y_nat)
    wet = (Dc + y_nat) >= -1e-12
    sol = beam._solve_from_stiff(L, B, alpha, Dc, fd.bind(wet), n=n, th0=th0, end="clamped")
    out = []
    while True:
        md = beam.max_depth(sol["y"])
        if md > fd.d_b:
            return np.array(out)
        out.append((Dc, sol["V"][0], md))
        wet = fd.update_wet(wet, sol["y"])
        Dc += step
        sol = beam.solve(L, B, alpha, Dc, fd.bind(wet), n=n, th0=th0, guess=sol["U"])


@pytest.mark.parametrize("L, B, alpha_deg", [(8.0, 2.0, 8.0), (10.0, 1.0, 0.0), (5.0, 1e4, 5.0)])
def test_limit_is_the_largest_force_of_a_brute_force_scan(L, B, alpha_deg):
    # Independent of the continuation logic (tangent predictor, regula falsi on dV/dD_c): a
    # scan in steps of 0.002 l_c. At an interior maximum the scan's best lies within
    # ½|V''| δ² of it; at breakthrough the force still rises, so the scan's last state lies
    # within V' δ below it. Tolerance 1e-3 relative covers both for these legs.
    fd = beam.Foundation(R, THETA, weight=0.03)
    alpha = math.radians(alpha_deg)
    out = beam.limit(L, B, alpha, fd, n=160)
    scan = _scan(L, B, alpha, fd, 160, 0.002)
    k = int(np.argmax(scan[:, 1]))
    assert out["V"][0] >= scan[k, 1] * (1 - 1e-9)
    assert out["V"][0] == pytest.approx(scan[k, 1], rel=1e-3)
    assert out["clamp_depth"] == pytest.approx(scan[k, 0], abs=0.01)
    if out["criterion"] == "local breakthrough":
        assert k == len(scan) - 1 and beam.max_depth(out["y"]) == pytest.approx(fd.d_b, abs=1e-8)
    else:
        assert 0 < k < len(scan) - 1 and abs(out["dV"]) < 1e-8 * abs(out["V"][0])
    # the limit of earlier versions (deepest point at the local limit depth) is never higher
    assert out["onset"]["V"] <= out["V"][0]
    assert beam.max_depth(out["onset"]["y"]) == pytest.approx(fd.d_lim, abs=1e-8)
    for key in ("theta", "M", "V", "y"):
        assert np.all(np.isfinite(out[key]))


def test_breakthrough_depth_matches_integrated_young_laplace():
    # Independent of the closed-form profile used by beam.breakthrough: integrate the 2D
    # Young–Laplace equation in arclength s outward from the contact point with
    # scipy.integrate.solve_ivp (lengths in l_c, d = depth below the undisturbed surface):
    #   dx/ds = cos ψ,  dd/ds = −sin ψ,  dψ/ds = −d  (curvature = hydrostatic pressure),
    # starting at d = 2 sin(ψ₀/2) (2D first integral). At φ_b the innermost point of the
    # interface (where it is vertical) must reach the symmetry plane x = 0, where the two
    # menisci meet above the rod; a little before φ_b it must not.
    from scipy.integrate import solve_ivp

    for r, th in ((0.04, 150.0), (0.1, 120.0), (0.3, 175.0)):
        t = math.radians(th)
        phi_b = beam.breakthrough(r, t)

        def x_min(phi, r=r, t=t):
            psi = phi + t - math.pi
            ev = lambda s, u: u[2] - 0.5 * math.pi  # noqa: E731  (the interface is vertical)
            ev.terminal = True
            sol = solve_ivp(lambda s, u: [math.cos(u[2]), -math.sin(u[2]), -u[1]], (0.0, 10.0),
                            [r * math.sin(phi), 2.0 * math.sin(0.5 * psi), psi], events=ev,
                            rtol=1e-11, atol=1e-12)
            return float(sol.y_events[0][0][0])

        assert x_min(phi_b) == pytest.approx(0.0, abs=1e-7)
        assert x_min(phi_b - 0.02) > 0.0
        fd = beam.Foundation(r, t)
        assert fd.phi_lim < fd.phi_b < math.pi and fd.d_lim < fd.d_b


def test_hysteresis_law_is_continuous_and_receding_pulls_harder():
    # Model statements of Foundation checked numerically: the law of a lifted wetted section
    # joins the advancing law at the surface, and with a smaller receding angle a lifted
    # wetted section pulls down harder at the same height (PHYSICS.md: lifting recedes).
    adv = beam.Foundation(R, THETA)
    rec = beam.Foundation(R, THETA, theta_receding=math.radians(110.0))
    wet = np.array([True])
    for fd in (adv, rec):
        for y0 in (0.0, -beam.BLEND, -beam.SNAP_RAMP, fd.d0_r, fd.d_off):
            for w in (True, False):
                lo = fd.liquid(np.array([y0 - 1e-9]), np.array([w]))[0][0]
                hi = fd.liquid(np.array([y0 + 1e-9]), np.array([w]))[0][0]
                assert abs(hi - lo) < 1e-7
    y = np.linspace(adv.d0 + 1e-3, -1e-3, 50)
    f_a = adv.liquid(y, np.ones_like(y, bool))[0]
    f_r = rec.liquid(y, np.ones_like(y, bool))[0]
    assert np.all(f_a < 0.0)                                     # a lifted section pulls down
    assert np.all(f_r[y < -beam.BLEND] < f_a[y < -beam.BLEND])   # receding pulls harder
    # beyond the advancing law's reach the receding law still holds on (d0_r = −2 cos(θ_r/2))
    assert rec.d0_r == pytest.approx(-2.0 * math.cos(math.radians(55.0)), abs=1e-12)
    # a never-wetted lifted section carries nothing above the snap-in band
    assert rec.liquid(np.array([-0.1]), np.array([False]))[0][0] == 0.0


def test_receding_law_pulls_at_least_as_hard_as_a_pinned_line():
    # Between advancing and receding the contact line can stay pinned (PHYSICS.md). A section
    # pushed to the surface (advancing, contact at φ_p) and then lifted keeps φ_p while the
    # angle falls: on that pinned branch, with the Vella, Lee & Kim force at (φ_p, ψ),
    #   y = 2 sin(ψ/2) + R(1 − cos φ_p),  f = 2 sin ψ + R²(φ_p − sin φ_p cos φ_p) + 2R sin φ_p · 2 sin(ψ/2).
    # The model uses the receding law instead, which must not pull less (safe side).
    th_r = math.radians(110.0)
    fd = beam.Foundation(R, THETA, theta_receding=th_r)
    p_p = brentq(lambda p: rod2d.force_parts(p, R, THETA)[2], 0.0, math.pi)
    psi = np.linspace(p_p + th_r - math.pi, p_p + THETA - math.pi, 200)[1:-1]
    y = 2 * np.sin(psi / 2) + R * (1 - math.cos(p_p))
    f_pin = 2 * np.sin(psi) + R**2 * (p_p - math.sin(p_p) * math.cos(p_p)) + 2 * R * math.sin(p_p) * 2 * np.sin(psi / 2)
    keep = y < -beam.BLEND
    f_model = fd.liquid(y[keep], np.ones(keep.sum(), bool))[0]
    assert np.all(f_model <= f_pin[keep] + 1e-12)


def test_foundation_interpolant_matches_exact_law():
    # Spline of the rod law against the exact parametric law at off-table points.
    fd = beam.Foundation(R, THETA)
    phi = np.linspace(0.05, fd.phi_lim, 37)
    f_st, f_p, D = rod2d.force_parts(phi, R, THETA)
    f, _ = fd.force(D)
    assert np.max(np.abs(f - (f_st + f_p))) < 1e-7
    # out of the liquid: no load
    assert fd.force(np.array([fd.d0 - 1.0]))[0][0] == 0.0


def test_singular_jacobian_is_a_convergence_error(monkeypatch):
    """A singular banded Jacobian (forced here) ends the elastica solve with ConvergenceError,
    which the callers' retries catch, not with numpy's LinAlgError; the stacked solve of many
    clamp depths marks only the singular system as failed."""
    import numpy as np
    import scipy.linalg

    from floatcalc.core import beam
    from floatcalc.errors import ConvergenceError

    def singular(*args, **kwargs):
        raise np.linalg.LinAlgError("singular matrix")

    fd = beam.Foundation(0.05, np.radians(150))
    monkeypatch.setattr(scipy.linalg, "solve_banded", singular)
    with pytest.raises(ConvergenceError):
        beam.solve(20.0, 1.0, 0.0, 0.5, fd)
    ab = np.zeros((3, 2 * beam._BAND + 1, 8))
    out = beam._solve_blocks(ab, np.ones((3, 8)))
    assert out.shape == (3, 8) and np.all(np.isnan(out))
