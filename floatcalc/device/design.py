"""Design files: a TOML description of a floating device, loaded with full validation.

Format (schema version 1; every dimensional value is a string with its unit)::

    schema_version = 1
    description = "what this is"

    [liquid]
    name = "water"                 # any name floatcalc knows (floatcalc liquid list)
    temperature = "20 degC"
    salinity = "35 g/kg"           # optional, seawater
    surface_tension = "60 mN/m"    # optional: measured value of a contaminated surface

    [body]
    mass = "1.07 g"                # everything except the legs (their weight is added)
    centre_of_mass = ["0 mm", "0 mm"]
    centre_of_mass_height = "3 mm" # optional, above the legs' reference plane

    [[legs]]
    kind = "rod"
    name = "front left"            # optional label
    position = ["10 mm", "5 mm"]   # centre of the element in plan
    radius = "0.15 mm"
    length = "20 mm"
    heading = "30 deg"             # rod axis in plan, from +x
    tilt = "0 deg"                 # optional, axis inclination
    material = "steel"             # or material_density = "7850 kg/m^3"
    coating = { advancing = "115 deg", receding = "95 deg" }
    # textured: coating = { advancing = "110 deg", texture = "cassie", solid_fraction = 0.3 }
    #           coating = { advancing = "100 deg", texture = "wenzel", roughness = 1.5 }

:func:`load_design` reads a file (or text) and reports *every* problem at once, one line each,
with the key path (``legs[3].radius: must be positive, got -0.1 mm``) and the nearest key for a
misspelt one. :func:`save_design` writes the same format back; load → save → load gives an
equal :class:`Design`.
"""

from __future__ import annotations

import difflib
import json
import math
import re
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from ..errors import InputError, input_error

SCHEMA_VERSION = 1
MAX_BYTES = 1_000_000
MAX_LEGS = 500
MAX_LISTED_PROBLEMS = 20

_TOP_KEYS = {"schema_version", "description", "liquid", "body", "legs"}
_LIQUID_KEYS = {"name", "temperature", "salinity", "surface_tension"}
_BODY_KEYS = {"mass", "centre_of_mass", "centre_of_mass_height"}
_COATING_KEYS = {"advancing", "receding", "texture", "roughness", "solid_fraction"}
_TEXTURES = ("none", "wenzel", "cassie")


@dataclass(frozen=True)
class Design:
    """A validated design: ``data`` as written in the file, ``liquid`` and SI parameters.

    Two designs are equal when their ``data`` are equal.
    """

    data: dict
    liquid: Any
    body: dict
    legs: tuple

    def __eq__(self, other):
        return isinstance(other, Design) and self.data == other.data

    def __hash__(self):
        return hash(json.dumps(self.data, sort_keys=True))

    @property
    def description(self) -> str:
        return str(self.data.get("description", ""))


def _unknown(keys, allowed, path, problems):
    for k in keys:
        if k not in allowed:
            close = difflib.get_close_matches(k, sorted(allowed), n=1, cutoff=0.6)
            hint = f" (did you mean '{close[0]}'?)" if close else ""
            shown = k if k.isprintable() else repr(k)  # a quoted TOML key may hold line breaks
            where = f"{path}.{shown}" if path else shown
            problems.append(f"{where}: unknown key{hint}; allowed: {', '.join(sorted(allowed))}")


def _catch(problems, fn, *args, **kw):
    try:
        return fn(*args, **kw)
    except InputError as exc:
        problems.append(str(exc))
        return None


def _need_str(value, path, example, problems):
    if isinstance(value, str):
        return True
    if isinstance(value, (int, float)) and not isinstance(value, bool):
        problems.append(f"{path}: needs a unit, as a string such as \"{example}\", got {value!r}")
    else:
        problems.append(f"{path}: must be a string with a unit such as \"{example}\", got {value!r}")
    return False


def _length(value, path, problems, *, signed=False, lo=None, hi=None):
    from .. import _validate as v
    from ..units import to_si

    if not _need_str(value, path, "0.2 mm", problems):
        return None
    if signed:
        x = _catch(problems, to_si, value, "length", path)
        if x is not None and lo is not None and not (lo <= x <= hi):
            problems.append(f"{path}: must be between {lo * 1e3:g} and {hi * 1e3:g} mm, got {x * 1e3:.6g} mm")
            return None
        return x
    return _catch(problems, v.length, value, path, upper=1.0)


