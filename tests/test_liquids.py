"""Liquid records: names, ranges, cautions, custom and contaminated liquids, errors.

Published property values are checked in tests/reference/test_liquids_reference.py; here the
behaviour of the API is checked (hand-computed values are worked out beside each check).
"""

from __future__ import annotations

import dataclasses
import math

import pytest

import floatcalc as fc
from floatcalc.errors import InputError
from floatcalc.liquids import CLEAN_SURFACE_CAUTION, FLAMMABLE_CAUTION


def test_every_named_liquid_builds_inside_its_range_with_sources_and_cautions():
    for row in fc.list_liquids():
        lo, hi = (float(x) for x in row["range"].split(",")[0].replace("°C", "").split(" to "))
        for t in (max(lo, 0.01), 0.5 * (lo + hi), hi):
            liq = fc.liquid(row["name"], f"{t} degC")
            assert liq.sigma > 0 and liq.rho > 0 and 1e-3 < liq.lc < 5e-3
            assert liq.sigma_source and liq.rho_source and liq.valid_range
            assert CLEAN_SURFACE_CAUTION in liq.cautions


@pytest.mark.parametrize("name", ["ethanol", "methanol", "isopropanol", "acetone"])
def test_flammable_liquids_carry_lab_caution(name):
    assert FLAMMABLE_CAUTION in fc.liquid(name).cautions


def test_water_has_no_flammable_caution_but_hot_water_warns_of_scalds():
    assert FLAMMABLE_CAUTION not in fc.water().cautions
    assert any("scald" in c for c in fc.water("80 degC").cautions)
    assert not any("scald" in c for c in fc.water("25 degC").cautions)


def test_aliases_and_spelling_variants():
    assert fc.liquid("IPA").name == "isopropanol"
    assert fc.liquid("  Ethylene_Glycol ").name == "ethylene glycol"
    assert fc.liquid("sea water").name == "seawater"
    assert fc.liquid("water", salinity="0 g/kg").name == "water"


def test_unknown_liquid_suggests_nearest_name():
    with pytest.raises(InputError, match=r"did you mean 'ethanol'\?.*got 'ethanl'"):
        fc.liquid("ethanl")
    with pytest.raises(InputError, match="liquid: must be a name"):
        fc.liquid(42)


@pytest.mark.parametrize("call, fragment", [
    (lambda: fc.water("0 degC"), "temperature: water allows 0.01 to 100 °C, got 0 °C"),
    (lambda: fc.water("101 degC"), "got 101 °C"),
    (lambda: fc.seawater("45 degC"), "seawater allows 0 to 40 °C"),
    (lambda: fc.seawater("20 degC", "43 g/kg"), "salinity: seawater allows 0 to 42 g/kg"),
    (lambda: fc.seawater("20 degC", "-1 g/kg"), "salinity: seawater allows 0 to 42 g/kg"),
    (lambda: fc.liquid("ethanol", "80 degC"), "ethanol allows 0 to 70 °C"),
    (lambda: fc.liquid("ethanol", salinity="3 g/kg"), "salinity: applies only to seawater"),
    (lambda: fc.liquid("water", salinity="35 g/kg"), "salinity: applies to seawater, not pure water"),
    (lambda: fc.custom_liquid("x", "0.5 mN/m", "1000 kg/m^3"), "surface_tension: must be between"),
    (lambda: fc.custom_liquid("x", "70 mN/m", "10 kg/m^3"), "density: must be between"),
    (lambda: fc.custom_liquid("x", "70 mN/m", "1000 kg/m^3", "-300 degC"), "above absolute zero"),
    (lambda: fc.contaminated(fc.water(), "80 mN/m"), "at most the clean value"),
    (lambda: fc.contaminated(fc.water()), "give exactly one of"),
    (lambda: fc.contaminated(fc.water(), reduction="100 %"), "percentage must be"),
    (lambda: fc.contaminated(fc.water(), reduction="ten %"), "must be a surface tension or a percentage"),
])
def test_out_of_range_inputs_are_refused_in_one_line(call, fragment):
    with pytest.raises(InputError) as info:
        call()
    assert fragment in str(info.value)
    assert "\n" not in str(info.value)


def test_range_ends_are_accepted():
    # The stated ranges include their ends (0.01 °C and 100 °C for water; 0 and 40 °C for seawater).
    fc.water("0.01 degC"), fc.water("100 degC"), fc.water("273.16 K")
    fc.seawater("0 degC", "0 g/kg"), fc.seawater("40 degC", "42 g/kg")


def test_custom_liquid_capillary_length_by_hand():
    # Hand value: sqrt(0.075 / (1100 × 9.80665)) = 2.6368e-3 m.
    liq = fc.custom_liquid("brine (invented)", "75 mN/m", "1.1 g/cm^3")
    assert liq.lc == pytest.approx(2.6368e-3, rel=1e-4)
    assert liq.capillary_length.to("mm").magnitude == pytest.approx(2.6368, rel=1e-4)


def test_contaminated_lowers_sigma_and_adds_caution():
    w = fc.water("20 degC")
    c1 = fc.contaminated(w, surface_tension="50 mN/m")
    assert c1.sigma == pytest.approx(0.050)
    assert c1.rho == w.rho and c1.lc < w.lc
    assert len(c1.cautions) == len(w.cautions) + 1 and "Contaminated surface" in c1.cautions[-1]
    c2 = fc.contaminated(w, reduction="10 %")
    assert c2.sigma == pytest.approx(0.9 * w.sigma)
    c3 = fc.contaminated(w, reduction="2 mN/m")
    assert c3.sigma == pytest.approx(w.sigma - 0.002)


def test_liquid_is_frozen_and_summary_keys_are_si():
    w = fc.water("25 degC")
    with pytest.raises(dataclasses.FrozenInstanceError):
        w.sigma = 0.05  # type: ignore[misc]
    s = w.summary()
    for key in ("surface_tension_N_per_m", "density_kg_per_m3", "capillary_length_m", "temperature_K"):
        assert isinstance(s[key], float) and math.isfinite(s[key])
    assert s["temperature_K"] == pytest.approx(298.15)
    assert "salinity_g_per_kg" in fc.seawater().summary()


def test_quantity_properties_have_units():
    w = fc.water()
    assert w.surface_tension.to("N/m").magnitude == pytest.approx(w.sigma, rel=1e-12)
    assert w.temperature.to("degC").magnitude == pytest.approx(20.0)
    assert w.density.to("g/cm^3").magnitude == pytest.approx(0.9982, abs=1e-4)
