"""``floatcalc demo``: the main job on a built-in, invented example.

Runs the built-in invented twelve-leg surface skimmer (``floatcalc/data/examples/skimmer.toml``)
through the whole-device solve: does it float, how deep, how level, how much more can it carry,
and which leg breaks through first. The same as ``floatcalc device --example skimmer``.
"""

from __future__ import annotations

from ._format import add_json_flag, print_json

#: Built-in example design run by the demo (invented, labelled so in the file).
DEMO_EXAMPLE = "skimmer"
TITLE = ("Invented example: a twelve-leg surface skimmer (about 1.2 g, PTFE-coated steel wire legs) "
         "on water at 20 °C")

ORDER = 10


def register(sub) -> None:
    p = sub.add_parser("demo", help="run the main calculation on a built-in invented example")
    add_json_flag(p)
    p.set_defaults(func=run)


def run(args) -> int:
    from ..design import example
    from ..device import solve_device

    r = solve_device(example(DEMO_EXAMPLE))
    if args.json:
        print_json({"example": TITLE, "invented": True, **r.to_dict()})
        return 0
    from .cmd_device import print_device

    print_device(r, title=TITLE)
    return 0
