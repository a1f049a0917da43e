"""Liquid records: surface tension, density, temperature, and where each value comes from.

A :class:`Liquid` is immutable. Build one with :func:`liquid` (by name), :func:`water`,
:func:`seawater`, :func:`custom_liquid`, and lower its surface tension for a contaminated surface
with :func:`contaminated`. :func:`list_liquids` lists the named liquids and their ranges.

Values are SI floats on the record (``sigma`` [N/m], ``rho`` [kg/m³], ``T`` [K]); the
properties ``surface_tension``, ``density``, ``temperature`` and ``capillary_length`` return
pint quantities.

>>> w = water("20 degC")
>>> round(w.sigma * 1e3, 2), round(w.rho, 1), round(w.lc * 1e3, 3)
(72.74, 998.2, 2.726)
"""

from __future__ import annotations

import dataclasses
import difflib
import math
from dataclasses import dataclass, field
from typing import Any

from .core import properties as _p
from .errors import input_error
from .units import Q_, to_si

#: Standard gravity [m/s²] (CGPM 1901); used unless a caller sets another value.
G0 = 9.80665

CLEAN_SURFACE_CAUTION = (
    "Static estimate for a clean liquid surface: surfactants, soap, oils, skin grease and "
    "heat lower the surface tension and with it every capillary force computed here."
)


@dataclass(frozen=True)
class Liquid:
    """An immutable liquid state.

    Attributes
    ----------
    name : str
    sigma : float [N/m]
        Surface tension.
    rho : float [kg/m³]
        Density.
    T : float [K]
        Temperature (NaN-free; for a custom liquid without temperature, 293.15 K is recorded).
    sigma_source, rho_source : str
        The correlation or origin of each value.
    valid_range : str
        Temperature (and salinity) range of the correlations, in words.
    salinity : float or None [g/kg]
        Absolute salinity for seawater.
    mu : float or None [Pa·s]
        Dynamic viscosity, where known (used only for the Reynolds number).
    mu_source : str
    g : float [m/s²]
        Gravitational acceleration used for the capillary length.
    cautions : tuple of str
        Cautions to show with every result computed for this liquid.
    """

    name: str
    sigma: float
    rho: float
    T: float
    sigma_source: str
    rho_source: str
    valid_range: str
    salinity: float | None = None
    mu: float | None = None
    mu_source: str = ""
    g: float = G0
    cautions: tuple[str, ...] = field(default=(CLEAN_SURFACE_CAUTION,))

    @property
    def lc(self) -> float:
        """Capillary length sqrt(σ/(ρg)) [m] as a float."""
        return math.sqrt(self.sigma / (self.rho * self.g))

    @property
    def surface_tension(self):
        """Surface tension as a pint quantity [mN/m]."""
        return Q_(self.sigma * 1e3, "mN/m")

    @property
    def density(self):
        """Density as a pint quantity [kg/m³]."""
        return Q_(self.rho, "kg/m**3")

    @property
    def temperature(self):
        """Temperature as a pint quantity [°C]."""
        return Q_(self.T - _p.KELVIN, "degC")

    @property
    def capillary_length(self):
        """Capillary length as a pint quantity [mm]."""
        return Q_(self.lc * 1e3, "mm")

    def summary(self) -> dict[str, Any]:
        """SI values with unit-suffixed keys, as printed by ``floatcalc liquid --json``."""
        out = {
            "name": self.name,
            "temperature_K": self.T,
            "surface_tension_N_per_m": self.sigma,
            "density_kg_per_m3": self.rho,
            "capillary_length_m": self.lc,
            "surface_tension_source": self.sigma_source,
            "density_source": self.rho_source,
            "valid_range": self.valid_range,
            "cautions": list(self.cautions),
        }
        if self.salinity is not None:
            out["salinity_g_per_kg"] = self.salinity
        if self.mu is not None:
            out["viscosity_Pa_s"] = self.mu
            out["viscosity_source"] = self.mu_source
        return out


