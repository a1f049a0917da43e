"""Issue 8 §2: one table of bad inputs across the API, the CLI, design files, CSV data and the page.

Every case asserts the house convention for a refused input (DEVELOPERS.md, "Conventions"):
``InputError`` with exactly one line ``field: what is allowed, got VALUE`` that names the field
(the key path for design files) and states the allowed range or form; on the CLI that same line
on stderr with exit code 2 and no traceback; a file the user gave keeps its bytes and mtime; on
the page an inline error beside the field, no exception, and the rest of the page still drawn.

The expected allowed ranges written in the table are the published validity ranges of each
correlation (as documented in PHYSICS.md / README), not values read back from the code:
water IAPWS R1-76 0.01–100 °C, seawater 0–40 °C and 0–42 g/kg (EOS-80), the organic liquids'
ranges of their Jasper (1972) fits, contact angles 0–180° through the liquid.

Separately, a payload beyond capacity is not an error: a "sinks" verdict with the shortfall.
"""

from __future__ import annotations

import json
import os
from dataclasses import dataclass
from pathlib import Path
from typing import Any, Callable

import pytest

import floatcalc as fc
from floatcalc.cli import main as cli_main
from floatcalc.device.design import example_text
from floatcalc.errors import InputError

APP = str(Path(__file__).resolve().parents[1] / "app.py")
TWIN = example_text("twin_rod")  # invented two-rod rig shipped with floatcalc


def _edit(old: str, new: str, text: str = TWIN) -> str:
    """The invented twin-rod design with one value changed (first occurrence)."""
    assert old in text, old
    return text.replace(old, new, 1)


@dataclass(frozen=True)
class Case:
    id: str
    where: str  # api | cli | design | csv | page
    what: Any  # callable (api), argv (cli), file text (design/csv), (label, value) (page)
    field: str  # must appear in the message (key path for design files; file name for file-level problems)
    allowed: str  # words stating the allowed range or form (case-insensitive)


def _api(fn: Callable[[], Any]):
    return fn


R, L, A = "0.25 mm", "40 mm", "150 deg"
LEG = ["leg", "--radius", "0.2mm", "--length", "40mm", "--contact-angle", "150deg"]


def _leg(**over):
    argv = list(LEG)
    for k, v in over.items():
        argv[argv.index(f"--{k.replace('_', '-')}") + 1] = v
    return argv


