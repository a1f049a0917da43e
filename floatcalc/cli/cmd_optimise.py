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
    p.add_argument("--contact-angle", default=None, help="advancing contact angle of the coating, e.g. 150deg (rod legs)")
    p.add_argument("--radius-range", default="0.05mm:0.5mm", help="bounds on leg radius (default 0.05mm:0.5mm)")
    p.add_argument("--length-range", default="5mm:80mm", help="bounds on each leg's wetted length (default 5mm:80mm)")
    p.add_argument("--count-range", default="1:12", help="bounds on the number of legs (default 1:12)")
    p.add_argument("--spacing-range", default=None,
                   help="bounds on the centre spacing of a level row, e.g. 3mm:15mm (default: legs far apart)")
    p.add_argument("--objective", default="mass", help="mass (least leg mass, default) or count (fewest legs)")
    p.add_argument("--material-density", default=None, help="leg material density (default steel 7850kg/m^3)")
    g = p.add_argument_group("whole device: least common scale of its elements instead")
    g.add_argument("--design", default=None, help="device design file (TOML)")
    g.add_argument("--example", default=None, help="built-in invented device, e.g. skimmer")
    g.add_argument("--scale", default="length", help="scale every element's length (default) or radius")
    g.add_argument("--factor-range", default="0.25:4", help="bounds on the scale factor (default 0.25:4)")
    add_liquid_args(p)
    add_json_flag(p)
    p.set_defaults(func=run)


def run(args) -> int:
    from ..errors import input_error
    from ..studies.optimise import optimise_rods

    if args.design is not None or args.example is not None:
        return _run_device(args)
    if args.contact_angle is None:
        raise input_error("contact-angle", "is required for rod legs (or give --design/--example)", "nothing")
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


def _run_device(args) -> int:
    from ..errors import input_error
    from ..studies.optimise import optimise_device_scale

    if args.design is not None and args.example is not None:
        raise input_error("design", "give either --design or --example, not both", repr(args.design))
    if args.scale not in ("length", "radius"):
        raise input_error("scale", "must be length or radius", repr(args.scale))
    parts = str(args.factor_range).split(":")
    try:
        bounds = tuple(float(x) for x in parts)
    except ValueError:
        bounds = ()
    if len(bounds) != 2:
        raise input_error("factor-range", "must be LOW:HIGH, e.g. 0.25:4", repr(args.factor_range))
    design = args.design
    if args.example is not None:
        from ..device.design import list_examples

        names = [e["name"] for e in list_examples()]
        if args.example not in names:
            raise input_error("example", f"must be one of {', '.join(names)}", repr(args.example))
        design = args.example
    r = optimise_device_scale(design, args.payload, safety_factor=_number(args.safety_factor),
                              input=f"{args.scale}_factor", bounds=bounds)
    if args.json:
        print_json(r.to_dict())
        return 0
    rows = [(f"{args.scale} factor", f"{r.factor:.5g} (every element's {args.scale} × this)"),
            ("payload", f"{r.payload_mass.to('g').magnitude:.4g} g"),
            ("largest payload", f"{r.max_payload_mass.to('g').magnitude:.4g} g"),
            ("safety factor", f"{r.safety_factor:.4g} (required {r.required_safety_factor:g})"),
            ("binding", ", ".join(r.binding) or "none")]
    rows += [("why", e) for e in r.explanation]
    print_table("Least element scale for a device (floatcalc.device equilibrium)", rows, [*r.warnings, *r.cautions])
    return 0
