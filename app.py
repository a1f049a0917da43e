"""floatcalc page: how much load small objects carry on a liquid surface.

Run with ``streamlit run app.py``. The page holds no physics: it collects inputs (text with
units, parsed by floatcalc), calls the floatcalc API (``floatcalc.report.assess`` and the
element functions behind it), and draws with ``floatcalc.plotting``.

Element kinds are small plug-in panels: ``PANELS`` maps a kind (as in
``floatcalc.examples.ELEMENT_KINDS``) to a function that draws its input fields and returns the
element's inputs. Results are cached by the inputs (``st.cache_resource`` keyed by the scenario
text: results are frozen records holding pint quantities of floatcalc's own registry, which a
pickle round trip through ``st.cache_data`` would move to another registry).
"""

from __future__ import annotations

import json
import time

import numpy as np
import streamlit as st

from floatcalc import examples as ex
from floatcalc import report as rp
from floatcalc.errors import InputError

st.set_page_config(page_title="floatcalc: load on a liquid surface", page_icon="💧", layout="wide")

OPENING_EXAMPLE = "robot"
VERDICT_STYLE = {"floats with margin": st.success, "marginal": st.warning, "sinks": st.error}


# ------------------------------------------------------------------------------------------------
# Cached API calls (keyed by the scenario as canonical JSON text)

def _key(scenario: dict) -> str:
    return json.dumps(scenario, sort_keys=True)


@st.cache_resource(max_entries=256, show_spinner=False)
def element_cached(key: str):
    """(result, contact-line length) of one slow element group (a ring), keyed by its inputs and liquid."""
    d = json.loads(key)
    return rp.evaluate_element(d["spec"], rp.make_liquid(d["liquid"]))


#: Element kinds solved through ``element_cached`` (a ring takes a second or two), so that a change
#: elsewhere on the page (load, another group) does not solve them again.
SLOW_KINDS = ("ring",)
UNUSED_BY_SOLVE = ("coating", "receding_angle")


@st.cache_resource(max_entries=512, show_spinner=False)
def assess_cached(key: str) -> rp.Assessment:
    scenario = json.loads(key)
    liquid = scenario.get("liquid", {})

    def evaluate(spec: dict, liq):
        if spec.get("kind") in SLOW_KINDS:
            used = {kk: vv for kk, vv in spec.items() if kk not in UNUSED_BY_SOLVE}
            return element_cached(json.dumps({"spec": used, "liquid": liquid}, sort_keys=True))
        return rp.evaluate_element(spec, liq)

    return rp.assess(scenario, evaluate=evaluate)


@st.cache_resource(max_entries=128, show_spinner=False)
def assess_device_cached(key: str) -> rp.DeviceAssessment:
    d = json.loads(key)
    return rp.assess_device(d["data"], d["payload"], d["safety_factor"])


def assess_any(key: str):
    """Assessment of a scenario key or a device key (JSON with a "data" entry)."""
    return assess_device_cached(key) if key.startswith('{"data"') else assess_cached(key)


def device_key(data: dict, payload: str, sf: float) -> str:
    return json.dumps({"data": data, "payload": payload, "safety_factor": sf}, sort_keys=True)


@st.cache_data(max_entries=256, show_spinner=False)
def figure_png(kind: str, key: str, group: int = 0, others: str = "") -> bytes:
    """PNG bytes of one drawing of an assessed scenario."""
    import io

    from matplotlib.figure import Figure

    from floatcalc import plotting

    a = assess_any(key) if key else None
    if kind == "plan":
        fig = Figure(figsize=(7.0, 5.8))
        fig.subplots_adjust(left=0.1, right=0.98, bottom=0.09, top=0.94)
        plotting.plan_view(a.result, ax=fig.add_subplot(), grid=100)
    elif kind == "section":
        fig = Figure(figsize=(10.5, 3.6))
        fig.subplots_adjust(left=0.07, right=0.99, bottom=0.15, top=0.91, wspace=0.25)
        ax1, ax2 = fig.subplots(1, 2, width_ratios=[2.3, 1.0])
        plotting.meniscus_section(a.elements[group].result, ax=ax1)
        plotting.meniscus_section(a.elements[group].result, ax=ax2, zoom=True)
    elif kind == "force":
        o = a.elements[group]
        fig = Figure(figsize=(8.0, 4.2))
        fig.subplots_adjust(left=0.1, right=0.98, bottom=0.13, top=0.92)
        plotting.force_depth(o.result, ax=fig.add_subplot(), load=o.load_share / o.per_element,
                             operating_depth=o.operating_depth)
    elif kind == "compare":
        items = [(name, assess_any(k)) for name, k in json.loads(others)]
        fig = Figure(figsize=(8.0, 4.2))
        fig.subplots_adjust(left=0.1, right=0.98, bottom=0.13, top=0.92)
        plotting.compare_curves(items, ax=fig.add_subplot())
    else:  # pragma: no cover - programming error
        raise KeyError(kind)
    buf = io.BytesIO()
    fig.savefig(buf, format="png", dpi=90)
    return buf.getvalue()


@st.cache_data(max_entries=64, show_spinner=False)
def csv_zip_cached(key: str) -> bytes:
    a = assess_any(key)
    tables = rp.curve_tables(a)
    if isinstance(a, rp.DeviceAssessment):
        tables["device_elements.csv"] = rp.device_element_table(a)
    return rp.csv_zip(tables)


def load_design_bytes(data: bytes) -> tuple[str, dict]:
    """("device", design data) or ("groups", scenario) from an uploaded file (floatcalc.examples.read_design)."""
    return ex.read_design(data)


