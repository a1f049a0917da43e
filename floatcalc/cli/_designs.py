"""Choosing a design in the CLI: a file or a built-in example, read by the one reader."""

from __future__ import annotations

import sys

from ..errors import input_error


def add_design_choice(p, required: bool = True) -> None:
    """The positional design FILE and ``--example NAME`` (one list of built-in examples)."""
    p.add_argument("file", nargs="?", default=None, help="design file (TOML, schema 2; see README 'Design files')")
    p.add_argument("--example", default=None, help="a built-in example design instead of a file "
                   "(list: floatcalc design examples)")


def design_from_args(args, what: str = "design"):
    """The Design chosen by ``FILE`` or ``--example`` (exactly one); its notes go to stderr."""
    from ..design import example, load_design

    if (args.file is None) == (args.example is None):
        raise input_error(what, "give a design file or --example NAME (see 'floatcalc design examples')",
                          "both" if args.file else "neither")
    d = example(args.example) if args.example else load_design(args.file)
    for n in d.notes:
        print(f"floatcalc: note: {n}", file=sys.stderr)
    return d
