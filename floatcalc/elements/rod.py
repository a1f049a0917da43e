"""Element kind ``rod``: a straight horizontal rod (wire leg) lying in the surface.

Law: the exact 2D rod law along the rod (Vella, Lee & Kim, Langmuir 22, 5979, 2006) with the
ends of :mod:`floatcalc.core.finite_rod` (bounded by the contact line across each end face).
Public function: :func:`floatcalc.rod` (module :mod:`floatcalc.rods`); the device adapter
below uses the same law, so a rod alone in a device has the same limit.
"""

from __future__ import annotations

import functools
import math

import numpy as np

from ._registry import (TABLE_POINTS, ElementKind, ElementModel, Field, effective_angle, from_first_contact,
                        rectangle, register_kind, rod_field, scaled_field)

HEADING = Field("signed_angle", "deg", default=0.0, lo=-2 * math.pi, hi=2 * math.pi, example="30 deg",
                help="direction of the axis in plan, from +x (a layout 'around' points it outward)")


class RodKind(ElementKind):
    name = "rod"
    label = "long leg"
    summary = "straight horizontal rod (wire leg) lying in the surface"
    command = "leg"
    oriented = True
    bond_words = "leg radius"
    fields = {
        "radius": Field("length", "mm", required=True, help="rod radius", example="0.2 mm"),
        "length": Field("length", "mm", required=True, help="wetted length", example="40 mm"),
        "heading": HEADING,
        "tilt": Field("signed_angle", "deg", default=0.0, lo=-math.radians(30), hi=math.radians(30),
                      example="0 deg", help="inclination of the axis (positive: the end along the heading lower)"),
        "segments": Field("int", default=5, lo=2, hi=50, help="force points along the rod (2–50)"),
    }

    def check(self, p, path, problems):
        if p.get("radius") and p.get("length") and p["length"] < 4 * p["radius"]:
            problems.append(f"{path}.length: must be at least 4 radii for a rod (use a pin or ball for "
                            f"a stubby foot), got {p['length'] * 1e3:.4g} mm")

    def footprint_radius(self, p):
        return 0.5 * p["length"]

    def solve(self, p, liquid):
        from ..rods import rod

        th = effective_angle(p["coating"]["advancing"], p["coating"])
        rec = p["coating"].get("receding")
        return rod(p["radius"], p["length"], th, receding_angle=None if rec is None or rec > th else rec,
                   liquid=liquid, material_density=p["density"])

    def model(self, p, liquid):
        from ..core import finite_rod
        from ..rods import contact_perimeter

        lc, s = liquid.lc, liquid.sigma
        R, L = p["radius"] / lc, p["length"] / lc
        th = effective_angle(p["coating"]["advancing"], p["coating"])
        n = p["segments"]
        lim_phi, D, hd, F = _tables(R, th, L, n)
        ux, uy = math.cos(p["heading"]), math.sin(p["heading"])
        along = (np.arange(n) + 0.5) / n * p["length"] - 0.5 * p["length"]   # [m]
        cx, cy = p["position"]
        pts = np.column_stack([cx + along * ux, cy + along * uy])
        offs = along * math.tan(p["tilt"]) - p["mount"]
        weight = p["density"] * math.pi * p["radius"] ** 2 * p["length"] * liquid.g
        warnings = []
        if L < finite_rod.MIN_LENGTH:
            warnings.append(f"rod length {p['length'] * 1e3:.3g} mm is under {finite_rod.MIN_LENGTH:g} capillary "
                            f"lengths: the end model assumes independent ends")
        if th < math.pi / 2:
            warnings.append("wetting rod (advancing angle below 90°): the limit is the liquid closing over the top")
        return ElementModel(
            points=pts, offsets=offs,
            depth=np.tile(D * lc, (n, 1)), force=F * s * lc, contact=np.tile(hd * lc, (n, 1)),
            own_weight=weight, perimeter=contact_perimeter(p["radius"], p["length"], lim_phi),
            footprint=rectangle(cx, cy, ux, uy, 0.5 * p["length"], p["radius"]),
            field=scaled_field(rod_field(cx / lc, cy / lc, ux, uy, 0.5 * L, R), lc),
            broken_force=liquid.rho * liquid.g * math.pi * p["radius"] ** 2 * p["length"],
            warnings=warnings,
            model_name="exact 2D rod law (Vella, Lee & Kim 2006) with bounded ends (core.finite_rod)",
            geometry={"radius": p["radius"], "length": p["length"], "heading": p["heading"], "theta": th},
        )


@functools.lru_cache(maxsize=256)
def _tables(R: float, th: float, L: float, n: int):
    """Scaled force tables of a rod of n segments (the position-free part of the model; rods
    alike in a device, e.g. the legs of a ring, share one). Arrays are read-only."""
    from ..core import finite_rod, rod2d

    lim = finite_rod.limit(R, th, L)
    phi = np.linspace(0.0, lim["phi"], TABLE_POINTS)
    f_st, f_p, D = rod2d.force_parts(phi, R, th)
    seg = L / n
    ends = 2.0 * finite_rod.end_force(phi, R, f_st)  # both ends together
    F = np.tile((f_st + f_p) * seg, (n, 1))
    F[0] += 0.5 * ends
    F[-1] += 0.5 * ends
    hd = 2.0 * np.sin(0.5 * (phi + th - np.pi))
    D0 = D
    D, hd = from_first_contact(D0, hd)
    F = np.array([from_first_contact(D0, row)[1] for row in F])
    for a in (D, hd, F):
        a.flags.writeable = False
    return float(lim["phi"]), D, hd, F


register_kind(RodKind())
