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
