"""2D meniscus checks (long rod, vertical wall) against published results and independent methods.

Independent methods used here: direct numerical integration of the 2D Young–Laplace equation
with SciPy (arclength form, shot in from the far field), trapezoid-rule quadrature of areas
along the parametric profile curves, and a brute-force plus ``scipy.optimize.minimize_scalar``
maximisation of the force written out from the geometry (pressure by ``scipy.integrate.quad``).
Lengths in capillary lengths l_c, forces per length in σ (see ``floatcalc.core.rod2d``).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.integrate import quad, solve_ivp
from scipy.optimize import minimize_scalar

import floatcalc as fc
from floatcalc.core import rod2d, wall2d

PI = math.pi
RNG_SEED = 20260601


def _trapezoid(y, x):
    return float(np.sum(0.5 * (y[1:] + y[:-1]) * np.diff(x)))


# ---------------------------------------------------------------------------------------------
# Direct integration of the 2D Young–Laplace equation (independent of any closed form)


def _shoot_from_far_field(psi_target: float, eps: float = 1e-9):
    """Integrate the 2D Young–Laplace equation in from the flat far field until the interface
    inclination (of the outward, +x direction, above the horizontal) reaches ``psi_target``.

    Scaled: curvature = height, i.e. dψ/dσ = z along the +x arclength σ. We march in −x
    (s = −σ) from x = 0 where the linearised solution z = ∓ε e^{-x} holds.
    Returns the dense solution and the end state (x, z).
    """
    sign = 1.0 if psi_target > 0 else -1.0  # depressed (z < 0) when the target is positive
    z0 = -sign * eps
    y0 = [0.0, z0, math.atan(-z0)]

    def rhs(s, y):
        x, z, psi = y
        return [-math.cos(psi), -math.sin(psi), -z]

    def hit(s, y):
        return y[2] - psi_target

    hit.terminal = True
    sol = solve_ivp(rhs, (0.0, 60.0), y0, events=hit, rtol=1e-12, atol=1e-14, dense_output=True,
                    method="DOP853")
    assert sol.status == 1, "the integration never reached the target inclination"
    x_end, z_end, _ = sol.y_events[0][0]
    return sol, x_end, z_end


@pytest.mark.parametrize("theta_deg", [0.0, 10.0, 30.0, 60.0, 89.0, 91.0, 120.0, 150.0, 180.0])
def test_wall_rise_matches_de_gennes_formula_and_ode(theta_deg):
    # Source: de Gennes, Brochard-Wyart & Quéré, Capillarity and Wetting Phenomena (2004):
    # rise at a vertical wall h = l_c sqrt(2 (1 − sin θ)), raised for θ < 90°, depressed above.
    # Second, independent: direct ODE integration of 2D Young–Laplace to the wall inclination
    # ψ = θ − 90° (rtol 1e-12); tolerance 1e-7 l_c (far-field start error ~ε, integration error).
    th = math.radians(theta_deg)
    published = math.copysign(math.sqrt(2.0 * (1.0 - math.sin(th))), math.cos(th))
    h = float(wall2d.contact_height(th))
    assert h == pytest.approx(published, abs=1e-12)
    _, _, z_wall = _shoot_from_far_field(th - PI / 2)
    assert z_wall == pytest.approx(h, abs=1e-7)
    # public API: SI, scaled by water's capillary length at 20 °C
    r = fc.wall_meniscus(f"{theta_deg} deg")
    assert r.contact_height.to("m").magnitude == pytest.approx(published * fc.water().lc, rel=1e-9)


@pytest.mark.parametrize("theta_deg", [0.0, 25.0, 70.0, 110.0, 165.0])
def test_wall_profile_matches_direct_ode_integration(theta_deg):
    # Independent method: the profile from scipy's ODE integration (above) against the closed
    # form of floatcalc.core.wall2d, compared as distance from the wall at equal heights.
    # Tolerance 1e-6 l_c in x for |z| > 1e-3 (below that the far-field start dominates).
    th = math.radians(theta_deg)
    sol, x_wall, z_wall = _shoot_from_far_field(th - PI / 2)
    s = np.linspace(0.0, sol.t_events[0][0], 4000)
    x, z, _ = sol.sol(s)
    keep = np.abs(z) > 1e-3
    x_ode = x[keep] - x_wall
    x_closed = wall2d.distance_from_wall(z[keep], z_wall)
    np.testing.assert_allclose(x_closed, x_ode, atol=1e-6)
    # and the drawing profile itself interpolates onto the same curve
    # (interpolated in height, which is monotone along the curve and smooth even where the
    # interface stands vertical at the wall for θ = 0)
    xp, zp = wall2d.profile(th, extent=4.0, n=400)
    zk = np.abs(z[keep])  # ODE samples run from the far field in to the wall: |z| increasing
    inside = np.abs(zp) > zk.min()
    x_on_ode = np.interp(np.abs(zp[inside]), zk, x_ode)
    np.testing.assert_allclose(xp[inside], x_on_ode, atol=1e-5)


def test_largest_meniscus_depth_is_two_capillary_lengths():
    # Source: PHYSICS.md / first integral of the 2D meniscus (de Gennes et al. 2004):
    # |h| ≤ 2 l_c, reached when the interface turns vertical-over (ψ = π). Checked by direct
    # ODE integration (tolerance 1e-7), and over random rod designs the contact-line depth at
    # the limit never exceeds 2 (and the lowest point never 2 + 2R).
    _, _, z_end = _shoot_from_far_field(PI - 1e-9)
    assert z_end == pytest.approx(-2.0, abs=1e-7)
    rng = np.random.default_rng(RNG_SEED)
    R = 10.0 ** rng.uniform(-4, 1, 20000)
    th = rng.uniform(0, PI, 20000)
    out = rod2d.limit_force(R, th)
    d_contact = out["depth"] - R * (1 - np.cos(out["phi"]))
    assert np.all(d_contact <= 2.0 + 1e-12)
    assert np.all(out["depth"] <= 2.0 + 2.0 * R + 1e-12)
    # a large, strongly non-wetting rod comes close to the bound (Vella et al. 2006, Fig. 3)
    big = rod2d.limit_force(10.0, PI)
    assert float(big["depth"] - 10.0 * (1 - np.cos(big["phi"]))) > 1.9


def test_contact_height_of_rod_meniscus_matches_ode():
    # Independent method: ODE integration to inclination ψ gives the contact-line depth that
    # the rod force law uses, d = 2 sin(ψ/2) (tolerance 1e-7 l_c).
    for psi in (0.3, 1.0, PI / 2, 2.4, 3.0):
        _, _, z = _shoot_from_far_field(psi)
        phi = psi + PI - 2.5  # θ = 2.5 rad
        *_, depth = rod2d.force_parts(phi, 0.0, 2.5)  # R = 0: depth is the contact-line depth
        assert -z == pytest.approx(float(depth), abs=1e-7)


# ---------------------------------------------------------------------------------------------
# Keller's theorem and the full force law by quadrature of areas


DESIGNS = [(0.05, 150.0, 0.7), (0.3, 110.0, 0.9), (1.0, 95.0, 1.0), (2.0, 160.0, 0.5),
           (0.5, 60.0, 0.6), (4.0, 30.0, 0.95), (0.1, 179.0, 0.3)]  # (R, θ deg, φ as fraction of limit... )


@pytest.mark.parametrize("R, theta_deg, frac", DESIGNS)
def test_keller_meniscus_area_equals_sin_psi(R, theta_deg, frac):
    # Source: Keller, Phys. Fluids 10, 3009 (1998): vertical surface-tension force equals the
    # weight of liquid displaced by the meniscus; in 2D the area on one side between z = 0 and
    # the interface is l_c² sin ψ. Area by the trapezoid rule along the parametric profile
    # (overhangs included: ∫ −z dx along the curve). Tolerance 1e-6 (quadrature, tail < 1e-8).
    th = math.radians(theta_deg)
    phi_lim = float(rod2d.limit(R, th))
    phi = (PI - th) + frac * (phi_lim - (PI - th)) if phi_lim > PI - th else 0.5 * phi_lim
    prof = rod2d.profile(R, th, phi, extent=25.0, n=40000)
    x, z = prof["right"]
    area = _trapezoid(-z, x)
    assert area == pytest.approx(math.sin(prof["psi"]), abs=1e-6)
    xl, zl = prof["left"]
    assert _trapezoid(-zl, -xl) == pytest.approx(area, abs=1e-12)  # mirror image


@pytest.mark.parametrize("R, theta_deg, frac", DESIGNS)
def test_total_rod_force_equals_displaced_liquid_area(R, theta_deg, frac):
    # Source: Keller (1998) extended to the whole body: total upward force per length (σ) equals
    # the area (l_c²) of liquid displaced between z = 0 and the wetted surface plus both
    # menisci. Areas by trapezoid quadrature along the drawn arc and profiles, compared with
    # the closed-form force law of Vella, Lee & Kim (2006) in rod2d. Tolerance 1e-6.
    th = math.radians(theta_deg)
    phi_lim = float(rod2d.limit(R, th))
    phi = frac * phi_lim
    prof = rod2d.profile(R, th, phi, extent=25.0, n=40000)
    x, z = prof["right"]
    meniscus = _trapezoid(-z, x)
    beta = np.linspace(-phi, phi, 20001)  # wetted arc, from the lowest point ±φ
    xa = R * np.sin(beta)
    za = prof["centre_z"] - R * np.cos(beta)
    column = _trapezoid(-za, xa)
    assert 2 * meniscus + column == pytest.approx(float(rod2d.force(phi, R, th)), abs=1e-6)


# ---------------------------------------------------------------------------------------------
# Limits and the limit search against an independent maximisation


@pytest.mark.parametrize("theta_deg", [0.0, 30.0, 60.0, 89.0, 90.0, 100.0, 135.0, 180.0])
def test_small_bond_limit_force_is_two_sigma_sin_theta_or_two_sigma(theta_deg):
    # Source: Vella, Lee & Kim (2006) and Bush & Hu (2006): for Bo → 0 the pressure part
    # vanishes and the largest force per length is 2σ sin ψ at its largest: 2σ when θ ≥ 90°
    # (ψ reaches 90°), 2σ sin θ below (ψ ≤ θ). At R = 1e-6 l_c the pressure part is O(R):
    # tolerance 1e-5.
    th = math.radians(theta_deg)
    expected = 2.0 if theta_deg >= 90 else 2.0 * math.sin(th)
    assert float(rod2d.limit_force(1e-6, th)["force"]) == pytest.approx(expected, abs=1e-5)


def _force_from_geometry(phi, R, theta):
    """Upward force per length [σ] written out from the geometry (Vella, Lee & Kim 2006, §2):

    two surface-tension pulls σ sin ψ at the contact lines, ψ = φ + θ − π, plus the hydrostatic
    pressure p = −ρ g z integrated over the wetted arc (by quad), its vertical component
    p cos β R dβ; the contact-line depth from the 2D first integral, d = 2 sin(ψ/2).
    """
    psi = phi + theta - PI
    d = 2.0 * math.sin(0.5 * psi)
    z_centre = -d + R * math.cos(phi)
    pressure, _ = quad(lambda b: -(z_centre - R * math.cos(b)) * math.cos(b) * R, -phi, phi,
                       epsabs=1e-13, epsrel=1e-12)
    return 2.0 * math.sin(psi) + pressure


def _brute_force_limit(R, theta):
    grid = np.linspace(0.0, PI, 181)
    f = np.array([_force_from_geometry(p, R, theta) for p in grid])
    k = int(np.argmax(f))
    if k == grid.size - 1:
        lo, hi = grid[-2], PI
    else:
        lo, hi = grid[max(k - 1, 0)], grid[k + 1]
    res = minimize_scalar(lambda p: -_force_from_geometry(p, R, theta), bounds=(lo, hi),
                          method="bounded", options={"xatol": 1e-11})
    cands = [(f[k], grid[k]), (-res.fun, res.x), (_force_from_geometry(PI, R, theta), PI)]
    return max(cands)


def test_limit_search_matches_bruteforce_maximisation_of_geometric_force():
    # Source: force law of Vella, Lee & Kim, Langmuir 22, 5979 (2006), written out above from
    # the geometry with the pressure by numerical quadrature, maximised by a 181-point grid
    # and scipy.optimize.minimize_scalar (bounded). Seeded random designs plus the corners.
    # Tolerance 1e-9 relative in the force (the maximum is flat, so the baseline's position
    # error ~1e-6 costs ~1e-12 in force), 2e-4 rad in position where the maximum is interior.
    rng = np.random.default_rng(RNG_SEED)
    designs = [(1e-4, 0.0), (1e-4, PI), (10.0, 0.0), (10.0, PI), (1.0, PI / 2)]
    designs += list(zip(10.0 ** rng.uniform(-4, 1, 16), rng.uniform(0, PI, 16)))
    for R, th in designs:
        f_ref, phi_ref = _brute_force_limit(R, th)
        out = rod2d.limit_force(R, th)
        assert float(out["force"]) == pytest.approx(f_ref, rel=1e-9, abs=1e-12), (R, th)
        if phi_ref < PI - 1e-3:
            assert float(out["phi"]) == pytest.approx(phi_ref, abs=2e-4), (R, th)


def test_force_parts_match_geometric_force_on_a_grid():
    # Independent method: the geometric force (quad) against rod2d.force at arbitrary φ, not
    # just at the limit. Tolerance 1e-10 (quadrature).
    rng = np.random.default_rng(RNG_SEED + 1)
    for _ in range(40):
        R, th, phi = 10.0 ** rng.uniform(-3, 1), rng.uniform(0, PI), rng.uniform(0, PI)
        assert float(rod2d.force(phi, R, th)) == pytest.approx(_force_from_geometry(phi, R, th),
                                                               rel=1e-10, abs=1e-12)


def test_newton_derivatives_match_finite_differences():
    # Independent method: central finite differences (step 1e-5 rad) of the geometric force
    # (quad) against the analytic df/dφ and d²f/dφ² that drive the limit search.
    # Tolerance: 1e-6 (first), 1e-4 (second derivative) absolute, from the step size.
    rng = np.random.default_rng(RNG_SEED + 2)
    h = 1e-5
    for _ in range(25):
        R, th = 10.0 ** rng.uniform(-3, 1), rng.uniform(0, PI)
        phi = rng.uniform(0.05, PI - 0.05)
        fm, f0, fp = (_force_from_geometry(phi + k * h, R, th) for k in (-1, 0, 1))
        d1, d2 = rod2d._dforce(phi, R, th)
        scale = max(1.0, R * R)
        assert float(d1) == pytest.approx((fp - fm) / (2 * h), abs=1e-6 * scale)
        assert float(d2) == pytest.approx((fp - 2 * f0 + fm) / h**2, abs=1e-3 * scale)


def test_pull_off_force_matches_bruteforce_minimum():
    # Independent method: with the receding angle, the largest adhesive (downward) force while
    # lifting is minus the minimum of the geometric force over all contact positions, found
    # here by a 2001-point scan and a bounded Brent refinement. Tolerance 1e-9 relative.
    for R_mm, th_r in ((0.2, 20.0), (0.5, 60.0), (1.0, 85.0), (0.1, 120.0)):
        liq = fc.water()
        th = math.radians(th_r)
        Rs = R_mm * 1e-3 / liq.lc
        grid = np.linspace(0.0, PI, 2001)
        f = np.array([_force_from_geometry(p, Rs, th) for p in grid])
        k = int(np.argmin(f))
        lo, hi = grid[max(k - 1, 0)], grid[min(k + 1, grid.size - 1)]
        res = minimize_scalar(lambda p: _force_from_geometry(p, Rs, th), bounds=(lo, hi),
                              method="bounded", options={"xatol": 1e-11})
        expected = max(0.0, -min(f[k], res.fun)) * liq.sigma * 0.05
        r = fc.rod(f"{R_mm} mm", "50 mm", "150 deg", receding_angle=f"{th_r} deg")
        assert r.pull_off_force.to("N").magnitude == pytest.approx(expected, rel=1e-9, abs=1e-15)


@pytest.mark.parametrize("theta_deg", [0.0, 20.0, 45.0, 80.0, 100.0, 135.0, 180.0])
def test_wall_lifted_area_balances_wilhelmy_pull(theta_deg):
    # Source: vertical force balance on the meniscus at a wall (de Gennes et al. 2004, ch. 1;
    # Wilhelmy 1863): σ cos θ per unit length = ρ g × (area between z = 0 and the interface),
    # i.e. area = cos θ l_c². Area by the trapezoid rule on the closed-form profile (extent 25,
    # tail below 1e-9); compared with cos θ and with the public force_per_length. Tol. 1e-6.
    th = math.radians(theta_deg)
    x, z = wall2d.profile(th, extent=25.0, n=20000)
    area = _trapezoid(z, x)
    assert area == pytest.approx(math.cos(th), abs=1e-6)
    w = fc.water()
    r = fc.wall_meniscus(f"{theta_deg} deg", liquid=w)
    assert r.force_per_length.to("N/m").magnitude == pytest.approx(area * w.rho * w.g * w.lc**2, abs=1e-6 * w.sigma)
