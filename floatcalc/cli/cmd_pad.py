"""``floatcalc pad``: limit load of a flat circular pad with sharp edges."""

from __future__ import annotations

from ._common import liquid_from_args
from .cmd_ball import add_common, limit_rows, liquid_row, output

ORDER = 42


def register(sub) -> None:
    p = sub.add_parser("pad", help="limit load of a flat circular pad (disc) with sharp edges")
    p.add_argument("--radius", required=True, help="pad radius, e.g. 2mm")
    p.add_argument("--thickness", required=True, help="pad thickness, e.g. 0.2mm")
    p.add_argument("--contact-angle", required=True, help="advancing contact angle, e.g. 110deg")
    add_common(p)
    p.set_defaults(func=run)


def run(args) -> int:
    from ..round import pad

    liq = liquid_from_args(args)
    r = pad(args.radius, args.thickness, args.contact_angle, liquid=liq, material_density=args.material_density)
    stages = [(f"  {name}", f"depth {lo * 1e3:.4g} to {hi * 1e3:.4g} mm")
              for name, (lo, hi) in r.details["stage_depth_ranges_m"].items()]
    rows = [liquid_row(liq),
            ("pad", f"radius {r.profile['radius_m'] * 1e3:.4g} mm, thickness {r.profile['thickness_m'] * 1e3:.4g} mm, "
                    f"advancing angle {r.contact_angle.magnitude:.1f}°"),
            ("stages (contact line)", ""), *stages,
            *limit_rows(r, [("stage at limit", r.stage_at_max)])]
    rows[-2] = ("Bond number", f"{r.bond_number:.3g}  (L = pad radius)")
    return output(args, r, "Flat pad: axisymmetric meniscus with edge pinning (Gibbs' inequality)", rows)
