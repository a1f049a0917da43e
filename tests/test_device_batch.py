"""Batched device capacity (floatcalc.studies.device_batch, floatcalc.core.equilibrium_batch).

The reference throughout is the scalar path, tested on its own in tests/test_device.py: the
study model's ``_DeviceFunc`` (rebuild the device, then floatcalc.core.equilibrium.capacity,
Brent's method on the payload with a Newton solve per step). The batch solves other equations
(heave, pitch and roll at the capacity directly) with another method, so agreement is a check
of both. Tolerance 1e-6 relative in the payload: the scalar root search stops at rtol 1e-8 and
accepts equilibria with a residual up to 1e-7 of the weight; in the twin-rod rig both rods reach
their limits together and the scalar search then brackets the jump at the limit sum (seen up to
4e-7).
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from floatcalc.core import equilibrium as eq
from floatcalc.core import equilibrium_batch as eb
from floatcalc.core import finite_rod
from floatcalc.device import Device, example
from floatcalc.device.design import design_from_data
from floatcalc.errors import InputError
from floatcalc.studies import device_batch as db
from floatcalc.studies.device_model import _DeviceFunc, device_model

RTOL = 1e-6
OUTPUTS = ("max_payload", "payload_mass", "spare_payload", "weight")

#: Invented rod device using the rest of what the rod adapter takes: a tilted rod, a raised
#: rod, two segment counts and densities, uneven headings, the centre of mass off-centre.
MIXED = {
    "schema_version": 1, "liquid": {"name": "water", "temperature": "25 degC"},
    "body": {"mass": "0.6 g", "centre_of_mass": ["1 mm", "-0.5 mm"]},
    "legs": [
        {"kind": "rod", "position": ["12 mm", "0 mm"], "heading": "80 deg", "radius": "0.2 mm", "length": "18 mm",
         "material": "steel", "coating": {"advancing": "120 deg"}, "segments": 4},
        {"kind": "rod", "position": ["-6 mm", "10 mm"], "heading": "200 deg", "radius": "0.2 mm",
         "length": "18 mm", "tilt": "2 deg", "material": "steel", "segments": 7,
         "coating": {"advancing": "120 deg"}},
        {"kind": "rod", "position": ["-6 mm", "-10 mm"], "heading": "-40 deg", "radius": "0.2 mm",
         "length": "18 mm", "mount": "0.05 mm", "material_density": "2700 kg/m^3",
         "coating": {"advancing": "120 deg"}, "segments": 4},
    ],
}
#: As MIXED with rods of two radii and a textured coating: their tables from first contact
#: differ in length.
UNEVEN = {**MIXED, "legs": [MIXED["legs"][0], {**MIXED["legs"][1], "radius": "0.15 mm", "length": "22 mm",
                                                 "coating": {"advancing": "105 deg", "texture": "cassie",
                                                             "solid_fraction": 0.4}}, MIXED["legs"][2]]}


def _designs():
    return {"skimmer": example("skimmer"), "twin_rod": example("twin_rod"), "mixed": design_from_data(MIXED)}


def _samples(design, n, seed, wide=False):
    """Seeded perturbations of every model input around the design (1-D SI arrays)."""
    rng = np.random.default_rng(seed)
    base = device_model(design).merged({})
    x = {k: np.full(n, float(v)) for k, v in base.items()}
    s = 3.0 if wide else 1.0
    x["contact_angle_shift"] = rng.normal(-0.05, 0.06 * s, n)
    x["radius_factor"] = rng.uniform(1 - 0.05 * s, 1 + 0.05 * s, n)
    x["length_factor"] = rng.uniform(1 - 0.1 * s, 1 + 0.05 * s, n)
    x["surface_tension"] = float(base["surface_tension"]) - rng.uniform(0.0, 0.01 * s, n)
    x["body_mass"] = float(base["body_mass"]) * rng.uniform(0.7, 5.0 if wide else 1.5, n)
    x["payload_mass"] = rng.uniform(0.0, 2e-3, n)
    return x


def _scalar(design, x):
    from floatcalc.device import Device

    # studies reuse the nominal layout's shielding factors (solved once, not per sample)
    f = _DeviceFunc(design, shielding=Device.from_design(design).shielding)
    n = x["radius_factor"].size
    rows = [f({k: float(v[i]) for k, v in x.items()}) for i in range(n)]
    return {k: np.array([r[k] for r in rows]) for k in OUTPUTS}


@pytest.mark.parametrize("name, wide", [("skimmer", False), ("skimmer", True), ("twin_rod", False),
                                        ("twin_rod", True), ("mixed", False)])
def test_batch_matches_scalar_on_random_perturbations(name, wide):
    design = _designs()[name]
    x = _samples(design, 22, seed=7 + 3 * wide + len(name), wide=wide)
    got = db.DeviceBatchFunc(design, block=9)(x)       # several blocks, the last one short
    ref = _scalar(design, x)
    for k in OUTPUTS:
        assert got[k].shape == (22,)
        np.testing.assert_allclose(got[k], ref[k], rtol=RTOL, atol=0, err_msg=k)
    if wide:  # the wide draws include devices too heavy for their legs (negative capacity)
        assert np.any(ref["max_payload"] < 0) and np.any(ref["max_payload"] > 0)


def test_symmetric_device_stays_level():
    """The twin-rod rig is symmetric about both axes with its centre of mass at the origin:
    the batch must find zero pitch and roll for any common perturbation, and the scalar
    capacity."""
    design = example("twin_rod")
    x = _samples(design, 12, seed=3)
    lay = db.layout(design)
    bs, W, xg, yg, weight, fs, clear = db.build(design, lay, x)
    assert clear.all()
    P, u, ok = eb.capacity_at_centre(bs, W, xg, yg)
    assert ok.all()
    assert np.max(np.abs(u[:, 1:])) < 1e-12
    np.testing.assert_allclose(P * fs, _scalar(design, x)["max_payload"], rtol=RTOL)


def test_core_batch_on_supports_of_any_kind_matches_scalar_capacity():
    """equilibrium_batch on stacked scalar Supports (ball feet, not rods; and the skimmer
    shifted off-centre) against floatcalc.core.equilibrium.capacity at the centre of mass."""
    legs = [{"kind": "ball", "position": [f"{8 * math.cos(a):.6f} mm", f"{8 * math.sin(a):.6f} mm"],
             "radius": "1 mm", "material": "nylon", "coating": {"advancing": "150 deg"}}
            for a in (0.0, 2 * math.pi / 3, 4 * math.pi / 3)]
    balls = design_from_data({"schema_version": 1, "liquid": {"name": "water"},
                              "body": {"mass": "0.02 g", "centre_of_mass": ["0.5 mm", "0.3 mm"]}, "legs": legs})
    for design in (balls, example("skimmer")):
        dev = Device.from_design(design)
        sup = dev.support()
        lc, fs = dev.liquid.lc, dev.liquid.sigma * dev.liquid.lc
        xg, yg = dev.centre_of_mass
        W = dev.weight / fs
        P, u, e, _ = eq.capacity(sup, W, xg / lc, yg / lc, xg / lc, yg / lc)
        shifts = np.array([0.0, 0.4, -0.3])     # [l_c] moves the centre of mass: tilted equilibria
        bs = eb.from_supports([sup] * 3)
        Pb, ub, ok = eb.capacity_at_centre(bs, np.full(3, W), xg / lc + shifts, np.full(3, yg / lc))
        assert ok.all()
        for i, sx in enumerate(shifts):
            Pi = P if sx == 0 else eq.capacity(sup, W, xg / lc + sx, yg / lc, xg / lc + sx, yg / lc)[0]
            assert Pb[i] == pytest.approx(Pi, rel=RTOL)
        assert ub[0] == pytest.approx(u, rel=1e-5, abs=1e-7)


def test_batch_lookup_is_the_support_law():
    """BatchSupport.lookup against Support.lookup at random depths (before contact, on the
    table, past the limit)."""
    sup = Device.from_design(example("skimmer")).support()
    bs = eb.from_supports([sup, sup])
    rng = np.random.default_rng(5)
    e = rng.uniform(-0.2, 1.2 * float(sup.limit_depth.max()), (2, sup.x.size))
    F, H, dF, _ = bs.lookup(e)
    for i in range(2):
        Fs, Hs, dFs = sup.lookup(e[i], slopes=True)
        np.testing.assert_allclose(F[i], Fs, rtol=1e-13, atol=1e-15)
        np.testing.assert_allclose(H[i], Hs, rtol=1e-13, atol=1e-15)
        np.testing.assert_allclose(dF[i], dFs, rtol=1e-12, atol=1e-15)


def test_vectorised_finite_rod_limit_equals_the_grid_search():
    rng = np.random.default_rng(11)
    R = 10 ** rng.uniform(-3, 0.3, 300)
    th = rng.uniform(0.0, np.pi, 300)
    th[:3] = (0.0, np.pi, 0.5 * np.pi)
    L = rng.uniform(2.0, 60.0, 300)
    ref = np.array([finite_rod.limit(*a)["phi"] for a in zip(R, th, L)])
    np.testing.assert_allclose(finite_rod.limit_many(R, th, L), ref, rtol=0, atol=1e-13)


def test_overlapping_footprints_stay_an_input_error():
    """Legs stretched into each other: the batch hands the sample to the scalar model, which
    refuses it with its one-line InputError."""
    design = example("skimmer")
    x = _samples(design, 4, seed=1)
    x["length_factor"][2] = 3.0
    with pytest.raises(InputError) as batch:
        db.DeviceBatchFunc(design)(x)
    with pytest.raises(InputError) as scalar:
        _DeviceFunc(design)({k: float(v[2]) for k, v in x.items()})
    assert str(batch.value) == str(scalar.value) and "\n" not in str(batch.value)


def test_rod_and_round_devices_are_batchable():
    """Rods and round elements are batched (round ones in tests/test_device_batch_mixed.py)."""
    assert db.batchable(example("skimmer")) and db.batchable(example("twin_rod"))
    legs = [{"kind": "ball", "position": [f"{8 * math.cos(a):.6f} mm", f"{8 * math.sin(a):.6f} mm"],
             "radius": "1 mm", "material": "nylon", "coating": {"advancing": "150 deg"}} for a in (0.0, 2.1, 4.2)]
    balls = design_from_data({"schema_version": 1, "liquid": {"name": "water"},
                              "body": {"mass": "0.02 g", "centre_of_mass": ["0 mm", "0 mm"]}, "legs": legs})
    assert db.batchable(balls)
    flex = [{"kind": "flexible_leg", "position": [f"{8 * math.cos(a):.6f} mm", f"{8 * math.sin(a):.6f} mm"],
             "heading": f"{a} rad", "radius": "0.1 mm", "length": "20 mm", "material": "steel",
             "coating": {"advancing": "150 deg"}} for a in (0.0, 2.1, 4.2)]
    legs_flex = design_from_data({"schema_version": 1, "liquid": {"name": "water"},
                                  "body": {"mass": "0.02 g", "centre_of_mass": ["0 mm", "0 mm"]}, "legs": flex})
    assert db.batchable(legs_flex)   # flexible legs too (tests/test_device_batch_flexleg.py)


def test_rods_with_tables_of_different_lengths_are_batched_like_the_scalar_path():
    """Rods whose tables from first contact differ in length: the scalar Device.support
    resamples them all on as many points as the longest (device.solve._common_tables), and so
    does the batch, which decides these samples itself."""
    design = design_from_data(UNEVEN)
    x = _samples(design, 6, seed=2)
    lay = db.layout(design)
    assert db.build(design, lay, x)[-1].all()
    ref = _scalar(design, x)
    got = db.DeviceBatchFunc(design)(x)
    for k in OUTPUTS:
        np.testing.assert_allclose(got[k], ref[k], rtol=RTOL)


def test_device_model_is_batched_for_rods_and_balls():
    """device_model switches to the batch for designs of batched kinds (arrays in, the scalar
    numbers out, broadcast shapes kept); kinds that stay scalar: tests/test_device_batch_mixed.py."""
    from floatcalc.studies.models import evaluate_pointwise

    m = device_model("skimmer")
    assert m.vectorised and isinstance(m.func, db.DeviceBatchFunc)
    values = {"radius_factor": np.array([[0.97], [1.0], [1.03]]), "surface_tension": np.array([0.0728, 0.065])}
    got = m.evaluate(values)
    ref = evaluate_pointwise(_DeviceFunc(m.func.design), m.merged(values))
    for k in OUTPUTS:
        assert got[k].shape == (3, 2)
        np.testing.assert_allclose(got[k], ref[k], rtol=RTOL)
    legs = [{"kind": "ball", "position": [f"{8 * math.cos(a):.6f} mm", f"{8 * math.sin(a):.6f} mm"],
             "radius": "1 mm", "material": "nylon", "coating": {"advancing": "150 deg"}} for a in (0.0, 2.1, 4.2)]
    balls = design_from_data({"schema_version": 1, "liquid": {"name": "water"},
                              "body": {"mass": "0.02 g", "centre_of_mass": ["0 mm", "0 mm"]}, "legs": legs})
    mb = device_model(balls)
    assert mb.vectorised and isinstance(mb.func, db.DeviceBatchFunc)
    ref = _DeviceFunc(balls, shielding=mb.func.shielding)(mb.merged({}))
    assert float(mb.evaluate({})["max_payload"]) == pytest.approx(ref["max_payload"], rel=1e-8) and ref["max_payload"] > 0
