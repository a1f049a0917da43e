"""CLI commands liquid, leg and demo, run in-process, plus one run of the installed script."""

from __future__ import annotations

import json
import math
import shutil
import subprocess

import pytest

from floatcalc.cli import main

SIGMA20 = 0.0727361  # N/m, water at 20 °C (IAPWS R1-76)
LC20 = 2.7259e-3     # m


def run(capsys, *argv):
    try:
        code = main(list(argv))
    except SystemExit as exc:  # argparse's own errors
        code = exc.code
    out, err = capsys.readouterr()
    return code, out, err


LEG = ["leg", "--radius", "0.25mm", "--length", "40mm", "--contact-angle", "150deg"]


def test_leg_json_has_required_keys_with_physical_values(capsys):
    code, out, err = run(capsys, *LEG, "--json")
    assert code == 0 and err == ""
    d = json.loads(out)
    keys = ("max_force_N", "max_force_per_length_N_per_m", "depth_at_max_m", "surface_tension_part_N",
            "pressure_part_N", "payload_N", "bond_number")
    for k in keys:
        assert isinstance(d[k], float) and math.isfinite(d[k]), k
    # Hand estimate: about 2σL = 5.82 mN plus a small meniscus pressure part (Bo ≈ 0.008).
    two_sigma_L = 2 * SIGMA20 * 0.04
    assert two_sigma_L < d["max_force_N"] < 1.2 * two_sigma_L
    assert d["max_force_N"] == pytest.approx(d["surface_tension_part_N"] + d["pressure_part_N"])
    # per length: the long-rod value; the total adds the two ends, each bounded by σ × its chord 2R
    assert d["max_force_per_length_N_per_m"] * 0.04 + d["end_part_N"] == pytest.approx(d["max_force_N"], rel=2e-3)
    assert 0 <= d["end_part_N"] <= 2 * SIGMA20 * 2 * 0.25e-3  # a depressed rod's ends add nothing (core.finite_rod)
    assert d["inputs"]["radius"] == "0.25mm" and d["liquid"]["name"] == "water"
    assert d["contact_perimeter_m"] > 2 * 0.04 and d["baudoin_number"] > 0
    assert 0 < d["depth_at_max_m"] < 2 * LC20 + 2 * 0.25e-3
    assert 0 < d["payload_N"] < d["max_force_N"]
    assert d["bond_number"] == pytest.approx((0.25e-3 / LC20) ** 2, rel=1e-3)
    assert "nan" not in out.lower()


def test_leg_text_output_names_model_and_cautions(capsys):
    code, out, err = run(capsys, *LEG, "--receding-angle", "120deg", "--count", "4")
    assert code == 0 and err == ""
    assert "Vella, Lee & Kim" in out and "pull-off" in out
    assert "clean liquid surface" in out and "far apart" in out


def test_leg_in_flammable_liquid_prints_lab_caution(capsys):
    code, out, _ = run(capsys, *LEG, "--liquid", "ethanol")
    assert code == 0 and "Flammable" in out


def test_liquid_json_keys(capsys):
    code, out, err = run(capsys, "liquid", "water", "--json")
    assert code == 0 and err == ""
    d = json.loads(out)
    # IAPWS R1-76 at 20 °C: 72.74 mN/m; CIPM: 998.21 kg/m³; l_c ≈ 2.7 mm (common practice)
    assert d["surface_tension_N_per_m"] == pytest.approx(0.07274, abs=1e-5)
    assert d["density_kg_per_m3"] == pytest.approx(998.21, abs=0.01)
    assert d["capillary_length_m"] == pytest.approx(2.73e-3, abs=0.02e-3)
    assert d["cautions"]


def test_liquid_text_list_and_seawater(capsys):
    code, out, _ = run(capsys, "liquid", "seawater", "--salinity", "35g/kg", "--temperature", "15degC")
    assert code == 0 and "salinity" in out and "Nayar" in out
    code, out, _ = run(capsys, "liquid", "list", "--json")
    assert code == 0 and {r["name"] for r in json.loads(out)["liquids"]} >= {"water", "seawater", "ethanol"}


def test_demo_is_labelled_invented(capsys):
    code, out, err = run(capsys, "demo")
    assert code == 0 and err == "" and "Invented example" in out
    code, out, _ = run(capsys, "demo", "--json")
    d = json.loads(out)
    assert d["invented"] is True and d["verdict"] in ("floats", "sinks")
    assert d["capacity_N"] == pytest.approx(d["weight_N"] + d["max_payload_N"], rel=1e-12)


