"""Rows of words and numbers for a design and its device result: the one wording of the page,
the PDF report, the CSV files and ``floatcalc report``.

Front-end module: no physics and no verdict logic. Every number comes from
:func:`floatcalc.device.solve.solve_device` (a :class:`~floatcalc.device.solve.DeviceResult`),
from the design (:mod:`floatcalc.design`) or from the element kinds' own functions
(:mod:`floatcalc.elements`); this module only chooses units and words.

Vocabulary (the README glossary, :mod:`floatcalc.device.assess`): weight, payload, load,
capacity, max payload, sinking payload, safety factor, utilisation, verdict.

>>> from floatcalc.design import example
>>> from floatcalc.device.solve import solve_device
>>> r = solve_device(example("skimmer"))
>>> dict(result_rows(r))["verdict"]
'floats'
"""

from __future__ import annotations

import math
from typing import Any

#: An element at or above this utilisation is shown as "near its limit" (a display threshold,
#: common practice; the verdict does not use it).
NEAR_LIMIT = 0.9
#: The three states an element is drawn in (plan view, element table).
STATES = ("carrying", "near its limit", "broken through")

#: The one vocabulary, as the README glossary words it.
GLOSSARY = {
    "weight": "the device's own weight (body and elements)",
    "payload": "extra load put on the device (an input)",
    "load": "weight + payload",
    "capacity": "the largest load the device carries with every element intact",
    "max payload": "capacity − weight (at the payload position, by default the centre of mass)",
    "sinking payload": "the largest payload before the device sinks, elements breaking through one by one",
    "safety factor": "capacity / load (achieved); the required one is an input",
    "utilisation": "an element's force / its limit force (0–1)",
    "verdict": "floats / floats with elements broken through / capsizes / sinks",
}


def element_state(es) -> str:
    """The drawing state of an :class:`~floatcalc.device.solve.ElementState`.

    >>> from types import SimpleNamespace as S
    >>> element_state(S(broken=False, utilisation=0.95)), element_state(S(broken=True, utilisation=1.0))
    ('near its limit', 'broken through')
    """
    if es.broken:
        return STATES[2]
    return STATES[1] if es.utilisation >= NEAR_LIMIT else STATES[0]


def force_text(q, g: float) -> str:
    """A force as mN with its mass equivalent in g (``"12.3 mN (1.25 g)"``).

    >>> from floatcalc.units import Q_
    >>> force_text(Q_(0.0098, "N"), 9.80665)
    '9.8 mN (0.9993 g)'
    """
    n = q.to("N").magnitude if hasattr(q, "to") else float(q)
    return f"{n * 1e3:.4g} mN ({n / g * 1e3:.4g} g)"


def _mm(v: float) -> str:
    return f"{v * 1e3:.4g} mm"


def liquid_text(liq) -> str:
    """One line on the liquid: name, temperature, σ, ρ, capillary length, sources."""
    sal = f", salinity {liq.salinity:g} g/kg" if getattr(liq, "salinity", None) is not None else ""
    return (f"{liq.name} at {liq.T - 273.15:.1f} °C{sal}: σ = {liq.sigma * 1e3:.2f} mN/m ({liq.sigma_source}), "
            f"ρ = {liq.rho:.1f} kg/m³, capillary length {liq.lc * 1e3:.3f} mm")


def table_title(design, i: int) -> str:
    """``"table 1: 12 long legs 'leg'"``: an element table in words (kind.noun)."""
    from ..elements import get_kind

    g = design.groups[i]
    kind = get_kind(g["kind"])
    name = g.get("name") or ""
    return f"table {i + 1}: {kind.noun(g['count'])}" + (f" '{name}'" if name else "")


def coating_text(coating: dict) -> str:
    """Coating in words with the effective (apparent) advancing angle of its texture model."""
    from ..elements import effective_angle

    adv = coating["advancing"]
    parts = [f"advancing {math.degrees(adv):.4g}°"]
    if coating.get("receding") is not None:
        parts.append(f"receding {math.degrees(coating['receding']):.4g}°")
    tex = coating.get("texture", "none")
    if tex == "wenzel":
        parts.append(f"texture Wenzel, roughness {coating['roughness']:g}")
    elif tex == "cassie":
        parts.append(f"texture Cassie–Baxter, solid fraction {coating['solid_fraction']:g}")
    else:
        parts.append("no texture")
    parts.append(f"effective advancing angle {math.degrees(effective_angle(adv, coating)):.4g}°")
    name = coating.get("name")
    return (f"{name}: " if name else "") + ", ".join(parts)


