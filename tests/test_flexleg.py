"""Public flexible-leg API (floatcalc.flexleg): invariants, inputs, CLI.

Published and cross-method checks are in tests/reference/test_flexleg_reference.py and
tests/test_beam.py; here: Hypothesis invariants, bad input, JSON keys and exit codes.
"""

from __future__ import annotations

import json
import math

import numpy as np
import pytest
from hypothesis import given, settings, strategies as st

from floatcalc.cli import main
from floatcalc.errors import InputError
from floatcalc.flexleg import flexible_leg, flexible_leg_curve


@pytest.mark.slow
@settings(max_examples=60, deadline=None)  # fewer than 200: each example solves two limit
@given(                                    # searches (two nonlinear BVP continuations)
    radius_mm=st.floats(0.05, 0.25),
    length_mm=st.floats(10.0, 60.0),
    theta_deg=st.floats(100.0, 180.0),
    log_e=st.floats(9.0, 11.9),
    factor=st.floats(1.5, 100.0),
)
def test_stiffer_leg_carries_more_and_never_beats_rigid(radius_mm, length_mm, theta_deg, log_e, factor):
    # Physical expectation (horizontal clamp): a stiffer leg stays flatter, so more of it works
    # near the limit depth; the rigid leg, all of it at the limit depth, bounds it. Same grid
    # for both stiffnesses so that only E changes.
    common = dict(contact_angle=f"{theta_deg} deg", material_density=7850.0, length_points=0, nodes=240)
    soft = flexible_leg(radius_mm * 1e-3, length_mm * 1e-3, youngs_modulus=10**log_e, **common)
    stiff = flexible_leg(radius_mm * 1e-3, length_mm * 1e-3, youngs_modulus=min(10**log_e * factor, 1.2e12),
                         **common)
    p_soft, p_stiff = soft.payload.magnitude, stiff.payload.magnitude
    rigid = stiff.rigid_payload.magnitude
    assert math.isfinite(p_soft) and math.isfinite(p_stiff)
    assert p_soft <= p_stiff * (1 + 1e-9)
    assert p_stiff <= rigid * (1 + 1e-9)
    assert 0.0 < soft.flexible_to_rigid <= 1.0 + 1e-9


def test_result_fields_and_shape_are_consistent():
    r = flexible_leg("0.1 mm", "40 mm", "150 deg", material="nylon")
    d = r.to_dict()
    for key in ("max_force_N", "payload_N", "own_weight_N", "depth_at_max_m", "tip_depth_m",
                "wetted_length_m", "rigid_max_force_N", "winkler_length_m", "saturation_length_m",
                "contact_position_at_max_deg", "receding_max_force_N"):
        assert key in d
    # payload = liquid force − own weight, by definition of the support at the clamp
    assert d["payload_N"] == pytest.approx(d["max_force_N"] - d["own_weight_N"], rel=1e-4)
    depth = r.shape["depth_m"]
    assert np.max(depth) == pytest.approx(d["depth_at_max_m"], rel=1e-6)
    assert depth[-1] == pytest.approx(d["tip_depth_m"])
    assert d["wetted_length_m"] <= d["length_m"] + 1e-12
    assert r.cautions and "surface tension" in r.cautions[0]
    assert len(r.length_curve.length) == 12


def test_flexible_nylon_leg_saturates_and_warns():
    # A soft nylon leg much longer than its Winkler length: the far part floats, the tip rises.
    r = flexible_leg("0.1 mm", "60 mm", "150 deg", material="nylon")
    assert r.tip_depth < r.clamp_depth_at_max
    assert r.flexible_to_rigid < 0.5
    assert r.saturation_length < r.length


def test_toe_and_clamp_angle_accepted():
    r = flexible_leg("0.1 mm", "30 mm", "150 deg", material="tungsten", clamp_angle="5 deg",
                     toe_angle="20 deg", length_points=0)
    assert r.toe_angle.magnitude == pytest.approx(20.0)
    assert r.shape["slope_deg"][-1] < r.shape["slope_deg"][0]


def test_curve_rises_to_the_limit():
    c = flexible_leg_curve("0.1 mm", "30 mm", "150 deg", material="steel", points=8)
    r = flexible_leg("0.1 mm", "30 mm", "150 deg", material="steel", length_points=0)
    assert np.all(np.diff(c.force.magnitude) > 0)
    assert c.payload.magnitude[-1] == pytest.approx(r.payload.magnitude, rel=1e-6)


