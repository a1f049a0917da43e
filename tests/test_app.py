"""The page through Streamlit's headless harness (streamlit.testing.v1.AppTest).

The page edits a schema-2 design and shows the result of ``solve_device``. Expected directions
of change are physical facts independent of the code: a heavier body lowers the achieved
safety factor (capacity / load: the load grows, the capacity moves only through the shift of
the combined centre of mass), a thicker leg of the same length carries more (Vella, Lee & Kim, Langmuir 22, 5979,
2006), and a lower surface tension lowers every capillary force (Young–Laplace: forces scale
with σ).
"""

from __future__ import annotations

import json
from pathlib import Path

import pytest
from streamlit.testing.v1 import AppTest

from _cli import run_cli

from floatcalc.design import design_text, example, load_design
from floatcalc.device.solve import solve_device

pytestmark = pytest.mark.slow  # each page run solves a device (seconds on a shared machine)

TIMEOUT = 180
ROOT = Path(__file__).resolve().parents[1]
APP = str(ROOT / "app.py")


def _app():
    at = AppTest.from_file(APP, default_timeout=TIMEOUT).run()
    _ok(at)
    return at


def _ok(at):
    assert not at.exception, [e.value for e in at.exception]


def _results(at) -> dict:
    t = at.table[0].value  # cells are Markdown-escaped on the page
    return {str(a).replace("\\", ""): str(b).replace("\\", "") for a, b in zip(t["quantity"], t["value"])}


def _sf(at) -> float:
    return float(_results(at)["safety factor (capacity / load)"].split()[0])


def _cap_mN(at) -> float:
    return float(_results(at)["capacity (every element intact)"].split()[0])


def _verdict(at) -> str:
    for kind in (at.success, at.warning, at.error):
        for el in kind:
            if el.value.startswith("Verdict"):
                return el.value.replace("\\", "")
    return ""


def _load(at, name):
    at.selectbox(key="pick").set_value(name).run()   # one choice loads it
    _ok(at)


def _page_design(at):
    """The design as the page holds it (what 'save this design' writes)."""
    from floatcalc.design import design_from_data

    return design_from_data(json.loads(json.dumps(at.session_state["current"])))


def test_opening_state_is_the_skimmer_with_the_solve_result():
    at = _app()
    assert any("twelve-leg surface skimmer" in t.value for t in at.text)
    r = solve_device(example("skimmer"))
    assert _verdict(at).startswith(f"Verdict: {r.verdict}.")
    assert _cap_mN(at) == pytest.approx(r.capacity.to("mN").magnitude, rel=1e-3)
    assert _results(at)["Baudoin number"].startswith(f"{r.baudoin_number:.3g}")
    assert at.dataframe  # element table
    assert any("Bo = " in t.value and "leg radius" in t.value for t in at.text)
    assert any("Static estimate for a clean liquid surface" in i.value for i in at.info)
    assert not at.metric  # plain text values, never truncated metric boxes


def test_inputs_change_results_and_a_bad_value_keeps_the_last_results():
    at = _app()
    sf0 = _sf(at)
    at.text_input(key="body.mass@1").set_value("2.0 g").run()
    _ok(at)
    assert _sf(at) < sf0  # heavier body: a larger load on about the same capacity
    _load(at, "compare")  # one table of 8 equal legs: a group edit
    cap1 = _cap_mN(at)
    at.text_input(key="el0.radius@2").set_value("0.2 mm").run()
    _ok(at)
    assert _cap_mN(at) > cap1  # thicker legs of the same length carry more (Vella, Lee & Kim 2006)
    good = _cap_mN(at)
    at.text_input(key="el0.radius@2").set_value("-1 mm").run()
    _ok(at)
    errs = [e.value.replace("\\", "") for e in at.error]
    assert any("elements[0].radius: must be positive" in e for e in errs), errs
    assert any(w.value.startswith("Not current") for w in at.warning)
    assert _cap_mN(at) == pytest.approx(good)  # the last good results stay on the page
    at.text_input(key="el0.radius@2").set_value("0.1 mm").run()
    assert not any(w.value.startswith("Not current") for w in at.warning)


def test_every_kind_can_be_chosen_and_shows_its_fields():
    from floatcalc.elements import kinds
    from floatcalc.page.widgets import label_of

    at = _app()
    _load(at, "classroom")
    for kind in kinds():
        ver = at.session_state["ver"]
        at.selectbox(key=f"el0.kind@{ver}").set_value(kind.name).run()
        _ok(at)
        labels = {w.label for w in [*at.text_input, *at.number_input]}
        for name, f in kind.fields.items():
            if f.kind != "position":
                assert label_of(name, f) in labels, (kind.name, name)
        table = at.session_state["current"]["elements"][0]
        assert table["kind"] == kind.name
        labels = [e.label.replace("\\", "") for e in at.expander]
        assert any(lb.startswith("table 1: ") and kind.noun(1) in lb for lb in labels), kind.name


