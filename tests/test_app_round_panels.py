"""Ring-footpad and vertical-pin panels of the page (streamlit.testing.v1.AppTest).

Adds a ring group and a pin group to a built-in invented scenario and checks that the page shows
their results, with each group's limit force equal to the one the floatcalc API gives for the
same inputs (the API is tested on its own in test_round.py); then bad ring values: each gives an
inline message beside its field, results wait, and the rest of the page is still drawn.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest
from streamlit.testing.v1 import AppTest

import floatcalc as fc
from floatcalc.materials import leg_material

pytestmark = pytest.mark.slow  # a ring takes a second or two, each page run draws figures

TIMEOUT = 120
APP = str(Path(__file__).resolve().parents[1] / "app.py")


def _no_exception(at):
    assert not at.exception, [e.value for e in at.exception]


def _fields(at, label):
    hits = [t for t in at.text_input if t.label == label]
    assert hits, f"no text input labelled {label!r}"
    return hits


def _page_failures(at):
    return [e.value for e in at.error if "could not" in e.value or "calculation failed" in e.value]


def _group_rows(at):
    tables = [d.value for d in at.dataframe if "limit force [mN]" in d.value.columns]
    assert tables, "no results table"
    return tables[0]


def _add(at, kind):
    at.selectbox(key="new_kind").set_value(kind).run()
    at.button(key=next(b.key for b in at.button if b.key.startswith("addgrp@"))).click().run()
    _no_exception(at)


def _open_robot(at):
    at.selectbox(key="pick").set_value("groups:robot").run()
    at.button(key="load_example").click().run()
    _no_exception(at)


def test_ring_and_pin_groups_show_results_equal_to_the_api():
    at = AppTest.from_file(APP, default_timeout=TIMEOUT).run()
    _open_robot(at)
    n0 = len(_group_rows(at))
    _add(at, "ring")
    _add(at, "pin")
    assert not _page_failures(at), _page_failures(at)
    rows = _group_rows(at)
    assert len(rows) == n0 + 2
    assert any(c.value.startswith(f"group {n0 + 1}: 4 ring footpads") for c in at.caption)
    assert any(c.value.startswith(f"group {n0 + 2}: 4 vertical pins") for c in at.caption)
    # Same inputs straight through the API: 4 steel rings, 5 mm / 0.2 mm wire, 160 deg advancing.
    ring = fc.ring("5 mm", "0.2 mm", "160 deg", material_density=leg_material("steel").rho)
    shown_ring = float(rows["limit force [mN]"].iloc[n0])
    assert shown_ring == pytest.approx(4 * ring.max_force.to("mN").magnitude, rel=1e-3)
    # 4 nylon pins, 0.3 mm radius, 3 mm long, 115 deg: limit = largest force on the API's curve.
    pin = fc.pin("0.3 mm", "115 deg", length="3 mm", material_density=leg_material("nylon").rho)
    shown_pin = float(rows["limit force [mN]"].iloc[n0 + 1])
    assert shown_pin == pytest.approx(4 * np.max(pin.curve.force.to("mN").magnitude), rel=1e-3)
    assert shown_pin > 0 and shown_ring > 10 * shown_pin
    # A change of the ring's geometry changes its row: a larger loop has a longer contact line.
    _fields(at, "Ring radius (wire centre line)")[0].set_value("8 mm").run()
    _no_exception(at)
    assert float(_group_rows(at)["limit force [mN]"].iloc[n0]) > shown_ring
    # The force-depth drawing of every group (ring and pin included) draws without a failure.
    at.radio(key="drawing").set_value("Force against depth").run()
    _no_exception(at)
    assert not _page_failures(at), _page_failures(at)


def test_bad_ring_values_are_inline_and_the_page_still_renders():
    at = AppTest.from_file(APP, default_timeout=TIMEOUT).run()
    _open_robot(at)
    _add(at, "ring")
    wire = _fields(at, "Wire radius")[0]
    wire.set_value("-1 mm").run()
    _no_exception(at)
    assert any(e.value == "wire_radius: must be positive, got -1 mm" for e in at.error)
    assert any(i.value.startswith("Results wait for valid inputs") for i in at.info)
    assert not at.metric  # no stale results
    headers = [h.value for h in at.subheader]
    assert {"Liquid", "Support elements", "Load", "Results", "Compare designs", "Reports"} <= set(headers)
    assert _fields(at, "Leg radius") and _fields(at, "Payload")  # the other panels are still there
    # Ring radius smaller than twice the wire radius.
    _fields(at, "Wire radius")[0].set_value("0.2 mm").run()
    _fields(at, "Ring radius (wire centre line)")[0].set_value("0.3 mm").run()
    _no_exception(at)
    assert any(e.value.startswith("ring_radius: must be at least twice the wire radius (0.4 mm)") for e in at.error)
    assert any(i.value.startswith("Results wait for valid inputs") for i in at.info)
    assert "Compare designs" in [h.value for h in at.subheader]
    # Corrected: results come back.
    _fields(at, "Ring radius (wire centre line)")[0].set_value("5 mm").run()
    _no_exception(at)
    assert not [e for e in at.error if e.value.startswith(("ring_radius", "wire_radius"))]
    assert at.metric and not _page_failures(at)