def device_example(name: str) -> dict:
    import tomllib

    from floatcalc.device.design import example_path

    return tomllib.loads(example_path(name).read_text(encoding="utf-8"))


def device_examples() -> list[dict]:
    from floatcalc.device import list_examples

    return list_examples()


# ------------------------------------------------------------------------------------------------
# Session state: the loaded scenario gives the fields their starting values; ``ver`` renews
# every widget key when a new scenario is loaded.

OPENING_DEVICE = "skimmer"


def _init_state() -> None:
    ss = st.session_state
    if "mode" not in ss:
        ss.ver = 0
        ss.upload_id = None
        try:
            ss.mode, ss.device = "device", device_example(OPENING_DEVICE)
            ss.base = ex.example(OPENING_EXAMPLE)
            ss.compare = []
        except Exception:  # noqa: BLE001 - without floatcalc.device the page opens on a leg example
            ss.mode = "groups"
            ss.base = ex.example(OPENING_EXAMPLE)
            ss.compare = [(a["title"], _key(a)) for a in ex.alternatives(ss.base)[1:]]


def _load(scenario: dict) -> None:
    ss = st.session_state
    ss.mode = "groups"
    ss.base = scenario
    ss.ver += 1
    main = {k: v for k, v in scenario.items() if k != "alternatives"}
    ss.compare = [(a["title"], _key(a)) for a in ex.alternatives(scenario)[1:]]
    ss.current = main
    ss.pop("pdf", None)


def _load_device(data: dict) -> None:
    ss = st.session_state
    ss.mode = "device"
    ss.device = data
    ss.ver += 1
    ss.compare = []
    ss.pop("pdf", None)


def k(name: str) -> str:
    return f"{name}@{st.session_state.ver}"


def text_field(label: str, default: str, key: str, **kw) -> str:
    """A text input whose starting value is ``default`` unless a callback already set its state."""
    if key in st.session_state:
        return st.text_input(label, key=key, **kw)
    return st.text_input(label, default, key=key, **kw)


def field_error(box, name: str, value, errors: dict) -> None:
    """Check one field with floatcalc's own parser; show the problem beside it."""
    msg = rp.check_field(name, value)
    if msg:
        errors[name] = msg
        box.error(msg, icon="⚠️")


# ------------------------------------------------------------------------------------------------
# Panels

def liquid_panel(spec: dict, errors: dict) -> dict:
    import floatcalc as fc

    names = [d["name"] for d in fc.list_liquids()]
    name = spec.get("name", "water")
    c1, c2 = st.columns(2)
    with c1:
        name = st.selectbox("Liquid", names, index=names.index(name) if name in names else 0, key=k("liq"),
                            help="Named liquids with published property correlations")
        temp = st.text_input("Temperature", spec.get("temperature", "20 degC"), key=k("temp"),
                             help="e.g. 20 degC; the range depends on the liquid")
        field_error(st, "temperature", temp, errors)
    with c2:
        sal = ""
        if name in ("water", "seawater"):
            sal = st.text_input("Salinity (blank for fresh water)", spec.get("salinity", ""), key=k("sal"),
                                help="absolute salinity, e.g. 35 g/kg (seawater correlations, 0–42 g/kg)")
            if sal.strip():
                field_error(st, "salinity", sal, errors)
        sig = st.text_input("Measured surface tension of a dirty surface (blank = clean)",
                            spec.get("surface_tension", ""), key=k("sig"),
                            help="e.g. 55 mN/m; surfactants, oils and skin grease lower it")
        if sig.strip():
            field_error(st, "surface_tension", sig, errors)
    out = {"name": name, "temperature": temp}
    if sal.strip():
        out["salinity"] = sal
    if sig.strip():
        out["surface_tension"] = sig
    if not errors:
        try:
            liq = rp.make_liquid(out)
            st.caption(f"σ = {liq.sigma * 1e3:.2f} mN/m ({liq.sigma_source}); ρ = {liq.rho:.1f} kg/m³ "
                       f"({liq.rho_source}); capillary length {liq.lc * 1e3:.3f} mm; valid {liq.valid_range}")
        except InputError as exc:
            errors["liquid"] = str(exc)
            st.error(str(exc), icon="⚠️")
    return out


def _coating_changed(i: int) -> None:
    ss = st.session_state
    adv, rec = ex.COATINGS.get(ss[k(f"coat{i}")], ("", ""))
    if adv:
        ss[k(f"adv{i}")] = adv
        ss[k(f"rec{i}")] = rec


