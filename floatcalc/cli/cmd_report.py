"""``floatcalc report``: PDF report (and CSV of every curve) of a design file or built-in example."""

from __future__ import annotations

import os

from ._format import add_json_flag, print_json, print_table

ORDER = 70


def register(sub) -> None:
    p = sub.add_parser("report", help="write a PDF report (and CSV curves) of a design file")
    p.add_argument("file", nargs="?", default=None, help="design file (TOML), e.g. design.toml")
    p.add_argument("--example", default=None,
                   help="use a built-in invented example instead of a file: robot, compare or classroom")
    p.add_argument("-o", "--output", default="report.pdf", help="PDF file to write (default report.pdf)")
    p.add_argument("--csv-dir", default=None, help="also write every curve as CSV into this directory")
    add_json_flag(p)
    p.set_defaults(func=run)


def _scenario(args):
    from ..errors import input_error
    from ..examples import MAX_FILE_BYTES, example, loads_toml

    if (args.file is None) == (args.example is None):
        raise input_error("report", "give a design file or --example NAME (one of them)",
                          "both" if args.file else "neither")
    if args.example is not None:
        return example(args.example)
    if not os.path.isfile(args.file):
        raise input_error("file", "must be an existing design file (TOML)", repr(args.file))
    size = os.path.getsize(args.file)
    if size > MAX_FILE_BYTES:
        raise input_error("file", f"must be at most {MAX_FILE_BYTES // 1024} kB", f"{size} bytes")
    with open(args.file, "rb") as f:
        return loads_toml(f.read())


def run(args) -> int:
    from .. import examples, report

    if not str(args.output).lower().endswith(".pdf"):
        from ..errors import input_error

        raise input_error("output", "must be a file name ending in .pdf", repr(args.output))
    scenario = _scenario(args)
    designs = examples.alternatives(scenario)
    a = report.assess(designs[0])
    others = [(s["title"], report.assess(s)) for s in designs[1:]]
    report.write_pdf(a, args.output, others)
    paths = report.write_csv_dir(a, args.csv_dir, others) if args.csv_dir else []
    if args.json:
        print_json({**a.to_dict(), "pdf": args.output, "csv": paths,
                    "alternatives": [{"title": n, **b.to_dict()} for n, b in others]})
        return 0
    rows = report.result_rows(a)[:5] + [("PDF report", args.output)]
    if paths:
        rows.append(("CSV curves", f"{len(paths)} files in {args.csv_dir}"))
    for n, b in others:
        rows.append(("alternative", f"{n}: {b.verdict}, margin {b.margin:.3g}"))
    print_table(a.title, rows, [*a.warnings, *a.cautions])
    return 0
