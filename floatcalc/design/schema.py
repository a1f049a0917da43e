"""Design files, schema version 2: one format for every command, the page and Python.

A design has a liquid, a body, a load and support elements of any kind::

    schema_version = 2
    description = "Invented example: ..."   # free text
    invented = true                         # optional: marks an invented example

    [liquid]                 # default water at 20 degC
    name = "water"           # any liquid floatcalc knows (floatcalc liquid list)
    temperature = "20 degC"
    salinity = "35 g/kg"     # seawater only
    surface_tension = "60 mN/m"   # measured value of a contaminated surface

    [body]                   # everything except the elements (their weight is added)
    mass = "1.07 g"
    centre_of_mass = ["0 mm", "0 mm"]       # default the origin
    centre_of_mass_height = "4 mm"          # default 0

    [load]                   # optional
    payload = "0.3 g"                       # default 0
    payload_position = ["3 mm", "0 mm"]     # default the centre of mass
    safety_factor = 1.5                     # required safety factor, default 1 (none)

    [[elements]]             # one table per element, or per group of equal elements
    kind = "rod"             # see floatcalc.elements.kind_names()
    name = "leg"
    position = ["18 mm", "5 mm"]            # placed ...
    heading = "15 deg"
    # ... or laid out: count = 6, layout = "around" (evenly round the centre of mass; oriented
    # kinds point outward, heading turns them; layout_radius default: far apart, 6 l_c between
    # neighbours) or layout = "row" (side by side along the normal of heading, centre spacing
    # `layout_spacing`, centred on position)
    radius = "0.15 mm"
    length = "20 mm"
    material = "steel"       # or material_density = "7850 kg/m^3"
    coating = { advancing = "115 deg", receding = "95 deg" }

    [[alternatives]]         # optional: designs compared with this one; each may replace
    description = "..."      # description, liquid, body, load and elements

The element keys come from each kind's schema in the registry (:mod:`floatcalc.elements`), so
a new kind needs no change here. Loading reports every problem at once, one line each with its
key path (``elements[3].radius: must be positive, got -0.1 mm``) and the nearest key for a
misspelt one. Schema-1 device files (``[[legs]]``) and the page's old quick files (``title``,
``[load] body_mass``, ``[[element]]``) still load through :mod:`floatcalc.design.migrate`, with
a note saying which format was read.
"""

from __future__ import annotations

import difflib
import json
import math
from dataclasses import dataclass, field, replace
from typing import Any

from ..errors import InputError, input_error

SCHEMA_VERSION = 2
MAX_ELEMENTS = 500
MAX_LISTED_PROBLEMS = 20
#: Gap between neighbouring footprints [capillary lengths] of a layout without a radius: far
#: enough apart that menisci do not interact (parallel rods tend to single rods beyond ~6 l_c;
#: Vella, Lee & Kim 2006, core/parallel2d.py).
FAR_APART_LC = 6.0

_TOP_KEYS = {"schema_version", "description", "invented", "liquid", "body", "load", "elements", "alternatives"}
_LIQUID_KEYS = {"name", "temperature", "salinity", "surface_tension"}
_BODY_KEYS = {"mass", "centre_of_mass", "centre_of_mass_height"}
_LOAD_KEYS = {"payload", "payload_position", "safety_factor"}
_LAYOUT_KEYS = {"count", "layout", "layout_radius", "layout_spacing", "start_angle"}
_COATING_KEYS = {"advancing", "receding", "texture", "roughness", "solid_fraction", "name", "post_size", "pitch",
                 "post_height"}
_TEXTURES = ("none", "wenzel", "cassie", "posts", "grooves")
_GEOMETRY_KEYS = ("post_size", "pitch", "post_height")
LAYOUTS = ("around", "row")
_ALT_KEYS = {"description", "liquid", "body", "load", "elements"}


