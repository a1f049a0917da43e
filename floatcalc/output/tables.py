"""One element of each element table, solved alone by its kind (for drawings and curves).

Tables that differ only in name, position and heading (a skimmer's twelve legs) are solved
once and listed together. Each entry calls the kind's own public function
(:meth:`~floatcalc.elements.ElementKind.solve`) and device adapter
(:meth:`~floatcalc.elements.ElementKind.model`): no physics here.
"""

from __future__ import annotations

import json
from dataclasses import dataclass
from typing import Any

_PLACEMENT = ("name", "position", "heading", "group", "index", "count", "layout", "layout_radius",
              "layout_spacing", "start_angle")


@dataclass
class TableElement:
    """One distinct element of a design: the tables it stands for, its inputs, its results."""

    tables: list[int]
    title: str
    params: dict
    result: Any = None
    model: Any = None
    error: str | None = None

    @property
    def kind(self):
        from ..elements import get_kind

        return get_kind(self.params["kind"])


def signature(p: dict, liquid) -> str:
    """Text key of an element's own inputs (placement left out) and its liquid."""
    own = {k: v for k, v in p.items() if k not in _PLACEMENT}
    return json.dumps({"p": own, "liquid": liquid.summary()}, sort_keys=True, default=str)


def distinct_tables(design) -> list[TableElement]:
    """The design's distinct element tables (first placed element of each), unsolved."""
    from ..elements import get_kind

    out: dict[str, TableElement] = {}
    for p in design.elements:
        if p.get("index", 0) != 0:
            continue
        key = signature(p, design.liquid)
        gi = p.get("group", 0)
        if key in out:
            out[key].tables.append(gi)
        else:
            out[key] = TableElement(tables=[gi], title="", params=p)
    items = list(out.values())
    for t in items:
        kind = get_kind(t.params["kind"])
        n = sum(design.groups[i]["count"] for i in t.tables)
        which = (f"table {t.tables[0] + 1}" if len(t.tables) == 1 else
                 f"tables {', '.join(str(i + 1) for i in t.tables)}" if len(t.tables) <= 4 else
                 f"tables {t.tables[0] + 1}–{t.tables[-1] + 1}")
        t.title = f"{which}: {kind.noun(n)}"
    return items


def solve_table(t: TableElement, liquid, solve=None) -> TableElement:
    """Fill in ``result`` (the kind's public result) and ``model`` of one table element;
    a failure is recorded as text in ``error``. ``solve(kind, p, liquid)`` may be given to
    cache the kind's solve (the page does)."""
    from ..errors import ConvergenceError, InputError

    kind = t.kind
    try:
        t.result = solve(kind, t.params, liquid) if solve else kind.solve(t.params, liquid)
    except (InputError, ConvergenceError) as exc:
        t.error = str(exc).splitlines()[0]
    try:
        t.model = kind.model(t.params, liquid)
    except (InputError, ConvergenceError) as exc:
        t.error = t.error or str(exc).splitlines()[0]
    return t


def solved_tables(design, solve=None) -> list[TableElement]:
    """:func:`distinct_tables`, each solved."""
    return [solve_table(t, design.liquid, solve) for t in distinct_tables(design)]


__all__ = ["TableElement", "signature", "distinct_tables", "solve_table", "solved_tables"]
