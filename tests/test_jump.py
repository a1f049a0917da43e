"""Jump model (floatcalc.motion.jump) against the momentum bound, closed forms and solve_ivp.

Sources of the checks:
* momentum bound for a constant push, v ≤ (F_cap/m − g) T (Newton's second law for the device;
  the liquid force may not exceed the surface-tension limit at any instant: Koh et al., Science
  349, 517, 2015);
* the half-sine bound, whose factor 2/π is checked here against numerical quadrature of the
  profile (scipy.integrate.quad), not against the same closed form;
* a two-body model (body and legs with their own mass, legs on the device's force–depth law
  with a critically damped response) integrated with scipy.integrate.solve_ivp.
"""

from __future__ import annotations

import json
import math

import numpy as np
import pytest
from scipy.integrate import quad, solve_ivp

from floatcalc.cli import main
from floatcalc.device import example
from floatcalc.device.design import design_from_data
from floatcalc.errors import InputError
from floatcalc.motion._device import heave_law
from floatcalc.motion.jump import jump

# Invented test device: four PTFE-coated steel rods in a square, centre of mass at the centre.
FOUR = design_from_data({
    "schema_version": 1, "description": "invented: four-rod test jumper",
    "liquid": {"name": "water", "temperature": "20 degC"},
    "body": {"mass": "0.3 g", "centre_of_mass": ["0 mm", "0 mm"]},
    "legs": [{"kind": "rod", "position": [x, y], "heading": h, "radius": "0.15 mm", "length": "20 mm",
              "material": "steel", "coating": {"advancing": "115 deg"}}
             for x, y, h in (("15 mm", "0 mm", "90 deg"), ("-15 mm", "0 mm", "90 deg"),
                             ("0 mm", "15 mm", "0 deg"), ("0 mm", "-15 mm", "0 deg"))],
})
LAW = heave_law(FOUR)
G = LAW.liquid.g
M = LAW.weight / G


def test_heave_law_rises_and_ends_at_the_smallest_cap():
    """One question, one answer: the heave law's capacity at the centre of mass is the device's
    own (solve_device: weight + max_payload), to the solvers' tolerances (1e-4: the capacity
    search stops at its Brent/Newton tolerances); the law's limit is the smallest of the level
    limit, that capacity and the contact-line bound."""
    from floatcalc.device import solve_device

    assert np.all(np.diff(LAW.force) > 0)
    assert LAW.limit_force == pytest.approx(LAW.force[-1])
    r = solve_device(FOUR)
    assert LAW.capacity_at_centre_of_mass == pytest.approx((r.weight + r.max_payload).to("N").magnitude, rel=1e-4)
    smallest = min(LAW.level_limit_force, LAW.capacity_at_centre_of_mass, LAW.contact_line_bound)
    assert LAW.limit_force <= smallest * (1 + 1e-9)
    assert LAW.limit_force == pytest.approx(smallest, rel=0.02)  # the bound rises with depth: cut a bit earlier


def _bound(law):
    # PHYSICS.md: vertical surface-tension force <= sigma x contact line; pressure part <=
    # rho g x deepest wetted point x horizontal projection (4 rods of 0.3 mm x 20 mm).
    s, rho = law.liquid.sigma, law.liquid.rho
    return s * law.element_perimeters.sum() + rho * G * float(law.element_depths.max()) * 4 * 0.3e-3 * 20e-3


def test_heave_law_within_contact_line_bound():
    # 1e-9: root-finding tolerance of the cut
    assert LAW.limit_force <= _bound(LAW) * (1 + 1e-9)


# The rod ends are bounded by σ × the chord across each end face (core.finite_rod.end_force),
# so the device law itself respects the PHYSICS.md contact-line bound.
def test_device_model_level_limit_within_contact_line_bound():
    assert LAW.level_limit_force <= LAW.contact_line_bound


def test_constant_push_meets_the_momentum_bound():
    T = 0.05
    r = jump(FOUR, T)
    assert not r.breaks_surface
    bound = (LAW.limit_force / M - G) * T
    assert r.max_takeoff_speed.to("m/s").magnitude == pytest.approx(bound, rel=1e-9)
    assert r.takeoff_speed.to("m/s").magnitude == pytest.approx(bound, rel=1e-9)
    assert r.jump_height.to("m").magnitude == pytest.approx(bound**2 / (2 * G), rel=1e-9)


