"""Drawings (floatcalc.plotting): to scale, states and steps drawn from the result's own fields,
log axis for safety-factor sweeps with the line at 1 marked."""

from __future__ import annotations

import numpy as np
import pytest
from matplotlib.colors import to_hex

from floatcalc import plotting as pl
from floatcalc.design import example
from floatcalc.device.solve import solve_device
from floatcalc.output.text import element_state


@pytest.fixture(scope="module")
def robot_loaded():
    # 2.3 g on the invented robot brings every leg above 90 % utilisation
    return solve_device(example("robot"), payload="2.3 g")


def test_plan_view_colours_each_element_by_its_state(robot_loaded):
    r = robot_loaded
    ax = pl.plan_view(r, grid=40)
    patches = [p for p in ax.patches if p.get_gid() == "element"]
    assert len(patches) == len(r.elements)
    for p, e in zip(patches, r.elements):
        assert to_hex(p.get_facecolor()) == pl.STATE_COLOURS[element_state(e)]
    assert {element_state(e) for e in r.elements} == {"near its limit"}
    assert ax.get_aspect() == 1.0


def test_failure_steps_follow_the_breakthrough_payloads():
    r = solve_device(example("twin_rod"))
    ax = pl.failure_steps(r)
    line = next(l for l in ax.lines if l.get_gid() == "steps")
    x, y = line.get_data()
    g = r.device.liquid.g
    pays = sorted(e.breakthrough_payload.to("N").magnitude / g * 1e3 for e in r.elements
                  if e.breakthrough_payload is not None)
    drops = [x[i] for i in range(1, len(y)) if y[i] < y[i - 1]]
    assert drops == pytest.approx(pays)
    assert y[0] == len(r.elements) and y[-1] == len(r.elements) - len(pays)


def test_safety_factor_sweep_is_on_a_log_axis_with_one_marked():
    ax = pl.safety_factor_sweep([1, 2, 3], [0.5, 1.5, 4.0], "body mass [g]", required=1.5)
    assert ax.get_yscale() == "log"
    ys = [l.get_ydata()[0] for l in ax.lines if len(set(np.atleast_1d(l.get_ydata()))) == 1]
    assert 1.0 in ys and 1.5 in ys


def test_sections_are_to_scale_and_bending_shape_follows_the_result():
    import floatcalc as fc

    ax = pl.meniscus_section(fc.rod("0.25 mm", "40 mm", "150 deg"))
    assert ax.get_aspect() == 1.0 and ax.get_xlabel() == pl.SECTION_XLABEL
    leg = fc.flexible_leg("0.1 mm", "60 mm", "115 deg", material="steel")
    ax = pl.bending_shape(leg)
    line = next(l for l in ax.lines if l.get_gid() == "leg")
    assert line.get_xdata() == pytest.approx(np.asarray(leg.shape["x_m"]) * 1e3)
    assert line.get_ydata() == pytest.approx(-np.asarray(leg.shape["depth_m"]) * 1e3)


def test_user_text_is_never_read_as_mathtext():
    assert pl.safe_text("a $b$") == r"a \$b\$"
    png = pl.figure_png(pl.comparison_bars, items=[("$\\frac{1}{0}$ {", solve_device(example("twin_rod")))])
    assert png[:8] == b"\x89PNG\r\n\x1a\n"
