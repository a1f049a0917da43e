"""Progressive failure: an element that reaches its limit breaks through and then carries only
its post-breakthrough force (the buoyancy of its submerged body, ρ g V: Archimedes); the device
re-settles on the rest and sinks only when no equilibrium remains (PHYSICS.md, bounds).

The independent check: a design whose smallest element breaks through first must carry, before
it sinks, exactly what the same design WITHOUT that element carries (its own weight moved onto
the body) plus the broken element's buoyancy. The foot sits at the centre of mass, so moving
its weight and its buoyancy there changes no moment.
"""

from __future__ import annotations

import math

import pytest

import floatcalc as fc
from floatcalc.design import design_from_data
from floatcalc.device.assess import VERDICTS

RODS = {"kind": "rod", "name": "leg", "count": 4, "layout": "around", "layout_radius": "25 mm", "radius": "0.2 mm",
        "length": "30 mm", "material": "steel", "coating": {"advancing": "120 deg"}}
FOOT = {"kind": "ball", "name": "foot", "position": ["0 mm", "0 mm"], "radius": "0.3 mm", "mount": "-1 mm",
        "material": "steel", "coating": {"advancing": "150 deg"}}


def design(elements, body_mass="0.5 g"):
    return design_from_data({"schema_version": 2, "body": {"mass": body_mass}, "elements": elements})


def test_smallest_element_breaks_first_and_the_device_floats_on_the_rest():
    d = design([RODS, FOOT])
    r = fc.solve_device(d)
    foot = next(e for e in r.elements if e.name == "foot")
    assert r.first_to_fail == "foot" and foot.breakthrough_order == 1
    # with a payload between the first breakthrough and sinking: floats on the rest
    P = 0.5 * (r.max_payload + r.sinking_payload).to("N").magnitude
    r2 = fc.solve_device(d, payload=f"{P / d.liquid.g!r} kg")
    assert r.sinking_payload > r.max_payload
    assert r2.verdict == VERDICTS[1] and "foot" in r2.broken_through


def test_sinking_payload_is_the_rest_plus_the_broken_element_buoyancy():
    d = design([RODS, FOOT])
    r = fc.solve_device(d)
    dev = r.device
    i = dev.names.index("foot")
    foot_model = dev.models[i]
    w = d.liquid
    foot_mass = foot_model.own_weight / w.g
    rest = design([RODS], body_mass=f"{(0.5e-3 + foot_mass) * 1e3!r} g")
    r_rest = fc.solve_device(rest)
    buoyancy = w.rho * w.g * 4.0 / 3.0 * math.pi * (0.3e-3) ** 3   # ρ g V of the submerged ball
    assert foot_model.broken_force == pytest.approx(buoyancy, rel=1e-12)
    expected = r_rest.max_payload.to("N").magnitude + buoyancy
    # tolerance: two different devices' capacity searches (Brent, rtol 1e-8) on tables resampled
    # to a common uniform grid (measured 7e-6)
    assert r.sinking_payload.to("N").magnitude == pytest.approx(expected, rel=1e-4)


def test_sinks_only_when_nothing_holds_it():
    d = design([RODS, FOOT])
    r = fc.solve_device(d)
    over = fc.solve_device(d, payload=f"{1.01 * r.sinking_payload.to('N').magnitude / fc.water().g * 1e3!r} g")
    assert over.verdict == "sinks" and over.shortfall is not None


def test_shielding_is_solved_once_per_layout(monkeypatch):
    """Changing only the body mass keeps the layout, so the shared meniscus is not solved again
    (the cache key is the layout; it was once overwritten by a per-element key and never hit)."""
    import copy

    from floatcalc.core import interactions as I
    from floatcalc.design import design_from_data, example
    from floatcalc.device import interact
    from floatcalc.device.solve import Device

    data = copy.deepcopy(example("skimmer").data)
    data["liquid"] = {"name": "water", "temperature": "21.5 degC"}   # a layout not solved before
    calls = []
    real = I.limit
    monkeypatch.setattr(I, "limit", lambda *a, **k: calls.append(1) or real(*a, **k))
    first = Device.from_design(design_from_data(data)).shielding
    n_first = len(calls)
    data["body"]["mass"] = "1.234 g"
    again = Device.from_design(design_from_data(data)).shielding
    assert n_first >= 1              # the skimmer has close legs, solved together
    assert len(calls) == n_first     # ... once
    assert list(again) == list(first)
    assert len(interact._CACHE) >= 1
