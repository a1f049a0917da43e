"""``floatcalc uncertainty``: Monte Carlo probability of sinking and payload-capacity percentiles."""

from __future__ import annotations

import sys

from ._common import add_liquid_args, liquid_from_args
from ._format import add_json_flag, print_json, print_table

ORDER = 62

#: Invented example: a six-legged rod skimmer whose coating may be worse than hoped and whose
#: pond may be dirty. Every figure here is made up for the demonstration.
DEMO = {
    "title": "Invented example: six-legged rod skimmer, 4.5 g payload, coating and pond uncertain",
    "values": {"radius": "0.2mm", "length": "60mm", "contact_angle": "125deg", "count": "6",
               "material_density": "7850kg/m^3", "payload": "4.5g"},
    "dist": ["contact_angle=normal:125deg:6deg", "radius=tol:0.2mm:0.01mm", "payload_mass=normal:4.5g:0.15g"],
    "contamination": "0.25:5mN/m:25mN/m",
}


def register(sub) -> None:
    from ..studies.cliargs import add_design_args, add_exec_args, add_rod_args

    p = sub.add_parser("uncertainty", help="probability of sinking and capacity percentiles from input distributions",
                       description="Sample inputs from distributions and report the probability that the design "
                       "sinks at its payload and percentiles of its payload capacity. Distributions: "
                       "normal:MEAN:SD, uniform:LOW:HIGH, tol:NOMINAL:TOL. Seeded and reproducible on every executor.")
    p.add_argument("--demo", action="store_true", help="run on a built-in invented design (ignores the design options)")
    add_rod_args(p)
    add_design_args(p)
    p.add_argument("--dist", action="append", default=[], metavar="NAME=SPEC",
                   help="distribution of an input, e.g. contact_angle=normal:150deg:5deg (repeatable)")
    p.add_argument("--contamination", default=None,
                   help="PROBABILITY:DROP_LOW:DROP_HIGH, e.g. 0.2:5mN/m:20mN/m (surface tension lowered at random)")
    p.add_argument("--samples", default="10000", help="number of samples, 100 to 10^7 (default 10000)")
    p.add_argument("--seed", default="0", help="random seed, a whole number ≥ 0 (default 0)")
    add_liquid_args(p)
    p.add_argument("--save", default=None, help="write a histogram of the capacity to FILE.png, .svg or .pdf")
    add_exec_args(p)
    add_json_flag(p)
    p.set_defaults(func=run)


def run(args) -> int:
    from ..errors import input_error
    from ..studies.cliargs import checked_path, exec_kwargs, model_from_args, save_figure
    from ..studies.uncertainty import parse_contamination, parse_distribution, uncertainty

    plot_path = checked_path(args.save, (".png", ".svg", ".pdf"), "save")
    dist_specs, contamination = list(args.dist), args.contamination
    title = "Monte Carlo uncertainty of rod legs (exact 2D rod law)"
    if args.demo:
        args.design = args.example = None
        args.element = "rod"
        for k, val in DEMO["values"].items():
            setattr(args, k, val)
        dist_specs = DEMO["dist"] + dist_specs
        contamination = contamination or DEMO["contamination"]
        title = DEMO["title"]
    model = model_from_args(args, liquid_from_args)
    if model.name != "rod":
        title = f"Monte Carlo uncertainty of {model.name[8:]}"
    dists = {}
    for spec in dist_specs:
        if "=" not in spec:
            raise input_error("dist", "must look like NAME=normal:MEAN:SD", repr(spec))
        name, text = (s.strip() for s in spec.split("=", 1))
        name = name.replace("-", "_").lower()
        if name not in model.inputs:
            raise input_error("dist", f"unknown input; known: {', '.join(sorted(model.inputs))}", repr(name))
        dists[name] = parse_distribution(text, model.inputs[name].kind, name)
    cont = None if contamination is None else parse_contamination(contamination)
    if not dists and cont is None:
        raise input_error("dist", "give at least one distribution (--dist) or --contamination", "none")
    r = uncertainty(model, dists, contamination=cont, samples=args.samples, seed=args.seed, **exec_kwargs(args))
    if plot_path is not None:
        from ..studies.plots import capacity_histogram

        save_figure(capacity_histogram(r), plot_path)
    if args.json:
        d = r.to_dict()
        if args.demo:
            d = {"example": DEMO["title"], "invented": True, **d}
        print_json(d)
        return 0
    p, se = r.probability_of_sinking, r.probability_standard_error
    prob = (f"0 of {r.samples} samples sink (below {r.probability_upper_95:.2g} at 95 % confidence)"
            if r.probability_upper_95 is not None else f"{p:.4g} ± {se:.2g} (binomial standard error)")
    rows = [("inputs", s) for s in r.inputs]
    rows += [
        ("design payload", f"{r.design_payload_mass.to('g').magnitude:.4g} g (nominal capacity "
                           f"{r.nominal_payload_capacity.to('g').magnitude:.4g} g)"),
        ("probability of sinking", prob),
    ]
    q = r.payload_capacity_percentiles.to("g").magnitude
    qse = r.payload_capacity_percentile_standard_error.to("g").magnitude
    for pc, val, e in zip(r.percentiles, q, qse):
        rows.append((f"capacity P{pc:g}", f"{val:.4g} g ± {e:.2g} g (batch means)"))
    rows.append(("samples", f"{r.samples}, seed {r.seed}, chunks of {r.chunk_size}, executor {r.executor}"))
    print_table(title, rows, [*r.warnings, *r.cautions])
    sys.stdout.flush()
    return 0