CASES = [
    # --- API: sizes (zero, negative, NaN, infinite, wrong dimension) ---------------------------
    Case("api-rod-radius-zero", "api", lambda: fc.rod("0 mm", L, A), "radius", "must be positive"),
    Case("api-rod-radius-negative", "api", lambda: fc.rod("-0.3 mm", L, A), "radius", "must be positive"),
    Case("api-rod-radius-nan", "api", lambda: fc.rod(float("nan"), L, A), "radius", "finite number"),
    Case("api-rod-radius-inf", "api", lambda: fc.rod("inf mm", L, A), "radius", "finite number"),
    Case("api-rod-radius-mass", "api", lambda: fc.rod("1 g", L, A), "radius", "must be a length"),
    Case("api-rod-length-zero", "api", lambda: fc.rod(R, "0 m", A), "length", "must be positive"),
    Case("api-ball-radius-nan", "api", lambda: fc.ball("nan mm", A), "radius", "finite number"),
    Case("api-ball-radius-too-big", "api", lambda: fc.ball("10 m", A), "radius", "capillary lengths"),
    Case("api-pad-thickness-negative", "api", lambda: fc.pad("2 mm", "-1 mm", "110 deg"), "thickness",
         "must be positive"),
    Case("api-ring-smaller-than-wire", "api", lambda: fc.ring("0.1 mm", "0.2 mm", A), "ring_radius",
         "at least twice the wire radius"),
    Case("api-parallel-rods-overlap", "api", lambda: fc.parallel_rods("0.2 mm", "50 mm", "115 deg", 4, "0.3 mm"),
         "spacing", "must exceed twice the radius"),
    Case("api-parallel-rods-count-zero", "api", lambda: fc.parallel_rods("0.2 mm", "50 mm", "115 deg", 0, "3 mm"),
         "count", "whole number from 1"),
    Case("api-flexleg-modulus", "api", lambda: fc.flexible_leg("0.1 mm", "60 mm", A, youngs_modulus="1 Pa"),
         "youngs_modulus", "between 0.1 MPa and 1200 GPa"),
    # --- API: contact angles ---------------------------------------------------------------------
    Case("api-angle-above-180", "api", lambda: fc.rod(R, L, "200 deg"), "contact_angle", "between 0 and 180 deg"),
    Case("api-angle-negative", "api", lambda: fc.pin("0.1 mm", "-5 deg"), "contact_angle", "between 0 and 180 deg"),
    Case("api-angle-is-a-length", "api", lambda: fc.rod(R, L, "5 mm"), "contact_angle", "must be an angle"),
    Case("api-receding-above-advancing", "api", lambda: fc.rod(R, L, "100 deg", receding_angle="120 deg"),
         "receding_angle", "must not exceed the advancing angle"),
    # --- API: temperatures outside each correlation's range ------------------------------------
    Case("api-water-hot", "api", lambda: fc.water("150 degC"), "temperature", "0.01 to 100 °C"),
    Case("api-water-frozen", "api", lambda: fc.water("-10 degC"), "temperature", "0.01 to 100 °C"),
    Case("api-water-temperature-length", "api", lambda: fc.water("20 mm"), "temperature", "must be a temperature"),
    Case("api-seawater-hot", "api", lambda: fc.seawater("50 degC"), "temperature", "0 to 40 °C"),
    Case("api-seawater-cold", "api", lambda: fc.liquid("seawater", "-5 degC"), "temperature", "0 to 40 °C"),
    Case("api-seawater-salinity", "api", lambda: fc.seawater("20 degC", "60 g/kg"), "salinity", "0 to 42 g/kg"),
    Case("api-ethanol-hot", "api", lambda: fc.liquid("ethanol", "90 degC"), "temperature", "0 to 70 °C"),
    Case("api-methanol-hot", "api", lambda: fc.liquid("methanol", "70 degC"), "temperature", "0 to 60 °C"),
    Case("api-isopropanol-hot", "api", lambda: fc.liquid("isopropanol", "80 degC"), "temperature", "0 to 75 °C"),
    Case("api-acetone-hot", "api", lambda: fc.liquid("acetone", "60 degC"), "temperature", "0 to 50 °C"),
    Case("api-ethylene-glycol-cold", "api", lambda: fc.liquid("ethylene glycol", "5 degC"), "temperature",
         "10 to 100 °C"),
    Case("api-glycerol-hot", "api", lambda: fc.liquid("glycerol", "60 degC"), "temperature", "10 to 50 °C"),
    Case("api-silicone-oil-hot", "api", lambda: fc.liquid("silicone oil", "90 degC"), "temperature", "0 to 80 °C"),
    # --- API: unknown names, with the nearest-name suggestion ------------------------------------
    Case("api-unknown-liquid", "api", lambda: fc.liquid("watr"), "liquid", "did you mean 'water'"),
    Case("api-unknown-material", "api", lambda: fc.leg_material("stell"), "material", "did you mean 'steel'"),
    Case("api-dirty-above-clean", "api", lambda: fc.contaminated(fc.water(), "100 mN/m"), "surface_tension",
         "at most the clean value"),
    Case("api-negative-payload", "api",
         lambda: fc.solve_device(fc.load_design(None, text=TWIN), payload="-1 g"), "payload", "from 0 to 100 kg"),
    # --- CLI ---------------------------------------------------------------------------------------
    Case("cli-leg-radius-zero", "cli", _leg(radius="0mm"), "radius", "must be positive"),
    Case("cli-leg-radius-negative", "cli", _leg(radius="-1mm"), "radius", "must be positive"),
    Case("cli-leg-radius-no-unit", "cli", _leg(radius="0.2"), "radius", "must be a length"),
    Case("cli-leg-radius-nan", "cli", _leg(radius="nanmm"), "radius", "number with a unit"),
    Case("cli-ball-radius-inf", "cli", ["ball", "--radius", "infmm", "--contact-angle", "150deg"], "radius",
         "number with a unit"),
    Case("cli-leg-angle-190", "cli", _leg(contact_angle="190deg"), "contact_angle", "between 0 and 180 deg"),
    Case("cli-water-hot", "cli", ["liquid", "water", "--temperature", "120degC"], "temperature", "0.01 to 100 °C"),
    Case("cli-seawater-salinity", "cli", ["liquid", "seawater", "--salinity", "50g/kg"], "salinity", "0 to 42 g/kg"),
    Case("cli-acetone-hot", "cli", ["liquid", "acetone", "--temperature", "60degC"], "temperature", "0 to 50 °C"),
    Case("cli-unknown-liquid", "cli", ["liquid", "wter"], "liquid", "did you mean 'water'"),
    Case("cli-unknown-material", "cli", _leg() + ["--material", "stainles"], "material",
         "did you mean 'stainless steel'"),
    Case("cli-unknown-example", "cli", ["device", "--example", "skimer"], "example", "did you mean 'skimmer'"),
    # --- design files (API load + solve, and `floatcalc device FILE`) ------------------------------
    Case("design-radius-negative", "design", _edit('radius = "0.25 mm"', 'radius = "-0.1 mm"'), "elements[0].radius",
         "must be positive"),
    Case("design-radius-nan", "design", _edit('radius = "0.25 mm"', 'radius = "nan mm"'), "elements[0].radius",
         "finite number"),
    Case("design-radius-mass", "design", _edit('radius = "0.25 mm"', 'radius = "0.25 kg"'), "elements[0].radius",
         "must be a length"),
    Case("design-radius-bare-number", "design", _edit('radius = "0.25 mm"', "radius = 0.25"), "elements[0].radius",
         "needs a unit"),
    Case("design-position-one-value", "design", _edit('position = ["0 mm", "-4 mm"]', 'position = ["0 mm"]'),
         "elements[1].position", "list of two lengths"),
    Case("design-advancing-200", "design", _edit('advancing = "115 deg"', 'advancing = "200 deg"'),
         "elements[0].coating.advancing", "between 0 and 180 deg"),
    Case("design-receding-above", "design", _edit('receding = "95 deg"', 'receding = "130 deg"'),
         "elements[0].coating.receding", "must not exceed the advancing angle"),
    Case("design-water-hot", "design", _edit('temperature = "20 degC"', 'temperature = "120 degC"'),
         "liquid.temperature", "0.01 to 100 °C"),
    Case("design-unknown-liquid", "design", _edit('name = "water"', 'name = "watter"'), "liquid",
         "did you mean 'water'"),
    Case("design-unknown-material", "design", _edit('material = "steel"', 'material = "stel"'), "elements[0].material",
         "did you mean 'steel'"),
    Case("design-unknown-kind", "design", _edit('kind = "rod"', 'kind = "rood"'), "elements[0].kind",
         "did you mean 'rod'"),
    Case("design-unknown-key", "design", _edit('heading = "0 deg"', 'headng = "0 deg"'), "elements[0].headng",
         "did you mean 'heading'"),
    Case("design-schema-version", "design", _edit("schema_version = 2", "schema_version = 7"), "schema_version",
         "reads versions 1 and 2"),
    Case("design-body-mass-negative", "design", _edit('mass = "0.8 g"', 'mass = "-0.8 g"'), "body.mass",
         "from 0 to 100 kg"),
    Case("design-malformed-toml", "design", _edit('mass = "0.8 g"', 'mass = "0.8 g'), "robot.toml", "not valid TOML"),
    Case("design-oversized", "design", TWIN + "\n# " + "x" * 1_000_100 + "\n", "robot.toml", "at most 1000 kB"),
    Case("design-overlapping-elements", "design",
         _edit('position = ["0 mm", "-4 mm"]', 'position = ["0 mm", "4.3 mm"]'), "elements[0] and elements[1]",
         "footprints overlap"),
    Case("design-centre-of-mass-outside", "design",
         _edit('centre_of_mass = ["0 mm", "0 mm"]', 'centre_of_mass = ["0 mm", "50 mm"]'), "body.centre_of_mass",
         "inside the support polygon"),
    # --- force-depth CSV for the fit (API fit_rod_csv and `floatcalc fit --data FILE`) ------------
    Case("csv-empty", "csv", "", "data", "header line"),
    Case("csv-header-without-units", "csv", "depth,force\n0.1,0.2\n", "data", "unit in brackets"),
    Case("csv-missing-column", "csv", "depth [mm]\n0.1\n0.2\n", "data", "needs a column 'force"),
    Case("csv-force-in-kg", "csv", "depth [mm],force [kg]\n0.1,0.2\n0.2,0.3\n", "data", "must be a force unit"),
    Case("csv-unknown-unit", "csv", "depth [mm],force [blorp]\n0.1,0.2\n", "data", "unknown unit"),
    Case("csv-not-a-number", "csv", "depth [mm],force [mN]\n0.1,abc\n0.2,0.3\n", "data", "is not a number"),
    Case("csv-extra-field", "csv", "depth [mm],force [mN]\n0.1,0.2,0.3\n", "data", "header has 2"),
    Case("csv-nan-value", "csv", "depth [mm],force [mN]\n0.1,nan\n", "data", "not finite"),
    Case("csv-oversized", "csv", "depth [mm],force [mN]\n" + "0.10,0.20\n" * 120_000, "data", "at most 1000 kB"),
    # --- the page (streamlit AppTest on app.py, opening on the invented skimmer device) -----------
    Case("page-leg-radius-nan", "page", ("radius [mm]", "nan mm"), "elements[0].radius", "finite number"),
    Case("page-advancing-200", "page", ("advancing angle [deg]", "200 deg"), "elements[0].coating.advancing",
         "between 0 and 180 deg"),
    Case("page-temperature-hot", "page", ("temperature [degC]", "200 degC"), "liquid.temperature", "0.01 to 100 °C"),
    Case("page-payload-wrong-unit", "page", ("payload [g]", "3 mm"), "load.payload", "mass"),
]


