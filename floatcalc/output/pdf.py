"""The PDF report of a solved design (matplotlib only, A4 portrait).

Pages: "Design summary" (inputs with each coating's texture and effective angle, results in
the one vocabulary, element table, Bond numbers), "Plan view and progressive failure", one
page per distinct element table (force–depth curve and meniscus drawing, or a flexible leg's
bending), "Comparison" (the design and its alternatives side by side, with their differing
inputs) and "Warnings, cautions and references" (each reference once, with the models it
supports). Every page carries the floatcalc version, the date and "page n of N".

No physics and no verdict logic: numbers come from the :class:`~floatcalc.device.solve.DeviceResult`
and the element kinds' own results (:mod:`floatcalc.output.tables`).
"""

from __future__ import annotations

import datetime as _dt
import io
import textwrap
from typing import Any

_PAGE = (8.27, 11.69)  # A4 portrait [inch]
HEADINGS = ("Design summary", "Plan view and progressive failure", "Element", "Comparison",
            "Warnings, cautions and references")
_INK = "#1f3b4d"


class _Pages:
    """Figures of the report; footers (version, date, page n of N) are added at the end."""

    def __init__(self):
        self.figs: list = []

    def new(self, heading: str):
        from matplotlib.figure import Figure

        fig = Figure(figsize=_PAGE)
        fig.text(0.07, 0.955, heading, fontsize=15, weight="bold", color=_INK)
        self.figs.append(fig)
        return fig

    def save(self, target, title: str, date: str):
        from matplotlib.backends.backend_pdf import PdfPages

        from .. import __version__

        n = len(self.figs)
        with PdfPages(target, metadata={"Title": f"floatcalc report: {_plain(title)}", "Creator": f"floatcalc {__version__}"}) as pdf:
            for k, fig in enumerate(self.figs, 1):
                fig.text(0.07, 0.025, f"floatcalc {__version__} · {date} · static estimate on a clean liquid surface",
                         fontsize=7.5, color="#555555")
                fig.text(0.93, 0.025, f"page {k} of {n}", fontsize=7.5, color="#555555", ha="right")
                pdf.savefig(fig)


class _Flow:
    """Flowing text on pages of :class:`_Pages` (wraps, continues on a new page)."""

    def __init__(self, pages: _Pages, heading: str):
        self.pages, self.heading = pages, heading
        self.fig = pages.new(heading)
        self.y = 0.92

    def _room(self, h=0.02):
        if self.y - h < 0.06:
            self.fig = self.pages.new(self.heading + " (continued)")
            self.y = 0.92

    def line(self, text: str, size: float = 9.0, bold: bool = False, indent: float = 0.0,
             color: str = "#222222", width: int | None = None):
        width = width or int(104 * 9.0 / size * (1.0 if not bold else 0.92) - 100 * indent)
        for k, part in enumerate(textwrap.wrap(str(text), width=width) or [""]):
            self._room()
            self.fig.text(0.07 + indent + (0.02 if k else 0.0), self.y, _plain(part), fontsize=size,
                          weight="bold" if bold else "normal", color=color, va="top")
            self.y -= 0.0165 * size / 9.0
        return self

    def rows(self, rows, width: int = 64, split: float = 0.42):
        for label, value in rows:
            left = textwrap.wrap(str(label), width=42) or [""]
            right = textwrap.wrap(str(value), width=width) or [""]
            for k in range(max(len(left), len(right))):
                self._room()
                if k < len(left):
                    self.fig.text(0.07, self.y, _plain(left[k]), fontsize=8.5, color=_INK, va="top")
                if k < len(right):
                    self.fig.text(split, self.y, _plain(right[k]), fontsize=8.5, color="#222222", va="top")
                self.y -= 0.0155
        return self

    def table(self, head: list[str], rows: list[list[str]], widths: list[float], size: float = 7.5):
        xs = [0.07]
        for w in widths[:-1]:
            xs.append(xs[-1] + w)
        for r, row in enumerate([head, *rows]):
            self._room()
            for x, cell, w in zip(xs, row, widths):
                txt = textwrap.shorten(str(cell), width=max(6, int(w * 150)), placeholder="…")
                self.fig.text(x, self.y, _plain(txt), fontsize=size, va="top", color=_INK if r == 0 else "#222222",
                              weight="bold" if r == 0 else "normal")
            self.y -= 0.0145
        return self

    def gap(self, h: float = 0.012):
        self.y -= h
        return self


def _plain(text: str) -> str:
    """Text drawn as it is: ``$`` escaped so matplotlib never reads user text as mathtext, and
    control characters written as escapes (:func:`floatcalc.output.text.escape_controls`)."""
    from .text import escape_controls

    return escape_controls(text).replace("$", r"\$")