@pytest.mark.parametrize("kwargs, field", [
    (dict(), "youngs_modulus"),
    (dict(material="unobtainium"), "material"),
    (dict(youngs_modulus="-3 GPa"), "youngs_modulus"),
    (dict(youngs_modulus="3 kg"), "youngs_modulus"),
    (dict(material="steel", clamp_angle="50 deg"), "clamp_angle"),
    (dict(material="steel", toe_angle="-5 deg"), "toe_angle"),
    (dict(material="steel", toe_length="80 mm"), "toe_length"),
    (dict(material="steel", receding_angle="160 deg"), "receding_angle"),
])
def test_bad_input_is_one_line_input_error(kwargs, field):
    with pytest.raises(InputError) as exc:
        flexible_leg("0.1 mm", "30 mm", "150 deg", length_points=0, **kwargs)
    msg = str(exc.value)
    assert msg.startswith(f"{field}:") and "\n" not in msg and ", got " in msg


def test_too_heavy_leg_is_refused():
    with pytest.raises(InputError, match="too heavy to float"):
        flexible_leg("3 mm", "30 mm", "150 deg", material="tungsten", length_points=0)


@pytest.mark.slow
def test_cli_flexible_json_and_errors(capsys):
    assert main(["leg", "--radius", "0.1mm", "--length", "30mm", "--contact-angle", "150deg",
                 "--material", "steel", "--clamp-angle", "5deg", "--json"]) == 0
    d = json.loads(capsys.readouterr().out)
    for key in ("max_force_N", "payload_N", "tip_depth_m", "wetted_length_m", "rigid_max_force_N"):
        assert math.isfinite(d[key])
    assert main(["leg", "--radius", "0.1mm", "--length", "30mm", "--contact-angle", "150deg",
                 "--material", "stel"]) == 2
    err = capsys.readouterr().err
    assert "did you mean 'steel'" in err and err.count("\n") == 1
    assert main(["leg", "--radius", "0.1mm", "--length", "30mm", "--contact-angle", "150deg",
                 "--youngs-modulus", "200GPa"]) == 0
    out = capsys.readouterr().out
    assert "Winkler length" in out and "clean liquid surface" in out


def test_device_flexible_leg_kind_adds_up_far_apart_legs():
    # Cross-check of the device adapter: four identical flexible legs far apart (60 mm, about
    # 22 l_c: superposed menisci negligible) on a level body carry four single-leg limits.
    from floatcalc.device import solve_device
    from floatcalc.device.design import design_from_data

    legs = [{"kind": "flexible_leg", "name": f"f{i}", "position": [f"{x} mm", f"{y} mm"],
             "heading": f"{h} deg", "radius": "0.1 mm", "length": "30 mm", "material": "steel",
             "coating": {"advancing": "150 deg"}}
            for i, (x, y, h) in enumerate([(30, 30, 0), (-30, 30, 180), (-30, -30, 180), (30, -30, 0)])]
    design = design_from_data({"schema_version": 1, "liquid": {"name": "water", "temperature": "20 degC"},
                               "body": {"mass": "0.2 g", "centre_of_mass": ["0 mm", "0 mm"]}, "legs": legs})
    r = solve_device(design)
    one = flexible_leg("0.1 mm", "30 mm", "150 deg", material="steel", length_points=0)
    total_limit = 4 * one.max_force.to("N").magnitude
    weight = r.weight.to("N").magnitude
    assert r.verdict == "floats"
    assert r.max_payload.to("N").magnitude == pytest.approx(total_limit - weight, rel=1e-3)