def _check_line(msg: str, case: Case) -> None:
    assert "\n" not in msg.strip() and "\r" not in msg, f"more than one line: {msg!r}"
    assert msg.strip(), "empty message"
    assert case.field in msg, f"field {case.field!r} not named in {msg!r}"
    assert case.allowed.lower() in msg.lower(), f"allowed form {case.allowed!r} not stated in {msg!r}"
    assert "Traceback" not in msg and "nan" != msg.strip().lower()


def _run_cli(argv, capsys) -> str:
    rc = cli_main(list(argv))
    out, err = capsys.readouterr()
    assert rc == 2, f"exit code {rc}, stderr {err!r}"
    assert "Traceback" not in err and "Traceback" not in out
    lines = err.strip().splitlines()
    assert len(lines) == 1, err
    assert lines[0].startswith("floatcalc: error: ")
    return lines[0][len("floatcalc: error: "):]


def _snapshot(path: Path):
    return path.read_bytes(), os.stat(path).st_mtime_ns


def _page(case: Case) -> None:
    from streamlit.testing.v1 import AppTest

    label, value = case.what
    at = AppTest.from_file(APP, default_timeout=60).run()
    assert not at.exception
    hits = [t for t in at.text_input if t.label == label]
    assert hits, f"no text input labelled {label!r} on the page"
    hits[0].set_value(value).run()
    assert not at.exception, [e.value for e in at.exception]
    import re

    # the page shows text from inputs escaped for Markdown (plain text): undo that to read it
    errors = [re.sub(r"\\(.)", r"\1", e.value) for e in at.error]
    assert errors, "no inline error shown"
    mine = [e for e in errors if e.startswith(case.field + ":")]
    assert len(mine) == 1, errors
    _check_line(mine[0], case)
    # the rest of the page still renders, and the last good results stay, marked not current
    heads = {s.value for s in at.subheader}
    assert {"Liquid", "Support elements", "Body and load", "Results", "Compare designs", "Reports"} <= heads, heads
    assert any("Not current" in w.value for w in at.warning)


