"""Dimensionless groups: values against hand computations and published magnitudes, readings."""

from __future__ import annotations

import pytest

import floatcalc as fc
from floatcalc import dimensionless as groups
from floatcalc.errors import InputError


def test_bond_number_is_one_at_the_capillary_length(water20):
    # Definition (de Gennes et al. 2004): Bo = (L / l_c)²; Bo = 1 when L = l_c.
    bo = fc.bond_number(water20, water20.lc)
    assert bo.value == pytest.approx(1.0, rel=1e-12)
    assert "Bo ~ 1" in bo.reading


def test_bond_number_hand_value(water20):
    # Hand value: 998.207 kg/m³ × 9.80665 m/s² × (1e-3 m)² / 0.0727361 N/m = 0.134583.
    assert fc.bond_number(water20, "1 mm").value == pytest.approx(0.134583, rel=1e-5)
    assert "≪" in fc.bond_number(water20, "0.1 mm").reading
    assert "≫" in fc.bond_number(water20, "20 mm").reading


def test_baudoin_number_hand_value(water20):
    # Hand value (Bush & Hu 2006 definition): 10 mg × 9.80665 / (0.0727361 N/m × 0.04 m) = 0.033706.
    ba = fc.baudoin_number(water20, "10 mg", "40 mm")
    assert ba.value == pytest.approx(0.033706, rel=1e-4)
    assert ba.value == pytest.approx(fc.baudoin_number(water20, "98.0665 uN", "40 mm").value, rel=1e-9)
    assert ba.reading.startswith("Ba < 1")
    assert fc.baudoin_number(water20, "1 g", "10 mm").reading.startswith("Ba ≥ 1")


def test_min_wave_speed_of_water_is_about_0_23_m_per_s(water20):
    # Source: de Gennes et al. (2004) and Lighthill, Waves in Fluids (1978): c_min ≈ 0.23 m/s
    # for clean water (from memory).
    assert fc.min_wave_speed(water20).to("m/s").magnitude == pytest.approx(0.23, abs=0.005)
    assert "below" in groups.wave_reading(water20, "0.1 m/s")
    assert "above" in groups.wave_reading(water20, "0.5 m/s")


def test_weber_and_reynolds_hand_values(water20):
    # Hand values: We = 998.207 × 0.5² × 1e-4 / 0.0727361 = 0.34309;
    # Re = 998.207 × 0.5 × 1e-4 / 1.0016e-3 ≈ 49.8 (Vogel viscosity, ±2.5 %, common practice).
    assert fc.weber_number(water20, "0.5 m/s", "0.1 mm").value == pytest.approx(0.34309, rel=1e-4)
    assert fc.reynolds_number(water20, "0.5 m/s", "0.1 mm").value == pytest.approx(49.8, rel=0.03)
    assert fc.reynolds_number(water20, "0.5 m/s", "0.1 mm", viscosity="2 mPa*s").value == pytest.approx(
        998.207 * 0.5 * 1e-4 / 2e-3, rel=1e-5)


def test_capillary_length_function(water20):
    # Common practice: about 2.7 mm for water at room temperature.
    assert fc.capillary_length(water20).to("mm").magnitude == pytest.approx(2.7, abs=0.05)


def test_all_groups_and_errors(water20):
    names = [g.symbol for g in groups.all_groups(water20, "0.2 mm", speed="0.3 m/s", weight="5 mg",
                                                 perimeter="60 mm")]
    assert names == ["Bo", "Ba", "We", "Re"]
    assert set(groups.all_groups(water20, "0.2 mm")[0].to_dict()) >= {"value", "reading", "definition"}
    with pytest.raises(InputError, match="speed: must be zero or positive"):
        fc.weber_number(water20, "-1 m/s", "1 mm")
    with pytest.raises(InputError, match="length: must be positive"):
        fc.bond_number(water20, "0 mm")
    with pytest.raises(InputError, match="viscosity: is not known"):
        fc.reynolds_number(fc.custom_liquid("x", "50 mN/m", "900 kg/m^3"), "1 m/s", "1 mm")


@pytest.mark.parametrize("weight, fragment", [
    ("-5 mN", "weight: must be positive, got -5 mN"),
    ("0 g", "weight: must be positive, got 0 g"),
    ("5 m", "weight: must be a force or a mass"),
])
def test_baudoin_weight_errors_name_the_real_problem(water20, weight, fragment):
    with pytest.raises(InputError) as info:
        fc.baudoin_number(water20, weight, "40 mm")
    assert fragment in str(info.value)
