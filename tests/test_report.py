"""The report (floatcalc report, floatcalc.output) on the one spine.

* One answer: the report, the page's solve and ``floatcalc device --json`` give the same
  capacity, Baudoin number and verdict for the same design (the same function,
  ``solve_device``, behind all three; STYLE.md "One question, one answer").
* ``floatcalc report --example NAME`` works for every built-in example; the PDF has a page
  per part with version, date and page numbers, every element kind drawn, each reference once.
* The Baudoin number printed equals W / (σ P) from the result's own weight and perimeter
  (Bush & Hu, Annu. Rev. Fluid Mech. 38, 339, 2006: Ba = M g / (σ P)).
"""

from __future__ import annotations

import csv
import io
import json
import math
import re
import subprocess
from pathlib import Path

import pytest

from _cli import run_cli
from floatcalc.design import example, example_names, load_design
from floatcalc.device.solve import solve_device
from floatcalc.output import text as tx

ROOT = Path(__file__).resolve().parents[1]


def _cli(*args):
    """``floatcalc ARGS`` in this process (tests/_cli.py: the command's entry point)."""
    return run_cli(*args)


def _pdf_text(path) -> list[str]:
    """Text of each PDF page (pdftotext from poppler-utils)."""
    out = subprocess.run(["pdftotext", "-layout", str(path), "-"], capture_output=True, text=True, check=True)
    return out.stdout.split("\f")


@pytest.mark.slow
def test_one_answer_report_page_and_device_command(tmp_path):
    """Same capacity, Baudoin number and verdict from the report, the page's solver and the
    device command, for a design file written by the page's writer."""
    from floatcalc.design import design_text
    from floatcalc.page import solver

    d = example("robot")
    path = tmp_path / "robot.toml"
    path.write_text(design_text(d), encoding="utf-8")
    dev = _cli("device", str(path), "--json")
    assert dev.returncode == 0, dev.stderr
    dj = json.loads(dev.stdout)
    rep = _cli("report", str(path), "-o", str(tmp_path / "r.pdf"), "--json")
    assert rep.returncode == 0, rep.stderr
    rj = json.loads(rep.stdout)
    _, page = solver.solve(load_design(path).data)
    for key in ("capacity_N", "baudoin_number", "max_payload_N", "sinking_payload_N"):
        assert rj[key] == pytest.approx(dj[key], rel=1e-12), key
    assert page.capacity.to("N").magnitude == pytest.approx(dj["capacity_N"], rel=1e-12)
    assert page.baudoin_number == pytest.approx(dj["baudoin_number"], rel=1e-12)
    assert rj["verdict"] == dj["verdict"] == page.verdict
    # Bush & Hu 2006: Ba = W / (sigma P), with the result's own load and contact perimeter
    sigma = dj["liquid"]["surface_tension_N_per_m"]
    assert dj["baudoin_number"] == pytest.approx(dj["load_N"] / (sigma * dj["contact_perimeter_m"]), rel=1e-9)


@pytest.mark.slow
@pytest.mark.parametrize("name", example_names())
def test_report_of_every_example(name, tmp_path):
    pdf = tmp_path / f"{name}.pdf"
    res = _cli("report", "--example", name, "-o", str(pdf), "--csv-dir", str(tmp_path / "csv"))
    assert res.returncode == 0, res.stderr
    assert "verdict" in res.stdout and str(pdf) in res.stdout
    pages = [p for p in _pdf_text(pdf) if p.strip()]
    n = len(pages)
    from floatcalc import __version__

    for k, p in enumerate(pages, 1):
        assert f"page {k} of {n}" in p
        assert f"floatcalc {__version__}" in p
        assert re.search(r"\d{4}-\d{2}-\d{2}", p)
    whole = "\n".join(pages)
    r = solve_device(example(name))
    assert f"Verdict: {r.verdict}" in whole
    for word in ("capacity", "max payload", "sinking payload", "safety factor", "utilisation", "Baudoin number"):
        assert word in whole, word
    # each reference (citation before ': ') listed once
    refs_page = whole[whole.index("References and the models they support"):]
    cites = [ln.strip().split(":")[0] for ln in refs_page.splitlines()
             if ln.strip().startswith("•") and re.search(r"\((19|20)\d\d\)", ln.split(":")[0])]
    assert cites and len(cites) == len(set(cites)), cites
    # cautions once each
    for c in r.cautions:
        head = c[:40]
        assert whole.count(head) == 1, head
    rows = list(csv.reader(io.StringIO((tmp_path / "csv" / "elements.csv").read_text())))
    assert len(rows) == 1 + len(r.elements)


