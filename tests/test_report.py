"""Design assessment, design files, CSV curves and the PDF report (floatcalc.report, examples).

The totals and the operating point are checked against closed forms that do not go through
floatcalc's code: in the limit of a vanishing rod radius with a contact angle of 180° the force
per length of a floating rod is purely the surface-tension pull 2σ sin ψ, maximal (2σ) at
ψ = 90°, with the contact line at depth 2 l_c sin(ψ/2) (Vella, Lee & Kim, Langmuir 22, 5979,
2006; the 2D first integral in de Gennes, Brochard-Wyart & Quéré, Capillarity and Wetting
Phenomena, Springer 2004).
"""

from __future__ import annotations

import csv
import io
import math
import subprocess
import sys

import pytest
from pypdf import PdfReader

from floatcalc import examples as ex
from floatcalc import report as rp
from floatcalc.cli import main
from floatcalc.errors import InputError
from floatcalc.liquids import CLEAN_SURFACE_CAUTION, water

G0 = 9.80665


def _thin_rod_design(body_mass_g: float, sf: float = 2.0, count: int = 4, length_mm: float = 100.0):
    return {
        "title": "test design (invented)", "invented": True,
        "liquid": {"name": "water", "temperature": "20 degC"},
        "load": {"body_mass": f"{body_mass_g} g", "payload": "0 g", "safety_factor": sf},
        "elements": [{"kind": "rod", "radius": "0.002 mm", "length": f"{length_mm} mm", "count": count,
                      "material": "steel", "advancing_angle": "180 deg"}],
    }


def test_verdict_thresholds_follow_the_issue_definition():
    # Thresholds stated in issue 7: margin >= SF floats with margin; 1 <= m < SF marginal; < 1 sinks.
    assert rp.verdict(2.0, 2.0) == "floats with margin"
    assert rp.verdict(1.999, 2.0) == "marginal"
    assert rp.verdict(1.0, 2.0) == "marginal"
    assert rp.verdict(0.999, 2.0) == "sinks"
    assert rp.verdict(math.inf, 1.5) == "floats with margin"


def test_thin_rod_limit_and_margin_match_the_surface_tension_closed_form():
    # F_limit -> 2 σ L n for R -> 0 and θ = 180° (Vella, Lee & Kim 2006); σ(20 °C) = 72.74 mN/m
    # (IAPWS R1-76 table value). Body 1 g.
    a = rp.assess(_thin_rod_design(1.0))
    sigma = 72.74e-3
    F = 2 * sigma * 0.1 * 4
    assert a.limit_force.to("N").magnitude == pytest.approx(F, rel=2e-3)  # rod radius 0.002 mm: pressure part ~1e-3
    W_legs = 7850 * math.pi * (2e-6) ** 2 * 0.1 * 4 * G0
    W = 1e-3 * G0 + W_legs
    assert a.total_load.to("N").magnitude == pytest.approx(W, rel=1e-9)
    assert a.margin == pytest.approx(F / W, rel=2e-3)
    assert a.verdict == "floats with margin"          # F/W ≈ 5.9 ≥ 2
    assert a.shortfall is None


def test_operating_depth_matches_first_integral():
    # Load fraction x of the limit: sin ψ = x, contact-line depth 2 l_c sin(ψ/2) (closed form);
    # the leg's lowest point lies a negligible 2R(…) below it for R = 0.002 mm.
    a = rp.assess(_thin_rod_design(1.0))
    o = a.elements[0]
    x = a.total_load.to("N").magnitude / a.limit_force.to("N").magnitude
    lc = water("20 degC").lc
    expected = 2 * lc * math.sin(0.5 * math.asin(x))
    assert o.operating_depth.to("m").magnitude == pytest.approx(expected, rel=5e-3, abs=5e-6)


def test_marginal_and_sinking_designs_report_their_shortfall():
    sigma = 72.74e-3
    F = 2 * sigma * 0.1 * 4  # as above, ≈ 58.2 mN
    # 4 g: W ≈ 39.2 mN, margin ≈ 1.48 < SF 2 -> marginal, short by 2W - F.
    m = rp.assess(_thin_rod_design(4.0))
    W = m.total_load.to("N").magnitude
    assert m.verdict == "marginal"
    assert m.shortfall.to("N").magnitude == pytest.approx(2 * W - F, rel=5e-3)
    # 7 g: W ≈ 68.6 mN > F -> sinks, short by W - F, and no operating point on the curve.
    s = rp.assess(_thin_rod_design(7.0))
    W = s.total_load.to("N").magnitude
    assert s.verdict == "sinks"
    assert s.shortfall.to("N").magnitude == pytest.approx(W - F, rel=2e-2)
    assert s.elements[0].operating_depth is None