def test_leg_whose_tip_lifts_off_still_reaches_its_limit():
    # Regression (found by Hypothesis for an earlier version, where the tip snapped off): a
    # soft, nearly non-wetting leg whose tip rises out of the liquid on the way down. The tip
    # ends above the reach of the receding law (first contact −2 cos(θ_r/2) l_c, 2D first
    # integral) and is reported dry; the limit is still reached and consistent with the shape.
    r = flexible_leg(0.0625e-3, 25e-3, "177 deg", youngs_modulus=4e9, material_density=7850.0,
                     length_points=0, nodes=240)
    lc = r.liquid.lc
    assert np.max(r.shape["depth_m"]) == pytest.approx(r.depth_at_max.to("m").magnitude, rel=1e-8)
    assert r.tip_depth.to("m").magnitude < -2 * math.cos(math.radians(177.0) / 2) * lc
    assert not r.shape["wetted"][-1]
    assert r.dry_lifted_length.to("m").magnitude > 0.1 * r.length.to("m").magnitude
    assert any("is dry at the limit" in w for w in r.warnings)
    assert math.isfinite(r.payload.magnitude) and r.payload.magnitude > 0
    assert r.limit_criterion in ("clamp-force maximum", "local breakthrough")


def test_device_flexible_leg_needs_a_modulus_or_material():
    from floatcalc.device.design import design_from_data

    leg = {"kind": "flexible_leg", "name": "f", "position": ["0 mm", "0 mm"], "radius": "0.1 mm",
           "length": "30 mm", "coating": {"advancing": "150 deg"}, "material_density": "7850 kg/m^3"}
    data = {"schema_version": 1, "liquid": {"name": "water"},
            "body": {"mass": "0.1 g", "centre_of_mass": ["0 mm", "0 mm"]}, "legs": [leg]}
    with pytest.raises(InputError, match=r"legs\[0\]\.youngs_modulus: required"):
        design_from_data(data)
    leg["youngs_modulus"] = "-2 GPa"
    with pytest.raises(InputError, match=r"legs\[0\]\.youngs_modulus: must be between"):
        design_from_data(data)


def test_cli_flexible_refuses_spacing(capsys):
    # Flexible legs are modelled far apart; a shared-meniscus spacing must not be ignored silently.
    assert main(["leg", "--radius", "0.1mm", "--length", "30mm", "--contact-angle", "150deg",
                 "--material", "steel", "--spacing", "3mm", "--count", "2"]) == 2
    assert capsys.readouterr().err.startswith("floatcalc: error: spacing:")


def _wetted_from_profile(r):
    """Wetted length from the reported shape alone: nodes marked wetted, crossings at half a
    node spacing (a check on the bookkeeping, not on the physics)."""
    s, w = r.shape["s_m"], r.shape["wetted"]
    ds = np.diff(s)
    return float(np.sum(ds * (w[1:] & w[:-1])) + 0.5 * np.sum(ds * (w[1:] ^ w[:-1])))


def test_lifted_root_of_a_steep_clamp_is_dry_and_counted_out():
    # Clamp pointing 15° down: the leg is set down from above, so its root, still above the
    # surface at the limit, never touched the liquid (PHYSICS.md: a contact line only advances
    # onto a section pushed into the liquid). It must be dry, carry nothing, not count as
    # wetted, and be reported.
    r = flexible_leg("0.1 mm", "30 mm", "150 deg", material="steel", clamp_angle="15 deg", length_points=0)
    depth, wet, load = r.shape["depth_m"], r.shape["wetted"], r.shape["liquid_load_N_per_m"]
    assert depth[0] < 0.0 and not wet[0]
    assert np.all(load[(depth < -0.05 * r.liquid.lc) & ~wet] == 0.0)
    dry = r.dry_lifted_length.to("m").magnitude
    wetted = r.wetted_length.to("m").magnitude
    assert dry > 0.2 * r.length.to("m").magnitude
    assert wetted + dry == pytest.approx(r.length.to("m").magnitude, rel=1e-2)
    assert wetted == pytest.approx(_wetted_from_profile(r), abs=2 * r.length.to("m").magnitude / r.nodes)
    assert any("is dry at the limit" in w for w in r.warnings)