# --------------------------------------------------------------------------------------------
# Water and seawater

WATER_T_MIN, WATER_T_MAX = 273.16, 373.15  # K: 0.01 °C (triple point) to 100 °C


def _temperature(value: Any, field_name: str = "temperature") -> float:
    return to_si(value, "temperature", field_name)


def _check_T(T: float, lo: float, hi: float, what: str) -> None:
    # 1 µK of slack: "0.01 degC" converts to 273.15999999999997 K, which must not be refused
    # as lying below the 273.16 K limit that is stated as "0.01 °C".
    if not (lo - 1e-6 <= T <= hi + 1e-6):
        raise input_error(
            "temperature",
            f"{what} allows {lo - _p.KELVIN:g} to {hi - _p.KELVIN:g} °C",
            f"{T - _p.KELVIN:.6g} °C",
        )


def water(temperature: Any = "20 degC") -> Liquid:
    """Pure water at 0.01–100 °C and 1 atm.

    Surface tension from IAPWS R1-76(2014); density from Tanaka et al. (2001) at 0–40 °C and
    from Kell (1975) above 40 °C (see :mod:`floatcalc.core.properties`).

    >>> round(water("25 degC").sigma * 1e3, 2)
    71.97
    """
    T = _temperature(temperature)
    _check_T(T, WATER_T_MIN, WATER_T_MAX, "water")
    t = T - _p.KELVIN
    if t <= 40.0:
        rho = float(_p.water_density_tanaka(t))
        rho_src = "Tanaka et al., Metrologia 38, 301 (2001)"
    else:
        rho = float(_p.water_density_kell(t))
        rho_src = "Kell, J. Chem. Eng. Data 20, 97 (1975)"
    cautions = [CLEAN_SURFACE_CAUTION]
    if t > 60.0:
        cautions.append("Hot water: risk of scalds; keep electronics and mains leads away from the bath.")
    return Liquid(
        name="water",
        sigma=float(_p.water_surface_tension_iapws(T)),
        rho=rho,
        T=T,
        sigma_source="IAPWS R1-76(2014)",
        rho_source=rho_src,
        valid_range="0.01 to 100 °C",
        mu=float(_p.water_viscosity_vogel(T)),
        mu_source=_p.VOGEL_SOURCE,
        cautions=tuple(cautions),
    )


SEAWATER_T_MIN, SEAWATER_T_MAX = 273.15, 313.15  # density correlation range (0–40 °C)
SEAWATER_S_MAX = 42.0  # g/kg, EOS-80 stated range (SP ≤ 42 ≈ SA 42.2 g/kg)


def seawater(temperature: Any = "20 degC", salinity: Any = "35 g/kg") -> Liquid:
    """Seawater at 1 atm by temperature and absolute salinity.

    Surface tension: Nayar et al. (2014) times IAPWS pure water; density: UNESCO EOS-80
    one-atmosphere equation (Millero & Poisson 1981), with practical salinity taken as
    SP = SA · 35/35.16504. Range: 0–40 °C, 0–42 g/kg (the density correlation is the narrower).
    """
    T = _temperature(temperature)
    S = to_si(salinity, "salinity", "salinity")
    _check_T(T, SEAWATER_T_MIN, SEAWATER_T_MAX, "seawater")
    if not (0.0 <= S <= SEAWATER_S_MAX):
        raise input_error("salinity", f"seawater allows 0 to {SEAWATER_S_MAX:g} g/kg", f"{S:g} g/kg")
    t = T - _p.KELVIN
    SP = S * 35.0 / 35.16504
    return Liquid(
        name="seawater",
        sigma=float(_p.seawater_surface_tension_nayar(T, S)),
        rho=float(_p.seawater_density_eos80(t, SP)),
        T=T,
        sigma_source="Nayar et al., J. Phys. Chem. Ref. Data 43, 043103 (2014)",
        rho_source="UNESCO EOS-80 one-atmosphere (Millero & Poisson 1981)",
        valid_range="0 to 40 °C, 0 to 42 g/kg",
        salinity=S,
        mu=float(_p.water_viscosity_vogel(T)),
        mu_source=_p.VOGEL_SOURCE + " (pure water; salt raises it by a few per cent)",
    )


