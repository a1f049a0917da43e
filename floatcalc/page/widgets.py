"""Input widgets generated from the element-kind registry (:class:`floatcalc.elements.Field`).

Every widget writes the text a design file holds (``"0.15 mm"``) into the design data; the
design loader (:func:`floatcalc.design.design_from_data`) checks it, and each problem line is
shown beside its field through a *slot* registered under the field's key path
(``elements[2].radius``). Nothing a user types is evaluated or rendered as markup: values go
to the design loader as text, messages are escaped (:func:`esc`).
"""

from __future__ import annotations

import re
from typing import Any

import streamlit as st

#: SI unit of each field kind (to show a default in the field's own unit).
_SI = {"length": "m", "signed_length": "m", "angle": "rad", "signed_angle": "rad", "modulus": "Pa"}
OTHER_MATERIAL = "other (enter a density)"
CUSTOM = "custom angles"

_MD = re.compile(r"([\\`*_{}\[\]()#+\-.!|<>~$:])")


def esc(text: Any) -> str:
    """Text safe to pass to a Streamlit call that renders Markdown: every Markdown and HTML
    character backslash-escaped, so ``**x**`` or ``![i](u)`` shows as typed.

    >>> esc("**fake** ![x](http://e.invalid/a.png)")
    '\\\\*\\\\*fake\\\\*\\\\* \\\\!\\\\[x\\\\]\\\\(http\\\\://e\\\\.invalid/a\\\\.png\\\\)'
    """
    return _MD.sub(r"\\\1", str(text))


class Slots:
    """Placeholders beside the fields, keyed by design key path; problems go to the longest
    matching path (``elements[2].coating.receding`` → that field, else ``elements[2]``)."""

    def __init__(self):
        self.slots: dict[str, Any] = {}
        self.shown: dict[str, list[str]] = {}
        #: table index -> placeholder for a drawing filled in once the design is valid
        self.drawings: dict[int, Any] = {}

    def add(self, path: str):
        self.slots[path] = st.empty()

    def place(self, path: str) -> str | None:
        best = None
        for p in self.slots:
            if path == p or path.startswith(p + ".") or path.startswith(p + "[") or path.startswith(p + " "):
                if best is None or len(p) > len(best):
                    best = p
        return best

    def show(self, problems: list[str]) -> list[str]:
        """Show each problem line at its field; returns the lines that found no field."""
        left = []
        for line in problems:
            path = line.split(": ", 1)[0].strip()
            where = self.place(path)
            if where is None:
                left.append(line)
            else:
                self.shown.setdefault(where, []).append(line)
        for where, lines in self.shown.items():
            self.slots[where].error(esc("\n".join(lines)), icon="⚠️")
        return left


def problem_lines(exc: Exception) -> list[str]:
    """The one-line problems of an InputError (the head line ``design: N problems`` dropped)."""
    lines = [ln for ln in str(exc).splitlines() if ln.strip()]
    if len(lines) > 1 and re.match(r"^[\w .'-]*: \d+ problems?", lines[0]):
        lines = lines[1:]
    return [re.sub(r"^design: ", "", ln) for ln in lines]


def _api_keys() -> set:
    """Widget keys whose value a callback set through the Session State API (a lookup of one
    key: ``key in st.session_state`` would copy the whole state on every widget)."""
    try:
        return st.session_state["_api_keys"]
    except KeyError:
        st.session_state["_api_keys"] = set()
        return st.session_state["_api_keys"]


def set_by_api(key: str, value) -> None:
    st.session_state[key] = value
    _api_keys().add(key)


def text(label: str, value: str, key: str, **kw) -> str:
    """A text input starting at ``value`` unless a callback already set its state."""
    api = _api_keys()
    if key in api:
        api.discard(key)
        return st.text_input(label, key=key, **kw)
    return st.text_input(label, value, key=key, **kw)


def _default_text(name: str, f) -> str:
    if f.default is None:
        return "from the material" if f.kind == "modulus" else ""
    if f.kind in _SI and f.unit:
        from ..units import Q_

        return f"{Q_(float(f.default), _SI[f.kind]).to(f.unit).magnitude:.4g} {f.unit}"
    return str(f.default)


def label_of(name: str, f) -> str:
    return name.replace("_", " ") + (f" [{f.unit}]" if f.unit else "")


