"""The Streamlit page through Streamlit's headless harness (streamlit.testing.v1.AppTest).

Covers: the opening state (built-in invented device, results at once), changing each kind of
input (liquid, temperature, salinity, contaminated surface tension, leg geometry, material,
coating, body mass, payload, safety factor), bad values (inline message, no exception, other
panels still drawn), loading the examples and comparing designs.

The file uploader cannot be driven by AppTest (it has no file-upload element in this Streamlit
version), so the upload-handling function ``floatcalc.examples.read_design`` that the page
calls is tested directly at the end.

Expected directions of change are physical facts independent of the code: a lower surface
tension lowers every capillary force (Young–Laplace: forces scale with σ), a thicker leg of the
same length carries more (Vella, Lee & Kim, Langmuir 22, 5979, 2006), and a heavier body lowers
the margin.
"""

from __future__ import annotations

from pathlib import Path

import pytest
from streamlit.testing.v1 import AppTest

from floatcalc import examples as ex
from floatcalc.errors import InputError

pytestmark = pytest.mark.slow  # each page run solves a device or draws figures (about 1 s each)

TIMEOUT = 60
APP = str(Path(__file__).resolve().parents[1] / "app.py")


def _field(at, label):
    hits = [t for t in at.text_input if t.label == label]
    assert hits, f"no text input labelled {label!r}"
    return hits[0]


def _metric(at, label_start) -> float:
    m = next(m for m in at.metric if m.label.startswith(label_start))
    return float(m.value.split()[0])


def _no_exception(at):
    assert not at.exception, [e.value for e in at.exception]


def _verdict(at) -> str:
    for kind in (at.success, at.warning, at.error):
        for el in kind:
            if el.value.startswith("**"):
                return el.value
    return ""


def _load_example(at, key):
    at.selectbox(key="pick").set_value(key).run()
    at.button(key="load_example").click().run()
    _no_exception(at)


def test_opening_state_is_the_invented_device_with_results():
    at = AppTest.from_file(APP, default_timeout=TIMEOUT).run()
    _no_exception(at)
    assert any("Invented example: twelve-leg surface skimmer" in c.value for c in at.caption)
    assert "FLOATS WITH MARGIN" in _verdict(at)
    assert _metric(at, "Capacity") > _metric(at, "Weight carried") > 0
    assert [d for d in at.dataframe]  # per-element table
    assert any("Static estimate for a clean liquid surface" in i.value for i in at.info)
    assert any("Electronics near water" in i.value for i in at.info)
    assert any("Baudoin number" in m.value for m in at.markdown)
    assert any("Bond number" in m.value for m in at.markdown)


def test_device_inputs_change_results_and_bad_values_stay_inline():
    at = AppTest.from_file(APP, default_timeout=TIMEOUT).run()
    cap0 = _metric(at, "Capacity")
    # Liquid: ethanol has about a third of water's surface tension -> much smaller capacity.
    at.selectbox(key="liq@0").set_value("ethanol").run()
    _no_exception(at)
    assert _metric(at, "Capacity") < 0.6 * cap0
    assert any("Flammable" in i.value for i in at.info)
    at.selectbox(key="liq@0").set_value("water").run()
    # Thicker legs carry more.
    _field(at, "Leg radius").set_value("0.25 mm").run()
    _no_exception(at)
    assert _metric(at, "Capacity") > cap0
    # Payload lowers the margin.
    m0 = _metric(at, "Margin")
    _field(at, "Payload (at the centre of mass)").set_value("0.5 g").run()
    assert _metric(at, "Margin") < m0
    # A bad value: inline message with the field's name, no traceback, the rest still drawn.
    _field(at, "Leg radius").set_value("-0.1 mm").run()
    _no_exception(at)
    assert any(e.value == "radius: must be positive, got -0.1 mm" for e in at.error)
    assert any("Results wait for valid inputs" in i.value for i in at.info)
    assert any(s.value == "Compare designs" for s in at.subheader)
    assert any(s.value == "Liquid" for s in at.subheader)
    # Temperature outside water's correlation range: message from the liquid, beside the liquid panel.
    _field(at, "Leg radius").set_value("0.15 mm").run()
    _field(at, "Temperature").set_value("150 degC").run()
    _no_exception(at)
    assert any(e.value.startswith("temperature: water allows") for e in at.error)