def test_lifted_wetted_part_follows_the_receding_law():
    # A nylon leg about two Winkler lengths long: bending lifts its tip out of the liquid after
    # it was wetted at first touch. PHYSICS.md: a rising contact line recedes. With a smaller
    # receding angle the lifted part pulls down harder (the 2D rod law at the receding angle,
    # Vella, Lee & Kim 2006), and the liquid clings higher; the warnings name the law used.
    common = dict(material="nylon", length_points=0)
    adv = flexible_leg("0.1 mm", "25 mm", "150 deg", **common)
    rec = flexible_leg("0.1 mm", "25 mm", "150 deg", receding_angle="60 deg", **common)
    for r in (adv, rec):
        depth, wet = r.shape["depth_m"], r.shape["wetted"]
        lifted = (depth < 0) & wet
        assert r.lifted_length.to("m").magnitude > 0 and np.any(lifted)
        assert np.all(r.shape["liquid_load_N_per_m"][lifted] < 0)      # lifted: pulled down
        assert r.wetted_length.to("m").magnitude == pytest.approx(_wetted_from_profile(r),
                                                                   abs=2 * r.length.to("m").magnitude / r.nodes)

    def pull(r):
        m = (r.shape["depth_m"] < 0) & r.shape["wetted"]
        return np.trapezoid(np.where(m, r.shape["liquid_load_N_per_m"], 0.0), r.shape["s_m"])

    assert pull(rec) < pull(adv) < 0
    assert rec.receding_angle.magnitude == pytest.approx(60.0)
    assert any("receding-angle law (60°)" in w for w in rec.warnings)
    assert not any("receding angle not given" in w for w in rec.warnings)
    assert any("receding angle not given" in w for w in adv.warnings)


def test_true_limit_is_not_below_the_local_limit_nor_above_the_rod_law():
    # The limit is the largest clamp force on the way down, so it is at least the support when
    # the deepest point first reaches the rod law's limit depth (earlier versions' limit), and
    # a level leg's liquid force is at most L × the rod law's largest force per length (every
    # section at best at the limit; Vella, Lee & Kim 2006), that is the rigid leg's.
    for kw in (dict(contact_angle="150 deg"), dict(contact_angle="120 deg", clamp_angle="-5 deg"),
               dict(contact_angle="170 deg", toe_angle="30 deg")):
        r = flexible_leg("0.1 mm", "60 mm", material="steel", length_points=0, **kw)
        assert r.payload.magnitude >= r.local_limit_payload.magnitude * (1 - 1e-9)
        assert r.limit_criterion in ("clamp-force maximum", "local breakthrough")
        assert r.depth_at_max.to("m").magnitude <= r.shape["breakthrough_depth_m"] * (1 + 1e-9)
    level = flexible_leg("0.1 mm", "60 mm", "150 deg", material="steel", length_points=0)
    assert level.max_force.magnitude <= level.rigid_max_force.magnitude * (1 + 1e-9)
    assert level.payload.magnitude > 1.03 * level.local_limit_payload.magnitude


def test_curve_ends_at_the_limit_with_its_criterion():
    kw = dict(material="steel", clamp_angle="-5 deg")
    c = flexible_leg_curve("0.1 mm", "60 mm", "120 deg", points=10, start="touch", **kw)
    r = flexible_leg("0.1 mm", "60 mm", "120 deg", length_points=0, **kw)
    assert c.limit_criterion == r.limit_criterion
    assert c.payload.magnitude[-1] == pytest.approx(r.payload.magnitude, rel=1e-9)
    assert c.clamp_depth.magnitude[-1] == pytest.approx(r.clamp_depth_at_max.magnitude, rel=1e-9)
    assert np.all(np.diff(c.force.magnitude) > 0)
    # start="touch": the unbent leg's deepest point (here the clamp) at the undisturbed surface
    assert c.clamp_depth.magnitude[0] == pytest.approx(0.0, abs=1e-12)


def test_leg_whose_path_snaps_reports_the_drop():
    # Regression (found by a seeded random search over the Hypothesis ranges): a soft,
    # nearly non-wetting leg with an upturned toe whose load path folds (no neighbouring
    # equilibrium) and jumps to a branch with a lower clamp force. The search must pass the
    # fold, end at a limit not below the force before the jump, and report the drop.
    r = flexible_leg(0.1222e-3, 37.69e-3, "174.08 deg", youngs_modulus=1.014e9, material_density=7850.0,
                     clamp_angle="-5.94 deg", toe_angle="15.78 deg", length_points=0)
    drop = [w for w in r.warnings if "snap lowered the clamp force" in w]
    assert any("snapped" in w for w in r.warnings) and len(drop) == 1
    before = float(drop[0].split(" from ")[1].split(" to ")[0]) * 1e-3
    assert r.payload.to("N").magnitude >= before
    assert r.payload.magnitude >= r.local_limit_payload.magnitude * (1 - 1e-9)
