"""Element kind ``pad``: a flat circular pad with sharp edges (edge pinning, Gibbs' inequality).

Public function: :func:`floatcalc.pad`.
"""

from __future__ import annotations

import math

from ._registry import Field, register_kind
from ._round import RoundKind


class PadKind(RoundKind):
    name = "pad"
    label = "flat pad"
    summary = "flat circular pad with sharp edges"
    command = "pad"
    bond_words = "pad radius"
    fields = {"radius": Field("length", "mm", required=True, help="pad radius", example="2 mm"),
              "thickness": Field("length", "mm", required=True, help="pad thickness", example="0.2 mm")}

    def compute(self, p, th, liquid):
        from .. import round as rd

        return rd.pad(p["radius"], p["thickness"], th, liquid=liquid, material_density=p["density"])

    def volume(self, p):
        return math.pi * p["radius"] ** 2 * p["thickness"]


register_kind(PadKind())