def test_leg_groups_every_input_kind():
    at = AppTest.from_file(APP, default_timeout=TIMEOUT).run()
    _load_example(at, "groups:robot")
    assert "FLOATS WITH MARGIN" in _verdict(at)
    f0 = _metric(at, "Limit force")
    # Geometry.
    _field(at, "Wetted length of each leg").set_value("60 mm").run()
    _no_exception(at)
    f_long = _metric(at, "Limit force")
    assert f_long > f0
    # Contaminated surface: lower σ -> lower limit, and the contamination caution appears.
    _field(at, "Measured surface tension of a dirty surface (blank = clean)").set_value("40 mN/m").run()
    _no_exception(at)
    assert _metric(at, "Limit force") < f_long
    assert any(i.value.startswith("Contaminated surface") for i in at.info)
    _field(at, "Measured surface tension of a dirty surface (blank = clean)").set_value("").run()
    # Salinity: seawater has a slightly higher surface tension than fresh water (Nayar et al. 2014).
    _field(at, "Salinity (blank for fresh water)").set_value("35 g/kg").run()
    _no_exception(at)
    assert any("Nayar" in c.value for c in at.caption)
    assert _metric(at, "Limit force") > f_long
    _field(at, "Salinity (blank for fresh water)").set_value("").run()
    # Coating preset fills in the angles.
    coat = next(s for s in at.selectbox if s.label == "Coating")
    coat.set_value("PTFE film").run()
    _no_exception(at)
    assert _field(at, "Advancing contact angle").value == "115 deg"
    assert _field(at, "Receding contact angle (optional)").value == "95 deg"
    # Material: a denser leg weighs more.
    w0 = _metric(at, "Weight carried")
    mat = next(s for s in at.selectbox if s.label == "Material")
    mat.set_value("tungsten").run()
    assert _metric(at, "Weight carried") > w0
    # Body mass and safety factor drive the verdict (thresholds from the safety factor).
    _field(at, "Body mass (without the legs)").set_value("2.5 g").run()
    margin = _metric(at, "Margin")
    at.number_input(key=next(n.key for n in at.number_input if n.label == "Safety factor")).set_value(
        max(1.0, round(margin + 0.5, 1))).run()
    _no_exception(at)
    assert "MARGINAL" in _verdict(at) if margin >= 1 else "SINKS" in _verdict(at)
    # A wrong unit, inline.
    _field(at, "Body mass (without the legs)").set_value("3 mm").run()
    _no_exception(at)
    assert any(e.value.startswith("body_mass: must be a mass") for e in at.error)


def test_examples_and_comparison():
    at = AppTest.from_file(APP, default_timeout=TIMEOUT).run()
    _load_example(at, "groups:compare")
    tables = [d.value for d in at.dataframe]
    cmp = [t for t in tables if "verdict" in t.columns]
    assert cmp and len(cmp[0]) == 2  # the two invented designs side by side
    # Add the current design again after a change: three designs.
    _field(at, "Leg radius").set_value("0.15 mm").run()
    at.button(key="cmp_add").click().run()
    _no_exception(at)
    cmp = [d.value for d in at.dataframe if "verdict" in d.value.columns]
    assert len(cmp[0]) == 3
    _load_example(at, "groups:classroom")
    assert any("invented example" in c.value for c in at.caption)
    cmp = [d.value for d in at.dataframe if "verdict" in d.value.columns]
    assert list(cmp[0]["verdict"]) == ["floats with margin", "sinks"]  # soap sinks the needle


def test_upload_handler_reads_both_formats_and_refuses_bad_files():
    # The page's uploader passes the file bytes to floatcalc.examples.read_design.
    kind, data = ex.read_design(ex.dumps_toml(ex.example("compare")).encode())
    assert kind == "groups" and data == ex.example("compare")
    from floatcalc.device.design import example_path

    kind, data = ex.read_design(example_path("twin_rod").read_bytes())
    assert kind == "device" and len(data["legs"]) == 2
    with pytest.raises(InputError, match="at most 64 kB"):
        ex.read_design(b" " * (ex.MAX_FILE_BYTES + 1))
    with pytest.raises(InputError, match="not valid TOML"):
        ex.read_design(b"legs = [")
    with pytest.raises(InputError) as e:
        ex.read_design(b"schema_version = 1\n[liquid]\nname='water'\n[body]\nmass='-1 g'\n")
    assert "body" in str(e.value) or "legs" in str(e.value)


def test_design_study_sweep_with_progress_and_bad_range():
    at = AppTest.from_file(APP, default_timeout=TIMEOUT).run()
    _load_example(at, "groups:robot")
    at.selectbox(key="study_in").set_value("count").run()
    at.button(key="study_run").click().run()
    _no_exception(at)
    assert any("just carries its load" in c.value for c in at.caption)
    at.text_input(key="study_lo_count").set_value("abc").run()
    at.button(key="study_run").click().run()
    _no_exception(at)
    assert any("count" in e.value for e in at.error)
    assert any(s.value == "Reports" for s in at.subheader)  # the rest of the page still drawn


def test_device_design_study_on_the_page():
    at = AppTest.from_file(APP, default_timeout=TIMEOUT).run()
    at.number_input(key="dstudy_n").set_value(4).run()
    at.button(key="dstudy_run").click().run()
    _no_exception(at)
    assert any("just carries its load" in c.value for c in at.caption)
