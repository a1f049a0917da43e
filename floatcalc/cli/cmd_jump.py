"""``floatcalc jump``: take-off of a device pushing off the surface, against the meniscus limit."""

from __future__ import annotations

from ._format import add_json_flag, print_json, print_table

ORDER = 55


def register(sub) -> None:
    p = sub.add_parser("jump", help="jump off the surface: largest take-off speed in a push time, does a push "
                       "break through")
    p.add_argument("file", nargs="?", default=None, help="design file (TOML, see README 'Design files')")
    p.add_argument("--example", default=None,
                   help="a built-in example design instead of a file (device examples, or 'strider': an invented "
                        "10 mg strider-like walker)")
    p.add_argument("--push-time", required=True, help="duration of the push, e.g. 20ms")
    g = p.add_mutually_exclusive_group()
    g.add_argument("--takeoff-speed", default=None, help="demanded take-off speed, e.g. 0.5m/s")
    g.add_argument("--push-force", default=None,
                   help="demanded push force between body and legs (peak of the profile), e.g. 30mN")
    p.add_argument("--profile", default="constant", choices=("constant", "half-sine"),
                   help="time course of the push (default constant)")
    from .cmd_stroke import add_texture_args

    add_texture_args(p)
    add_json_flag(p)
    p.set_defaults(func=run)


def _design(args):
    """The design of a file, a device example, or an invented motion example (data/motion_*.toml)."""
    from pathlib import Path

    from ..device import example, list_examples, load_design
    from ..errors import input_error

    if (args.file is None) == (args.example is None):
        raise input_error("design", "give a design file or --example NAME (see 'floatcalc device --list-examples')",
                          "both" if args.file else "neither")
    if args.file:
        return load_design(args.file)
    motion = Path(__file__).resolve().parent.parent / "data" / f"motion_{args.example}.toml"
    if args.example not in [e["name"] for e in list_examples()] and args.example.isidentifier() and motion.is_file():
        return load_design(motion)
    return example(args.example)


def run(args) -> int:
    from ..motion.coating import texture_from_args
    from ..motion.jump import jump

    tex = texture_from_args(args.texture, args.post_size, args.pitch, args.post_height)
    r = jump(_design(args), args.push_time, takeoff_speed=args.takeoff_speed, push_force=args.push_force,
             profile=args.profile, texture=tex)
    if args.json:
        print_json(r.to_dict())
        return 0
    d = r.to_dict()

    def mN(k):
        return f"{d[k] * 1e3:.4g} mN"

    rows = [
        ("push", f"{r.profile}, {d['push_time_s'] * 1e3:.4g} ms"),
        ("weight (body + legs)", mN("weight_N")),
        ("limit force of the surface", f"{mN('limit_force_N')} ('{r.first_to_fail}' gives way first)"),
        ("largest take-off speed", f"{d['max_takeoff_speed_m_per_s']:.4g} m/s "
                                   f"(jump height {d['max_jump_height_m'] * 1e3:.4g} mm)"),
        ("peak liquid force of this push", mN("peak_force_N")),
        ("breaks through the surface", "YES" if r.breaks_surface else "no"),
    ]
    if d["takeoff_speed_m_per_s"] is not None:
        rows.append(("take-off speed of this push", f"{d['takeoff_speed_m_per_s']:.4g} m/s "
                                                    f"(jump height {d['jump_height_m'] * 1e3:.4g} mm)"))
        rows.append(("leg extension needed during the push", f"{d['leg_stroke_m'] * 1e3:.4g} mm"))
    rows.append(("capillary time √(l_c/g)", f"{d['capillary_time_s'] * 1e3:.3g} ms"))
    for name, c in zip(r.coating_elements, r.coating):
        rows.append((f"coating, {name}", f"{c.state} ({c.pressure.to('Pa').magnitude:.4g} Pa against "
                                         f"{c.critical_pressure.to('Pa').magnitude:.4g} Pa)"))
    if r.floods_on_landing is not None:
        rows.append(("coating floods on landing", "YES" if r.floods_on_landing else "no"))
    print_table("Jump off the surface (quasi-static meniscus)", rows, [*r.warnings, *r.cautions])
    return 0
