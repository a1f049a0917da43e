"""``floatcalc fit``: advancing and receding contact angles (and σ, depth zero, tare) from a force–depth CSV.

The element kinds and their geometry options come from the one table
:data:`floatcalc.studies.fit.KINDS`; this module only formats.
"""

from __future__ import annotations

from ._common import add_liquid_args, liquid_from_args
from ._format import add_json_flag, print_json, print_table

ORDER = 63


def _geometry_options():
    """Option name -> (geometry key, help) over all kinds, from the kind table."""
    from ..studies.fit import KINDS

    opts: dict[str, tuple[str, list[str]]] = {}
    for k in KINDS.values():
        for key, (_, text) in k.geometry.items():
            opt = "--" + key.replace("_", "-")
            opts.setdefault(opt, (key, []))[1].append(f"{k.name}: {text}")
    return opts


def register(sub) -> None:
    from ..studies.fit import KINDS

    p = sub.add_parser(
        "fit", help="fit contact angles of a rod, row of rods, ball, pad, ring or pin from a force-depth CSV",
        description="Fit the advancing contact angle (push-in rows) and the receding angle (pull-out rows), "
        "optionally the surface tension, the depth zero and the balance tare, to force against depth of the "
        "element's lowest point. The CSV needs a header naming units, e.g. 'depth [mm],force [mN]'; optional "
        "columns 'force uncertainty [mN]' (weighted fit) and 'direction' (push or pull on each row; otherwise "
        "the sign of the depth change decides). Lines starting with # are comments; columns may be separated "
        "by ';' (then decimal commas are read). Any other column is refused. Bad rows are reported by line "
        "number.")
    p.add_argument("--data", default=None, help="CSV file with columns 'depth [unit]' and 'force [unit]'")
    p.add_argument("--demo", action="store_true", help="fit the shipped INVENTED push-in data set (one rod)")
    p.add_argument("--demo-cycle", action="store_true",
                   help="fit the shipped INVENTED push-in/pull-out data set (both angles, depth offset, tare)")
    p.add_argument("--element", default="rod", choices=list(KINDS),
                   help="element kind: " + "; ".join(f"{k.name} = {k.summary}" for k in KINDS.values()))
    for opt, (key, helps) in _geometry_options().items():
        p.add_argument(opt, dest=f"geo_{key}", default=None, help="; ".join(helps))
    p.add_argument("--force-uncertainty", default=None,
                   help="stated force uncertainty of every row: absolute (0.1mN), proportional to the reading "
                   "(2%%) or both ('0.01mN+1%%'); default: a 'force uncertainty' column if present, else "
                   "estimated from the residuals")
    p.add_argument("--fit-surface-tension", action="store_true", help="fit the surface tension as well")
    p.add_argument("--fit-depth-offset", action="store_true",
                   help="fit the depth reading at first touch (zero of depth) as well")
    p.add_argument("--fit-tare", action="store_true",
                   help="fit the balance reading at zero liquid force as well (record baseline rows in the air)")
    p.add_argument("--direction", default="auto", choices=["auto", "push", "pull"],
                   help="branch of the rows when the file has no direction column: auto (sign of the depth "
                   "change, rows in recording order), or all push or all pull")
    p.add_argument("--intervals", default="profile", choices=["profile", "wald"],
                   help="interval shown: profile likelihood (default) or Wald (Jacobian, faster)")
    p.add_argument("--confidence", default="0.95", help="confidence level of the intervals (default 0.95)")
    p.add_argument("--skip-bad-rows", action="store_true", help="drop bad rows (reported as warnings) instead of stopping")
    p.add_argument("--save", default=None,
                   help="write data, fit and weighted residuals to FILE.png, .svg or .pdf")
    add_liquid_args(p)
    add_json_flag(p)
    p.set_defaults(func=run)


def _names(args) -> tuple[str, ...]:
    names = ["contact_angle"]
    for flag, name in (("fit_surface_tension", "surface_tension"), ("fit_depth_offset", "depth_offset"),
                       ("fit_tare", "tare")):
        if getattr(args, flag):
            names.append(name)
    return tuple(names)