@dataclass(frozen=True)
class Design:
    """A validated design.

    ``data`` is the file's content in schema 2 (strings with units, as written); ``liquid``
    the :class:`~floatcalc.liquids.Liquid`; ``body`` and ``load`` SI values; ``groups`` the
    element tables as validated (SI); ``elements`` every element placed (SI parameters with
    ``position``, ``heading``, ``name`` and ``group``); ``alternatives`` designs to compare;
    ``notes`` what the reader wants a user to know (the format it read). Two designs are equal
    when their ``data`` are equal.
    """

    data: dict
    liquid: Any
    body: dict
    load: dict
    groups: tuple
    elements: tuple
    alternatives: tuple = ()
    notes: tuple = ()
    source_text: str | None = field(default=None, compare=False)
    name: str = "design"

    def __eq__(self, other):
        return isinstance(other, Design) and self.data == other.data

    def __hash__(self):
        return hash(json.dumps(self.data, sort_keys=True))

    @property
    def description(self) -> str:
        return str(self.data.get("description", ""))

    @property
    def invented(self) -> bool:
        return bool(self.data.get("invented", False)) or self.description.lower().startswith("invented")

    @property
    def legs(self) -> tuple:
        """The placed elements (name kept from schema 1)."""
        return self.elements

    def with_data(self, data: dict) -> "Design":
        """The design validated again from changed ``data`` (the source text's comments kept)."""
        d = design_from_data(data, self.name)
        return replace(d, source_text=self.source_text, notes=())


# ------------------------------------------------------------------------------------------
# Value checks (one line per problem, with the key path)

def _unknown(keys, allowed, path, problems):
    for k in keys:
        if k not in allowed:
            close = difflib.get_close_matches(str(k), sorted(allowed), n=1, cutoff=0.6)
            hint = f" (did you mean '{close[0]}'?)" if close else ""
            shown = k if str(k).isprintable() else repr(k)  # a quoted TOML key may hold line breaks
            where = f"{path}.{shown}" if path else shown
            problems.append(f"{where}: unknown key{hint}; allowed: {', '.join(sorted(allowed))}")


def _catch(problems, fn, *args, **kw):
    try:
        return fn(*args, **kw)
    except InputError as exc:
        problems.append(str(exc).split("\n")[0])
        return None


def _need_str(value, path, example, problems):
    if isinstance(value, str):
        return True
    if isinstance(value, (int, float)) and not isinstance(value, bool):
        problems.append(f"{path}: needs a unit, as a string such as \"{example}\", got {value!r}")
    else:
        problems.append(f"{path}: must be a string with a unit such as \"{example}\", got {_short(value)}")
    return False


def _short(value) -> str:
    r = repr(value)
    return r if len(r) <= 60 else r[:57] + "..."


def _length(value, path, problems, *, signed=False, lo=None, hi=None, example="0.2 mm"):
    from .. import _validate as v
    from ..units import to_si

    if not _need_str(value, path, example, problems):
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
        problems.append(f"{path}: must be a list of two lengths [x, y] such as [\"10 mm\", \"0 mm\"], "
                        f"got {_short(value)}")
        return None
    xy = [_length(v, f"{path}[{i}]", problems, signed=True, lo=-1.0, hi=1.0) for i, v in enumerate(value)]
    return None if None in xy else (xy[0], xy[1])


def _int(value, path, problems, lo, hi):
    if isinstance(value, bool) or not isinstance(value, int) or not (lo <= value <= hi):
        problems.append(f"{path}: must be a whole number from {lo:g} to {hi:g}, got {_short(value)}")
        return None
    return int(value)


def _number(value, path, problems, lo, hi, what):
    if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value) \
            or not (lo <= value <= hi):
        problems.append(f"{path}: must be a plain number {what}, got {_short(value)}")
        return None
    return float(value)


