"""The page: sidebar (examples, upload), inputs (liquid, body and load, element tables),
results, drawings, classroom slider, sweep, comparison and reports.

The design data (schema 2, text with units) in ``st.session_state.data`` give the widgets
their starting values; every rerun reads the widgets back into a new data dict, validates it
with :func:`floatcalc.design.design_from_data` (problems shown at their fields) and solves it
with :func:`floatcalc.device.solve.solve_device` (cached, :mod:`floatcalc.page.solver`).
After a bad value the last good results stay on the page, marked as not current.
"""

from __future__ import annotations

import copy
import json
import time

import streamlit as st

from ..errors import ConvergenceError, InputError
from . import solver
from .widgets import Slots, coating_widget, esc, field_widget, material_widget, problem_lines, text

OPENING_EXAMPLE = "skimmer"
LAYOUTS = {"placed": "placed at a position", "around": "evenly around the centre of mass",
           "row": "side by side in a row"}
DRAWINGS = ("plan view", "what breaks first", "element tables", "safety-factor sweep")
VERDICT_BOX = {"floats": "success", "floats with elements broken through": "warning", "capsizes": "error",
               "sinks": "error"}


# ------------------------------------------------------------------------------------------
# State

def _ss():
    return st.session_state


def load_data(data: dict, source_text: str | None = None, notes=()) -> None:
    """Make ``data`` the page's design (new widget keys)."""
    ss = _ss()
    ss.data = copy.deepcopy(data)
    ss.source_text = source_text
    ss.notes = list(notes)
    ss.ver = ss.get("ver", 0) + 1
    ss.good = None  # results of another design are never shown as this one's
    ss.pop("pdf", None)
    ss.pop("csvzip", None)


def _init() -> None:
    ss = _ss()
    if "data" not in ss:
        from ..design import example

        d = example(OPENING_EXAMPLE)
        ss.compare = []
        ss.good = None
        ss.upload_id = None
        load_data(d.data, d.source_text, d.notes)


def k(name: str) -> str:
    return f"{name}@{_ss().ver}"


def _current() -> dict:
    return copy.deepcopy(_ss().get("current", _ss().data))


# structure edits (callbacks): start from the inputs as they stand, change, renew the keys

def _edit(fn) -> None:
    ss = _ss()
    data = _current()
    fn(data)
    ss.data = data
    ss.ver += 1


def new_table(kind_name: str, base: dict | None = None) -> dict:
    """A table of ``kind_name`` with the kind's example values (quick form: 4, 'around')."""
    from ..elements import get_kind

    kind = get_kind(kind_name)
    t = {"kind": kind_name, "name": (base or {}).get("name", kind.label)}
    for key in ("count", "layout", "position", "layout_radius", "layout_spacing", "start_angle"):
        if base and key in base:
            t[key] = base[key]
    if "count" not in t and "position" not in t:
        t["count"], t["layout"] = 4, "around"
    for n, f in kind.fields.items():
        if f.required:
            t[n] = f.example if f.example else (int(f.lo) if f.kind == "int" and f.lo is not None else "")
        if base and n in base and n != "kind" and (n in kind.fields) and base.get("kind") == kind_name:
            t[n] = base[n]
    if base and "material" in base:
        t["material"] = base["material"]
    elif base and "material_density" in base:
        t["material_density"] = base["material_density"]
    else:
        t["material"] = "steel"
    t["coating"] = copy.deepcopy((base or {}).get("coating") or {"advancing": "115 deg", "receding": "95 deg",
                                                                   "name": "PTFE film"})
    return t


def _show_table(i: int) -> None:
    """With one table edited at a time (more than :data:`ALL_TABLES_SHOWN`), edit table ``i``
    next (a table just added or duplicated is shown, not the first one)."""
    if len(_ss().data.get("elements", [])) > ALL_TABLES_SHOWN:
        _ss()[k("edit_table")] = i


def _add_table() -> None:
    _edit(lambda d: d.setdefault("elements", []).append(new_table(_ss().get("new_kind", "rod"))))
    _show_table(len(_ss().data["elements"]) - 1)


def _dup_table(i: int) -> None:
    def f(d):
        t = copy.deepcopy(d["elements"][i])
        t["name"] = (t.get("name") or "table") + " copy"
        d["elements"].insert(i + 1, t)
    _edit(f)
    _show_table(i + 1)


