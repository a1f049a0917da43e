"""Design files: validation messages, round trip, size and syntax limits (floatcalc.device.design)."""

from __future__ import annotations

import math
import tomllib

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from floatcalc.cli import main
from floatcalc.device.design import (Design, design_from_data, design_text, example, example_text, list_examples,
                                     load_design, save_design)
from floatcalc.device.elements import effective_angle
from floatcalc.errors import InputError

GOOD = """
schema_version = 1
description = "invented test design"

[liquid]
name = "water"
temperature = "25 degC"

[body]
mass = "0.4 g"
centre_of_mass = ["0 mm", "0 mm"]

[[legs]]
kind = "rod"
position = ["0 mm", "5 mm"]
radius = "0.2 mm"
length = "15 mm"
material = "steel"
coating = { advancing = "110 deg", receding = "90 deg" }

[[legs]]
kind = "rod"
position = ["0 mm", "-5 mm"]
radius = "0.2 mm"
length = "15 mm"
material_density = "2700 kg/m^3"
coating = { advancing = "100 deg", texture = "cassie", solid_fraction = 0.4 }
"""


def test_good_design_loads():
    d = load_design(None, text=GOOD)
    assert len(d.legs) == 2 and d.legs[0]["radius"] == pytest.approx(2e-4)
    assert d.legs[1]["density"] == 2700.0 and d.legs[1]["coating"]["texture"] == "cassie"
    assert d.liquid.T == pytest.approx(298.15)


def test_all_problems_reported_at_once_with_key_paths():
    bad = (GOOD.replace('radius = "0.2 mm"', 'radius = "-0.1 mm"', 1)
           .replace('length = "15 mm"\nmaterial_density', 'lenght = "15 mm"\nmaterial_density')
           .replace('mass = "0.4 g"', 'mass = 0.4')
           .replace('temperature = "25 degC"', 'temperature = "250 degC"'))
    with pytest.raises(InputError) as exc:
        load_design("bad.toml", text=bad)
    lines = str(exc.value).splitlines()
    assert lines[0].startswith("bad.toml: ")
    body = "\n".join(lines[1:])
    assert "legs[0].radius: must be positive, got -0.1 mm" in body
    assert "legs[1].lenght: unknown key (did you mean 'length'?)" in body
    assert "legs[1].length: required" in body
    assert "body.mass: needs a unit" in body
    assert "liquid.temperature: water allows 0.01 to 100 °C" in body
    assert all(": " in line for line in lines)


def test_single_problem_is_one_line():
    with pytest.raises(InputError) as exc:
        load_design(None, text=GOOD.replace('advancing = "110 deg"', 'advancing = "200 deg"'))
    assert str(exc.value) == "legs[0].coating.advancing: must be between 0 and 180 deg, got 200 deg"


def test_misspelt_top_level_and_kind():
    with pytest.raises(InputError) as exc:
        load_design(None, text=GOOD.replace("[body]", "[bdoy]").replace('kind = "rod"', 'kind = "rdo"', 1))
    msg = str(exc.value)
    assert "bdoy: unknown key (did you mean 'body'?)" in msg
    assert "legs[0].kind: unknown element kind (did you mean 'rod'?)" in msg


def test_round_element_keys_validated():
    text = GOOD.replace('kind = "rod"', 'kind = "ring"', 1).replace('radius = "0.2 mm"\nlength = "15 mm"',
                                                                  'ring_radius = "2 mm"\nwire_radius = "3 mm"', 1)
    with pytest.raises(InputError, match=r"legs\[0\].ring_radius: must be at least twice the wire radius"):
        load_design(None, text=text)
    text = GOOD.replace('kind = "rod"', 'kind = "ball"', 1)
    with pytest.raises(InputError) as exc:
        load_design(None, text=text)
    assert "legs[0].length: unknown key" in str(exc.value)


def test_unavailable_kind_refuses_clearly():
    from floatcalc.elements import _registry as reg

    class Missing(reg.ElementKind):
        name = "test_foot"
        unavailable = "element kind 'test_foot' needs floatcalc.nothing, which this version does not have"

    reg.register_kind(Missing())
    try:
        with pytest.raises(InputError, match=r"legs\[0\].kind: element kind 'test_foot' needs floatcalc.nothing"):
            load_design(None, text=GOOD.replace('kind = "rod"', 'kind = "test_foot"', 1))
    finally:
        reg._KINDS.pop("test_foot")


def test_rod_row_spacing_must_clear_the_rods():
    text = GOOD.replace('kind = "rod"', 'kind = "rod_row"\ncount = 3\nspacing = "0.3 mm"', 1)
    with pytest.raises(InputError, match=r"legs\[0\].spacing: must exceed twice the radius \(0.4 mm\)"):
        load_design(None, text=text)


def test_schema_version_required_and_checked():
    with pytest.raises(InputError, match="schema_version: this floatcalc reads versions 1 and 2, got 3"):
        load_design(None, text=GOOD.replace("schema_version = 1", "schema_version = 3"))
    # a schema-2 file names its element tables [[elements]]; [[legs]] there is a misspelt key
    with pytest.raises(InputError, match=r"legs: unknown key"):
        load_design(None, text=GOOD.replace("schema_version = 1", "schema_version = 2"))