# --------------------------------------------------------------------------------------------
# Other named liquids: linear σ(t) (Jasper 1972 where he lists the liquid) and linear ρ(t).

_JASPER = "Jasper, J. Phys. Chem. Ref. Data 1, 841 (1972), linear fit"
_CRC = "CRC Handbook of Chemistry and Physics, values at 20 °C and 25 °C, linear (from memory)"


@dataclass(frozen=True)
class _LinearLiquid:
    sigma0: float  # N/m at 0 °C (Jasper form σ = a − b t)
    dsigma: float  # N/m per K
    sigma_src: str
    rho20: float  # kg/m³ at 20 °C
    drho: float  # kg/m³ per K
    rho_src: str
    t_min: float  # °C
    t_max: float  # °C
    mu20: float | None = None  # Pa·s at 20 °C
    flammable: bool = False
    note: str = ""


_NAMED: dict[str, _LinearLiquid] = {
    "ethanol": _LinearLiquid(24.05e-3, -0.0832e-3, _JASPER, 789.3, -0.85, _CRC, 0.0, 70.0, 1.20e-3, True),
    "methanol": _LinearLiquid(24.00e-3, -0.0773e-3, _JASPER, 791.4, -0.94, _CRC, 0.0, 60.0, 0.59e-3, True),
    "isopropanol": _LinearLiquid(22.90e-3, -0.0789e-3, _JASPER, 785.1, -0.82, _CRC, 0.0, 75.0, 2.40e-3, True),
    "acetone": _LinearLiquid(26.26e-3, -0.112e-3, _JASPER, 790.8, -1.26, _CRC, 0.0, 50.0, 0.32e-3, True),
    "ethylene glycol": _LinearLiquid(50.21e-3, -0.089e-3, _JASPER, 1113.5, -0.71, _CRC, 10.0, 100.0, 19.9e-3),
    "glycerol": _LinearLiquid(
        64.6e-3, -0.060e-3,
        "63.4 mN/m at 20 °C (CRC Handbook) with slope −0.060 mN/m/K (from memory, common practice)",
        1261.3, -0.65, _CRC, 10.0, 50.0, 1.41,
        note="Glycerol absorbs water from the air, which raises its surface tension toward water's.",
    ),
    # n-hexadecane: σ from Jasper's table (a = 29.18 mN/m, b = 0.0854 mN/m/K, above the melting
    # point 18.2 °C); ρ = 773.4 kg/m³ at 20 °C, −0.66 kg/m³/K (CRC Handbook values, from memory);
    # μ 3.45 mPa·s at 20 °C (from memory). Flash point about 135 °C (combustible).
    "n-hexadecane": _LinearLiquid(29.18e-3, -0.0854e-3, _JASPER, 773.4, -0.66, _CRC, 18.2, 100.0, 3.45e-3, True,
                                  note="n-Hexadecane freezes at 18 °C; below that it is not a liquid."),
    "silicone oil": _LinearLiquid(
        21.6e-3, -0.060e-3,
        "typical datasheet value for 10 cSt polydimethylsiloxane, 20.1 mN/m at 25 °C (common practice)",
        938.0, -0.90, "typical datasheet value for 10 cSt PDMS, 935 kg/m³ at 25 °C (common practice)",
        0.0, 80.0, 9.4e-3,
        note="Silicone oils wet almost every solid (contact angles near 0°); check coating data.",
    ),
}

_ALIASES = {
    "2-propanol": "isopropanol", "ipa": "isopropanol", "isopropyl alcohol": "isopropanol",
    "glycerine": "glycerol", "glycerin": "glycerol", "pdms": "silicone oil",
    "salt water": "seawater", "sea water": "seawater", "monoethylene glycol": "ethylene glycol",
    "ethanediol": "ethylene glycol", "pure water": "water", "hexadecane": "n-hexadecane", "cetane": "n-hexadecane",
}

