"""Devices whose elements differ (radius, length, coating): their force–depth tables differ in
length, and the device must still solve (it once failed with a raw NumPy error)."""

from __future__ import annotations

import math

import pytest

import floatcalc as fc
from floatcalc.device.design import load_design
from floatcalc.device.solve import solve_device

MIXED = """schema_version = 1
description = "Invented test design: two unlike rods"
[liquid]
name = "water"
temperature = "20 degC"
[body]
mass = "0.5 g"
centre_of_mass = ["0 mm", "{ycom}"]
[[legs]]
kind = "rod"
position = ["0 mm", "{y0}"]
radius = "0.2 mm"
length = "30 mm"
material = "steel"
coating = {{ advancing = "115 deg", receding = "95 deg" }}
[[legs]]
kind = "rod"
position = ["0 mm", "{y1}"]
radius = "0.3 mm"
length = "40 mm"
material = "steel"
coating = {{ advancing = "140 deg" }}
"""


def _solve(y0="5 mm", y1="-5 mm", ycom="0 mm"):
    return solve_device(load_design("mixed.toml", text=MIXED.format(y0=y0, y1=y1, ycom=ycom)))


def test_unlike_rods_solve_and_balance_forces_and_moments():
    r = _solve()
    d = r.to_dict()
    forces = [e["force_N"] for e in d["elements"]]
    W = sum(forces)
    # Independent check: a static balance of the reported forces (Newton's laws, not the solver):
    # total force = weight of body + legs, and the moment about x of the element forces equals
    # that of the weights. The legs' own weights act at their own centres (y = ±5 mm).
    liq = fc.water("20 degC")
    leg_w = [7850 * math.pi * 0.2e-3**2 * 30e-3 * liq.g, 7850 * math.pi * 0.3e-3**2 * 40e-3 * liq.g]
    body_w = 0.5e-3 * liq.g
    assert W == pytest.approx(body_w + sum(leg_w), rel=1e-6)
    moment_forces = forces[0] * 5e-3 + forces[1] * (-5e-3)
    moment_weights = leg_w[0] * 5e-3 + leg_w[1] * (-5e-3)
    assert moment_forces == pytest.approx(moment_weights, abs=1e-6 * W * 5e-3)
    assert d["verdict"] == "floats" and d["max_payload_N"] > 0


def test_mirroring_the_layout_flips_the_roll():
    a = _solve().to_dict()["equilibrium"]
    b = _solve(y0="-5 mm", y1="5 mm").to_dict()["equilibrium"]
    assert a["roll_deg"] != 0.0
    assert b["roll_deg"] == pytest.approx(-a["roll_deg"], rel=1e-6, abs=1e-9)
    assert b["heave_m"] == pytest.approx(a["heave_m"], rel=1e-6)


def test_a_small_ball_beside_a_rod_does_not_shield_it_more_than_a_whole_rod_would():
    """A rod with a 0.5 mm ball foot 1.8 l_c away (invented rig). The ball's meniscus is far
    smaller than a parallel rod's at the same gap, so the rod's limit cannot fall by more than
    a full parallel neighbour's would: the exact shared-meniscus solution of two long rods
    (core.parallel2d; Vella, Lee & Kim, Langmuir 22, 5979, 2006) bounds the shielding from below.
    (The cluster's level limit once gave the rod 64 % of its limit alone: the ball reached the
    end of its branch long before the rod reached its limit.)"""
    import math

    from floatcalc.core import parallel2d
    from floatcalc.design import design_from_data
    from floatcalc.device.solve import Device, solve_device

    data = {"schema_version": 2, "description": "Invented test rig", "invented": True,
            "liquid": {"name": "water", "temperature": "20 degC"},
            "body": {"mass": "0.3 g"},
            "elements": [
                {"kind": "rod", "name": "leg N", "position": ["0 mm", "15 mm"], "radius": "0.15 mm",
                 "length": "20 mm", "material": "steel", "coating": {"advancing": "115 deg"}},
                {"kind": "rod", "name": "leg S", "position": ["0 mm", "-15 mm"], "radius": "0.15 mm",
                 "length": "20 mm", "material": "steel", "coating": {"advancing": "115 deg"}},
                *({"kind": "ball", "name": n, "position": [x, y], "radius": "0.5 mm", "material": "steel",
                   "coating": {"advancing": "115 deg"}}
                  for n, (x, y) in {"foot A": ("12 mm", "0 mm"), "foot B": ("-6 mm", "10 mm"),
                                    "foot C": ("-6 mm", "-10 mm")}.items()),
            ]}
    design = design_from_data(data)
    dev = Device.from_design(design)
    lc = design.liquid.lc
    gap = (15e-3 - 10e-3 - 0.15e-3 - 0.5e-3) / lc            # rod surface to ball surface [l_c]
    R = 0.15e-3 / lc
    th = math.radians(115)
    pair = parallel2d.row_limit(R, th, gap + 2 * R, 2)["force"] / (2 * parallel2d.row_limit(R, th, 50.0, 1)["force"])
    assert 0.9 < pair < 1.0
    assert min(dev.shielding[:2]) >= pair - 1e-3
    res = solve_device(design)          # and the device answers (it once ended in a traceback)
    assert res.verdict in ("floats", "floats with elements broken through", "sinks", "capsizes")
