"""Matplotlib drawings of floatcalc results: cross-sections to scale, force–depth curves.

Front-end module: no physics, only drawing of what the API returns. It is imported by the page
and the report, never by ``import floatcalc``; matplotlib is imported inside the functions.
Every function draws on ``ax`` if given, else on a new :class:`matplotlib.figure.Figure`
(no pyplot state, so it is safe in a Streamlit server), and returns the axes.

Cross-sections are drawn to scale (equal aspect); lengths in mm, forces in mN.

>>> import floatcalc as fc
>>> ax = meniscus_section(fc.rod("0.25 mm", "40 mm", "150 deg"))
>>> ax.get_aspect(), ax.get_xlabel()
(1.0, 'horizontal distance from the leg axis [mm]')
"""

from __future__ import annotations

import math
from typing import Any

import numpy as np

#: The page's own palette.
COLOURS = {
    "liquid": "#d3ebf0",
    "interface": "#176a85",
    "solid": "#6b5444",
    "solid_edge": "#3b2c22",
    "contact": "#e4572e",
    "depth": "#6d3f9c",
    "surface": "#8aa1ad",
    "total": "#13233f",
    "surface_tension": "#2a9d8f",
    "pressure": "#d99a26",
    "load": "#b33c2e",
}
VERDICT_COLOURS = {"floats with margin": "#2d7a3a", "marginal": "#a86200", "sinks": "#b3261e"}
_SERIES = ("#13233f", "#c44536", "#2a9d8f", "#8a5a9e", "#d99a26", "#4f6d7a")

SECTION_XLABEL = "horizontal distance from the leg axis [mm]"
SECTION_YLABEL = "height above the undisturbed surface [mm]"
DEPTH_LABEL = "depth of the lowest point below the undisturbed surface [mm]"
FORCE_LABEL = "upward force from the liquid [mN]"


def _axes(ax, size=(7.0, 3.6)):
    if ax is not None:
        return ax
    from matplotlib.figure import Figure

    fig = Figure(figsize=size, layout="constrained")
    return fig.add_subplot()


def _style(ax):
    ax.grid(True, color="#e6e6e6", lw=0.6)
    ax.set_axisbelow(True)
    for side in ("top", "right"):
        ax.spines[side].set_visible(False)


