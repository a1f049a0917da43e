"""Built-in example scenarios for the page and the report, and the design-file format they share.

Every example here is **invented** for illustration (no real robot, rig or class is described):
one per kind of user,

* ``"robot"``     a small water-walking robot (microrobotics engineer sizing legs),
* ``"compare"``   two leg designs for the same body, side by side (biomimetics comparison),
* ``"classroom"`` a floating-needle demonstration, clean and soapy water (teaching lab).

A *scenario* is a plain dict of strings and numbers (values keep their units as text, e.g.
``"0.25 mm"``; the public API parses them), so that it can be shown in input fields, cached by
value, and written to and read from a TOML design file::

    title = "..."
    invented = true
    [liquid]
    name = "water"              # any name floatcalc.liquid() knows
    temperature = "20 degC"
    salinity = "35 g/kg"        # optional, water/seawater only
    surface_tension = "60 mN/m" # optional: measured value of a contaminated surface
    [load]
    body_mass = "1.5 g"         # body without the support elements
    payload = "0.3 g"
    safety_factor = 2.0
    [[element]]
    kind = "rod"                # long horizontal leg; see ELEMENT_KINDS
    radius = "0.25 mm"
    length = "35 mm"
    count = 6
    material = "steel"          # a name in floatcalc.materials or a density such as "7850 kg/m^3"
    coating = "PTFE film"       # a name in COATINGS (sets the angles) or "custom"
    advancing_angle = "115 deg"
    receding_angle = "95 deg"

Files are parsed with :mod:`tomllib` only (no evaluation of user text, no pickle), their size is
limited to :data:`MAX_FILE_BYTES`, and unknown keys are refused with a one-line
:class:`~floatcalc.errors.InputError`.

>>> s = example("robot")
>>> s["invented"], s["elements"][0]["kind"]
(True, 'rod')
>>> loads_toml(dumps_toml(s)) == s
True
"""

from __future__ import annotations

import copy
import math
from typing import Any

from .errors import input_error

#: Largest design file accepted [bytes]; design files are a few hundred bytes.
MAX_FILE_BYTES = 64 * 1024

#: Element kinds the page and report know how to evaluate, with their input fields.
ELEMENT_KINDS: dict[str, dict[str, Any]] = {
    "rod": {
        "label": "long horizontal leg (wire or rod lying in the surface)",
        "fields": ("radius", "length", "count", "material", "coating", "advancing_angle",
                   "receding_angle"),
    },
    "ball": {
        "label": "ball foot (sphere resting in the surface)",
        "fields": ("radius", "count", "material", "coating", "advancing_angle", "receding_angle"),
    },
    "pad": {
        "label": "flat circular pad (disc with sharp edges)",
        "fields": ("radius", "thickness", "count", "material", "coating", "advancing_angle",
                   "receding_angle"),
    },
    "ring": {
        "label": "ring footpad (closed wire loop lying in the surface)",
        "fields": ("ring_radius", "wire_radius", "count", "material", "coating", "advancing_angle",
                   "receding_angle"),
    },
    "pin": {
        "label": "vertical pin (pushed down through the surface)",
        "fields": ("radius", "length", "count", "material", "coating", "advancing_angle",
                   "receding_angle"),
    },
}

def material_names() -> list[str]:
    """Names of the leg materials of :mod:`floatcalc.materials` (densities with their sources).

    >>> "steel" in material_names()
    True
    """
    from .materials import list_leg_materials

    return [m["name"] for m in list_leg_materials()]


#: Typical advancing / receding angles on water of common coatings: values recalled from
#: memory (common practice), spread widely with preparation; measure your own coating.
COATINGS: dict[str, tuple[str, str]] = {
    "PTFE film": ("115 deg", "95 deg"),
    "paraffin wax": ("110 deg", "95 deg"),
    "superhydrophobic spray": ("160 deg", "150 deg"),
    "bare steel": ("75 deg", "35 deg"),
    "custom": ("", ""),
}