def test_half_sine_factor_against_quadrature():
    T = 0.05
    r = jump(FOUR, T, profile="half-sine")
    mean_shape = quad(lambda t: math.sin(math.pi * t / T), 0.0, T)[0] / T
    expected = (LAW.limit_force / M - G) * T * mean_shape
    assert r.max_takeoff_speed.to("m/s").magnitude == pytest.approx(expected, rel=1e-9)


@pytest.mark.parametrize("profile", ["constant", "half-sine"])
def test_demand_just_below_and_above_the_limit(profile):
    T = 0.04
    vmax = jump(FOUR, T, profile=profile).max_takeoff_speed.to("m/s").magnitude
    below = jump(FOUR, T, takeoff_speed=0.99 * vmax, profile=profile)
    above = jump(FOUR, T, takeoff_speed=1.01 * vmax, profile=profile)
    assert not below.breaks_surface and below.takeoff_speed.to("m/s").magnitude == pytest.approx(0.99 * vmax)
    assert above.breaks_surface and above.takeoff_speed is None and above.jump_height is None
    assert above.peak_force.to("N").magnitude > LAW.limit_force
    if profile == "half-sine":  # the force crosses the limit before mid-push
        assert 0.0 < above.break_time.to("s").magnitude < 0.5 * T


def test_push_force_demand_gives_momentum():
    T, P = 0.03, 8e-3
    r = jump(FOUR, T, push_force=P)
    assert r.takeoff_speed.to("m/s").magnitude == pytest.approx((P - LAW.body_weight) * T / M, rel=1e-9)
    assert r.peak_force.to("N").magnitude == pytest.approx(P + LAW.weight - LAW.body_weight, rel=1e-12)


def test_two_body_integration_with_solve_ivp():
    """Body and legs as two masses; the legs sit on the force–depth law with a critically damped
    response (time constant well below the push time), so they follow quasi-statically. The
    peak liquid force must agree with the quasi-static model to 0.5 % (the legs lag by their
    time constant). The quasi-static model neglects the legs' own momentum (they rebound upwards
    as the push eases); the integrated take-off speed may exceed the model's by at most that
    momentum, m_l × (largest leg speed) / m, plus 0.5 %; it must never be lower by more than
    0.5 % (the model is on the safe side)."""
    T = 0.2  # the legs' damped time constant sqrt(m_l/k) is about 5 ms here
    r = jump(FOUR, T, profile="half-sine", takeoff_speed=0.8)
    Wb, Wl = LAW.body_weight, LAW.weight - LAW.body_weight
    mb, ml = Wb / G, Wl / G
    Ppk = r.peak_push_force.to("N").magnitude
    z_rest = float(np.interp(LAW.weight, LAW.force, LAW.depth))
    k = float(np.interp(z_rest, LAW.depth[1:], np.diff(LAW.force) / np.diff(LAW.depth)))
    c = 2.0 * math.sqrt(k * ml)

    def Fz(z):
        return float(np.interp(z, LAW.depth, LAW.force, left=0.0, right=LAW.limit_force))

    def rhs(t, y):
        _, vb, z, w = y
        P = Wb + (Ppk - Wb) * math.sin(math.pi * t / T)
        return [vb, (P - Wb) / mb, w, (P + Wl - Fz(z) - c * w) / ml]

    sol = solve_ivp(rhs, (0.0, T), [0.0, 0.0, z_rest, 0.0], rtol=1e-9, atol=1e-12, max_step=T / 400,
                    dense_output=True)
    tt = np.linspace(0, T, 801)
    Fpeak = max(Fz(z) for z in sol.sol(tt)[2])
    yb, vb, _, w = sol.y[:, -1]
    v_off = (mb * vb - ml * w) / (mb + ml)
    v_model = r.takeoff_speed.to("m/s").magnitude
    rebound = ml * r.max_leg_speed.to("m/s").magnitude / (mb + ml)
    assert v_model * (1 - 5e-3) <= v_off <= v_model * (1 + 5e-3) + rebound
    assert Fpeak == pytest.approx(r.peak_force.to("N").magnitude, rel=5e-3)
    # leg extension = body rise relative to the (nearly still) legs
    assert yb == pytest.approx(r.leg_stroke.to("m").magnitude, rel=5e-3)


