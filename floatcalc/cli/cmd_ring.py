"""``floatcalc ring``: limit load of a ring footpad (closed loop of round wire)."""

from __future__ import annotations

from ._common import liquid_from_args
from .cmd_ball import add_common, limit_rows, liquid_row, output

ORDER = 43


def register(sub) -> None:
    p = sub.add_parser("ring", help="limit load of a ring footpad (closed loop of wire lying in the surface)")
    p.add_argument("--ring-radius", required=True, help="radius of the wire's centre line, e.g. 5mm")
    p.add_argument("--wire-radius", required=True, help="wire radius, e.g. 0.2mm")
    p.add_argument("--contact-angle", required=True, help="advancing contact angle, e.g. 150deg")
    add_common(p)
    p.set_defaults(func=run)


def run(args) -> int:
    from ..round import ring

    liq = liquid_from_args(args)
    r = ring(args.ring_radius, args.wire_radius, args.contact_angle, liquid=liq,
             material_density=args.material_density)
    d = r.details
    rows = [liquid_row(liq),
            ("ring", f"centre-line radius {r.profile['ring_radius_m'] * 1e3:.4g} mm, wire radius "
                     f"{r.profile['wire_radius_m'] * 1e3:.4g} mm, advancing angle {r.contact_angle.magnitude:.1f}°"),
            *limit_rows(r, [
                ("contact positions at limit", f"outer {d['contact_position_outer_deg']:.1f}°, "
                                               f"inner {d['contact_position_inner_deg']:.1f}° from the bottom"),
                ("enclosed depressed liquid", f"{d['enclosed_liquid_force_N'] * 1e3:.4g} mN (weight carried by the inner line)"),
                ("limit per wire length", f"{d['max_force_per_length_N_per_m'] * 1e3:.4g} mN/m"),
            ])]
    rows[-2] = ("Bond number", f"{r.bond_number:.3g}  (L = ring wire radius)")
    return output(args, r, "Ring footpad: outer and enclosed axisymmetric menisci", rows)
