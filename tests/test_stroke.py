"""Rowing-stroke model (floatcalc.motion.stroke) and the thin-leg thrust bound (core.meniscus_thrust).

Checks and their sources:
* the closed-form thrust bound h(u, θ) against a brute-force search over both interface
  inclinations (an independent method), and the contact-line bound |F| ≤ σP (PHYSICS.md;
  Hu, Chan & Bush, Nature 424, 663, 2003: maximum curvature force σP);
* a thrust just below / above the bound, and a vertical load above the device's limit;
* the Weber number is groups.weber_number's (one question, one answer) and c_min for water at
  20 °C is the published ≈ 0.23 m/s (de Gennes, Brochard-Wyart & Quéré 2004).
"""

from __future__ import annotations

import json
import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from floatcalc import dimensionless as groups
from floatcalc.cli import main
from floatcalc.core.meniscus_thrust import max_thrust, max_vertical
from floatcalc.device import example
from floatcalc.errors import InputError
from floatcalc.motion.stroke import stroke


def brute_force(u, theta, n=200001):
    """Largest f_x by scanning the rear inclination on a fine grid, the front one solved from
    the constraint on both arcsine branches (independent of the candidate list of the code)."""
    a = np.linspace(theta - math.pi, theta, n)
    v = 2 * u - np.sin(a)
    ok = np.abs(v) <= 1
    best = 0.0 if u == 0 else -np.inf
    for b in (np.arcsin(np.clip(v, -1, 1)), math.pi - np.arcsin(np.clip(v, -1, 1))):
        b = np.where(b > math.pi, b - 2 * math.pi, b)
        good = ok & (b >= theta - math.pi - 1e-12) & (b <= theta + 1e-12)
        if good.any():
            best = max(best, float((0.5 * (np.cos(b) - np.cos(a)))[good].max()))
    return max(best, 0.0) if np.isfinite(best) else 0.0


@pytest.mark.parametrize("deg", [70.0, 100.0, 115.0, 150.0, 180.0])
@pytest.mark.parametrize("u", [0.0, 0.2, 0.5, 0.8])
def test_closed_form_against_brute_force(deg, u):
    th = math.radians(deg)
    if u > max_vertical(th):
        assert max_thrust(u, th) == 0.0
        return
    # grid step 1.6e-5 rad: the scan is good to about 1e-6 where the optimum is smooth, and to
    # 1e-4 at the kink of a boundary optimum
    assert max_thrust(u, th) == pytest.approx(brute_force(u, th), abs=1e-4)


@settings(max_examples=200, deadline=None, derandomize=True)
@given(st.floats(0.0, 1.0), st.floats(0.0, math.pi))
def test_thrust_bound_respects_the_contact_line_bound(u, th):
    h = max_thrust(u, th)
    assert h >= 0.0
    assert h * h + u * u <= 1.0 + 1e-12
    if th >= math.pi / 2:  # on a non-wetting leg a more repellent coating never gives less thrust
        assert max_thrust(u, min(th + 0.1, math.pi)) >= h - 1e-12


def test_weightless_non_wetting_leg_gets_the_full_curvature_force():
    assert max_thrust(0.0, math.pi) == pytest.approx(1.0)
    assert max_thrust(0.6, math.pi) == pytest.approx(0.8)


TWIN = example("twin_rod")


def test_thrust_just_below_and_above_the_bound():
    r = stroke(TWIN, "50 ms", "0 N")
    cap = r.max_thrust.to("N").magnitude
    assert 0 < cap < r.contact_line_force.to("N").magnitude
    assert not stroke(TWIN, "50 ms", 0.99 * cap).breaks_surface
    over = stroke(TWIN, "50 ms", 1.01 * cap)
    assert over.breaks_surface and over.breaks_by == "thrust"
    # extra vertical load leaves less thrust
    assert stroke(TWIN, "50 ms", 0.0, extra_vertical="3 mN").max_thrust < r.max_thrust


def test_vertical_overload_breaks_through():
    r = stroke(TWIN, "50 ms", "1 mN")
    extra = r.max_extra_vertical.to("N").magnitude
    over = stroke(TWIN, "50 ms", "1 mN", extra_vertical=1.02 * extra)
    assert over.breaks_surface and over.breaks_by == "vertical" and over.max_thrust.magnitude == 0.0


def test_weber_number_and_min_wave_speed():
    r = stroke(TWIN, "50 ms", "2 mN", leg_speed="0.4 m/s")
    liq = TWIN.liquid
    assert r.weber_number == pytest.approx(groups.weber_number(liq, 0.4, 0.25e-3).value, rel=1e-12)
    assert r.min_wave_speed.to("m/s").magnitude == pytest.approx(0.23, abs=0.005)
    assert r.above_min_wave_speed and "steady" in r.wave_caveat
    # impulse: speed gained = F T / m
    assert r.speed_gain.to("m/s").magnitude == pytest.approx(2e-3 * 0.05 / (r.weight.to("N").magnitude / liq.g))


def test_fast_stroke_floods_a_texture_and_says_so():
    tex = {"texture": "posts", "post_size": 10e-6, "pitch": 40e-6, "post_height": 30e-6}
    slow = stroke(TWIN, "50 ms", "2 mN", leg_speed="0.5 m/s", texture=tex)
    fast = stroke(TWIN, "50 ms", "2 mN", leg_speed="2 m/s", texture=tex)
    assert all(c.state == "cassie" for c in slow.coating)
    assert all(c.state == "wenzel" for c in fast.coating)
    assert any("Wenzel angle" in w for w in fast.warnings)
    assert fast.coating[0].contact_angle < slow.coating[0].contact_angle  # Wenzel below Cassie


def test_bad_inputs():
    with pytest.raises(InputError, match="thrust"):
        stroke(TWIN, "50 ms", "-1 mN")
    with pytest.raises(InputError, match="stroke_time"):
        stroke(TWIN, "5 m", "1 mN")


def test_cli_json(capsys):
    code = main(["stroke", "--example", "twin_rod", "--stroke-time", "40ms", "--thrust", "3mN", "--json"])
    out, err = capsys.readouterr()
    assert code == 0, err
    d = json.loads(out)
    for k in ("breaks_surface", "max_thrust_N", "weber_number", "min_wave_speed_m_per_s", "wave_caveat"):
        assert k in d
    code = main(["stroke", "--example", "twin_rod", "--stroke-time", "40ms", "--thrust", "3mN", "--texture", "posts"])
    assert code == 2 and "post_size" in capsys.readouterr().err


def test_device_thrust_is_the_sum_of_element_capacities():
    # twin rod: two equal rods share the weight equally, so each carries W/2 on a contact line
    # P_i = 2L + 4R sin φ (sides and end chords); the device's bound is twice one rod's σP_i h(W/(2σP_i), θ).
    r = stroke(TWIN, "50 ms", "1 mN")
    caps = r.element_max_thrust.to("N").magnitude
    assert caps.sum() == pytest.approx(r.max_thrust.to("N").magnitude, rel=1e-12)
    assert caps[0] == pytest.approx(caps[1], rel=1e-9)
    liq = TWIN.liquid
    from floatcalc.device import Device

    sP = liq.sigma * Device.from_design(TWIN).models[0].perimeter  # the rod's one contact perimeter
    W = r.weight.to("N").magnitude
    assert caps[0] == pytest.approx(sP * max_thrust(0.5 * W / sP, math.radians(115)), rel=1e-3)
