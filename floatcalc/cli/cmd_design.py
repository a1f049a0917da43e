"""``floatcalc design``: check a design file, rewrite an older one in schema 2, list examples."""

from __future__ import annotations

import sys

from ._format import add_json_flag, print_json, print_table

ORDER = 45


def register(sub) -> None:
    p = sub.add_parser("design", help="check or upgrade a design file; list or print the built-in examples")
    s = p.add_subparsers(dest="action", metavar="ACTION")
    u = s.add_parser("upgrade", help="rewrite a schema-1 or older quick file in schema 2 (comments kept)")
    u.add_argument("file", help="design file to rewrite")
    u.add_argument("-o", "--output", default=None, help="write here instead of over FILE")
    u.set_defaults(func=upgrade)
    c = s.add_parser("check", help="validate a design file and list its elements")
    c.add_argument("file")
    add_json_flag(c)
    c.set_defaults(func=check)
    e = s.add_parser("examples", help="list the built-in example designs (all invented)")
    add_json_flag(e)
    e.set_defaults(func=examples)
    w = s.add_parser("show", help="print a built-in example's design file (to start your own from)")
    w.add_argument("name")
    w.set_defaults(func=show)
    p.set_defaults(func=_no_action)


def _no_action(args) -> int:
    from ..errors import input_error

    raise input_error("design", "give an action: upgrade, check, examples or show (see 'floatcalc design --help')")


def upgrade(args) -> int:
    from ..design import design_text, load_design
    from pathlib import Path

    d = load_design(args.file)
    text = design_text(d)
    target = Path(args.output or args.file)
    load_design(text=text)  # what is written must read back
    try:
        target.write_text(text, encoding="utf-8")
    except OSError as exc:
        from ..errors import input_error

        raise input_error(str(target), f"cannot be written ({exc.strerror or 'write error'})") from None
    was = d.notes[0].split(";")[0].replace("read ", "") if d.notes else "already schema 2"
    print(f"{target}: written in schema 2 ({was})", file=sys.stderr)
    return 0


def check(args) -> int:
    from ..design import load_design

    d = load_design(args.file)
    if args.json:
        print_json({"ok": True, "notes": list(d.notes), "elements": [
            {"name": p["name"], "kind": p["kind"], "position_m": list(p["position"])} for p in d.elements]})
        return 0
    for n in d.notes:
        print(f"floatcalc: note: {n}", file=sys.stderr)
    from .cmd_device import _safe

    rows = [("description", _safe(d.description) or "(none)"), ("elements", str(len(d.elements)))]
    rows += [(_safe(p["name"]), f"{p['kind']} at ({p['position'][0] * 1e3:.3g}, {p['position'][1] * 1e3:.3g}) mm")
             for p in d.elements[:50]]
    print_table(f"{args.file}: a valid design", rows)
    return 0


def examples(args) -> int:
    from ..design import list_examples

    rows = list_examples()
    if args.json:
        print_json({"examples": rows})
    else:
        print_table("Built-in example designs (all invented)", [(r["name"], r["description"]) for r in rows])
    return 0


def show(args) -> int:
    from ..design import example_text

    sys.stdout.write(example_text(args.name))
    return 0
