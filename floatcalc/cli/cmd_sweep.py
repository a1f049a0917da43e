"""``floatcalc sweep``: vary one or two inputs of a rod-leg design; table (CSV) and plot."""

from __future__ import annotations

import json
import sys

from ._common import add_liquid_args, liquid_from_args
from ._format import _clean, add_json_flag, print_json

ORDER = 60


def register(sub) -> None:
    from ..studies.cliargs import add_design_args, add_exec_args, add_rod_args

    p = sub.add_parser("sweep", help="vary one or two design inputs; CSV table and plot with the limit marked",
                       description="Evaluate a design over ranges of one or two inputs. Ranges are "
                       "NAME=START:STOP:N (linear) or NAME=START:STOP:N:log, e.g. radius=0.05mm:0.5mm:50:log. "
                       "Rod inputs: radius, length, contact_angle, count, material_density, surface_tension, "
                       "liquid_density, payload_mass. Device inputs (--design/--example): contact_angle_shift, "
                       "surface_tension, radius_factor, length_factor, body_mass, payload_mass. Ball/pad inputs "
                       "(--element): radius, thickness (pad), contact_angle, surface_tension, material_density, "
                       "payload_mass.")
    p.add_argument("--vary", action="append", required=True, metavar="NAME=START:STOP:N[:log]",
                   help="input to vary (give once or twice)")
    add_rod_args(p)
    add_design_args(p)
    add_liquid_args(p)
    p.add_argument("--output", default=None, help="write the table to FILE.csv (unit-bearing headers) or FILE.json")
    p.add_argument("--save", default=None, help="write the plot to FILE.png, .svg or .pdf")
    p.add_argument("--plot-output", default=None, help="output to plot (default spare_payload: max payload minus the design payload)")
    add_exec_args(p)
    add_json_flag(p)
    p.set_defaults(func=run)


def run(args) -> int:
    from ..studies.cliargs import checked_path, exec_kwargs, model_from_args, notes, save_figure
    from ..studies.csvio import to_text, write_table
    from ..studies.sweep import sweep

    out_path = checked_path(args.output, (".csv", ".json"), "output")
    plot_path = checked_path(args.save, (".png", ".svg", ".pdf"), "save")
    model = model_from_args(args, liquid_from_args)
    if len(args.vary) > 2:
        from ..errors import input_error

        raise input_error("vary", "give one or two inputs to vary", len(args.vary))
    if args.plot_output is not None and args.plot_output not in model.outputs:
        from ..errors import input_error

        raise input_error("plot-output", f"must be one of {', '.join(model.outputs)}", repr(args.plot_output))
    res = sweep(model, args.vary, **exec_kwargs(args))
    fig = None
    if plot_path is not None:
        from ..studies.plots import sweep_plot

        fig = sweep_plot(res, args.plot_output)
    comments = [f"floatcalc sweep of model '{res.model}' (static estimate, clean liquid)",
                *[f"reference: {r}" for r in res.references],
                *[f"warning: {w}" for w in res.warnings], *[f"caution: {c}" for c in res.cautions]]
    if len(res.axes) == 1:
        a = res.axes[0]
        from ..units import KINDS, format_si

        fmt = (lambda c: format_si(c, a.kind, a.unit)) if a.kind in KINDS else (lambda c: f"{c:.4g}")
        shown = ", ".join(fmt(c) for c in res.crossings) or "none in range"
        comments.append(f"limit ({res.limit_output} = 0) at {a.name} = {shown}")
    if out_path is not None:
        if out_path.suffix.lower() == ".json":
            out_path.write_text(json.dumps(_clean(res.to_dict()), indent=2, ensure_ascii=False) + "\n", encoding="utf-8")
        else:
            write_table(out_path, res.table(), comments=comments)
        print(f"table written to {out_path}", file=sys.stderr)
    if fig is not None:
        save_figure(fig, plot_path)
    if args.json:
        print_json(res.to_dict())
    elif out_path is None:
        sys.stdout.write(to_text(res.table(), comments=comments))
    else:
        for line in notes(comments):
            print(line)
    return 0
