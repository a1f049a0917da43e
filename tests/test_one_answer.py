"""One question, one answer: every path that computes the same number gives the same number.

Each check compares two code paths a user can take to the same quantity (the element's public
function, the same element alone in a device, the study model, the CLI); they must agree to the
solver tolerances stated beside each assertion.
"""

from __future__ import annotations

import json
import math

import pytest

import floatcalc as fc
from floatcalc.cli import main
from floatcalc.design import design_from_data
from floatcalc.elements import get_kind, kinds

WATER = {"name": "water", "temperature": "20 degC"}
COATING = {"advancing": "150 deg", "receding": "120 deg"}

#: one element of every kind, as a design-file table (invented sizes)
TABLES = {
    "rod": {"radius": "0.25 mm", "length": "20 mm"},
    "rod_row": {"radius": "0.2 mm", "length": "50 mm", "rods": 3, "spacing": "3 mm"},
    "flexible_leg": {"radius": "0.1 mm", "length": "40 mm", "material": "nylon"},
    "pin": {"radius": "0.1 mm", "length": "3 mm"},
    "ball": {"radius": "0.5 mm"},
    "pad": {"radius": "2 mm", "thickness": "0.2 mm"},
    "ring": {"ring_radius": "5 mm", "wire_radius": "0.2 mm"},
}


def alone(kind: str):
    """A design of one element of ``kind`` at the origin, weightless body."""
    el = {"kind": kind, "position": ["0 mm", "0 mm"], "material": "steel", "coating": dict(COATING)}
    el.update(TABLES[kind])
    return design_from_data({"schema_version": 2, "liquid": WATER, "body": {"mass": "0 g"}, "elements": [el]})


def test_every_kind_has_a_table_here():
    assert sorted(TABLES) == sorted(k.name for k in kinds())


@pytest.mark.parametrize("kind", sorted(TABLES))
def test_public_result_equals_the_element_alone_in_a_device(kind):
    d = alone(kind)
    p = d.elements[0]
    res = get_kind(kind).solve(p, d.liquid)
    r = fc.solve_device(d)
    # capacity of a device of one element = that element's limit force (Brent on the payload,
    # rtol 1e-8; flexible legs tabulate their curve on 25 clamp depths, hence 1e-3 there)
    tol = 1e-3 if kind == "flexible_leg" else 1e-6
    assert r.capacity.to("N").magnitude == pytest.approx(res.max_force.to("N").magnitude, rel=tol)
    assert r.elements[0].limit_force.to("N").magnitude == pytest.approx(res.max_force.to("N").magnitude, rel=tol)
    # one contact perimeter per kind, hence one Baudoin number (flexible legs: their result has
    # no perimeter field yet; the device uses 2L + 2R for them)
    if kind == "flexible_leg":
        return
    assert r.contact_perimeter.to("m").magnitude == pytest.approx(res.contact_perimeter.to("m").magnitude, rel=1e-3)


def test_rod_function_device_study_model_and_cli_agree():
    r = fc.rod("0.25 mm", "20 mm", "150 deg", material_density="7850 kg/m^3")
    m = fc.rod_model(radius="0.25 mm", length="20 mm", contact_angle="150 deg")
    assert float(m.evaluate({})["max_force"]) == pytest.approx(r.max_force.to("N").magnitude, rel=1e-12)
    dev = fc.solve_device(alone("rod"))
    assert dev.capacity.to("N").magnitude == pytest.approx(r.max_force.to("N").magnitude, rel=1e-7)


def test_cli_leg_and_device_baudoin_agree(capsys, tmp_path):
    path = tmp_path / "one.toml"
    fc.save_design(alone("rod"), path)
    assert main(["device", str(path), "--json"]) == 0
    dev = json.loads(capsys.readouterr().out)
    assert main(["leg", "--radius", "0.25mm", "--length", "20mm", "--contact-angle", "150deg", "--json"]) == 0
    leg = json.loads(capsys.readouterr().out)
    # the leg's own Baudoin number is its own weight over σP; the device's is its load over σP:
    # with no body and no payload the two loads are the same weight
    assert dev["baudoin_number"] == pytest.approx(leg["baudoin_number"], rel=1e-9)
    assert dev["capacity_N"] == pytest.approx(leg["max_force_N"], rel=1e-7)


def test_rod_row_equals_parallel_rods():
    d = alone("rod_row")
    pr = fc.parallel_rods("0.2 mm", "50 mm", "150 deg", 3, "3 mm", liquid=d.liquid, material_density="7850 kg/m^3")
    r = fc.solve_device(d)
    assert r.capacity.to("N").magnitude == pytest.approx(pr.max_force.to("N").magnitude, rel=1e-4)


def test_ring_rule_lives_in_one_place():
    from floatcalc.elements.ring import ring_rule
    from floatcalc.errors import InputError

    msg = ring_rule(3e-4, 2e-4)
    with pytest.raises(InputError) as a:
        fc.ring("0.3 mm", "0.2 mm", "150 deg")
    bad = dict(TABLES["ring"], ring_radius="0.3 mm")
    with pytest.raises(InputError) as b:
        design_from_data({"schema_version": 2, "body": {"mass": "0 g"}, "elements": [
            {"kind": "ring", "position": ["0 mm", "0 mm"], "material": "steel", "coating": COATING, **bad}]})
    assert str(a.value) == msg and str(b.value) == f"elements[0].{msg}"


def test_quick_layout_of_far_apart_copies_carries_count_times_one():
    # count = 4 laid out around the body with no radius: far apart (6 l_c between neighbours),
    # so the device carries four times one leg, less the small superposed-meniscus coupling
    el = {"kind": "rod", "count": 4, "material": "steel", "coating": COATING, **TABLES["rod"]}
    d = design_from_data({"schema_version": 2, "body": {"mass": "0 g"}, "elements": [el]})
    one = fc.rod("0.25 mm", "20 mm", "150 deg").max_force.to("N").magnitude
    cap = fc.solve_device(d).capacity.to("N").magnitude
    assert cap == pytest.approx(4 * one, rel=2e-3)
    assert cap <= 4 * one * (1 + 1e-9)  # neighbours never add capacity


def test_verdict_words_are_one_set():
    from floatcalc.device.assess import VERDICTS

    for name in fc.list_device_examples():
        r = fc.solve_device(fc.device_example(name["name"]))
        assert r.verdict in VERDICTS
    assert math.isfinite(r.safety_factor)