_EXAMPLES: dict[str, dict[str, Any]] = {
    "robot": {
        "title": "Invented example: a 1.2 g six-legged water-walking robot carrying a 0.3 g sensor",
        "invented": True,
        "audience": "small robot",
        "liquid": {"name": "water", "temperature": "20 degC"},
        "load": {"body_mass": "1.2 g", "payload": "0.3 g", "safety_factor": 2.0},
        "elements": [
            {"kind": "rod", "radius": "0.2 mm", "length": "40 mm", "count": 6, "material": "steel",
             "coating": "superhydrophobic spray", "advancing_angle": "160 deg",
             "receding_angle": "150 deg"},
        ],
    },
    "compare": {
        "title": "Invented example: two leg designs for the same 0.8 g body",
        "invented": True,
        "audience": "comparison of two leg designs",
        "liquid": {"name": "water", "temperature": "25 degC"},
        "load": {"body_mass": "0.8 g", "payload": "0 g", "safety_factor": 1.5},
        "elements": [
            {"kind": "rod", "radius": "0.1 mm", "length": "30 mm", "count": 8,
             "material": "nickel-titanium", "coating": "PTFE film",
             "advancing_angle": "115 deg", "receding_angle": "95 deg"},
        ],
        "alternatives": [
            {"title": "Design B (invented): four thicker carbon-fibre legs, superhydrophobic",
             "elements": [
                 {"kind": "rod", "radius": "0.35 mm", "length": "30 mm", "count": 4,
                  "material": "carbon fibre", "coating": "superhydrophobic spray",
                  "advancing_angle": "160 deg", "receding_angle": "150 deg"},
             ]},
        ],
    },
    "classroom": {
        "title": "Invented example: floating a waxed darning needle on tap water, then adding soap",
        "invented": True,
        "audience": "classroom floating demonstration",
        "liquid": {"name": "water", "temperature": "22 degC"},
        "load": {"body_mass": "0 g", "payload": "0 g", "safety_factor": 1.5},
        "elements": [
            {"kind": "rod", "radius": "0.6 mm", "length": "50 mm", "count": 1, "material": "steel",
             "coating": "paraffin wax", "advancing_angle": "110 deg", "receding_angle": "95 deg"},
        ],
        "alternatives": [
            {"title": "Same needle after a drop of washing-up liquid (invented: 30 mN/m measured)",
             "liquid": {"name": "water", "temperature": "22 degC", "surface_tension": "30 mN/m"}},
        ],
    },
}

#: Short names of the examples, in the order the page lists them.
EXAMPLE_NAMES: tuple[str, ...] = tuple(_EXAMPLES)


def example(name: str) -> dict[str, Any]:
    """A deep copy of the built-in (invented) example scenario ``name``.

    >>> example("classroom")["liquid"]["name"]
    'water'
    """
    if name not in _EXAMPLES:
        raise input_error("example", f"must be one of {', '.join(EXAMPLE_NAMES)}", repr(name))
    return copy.deepcopy(_EXAMPLES[name])


def alternatives(scenario: dict[str, Any]) -> list[dict[str, Any]]:
    """The scenario itself followed by each of its alternatives as a full scenario.

    An alternative overrides the liquid, load or elements of the main scenario.

    >>> [s["title"][:8] for s in alternatives(example("compare"))]
    ['Invented', 'Design B']
    """
    base = {k: v for k, v in scenario.items() if k != "alternatives"}
    out = [copy.deepcopy(base)]
    for alt in scenario.get("alternatives", []):
        s = copy.deepcopy(base)
        for key in ("title", "liquid", "load", "elements"):
            if key in alt:
                s[key] = copy.deepcopy(alt[key])
        out.append(s)
    return out


# ------------------------------------------------------------------------------------------------
# Design files (TOML)

_TOP = {"title", "invented", "audience", "liquid", "load", "elements", "element", "alternatives",
        "alternative"}
_LIQ = {"name", "temperature", "salinity", "surface_tension"}
_LOAD = {"body_mass", "payload", "safety_factor"}


def loads_toml(text: str | bytes) -> dict[str, Any]:
    """Parse a design file (TOML text) into a scenario, refusing anything unexpected.

    Raises
    ------
    InputError
        File too large, not UTF-8, not valid TOML, unknown keys, or wrong value types.

    >>> loads_toml('[liquid]\\nname = 5')
    Traceback (most recent call last):
    ...
    floatcalc.errors.InputError: design file: liquid.name must be text, got 5
    """
    import tomllib

    if isinstance(text, bytes):
        if len(text) > MAX_FILE_BYTES:
            raise input_error("design file", f"must be at most {MAX_FILE_BYTES // 1024} kB",
                              f"{len(text)} bytes")
        try:
            text = text.decode("utf-8")
        except UnicodeDecodeError:
            raise input_error("design file", "must be UTF-8 text (TOML)", "undecodable bytes") from None
    if len(text.encode("utf-8")) > MAX_FILE_BYTES:
        raise input_error("design file", f"must be at most {MAX_FILE_BYTES // 1024} kB",
                          f"{len(text.encode('utf-8'))} bytes")
    from .device.design import check_key_depth

    check_key_depth(text, "design file")
    try:
        raw = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise input_error("design file", "is not valid TOML", str(exc).splitlines()[0]) from None
    except RecursionError:  # tomllib recurses once per nested array or inline table
        raise input_error("design file", "is not a design file: arrays or tables nested too deeply") from None
    return _check_scenario(raw)