@pytest.mark.parametrize("case", CASES, ids=[c.id for c in CASES])
def test_bad_input_is_refused_with_one_clear_line(case: Case, tmp_path, capsys):
    if case.where == "api":
        with pytest.raises(InputError) as exc:
            case.what()
        _check_line(str(exc.value), case)
    elif case.where == "cli":
        _check_line(_run_cli(case.what, capsys), case)
    elif case.where in ("design", "csv"):
        path = tmp_path / ("robot.toml" if case.where == "design" else "rig.csv")
        path.write_text(case.what, encoding="utf-8", newline="")
        before = _snapshot(path)
        with pytest.raises(InputError) as exc:
            if case.where == "design":
                fc.solve_device(fc.load_design(path))
            else:
                from floatcalc.studies.fit import fit_rod_csv

                fit_rod_csv(path, radius="0.25 mm", length="60 mm")
        _check_line(str(exc.value), case)
        argv = (["device", str(path)] if case.where == "design"
                else ["fit", "--radius", "0.25mm", "--length", "60mm", "--data", str(path)])
        _check_line(_run_cli(argv, capsys), case)
        assert _snapshot(path) == before, "the user's file was changed"
    elif case.where == "page":
        _page(case)
    else:  # pragma: no cover - a mistake in the table
        raise AssertionError(case.where)