def _angle(value, path, problems, *, signed=False, lo=None, hi=None):
    from .. import _validate as v
    from ..units import to_si

    if not _need_str(value, path, "150 deg", problems):
        return None
    if signed:
        x = _catch(problems, to_si, value, "angle", path)
        if x is not None and lo is not None and not (lo - 1e-12 <= x <= hi + 1e-12):
            problems.append(f"{path}: must be between {math.degrees(lo):g} and {math.degrees(hi):g} deg, "
                            f"got {math.degrees(x):.6g} deg")
            return None
        return x
    return _catch(problems, v.angle, value, path)


def _position(value, path, problems):
    if not isinstance(value, list) or len(value) != 2:
        problems.append(f"{path}: must be a list of two lengths [x, y] such as [\"10 mm\", \"0 mm\"], got {value!r}")
        return None
    xy = [_length(v, f"{path}[{i}]", problems, signed=True, lo=-1.0, hi=1.0) for i, v in enumerate(value)]
    return None if None in xy else (xy[0], xy[1])


def _coating(value, path, problems):
    from .. import _validate as v

    if not isinstance(value, dict):
        problems.append(f"{path}: must be a table such as {{ advancing = \"115 deg\" }}, got {value!r}")
        return None
    _unknown(value, _COATING_KEYS, path, problems)
    out: dict[str, Any] = {}
    if "advancing" not in value:
        problems.append(f"{path}.advancing: required (advancing contact angle, e.g. \"115 deg\")")
    else:
        out["advancing"] = _angle(value["advancing"], f"{path}.advancing", problems)
    if "receding" in value:
        r = _angle(value["receding"], f"{path}.receding", problems)
        if r is not None and out.get("advancing") is not None:
            r = _catch(problems, v.hysteresis, out["advancing"], value["receding"], f"{path}.receding")
        out["receding"] = r
    tex = value.get("texture", "none")
    if tex not in _TEXTURES:
        close = difflib.get_close_matches(str(tex), _TEXTURES, n=1)
        hint = f" (did you mean '{close[0]}'?)" if close else ""
        problems.append(f"{path}.texture: must be one of {', '.join(_TEXTURES)}{hint}, got {tex!r}")
        tex = "none"
    out["texture"] = tex
    for key, lo, hi, what in (("roughness", 1.0, 10.0, "wenzel"), ("solid_fraction", 0.0, 1.0, "cassie")):
        if tex == what:
            x = value.get(key)
            if x is None:
                problems.append(f"{path}.{key}: required for texture '{what}'")
            elif isinstance(x, bool) or not isinstance(x, (int, float)) or not math.isfinite(x) or not (
                (lo <= x <= hi) if key == "roughness" else (lo < x <= hi)
            ):
                rng = "from 1 to 10" if key == "roughness" else "above 0 and at most 1"
                problems.append(f"{path}.{key}: must be a plain number {rng}, got {x!r}")
            else:
                out[key] = float(x)
        elif key in value:
            problems.append(f"{path}.{key}: applies only to texture '{what}', got texture '{tex}'")
    return out


def _material(leg, path, problems):
    from .. import _validate as v
    from ..materials import leg_material

    if "material" in leg and "material_density" in leg:
        problems.append(f"{path}: give material or material_density, not both")
        return None
    if "material_density" in leg:
        val = leg["material_density"]
        if not _need_str(val, f"{path}.material_density", "7850 kg/m^3", problems):
            return None
        return _catch(problems, v.density, val, f"{path}.material_density")
    if "material" in leg:
        try:
            return leg_material(leg["material"]).rho
        except InputError as exc:
            problems.append(f"{path}.{exc}")
            return None
    problems.append(f"{path}.material: required (a name such as 'steel', or material_density)")
    return None