def test_short_push_warns_about_the_capillary_time():
    r = jump(FOUR, "5 ms", profile="half-sine")
    assert r.capillary_time.to("ms").magnitude == pytest.approx(16.7, abs=0.2)  # √(l_c/g), water 20 °C
    assert any("capillary time" in w for w in r.warnings)
    assert not any("capillary time" in w for w in jump(FOUR, "50 ms", profile="half-sine").warnings)


def test_off_centre_mass_lowers_the_limit_to_the_static_capacity():
    law = heave_law(example("skimmer"))
    assert law.limit_force < law.level_limit_force
    r = jump(example("skimmer"), "40 ms")
    assert any("off the centre of support" in w for w in r.warnings)


def test_bad_inputs_are_one_line_errors():
    with pytest.raises(InputError, match="push_time"):
        jump(FOUR, "3 mm")
    with pytest.raises(InputError, match="push_force: must exceed"):
        jump(FOUR, 0.02, push_force="0.1 mN")
    with pytest.raises(InputError, match="not both"):
        jump(FOUR, 0.02, push_force="5 mN", takeoff_speed="1 m/s")
    with pytest.raises(InputError, match="profile"):
        jump(FOUR, 0.02, profile="square")


def test_cli_json_keys(capsys):
    code = main(["jump", "--example", "twin_rod", "--push-time", "30ms", "--takeoff-speed", "0.2m/s", "--json"])
    out, err = capsys.readouterr()
    assert code == 0, err
    d = json.loads(out)
    for k in ("max_takeoff_speed_m_per_s", "takeoff_speed_m_per_s", "breaks_surface", "peak_force_N",
              "jump_height_m"):
        assert k in d
    assert d["breaks_surface"] is False
    assert d["takeoff_speed_m_per_s"] == pytest.approx(0.2)
    assert d["jump_height_m"] == pytest.approx(0.2**2 / (2 * 9.80665))
    code = main(["jump", "--example", "twin_rod", "--push-time", "abc"])
    assert code == 2 and "push_time" in capsys.readouterr().err


def test_textured_coating_checked_for_push_and_landing():
    """A wide-pitch post texture (f = 1/225, depinning pressure ~ 58 Pa, by the closed form of
    tests/test_wetting.py) holds the hydrostatic pressure at the limit depth (~ 40 Pa) but
    floods on landing at the take-off speed (½ρv² ~ 65 Pa)."""
    wide = {"texture": "posts", "post_size": 10e-6, "pitch": 150e-6, "post_height": 30e-6}
    r = jump(example("twin_rod"), "50 ms", profile="half-sine", texture=wide)
    assert [c.state for c in r.coating] == ["cassie", "cassie"]
    assert r.floods_on_landing is True
    assert any("landing" in w for w in r.warnings)
    fine = {"texture": "posts", "post_size": 10e-6, "pitch": 40e-6, "post_height": 30e-6}
    assert jump(example("twin_rod"), "50 ms", profile="half-sine", texture=fine).floods_on_landing is False


def test_device_too_heavy_to_float_cannot_jump():
    heavy = design_from_data({
        "schema_version": 1, "liquid": {"name": "water"},
        "body": {"mass": "5 g", "centre_of_mass": ["0 mm", "0 mm"]},
        "legs": [{"kind": "rod", "position": ["0 mm", y], "radius": "0.15 mm", "length": "20 mm",
                  "material": "steel", "coating": {"advancing": "115 deg"}} for y in ("5 mm", "-5 mm")],
    })
    r = jump(heavy, "30 ms")
    assert r.breaks_surface and r.takeoff_speed is None and r.max_takeoff_speed.magnitude == 0.0
    assert any("cannot carry its own weight" in w for w in r.warnings)