def test_baudoin_number_of_whole_design():
    # Ba = W / (σ P), P = 2 L n contact-line length (Bush & Hu 2006).
    a = rp.assess(_thin_rod_design(1.0))
    W = a.total_load.to("N").magnitude
    assert a.baudoin_number == pytest.approx(W / (72.74e-3 * 2 * 0.1 * 4), rel=1e-3)
    assert "Ba < 1" in a.baudoin_reading


def test_cautions_always_present_and_contamination_lowers_the_limit():
    a = rp.assess(ex.example("classroom"))
    assert CLEAN_SURFACE_CAUTION in a.cautions
    assert any("Electronics near water" in c for c in a.cautions)
    soapy = rp.assess(ex.alternatives(ex.example("classroom"))[1])
    assert soapy.limit_force < a.limit_force
    assert any(c.startswith("Contaminated surface") for c in soapy.cautions)
    # Ethanol is flammable: its caution reaches the assessment.
    s = ex.example("robot")
    s["liquid"] = {"name": "ethanol", "temperature": "20 degC"}
    assert any("Flammable" in c for c in rp.assess(s).cautions)


def test_examples_are_invented_and_cover_three_users():
    titles = [ex.example(n)["title"] for n in ex.EXAMPLE_NAMES]
    assert len(titles) == 3
    assert all(t.lower().startswith("invented example") for t in titles)
    assert all(ex.example(n)["invented"] for n in ex.EXAMPLE_NAMES)
    assert len(ex.alternatives(ex.example("compare"))) == 2


@pytest.mark.parametrize("name", ex.EXAMPLE_NAMES)
def test_design_file_round_trip(name):
    s = ex.example(name)
    assert ex.loads_toml(ex.dumps_toml(s)) == s


@pytest.mark.parametrize("text, words", [
    ("title = 'x'\n[liquid]\nname = 'water'\nsecret = 1\n", "unknown key in liquid"),
    ("title = \n", "not valid TOML"),
    ("[load]\nsafety_factor = 0.5\n[[element]]\nradius='1 mm'\n", "safety_factor"),
    ("[[element]]\nkind = 'teapot'\n", "kind must be one of"),
    ("[[element]]\ncount = 2.5\n", "count must be a whole number"),
])
def test_bad_design_files_refused_in_one_line(text, words):
    with pytest.raises(InputError) as e:
        ex.loads_toml(text)
    assert words in str(e.value)
    assert "\n" not in str(e.value)


def test_design_file_size_limit_and_no_evaluation():
    with pytest.raises(InputError, match="at most 64 kB"):
        ex.loads_toml(b"#" * (ex.MAX_FILE_BYTES + 1))
    with pytest.raises(InputError, match="UTF-8"):
        ex.loads_toml(b"\xff\xfe\x00")
    # Text that looks like code stays text.
    s = ex.loads_toml("title = \"__import__('os').system('echo hi')\"\n[[element]]\nradius = '0.2 mm'\n")
    assert s["title"].startswith("__import__")


def test_check_field_messages():
    assert rp.check_field("length", "30 mm") is None
    assert rp.check_field("advancing_angle", "190 deg") == "advancing_angle: must be between 0 and 180 deg, got 190 deg"
    assert rp.check_field("body_mass", "-1 g").startswith("body_mass: must be from 0 to 10 kg")
    assert rp.check_field("radius", "abc").startswith("radius: is not a number with a unit")
    assert rp.check_field("material", "unobtainium").startswith("material: unknown leg material")


def test_csv_of_every_curve():
    a = rp.assess(ex.example("robot"))
    tables = rp.curve_tables(a)
    assert set(tables) == {"group1_force_depth.csv", "group1_meniscus.csv"}
    rows = list(csv.DictReader(io.StringIO(tables["group1_force_depth.csv"])))
    assert list(rows[0]) == ["depth_m", "force_N", "surface_tension_part_N", "pressure_part_N"]
    for r in rows[::20]:
        total = float(r["surface_tension_part_N"]) + float(r["pressure_part_N"])
        assert float(r["force_N"]) == pytest.approx(total, rel=1e-6, abs=1e-12)
    # The largest force in the CSV is the limit force of the result, at the last row (limit).
    assert max(float(r["force_N"]) for r in rows) == pytest.approx(a.limit_force.to("N").magnitude, rel=1e-6)
    prof = list(csv.DictReader(io.StringIO(tables["group1_meniscus.csv"])))
    assert {p["side"] for p in prof} == {"left", "right"}


def _pdf_text(data) -> tuple[int, str]:
    reader = PdfReader(io.BytesIO(data) if isinstance(data, bytes) else data)
    return len(reader.pages), "\n".join(p.extract_text() for p in reader.pages)


