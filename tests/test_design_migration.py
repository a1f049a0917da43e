"""One design format: older files load with a note, 'floatcalc design upgrade' rewrites them in
schema 2 keeping their comments, and save → load is exact for every element kind."""

from __future__ import annotations

import tomllib

import floatcalc as fc
from floatcalc.cli import main
from floatcalc.design import design_text, load_design

QUICK = '''# Invented example: an old quick-design file as the page used to save it
title = "Invented example: a six-legged robot"
invented = true

[liquid]
name = "water"
temperature = "20 degC"

[load]
body_mass = "1.2 g"
payload = "0.3 g"
safety_factor = 2.0

[[element]]
kind = "rod"
radius = "0.2 mm"
length = "40 mm"
count = 6
material = "steel"
coating = "superhydrophobic spray"
advancing_angle = "160 deg"
receding_angle = "150 deg"
'''

SCHEMA1 = '''# Invented example: a two-rod rig in the schema-1 format
schema_version = 1
description = "Invented example: two rods"

[body]
mass = "0.8 g"
centre_of_mass = ["0 mm", "0 mm"]

[[legs]]
kind = "rod"
position = ["0 mm", "4 mm"]
radius = "0.25 mm"
length = "60 mm"
material = "steel"
coating = { advancing = "115 deg" }

[[legs]]
kind = "rod_row"
position = ["0 mm", "-6 mm"]
radius = "0.2 mm"
length = "60 mm"
count = 2
spacing = "1.5 mm"
material = "steel"
coating = { advancing = "115 deg" }
'''


def test_quick_file_loads_with_a_note_as_far_apart_copies():
    d = load_design(text=QUICK)
    assert d.notes and "quick-design" in d.notes[0]
    assert len(d.elements) == 6 and d.load["safety_factor"] == 2.0
    assert abs(d.load["payload"] - 0.3e-3) < 1e-15 and abs(d.body["mass"] - 1.2e-3) < 1e-15
    assert d.elements[0]["coating"]["name"] == "superhydrophobic spray"
    r = fc.solve_device(d)
    one = fc.rod("0.2 mm", "40 mm", "160 deg").max_force.to("N").magnitude
    assert abs(r.capacity.to("N").magnitude / (6 * one) - 1) < 2e-3   # far apart: six times one leg


def test_upgrade_command_rewrites_in_schema_2_and_keeps_comments(tmp_path, capsys):
    for text in (QUICK, SCHEMA1):
        path = tmp_path / "old.toml"
        path.write_text(text, encoding="utf-8")
        before = load_design(path)
        assert main(["design", "upgrade", str(path)]) == 0
        new = path.read_text(encoding="utf-8")
        assert new.startswith("# Invented example")
        data = tomllib.loads(new)
        assert data["schema_version"] == 2 and "elements" in data and "legs" not in data and "element" not in data
        after = load_design(path)
        assert after.notes == ()
        assert after.elements == before.elements          # the same placed elements, SI
        assert main(["device", str(path), "--json"]) == 0
    capsys.readouterr()


def test_save_load_is_exact_for_every_kind(tmp_path):
    from floatcalc.elements import kind_names

    tables = {
        "rod": {"radius": "0.25 mm", "length": "20 mm", "heading": "30 deg"},
        "rod_row": {"radius": "0.2 mm", "length": "30 mm", "rods": 3, "spacing": "3 mm"},
        "flexible_leg": {"radius": "0.1 mm", "length": "30 mm", "material": "nylon", "clamp_angle": "5 deg"},
        "pin": {"radius": "0.1 mm", "length": "3 mm"},
        "ball": {"radius": "0.5 mm"},
        "pad": {"radius": "2 mm", "thickness": "0.2 mm"},
        "ring": {"ring_radius": "5 mm", "wire_radius": "0.2 mm"},
    }
    assert sorted(tables) == sorted(kind_names())
    els = []
    for k, (kind, geo) in enumerate(tables.items()):
        el = {"kind": kind, "name": f"{kind} # one", "position": [f"{40 * k} mm", "0 mm"],
              "coating": {"advancing": "140 deg", "receding": "120 deg", "texture": "cassie", "solid_fraction": 0.5}}
        el.setdefault("material", "steel")
        el.update(geo)
        els.append(el)
    text = ('# Invented example: every kind once\nschema_version = 2\ndescription = "Invented: every kind"\n'
            '[body]\nmass = "1 g"\ncentre_of_mass = ["120 mm", "0 mm"]\n')
    import tomlkit

    doc = tomlkit.parse(text)
    doc["elements"] = els
    d = load_design(text=tomlkit.dumps(doc))
    path = tmp_path / "every.toml"
    fc.save_design(d, path)
    again = load_design(path)
    assert again == d and again.elements == d.elements
    assert path.read_text(encoding="utf-8").startswith("# Invented example")
    assert design_text(again) == path.read_text(encoding="utf-8")
