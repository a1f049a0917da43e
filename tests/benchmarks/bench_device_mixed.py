"""Benchmark: studies of devices with round elements, batched against the scalar path, one run.

Two invented test rigs (not real devices):

* *mixed*: four rods, two ball feet, two pads and two pins (balls and pads close to the rods,
  so their nominal shielding factors are below 1);
* *rings*: three ring footpads and three rods;
* *rows*: two rod rows (three rods, and a pair) and a ball foot;
* *flexleg*: four flexible steel legs alike (receding angle given) and two ball feet.

Figures, each pair measured interleaved in this process on the same seeded inputs (contact
angle shift, radius and length factors, surface tension, body mass all perturbed; see
``_inputs``), best of the repeats:

* ``device_mixed_samples_per_s`` (serial, the batched study function
  :class:`floatcalc.studies.device_batch.DeviceBatchFunc` on 2000 samples) with
  ``device_mixed_scalar_samples_per_s`` beside it (the scalar ``_DeviceFunc``, one device
  rebuild and capacity search per sample, on a subset) and ``device_mixed_batch_speedup``;
  ``device_mixed_batch_max_rel_diff``: the largest relative difference of ``max_payload``
  between the two on the subset;
* ``device_ring_samples_per_s`` / ``device_ring_scalar_samples_per_s`` likewise, and
  ``device_row_samples_per_s`` / ``device_row_scalar_samples_per_s`` (no target: the rows'
  shared-meniscus law costs tens of milliseconds a sample even batched);
* ``device_flexleg_samples_per_s`` / ``device_flexleg_scalar_samples_per_s`` (and
  ``_batch_speedup``, ``_batch_max_rel_diff``) likewise on the flexleg rig: every sample
  distinct, so the batch still solves one elastica per sample (one for the four legs alike,
  where the scalar model solves four); ``device_flexleg_sweep_samples_per_s`` /
  ``device_flexleg_sweep_scalar_samples_per_s``: a sweep of the body and payload masses only
  (the legs' inputs repeat: one elastica for the whole sweep in the batch);
* ``device_mixed_uncertainty_serial_s`` / ``_local_s`` / ``device_mixed_parallel_speedup``: a
  Monte Carlo study (:func:`floatcalc.studies.uncertainty`) of 10⁴ samples of the mixed rig,
  serially and on all local cores (``--quick``: 2000), identical samples checked
  (``device_mixed_serial_equals_local``).

The machine's cores and its 1-minute load average before and after are reported: other jobs on
a shared machine slow every figure (the scalar and batched runs alike). ``machine_parallel_headroom``
is the same serial-against-local comparison for a busy loop in 16 tasks (``sum`` over a
range; no floatcalc in it), measured right after the study: where it is near 1 the machine had no spare
core for this process's workers at the time (other sessions busy; with the kernel's
``sched_autogroup`` all processes of one session share one session's CPU share), and no
study can gain from them then.
"""

from __future__ import annotations

import math
import os
import time

import numpy as np

TARGETS = {
    "device_mixed_samples_per_s": (">=", 1000.0),
    "device_ring_samples_per_s": (">=", 100.0),
    "device_mixed_serial_equals_local": ("==", True),
    # four legs alike: the batch solves one elastica a sample where the scalar model solves four
    "device_flexleg_batch_speedup": (">=", 2.0),
    "device_flexleg_batch_max_rel_diff": ("<=", 1e-8),
}


def _at(r, a):
    return [f"{r * math.cos(math.radians(a)):.6f} mm", f"{r * math.sin(math.radians(a)):.6f} mm"]


def _rod(r, a, length="16 mm"):
    return {"kind": "rod", "position": _at(r, a), "heading": f"{a} deg", "radius": "0.2 mm", "length": length,
            "material": "steel", "coating": {"advancing": "150 deg"}}


