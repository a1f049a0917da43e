"""Drawings the page redraws on every change, kept between reruns.

The plan view of a device changes with every solve (meniscus field, element states), but its
axes, ticks, labels, element outlines and numbers depend only on the device's geometry
(:func:`floatcalc.plotting.plan_geometry`). The page keeps one figure per geometry (a few, least
recently used first out) and redraws only the solved parts
(:func:`floatcalc.plotting.plan_view_update`), which skips creating the axes, ticks and text
layout again. No Streamlit here; each kept figure has its own lock (sessions run in threads).
"""

from __future__ import annotations

import threading
from collections import OrderedDict

#: Figure size [inch] and dots per inch of the page's plan view.
PLAN_SIZE = (8.0, 6.2)
PLAN_DPI = 100
PLAN_GRID = 70
_KEPT = 6

_lock = threading.Lock()
_figures: "OrderedDict[bytes, tuple[threading.Lock, object]]" = OrderedDict()


def plan_png(device_result) -> bytes:
    """PNG of the plan view of ``device_result`` (:func:`floatcalc.plotting.plan_view`), drawn
    on a kept figure of the same geometry when there is one."""
    from .. import plotting as pl

    geo = pl.plan_geometry(device_result)
    with _lock:
        entry = _figures.get(geo)
        if entry is not None:
            _figures.move_to_end(geo)
    if entry is not None:
        lock, ax = entry
        with lock:
            if pl.plan_view_update(ax, device_result):
                return pl.trimmed_png(ax.figure, PLAN_DPI)
    fig = pl.new_figure(PLAN_SIZE, pl.PLAN_MARGINS)
    ax = fig.add_subplot()
    pl.plan_view(device_result, ax=ax, grid=PLAN_GRID)
    lock = threading.Lock()
    with lock:
        png = pl.trimmed_png(fig, PLAN_DPI)
    with _lock:
        _figures[geo] = (lock, ax)
        _figures.move_to_end(geo)
        while len(_figures) > _KEPT:
            _figures.popitem(last=False)
    return png


def clear() -> None:
    with _lock:
        _figures.clear()


__all__ = ["plan_png", "clear", "PLAN_SIZE", "PLAN_DPI", "PLAN_GRID"]
