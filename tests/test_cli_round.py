"""CLI: floatcalc pin, ball, pad, ring (JSON keys, text output, exit code 2 on bad input)."""

from __future__ import annotations

import json

import pytest

from floatcalc.cli import main


def _run(capsys, *argv):
    code = main(list(argv))
    out = capsys.readouterr()
    return code, out.out, out.err


@pytest.mark.parametrize("argv,keys", [
    (["pin", "--radius", "0.1mm", "--contact-angle", "60deg"], ["meniscus_height_m", "vertical_force_N"]),
    (["ball", "--radius", "0.5mm", "--contact-angle", "150deg"], ["max_force_N", "depth_at_max_m", "payload_N"]),
    (["pad", "--radius", "2mm", "--thickness", "0.2mm", "--contact-angle", "110deg"],
     ["max_force_N", "depth_at_max_m", "payload_N"]),
    pytest.param(["ring", "--ring-radius", "3mm", "--wire-radius", "0.15mm", "--contact-angle", "150deg"],
                 ["max_force_N", "depth_at_max_m", "payload_N"], marks=pytest.mark.slow),  # ~3 s: the ring's solves
])
def test_json_keys(capsys, argv, keys):
    code, out, _ = _run(capsys, *argv, "--json")
    assert code == 0
    d = json.loads(out)
    for k in [*keys, "bond_number", "warnings", "cautions"]:
        assert k in d
    assert all(isinstance(d[k], float) for k in keys)


def test_pin_sign_of_meniscus_height(capsys):
    _, out, _ = _run(capsys, "pin", "--radius", "0.1mm", "--contact-angle", "120deg", "--depth", "2mm", "--json")
    assert json.loads(out)["meniscus_height_m"] < 0  # non-wetting: depressed
    _, out, _ = _run(capsys, "pin", "--radius", "0.1mm", "--contact-angle", "30deg", "--json")
    assert json.loads(out)["meniscus_height_m"] > 0


def test_text_output_and_curve(capsys):
    code, out, _ = _run(capsys, "pad", "--radius", "2mm", "--thickness", "0.2mm", "--contact-angle", "110deg",
                        "--curve", "--liquid", "ethanol")
    assert code == 0
    assert "pinned at top edge" in out and "force-depth curve" in out
    assert "Flammable" in out and "clean liquid surface" in out
    code, out, _ = _run(capsys, "ball", "--radius", "0.5mm", "--contact-angle", "150deg", "--json", "--curve")
    assert len(json.loads(out)["curve"]["depth_m"]) > 10


@pytest.mark.parametrize("argv", [
    ["ball", "--radius", "-0.5mm", "--contact-angle", "150deg"],
    ["ball", "--radius", "0.5mm", "--contact-angle", "200deg"],
    ["pad", "--radius", "2mm", "--thickness", "0.2kg", "--contact-angle", "110deg"],
    ["ring", "--ring-radius", "0.2mm", "--wire-radius", "0.15mm", "--contact-angle", "150deg"],
    ["pin", "--radius", "0.1mm", "--contact-angle", "60deg", "--depth", "-1mm"],
    ["pin", "--radius", "abc", "--contact-angle", "60deg"],
])
def test_bad_input_exit_2(capsys, argv):
    code, out, err = _run(capsys, *argv)
    assert code == 2
    assert err.startswith("floatcalc: error: ") and err.count("\n") == 1 and "Traceback" not in err