#: Invented rig: rods, ball feet, pads and pins.
MIXED = [
    *(_rod(14, a) for a in (45, 135, 225, 315)),
    *({"kind": "ball", "position": _at(7, a), "radius": "1 mm", "material": "nylon",
       "coating": {"advancing": "150 deg"}} for a in (0, 180)),
    *({"kind": "pad", "position": _at(7, a), "radius": "1.5 mm", "thickness": "0.2 mm", "material": "nylon",
       "coating": {"advancing": "120 deg"}} for a in (90, 270)),
    *({"kind": "pin", "position": _at(24, a), "radius": "0.3 mm", "length": "3 mm", "material": "steel",
       "coating": {"advancing": "110 deg"}} for a in (0, 180)),
]
#: Invented rig: three ring footpads between three rods.
RINGS = [
    *({"kind": "ring", "position": _at(13, a), "ring_radius": "3 mm", "wire_radius": "0.2 mm", "material": "steel",
       "coating": {"advancing": "115 deg"}} for a in (90, 210, 330)),
    *(_rod(16, a, "14 mm") for a in (30, 150, 270)),
]

#: Invented rig: four flexible legs alike and two ball feet.
FLEX = [
    *({"kind": "flexible_leg", "position": _at(6, a), "heading": f"{a} deg", "radius": "0.1 mm", "length": "20 mm",
       "material": "steel", "clamp_angle": "3 deg", "coating": {"advancing": "150 deg", "receding": "120 deg"}}
      for a in (45, 135, 225, 315)),
    *({"kind": "ball", "position": _at(9, a), "radius": "1 mm", "material": "nylon",
       "coating": {"advancing": "150 deg"}} for a in (0, 180)),
]

#: Invented rig: two rod rows and a ball foot.
ROWS = [{"kind": "rod_row", "position": ["0 mm", "20 mm"], "radius": "0.2 mm", "length": "30 mm", "rods": 3,
         "spacing": "4 mm", "material": "steel", "coating": {"advancing": "120 deg"}, "segments": 4},
        {"kind": "rod_row", "position": ["0 mm", "-20 mm"], "heading": "10 deg", "radius": "0.2 mm", "length": "30 mm",
         "rods": 2, "spacing": "1.5 mm", "material": "steel", "coating": {"advancing": "120 deg"}},
        {"kind": "ball", "position": ["12 mm", "0 mm"], "radius": "1 mm", "material": "nylon",
         "coating": {"advancing": "150 deg"}}]


def _design(elements, mass):
    from floatcalc.design import design_from_data

    return design_from_data({"schema_version": 2, "description": "Invented benchmark rig", "invented": True,
                             "liquid": {"name": "water", "temperature": "20 degC"},
                             "body": {"mass": mass, "centre_of_mass": ["0 mm", "0 mm"]}, "elements": elements})


def _inputs(design, n, seed):
    """Seeded perturbations of every study input (1-D SI arrays)."""
    rng = np.random.default_rng(seed)
    return {"contact_angle_shift": rng.normal(np.radians(-3), np.radians(3), n),
            "radius_factor": rng.uniform(0.97, 1.03, n), "length_factor": rng.uniform(0.95, 1.03, n),
            "surface_tension": design.liquid.sigma - np.where(rng.random(n) < 0.25, rng.uniform(5e-3, 20e-3, n), 0.0),
            "body_mass": float(design.body["mass"]) * rng.uniform(0.8, 1.2, n), "payload_mass": rng.uniform(0, 1e-3, n)}


