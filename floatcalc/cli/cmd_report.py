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
    p.add_argument("--payload", default="0 g", help="payload at the centre of mass of a device file, e.g. 0.3g")
    p.add_argument("--safety-factor", default="2", help="safety factor for a device file (default 2)")
    add_json_flag(p)
    p.set_defaults(func=run)


def _scenario(args):
    """("device", data) for a floatcalc.device design file, else ("groups", scenario)."""
    import tomllib

    from ..errors import input_error
    from ..examples import MAX_FILE_BYTES, example, loads_toml
    from ..report import is_device_data

    if (args.file is None) == (args.example is None):
        raise input_error("report", "give a design file or --example NAME (one of them)",
                          "both" if args.file else "neither")
    if args.example is not None:
        return "groups", example(args.example)
    if not os.path.isfile(args.file):
        raise input_error("file", "must be an existing design file (TOML)", repr(args.file))
    size = os.path.getsize(args.file)
    if size > MAX_FILE_BYTES:
        raise input_error("file", f"must be at most {MAX_FILE_BYTES // 1024} kB", f"{size} bytes")
    with open(args.file, "rb") as f:
        raw = f.read()
    try:
        data = tomllib.loads(raw.decode("utf-8"))
    except (UnicodeDecodeError, tomllib.TOMLDecodeError) as exc:
        raise input_error("file", "must be UTF-8 TOML text", str(exc).splitlines()[0]) from None
    if is_device_data(data):
        return "device", data
    return "groups", loads_toml(raw)


def run(args) -> int:
    from .. import examples, report
    from ..errors import input_error

    if not str(args.output).lower().endswith(".pdf"):
        raise input_error("output", "must be a file name ending in .pdf", repr(args.output))
    kind, scenario = _scenario(args)
    if kind == "device":
        a = report.assess_device(scenario, args.payload, args.safety_factor)
        others = []
        rows_of = report.device_result_rows
    else:
        designs = examples.alternatives(scenario)
        a = report.assess(designs[0])
        others = [(s["title"], report.assess(s)) for s in designs[1:]]
        rows_of = report.result_rows
    report.write_pdf(a, args.output, others)
    paths = report.write_csv_dir(a, args.csv_dir, others) if args.csv_dir else []
    if args.json:
        print_json({**a.to_dict(), "pdf": args.output, "csv": paths,
                    "alternatives": [{"title": n, **b.to_dict()} for n, b in others]})
        return 0
    rows = rows_of(a)[:5] + [("PDF report", args.output)]
    if paths:
        rows.append(("CSV curves", f"{len(paths)} files in {args.csv_dir}"))
    for n, b in others:
        rows.append(("alternative", f"{n}: {b.verdict}, margin {b.margin:.3g}"))
    print_table(a.title, rows, [*a.warnings, *a.cautions])
    return 0
