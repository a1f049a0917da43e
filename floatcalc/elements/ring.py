"""Element kind ``ring``: a closed wire ring (ring footpad) lying flat in the surface.

Law: outer and enclosed axisymmetric menisci at a common wire depth (:mod:`floatcalc.round`).
The ring rule, ring radius ≥ 2 wire radii, is checked here once (design files, CLI, page and
:func:`floatcalc.ring` all call :func:`check_ring_rule`).
"""

from __future__ import annotations

import math

from ._registry import Field, register_kind
from ._round import RoundKind


def ring_rule(ring_radius: float, wire_radius: float) -> str | None:
    """The problem with a ring's two radii [m] together, or None: R ≥ 2 b.

    >>> ring_rule(5e-3, 2e-4) is None
    True
    >>> ring_rule(3e-4, 2e-4)
    'ring_radius: must be at least twice the wire radius (0.4 mm), got 0.3 mm'
    """
    if ring_radius < 2.0 * wire_radius:
        return (f"ring_radius: must be at least twice the wire radius ({2 * wire_radius * 1e3:.4g} mm), "
                f"got {ring_radius * 1e3:.4g} mm")
    return None


class RingKind(RoundKind):
    name = "ring"
    label = "ring footpad"
    summary = "closed wire ring lying flat in the surface"
    command = "ring"
    bond_field = "wire_radius"
    bond_words = "ring wire radius"
    fields = {"ring_radius": Field("length", "mm", required=True, help="radius of the ring's centre line",
                                   example="5 mm"),
              "wire_radius": Field("length", "mm", required=True, help="radius of the wire", example="0.2 mm")}

    def check(self, p, path, problems):
        msg = ring_rule(p["ring_radius"], p["wire_radius"])
        if msg:
            problems.append(f"{path}.{msg}")

    def compute(self, p, th, liquid):
        from .. import round as rd

        return rd.ring(p["ring_radius"], p["wire_radius"], th, liquid=liquid, material_density=p["density"])

    def outer_radius(self, p, res):
        return p["ring_radius"] + p["wire_radius"]

    def footprint_radius(self, p):
        return p["ring_radius"] + p["wire_radius"]

    def volume(self, p):
        return 2.0 * math.pi * p["ring_radius"] * math.pi * p["wire_radius"] ** 2


register_kind(RingKind())