def _remove_table(i: int) -> None:
    _edit(lambda d: d["elements"].pop(i))


def _kind_changed(i: int) -> None:
    new = _ss()[k(f"el{i}.kind")]

    def f(d):
        d["elements"][i] = new_table(new, d["elements"][i])
    _edit(f)


# ------------------------------------------------------------------------------------------
# Inputs

def liquid_panel(data: dict, slots: Slots) -> None:
    from ..liquids import list_liquids

    ld = dict(data.get("liquid") or {})
    names = [x["name"] for x in list_liquids()]
    nm = ld.get("name", "water")
    c1, c2 = st.columns(2)
    with c1:
        name = st.selectbox("liquid", names, index=names.index(nm) if nm in names else 0, key=k("liq.name"),
                            help="named liquids with published property correlations")
        temp = text("temperature [degC]", str(ld.get("temperature", "20 degC")), k("liq.temp"),
                    help="e.g. 20 degC; the range depends on the liquid")
        slots.add("liquid.temperature")
        slots.add("liquid.name")
    with c2:
        sal = ""
        if name in ("water", "seawater"):
            sal = text("salinity [g/kg] (blank: fresh water)", str(ld.get("salinity", "")), k("liq.sal"),
                       help="absolute salinity, e.g. 35 g/kg")
            slots.add("liquid.salinity")
        sig = text("measured surface tension [mN/m] (blank: clean)", str(ld.get("surface_tension", "")),
                   k("liq.sig"), help="e.g. 55 mN/m for a contaminated surface; soap brings water to about 30 mN/m")
        slots.add("liquid.surface_tension")
    out = {"name": name, "temperature": temp.strip()}
    if sal.strip():
        out["salinity"] = sal.strip()
    if sig.strip():
        out["surface_tension"] = sig.strip()
    data["liquid"] = out
    slots.add("liquid")


def body_load_panel(data: dict, slots: Slots) -> None:
    b = dict(data.get("body") or {})
    ld = dict(data.get("load") or {})
    c1, c2 = st.columns(2)
    with c1:
        b["mass"] = text("body mass [g] (without its elements)", str(b.get("mass", "1 g")), k("body.mass")).strip()
        slots.add("body.mass")
        com = b.get("centre_of_mass", ["0 mm", "0 mm"])
        x = text("centre of mass x [mm]", str(com[0]), k("body.comx"))
        y = text("centre of mass y [mm]", str(com[1]), k("body.comy"))
        b["centre_of_mass"] = [x.strip(), y.strip()]
        slots.add("body.centre_of_mass")
        h = text("centre of mass height [mm]", str(b.get("centre_of_mass_height", "0 mm")), k("body.comh"),
                 help="above the elements' lowest points; a high centre of mass can capsize the device")
        b["centre_of_mass_height"] = h.strip()
        slots.add("body.centre_of_mass_height")
    with c2:
        pay = text("payload [g]", str(ld.get("payload", "0 g")), k("load.payload"),
                   help="extra load put on the device")
        slots.add("load.payload")
        off = st.checkbox("payload off centre", value="payload_position" in ld,
                          key=k("load.off"))
        new = {"payload": pay.strip()}
        if off:
            pp = ld.get("payload_position", ["0 mm", "0 mm"])
            px = text("payload x [mm]", str(pp[0]), k("load.px"))
            py = text("payload y [mm]", str(pp[1]), k("load.py"))
            new["payload_position"] = [px.strip(), py.strip()]
            slots.add("load.payload_position")
        sf = st.number_input("required safety factor (capacity / load)", min_value=1.0, max_value=100.0,
                             value=float(ld.get("safety_factor", 1.0)), step=0.1, key=k("load.sf"),
                             help="1: none; common practice for lab demonstrations is 1.5 to 2")
        new["safety_factor"] = float(sf)
        slots.add("load.safety_factor")
    data["body"] = b
    data["load"] = new


