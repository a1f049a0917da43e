"""Water walking in motion: jumps and strokes against the meniscus limit, coatings under pressure.

* :func:`floatcalc.motion.jump.jump` — take-off of a device pushing off the surface (momentum
  against the quasi-static force–depth law, limit force never exceeded; Koh et al. 2015),
* :func:`floatcalc.motion.stroke.stroke` — a rowing stroke: vertical and horizontal leg force
  against the meniscus' capacity, Weber number and the minimum wave speed,
* :func:`floatcalc.motion.coating.coating_under_pressure` — a textured coating (posts or grooves)
  against the hydrostatic and dynamic pressure; it floods to the Wenzel state past its
  depinning or sag pressure (numeric core: :mod:`floatcalc.core.wetting`).

The device enters only through :func:`floatcalc.motion._device.heave_law`.
"""

from __future__ import annotations

__all__ = ["coating_under_pressure", "jump", "stroke"]


def __getattr__(name):
    import importlib

    where = {"jump": "jump", "stroke": "stroke", "coating_under_pressure": "coating",
             "JumpResult": "jump", "StrokeResult": "stroke"}
    if name not in where:
        raise AttributeError(f"module 'floatcalc.motion' has no attribute {name!r}")
    return getattr(importlib.import_module(f".{where[name]}", __name__), name)