def _leg(leg, path, problems):
    from .elements import get_kind, kind_names

    if not isinstance(leg, dict):
        problems.append(f"{path}: must be a table ([[legs]]), got {leg!r}")
        return None
    kname = leg.get("kind")
    if kname is None:
        problems.append(f"{path}.kind: required; one of {', '.join(kind_names())}")
        return None
    kind = get_kind(kname) if isinstance(kname, str) else None
    if kind is None:
        close = difflib.get_close_matches(str(kname), kind_names(), n=1)
        hint = f" (did you mean '{close[0]}'?)" if close else ""
        problems.append(f"{path}.kind: unknown element kind{hint}; known: {', '.join(kind_names())}, got {kname!r}")
        return None
    if kind.unavailable:
        problems.append(f"{path}.kind: {kind.unavailable}, got {kname!r}")
        return None
    _unknown(leg, kind.keys, path, problems)
    p: dict[str, Any] = {"kind": kname, "name": str(leg.get("name", ""))}
    before = len(problems)
    for key, spec in kind.keys.items():
        if key in ("kind", "name", "material", "material_density"):
            continue
        where = f"{path}.{key}"
        if key not in leg:
            if spec.required:
                problems.append(f"{where}: required ({spec.help})")
            else:
                p[key] = spec.default
            continue
        val = leg[key]
        if spec.kind == "length":
            p[key] = _length(val, where, problems)
        elif spec.kind == "signed_length":
            p[key] = _length(val, where, problems, signed=True, lo=spec.lo, hi=spec.hi)
        elif spec.kind == "angle":
            p[key] = _angle(val, where, problems)
        elif spec.kind == "signed_angle":
            p[key] = _angle(val, where, problems, signed=True, lo=spec.lo, hi=spec.hi)
        elif spec.kind == "position":
            p[key] = _position(val, where, problems)
        elif spec.kind == "coating":
            p[key] = _coating(val, where, problems)
        elif spec.kind == "int":
            if isinstance(val, bool) or not isinstance(val, int) or not (spec.lo <= val <= spec.hi):
                problems.append(f"{where}: must be a whole number from {spec.lo:g} to {spec.hi:g}, got {val!r}")
            else:
                p[key] = int(val)
        elif spec.kind == "str":
            p[key] = str(val)
        else:  # pragma: no cover - programming error in a kind
            raise KeyError(spec.kind)
    p["density"] = _material(leg, path, problems)
    p["material_name"] = leg.get("material") if isinstance(leg.get("material"), str) else None
    if len(problems) == before:
        kind.check(p, path, problems)
    return p if len(problems) == before else None


MAX_KEY_PARTS = 64  # dotted parts in one key or table header; tomllib takes quadratic time in them


def check_key_depth(text: str, source: str) -> None:
    """Refuse a key or table header with more than MAX_KEY_PARTS dotted parts before parsing
    (a 64 kB line of ``a.a.a...`` keeps tomllib busy for many seconds)."""
    for n, line in enumerate(text.splitlines(), start=1):
        s = line.lstrip()
        if s and s[0] != "#" and s.split("=", 1)[0].count(".") >= MAX_KEY_PARTS:
            raise input_error(source, f"line {n}: keys may have at most {MAX_KEY_PARTS} dotted parts",
                              f"{s.split('=', 1)[0].count('.') + 1} parts")


def parse_toml(text: str, source: str = "design"):
    """Parse TOML text; malformed TOML gives one InputError line with tomllib's position."""
    import tomllib

    check_key_depth(text, source)
    try:
        return tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise input_error(source, f"is not valid TOML ({exc})") from None
    except RecursionError:  # tomllib recurses once per nested array or inline table
        raise input_error(source, "is not a design file: arrays or tables nested too deeply") from None


def read_text(path) -> tuple[str, str]:
    """Text of a design file, refusing files over 1 MB and non-UTF-8 bytes."""
    p = Path(path)
    if not p.is_file():
        raise input_error(str(path), "no such design file")
    size = p.stat().st_size
    if size > MAX_BYTES:
        raise input_error(str(path), f"design files may be at most {MAX_BYTES // 1000} kB", f"{size} bytes")
    try:
        return p.read_text(encoding="utf-8"), str(path)
    except UnicodeDecodeError:
        raise input_error(str(path), "must be UTF-8 text") from None