def _text(value: Any, where: str) -> str:
    if not isinstance(value, str):
        raise input_error("design file", f"{where} must be text", repr(value))
    return value


def _table(value: Any, allowed: set[str], where: str) -> dict[str, Any]:
    if not isinstance(value, dict):
        raise input_error("design file", f"{where} must be a table", repr(value))
    extra = sorted(set(value) - allowed)
    if extra:
        raise input_error("design file", f"unknown key in {where} (allowed: {', '.join(sorted(allowed))})",
                          repr(extra[0]))
    return value


def _check_liquid(d: Any, where: str) -> dict[str, Any]:
    d = _table(d, _LIQ, where)
    out = {"name": _text(d.get("name", "water"), f"{where}.name"),
           "temperature": _text(d.get("temperature", "20 degC"), f"{where}.temperature")}
    for k in ("salinity", "surface_tension"):
        if d.get(k) not in (None, ""):
            out[k] = _text(d[k], f"{where}.{k}")
    return out


def _check_load(d: Any, where: str) -> dict[str, Any]:
    d = _table(d, _LOAD, where)
    sf = d.get("safety_factor", 1.5)
    if isinstance(sf, bool) or not isinstance(sf, (int, float)) or not math.isfinite(sf) or not (1 <= sf <= 100):
        raise input_error("design file", f"{where}.safety_factor must be a number from 1 to 100", repr(sf))
    return {"body_mass": _text(d.get("body_mass", "0 g"), f"{where}.body_mass"),
            "payload": _text(d.get("payload", "0 g"), f"{where}.payload"),
            "safety_factor": float(sf)}


def _check_elements(items: Any, where: str) -> list[dict[str, Any]]:
    if not isinstance(items, list) or not items:
        raise input_error("design file", f"{where} must be a non-empty list of [[element]] tables", repr(items))
    if len(items) > 50:
        raise input_error("design file", f"{where} allows at most 50 element groups", len(items))
    out = []
    for i, e in enumerate(items):
        w = f"{where}[{i}]"
        if not isinstance(e, dict):
            raise input_error("design file", f"{w} must be a table", repr(e))
        kind = e.get("kind", "rod")
        if kind not in ELEMENT_KINDS:
            raise input_error("design file", f"{w}.kind must be one of {', '.join(ELEMENT_KINDS)}", repr(kind))
        e = _table(e, {"kind", *ELEMENT_KINDS[kind]["fields"]}, w)
        el: dict[str, Any] = {"kind": kind}
        for k in ELEMENT_KINDS[kind]["fields"]:
            if k not in e or e[k] == "":
                continue
            if k == "count":
                c = e[k]
                if isinstance(c, bool) or not isinstance(c, int) or not (1 <= c <= 10000):
                    raise input_error("design file", f"{w}.count must be a whole number from 1 to 10000", repr(c))
                el[k] = c
            else:
                el[k] = _text(e[k], f"{w}.{k}")
        out.append(el)
    return out


