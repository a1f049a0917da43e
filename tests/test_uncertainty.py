"""Monte Carlo uncertainty against closed-form answers.

Closed-form case: a very thin rod (R = 1 µm, R/l_c ≈ 4e-4) with θ = 180° carries
F ≈ 2σL (small-Bond limit of the 2D rod law, Vella, Lee & Kim 2006; PHYSICS.md), linear in σ.
With only σ uncertain and normal, N(μ, s²), the rod sinks when 2σL < W, so
P(sink) = Φ((W/(2L) − μ)/s) and the p-th percentile of the payload capacity is
(2L(μ + s z_p) − W_own)/g. The O(R/l_c) pressure correction shifts these by far less than the
Monte Carlo error at the sample sizes used.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.stats import norm

from floatcalc.errors import InputError
from floatcalc.liquids import water
from floatcalc.studies.models import rod_model
from floatcalc.studies.uncertainty import Contamination, Distribution, parse_distribution, uncertainty

R, L, RHO_S = 1e-6, 0.05, 7850.0


def _thin_model(payload):
    liq = water()
    return liq, rod_model(liq, radius=R, length=L, contact_angle=math.pi, payload_mass=payload)


def test_probability_of_sinking_matches_normal_cdf():
    liq, m = _thin_model(0.7e-3)
    mu, s = 72e-3, 4e-3
    r = uncertainty(m, {"surface_tension": Distribution("normal", mu, s)}, samples=20000, seed=11)
    W = 0.7e-3 * liq.g + RHO_S * math.pi * R**2 * L * liq.g
    p_exact = norm.cdf((W / (2 * L) - mu) / s)
    assert 0.05 < p_exact < 0.95
    assert abs(r.probability_of_sinking - p_exact) < 4 * r.probability_standard_error
    # binomial standard error of the estimate
    assert r.probability_standard_error == pytest.approx(math.sqrt(p_exact * (1 - p_exact) / 20000), rel=0.05)


@pytest.mark.slow
def test_percentiles_and_their_batch_means_error():
    liq, m = _thin_model(0.0)
    mu, s, N = 70e-3, 5e-3, 40000
    r = uncertainty(m, {"surface_tension": Distribution("normal", mu, s)}, samples=N, seed=5,
                    percentiles=(5.0, 50.0, 95.0))
    W_own = RHO_S * math.pi * R**2 * L * liq.g
    got = r.payload_capacity_percentiles.to("kg").magnitude
    se = r.payload_capacity_percentile_standard_error.to("kg").magnitude
    for pc, q, e in zip((5.0, 50.0, 95.0), got, se):
        z = norm.ppf(pc / 100)
        exact = (2 * L * (mu + s * z) - W_own) / liq.g
        # Asymptotic SE of a sample quantile: sqrt(p(1-p)) / (f(x_p) sqrt(N)) (e.g. Serfling,
        # Approximation Theorems of Mathematical Statistics, 1980, §2.3), f the capacity density.
        p = pc / 100
        f = norm.pdf(z) / (2 * L * s / liq.g)
        se_asym = math.sqrt(p * (1 - p)) / (f * math.sqrt(N))
        assert abs(q - exact) < 4 * se_asym
        assert 0.4 < e / se_asym < 2.5   # batch means (20 batches) is itself noisy, ~±35 %


def test_contamination_mixture_closed_form():
    # With probability 1 and a fixed drop Δ the mixture is the normal shifted by −Δ.
    liq, m = _thin_model(0.7e-3)
    mu, s, d = 75e-3, 4e-3, 5e-3
    r = uncertainty(m, {"surface_tension": Distribution("normal", mu, s)}, samples=20000, seed=3,
                    contamination=Contamination(1.0, d, d))
    W = 0.7e-3 * liq.g + RHO_S * math.pi * R**2 * L * liq.g
    p_exact = norm.cdf((W / (2 * L) - (mu - d)) / s)
    assert abs(r.probability_of_sinking - p_exact) < 4 * r.probability_standard_error


def test_no_sinking_gives_rule_of_three_bound():
    _, m = _thin_model(0.1e-3)
    r = uncertainty(m, {"surface_tension": Distribution("uniform", 70e-3, 72e-3)}, samples=1000, seed=0)
    assert r.probability_of_sinking == 0.0
    assert r.probability_upper_95 == pytest.approx(3e-3)


def test_same_seed_same_answer_other_seed_differs():
    m = rod_model(count=4.0, payload_mass=2.2e-3)
    d = {"contact_angle": parse_distribution("normal:150deg:8deg", "angle", "contact_angle"),
         "radius": parse_distribution("tol:0.2mm:0.02mm", "length", "radius")}
    a = uncertainty(m, d, samples=5000, seed=42, executor="serial")
    b = uncertainty(m, d, samples=5000, seed=42, executor="serial")
    c = uncertainty(m, d, samples=5000, seed=43, executor="serial")
    assert np.array_equal(a.capacity_samples, b.capacity_samples)
    assert not np.array_equal(a.capacity_samples, c.capacity_samples)


def test_clipping_is_reported():
    m = rod_model()
    r = uncertainty(m, {"contact_angle": Distribution("normal", math.radians(178), math.radians(5))},
                    samples=500, seed=1)
    assert any("clipped" in w for w in r.warnings)


@pytest.mark.parametrize("kw", [{"samples": 50}, {"samples": "abc"}, {"seed": -1}, {"seed": 1.5}])
def test_bad_run_settings(kw):
    with pytest.raises(InputError):
        uncertainty(rod_model(), {"radius": Distribution("uniform", 1e-4, 2e-4)}, **kw)


@pytest.mark.parametrize("text", ["normal:150deg", "normal:150deg:-1deg", "uniform:2deg:1deg",
                                  "beta:1:2", "normal:150kg:5deg"])
def test_bad_distributions(text):
    with pytest.raises(InputError):
        parse_distribution(text, "angle", "contact_angle")


def test_cli_demo_is_labelled_invented(capsys):
    import json

    from floatcalc.cli import main

    assert main(["uncertainty", "--demo", "--samples", "2000", "--json"]) == 0
    d = json.loads(capsys.readouterr().out)
    assert d["invented"] is True and 0 <= d["probability_of_sinking"] <= 1
    assert any("clean liquid" in c for c in d["cautions"])