def load_design(source, *, text: str | None = None) -> Design:
    """Load and validate a design file (path) or, with ``text=``, design text.

    Raises
    ------
    InputError
        One line per problem (all problems at once), each with its key path.

    >>> d = load_design(None, text=example_text("skimmer"))
    >>> len(d.legs), d.liquid.name
    (12, 'water')
    """
    if text is None:
        text, name = read_text(source)
    else:
        name = "design" if source is None else str(source)
        if len(text.encode("utf-8")) > MAX_BYTES:
            raise input_error(name, f"design text may be at most {MAX_BYTES // 1000} kB")
    data = parse_toml(text, name)
    return design_from_data(data, name)


def design_from_data(data: dict, name: str = "design") -> Design:
    """Validate a design given as a dict (the parsed TOML)."""
    from ..liquids import contaminated, liquid

    problems: list[str] = []
    _unknown(data, _TOP_KEYS, "", problems)
    ver = data.get("schema_version")
    if ver is None:
        problems.append(f"schema_version: required, set schema_version = {SCHEMA_VERSION}")
    elif ver != SCHEMA_VERSION or isinstance(ver, bool):
        problems.append(f"schema_version: this floatcalc reads version {SCHEMA_VERSION}, got {ver!r}")
    if "description" in data and not isinstance(data["description"], str):
        problems.append(f"description: must be a string, got {data['description']!r}")

    liq = None
    ld = data.get("liquid")
    if not isinstance(ld, dict):
        problems.append("liquid: required table, e.g. [liquid] name = \"water\", temperature = \"20 degC\"")
    else:
        _unknown(ld, _LIQUID_KEYS, "liquid", problems)
        nm = ld.get("name", "water")
        temp = ld.get("temperature", "20 degC")
        ok = _need_str(temp, "liquid.temperature", "20 degC", problems)
        if "salinity" in ld:
            ok = _need_str(ld["salinity"], "liquid.salinity", "35 g/kg", problems) and ok
        if ok:
            try:
                liq = liquid(nm, temp, ld.get("salinity"))
            except InputError as exc:
                problems.append(f"liquid.{exc}")
        if liq is not None and "surface_tension" in ld:
            if _need_str(ld["surface_tension"], "liquid.surface_tension", "60 mN/m", problems):
                try:
                    liq = contaminated(liq, surface_tension=ld["surface_tension"])
                except InputError as exc:
                    problems.append(f"liquid.surface_tension: {str(exc).split(': ', 1)[-1]}")

    body: dict[str, Any] = {}
    bd = data.get("body")
    if not isinstance(bd, dict):
        problems.append("body: required table with mass and centre_of_mass")
    else:
        _unknown(bd, _BODY_KEYS, "body", problems)
        from .. import _validate as v

        if "mass" not in bd:
            problems.append("body.mass: required (mass of the body without its legs, e.g. \"1.0 g\")")
        elif _need_str(bd["mass"], "body.mass", "1.2 g", problems):
            m = _catch(problems, to_si_mass, bd["mass"], "body.mass")
            body["mass"] = m
        if "centre_of_mass" not in bd:
            problems.append("body.centre_of_mass: required, [x, y] in plan such as [\"0 mm\", \"0 mm\"]")
        else:
            body["centre_of_mass"] = _position(bd["centre_of_mass"], "body.centre_of_mass", problems)
        body["centre_of_mass_height"] = 0.0
        if "centre_of_mass_height" in bd:
            body["centre_of_mass_height"] = _length(bd["centre_of_mass_height"], "body.centre_of_mass_height",
                                                    problems, signed=True, lo=-1.0, hi=1.0)
        del v

    legs = data.get("legs")
    parsed = []
    if not isinstance(legs, list) or not legs:
        problems.append("legs: required, one or more [[legs]] tables")
    elif len(legs) > MAX_LEGS:
        problems.append(f"legs: at most {MAX_LEGS} elements, got {len(legs)}")
    else:
        for i, leg in enumerate(legs):
            parsed.append(_leg(leg, f"legs[{i}]", problems))
    if problems:
        head = f"{name}: {len(problems)} problem{'s' if len(problems) > 1 else ''}"
        if len(problems) > MAX_LISTED_PROBLEMS:  # a file of thousands of junk keys: bounded message
            head += f" (the first {MAX_LISTED_PROBLEMS} listed)"
            problems = problems[:MAX_LISTED_PROBLEMS]
        raise InputError(head + "\n" + "\n".join(problems) if len(problems) > 1 else problems[0])
    return Design(data=data, liquid=liq, body=body, legs=tuple(parsed))


