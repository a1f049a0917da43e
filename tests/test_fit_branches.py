"""Push-in and pull-out branches: advancing and receding angles (and hysteresis) from one data set.

Data are made by an independent construction of the rod law (the same one as in
tests/test_fit.py: geometry of a circular section, contact-line depth from the 2D first integral
of Young–Laplace h₀ = 2 l_c sin(ψ/2) (de Gennes, Brochard-Wyart & Quéré, Capillarity and Wetting
Phenomena, 2004), pressure force by scipy.integrate.quad), at chosen contact positions φ (no
inversion). The push-in branch follows the advancing angle, the pull-out branch the receding
angle (PHYSICS.md: a line moving down a body advances, moving up it recedes).
"""

from __future__ import annotations

import io
import math

import numpy as np
import pytest
from scipy.integrate import quad

from floatcalc.liquids import water
from floatcalc.studies.fit import fit, fit_csv

R, L = 0.25e-3, 0.06
GEO = {"radius": R, "length": L}
TA, TR = 115.0, 95.0


def _reference(phi, theta, sigma, rho, g):
    lc = math.sqrt(sigma / (rho * g))
    psi = phi + theta - math.pi
    h0 = 2 * lc * math.sin(psi / 2)
    zc = -h0 + R * math.cos(phi)
    pressure, _ = quad(lambda a: -rho * g * (zc - R * math.cos(a)) * math.cos(a) * R, -phi, phi,
                       epsabs=1e-14, epsrel=1e-12)
    return -(zc - R), L * (2 * sigma * math.sin(psi) + pressure)


def _branch(theta_deg, phis):
    liq = water()
    return np.array([_reference(p, math.radians(theta_deg), liq.sigma, liq.rho, liq.g) for p in phis])


def _cycle(n_push=30, n_pull=30):
    push = _branch(TA, np.linspace(0.02, math.pi - 0.05, 500))
    k = int(np.argmax(push[:, 1]))
    k0 = int(np.argmax(push[:, 0] >= 0.0))
    push = push[np.linspace(k0, int(0.9 * k), n_push).round().astype(int)]   # first touch to 90 % of the limit
    turn = push[-1, 0]
    pull = _branch(TR, np.linspace(0.03, math.pi - 0.05, 800))
    pull = pull[pull[:, 0] <= turn][::-1]                                     # from the turn up to near pull-off
    pull = pull[np.linspace(0, len(pull) - 1, n_pull).round().astype(int)]
    D = np.concatenate([push[:, 0], pull[:, 0]])
    F = np.concatenate([push[:, 1], pull[:, 1]])
    return D, F, np.array(["push"] * n_push + ["pull"] * n_pull)


def test_advancing_and_receding_recovered():
    D, F0, direction = _cycle()
    # noise-free: both angles to 1e-5° (two implementations of the same law agree)
    exact = fit("rod", D, F0 + 1e-9 * (-1.0) ** np.arange(D.size), geometry=GEO, intervals="wald")
    assert exact.contact_angle.magnitude == pytest.approx(TA, abs=1e-5)
    assert exact.receding_angle.magnitude == pytest.approx(TR, abs=1e-5)
    assert exact.push_points == 30 and exact.pull_points == 30
    # seeded noise, 99.9 % intervals (one case; a 95 % one misses 1 time in 20 by design)
    F = F0 + np.random.default_rng(8).normal(0, 0.03e-3, D.size)
    r = fit("rod", D, F, geometry=GEO, force_uncertainty="0.03 mN", confidence=0.999)
    lo, hi = r.contact_angle_ci.magnitude
    assert lo < TA < hi and hi - lo < 5.0
    lo, hi = r.receding_angle_ci.magnitude
    assert lo < TR < hi and hi - lo < 5.0
    lo, hi = r.hysteresis_ci.magnitude
    assert lo < TA - TR < hi
    d = r.to_dict()
    for k in ("receding_angle_deg", "receding_angle_ci_deg", "hysteresis_deg", "hysteresis_ci_deg"):
        assert k in d
    # the same rows told apart by an explicit direction column give the same fit
    r2 = fit("rod", D, F, geometry=GEO, force_uncertainty="0.03 mN", confidence=0.999, direction=direction)
    assert r2.receding_angle.magnitude == pytest.approx(r.receding_angle.magnitude, rel=1e-12)


