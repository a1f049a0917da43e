"""Drawings: to scale, labelled with units, solid and contact points drawn where they belong.

Geometry checks compare the drawing with the inputs (leg radius given by the user) and with the
closed-form contact-line depth of a 2D meniscus, |h| = 2 l_c sin(ψ/2) (de Gennes,
Brochard-Wyart & Quéré, Capillarity and Wetting Phenomena, Springer 2004), not with the
drawing code's own arithmetic.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from matplotlib.patches import Circle

from floatcalc import examples as ex
from floatcalc import plotting
from floatcalc import report as rp
from floatcalc.liquids import water
from floatcalc.rods import rod


@pytest.fixture(scope="module")
def leg():
    return rod("0.5 mm", "60 mm", "150 deg", receding_angle="120 deg")


def _by_gid(artists, gid):
    return [a for a in artists if a.get_gid() == gid]


@pytest.mark.parametrize("zoom", [False, True])
def test_section_is_to_scale_and_labelled(leg, zoom):
    ax = plotting.meniscus_section(leg, zoom=zoom)
    assert ax.get_aspect() == 1.0
    assert ax.get_xlabel() == "horizontal distance from the leg axis [mm]"
    assert ax.get_ylabel() == "height above the undisturbed surface [mm]"
    # Equal aspect means one mm covers the same number of pixels in x and in y.
    fig = ax.figure
    fig.draw_without_rendering()  # applies the aspect to the axes box
    p0 = ax.transData.transform((0.0, 0.0))
    p1 = ax.transData.transform((1.0, 1.0))
    assert abs(p1[0] - p0[0]) == pytest.approx(abs(p1[1] - p0[1]), rel=1e-6)


def test_solid_is_drawn_with_the_input_radius(leg):
    ax = plotting.meniscus_section(leg)
    solids = _by_gid(ax.patches, "solid")
    assert len(solids) == 1 and isinstance(solids[0], Circle)
    assert solids[0].get_radius() == pytest.approx(0.5)  # the user's 0.5 mm


def test_contact_points_lie_on_the_solid_at_the_closed_form_depth(leg):
    ax = plotting.meniscus_section(leg)
    pts = _by_gid(ax.collections, "contact points")
    assert len(pts) == 1
    xy = pts[0].get_offsets()
    assert xy.shape == (2, 2)
    centre = _by_gid(ax.patches, "solid")[0].center
    dist = np.hypot(xy[:, 0] - centre[0], xy[:, 1] - centre[1])
    assert list(dist) == pytest.approx([0.5, 0.5], rel=1e-9)
    assert xy[0, 0] == pytest.approx(-xy[1, 0])  # symmetric about the leg axis
    psi = math.radians(leg.inclination_at_max.to("deg").magnitude)
    lc_mm = water("20 degC").lc * 1e3
    assert xy[0, 1] == pytest.approx(-2 * lc_mm * math.sin(psi / 2), rel=1e-9)


def test_depth_is_marked(leg):
    ax = plotting.meniscus_section(leg)
    d = leg.depth_at_max.to("mm").magnitude
    assert any(t.get_text() == f"depth {d:.3g} mm" for t in ax.texts)


def test_force_depth_axes_limit_and_operating_point():
    a = rp.assess(ex.example("robot"))
    o = a.elements[0]
    ax = plotting.force_depth(o.result, load=o.load_share, operating_depth=o.operating_depth)
    assert ax.get_xlabel() == "depth of the lowest point below the undisturbed surface [mm]"
    assert ax.get_ylabel() == "upward force from the liquid [mN]"
    labels = [line.get_label() for line in ax.lines]
    assert {"total force", "surface-tension part", "pressure (buoyancy) part"} <= set(labels)
    # The limit marker sits at the top of the drawn total curve.
    total = next(line for line in ax.lines if line.get_label() == "total force")
    lim = _by_gid(ax.collections, "limit")[0].get_offsets()[0]
    assert lim[1] == pytest.approx(np.max(total.get_ydata()), rel=1e-9)
    op = _by_gid(ax.collections, "operating point")[0].get_offsets()[0]
    assert op[1] == pytest.approx(o.load_share.to("mN").magnitude)
    # The operating point lies on the total curve (interpolated independently here).
    assert np.interp(op[0], total.get_xdata(), total.get_ydata()) == pytest.approx(op[1], rel=1e-3)


def test_comparison_overlays_one_curve_per_design():
    items = [(f"design {i}", rp.assess(s)) for i, s in enumerate(ex.alternatives(ex.example("compare")), 1)]
    ax = plotting.compare_curves(items)
    labels = [line.get_label() for line in ax.lines]
    assert "design 1" in labels and "design 2" in labels
    assert "[mm]" in ax.get_xlabel() and "[mN]" in ax.get_ylabel()


def test_ball_section_solid_and_contact_points():
    from floatcalc.round import ball

    b = ball("1 mm", "150 deg")
    ax = plotting.meniscus_section(b)
    assert ax.get_aspect() == 1.0
    assert ax.get_xlabel() == "horizontal distance from the element axis [mm]"
    solid = _by_gid(ax.patches, "solid")[0]
    assert isinstance(solid, Circle) and solid.get_radius() == pytest.approx(1.0)
    xy = _by_gid(ax.collections, "contact points")[0].get_offsets()
    dist = np.hypot(xy[:, 0] - solid.center[0], xy[:, 1] - solid.center[1])
    assert list(dist) == pytest.approx([1.0, 1.0], rel=1e-6)  # the contact line lies on the sphere
