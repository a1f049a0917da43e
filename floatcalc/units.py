"""The package's single pint registry and the one helper that strips units at the API boundary.

Public functions accept, for every dimensional input:

* a pint quantity (from this registry or any other: it is converted through its string form),
* a plain number or NumPy array, taken to be in SI base units (metre, kilogram, second, kelvin,
  radian; salinity in g/kg),
* a string such as ``"0.15 mm"``, ``"150 deg"`` or ``"20 degC"``.

The registry is built lazily on first use, so ``import floatcalc`` does not pay for pint.

>>> to_si("0.15 mm", "length", "radius")
0.00015
>>> to_si(3, "length", "radius")
3.0
>>> to_si("3 kg", "length", "radius")
Traceback (most recent call last):
...
floatcalc.errors.InputError: radius: must be a length (e.g. '0.2 mm'), got 3 kilogram
"""

from __future__ import annotations

import functools
import math
from typing import Any

import numpy as np

from .errors import input_error

#: kind -> (pint dimensionality string, SI unit used inside floatcalc, example for messages)
KINDS: dict[str, tuple[str, str, str]] = {
    "length": ("[length]", "m", "0.2 mm"),
    "area": ("[length]**2", "m**2", "1 mm**2"),
    "mass": ("[mass]", "kg", "1.2 g"),
    "angle": ("", "rad", "150 deg"),
    "temperature": ("[temperature]", "K", "20 degC"),
    "surface_tension": ("[mass]/[time]**2", "N/m", "72 mN/m"),
    "density": ("[mass]/[length]**3", "kg/m**3", "1000 kg/m^3"),
    "force": ("[mass]*[length]/[time]**2", "N", "5 mN"),
    "force_per_length": ("[mass]/[time]**2", "N/m", "1 mN/m"),
    "pressure": ("[mass]/[length]/[time]**2", "Pa", "200 GPa"),
    "speed": ("[length]/[time]", "m/s", "0.3 m/s"),
    "acceleration": ("[length]/[time]**2", "m/s**2", "9.81 m/s^2"),
    "viscosity": ("[mass]/[length]/[time]", "Pa*s", "1 mPa*s"),
    "salinity": ("", "g/kg", "35 g/kg"),
}

_KIND_WORD = {
    "length": "a length",
    "area": "an area",
    "mass": "a mass",
    "angle": "an angle",
    "temperature": "a temperature",
    "surface_tension": "a surface tension (force per length)",
    "density": "a density (mass per volume)",
    "force": "a force",
    "force_per_length": "a force per unit length",
    "pressure": "a pressure or modulus",
    "speed": "a speed",
    "acceleration": "an acceleration",
    "viscosity": "a dynamic viscosity",
    "salinity": "a salinity (mass fraction)",
}


@functools.cache
def registry():
    """Return the package-wide :class:`pint.UnitRegistry` (built on first call)."""
    import pint

    ureg = pint.UnitRegistry(autoconvert_offset_to_baseunit=True)
    ureg.formatter.default_format = "~P"
    return ureg


def Q_(value: Any, unit: str):
    """Make a quantity of ``value`` in ``unit`` with the package registry."""
    return registry().Quantity(value, unit)


def _is_quantity(value: Any) -> bool:
    return hasattr(value, "magnitude") and hasattr(value, "units") and hasattr(value, "to")


def _parse_string(text: str, kind: str, field: str):
    ureg = registry()
    s = text.strip()
    if not s:
        raise input_error(field, f"must be {_KIND_WORD[kind]} (e.g. '{KINDS[kind][2]}')", "an empty string")
    # Accept the usual unicode forms users paste.
    s = s.replace("°C", " degC").replace("°F", " degF").replace("°", " deg").replace("µ", "u").replace("μ", "u")
    try:
        q = ureg.Quantity(s)
    except Exception:
        raise input_error(
            field, f"is not a number with a unit (e.g. '{KINDS[kind][2]}')", repr(text)
        ) from None
    return q