def _rates(name, design, n_batch, n_scalar, reps):
    from floatcalc.device import Device
    from floatcalc.studies.device_batch import DeviceBatchFunc
    from floatcalc.studies.device_model import _DeviceFunc

    shield = Device.from_design(design).shielding
    batch = DeviceBatchFunc(design, shielding=shield)
    scalar = _DeviceFunc(design, shielding=shield)
    xb = _inputs(design, n_batch, 1)
    xs = {k: v[:n_scalar] for k, v in _inputs(design, n_scalar, 2).items()}
    batch({k: v[:20] for k, v in xb.items()})          # warm imports and tables
    t_b = t_s = math.inf
    for _ in range(reps):   # interleaved, best of reps (other jobs on a shared machine)
        t = time.perf_counter()
        batch(xb)
        t_b = min(t_b, time.perf_counter() - t)
        t = time.perf_counter()
        ref = np.array([scalar({k: float(v[i]) for k, v in xs.items()})["max_payload"] for i in range(n_scalar)])
        t_s = min(t_s, time.perf_counter() - t)
    got = batch(xs)["max_payload"]
    return {f"device_{name}_samples_per_s": n_batch / t_b, f"device_{name}_scalar_samples_per_s": n_scalar / t_s,
            f"device_{name}_batch_speedup": (n_batch / t_b) / (n_scalar / t_s),
            f"device_{name}_batch_max_rel_diff": float(np.max(np.abs(got - ref) / np.abs(ref)))}


def _flex_rates(design, n_batch, n_scalar, n_sweep, reps):
    """Batched against scalar on the flexleg rig: perturbed samples, then a mass sweep."""
    from floatcalc.device import Device
    from floatcalc.studies.device_batch import DeviceBatchFunc
    from floatcalc.studies.device_model import _DeviceFunc

    shield = Device.from_design(design).shielding
    batch = DeviceBatchFunc(design, shielding=shield)
    scalar = _DeviceFunc(design, shielding=shield)
    x = _inputs(design, n_batch, 1)
    x["body_mass"] = x["body_mass"] * 0.3     # the rig carries about 10 mN
    x["payload_mass"] = x["payload_mass"] * 0.3
    xs = {k: v[:n_scalar] for k, v in x.items()}
    sweep = {k: np.full(n_sweep, v[0]) for k, v in x.items()}
    sweep["body_mass"] = float(design.body["mass"]) * np.linspace(0.5, 1.5, n_sweep)
    sweep["payload_mass"] = np.linspace(0.0, 3e-4, n_sweep)
    sw_s = {k: v[:n_scalar] for k, v in sweep.items()}
    batch({k: v[:1] for k, v in x.items()})            # warm imports; the nominal layout is kept
    one = lambda xx, i: scalar({k: float(v[i]) for k, v in xx.items()})["max_payload"]  # noqa: E731
    t_b = t_s = t_wb = t_ws = math.inf
    for _ in range(reps):   # interleaved, best of reps (other jobs on a shared machine)
        t = time.perf_counter()
        got = batch(x)["max_payload"]
        t_b = min(t_b, time.perf_counter() - t)
        t = time.perf_counter()
        ref = np.array([one(xs, i) for i in range(n_scalar)])
        t_s = min(t_s, time.perf_counter() - t)
        t = time.perf_counter()
        got_w = batch(sweep)["max_payload"]
        t_wb = min(t_wb, time.perf_counter() - t)
        t = time.perf_counter()
        ref_w = np.array([one(sw_s, i) for i in range(n_scalar)])
        t_ws = min(t_ws, time.perf_counter() - t)
    diff = max(float(np.max(np.abs(got[:n_scalar] - ref) / np.abs(ref))),
               float(np.max(np.abs(got_w[:n_scalar] - ref_w) / np.abs(ref_w))))
    return {"device_flexleg_samples_per_s": n_batch / t_b, "device_flexleg_scalar_samples_per_s": n_scalar / t_s,
            "device_flexleg_batch_speedup": (n_batch / t_b) / (n_scalar / t_s),
            "device_flexleg_sweep_samples_per_s": n_sweep / t_wb,
            "device_flexleg_sweep_scalar_samples_per_s": n_scalar / t_ws,
            "device_flexleg_sweep_speedup": (n_sweep / t_wb) / (n_scalar / t_ws),
            "device_flexleg_batch_max_rel_diff": diff}


