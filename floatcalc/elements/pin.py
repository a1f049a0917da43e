"""Element kind ``pin``: a vertical pin (fibre) dipped tip-first.

It does not sink by meniscus failure: its force keeps rising until the body reaches the
surface, so its limit is the largest force before its top end (tip depth = ``length``, its
protrusion below the body) reaches the surface. Public function: :func:`floatcalc.pin`; the
limit is :func:`pin_limit` (the same number for the CLI, the report and a device).
"""

from __future__ import annotations

import math
from dataclasses import replace

from ._registry import Field, register_kind
from ._round import RoundKind


class PinKind(RoundKind):
    name = "pin"
    label = "vertical pin"
    summary = "vertical pin (fibre) dipped tip-first"
    command = "pin"
    bond_words = "pin radius"
    fields = {"radius": Field("length", "mm", required=True, help="pin radius", example="0.1 mm"),
              "length": Field("length", "mm", required=True, help="protrusion of the pin below the body",
                              example="3 mm")}

    def compute(self, p, th, liquid):
        from ..round import pin_limit

        res = pin_limit(p["radius"], p["length"], th, liquid, p["density"])
        # the device uses the force over tip depth (its curve includes the tip pressure), so
        # the single-depth note about a tip taken far below does not apply here
        return replace(res, warnings=tuple(w for w in res.warnings if not w.startswith("tip depth not given")))

    def outer_radius(self, p, res):
        return p["radius"]

    def volume(self, p):
        return math.pi * p["radius"] ** 2 * p["length"]


register_kind(PinKind())