def test_schema1_file_loads_with_a_note_and_upgrades():
    d = load_design(None, text=GOOD)
    assert d.notes and "schema-1" in d.notes[0] and "floatcalc design upgrade" in d.notes[0]
    text = design_text(d)
    new = tomllib.loads(text)
    assert new["schema_version"] == 2 and len(new["elements"]) == 2 and "legs" not in new
    again = load_design(None, text=text)
    assert again.notes == () and again.elements == d.elements


def test_malformed_toml_is_one_line_with_position():
    with pytest.raises(InputError) as exc:
        load_design(None, text=GOOD.replace('name = "water"', 'name = "water'))
    msg = str(exc.value)
    assert "\n" not in msg and "is not valid TOML" in msg and "line" in msg and "column" in msg


def test_oversized_file_refused(tmp_path):
    p = tmp_path / "big.toml"
    p.write_text(GOOD + "#" * 1_100_000, encoding="utf-8")
    with pytest.raises(InputError, match=r"files may be at most 1000 kB"):
        load_design(p)


def test_round_trip_of_every_example(tmp_path):
    for e in list_examples():
        d1 = example(e["name"])
        save_design(d1, tmp_path / "x.toml")
        d2 = load_design(tmp_path / "x.toml")
        assert d1 == d2 and d1.legs == d2.legs


_len = st.floats(0.05, 0.5).map(lambda v: f"{v:.6g} mm")


@settings(max_examples=100, deadline=None)  # 100: each example parses ~20 unit strings with pint (~25 ms)
@given(st.lists(st.tuples(st.floats(-50, 50), st.floats(-50, 50), _len, st.floats(0, 180), st.text(max_size=12)),
                min_size=1, max_size=5))
def test_round_trip_property(legs):
    """load → save → load gives an equal design, for arbitrary positions, names and sizes."""
    data = {
        "schema_version": 1, "description": "invented \"quoted\" \\ design",
        "liquid": {"name": "water", "temperature": "20 degC"},
        "body": {"mass": "1 g", "centre_of_mass": ["0 mm", "0 mm"]},
        "legs": [{"kind": "rod", "name": name, "position": [f"{x!r} mm", f"{y!r} mm"], "radius": r,
                  "length": "10 mm", "heading": f"{h!r} deg", "material": "steel",
                  "coating": {"advancing": "120 deg"}} for x, y, r, h, name in legs],
    }
    d1 = design_from_data(data)
    text = design_text(d1)
    d2 = load_design(None, text=text)
    assert d1 == d2 and design_text(d2) == text


def test_texture_models_limits():
    """Wenzel with r = 1 and Cassie–Baxter with f = 1 leave θ unchanged; f → 0 tends to 180°
    (limits of the published formulas)."""
    th = math.radians(105)
    assert effective_angle(th, {"texture": "wenzel", "roughness": 1.0}) == pytest.approx(th)
    assert effective_angle(th, {"texture": "cassie", "solid_fraction": 1.0}) == pytest.approx(th)
    assert math.degrees(effective_angle(th, {"texture": "cassie", "solid_fraction": 1e-6})) > 179.0
    # roughness amplifies: hydrophobic gets more so (Wenzel 1936)
    assert effective_angle(th, {"texture": "wenzel", "roughness": 1.5}) > th


def test_texture_keys_validated():
    with pytest.raises(InputError, match=r"legs\[1\].coating.solid_fraction: must be a plain number above 0"):
        load_design(None, text=GOOD.replace("solid_fraction = 0.4", "solid_fraction = 1.4"))
    with pytest.raises(InputError, match=r"legs\[0\].coating.receding: must not exceed the advancing angle"):
        load_design(None, text=GOOD.replace('receding = "90 deg"', 'receding = "130 deg"'))


def test_examples_labelled_invented():
    for e in list_examples():
        assert e["description"].startswith("Invented example")
        assert "Invented example" in example_text(e["name"]).splitlines()[0]


def test_cli_bad_file_exit_2_one_line_per_problem(tmp_path, capsys):
    p = tmp_path / "bad.toml"
    p.write_text(GOOD.replace('radius = "0.2 mm"', 'radius = "-0.1 mm"', 1).replace('mass = "0.4 g"', 'mass = "x"'),
                 encoding="utf-8")
    code = main(["device", str(p)])
    err = capsys.readouterr().err
    assert code == 2 and "Traceback" not in err
    assert "legs[0].radius: must be positive, got -0.1 mm" in err and "body.mass" in err
    code = main(["device", str(tmp_path / "missing.toml")])
    assert code == 2 and "no such design file" in capsys.readouterr().err


def test_cli_list_examples(capsys):
    assert main(["device", "--list-examples"]) == 0
    assert "skimmer" in capsys.readouterr().out
    assert main(["device", "--example", "skimer"]) == 2
    assert "did you mean 'skimmer'" in capsys.readouterr().err


def test_design_equality_is_by_content():
    a = load_design(None, text=GOOD)
    b = load_design(None, text=GOOD)
    assert isinstance(a, Design) and a == b and hash(a) == hash(b)
    assert tomllib.loads(design_text(a))["elements"][1]["coating"]["solid_fraction"] == 0.4