def _check_scenario(raw: dict[str, Any]) -> dict[str, Any]:
    _table(raw, _TOP, "the file")
    s: dict[str, Any] = {
        "title": _text(raw.get("title", "Design from file"), "title"),
        "invented": bool(raw.get("invented", False)),
    }
    if "audience" in raw:
        s["audience"] = _text(raw["audience"], "audience")
    s["liquid"] = _check_liquid(raw.get("liquid", {}), "liquid")
    s["load"] = _check_load(raw.get("load", {}), "load")
    s["elements"] = _check_elements(raw.get("element", raw.get("elements")), "element")
    alts = raw.get("alternative", raw.get("alternatives"))
    if alts is not None:
        if not isinstance(alts, list):
            raise input_error("design file", "alternative must be a list of [[alternative]] tables", repr(alts))
        s["alternatives"] = []
        for i, a in enumerate(alts):
            w = f"alternative[{i}]"
            a = _table(a, {"title", "liquid", "load", "element", "elements"}, w)
            alt: dict[str, Any] = {}
            if "title" in a:
                alt["title"] = _text(a["title"], f"{w}.title")
            if "liquid" in a:
                alt["liquid"] = _check_liquid(a["liquid"], f"{w}.liquid")
            if "load" in a:
                alt["load"] = _check_load(a["load"], f"{w}.load")
            if "element" in a or "elements" in a:
                alt["elements"] = _check_elements(a.get("element", a.get("elements")), f"{w}.element")
            s["alternatives"].append(alt)
    return s


def read_design(data: bytes | str) -> tuple[str, dict[str, Any]]:
    """Read an uploaded design file: ``("device", data)`` or ``("groups", scenario)``.

    A file with ``schema_version`` or ``[[legs]]`` is a :mod:`floatcalc.device` design and is
    validated by its loader (every problem at once); anything else is a scenario read by
    :func:`loads_toml`. Size-limited to :data:`MAX_FILE_BYTES`, UTF-8 TOML parsed with
    :mod:`tomllib` only.

    >>> read_design(dumps_toml(example("robot")))[0]
    'groups'
    """
    import tomllib

    raw = data.encode("utf-8") if isinstance(data, str) else bytes(data)
    if len(raw) > MAX_FILE_BYTES:
        raise input_error("design file", f"must be at most {MAX_FILE_BYTES // 1024} kB", f"{len(raw)} bytes")
    try:
        text = raw.decode("utf-8")
    except UnicodeDecodeError:
        raise input_error("design file", "must be UTF-8 text (TOML)", "undecodable bytes") from None
    from .device.design import check_key_depth

    check_key_depth(text, "design file")
    try:
        parsed = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise input_error("design file", "is not valid TOML", str(exc).splitlines()[0]) from None
    except RecursionError:  # tomllib recurses once per nested array or inline table
        raise input_error("design file", "is not a design file: arrays or tables nested too deeply") from None
    if "schema_version" in parsed or "legs" in parsed:
        from .device.design import design_from_data

        design_from_data(parsed, "design file")
        return "device", parsed
    return "groups", _check_scenario(parsed)


def _toml_value(v: Any) -> str:
    if isinstance(v, bool):
        return "true" if v else "false"
    if isinstance(v, (int, float)):
        return repr(v)
    s = str(v).replace("\\", "\\\\").replace('"', '\\"').replace("\n", " ")
    return f'"{s}"'


def _toml_table(header: str, d: dict[str, Any]) -> list[str]:
    lines = [header]
    lines += [f"{k} = {_toml_value(v)}" for k, v in d.items() if v is not None]
    return lines + [""]


def dumps_toml(scenario: dict[str, Any]) -> str:
    """Write a scenario as a design file (TOML text) that :func:`loads_toml` reads back.

    >>> "[[element]]" in dumps_toml(example("robot"))
    True
    """
    s = _check_scenario({("element" if k == "elements" else "alternative" if k == "alternatives" else k): v
                         for k, v in scenario.items()})
    lines = [f"title = {_toml_value(s['title'])}", f"invented = {_toml_value(s['invented'])}"]
    if "audience" in s:
        lines.append(f"audience = {_toml_value(s['audience'])}")
    lines.append("")
    lines += _toml_table("[liquid]", s["liquid"])
    lines += _toml_table("[load]", s["load"])
    for e in s["elements"]:
        lines += _toml_table("[[element]]", e)
    for a in s.get("alternatives", []):
        lines.append("[[alternative]]")
        if "title" in a:
            lines.append(f"title = {_toml_value(a['title'])}")
        lines.append("")
        if "liquid" in a:
            lines += _toml_table("[alternative.liquid]", a["liquid"])
        if "load" in a:
            lines += _toml_table("[alternative.load]", a["load"])
        for e in a.get("elements", []):
            lines += _toml_table("[[alternative.element]]", e)
    return "\n".join(lines).rstrip() + "\n"


__all__ = ["EXAMPLE_NAMES", "ELEMENT_KINDS", "material_names", "COATINGS", "MAX_FILE_BYTES", "example",
           "alternatives", "loads_toml", "dumps_toml", "read_design"]
