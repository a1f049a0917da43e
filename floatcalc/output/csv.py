"""CSV tables of a solved design: every element table's force–depth curve and meniscus profile,
the elements at equilibrium, and the result rows. Plain CSV with unit-bearing headers (SI)."""

from __future__ import annotations

import csv as _csv
import io
import zipfile


class _SafeWriter:
    """A csv writer whose text cells have their control characters escaped (names from a
    design file reach a terminal when the CSV is printed)."""

    def __init__(self, buf):
        self._w = _csv.writer(buf, lineterminator="\n")

    def writerow(self, row):
        from .text import escape_controls

        self._w.writerow([escape_controls(c) if isinstance(c, str) else c for c in row])


def _writer():
    buf = io.StringIO()
    return buf, _SafeWriter(buf)


def curve_tables(tables, prefix: str = "") -> dict[str, str]:
    """CSV text of each distinct table's curves (:func:`floatcalc.output.tables.solved_tables`),
    keyed by file name: ``tableN_force_depth.csv`` (depth_m, force_N[, parts]) and, where the
    kind draws one, ``tableN_meniscus.csv``."""
    from ..plotting import element_curve

    out: dict[str, str] = {}
    for t in tables:
        if t.result is None and t.model is None:
            continue
        n = t.tables[0] + 1
        c = element_curve(t.result, t.model)
        parts = [p for p in ("surface_tension", "pressure") if p in c]
        buf, w = _writer()
        w.writerow(["depth_m", "force_N", *[f"{p}_part_N" for p in parts]])
        for k in range(len(c["depth"])):
            w.writerow([f"{c['depth'][k] * 1e-3:.9g}", f"{c['force'][k] * 1e-3:.9g}",
                        *[f"{c[p][k] * 1e-3:.9g}" for p in parts]])
        out[f"{prefix}table{n}_force_depth.csv"] = buf.getvalue()
        prof = getattr(t.result, "profile", None) or {}
        if "right_m" in prof:
            buf, w = _writer()
            w.writerow(["side", "x_m", "z_m"])
            for side in ("left_m", "right_m"):
                for x, z in zip(*prof[side]):
                    w.writerow([side[:-2], f"{x:.9g}", f"{z:.9g}"])
            out[f"{prefix}table{n}_meniscus.csv"] = buf.getvalue()
        elif "r_m" in prof:
            buf, w = _writer()
            w.writerow(["r_m", "z_m"])
            for x, z in zip(prof["r_m"], prof["z_m"]):
                w.writerow([f"{x:.9g}", f"{z:.9g}"])
            out[f"{prefix}table{n}_meniscus.csv"] = buf.getvalue()
        shape = getattr(t.result, "shape", None)
        if isinstance(shape, dict) and "x_m" in shape:
            buf, w = _writer()
            w.writerow(["x_m", "depth_m"])
            for x, z in zip(shape["x_m"], shape["depth_m"]):
                w.writerow([f"{x:.9g}", f"{z:.9g}"])
            out[f"{prefix}table{n}_bending.csv"] = buf.getvalue()
    return out


def element_table(r) -> str:
    """CSV of the elements at equilibrium: plan position, force, limit, utilisation, state,
    breakthrough order and payload."""
    from .text import element_state

    buf, w = _writer()
    w.writerow(["element", "kind", "x_m", "y_m", "force_N", "limit_force_N", "utilisation", "state",
                "depth_m", "limit_depth_m", "breakthrough_order", "breakthrough_payload_N"])
    for e, m in zip(r.elements, r.device.models):
        c = m.footprint.mean(axis=0)
        bp = e.breakthrough_payload
        w.writerow([e.name, e.kind, f"{c[0]:.9g}", f"{c[1]:.9g}", f"{e.force.to('N').magnitude:.9g}",
                    f"{e.limit_force.to('N').magnitude:.9g}", f"{e.utilisation:.6g}", element_state(e),
                    f"{e.depth.to('m').magnitude:.9g}", f"{e.limit_depth.to('m').magnitude:.9g}",
                    "" if e.breakthrough_order is None else e.breakthrough_order,
                    "" if bp is None else f"{bp.to('N').magnitude:.9g}"])
    return buf.getvalue()


def result_table(r) -> str:
    """CSV of the result rows (quantity, value) in the page's words."""
    from .text import result_rows

    buf, w = _writer()
    w.writerow(["quantity", "value"])
    for row in result_rows(r):
        w.writerow(row)
    return buf.getvalue()


def all_tables(r, tables, others=()) -> dict[str, str]:
    """Every CSV table of a result and its distinct element tables (and of compared entries:
    ``others`` = (name, result, tables) triples, prefixed ``entry2_`` …)."""
    out = {"results.csv": result_table(r), "elements.csv": element_table(r), **curve_tables(tables)}
    for k, (_, b, tb) in enumerate(others, 2):
        out[f"entry{k}_results.csv"] = result_table(b)
        out[f"entry{k}_elements.csv"] = element_table(b)
        out.update(curve_tables(tb, prefix=f"entry{k}_"))
    return out


def csv_zip(tables: dict[str, str]) -> bytes:
    """A zip archive (bytes) of CSV tables."""
    buf = io.BytesIO()
    with zipfile.ZipFile(buf, "w", zipfile.ZIP_DEFLATED) as z:
        for name, text in tables.items():
            z.writestr(name, text)
    return buf.getvalue()


def write_csv_dir(tables: dict[str, str], directory: str) -> list[str]:
    """Write CSV tables into ``directory`` (created if needed); returns the paths."""
    import os

    os.makedirs(directory, exist_ok=True)
    paths = []
    for name, text in tables.items():
        path = os.path.join(directory, name)
        with open(path, "w", encoding="utf-8", newline="") as f:
            f.write(text)
        paths.append(path)
    return paths


__all__ = ["curve_tables", "element_table", "result_table", "all_tables", "csv_zip", "write_csv_dir"]