def table_panel(data: dict, i: int, slots: Slots, expanded: bool) -> None:
    """Editor of element table ``i``: kind chooser, the kind's fields, layout, material, coating."""
    from ..elements import get_kind, kinds

    t = data["elements"][i]
    kind = get_kind(t.get("kind")) or get_kind("rod")
    n = int(t.get("count", 1))
    title = f"table {i + 1}: {kind.noun(n)}"
    # expander labels render Markdown: the user's name escaped
    with st.expander(esc(title + (f" — {t.get('name')}" if t.get("name") else "")), expanded=expanded):
        path = f"elements[{i}]"
        slots.add(path)
        names = [x.name for x in kinds() if not x.unavailable]
        c1, c2, c3 = st.columns([1.4, 1.2, 0.8])
        with c1:
            st.selectbox("kind", names, index=names.index(kind.name) if kind.name in names else 0,
                         key=k(f"el{i}.kind"), format_func=lambda nm: get_kind(nm).label,
                         on_change=_kind_changed, args=(i,), help=kind.summary)
        with c2:
            t["name"] = text("name", str(t.get("name", "")), k(f"el{i}.name"), help="label shown in results").strip()
            if not t["name"]:
                t.pop("name")
            slots.add(f"{path}.name")
        with c3:
            t["count"] = int(st.number_input("count", min_value=1, max_value=500, value=n, step=1,
                                             key=k(f"el{i}.count"), help="equal elements in this table"))
        if t["count"] > 1:
            st.caption(f"Changes here apply to all {t['count']} {kind.noun(t['count']).split(' ', 1)[1]} of this table.")
        lay_keys = ["around", "row"] if t["count"] > 1 else ["placed"]
        cur = t.get("layout") or ("placed" if t["count"] == 1 else "around")
        lay = st.selectbox("layout", lay_keys, index=lay_keys.index(cur) if cur in lay_keys else 0,
                           key=k(f"el{i}.layout.{t['count'] > 1}"), format_func=LAYOUTS.get)
        slots.add(f"{path}.count")
        slots.add(f"{path}.layout")
        for key in ("layout", "layout_radius", "layout_spacing", "start_angle"):
            if key != "layout" and key in t and (lay != "around" or key == "layout_spacing"):
                if not (lay == "row" and key == "layout_spacing"):
                    t.pop(key)
        if lay == "placed":
            t.pop("layout", None)
            t.pop("count", None)
            t.setdefault("position", ["0 mm", "0 mm"])
            field_widget(t, "position", kind.all_fields["position"], f"{path}.position", k(f"el{i}.pos"), slots)
        else:
            t["layout"] = lay
            if lay == "around":
                t.pop("position", None)
                r = text("layout radius [mm] (blank: far apart)", str(t.get("layout_radius", "")),
                         k(f"el{i}.lrad"), help="distance of each element from the centre of mass")
                if r.strip():
                    t["layout_radius"] = r.strip()
                else:
                    t.pop("layout_radius", None)
                slots.add(f"{path}.layout_radius")
            else:
                t.setdefault("position", ["0 mm", "0 mm"])
                field_widget(t, "position", kind.all_fields["position"], f"{path}.position", k(f"el{i}.pos"), slots)
                t["layout_spacing"] = text("layout spacing [mm]", str(t.get("layout_spacing", "8 mm")),
                                           k(f"el{i}.lsp"), help="centre-to-centre spacing").strip()
                slots.add(f"{path}.layout_spacing")
        # two fields a row; a field's problem shows under its row, as wide as the panel (a
        # half column would break the key path of the message mid-word)
        items = [*kind.fields.items(), ("mount", kind.all_fields["mount"])]
        for j in range(0, len(items), 2):
            pair = items[j:j + 2]
            cols = st.columns(2)
            for col, (fname, f) in zip(cols, pair):
                with col:
                    field_widget(t, fname, f, f"{path}.{fname}", k(f"el{i}.{fname}"), slots, slot=False)
            for fname, _ in pair:
                slots.add(f"{path}.{fname}")
        if kind.name == "flexible_leg":
            slots.drawings[i] = st.empty()
        m1, m2 = st.columns([1, 1.6])
        with m1:
            material_widget(t, path, k(f"el{i}.mat"), slots)
        with m2:
            coating_widget(t, path, k(f"el{i}.coat"), slots)
        b1, b2, _ = st.columns([1, 1, 2])
        b1.button("duplicate", key=k(f"el{i}.dup"), on_click=_dup_table, args=(i,),
                  help="add a copy of this table below it")
        if len(data["elements"]) > 1:
            b2.button("remove", key=k(f"el{i}.rm"), on_click=_remove_table, args=(i,))


#: With more tables than this, one table is edited at a time (chosen from a list); each
#: widget costs time on every rerun.
ALL_TABLES_SHOWN = 3


