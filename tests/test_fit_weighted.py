"""Weighted calibration fits: estimates and standard errors against scipy.optimize.curve_fit, the
error models, depth offset and tare, and the intervals.

Independent check: :func:`scipy.optimize.curve_fit` (SciPy's own nonlinear least squares and
covariance, ``sigma=`` and ``absolute_sigma=``) on the same data and the same force–depth law.
The law is shared on purpose, so that the comparison isolates the estimator (weights,
Jacobian, covariance, quantiles); the law itself is checked against an independent quadrature
construction in tests/test_fit.py and tests/test_fit_branches.py.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.optimize import curve_fit

import floatcalc as fc
from floatcalc.errors import ConvergenceError, InputError
from floatcalc.liquids import water
from floatcalc.studies.fit import fit, force_depth_law, rod_force_at_depth

GEO = {"radius": "0.5 mm", "length": "60 mm"}
TH = 115.0


def _depths(theta=TH, baseline=10, n=40):
    dmax = fc.rod(GEO["radius"], GEO["length"], f"{theta} deg").depth_at_max.to("m").magnitude
    pre = np.linspace(-1e-3, -0.2e-3, baseline) if baseline else np.empty(0)
    return np.concatenate([pre, np.linspace(0.05e-3, dmax, n)])


def _push_model(law, sigma):
    def f(D, theta, delta=0.0, tare=0.0):
        Dt = D - delta
        return np.where(Dt < 0.0, 0.0, law(Dt, math.radians(theta), sigma)[0]) + tare
    return f


LAW = force_depth_law("rod", GEO)
SIG = water().sigma
MODEL = _push_model(LAW, SIG)


def _cf(f, D, F, p0, sigma=None, absolute=False):
    p, cov = curve_fit(f, D, F, p0=p0, sigma=sigma, absolute_sigma=absolute, method="trf", jac="3-point",
                       x_scale="jac", xtol=1e-15, ftol=1e-15, gtol=1e-15, max_nfev=5000)
    return p, np.sqrt(np.diag(cov))


def _ours(r, names):
    est = []
    for n in names:
        q = getattr(r, n).to({"contact_angle": "deg", "depth_offset": "m", "tare": "N"}[n]).magnitude
        est.append(float(q))
    keys = {"contact_angle": "contact_angle_deg", "depth_offset": "depth_offset_m", "tare": "tare_N"}
    return np.array(est), np.array([r.standard_errors[keys[n]] for n in names])


@pytest.mark.parametrize("model", ["estimated", "absolute", "column", "proportional", "offset+tare"])
def test_estimates_and_standard_errors_match_curve_fit(model):
    # Source: scipy.optimize.curve_fit (independent implementation of weighted nonlinear least
    # squares; absolute_sigma=True for stated uncertainties, False when the scale is estimated).
    # Tolerance 1e-6 relative, as the brief asks; both fits converge far tighter than that.
    rng = np.random.default_rng({"estimated": 1, "absolute": 2, "column": 3, "proportional": 4,
                                 "offset+tare": 5}[model])
    D = _depths(baseline=10 if model == "offset+tare" else 0)
    F0 = MODEL(D, TH)
    names = ["contact_angle"]
    if model == "estimated":
        F = F0 + rng.normal(0, 0.03e-3, D.size)
        r = fit("rod", D, F, geometry=GEO)
        p, se = _cf(lambda d, t: MODEL(d, t), D, F, [TH - 7.0])
    elif model == "absolute":
        F = F0 + rng.normal(0, 0.03e-3, D.size)
        r = fit("rod", D, F, geometry=GEO, force_uncertainty="0.03 mN")
        p, se = _cf(lambda d, t: MODEL(d, t), D, F, [TH - 7.0], np.full(D.size, 0.03e-3), True)
    elif model == "column":
        u = 0.01e-3 + 0.03e-3 * rng.random(D.size)
        F = F0 + rng.normal(0, 1.0, D.size) * u
        r = fit("rod", D, F, geometry=GEO, force_uncertainty=u)
        p, se = _cf(lambda d, t: MODEL(d, t), D, F, [TH - 7.0], u, True)
    elif model == "proportional":
        D = D[D > 0.5e-3]  # rows with clearly positive force (no zero crossing for a pure % model)
        F0 = MODEL(D, TH)
        F = F0 * (1.0 + 0.01 * rng.normal(0, 1.0, D.size))
        r = fit("rod", D, F, geometry=GEO, force_uncertainty="1%")
        # At the fixed point of the reweighting the weights are 1 % of the fitted force; curve_fit
        # with those weights must land on the same estimate (that is what a fixed point means).
        u = r.force_uncertainty.to("N").magnitude
        assert np.allclose(u, 0.01 * np.abs(r.fitted_force.to("N").magnitude), rtol=1e-12)
        p, se = _cf(lambda d, t: MODEL(d, t), D, F, [TH - 7.0], u, True)
    else:
        names = ["contact_angle", "depth_offset", "tare"]
        d = D + 0.1e-3
        F = F0 + 0.2e-3 + rng.normal(0, 0.02e-3, D.size)
        r = fit("rod", d, F, geometry=GEO, force_uncertainty="0.02 mN", fit=tuple(names))
        # curve_fit's finite-difference steps are relative to each parameter, so give it the offset
        # in mm and the tare in mN (same estimator; its estimates and errors are scaled back).
        p, se = _cf(lambda x, t, dm, tm: MODEL(x, t, dm * 1e-3, tm * 1e-3), d, F, [TH - 3.0, 0.08, 0.15],
                    np.full(D.size, 0.02e-3), True)
        p, se = p * [1.0, 1e-3, 1e-3], se * [1.0, 1e-3, 1e-3]
    est, ours_se = _ours(r, names)
    assert est == pytest.approx(p, rel=1e-6, abs=1e-12)
    assert ours_se == pytest.approx(se, rel=1e-6)


def test_proportional_noise_needs_weights():
    # 1 % proportional noise at 140°: the unweighted fit warns that the residuals grow with the
    # force; the weighted fit gives chi-squared near its degrees of freedom (for a correct error
    # model chi2/dof has mean 1 and sd sqrt(2/dof) ≈ 0.23 here; bound 3 sd).
    th = 140.0
    D = _depths(th, baseline=0, n=60)
    D = D[MODEL(D, th) > 0.05 * MODEL(D, th).max()]  # forces from 5 % to 100 % of the largest
    F = MODEL(D, th) * (1.0 + 0.01 * np.random.default_rng(11).normal(0, 1.0, D.size))
    a = fit("rod", D, F, geometry=GEO)
    assert any("grow with the force" in w for w in a.warnings)
    b = fit("rod", D, F, geometry=GEO, force_uncertainty="1%")
    assert abs(b.chi_squared / b.degrees_of_freedom - 1.0) < 3 * math.sqrt(2 / b.degrees_of_freedom)
    assert not any("grow with the force" in w for w in b.warnings)
    assert b.error_model.startswith("stated: 1 %")


def test_known_offset_and_tare_recovered_within_their_intervals():
    # Synthetic data with a known depth offset (0.12 mm) and tare (0.25 mN) and 10 baseline rows
    # before first touch. 99.9 % intervals (a single seeded case: at 95 % each would miss 1 time
    # in 20 by design; coverage is checked in tests/test_fit_coverage.py).
    D = _depths()
    rng = np.random.default_rng(21)
    d, F = D + 0.12e-3, MODEL(D, TH) + 0.25e-3 + rng.normal(0, 0.02e-3, D.size)
    r = fit("rod", d, F, geometry=GEO, force_uncertainty="0.02 mN", fit=("contact_angle", "depth_offset", "tare"),
            confidence=0.999)
    lo, hi = r.depth_offset_ci.to("m").magnitude
    assert lo < 0.12e-3 < hi and hi - lo < 0.05e-3
    lo, hi = r.tare_ci.to("N").magnitude
    assert lo < 0.25e-3 < hi
    lo, hi = r.contact_angle_ci.to("deg").magnitude
    assert lo < TH < hi
    assert r.points_before_contact == 10
    d_ = r.to_dict()
    assert d_["interval_method"] == "profile likelihood"
    C = np.array(d_["correlation"]["matrix"])
    assert d_["correlation"]["parameters"] == ["contact_angle", "depth_offset", "tare"]
    assert np.allclose(np.diag(C), 1.0) and np.allclose(C, C.T) and np.all(np.abs(C) <= 1.0 + 1e-12)
    for k in ("depth_offset_m", "tare_N", "depth_offset_ci_m", "tare_ci_N", "standard_errors", "wald_ci",
              "profile_ci", "contact_angle_deg", "contact_angle_ci_deg"):
        assert k in d_


def test_profile_and_wald_agree_when_the_model_is_nearly_linear():
    # Bates & Watts (1988, ch. 6): for small noise the profile interval tends to the Wald one.
    D = _depths(baseline=0)
    F = MODEL(D, TH) + np.random.default_rng(3).normal(0, 0.002e-3, D.size)
    r = fit("rod", D, F, geometry=GEO, force_uncertainty="0.002 mN")
    w = r.wald_ci["contact_angle_deg"]
    p = r.profile_ci["contact_angle_deg"]
    assert p == pytest.approx(w, abs=0.02 * (w[1] - w[0]))
    rw = fit("rod", D, F, geometry=GEO, force_uncertainty="0.002 mN", intervals="wald")
    assert rw.interval_method == "Wald (Jacobian)" and rw.profile_ci == {}
    assert rw.contact_angle_ci.magnitude.tolist() == pytest.approx(w, rel=1e-9)


def test_understated_uncertainty_is_flagged():
    D = _depths(baseline=0)
    F = MODEL(D, TH) + np.random.default_rng(4).normal(0, 0.05e-3, D.size)
    r = fit("rod", D, F, geometry=GEO, force_uncertainty="0.01 mN")
    assert r.chi_squared_p_value < 1e-3
    assert any("larger than the stated force uncertainty" in w for w in r.warnings)


def test_tare_without_baseline_rows_is_warned_about():
    # Without rows at zero liquid force the tare and the angle of a thin rod are nearly
    # interchangeable (a measured property of this law: |r| > 0.95 here).
    D = _depths(baseline=0)
    F = MODEL(D, TH) + np.random.default_rng(5).normal(0, 0.02e-3, D.size)
    r = fit("rod", D, F, geometry=GEO, force_uncertainty="0.02 mN", fit=("contact_angle", "tare"),
            intervals="wald")
    assert any("baseline rows" in w for w in r.warnings)
    assert abs(r.correlation["matrix"][0][1]) > 0.95


def test_fast_rod_law_matches_the_bisection_law():
    # Cross-check of two inversions of D(φ): Newton on the interpolated start (fit) against
    # 60-step bisection (floatcalc.studies._rodcurve); 1e-12 in force per length [σ].
    from floatcalc.studies import _rodcurve

    rng = np.random.default_rng(0)
    for _ in range(100):
        R, th = 10 ** rng.uniform(-3, 0.5), rng.uniform(0.01, math.pi - 1e-6)
        lo, hi = _rodcurve.depth(0.0, R, th), _rodcurve.depth(math.pi, R, th)
        D = rng.uniform(lo - 0.1, hi + 0.1, 100)
        assert np.max(np.abs(rod_force_at_depth(D, R, th) - _rodcurve.force_at_depth(D, R, th)[0])) < 1e-12


@pytest.mark.parametrize("spec, needle", [
    ("abc", "force such as"), ("150%", "between 0 % and 100 %"), ("-1 mN", "positive"),
    ([1e-5, 2e-5], "one value per row"), ("0 mN", "positive"),
])
def test_bad_force_uncertainty_is_refused(spec, needle):
    D = _depths(baseline=0)
    with pytest.raises(InputError) as exc:
        fit("rod", D, MODEL(D, TH), geometry=GEO, force_uncertainty=spec)
    assert needle in str(exc.value) and "\n" not in str(exc.value)


def test_bad_fit_names_and_geometry_are_refused():
    D = _depths(baseline=0)
    F = MODEL(D, TH)
    with pytest.raises(InputError, match="names parameters"):
        fit("rod", D, F, geometry=GEO, fit=("contact_angle", "zero"))
    with pytest.raises(InputError, match="not an input of a rod"):
        fit("rod", D, F, geometry={**GEO, "spacing": "1 mm"})
    with pytest.raises(InputError, match="element: must be one of"):
        fit("leg", D, F, geometry=GEO)
    with pytest.raises(InputError, match="length: is required"):
        fit("rod", D, F, geometry={"radius": "0.5 mm"})


def test_parameters_the_data_cannot_tell_apart_raise():
    # Data only before first touch: the force does not depend on the angle at all.
    D = np.linspace(-1e-3, -0.1e-3, 12)
    with pytest.raises(ConvergenceError):
        fit("rod", D, np.zeros(D.size) + 1e-6 * (-1.0) ** np.arange(D.size), geometry=GEO)


def test_rows_above_the_surface_that_read_a_force_are_flagged():
    # The stage zero is 0.15 mm below first touch, so the first push rows are in contact while
    # their depth reading is negative; without the depth offset they are taken as in the air.
    D = _depths(baseline=0)
    d = np.concatenate([np.linspace(-0.5e-3, -0.2e-3, 4), D]) - 0.15e-3
    F = MODEL(d + 0.15e-3, TH) + np.random.default_rng(6).normal(0, 0.02e-3, d.size)
    r = fit("rod", d, F, geometry=GEO, force_uncertainty="0.02 mN", intervals="wald")
    assert any("zero of depth may be off" in w for w in r.warnings)
    ok = fit("rod", d, F, geometry=GEO, force_uncertainty="0.02 mN", fit=("contact_angle", "depth_offset"),
             intervals="wald", confidence=0.999)
    assert not any("zero of depth may be off" in w for w in ok.warnings)
    lo, hi = ok.depth_offset_ci.to("m").magnitude
    assert lo < -0.15e-3 < hi