def meniscus_section(result: Any, ax=None, extent_lc: float = 3.0, zoom: bool = False):
    """Cross-section of a long leg at its limit: liquid, meniscus, leg section, contact points.

    Drawn to scale (equal aspect) in mm, from ``result.profile`` of a
    :class:`~floatcalc.rods.RodResult`. The solid is the patch with gid ``"solid"``, the contact
    points the collection with gid ``"contact points"``; the depth of the lowest point is marked.

    Parameters
    ----------
    result : RodResult
    extent_lc : float
        How far to draw the meniscus beyond the contact points, in capillary lengths.
    zoom : bool
        Draw a close-up around the leg instead (still to scale), for legs much thinner than the
        capillary length.
    """
    from matplotlib.patches import Circle, Polygon

    ax = _axes(ax)
    p = result.profile
    if p.get("body") == "torus":
        return _ring_section(result, ax, extent_lc, zoom)
    if "r_m" in p:
        return _round_section(result, ax, extent_lc, zoom)
    mm = 1e3
    R = p["radius_m"] * mm
    zc_centre = p["centre_z_m"] * mm
    xr, zr = (np.asarray(a) * mm for a in p["right_m"])
    xl, zl = (np.asarray(a) * mm for a in p["left_m"])
    cx, cz = p["contact_m"][0] * mm, p["contact_m"][1] * mm
    depth = p["depth_m"] * mm
    lc = result.liquid.lc * mm if result.liquid is not None else 2.7
    X = abs(cx) + extent_lc * lc
    keep_r, keep_l = xr <= X, xl >= -X
    xr, zr, xl, zl = xr[keep_r], zr[keep_r], xl[keep_l], zl[keep_l]
    bottom = -(depth + 0.6 * lc)

    # Liquid: below the left meniscus, the wetted arc of the leg and the right meniscus.
    phi = math.radians(result.contact_position_at_max.to("deg").magnitude)
    a = np.linspace(-phi, phi, 120)
    arc_x, arc_z = R * np.sin(a), zc_centre - R * np.cos(a)
    outline = np.concatenate([
        np.column_stack([xl[::-1], zl[::-1]]),
        np.column_stack([arc_x, arc_z]),
        np.column_stack([xr, zr]),
        [[xr[-1] if xr.size else X, bottom], [xl[-1] if xl.size else -X, bottom]],
    ])
    ax.add_patch(Polygon(outline, closed=True, facecolor=COLOURS["liquid"], edgecolor="none",
                         zorder=1, gid="liquid", label="liquid"))
    ax.plot(xr, zr, color=COLOURS["interface"], lw=1.8, zorder=3, label="meniscus (liquid surface)")
    ax.plot(xl, zl, color=COLOURS["interface"], lw=1.8, zorder=3)
    ax.axhline(0.0, color=COLOURS["surface"], lw=0.9, ls=(0, (5, 4)), zorder=2,
               label="undisturbed surface")
    ax.add_patch(Circle((0.0, zc_centre), R, facecolor=COLOURS["solid"], edgecolor=COLOURS["solid_edge"],
                        lw=1.0, zorder=4, gid="solid", label="leg section (solid)"))
    pts = ax.scatter([-cx, cx], [cz, cz], s=36, color=COLOURS["contact"], edgecolor="white", lw=0.8,
                     zorder=5, label="contact points")
    pts.set_gid("contact points")
    low = zc_centre - R
    if not zoom:
        xd = -X * 0.82
        ax.annotate("", xy=(xd, low), xytext=(xd, 0.0),
                    arrowprops={"arrowstyle": "<->", "color": COLOURS["depth"], "lw": 1.2}, zorder=5)
        ax.plot([xd, 0.0], [low, low], color=COLOURS["depth"], lw=0.8, ls=":", zorder=5)
        ax.text(xd + 0.04 * X, 0.5 * low, f"depth {depth:.3g} mm", color=COLOURS["depth"], fontsize=8.5,
                va="center", ha="left", zorder=6)
    top = max(zc_centre + R, 0.0) + 0.35 * lc
    if zoom:  # close-up around the leg, still to scale
        X = max(3.0 * R, 1.6 * abs(cx), 0.2 * lc)
        bottom, top = zc_centre - 0.75 * X, zc_centre + 0.75 * X
        ax.plot([-X, 0.0], [low, low], color=COLOURS["depth"], lw=0.8, ls=":", zorder=5)
        ax.text(-0.95 * X, low - 0.02 * X, f"lowest point: depth {depth:.3g} mm", color=COLOURS["depth"],
                fontsize=8.5, va="top", ha="left", zorder=6)
    ax.set_xlim(-X, X)
    ax.set_ylim(bottom, top)
    ax.set_aspect("equal")
    ax.set_xlabel(SECTION_XLABEL)
    ax.set_ylabel(SECTION_YLABEL)
    ax.set_title("Close-up of the leg at the limit (to scale)" if zoom else
                 "Meniscus cross-section at the limit load (to scale)", fontsize=10, loc="left")
    if not zoom:
        ax.legend(loc="lower right", fontsize=7, framealpha=0.85, ncols=2)
    _style(ax)
    return ax


