"""The package's single pint registry and the one helper that strips units at the API boundary.

Public functions accept, for every dimensional input:

* a pint quantity (from this registry or any other: it is rebuilt from its magnitude and unit
  names),
* a plain number or NumPy array, taken to be in SI base units (metre, kilogram, second, kelvin,
  radian; salinity in g/kg),
* a string such as ``"0.15 mm"``, ``"150 deg"`` or ``"20 degC"``: a number and a unit, read by
  the small grammar below (nothing in the text is evaluated, so ``9**9**9 mm`` is refused at
  once).

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
import re
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


def Q_(value: Any, unit: Any):
    """Make a quantity of ``value`` in ``unit`` with the package registry.

    A text ``unit`` must be a unit expression of the value grammar below (``"mm"``,
    ``"kg/m^3"``, ``"N*m/rad"``); it is checked name by name, never evaluated, so a unit read
    from a file (a CSV header, say) cannot make pint compute anything. Anything else (a pint
    unit) is passed on as it is.

    >>> Q_(250, "um").to("mm")
    <Quantity(0.25, 'millimeter')>
    """
    if isinstance(unit, str):
        unit = _unit(unit)
    return registry().Quantity(value, unit)


@functools.lru_cache(maxsize=512)
def _unit(unit: str):
    """The registry unit of a checked unit text (cached: internal code makes many quantities)."""
    return registry().Unit(unit_text(unit))


@functools.lru_cache(maxsize=512)
def unit_text(unit: str, field: str = "unit") -> str:
    """Check a unit expression of the value grammar and return it in registry names.

    >>> unit_text("kg/m^3")
    'kilogram ** 1 * meter ** -3'
    >>> unit_text("9**9**9")
    Traceback (most recent call last):
    ...
    floatcalc.errors.InputError: unit: must be a unit such as 'mm', 'kg/m^3' or 'mN/m', got '9**9**9'
    """
    s = unit.strip()
    if not s or s in ("dimensionless", "1"):
        return ""
    problem = "must be a unit such as 'mm', 'kg/m^3' or 'mN/m'"
    if len(s) > MAX_TEXT:
        raise input_error(field, f"{problem} (at most {MAX_TEXT} characters)", f"a text of {len(s)} characters")
    try:
        factors = _scan_unit(s, 0)
    except _Syntax as exc:
        raise input_error(field, problem + (f"; {exc.detail}" if exc.detail else ""), repr(unit)) from None
    units: dict[str, int] = {}
    for name, power in factors:
        reg_name = _unit_name(name)
        if reg_name is None:
            raise input_error(field, f"unknown unit '{name}'{_suggest(name)}", repr(unit))
        units[reg_name] = units.get(reg_name, 0) + power
    return _join_units(units)


def _join_units(units: dict[str, int]) -> str:
    """``{'meter': 2, 'second': -1}`` -> ``'meter ** 2 * second ** -1'`` (validated names only)."""
    return " * ".join(f"{n} ** {p}" for n, p in units.items() if p != 0)


def _is_quantity(value: Any) -> bool:
    return hasattr(value, "magnitude") and hasattr(value, "units") and hasattr(value, "to")


# ------------------------------------------------------------------------------------------
# The value grammar. Nothing a user types is ever evaluated: the text is matched against the
# grammar below in one left-to-right pass (time linear in its length, which is capped), each
# unit name is looked up in the registry, and the quantity is built from the parsed pieces.
#
#   value     ::= number [spaces] [unit]
#   number    ::= [sign] (digits ["." [digits]] | "." digits) [("e"|"E") [sign] digit{1,3}]
#               | [sign] ("nan" | "inf" | "infinity")        (read, then refused as not finite)
#   sign      ::= "+" | "-" | "−"
#   unit      ::= factor {joiner factor}                      (at most 6 factors)
#   joiner    ::= [spaces] ("*" | "·" | "⋅") [spaces] | spaces | [spaces] "/" [spaces]
#   factor    ::= name [power]
#   power     ::= [spaces] ("^" | "**") [spaces] [sign] digit | ["⁻"] superscript-digit
#                                                              (|power| from 1 to 4)
#   name      ::= letters (A-Z a-z _ µ μ Ω Å) | "°" | "°C" | "°F" | "℃" | "℉" | "%" | "‰"
#
# A factor after "/" is in the denominator; once a "/" is seen every further factor needs its
# own "/" ("W/m/K"), since "W/m K" reads differently to different people.

MAX_TEXT = 64  #: longest accepted value text [characters]
MAX_NUMBER = 32  #: longest accepted number, sign and exponent included [characters]
MAX_EXPONENT_DIGITS = 3
MAX_FACTORS = 6
MAX_POWER = 4

_SPACES = " \t\u00a0\u2009\u202f"  # space, tab, no-break space, thin space, narrow no-break space
_NUMBER = re.compile(
    r"([-+\u2212]?)(?:([0-9]+(?:\.[0-9]*)?|\.[0-9]+)(?:[eE]([-+\u2212]?)([0-9]+))?"
    r"|((?i:nan|inf(?:inity)?))(?![A-Za-z_]))"
)
_NAME = re.compile(r"[A-Za-z_\u00b5\u03bc\u03a9\u00c5]+|[°º][CFK]?|[%‰℃℉]")
_SUPERSCRIPT = {"¹": 1, "²": 2, "³": 3, "⁴": 4, "⁰": 0, "⁵": 5, "⁶": 6, "⁷": 7, "⁸": 8, "⁹": 9}
_ALIASES = {
    "°": "degree", "º": "degree", "°C": "degC", "ºC": "degC", "℃": "degC", "°F": "degF", "ºF": "degF",
    "℉": "degF", "°K": "K", "ºK": "K", "%": "percent", "‰": "permille",
}
_OFFSET_UNITS = {"degree_Celsius", "degree_Fahrenheit", "degree_Reaumur"}
#: short list that unknown unit names are compared with (difflib) to suggest a spelling
COMMON_UNITS = (
    "m", "cm", "mm", "um", "nm", "km", "inch", "ft", "g", "mg", "ug", "kg", "N", "mN", "uN", "nN",
    "dyn", "deg", "rad", "mrad", "degC", "degF", "K", "Pa", "kPa", "MPa", "GPa", "mPa", "s", "ms",
    "min", "h", "percent", "permille", "cP", "lbf", "lb", "bar",
)


class _Syntax(Exception):
    """Text outside the grammar; ``detail`` (may be empty) says what to write instead."""

    def __init__(self, detail: str = ""):
        super().__init__(detail)
        self.detail = detail


def _skip_spaces(s: str, i: int) -> int:
    while i < len(s) and s[i] in _SPACES:
        i += 1
    return i


def _scan_power(s: str, i: int) -> tuple[int, int]:
    """Read an optional power after a unit name at ``s[i]``; return (power, new index)."""
    op = _skip_spaces(s, i)
    if s.startswith("**", op) or s.startswith("^", op):
        j = _skip_spaces(s, op + (2 if s[op] == "*" else 1))
        sign = 1
        if j < len(s) and s[j] in "+-\u2212":
            sign = -1 if s[j] != "+" else 1
            j += 1
        k = j
        while k < len(s) and s[k].isascii() and s[k].isdigit():
            k += 1
        if k == j:
            raise _Syntax("a power is a whole number such as m^2 or s^-1")
        digits = s[j:k]
    elif i < len(s) and (s[i] in _SUPERSCRIPT or s[i] == "⁻"):
        j, sign = i, 1
        if s[j] == "⁻":
            sign, j = -1, j + 1
        k = j
        while k < len(s) and s[k] in _SUPERSCRIPT:
            k += 1
        if k == j:
            raise _Syntax("a power is a whole number such as m^2 or s^-1")
        digits = "".join(str(_SUPERSCRIPT[c]) for c in s[j:k])
    else:
        return 1, i
    if len(digits) > 1 or not 1 <= int(digits) <= MAX_POWER:
        raise _Syntax(f"unit powers are whole numbers from -{MAX_POWER} to {MAX_POWER} (not 0)")
    after = _skip_spaces(s, k)
    if k < len(s) and (s[k] in _SUPERSCRIPT or s[k].isdigit()) or s.startswith(("**", "^"), after):
        raise _Syntax("one power per unit name, no power towers")
    return sign * int(digits), k


def _scan_unit(s: str, i: int) -> list[tuple[str, int]]:
    """Read the unit expression starting at ``s[i]`` up to the end of ``s``.

    Returns the factors as (name as typed, power) pairs; raises :class:`_Syntax` if the text is
    not a unit expression of the grammar.
    """
    factors: list[tuple[str, int]] = []
    divided = False
    sign = 1
    while True:
        m = _NAME.match(s, i)
        if not m:
            raise _Syntax("")
        name, i = m.group(), m.end()
        power, i = _scan_power(s, i)
        factors.append((name, sign * power))
        if len(factors) > MAX_FACTORS:
            raise _Syntax(f"at most {MAX_FACTORS} unit names")
        j = _skip_spaces(s, i)
        if j == len(s):
            return factors
        if j < len(s) and s[j].isascii() and s[j].isdigit():
            raise _Syntax(f"write powers as {name}^2, and the number before the unit")
        if s[j] in "*·⋅/":
            if s[j] == "/":
                divided, sign = True, -1
            elif divided:
                raise _Syntax("after '/' give each further unit its own '/', as in W/m/K")
            i = _skip_spaces(s, j + 1)
        elif j > i:  # a space between two names multiplies
            if divided:
                raise _Syntax("after '/' give each further unit its own '/', as in W/m/K")
            i = j
        else:
            raise _Syntax("")


def _unit_name(name: str) -> str | None:
    """Registry name (``millimeter``) of a unit name as typed (``mm``, ``µm``), or None."""
    typed = _ALIASES.get(name, name.replace("\u00b5", "u").replace("\u03bc", "u"))
    found = registry().parse_unit_name(typed)  # looks the name up; never evaluates anything
    if not found:
        return None
    prefix, unit, suffix = found[0]
    return prefix + unit + suffix


def _suggest(name: str) -> str:
    import difflib

    close = difflib.get_close_matches(name, COMMON_UNITS, n=3, cutoff=0.5)
    return f" (did you mean {' or '.join(repr(c) for c in close)}?)" if close else ""


def _parse_string(text: str, kind: str, field: str):
    """Parse a value text of the grammar above into a quantity of the package registry."""
    example = KINDS[kind][2]
    s = text.strip()
    if not s:
        raise input_error(field, f"must be {_KIND_WORD[kind]} (e.g. '{example}')", "an empty string")
    if len(s) > MAX_TEXT:
        raise input_error(field, f"must be a short text such as '{example}' (at most {MAX_TEXT} characters)",
                          f"a text of {len(s)} characters")
    not_value = f"is not a number with a unit (e.g. '{example}')"
    m = _NUMBER.match(s)
    if not m:
        try:  # a unit with no number, such as 'mm'
            names_ok = all(_unit_name(name) for name, _ in _scan_unit(s, 0))
        except _Syntax:
            names_ok = False
        if names_ok:
            raise input_error(field, f"needs a number before the unit (e.g. '{example}')", repr(text))
        raise input_error(field, not_value, repr(text))
    sign, mantissa, exp_sign, exp_digits, special = m.groups()
    i = m.end()
    if i < len(s) and s[i] == "," and i + 1 < len(s) and s[i + 1].isascii() and s[i + 1].isdigit():
        raise input_error(field, f"use a decimal point: {_decimal_point_hint(s, example)}", repr(text))
    number = m.group().replace("\u2212", "-")
    if len(number) > MAX_NUMBER:
        raise input_error(field, f"the number may have at most {MAX_NUMBER} characters (e.g. '{example}')",
                              repr(text))
    if exp_digits is not None and len(exp_digits) > MAX_EXPONENT_DIGITS:
        if exp_sign in ("-", "\u2212"):
            raise input_error(field, f"the exponent may have at most {MAX_EXPONENT_DIGITS} digits (e.g. '{example}')",
                              repr(text))
        raise input_error(field, f"must be a finite number (e.g. '{example}')", repr(text))
    magnitude = float(number)  # safe: ASCII digits, at most 32 characters
    if not math.isfinite(magnitude):
        raise input_error(field, f"must be a finite number (e.g. '{example}')", repr(text))
    if (i < len(s) and s[i] in "eE" and mantissa is not None and exp_digits is None
            and (i + 1 == len(s) or s[i + 1] in _SPACES or s[i + 1] in "+-\u2212")):
        # '1e mm', '2E', '1e+ mm': an exponent without its digits (not the unit 'e', the elementary charge)
        raise input_error(field, f"the exponent after 'e' needs digits, as in 1.5e-3 (e.g. '{example}')", repr(text))
    j = _skip_spaces(s, i)
    if j == len(s):
        factors: list[tuple[str, int]] = []
    else:
        try:
            factors = _scan_unit(s, j)
        except _Syntax as exc:
            detail = exc.detail
            if not detail and s[j] in "*/^+-()":
                detail = "no arithmetic: write the value as one number such as 1.5e-3"
            hint = f"; {detail}" if detail else ""
            raise input_error(field, not_value + hint, repr(text)) from None
    hint = _kind_hint(factors, kind, number)
    units: dict[str, int] = {}
    for name, power in factors:
        reg_name = _unit_name(name)
        if reg_name is None:
            if hint:
                raise input_error(field, hint, repr(text))
            raise input_error(field, f"unknown unit '{name}'{_suggest(name)}; write e.g. '{example}'", repr(text))
        units[reg_name] = units.get(reg_name, 0) + power
    units = {n: p for n, p in units.items() if p != 0}
    if set(units) & _OFFSET_UNITS and (len(factors) != 1 or factors[0][1] != 1):
        raise input_error(field, f"degC and degF stand alone, with no power or other unit (e.g. '{example}')",
                          repr(text))
    try:  # the registry parses only validated names and small powers
        q = registry().Quantity(magnitude, _join_units(units))
    except Exception:  # pint refuses a combination: still a one-line input error
        raise input_error(field, not_value, repr(text)) from None
    if hint and q.dimensionality != Q_(1, KINDS[kind][1]).dimensionality:
        raise input_error(field, hint, repr(text))
    return q


def _decimal_point_hint(s: str, example: str) -> str:
    """The text with its decimal comma made a point, when that gives a value of the grammar."""
    m = re.match(r"([-+\u2212]?[0-9]+),([0-9]+)[ ]?", s)
    rest = s[m.end():].strip() if m else ""
    if rest:
        try:
            _scan_unit(rest, 0)
        except _Syntax:
            m = None
    if m is None:
        return f"e.g. {example}"
    whole, frac = m.groups()
    fixed = f"{whole}.{frac} {rest}".strip()
    if len(frac) == 3:  # the comma may separate thousands
        return f"{fixed} (or {whole}{frac} {rest}".strip() + " with no thousands separator)"
    return fixed


def _kind_hint(factors: list[tuple[str, int]], kind: str, number: str) -> str:
    """A hint for a unit commonly typed by mistake for ``kind`` (coulomb for Celsius, ...)."""
    if len(factors) != 1 or factors[0][1] != 1:
        return ""
    name = factors[0][0]
    if kind == "temperature" and name == "C":
        return f"'C' is coulomb; for Celsius write {number} degC"
    if kind == "temperature" and name == "F":
        return f"'F' is farad; for Fahrenheit write {number} degF"
    if kind == "temperature" and name in ("°", "º", "deg"):
        return f"'{name}' alone is an angle; for Celsius write {number} degC"
    if kind == "salinity" and name in ("ppt", "psu", "PSU", "ppth"):
        return f"'{name}' is not read as parts per thousand; write {number} g/kg"
    return ""


def _real_array(value: Any, kind: str, field: str) -> np.ndarray:
    """A plain number or array of real numbers as a float array; InputError for anything else."""
    import numbers

    refuse = input_error(field, f"must be {_KIND_WORD[kind]} (e.g. '{KINDS[kind][2]}')", _show(value))
    if value is None or isinstance(value, (bool, np.bool_, str, bytes, dict, set, frozenset, complex)):
        raise refuse
    if isinstance(value, numbers.Real):
        try:
            return np.asarray(float(value))
        except OverflowError:
            raise input_error(field, "must be a finite number", _show(value)) from None
        except (TypeError, ValueError):
            raise refuse from None
    if isinstance(value, (list, tuple)) and _holds_quantity(value):
        raise input_error(field, "a list of quantities is not accepted; give one quantity with an array "
                          "magnitude, e.g. Q_([0.1, 0.2], 'mm')", _show(value))
    try:
        arr = np.asarray(value)
    except Exception:  # ragged lists and objects NumPy cannot make an array of
        raise refuse from None
    if arr.dtype.kind in "fiu":
        return arr.astype(float)
    if arr.dtype.kind == "O" and arr.size <= 1_000_000:
        out = np.empty(arr.shape, dtype=float)
        for idx, x in np.ndenumerate(arr):
            if isinstance(x, (bool, np.bool_)) or not isinstance(x, numbers.Real):
                raise refuse
            try:
                out[idx] = float(x)
            except OverflowError:
                raise input_error(field, "must be a finite number", _show(x)) from None
            except (TypeError, ValueError):
                raise refuse from None
        return out
    raise refuse  # booleans, complex numbers, strings, dates, records


def _holds_quantity(seq, depth: int = 0) -> bool:
    for x in seq:
        if _is_quantity(x) or (depth < 2 and isinstance(x, (list, tuple)) and _holds_quantity(x, depth + 1)):
            return True
    return False


def _show(value: Any) -> str:
    """A short printable description of a value for an error message."""
    if isinstance(value, np.ndarray) and value.ndim:
        return f"an array of shape {value.shape} and type {value.dtype}"
    text = repr(value)
    return text if len(text) <= 60 else text[:57] + "..."


def _rebuild(value):
    """A quantity from another pint registry, rebuilt in ours from its magnitude and unit names."""
    parts = []
    for name, power in value.unit_items():
        reg_name = _unit_name(str(name)) if _NAME.fullmatch(str(name)) else None
        if reg_name is None or not isinstance(power, (int, float)) or not abs(power) <= MAX_POWER:
            return None
        parts.append(f"{reg_name} ** {power!r}")
    return " * ".join(parts)


def to_si(value: Any, kind: str, field: str, *, array: bool = False) -> Any:
    """Convert ``value`` to a float (or array if ``array``) in floatcalc's SI unit for ``kind``.

    Parameters
    ----------
    value : pint quantity, number, array or str
        Plain numbers are taken to be in SI already (see module docstring). Text follows the
        value grammar of this module (a number, then a unit; nothing is evaluated).
    kind : str
        One of :data:`KINDS` (``"length"``, ``"angle"``, ...).
    field : str
        Name of the input, used in error messages.
    array : bool
        Allow array input and return a float array; otherwise a scalar float is required.

    Raises
    ------
    InputError
        Wrong dimension, text outside the grammar, NaN or infinite values, booleans, complex
        numbers, None, mappings, lists of text or quantities, ragged lists, or an array where a
        scalar is required.

    Examples
    --------
    >>> to_si("1000 kg/m^3", "density", "rho")
    1000.0
    >>> to_si("22 C", "temperature", "temperature")
    Traceback (most recent call last):
    ...
    floatcalc.errors.InputError: temperature: 'C' is coulomb; for Celsius write 22 degC, got '22 C'
    """
    if kind not in KINDS:  # programming error, not user input
        raise KeyError(kind)
    if isinstance(value, str) and not array:
        hit = _TEXT_SI.get((value, kind))
        if hit is not None:  # text converted before (a page rerun validates every field again)
            return hit
        out = _to_si(value, kind, field, array)
        if len(_TEXT_SI) >= _TEXT_SI_MAX:
            _TEXT_SI.clear()
        _TEXT_SI[(value, kind)] = out
        return out
    return _to_si(value, kind, field, array)


#: Text values already converted by :func:`to_si`, by (text, kind): the result of a text does
#: not depend on the field's name (only its error messages do, and errors are never stored).
_TEXT_SI: dict = {}
_TEXT_SI_MAX = 4096


def _to_si(value: Any, kind: str, field: str, array: bool) -> Any:
    dim, si_unit, example = KINDS[kind]
    if isinstance(value, str):
        q = _parse_string(value, kind, field)
        if kind in ("angle", "salinity") and not dict(q.unit_items()):
            raise input_error(field, f"needs a unit (e.g. '{example}')", repr(value))
        mag = _convert(q, kind, field)
    elif _is_quantity(value):
        if getattr(value, "_REGISTRY", None) is not registry():
            # A quantity from another registry: rebuilt here from its magnitude and unit names.
            mag = _real_array(value.magnitude, kind, field)
            names = _rebuild(value)
            if names is None:
                raise input_error(field, f"has a unit this package does not know (e.g. '{example}')",
                                  _show(str(value.units)))
            value = registry().Quantity(mag, names)
        mag = _convert(value, kind, field)
    else:
        mag = _real_array(value, kind, field)
    mag = _real_array(mag, kind, field)
    if not array and mag.ndim != 0:
        raise input_error(field, "must be a single value, not a list or array", f"shape {mag.shape}")
    if not np.all(np.isfinite(mag)):
        bad = mag[~np.isfinite(mag)].flat[0] if mag.ndim else float(mag)
        raise input_error(field, "must be a finite number", f"{bad} {si_unit}")
    return float(mag) if mag.ndim == 0 else mag


_ANGLE_UNITS = {"degree", "radian", "arcminute", "arcsecond", "turn", "revolution", "gradian", "milliradian"}


def _convert(q, kind: str, field: str):
    si_unit, example = KINDS[kind][1], KINDS[kind][2]
    want = Q_(1, si_unit).dimensionality
    names = {name for name, _ in q.unit_items()}
    angle_like = bool(names & _ANGLE_UNITS)
    if q.dimensionality != want or (kind == "angle" and names and not names <= _ANGLE_UNITS) or (
        kind != "angle" and angle_like
    ):
        raise input_error(field, f"must be {_KIND_WORD[kind]} (e.g. '{example}')", _describe(q))
    try:
        return q.to(unit_text(si_unit)).magnitude
    except Exception:  # pint refuses the conversion (an offset unit in a product, ...)
        raise input_error(field, f"must be {_KIND_WORD[kind]} (e.g. '{example}')", _describe(q)) from None


def _describe(q) -> str:
    """Describe a quantity for an error message, e.g. ``3 kilogram`` or ``5 (no unit)``."""
    mag = q.magnitude
    try:
        mag_s = f"{mag:g}" if np.ndim(mag) == 0 else f"array of shape {np.shape(mag)}"
    except (TypeError, ValueError):
        mag_s = _show(mag)
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
        mag = Q_(value, KINDS[kind][1]).to(unit_text(unit)).magnitude
    if not math.isfinite(mag):
        return f"{mag} {unit}"
    return f"{mag:.{digits}g} {unit}"