def to_si_mass(value, field):
    from .. import _validate as v

    return v.positive(value, "mass", field, show="g", upper=100.0)


# ------------------------------------------------------------------------------------------
# Writer (the subset of TOML this format uses)

_BARE = re.compile(r"^[A-Za-z0-9_-]+$")


def _toml_value(v) -> str:
    if isinstance(v, bool):
        return "true" if v else "false"
    if isinstance(v, int):
        return str(v)
    if isinstance(v, float):
        if not math.isfinite(v):
            raise ValueError("non-finite value in a design")
        return repr(v)
    if isinstance(v, str):
        # JSON escapes are valid TOML basic-string escapes; TOML also forbids a literal DEL.
        return json.dumps(v, ensure_ascii=False).replace("\x7f", "\\u007f")
    if isinstance(v, list):
        return "[" + ", ".join(_toml_value(x) for x in v) + "]"
    if isinstance(v, dict):
        return "{ " + ", ".join(f"{_key(k)} = {_toml_value(x)}" for k, x in v.items()) + " }"
    raise TypeError(f"cannot write {type(v).__name__} to a design file")


def _key(k: str) -> str:
    return k if _BARE.match(k) else _toml_value(str(k))


def design_text(design: Design | dict) -> str:
    """TOML text of a design (the same format :func:`load_design` reads)."""
    data = design.data if isinstance(design, Design) else design
    out = []
    for k in ("schema_version", "description"):
        if k in data:
            out.append(f"{k} = {_toml_value(data[k])}")
    for k, v in data.items():
        if k not in ("schema_version", "description", "liquid", "body", "legs") and not isinstance(v, (dict, list)):
            out.append(f"{_key(k)} = {_toml_value(v)}")
    for section in ("liquid", "body"):
        if section in data:
            out.append("")
            out.append(f"[{section}]")
            for k, v in data[section].items():
                out.append(f"{_key(k)} = {_toml_value(v)}")
    for leg in data.get("legs", []):
        out.append("")
        out.append("[[legs]]")
        for k, v in leg.items():
            out.append(f"{_key(k)} = {_toml_value(v)}")
    return "\n".join(out) + "\n"


def save_design(design: Design | dict, path) -> None:
    """Write a design to ``path`` in the design-file format."""
    Path(path).write_text(design_text(design), encoding="utf-8")


# ------------------------------------------------------------------------------------------
# Built-in examples (floatcalc/data/*.toml)

def _data_dir() -> Path:
    return Path(__file__).resolve().parent.parent / "data"


def list_examples() -> list[dict[str, str]]:
    """Names and descriptions of the built-in example designs.

    >>> "skimmer" in [e["name"] for e in list_examples()]
    True
    """
    import tomllib

    rows = []
    for p in sorted(_data_dir().glob("device_*.toml")):
        d = tomllib.loads(p.read_text(encoding="utf-8"))
        rows.append({"name": p.stem[len("device_"):], "description": str(d.get("description", ""))})
    return rows


def example_path(name: str) -> Path:
    names = [e["name"] for e in list_examples()]
    if name not in names:
        close = difflib.get_close_matches(str(name), names, n=1)
        hint = f" (did you mean '{close[0]}'?)" if close else ""
        raise input_error("example", f"unknown example{hint}; known: {', '.join(names)}", repr(name))
    return _data_dir() / f"device_{name}.toml"


def example_text(name: str) -> str:
    return example_path(name).read_text(encoding="utf-8")


def example(name: str) -> Design:
    """A built-in example design by name (see :func:`list_examples`)."""
    return load_design(example_path(name))