def input_rows(design) -> list[tuple[str, str]]:
    """(label, value) rows of a design's inputs, with each element table's fields as written."""
    from ..elements import get_kind

    b, ld = design.body, design.load
    rows = [("description", design.description or "(none)"), ("liquid", liquid_text(design.liquid)),
            ("body mass (without elements)", f"{b['mass'] * 1e3:.4g} g"),
            ("body centre of mass", f"({_mm(b['centre_of_mass'][0])}, {_mm(b['centre_of_mass'][1])}), "
                                    f"height {_mm(b.get('centre_of_mass_height', 0.0))}"),
            ("payload", f"{ld['payload'] * 1e3:.4g} g"),
            ("payload position", "the centre of mass" if ld.get("payload_position") is None else
             f"({_mm(ld['payload_position'][0])}, {_mm(ld['payload_position'][1])})"),
            ("required safety factor", f"{ld['safety_factor']:g}")]
    raw = design.data.get("elements", [])
    for i, g in enumerate(design.groups):
        kind = get_kind(g["kind"])
        t = raw[i] if i < len(raw) else {}
        vals = [f"{k} = {_plain(t[k])}" for k in kind.fields if k in t]
        place = (f"{g['count']} laid out '{g['layout']}'" if g.get("layout") else
                 f"at ({_mm(g['position'][0])}, {_mm(g['position'][1])})")
        mat = g.get("material_name") or f"density {g['density']:.5g} kg/m³"
        rows.append((table_title(design, i), f"{kind.summary}; {', '.join(vals)}; {place}; material {mat}"))
        rows.append((f"table {i + 1} coating", coating_text(g["coating"])))
    return rows


_CONTROL_CATEGORIES = ("Cc", "Cf", "Cs", "Co", "Zl", "Zp")


def escape_controls(text: Any) -> str:
    r"""``text`` with control, format (bidi overrides), private-use and line-separator characters
    written as escapes (``\x1b``, ``\u202e``), so a name from a design file cannot act on a
    terminal, reorder a PDF line or start a new one. Printable text is unchanged.

    >>> escape_controls("leg\x1b[2J\u202eevil")
    'leg\\x1b[2J\\u202eevil'
    >>> escape_controls("ball foot 1 (0.5 mm, 150°)")
    'ball foot 1 (0.5 mm, 150°)'
    """
    import unicodedata

    s = str(text)
    if s.isascii() and s.isprintable():
        return s
    return "".join(repr(c)[1:-1] if unicodedata.category(c) in _CONTROL_CATEGORIES else c for c in s)


def _plain(v: Any) -> str:
    if isinstance(v, list):
        return "[" + ", ".join(_plain(x) for x in v) + "]"
    return str(v)


def result_rows(r) -> list[tuple[str, str]]:
    """(label, value) rows of a :class:`~floatcalc.device.solve.DeviceResult`, in the one
    vocabulary. The verdict is ``r.verdict`` as the solve gave it."""
    from ..dimensionless import baudoin_number

    liq = r.device.liquid
    g = liq.g
    rows = [("verdict", r.verdict)]
    if r.below_required_safety_factor:
        rows.append(("below the required safety factor",
                     f"yes: achieved {r.safety_factor:.3g}, required {r.required_safety_factor:g}"))
    rows += [
        ("weight (body + elements)", force_text(r.weight, g)),
        ("payload", force_text(r.applied_payload, g)),
        ("load (weight + payload)", force_text(r.load, g)),
        ("capacity (every element intact)", force_text(r.capacity, g)),
        ("max payload (capacity − weight)", force_text(r.max_payload, g)),
        ("sinking payload (elements breaking through one by one)", force_text(r.sinking_payload, g)),
        ("safety factor (capacity / load)", f"{r.safety_factor:.3g} (required {r.required_safety_factor:g})"),
        ("first to break through", r.first_to_fail),
        ("broken through at this load", ", ".join(r.broken_through) if r.broken_through else "none"),
    ]
    if r.shortfall is not None:
        rows.append(("short by", force_text(r.shortfall, g)))
    rows += [
        ("heave (depth at the origin)", f"{r.heave.to('mm').magnitude:.3g} mm"),
        ("pitch / roll", f"{r.pitch.magnitude:+.2f}° / {r.roll.magnitude:+.2f}° (+: the +x / +y side lower)"),
        ("Baudoin number", f"{r.baudoin_number:.3g}: "
                           f"{baudoin_number(liq, r.load.to('N').magnitude, r.contact_perimeter.to('m').magnitude).reading}"),
    ]
    return rows


def element_rows(r) -> list[dict[str, str]]:
    """One row per placed element: force, limit force, utilisation, state, breakthrough."""
    g = r.device.liquid.g
    out = []
    for e in r.elements:
        bp = e.breakthrough_payload
        out.append({
            "element": e.name, "kind": e.kind,
            "force [mN]": f"{e.force.to('mN').magnitude:.4g}",
            "limit force [mN]": f"{e.limit_force.to('mN').magnitude:.4g}",
            "utilisation [%]": f"{100 * e.utilisation:.1f}",
            "state": element_state(e),
            "breaks through": "—" if e.breakthrough_order is None else f"#{e.breakthrough_order}",
            "at payload [g]": "—" if bp is None else f"{bp.to('N').magnitude / g * 1e3:.4g}",
        })
    return out


def failure_steps(r) -> list[dict[str, Any]]:
    """Progressive failure in order: (order, element, payload [N]) of each element that breaks
    through before the device sinks, from the ElementStates."""
    steps = [dict(order=e.breakthrough_order, name=e.name, kind=e.kind,
                  payload=e.breakthrough_payload.to("N").magnitude)
             for e in r.elements if e.breakthrough_order is not None and e.breakthrough_payload is not None]
    return sorted(steps, key=lambda s: s["order"])