def field_widget(table: dict, name: str, f, path: str, key: str, slots: Slots, slot: bool = True) -> None:
    """One kind field: read its widget into ``table`` (blank optional fields are left out).
    Its problem slot goes right under it, or, with ``slot=False``, where the caller adds it."""
    cur = table.get(name)
    helptext = f.help + (f"; e.g. {f.example}" if f.example else "")
    if f.kind == "int":
        lo, hi = int(f.lo if f.lo is not None else 1), int(f.hi if f.hi is not None else 1000)
        start = cur if isinstance(cur, int) else (f.default if isinstance(f.default, int) else lo)
        table[name] = int(st.number_input(label_of(name, f), min_value=lo, max_value=hi,
                                          value=int(min(max(start, lo), hi)), step=1, key=key, help=helptext))
    elif f.kind == "position":
        c1, c2 = st.columns(2)
        cur = cur if isinstance(cur, list) and len(cur) == 2 else ["0 mm", "0 mm"]
        with c1:
            x = text(f"{name.replace('_', ' ')} x [mm]", str(cur[0]), key + ".x", help=helptext)
        with c2:
            y = text(f"{name.replace('_', ' ')} y [mm]", str(cur[1]), key + ".y", help=helptext)
        table[name] = [x.strip(), y.strip()]
    else:
        d = _default_text(name, f)
        val = text(label_of(name, f), "" if cur is None else str(cur), key,
                   placeholder=("default: " + d) if d else (f.example or ""), help=helptext)
        if val.strip():
            table[name] = val.strip()
        else:
            table.pop(name, None)
            if f.required:
                table[name] = ""  # the loader says it is required, at this field
    if slot:
        slots.add(path)


def material_widget(table: dict, path: str, key: str, slots: Slots) -> None:
    """Material by name (handbook densities of :mod:`floatcalc.materials`) or a density."""
    from ..materials import list_leg_materials

    names = [m["name"] for m in list_leg_materials()] + [OTHER_MATERIAL]
    m = table.get("material")
    idx = names.index(m) if m in names else (len(names) - 1 if "material_density" in table else 0)
    choice = st.selectbox("material", names, index=idx, key=key + ".name",
                          help="for the element's own weight (and a flexible leg's stiffness)")
    table.pop("material", None)
    dens = table.pop("material_density", None)
    if choice == OTHER_MATERIAL:
        table["material_density"] = text("material density [kg/m^3]", dens or "7850 kg/m^3", key + ".density")
        slots.add(f"{path}.material_density")
    else:
        table["material"] = choice
    slots.add(f"{path}.material")


def _preset_changed(key: str) -> None:
    from ..examples import COATINGS

    pick = st.session_state[key + ".preset"]
    if pick in COATINGS:
        set_by_api(key + ".advancing", COATINGS[pick][0])
        set_by_api(key + ".receding", COATINGS[pick][1])


def coating_widget(table: dict, path: str, key: str, slots: Slots) -> None:
    """Coating: a preset (typical angles, from memory), advancing and receding angles, texture."""
    from ..examples import COATINGS, COATINGS_SOURCE

    c = dict(table.get("coating") or {})
    names = [CUSTOM, *COATINGS]
    idx = names.index(c["name"]) if c.get("name") in names else 0
    pick = st.selectbox("coating", names, index=idx, key=key + ".preset", on_change=_preset_changed, args=(key,),
                        help=f"fills in typical angles on water ({COATINGS_SOURCE})")
    adv = text("advancing angle [deg]", str(c.get("advancing", "110 deg")), key + ".advancing",
               help="advancing contact angle: sets the load limit")
    rec = text("receding angle [deg]", str(c.get("receding", "")), key + ".receding",
               placeholder="optional", help="receding contact angle (for lifting); at most the advancing one")
    out: dict[str, Any] = {"advancing": adv.strip()}
    if rec.strip():
        out["receding"] = rec.strip()
    if pick != CUSTOM:
        out["name"] = pick
    elif c.get("name") and c["name"] not in COATINGS:
        out["name"] = c["name"]
    textures = ["none", "wenzel", "cassie"]
    tex = st.selectbox("texture", textures, index=textures.index(c.get("texture", "none"))
                       if c.get("texture", "none") in textures else 0, key=key + ".texture",
                       help="Wenzel: cos θ* = r cos θ; Cassie–Baxter: cos θ* = f (cos θ + 1) − 1")
    if tex != "none":
        out["texture"] = tex
    if tex == "wenzel":
        out["roughness"] = float(st.number_input("roughness r (≥ 1)", min_value=1.0, max_value=10.0,
                                                 value=float(c.get("roughness", 1.5)), step=0.1, key=key + ".r"))
    elif tex == "cassie":
        out["solid_fraction"] = float(st.number_input("solid fraction f (0–1)", min_value=0.001, max_value=1.0,
                                                      value=float(c.get("solid_fraction", 0.2)), step=0.05,
                                                      key=key + ".f"))
    table["coating"] = out
    slots.add(f"{path}.coating")


__all__ = ["esc", "Slots", "problem_lines", "text", "field_widget", "material_widget", "coating_widget",
           "label_of", "OTHER_MATERIAL", "CUSTOM"]