def _coating(value, path, problems):
    from .. import _validate as v

    if not isinstance(value, dict):
        problems.append(f"{path}: must be a table such as {{ advancing = \"115 deg\" }}, got {_short(value)}")
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
    if "name" in value:
        if isinstance(value["name"], str) and len(value["name"]) <= 80:
            out["name"] = value["name"]
        else:
            problems.append(f"{path}.name: must be text of at most 80 characters, got {_short(value['name'])}")
    tex = value.get("texture", "none")
    if tex not in _TEXTURES:
        close = difflib.get_close_matches(str(tex), _TEXTURES, n=1)
        hint = f" (did you mean '{close[0]}'?)" if close else ""
        problems.append(f"{path}.texture: must be one of {', '.join(_TEXTURES)}{hint}, got {_short(tex)}")
        tex = "none"
    out["texture"] = tex
    for key, lo, hi, what in (("roughness", 1.0, 10.0, "wenzel"), ("solid_fraction", 1e-9, 1.0, "cassie")):
        if tex == what:
            x = value.get(key)
            if x is None:
                problems.append(f"{path}.{key}: required for texture '{what}'")
            else:
                rng = "from 1 to 10" if key == "roughness" else "above 0 and at most 1"
                x = _number(x, f"{path}.{key}", problems, lo, hi, rng)
                if x is not None:
                    out[key] = x
        elif key in value:
            problems.append(f"{path}.{key}: applies only to texture '{what}', got texture '{tex}'")
    for key in _GEOMETRY_KEYS:   # posts or grooves: size, pitch and height of the texture
        if tex in ("posts", "grooves"):
            if key not in value:
                problems.append(f"{path}.{key}: required for texture '{tex}' (e.g. \"10 um\")")
            else:
                x = _length(value[key], f"{path}.{key}", problems, example="10 um")
                if x is not None and x > 1e-3:
                    problems.append(f"{path}.{key}: must be at most 1 mm, got {x * 1e3:.4g} mm")
                elif x is not None:
                    out[key] = x
        elif key in value:
            problems.append(f"{path}.{key}: applies only to texture 'posts' or 'grooves', got texture '{tex}'")
    if tex in ("posts", "grooves") and all(k in out for k in ("post_size", "pitch")) and out["pitch"] <= out["post_size"]:
        problems.append(f"{path}.pitch: must be larger than post_size ({out['post_size'] * 1e6:.4g} µm), "
                        f"got {out['pitch'] * 1e6:.4g} µm")
    return out


def _material(el, path, problems):
    from .. import _validate as v
    from ..materials import leg_material

    if "material" in el and "material_density" in el:
        problems.append(f"{path}: give material or material_density, not both")
        return None
    if "material_density" in el:
        val = el["material_density"]
        if not _need_str(val, f"{path}.material_density", "7850 kg/m^3", problems):
            return None
        return _catch(problems, v.density, val, f"{path}.material_density")
    if "material" in el:
        if not isinstance(el["material"], str):
            problems.append(f"{path}.material: must be a material name such as 'steel', got {_short(el['material'])}")
            return None
        try:
            return leg_material(el["material"]).rho
        except InputError as exc:
            problems.append(f"{path}.{exc}")
            return None
    problems.append(f"{path}.material: required (a name such as 'steel', or material_density)")
    return None


def _field_value(spec, val, where, problems):
    k = spec.kind
    if k == "length":
        return _length(val, where, problems, example=spec.example or "0.2 mm")
    if k == "signed_length":
        return _length(val, where, problems, signed=True, lo=spec.lo, hi=spec.hi)
    if k == "angle":
        return _angle(val, where, problems)
    if k == "signed_angle":
        return _angle(val, where, problems, signed=True, lo=spec.lo, hi=spec.hi)
    if k == "position":
        return _position(val, where, problems)
    if k == "coating":
        return _coating(val, where, problems)
    if k == "int":
        return _int(val, where, problems, spec.lo, spec.hi)
    if k == "modulus":
        from ..materials import youngs_modulus

        if not _need_str(val, where, spec.example or "200 GPa", problems):
            return None
        return _catch(problems, youngs_modulus, val, where)
    if k == "str":
        if not isinstance(val, str) or len(val) > 80:
            problems.append(f"{where}: must be text of at most 80 characters, got {_short(val)}")
            return None
        return val
    raise KeyError(k)  # pragma: no cover - a kind declared an unknown field kind


