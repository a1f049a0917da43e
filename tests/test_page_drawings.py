"""The page's kept plan-view figures: a figure updated for a new solve shows what a new
drawing of that solve shows (compared pixel by pixel with a figure drawn from scratch), and a
device of another geometry gets its own figure.

Not a comparison with earlier output of the code: both pictures are made in the same run, one
by the fresh path (:func:`floatcalc.plotting.plan_view` on a new figure), one by the update
path (:func:`floatcalc.plotting.plan_view_update` on a figure first drawn for another result).
"""

from __future__ import annotations

import copy
import io

import numpy as np
import pytest

from floatcalc import plotting as pl
from floatcalc.design import design_from_data, example
from floatcalc.device.solve import solve_device
from floatcalc.page import drawings


def _solved(name, changes=None):
    d = copy.deepcopy(example(name).data)
    for (sec, key), val in (changes or {}).items():
        d.setdefault(sec, {})[key] = val
    return solve_device(design_from_data(d), placement=False)


def _pixels(png: bytes):
    from PIL import Image

    return np.asarray(Image.open(io.BytesIO(png)).convert("RGB")).astype(int)


def _fresh(r) -> bytes:
    fig = pl.new_figure(drawings.PLAN_SIZE, pl.PLAN_MARGINS)
    pl.plan_view(r, ax=fig.add_subplot(), grid=drawings.PLAN_GRID)
    return pl.trimmed_png(fig, drawings.PLAN_DPI)


@pytest.mark.slow
def test_updated_plan_figure_equals_a_fresh_drawing():
    drawings.clear()
    light = _solved("robot", {("load", "payload"): "0 g"})
    heavy = _solved("robot", {("load", "payload"): "2.5 g"})  # more load: other states, payload drawn
    assert pl.plan_geometry(light) == pl.plan_geometry(heavy)
    assert [e.utilisation for e in light.elements] != [e.utilisation for e in heavy.elements]
    first = drawings.plan_png(light)  # the kept figure is drawn for the light load
    updated = drawings.plan_png(heavy)  # ... and updated for the heavy one
    a, b = _pixels(updated), _pixels(_fresh(heavy))
    assert a.shape == b.shape
    assert np.mean(np.any(a != b, axis=2)) < 1e-3, np.abs(a - b).max()
    # and back: the payload marker and its legend entry go again
    a, b = _pixels(drawings.plan_png(light)), _pixels(first)
    assert a.shape == b.shape and np.mean(np.any(a != b, axis=2)) < 1e-3
    assert not np.array_equal(_pixels(first), _pixels(updated))  # the two states do differ


def test_another_geometry_is_not_drawn_on_a_kept_figure():
    drawings.clear()
    r1 = _solved("twin_rod")
    r2 = _solved("twin_rod", {("body", "mass"): "0.5 g"})
    fig = pl.new_figure(drawings.PLAN_SIZE, pl.PLAN_MARGINS)
    ax = pl.plan_view(r1, ax=fig.add_subplot(), grid=20)
    assert pl.plan_view_update(ax, r2)
    d = copy.deepcopy(example("twin_rod").data)
    d["elements"][0]["length"] = "40 mm"
    other = solve_device(design_from_data(d), placement=False)
    assert pl.plan_geometry(other) != pl.plan_geometry(r1)
    assert not pl.plan_view_update(ax, other)
