"""Public API for long horizontal rods (floatcalc.rod, floatcalc.rod_limit).

Physics against published results and independent methods lives in
tests/reference/test_rod_reference.py; here: units, scaling, warnings, cautions, hysteresis,
hand estimates and published order-of-magnitude bands.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

import floatcalc as fc
from floatcalc.errors import InputError

SIGMA20 = 0.0727361  # N/m, water 20 °C (IAPWS R1-76)
LC20 = 2.7259e-3     # m, water 20 °C


@pytest.fixture(scope="module")
def leg():
    return fc.rod("0.25 mm", "40 mm", "150 deg")


def test_leg_against_hand_estimates(leg):
    # Hand estimate: a thin (Bo ≈ 0.008) non-wetting leg carries about 2σL = 5.82 mN from
    # surface tension plus a little meniscus pressure; the depth stays below 2 l_c + 2R.
    two_sigma_L = 2 * SIGMA20 * 0.04
    st = leg.surface_tension_part.to("N").magnitude
    pr = leg.pressure_part.to("N").magnitude
    end = leg.end_part.to("N").magnitude
    assert st - end == pytest.approx(two_sigma_L, rel=1e-3)  # ψ ≈ 90° at the limit
    # the two ends add at most σ × the chord 2R across each flat end face (contact-line bound);
    # a depressed rod's ends add nothing (core.finite_rod: the solved 3D ends are negative)
    assert 0 <= end <= SIGMA20 * 2 * (2 * 0.25e-3) * (1 + 1e-12)
    assert 0 < pr < 0.2 * two_sigma_L
    # pressure part bounded by the weight of a liquid slab 2R wide and (2 l_c + 2R) deep
    assert pr < 998.2 * 9.80665 * 0.04 * 2 * 0.25e-3 * (2 * LC20 + 0.5e-3)
    assert leg.max_force.to("N").magnitude == pytest.approx(st + pr, rel=1e-12)
    assert 0 < leg.depth_at_max.to("m").magnitude < 2 * LC20 + 2 * 0.25e-3
    assert leg.inclination_at_max.to("deg").magnitude == pytest.approx(90, abs=1)
    # own weight of a steel wire by hand: 7850 kg/m³ × π (0.25 mm)² × 40 mm × g = 0.6046 mN
    assert leg.own_weight.to("mN").magnitude == pytest.approx(0.6046, rel=1e-3)
    assert leg.payload.to("N").magnitude == pytest.approx(
        leg.max_force.to("N").magnitude - leg.own_weight.to("N").magnitude, rel=1e-12)
    assert leg.bond_number == pytest.approx((0.25e-3 / LC20) ** 2, rel=1e-3)


def test_result_json_keys_and_values_are_si(leg):
    d = leg.to_dict()
    for key in ("max_force_N", "max_force_per_length_N_per_m", "depth_at_max_m", "surface_tension_part_N",
                "pressure_part_N", "payload_N", "own_weight_N", "payload_mass_kg", "bond_number",
                "baudoin_number", "contact_angle_deg", "radius_m", "length_m"):
        assert key in d, key
        assert isinstance(d[key], float) and math.isfinite(d[key]), key
    # per length: the long-rod (2D) value; the total adds the bounded ends
    assert d["max_force_per_length_N_per_m"] * 0.04 + d["end_part_N"] == pytest.approx(d["max_force_N"], rel=2e-3)
    assert d["contact_perimeter_m"] == pytest.approx(2 * 0.04 + 4 * 0.25e-3 * math.sin(
        math.radians(d["contact_position_at_max_deg"])), rel=1e-12)
    assert d["radius_m"] == 0.00025 and d["contact_angle_deg"] == pytest.approx(150)
    assert d["liquid"]["name"] == "water"
    assert d["cautions"] and "clean" in d["cautions"][0]


def test_song_sitti_wire_leg_band():
    # Source: Song, Suhr & Sitti, ICRA 2006: Teflon-coated wire legs carry about 0.15 g per cm
    # of leg. Used only as a band (0.1–0.25 g/cm): the paper's wire and coating details are not
    # at hand; the model is not tuned to it.
    for radius, angle in (("0.1 mm", "110 deg"), ("0.2 mm", "120 deg")):
        r = fc.rod(radius, "10 mm", angle)
        per_cm_g = r.max_force.to("N").magnitude / 9.80665 * 1e3
        assert 0.1 < per_cm_g < 0.25


def test_count_and_length_scale_linearly():
    one = fc.rod("0.2 mm", "30 mm", "115 deg")
    six = fc.rod("0.2 mm", "30 mm", "115 deg", count=6)
    twice = fc.rod("0.2 mm", "60 mm", "115 deg")
    assert six.max_force.to("N").magnitude == pytest.approx(6 * one.max_force.to("N").magnitude, rel=1e-12)
    # doubling the length doubles the 2D part; the two ends are counted once
    assert twice.max_force.to("N").magnitude - twice.end_part.to("N").magnitude == pytest.approx(
        2 * (one.max_force.to("N").magnitude - one.end_part.to("N").magnitude), rel=2e-3)
    assert six.depth_at_max == one.depth_at_max
    assert any("far apart" in w for w in six.warnings)


def test_warnings_name_the_assumptions():
    r = fc.rod("0.2 mm", "10 mm", "60 deg")
    text = " ".join(r.warnings)
    assert "rod ends" in text               # 10 mm < 20 l_c
    assert "steel" in text                  # default material density
    assert "wetting leg" in text            # θ < 90°
    quiet = fc.rod("0.2 mm", "100 mm", "120 deg", material_density="2700 kg/m^3")
    assert quiet.warnings == ()


def test_liquid_cautions_reach_the_result():
    r = fc.rod("0.2 mm", "100 mm", "120 deg", liquid=fc.liquid("ethanol"))
    assert any("Flammable" in c for c in r.cautions)
    dirty = fc.contaminated(fc.water(), surface_tension="50 mN/m")
    rd = fc.rod("0.2 mm", "100 mm", "120 deg", liquid=dirty)
    assert any("Contaminated" in c for c in rd.cautions)
    assert rd.max_force < fc.rod("0.2 mm", "100 mm", "120 deg").max_force


def test_hysteresis_receding_limit_and_pull_off():
    r = fc.rod("0.2 mm", "50 mm", "120 deg", receding_angle="70 deg")
    assert r.receding_max_force <= r.max_force
    assert r.pull_off_force.to("N").magnitude >= 0
    # a strongly wetting receding angle adheres: the pull-off force is positive
    assert fc.rod("0.2 mm", "50 mm", "120 deg", receding_angle="20 deg").pull_off_force.magnitude > 0
    same = fc.rod("0.2 mm", "50 mm", "120 deg", receding_angle="120 deg")
    assert same.receding_max_force.to("N").magnitude == pytest.approx(same.max_force.to("N").magnitude)


def test_curve_ends_at_limit_and_profile_is_consistent(leg):
    c = leg.curve
    f = c.force.to("N").magnitude
    assert f[-1] == pytest.approx(leg.max_force.to("N").magnitude, rel=1e-12)
    assert f.max() <= leg.max_force.to("N").magnitude * (1 + 1e-12)
    assert c.depth.to("m").magnitude[-1] == pytest.approx(leg.depth_at_max.to("m").magnitude)
    assert np.all(np.diff(c.depth.to("m").magnitude) > 0)
    assert c.rows().shape == (200, 4)
    p = leg.profile
    assert p["depth_m"] == pytest.approx(leg.depth_at_max.to("m").magnitude)
    # contact point lies on the rod surface
    cx, cz = p["contact_m"]
    assert math.hypot(cx, cz - p["centre_z_m"]) == pytest.approx(0.25e-3, rel=1e-9)


def test_rod_limit_vectorised_matches_scalar_calls():
    radii = np.array([0.05e-3, 0.3e-3, 2e-3])
    angles = np.radians([100.0, 140.0, 170.0])
    lim = fc.rod_limit(radii, angles)
    for R, th, f in zip(radii, angles, lim["max_force_per_length"].to("N/m").magnitude):
        assert fc.rod(R, 0.1, th).max_force_per_length.to("N/m").magnitude == pytest.approx(f, rel=1e-12)


@pytest.mark.parametrize("kwargs, fragment", [
    (dict(radius="-0.1 mm"), "radius: must be positive"),
    (dict(radius="0 mm"), "radius: must be positive"),
    (dict(radius="nan mm"), "radius: must be a finite number"),
    (dict(length="3 kg"), "length: must be a length"),
    (dict(contact_angle="190 deg"), "contact_angle: must be between 0 and 180 deg"),
    (dict(contact_angle="150"), "contact_angle: needs a unit"),
    (dict(receding_angle="160 deg"), "receding_angle: must not exceed the advancing angle"),
    (dict(count=2.5), "count: must be a whole number"),
    (dict(count=0), "count: must be a whole number"),
    (dict(material_density="0.1 kg/m^3"), "material_density: must be between"),
])
def test_bad_input_raises_one_line_input_error(kwargs, fragment):
    args = dict(radius="0.2 mm", length="40 mm", contact_angle="150 deg")
    args.update(kwargs)
    with pytest.raises(InputError) as info:
        fc.rod(args.pop("radius"), args.pop("length"), args.pop("contact_angle"), **args)
    assert fragment in str(info.value) and "\n" not in str(info.value)
