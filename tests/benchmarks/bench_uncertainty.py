"""Benchmark: Monte Carlo uncertainty, serial against all local cores, measured in one run.

Figures (seeded; the serial and parallel runs must give identical samples, checked here):

* ``rod_uncertainty_10k_serial_s`` / ``rod_uncertainty_10k_s`` / ``rod_parallel_speedup``:
  10⁴ samples of an invented six-leg rod design (contact angle, radius tolerance, payload and
  a contamination mixture uncertain) serially and on all cores (``executor="local"``). The rod
  model is vectorised, so 10⁴ samples are a few array operations and starting worker
  processes costs more than the work: the speed-up is below 1, and "auto" stays serial.
* ``device_samples``, ``uncertainty_10k_serial_s``, ``uncertainty_10k_s``,
  ``device_parallel_speedup``: the built-in invented twelve-leg skimmer
  (``floatcalc.device`` example ``skimmer``) through ``floatcalc.studies.device_model``,
  10⁴ samples serially and on all cores, measured side by side (``--quick``, or a scalar
  model: 10³ or fewer samples, the 10⁴ figures then extrapolated linearly and
  ``uncertainty_10k_extrapolated`` True).
  Target ≤ 10 s on all cores.
* ``device_model_vectorised``: whether the study model is the batched one
  (floatcalc.studies.device_batch, all-rod designs).
* ``device_ms_per_sample_scalar`` / ``device_ms_per_sample_batched``: the scalar model
  (``_DeviceFunc``, one device rebuild and capacity search per sample) on a small set of
  seeded inputs, and the batched model on a 2000-sample block, both in this process; and
  ``device_batch_max_rel_diff``, the largest relative difference of ``max_payload`` between
  the two on the scalar set.
"""

from __future__ import annotations

import math
import os
import time

import numpy as np

TARGETS = {
    "uncertainty_10k_s": ("<=", 10.0),
    "rod_uncertainty_10k_s": ("<=", 10.0),
    "serial_equals_parallel": ("==", True),
}


def _rod_study(executor):
    from floatcalc.studies.models import rod_model
    from floatcalc.studies.uncertainty import Contamination, parse_distribution, uncertainty

    m = rod_model(count=6.0, radius=2e-4, length=0.06, contact_angle=math.radians(125), payload_mass=4.5e-3)
    d = {"contact_angle": parse_distribution("normal:125deg:6deg", "angle", "contact_angle"),
         "radius": parse_distribution("tol:0.2mm:0.01mm", "length", "radius"),
         "payload_mass": parse_distribution("normal:4.5g:0.15g", "mass", "payload_mass")}
    return uncertainty(m, d, contamination=Contamination(0.25, 5e-3, 25e-3), samples=10_000, seed=1,
                       executor=executor)


def _device_study(n, executor):
    from floatcalc.studies.device_model import device_model
    from floatcalc.studies.uncertainty import Contamination, parse_distribution, uncertainty

    m = device_model("skimmer")
    d = {"contact_angle_shift": parse_distribution("normal:-5deg:5deg", "angle", "contact_angle_shift"),
         "radius_factor": parse_distribution("tol:1:0.03", "ratio", "radius_factor"),
         "payload_mass": parse_distribution("normal:1.5g:0.1g", "mass", "payload_mass")}
    return uncertainty(m, d, contamination=Contamination(0.25, 5e-3, 20e-3), samples=n, seed=2,
                       executor=executor)


def _timed(fn, *a):
    t = time.perf_counter()
    out = fn(*a)
    return time.perf_counter() - t, out


def _device_inputs(model, n, seed):
    """Seeded device-model inputs (1-D SI arrays) like those the study draws."""
    rng = np.random.default_rng(seed)
    x = {k: np.full(n, float(v)) for k, v in model.merged({}).items()}
    x["contact_angle_shift"] = rng.normal(np.radians(-5), np.radians(5), n)
    x["radius_factor"] = rng.uniform(0.97, 1.03, n)
    x["payload_mass"] = rng.normal(1.5e-3, 1e-4, n)
    x["surface_tension"] = x["surface_tension"] - np.where(rng.random(n) < 0.25, rng.uniform(5e-3, 20e-3, n), 0.0)
    return x