def elements_panel(data: dict, slots: Slots) -> None:
    from ..elements import get_kind, kinds

    els = data.setdefault("elements", [])
    slots.add("elements")
    if len(els) <= ALL_TABLES_SHOWN:
        for i in range(len(els)):
            table_panel(data, i, slots, expanded=True)
    else:
        def title(j):
            t = els[j]
            kd = get_kind(t.get("kind"))
            noun = kd.noun(int(t.get("count", 1))) if kd else str(t.get("kind"))
            return f"table {j + 1}: {noun}" + (f" — {t['name']}" if t.get("name") else "")

        sel = st.selectbox(f"table to edit ({len(els)} tables)", range(len(els)), format_func=title,
                           key=k("edit_table"), help="problems in a table not shown are listed above")
        table_panel(data, min(sel, len(els) - 1), slots, expanded=True)
    c1, c2 = st.columns([1.6, 1])
    c1.selectbox("kind of element to add", [x.name for x in kinds() if not x.unavailable], key="new_kind",
                 format_func=lambda nm: get_kind(nm).label, help="; ".join(f"{x.label}: {x.summary}" for x in kinds()))
    c2.button("add table", key=k("add"), on_click=_add_table, help="an element table of 4 elements laid out "
              "around the centre of mass, with the kind's example sizes")


# ------------------------------------------------------------------------------------------
# Results

def verdict_box(r) -> None:
    box = getattr(st, VERDICT_BOX.get(r.verdict, "info"))
    line = f"Verdict: {r.verdict}. Safety factor {r.safety_factor:.3g} (required {r.required_safety_factor:g})."
    if r.below_required_safety_factor:
        line += " Below the required safety factor."
    box(esc(line))


def results_panel(design, r, current: bool) -> None:
    from ..output.text import bond_rows, result_rows

    if not current:
        st.warning("Not current: these results are for the last valid inputs. Correct the field marked on the left.",
                   icon="✋")
    verdict_box(r)
    rows = result_rows(r)
    # st.table renders Markdown in its cells: every cell escaped (element names are user text)
    st.table({"quantity": [esc(a) for a, _ in rows], "value": [esc(b) for _, b in rows]})
    st.markdown("**Bond numbers** (Bo = ρ g L² / σ)")
    for b in bond_rows(design):
        st.text(f"{b['table']}: Bo = {b['Bo']} with {b['length']}; {b['reading']}")


def table_drawings(design, slots: Slots) -> None:
    """Drawings inside the table editors: a flexible leg's bending at its limit."""
    from .. import plotting as pl
    from ..elements import get_kind
    from ..output.tables import signature

    for i, ph in slots.drawings.items():
        p = next((e for e in design.elements if e.get("group") == i and e.get("index", 0) == 0), None)
        if p is None:
            continue
        kind = get_kind(p["kind"])
        key = "bendpng:" + signature(p, design.liquid)
        try:
            hit = solver.cached(key)
            if hit is None:  # the solve goes through the worker (budget); the drawing here
                res = solver.solve_element(kind, p, design.liquid, budget=10.0)
                png = pl.figure_png(pl.bending_shape, size=(4.6, 3.3), dpi=110, result=res, compact=True)
                words = (f"bending of one leg alone at its limit load: tip deflection "
                         f"{pl.tip_deflection(res.shape) * 1e3:.3g} mm from the clamp's straight line, "
                         f"tip depth {res.tip_depth.to('mm').magnitude:.3g} mm, clamp depth "
                         f"{res.clamp_depth_at_max.to('mm').magnitude:.3g} mm")
                hit = solver.remember(key, (png, words))
            ph.image(hit[0], caption=hit[1], width="stretch")
        except solver.SolveTimeout:
            ph.caption("bending drawing: still solving")
        except (InputError, ConvergenceError) as exc:
            ph.error(esc(f"bending drawing: {problem_lines(exc)[0]}"), icon="⚠️")


def elements_table_panel(r) -> None:
    from ..output.text import element_rows

    rows = element_rows(r)
    for j, row in enumerate(rows, 1):
        row["no."] = j
    st.dataframe(rows, hide_index=True, width="stretch", height=min(38 + 35 * len(rows), 360),
                 column_order=["no.", *[c for c in rows[0] if c != "no."]] if rows else None,
                 column_config={c: st.column_config.TextColumn(width=_text_width([str(r[c]) for r in rows], c))
                                for c in ("element", "kind")} if rows else None)


