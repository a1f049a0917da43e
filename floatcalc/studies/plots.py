"""Plots of study results: sweep lines and heat maps with the limit marked, fit residuals,
capacity histograms. Front end only; matplotlib is imported inside the functions and figures
are built without pyplot state (safe in a server). Each function returns the figure.

>>> from floatcalc.studies.models import rod_model
>>> from floatcalc.studies.sweep import sweep
>>> fig = sweep_plot(sweep(rod_model(payload_mass=5e-4), ["radius=0.05mm:0.5mm:8"]))
>>> fig.axes[0].get_xlabel()
'radius [mm]'
"""

from __future__ import annotations

from typing import Any

import numpy as np

_LINE = "#1d3557"
_LIMIT = "#c1121f"
_OK = "#2a9d8f"


def _figure(size=(6.4, 4.0)):
    from matplotlib.figure import Figure

    fig = Figure(figsize=size, layout="constrained")
    return fig, fig.add_subplot()


def _label(name: str, unit: str) -> str:
    return f"{name.replace('_', ' ')} [{unit}]" if unit else name.replace("_", " ")


def sweep_plot(result: Any, output: str | None = None):
    """Line (one swept input) or heat map (two) of ``output`` (default: the limit output).

    The limit, where the limit output crosses zero (payload = design payload), is marked: a
    dashed line and dots at the crossings in 1D, a contour in 2D.
    """
    out = output or result.limit_output
    if out not in result.outputs:
        from ..errors import input_error

        raise input_error("output", f"must be one of {', '.join(result.outputs)}", repr(out))
    kind, unit = result.output_units[out]
    y = result.shown(out)
    fig, ax = _figure()
    a0 = result.axes[0]
    x0 = a0.shown()
    if len(result.axes) == 1:
        ax.plot(x0, y, color=_LINE, lw=1.8, label=_label(out, unit))
        if out == result.limit_output:
            ax.axhline(0.0, color=_LIMIT, ls="--", lw=1.0, label="limit (design payload carried exactly)")
            for c in result.crossings:
                cx = float(np.interp(c, a0.values, x0))
                ax.plot([cx], [0.0], "o", color=_LIMIT, ms=5)
        ax.set_xlabel(_label(a0.name, a0.unit))
        ax.set_ylabel(_label(out, unit))
        if a0.log:
            ax.set_xscale("log")
        ax.legend(loc="best", fontsize=8)
    else:
        a1 = result.axes[1]
        x1 = a1.shown()
        mesh = ax.pcolormesh(x0, x1, y.T, shading="auto", cmap="viridis")
        fig.colorbar(mesh, ax=ax, label=_label(out, unit))
        lim = result.shown(result.limit_output)
        if np.nanmin(lim) < 0 < np.nanmax(lim):
            cs = ax.contour(x0, x1, lim.T, levels=[0.0], colors=[_LIMIT], linewidths=1.6)
            ax.clabel(cs, fmt={0.0: "limit"}, fontsize=8)
        ax.set_xlabel(_label(a0.name, a0.unit))
        ax.set_ylabel(_label(a1.name, a1.unit))
        if a0.log:
            ax.set_xscale("log")
        if a1.log:
            ax.set_yscale("log")
    ax.set_title(f"{result.model} sweep (static estimate, clean liquid)", fontsize=9)
    return fig


def fit_plot(result: Any):
    """Measured and fitted force against depth, and the residuals below."""
    from matplotlib.figure import Figure

    fig = Figure(figsize=(6.4, 5.2), layout="constrained")
    ax, axr = fig.subplots(2, 1, sharex=True, height_ratios=[3, 1.4])
    D = result.depth.to("mm").magnitude
    order = np.argsort(D)
    ax.plot(D, result.force.to("mN").magnitude, "o", ms=3.5, color=_LINE, label="data")
    ax.plot(D[order], result.fitted_force.to("mN").magnitude[order], color=_LIMIT, lw=1.6,
            label=f"fit: θ = {result.contact_angle.magnitude:.2f}°")
    ax.set_ylabel("force [mN]")
    ax.legend(fontsize=8)
    axr.axhline(0.0, color="0.5", lw=0.8)
    axr.plot(D, result.residuals.to("mN").magnitude, "o", ms=3.5, color=_OK)
    axr.set_xlabel("depth of the lowest point [mm]")
    axr.set_ylabel("residual [mN]")
    return fig


def capacity_histogram(result: Any, bins: int = 60):
    """Histogram of the sampled payload capacity with the design payload marked."""
    fig, ax = _figure()
    cap = np.asarray(result.capacity_samples) * 1e3
    ax.hist(cap, bins=bins, color=_LINE, alpha=0.85)
    ax.axvline(result.design_payload_mass.to("g").magnitude, color=_LIMIT, ls="--", label="design payload")
    ax.set_xlabel("payload capacity [g]")
    ax.set_ylabel("samples")
    ax.legend(fontsize=8)
    return fig


def save(fig, path: Any) -> None:
    """Save a figure; the format follows the file suffix (png, svg, pdf)."""
    fig.savefig(path, dpi=150)