def rod_panel(i: int, spec: dict, errors: dict, with_count: bool = True) -> dict:
    """Inputs of a group of long horizontal legs (``with_count=False``: legs of a device)."""
    e = {"kind": "rod"}
    c1, c2, c3 = st.columns(3)
    with c1:
        e["radius"] = st.text_input("Leg radius", spec.get("radius", "0.2 mm"), key=k(f"rad{i}"),
                                    help="radius of the wire or rod, e.g. 0.2 mm")
        field_error(st, "radius", e["radius"], errors)
        e["length"] = st.text_input("Wetted length of each leg", spec.get("length", "30 mm"), key=k(f"len{i}"),
                                    help="length lying in the surface, e.g. 30 mm")
        field_error(st, "length", e["length"], errors)
    with c2:
        if with_count:
            e["count"] = int(st.number_input("Number of legs", min_value=1, max_value=1000, step=1,
                                             value=int(spec.get("count", 1)), key=k(f"cnt{i}")))
        mats = ex.material_names() + ["other (enter density)"]
        m = spec.get("material", "steel")
        choice = st.selectbox("Material", mats, index=mats.index(m) if m in mats else len(mats) - 1,
                              key=k(f"mat{i}"), help="for the legs' own weight; handbook densities from floatcalc.materials")
        if choice == mats[-1]:
            e["material"] = st.text_input("Material density", m if m not in mats else "7850 kg/m^3",
                                          key=k(f"dens{i}"))
            field_error(st, "material", e["material"], errors)
        else:
            e["material"] = choice
    with c3:
        coats = list(ex.COATINGS)
        cdef = spec.get("coating", "custom")
        e["coating"] = st.selectbox("Coating", coats, index=coats.index(cdef) if cdef in coats else len(coats) - 1,
                                    key=k(f"coat{i}"), on_change=_coating_changed, args=(i,),
                                    help="sets typical angles (from memory); enter measured ones")
        e["advancing_angle"] = text_field("Advancing contact angle", spec.get("advancing_angle", "110 deg"),
                                             key=k(f"adv{i}"), help="sets the load limit, e.g. 115 deg")
        field_error(st, "advancing_angle", e["advancing_angle"], errors)
        e["receding_angle"] = text_field("Receding contact angle (optional)", spec.get("receding_angle", ""),
                                            key=k(f"rec{i}"), help="for pull-off; at most the advancing angle")
        if e["receding_angle"].strip():
            field_error(st, "receding_angle", e["receding_angle"], errors)
        else:
            e.pop("receding_angle")
    return e


def round_panel(kind: str):
    """Panel factory for a round element kind (ball foot or flat pad)."""

    def panel(i: int, spec: dict, errors: dict) -> dict:
        e = {"kind": kind}
        c1, c2, c3 = st.columns(3)
        with c1:
            e["radius"] = st.text_input("Ball radius" if kind == "ball" else "Pad radius",
                                        spec.get("radius", "1 mm"), key=k(f"rad{i}"), help="e.g. 1 mm")
            field_error(st, "radius", e["radius"], errors)
            if kind == "pad":
                e["thickness"] = st.text_input("Pad thickness", spec.get("thickness", "0.5 mm"), key=k(f"thk{i}"))
                field_error(st, "thickness", e["thickness"], errors)
        with c2:
            e["count"] = int(st.number_input("Number of elements", min_value=1, max_value=1000, step=1,
                                             value=int(spec.get("count", 1)), key=k(f"cnt{i}")))
            mats = ex.material_names() + ["other (enter density)"]
            m = spec.get("material", "steel")
            choice = st.selectbox("Material", mats, index=mats.index(m) if m in mats else len(mats) - 1,
                                  key=k(f"mat{i}"))
            if choice == mats[-1]:
                e["material"] = st.text_input("Material density", m if m not in mats else "1200 kg/m^3",
                                              key=k(f"dens{i}"))
                field_error(st, "material", e["material"], errors)
            else:
                e["material"] = choice
        with c3:
            coats = list(ex.COATINGS)
            cdef = spec.get("coating", "custom")
            e["coating"] = st.selectbox("Coating", coats, index=coats.index(cdef) if cdef in coats else len(coats) - 1,
                                        key=k(f"coat{i}"), on_change=_coating_changed, args=(i,))
            e["advancing_angle"] = text_field("Advancing contact angle", spec.get("advancing_angle", "110 deg"),
                                                 key=k(f"adv{i}"))
            field_error(st, "advancing_angle", e["advancing_angle"], errors)
            e["receding_angle"] = text_field("Receding contact angle (optional)", spec.get("receding_angle", ""),
                                                key=k(f"rec{i}"))
            if e["receding_angle"].strip():
                field_error(st, "receding_angle", e["receding_angle"], errors)
            else:
                e.pop("receding_angle")
        st.caption("Round elements are treated as far apart (no shared meniscus); forces are for all of them.")
        return e

    return panel


def _material_and_angles(i: int, spec: dict, e: dict, errors: dict, c2, c3, default_density: str) -> None:
    """Count, material and contact-angle fields shared by the ring and pin panels."""
    with c2:
        e["count"] = int(st.number_input("Number of elements", min_value=1, max_value=1000, step=1,
                                         value=int(spec.get("count", 1)), key=k(f"cnt{i}")))
        mats = ex.material_names() + ["other (enter density)"]
        m = spec.get("material", "steel")
        choice = st.selectbox("Material", mats, index=mats.index(m) if m in mats else len(mats) - 1,
                              key=k(f"mat{i}"))
        if choice == mats[-1]:
            e["material"] = st.text_input("Material density", m if m not in mats else default_density,
                                          key=k(f"dens{i}"))
            field_error(st, "material", e["material"], errors)
        else:
            e["material"] = choice
    with c3:
        coats = list(ex.COATINGS)
        cdef = spec.get("coating", "custom")
        e["coating"] = st.selectbox("Coating", coats, index=coats.index(cdef) if cdef in coats else len(coats) - 1,
                                    key=k(f"coat{i}"), on_change=_coating_changed, args=(i,))
        e["advancing_angle"] = text_field("Advancing contact angle", spec.get("advancing_angle", "110 deg"),
                                          key=k(f"adv{i}"), help="sets the load limit, e.g. 150 deg")
        field_error(st, "advancing_angle", e["advancing_angle"], errors)
        e["receding_angle"] = text_field("Receding contact angle (optional)", spec.get("receding_angle", ""),
                                         key=k(f"rec{i}"), help="for pull-off; at most the advancing angle")
        if e["receding_angle"].strip():
            field_error(st, "receding_angle", e["receding_angle"], errors)
        else:
            e.pop("receding_angle")