FLAMMABLE_CAUTION = (
    "Flammable liquid: work in a ventilated place away from flames, sparks and hot plates; "
    "keep batteries and motor drivers of test rigs clear of spills."
)


def list_liquids() -> list[dict[str, str]]:
    """Names, ranges and sources of every named liquid.

    >>> "water" in [d["name"] for d in list_liquids()]
    True
    """
    rows = [
        {"name": "water", "range": "0.01 to 100 °C", "surface_tension_source": "IAPWS R1-76(2014)",
         "density_source": "Tanaka et al. 2001 (0–40 °C), Kell 1975 (above)"},
        {"name": "seawater", "range": "0 to 40 °C, 0 to 42 g/kg",
         "surface_tension_source": "Nayar et al. 2014", "density_source": "UNESCO EOS-80"},
    ]
    for name, d in _NAMED.items():
        rows.append({"name": name, "range": f"{d.t_min:g} to {d.t_max:g} °C",
                     "surface_tension_source": d.sigma_src, "density_source": d.rho_src})
    return rows


def _known_names() -> list[str]:
    return ["water", "seawater", *_NAMED, *_ALIASES]


def liquid(name: str, temperature: Any = "20 degC", salinity: Any | None = None) -> Liquid:
    """Named liquid at a temperature (and salinity for seawater).

    Raises :class:`~floatcalc.errors.InputError` for an unknown name (with the nearest match) or
    a temperature outside the liquid's correlation range.

    >>> liquid("ethanol", "20 degC").name
    'ethanol'
    """
    if not isinstance(name, str):
        raise input_error("liquid", "must be a name such as 'water'", repr(name))
    key = " ".join(name.strip().lower().replace("_", " ").split())
    key = _ALIASES.get(key, key)
    if key == "water":
        if salinity is not None and to_si(salinity, "salinity", "salinity") != 0.0:
            raise input_error("salinity", "applies to seawater, not pure water: choose the liquid 'seawater' "
                              "(salinity 0 means pure water)", repr(salinity))
        return water(temperature)
    if key == "seawater":
        return seawater(temperature, "35 g/kg" if salinity is None else salinity)
    if key not in _NAMED:
        close = difflib.get_close_matches(key, _known_names(), n=1)
        hint = f" (did you mean '{close[0]}'?)" if close else ""
        raise input_error(
            "liquid", f"unknown liquid{hint}; known: {', '.join(['water', 'seawater', *_NAMED])}", repr(name)
        )
    if salinity is not None:
        raise input_error("salinity", "applies only to seawater (and 0 to water)", repr(salinity))
    d = _NAMED[key]
    T = _temperature(temperature)
    _check_T(T, d.t_min + _p.KELVIN, d.t_max + _p.KELVIN, key)
    t = T - _p.KELVIN
    cautions = [CLEAN_SURFACE_CAUTION]
    if d.flammable:
        cautions.append(FLAMMABLE_CAUTION)
    if d.note:
        cautions.append(d.note)
    return Liquid(
        name=key,
        sigma=float(_p.linear_in_temperature(t, d.sigma0, d.dsigma, t_ref=0.0)),
        rho=float(_p.linear_in_temperature(t, d.rho20, d.drho, t_ref=20.0)),
        T=T,
        sigma_source=d.sigma_src,
        rho_source=d.rho_src,
        valid_range=f"{d.t_min:g} to {d.t_max:g} °C",
        mu=d.mu20,
        mu_source="value at 20 °C only (CRC Handbook, from memory); strongly temperature dependent",
        cautions=tuple(cautions),
    )