def test_direction_column_in_csv_and_shuffled_rows():
    D, F0, direction = _cycle(20, 20)
    F = F0 + np.random.default_rng(9).normal(0, 0.03e-3, D.size)
    order = np.random.default_rng(1).permutation(D.size)   # rows out of recording order
    text = "# invented\ndepth [mm],force [mN],direction\n" + "".join(
        f"{D[i] * 1e3:.9g},{F[i] * 1e3:.9g},{direction[i]}\n" for i in order)
    r = fit_csv("rod", io.StringIO(text), geometry=GEO, force_uncertainty="0.03 mN")
    ref = fit("rod", D, F, geometry=GEO, force_uncertainty="0.03 mN", direction=direction)
    assert r.contact_angle.magnitude == pytest.approx(ref.contact_angle.magnitude, rel=1e-9)
    assert r.receding_angle.magnitude == pytest.approx(ref.receding_angle.magnitude, rel=1e-9)
    # without the column, shuffled rows would be split wrongly by the depth order: warned about
    text2 = "depth [mm],force [mN]\n" + "".join(f"{D[i] * 1e3:.9g},{F[i] * 1e3:.9g}\n" for i in order)
    r3 = fit_csv("rod", io.StringIO(text2), geometry=GEO, force_uncertainty="0.03 mN", intervals="wald")
    assert any("changes direction" in w for w in r3.warnings)
    assert any("larger than the stated force uncertainty" in w for w in r3.warnings)


def test_bad_direction_value_names_its_line():
    from floatcalc.errors import InputError

    text = "depth [mm],force [mN],direction\n0.1,1,push\n0.2,2,push\n0.3,3,sideways\n0.4,4,push\n"
    with pytest.raises(InputError) as exc:
        fit_csv("rod", io.StringIO(text), geometry=GEO)
    assert "line 4" in str(exc.value) and "push or pull" in str(exc.value)


def test_pull_only_data_fit_the_receding_angle_alone():
    D, F0, direction = _cycle(20, 25)
    pull = direction == "pull"
    r = fit("rod", D[pull], F0[pull] + 1e-9 * (-1.0) ** np.arange(25), geometry=GEO, direction="pull",
            intervals="wald")
    assert r.contact_angle is None and r.receding_angle.magnitude == pytest.approx(TR, abs=1e-5)
    assert r.to_dict()["contact_angle_deg"] is None


def test_fit_rod_is_the_same_fit_and_plots_any_branch(tmp_path):
    # One question, one answer: the compatibility wrapper calls fit("rod", ...).
    from floatcalc.studies.fit import fit_plot, fit_rod

    D, F0, direction = _cycle(15, 15)
    F = F0 + np.random.default_rng(4).normal(0, 0.03e-3, D.size)
    a = fit_rod(D, F, radius=R, length=L, force_uncertainty="0.03 mN")
    b = fit("rod", D, F, geometry=GEO, force_uncertainty="0.03 mN")
    assert a.to_dict() == b.to_dict()
    pull = direction == "pull"
    c = fit("rod", D[pull], F[pull], geometry=GEO, direction="pull", intervals="wald")
    for r in (a, c):
        fig = fit_plot(r)
        fig.savefig(tmp_path / "f.png")
        assert (tmp_path / "f.png").read_bytes()[:4] == b"\x89PNG"


def test_receding_angle_without_pull_rows_is_refused():
    from floatcalc.errors import InputError

    D, F0, direction = _cycle(10, 10)
    push = direction == "push"
    with pytest.raises(InputError, match="receding_angle needs pull-out rows"):
        fit("rod", D[push], F0[push], geometry=GEO, fit=("contact_angle", "receding_angle"))