def test_quick_form_adds_tables_with_count_and_layout_around_and_edits_say_what_they_change():
    at = _app()
    _load(at, "classroom")
    at.selectbox(key="new_kind").set_value("ball").run()
    ver = at.session_state["ver"]
    at.button(key=f"add@{ver}").click().run()
    _ok(at)
    els = at.session_state["current"]["elements"]
    assert els[-1]["kind"] == "ball" and els[-1]["count"] == 4 and els[-1]["layout"] == "around"
    assert any(e.label.replace("\\", "").startswith("table 2: 4 ball feet") for e in at.expander)
    assert any("apply to all 4 ball feet of this table" in c.value for c in at.caption)
    ver = at.session_state["ver"]
    at.button(key=f"el1.dup@{ver}").click().run()
    assert len(at.session_state["current"]["elements"]) == 3
    ver = at.session_state["ver"]
    at.button(key=f"el2.rm@{ver}").click().run()
    at.button(key=f"el1.rm@{at.session_state['ver']}").click().run()
    assert len(at.session_state["current"]["elements"]) == 1


def test_saved_design_loads_in_python_and_the_commands(tmp_path):
    at = _app()
    at.text_input(key="load.payload@1").set_value("0.4 g").run()
    d = _page_design(at)
    path = tmp_path / "page.toml"
    path.write_text(design_text(d), encoding="utf-8")
    back = load_design(path)
    assert back.data["load"]["payload"] == "0.4 g" and not back.notes
    dev = run_cli("device", str(path), "--json")  # the commands' entry point, in this process
    assert dev.returncode == 0, dev.stderr
    assert json.loads(dev.stdout)["verdict"] == solve_device(back).verdict
    sw = run_cli("sweep", "--design", str(path), "--vary", "body_mass=0.5g:1.5g:3", "--json")
    assert sw.returncode == 0, sw.stderr


def test_classroom_slider_soap_sinks_the_needle():
    """The classroom example's alternative (30 mN/m, invented) sinks; the slider shows it."""
    at = _app()
    _load(at, "classroom")
    at.expander  # the slider lives in the classroom expander
    at.slider(key="class_sigma").set_value(72).run()
    clean = [v for v in (s.value for s in at.success) if v.startswith("Verdict")]
    assert clean
    at.slider(key="class_sigma").set_value(30).run()
    _ok(at)
    boxes = [e.value.replace("\\", "") for e in at.error if e.value.startswith("Verdict")]
    assert any(b.startswith("Verdict: sinks") for b in boxes), boxes
    # the alternative in the file agrees: the same solve
    alt = example("classroom").alternatives[0]
    assert solve_device(alt).verdict == "sinks"


def test_drawings_and_compare_panels():
    at = _app()
    for choice in ("plan view", "what breaks first", "element tables"):
        at.radio(key="drawing").set_value(choice).run()
        _ok(at)
        assert at.get("image"), choice
        assert not [e for e in at.error if "could not be shown" in e.value], choice
    _load(at, "compare")
    frames = [f.value for f in at.dataframe]
    assert any("design B" in list(f.columns) for f in frames)


QUICK_FILE = b"""# an older quick file, as the page saved it before schema 2 (invented)
title = "Invented example: four legs"
invented = true
[liquid]
name = "water"
temperature = "20 degC"
[load]
body_mass = "0.5 g"
safety_factor = 1.5
[[element]]
kind = "rod"
radius = "0.2 mm"
length = "30 mm"
count = 4
material = "steel"
coating = "PTFE film"
advancing_angle = "115 deg"
"""


def test_an_older_file_is_read_through_the_one_reader_with_its_note_shown():
    """AppTest cannot upload; the page's upload handler is called and its design loaded the way
    the sidebar does (floatcalc.page.main.read_upload, load_data)."""
    from floatcalc.page.main import read_upload

    d = read_upload(QUICK_FILE)
    assert d.notes and d.data["schema_version"] == 2
    assert d.data["elements"][0]["count"] == 4 and d.data["elements"][0]["layout"] == "around"
    at = AppTest.from_file(APP, default_timeout=TIMEOUT)
    at.session_state["data"] = json.loads(json.dumps(d.data))
    at.session_state["notes"] = list(d.notes)
    at.session_state["ver"] = 1
    at.session_state["compare"] = []
    at.session_state["good"] = None
    at.run()
    _ok(at)
    assert any(d.notes[0][:30].replace(" ", "") in i.value.replace("\\", "").replace(" ", "") for i in at.info)
    assert _verdict(at).startswith("Verdict: " + solve_device(d).verdict)


def test_a_table_added_to_many_is_the_one_shown_for_editing():
    """With more tables than are shown at once (the skimmer's twelve), the table just added is
    the one opened for editing, not the first."""
    at = _app()
    at.selectbox(key="new_kind").set_value("ball").run()
    ver = at.session_state["ver"]
    at.button(key=f"add@{ver}").click().run()
    _ok(at)
    ver = at.session_state["ver"]
    assert at.selectbox(key=f"edit_table@{ver}").value == 12
    labels = [e.label.replace("\\", "") for e in at.expander]
    assert any(lb.startswith("table 13: 4 ball feet") for lb in labels), labels
    at.button(key=f"el12.dup@{ver}").click().run()  # a copy: shown next
    _ok(at)
    ver = at.session_state["ver"]
    assert at.selectbox(key=f"edit_table@{ver}").value == 13