def _text_width(cells: list[str], head: str) -> int:
    """Column width [px] for the longest of ``cells`` (and the header) at the table's font,
    within 60–220 px (the rest of the row keeps its room at 1280 px)."""
    n = max([len(head), *map(len, cells)])
    return int(min(max(7.6 * n + 26, 60), 220))


def notes_panel(r) -> None:
    for w in dict.fromkeys(r.warnings):
        st.warning(esc(w), icon="⚠️")
    for c in dict.fromkeys(r.cautions):
        st.info(esc(c), icon="ℹ️")


@st.cache_data(max_entries=256, show_spinner=False)
def figure(kind: str, key: str, extra: str = "") -> bytes:
    """PNG of one drawing of the solved design ``key`` (solver cache), cached."""
    from .. import plotting as pl

    hit = solver.cached(key)
    r = hit
    if kind == "plan":
        from .drawings import plan_png

        return plan_png(r)
    if kind == "steps":
        return pl.figure_png(pl.failure_steps, size=(9.0, 4.2), device_result=r)
    if kind == "sweep":
        d = json.loads(extra)
        return pl.figure_png(pl.safety_factor_sweep, size=(9.0, 4.2), values=d["x"], safety_factors=d["sf"],
                             xlabel=d["label"], required=d["req"])
    raise KeyError(kind)


def _element_figures(t, r) -> None:
    from .. import plotting as pl

    res = t.result
    load = next((e.force for e in r.elements if e.name == t.params.get("name")), None)
    if res is not None and getattr(res, "profile", None):
        st.image(pl.figure_png(pl.meniscus_section, size=(9.0, 4.0), result=res), width="stretch")
        st.image(pl.figure_png(pl.meniscus_section, size=(6.0, 4.0), result=res, zoom=True), width=560)
    elif res is not None and isinstance(getattr(res, "shape", None), dict):
        st.image(pl.figure_png(pl.bending_shape, size=(9.0, 3.8), result=res), width="stretch")
    else:
        st.caption("no cross-section drawing for this kind")
    st.image(pl.figure_png(pl.force_depth, size=(9.0, 4.2), result=res, model=t.model, load=load), width="stretch")


def drawings_panel(design, r, key: str) -> None:
    choice = st.radio("drawing", DRAWINGS, horizontal=True, key="drawing", label_visibility="collapsed")
    if choice == DRAWINGS[0]:
        st.image(figure("plan", key), width=760)
        st.caption("Numbers: the rows of the element table. Near its limit: utilisation at least 90 %.")
    elif choice == DRAWINGS[1]:
        from ..output.text import failure_steps

        st.image(figure("steps", key), width="stretch")
        st.caption("Numbers at the steps: the order in which the elements break through (table below).")
        steps = failure_steps(r)
        g = r.device.liquid.g
        st.dataframe([{"order": s["order"], "element": s["name"], "breaks through at payload [g]":
                       f"{s['payload'] / g * 1e3:.4g}"} for s in steps], hide_index=True, width="stretch",
                     height=min(38 + 35 * max(len(steps), 1), 280))
    elif choice == DRAWINGS[2]:
        element_drawings(design, r)
    else:
        sweep_panel(design, r)


def element_drawings(design, r) -> None:
    from ..output.tables import distinct_tables, solve_table

    tabs = distinct_tables(design)
    i = st.selectbox("element table", range(len(tabs)), format_func=lambda j: tabs[j].title, key="draw_table")
    t = tabs[min(i, len(tabs) - 1)]
    st.text(t.kind.summary)
    with st.spinner(f"solving one {t.kind.label} alone..."):
        try:
            solve_table(t, design.liquid, lambda kind, p, liq: solver.solve_element(kind, p, liq))
        except solver.SolveTimeout:
            st.info("This element takes long to solve alone; it goes on in the background. Rerun in a moment.")
            return
    if t.error:
        st.error(esc(t.error), icon="⚠️")
    if t.result is not None or t.model is not None:
        _element_figures(t, r)


SWEEPS = {"surface tension [mN/m]": ("liquid", "surface_tension", "mN/m", 30.0, 72.0),
          "body mass [g]": ("body", "mass", "g", 0.2, 3.0),
          "payload [g]": ("load", "payload", "g", 0.0, 3.0)}