def _per_sample(model, quick):
    """Scalar and batched ms per sample on the same inputs, and their largest difference."""
    from floatcalc.studies.device_batch import DeviceBatchFunc
    from floatcalc.studies.device_model import _DeviceFunc

    design = model.func.design
    n_s = 40 if quick else 200
    xs = _device_inputs(model, n_s, 5)
    scalar = _DeviceFunc(design)
    t = time.perf_counter()
    ref = np.array([scalar({k: float(v[i]) for k, v in xs.items()})["max_payload"] for i in range(n_s)])
    t_s = time.perf_counter() - t
    out = {"device_ms_per_sample_scalar": 1e3 * t_s / n_s}
    try:
        batch = DeviceBatchFunc(design)
    except Exception:  # pragma: no cover - not an all-rod design
        return out
    got = batch(xs)["max_payload"]
    xb = _device_inputs(model, 2000, 6)
    t = time.perf_counter()
    batch(xb)
    out["device_ms_per_sample_batched"] = 1e3 * (time.perf_counter() - t) / 2000
    out["device_batch_max_rel_diff"] = float(np.max(np.abs(got - ref) / np.abs(ref)))
    return out


def run(quick: bool = False) -> dict:
    _rod_study("serial")  # warm imports
    t_rs, rs = _timed(_rod_study, "serial")
    t_rl, rl = _timed(_rod_study, "local")
    from floatcalc.studies.device_model import device_model

    model = device_model("skimmer")
    model.evaluate({})  # warm imports and the design
    # measured 10⁴ with the batched model; the scalar one (about 40 ms a sample) as before
    n = (1000 if quick else 10_000) if model.vectorised else (100 if quick else 1000)
    t_ds, ds = _timed(_device_study, n, "serial")
    t_dl, dl = _timed(_device_study, n, "local")
    rod_same = bool(np.array_equal(rs.capacity_samples, rl.capacity_samples))
    dev_same = bool(np.array_equal(ds.capacity_samples, dl.capacity_samples))
    same = rod_same and dev_same
    return {
        "cores": os.cpu_count(),
        "rod_uncertainty_10k_serial_s": t_rs,
        "rod_uncertainty_10k_s": t_rl,
        "rod_parallel_speedup": t_rs / t_rl,
        "rod_probability_of_sinking": rs.probability_of_sinking,
        "device_model_vectorised": model.vectorised,
        "device_samples": n,
        "device_serial_s": t_ds,
        "device_local_s": t_dl,
        "uncertainty_10k_serial_s": t_ds * 10_000 / n,
        "uncertainty_10k_s": t_dl * 10_000 / n,
        "uncertainty_10k_extrapolated": n != 10_000,
        "device_parallel_speedup": t_ds / t_dl,
        "device_probability_of_sinking": ds.probability_of_sinking,
        **_per_sample(model, quick),
        "serial_equals_parallel": same,
        "rod_serial_equals_parallel": rod_same,
        "device_serial_equals_parallel": dev_same,
        "device_samples_differing": int(np.count_nonzero(ds.capacity_samples != dl.capacity_samples)),
    }


if __name__ == "__main__":
    import argparse

    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--quick", action="store_true")
    args = ap.parse_args()
    res = run(args.quick)
    width = max(map(len, res))
    for k, v in res.items():
        print(f"{k:<{width}}  {v:.4g}" if isinstance(v, float) else f"{k:<{width}}  {v}")
    if res["uncertainty_10k_extrapolated"]:
        print(f"note: uncertainty_10k_serial_s and uncertainty_10k_s are extrapolated from "
              f"{res['device_samples']} measured device samples")
