"""Hypothesis property tests for the long-rod model (core.rod2d and the public floatcalc.rod).

Invariants: the limit force grows with radius and with advancing angle; the answer does not
depend on how the units are written; no NaN or infinity anywhere in the design space
(radius 1e-4 to 10 l_c, any angle 0–180°); the force–depth curve ends at the limit and the
limit is the maximum of the force over every contact position. Hypothesis runs derandomised
(see conftest.py), 200 examples each.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

import floatcalc as fc
from floatcalc.core import rod2d
from floatcalc.units import Q_

PI = math.pi
log_radius = st.floats(min_value=-4.0, max_value=1.0)          # log10(R / l_c)
angle = st.floats(min_value=0.0, max_value=PI)
angle_with_ends = st.one_of(st.sampled_from([0.0, PI / 2, PI]), angle)


def _f(R, th):
    return float(rod2d.limit_force(R, th)["force"])


@settings(max_examples=200, deadline=None)
@given(log_radius, log_radius, angle_with_ends)
def test_limit_force_increases_with_radius(a, b, th):
    R1, R2 = sorted((10.0**a, 10.0**b))
    assert _f(R1, th) <= _f(R2, th) * (1 + 1e-12) + 1e-15


@settings(max_examples=200, deadline=None)
@given(log_radius, angle_with_ends, angle_with_ends)
def test_limit_force_increases_with_advancing_angle(a, t1, t2):
    R = 10.0**a
    lo, hi = sorted((t1, t2))
    assert _f(R, lo) <= _f(R, hi) * (1 + 1e-12) + 1e-15


@pytest.mark.slow
@settings(max_examples=200, deadline=None)
@given(st.floats(min_value=1e-3, max_value=5.0), st.floats(min_value=1.0, max_value=179.0))
def test_same_answer_whatever_the_units(radius_mm, angle_deg):
    # radius in mm, µm, inch (exact 25.4 mm), SI float and quantity; angle in deg, rad, quantity
    forms = [
        (f"{radius_mm!r} mm", f"{angle_deg!r} deg"),
        (f"{radius_mm * 1000!r} um", math.radians(angle_deg)),
        (f"{radius_mm / 25.4!r} inch", Q_(angle_deg, "degree")),
        (radius_mm * 1e-3, f"{math.radians(angle_deg)!r} rad"),
        (Q_(radius_mm, "mm"), f"{angle_deg!r}°"),
    ]
    ref = None
    for R, th in forms:
        f = fc.rod(R, "50 mm", th, curve_points=2).max_force.to("N").magnitude
        ref = f if ref is None else ref
        assert math.isclose(f, ref, rel_tol=1e-12)


@settings(max_examples=200, deadline=None)
@given(log_radius, angle_with_ends)
def test_no_nan_or_inf_anywhere(a, th):
    R = 10.0**a
    out = rod2d.limit_force(R, th)
    assert all(np.all(np.isfinite(v)) for v in out.values())
    assert 0.0 <= float(out["phi"]) <= PI
    curve = rod2d.force_depth_curve(R, th, n=50)
    assert all(np.all(np.isfinite(v)) for v in curve.values())
    prof = rod2d.profile(R, th, float(out["phi"]), n=50)
    assert np.all(np.isfinite(prof["right"][0])) and np.all(np.isfinite(prof["right"][1]))


@settings(max_examples=60, deadline=None)  # fewer: each example builds a full SI result (~10 ms)
@given(log_radius, angle_with_ends)
def test_public_result_is_finite_json(a, th):
    lc = fc.water().lc
    d = fc.rod(10.0**a * lc, "50 mm", th, receding_angle=0.5 * th).to_dict()
    for k, v in d.items():
        if isinstance(v, float):
            assert math.isfinite(v), k


@settings(max_examples=200, deadline=None)
@given(log_radius, angle_with_ends)
def test_curve_ends_at_limit_and_limit_is_the_maximum(a, th):
    R = 10.0**a
    lim = rod2d.limit_force(R, th)
    f_lim = float(lim["force"])
    curve = rod2d.force_depth_curve(R, th, n=300)
    assert math.isclose(curve["force"][-1], f_lim, rel_tol=1e-12, abs_tol=1e-15)
    assert math.isclose(curve["depth"][-1], float(lim["depth"]), rel_tol=1e-12, abs_tol=1e-15)
    tol = 1e-12 * abs(f_lim) + 1e-15
    assert curve["force"].max() <= f_lim + tol
    # and over every allowed contact position, not only up to the limit
    grid = np.linspace(0.0, PI, 2001)
    assert rod2d.force(grid, R, th).max() <= f_lim + tol