def to_si(value: Any, kind: str, field: str, *, array: bool = False) -> Any:
    """Convert ``value`` to a float (or array if ``array``) in floatcalc's SI unit for ``kind``.

    Parameters
    ----------
    value : pint quantity, number, array or str
        Plain numbers are taken to be in SI already (see module docstring).
    kind : str
        One of :data:`KINDS` (``"length"``, ``"angle"``, ...).
    field : str
        Name of the input, used in error messages.
    array : bool
        Allow array input and return a float array; otherwise a scalar float is required.

    Raises
    ------
    InputError
        Wrong dimension, unparsable text, NaN or infinite values, or an array where a scalar is
        required.
    """
    if kind not in KINDS:  # programming error, not user input
        raise KeyError(kind)
    dim, si_unit, example = KINDS[kind]
    if isinstance(value, str):
        q = _parse_string(value, kind, field)
        if kind in ("angle", "salinity") and not dict(q.unit_items()):
            raise input_error(field, f"needs a unit (e.g. '{example}')", repr(value))
        mag = _convert(q, kind, field)
    elif _is_quantity(value):
        if getattr(value, "_REGISTRY", None) is not registry():
            # A quantity from another registry: rebuild it here from magnitude and unit name.
            value = registry().Quantity(np.asarray(value.magnitude, dtype=float), str(value.units))
        mag = _convert(value, kind, field)
    elif isinstance(value, bool) or value is None:
        raise input_error(field, f"must be {_KIND_WORD[kind]} (e.g. '{example}')", repr(value))
    else:
        try:
            mag = np.asarray(value, dtype=float)
        except (TypeError, ValueError):
            raise input_error(field, f"must be {_KIND_WORD[kind]} (e.g. '{example}')", repr(value)) from None
    mag = np.asarray(mag, dtype=float)
    if not array and mag.ndim != 0:
        raise input_error(field, "must be a single value, not a list or array", f"shape {mag.shape}")
    if not np.all(np.isfinite(mag)):
        bad = mag[~np.isfinite(mag)].flat[0] if mag.ndim else float(mag)
        raise input_error(field, "must be a finite number", f"{bad} {si_unit}")
    return float(mag) if mag.ndim == 0 else mag


_ANGLE_UNITS = {"degree", "radian", "arcminute", "arcsecond", "turn", "revolution", "gradian", "milliradian"}


def _convert(q, kind: str, field: str):
    si_unit, example = KINDS[kind][1], KINDS[kind][2]
    want = registry().Quantity(1, si_unit).dimensionality
    names = {name for name, _ in q.unit_items()}
    angle_like = bool(names & _ANGLE_UNITS)
    if q.dimensionality != want or (kind == "angle" and names and not names <= _ANGLE_UNITS) or (
        kind != "angle" and angle_like
    ):
        raise input_error(field, f"must be {_KIND_WORD[kind]} (e.g. '{example}')", _describe(q))
    return q.to(si_unit).magnitude


def _describe(q) -> str:
    """Describe a quantity for an error message, e.g. ``3 kilogram`` or ``5 (no unit)``."""
    mag = q.magnitude
    mag_s = f"{mag:g}" if np.ndim(mag) == 0 else f"array of shape {np.shape(mag)}"
    return f"{mag_s} (no unit)" if not dict(q.unit_items()) else f"{mag_s} {q.units:D}"


def format_si(value: float, kind: str, unit: str | None = None, digits: int = 4) -> str:
    """Format an SI value of ``kind`` for messages, optionally in another unit.

    >>> format_si(1.5e-4, "length", "mm")
    '0.15 mm'
    """
    if unit is None:
        unit = KINDS[kind][1]
        mag = value
    else:
        mag = Q_(value, KINDS[kind][1]).to(unit).magnitude
    if not math.isfinite(mag):
        return f"{mag} {unit}"
    return f"{mag:.{digits}g} {unit}"