def _element(el, path, problems):
    """Validate one element table; returns the SI parameter dict (layout keys included) or None."""
    from ..elements import get_kind, kind_names

    if not isinstance(el, dict):
        problems.append(f"{path}: must be a table ([[elements]]), got {_short(el)}")
        return None
    kname = el.get("kind")
    if kname is None:
        problems.append(f"{path}.kind: required; one of {', '.join(kind_names())}")
        return None
    kind = get_kind(kname) if isinstance(kname, str) else None
    if kind is None:
        close = difflib.get_close_matches(str(kname), kind_names(), n=1)
        hint = f" (did you mean '{close[0]}'?)" if close else ""
        problems.append(f"{path}.kind: unknown element kind{hint}; known: {', '.join(kind_names())}, "
                        f"got {_short(kname)}")
        return None
    if kind.unavailable:
        problems.append(f"{path}.kind: {kind.unavailable}, got {kname!r}")
        return None
    fields = kind.all_fields
    _unknown(el, set(fields) | _LAYOUT_KEYS, path, problems)
    before = len(problems)
    p: dict[str, Any] = {"kind": kname, "name": ""}
    for key, spec in fields.items():
        if key in ("kind", "material", "material_density"):
            continue
        where = f"{path}.{key}"
        if key not in el:
            if spec.required:
                problems.append(f"{where}: required ({spec.help})")
            elif key != "name":
                p[key] = spec.default
            continue
        p[key] = _field_value(spec, el[key], where, problems)
    p["density"] = _material(el, path, problems)
    p["material_name"] = el.get("material") if isinstance(el.get("material"), str) else None
    # layout
    count = 1
    bad_count = False
    if "count" in el:
        got = _int(el["count"], f"{path}.count", problems, 1, MAX_ELEMENTS)
        count, bad_count = got or 1, got is None
    layout = el.get("layout", "around" if count > 1 else None)
    if layout is not None and layout not in LAYOUTS:
        problems.append(f"{path}.layout: must be one of {', '.join(LAYOUTS)}, got {_short(layout)}")
        layout = None
    if count == 1 and "layout" in el:
        problems.append(f"{path}.layout: applies only with count above 1, got count = 1")
    for key, needs in (("layout_radius", "around"), ("start_angle", "around"), ("layout_spacing", "row")):
        if key in el and layout != needs:
            problems.append(f"{path}.{key}: applies only to layout '{needs}', got layout "
                            f"{'none' if layout is None else repr(layout)}")
    if layout == "row" and "layout_spacing" not in el:
        problems.append(f"{path}.layout_spacing: required for layout 'row' (centre-to-centre, e.g. \"8 mm\")")
    p["count"] = count
    p["layout"] = layout
    p["layout_radius"] = (_length(el["layout_radius"], f"{path}.layout_radius", problems, signed=True, lo=0.0,
                                  hi=1.0) if "layout_radius" in el else None)
    p["layout_spacing"] = (_length(el["layout_spacing"], f"{path}.layout_spacing", problems)
                           if "layout_spacing" in el else None)
    p["start_angle"] = (_angle(el["start_angle"], f"{path}.start_angle", problems, signed=True,
                               lo=-2 * math.pi, hi=2 * math.pi) if "start_angle" in el else 0.0)
    if "position" not in el and layout is None and not bad_count:  # a bad count is reported once
        problems.append(f"{path}.position: required ([x, y] such as [\"10 mm\", \"0 mm\"]), or give count "
                        "and layout")
    if len(problems) == before:
        kind.check(p, path, problems)
    return p if len(problems) == before else None


