"""Shared adapter of the round element kinds (pin, ball, pad, ring): one force point with the
element's axisymmetric force–depth curve (:mod:`floatcalc.round`).

The curve is cut at the element's limit (``depth_at_max``). The contact-line depth that drives
the neighbours is taken from the surface-tension part through Keller's theorem for the
linearised outer meniscus, F_st = 2π σ r_c h₀ K₁(r_c/l_c)/(l_c K₀(r_c/l_c)), with r_c the outer
contact radius at the limit (an approximation for a ring, whose inner line pulls on enclosed
liquid that does not spread outward).
"""

from __future__ import annotations

import math

import numpy as np

from ._registry import (TABLE_POINTS, ElementKind, ElementModel, axisym_field, circle, effective_angle,
                        from_first_contact, scaled_field)


_PLACEMENT = ("position", "name", "group", "index", "heading", "mount", "layout", "layout_radius", "layout_spacing",
              "start_angle", "count")
_CACHE: dict = {}
_CACHE_MAX = 256


def _key(kind, p, liquid):
    import json

    geo = {k: v for k, v in p.items() if k not in _PLACEMENT}
    return (kind, json.dumps(geo, sort_keys=True, default=str), liquid.sigma, liquid.rho, liquid.g, liquid.name)


class RoundKind(ElementKind):
    def compute(self, p, th, liquid):  # pragma: no cover - abstract
        raise NotImplementedError

    def solve(self, p, liquid):
        """The element's result; equal elements (copies in a layout) are solved once."""
        key = _key(self.name, p, liquid)
        if key not in _CACHE:
            if len(_CACHE) >= _CACHE_MAX:
                _CACHE.pop(next(iter(_CACHE)))
            th = effective_angle(p["coating"]["advancing"], p["coating"])
            _CACHE[key] = self.compute(p, th, liquid)
        return _CACHE[key]

    def outer_radius(self, p, res) -> float:
        return float(res.contact_radius_at_max.to("m").magnitude)

    def volume(self, p) -> float:  # pragma: no cover - abstract
        raise NotImplementedError

    def limit_depth(self, p, res, D) -> float:
        return float(res.depth_at_max.to("m").magnitude)

    def model(self, p, liquid):
        from scipy.special import k0e, k1e

        lc, s = liquid.lc, liquid.sigma
        res = self.solve(p, liquid)
        c = res.curve
        D = c.depth.to("m").magnitude
        F = c.force.to("N").magnitude
        Fst = c.surface_tension.to("N").magnitude
        d_lim = self.limit_depth(p, res, D)
        keep = D < d_lim
        # the table ends at the element's own limit, with the refined limit force of its result
        # (one answer: the element alone in a device carries exactly its public max_force)
        f_lim = float(res.max_force.to("N").magnitude)
        st_lim = float(res.surface_tension_part.to("N").magnitude)
        D = np.append(D[keep], d_lim)
        F = np.append(F[keep], f_lim)
        Fst = np.append(Fst[keep], st_lim)
        D, F, Fst = from_first_contact(D, F, Fst)
        grid = np.linspace(D[0], D[-1], TABLE_POINTS)
        Fg = np.interp(grid, D, F)
        rc = max(self.outer_radius(p, res), 1e-9)
        h0 = np.interp(grid, D, Fst) * lc / (s * 2.0 * math.pi * rc * k1e(rc / lc) / k0e(rc / lc))
        cx, cy = p["position"]
        return ElementModel(
            points=np.array([[cx, cy]]), offsets=np.array([-p["mount"]]),
            depth=grid[None, :], force=Fg[None, :], contact=h0[None, :],
            own_weight=float(res.own_weight.to("N").magnitude),
            perimeter=float(res.contact_perimeter.to("m").magnitude),
            footprint=circle(cx, cy, self.footprint_radius(p)),
            field=scaled_field(axisym_field(cx / lc, cy / lc, rc / lc), lc),
            broken_force=liquid.rho * liquid.g * self.volume(p),
            warnings=[w for w in res.warnings if "material density" not in w],
            model_name=f"axisymmetric meniscus (floatcalc.round.{self.name})",
            geometry={**{k: p[k] for k in self.fields if k in p},
                      "theta": effective_angle(p["coating"]["advancing"], p["coating"])},
        )
