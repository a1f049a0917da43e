"""Sweeps: grid layout, limit crossings, small-Bond limit, table and plot output."""

from __future__ import annotations

import math

import numpy as np
import pytest

import floatcalc as fc
from floatcalc.errors import InputError
from floatcalc.liquids import water
from floatcalc.studies.models import rod_model
from floatcalc.studies.ranges import parse_axis
from floatcalc.studies.sweep import sweep


def test_small_bond_limit_over_contact_angle():
    # Small-rod limit (Vella, Lee & Kim 2006; PHYSICS.md): for R << l_c and θ ≥ 90° the largest
    # force per length tends to 2σ (ψ reaches 90°). R = 1 µm gives R/l_c ≈ 4e-4; the
    # pressure part is O(R/l_c), so agreement to 2e-3 is expected.
    liq = water()
    m = rod_model(liq, radius=1e-6, length=0.05)
    s = sweep(m, ["contact_angle=95deg:180deg:18"])
    assert np.allclose(s.outputs["max_force"], 2 * liq.sigma * 0.05, rtol=2e-3)


def test_grid_order_and_points_match_single_designs():
    # Each grid point equals the scalar public API at that design (a different code path:
    # floatcalc.rod() evaluates one design without the study layer).
    liq = water()
    m = rod_model(liq, count=3.0, length=0.06, material_density=2700.0)
    s = sweep(m, ["radius=0.1mm:0.4mm:4", "contact_angle=100deg:160deg:3"])
    assert s.shape == (4, 3)
    for i, R in enumerate(s.axes[0].values):
        for j, th in enumerate(s.axes[1].values):
            r = fc.rod(R, 0.06, th, count=3, material_density=2700, liquid=liq)
            assert s.outputs["max_force"][i, j] == pytest.approx(r.max_force.to("N").magnitude, rel=1e-12)
            assert s.outputs["payload"][i, j] == pytest.approx(r.payload.to("N").magnitude, rel=1e-10)


def test_limit_crossing_against_root_finder():
    # The interpolated crossing must bracket the root found by brentq on the scalar API,
    # to within one grid step (linear interpolation on a log grid).
    from scipy.optimize import brentq

    liq = water()
    Mp = 2.3e-3
    m = rod_model(liq, count=4.0, payload_mass=Mp)
    s = sweep(m, ["radius=0.05mm:0.5mm:200:log"])
    assert len(s.crossings) == 1
    root = brentq(lambda R: fc.rod(R, 0.04, "150 deg", count=4, material_density=7850, liquid=liq)
                  .payload.to("N").magnitude - Mp * liq.g, 0.2e-3, 0.5e-3, xtol=1e-12)
    step = (0.5 / 0.05) ** (1 / 199)
    assert abs(math.log(s.crossings[0] / root)) < math.log(step) * 0.05


def test_count_axis_is_whole_numbers():
    a = parse_axis("count=1:6:20", rod_model().axis_catalogue())
    assert a.values.tolist() == [1, 2, 3, 4, 5, 6]


@pytest.mark.parametrize("text", ["radius", "radius=1mm:2mm", "radius=1mm:2mm:1", "radius=1kg:2kg:5",
                                  "bogus=1:2:3", "radius=-1mm:2mm:5:log", "radius=1mm:1mm:5",
                                  "radius=1mm:2mm:5:cubic", "contact_angle=100deg:200deg:3"])
def test_bad_ranges(text):
    with pytest.raises(InputError) as exc:
        sweep(rod_model(), [text])
    assert "\n" not in str(exc.value)


def test_cli_writes_csv_and_plot(tmp_path, capsys):
    from floatcalc.cli import main
    from floatcalc.studies.csvio import read_table

    csv, png = tmp_path / "s.csv", tmp_path / "s.png"
    code = main(["sweep", "--vary", "radius=0.05mm:0.5mm:12:log", "--vary", "contact_angle=100deg:170deg:5",
                 "--count", "4", "--payload", "2g", "--output", str(csv), "--save", str(png)])
    assert code == 0
    t = read_table(csv, {"radius": "length", "spare_payload": "force"})
    assert t.columns["radius"].size == 60
    assert t.units["radius"] == "mm" and t.units["spare_payload"] == "mN"
    assert png.read_bytes()[:4] == b"\x89PNG"
    assert any("caution" in c for c in t.comments)


def test_device_model_matches_solve_device_and_sweeps():
    # The study model of a whole device calls the same capacity search as solve_device; its
    # nominal capacity must be the one solve_device reports for the built-in invented skimmer.
    from floatcalc.device import example, solve_device
    from floatcalc.studies.device_model import device_model

    m = device_model("skimmer")
    ref = solve_device(example("skimmer")).max_payload.to("N").magnitude
    # rel 1e-7: for an all-rod design the model is the batched solver (studies.device_batch),
    # which lands on the root to ~1e-14, while solve_device's Brent search stops at rtol 1e-8
    # (1.3e-9 apart for the skimmer)
    assert float(m.evaluate({})["max_payload"]) == pytest.approx(ref, rel=1e-7)
    # Water-repellent legs carry more as the advancing angle rises (Vella, Lee & Kim 2006, fig. of
    # limit force against contact angle): capacity increasing along a contact-angle-shift sweep.
    s = sweep(m, ["contact_angle_shift=-20deg:20deg:3"], executor="serial")
    assert np.all(np.diff(s.outputs["max_payload"]) > 0)


from hypothesis import given, settings  # noqa: E402
from hypothesis import strategies as st  # noqa: E402


@settings(max_examples=200, deadline=None)
@given(a=st.floats(0.01, 5.0), b=st.floats(0.01, 5.0), n=st.integers(2, 300), log=st.booleans())
def test_ranges_hit_their_ends_and_are_monotone(a, b, n, log):
    # Invariant of any range: n points, exact end points (to rounding), strictly monotone,
    # and for log spacing a constant ratio between neighbours.
    if abs(a - b) < 1e-6:
        return
    ax = parse_axis(f"radius={a}mm:{b}mm:{n}{':log' if log else ''}", rod_model().axis_catalogue())
    v = ax.values
    assert v.size == n
    assert v[0] == pytest.approx(a * 1e-3, rel=1e-12) and v[-1] == pytest.approx(b * 1e-3, rel=1e-12)
    d = np.diff(v)
    assert np.all(d > 0) if b > a else np.all(d < 0)
    if log:
        r = v[1:] / v[:-1]
        assert np.allclose(r, r[0], rtol=1e-9)


def test_ball_sweep_small_bond_limit():
    # Small sphere (Bond number → 0): largest capillary force 2πRσ sin²(θ/2) (flotation
    # literature, Scheludko and co-workers; Nutt 1960; PHYSICS.md). R = 0.05 mm gives
    # Bo ≈ 3e-4; the pressure part adds O(R/l_c) ≈ 2 %, so 2.5 % is allowed.
    from floatcalc.studies.element_model import element_model

    liq = water()
    R = 0.05e-3
    s = sweep(element_model("ball", liq, radius=R), ["contact_angle=100deg:170deg:4"], executor="serial")
    th = s.axes[0].values
    assert np.allclose(s.outputs["max_force"], 2 * math.pi * R * liq.sigma * np.sin(th / 2) ** 2, rtol=0.025)