def _liquid(ld, problems, path="liquid"):
    from ..liquids import contaminated, liquid

    if ld is None:
        ld = {}
    if not isinstance(ld, dict):
        problems.append(f"{path}: must be a table, e.g. [liquid] name = \"water\", temperature = \"20 degC\"")
        return None
    _unknown(ld, _LIQUID_KEYS, path, problems)
    nm = ld.get("name", "water")
    temp = ld.get("temperature", "20 degC")
    if not isinstance(nm, str):
        problems.append(f"{path}.name: must be a liquid name such as \"water\", got {_short(nm)}")
        return None
    ok = _need_str(temp, f"{path}.temperature", "20 degC", problems)
    if "salinity" in ld:
        ok = _need_str(ld["salinity"], f"{path}.salinity", "35 g/kg", problems) and ok
    if not ok:
        return None
    liq = None
    try:
        liq = liquid(nm, temp, ld.get("salinity"))
    except InputError as exc:
        problems.append(f"{path}.{exc}")
    if liq is not None and "surface_tension" in ld:
        if _need_str(ld["surface_tension"], f"{path}.surface_tension", "60 mN/m", problems):
            try:
                liq = contaminated(liq, surface_tension=ld["surface_tension"])
            except InputError as exc:
                problems.append(f"{path}.surface_tension: {str(exc).split(': ', 1)[-1]}")
    return liq


def _mass(value, path, problems, lo_zero=False):
    from .. import _validate as v
    from ..units import to_si

    if not _need_str(value, path, "1.2 g", problems):
        return None
    if lo_zero:
        m = _catch(problems, to_si, value, "mass", path)
        if m is not None and not (0.0 <= m <= 100.0):
            problems.append(f"{path}: must be from 0 to 100 kg, got {m * 1e3:.6g} g")
            return None
        return m
    return _catch(problems, v.positive, value, "mass", path, show="g", upper=100.0)


def _body(bd, problems, path="body"):
    if not isinstance(bd, dict):
        problems.append(f"{path}: required table with mass, e.g. [body] mass = \"1.0 g\"")
        return None
    _unknown(bd, _BODY_KEYS, path, problems)
    body: dict[str, Any] = {"mass": 0.0, "centre_of_mass": (0.0, 0.0), "centre_of_mass_height": 0.0}
    if "mass" not in bd:
        problems.append(f"{path}.mass: required (mass of the body without its elements, e.g. \"1.0 g\")")
    else:
        body["mass"] = _mass(bd["mass"], f"{path}.mass", problems, lo_zero=True)
    if "centre_of_mass" in bd:
        body["centre_of_mass"] = _position(bd["centre_of_mass"], f"{path}.centre_of_mass", problems)
    if "centre_of_mass_height" in bd:
        body["centre_of_mass_height"] = _length(bd["centre_of_mass_height"], f"{path}.centre_of_mass_height",
                                                problems, signed=True, lo=-1.0, hi=1.0)
    return body


def _load(ld, problems, path="load"):
    load: dict[str, Any] = {"payload": 0.0, "payload_position": None, "safety_factor": 1.0}
    if ld is None:
        return load
    if not isinstance(ld, dict):
        problems.append(f"{path}: must be a table, e.g. [load] payload = \"0.3 g\"")
        return load
    _unknown(ld, _LOAD_KEYS, path, problems)
    if "payload" in ld:
        load["payload"] = _mass(ld["payload"], f"{path}.payload", problems, lo_zero=True)
    if "payload_position" in ld:
        load["payload_position"] = _position(ld["payload_position"], f"{path}.payload_position", problems)
    if "safety_factor" in ld:
        load["safety_factor"] = _number(ld["safety_factor"], f"{path}.safety_factor", problems, 1.0, 100.0,
                                        "from 1 to 100")
    return load


# ------------------------------------------------------------------------------------------
# Layouts: element tables with count > 1 become placed elements

