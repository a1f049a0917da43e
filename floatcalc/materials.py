"""Leg materials: Young's modulus and density of common wire and fibre materials.

A :class:`LegMaterial` is immutable and holds SI floats (``E`` [Pa], ``rho`` [kg/m³]) with the
source of each value. Get one by name with :func:`leg_material`, make your own with
:func:`custom_leg_material`, list the table with :func:`list_leg_materials`.

The values are room-temperature handbook figures recalled from memory (the handbook named with
each entry); real wires vary with alloy, temper and drawing by several per cent, polymers by
much more (moisture, orientation). Use a measured value where it matters.

>>> m = leg_material("tungsten")
>>> round(m.E / 1e9), round(m.rho)
(411, 19300)
>>> leg_material("tungstn")
Traceback (most recent call last):
...
floatcalc.errors.InputError: material: unknown leg material (did you mean 'tungsten'?); known: steel, stainless steel, tungsten, nickel-titanium, carbon fibre, pet, nylon, copper, got 'tungstn'
"""

from __future__ import annotations

import difflib
from dataclasses import dataclass
from typing import Any

from . import _validate as v
from .errors import input_error
from .units import Q_, to_si

#: Allowed Young's modulus range [Pa] for custom values: soft elastomers to diamond.
E_MIN, E_MAX = 1e5, 1.2e12


@dataclass(frozen=True)
class LegMaterial:
    """Elastic properties of a leg material.

    Attributes
    ----------
    name : str
    E : float [Pa]
        Young's modulus (axial for fibres).
    rho : float [kg/m³]
        Density.
    source : str
        Where the values come from.
    note : str
        What the value depends on.
    """

    name: str
    E: float
    rho: float
    source: str
    note: str = ""

    @property
    def youngs_modulus(self):
        """Young's modulus as a quantity [GPa]."""
        return Q_(self.E / 1e9, "GPa")

    @property
    def density(self):
        """Density as a quantity [kg/m³]."""
        return Q_(self.rho, "kg/m**3")

    def summary(self) -> dict[str, Any]:
        return {"name": self.name, "youngs_modulus_Pa": self.E, "density_kg_per_m3": self.rho,
                "source": self.source, "note": self.note}


_ASM = "from memory: ASM Handbook, Vol. 1–2 (ASM International), room temperature"
_CRC = "from memory: CRC Handbook of Chemistry and Physics, elastic constants of the elements"
_ASHBY = "from memory: Ashby, Materials Selection in Mechanical Design (Elsevier), property charts"

_TABLE: dict[str, LegMaterial] = {
    m.name: m for m in (
        LegMaterial("steel", 200e9, 7850.0, _ASM, "plain carbon / music wire; E barely depends on temper"),
        LegMaterial("stainless steel", 193e9, 8000.0, _ASM, "austenitic 304/316; cold drawing changes E by a few per cent"),
        LegMaterial("tungsten", 411e9, 19300.0, _CRC, "pure drawn wire"),
        LegMaterial("nickel-titanium", 75e9, 6450.0,
                    "from memory: ASM Handbook, Vol. 2, shape memory alloys (austenite, 70–83 GPa)",
                    "superelastic NiTi in the austenite phase; martensite is far softer (about 30 GPa)"),
        LegMaterial("carbon fibre", 135e9, 1550.0, _ASHBY,
                    "unidirectional carbon-fibre/epoxy rod, axial; bare fibres are stiffer (about 230 GPa)"),
        LegMaterial("pet", 3.0e9, 1380.0, _ASHBY,
                    "PET/polyester, bulk value; drawn monofilament can be two to four times stiffer"),
        LegMaterial("nylon", 2.5e9, 1140.0, _ASHBY,
                    "nylon 6,6 dry; wet nylon is about 40 % softer"),
        LegMaterial("copper", 117e9, 8960.0, _CRC, "annealed; 110–130 GPa depending on texture"),
    )
}

_ALIASES = {
    "carbon steel": "steel", "music wire": "steel", "spring steel": "steel",
    "stainless": "stainless steel", "ss": "stainless steel", "304": "stainless steel",
    "316": "stainless steel", "w": "tungsten",
    "niti": "nickel-titanium", "nitinol": "nickel-titanium", "nickel titanium": "nickel-titanium",
    "carbon fiber": "carbon fibre", "cfrp": "carbon fibre", "carbon": "carbon fibre",
    "polyester": "pet", "pet/polyester": "pet", "polyamide": "nylon", "pa66": "nylon",
    "cu": "copper",
}


def _key(name: str) -> str:
    return " ".join(name.strip().lower().replace("_", " ").split())


def list_leg_materials() -> list[dict[str, Any]]:
    """Rows of the material table (SI values, sources and notes).

    >>> [r["name"] for r in list_leg_materials()][:3]
    ['steel', 'stainless steel', 'tungsten']
    """
    return [m.summary() for m in _TABLE.values()]


def leg_material(name: str) -> LegMaterial:
    """Leg material by name (aliases such as ``nitinol``, ``cfrp``, ``polyester`` accepted).

    Raises
    ------
    InputError
        Unknown name, with the nearest known name suggested.
    """
    if isinstance(name, LegMaterial):
        return name
    if not isinstance(name, str):
        raise input_error("material", "must be a material name such as 'steel'", repr(name))
    key = _key(name)
    key = _ALIASES.get(key, key)
    key = _ALIASES.get(key.replace("-", " "), key)
    if key in _TABLE:
        return _TABLE[key]
    if key.replace(" ", "-") in _TABLE:
        return _TABLE[key.replace(" ", "-")]
    close = difflib.get_close_matches(key, [*_TABLE, *_ALIASES], n=1, cutoff=0.6)
    hint = ""
    if close:
        hint = f" (did you mean '{_ALIASES.get(close[0], close[0])}'?)"
    raise input_error("material", f"unknown leg material{hint}; known: {', '.join(_TABLE)}", repr(name))


def youngs_modulus(value: Any, field: str = "youngs_modulus") -> float:
    """A Young's modulus [Pa] between 0.1 MPa and 1200 GPa (e.g. ``"200 GPa"``)."""
    E = to_si(value, "pressure", field)
    if not (E_MIN <= E <= E_MAX):
        raise input_error(field, "must be between 0.1 MPa and 1200 GPa", f"{E / 1e9:.6g} GPa")
    return E


def custom_leg_material(name: str, youngs_modulus: Any, density: Any) -> LegMaterial:
    """A material of your own, e.g. ``custom_leg_material("my wire", "180 GPa", "7900 kg/m^3")``.

    >>> round(custom_leg_material("x", "180 GPa", "7900 kg/m^3").E / 1e9)
    180
    """
    E = _youngs(youngs_modulus)
    rho = v.density(density, "density")
    from ._validate import name as v_name

    return LegMaterial(v_name(name, "name"), E, rho, "user value")


_youngs = youngs_modulus