def sweep_panel(design, r) -> None:
    """Safety factor against one input (each point a full solve, cached), log axis."""
    ss = _ss()
    c1, c2, c3, c4 = st.columns([1.5, 1, 1, 0.8])
    name = c1.selectbox("input to vary", list(SWEEPS), key="sw_in")
    sec, field, unit, lo, hi = SWEEPS[name]
    a = c2.number_input("from", value=lo, key=f"sw_lo_{name}", min_value=0.0)
    b = c3.number_input("to", value=hi, key=f"sw_hi_{name}", min_value=0.0)
    n = int(c4.number_input("points", min_value=3, max_value=30, value=8, key="sw_n"))
    skey = json.dumps([solver.design_key(design.data), name, a, b, n])
    if st.button("run the sweep", key="sw_run"):
        bar = st.progress(0.0, text="sweeping...")
        xs, sfs = [], []
        t0 = time.perf_counter()
        for j in range(n):
            x = a + (b - a) * j / (n - 1)
            data = copy.deepcopy(design.data)
            data.pop("alternatives", None)
            data.setdefault(sec, {})[field] = f"{x:.6g} {unit}"
            try:
                _, rr = solver.solve(data, budget=solver.SWEEP_BUDGET_S)
                xs.append(x)
                sfs.append(rr.safety_factor)
            except (InputError, ConvergenceError) as exc:
                st.error(esc(f"{name} = {x:.4g}: {problem_lines(exc)[0]}"), icon="⚠️")
            except solver.SolveTimeout:
                break
            bar.progress((j + 1) / n, text=f"sweeping... {j + 1} of {n}")
            if time.perf_counter() - t0 > solver.SWEEP_BUDGET_S:
                st.info(f"the sweep stopped after {solver.SWEEP_BUDGET_S:g} s with {len(xs)} points")
                break
        bar.empty()
        ss.sweep = (skey, {"x": xs, "sf": sfs, "label": name, "req": r.required_safety_factor})
    if ss.get("sweep") and ss.sweep[0] == skey and len(ss.sweep[1]["x"]) >= 2:
        st.image(figure("sweep", "", json.dumps(ss.sweep[1])), width="stretch")
    elif ss.get("sweep"):
        st.caption("inputs changed since the last sweep: run it again")


def classroom_panel(design) -> None:
    """Surface-tension slider (clean water 72 mN/m down to soapy 30 mN/m): the verdict redrawn live."""
    sig0 = design.liquid.sigma * 1e3
    v = st.slider("surface tension [mN/m] (72: the clean liquid; soapy water about 30)", min_value=30,
                  max_value=72, value=int(min(max(round(sig0), 30), 72)), step=1, key="class_sigma")
    data = copy.deepcopy(design.data)
    data.pop("alternatives", None)
    liq = data.setdefault("liquid", {})
    if v >= 72:
        liq.pop("surface_tension", None)  # the clean liquid's own value
    else:
        liq["surface_tension"] = f"{v} mN/m"
    try:
        with st.spinner("solving..."):
            _, r = solver.solve(data)
    except (InputError, ConvergenceError) as exc:
        st.error(esc(problem_lines(exc)[0]), icon="⚠️")
        return
    except solver.SolveTimeout:
        st.info("still solving; move the slider again in a moment")
        return
    verdict_box(r)
    g = r.device.liquid.g
    st.text(f"at {v} mN/m: capacity {r.capacity.to('N').magnitude / g * 1e3:.3g} g for a load of "
            f"{r.load.to('N').magnitude / g * 1e3:.3g} g")