def ring_panel(i: int, spec: dict, errors: dict) -> dict:
    """Inputs of a group of ring footpads (closed wire loops, floatcalc.ring)."""
    e = {"kind": "ring"}
    c1, c2, c3 = st.columns(3)
    with c1:
        e["ring_radius"] = st.text_input("Ring radius (wire centre line)", spec.get("ring_radius", "5 mm"),
                                         key=k(f"rrad{i}"), help="at least twice the wire radius, e.g. 5 mm")
        ok_r = rp.check_field("ring_radius", e["ring_radius"]) is None
        field_error(st, "ring_radius", e["ring_radius"], errors)
        e["wire_radius"] = st.text_input("Wire radius", spec.get("wire_radius", "0.2 mm"), key=k(f"wrad{i}"),
                                         help="radius of the round wire, e.g. 0.2 mm")
        ok_w = rp.check_field("wire_radius", e["wire_radius"]) is None
        field_error(st, "wire_radius", e["wire_radius"], errors)
        if ok_r and ok_w:
            msg = rp.check_ring(e["ring_radius"], e["wire_radius"])
            if msg:
                errors[f"ring{i}"] = msg
                st.error(msg, icon="⚠️")
    _material_and_angles(i, spec, e, errors, c2, c3, "7850 kg/m^3")
    st.caption("Rings are treated as far apart (no shared meniscus); forces are for all of them. "
               "A ring takes a second or two to solve the first time.")
    return e


def pin_panel(i: int, spec: dict, errors: dict) -> dict:
    """Inputs of a group of vertical pins pushed down through the surface (floatcalc.pin)."""
    e = {"kind": "pin"}
    c1, c2, c3 = st.columns(3)
    with c1:
        e["radius"] = st.text_input("Pin radius", spec.get("radius", "0.3 mm"), key=k(f"rad{i}"), help="e.g. 0.3 mm")
        field_error(st, "radius", e["radius"], errors)
        e["length"] = st.text_input("Pin length (protrusion below the body)", spec.get("length", "3 mm"),
                                    key=k(f"len{i}"), help="the pin's top end reaches the surface at this depth")
        field_error(st, "length", e["length"], errors)
    _material_and_angles(i, spec, e, errors, c2, c3, "1200 kg/m^3")
    st.caption("Pins are treated as far apart (no shared meniscus); forces are for all of them. The limit "
               "is the largest upward force before the pin's top end reaches the surface.")
    return e


#: Element kind -> panel function (i, spec, errors) -> element inputs. A new kind needs a panel
#: here, an entry in floatcalc.examples.ELEMENT_KINDS and a branch in report.evaluate_element.
PANELS = {"rod": rod_panel, "ball": round_panel("ball"), "pad": round_panel("pad"),
          "ring": ring_panel, "pin": pin_panel}

NEW_GROUP = {
    "rod": {"kind": "rod", "radius": "0.2 mm", "length": "30 mm", "count": 2, "material": "steel",
            "coating": "PTFE film", "advancing_angle": "115 deg", "receding_angle": "95 deg"},
    "ball": {"kind": "ball", "radius": "1 mm", "count": 4, "material": "nylon", "coating": "superhydrophobic spray",
             "advancing_angle": "160 deg", "receding_angle": "150 deg"},
    "pad": {"kind": "pad", "radius": "2 mm", "thickness": "0.3 mm", "count": 4, "material": "pet",
            "coating": "paraffin wax", "advancing_angle": "110 deg", "receding_angle": "95 deg"},
    "ring": {"kind": "ring", "ring_radius": "5 mm", "wire_radius": "0.2 mm", "count": 4, "material": "steel",
             "coating": "superhydrophobic spray", "advancing_angle": "160 deg", "receding_angle": "150 deg"},
    "pin": {"kind": "pin", "radius": "0.3 mm", "length": "3 mm", "count": 4, "material": "nylon",
            "coating": "PTFE film", "advancing_angle": "115 deg", "receding_angle": "95 deg"},
}


def load_panel(spec: dict, errors: dict) -> dict:
    c1, c2, c3 = st.columns(3)
    with c1:
        body = st.text_input("Body mass (without the legs)", spec.get("body_mass", "0 g"), key=k("body"),
                             help="e.g. 1.2 g")
        field_error(st, "body_mass", body, errors)
    with c2:
        pay = st.text_input("Payload", spec.get("payload", "0 g"), key=k("pay"), help="e.g. 0.3 g")
        field_error(st, "payload", pay, errors)
    with c3:
        sf = st.number_input("Safety factor", min_value=1.0, max_value=10.0, step=0.1,
                             value=float(spec.get("safety_factor", 1.5)), key=k("sf"),
                             help="required ratio of limit force to weight for 'floats with margin'")
    return {"body_mass": body, "payload": pay, "safety_factor": float(sf)}


def _add_group() -> None:
    ss = st.session_state
    cur = dict(ss.get("current", ss.base))
    kind = ss.get("new_kind", "rod")
    cur["elements"] = [*cur["elements"], dict(NEW_GROUP.get(kind, NEW_GROUP["rod"]))]
    cur["alternatives"] = ss.base.get("alternatives", [])
    compare = ss.compare
    _load(cur)
    ss.compare = compare


def _remove_group(i: int) -> None:
    ss = st.session_state
    cur = dict(ss.get("current", ss.base))
    cur["elements"] = [e for j, e in enumerate(cur["elements"]) if j != i]
    cur["alternatives"] = ss.base.get("alternatives", [])
    compare = ss.compare
    _load(cur)
    ss.compare = compare