def _round_section(result: Any, ax, extent_lc: float, zoom: bool):
    """Axisymmetric cross-section (ball or pad) through the axis, drawn like the rod section."""
    from matplotlib.patches import Circle, Polygon, Rectangle

    p = result.profile
    mm = 1e3
    r = np.asarray(p["r_m"]) * mm
    z = np.asarray(p["z_m"]) * mm
    R = p["radius_m"] * mm
    lc = result.liquid.lc * mm if result.liquid is not None else 2.7
    cx, cz = float(r[0]), float(z[0])
    X = abs(cx) + extent_lc * lc
    keep = r <= X
    r, z = r[keep], z[keep]
    depth = result.depth_at_max.to("mm").magnitude
    bottom = -(depth + 0.6 * lc)
    if p.get("body") == "sphere":
        zc0 = p["centre_z_m"] * mm
        phi = math.radians(result.details.get("contact_position_at_max_deg", 90.0))
        a = np.linspace(-phi, phi, 120)
        wet = np.column_stack([R * np.sin(a), zc0 - R * np.cos(a)])
        solid = Circle((0.0, zc0), R)
        low, top_s = zc0 - R, zc0 + R
    elif p.get("body") == "cylinder":  # vertical pin: flat tip at the operating depth, side wetted
        zb = -depth
        L = result.details.get("length_m", 2.0 * depth / mm) * mm
        wet = np.array([[-R, cz], [-R, zb], [R, zb], [R, cz]])
        solid = Rectangle((-R, zb), 2 * R, L)
        low, top_s = zb, min(zb + L, max(cz, 0.0) + 0.5 * lc)
    else:  # flat disc with sharp edges
        zb = p["bottom_z_m"] * mm
        t = p["thickness_m"] * mm
        wet = np.array([[-R, cz], [-R, zb], [R, zb], [R, cz]])
        solid = Rectangle((-R, zb), 2 * R, t)
        low, top_s = zb, zb + t
    outline = np.concatenate([np.column_stack([-r[::-1], z[::-1]]), wet, np.column_stack([r, z]),
                              [[r[-1], bottom], [-r[-1], bottom]]])
    ax.add_patch(Polygon(outline, closed=True, facecolor=COLOURS["liquid"], edgecolor="none", zorder=1,
                         gid="liquid", label="liquid"))
    ax.plot(r, z, color=COLOURS["interface"], lw=1.8, zorder=3, label="meniscus (liquid surface)")
    ax.plot(-r, z, color=COLOURS["interface"], lw=1.8, zorder=3)
    ax.axhline(0.0, color=COLOURS["surface"], lw=0.9, ls=(0, (5, 4)), zorder=2, label="undisturbed surface")
    solid.set(facecolor=COLOURS["solid"], edgecolor=COLOURS["solid_edge"], lw=1.0, zorder=4, gid="solid",
              label=f"{result.element} section (solid)")
    ax.add_patch(solid)
    pts = ax.scatter([-cx, cx], [cz, cz], s=36, color=COLOURS["contact"], edgecolor="white", lw=0.8,
                     zorder=5, label="contact points")
    pts.set_gid("contact points")
    top = max(top_s, 0.0) + 0.35 * lc
    if zoom:
        X = max(1.6 * R, 1.4 * abs(cx), 0.2 * lc)
        mid = 0.5 * (low + top_s)
        bottom, top = mid - 0.75 * X, mid + 0.75 * X
        ax.plot([-X, 0.0], [low, low], color=COLOURS["depth"], lw=0.8, ls=":", zorder=5)
        ax.text(-0.95 * X, low - 0.02 * X, f"lowest point: depth {depth:.3g} mm", color=COLOURS["depth"],
                fontsize=8.5, va="top", ha="left", zorder=6)
    else:
        xd = -X * 0.82
        ax.annotate("", xy=(xd, low), xytext=(xd, 0.0),
                    arrowprops={"arrowstyle": "<->", "color": COLOURS["depth"], "lw": 1.2}, zorder=5)
        ax.plot([xd, 0.0], [low, low], color=COLOURS["depth"], lw=0.8, ls=":", zorder=5)
        ax.text(xd + 0.04 * X, 0.5 * low, f"depth {depth:.3g} mm", color=COLOURS["depth"], fontsize=8.5,
                va="center", ha="left", zorder=6)
        ax.legend(loc="lower right", fontsize=7, framealpha=0.85, ncols=2)
    ax.set_xlim(-X, X)
    ax.set_ylim(min(bottom, low - 0.1 * lc), top)
    ax.set_aspect("equal")
    ax.set_xlabel("horizontal distance from the element axis [mm]")
    ax.set_ylabel(SECTION_YLABEL)
    ax.set_title("Close-up of the element at the limit (to scale)" if zoom else
                 "Meniscus cross-section through the axis at the limit load (to scale)", fontsize=10, loc="left")
    _style(ax)
    return ax