def place(groups, body, liquid) -> tuple:
    """Every element placed: ``position`` and ``heading`` filled in from the group's layout.

    ``around``: evenly round the centre of mass (or ``position``) at ``layout_radius`` from it,
    the first at ``start_angle`` from +x; oriented kinds point outward, turned by ``heading``.
    Without ``layout_radius`` the radius is chosen so that neighbouring footprints are
    :data:`FAR_APART_LC` capillary lengths apart (and clear of the groups inside), i.e. the
    elements carry as if alone. ``row``: side by side along the normal of ``heading``, at
    centre ``layout_spacing``, centred on ``position`` (default the centre of mass).
    """
    from ..elements import get_kind

    out = []
    gap = FAR_APART_LC * liquid.lc
    reach = 0.0  # outer reach of the auto-placed groups so far [m]
    cg = body["centre_of_mass"] or (0.0, 0.0)
    for gi, p in enumerate(groups):
        kind = get_kind(p["kind"])
        n = p["count"]
        base = p.get("name") or ""
        names = [base or kind.label] if n == 1 else [f"{base or kind.label} {k + 1}" for k in range(n)]
        if p["layout"] is None:
            out.append({**p, "name": names[0], "group": gi, "index": 0})
            continue
        centre = p.get("position") or cg
        rf = kind.footprint_radius(p)
        heading0 = p.get("heading") or 0.0
        if p["layout"] == "row":
            ux, uy = math.cos(heading0), math.sin(heading0)
            for k in range(n):
                off = (k - 0.5 * (n - 1)) * p["layout_spacing"]
                pos = (centre[0] - uy * off, centre[1] + ux * off)
                out.append({**p, "position": pos, "heading": heading0, "name": names[k], "group": gi, "index": k})
            continue
        r = p["layout_radius"]
        if r is None:
            s = math.sin(math.pi / n)
            if kind.oriented:   # radial legs: inner ends `gap` apart, clear of the groups inside
                r = max(rf + 0.5 * gap / s, reach + gap + rf)
            else:
                r = max((2 * rf + gap) / (2 * s), reach + gap + rf)
            reach = r + rf
        for k in range(n):
            a = p["start_angle"] + 2.0 * math.pi * k / n
            pos = (centre[0] + r * math.cos(a), centre[1] + r * math.sin(a))
            item = {**p, "position": pos, "name": names[k], "group": gi, "index": k}
            if kind.oriented:
                item["heading"] = a + heading0
            out.append(item)
    return tuple(out)


# ------------------------------------------------------------------------------------------

def _problems_error(name, problems) -> InputError:
    head = f"{name}: {len(problems)} problem{'s' if len(problems) > 1 else ''}"
    if len(problems) > MAX_LISTED_PROBLEMS:  # a file of thousands of junk keys: bounded message
        head += f" (the first {MAX_LISTED_PROBLEMS} listed)"
        problems = problems[:MAX_LISTED_PROBLEMS]
    return InputError(head + "\n" + "\n".join(problems) if len(problems) > 1 else problems[0])


def _validate(data: dict, problems: list, path: str = "", *, top: bool = True):
    pre = f"{path}." if path else ""
    liq = _liquid(data.get("liquid"), problems, f"{pre}liquid")
    body = _body(data.get("body"), problems, f"{pre}body")
    load = _load(data.get("load"), problems, f"{pre}load")
    els = data.get("elements")
    groups = []
    if not isinstance(els, list) or not els:
        problems.append(f"{pre}elements: required, one or more [[elements]] tables")
    elif len(els) > MAX_ELEMENTS:
        problems.append(f"{pre}elements: at most {MAX_ELEMENTS} element tables, got {len(els)}")
    else:
        groups = [_element(el, f"{pre}elements[{i}]", problems) for i, el in enumerate(els)]
        total = sum(g["count"] for g in groups if g)
        if total > MAX_ELEMENTS:
            problems.append(f"{pre}elements: at most {MAX_ELEMENTS} elements in all (counts included), got {total}")
    return liq, body, load, groups