def results_panel(a: rp.Assessment) -> None:
    VERDICT_STYLE[a.verdict](
        f"**{a.verdict.upper()}**: margin {a.margin:.3g} against safety factor {a.safety_factor:g}"
        + (f"; short by {a.shortfall.to('mN').magnitude:.3g} mN of limit force" if a.shortfall is not None else ""))
    c1, c2, c3, c4 = st.columns(4)
    c1.metric("Limit force", f"{a.limit_force.to('mN').magnitude:.3g} mN")
    c2.metric("Weight carried", f"{a.total_load.to('mN').magnitude:.3g} mN",
              help="body + payload + the elements' own weight")
    c3.metric("Margin", f"{a.margin:.3g}", help=rp.VERDICT_RULE)
    spare_g = a.spare_payload.to("N").magnitude / a.liquid.g * 1e3
    c4.metric("Payload left", f"{spare_g:.3g} g", help="extra payload before the margin falls to the safety factor")
    rows = []
    for i, o in enumerate(a.elements, 1):
        r = o.result
        od = "sinks" if o.operating_depth is None else f"{o.operating_depth.to('mm').magnitude:.3g}"
        st.caption(f"group {i}: {o.label}")
        rows.append({"group": i,
                     "limit force [mN]": f"{o.max_force.to('mN').magnitude:.4g}",
                     "surface-tension part [mN]": f"{o.per_element * r.surface_tension_part.to('mN').magnitude:.4g}",
                     "pressure part [mN]": f"{o.per_element * r.pressure_part.to('mN').magnitude:.4g}",
                     "load carried [mN]": f"{o.load_share.to('mN').magnitude:.4g}",
                     "depth under load [mm]": od,
                     "depth at limit [mm]": f"{o.depth_at_max.to('mm').magnitude:.3g}",
                     "own weight [mN]": f"{o.own_weight.to('mN').magnitude:.3g}"})
    st.dataframe(rows, hide_index=True, width="stretch")
    st.markdown("**Dimensionless groups**")
    for i, o in enumerate(a.elements, 1):
        st.markdown(f"- Bond number (group {i}, L = leg radius): **{o.bond_number:.3g}**: {o.bond_reading}")
    st.markdown(f"- Baudoin number (whole design, weight / (σ × contact-line length)): "
                f"**{a.baudoin_number:.3g}**: {a.baudoin_reading}")


def notes_panel(a: rp.Assessment) -> None:
    st.markdown("**Warnings from the models**")
    if a.warnings:
        for w in a.warnings:
            st.warning(w, icon="⚠️")
    else:
        st.caption("none: every input lies inside the models' stated validity ranges")
    st.markdown("**Cautions**")
    for c in a.cautions:
        st.info(c, icon="ℹ️")
    with st.expander("Models and references"):
        for r in a.references:
            st.markdown(f"- {r}")
        st.markdown(f"- Verdict rule: {rp.VERDICT_RULE}")


DRAWINGS = ("Meniscus cross-section", "Force against depth")
DEVICE_DRAWINGS = ("Plan view", "Leg cross-section", "Force against depth (one leg)")


def drawings_panel(a: rp.Assessment, key: str) -> None:
    # One drawing at a time (a choice, not tabs) so that a change of input redraws only one.
    choice = st.radio("Drawing", DRAWINGS, horizontal=True, key="drawing", label_visibility="collapsed")
    kind = "section" if choice == DRAWINGS[0] else "force"
    for i, o in enumerate(a.elements):
        if len(a.elements) > 1:
            st.caption(f"group {i + 1}: {o.label}")
        st.image(figure_png(kind, key, i), width="stretch")


def device_legs_panel(data: dict, errors: dict) -> list:
    """Shared inputs for the rod legs of a device; a changed value applies to every rod leg."""
    legs = data.get("legs", [])
    rods = [leg for leg in legs if leg.get("kind") == "rod"]
    kinds = sorted({leg.get("kind", "?") for leg in legs})
    st.caption(f"{len(legs)} elements ({', '.join(kinds)}); plan positions and headings come from the design "
               "file. A value changed here applies to every rod leg.")
    if not rods:
        return legs
    first = rods[0]
    coat = first.get("coating", {})
    spec = {"radius": first.get("radius", ""), "length": first.get("length", ""),
            "material": first.get("material", first.get("material_density", "steel")),
            "coating": next((c for c, (a, r) in ex.COATINGS.items()
                             if a == coat.get("advancing") and r == coat.get("receding", "")), "custom"),
            "advancing_angle": coat.get("advancing", ""), "receding_angle": coat.get("receding", "")}
    with st.container(border=True):
        st.markdown("**Rod legs (long horizontal wires)**")
        e = rod_panel(0, spec, errors, with_count=False)
    out = []
    for leg in legs:
        leg = json.loads(json.dumps(leg))
        if leg.get("kind") == "rod":
            for key in ("radius", "length"):
                if e[key] != spec[key]:
                    leg[key] = e[key]
            if e["material"] != spec["material"]:
                leg.pop("material", None)
                leg.pop("material_density", None)
                if any(ch.isdigit() for ch in e["material"]):
                    leg["material_density"] = e["material"]
                else:
                    leg["material"] = e["material"]
            c = leg.setdefault("coating", {})
            if e["advancing_angle"] != spec["advancing_angle"]:
                c["advancing"] = e["advancing_angle"]
            rec = e.get("receding_angle", "")
            if rec != spec["receding_angle"]:
                if rec:
                    c["receding"] = rec
                else:
                    c.pop("receding", None)
        out.append(leg)
    return out