def compare_panel(design, r) -> None:
    from .. import plotting as pl
    from ..output.text import comparison_rows, entry_name

    ss = _ss()
    entries = [(entry_name(design, 0), design, r)]
    for j, a in enumerate(design.alternatives, 1):
        try:
            _, ra = solver.solve(a.data)
            entries.append((entry_name(a, j), a, ra))
        except (InputError, ConvergenceError, solver.SolveTimeout) as exc:
            st.error(esc(f"alternative {j}: {exc}"), icon="⚠️")
    for name, data in ss.compare:
        try:
            da, ra = solver.solve(data)
            entries.append((name, da, ra))
        except (InputError, ConvergenceError, solver.SolveTimeout) as exc:
            st.error(esc(f"{name}: {exc}"), icon="⚠️")
    b1, b2 = st.columns(2)
    if b1.button("add the current design to the comparison", key="cmp_add"):
        data = copy.deepcopy(design.data)
        data.pop("alternatives", None)
        ss.compare = [*ss.compare, (f"saved {len(ss.compare) + 1}", data)]
        st.rerun()
    if ss.compare and b2.button("clear the saved designs", key="cmp_clear"):
        ss.compare = []
        st.rerun()
    if len(entries) < 2:
        st.caption("This design has no alternatives. Add the current design, change an input, and compare.")
        return
    head, rows = comparison_rows(entries)
    st.dataframe([dict(zip(head if head[0] else ["", *head[1:]], row)) for row in rows], hide_index=True,
                 width="stretch")
    for name, d, _ in entries:
        st.text(f"{name}: {d.description}")
    st.image(pl.figure_png(pl.comparison_bars, size=(9.0, 1.6 + 0.9 * len(entries)),
                           items=[(n, x) for n, _, x in entries]), width="stretch")


def reports_panel(design, r, key: str) -> None:
    from ..design import design_text
    from ..output import csv as out_csv
    from ..output import pdf
    from ..output.tables import solved_tables
    from ..output.text import entry_name

    ss = _ss()
    c1, c2, c3 = st.columns(3)
    # the TOML text is made once per design (about 20 ms) and handed over as bytes: a lazy
    # callable is fetched by a separate request on click, which timed out on a loaded server
    tkey = (key, ss.get("source_text"))
    if not ss.get("toml") or ss.toml[0] != tkey:
        ss.toml = (tkey, design_text(design).encode("utf-8"))
    c1.download_button("save this design (TOML)", ss.toml[1], file_name="design.toml",
                       mime="application/toml", key="dl_toml", help="schema 2; loads in floatcalc device, "
                       "floatcalc sweep --design and floatcalc.load_design")
    if c2.button("prepare the CSV tables", key="csv_make"):
        with st.spinner("solving each element table alone..."):
            tables = solved_tables(design, lambda kind, p, liq: solver.solve_element(kind, p, liq, None))
            ss.csvzip = (key, out_csv.csv_zip(out_csv.all_tables(r, tables)))
    if ss.get("csvzip") and ss.csvzip[0] == key:
        c2.download_button("download the CSV tables (zip)", ss.csvzip[1], file_name="floatcalc_tables.zip",
                           mime="application/zip", key="dl_csv")
    if c3.button("prepare the PDF report", key="pdf_make"):
        with st.spinner("writing the PDF report..."):
            tables = solved_tables(design, lambda kind, p, liq: solver.solve_element(kind, p, liq, None))
            compared = []
            for j, a in enumerate(design.alternatives, 1):
                compared.append((entry_name(a, j), a, solver.solve(a.data, None)[1]))
            ss.pdf = (key, pdf.pdf_bytes(design, r, tables=tables, compared=compared))
    if ss.get("pdf") and ss.pdf[0] == key:
        c3.download_button("download the PDF report", ss.pdf[1], file_name="floatcalc_report.pdf",
                           mime="application/pdf", key="dl_pdf")


# ------------------------------------------------------------------------------------------
# Sidebar

def _pick_example() -> None:
    """Load the built-in example just chosen, then clear the choice."""
    from ..design import example

    ss = _ss()
    name = ss.get("pick")
    if name:
        d = example(name)
        load_data(d.data, d.source_text, d.notes)
        ss.pick = None


def sidebar() -> None:
    from ..design import list_examples, load_design
    from ..design.read import MAX_BYTES

    ss = _ss()
    with st.sidebar:
        st.header("Designs")
        ex = {e["name"]: e["description"] for e in list_examples()}
        # choosing an example loads it at once (one click), and the box is ready for the next
        st.selectbox("built-in examples (all invented)", list(ex), index=None,
                     placeholder="choose an example to load...", key="pick", on_change=_pick_example,
                     help="loads the example in place of the current design (save the current one first "
                          "if you want to keep it)")
        mb = MAX_BYTES / 1e6
        up = st.file_uploader(f"open a design file (TOML, at most {mb:g} MB)", type=["toml"], key="upload")
        if up is not None and up.file_id != ss.get("upload_id"):
            ss.upload_id = up.file_id
            ss.upload_error = None
            try:
                d = read_upload(up.getvalue(), up.size)
                load_data(d.data, d.source_text, d.notes)
                st.rerun()
            except InputError as exc:
                ss.upload_error = str(exc)
        if ss.get("upload_error") and up is not None:
            st.error(esc(ss.upload_error), icon="⚠️")
        st.divider()
        st.caption("Static estimates on a clean liquid surface. Soap, oils and heat lower the surface tension "
                   "and every force here.")
        del load_design


