"""Every element kind with a force–depth law can be fitted through the one function shape.

Round trips: data from each kind's public force–depth curve (floatcalc.ball/pad/ring/pin and
floatcalc.core.parallel2d for a row of rods) at a known angle, with and without seeded noise.
They check the fitting machinery on each law, not the laws' physics (each law is checked
against independent methods in its own tests). One cross-check between laws: a "row" of one
rod (parallel2d, turning-point first integral) must give the single-rod law (rod2d).
"""

from __future__ import annotations

import math

import numpy as np
import pytest

import floatcalc as fc
from floatcalc.liquids import water
from floatcalc.studies.fit import KINDS, fit, force_depth_law


def test_kind_table_lists_every_kind_with_a_force_depth_law():
    assert set(KINDS) == {"rod", "rod_row", "ball", "pad", "ring", "pin"}


def test_row_of_one_rod_is_the_rod_law_and_row_limit_matches_parallel_rods():
    # Cross-check of two implementations: parallel2d (N = 1) against rod2d via the fit's law,
    # 1e-6 relative (the row law is read from a 1201-state curve by monotone interpolation).
    geo = {"radius": "0.25 mm", "length": "40 mm"}
    rod = force_depth_law("rod", geo)
    row = force_depth_law("rod_row", {**geo, "count": 1, "spacing": "20 mm"})
    D = np.linspace(0.05e-3, 3e-3, 30)
    th = math.radians(120)
    a, b = rod(D, th, water().sigma)[0], row(D, th, water().sigma)[0]
    assert b == pytest.approx(a, rel=1e-6, abs=1e-9 * np.max(np.abs(a)))
    # the largest force along the row's law equals floatcalc.parallel_rods' limit (its own maximiser)
    row3 = force_depth_law("rod_row", {**geo, "count": 3, "spacing": "1.2 mm"})
    lim = fc.parallel_rods("0.25 mm", "40 mm", "120 deg", 3, "1.2 mm")
    Dd = np.linspace(0.0, 6e-3, 6001)
    assert float(np.max(row3(Dd, th, water().sigma)[0])) == pytest.approx(lim.max_force.to("N").magnitude, rel=1e-4)


def _round_trip(kind, geometry, theta, D, F0, noise, **kw):
    exact = fit(kind, D, F0 + 1e-9 * np.max(np.abs(F0)) * (-1.0) ** np.arange(D.size), geometry=geometry,
                intervals="wald", **kw)
    assert exact.contact_angle.magnitude == pytest.approx(theta, abs=1e-3)
    F = F0 + np.random.default_rng(5).normal(0.0, noise * np.max(np.abs(F0)), D.size)
    r = fit(kind, D, F, geometry=geometry, confidence=0.999, **kw)
    lo, hi = r.contact_angle_ci.magnitude
    assert lo < theta < hi and hi - lo < 20.0  # the data determine the angle to a few degrees
    d = r.to_dict()
    assert d["element"] == kind and d["contact_angle_ci_deg"] == [lo, hi]
    return r


@pytest.mark.slow
def test_rod_row_round_trip():
    from floatcalc.core import parallel2d

    liq = water()
    R, L, S, n, th = 0.25e-3, 0.04, 1.2e-3, 3, 110.0
    c = parallel2d.row_curve(R / liq.lc, math.radians(th), S / liq.lc, n)
    k = int(c["i_max"])
    i0 = int(np.argmax(c["depth"] >= 0.02))
    sel = np.linspace(i0, k, 25).round().astype(int)
    D, F0 = c["depth"][sel] * liq.lc, c["force"][sel] * liq.sigma * L
    _round_trip("rod_row", {"radius": R, "length": L, "count": n, "spacing": S}, th, D, F0, 0.01)


@pytest.mark.slow
@pytest.mark.parametrize("kind, geometry, theta", [
    ("ball", {"radius": "1 mm"}, 120.0),
    ("pad", {"radius": "2 mm", "thickness": "0.5 mm"}, 105.0),
    ("pin", {"radius": "0.3 mm", "length": "6 mm"}, 100.0),
])
def test_round_element_round_trip(kind, geometry, theta):
    if kind == "ball":
        r = fc.ball(geometry["radius"], f"{theta} deg")
    elif kind == "pad":
        r = fc.pad(geometry["radius"], geometry["thickness"], f"{theta} deg")
    else:
        r = fc.pin(geometry["radius"], f"{theta} deg", length=geometry["length"])
    x = r.curve.depth.to("m").magnitude
    end = r.depth_at_max.to("m").magnitude if hasattr(r, "depth_at_max") else x[-1]
    D = np.linspace(max(x[0], 0.0) + 0.02 * end, end, 14)
    F0 = r.curve.force_at_depth(D).to("N").magnitude
    _round_trip(kind, geometry, theta, D, F0, 0.01)


@pytest.mark.slow
def test_ring_round_trip():
    # A ring curve takes about a second per angle, so this is one seeded noisy fit with the Wald
    # interval only (the machinery is the same as for the other kinds).
    th = 110.0
    r = fc.ring("3 mm", "0.2 mm", f"{th} deg")
    end = r.depth_at_max.to("m").magnitude
    D = np.linspace(0.05 * end, end, 12)
    F0 = r.curve.force_at_depth(D).to("N").magnitude
    geo = {"ring_radius": "3 mm", "wire_radius": "0.2 mm"}
    F = F0 + np.random.default_rng(6).normal(0.0, 0.002 * np.max(np.abs(F0)), D.size)
    f = fit("ring", D, F, geometry=geo, intervals="wald", confidence=0.999)
    lo, hi = f.contact_angle_ci.magnitude
    assert lo < th < hi and hi - lo < 5.0 and f.interval_method == "Wald (Jacobian)"
