"""Shared adapter of the round element kinds (pin, ball, pad, ring): one force point with the
element's axisymmetric force–depth curve (:mod:`floatcalc.round`).

The curve is cut at the element's limit (``depth_at_max``). The contact-line depth that drives
the neighbours is taken from the surface-tension part through Keller's theorem for the
linearised outer meniscus, F_st = 2π σ r_c h₀ K₁(r_c/l_c)/(l_c K₀(r_c/l_c)), with r_c the outer
contact radius at the limit (an approximation for a ring, whose inner line pulls on enclosed
liquid that does not spread outward).
"""

from __future__ import annotations


import numpy as np

from ._registry import (ElementKind, ElementModel, axisym_field, circle, effective_angle,
                        scaled_field)


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

    def _tables(self, p, liquid):
        """The batched tables of :func:`floatcalc.round.element_tables` for this element (one row,
        a few ms instead of a full public solve; same limit to 1e-8), or None to use the result."""
        from ..round import element_tables

        geo = {k: p[k] for k in self.fields}
        th = effective_angle(p["coating"]["advancing"], p["coating"])
        key = ("tables",) + _key(self.name, p, liquid)[1:]
        if key not in _CACHE:
            if len(_CACHE) >= _CACHE_MAX:
                _CACHE.pop(next(iter(_CACHE)))
            _CACHE[key] = element_tables(self.name, contact_angle=th, liquid=liquid, material_density=p["density"],
                                         **geo)
        return _CACHE[key]

    def model(self, p, liquid):
        lc = liquid.lc
        t = self._tables(p, liquid)
        grid = t.depth_m[0]
        Fg = t.force_N[0].copy()
        Fg[-1] = max(float(t.max_force_N[0]), float(Fg[-1]))  # end at the refined limit force
        h0 = t.contact_depth_m[0]
        rc = max(float(t.contact_radius_m[0]), 1e-9)
        if self.name == "ring":
            rc = p["ring_radius"] + p["wire_radius"]
        cx, cy = p["position"]
        return ElementModel(
            points=np.array([[cx, cy]]), offsets=np.array([-p["mount"]]),
            depth=grid[None, :], force=Fg[None, :], contact=h0[None, :],
            own_weight=float(t.own_weight_N[0]), perimeter=float(t.perimeter_m[0]),
            footprint=circle(cx, cy, self.footprint_radius(p)),
            field=scaled_field(axisym_field(cx / lc, cy / lc, rc / lc), lc),
            broken_force=liquid.rho * liquid.g * self.volume(p),
            warnings=[w for w in t.warnings[0] if "material density" not in w],
            model_name=f"axisymmetric meniscus (floatcalc.round.{self.name})",
            geometry={**{k: p[k] for k in self.fields if k in p},
                      "theta": effective_angle(p["coating"]["advancing"], p["coating"])},
        )
