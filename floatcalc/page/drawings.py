"""Drawings the page redraws on every change, kept between reruns.

The plan view of a device changes with every solve (meniscus field, element states), but its
axes, ticks, labels, element outlines and numbers depend only on the device's geometry
(:func:`floatcalc.plotting.plan_geometry`). The page keeps one figure per geometry (a few, least
recently used first out) and redraws only the solved parts
(:func:`floatcalc.plotting.plan_view_update`) over the kept pixels of the rest (titles, ticks,
labels, legend: :func:`floatcalc.plotting.plan_view_layers` says which parts change), which
skips creating the axes and ticks and laying out most text again. No Streamlit here; each
kept figure has its own lock (sessions run in threads).
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
_figures: "OrderedDict[bytes, _Kept]" = OrderedDict()


class _Kept:
    """One kept plan figure: its axes, lock and the picture without the solved parts."""

    def __init__(self, ax):
        self.ax = ax
        self.lock = threading.Lock()
        self.background = None
        self.legend_payload = None


def _background(kept: _Kept) -> None:
    """Draw the figure without its changing parts and keep those pixels."""
    from .. import plotting as pl

    ax = kept.ax
    canvas = ax.figure.canvas
    changing, covering = pl.plan_view_layers(ax)
    for a in changing + covering:
        a.set_visible(False)
    canvas.draw()
    kept.background = canvas.copy_from_bbox(ax.figure.bbox)
    for a in changing + covering:
        a.set_visible(True)
    st = ax._floatcalc_plan
    st["payload"].set_visible(st["legend_payload"])  # hidden when there is no payload
    kept.legend_payload = st["legend_payload"]


def _blit(kept: _Kept) -> bytes:
    """The picture: the kept background, then the changing parts and what covers them."""
    from .. import plotting as pl

    ax = kept.ax
    canvas = ax.figure.canvas
    canvas.restore_region(kept.background)
    changing, covering = pl.plan_view_layers(ax)
    for a in sorted(changing, key=lambda a: a.get_zorder()) + covering:
        if a.get_visible():
            ax.draw_artist(a)
    return pl.trimmed_png(ax.figure, PLAN_DPI, drawn=True)


def plan_png(device_result) -> bytes:
    """PNG of the plan view of ``device_result`` (:func:`floatcalc.plotting.plan_view`), drawn
    on a kept figure of the same geometry when there is one: only the solved parts (and what
    lies on them) are drawn again over the kept rest of the picture."""
    from .. import plotting as pl

    geo = pl.plan_geometry(device_result)
    with _lock:
        kept = _figures.get(geo)
        if kept is not None:
            _figures.move_to_end(geo)
    if kept is not None:
        with kept.lock:
            if pl.plan_view_update(kept.ax, device_result):
                if kept.ax._floatcalc_plan["legend_payload"] == kept.legend_payload:
                    return _blit(kept)
                _background(kept)  # the legend changed: a new background
                return _blit(kept)
    fig = pl.new_figure(PLAN_SIZE, pl.PLAN_MARGINS)
    ax = fig.add_subplot()
    pl.plan_view(device_result, ax=ax, grid=PLAN_GRID)
    kept = _Kept(ax)
    with kept.lock:
        png = pl.trimmed_png(fig, PLAN_DPI)  # the whole picture, drawn once
        _background(kept)  # ... and the rest kept for the next change
    with _lock:
        _figures[geo] = kept
        _figures.move_to_end(geo)
        while len(_figures) > _KEPT:
            _figures.popitem(last=False)
    return png


def clear() -> None:
    with _lock:
        _figures.clear()


__all__ = ["plan_png", "clear", "PLAN_SIZE", "PLAN_DPI", "PLAN_GRID"]