def test_help_lists_commands(capsys):
    code, out, _ = run(capsys, "--help")
    assert code == 0
    for name in ("liquid", "leg", "demo"):
        assert name in out


BAD = [
    ("negative radius", [*LEG[:2], "-0.25mm", *LEG[3:]], "radius: must be positive"),
    ("zero radius", [*LEG[:2], "0mm", *LEG[3:]], "radius: must be positive"),
    ("NaN radius", [*LEG[:2], "nan mm", *LEG[3:]], "radius: must be a finite number"),
    ("bare NaN", [*LEG[:2], "nan", *LEG[3:]], "radius:"),
    ("infinite length", [*LEG[:4], "inf mm", *LEG[5:]], "length: must be a finite number"),
    ("overflowing number", [*LEG[:4], "1e400mm", *LEG[5:]], "length: must be a finite number"),
    ("no unit on radius", [*LEG[:2], "0.25", *LEG[3:]], "radius: must be a length"),
    ("no unit on angle", [*LEG[:6], "150"], "contact_angle: needs a unit"),
    ("wrong dimension", [*LEG[:2], "3kg", *LEG[3:]], "radius: must be a length"),
    ("angle as length", [*LEG[:6], "2mm"], "contact_angle: must be an angle"),
    ("angle over 180", [*LEG[:6], "190deg"], "contact_angle: must be between 0 and 180 deg"),
    ("negative angle", [*LEG[:6], "-5deg"], "contact_angle: must be between 0 and 180 deg"),
    ("receding above advancing", [*LEG, "--receding-angle", "160deg"], "receding_angle: must not exceed"),
    ("unknown liquid", [*LEG, "--liquid", "watr"], "did you mean 'water'?"),
    ("temperature out of range", [*LEG, "--temperature", "150degC"], "temperature: water allows"),
    ("temperature without unit", [*LEG, "--temperature", "20"], "temperature: must be a temperature"),
    ("count not whole", [*LEG, "--count", "2.5"], "count: must be a whole number"),
    ("count zero", [*LEG, "--count", "0"], "count: must be a whole number"),
    ("missing required option", ["leg", "--length", "40mm", "--contact-angle", "150deg"], "required: --radius"),
    ("unparsable text", [*LEG[:2], "abc", *LEG[3:]], "radius: is not a number with a unit"),
    ("empty text", [*LEG[:2], "", *LEG[3:]], "radius: must be a length"),
    ("unknown option", [*LEG, "--colour", "red"], "unrecognized arguments"),
    ("unknown command", ["float"], "invalid choice"),
    ("salinity over range", ["liquid", "seawater", "--salinity", "50g/kg"], "salinity: seawater allows"),
    ("salinity without unit", ["liquid", "seawater", "--salinity", "35"], "salinity: needs a unit"),
    ("dirty sigma above clean", ["liquid", "water", "--surface-tension", "90mN/m"], "at most the clean value"),
    ("unknown liquid name", ["liquid", "mercury"], "liquid: unknown liquid"),
    ("frozen water", ["liquid", "water", "--temperature", "-5degC"], "temperature: water allows"),
    ("pasted line break", ["demo", "\x85"], "unrecognized arguments: \\x85"),
    ("newline in a value", [*LEG, "--liquid", "wat\ner"], "unknown liquid"),
]


@pytest.mark.parametrize("label, argv, fragment", BAD, ids=[b[0] for b in BAD])
def test_bad_input_one_line_exit_2_no_traceback(capsys, label, argv, fragment):
    code, out, err = run(capsys, *argv)
    assert code == 2, label
    lines = err.splitlines()  # splitlines also breaks at \x85, \u2028, ... (what a terminal may show)
    assert len(lines) == 1 and lines[0].startswith("floatcalc: error: "), err
    assert fragment in lines[0]
    assert "Traceback" not in err + out
    assert "nan" not in out.lower()
    if not any("nan" in a for a in argv):
        assert "nan" not in err.lower()


@pytest.mark.slow
def test_installed_console_script_runs():
    exe = shutil.which("floatcalc")
    assert exe is not None, "the floatcalc console script is not on PATH (pip install -e .)"
    proc = subprocess.run([exe, *LEG, "--json"], capture_output=True, text=True, timeout=60)
    assert proc.returncode == 0, proc.stderr
    assert json.loads(proc.stdout)["max_force_N"] > 0
    bad = subprocess.run([exe, *LEG[:2], "-1mm", *LEG[3:]], capture_output=True, text=True, timeout=60)
    assert bad.returncode == 2 and bad.stderr.count("\n") == 1 and "Traceback" not in bad.stderr
