"""Element kind ``rod_row``: N long parallel rods on one frame sharing their menisci.

Law: exact 2D shared menisci (:mod:`floatcalc.core.parallel2d`, turning-point first integral;
Vella, Lee & Kim, Langmuir 22, 5979, 2006). Public function: :func:`floatcalc.parallel_rods`.
"""

from __future__ import annotations

import math

import numpy as np

from ._registry import (TABLE_POINTS, ElementKind, ElementModel, Field, effective_angle, from_first_contact,
                        rectangle, register_kind, rod_field, scaled_field)
from .rod import HEADING


class RodRowKind(ElementKind):
    """N long parallel rods at equal spacing on one frame.

    The law holds for a row level across its rods; if the device rolls across the row, each
    rod's force is taken from that law at its own depth (an approximation for small tilts).
    Outer rods carry an outer and an inner side, inner rods two inner sides. Seen from outside,
    the row's meniscus is that of a strip as wide as the row. End effects are not included
    (long rods; a warning below 20 l_c).
    """

    name = "rod_row"
    label = "rod row"
    summary = "row of long parallel rods sharing their menisci (exact 2D)"
    oriented = True
    bond_words = "rod radius"
    fields = {
        "radius": Field("length", "mm", required=True, help="rod radius", example="0.2 mm"),
        "length": Field("length", "mm", required=True, help="wetted length of each rod", example="50 mm"),
        "rods": Field("int", required=True, lo=2, hi=50, help="number of rods in the row (2–50)"),
        "spacing": Field("length", "mm", required=True, help="centre-to-centre spacing, more than 2 radii",
                         example="3 mm"),
        "heading": HEADING,
        "segments": Field("int", default=5, lo=2, hi=50, help="force points along each rod (2–50)"),
    }

    def check(self, p, path, problems):
        if p["spacing"] <= 2 * p["radius"]:
            problems.append(f"{path}.spacing: must exceed twice the radius ({2 * p['radius'] * 1e3:.4g} mm): "
                            f"the rods would overlap, got {p['spacing'] * 1e3:.4g} mm")
        if p["length"] < 4 * p["radius"]:
            problems.append(f"{path}.length: must be at least 4 radii, got {p['length'] * 1e3:.4g} mm")

    def footprint_radius(self, p):
        return math.hypot(0.5 * p["length"], 0.5 * (p["rods"] - 1) * p["spacing"] + p["radius"])

    def solve(self, p, liquid):
        from ..device.parallel import parallel_rods

        th = effective_angle(p["coating"]["advancing"], p["coating"])
        return parallel_rods(p["radius"], p["length"], th, p["rods"], p["spacing"], liquid=liquid,
                             material_density=p["density"])

    def model(self, p, liquid):
        from ..core import parallel2d

        lc, s = liquid.lc, liquid.sigma
        R, L, S, N = p["radius"] / lc, p["length"] / lc, p["spacing"] / lc, p["rods"]
        th = effective_angle(p["coating"]["advancing"], p["coating"])
        po, co, fo = parallel2d.outer_side(R, th, 1201)
        pi_, ci, fi, _ = parallel2d.inner_side(R, th, S, 1201)
        row = parallel2d.row_curve(R, th, S, N, n=2401)
        c_lim = row["depth"][row["i_max"]] - R
        c0 = max(co[0], ci[0], -R)
        c = np.linspace(c0, c_lim, TABLE_POINTS)
        f_out = np.interp(c, co, fo)
        f_in = np.interp(c, ci, fi)
        psi_o = np.interp(c, co, po) + th - np.pi
        h_out = 2.0 * np.sin(0.5 * psi_o)
        D = c + R
        D, h_out, f_out, f_in = from_first_contact(D, h_out, f_out, f_in)
        n = p["segments"]
        seg = L / n
        ux, uy = math.cos(p["heading"]), math.sin(p["heading"])
        vx, vy = -uy, ux
        cx, cy = p["position"]
        along = (np.arange(n) + 0.5) / n * p["length"] - 0.5 * p["length"]
        across = (np.arange(N) - 0.5 * (N - 1)) * p["spacing"]
        pts, rows = [], []
        for k, a in enumerate(across):
            per_len = (f_out + f_in) if k in (0, N - 1) else 2.0 * f_in
            for b in along:
                pts.append((cx + b * ux + a * vx, cy + b * uy + a * vy))
                rows.append(per_len * seg)
        m = N * n
        half_w = 0.5 * (N - 1) * p["spacing"] + p["radius"]
        warnings = []
        if L < 20.0:
            warnings.append(f"rod length {p['length'] * 1e3:.3g} mm is under 20 capillary lengths: end effects "
                            "of the row are not included")
        weight = N * p["density"] * math.pi * p["radius"] ** 2 * p["length"] * liquid.g
        phi_lim = float(row["phi_outer"][row["i_max"]])  # outer contact position at the limit
        return ElementModel(
            points=np.array(pts), offsets=np.full(m, -p["mount"]),
            depth=np.tile(D * lc, (m, 1)), force=np.array(rows) * s * lc, contact=np.tile(h_out * lc, (m, 1)),
            own_weight=weight, perimeter=N * (2.0 * p["length"] + 4.0 * p["radius"] * math.sin(phi_lim)),
            footprint=rectangle(cx, cy, ux, uy, 0.5 * p["length"], half_w),
            field=scaled_field(rod_field(cx / lc, cy / lc, ux, uy, 0.5 * L, half_w / lc), lc),
            broken_force=N * liquid.rho * liquid.g * math.pi * p["radius"] ** 2 * p["length"],
            warnings=warnings, model_name="exact 2D parallel rods (core.parallel2d)",
            geometry={"radius": p["radius"], "length": p["length"], "heading": p["heading"], "theta": th,
                      "rods": N, "spacing": p["spacing"]},
        )


register_kind(RodRowKind())
