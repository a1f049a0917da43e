"""``floatcalc fit`` options: element kinds and their geometry, error models, nuisance parameters, JSON keys."""

from __future__ import annotations

import json
import math

import numpy as np
import pytest

from floatcalc.cli import main
from floatcalc.studies.fit import force_depth_law


def _csv(tmp_path, theta=118.0, offset=0.0, tare=0.0, noise=0.02e-3, seed=3):
    geo = {"radius": "0.5 mm", "length": "60 mm"}
    law = force_depth_law("rod", geo)
    D = np.concatenate([np.linspace(-1e-3, -0.2e-3, 8), np.linspace(0.05e-3, 4e-3, 40)])
    F = np.where(D < 0, 0.0, law(D, math.radians(theta), 0.072736)[0])
    F = F + tare + np.random.default_rng(seed).normal(0, noise, D.size)
    p = tmp_path / "rig.csv"
    p.write_text("# invented\ndepth [mm];force [mN]\n" + "".join(
        f"{(d + offset) * 1e3:.6f};{f * 1e3:.6f}\n".replace(".", ",") for d, f in zip(D, F)))
    return p


def test_cli_json_keys_with_offset_tare_and_stated_uncertainty(tmp_path, capsys):
    # Data written semicolon-separated with decimal commas (a dialect the reader must accept).
    p = _csv(tmp_path, offset=0.1e-3, tare=0.2e-3)
    assert main(["fit", "--data", str(p), "--radius", "0.5mm", "--length", "60mm", "--force-uncertainty",
                 "0.02mN", "--fit-depth-offset", "--fit-tare", "--json", "--confidence", "0.999"]) == 0
    d = json.loads(capsys.readouterr().out)
    for k in ("contact_angle_deg", "contact_angle_ci_deg", "depth_offset_m", "depth_offset_ci_m", "tare_N",
              "tare_ci_N", "correlation", "interval_method", "standard_errors", "wald_ci", "profile_ci",
              "chi_squared", "error_model", "receding_angle_deg"):
        assert k in d, k
    lo, hi = d["contact_angle_ci_deg"]
    assert lo < 118.0 < hi
    lo, hi = d["depth_offset_ci_m"]
    assert lo < 0.1e-3 < hi
    lo, hi = d["tare_ci_N"]
    assert lo < 0.2e-3 < hi
    assert d["interval_method"] == "profile likelihood" and d["receding_angle_deg"] is None


def test_cli_text_output_and_proportional_uncertainty(tmp_path, capsys):
    p = _csv(tmp_path)
    assert main(["fit", "--data", str(p), "--radius", "0.5mm", "--length", "60mm", "--force-uncertainty",
                 "0.02mN+0.5%", "--intervals", "wald"]) == 0
    out = capsys.readouterr().out
    assert "advancing contact angle" in out and "Wald (Jacobian) interval" in out
    assert "0.5 % of the reading + 0.02 mN" in out


@pytest.mark.parametrize("argv, needle", [
    (["--element", "ball", "--radius", "1mm", "--spacing", "2mm"], "spacing: is not an input of a ball"),
    (["--element", "rod_row", "--radius", "0.25mm", "--length", "40mm"], "spacing: is required"),
    (["--element", "ring", "--ring-radius", "3mm"], "wire-radius: is required"),
    (["--radius", "0.5mm", "--length", "60mm", "--force-uncertainty", "lots"], "force_uncertainty"),
])
def test_cli_refuses_bad_options_with_one_line(tmp_path, capsys, argv, needle):
    p = _csv(tmp_path)
    assert main(["fit", "--data", str(p), *argv]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and needle in err[0]


def test_cli_demo_cycle_and_plot(tmp_path, capsys):
    png = tmp_path / "cycle.png"
    assert main(["fit", "--demo-cycle", "--json", "--save", str(png)]) == 0
    d = json.loads(capsys.readouterr().out)
    # the invented file was made at 118° / 96°, offset 0.08 mm, tare 0.15 mN (its header says so)
    for key, truth in (("contact_angle_ci_deg", 118.0), ("receding_angle_ci_deg", 96.0),
                       ("depth_offset_ci_m", 0.08e-3), ("tare_ci_N", 0.15e-3)):
        lo, hi = d[key]
        assert lo < truth < hi, key
    assert d["invented"] is True and d["pull_points"] > 0
    assert png.read_bytes()[:4] == b"\x89PNG"
