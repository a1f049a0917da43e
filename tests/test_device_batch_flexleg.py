"""Batched study function of devices with flexible legs (issue 16), against the scalar path.

Reference: the scalar study path (``floatcalc.studies.device_model._DeviceFunc``: rebuild the
device with every element's own adapter, then floatcalc.core.equilibrium.capacity), tested on
its own in tests/test_device.py and tests/test_one_answer.py. The batch takes each leg's table
from the same adapter (so the tables are the same numbers), builds the rest of the device on
arrays and solves other equations for the capacity (batched Newton on heave, pitch and roll);
tolerance 1e-8 relative as in tests/test_device_batch_mixed.py (the scalar root search stops
at rtol 1e-8). The elastica's own tolerances do not enter: the leg's table is not
approximated, and :func:`floatcalc.core.beam.solve_many` is checked here to give the very
bytes of :func:`floatcalc.core.beam.solve`.

Designs here are invented test rigs, not real devices.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from floatcalc.core import beam
from floatcalc.errors import ConvergenceError, InputError
from floatcalc.studies import device_batch as db
from floatcalc.studies.device_model import _DeviceFunc, device_model

from test_device_batch_mixed import MIXED, OUTPUTS, _at, _check, _design, _samples, _scalar

#: Invented rig: three flexible legs alike (steel, clamp slope 3°, receding angle given), a
#: fourth unlike them (aluminium-like modulus and density, an upturned toe, mounted higher),
#: a ball foot and a rod.
FLEX = [
    *({"kind": "flexible_leg", "position": _at(6, a), "heading": f"{a} deg", "radius": "0.1 mm", "length": "20 mm",
       "material": "steel", "clamp_angle": "3 deg", "coating": {"advancing": "150 deg", "receding": "120 deg"}}
      for a in (90, 210, 330)),
    {"kind": "flexible_leg", "position": _at(7, 270), "heading": "270 deg", "radius": "0.08 mm", "length": "15 mm",
     "youngs_modulus": "70 GPa", "material_density": "2700 kg/m^3", "toe_angle": "20 deg", "mount": "0.05 mm",
     "coating": {"advancing": "140 deg"}},
    dict(MIXED[5], position=_at(12, 30)),
    dict(MIXED[0], position=_at(14, 150), heading="150 deg"),
]


@pytest.fixture(scope="module")
def rig():
    return _design(FLEX, mass="0.05 g")


def _light(design, n, seed):
    x = _samples(design, n, seed=seed)
    x["body_mass"] = x["body_mass"] * 0.3   # the rig carries about 8 mN: keep it afloat
    return x


def test_flexleg_device_batch_matches_scalar(rig):
    x = _light(rig, 4, seed=3)
    lay = db.layout(rig)
    assert lay.types[lay.elem_type[0]] is lay.types[lay.elem_type[2]], "legs alike share one table"
    assert lay.elem_type[3] != lay.elem_type[0]
    assert db.build(rig, lay, x)[-1].all(), "the batch should decide these samples itself"
    got = db.DeviceBatchFunc(rig)(x)
    ref = _scalar(rig, x)
    assert np.all(ref["spare_payload"] != 0.0)
    _check(got, ref)


def test_study_model_of_a_flexleg_device_is_batched_and_chunked_as_before(rig):
    """device_model hands flexible-leg designs to the batch, marked costly (studies keep the
    point-by-point chunks and therefore the same seeded samples)."""
    m = device_model(rig)
    assert m.vectorised and m.costly and isinstance(m.func, db.DeviceBatchFunc)
    x = _light(rig, 2, seed=5)
    _check({k: np.asarray(v) for k, v in m.evaluate(x).items()}, _scalar(rig, x))


def test_repeated_samples_solve_each_leg_type_once(rig, monkeypatch):
    """A sweep of the body and payload masses leaves the legs' inputs alone: one elastica per
    leg type for the whole sweep (and still the scalar model's numbers)."""
    from floatcalc.elements.flexible_leg import FlexibleLegKind

    f = db.DeviceBatchFunc(rig)
    x = _light(rig, 3, seed=7)
    f({k: v[:1] for k, v in x.items()})            # the nominal layout is built and kept
    calls = []
    model = FlexibleLegKind.model
    monkeypatch.setattr(FlexibleLegKind, "model", lambda self, p, liq: calls.append(p["name"]) or model(self, p, liq))
    sweep = {k: np.full(5, v[1]) for k, v in x.items()}
    sweep["body_mass"] = np.linspace(0.5, 1.5, 5) * float(rig.body["mass"]) * 0.3
    sweep["payload_mass"] = np.linspace(0.0, 1e-4, 5)
    got = f(sweep)
    assert len(calls) == 2, calls                  # two leg types, one distinct sample
    monkeypatch.setattr(FlexibleLegKind, "model", model)
    sub = {k: v[[0, 4]] for k, v in sweep.items()}
    _check({k: v[[0, 4]] for k, v in got.items()}, _scalar(rig, sub))


@pytest.mark.slow
def test_clamp_footprint_is_one_sided():
    """A leg's rectangle starts at its clamp: a ball just behind the clamp (closer than half
    the leg's length, but clear of it) is no overlap, and the batch decides the sample; a
    ball in front of the leg, reached when the legs grow, is, and the batch hands it to the
    scalar model, which gives its one-line error."""
    leg = lambda a: {"kind": "flexible_leg", "position": _at(6, a), "heading": f"{a} deg",  # noqa: E731
                     "radius": "0.1 mm", "length": "20 mm", "material": "steel", "coating": {"advancing": "150 deg"}}
    ball = lambda r, a: {"kind": "ball", "position": _at(r, a), "radius": "1 mm", "material": "nylon",  # noqa: E731
                         "coating": {"advancing": "150 deg"}}
    behind = _design([leg(90), leg(210), leg(330), ball(3.5, 90)], mass="0.03 g")
    x = _light(behind, 2, seed=11)
    lay = db.layout(behind)
    assert db.build(behind, lay, x)[-1].all()
    _check(db.DeviceBatchFunc(behind)(x), _scalar(behind, x))

    front = _design([leg(90), leg(210), leg(330), ball(28.0, 90)], mass="0.03 g")
    x = {k: np.full(2, v) for k, v in {"contact_angle_shift": 0.0, "surface_tension": front.liquid.sigma,
                                        "radius_factor": 1.0, "body_mass": 1e-5, "payload_mass": 0.0}.items()}
    x["length_factor"] = np.array([1.0, 1.1])     # 6 + 22 mm reaches the ball at 28 mm (radius 1 mm)
    assert db.build(front, db.layout(front), x)[-1].tolist() == [True, False]
    with pytest.raises(InputError) as batch:
        db.DeviceBatchFunc(front)(x)
    with pytest.raises(InputError) as scalar:
        _DeviceFunc(front)({k: float(v[1]) for k, v in x.items()})
    assert str(batch.value) == str(scalar.value) and "\n" not in str(batch.value)


def test_solve_many_takes_the_steps_of_solve():
    """beam.solve_many against beam.solve system by system, from tangent-predicted starts on
    a leg's own load path: the same states to the last bit and the same iteration counts; a
    system that solve gives up on is marked failed."""
    from floatcalc.flexleg import _prepare

    rng = np.random.default_rng(21)
    leg = _prepare(1.2e-4, 0.03, math.radians(145.0), 2e11, None, math.radians(4.0), math.radians(15.0), None,
                   7850.0, None, math.radians(115.0))[7]
    n = leg.nodes()
    th0, fd = leg.th0(n), leg.found
    lim = beam.limit(leg.L, leg.B, leg.alpha, fd, n=n, th0=th0, onset=False, keep_path=True)
    path = lim["path"]
    k = rng.choice(len(path) - 1, size=6, replace=False)
    bases = [path[i] for i in k]
    depths = np.array([a["Dc"] + rng.uniform(0.0, 1.0) * (path[i + 1]["Dc"] - a["Dc"]) for a, i in zip(bases, k)])
    G = np.stack([a["U"] + a["dU"] * (D - a["Dc"]) for a, D in zip(bases, depths)])
    W = np.stack([a["wet"] for a in bases])
    U, its, ok = beam.solve_many(leg.L, leg.B, leg.alpha, depths, fd, W, G, n=n, th0=th0)
    assert ok.all()
    for j in range(depths.size):
        ref = beam.solve(leg.L, leg.B, leg.alpha, depths[j], fd.bind(W[j]), n=n, th0=th0, guess=G[j])
        assert np.array_equal(U[j], ref["U"]) and its[j] == ref["iterations"]
    # one Newton step is not enough from a predicted start: solve raises, solve_many says so
    with pytest.raises(ConvergenceError):
        beam.solve(leg.L, leg.B, leg.alpha, depths[0], fd.bind(W[0]), n=n, th0=th0, guess=G[0], max_iter=1)
    _, _, ok1 = beam.solve_many(leg.L, leg.B, leg.alpha, depths[:1], fd, W[:1], G[:1], n=n, th0=th0, max_iter=1)
    assert not ok1[0]


class _Sizes:
    """A study callable that records how many points each call gets (picklable, module level)."""

    def __init__(self, func):
        self.func, self.sizes = func, []

    def __call__(self, x):
        self.sizes.append(int(np.broadcast(*x.values()).size))
        return self.func(x)


def test_costly_models_keep_point_by_point_chunks():
    """A model marked costly (a device with flexible legs) gets the chunks of a point-by-point
    model (uncertainty.CHUNK_SLOW samples, sweep.CHUNK_POINTS_SLOW points), each as arrays, so
    its seeded samples are those it had as a point-by-point model; the same model not marked
    costly gets one large chunk."""
    import importlib
    from dataclasses import replace

    from floatcalc.studies.models import rod_model

    sw = importlib.import_module("floatcalc.studies.sweep")        # the modules, not the functions
    un = importlib.import_module("floatcalc.studies.uncertainty")

    base = rod_model()
    dist = {"radius": un.Distribution("normal", 2e-4, 1e-5)}
    runs = {}
    for costly in (True, False):
        rec = _Sizes(base.func)
        m = replace(base, func=rec, costly=costly)
        r = un.uncertainty(m, dist, samples=200, seed=4, executor="serial")
        runs[costly] = (rec.sizes, r.capacity_samples)
    slow, fast = runs[True][0], runs[False][0]
    assert max(slow) == un.CHUNK_SLOW and sum(slow) >= 200 and max(fast) > un.CHUNK_SLOW
    pointwise = replace(base, vectorised=False)
    ref = un.uncertainty(pointwise, dist, samples=200, seed=4, executor="serial").capacity_samples
    assert np.array_equal(runs[True][1], ref)   # the same seeded samples, so the same capacities
    rec = _Sizes(base.func)
    sw.sweep(replace(base, func=rec, costly=True), ["radius=0.1mm:0.3mm:40"], executor="serial")
    assert max(rec.sizes) == sw.CHUNK_POINTS_SLOW
