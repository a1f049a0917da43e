"""``floatcalc fit``: effective advancing contact angle of a leg from measured force–depth data."""

from __future__ import annotations

from ._common import add_liquid_args, liquid_from_args
from ._format import add_json_flag, print_json, print_table

ORDER = 63


def register(sub) -> None:
    p = sub.add_parser("fit", help="fit the effective contact angle of a leg, ball or pad from a force-depth CSV",
                       description="Fit the advancing contact angle (optionally also the surface tension) of a "
                       "long rod, a ball foot or a flat pad from force against depth of its lowest point. The CSV needs a header naming "
                       "units, e.g. 'depth [mm],force [mN]'; lines starting with # are comments. Bad rows are "
                       "reported by line number.")
    p.add_argument("--data", default=None, help="CSV file with columns 'depth [unit]' and 'force [unit]'")
    p.add_argument("--demo", action="store_true", help="fit the shipped invented data set with its invented rig")
    p.add_argument("--element", default="rod", help="rod (default), ball or pad")
    p.add_argument("--radius", default=None, help="rod, ball or pad radius, e.g. 0.25mm")
    p.add_argument("--length", default=None, help="wetted length of the rod, e.g. 60mm")
    p.add_argument("--thickness", default=None, help="pad thickness, e.g. 0.5mm")
    p.add_argument("--count", default="1", help="identical rods measured together (default 1)")
    p.add_argument("--fit-surface-tension", action="store_true", help="fit the surface tension as well")
    p.add_argument("--confidence", default="0.95", help="confidence level of the intervals (default 0.95)")
    p.add_argument("--skip-bad-rows", action="store_true", help="drop bad rows (reported as warnings) instead of stopping")
    p.add_argument("--save", default=None, help="write data, fit and residuals to FILE.png, .svg or .pdf")
    add_liquid_args(p)
    add_json_flag(p)
    p.set_defaults(func=run)


def run(args) -> int:
    from ..errors import input_error
    from ..studies import fit as F
    from ..studies.cliargs import checked_path, save_figure

    plot_path = checked_path(args.save, (".png", ".svg", ".pdf"), "save")
    kw = {"fit_surface_tension": args.fit_surface_tension, "confidence": args.confidence,
          "skip_bad_rows": args.skip_bad_rows}
    if args.demo:
        if args.data is not None:
            raise input_error("data", "give either --data or --demo, not both", repr(args.data))
        r = F.demo_fit(**kw)
        title = "Contact-angle fit of the shipped INVENTED data set (synthetic, not a measurement)"
    else:
        need = {"rod": ("data", "radius", "length"), "ball": ("data", "radius"),
                "pad": ("data", "radius", "thickness")}
        if args.element not in need:
            raise input_error("element", "must be rod, ball or pad", repr(args.element))
        missing = [n for n in need[args.element] if getattr(args, n) is None]
        if missing:
            raise input_error(missing[0], f"is required for a {args.element} (or use --demo)", "nothing")
        liq = liquid_from_args(args)
        if args.element == "rod":
            r = F.fit_rod_csv(args.data, radius=args.radius, length=args.length, count=args.count, liquid=liq, **kw)
        else:
            r = F.fit_element_csv(args.element, args.data, radius=args.radius, thickness=args.thickness,
                                  liquid=liq, **kw)
        title = f"Contact-angle fit of {args.data}"
    if plot_path is not None:
        from ..studies.plots import fit_plot

        save_figure(fit_plot(r), plot_path)
    if args.json:
        d = r.to_dict()
        if args.demo:
            d = {"data": "invented demo data set (synthetic)", "invented": True, **d}
        print_json(d)
        return 0
    lo, hi = r.contact_angle_ci.magnitude
    what = (f"{r.count} × radius {r.radius.to('mm').magnitude:.4g} mm, length {r.length.to('mm').magnitude:.4g} mm"
            if r.element == "rod" else f"radius {r.radius.to('mm').magnitude:.4g} mm")
    rows = [
        (r.element, what),
        ("points", f"{r.points} ({r.degrees_of_freedom} degrees of freedom)"),
        ("advancing contact angle", f"{r.contact_angle.magnitude:.2f}°  "
                                    f"[{lo:.2f}°, {hi:.2f}°] at {r.confidence:g} confidence (Jacobian interval)"),
    ]
    if r.surface_tension_fitted:
        slo, shi = r.surface_tension_ci.to("mN/m").magnitude
        rows.append(("surface tension", f"{r.surface_tension.to('mN/m').magnitude:.4g} mN/m  [{slo:.4g}, {shi:.4g}] mN/m"))
    else:
        rows.append(("surface tension", f"{r.surface_tension.to('mN/m').magnitude:.4g} mN/m (liquid value, not fitted)"))
    rows.append(("residual rms", f"{r.residual_rms.to('mN').magnitude:.3g} mN"))
    print_table(title, rows, [*r.warnings, *r.cautions])
    return 0