def test_report_refuses_bad_arguments(tmp_path):
    res = _cli("report", "-o", str(tmp_path / "x.txt"), "--example", "robot")
    assert res.returncode == 2 and "output: must be a file name ending in .pdf" in res.stderr
    res = _cli("report", "-o", str(tmp_path / "x.pdf"))
    assert res.returncode == 2 and "give a design file or --example NAME" in res.stderr
    res = _cli("report", "--example", "robott", "-o", str(tmp_path / "x.pdf"))
    assert res.returncode == 2 and "did you mean 'robot'" in res.stderr


@pytest.mark.slow
def test_pdf_draws_every_element_kind(tmp_path):
    """One design with a table of every registered kind: the PDF has a page for each, with a
    force–depth curve, and the kind's drawing (section, or bending for a flexible leg)."""
    from floatcalc.design import design_from_data
    from floatcalc.elements import kinds
    from floatcalc.output import pdf
    from floatcalc.page.main import new_table

    tables = []
    for k in kinds():
        t = new_table(k.name)
        t["count"], t["layout"] = 1, None
        t.pop("layout")
        t.pop("count")
        tables.append(t)
    for j, t in enumerate(tables):
        t["position"] = [f"{70 * math.cos(2 * math.pi * j / len(tables)):.2f} mm",
                         f"{70 * math.sin(2 * math.pi * j / len(tables)):.2f} mm"]
        t["heading"] = f"{360 * j / len(tables):.1f} deg" if "heading" in dict(
            next(k for k in kinds() if k.name == t["kind"]).fields) else None
        if t["heading"] is None:
            t.pop("heading")
    data = {"schema_version": 2, "description": "Invented test design: one element of every kind",
            "body": {"mass": "0.2 g"}, "elements": tables}
    d = design_from_data(data)
    r = solve_device(d)
    out = tmp_path / "kinds.pdf"
    pdf.write_pdf(d, r, out)
    whole = "\n".join(_pdf_text(out))
    for k in kinds():
        assert f"1 {k.label}" in whole, k.label
    assert "Flexible leg bending at the limit" in whole
    assert whole.count("Force against depth") == len(kinds())


def test_text_rows_use_the_one_vocabulary():
    r = solve_device(example("skimmer"))
    labels = [a for a, _ in tx.result_rows(r)]
    assert labels[0] == "verdict" and dict(tx.result_rows(r))["verdict"] in __import__(
        "floatcalc.device.assess", fromlist=["VERDICTS"]).VERDICTS
    for word in ("weight", "payload", "load", "capacity", "max payload", "sinking payload", "safety factor"):
        assert any(lb.startswith(word) for lb in labels), word
    assert not any("margin" in lb for lb in labels)
    rows = tx.element_rows(r)
    assert {row["state"] for row in rows} <= set(tx.STATES)


def test_comparison_names_entries_and_their_differing_inputs():
    d = example("compare")
    items = [(tx.entry_name(x, i), x, solve_device(x)) for i, x in enumerate([d, *d.alternatives])]
    head, rows = tx.comparison_rows(items)
    assert head[1:] == ["design A", "design B"]
    keys = [row[0] for row in rows]
    assert "input elements[0].radius" in keys and "input elements[0].count" in keys
    assert "input liquid.name" not in keys  # the same in both
    radius = next(row for row in rows if row[0] == "input elements[0].radius")
    assert radius[1:] == ["0.1 mm", "0.35 mm"]
