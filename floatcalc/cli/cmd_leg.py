"""``floatcalc leg``: limit load of long horizontal legs (rods)."""

from __future__ import annotations

from ..dimensionless import bond_number
from ..rods import rod
from ._common import add_liquid_args, element_json, fmt, liquid_from_args, refuse_unless
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
    p.add_argument("--spacing", default=None,
                   help="centre spacing of --count parallel legs sharing their menisci, e.g. 3mm (exact 2D)")
    f = p.add_argument_group("flexible leg (given E or a material: the leg bends under its load)")
    f.add_argument("--youngs-modulus", default=None, help="Young's modulus of the wire, e.g. 200GPa")
    f.add_argument("--material", default=None, help="leg material, e.g. steel, tungsten, nitinol, nylon")
    f.add_argument("--clamp-angle", default=None, help="slope at the clamp below horizontal, -45..45deg (default 0)")
    f.add_argument("--toe-angle", default=None, help="upturned toe over the last 10%% of the leg, e.g. 20deg")
    add_liquid_args(p)
    add_json_flag(p)
    p.set_defaults(func=run)


INPUTS = ("radius", "length", "contact_angle", "receding_angle", "material_density", "count", "spacing",
          "youngs_modulus", "material", "clamp_angle", "toe_angle")


def run(args) -> int:
    liq = liquid_from_args(args)
    flexible = args.youngs_modulus is not None or args.material is not None
    for opt, val in (("--clamp-angle", args.clamp_angle), ("--toe-angle", args.toe_angle)):
        refuse_unless(val, flexible, opt, "to a flexible leg: give --material or --youngs-modulus")
    if args.spacing is not None and str(args.count).strip() in ("1", "1.0"):
        refuse_unless(args.spacing, False, "--spacing", "with --count of 2 or more (parallel legs)")
    if flexible:
        return _run_flexible(args, liq)  # refuses --spacing (flexible legs are modelled far apart)
    if args.spacing is not None:
        return _run_parallel(args, liq)
    r = rod(args.radius, args.length, args.contact_angle, receding_angle=args.receding_angle,
            liquid=liq, material_density=args.material_density, count=args.count)
    if args.json:
        print_json(element_json(r, args, INPUTS))
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
    rows.append(("Baudoin number", f"{r.baudoin_number:.3g}  (own weight / (σ × contact perimeter "
                                   f"{fmt(r.contact_perimeter, 'mm')}))"))
    print_table("Long horizontal legs: exact 2D meniscus (Vella, Lee & Kim 2006)", rows,
                [*r.warnings, *r.cautions])
    return 0


def _run_flexible(args, liq) -> int:
    """Flexible-leg model (floatcalc.flexleg); same JSON keys as the rigid leg plus the shape's."""
    from ..errors import input_error
    from ..flexleg import flexible_leg

    if getattr(args, "spacing", None) is not None:
        raise input_error("spacing", "is not supported with the flexible-leg model (legs far apart)", args.spacing)
    r = flexible_leg(args.radius, args.length, args.contact_angle, youngs_modulus=args.youngs_modulus,
                     material=args.material, clamp_angle=args.clamp_angle or "0 deg", toe_angle=args.toe_angle,
                     material_density=args.material_density, liquid=liq, count=args.count,
                     receding_angle=args.receding_angle)
    notes = list(r.warnings)
    if args.json:
        d = element_json(r, args, INPUTS)
        d["warnings"] = notes
        print_json(d)
        return 0
    sat = "not found" if r.saturation_length is None else (
        f"{fmt(r.saturation_length, 'mm')} = {r.saturation_to_winkler:.3g} Winkler lengths "
        f"(first reaches 95 % of the best payload over 0.2–12 Winkler lengths)")
    rows = [
        ("liquid", f"{liq.name} at {liq.T - 273.15:.1f} °C, σ = {liq.sigma * 1e3:.2f} mN/m, l_c = {liq.lc * 1e3:.3f} mm"),
        ("legs", f"{r.count} × radius {fmt(r.radius, 'mm')}, length {fmt(r.length, 'mm')}, "
                 f"advancing angle {r.contact_angle.magnitude:.1f}°"),
        ("material", f"{r.material}: E = {fmt(r.youngs_modulus, 'GPa')}, density {r.material_density.magnitude:.5g} kg/m³"),
        ("clamp", f"{r.clamp_angle.magnitude:.3g}° below horizontal; toe {r.toe_angle.magnitude:.3g}°"),
        ("limit force (liquid)", f"{fmt(r.max_force, 'mN')}  ({fmt(r.max_force_per_length, 'mN/m')} per unit length)"),
        ("  same leg if rigid", f"{fmt(r.rigid_max_force, 'mN')}"),
        ("own weight", fmt(r.own_weight, "mN")),
        ("payload (support at clamp)", f"{fmt(r.payload, 'mN')} = {fmt(r.payload_mass, 'g')}; "
                                       f"{r.flexible_to_rigid:.3g} × rigid payload {fmt(r.rigid_payload, 'mN')}"),
        ("clamp depth at limit", f"{fmt(r.clamp_depth_at_max, 'mm')}; deepest point at {fmt(r.depth_at_max, 'mm')}"),
        ("tip depth at limit", fmt(r.tip_depth, "mm")),
        ("limit set by", f"{r.limit_criterion}"),
        ("lifted wetted length", fmt(r.lifted_length, "mm")),
        ("wetted length", fmt(r.wetted_length, "mm")),
        ("largest slope / bending strain", f"{r.max_slope.magnitude:.3g}° / {r.max_bending_strain * 100:.3g} %"),
        ("elasto-capillary length", f"{fmt(r.elastocapillary_length, 'mm')}  ((EI/σ)^(1/3))"),
        ("Winkler length", f"{fmt(r.winkler_length, 'mm')}  ((4EI/k)^(1/4), k = {fmt(r.foundation_stiffness, 'N/m**2')})"),
        ("saturation length", sat),
    ]
    print_table("Flexible wire legs: elastica on the 2D rod law (Vella, Lee & Kim 2006; Hetényi 1946)", rows,
                [*notes, *r.cautions])
    return 0


def _run_parallel(args, liq) -> int:
    """N parallel legs at a centre spacing: exact 2D shared menisci (floatcalc.device.parallel)."""
    from ..device.parallel import parallel_rods

    r = parallel_rods(args.radius, args.length, args.contact_angle, args.count, args.spacing,
                      liquid=liq, material_density=args.material_density)
    if args.json:
        print_json(element_json(r, args, INPUTS))
        return 0
    rows = [
        ("liquid", f"{liq.name} at {liq.T - 273.15:.1f} °C, σ = {liq.sigma * 1e3:.2f} mN/m, l_c = {liq.lc * 1e3:.3f} mm"),
        ("legs", f"{r.count} parallel × radius {fmt(r.radius, 'mm')}, length {fmt(r.length, 'mm')}, "
                 f"spacing {fmt(r.spacing, 'mm')}, advancing angle {r.contact_angle.magnitude:.1f}°"),
        ("limit force, all legs", fmt(r.max_force, "mN")),
        ("limit per leg", f"{fmt(r.per_leg_max_force, 'mN')} (isolated leg: {fmt(r.isolated_per_leg_max_force, 'mN')})"),
        ("depth at limit", fmt(r.depth_at_max, "mm")),
        ("own weight", fmt(r.own_weight, "mN")),
        ("payload", f"{fmt(r.payload, 'mN')} = {fmt(r.payload_mass, 'g')}"),
    ]
    print_table("Parallel legs sharing menisci: exact 2D (turning-point first integral)", rows,
                [*r.warnings, *r.cautions])
    return 0