def _ring_section(result: Any, ax, extent_lc: float, zoom: bool):
    """Cross-section of a ring footpad through its axis: both wire sections, outer and inner menisci."""
    from matplotlib.patches import Circle, Polygon

    p = result.profile
    mm = 1e3
    ro, zo = (np.asarray(p["outer"][q]) * mm for q in ("r_m", "z_m"))
    ri, zi = (np.asarray(p["inner"][q]) * mm for q in ("r_m", "z_m"))
    Rr, b, zc = p["ring_radius_m"] * mm, p["wire_radius_m"] * mm, p["wire_centre_z_m"] * mm
    lc = result.liquid.lc * mm if result.liquid is not None else 2.7
    X = float(ro[0]) + extent_lc * lc
    keep = ro <= X
    ro, zo = ro[keep], zo[keep]
    # the inner meniscus runs from the inner contact line towards the axis
    order = np.argsort(ri)
    ri, zi = ri[order], zi[order]
    depth = result.depth_at_max.to("mm").magnitude
    low = zc - b
    bottom = min(-(depth + 0.6 * lc), low - 0.1 * lc)
    outline = np.concatenate([
        np.column_stack([-ro[::-1], zo[::-1]]), [[-Rr, zc]], np.column_stack([-ri[::-1], zi[::-1]]),
        np.column_stack([ri, zi]), [[Rr, zc]], np.column_stack([ro, zo]),
        [[ro[-1], bottom], [-ro[-1], bottom]]])
    ax.add_patch(Polygon(outline, closed=True, facecolor=COLOURS["liquid"], edgecolor="none", zorder=1,
                         gid="liquid", label="liquid"))
    for sgn in (1.0, -1.0):
        ax.plot(sgn * ro, zo, color=COLOURS["interface"], lw=1.8, zorder=3,
                label="meniscus (liquid surface)" if sgn > 0 else None)
        ax.plot(sgn * ri, zi, color=COLOURS["interface"], lw=1.8, zorder=3)
        ax.add_patch(Circle((sgn * Rr, zc), b, facecolor=COLOURS["solid"], edgecolor=COLOURS["solid_edge"],
                            lw=1.0, zorder=4, gid="solid", label="wire section (solid)" if sgn > 0 else None))
    ax.axhline(0.0, color=COLOURS["surface"], lw=0.9, ls=(0, (5, 4)), zorder=2, label="undisturbed surface")
    co, ci = (float(ro[0]), float(zo[0])), (float(ri[-1]), float(zi[-1]))
    pts = ax.scatter([-co[0], co[0], -ci[0], ci[0]], [co[1], co[1], ci[1], ci[1]], s=36, color=COLOURS["contact"],
                     edgecolor="white", lw=0.8, zorder=5, label="contact points")
    pts.set_gid("contact points")
    top = max(zc + b, float(np.max(zi)) if zi.size else 0.0, 0.0) + 0.35 * lc
    if zoom:  # close-up around the right-hand wire section, still to scale
        w = max(4.0 * b, 1.6 * (co[0] - ci[0]), 0.2 * lc)
        ax.set_xlim(Rr - w, Rr + w)
        ax.set_ylim(zc - 0.75 * w, zc + 0.75 * w)
        ax.plot([Rr - w, Rr], [low, low], color=COLOURS["depth"], lw=0.8, ls=":", zorder=5)
        ax.text(Rr - 0.95 * w, low - 0.02 * w, f"lowest point: depth {depth:.3g} mm", color=COLOURS["depth"],
                fontsize=8.5, va="top", ha="left", zorder=6)
    else:
        xd = -X * 0.9
        ax.annotate("", xy=(xd, low), xytext=(xd, 0.0),
                    arrowprops={"arrowstyle": "<->", "color": COLOURS["depth"], "lw": 1.2}, zorder=5)
        ax.plot([xd, -Rr], [low, low], color=COLOURS["depth"], lw=0.8, ls=":", zorder=5)
        ax.text(xd + 0.03 * X, 0.5 * low, f"depth {depth:.3g} mm", color=COLOURS["depth"], fontsize=8.5,
                va="center", ha="left", zorder=6)
        ax.legend(loc="lower right", fontsize=7, framealpha=0.85, ncols=2)
        ax.set_xlim(-X, X)
        ax.set_ylim(bottom, top)
    ax.set_aspect("equal")
    ax.set_xlabel("horizontal distance from the ring axis [mm]")
    ax.set_ylabel(SECTION_YLABEL)
    ax.set_title("Close-up of the wire at the limit (to scale)" if zoom else
                 "Ring cross-section through the axis at the limit load (to scale)", fontsize=10, loc="left")
    _style(ax)
    return ax


