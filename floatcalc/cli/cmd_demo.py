"""``floatcalc demo``: the main job on a built-in, invented example."""

from __future__ import annotations

from ..liquids import water
from ..rod import rod
from ._common import fmt
from ._format import add_json_flag, print_json, print_table

#: Invented example: a six-legged pond skimmer toy with PTFE-coated steel wire legs.
DEMO = {
    "title": "Invented example: a 0.9 g six-legged pond-skimmer toy on tap water at 20 °C",
    "body_mass_kg": 0.9e-3,
    "radius": "0.2 mm", "length": "30 mm", "contact_angle": "115 deg", "receding_angle": "95 deg",
    "count": 6, "material_density": "7850 kg/m^3",
}


ORDER = 10


def register(sub) -> None:
    p = sub.add_parser("demo", help="run the main calculation on a built-in invented example")
    add_json_flag(p)
    p.set_defaults(func=run)


def run(args) -> int:
    liq = water("20 degC")
    d = DEMO
    r = rod(d["radius"], d["length"], d["contact_angle"], receding_angle=d["receding_angle"],
            liquid=liq, material_density=d["material_density"], count=d["count"])
    body = d["body_mass_kg"] * liq.g
    margin = (r.payload.to("N").magnitude - body)
    verdict = "floats" if margin > 0 else "sinks"
    if args.json:
        out = {"example": d["title"], "invented": True, "body_weight_N": body,
               "margin_N": margin, "verdict": verdict, **r.to_dict()}
        print_json(out)
        return 0
    rows = [
        ("legs", f"{r.count} × PTFE-coated steel wire, radius {fmt(r.radius, 'mm')}, length {fmt(r.length, 'mm')}"),
        ("coating", f"advancing {r.contact_angle.magnitude:.0f}°, receding {r.receding_angle.magnitude:.0f}°"),
        ("limit force, all legs", fmt(r.max_force, "mN")),
        ("legs' own weight", fmt(r.own_weight, "mN")),
        ("body weight", f"{body * 1e3:.4g} mN"),
        ("margin", f"{margin * 1e3:.4g} mN ({verdict}; safety factor {r.payload.to('N').magnitude / body:.2f})"),
        ("depth at limit", fmt(r.depth_at_max, "mm")),
    ]
    print_table(d["title"], rows, [*r.warnings, *r.cautions])
    return 0
