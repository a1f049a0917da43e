"""Element kind ``flexible_leg``: a wire leg clamped to the body that bends under its load.

Law: an elastica on the exact 2D rod-law foundation (:mod:`floatcalc.flexleg`,
:mod:`floatcalc.core.beam`; Vella, Lee & Kim 2006; Hetényi 1946). Public function:
:func:`floatcalc.flexible_leg`.
"""

from __future__ import annotations

import math

import numpy as np

from ._registry import (TABLE_POINTS, ElementKind, ElementModel, Field, effective_angle, rectangle,
                        register_kind, rod_field, scaled_field)
from .rod import HEADING


class FlexibleLegKind(ElementKind):
    name = "flexible_leg"
    label = "flexible leg"
    summary = "flexible wire leg clamped to the body, bending under its capillary load"
    oriented = True
    bond_words = "leg radius"
    fields = {
        "radius": Field("length", "mm", required=True, help="wire radius", example="0.1 mm"),
        "length": Field("length", "mm", required=True, help="leg length from the clamp to the tip",
                        example="60 mm"),
        "heading": HEADING,
        "clamp_angle": Field("signed_angle", "deg", default=0.0, lo=-math.radians(45), hi=math.radians(45),
                             example="5 deg", help="slope at the clamp below horizontal"),
        "toe_angle": Field("angle", "deg", default=0.0, example="20 deg",
                           help="upturned toe over the last 10 % of the leg (0–90 deg)"),
        "youngs_modulus": Field("modulus", "GPa", example="200 GPa",
                                help="Young's modulus (default: from the material)"),
    }

    def check(self, p, path, problems):
        if p.get("youngs_modulus") is None and p.get("material_name") is None:
            problems.append(f"{path}.youngs_modulus: required when no material name is given "
                            f"(e.g. '200 GPa'), got neither")
        if p.get("toe_angle") is not None and p["toe_angle"] > math.pi / 2 + 1e-12:
            problems.append(f"{path}.toe_angle: must be between 0 and 90 deg, got {math.degrees(p['toe_angle']):.4g} deg")

    def footprint_radius(self, p):
        return 0.5 * p["length"]

    def _args(self, p):
        th = effective_angle(p["coating"]["advancing"], p["coating"])
        rec = p["coating"].get("receding")
        return dict(radius=p["radius"], length=p["length"], contact_angle=th,
                    receding_angle=None if rec is None or rec > th else rec,
                    youngs_modulus=p.get("youngs_modulus"), material=p.get("material_name"),
                    clamp_angle=p["clamp_angle"], toe_angle=p["toe_angle"] or None,
                    material_density=p["density"])

    def solve(self, p, liquid):
        from ..flexleg import flexible_leg

        a = self._args(p)
        return flexible_leg(a.pop("radius"), a.pop("length"), a.pop("contact_angle"), liquid=liquid, **a)

    def model(self, p, liquid):
        from ..flexleg import flexible_leg_curve

        a = self._args(p)
        c = flexible_leg_curve(a.pop("radius"), a.pop("length"), a.pop("contact_angle"), liquid=liquid,
                               points=25, start="touch", **a)
        D = c.clamp_depth.to("m").magnitude
        F = c.force.to("N").magnitude
        H = c.contact_depth.to("m").magnitude
        grid = np.linspace(D[0], D[-1], TABLE_POINTS)
        ux, uy = math.cos(p["heading"]), math.sin(p["heading"])
        cx, cy = p["position"]
        lc = liquid.lc
        mid = (cx + 0.5 * p["length"] * ux, cy + 0.5 * p["length"] * uy)
        return ElementModel(
            points=np.array([[cx, cy]]), offsets=np.array([-p["mount"]]),
            depth=grid[None, :], force=np.interp(grid, D, F)[None, :], contact=np.interp(grid, D, H)[None, :],
            own_weight=c.own_weight.to("N").magnitude,
            perimeter=2.0 * p["length"] + 2.0 * p["radius"],
            footprint=rectangle(cx, cy, ux, uy, 0.5 * p["length"], p["radius"], start=True),
            field=scaled_field(rod_field(mid[0] / lc, mid[1] / lc, ux, uy, 0.5 * p["length"] / lc,
                                         p["radius"] / lc), lc),
            broken_force=liquid.rho * liquid.g * math.pi * p["radius"] ** 2 * p["length"],
            warnings=[*c.warnings, "flexible leg: its force acts at the clamp in the device balance (the clamp "
                      "moment is not passed to pitch and roll); depth is the clamp's"],
            model_name="elastica on the exact 2D rod law (floatcalc.flexleg; Vella, Lee & Kim 2006; Hetényi 1946)",
            geometry={"radius": p["radius"], "length": p["length"], "heading": p["heading"]},
        )


register_kind(FlexibleLegKind())