def test_table_covers_the_brief():
    """At least 40 cases, and every front end represented (a guard on the table itself)."""
    assert len(CASES) >= 40
    assert {c.where for c in CASES} == {"api", "cli", "design", "csv", "page"}
    assert len({c.id for c in CASES}) == len(CASES)


# ------------------------------------------------------------------------------------------------
# A payload beyond capacity is an answer, not an error.

def test_payload_beyond_capacity_sinks_with_shortfall_api():
    d = fc.device_example("twin_rod")
    r0 = fc.solve_device(d)
    r = fc.solve_device(d, payload="1 kg")
    assert r.verdict == "sinks"
    # shortfall = weight of 1 kg less what the device can still carry (independent arithmetic)
    expected = 1.0 * 9.80665 - r0.max_payload.to("N").magnitude
    assert r.shortfall.to("N").magnitude == pytest.approx(expected, rel=0.02)
    assert r.shortfall.to("N").magnitude > 0


def test_payload_beyond_capacity_sinks_with_shortfall_cli(capsys):
    rc = cli_main(["device", "--example", "skimmer", "--payload", "1kg", "--json"])
    out, err = capsys.readouterr()
    assert rc == 0, err
    assert "Traceback" not in err
    d = json.loads(out)
    assert d["verdict"] == "sinks"
    assert d["shortfall_N"] > 0
    assert d["shortfall_N"] == pytest.approx(9.80665 - d["max_payload_N"], rel=0.02)


@pytest.mark.parametrize("call,field", [
    (lambda: fc.rod("0.2 mm", "20 mm", "150 deg", liquid=5), "liquid"),
    (lambda: fc.ball("0.5 mm", "150 deg", liquid=3.0), "liquid"),
    (lambda: fc.flexible_leg("0.1 mm", "30 mm", "150 deg", material="nylon", liquid=[1]), "liquid"),
    (lambda: fc.rod("0.2 mm", "20 mm", "150 deg", curve_points=10**9), "curve_points"),
    (lambda: fc.rod("0.2 mm", "20 mm", "150 deg", curve_points=1), "curve_points"),
    (lambda: fc.rod_limit([1e-4, 2e-4], [1.0, 2.0, 3.0]), "contact_angle"),
    (lambda: fc.rod(1j, "20 mm", "150 deg"), "radius"),
    (lambda: fc.solve_device(None), "design"),
    (lambda: fc.solve_device({"a": 1}), "design"),
    (lambda: fc.save_design(None, "x.toml"), "design"),
    (lambda: fc.load_design(None), "design"),
])
def test_wrong_types_in_python_raise_the_package_input_error(call, field):
    with pytest.raises(InputError) as exc:
        call()
    assert str(exc.value).startswith(field + ":") and "\n" not in str(exc.value)
