"""Matplotlib drawings of floatcalc results: cross-sections to scale, force–depth curves.

Front-end module: no physics, only drawing of what the API returns. It is imported by the page
and the report, never by ``import floatcalc``; matplotlib is imported inside the functions.
Every function draws on ``ax`` if given, else on a new :class:`matplotlib.figure.Figure`
(no pyplot state, so it is safe in a Streamlit server), and returns the axes.

Cross-sections and plan views are drawn to scale (equal aspect); lengths in mm, forces in mN.
Font sizes are chosen for a 1280 px wide projector (10–11 pt at 110 dpi).

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
VERDICT_COLOURS = {"floats": "#2d7a3a", "floats with elements broken through": "#a86200", "capsizes": "#b3261e",
                   "sinks": "#b3261e"}
#: Colours of the element states of :data:`floatcalc.output.text.STATES`.
STATE_COLOURS = {"carrying": "#2a7f62", "near its limit": "#d99a26", "broken through": "#b3261e"}
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
    if p.get("body") == "rod row":
        return _row_section(result, ax, extent_lc, zoom)
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
        ax.text(xd + 0.04 * X, 0.5 * low, f"depth {depth:.3g} mm", color=COLOURS["depth"], fontsize=10,
                va="center", ha="left", zorder=6)
    top = max(zc_centre + R, 0.0) + 0.35 * lc
    if zoom:  # close-up around the leg, still to scale
        X = max(3.0 * R, 1.6 * abs(cx), 0.2 * lc)
        bottom, top = zc_centre - 0.75 * X, zc_centre + 0.75 * X
        ax.plot([-X, 0.0], [low, low], color=COLOURS["depth"], lw=0.8, ls=":", zorder=5)
        ax.text(-0.95 * X, low - 0.02 * X, f"lowest point: depth {depth:.3g} mm", color=COLOURS["depth"],
                fontsize=10, va="top", ha="left", zorder=6)
    ax.set_xlim(-X, X)
    ax.set_ylim(bottom, top)
    ax.set_aspect("equal")
    ax.set_xlabel(SECTION_XLABEL)
    ax.set_ylabel(SECTION_YLABEL)
    ax.set_title("Close-up of the leg at the limit (to scale)" if zoom else
                 "Meniscus cross-section at the limit load (to scale)", fontsize=11, loc="left")
    if not zoom:
        _legend_below(ax)
    _style(ax)
    return ax


def _legend_below(ax, ncols: int = 3, **kw):
    """Legend under the axes (never over the drawing); ``bbox_inches="tight"`` keeps it in."""
    return ax.legend(loc="upper center", bbox_to_anchor=(0.5, 0.0), borderaxespad=3.6, ncols=ncols, fontsize=9,
                     frameon=False, **kw)


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
                fontsize=10, va="top", ha="left", zorder=6)
    else:
        xd = -X * 0.82
        ax.annotate("", xy=(xd, low), xytext=(xd, 0.0),
                    arrowprops={"arrowstyle": "<->", "color": COLOURS["depth"], "lw": 1.2}, zorder=5)
        ax.plot([xd, 0.0], [low, low], color=COLOURS["depth"], lw=0.8, ls=":", zorder=5)
        ax.text(xd + 0.04 * X, 0.5 * low, f"depth {depth:.3g} mm", color=COLOURS["depth"], fontsize=10,
                va="center", ha="left", zorder=6)
        _legend_below(ax)
    ax.set_xlim(-X, X)
    ax.set_ylim(min(bottom, low - 0.1 * lc), top)
    ax.set_aspect("equal")
    ax.set_xlabel("horizontal distance from the element axis [mm]")
    ax.set_ylabel(SECTION_YLABEL)
    ax.set_title("Close-up of the element at the limit (to scale)" if zoom else
                 "Meniscus cross-section through the axis at the limit load (to scale)", fontsize=11, loc="left")
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
                fontsize=10, va="top", ha="left", zorder=6)
    else:
        xd = -X * 0.9
        ax.annotate("", xy=(xd, low), xytext=(xd, 0.0),
                    arrowprops={"arrowstyle": "<->", "color": COLOURS["depth"], "lw": 1.2}, zorder=5)
        ax.plot([xd, -Rr], [low, low], color=COLOURS["depth"], lw=0.8, ls=":", zorder=5)
        ax.text(xd + 0.03 * X, 0.5 * low, f"depth {depth:.3g} mm", color=COLOURS["depth"], fontsize=10,
                va="center", ha="left", zorder=6)
        _legend_below(ax)
        ax.set_xlim(-X, X)
        ax.set_ylim(bottom, top)
    ax.set_aspect("equal")
    ax.set_xlabel("horizontal distance from the ring axis [mm]")
    ax.set_ylabel(SECTION_YLABEL)
    ax.set_title("Close-up of the wire at the limit (to scale)" if zoom else
                 "Ring cross-section through the axis at the limit load (to scale)", fontsize=11, loc="left")
    _style(ax)
    return ax


def _row_section(result: Any, ax, extent_lc: float, zoom: bool):
    """Cross-section of a row of parallel rods at the limit (``ParallelRodsResult.profile``,
    from :func:`floatcalc.core.parallel2d.row_profile`): every rod section, the outer menisci
    and the shared meniscus in each gap with its turning point (mid-gap depth) marked."""
    from matplotlib.patches import Circle, Polygon

    p = result.profile
    mm = 1e3
    R = p["radius_m"] * mm
    zc = p["centre_z_m"] * mm
    xs = np.asarray(p["centres_x_m"]) * mm
    xr, zr = (np.asarray(a) * mm for a in p["outer_right_m"])
    xl, zl = (np.asarray(a) * mm for a in p["outer_left_m"])
    gaps = [(np.asarray(gx) * mm, np.asarray(gz) * mm) for gx, gz in p["gaps_m"]]
    cx, cz = (np.asarray(a) * mm for a in p["contacts_m"])
    depth = p["depth_m"] * mm
    lc = result.liquid.lc * mm if result.liquid is not None else 2.7
    X = float(cx[-1]) + extent_lc * lc
    kr, kl = xr <= X, xl >= -X
    xr, zr, xl, zl = xr[kr], zr[kr], xl[kl], zl[kl]
    low = zc - R
    bottom = -(depth + 0.6 * lc)
    po, pi_ = p["phi_outer"], p["phi_inner"]
    n = len(xs)
    parts = [np.column_stack([xl[::-1], zl[::-1]])]
    for k, x in enumerate(xs):  # wetted arc under each rod, then the gap to its right
        a = np.linspace(-(po if k == 0 else pi_), po if k == n - 1 else pi_, 80)
        parts.append(np.column_stack([x + R * np.sin(a), zc - R * np.cos(a)]))
        if k < n - 1:
            parts.append(np.column_stack(gaps[k]))
    parts += [np.column_stack([xr, zr]), [[xr[-1] if xr.size else X, bottom], [xl[-1] if xl.size else -X, bottom]]]
    ax.add_patch(Polygon(np.concatenate(parts), closed=True, facecolor=COLOURS["liquid"], edgecolor="none",
                         zorder=1, gid="liquid", label="liquid"))
    ax.plot(xr, zr, color=COLOURS["interface"], lw=1.8, zorder=3, label="meniscus (liquid surface)")
    ax.plot(xl, zl, color=COLOURS["interface"], lw=1.8, zorder=3)
    for k, (gx, gz) in enumerate(gaps):
        ax.plot(gx, gz, color=COLOURS["interface"], lw=1.8, zorder=3, gid="shared meniscus")
    ax.axhline(0.0, color=COLOURS["surface"], lw=0.9, ls=(0, (5, 4)), zorder=2, label="undisturbed surface")
    for k, x in enumerate(xs):
        ax.add_patch(Circle((x, zc), R, facecolor=COLOURS["solid"], edgecolor=COLOURS["solid_edge"], lw=1.0,
                            zorder=4, gid="solid", label="rod sections (solid)" if k == 0 else None))
    pts = ax.scatter(cx, cz, s=30, color=COLOURS["contact"], edgecolor="white", lw=0.7, zorder=5,
                     label="contact points")
    pts.set_gid("contact points")
    if gaps:
        mids = [(0.5 * (xs[k] + xs[k + 1]), float(gz[len(gz) // 2])) for k, (_, gz) in enumerate(gaps)]
        ax.scatter([m[0] for m in mids], [m[1] for m in mids], marker="x", s=34, color=COLOURS["depth"], lw=1.4,
                   zorder=5, label=f"mid-gap depth {-mids[0][1]:.3g} mm (shared meniscus)").set_gid("mid-gap")
    top = max(zc + R, 0.0) + 0.35 * lc
    if zoom:  # close-up of the row, still to scale
        half = max(float(cx[-1]) + 2.0 * R, 0.2 * lc)
        X = half
        bottom, top = zc - 0.6 * half, zc + 0.6 * half
        if gaps:
            bottom = min(bottom, low - 0.15 * half)
        ax.plot([-X, xs[0]], [low, low], color=COLOURS["depth"], lw=0.8, ls=":", zorder=5)
        ax.text(-0.97 * X, low - 0.02 * X, f"lowest point: depth {depth:.3g} mm", color=COLOURS["depth"],
                fontsize=10, va="top", ha="left", zorder=6)
    else:
        xd = -X * 0.85
        ax.annotate("", xy=(xd, low), xytext=(xd, 0.0),
                    arrowprops={"arrowstyle": "<->", "color": COLOURS["depth"], "lw": 1.2}, zorder=5)
        ax.plot([xd, xs[0]], [low, low], color=COLOURS["depth"], lw=0.8, ls=":", zorder=5)
        ax.text(xd + 0.03 * X, 0.5 * low, f"depth {depth:.3g} mm", color=COLOURS["depth"], fontsize=10,
                va="center", ha="left", zorder=6)
        _legend_below(ax)
    ax.set_xlim(-X, X)
    ax.set_ylim(min(bottom, low - 0.1 * lc) if not zoom else bottom, top)
    ax.set_aspect("equal")
    ax.set_xlabel("horizontal distance from the middle of the row [mm]")
    ax.set_ylabel("height [mm]" if zoom else SECTION_YLABEL)  # a close-up is short
    ax.set_title(f"Close-up of the {n} rods at the limit (to scale)" if zoom else
                 f"Row of {n} rods: shared menisci at the limit load (to scale)", fontsize=11, loc="left")
    _style(ax)
    return ax


def safe_text(text: str) -> str:
    """User text for a matplotlib label: ``$`` escaped so it is never read as mathtext.

    >>> safe_text("leg $1$")
    'leg \\\\$1\\\\$'
    """
    return str(text).replace("$", r"\$")


def element_curve(result: Any = None, model: Any = None) -> dict[str, Any]:
    """Force–depth data of one element [mm, mN]: from the kind's public result (``result.curve``,
    with surface-tension and pressure parts) or, for kinds without one, from the device
    adapter's table (:class:`~floatcalc.elements.ElementModel`: depth of its reference point,
    total force)."""
    if result is not None and getattr(result, "curve", None) is not None:
        c = result.curve
        out = {"depth": c.depth.to("mm").magnitude, "force": c.force.to("mN").magnitude}
        for part in ("surface_tension", "pressure"):
            if getattr(c, part, None) is not None:
                out[part] = getattr(c, part).to("mN").magnitude
        out["limit"] = (result.depth_at_max.to("mm").magnitude, result.max_force.to("mN").magnitude)
        return out
    if model is None:
        raise ValueError("element_curve needs a result with a curve or an element model")
    d = np.asarray(model.depth)[0] - float(np.asarray(model.offsets)[0])
    f = model.force_at_depth(d)
    return {"depth": d * 1e3, "force": np.asarray(f) * 1e3, "limit": (model.limit_depth * 1e3, model.limit_force * 1e3)}


def force_depth(result: Any = None, ax=None, load: Any = None, model: Any = None, parts: bool = True,
                title: str = "Force against depth, up to breakthrough"):
    """Force–depth curve of one element with its limit and the force it carries in the device.

    Parameters
    ----------
    result : a kind's public result (``kind.solve``) with ``curve``, ``max_force``, ``depth_at_max``
    model : ElementModel, optional
        Used when the result has no curve (rod rows, flexible legs).
    load : quantity [force], optional
        Force the element carries in the device; drawn as a horizontal line.
    """
    ax = _axes(ax)
    c = element_curve(result, model)
    ax.plot(c["depth"], c["force"], color=COLOURS["total"], lw=2.0, label="total force")
    if parts and "surface_tension" in c:
        ax.plot(c["depth"], c["surface_tension"], color=COLOURS["surface_tension"], lw=1.3, ls="--",
                label="surface-tension part")
    if parts and "pressure" in c:
        ax.plot(c["depth"], c["pressure"], color=COLOURS["pressure"], lw=1.3, ls="-.",
                label="pressure (buoyancy) part")
    dm, fm = c["limit"]
    lim = ax.scatter([dm], [fm], marker="v", s=70, color=COLOURS["total"], zorder=5,
                     label=f"limit force {fm:.3g} mN at {dm:.3g} mm")
    lim.set_gid("limit")
    if load is not None:
        fl = load.to("mN").magnitude
        ax.axhline(fl, color=COLOURS["load"], lw=1.2, ls=":", label=f"force carried in the device {fl:.3g} mN")
    ax.axhline(0.0, color="#999999", lw=0.6)
    ax.set_xlabel(DEPTH_LABEL)
    ax.set_ylabel(FORCE_LABEL)
    ax.set_title(title, fontsize=11, loc="left")
    ax.legend(fontsize=9, frameon=False, loc="upper left")
    _style(ax)
    return ax


def tip_deflection(shape: dict) -> float:
    """Deflection [m] of a bent leg's tip from the straight line the clamp points along.

    Geometry only: from ``FlexLegResult.shape`` (``x_m``, ``depth_m``, ``slope_deg`` along the
    leg), the tip's vertical distance from the tangent at the clamp,
    ``d = |(z_tip − z_0) − tan(α_0) (x_tip − x_0)|`` with z the depth and α_0 the slope at the
    clamp. A rigid leg has d = 0.

    >>> round(tip_deflection({"x_m": [0.0, 0.01], "depth_m": [0.002, 0.0015], "slope_deg": [0.0, -5.0]}), 6)
    0.0005
    """
    x = np.asarray(shape["x_m"], dtype=float)
    z = np.asarray(shape["depth_m"], dtype=float)
    a0 = math.radians(float(np.asarray(shape.get("slope_deg", [0.0]), dtype=float)[0]))
    return float(abs((z[-1] - z[0]) - math.tan(a0) * (x[-1] - x[0])))


def bending_shape(result: Any, ax=None, compact: bool = False):
    """Bent shape of a flexible leg at its limit (``FlexLegResult.shape``): depth along the leg,
    the straight line the clamp points along (where a rigid leg would lie), the undisturbed
    surface and the clamp. Not to scale vertically (depths are a few mm over legs of tens of
    mm); the axes say so. The title gives the tip depth and :func:`tip_deflection`; ``compact``
    (a narrow column, the numbers said beside it) keeps the words short."""
    ax = _axes(ax)
    s = result.shape
    x = np.asarray(s["x_m"]) * 1e3
    z = -np.asarray(s["depth_m"]) * 1e3
    a0 = math.radians(float(np.asarray(s.get("slope_deg", [0.0]))[0]))
    ax.axhline(0.0, color=COLOURS["surface"], lw=1.0, ls=(0, (5, 4)), label="undisturbed surface")
    ax.plot([x[0], x[-1]], [z[0], z[0] - math.tan(a0) * (x[-1] - x[0])], color="#777777", lw=1.0, ls="--",
            label="straight from the clamp (rigid)" if compact else "straight line from the clamp (a rigid leg)")
    ax.plot(x, z, color=COLOURS["solid"], lw=2.6, label="leg at the limit load", gid="leg")
    ax.scatter([x[0]], [z[0]], marker="s", s=60, color=COLOURS["solid_edge"], zorder=5, label="clamp")
    ax.set_xlabel("distance from the clamp [mm]")
    if compact:
        ax.set_ylabel("height [mm] (scale enlarged)")
        ax.set_title("One leg bending at its limit", fontsize=11, loc="left")
    else:
        ax.set_ylabel("height of the leg [mm]\n(vertical scale enlarged)")
        ax.set_title(f"Flexible leg bending at the limit: tip depth {result.tip_depth.to('mm').magnitude:.3g} mm, "
                     f"tip deflection {tip_deflection(s) * 1e3:.3g} mm", fontsize=11, loc="left")
    _legend_below(ax, ncols=2)
    _style(ax)
    return ax


PLAN_XLABEL = "x, plan position [mm]"
PLAN_YLABEL = "y, plan position [mm]"


def plan_geometry(device_result: Any) -> bytes:
    """What a plan view's fixed parts depend on (element footprints, capillary length): two
    results with the same bytes can share one drawing, updated by :func:`plan_view_update`."""
    dev = device_result.device
    parts = [np.asarray(m.footprint, dtype=float).tobytes() for m in dev.models]
    return b"|".join([np.float64(dev.liquid.lc).tobytes(), *parts])


def plan_view(device_result: Any, ax=None, grid: int = 100, numbers: bool = True):
    """Plan view of a device at equilibrium: each element in its state, meniscus depth contours.

    Drawn to scale (equal aspect) in mm from a :class:`~floatcalc.device.DeviceResult`: each
    element's footprint coloured by its state (carrying / near its limit / broken through, see
    :func:`floatcalc.output.text.element_state`; patches with gid ``"element"``), its number
    (the element table lists the numbers), the superposed meniscus depth
    (``Device.meniscus_depth``) with its colour scale beside the axes, the centre of mass and
    the payload position. The parts that depend on the solve are drawn by the same function
    that :func:`plan_view_update` calls, so an updated drawing is the drawing of the new result.
    """
    from matplotlib.patches import Polygon
    from matplotlib.ticker import MaxNLocator

    ax = _axes(ax, size=(6.5, 6.0))
    dev = device_result.device
    lc = dev.liquid.lc
    mm = 1e3
    pts = np.vstack([m.footprint for m in dev.models])
    lo, hi = pts.min(axis=0) - 1.2 * lc, pts.max(axis=0) + 1.2 * lc
    patches, dots, labels = [], [], []
    for i, m in enumerate(dev.models):
        fp = m.footprint * mm
        patches.append(ax.add_patch(Polygon(fp, closed=True, lw=3.0, zorder=4, gid="element", label=None)))
        c = fp.mean(axis=0)
        if np.ptp(fp, axis=0).max() < 0.02 * float(np.max(hi - lo)) * mm:  # too small to see at this scale
            dots.append((i, ax.scatter([c[0]], [c[1]], s=60, edgecolor="#222222", lw=0.6, zorder=5)))
        if numbers:
            labels.append(ax.text(c[0], c[1], str(i + 1), fontsize=9, ha="center", va="center", zorder=6,
                                  color="#111111",
                                  bbox={"boxstyle": "round,pad=0.12", "fc": "white", "ec": "none", "alpha": 0.8}))
    com = ax.scatter([0.0], [0.0], marker="+", s=110, color="#111111", zorder=7)
    com.set_gid("centre of mass")
    pay = ax.scatter([0.0], [0.0], marker="v", s=80, color=COLOURS["load"], zorder=7)
    pay.set_gid("payload")
    # the depth scale beside the axes as drawn (equal aspect), as tall as the plan; callers
    # leave about 1 inch on the right for it (PLAN_MARGINS, the report's plan axes)
    cax = ax.inset_axes([1.03, 0.0, 0.035, 1.0])
    cax.set_xticks([])
    cax.yaxis.tick_right()
    cax.yaxis.set_label_position("right")
    cax.yaxis.set_major_locator(MaxNLocator(nbins=6))  # readable on a short plan (a long row)
    cax.set_ylabel("meniscus depth [mm]", fontsize=10)
    ax.set_xlim(lo[0] * mm, hi[0] * mm)
    ax.set_ylim(lo[1] * mm, hi[1] * mm)
    ax.set_aspect("equal")
    ax.set_xlabel(PLAN_XLABEL)
    ax.set_ylabel(PLAN_YLABEL)
    ax.set_title("Plan view: state of each element (to scale)", fontsize=11, loc="left")
    ax._floatcalc_plan = {"geometry": plan_geometry(device_result), "grid": grid, "lo": lo, "hi": hi,
                          "patches": patches, "dots": dots, "labels": labels, "com": com, "payload": pay, "cax": cax,
                          "field": None, "scale": None, "legend_payload": None}
    _plan_solved_parts(ax, device_result)
    return ax


def plan_view_update(ax, device_result: Any) -> bool:
    """Redraw the parts of a :func:`plan_view` that depend on the solve (meniscus field and its
    scale, element states, centre of mass, payload) for ``device_result``; False (nothing
    changed) if ``ax`` holds no plan view of the same geometry (:func:`plan_geometry`)."""
    st = getattr(ax, "_floatcalc_plan", None)
    if st is None or st["geometry"] != plan_geometry(device_result):
        return False
    _plan_solved_parts(ax, device_result)
    return True


def plan_view_layers(ax) -> tuple[list, list]:
    """(changing, covering) artists of a :func:`plan_view`, for redrawing only the part of the
    picture a new solve changes: ``changing`` are redrawn by :func:`plan_view_update`, and
    ``covering`` lie on top of them inside the axes (spines, element numbers); both lists in
    drawing (z) order. Everything else (titles, ticks, labels, legend) lies outside the axes
    or under the meniscus field."""
    st = ax._floatcalc_plan
    changing = [st["field"], *st["patches"], *[d for _, d in st["dots"]], st["com"], st["payload"], st["cax"]]
    covering = [*ax.spines.values(), *st["labels"]]
    return changing, sorted(covering, key=lambda a: a.get_zorder())


def _plan_solved_parts(ax, device_result: Any) -> None:
    from matplotlib.lines import Line2D

    from .output.text import element_state

    st = ax._floatcalc_plan
    dev = device_result.device
    mm = 1e3
    lo, hi, grid = st["lo"], st["hi"], st["grid"]
    X, Y = np.meshgrid(np.linspace(lo[0], hi[0], grid), np.linspace(lo[1], hi[1], grid))
    depth = dev.meniscus_depth(X, Y, device_result.contact_depths) * mm
    top = max(float(np.nanmax(depth)), 1e-6)
    levels = np.linspace(0.0, top, 10)
    for old in (st["field"], st["scale"]):
        if old is not None:
            old.remove()
    st["field"] = ax.contourf(X * mm, Y * mm, depth, levels=levels, cmap="Blues", extend="both", zorder=1,
                              alpha=0.8)
    st["field"].set_gid("meniscus depth")
    cax = st["cax"]
    mids = 0.5 * (levels[1:] + levels[:-1])
    st["scale"] = cax.pcolormesh([0.0, 1.0], levels, mids[:, None], cmap=st["field"].cmap, norm=st["field"].norm,
                                 alpha=0.8)
    cax.set_xlim(0.0, 1.0)
    cax.set_ylim(0.0, top)
    states = [element_state(es) for es in device_result.elements]
    for patch, state in zip(st["patches"], states):
        patch.set_facecolor(STATE_COLOURS[state])
        patch.set_edgecolor(STATE_COLOURS[state])
    for i, dot in st["dots"]:
        dot.set_color(STATE_COLOURS[states[i]])
        dot.set_edgecolor("#222222")
    xg, yg = dev.centre_of_mass
    st["com"].set_offsets([[xg * mm, yg * mm]])
    loaded = device_result.applied_payload.magnitude > 0
    if loaded:
        st["payload"].set_offsets([device_result.max_payload_position.to("mm").magnitude])
    st["payload"].set_visible(loaded)
    if st["legend_payload"] != loaded:
        handles = [Line2D([], [], marker="s", ls="", ms=10, color=STATE_COLOURS[s], label=s) for s in STATE_COLOURS]
        handles.append(Line2D([], [], marker="+", ls="", ms=10, color="#111111", label="centre of mass"))
        if loaded:
            handles.append(Line2D([], [], marker="v", ls="", ms=9, color=COLOURS["load"], label="payload"))
        if ax.get_legend() is not None:
            ax.get_legend().remove()
        _legend_below(ax, ncols=len(handles), handles=handles, handletextpad=0.3, columnspacing=1.0)
        st["legend_payload"] = loaded


def failure_steps(device_result: Any, ax=None):
    """Stepped view of progressive failure: elements still intact against payload [g].

    From each :class:`~floatcalc.device.solve.ElementState`'s ``breakthrough_order`` and
    ``breakthrough_payload``; the max payload (first breakthrough), the sinking payload and the
    applied payload are marked.
    """
    from .output.text import failure_steps as steps_of

    ax = _axes(ax, size=(7.5, 4.2))
    r = device_result
    g = r.device.liquid.g
    n = len(r.elements)
    steps = steps_of(r)
    sink = r.sinking_payload.to("N").magnitude / g * 1e3
    x = [0.0]
    y = [n]
    for k, s in enumerate(steps):
        p = s["payload"] / g * 1e3
        x += [p, p]
        y += [y[-1], n - (k + 1)]
    x.append(max(sink, x[-1]) * 1.05 + 1e-9)
    y.append(y[-1])
    ax.plot(x, y, color=COLOURS["total"], lw=2.0, drawstyle="default", gid="steps")
    for k, s in enumerate(steps[:12]):
        p = s["payload"] / g * 1e3
        ax.annotate(f"{s['order']}", (p, n - k - 0.5), fontsize=9, ha="right", va="center",
                    xytext=(-3, 0), textcoords="offset points", color=COLOURS["load"])
    mp = r.max_payload.to("N").magnitude / g * 1e3
    ax.axvline(mp, color=STATE_COLOURS["near its limit"], lw=1.2, ls="--", label=f"max payload {mp:.3g} g")
    ax.axvline(sink, color=STATE_COLOURS["broken through"], lw=1.4, ls="-", label=f"sinking payload {sink:.3g} g")
    ap = r.applied_payload.to("N").magnitude / g * 1e3
    if ap > 0:
        ax.axvline(ap, color="#555555", lw=1.0, ls=":", label=f"payload {ap:.3g} g")
    ax.set_ylim(-0.3, n + 0.6)
    ax.set_xlim(0.0, x[-1])
    ax.set_xlabel("payload [g]")
    ax.set_ylabel("elements still intact")
    ax.set_title("What breaks first: elements breaking through as the payload grows", fontsize=11, loc="left")
    ax.legend(fontsize=9, frameon=False, loc="lower left")
    _style(ax)
    return ax


def safety_factor_sweep(values, safety_factors, xlabel: str, required: float | None = None, ax=None):
    """Achieved safety factor (capacity / load) against one input, on a log axis, with the line
    at 1 (load = capacity) and the required safety factor marked."""
    ax = _axes(ax, size=(7.5, 4.2))
    sf = np.asarray(safety_factors, dtype=float)
    ax.plot(values, sf, color=COLOURS["total"], lw=2.0, marker="o", ms=4, label="safety factor (capacity / load)")
    ax.set_yscale("log")
    ax.axhline(1.0, color=STATE_COLOURS["broken through"], lw=1.4, label="1: load = capacity")
    if required is not None and required > 1.0:
        ax.axhline(required, color=STATE_COLOURS["near its limit"], lw=1.2, ls="--",
                   label=f"required safety factor {required:g}")
    lo = min(float(np.nanmin(sf)), 1.0) / 1.3
    hi = max(float(np.nanmax(sf)), required or 1.0) * 1.3
    ax.set_ylim(lo, hi)
    from matplotlib.ticker import FuncFormatter, LogLocator

    ax.yaxis.set_major_locator(LogLocator(base=10, subs=(1.0, 1.5, 2.0, 3.0, 5.0, 7.0)))
    ax.yaxis.set_major_formatter(FuncFormatter(lambda v, _: f"{v:g}"))
    ax.yaxis.set_minor_formatter(FuncFormatter(lambda v, _: ""))
    ax.set_xlabel(xlabel)
    ax.set_ylabel("safety factor [-] (log scale)")
    ax.set_title("Safety factor against one input", fontsize=11, loc="left")
    ax.legend(fontsize=9, frameon=False, loc="best")
    _style(ax)
    return ax


def comparison_bars(items: list[tuple[str, Any]], ax=None):
    """Capacity and weight of compared designs side by side [g] (``items``: (name, DeviceResult))."""
    ax = _axes(ax, size=(7.5, 3.8))
    names = [safe_text(n) for n, _ in items]
    g = items[0][1].device.liquid.g if items else 9.80665
    cap = [r.capacity.to("N").magnitude / g * 1e3 for _, r in items]
    w = [r.weight.to("N").magnitude / g * 1e3 for _, r in items]
    sink = [(r.weight + r.sinking_payload).to("N").magnitude / g * 1e3 for _, r in items]
    y = np.arange(len(items))
    ax.barh(y + 0.25, sink, height=0.25, color="#9fb8c8", label="weight + sinking payload")
    ax.barh(y, cap, height=0.25, color=COLOURS["total"], label="capacity")
    ax.barh(y - 0.25, w, height=0.25, color=COLOURS["solid"], label="weight")
    ax.set_yticks(y, names, fontsize=10)
    ax.invert_yaxis()
    ax.set_xlabel("load [g]")
    ax.set_title("Designs compared", fontsize=11, loc="left")
    ax.legend(fontsize=9, frameon=False, loc="lower right")
    _style(ax)
    return ax


def figure_png(draw, size=(7.0, 4.2), dpi: int = 100, margins: dict | None = None, **kw) -> bytes:
    """PNG bytes of one drawing: ``draw(ax=..., **kw)`` on a new figure, nothing clipped.

    By default the saved area is the drawing's tight bounding box (``bbox_inches="tight"``,
    which lays the figure out twice). With ``margins`` (``Figure.subplots_adjust`` keywords,
    figure fractions, wide enough for every label) the figure is drawn once and the blank
    border trimmed from the pixels (:func:`trimmed_png`): the same picture in about two thirds
    of the time, for drawings the page redraws on every change (:data:`PLAN_MARGINS`)."""
    import io

    fig = new_figure(size, margins)
    draw(ax=fig.add_subplot(), **kw)
    if margins:
        return trimmed_png(fig, dpi)
    buf = io.BytesIO()
    fig.savefig(buf, format="png", dpi=dpi, bbox_inches="tight")
    return buf.getvalue()


def new_figure(size=(7.0, 4.2), margins: dict | None = None):
    """A figure without pyplot state (safe in a server), with fixed ``margins`` if given."""
    from matplotlib.figure import Figure

    fig = Figure(figsize=size)
    if margins:
        fig.subplots_adjust(**margins)
    return fig


def trimmed_png(fig, dpi: int = 100, pad: int = 10, drawn: bool = False) -> bytes:
    """PNG of ``fig`` drawn once at ``dpi`` (or as its canvas holds it, ``drawn``), its blank
    (white) border trimmed to ``pad`` pixels. The figure keeps its canvas, so drawing it again
    reuses its tick and text layout."""
    import io

    from matplotlib.backends.backend_agg import FigureCanvasAgg
    from PIL import Image

    if fig.get_dpi() != dpi:
        fig.set_dpi(dpi)
    canvas = fig.canvas if isinstance(fig.canvas, FigureCanvasAgg) else FigureCanvasAgg(fig)
    if not drawn:
        canvas.draw()
    px = np.asarray(canvas.buffer_rgba())
    ink = np.any(px[..., :3] < 250, axis=2)
    rows, cols = np.flatnonzero(ink.any(axis=1)), np.flatnonzero(ink.any(axis=0))
    if rows.size:
        px = px[max(rows[0] - pad, 0):rows[-1] + pad + 1, max(cols[0] - pad, 0):cols[-1] + pad + 1]
    buf = io.BytesIO()
    Image.fromarray(np.ascontiguousarray(px[..., :3])).save(buf, format="png", compress_level=1)  # fast, local
    return buf.getvalue()


#: Fixed margins of :func:`plan_view` on an 8 × 6.2 inch figure (room for the axis labels, the
#: colour bar and the legend under the axes), for :func:`figure_png`.
PLAN_MARGINS = {"left": 0.09, "right": 0.86, "bottom": 0.17, "top": 0.95}


__all__ = ["COLOURS", "VERDICT_COLOURS", "STATE_COLOURS", "safe_text", "meniscus_section", "element_curve",
           "force_depth", "bending_shape", "tip_deflection", "plan_view", "plan_view_update", "plan_view_layers", "plan_geometry", "failure_steps", "safety_factor_sweep", "comparison_bars",
           "figure_png", "new_figure", "trimmed_png", "PLAN_MARGINS", "SECTION_XLABEL", "SECTION_YLABEL", "DEPTH_LABEL", "FORCE_LABEL"]