def device_load_panel(body: dict, errors: dict) -> tuple[str, str, float]:
    c1, c2, c3 = st.columns(3)
    with c1:
        mass = st.text_input("Body mass (without the legs)", body.get("mass", "1 g"), key=k("dbody"))
        field_error(st, "body_mass", mass, errors)
    with c2:
        pay = st.text_input("Payload (at the centre of mass)", "0 g", key=k("dpay"), help="e.g. 0.3 g")
        field_error(st, "payload", pay, errors)
    with c3:
        sf = st.number_input("Safety factor", min_value=1.0, max_value=10.0, step=0.1, value=2.0, key=k("dsf"),
                             help="required ratio of capacity to weight for 'floats with margin'")
    return mass, pay, float(sf)


def device_results_panel(a: rp.DeviceAssessment) -> None:
    r = a.result
    VERDICT_STYLE[a.verdict](
        f"**{a.verdict.upper()}**: margin {a.margin:.3g} against safety factor {a.safety_factor:g}"
        + (f"; short by {a.shortfall.to('mN').magnitude:.3g} mN of capacity" if a.shortfall is not None else ""))
    c1, c2, c3, c4 = st.columns(4)
    c1.metric("Capacity", f"{a.limit_force.to('mN').magnitude:.3g} mN",
              help="weight it can carry: own weight + largest payload at the centre of mass (device equilibrium)")
    c2.metric("Weight carried", f"{a.total_load.to('mN').magnitude:.3g} mN", help="body + legs + payload")
    c3.metric("Margin", f"{a.margin:.3g}", help=rp.VERDICT_RULE)
    spare_g = a.spare_payload.to("N").magnitude / a.liquid.g * 1e3
    c4.metric("Payload left", f"{spare_g:.3g} g", help="extra payload before the margin falls to the safety factor")
    st.markdown(f"First element to give way: **{r.first_to_fail}**. Equilibrium: heave "
                f"{r.heave.to('mm').magnitude:.3g} mm, pitch {r.pitch.magnitude:.2f}°, roll {r.roll.magnitude:.2f}°.")
    rows = [{"element": e.name, "kind": e.kind, "force [mN]": f"{e.force.to('mN').magnitude:.4g}",
             "share of load [%]": f"{100 * e.share:.1f}", "depth [mm]": f"{e.depth.to('mm').magnitude:.3g}",
             "limit force [mN]": f"{e.limit_force.to('mN').magnitude:.4g}",
             "depth to spare [mm]": f"{e.depth_margin.to('mm').magnitude:.3g}"} for e in r.elements]
    st.dataframe(rows, hide_index=True, width="stretch", height=min(38 + 35 * len(rows), 300))
    st.markdown("**Dimensionless groups**")
    for o in a.elements:
        st.markdown(f"- Bond number (L = leg radius): **{o.bond_number:.3g}**: {o.bond_reading}")
    st.markdown(f"- Baudoin number (weight / (σ × contact perimeter)): **{a.baudoin_number:.3g}**: "
                f"{a.baudoin_reading}")


def device_drawings_panel(a: rp.DeviceAssessment, key: str) -> None:
    choice = st.radio("Drawing", DEVICE_DRAWINGS, horizontal=True, key="device_drawing",
                      label_visibility="collapsed")
    if choice == DEVICE_DRAWINGS[0]:
        st.image(figure_png("plan", key), width="stretch")
        return
    if not a.elements:
        st.caption("no rod leg to draw")
        return
    st.caption(a.elements[0].label + ": its own force–depth law, with the force it carries in the device")
    st.image(figure_png("section" if choice == DEVICE_DRAWINGS[1] else "force", key, 0), width="stretch")


def _guard(title: str, fn, *args) -> None:
    """Run a panel; any failure is shown in words inside the panel, never as a traceback."""
    try:
        fn(*args)
    except InputError as exc:
        st.error(str(exc), icon="⚠️")
    except Exception as exc:  # noqa: BLE001 - the page must keep working
        st.error(f"{title} could not be shown: {type(exc).__name__}: {exc}", icon="⚠️")


STUDY_DEFAULTS = {"radius": ("0.05 mm", "0.5 mm"), "length": ("5 mm", "80 mm"),
                  "contact_angle": ("90 deg", "170 deg"), "count": ("1", "12"),
                  "payload_mass": ("0 g", "5 g")}


DEVICE_STUDY_DEFAULTS = {"payload_mass": ("0 g", "4 g"), "body_mass": ("0.5 g", "4 g"),
                         "surface_tension": ("30 mN/m", "72 mN/m"), "contact_angle_shift": ("-30 deg", "30 deg"),
                         "radius_factor": ("0.5", "2"), "length_factor": ("0.5", "2")}