def write_pdf(design, result, target: Any, *, tables=None, compared=(), date: str | None = None) -> None:
    """Write the PDF report of a design and its :func:`~floatcalc.device.solve.solve_device`
    result to a path or file object.

    Parameters
    ----------
    design : Design
    result : DeviceResult
        ``solve_device(design)`` (the page passes its cached one).
    tables : list of TableElement, optional
        :func:`floatcalc.output.tables.solved_tables` of the design (solved here if omitted).
    compared : sequence of (name, Design, DeviceResult)
        Entries shown beside the design on the "Comparison" page (its alternatives).
    date : str, optional
        Date printed on every page (default today, ISO format).
    """
    from .. import plotting
    from .tables import solved_tables
    from .text import (bond_rows, cautions, element_rows, entry_name, comparison_rows, input_rows, references,
                       result_rows)

    date = date or _dt.date.today().isoformat()
    tables = solved_tables(design) if tables is None else tables
    pages = _Pages()

    # 1. Design summary
    f = _Flow(pages, HEADINGS[0])
    f.line(design.description or "(no description)", size=11, bold=True)
    if design.invented:
        f.line("This is an invented example, not a measured design.", color="#8a4b08")
    for n in design.notes:
        f.line(n, size=8, color="#444444")
    f.gap()
    colour = plotting.VERDICT_COLOURS.get(result.verdict, _INK)
    f.line(f"Verdict: {result.verdict}", size=13, bold=True, color=colour)
    if result.below_required_safety_factor:
        f.line(f"below the required safety factor: achieved {result.safety_factor:.3g}, required "
               f"{result.required_safety_factor:g}", bold=True, color=plotting.VERDICT_COLOURS["sinks"])
    f.gap().line("Inputs", size=11, bold=True).rows(input_rows(design)).gap()
    f.line("Results", size=11, bold=True).rows(result_rows(result)).gap()
    f.line("Elements at this load", size=11, bold=True)
    rows = element_rows(result)
    if rows:
        head = [k for k in rows[0] if k != "kind"]  # the kind is in the table titles above
        f.table(head, [[r[k] for k in head] for r in rows], [0.17, 0.1, 0.14, 0.14, 0.13, 0.13, 0.1])
    f.gap().line("Bond numbers (Bo = ρ g L² / σ)", size=11, bold=True)
    for b in bond_rows(design):
        f.line(f"{b['table']}: Bo = {b['Bo']} with {b['length']}; {b['reading']}", size=8.5, indent=0.01)

    # 2. Plan view and progressive failure
    fig = pages.new(HEADINGS[1])
    plotting.plan_view(result, ax=fig.add_axes([0.1, 0.5, 0.74, 0.42]))  # colour bar on the right
    plotting.failure_steps(result, ax=fig.add_axes([0.11, 0.08, 0.82, 0.26]))
    fig.text(0.07, 0.405, "Element colours: carrying / near its limit (utilisation ≥ 90 %) / broken through. "
             "Numbers: the element rows on page 1.", fontsize=8.5)

    # 3. one page per distinct element table
    el_results = {}
    for t in tables:
        fig = pages.new(f"{HEADINGS[2]}: {t.title}")
        fig.text(0.07, 0.93, _plain(t.kind.summary), fontsize=9)
        if t.error:
            fig.text(0.07, 0.9, _plain(f"could not be solved alone: {t.error}"), fontsize=9, color="#b3261e")
        res = t.result
        if res is not None:
            el_results[t.title] = res
        load = None
        first = next((e for e in result.elements if e.name == t.params.get("name")), None)
        if first is not None:
            load = first.force
        if res is not None and (getattr(res, "profile", None) or {}).get("body") == "rod row":
            # a row's rods are small beside its outer menisci: the section and a close-up
            plotting.meniscus_section(res, ax=fig.add_axes([0.12, 0.67, 0.8, 0.23]))
            plotting.meniscus_section(res, ax=fig.add_axes([0.22, 0.42, 0.6, 0.14]), zoom=True)
        elif res is not None and getattr(res, "profile", None):
            plotting.meniscus_section(res, ax=fig.add_axes([0.12, 0.62, 0.8, 0.28]))
        elif res is not None and isinstance(getattr(res, "shape", None), dict):
            plotting.bending_shape(res, ax=fig.add_axes([0.12, 0.6, 0.8, 0.28]))
        else:
            fig.text(0.07, 0.75, "no cross-section drawing for this kind", fontsize=9, color="#555555")
        if res is not None or t.model is not None:
            box = [0.12, 0.125, 0.8, 0.225] if "rod row" in str((getattr(res, "profile", None) or {}).get("body")) else \
                [0.12, 0.13, 0.8, 0.33]
            plotting.force_depth(res, model=t.model, load=load, ax=fig.add_axes(box))
        fig.text(0.07, 0.08, _plain(f"model: {t.model.model_name}" if t.model is not None else ""), fontsize=8)

    # 4. comparison
    if compared:
        items = [(entry_name(design, 0), design, result), *compared]
        f = _Flow(pages, HEADINGS[3])
        head, rows = comparison_rows(items)
        n = len(items)
        w0 = 0.3
        f.table(head, rows, [w0, *[(0.86 - w0) / n] * n], size=7.5)
        f.gap(0.02)
        for name, d, _ in items:
            f.line(f"{name}: {d.description}", size=8)
        ax = f.fig.add_axes([0.2, 0.08, 0.72, max(0.15, min(0.3, f.y - 0.14))])
        plotting.comparison_bars([(n_, r_) for n_, _, r_ in items], ax=ax)

    # 5. warnings, cautions, references
    f = _Flow(pages, HEADINGS[4])
    f.line("Warnings from the models", size=11, bold=True)
    for w in list(dict.fromkeys(result.warnings)) or ["none: every input lies inside the models' validity ranges"]:
        f.line("• " + w, indent=0.01)
    f.gap().line("Cautions", size=11, bold=True)
    for c in cautions(result):
        f.line("• " + c, indent=0.01)
    f.gap().line("References and the models they support", size=11, bold=True)
    for ref, models in references(result, el_results):
        f.line(f"• {ref}" + (f" — {'; '.join(models)}" if models else ""), indent=0.01)
    pages.save(target, design.description or "design", date)


def pdf_bytes(design, result, **kw) -> bytes:
    """The PDF report as bytes (for a download button)."""
    buf = io.BytesIO()
    write_pdf(design, result, buf, **kw)
    return buf.getvalue()


__all__ = ["HEADINGS", "write_pdf", "pdf_bytes"]
