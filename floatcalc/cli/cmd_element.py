"""``floatcalc element KIND``: the limit of one element of any kind, options from its schema.

Every kind in the registry (:mod:`floatcalc.elements`) gets a subcommand whose options are
generated from the kind's input schema (``kind.fields``: name, unit, help), validated by the
same code as a design-file element table (key paths become option names), and solved by the
kind's public function. A new kind therefore has its command without any change here. The JSON
has the one element shape (inputs echoed, liquid, force parts, Bond and Baudoin numbers,
contact perimeter).
"""

from __future__ import annotations

from ._common import add_liquid_args, element_json, fmt, liquid_from_args
from ._format import add_json_flag, print_json, print_table

ORDER = 35
#: placement fields that mean nothing for one element alone
_SKIP = ("kind", "name", "position", "mount", "heading", "tilt", "segments", "material", "material_density",
         "coating")


def _opt(name: str) -> str:
    return "--" + name.replace("_", "-")


def register(sub) -> None:
    from ..elements import kinds

    p = sub.add_parser("element", help="limit of one element of any kind (options from its schema)")
    s = p.add_subparsers(dest="kind", metavar="KIND")
    for kind in kinds():
        k = s.add_parser(kind.name, help=kind.summary)
        for name, f in kind.fields.items():
            if name in _SKIP:
                continue
            unit = f" [{f.unit}]" if f.unit else ""
            ex = f", e.g. {f.example.replace(' ', '')}" if f.example else ""
            k.add_argument(_opt(name), dest=name, default=None, required=f.required,
                           help=f"{f.help}{unit}{ex}")
        k.add_argument("--contact-angle", required=True, help="advancing contact angle, e.g. 150deg")
        k.add_argument("--receding-angle", default=None, help="receding contact angle, e.g. 120deg")
        k.add_argument("--texture", default=None, choices=("wenzel", "cassie"), help="texture model of the coating")
        k.add_argument("--roughness", default=None, help="Wenzel roughness r ≥ 1 (with --texture wenzel)")
        k.add_argument("--solid-fraction", default=None, help="Cassie solid fraction 0–1 (with --texture cassie)")
        k.add_argument("--material", default=None, help="material name, e.g. steel (default steel)")
        k.add_argument("--material-density", default=None, help="material density, e.g. 7850kg/m^3")
        add_liquid_args(k)
        add_json_flag(k)
        k.set_defaults(func=run, element_kind=kind.name)
    p.set_defaults(func=_no_kind)


def _no_kind(args) -> int:
    from ..elements import kind_names
    from ..errors import input_error

    raise input_error("element", f"give a kind: {', '.join(kind_names())} (see 'floatcalc element --help')")


def _table(args, kind) -> dict:
    """The element as a design-file table (text values as given)."""
    t: dict = {"kind": kind.name, "position": ["0 mm", "0 mm"]}
    for name, f in kind.fields.items():
        v = getattr(args, name, None)
        if name in _SKIP or v is None:
            continue
        t[name] = int(v) if f.kind == "int" and str(v).strip().lstrip("-").isdigit() else v
    coating = {"advancing": args.contact_angle}
    if args.receding_angle is not None:
        coating["receding"] = args.receding_angle
    if args.texture is not None:
        coating["texture"] = args.texture
    for name, key in (("roughness", "roughness"), ("solid_fraction", "solid_fraction")):
        v = getattr(args, name)
        if v is not None:
            try:
                coating[key] = float(v)
            except ValueError:
                coating[key] = v
    t["coating"] = coating
    if args.material_density is not None:
        t["material_density"] = args.material_density
    else:
        t["material"] = args.material or "steel"
    return t


def _option_path(problem: str, kind) -> str:
    """'cli.radius: ...' → '--radius: ...' (the option a user typed)."""
    head, _, rest = problem.partition(": ")
    key = head.split(".", 1)[-1]
    key = {"coating.advancing": "contact_angle", "coating.receding": "receding_angle"}.get(key, key)
    return f"{_opt(key.split('.')[-1])}: {rest}"


def run(args) -> int:
    from ..design.schema import _element
    from ..elements import get_kind
    from ..errors import InputError

    kind = get_kind(args.element_kind)
    liq = liquid_from_args(args)
    problems: list[str] = []
    p = _element(_table(args, kind), "cli", problems)
    if problems:
        raise InputError(_option_path(problems[0], kind))
    p["position"] = (0.0, 0.0)
    r = kind.solve(p, liq)
    names = [n for n in kind.fields if n not in _SKIP] + ["contact_angle", "receding_angle", "texture",
                                                          "roughness", "solid_fraction", "material",
                                                          "material_density"]
    if args.json:
        d = element_json(r, args, names)
        d["kind"] = kind.name
        print_json(d)
        return 0
    rows = [("liquid", f"{liq.name} at {liq.T - 273.15:.1f} °C, σ = {liq.sigma * 1e3:.2f} mN/m"),
            ("element", f"{kind.label}: " + ", ".join(f"{n} {getattr(args, n)}" for n in names
                                                     if getattr(args, n, None) is not None)),
            ("limit force", fmt(r.max_force, "mN")),
            ("  surface tension part", fmt(r.surface_tension_part, "mN")),
            ("  pressure part", fmt(r.pressure_part, "mN")),
            ("depth at limit", fmt(r.depth_at_max, "mm")),
            ("own weight", fmt(r.own_weight, "mN")),
            ("payload (limit minus own weight)", fmt(r.payload, "mN"))]
    per = getattr(r, "contact_perimeter", None)
    if per is not None:
        rows.append(("contact perimeter", fmt(per, "mm")))
    rows.append(("Bond number", f"{r.bond_number:.3g} (L = {kind.bond_words})"))
    if getattr(r, "baudoin_number", None) is not None:
        rows.append(("Baudoin number", f"{r.baudoin_number:.3g} (own weight / (σ × contact perimeter))"))
    print_table(f"{kind.label.capitalize()}: {getattr(r, 'references', ('',))[0]}", rows, [*r.warnings, *r.cautions])
    return 0