def study_panel(current: dict, key: str, sf: float, device: bool = False, payload: str = "0 g") -> None:
    """Sweep one input (floatcalc.studies) in chunks, with a progress bar, and draw the sweep."""
    ss = st.session_state
    inputs = rp.DEVICE_STUDY_INPUTS if device else rp.STUDY_INPUTS
    defaults = DEVICE_STUDY_DEFAULTS if device else STUDY_DEFAULTS
    pre = "dstudy" if device else "study"
    c1, c2, c3, c4 = st.columns([1.4, 1, 1, 0.8])
    name = c1.selectbox("Input to vary", list(inputs), format_func=lambda n: inputs[n], key=f"{pre}_in")
    lo, hi = defaults[name]
    start = c2.text_input("From", lo, key=f"{pre}_lo_{name}")
    stop = c3.text_input("To", hi, key=f"{pre}_hi_{name}")
    pts = int(c4.number_input("Points", min_value=3, max_value=100 if device else 400, value=12 if device else 60,
                              step=1, key=f"{pre}_n"))
    if device:
        st.caption("Each point solves the whole device (about a quarter of a second a point).")
    skey = json.dumps([key, name, start, stop, pts])
    if st.button("Run the sweep", key=f"{pre}_run"):
        bar = st.progress(0.0, text="sweeping...")
        prog = lambda f: bar.progress(f, text=f"sweeping... {100 * f:.0f} %")  # noqa: E731
        try:
            if device:
                res = rp.device_study_sweep(current, name, start, stop, pts, payload=payload, progress=prog)
            else:
                res = rp.study_sweep(current, name, start, stop, pts, progress=prog)
            ss[pre] = (skey, res)
        except InputError as exc:
            ss[pre] = None
            st.error(str(exc), icon="⚠️")
        bar.empty()
    if ss.get(pre) and ss[pre][0] == skey:
        import io

        from floatcalc import plotting

        res = ss[pre][1]
        fig = plotting.sweep_figure(res, "margin" if device else "safety_factor", None if device else sf)
        buf = io.BytesIO()
        fig.savefig(buf, format="png", dpi=90)
        st.image(buf.getvalue(), width=720)
        if res.crossings:
            a = res.axes[0]
            shown = ", ".join(f"{float(np.interp(c, a.values, a.shown())):.4g} {a.unit}" for c in res.crossings)
            st.caption(f"the design just carries its load (limit force = weight) at {inputs[name]} = {shown}")
        for w in res.warnings:
            st.warning(w, icon="⚠️")
    elif ss.get(pre):
        st.caption("inputs changed since the last sweep: run it again")


def compare_panel(current_name: str, current_key: str | None) -> None:
    ss = st.session_state
    st.caption("Put two or more designs side by side: the current design against the saved ones.")
    b1, b2 = st.columns(2)
    if current_key is not None and b1.button("Add the current design to the comparison", key="cmp_add"):
        ss.compare = [*ss.compare, (f"saved {len(ss.compare) + 1}: {current_name}", current_key)]
    if ss.compare and b2.button("Clear the comparison", key="cmp_clear"):
        ss.compare = []
    items = ([("current design", current_key)] if current_key is not None else []) + list(ss.compare)
    if len(items) < 2:
        st.caption("Add a design to compare it with the current one: change an input, add it again, and so on.")
        return
    assessed = []
    for name, kk in items:
        try:
            assessed.append((name, kk, assess_any(kk)))
        except InputError as exc:
            st.error(f"{name}: {exc}", icon="⚠️")
    st.dataframe(rp.comparison_rows([(n, a) for n, _, a in assessed]), hide_index=True, width="stretch")
    st.image(figure_png("compare", "", 0, json.dumps([(n, kk) for n, kk, _ in assessed])), width=760)


def reports_panel(a, key: str, toml_text: str) -> None:
    ss = st.session_state
    c1, c2, c3 = st.columns(3)
    c1.download_button("Save this design (TOML)", toml_text, file_name="design.toml",
                       mime="application/toml", key="dl_toml")
    c2.download_button("Curves as CSV (zip)", csv_zip_cached(key), file_name="floatcalc_curves.zip",
                       mime="application/zip", key="dl_csv")
    if c3.button("Prepare the PDF report", key="pdf_make"):
        with st.spinner("Writing the PDF report..."):
            others = [(n, assess_any(kk)) for n, kk in ss.compare]
            ss.pdf = (key, rp.pdf_bytes(a, others))
    if ss.get("pdf") and ss.pdf[0] == key:
        c3.download_button("Download the PDF report", ss.pdf[1], file_name="floatcalc_report.pdf",
                           mime="application/pdf", key="dl_pdf")


# ------------------------------------------------------------------------------------------------
# Page

def sidebar() -> None:
    ss = st.session_state
    with st.sidebar:
        st.header("Designs")
        choices: dict[str, str] = {}
        try:
            for d in device_examples():
                choices[f"device:{d['name']}"] = f"Device: {d['description']}"
        except Exception:  # noqa: BLE001 - device examples unavailable
            pass
        for n in ex.EXAMPLE_NAMES:
            choices[f"groups:{n}"] = ex.example(n)["title"]
        pick = st.selectbox("Built-in examples (all invented)", list(choices), format_func=lambda n: choices[n],
                            index=None, placeholder="choose an example...", key="pick")
        if pick and st.button("Load this example", key="load_example"):
            kind, name = pick.split(":", 1)
            _load_device(device_example(name)) if kind == "device" else _load(ex.example(name))
            st.rerun()
        up = st.file_uploader(f"Open a design file (TOML, at most {ex.MAX_FILE_BYTES // 1024} kB)",
                              type=["toml"], key="upload")
        if up is not None and up.file_id != ss.upload_id:
            ss.upload_id = up.file_id
            ss.upload_error = None
            try:
                if up.size > ex.MAX_FILE_BYTES:
                    raise InputError(f"design file: must be at most {ex.MAX_FILE_BYTES // 1024} kB, got {up.size} bytes")
                kind, data = load_design_bytes(up.read(ex.MAX_FILE_BYTES + 1))
                _load_device(data) if kind == "device" else _load(data)
                st.rerun()
            except InputError as exc:
                ss.upload_error = str(exc)
        if ss.get("upload_error") and up is not None:
            st.error(ss.upload_error, icon="⚠️")
        st.divider()
        st.caption("Static estimates on a clean liquid surface. Surfactants, oils and heat lower the "
                   "surface tension and every force here.")


def liquid_section(spec: dict, errors: dict) -> dict:
    """The "Liquid" heading and panel; a failure is shown inline and recorded in ``errors``."""
    st.subheader("Liquid")
    try:
        return liquid_panel(spec, errors)
    except Exception as exc:  # noqa: BLE001 - the page never shows a traceback
        st.error(f"liquid inputs could not be read: {exc}", icon="⚠️")
        errors["liquid"] = str(exc)
        return {}


