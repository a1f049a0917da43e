"""'floatcalc element KIND': options generated from each kind's schema; the same number as the
kind's public function (one answer) and the one JSON shape."""

from __future__ import annotations

import json

import pytest

import floatcalc as fc
from floatcalc.cli import main
from floatcalc.elements import kind_names

ARGS = {
    "rod": ["--radius", "0.25mm", "--length", "20mm"],
    "rod_row": ["--radius", "0.2mm", "--length", "50mm", "--rods", "3", "--spacing", "3mm"],
    "flexible_leg": ["--radius", "0.1mm", "--length", "30mm", "--youngs-modulus", "2.5GPa"],
    "pin": ["--radius", "0.1mm", "--length", "3mm"],
    "ball": ["--radius", "0.5mm"],
    "pad": ["--radius", "2mm", "--thickness", "0.2mm"],
    "ring": ["--ring-radius", "5mm", "--wire-radius", "0.2mm"],
}


def test_every_registered_kind_has_a_command():
    assert sorted(ARGS) == sorted(kind_names())


@pytest.mark.parametrize("kind", [pytest.param(k, marks=pytest.mark.slow) if k == "ring" else k  # ring: ~5 s
                                  for k in sorted(ARGS)])
def test_element_command_json_shape(kind, capsys):
    assert main(["element", kind, *ARGS[kind], "--contact-angle", "150deg", "--json"]) == 0
    d = json.loads(capsys.readouterr().out)
    for key in ("max_force_N", "depth_at_max_m", "surface_tension_part_N", "pressure_part_N", "payload_N",
                "bond_number", "inputs", "liquid"):
        assert key in d, key
    assert d["inputs"]["contact_angle"] == "150deg" and d["liquid"]["name"] == "water"


def test_element_command_equals_the_public_function(capsys):
    assert main(["element", "ball", "--radius", "0.5mm", "--contact-angle", "150deg", "--json"]) == 0
    d = json.loads(capsys.readouterr().out)
    assert d["max_force_N"] == pytest.approx(fc.ball("0.5 mm", "150 deg").max_force.to("N").magnitude, rel=1e-12)


def test_bad_values_name_the_option(capsys):
    assert main(["element", "ring", "--ring-radius", "0.3mm", "--wire-radius", "0.2mm", "--contact-angle",
                 "150deg"]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and err[0].startswith("floatcalc: error: --ring-radius: must be at least twice")
