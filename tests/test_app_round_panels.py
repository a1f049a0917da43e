"""Page panels of the kinds with their own drawings and cross-field rules (AppTest).

A flexible leg's table shows its bending drawing; the ring rule (ring radius ≥ 2 wire radii,
a geometric condition of a torus: the wire may not cross the axis) is shown inline at the ring
field, with the last good results kept.
"""

from __future__ import annotations

from pathlib import Path

import pytest
from streamlit.testing.v1 import AppTest

pytestmark = pytest.mark.slow

APP = str(Path(__file__).resolve().parents[1] / "app.py")


def _classroom():
    at = AppTest.from_file(APP, default_timeout=240).run()
    at.selectbox(key="pick").set_value("classroom").run()   # one choice loads it
    assert not at.exception
    return at


def test_flexible_leg_panel_shows_its_bending_drawing():
    at = _classroom()
    ver = at.session_state["ver"]
    at.selectbox(key=f"el0.kind@{ver}").set_value("flexible_leg").run()
    assert not at.exception, [e.value for e in at.exception]
    ed = [x for x in at.get("image") if "bending of one leg alone" in str(x.proto)]
    assert ed, "no bending drawing in the flexible leg's table editor"
    at.radio(key="drawing").set_value("element tables").run()
    assert not at.exception, [e.value for e in at.exception]
    assert not [e.value for e in at.error], [e.value for e in at.error]
    assert any("flexible wire leg" in t.value for t in at.text)
    imgs = at.get("image")
    assert len(imgs) >= 2  # bending drawing and force–depth curve


def test_ring_rule_is_shown_at_the_field():
    at = _classroom()
    ver = at.session_state["ver"]
    at.selectbox(key=f"el0.kind@{ver}").set_value("ring").run()
    ver = at.session_state["ver"]
    at.text_input(key=f"el0.ring_radius@{ver}").set_value("0.3 mm").run()
    at.text_input(key=f"el0.wire_radius@{ver}").set_value("0.2 mm").run()
    assert not at.exception
    errs = [e.value.replace("\\", "") for e in at.error]
    assert any(e.startswith("elements[0].ring_radius") or "ring" in e for e in errs), errs