def read_upload(data: bytes, size: int | None = None):
    """An uploaded design file: at most :data:`floatcalc.design.read.MAX_BYTES`, schema 2 (older
    formats migrated with a note), through :func:`floatcalc.design.load_design`."""
    from ..design import load_design
    from ..design.read import MAX_BYTES
    from ..errors import input_error

    n = len(data) if size is None else size
    if n > MAX_BYTES:
        raise input_error("design file", f"files may be at most {MAX_BYTES // 1000} kB", f"{n} bytes")
    return load_design(text=bytes(data))


# ------------------------------------------------------------------------------------------
# Page

def _guard(title: str, fn, *args) -> None:
    try:
        fn(*args)
    except InputError as exc:
        st.error(esc(str(exc)), icon="⚠️")
    except Exception as exc:  # noqa: BLE001 - the page never shows a traceback
        st.error(esc(f"{title} could not be shown: {type(exc).__name__}: {exc}"), icon="⚠️")


def main() -> None:
    t0 = time.perf_counter()
    st.set_page_config(page_title="floatcalc: load on a liquid surface", page_icon="💧", layout="wide")
    _init()
    ss = _ss()
    sidebar()
    st.title("floatcalc: what can it carry on the surface?")
    data = copy.deepcopy(ss.data)
    if data.get("description"):
        st.text(str(data["description"]))
    for n in ss.get("notes", []):
        st.info(esc(n), icon="ℹ️")
    slots = Slots()
    left, right = st.columns([1.0, 1.15], gap="large")
    with left:
        st.subheader("Liquid")
        liquid_panel(data, slots)
        st.subheader("Body and load")
        body_load_panel(data, slots)
        st.subheader("Support elements")
        elements_panel(data, slots)
    ss.current = data
    design = r = None
    key = None
    problems: list[str] = []
    running = False
    try:
        design = solver.design_of(data, ss.get("source_text"))
        key = "solve:" + solver.design_key(data)
        with right:
            with st.spinner("solving the device..."):
                _, r = solver.solve(data)
    except InputError as exc:
        problems = problem_lines(exc)
    except ConvergenceError as exc:
        problems = [f"the solve did not converge: {exc}"]
    except solver.SolveTimeout:
        running = True
    left_over = slots.show(problems)
    if design is not None:
        table_drawings(design, slots)
    if r is not None:
        ss.good = (key, design, r)
    with right:
        st.subheader("Results")
        for line in left_over:
            st.error(esc(line), icon="⚠️")
        if running:
            st.info(f"Still solving after {solver.SOLVE_BUDGET_S:g} s: the results below are the last ones; "
                    "this solve goes on and appears on the next change or rerun.", icon="⏳")
        good = ss.get("good")
        if good is None:
            st.info("Results appear once every input is valid.")
        else:
            _guard("Results", results_panel, good[1], good[2], r is not None)
            st.subheader("Warnings and cautions")
            _guard("Warnings and cautions", notes_panel, good[2])
    if good is not None:
        gkey, gdesign, gr = good
        st.subheader("Elements at this load")
        _guard("Elements", elements_table_panel, gr)
        st.subheader("Drawings")
        _guard("Drawings", drawings_panel, gdesign, gr, gkey)
        with st.expander("Classroom: soap and surface tension"):
            _guard("Classroom", classroom_panel, gdesign)
        st.subheader("Compare designs")
        _guard("Comparison", compare_panel, gdesign, gr)
    st.subheader("Reports")
    if r is not None:
        _guard("Reports", reports_panel, design, r, key)
    else:
        st.caption("Reports are available once every input is valid.")
    ss.page_ms = 1e3 * (time.perf_counter() - t0)
    st.caption(f"page computed in {ss.page_ms:.0f} ms · floatcalc")


__all__ = ["main", "load_data", "new_table", "read_upload", "SWEEPS", "DRAWINGS"]
