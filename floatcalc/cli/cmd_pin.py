"""``floatcalc pin``: meniscus height and vertical force on a vertical pin or fibre."""

from __future__ import annotations

from ._common import fmt, liquid_from_args
from .cmd_ball import add_common, liquid_row, output

ORDER = 40


def register(sub) -> None:
    p = sub.add_parser("pin", help="meniscus height and vertical force on a vertical pin or fibre")
    p.add_argument("--radius", required=True, help="pin radius, e.g. 0.1mm")
    p.add_argument("--contact-angle", required=True, help="advancing contact angle, e.g. 60deg")
    p.add_argument("--depth", default=None, help="depth of the flat tip below the surface, e.g. 1mm "
                   "(default: tip far below, no tip pressure)")
    p.add_argument("--length", default=None, help="pin length, for its own weight, e.g. 10mm")
    add_common(p)
    p.set_defaults(func=run)


def run(args) -> int:
    from ..round import pin

    liq = liquid_from_args(args)
    r = pin(args.radius, args.contact_angle, depth=args.depth, length=args.length, liquid=liq,
            material_density=args.material_density)
    h = r.meniscus_height.to("mm").magnitude
    rows = [liquid_row(liq),
            ("pin", f"radius {fmt(r.radius, 'mm')}, advancing angle {r.contact_angle.magnitude:.1f}°"
                    + ("" if r.depth is None else f", tip at depth {fmt(r.depth, 'mm')}")),
            ("meniscus height", f"{h:+.4g} mm ({'above' if h >= 0 else 'below'} the undisturbed surface)"),
            ("contact line", r.stage),
            ("vertical force", f"{fmt(r.vertical_force, 'mN')} (upward positive)"),
            ("  surface tension part", fmt(r.surface_tension_part, "mN")),
            ("  pressure on the tip", fmt(r.pressure_part, "mN")),
            ("Wilhelmy pull σ P cos θ", f"{fmt(r.wilhelmy_force, 'mN')} (downward when positive)"),
            ("own weight", fmt(r.own_weight, "mN")),
            ("payload", fmt(r.payload, "mN")),
            ("Bond number", f"{r.bond_number:.3g}  (L = pin radius)")]
    return output(args, r, "Vertical pin: axisymmetric meniscus (contact line on the side or pinned at the tip)", rows)
