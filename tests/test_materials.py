"""Leg material table (floatcalc.materials): values against independent data, names, errors."""

from __future__ import annotations

import pytest

from floatcalc.errors import InputError
from floatcalc.materials import custom_leg_material, leg_material, list_leg_materials

AVOGADRO = 6.02214076e23  # exact, SI 2019


@pytest.mark.parametrize("name, symbol, atoms_per_cell, a_angstrom", [
    # Cubic lattice constants at room temperature, from memory (Kittel, Introduction to Solid
    # State Physics, table of crystal structures): W bcc 3.165 Å, Cu fcc 3.615 Å.
    ("tungsten", "W", 2, 3.165),
    ("copper", "Cu", 4, 3.615),
])
def test_element_density_matches_lattice_and_molar_mass(name, symbol, atoms_per_cell, a_angstrom):
    # X-ray density ρ = n M / (N_A a³), molar mass from the `chemicals` reference library.
    from chemicals.elements import periodic_table

    M = getattr(periodic_table, symbol).MW * 1e-3  # kg/mol
    rho_xray = atoms_per_cell * M / (AVOGADRO * (a_angstrom * 1e-10) ** 3)
    assert leg_material(name).rho == pytest.approx(rho_xray, rel=0.01)


def test_tungsten_modulus_matches_single_crystal_constants():
    # Tungsten is elastically isotropic, so E follows from its single-crystal constants:
    # E = (C11 − C12)(C11 + 2 C12)/(C11 + C12). C11 = 523, C12 = 203 GPa at room temperature
    # (from memory; Simmons & Wang, Single Crystal Elastic Constants, MIT Press 1971).
    c11, c12 = 523e9, 203e9
    E = (c11 - c12) * (c11 + 2 * c12) / (c11 + c12)
    assert leg_material("tungsten").E == pytest.approx(E, rel=0.02)


def test_table_has_the_issue_materials_with_sources_and_plausible_values():
    names = [r["name"] for r in list_leg_materials()]
    assert names == ["steel", "stainless steel", "tungsten", "nickel-titanium", "carbon fibre",
                     "pet", "nylon", "copper"]
    for row in list_leg_materials():
        assert row["source"]  # every value names where it comes from
        assert 1e9 <= row["youngs_modulus_Pa"] <= 5e11
        assert 900 <= row["density_kg_per_m3"] <= 20000
    # Handbook ordering (common practice): polymers ≪ NiTi < copper < carbon-fibre rod < steel < tungsten
    E = {r["name"]: r["youngs_modulus_Pa"] for r in list_leg_materials()}
    assert E["nylon"] < E["nickel-titanium"] < E["copper"] < E["carbon fibre"] < E["steel"] < E["tungsten"]


@pytest.mark.parametrize("alias, name", [("Nitinol", "nickel-titanium"), ("CFRP", "carbon fibre"),
                                         ("polyester", "pet"), ("stainless", "stainless steel"),
                                         ("carbon fiber", "carbon fibre"), ("Cu", "copper")])
def test_aliases(alias, name):
    assert leg_material(alias).name == name


def test_unknown_material_suggests_nearest_name():
    with pytest.raises(InputError) as exc:
        leg_material("tungstem")
    msg = str(exc.value)
    assert msg.startswith("material: ") and "did you mean 'tungsten'" in msg and "got 'tungstem'" in msg


def test_custom_material_and_its_checks():
    m = custom_leg_material("my wire", "150 GPa", "7000 kg/m^3")
    assert (m.E, m.rho) == (150e9, 7000.0)
    with pytest.raises(InputError, match="youngs_modulus: must be between"):
        custom_leg_material("x", "0 Pa", "7000 kg/m^3")
    with pytest.raises(InputError, match="density"):
        custom_leg_material("x", "150 GPa", "-1 kg/m^3")
