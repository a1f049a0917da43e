"""``floatcalc ball``: limit load of a ball foot (sphere) in the surface.

Also holds the output helpers shared by the round-element commands (pin, ball, pad, ring).
"""

from __future__ import annotations

from ._common import add_liquid_args, fmt, liquid_from_args
from ._format import add_json_flag, print_json, print_table

ORDER = 41


def add_common(p) -> None:
    """Options every round-element command shares: material, liquid, output."""
    p.add_argument("--material-density", default=None, help="material density (default steel 7850kg/m^3)")
    p.add_argument("--curve", action="store_true", help="also print the force-depth curve")
    add_liquid_args(p)
    add_json_flag(p)


def liquid_row(liq):
    return ("liquid", f"{liq.name} at {liq.T - 273.15:.1f} °C, σ = {liq.sigma * 1e3:.2f} mN/m, "
                      f"l_c = {liq.lc * 1e3:.3f} mm")


def curve_dict(curve) -> dict:
    d = {"depth_m": curve.depth.to("m").magnitude.tolist(), "force_N": curve.force.to("N").magnitude.tolist(),
         "surface_tension_N": curve.surface_tension.to("N").magnitude.tolist(),
         "pressure_N": curve.pressure.to("N").magnitude.tolist()}
    if curve.stage:
        d["stage"] = list(curve.stage)
    return d


def print_curve(curve, every: int = 1) -> None:
    print()
    print("  force-depth curve (depth of the lowest point, upward force)")
    stage = curve.stage or ("",) * len(curve.depth)
    for k in range(0, len(curve.depth), every):
        print(f"    {curve.depth[k].to('mm').magnitude:10.5f} mm  {curve.force[k].to('mN').magnitude:12.6g} mN  {stage[k]}")


#: Element inputs echoed in the JSON of every round-element command.
INPUTS = ("radius", "thickness", "ring_radius", "wire_radius", "length", "depth", "contact_angle",
          "receding_angle", "material_density")


def output(args, r, title: str, rows) -> int:
    if args.json:
        from ._common import element_json

        d = element_json(r, args, INPUTS)
        if args.curve:
            d["curve"] = curve_dict(r.curve)
        print_json(d)
        return 0
    print_table(title, rows, [*r.warnings, *r.cautions])
    if args.curve:
        print_curve(r.curve, max(1, len(r.curve.depth) // 40))
    return 0


def limit_rows(r, extra=()):
    """Rows shared by ball, pad and ring."""
    rows = [
        ("limit force", fmt(r.max_force, "mN")),
        ("  surface tension part", fmt(r.surface_tension_part, "mN")),
        ("  pressure part", fmt(r.pressure_part, "mN")),
        ("depth at limit", f"{fmt(r.depth_at_max, 'mm')} (lowest point below the undisturbed surface)"),
        ("meniscus angle at limit", f"{r.inclination_at_max.magnitude:.1f}°"),
        *extra,
        ("own weight", fmt(r.own_weight, "mN")),
        ("payload", f"{fmt(r.payload, 'mN')} = {fmt(r.payload_mass, 'g')}"),
        ("contact perimeter", fmt(r.contact_perimeter, "mm") if getattr(r, "contact_perimeter", None) is not None
         else "-"),
        ("Bond number", f"{r.bond_number:.3g}"),
        ("Baudoin number", f"{r.baudoin_number:.3g}  (own weight / (σ × contact perimeter))"),
    ]
    return rows


def register(sub) -> None:
    p = sub.add_parser("ball", help="limit load of a ball foot (sphere) resting in the surface")
    p.add_argument("--radius", required=True, help="ball radius, e.g. 0.5mm")
    p.add_argument("--contact-angle", required=True, help="advancing contact angle, e.g. 150deg")
    add_common(p)
    p.set_defaults(func=run)


def run(args) -> int:
    from ..round import ball

    liq = liquid_from_args(args)
    r = ball(args.radius, args.contact_angle, liquid=liq, material_density=args.material_density)
    rows = [liquid_row(liq),
            ("ball", f"radius {r.profile['radius_m'] * 1e3:.4g} mm, advancing angle {r.contact_angle.magnitude:.1f}°"),
            *limit_rows(r, [("contact position at limit",
                             f"{r.details['contact_position_at_max_deg']:.1f}° from the bottom, "
                             f"contact radius {fmt(r.contact_radius_at_max, 'mm')}")])]
    rows[-2] = ("Bond number", f"{r.bond_number:.3g}  (L = ball radius)")
    return output(args, r, "Ball foot: axisymmetric meniscus, limit over the contact position", rows)
