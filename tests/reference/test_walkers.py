"""Published water walkers as reference cases: floatcalc's prediction beside the published figure.

The cases, their sources, what each figure was checked against (``checked_against``: the
abstract, or ``not checked``), the bands and the reasons for them are in
``tests/reference/walkers.csv``. Every row runs here: the prediction (from the public API:
fc.rod, fc.rod_limit, fc.flexible_leg, fc.pad, floatcalc.device, floatcalc.motion.jump) divided
by the published value must lie in the row's band. Bands are stated tolerances for what the
papers fix and we do not know (leg diameters, coatings, shapes), never fitted. Differences are
discussed in the ``notes`` column.

A second, bookkeeping check keeps the table's printed ``floatcalc_value`` within 2 % of the
current prediction, so the table does not go stale (it is not a physics check).
"""

from __future__ import annotations

import csv
import functools
import math
from pathlib import Path

import pytest

import floatcalc as fc

G = 9.80665
DATA = Path(__file__).resolve().parents[2] / "floatcalc" / "data"
ROWS = list(csv.DictReader((Path(__file__).parent / "walkers.csv").open(encoding="utf-8")))


@functools.cache
def _song_leg_payload_g():
    w = fc.water("20 degC")
    r = fc.flexible_leg("0.15 mm", "70 mm", "110 deg", material="stainless steel", liquid=w, length_points=0)
    return r.payload.to("N").magnitude / G * 1e3


def _strider():
    from floatcalc.device import load_design

    return load_design(DATA / "motion_strider.toml")


PREDICT = {
    "song2006_four_legs_measured": lambda: 4 * _song_leg_payload_g(),
    "song2006_four_legs_model": lambda: 4 * _song_leg_payload_g(),
    "song2007_twelve_legs": lambda: 12 * _song_leg_payload_g(),
    "feng2007_single_leg": lambda: fc.rod("50 um", "10 mm", "167 deg", liquid=fc.water("20 degC"),
                                          material_density="1100 kg/m^3").max_force.to("mN").magnitude,
    "koh2015_force_per_length": lambda: fc.rod_limit(50e-6, math.radians(160), liquid=fc.water("20 degC"))
    ["max_force_per_length"].to("mN/m").magnitude,
    "koh2015_takeoff_bound": lambda: __import__("floatcalc.motion.jump", fromlist=["jump"]).jump(
        _strider(), "10 ms", profile="half-sine").max_takeoff_speed.to("m/s").magnitude,
    "zhang2014_disc_water": lambda: fc.pad("10 mm", "0.1 mm", "160 deg", liquid=fc.water("20 degC"),
                                           material_density="7900 kg/m^3").max_force.to("mN").magnitude,
    "zhang2014_disc_hexadecane": lambda: fc.pad("10 mm", "0.1 mm", "150 deg", liquid=fc.liquid("n-hexadecane", "20 degC"),
                                                material_density="7900 kg/m^3").max_force.to("mN").magnitude,
    "hu2003_strider_weight": lambda: _strider_capacity_mN(),
}


def _strider_capacity_mN():
    from floatcalc.device import solve_device

    r = solve_device(_strider())
    assert r.verdict == "floats"
    assert r.weight.to("mN").magnitude == pytest.approx(0.1, rel=0.01)  # 10 mg body, legs ~0.04 mg each
    assert r.baudoin_number < 1.0  # Bush & Hu (2006): necessary for standing on surface tension
    return (r.weight + r.max_payload).to("mN").magnitude


def test_every_row_has_a_source_a_band_and_a_model():
    assert {r["case"] for r in ROWS} == set(PREDICT)
    for r in ROWS:
        assert r["source"].strip() and r["notes"].strip() and r["model"].strip()
        assert r["checked_against"] in ("abstract", "not checked")
        assert 0 < float(r["band_low"]) <= 1.0 <= float(r["band_high"]) or r["case"].endswith(("_bound", "_weight"))


@pytest.mark.parametrize("row", ROWS, ids=[r["case"] for r in ROWS])
def test_prediction_within_the_stated_band_of_the_published_figure(row):
    ours = PREDICT[row["case"]]()
    ratio = ours / float(row["published_value"])
    assert float(row["band_low"]) <= ratio <= float(row["band_high"]), (
        f"{row['case']}: floatcalc {ours:.4g} {row['unit']} vs published {row['published_value']} ({row['source']})")


@pytest.mark.parametrize("row", ROWS, ids=[r["case"] for r in ROWS])
def test_table_shows_the_current_prediction(row):
    assert PREDICT[row["case"]]() == pytest.approx(float(row["floatcalc_value"]), rel=0.02)


def test_hexadecane_over_water_ratio_of_the_disc():
    # Zhang et al. (2014): 9 mN / 17 mN = 0.53. A pad pinned at its edge scales with σ and l_c:
    # the ratio follows from the liquids alone, to 5 % (the two pads' pressure parts differ).
    wat = PREDICT["zhang2014_disc_water"]()
    hexa = PREDICT["zhang2014_disc_hexadecane"]()
    assert hexa / wat == pytest.approx(9.0 / 17.0, rel=0.05)