def bond_rows(design) -> list[dict[str, str]]:
    """Bond number of each distinct element table (tables that differ only in placement are
    listed together), its length named by the kind's ``bond_words``, with the reading of
    :func:`floatcalc.dimensionless.bond_reading`."""
    from ..dimensionless import bond_number
    from .tables import distinct_tables

    out = []
    for t in distinct_tables(design):
        kind = t.kind
        grp = bond_number(design.liquid, kind.bond_length(t.params), which=kind.bond_words)
        out.append({"table": t.title, "length": grp.scale, "Bo": f"{grp.value:.3g}", "reading": grp.reading})
    return out


def cautions(r) -> list[str]:
    """The result's cautions (scenario-chosen by the solve), each once."""
    return list(dict.fromkeys(r.cautions))


def references(r, element_results: dict | None = None) -> list[tuple[str, list[str]]]:
    """Each reference once, with the models it supports: the device solve's references and
    those of each element table's own result (``element_results``: table title → result).

    A reference is keyed by its citation (the text before ``": "``); what each mention says it
    supports is listed with it, each once.
    """
    cites: dict[str, list[str]] = {}

    def add(ref: str, what: str):
        cite, _, says = str(ref).partition(": ")
        lst = cites.setdefault(cite, [])
        for item in (says, what):
            if item and item not in lst:
                lst.append(item)

    for ref in r.references:
        add(ref, "device equilibrium and capacity")
    for title, res in (element_results or {}).items():
        for ref in getattr(res, "references", ()):
            add(ref, title.split(": ", 1)[-1])
    out = list(cites.items())
    models = sorted({m.model_name for m in r.device.models if m.model_name})
    if models:
        out.append(("element laws used in the device solve", models))
    return out


# ------------------------------------------------------------------------------------------
# Comparison of a design with its alternatives

def _flat(d: Any, pre: str = "") -> dict[str, str]:
    out: dict[str, str] = {}
    if isinstance(d, dict):
        for k, v in d.items():
            out.update(_flat(v, f"{pre}.{k}" if pre else str(k)))
    elif isinstance(d, list) and d and all(isinstance(x, dict) for x in d):
        for i, v in enumerate(d):
            out.update(_flat(v, f"{pre}[{i}]"))
    else:
        out[pre] = _plain(d)
    return out


def differing_inputs(datas: list[dict]) -> list[tuple[str, list[str]]]:
    """Key paths whose values differ between designs' data, with each design's value ('—' where
    absent); the description is left out (it names the entries).

    >>> differing_inputs([{"body": {"mass": "1 g"}}, {"body": {"mass": "2 g"}}])
    [('body.mass', ['1 g', '2 g'])]
    """
    flats = [_flat({k: v for k, v in d.items() if k not in ("alternatives", "description")}) for d in datas]
    keys = list(dict.fromkeys(k for f in flats for k in f))
    out = []
    for k in keys:
        vals = [f.get(k, "—") for f in flats]
        if len(set(vals)) > 1:
            out.append((k, vals))
    return out


def entry_name(design, i: int) -> str:
    """Name of a compared entry: its description up to the first comma if that is short, else
    'this design' / 'alternative N' (the full descriptions are listed beside the comparison)."""
    d = (design.description or "").removeprefix("Invented example: ")
    head = d.split(",")[0].strip()
    if head and len(head) <= 30:
        return head
    return "this design" if i == 0 else f"alternative {i}"


def comparison_rows(items: list[tuple[str, Any, Any]]) -> tuple[list[str], list[list[str]]]:
    """(header, rows) of named entries side by side: results first, then the differing inputs.

    ``items`` are (name, design, result) triples.
    """
    head = ["", *[n for n, _, _ in items]]
    rows: list[list[str]] = []

    def add(label, fn):
        rows.append([label, *[fn(r) for _, _, r in items]])

    add("verdict", lambda r: r.verdict + (" (below the required safety factor)" if r.below_required_safety_factor else ""))
    add("capacity", lambda r: force_text(r.capacity, r.device.liquid.g))
    add("weight", lambda r: force_text(r.weight, r.device.liquid.g))
    add("max payload", lambda r: force_text(r.max_payload, r.device.liquid.g))
    add("sinking payload", lambda r: force_text(r.sinking_payload, r.device.liquid.g))
    add("safety factor", lambda r: f"{r.safety_factor:.3g} (required {r.required_safety_factor:g})")
    add("first to break through", lambda r: r.first_to_fail)
    add("Baudoin number", lambda r: f"{r.baudoin_number:.3g}")
    for key, vals in differing_inputs([d.data for _, d, _ in items]):
        rows.append([f"input {key}", *vals])
    return head, rows


__all__ = ["NEAR_LIMIT", "STATES", "GLOSSARY", "element_state", "force_text", "liquid_text", "table_title",
           "coating_text", "input_rows", "result_rows", "element_rows", "failure_steps", "bond_rows", "cautions",
           "references", "differing_inputs", "entry_name", "comparison_rows"]
