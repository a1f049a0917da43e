"""Coverage of the shown 95 % interval and bias of the estimate, per error model.

Method (the definition of a confidence interval; e.g. Bates & Watts 1988, sec. 6.1): draw
seeded synthetic data sets from the model with known parameters, fit each, and count how often
the 95 % interval contains the true angle. With 400 sets a correct interval gives 380 ± 4.4
hits; the check accepts 92–98 % (368–392, ±2.7 binomial sd), as the brief asks (≥ 200 sets). The
mean estimate must lie within 0.2 standard errors of the truth (the standard error of a mean of
400 estimates is 0.05 SE, so a bias of 0.2 SE is 4 of those).

The law is the vectorised rod law (fast); the exact forces are computed once per design.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

import floatcalc as fc
from floatcalc.liquids import water
from floatcalc.studies.fit import fit, force_depth_law

GEO = {"radius": "0.5 mm", "length": "60 mm"}
TH = 115.0
SETS = 400
LAW = force_depth_law("rod", GEO)


def _design(baseline=0, n=40, positive_only=False):
    dmax = fc.rod(GEO["radius"], GEO["length"], f"{TH} deg").depth_at_max.to("m").magnitude
    pre = np.linspace(-1e-3, -0.2e-3, baseline) if baseline else np.empty(0)
    D = np.concatenate([pre, np.linspace(0.05e-3, dmax, n)])
    F0 = np.where(D < 0, 0.0, LAW(D, math.radians(TH), water().sigma)[0])
    if positive_only:  # a pure percentage model needs forces well away from zero
        keep = F0 > 0.05 * F0.max()
        D, F0 = D[keep], F0[keep]
    return D, F0


def _run(model):
    rng = np.random.default_rng({"estimated": 101, "absolute": 202, "proportional": 303, "offset+tare": 404}[model])
    D, F0 = _design(baseline=10 if model == "offset+tare" else 0, positive_only=model == "proportional")
    hits = wald_hits = 0
    est, se = [], []
    for _ in range(SETS):
        if model == "estimated":
            r = fit("rod", D, F0 + rng.normal(0, 0.03e-3, D.size), geometry=GEO)
        elif model == "absolute":
            r = fit("rod", D, F0 + rng.normal(0, 0.03e-3, D.size), geometry=GEO, force_uncertainty="0.03 mN")
        elif model == "proportional":
            r = fit("rod", D, F0 * (1 + 0.01 * rng.normal(0, 1, D.size)), geometry=GEO, force_uncertainty="1%")
        else:
            r = fit("rod", D + 0.1e-3, F0 + 0.2e-3 + rng.normal(0, 0.02e-3, D.size), geometry=GEO,
                    force_uncertainty="0.02 mN", fit=("contact_angle", "depth_offset", "tare"))
        lo, hi = r.contact_angle_ci.magnitude
        hits += lo < TH < hi
        wlo, whi = r.wald_ci["contact_angle_deg"]
        wald_hits += wlo < TH < whi
        est.append(r.contact_angle.magnitude)
        se.append(r.standard_errors["contact_angle_deg"])
    return hits, wald_hits, np.array(est), np.array(se)


@pytest.mark.slow
@pytest.mark.parametrize("model", ["estimated", "absolute", "proportional", "offset+tare"])
def test_coverage_and_bias(model):
    hits, wald_hits, est, se = _run(model)
    bias = (est.mean() - TH) / se.mean()
    print(f"\n{model}: profile coverage {hits}/{SETS}, Wald {wald_hits}/{SETS}, bias {bias:+.3f} SE, "
          f"mean SE {se.mean():.4f} deg")
    assert 0.92 * SETS <= hits <= 0.98 * SETS
    assert abs(bias) < 0.2