def test_pdf_report_pages_headings_and_cautions():
    a = rp.assess(ex.example("robot"))
    n, text = _pdf_text(rp.pdf_bytes(a))
    assert n == 3  # summary, drawings (one element group), warnings/cautions/models
    flat = " ".join(text.split())
    for heading in ("Design summary", "Drawings", "Warnings, cautions and models", "Inputs", "Results"):
        assert heading in flat
    assert "invented example" in flat.lower()
    assert "FLOATS WITH MARGIN" in flat
    assert "Static estimate for a clean liquid surface" in flat
    assert "Electronics near water" in flat
    assert "Vella, Lee & Kim" in flat
    assert "Bond number" in flat and "Baudoin number" in flat


def test_pdf_report_with_comparison_from_cli(tmp_path):
    out = tmp_path / "cmp.pdf"
    csv_dir = tmp_path / "curves"
    code = main(["report", "--example", "compare", "-o", str(out), "--csv-dir", str(csv_dir)])
    assert code == 0
    n, text = _pdf_text(str(out))
    assert n == 4
    assert "Comparison of designs" in " ".join(text.split())
    assert len(list(csv_dir.glob("*.csv"))) == 4


def test_cli_report_bad_input_exits_2(tmp_path):
    bad = tmp_path / "bad.toml"
    bad.write_text("[liquid]\nname = 'water'\ntemperature = '150 degC'\n[[element]]\nradius = '0.2 mm'\n"
                   "length = '30 mm'\nadvancing_angle = '110 deg'\n")
    proc = subprocess.run([sys.executable, "-c", "import sys; from floatcalc.cli import main; sys.exit(main())",
                           "report", str(bad), "-o", str(tmp_path / "x.pdf")], capture_output=True, text=True,
                          timeout=120)
    assert proc.returncode == 2
    assert proc.stderr.strip().count("\n") == 0
    assert "temperature" in proc.stderr and "Traceback" not in proc.stderr


# ------------------------------------------------------------------------------------------------
# Whole devices (floatcalc.device)

def _skimmer():
    import tomllib

    from floatcalc.device.design import example_path

    return tomllib.loads(example_path("skimmer").read_text(encoding="utf-8"))


@pytest.fixture(scope="module")
def skimmer_capacity():
    from floatcalc.device import example, solve_device

    r = solve_device(example("skimmer"))
    return r.weight.to("N").magnitude, r.max_payload.to("N").magnitude


def test_device_verdict_agrees_with_the_device_solver_at_its_capacity(skimmer_capacity):
    # The device solver decides floats/sinks by its own equilibrium; the verdict rule must agree:
    # just under capacity -> margin just above 1 (marginal with SF 2), just over -> sinks.
    W, Pmax = skimmer_capacity
    under = rp.assess_device(_skimmer(), f"{0.98 * Pmax / G0} kg", 2.0)
    over = rp.assess_device(_skimmer(), f"{1.05 * Pmax / G0} kg", 2.0)
    assert under.result.verdict == "floats" and under.verdict == "marginal"
    assert 1.0 < under.margin < 1.02
    assert over.result.verdict == "sinks" and over.verdict == "sinks"
    assert over.shortfall.to("N").magnitude == pytest.approx(0.05 * Pmax, rel=1e-6)
    # Shares of the load add up to the whole weight carried.
    assert sum(e.share for e in under.result.elements) == pytest.approx(1.0, rel=1e-9)


def test_device_sweep_crossing_is_the_device_capacity(skimmer_capacity):
    # Two routes to the same number: the study's sweep of the payload crosses zero margin where
    # the device solver's capacity lies (margin is linear in the payload, so interpolation is exact).
    W, Pmax = skimmer_capacity
    seen = []
    res = rp.device_study_sweep(_skimmer(), "payload_mass", "0 g", "4 g", 5, progress=seen.append, chunks=2)
    assert seen == [0.5, 1.0]
    assert len(res.crossings) == 1
    assert res.crossings[0] == pytest.approx(Pmax / G0, rel=1e-3)


def test_device_report_has_plan_view_page(tmp_path):
    out = tmp_path / "dev.pdf"
    csv_dir = tmp_path / "c"
    from floatcalc.device.design import example_path

    assert main(["report", str(example_path("skimmer")), "-o", str(out), "--csv-dir", str(csv_dir),
                 "--payload", "0.3 g"]) == 0
    n, text = _pdf_text(str(out))
    flat = " ".join(text.split())
    assert n >= 4
    assert "Drawings (plan view)" in flat and "twelve-leg surface skimmer" in flat
    assert "Static estimate for a clean liquid surface" in flat
    rows = list(csv.DictReader(io.StringIO((csv_dir / "device_elements.csv").read_text())))
    assert len(rows) == 12
    assert sum(float(r["share"]) for r in rows) == pytest.approx(1.0, rel=1e-5)