def design_from_data(data: dict, name: str = "design", *, source_text: str | None = None) -> Design:
    """Validate a design given as a dict (parsed TOML); older formats are migrated first."""
    from .migrate import detect, migrate

    if not isinstance(data, dict):
        raise input_error(name, "must be a design (a TOML table)", type(data).__name__)
    if not data:  # an empty file: one line, not the three keys it lacks
        raise input_error(name, "is empty; a design needs schema_version = 2, a [body] table and "
                          "[[elements]] tables (start from 'floatcalc design show twin_rod')")
    fmt = detect(data)
    notes: tuple = ()
    if fmt != "schema 2":
        data, note = migrate(data, fmt)
        notes = (note,)
    problems: list[str] = []
    _unknown(data, _TOP_KEYS, "", problems)
    ver = data.get("schema_version")
    if ver != SCHEMA_VERSION or isinstance(ver, bool):
        problems.append(f"schema_version: this floatcalc reads versions 1 and {SCHEMA_VERSION}, got {_short(ver)}")
    if "description" in data and not isinstance(data["description"], str):
        problems.append(f"description: must be a string, got {_short(data['description'])}")
    if "invented" in data and not isinstance(data["invented"], bool):
        problems.append(f"invented: must be true or false, got {_short(data['invented'])}")
    liq, body, load, groups = _validate(data, problems)
    alts = data.get("alternatives", [])
    if not isinstance(alts, list) or len(alts) > 8:
        problems.append("alternatives: must be a list of at most 8 [[alternatives]] tables")
        alts = []
    for i, a in enumerate(alts):
        if not isinstance(a, dict):
            problems.append(f"alternatives[{i}]: must be a table, got {_short(a)}")
        else:
            _unknown(a, _ALT_KEYS, f"alternatives[{i}]", problems)
    if problems:
        if fmt != "schema 2":  # name the keys as the file wrote them
            from .migrate import file_path

            problems = [file_path(pr, fmt) for pr in problems]
        raise _problems_error(name, problems)
    elements = place(groups, body, liq)
    alternatives = []
    for i, a in enumerate(alts):
        merged = {k: v for k, v in data.items() if k != "alternatives"}
        merged.update({k: v for k, v in a.items()})
        try:
            alternatives.append(design_from_data(merged, f"{name}: alternatives[{i}]"))
        except InputError as exc:
            raise InputError(str(exc).replace(f"{name}: alternatives[{i}]: ", f"alternatives[{i}]: ")) from None
    return Design(data=data, liquid=liq, body=body, load=load, groups=tuple(groups), elements=elements,
                  alternatives=tuple(alternatives), notes=notes, source_text=source_text, name=name)


def load_design(source=None, *, text: str | bytes | None = None) -> Design:
    """Load and validate a design file (a path) or design text / uploaded bytes (``text=``).

    The one reader of every command, the page and Python: size and TOML guards of
    :mod:`floatcalc.design.read`; every problem at once, one line each with its key path;
    older formats migrated with a note (:attr:`Design.notes`).

    >>> from floatcalc.design import example_text
    >>> d = load_design(text=example_text("skimmer"))
    >>> len(d.elements), d.liquid.name
    (12, 'water')
    """
    from .read import decode, parse_toml, read_text

    if text is None:
        if source is None:
            raise input_error("design", "give a design file path or text")
        if not isinstance(source, (str, bytes)) and not hasattr(source, "__fspath__"):
            raise input_error("design", "must be a path to a design file, a Design or design text",
                              type(source).__name__)
        text, name = read_text(source)
    else:
        name = "design" if source is None else str(source)
        if not isinstance(text, (str, bytes, bytearray)):
            raise input_error("text", "must be design text (str) or the bytes of a design file",
                              type(text).__name__)
        text = decode(text, name)
    data = parse_toml(text, name)
    return design_from_data(data, name, source_text=text)
