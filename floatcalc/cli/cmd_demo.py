"""``floatcalc demo``: the main job on a built-in, invented example.

Runs the built-in invented twelve-leg surface skimmer (``floatcalc/data/device_skimmer.toml``)
through the whole-device solve: does it float, how deep, how level, how much more can it carry,
and which leg gives way first.
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
    from ..device import example, solve_device

    r = solve_device(example(DEMO_EXAMPLE))
    weight = r.weight.to("N").magnitude
    extra = r.max_payload.to("N").magnitude
    if args.json:
        out = {
            "example": TITLE, "invented": True, "verdict": r.verdict,
            "body_weight_N": weight,             # the whole device: body and legs
            "payload_N": weight + extra,         # load the legs carry at the centre of mass at their limit
            "margin_N": extra,                   # what can still be added there
            "device": r.to_dict(),
        }
        print_json(out)
        return 0
    from .cmd_device import print_device

    print_device(r, title=TITLE)
    return 0