def test_ball_feet_group_scales_with_count_and_meets_small_sphere_limit():
    # Small sphere (Bo -> 0): limit force 2πRσ sin²(θ/2) (Scheludko et al. 1976; Nutt 1960).
    # R = 0.05 mm gives Bo ≈ 3e-4; the buoyancy part is then ~Bo relative, so 2 % tolerance.
    s = _thin_rod_design(0.0)
    s["elements"] = [{"kind": "ball", "radius": "0.05 mm", "count": 3, "material": "nylon",
                      "advancing_angle": "150 deg"}]
    a = rp.assess(s)
    single = 2 * math.pi * 0.05e-3 * 72.74e-3 * math.sin(math.radians(75)) ** 2
    assert a.limit_force.to("N").magnitude == pytest.approx(3 * single, rel=2e-2)
    assert a.elements[0].per_element == 3
    # Weight of three nylon spheres (1140 kg/m³, floatcalc.materials) is the whole load here.
    W = 3 * 1140 * 4 / 3 * math.pi * (0.05e-3) ** 3 * G0
    assert a.total_load.to("N").magnitude == pytest.approx(W, rel=1e-9)


def test_study_sweep_crossing_matches_closed_form_and_reports_progress():
    # Thin rods (R -> 0, θ = 180°): each leg carries 2σL (Vella, Lee & Kim 2006), so a 3 g body
    # needs n* = m g / (2σL − W_leg) legs; the model's margin is linear in n, so the crossing
    # found by interpolation between whole counts is exact up to the thin-rod approximation.
    s = _thin_rod_design(3.0)
    seen = []
    res = rp.study_sweep(s, "count", "1", "6", 6, progress=seen.append, chunks=3)
    W_leg = 7850 * math.pi * (2e-6) ** 2 * 0.1 * G0
    n_star = 3e-3 * G0 / (2 * 72.74e-3 * 0.1 - W_leg)
    assert len(res.crossings) == 1
    # floatcalc.studies reports a count limit as the smallest whole number of legs that carries.
    assert res.crossings[0] == math.ceil(n_star)
    assert seen == pytest.approx([1 / 3, 2 / 3, 1.0])
    assert res.shape == (6,)
    # Continuous input: the mass four legs just carry, m* = 4 (2σL − W_leg) / g.
    res = rp.study_sweep(s, "payload_mass", "1 g", "9 g", 41)
    m_star = 4 * (2 * 72.74e-3 * 0.1 - W_leg) / G0
    assert res.crossings[0] == pytest.approx(m_star, rel=3e-3)
    with pytest.raises(InputError):
        rp.study_sweep(s, "colour", "1", "2")


# ------------------------------------------------------------------------------------------------
# Whatever a user types or uploads, the answer is a one-line message or a value, never a crash.

from hypothesis import HealthCheck, given, settings  # noqa: E402
from hypothesis import strategies as hst  # noqa: E402

_TEXT = hst.one_of(
    hst.sampled_from(["0.2 mm", "-1 mm", "nan mm", "inf g", "1e400 mm", "3 kg", "150 deg", "200 deg", "",
                      "abc", "1/0", "2**1000 mm", "20 degC", "-300 degC", "35 g/kg", "0.2 µm", "12", "1e-300 m",
                      "__import__('os')", "1 mm mm", "steel", "tungstn"]),
    hst.text(max_size=16),
)


@settings(max_examples=200, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(name=hst.sampled_from(sorted(rp._FIELD_CHECKS)), text=_TEXT)
def test_check_field_answers_every_text_in_one_line(name, text):
    msg = rp.check_field(name, text)
    assert msg is None or (msg.startswith(f"{name}:") or ":" in msg) and "\n" not in msg


@settings(max_examples=200, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(data=hst.one_of(hst.binary(max_size=200),
                       hst.text(max_size=200).map(lambda t: t.encode("utf-8", "surrogatepass")
                                                  if all(not 0xD800 <= ord(c) <= 0xDFFF for c in t) else b"")))
def test_read_design_refuses_junk_with_input_error_only(data):
    try:
        kind, parsed = ex.read_design(data)
    except InputError:
        return
    assert kind in ("groups", "device") and isinstance(parsed, dict)


@settings(max_examples=100, deadline=None, suppress_health_check=[HealthCheck.too_slow])  # ~20 ms each
@given(radius=_TEXT, length=_TEXT, angle=_TEXT, body=_TEXT)
def test_assess_gives_finite_numbers_or_one_input_error(radius, length, angle, body):
    s = ex.example("robot")
    s["elements"][0].update(radius=radius, length=length, advancing_angle=angle)
    s["load"]["body_mass"] = body
    try:
        a = rp.assess(s)
    except InputError as exc:
        assert "\n" not in str(exc)
        return
    assert math.isfinite(a.margin) and a.verdict in rp.VERDICTS
    assert math.isfinite(a.limit_force.to("N").magnitude)
