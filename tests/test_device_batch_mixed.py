"""Batched study function of devices with round elements (ball feet, pads, pins, rings) and rods.

Reference: the scalar study path (``floatcalc.studies.device_model._DeviceFunc``: rebuild the
device with every element's own adapter, then floatcalc.core.equilibrium.capacity, Brent's
method on the payload with a Newton solve per step), tested on its own in tests/test_device.py
and tests/test_one_answer.py. The batch builds the tables for all samples at once and solves
other equations (heave, pitch and roll at the capacity together, batched Newton), so agreement
checks both. Tolerance 1e-8 relative in the capacity: the scalar root search stops at rtol
1e-8 (the batch converges to 1e-12); the spare payload (capacity minus the payload weight) is
compared with the same absolute tolerance, since the subtraction can cancel digits.

Designs here are invented test rigs, not real devices.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from floatcalc.design import design_from_data
from floatcalc.device import Device
from floatcalc.errors import InputError
from floatcalc.studies import device_batch as db
from floatcalc.studies.device_model import _DeviceFunc, device_model

RTOL = 1e-8
OUTPUTS = ("max_payload", "payload_mass", "spare_payload", "weight")


def _at(r, a):
    return [f"{r * math.cos(math.radians(a)):.6f} mm", f"{r * math.sin(math.radians(a)):.6f} mm"]


def _design(elements, mass="0.3 g", com=("0 mm", "0 mm")):
    return design_from_data({"schema_version": 2, "description": "Invented test rig", "invented": True,
                             "liquid": {"name": "water", "temperature": "20 degC"},
                             "body": {"mass": mass, "centre_of_mass": list(com)}, "elements": elements})


#: Invented rig: five rods (one pair side by side 2 mm apart, so that their shielding factors are
#: below 1; the pair is 3.3 l_c from the next rod, clear of the 2.5 l_c reach under the perturbations), two ball feet and two pads close to the rods, and two pins.
MIXED = [
    *({"kind": "rod", "position": _at(14, a), "heading": f"{a} deg", "radius": "0.2 mm", "length": "16 mm",
       "material": "steel", "coating": {"advancing": "150 deg"}} for a in (45, 135, 225, 315)),
    {"kind": "rod", "position": [f"{16 * math.cos(math.pi / 4) - 2 * math.sin(math.pi / 4):.6f} mm",
                                 f"{16 * math.sin(math.pi / 4) + 2 * math.cos(math.pi / 4):.6f} mm"],
     "heading": "45 deg", "radius": "0.2 mm", "length": "16 mm", "material": "steel",
     "coating": {"advancing": "150 deg"}},
    *({"kind": "ball", "position": _at(7, a), "radius": "1 mm", "material": "nylon",
       "coating": {"advancing": "150 deg"}} for a in (0, 180)),
    *({"kind": "pad", "position": _at(7, a), "radius": "1.5 mm", "thickness": "0.2 mm", "material": "nylon",
       "coating": {"advancing": "120 deg"}} for a in (90, 270)),
    *({"kind": "pin", "position": _at(24, a), "radius": "0.3 mm", "length": "3 mm", "material": "steel",
       "coating": {"advancing": "110 deg"}} for a in (0, 180)),
]
#: Invented rig on three ring footpads, far apart, with a textured coating, off-centre mass.
RINGS = [{"kind": "ring", "position": _at(12, a), "ring_radius": "3 mm", "wire_radius": "0.2 mm",
          "material": "steel", "mount": "0.02 mm" if a == 90 else "0 mm",
          "coating": {"advancing": "115 deg", "texture": "wenzel", "roughness": 1.2}} for a in (90, 210, 330)]


def _samples(design, n, seed, wide=False):
    """Seeded perturbations of every model input around the design (1-D SI arrays)."""
    rng = np.random.default_rng(seed)
    base = {"contact_angle_shift": 0.0, "surface_tension": design.liquid.sigma, "radius_factor": 1.0,
            "length_factor": 1.0, "body_mass": float(design.body["mass"]), "payload_mass": 0.0}
    x = {k: np.full(n, float(v)) for k, v in base.items()}
    s = 3.0 if wide else 1.0
    x["contact_angle_shift"] = rng.normal(-0.05, 0.06 * s, n)
    x["radius_factor"] = rng.uniform(1 - 0.05 * s, 1 + 0.05 * s, n)
    x["length_factor"] = rng.uniform(1 - 0.1 * s, 1 + 0.05 * s, n)
    x["surface_tension"] = float(base["surface_tension"]) - rng.uniform(0.0, 0.01 * s, n)
    x["body_mass"] = float(base["body_mass"]) * rng.uniform(0.7, 5.0 if wide else 1.5, n)
    x["payload_mass"] = rng.uniform(0.0, 2e-3, n)
    return x


def _scalar(design, x, shield=None):
    f = _DeviceFunc(design, shielding=Device.from_design(design).shielding if shield is None else shield)
    n = x["radius_factor"].size
    rows = [f({k: float(v[i]) for k, v in x.items()}) for i in range(n)]
    return {k: np.array([r[k] for r in rows]) for k in OUTPUTS}


def _check(got, ref):
    for k in OUTPUTS:
        scale = np.abs(ref["max_payload"] if k == "spare_payload" else ref[k])
        np.testing.assert_array_less(np.abs(got[k] - ref[k]), RTOL * scale + 1e-300, err_msg=k)


@pytest.fixture(scope="module")
def rig():
    design = _design(MIXED)
    return design, Device.from_design(design).shielding


def test_mixed_device_batch_matches_scalar(rig):
    mixed, shield = rig
    assert min(shield) < 0.99, "the rig should have shared menisci (factors below 1)"
    x = _samples(mixed, 20, seed=4)
    lay = db.layout(mixed, shield)
    assert db.build(mixed, lay, x)[-1].all(), "every sample should be decided by the batch itself"
    _check(db.DeviceBatchFunc(mixed, block=7, shielding=shield)(x), _scalar(mixed, x, shield))


def test_mixed_device_wide_draws_include_sinking(rig):
    """Wide draws: heavy bodies sink (negative capacity) and the batch still agrees."""
    mixed, shield = rig
    x = _samples(mixed, 16, seed=9, wide=True)
    x["body_mass"] *= np.linspace(1.0, 8.0, 16)
    ref = _scalar(mixed, x, shield)
    assert np.any(ref["max_payload"] < 0) and np.any(ref["max_payload"] > 0)
    _check(db.DeviceBatchFunc(mixed, shielding=shield)(x), ref)


def test_ring_device_batch_matches_scalar():
    design = _design(RINGS, mass="0.2 g", com=("0.5 mm", "0.2 mm"))
    x = _samples(design, 10, seed=2)
    _check(db.DeviceBatchFunc(design)(x), _scalar(design, x))


def test_round_feet_pushed_into_each_other_stay_an_input_error(rig):
    """Ball feet grown into the pads beside them: the batch hands the sample to the scalar
    model, which refuses it with its one-line InputError."""
    mixed, shield = rig
    x = _samples(mixed, 3, seed=1)
    x["radius_factor"][1] = 4.0
    with pytest.raises(InputError) as batch:
        db.DeviceBatchFunc(mixed, shielding=shield)(x)
    with pytest.raises(InputError) as scalar:
        _DeviceFunc(mixed, shielding=shield)({k: float(v[1]) for k, v in x.items()})
    assert str(batch.value) == str(scalar.value) and "\n" not in str(batch.value)


def test_overlap_test_is_the_scalar_one_near_touching():
    """Two pads whose footprints touch at radius factor 1.25 (centres 5 mm apart, radius 2 mm;
    the adapter's 24-gon has a vertex on the line of centres): below it the batch decides,
    above it the scalar model refuses; at it the batch leaves the sample to the scalar model,
    so both paths behave alike either way (raise alike, or agree)."""
    pads = [{"kind": "pad", "position": [x, "0 mm"], "radius": "2 mm", "thickness": "0.3 mm", "material": "nylon",
             "coating": {"advancing": "120 deg"}} for x in ("-2.5 mm", "2.5 mm")]
    pads.append({"kind": "ball", "position": ["0 mm", "9 mm"], "radius": "1 mm", "material": "nylon",
                 "coating": {"advancing": "150 deg"}})
    design = _design(pads, mass="0.05 g", com=("0 mm", "2 mm"))
    lay = db.layout(design)
    rf = np.array([1.2, 1.2499, 1.25, 1.2501, 1.3])
    x = {k: np.full(5, float(v)) for k, v in device_model(design).merged({}).items()}
    x["radius_factor"] = rf
    clear = db.build(design, lay, x)[-1]
    assert list(clear) == [True, True, False, False, False]
    for i in range(rf.size):
        one = {k: v[i:i + 1] for k, v in x.items()}
        try:
            ref = _scalar(design, one)
        except InputError as exc:
            assert i >= 2
            with pytest.raises(InputError) as batch:
                db.DeviceBatchFunc(design)(one)
            assert str(batch.value) == str(exc)
        else:
            assert i <= 2
            _check(db.DeviceBatchFunc(design)(one), ref)


def test_every_kind_is_batched():
    """Every registered kind has a batched path (flexible legs since issue 16); a kind left to
    the scalar model would have to say why."""
    assert db.SCALAR_KINDS == {}
    from floatcalc.elements import kind_names

    assert set(kind_names()) == set(db.BATCH_KINDS)
    flex = _design([{"kind": "flexible_leg", "position": ["0 mm", "20 mm"], "heading": "90 deg", "radius": "0.1 mm",
                     "length": "20 mm", "material": "steel", "coating": {"advancing": "150 deg"}}, *MIXED[5:7]],
                   com=("0 mm", "5 mm"))
    assert db.batchable(flex)
    m = device_model(flex)
    assert m.vectorised and m.costly and isinstance(m.func, db.DeviceBatchFunc)
    assert not device_model(_design(MIXED)).costly


#: Invented rig: two rod rows (three rods, and a close pair raised a little and turned) and a ball.
ROWS = [{"kind": "rod_row", "position": ["0 mm", "20 mm"], "radius": "0.2 mm", "length": "30 mm", "rods": 3,
         "spacing": "4 mm", "material": "steel", "coating": {"advancing": "120 deg"}, "segments": 4},
        {"kind": "rod_row", "position": ["0 mm", "-20 mm"], "heading": "10 deg", "radius": "0.2 mm", "length": "30 mm",
         "rods": 2, "spacing": "1.5 mm", "material": "steel", "coating": {"advancing": "120 deg"}, "mount": "0.02 mm"},
        {"kind": "ball", "position": ["12 mm", "0 mm"], "radius": "1 mm", "material": "nylon",
         "coating": {"advancing": "150 deg"}}]


@pytest.mark.slow
def test_rod_row_device_batch_matches_scalar():
    design = _design(ROWS, mass="0.5 g", com=("1 mm", "2 mm"))
    assert db.batchable(design)
    x = _samples(design, 3, seed=8)
    lay = db.layout(design)
    assert db.build(design, lay, x)[-1].all()
    _check(db.DeviceBatchFunc(design)(x), _scalar(design, x))


def test_fast_turning_depth_is_the_bisection_root():
    """core.parallel2d_batch.turning_depth (10 bisections and 6 Illinois steps) against
    core.parallel2d.turning_depth (56 bisections) on seeded random inclinations and gaps,
    from nearly flat to steep and from narrow to wide gaps."""
    from floatcalc.core import parallel2d, parallel2d_batch

    rng = np.random.default_rng(12)
    psi = rng.uniform(-np.pi, np.pi, 2000)
    psi[:3] = (1e-6, -1e-6, np.pi - 1e-6)
    gap = 10 ** rng.uniform(-6, 1.5, 2000)
    ref = parallel2d.turning_depth(psi, gap)
    got = parallel2d_batch.turning_depth(psi, gap)
    # both roots solve X(ψ, h_m) = gap to rounding; near ψ = π with a narrow gap X is nearly
    # flat in h_m (deep turning points), so a rounding-level residual moves the root by up to
    # about 1e-12 of itself (seen 1.6e-12 with NumPy 2.4): compare residuals tightly and roots
    # to 1e-10 (the issue asks scalar and batched to agree to 1e-8)
    res = np.abs(parallel2d.gap_distance(np.abs(psi), got) - gap)
    res_ref = np.abs(parallel2d.gap_distance(np.abs(psi), ref) - gap)
    assert np.all(res <= np.maximum(4 * res_ref, 1e-12 * gap))
    np.testing.assert_allclose(got, ref, rtol=1e-10, atol=0)
    # on φ grids of rows (roots interpolated between every eighth point, then polished)
    R = rng.uniform(0.02, 0.3, 4)
    th = rng.uniform(1.6, 3.1, 4)
    S = R * rng.uniform(2.05, 40, 4)
    phi = np.linspace(0.0, np.pi, 2401)[None, :]
    psi = np.broadcast_to(phi + th[:, None] - np.pi, (4, 2401))
    gap = 0.5 * S[:, None] - R[:, None] * np.sin(phi)
    ok = gap > 1e-9
    got = parallel2d_batch.grid_turning_depth(psi, gap, ok)
    np.testing.assert_allclose(got[ok], parallel2d.turning_depth(psi[ok], gap[ok]), rtol=1e-12, atol=0)


def test_row_tables_are_the_rod_row_adapter():
    """The batched rod-row tables against the rod_row adapter (floatcalc.elements.rod_row) on
    seeded random rows: depths, outer and inner rod forces and contact depths."""
    import floatcalc as fc
    from floatcalc.core import parallel2d_batch
    from floatcalc.elements import get_kind

    w = fc.water()
    lc, fs = w.lc, w.sigma * w.lc
    rng = np.random.default_rng(21)
    M, N = 3, 4
    R = rng.uniform(1e-4, 4e-4, M)
    th = np.radians(rng.uniform(95, 165, M))
    Sp = R * rng.uniform(2.5, 40, M)
    L = rng.uniform(0.02, 0.06, M)
    tb = parallel2d_batch.row_tables(R / lc, th, Sp / lc, N, L / lc, 5)
    kind = get_kind("rod_row")
    for i in range(M):
        p = {"kind": "rod_row", "name": "", "position": (0.0, 0.0), "mount": 0.0, "radius": R[i], "length": L[i],
             "rods": N, "spacing": Sp[i], "heading": 0.0, "segments": 5, "density": 7850.0, "material_name": "steel",
             "coating": {"advancing": th[i], "texture": "none"}}
        m = kind.model(p, w)
        n = int(tb["n"][i])
        assert m.depth.shape[1] == n
        np.testing.assert_allclose(tb["depth"][i, :n], m.depth[0] / lc, rtol=1e-12, atol=1e-14)
        np.testing.assert_allclose(tb["outer"][i, :n], m.force[0] / fs, rtol=1e-10, atol=1e-14)
        np.testing.assert_allclose(tb["inner"][i, :n], m.force[5] / fs, rtol=1e-10, atol=1e-14)   # rod 2 of 4
        np.testing.assert_allclose(tb["contact"][i, :n], m.contact[0] / lc, rtol=1e-10, atol=1e-14)


def test_device_model_takes_the_batch_for_mixed_devices(rig):
    """Sweeps, the optimiser and uncertainty studies call device_model: for a mixed device it
    is the batch (arrays in, broadcast shapes kept, the scalar numbers out)."""
    from floatcalc.studies.models import evaluate_pointwise

    m = device_model(rig[0])
    assert m.vectorised and isinstance(m.func, db.DeviceBatchFunc)
    values = {"radius_factor": np.array([[0.97], [1.03]]), "contact_angle_shift": np.radians([-4.0, 0.0, 3.0])}
    got = m.evaluate(values)
    ref = evaluate_pointwise(_DeviceFunc(m.func.design, shielding=m.func.shielding), m.merged(values))
    for k in OUTPUTS:
        assert got[k].shape == (2, 3)
    _check({k: got[k].ravel() for k in OUTPUTS}, {k: np.ravel(ref[k]) for k in OUTPUTS})


def test_equal_element_inputs_share_one_table(rig, monkeypatch):
    """A sweep of the body mass at two contact-angle shifts: the element laws are built for the
    two distinct inputs only, and every sample still gets the scalar answer."""
    mixed, shield = rig
    x = _samples(mixed, 8, seed=6)
    x["contact_angle_shift"] = np.where(np.arange(8) % 2 == 0, 0.0, -0.05)
    for k in ("radius_factor", "length_factor", "surface_tension"):
        x[k] = np.full(8, x[k][0])
    sizes = []
    real = db._round_tables

    def counted(kind, geo, th, *a):
        sizes.append(th.size)
        return real(kind, geo, th, *a)

    monkeypatch.setattr(db, "_round_tables", counted)
    got = db.DeviceBatchFunc(mixed, shielding=shield)(x)
    assert sizes == [2, 2, 2]     # ball, pad, pin types: two distinct inputs each
    _check(got, _scalar(mixed, x, shield))