def custom_liquid(name: str, surface_tension: Any, density: Any, temperature: Any = "20 degC") -> Liquid:
    """A liquid from measured or looked-up values.

    >>> round(custom_liquid("brine", "75 mN/m", "1100 kg/m^3").lc * 1e3, 3)
    2.637
    """
    from ._validate import name as v_name

    v_name(name, "name")
    sigma = to_si(surface_tension, "surface_tension", "surface_tension")
    rho = to_si(density, "density", "density")
    T = _temperature(temperature)
    if not (1e-3 <= sigma <= 1.0):
        raise input_error("surface_tension", "must be between 1 and 1000 mN/m", f"{sigma * 1e3:g} mN/m")
    if not (100.0 <= rho <= 25000.0):
        raise input_error("density", "must be between 100 and 25000 kg/m³", f"{rho:g} kg/m³")
    if T <= 0:
        raise input_error("temperature", "must be above absolute zero", f"{T:g} K")
    return Liquid(
        name=v_name(name, "name") or "custom liquid",
        sigma=sigma,
        rho=rho,
        T=T,
        sigma_source="given by the user",
        rho_source="given by the user",
        valid_range="as given",
    )


def contaminated(base: Liquid, surface_tension: Any | None = None, reduction: Any | None = None) -> Liquid:
    """The same liquid with a lowered surface tension, for a contaminated surface.

    Give either the measured ``surface_tension`` of the dirty surface, or the ``reduction`` from
    the clean value (a surface tension such as ``"10 mN/m"`` or a fraction such as ``"15 %"``).

    >>> w = water("20 degC")
    >>> round(contaminated(w, reduction="10 mN/m").sigma * 1e3, 2)
    62.74
    """
    if not isinstance(base, Liquid):
        base = as_liquid(base)  # a liquid name is read; anything else is a one-line InputError
    if (surface_tension is None) == (reduction is None):
        raise input_error("contamination", "give exactly one of surface_tension or reduction", None)
    if surface_tension is not None:
        sigma = to_si(surface_tension, "surface_tension", "contaminated surface_tension")
        how = f"measured {sigma * 1e3:.4g} mN/m"
    else:
        sigma = _reduced(base.sigma, reduction)
        how = f"clean value lowered by {reduction}"
    if not (0.0 < sigma <= base.sigma):
        raise input_error(
            "contaminated surface_tension",
            f"must be above 0 and at most the clean value {base.sigma * 1e3:.4g} mN/m",
            f"{sigma * 1e3:.4g} mN/m",
        )
    caution = (
        f"Contaminated surface: surface tension {sigma * 1e3:.4g} mN/m instead of "
        f"{base.sigma * 1e3:.4g} mN/m ({how}); the liquid's own correlation no longer applies."
    )
    return dataclasses.replace(
        base,
        name=f"{base.name} (contaminated)",
        sigma=sigma,
        sigma_source=f"contaminated: {how}",
        cautions=(*base.cautions, caution),
    )


def _reduced(sigma: float, reduction: Any) -> float:
    if isinstance(reduction, str) and reduction.strip().endswith("%"):
        try:
            frac = float(reduction.strip()[:-1]) / 100.0
        except ValueError:
            raise input_error("reduction", "must be a surface tension or a percentage", repr(reduction)) from None
        if not (0.0 <= frac < 1.0) or not math.isfinite(frac):
            raise input_error("reduction", "percentage must be from 0 up to (not including) 100 %", repr(reduction))
        return sigma * (1.0 - frac)
    return sigma - to_si(reduction, "surface_tension", "reduction")


def as_liquid(value: Any) -> "Liquid":
    """The liquid an API call asked for: a :class:`Liquid`, a liquid name, or None (water at
    20 °C); anything else is a one-line InputError (the one check every public function uses).

    >>> as_liquid("ethanol").name, as_liquid(None).name
    ('ethanol', 'water')
    """
    if value is None:
        return water()
    if isinstance(value, Liquid):
        return value
    if isinstance(value, str):
        return liquid(value)
    raise input_error("liquid", "must be a Liquid such as floatcalc.water('20 degC') or a liquid name such as "
                      "'water'", type(value).__name__)
