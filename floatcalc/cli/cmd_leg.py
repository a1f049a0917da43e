"""``floatcalc leg``: limit load of long horizontal legs (rods)."""

from __future__ import annotations

from ..groups import bond_number
from ..rod import rod
from ._common import add_liquid_args, fmt, liquid_from_args
from ._format import add_json_flag, print_json, print_table


ORDER = 30


def register(sub) -> None:
    p = sub.add_parser("leg", help="limit load of long horizontal legs (rods) lying in the surface")
    p.add_argument("--radius", required=True, help="leg radius, e.g. 0.15mm")
    p.add_argument("--length", required=True, help="wetted length of each leg, e.g. 40mm")
    p.add_argument("--contact-angle", required=True, help="advancing contact angle, e.g. 150deg")
    p.add_argument("--receding-angle", default=None, help="receding contact angle, e.g. 120deg")
    p.add_argument("--material-density", default=None, help="leg material density (default steel 7850kg/m^3)")
    p.add_argument("--count", default="1", help="number of identical legs (default 1)")
    add_liquid_args(p)
    add_json_flag(p)
    p.set_defaults(func=run)


def run(args) -> int:
    liq = liquid_from_args(args)
    r = rod(args.radius, args.length, args.contact_angle, receding_angle=args.receding_angle,
            liquid=liq, material_density=args.material_density, count=args.count)
    if args.json:
        print_json(r.to_dict())
        return 0
    bo = bond_number(liq, r.radius, "leg radius")
    rows = [
        ("liquid", f"{liq.name} at {liq.T - 273.15:.1f} °C, σ = {liq.sigma * 1e3:.2f} mN/m, l_c = {liq.lc * 1e3:.3f} mm"),
        ("legs", f"{r.count} × radius {fmt(r.radius, 'mm')}, length {fmt(r.length, 'mm')}, "
                 f"advancing angle {r.contact_angle.magnitude:.1f}°"),
        ("limit force", f"{fmt(r.max_force, 'mN')}  ({fmt(r.max_force_per_length, 'mN/m')} per unit length)"),
        ("  surface tension part", fmt(r.surface_tension_part, "mN")),
        ("  pressure part", fmt(r.pressure_part, "mN")),
        ("depth at limit", f"{fmt(r.depth_at_max, 'mm')} (lowest point below the undisturbed surface)"),
        ("meniscus angle at limit", f"{r.inclination_at_max.magnitude:.1f}° (contact at {r.contact_position_at_max.magnitude:.1f}° from the bottom)"),
        ("own weight", fmt(r.own_weight, "mN")),
        ("payload", f"{fmt(r.payload, 'mN')} = {fmt(r.payload_mass, 'g')}"),
    ]
    if r.receding_max_force is not None:
        rows.append(("limit with receded line", fmt(r.receding_max_force, "mN")))
        rows.append(("pull-off force (lifting)", fmt(r.pull_off_force, "mN")))
    rows.append(("Bond number", f"{r.bond_number:.3g}  ({bo.reading}; L = leg radius)"))
    rows.append(("Baudoin number", f"{r.baudoin_number:.3g}  (own weight / (σ × 2L × count))"))
    print_table("Long horizontal legs: exact 2D meniscus (Vella, Lee & Kim 2006)", rows,
                [*r.warnings, *r.cautions])
    return 0
