"""Cost guards: the largest designs the loader accepts answer in seconds, not minutes.

(These are correctness guards against quadratic Python loops coming back, with generous
bounds on a shared machine; speed itself is measured by tests/benchmarks/.)
"""

from __future__ import annotations

import time

import floatcalc as fc
from floatcalc.design import design_from_data


def _balls(n, radius=None):
    el = {"kind": "ball", "count": n, "radius": "0.5 mm", "material": "steel", "coating": {"advancing": "150 deg"}}
    if radius:
        el["layout_radius"] = radius
    return design_from_data({"schema_version": 2, "body": {"mass": "0.2 g"}, "elements": [el]})


def test_two_hundred_ball_feet_answer_in_seconds():
    d = _balls(200)
    t = time.process_time()
    r = fc.solve_device(d)
    assert time.process_time() - t < 30.0
    assert len(r.elements) == 200 and r.verdict in ("floats", "floats with elements broken through", "sinks")


def test_a_close_ring_of_fifty_feet_is_warned_not_solved_for_minutes():
    d = _balls(50, "40 mm")
    t = time.process_time()
    r = fc.solve_device(d)
    assert time.process_time() - t < 30.0
    assert any("round elements within" in w for w in r.warnings)