def _study(model, n, executor):
    from floatcalc.studies.uncertainty import (
        Contamination,
        parse_distribution,
        uncertainty,
    )

    d = {"contact_angle_shift": parse_distribution("normal:-3deg:3deg", "angle", "contact_angle_shift"),
         "radius_factor": parse_distribution("tol:1:0.03", "ratio", "radius_factor"),
         "length_factor": parse_distribution("tol:1:0.03", "ratio", "length_factor"),
         "payload_mass": parse_distribution("normal:1g:0.2g", "mass", "payload_mass")}
    return uncertainty(model, d, contamination=Contamination(0.25, 5e-3, 20e-3), samples=n, seed=3,
                       executor=executor)


def _headroom(reps):
    from floatcalc.studies.executors import local_pool, run_chunks, shutdown_pool

    tasks = [(range(k, k + 6_000_000),) for k in range(16)]   # builtins: picklable from any module
    local_pool(os.cpu_count() or 1)
    t_s = t_l = math.inf
    for _ in range(reps):
        t = time.perf_counter()
        run_chunks(sum, tasks, executor="serial")
        t_s = min(t_s, time.perf_counter() - t)
        t = time.perf_counter()
        run_chunks(sum, tasks, executor="local")
        t_l = min(t_l, time.perf_counter() - t)
    shutdown_pool()
    return t_s / t_l


def _load():
    try:
        return os.getloadavg()[0]
    except OSError:  # pragma: no cover - platforms without it
        return float("nan")


def run(quick: bool = False) -> dict:
    from floatcalc.studies.device_model import device_model
    from floatcalc.studies.executors import shutdown_pool

    res = {"device_mixed_cores": os.cpu_count(), "device_mixed_load_before": _load()}
    reps = 1 if quick else 3
    mixed = _design(MIXED, "0.3 g")
    res.update(_rates("mixed", mixed, 1000 if quick else 2000, 10 if quick else 40, reps))
    res.update(_rates("ring", _design(RINGS, "0.3 g"), 200 if quick else 500, 5 if quick else 20, reps))
    res.update(_rates("row", _design(ROWS, "0.5 g"), 20 if quick else 60, 3 if quick else 6, 1))
    res.update(_flex_rates(_design(FLEX, "0.05 g"), 4 if quick else 12, 2 if quick else 4, 50 if quick else 200,
                           1 if quick else 2))
    model = device_model(mixed)
    res["device_mixed_model_vectorised"] = model.vectorised
    n = 2000 if quick else 10_000
    shutdown_pool()
    _study(model, 200, "local")       # start the pool (its cost is not in the figures below)
    t_s = t_l = math.inf
    same = True
    for _ in range(1 if quick else 2):   # interleaved, best of two
        t = time.perf_counter()
        a = _study(model, n, "serial")
        t_s = min(t_s, time.perf_counter() - t)
        t = time.perf_counter()
        b = _study(model, n, "local")
        t_l = min(t_l, time.perf_counter() - t)
        same &= bool(np.array_equal(a.capacity_samples, b.capacity_samples))
    shutdown_pool()
    res["machine_parallel_headroom"] = _headroom(1 if quick else 2)
    res.update({"device_mixed_uncertainty_samples": n, "device_mixed_uncertainty_serial_s": t_s,
                "device_mixed_uncertainty_local_s": t_l, "device_mixed_parallel_speedup": t_s / t_l,
                "device_mixed_serial_equals_local": same, "device_mixed_load_after": _load()})
    return res


if __name__ == "__main__":
    import argparse

    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--quick", action="store_true")
    args = ap.parse_args()
    out = run(args.quick)
    width = max(map(len, out))
    for key, v in out.items():
        print(f"{key:<{width}}  {v:.4g}" if isinstance(v, float) else f"{key:<{width}}  {v}")