def run(args) -> int:
    from ..errors import input_error
    from ..studies import fit as F
    from ..studies.cliargs import checked_path, save_figure

    plot_path = checked_path(args.save, (".png", ".svg", ".pdf"), "save")
    kind = F.KINDS[args.element]
    given = {key: getattr(args, f"geo_{key}") for _, (key, _) in _geometry_options().items()
             if getattr(args, f"geo_{key}") is not None}
    kw = {"confidence": args.confidence, "skip_bad_rows": args.skip_bad_rows, "intervals": args.intervals,
          "force_uncertainty": args.force_uncertainty}
    demo = args.demo or args.demo_cycle
    if demo:
        if args.data is not None:
            raise input_error("data", "give either --data or a demo, not both", repr(args.data))
        if args.demo and args.demo_cycle:
            raise input_error("demo", "give --demo or --demo-cycle, not both", "both")
        if given or args.element != "rod":
            raise input_error("demo", "uses its own invented rig; leave out --element and the geometry options",
                              ", ".join(f"--{k.replace('_', '-')}" for k in given) or args.element)
        names = _names(args)
        if args.demo_cycle:
            names = tuple(dict.fromkeys(names + ("depth_offset", "tare")))
        r = F.demo_fit(cycle=args.demo_cycle, fit=names, **kw)
        title = ("Contact-angle fit of the shipped INVENTED " + ("push-in/pull-out " if args.demo_cycle else "")
                 + "data set (synthetic, not a measurement)")
    else:
        if args.data is None:
            raise input_error("data", "is required (a CSV file), or use --demo / --demo-cycle", "nothing")
        foreign = [k for k in given if k not in kind.geometry]
        if foreign:
            raise input_error(foreign[0].replace("_", "-"), f"is not an input of a {kind.name} (inputs: "
                              f"{', '.join('--' + k.replace('_', '-') for k in kind.geometry)})", repr(given[foreign[0]]))
        missing = [k for k in kind.geometry if k not in given and k not in kind.optional]
        if missing:
            raise input_error(missing[0].replace("_", "-"), f"is required for a {kind.name} (or use --demo)", "nothing")
        r = F.fit_csv(kind.name, args.data, geometry=given, liquid=liquid_from_args(args), fit=_names(args),
                      direction=args.direction, **kw)
        title = f"Contact-angle fit of {args.data}"
    if plot_path is not None:
        save_figure(F.fit_plot(r), plot_path)
    if args.json:
        d = r.to_dict()
        if demo:
            d = {"data": "invented demo data set (synthetic)", "invented": True, **d}
        print_json(d)
        return 0
    print_table(title, _rows(r, kind), [*r.warnings, *r.cautions])
    return 0


def _ci(q, unit, digits=4):
    lo, hi = q.to(unit).magnitude
    return f"[{lo:.{digits}g}, {hi:.{digits}g}] {unit}"


def _rows(r, kind):
    geo = ", ".join(f"{k.removesuffix('_m').replace('_', ' ')} {v * 1e3:.4g} mm" if k.endswith("_m") else f"{k} {v}"
                    for k, v in r.geometry.items())
    rows = [(r.element, f"{kind.summary}; {geo}"),
            ("points", f"{r.points} ({r.push_points} push, {r.pull_points} pull, {r.points_before_contact} at "
                       f"zero liquid force; {r.degrees_of_freedom} degrees of freedom)"),
            ("force uncertainty", r.error_model)]
    where = f"at {r.confidence:g} confidence, {r.interval_method} interval"
    if r.contact_angle is not None:
        rows.append(("advancing contact angle", f"{r.contact_angle.magnitude:.2f}°  "
                     f"{_ci(r.contact_angle_ci, 'deg', 5).replace(' deg', '°')} {where}"))
    if r.receding_angle is not None:
        rows.append(("receding contact angle", f"{r.receding_angle.magnitude:.2f}°  "
                     f"{_ci(r.receding_angle_ci, 'deg', 5).replace(' deg', '°')}"))
    if r.hysteresis is not None:
        rows.append(("hysteresis", f"{r.hysteresis.magnitude:.2f}°  "
                     f"{_ci(r.hysteresis_ci, 'deg', 4).replace(' deg', '°')} (Wald, from the covariance)"))
    if r.surface_tension_fitted:
        rows.append(("surface tension", f"{r.surface_tension.to('mN/m').magnitude:.4g} mN/m  "
                     f"{_ci(r.surface_tension_ci, 'mN/m')}"))
    else:
        rows.append(("surface tension", f"{r.surface_tension.to('mN/m').magnitude:.4g} mN/m (liquid value, not fitted)"))
    if "depth_offset" in r.fitted:
        rows.append(("depth offset", f"{r.depth_offset.to('mm').magnitude:.4g} mm  {_ci(r.depth_offset_ci, 'mm')}"))
    if "tare" in r.fitted:
        rows.append(("tare", f"{r.tare.to('mN').magnitude:.4g} mN  {_ci(r.tare_ci, 'mN')}"))
    if r.chi_squared is not None:
        rows.append(("chi-squared", f"{r.chi_squared:.4g} for {r.degrees_of_freedom} degrees of freedom "
                                    f"(p = {r.chi_squared_p_value:.3g})"))
    else:
        rows.append(("residual scale", f"{r.residual_scale.to('mN').magnitude:.3g} mN (estimated noise per row)"))
    names = r.correlation.get("parameters", [])
    if len(names) > 1:
        m = r.correlation["matrix"]
        pairs = [(abs(m[i][j]), m[i][j], names[i], names[j]) for i in range(len(names)) for j in range(i + 1, len(names))]
        _, c, a, b = max(pairs)
        rows.append(("largest correlation", f"{a} / {b}: {c:+.3f} (full matrix in --json)"))
    rows.append(("residual rms", f"{r.residual_rms.to('mN').magnitude:.3g} mN"))
    return rows