def force_depth(result: Any, ax=None, load: Any = None, operating_depth: Any = None, parts: bool = True):
    """Force–depth curve of one element group with its limit, parts and operating point.

    Parameters
    ----------
    result : RodResult (or any result with ``curve``, ``max_force``, ``depth_at_max``)
    load : quantity [force], optional
        Load the group carries; drawn as a horizontal line, with the operating point at
        ``operating_depth`` (quantity [length]) if it exists.
    parts : bool
        Also draw the surface-tension and pressure parts.
    """
    ax = _axes(ax)
    c = result.curve
    d = c.depth.to("mm").magnitude
    ax.plot(d, c.force.to("mN").magnitude, color=COLOURS["total"], lw=2.0, label="total force")
    if parts:
        ax.plot(d, c.surface_tension.to("mN").magnitude, color=COLOURS["surface_tension"], lw=1.3,
                ls="--", label="surface-tension part")
        ax.plot(d, c.pressure.to("mN").magnitude, color=COLOURS["pressure"], lw=1.3, ls="-.",
                label="pressure (buoyancy) part")
    dm, fm = result.depth_at_max.to("mm").magnitude, result.max_force.to("mN").magnitude
    lim = ax.scatter([dm], [fm], marker="v", s=70, color=COLOURS["total"], zorder=5,
                     label=f"limit {fm:.3g} mN at {dm:.3g} mm")
    lim.set_gid("limit")
    if load is not None:
        fl = load.to("mN").magnitude
        ax.axhline(fl, color=COLOURS["load"], lw=1.0, ls=":", label=f"load carried {fl:.3g} mN")
        if operating_depth is not None:
            op = ax.scatter([operating_depth.to("mm").magnitude], [fl], s=60, color=COLOURS["load"],
                            edgecolor="white", zorder=6, label="operating point")
            op.set_gid("operating point")
    ax.axhline(0.0, color="#999999", lw=0.6)
    ax.set_xlabel(DEPTH_LABEL)
    ax.set_ylabel(FORCE_LABEL)
    ax.set_title("Force against depth, up to break-through", fontsize=10, loc="left")
    ax.legend(fontsize=7.5, frameon=False, loc="upper left")
    _style(ax)
    return ax


def compare_curves(items: list[tuple[str, Any]], ax=None):
    """Overlaid force–depth curves of several assessed designs (:class:`~floatcalc.report.Assessment`).

    Each element group gets a line ending in its limit marker, and the load that curve carries
    (its share of the design's weight) as a dotted line in the same colour.
    """
    ax = _axes(ax)
    for k, (name, a) in enumerate(items):
        col = _SERIES[k % len(_SERIES)]
        for j, o in enumerate(a.elements):
            c = o.result.curve
            lab = name if len(a.elements) == 1 else f"{name}, group {j + 1}"
            if getattr(o, "per_element", 1) > 1:
                lab += " (one of its elements)"
            ax.plot(c.depth.to("mm").magnitude, c.force.to("mN").magnitude, color=col,
                    lw=1.8, ls=("-", "--", "-.")[j % 3], label=lab)
            ax.scatter([o.result.depth_at_max.to("mm").magnitude], [o.result.max_force.to("mN").magnitude],
                       marker="v", color=col, s=50, zorder=5)
            ax.axhline((o.load_share / getattr(o, "per_element", 1)).to("mN").magnitude, color=col, lw=0.9,
                       ls=":")
    ax.axhline(0.0, color="#999999", lw=0.6)
    ax.set_xlabel(DEPTH_LABEL)
    ax.set_ylabel(FORCE_LABEL)
    ax.set_title("Designs compared: force against depth (▼ limit, dotted: load each curve carries)",
                 fontsize=10, loc="left")
    ax.legend(fontsize=7.5, frameon=False, loc="upper left")
    _style(ax)
    return ax


