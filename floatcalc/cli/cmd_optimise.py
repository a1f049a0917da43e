"""``floatcalc optimise``: least support mass (or fewest legs) of rod legs for a payload."""

from __future__ import annotations

from ._common import add_liquid_args, liquid_from_args
from ._format import add_json_flag, print_json, print_table

ORDER = 61


def register(sub) -> None:
    p = sub.add_parser("optimise", help="lightest (or fewest) rod legs that carry a payload with a safety factor",
                       description="Search leg count, radius, length (and row spacing) within bounds for the "
                       "least leg mass (or fewest legs) whose limit force is at least the safety factor times "
                       "the total weight. Static estimate, clean liquid.")
    p.add_argument("--payload", required=True, help="mass carried besides the legs, e.g. 2g")
    p.add_argument("--safety-factor", default="2", help="limit force / total weight required (default 2)")
    p.add_argument("--contact-angle", required=True, help="advancing contact angle of the coating, e.g. 150deg")
    p.add_argument("--radius-range", default="0.05mm:0.5mm", help="bounds on leg radius (default 0.05mm:0.5mm)")
    p.add_argument("--length-range", default="5mm:80mm", help="bounds on each leg's wetted length (default 5mm:80mm)")
    p.add_argument("--count-range", default="1:12", help="bounds on the number of legs (default 1:12)")
    p.add_argument("--spacing-range", default=None,
                   help="bounds on the centre spacing of a level row, e.g. 3mm:15mm (default: legs far apart)")
    p.add_argument("--objective", default="mass", help="mass (least leg mass, default) or count (fewest legs)")
    p.add_argument("--material-density", default=None, help="leg material density (default steel 7850kg/m^3)")
    add_liquid_args(p)
    add_json_flag(p)
    p.set_defaults(func=run)


def run(args) -> int:
    from ..studies.optimise import optimise_rods

    liq = liquid_from_args(args)
    r = optimise_rods(args.payload, safety_factor=_number(args.safety_factor), contact_angle=args.contact_angle,
                      radius=args.radius_range, length=args.length_range, count=args.count_range,
                      spacing=args.spacing_range, objective=args.objective, liquid=liq,
                      material_density=args.material_density)
    if args.json:
        print_json(r.to_dict())
        return 0
    rows = [
        ("objective", "least leg mass (ties: fewest legs)" if r.objective == "mass" else "fewest legs, then least mass"),
        ("legs", f"{r.count} × radius {r.radius.to('mm').magnitude:.4g} mm, length {r.length.to('mm').magnitude:.4g} mm"),
        ("row spacing", "far apart (≥ 4 capillary lengths)" if r.spacing is None else f"{r.spacing.to('mm').magnitude:.4g} mm"),
        ("leg mass", f"{r.support_mass.to('g').magnitude:.4g} g"),
        ("payload", f"{r.payload_mass.to('g').magnitude:.4g} g"),
        ("limit force", f"{r.max_force.to('mN').magnitude:.4g} mN"),
        ("total weight", f"{r.total_load.to('mN').magnitude:.4g} mN"),
        ("safety factor", f"{r.safety_factor:.4g} (required {r.required_safety_factor:g})"),
        ("spare payload", f"{r.spare_payload.to('g').magnitude:.4g} g at the required safety factor"),
        ("binding", ", ".join(r.binding) or "none"),
    ]
    for line in r.explanation:
        rows.append(("why", line))
    feas = [p for p in r.per_count if p["feasible"]]
    if feas:
        rows.append(("per count", "least leg mass for each count that works:"))
        for p in feas[:12]:
            rows.append((f"  {p['count']} legs", f"{p['support_mass_kg'] * 1e3:.4g} g (radius {p['radius_m'] * 1e3:.4g} mm, "
                                                 f"length {p['length_m'] * 1e3:.4g} mm)"))
    print_table("Least-mass rod legs (exact 2D rod law, Vella, Lee & Kim 2006)", rows, [*r.warnings, *r.cautions])
    return 0


def _number(text):
    from ..errors import input_error

    try:
        return float(text)
    except (TypeError, ValueError):
        raise input_error("safety-factor", "must be a number from 1 to 100", repr(text)) from None
