"""Element kind ``ball``: a ball foot (sphere) pressed into the surface.

Law: the axisymmetric meniscus (:mod:`floatcalc.core.round_bodies`). Public function:
:func:`floatcalc.ball`.
"""

from __future__ import annotations

import math

from ._registry import Field, register_kind
from ._round import RoundKind


class BallKind(RoundKind):
    name = "ball"
    label = "ball foot"
    plural = "ball feet"
    summary = "ball foot (sphere) pressed into the surface"
    command = "ball"
    bond_words = "ball radius"
    fields = {"radius": Field("length", "mm", required=True, help="ball radius", example="0.5 mm")}

    def compute(self, p, th, liquid):
        from .. import round as rd

        return rd.ball(p["radius"], th, liquid=liquid, material_density=p["density"])

    def volume(self, p):
        return 4.0 / 3.0 * math.pi * p["radius"] ** 3


register_kind(BallKind())