def groups_page(errors: dict):
    """Inputs of a scenario of element groups; returns (assessment or None, key, toml, name)."""
    ss = st.session_state
    base = ss.base
    left, right = st.columns([1.0, 1.25], gap="large")
    with left:
        liq = liquid_section(base.get("liquid", {}), errors)
        st.subheader("Support elements")
        elements = []
        for i, spec in enumerate(base.get("elements", [])):
            kind = spec.get("kind", "rod")
            with st.container(border=True):
                h1, h2 = st.columns([4, 1])
                h1.markdown(f"**Group {i + 1}: {ex.ELEMENT_KINDS.get(kind, {}).get('label', kind)}**")
                if len(base["elements"]) > 1:
                    h2.button("Remove", key=k(f"rm{i}"), on_click=_remove_group, args=(i,))
                panel = PANELS.get(kind)
                if panel is None:
                    st.error(f"kind: this page has no panel for '{kind}'", icon="⚠️")
                    errors[f"kind{i}"] = kind
                    continue
                try:
                    elements.append(panel(i, spec, errors))
                except Exception as exc:  # noqa: BLE001
                    st.error(f"group {i + 1} inputs could not be read: {exc}", icon="⚠️")
                    errors[f"group{i}"] = str(exc)
        a1, a2 = st.columns([1, 1])
        a1.selectbox("Kind of element to add", list(PANELS), key="new_kind",
                     format_func=lambda kk: ex.ELEMENT_KINDS[kk]["label"])
        a2.button("Add an element group", key=k("addgrp"), on_click=_add_group)
        st.subheader("Load")
        load = load_panel(base.get("load", {}), errors)
    current = {"title": base.get("title", "Design"), "invented": bool(base.get("invented", False)),
               "liquid": liq, "load": load, "elements": elements}
    if base.get("audience"):
        current["audience"] = base["audience"]
    key = _key(current)
    a = None
    with right:
        st.subheader("Results")
        if errors:
            st.info("Results wait for valid inputs: correct the field marked in red on the left.", icon="✋")
        else:
            try:
                a = assess_cached(key)
                ss.current = current
            except InputError as exc:
                st.error(str(exc), icon="⚠️")
            except Exception as exc:  # noqa: BLE001
                st.error(f"the calculation failed: {type(exc).__name__}: {exc}", icon="⚠️")
        if a is not None:
            _guard("Results", results_panel, a)
            st.subheader("Drawings")
            _guard("Drawings", drawings_panel, a, key)
            _guard("Warnings and cautions", notes_panel, a)
            with st.expander("Design study: sweep one input of the first leg group"):
                _guard("Design study", study_panel, current, key, a.safety_factor)
    toml_text = ex.dumps_toml(current) if a is not None else ""
    return a, key, toml_text, current["title"]


def device_page(errors: dict):
    """Inputs of a device design; returns (assessment or None, key, toml, name)."""
    ss = st.session_state
    data = ss.device
    left, right = st.columns([1.0, 1.25], gap="large")
    with left:
        liq = liquid_section(data.get("liquid", {}), errors)
        st.subheader("Support elements")
        legs = data.get("legs", [])
        try:
            legs = device_legs_panel(data, errors)
        except Exception as exc:  # noqa: BLE001
            st.error(f"leg inputs could not be read: {exc}", icon="⚠️")
            errors["legs"] = str(exc)
        st.subheader("Load")
        mass, pay, sf = device_load_panel(data.get("body", {}), errors)
    new = json.loads(json.dumps(data))
    new["liquid"] = liq
    new["legs"] = legs
    new.setdefault("body", {})["mass"] = mass
    key = device_key(new, pay, sf)
    a = None
    with right:
        st.subheader("Results")
        if errors:
            st.info("Results wait for valid inputs: correct the field marked in red on the left.", icon="✋")
        else:
            try:
                with st.spinner("Solving the device equilibrium..."):
                    a = assess_device_cached(key)
            except InputError as exc:
                for line in str(exc).splitlines():
                    st.error(line, icon="⚠️")
            except Exception as exc:  # noqa: BLE001
                st.error(f"the calculation failed: {type(exc).__name__}: {exc}", icon="⚠️")
        if a is not None:
            _guard("Results", device_results_panel, a)
            st.subheader("Drawings")
            _guard("Drawings", device_drawings_panel, a, key)
            _guard("Warnings and cautions", notes_panel, a)
            with st.expander("Design study: sweep one input of the whole device"):
                _guard("Design study", study_panel, new, key, sf, True, pay)
    toml_text = ""
    if a is not None:
        from floatcalc.device import design_text

        toml_text = design_text(new)
    return a, key, toml_text, str(data.get("description", "device"))[:60]


def main() -> None:
    t0 = time.perf_counter()
    _init_state()
    ss = st.session_state
    sidebar()
    st.title("floatcalc: what can it carry on the surface?")
    if ss.mode == "device":
        desc = str(ss.device.get("description", "Device design"))
        st.caption(desc)
    else:
        st.caption(ss.base.get("title", "") + ("  ·  invented example" if ss.base.get("invented") else ""))
    errors: dict[str, str] = {}
    a, key, toml_text, name = (device_page if ss.mode == "device" else groups_page)(errors)
    st.subheader("Compare designs")
    _guard("Comparison", compare_panel, name, key if a is not None else None)
    st.subheader("Reports")
    if a is not None:
        _guard("Reports", reports_panel, a, key, toml_text)
    else:
        st.caption("Reports are available once every input is valid.")
    st.caption(f"page computed in {1e3 * (time.perf_counter() - t0):.0f} ms · floatcalc")


main()