def sweep_figure(result: Any, output: str = "safety_factor", safety_factor: float | None = None):
    """The sweep plot of :func:`floatcalc.studies.plots.sweep_plot`, with the required safety
    factor drawn as a horizontal line when ``output`` is the achieved ``safety_factor``."""
    from .studies.plots import sweep_plot

    fig = sweep_plot(result, output)
    ax = fig.axes[0]
    if safety_factor is not None and output == "safety_factor" and len(result.axes) == 1:
        ax.axhline(safety_factor, color=VERDICT_COLOURS["floats with margin"], lw=1.2, ls="-.",
                   label=f"required safety factor {safety_factor:g}")
        ax.axhline(1.0, color=VERDICT_COLOURS["sinks"], lw=1.0, ls=":", label="1: limit force = weight")
        ax.set_ylabel("margin = limit force / weight carried [-]")
        ax.legend(loc="best", fontsize=8)
    elif output == "margin" and len(result.axes) == 1:
        kind, unit = result.output_units["margin"]
        ax.set_ylabel(f"payload still possible beyond the design load [{unit}] (below 0: sinks)")
    return fig


PLAN_XLABEL = "x, plan position [mm]"
PLAN_YLABEL = "y, plan position [mm]"


def plan_view(device_result: Any, ax=None, grid: int = 140):
    """Plan view of a device at equilibrium: elements, meniscus depth contours, load shares.

    Drawn to scale (equal aspect) in mm from a :class:`~floatcalc.device.DeviceResult`: each
    element's footprint (patches with gid ``"element"``), filled contours of the superposed
    meniscus depth from ``Device.meniscus_depth``, each element's share of the load in per cent,
    and the centre of mass.
    """
    from matplotlib.patches import Polygon

    ax = _axes(ax, size=(6.5, 6.0))
    dev = device_result.device
    lc = dev.liquid.lc
    mm = 1e3
    pts = np.vstack([m.footprint for m in dev.models])
    lo, hi = pts.min(axis=0) - 1.5 * lc, pts.max(axis=0) + 1.5 * lc
    xs = np.linspace(lo[0], hi[0], grid)
    ys = np.linspace(lo[1], hi[1], grid)
    X, Y = np.meshgrid(xs, ys)
    depth = dev.meniscus_depth(X, Y, device_result.contact_depths) * mm
    top = max(float(np.nanmax(depth)), 1e-6)
    cs = ax.contourf(X * mm, Y * mm, depth, levels=np.linspace(0.0, top, 12), cmap="GnBu", extend="both", zorder=1)
    ax.contour(X * mm, Y * mm, depth, levels=np.linspace(0.0, top, 12)[1::2], colors="#24505f",
               linewidths=0.5, zorder=2)
    cb = ax.figure.colorbar(cs, ax=ax, shrink=0.8)
    cb.set_label("meniscus depth below the undisturbed surface [mm]")
    for m, st in zip(dev.models, device_result.elements):
        fp = m.footprint * mm
        ax.add_patch(Polygon(fp, closed=True, facecolor=COLOURS["solid"], edgecolor=COLOURS["solid_edge"],
                             lw=0.8, zorder=4, gid="element"))
        c = fp.mean(axis=0)
        ax.text(c[0], c[1], f"{100 * st.share:.0f} %", fontsize=7, ha="center", va="bottom", zorder=6,
                color="#111111", bbox={"boxstyle": "round,pad=0.15", "fc": "white", "ec": "none", "alpha": 0.75})
    xg, yg = dev.centre_of_mass
    ax.scatter([xg * mm], [yg * mm], marker="+", s=90, color=COLOURS["load"], zorder=7,
               label="centre of mass").set_gid("centre of mass")
    ax.set_xlim(lo[0] * mm, hi[0] * mm)
    ax.set_ylim(lo[1] * mm, hi[1] * mm)
    ax.set_aspect("equal")
    ax.set_xlabel(PLAN_XLABEL)
    ax.set_ylabel(PLAN_YLABEL)
    ax.set_title("Plan view: elements, meniscus depth and share of the load (to scale)", fontsize=10, loc="left")
    ax.legend(loc="upper right", fontsize=7, framealpha=0.85)
    return ax


__all__ = ["COLOURS", "VERDICT_COLOURS", "meniscus_section", "force_depth", "compare_curves", "plan_view", "sweep_figure",
           "SECTION_XLABEL", "SECTION_YLABEL", "DEPTH_LABEL", "FORCE_LABEL"]
