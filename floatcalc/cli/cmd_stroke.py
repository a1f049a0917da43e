"""``floatcalc stroke``: a rowing stroke against the meniscus (thrust, extra vertical force)."""

from __future__ import annotations

from ._format import add_json_flag, print_json, print_table

ORDER = 56


def add_texture_args(p) -> None:
    g = p.add_argument_group("textured coating (all elements)")
    g.add_argument("--texture", default=None, choices=("posts", "grooves"),
                   help="texture of the coating: square posts or parallel grooves")
    g.add_argument("--post-size", default=None, help="post side or ridge width, e.g. 10um")
    g.add_argument("--pitch", default=None, help="centre-to-centre spacing, e.g. 40um")
    g.add_argument("--post-height", default=None, help="post height or groove depth, e.g. 30um")


def register(sub) -> None:
    p = sub.add_parser("stroke", help="rowing stroke: does a demanded thrust break through, largest thrust")
    p.add_argument("file", nargs="?", default=None, help="design file (TOML, see README 'Design files')")
    p.add_argument("--example", default=None, help="a built-in example design instead of a file")
    p.add_argument("--stroke-time", required=True, help="duration of the stroke, e.g. 50ms")
    p.add_argument("--thrust", required=True, help="horizontal force of all legs together, e.g. 2mN")
    p.add_argument("--extra-vertical", default="0 N", help="extra downward leg force during the stroke, e.g. 1mN")
    p.add_argument("--leg-speed", default=None,
                   help="leg speed through the liquid, e.g. 0.3m/s (default: estimated from the impulse)")
    add_texture_args(p)
    add_json_flag(p)
    p.set_defaults(func=run)


def run(args) -> int:
    from ..motion.coating import texture_from_args
    from ..motion.stroke import stroke
    from .cmd_jump import _design

    tex = texture_from_args(args.texture, args.post_size, args.pitch, args.post_height)
    r = stroke(_design(args), args.stroke_time, args.thrust, extra_vertical=args.extra_vertical,
               leg_speed=args.leg_speed, texture=tex)
    if args.json:
        print_json(r.to_dict())
        return 0
    d = r.to_dict()
    rows = [
        ("stroke", f"{d['stroke_time_s'] * 1e3:.4g} ms, thrust {d['thrust_N'] * 1e3:.4g} mN, vertical "
                   f"{d['vertical_force_N'] * 1e3:.4g} mN (weight + extra)"),
        ("breaks through the surface", f"YES ({r.breaks_by})" if r.breaks_surface else "no"),
        ("largest thrust at this vertical load", f"{d['max_thrust_N'] * 1e3:.4g} mN"),
        ("largest extra vertical force", f"{d['max_extra_vertical_N'] * 1e3:.4g} mN"),
        ("limit force / σ × contact line", f"{d['limit_force_N'] * 1e3:.4g} mN / {d['contact_line_force_N'] * 1e3:.4g} mN"),
        ("speed gained per stroke (no drag)", f"{d['speed_gain_m_per_s']:.3g} m/s"),
        ("leg speed", f"{d['leg_speed_m_per_s']:.3g} m/s ({r.leg_speed_source})"),
        ("Weber number ρU²R/σ", f"{r.weber_number:.3g}"),
        ("minimum wave speed c_min", f"{d['min_wave_speed_m_per_s']:.3f} m/s ({r.wave_caveat})"),
    ]
    for name, c in zip(r.coating_elements, r.coating):
        rows.append((f"coating, {name}", f"{c.state} ({c.pressure.to('Pa').magnitude:.4g} Pa against "
                                         f"{c.critical_pressure.to('Pa').magnitude:.4g} Pa)"))
    print_table("Rowing stroke against the meniscus (quasi-static)", rows, [*r.warnings, *r.cautions])
    return 0
