"""N parallel rods sharing their menisci (floatcalc.core.parallel2d, floatcalc.device.parallel).

Independent checks: direct integration of the 2D Young–Laplace equation in arclength form with
scipy's solve_ivp (turning-point height, gap width, Keller's theorem between the rods), a
quadrature of the hydrostatic pressure over the wetted arc, and the single-rod solution of
floatcalc.core.rod2d (itself checked against Vella, Lee & Kim 2006 in tests/reference).
"""

from __future__ import annotations

import json
import math

import numpy as np
import pytest
from scipy.integrate import quad, solve_ivp

from floatcalc.cli import main
from floatcalc.core import parallel2d as p2
from floatcalc.core import rod2d
from floatcalc.device.parallel import parallel_rods
from floatcalc.errors import InputError

CASES = [(0.09, 115.0, 1.0), (0.3, 150.0, 1.5), (0.05, 100.0, 0.4), (0.2, 125.0, 3.0)]


def _ode_from_mid_gap(h_m, psi_end):
    """Integrate dψ/ds = h, dh/ds = sin ψ, dx/ds = cos ψ, dA/ds = h cos ψ from the turning point.

    Returns x, h and the meniscus area A = ∫ h dx at the point where ψ reaches psi_end.
    Signs: a depressed gap (h_m > 0) has ψ, h > 0; a raised one is its mirror image.
    """
    sgn = 1.0 if psi_end >= 0 else -1.0

    def rhs(s, y):
        x, h, psi, A = y
        return [math.cos(psi), math.sin(psi), h, h * math.cos(psi)]

    def hit(s, y):
        return abs(y[2]) - abs(psi_end)

    hit.terminal = True
    sol = solve_ivp(rhs, (0.0, 50.0), [0.0, sgn * abs(h_m), 0.0, 0.0], events=hit,
                    rtol=1e-11, atol=1e-13, max_step=0.01)
    x, h, psi, A = sol.y_events[0][0]
    return x, h, A


@pytest.mark.parametrize("R, theta_deg, S", CASES)
def test_inner_meniscus_matches_direct_ode_integration(R, theta_deg, S):
    """Turning-point depth, contact height and gap width agree with solve_ivp to 1e-6 l_c."""
    th = math.radians(theta_deg)
    phi, c, f, hm = p2.inner_side(R, th, S, n=401)
    for k in np.linspace(5, len(phi) - 5, 6).astype(int):
        psi = phi[k] + th - math.pi
        if abs(psi) < 1e-3:
            continue
        x, h, A = _ode_from_mid_gap(hm[k], psi)
        assert x == pytest.approx(0.5 * S - R * math.sin(phi[k]), abs=1e-6)
        assert h == pytest.approx(c[k] + R * math.cos(phi[k]), abs=1e-6)
        # Keller's theorem (Phys. Fluids 10, 3009, 1998) for the gap: the vertical pull
        # sin ψ of the inner contact line equals the liquid displaced between it and mid-gap.
        assert A == pytest.approx(math.sin(psi), abs=1e-6)


@pytest.mark.parametrize("R, theta_deg, S", CASES[:2])
def test_side_force_is_pull_plus_pressure_by_quadrature(R, theta_deg, S):
    """Side force = sin ψ + ∫ (depth) cos α R dα over the wetted half-arc (direct quadrature)."""
    th = math.radians(theta_deg)
    phi, c, f, hm = p2.inner_side(R, th, S, n=201)
    for k in (20, 100, 180):
        if k >= len(phi):
            continue
        press, _ = quad(lambda a: (c[k] + R * math.cos(a)) * math.cos(a) * R, 0.0, phi[k], epsabs=1e-13)
        assert f[k] == pytest.approx(math.sin(phi[k] + th - math.pi) + press, abs=1e-10)


@pytest.mark.parametrize("N", [2, 3, 5])
def test_far_apart_rods_add_up(N):
    """At 12 l_c spacing the shared menisci no longer interact: N times one rod (rod2d)."""
    R, th = 0.1, math.radians(120)
    one = float(rod2d.limit_force(R, th)["force"])
    lim = p2.row_limit(R, th, 12.0, N)
    assert lim["force"] == pytest.approx(N * one, rel=2e-4)


def test_single_rod_is_rod2d():
    lim = p2.row_limit(0.2, math.radians(140), 1.0, 1)
    assert lim["force"] == pytest.approx(float(rod2d.limit_force(0.2, math.radians(140))["force"]), rel=1e-12)


def test_per_rod_limit_falls_as_rods_close_in():
    """Closer rods share one meniscus: the per-rod limit falls monotonically below 2 l_c spacing.

    Near touching, thin rods act as one body with one pair of outer contact lines, so the pair
    carries about as much as one rod (per rod about half; asymptotic argument, R → 0).
    """
    R, th = 0.03, math.radians(115)
    one = float(rod2d.limit_force(R, th)["force"])
    ratios = [p2.row_limit(R, th, S, 2)["force"] / (2 * one) for S in (2.1 * R, 0.3, 0.6, 1.0, 2.0)]
    assert all(a < b for a, b in zip(ratios, ratios[1:]))
    assert ratios[0] < 0.6


def test_parallel_api_and_overlap_error():
    r = parallel_rods("0.25 mm", "40 mm", "115 deg", 3, "2 mm")
    assert r.max_force.to("N").magnitude == pytest.approx(3 * r.per_leg_max_force.to("N").magnitude)
    assert r.per_leg_max_force < r.isolated_per_leg_max_force
    with pytest.raises(InputError, match=r"^spacing: must exceed twice the radius .* got 0.5 mm$"):
        parallel_rods("0.25 mm", "40 mm", "115 deg", 3, "0.5 mm")


def test_cli_count_spacing_json(capsys):
    code = main(["leg", "--radius", "0.2mm", "--length", "50mm", "--contact-angle", "115deg",
                 "--count", "4", "--spacing", "3mm", "--json"])
    d = json.loads(capsys.readouterr().out)
    assert code == 0
    assert d["max_force_N"] == pytest.approx(4 * d["per_leg_max_force_N"])
    code = main(["leg", "--radius", "0.2mm", "--length", "50mm", "--contact-angle", "115deg",
                 "--count", "4", "--spacing", "0.4mm"])
    err = capsys.readouterr().err
    assert code == 2 and len(err.strip().splitlines()) == 1 and "overlap" in err
