"""Older design formats, read into schema 2 (and rewritten by ``floatcalc design upgrade``).

* **schema 1** device files (``schema_version = 1``, ``[[legs]]``): the element tables move to
  ``[[elements]]`` unchanged, except that a ``rod_row``'s number of rods, ``count``, is now
  ``rods`` (``count`` lays out copies of an element in schema 2).
* **quick files** saved by the page before schema 2 (``title``, ``invented``, ``[load]``
  with ``body_mass``, ``payload`` and ``safety_factor``, ``[[element]]`` groups with ``count``,
  ``coating`` as a preset name and ``advancing_angle`` / ``receding_angle``, and
  ``[[alternative]]`` tables): each group becomes an element table with ``count`` laid out
  ``around`` the body far apart, which is what the quick form meant (elements that do not
  share a meniscus).

Each migration returns the schema-2 dict and a one-line note naming the format it read.
"""

from __future__ import annotations

import copy
from typing import Any

UPGRADE_HINT = "rewrite it in schema 2 with 'floatcalc design upgrade FILE'"
_QUICK_KEYS = {"title", "audience", "element", "alternative"}


def detect(data: dict) -> str:
    """Which format a parsed design is: ``"schema 2"``, ``"schema 1"`` or ``"quick"``.

    >>> detect({"schema_version": 2}), detect({"legs": []}), detect({"title": "x", "element": []})
    ('schema 2', 'schema 1', 'quick')
    """
    ver = data.get("schema_version")
    if ver == 1 or ("legs" in data and ver is None):
        return "schema 1"
    if ver is None:
        load = data.get("load")
        if _QUICK_KEYS & set(data) or (isinstance(load, dict) and "body_mass" in load):
            return "quick"
    return "schema 2"


def migrate(data: dict, fmt: str) -> tuple[dict, str]:
    """(schema-2 dict, note) for a design in format ``fmt`` (see :func:`detect`)."""
    if fmt == "schema 1":
        return from_schema1(data), f"read a schema-1 device file ([[legs]]); {UPGRADE_HINT}"
    if fmt == "quick":
        return from_quick(data), f"read an older quick-design file ([[element]] groups); {UPGRADE_HINT}"
    return data, ""


def file_path(problem: str, fmt: str) -> str:
    """A problem line with its key path as the older file wrote it.

    >>> file_path("elements[2].radius: must be positive", "schema 1")
    'legs[2].radius: must be positive'
    >>> file_path("elements[0].coating.advancing: required", "quick")
    'element[0].advancing_angle: required'
    """
    import re

    if fmt == "schema 1":
        problem = re.sub(r"^elements(?=[\[:.])", "legs", problem)
        return re.sub(r"^(legs\[\d+\])\.rods\b", r"\1.count", problem)
    if fmt == "quick":
        problem = re.sub(r"^elements(?=[\[:.])", "element", problem)
        problem = re.sub(r"^(element\[\d+\])\.coating\.advancing", r"\1.advancing_angle", problem)
        problem = re.sub(r"^(element\[\d+\])\.coating\.receding", r"\1.receding_angle", problem)
        problem = re.sub(r"^body\.mass", "load.body_mass", problem)
        return re.sub(r"^description", "title", problem)
    return problem


def _legs(legs):
    out = []
    for leg in legs if isinstance(legs, list) else []:
        if isinstance(leg, dict):
            leg = dict(leg)
            if leg.get("kind") == "rod_row" and "count" in leg:
                leg["rods"] = leg.pop("count")
        out.append(leg)
    return out if isinstance(legs, list) else legs


def from_schema1(data: dict) -> dict:
    """Schema 1 → 2.

    >>> from_schema1({"schema_version": 1, "legs": [{"kind": "rod_row", "count": 3}]})["elements"]
    [{'kind': 'rod_row', 'rods': 3}]
    """
    out: dict[str, Any] = {"schema_version": 2}
    for k, v in data.items():
        if k == "schema_version":
            continue
        out["elements" if k == "legs" else k] = _legs(v) if k == "legs" else copy.deepcopy(v)
    return out


def _quick_element(e: Any) -> Any:
    if not isinstance(e, dict):
        return e
    el: dict[str, Any] = {}
    coating: dict[str, Any] = {}
    for k, v in e.items():
        if k == "advancing_angle":
            coating["advancing"] = v
        elif k == "receding_angle":
            if v not in ("", None):
                coating["receding"] = v
        elif k == "coating":
            if isinstance(v, str) and v and v != "custom":
                coating["name"] = v
        elif k == "material" and isinstance(v, str) and any(c.isdigit() for c in v):
            el["material_density"] = v
        else:
            el[k] = v
    el.setdefault("kind", "rod")
    if coating:
        el["coating"] = {k: coating[k] for k in ("advancing", "receding", "name") if k in coating}
    el.setdefault("material", "steel") if "material_density" not in el else None
    n = el.get("count", 1)
    if isinstance(n, int) and not isinstance(n, bool) and n > 1:
        el["layout"] = "around"
    elif "count" in el and n == 1:
        del el["count"]
    if el.get("count") in (None, 1) and "position" not in el:
        el["position"] = ["0 mm", "0 mm"]
    return el


def _quick_parts(d: dict) -> dict:
    out: dict[str, Any] = {}
    if "title" in d:
        out["description"] = d["title"]
    if "liquid" in d:
        out["liquid"] = copy.deepcopy(d["liquid"])
    load = d.get("load")
    if isinstance(load, dict):
        out["body"] = {"mass": load.get("body_mass", "0 g")}
        rest = {k: v for k, v in load.items() if k != "body_mass"}
        if rest:
            out["load"] = rest
    elif load is not None:
        out["load"] = load
    els = d.get("element", d.get("elements"))
    if els is not None:
        out["elements"] = [_quick_element(e) for e in els] if isinstance(els, list) else els
    return out


def from_quick(data: dict) -> dict:
    """Quick file → schema 2 (groups laid out around the body, far apart).

    >>> d = from_quick({"title": "T", "load": {"body_mass": "1 g"}, "element": [{"kind": "ball", "count": 4,
    ...                 "radius": "1 mm", "advancing_angle": "150 deg"}]})
    >>> d["body"], d["elements"][0]["layout"], d["elements"][0]["coating"]
    ({'mass': '1 g'}, 'around', {'advancing': '150 deg'})
    """
    out: dict[str, Any] = {"schema_version": 2}
    out.update(_quick_parts(data))
    out.setdefault("body", {"mass": "0 g"})
    if "invented" in data:
        out["invented"] = data["invented"]
    for k, v in data.items():
        if k not in ("title", "liquid", "load", "element", "elements", "alternative", "alternatives",
                     "invented", "audience", "schema_version"):
            out[k] = v  # unknown keys are kept so that the schema-2 check names them
    alts = data.get("alternative", data.get("alternatives"))
    if isinstance(alts, list):
        out["alternatives"] = [_quick_parts(a) if isinstance(a, dict) else a for a in alts]
    return out
