"""``floatcalc report``: PDF report (and CSV tables) of a design file or a built-in example.

Reads schema 2 through :mod:`floatcalc.design` and solves with
:func:`floatcalc.device.solve.solve_device`: the same capacity, Baudoin number and verdict as
``floatcalc device`` and the page.
"""

from __future__ import annotations

from ._format import add_json_flag, print_json, print_table

ORDER = 70


def register(sub) -> None:
    p = sub.add_parser("report", help="write a PDF report (and CSV tables) of a design file")
    p.add_argument("file", nargs="?", default=None, help="design file (TOML), e.g. design.toml")
    p.add_argument("--example", default=None,
                   help="use a built-in invented example instead of a file (see floatcalc device --list-examples)")
    p.add_argument("-o", "--output", default="report.pdf", help="PDF file to write (default report.pdf)")
    p.add_argument("--csv-dir", default=None, help="also write every table and curve as CSV into this directory")
    p.add_argument("--payload", default=None, help="payload, e.g. 0.3g (default the file's [load] payload)")
    p.add_argument("--safety-factor", default=None,
                   help="required safety factor (default the file's [load] safety_factor, else 1)")
    add_json_flag(p)
    p.set_defaults(func=run)


def _check_targets(output: str, csv_dir: str | None) -> None:
    """Refuse, before any solving, a PDF or CSV target that cannot be written."""
    import os
    from pathlib import Path

    from ..errors import input_error

    out = Path(output)
    if out.is_dir():
        raise input_error("output", "is a folder; give a file name ending in .pdf", repr(output))
    folder = out.parent
    if not folder.is_dir():
        raise input_error("output", "folder does not exist", repr(str(folder)))
    if not os.access(folder, os.W_OK) or (out.exists() and not os.access(out, os.W_OK)):
        raise input_error("output", "cannot be written here (permission denied)", repr(output))
    if csv_dir is not None:
        d = Path(csv_dir)
        if d.exists() and not d.is_dir():
            raise input_error("csv-dir", "is a file, not a folder", repr(csv_dir))
        if not d.exists() and not d.parent.is_dir():
            raise input_error("csv-dir", "its parent folder does not exist", repr(str(d.parent)))


def run(args) -> int:
    from ..design import example, load_design
    from ..device.solve import solve_device
    from ..errors import input_error
    from ..output import csv as out_csv
    from ..output import pdf
    from ..output.tables import solved_tables
    from ..output.text import entry_name, result_rows

    if not str(args.output).lower().endswith(".pdf"):
        raise input_error("output", "must be a file name ending in .pdf", repr(args.output))
    _check_targets(args.output, args.csv_dir)
    if (args.file is None) == (args.example is None):
        raise input_error("report", "give a design file or --example NAME (one of them)",
                          "both" if args.file else "neither")
    design = example(args.example) if args.example is not None else load_design(args.file)
    r = solve_device(design, payload=args.payload, safety_factor=args.safety_factor)
    compared = [(entry_name(a, k), a, solve_device(a, payload=args.payload, safety_factor=args.safety_factor))
                for k, a in enumerate(design.alternatives, 1)]
    tables = solved_tables(design)
    pdf.write_pdf(design, r, args.output, tables=tables, compared=compared)
    paths = []
    if args.csv_dir:
        others = [(n, b, solved_tables(a)) for n, a, b in compared]
        paths = out_csv.write_csv_dir(out_csv.all_tables(r, tables, others), args.csv_dir)
    if args.json:
        print_json({**r.to_dict(), "pdf": args.output, "csv": paths, "notes": list(design.notes),
                    "alternatives": [{"name": n, **b.to_dict()} for n, _, b in compared]})
        return 0
    rows = result_rows(r)[:9] + [("PDF report", args.output)]
    if paths:
        rows.append(("CSV tables", f"{len(paths)} files in {args.csv_dir}"))
    for n, _, b in compared:
        rows.append((f"alternative: {n}", f"{b.verdict}, safety factor {b.safety_factor:.3g}"))
    print_table(design.description or "design", rows, [*design.notes, *dict.fromkeys(r.warnings), *r.cautions])
    return 0
