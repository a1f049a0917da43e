"""Published checks for whole devices (floatcalc.device), each naming its source.

* Wilhelmy relation (L. Wilhelmy, Ann. Phys. 195, 177, 1863): a vertical fibre dipped well
  past its meniscus carries σ P |cos θ| by surface tension.
* Song, Suhr & Sitti, ICRA 2006: Teflon-coated compliant wire legs carry about 0.15 g per cm
  of leg. A band check only (factor 2 either way), since leg diameter and coating angles
  differ from the paper's; never used to tune anything.
* Vella, Lee & Kim, Langmuir 22, 5979 (2006): far-apart parallel rods carry the sum of single
  rods; rods close together share one meniscus and carry less per rod.
"""

from __future__ import annotations

import math

import pytest

from floatcalc.device import example, solve_device
from floatcalc.device.design import design_from_data
from floatcalc.device.parallel import parallel_rods
from floatcalc.liquids import water

W20 = water("20 degC")


def test_three_pin_device_carries_the_wilhelmy_force():
    """Three thin non-wetting pins far apart, pushed to their full protrusion L: total ≈
    3 (σ P |cos θ| + ρ g π b² L), the Wilhelmy pull plus the hydrostatic pressure on the flat
    tip. Tolerance 2 %: the side meniscus of a 0.1 mm pin has converged to the Wilhelmy value
    well before 4 mm."""
    b, th = 0.1e-3, math.radians(120)
    legs = [{"kind": "pin", "position": [f"{40 * math.cos(a):.5f} mm", f"{40 * math.sin(a):.5f} mm"],
             "radius": "0.1 mm", "length": "4 mm", "material": "nylon", "coating": {"advancing": "120 deg"}}
            for a in (0.0, 2 * math.pi / 3, 4 * math.pi / 3)]
    d = design_from_data({"schema_version": 1, "liquid": {"name": "water"},
                          "body": {"mass": "0.001 g", "centre_of_mass": ["0 mm", "0 mm"]}, "legs": legs})
    r = solve_device(d)
    assert r.verdict == "floats"
    total = (r.weight + r.max_payload).to("N").magnitude
    one = W20.sigma * 2 * math.pi * b * abs(math.cos(th)) + W20.rho * W20.g * math.pi * b * b * 4e-3
    assert total == pytest.approx(3 * one, rel=0.02)


def test_skimmer_load_per_leg_length_in_published_band():
    """Song, Suhr & Sitti (ICRA 2006): ~0.15 g per cm for Teflon-coated wire legs; band 0.075–0.3."""
    r = solve_device(example("skimmer"))
    carried_g = (r.weight + r.max_payload).to("N").magnitude / W20.g * 1e3
    per_cm = carried_g / (12 * 2.0)  # twelve 20 mm legs
    assert 0.075 <= per_cm <= 0.3


def test_pairs_of_rods_share_their_meniscus():
    """Vella, Lee & Kim (2006): two distant rods carry twice one rod; touching ones much less."""
    far = parallel_rods("0.2 mm", "100 mm", "110 deg", 2, "40 mm")
    near = parallel_rods("0.2 mm", "100 mm", "110 deg", 2, "0.45 mm")
    assert far.per_leg_max_force.magnitude == pytest.approx(far.isolated_per_leg_max_force.magnitude, rel=1e-4)
    assert near.per_leg_max_force.magnitude < 0.75 * near.isolated_per_leg_max_force.magnitude
