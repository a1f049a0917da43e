"""Neighbours in a device: parallel rods that share their meniscus carry what the exact 2D
shared-meniscus solution says (Vella, Lee & Kim, Langmuir 22, 5979, 2006; core.parallel2d,
turning-point first integral), not what far-apart rods carry.

Tolerance 2 %: the rods are 100 mm ≈ 37 l_c long, so their ends (bounded end term of
core.finite_rod against the 3D ends of the solved model) move the total by about 1 %; the
shielding factor is solved with the 3D interaction model (core.interactions).
"""

from __future__ import annotations

import math

import pytest

import floatcalc as fc
from floatcalc.core import parallel2d
from floatcalc.design import design_from_data

R, L, THETA = 0.2e-3, 100e-3, 115.0
W = fc.water()


def row(n: int, gap_lc: float):
    S = gap_lc * W.lc + 2 * R
    return S, design_from_data({"schema_version": 2, "body": {"mass": "0 g"}, "elements": [
        {"kind": "rod", "count": n, "layout": "row", "layout_spacing": f"{S * 1e3:.9g} mm", "radius": "0.2 mm",
         "length": "100 mm", "material": "steel", "coating": {"advancing": f"{THETA} deg"}}]})


@pytest.mark.parametrize("n,gap_lc", [(2, 0.55), (2, 1.0), (2, 1.65), (2, 3.0), (2, 6.0), (3, 1.5)])
def test_parallel_rods_in_a_device_match_the_exact_shared_meniscus(n, gap_lc):
    S, d = row(n, gap_lc)
    cap = fc.solve_device(d).capacity.to("N").magnitude
    exact = parallel2d.row_limit(R / W.lc, math.radians(THETA), S / W.lc, n)["force"] * W.sigma * L
    assert cap == pytest.approx(exact, rel=0.02)


def test_three_close_rods_on_the_safe_side():
    # Known shortfall, reported: three rods at a 0.5 l_c gap come out 3.7 % BELOW the exact 2D
    # row (the 3D cluster limit of core.interactions is 4.7 % under 2D × L there), outside the
    # 2 % aimed at but on the safe side; asserted as such so that a change is noticed.
    S, d = row(3, 0.5)
    cap = fc.solve_device(d).capacity.to("N").magnitude
    exact = parallel2d.row_limit(R / W.lc, math.radians(THETA), S / W.lc, 3)["force"] * W.sigma * L
    assert 0.95 * exact <= cap <= exact


def test_capacity_falls_as_rods_come_closer():
    caps = [fc.solve_device(row(2, g)[1]).capacity.to("N").magnitude for g in (0.55, 1.0, 1.65, 4.0)]
    assert caps == sorted(caps) and caps[0] < 0.8 * caps[-1]
    r = fc.solve_device(row(2, 0.55)[1])
    assert any("lower its limit" in w for w in r.warnings)
