"""Benchmark: do local worker processes pay? Serial against ``executor="local"``, one run.

Monte Carlo uncertainty (:func:`floatcalc.studies.uncertainty`) of

* the built-in invented twelve-leg skimmer (``floatcalc.studies.device_model("skimmer")``,
  batched all-rod model, about 1 ms a sample) at 10³ and 10⁴ samples, and
* an invented six-leg rod design (``rod_model``, vectorised, microseconds a sample) at 10⁴,

serially and on all local cores, interleaved, best of two (one with ``--quick``); a first
local run before them starts the persistent pool (``device_1k_local_cold_s``). Every pair must give identical samples
(seeded chunks; checked here). Figures: ``*_serial_s``, ``*_local_s``, ``*_speedup``
(serial / local), ``uncertainty_parallel_speedup`` (the skimmer at 10⁴, warm pool) and
``serial_equals_local``. The machine's core count and load move every figure.
"""

from __future__ import annotations

import math
import os
import time

import numpy as np

TARGETS = {
    "uncertainty_parallel_speedup": (">=", 1.5),
    "device_1k_speedup": (">=", 1.0),
    "serial_equals_local": ("==", True),
}


def _device(n, executor):
    from floatcalc.studies.device_model import device_model
    from floatcalc.studies.uncertainty import Contamination, parse_distribution, uncertainty

    m = _device.model = getattr(_device, "model", None) or device_model("skimmer")
    d = {"contact_angle_shift": parse_distribution("normal:-5deg:5deg", "angle", "contact_angle_shift"),
         "radius_factor": parse_distribution("tol:1:0.03", "ratio", "radius_factor"),
         "payload_mass": parse_distribution("normal:1.5g:0.1g", "mass", "payload_mass")}
    return uncertainty(m, d, contamination=Contamination(0.25, 5e-3, 20e-3), samples=n, seed=2,
                       executor=executor)


def _rod(n, executor):
    from floatcalc.studies.models import rod_model
    from floatcalc.studies.uncertainty import Contamination, parse_distribution, uncertainty

    m = rod_model(count=6.0, radius=2e-4, length=0.06, contact_angle=math.radians(125), payload_mass=4.5e-3)
    d = {"contact_angle": parse_distribution("normal:125deg:6deg", "angle", "contact_angle"),
         "radius": parse_distribution("tol:0.2mm:0.01mm", "length", "radius"),
         "payload_mass": parse_distribution("normal:4.5g:0.15g", "mass", "payload_mass")}
    return uncertainty(m, d, contamination=Contamination(0.25, 5e-3, 25e-3), samples=n, seed=1,
                       executor=executor)


def _timed(fn, *a):
    t = time.perf_counter()
    out = fn(*a)
    return time.perf_counter() - t, out


def run(quick: bool = False) -> dict:
    from floatcalc.studies.executors import shutdown_pool

    shutdown_pool()
    _device(100, "serial")  # warm imports, the design and the tables
    _rod(1000, "serial")
    res = {"cores": os.cpu_count()}
    same = True
    reps = 1 if quick else 2
    cases = [("device_1k", _device, 1000), ("device_10k", _device, 3000 if quick else 10_000),
             ("rod_10k", _rod, 10_000)]
    for k, (name, fn, n) in enumerate(cases):
        if k == 0:
            t_c, c = _timed(fn, n, "local")  # includes starting the pool
            res[f"{name}_local_cold_s"] = t_c
        t_s = t_l = math.inf
        for _ in range(reps):  # interleaved, best of reps (other jobs on a shared machine)
            dt, a = _timed(fn, n, "serial")
            t_s = min(t_s, dt)
            dt, b = _timed(fn, n, "local")
            t_l = min(t_l, dt)
            same &= bool(np.array_equal(a.capacity_samples, b.capacity_samples))
        if k == 0:
            same &= bool(np.array_equal(a.capacity_samples, c.capacity_samples))
        res[f"{name}_samples"] = n
        res[f"{name}_serial_s"] = t_s
        res[f"{name}_local_s"] = t_l
        res[f"{name}_speedup"] = t_s / t_l
        res[f"{name}_chunks"] = math.ceil(n / a.chunk_size)
    res["uncertainty_parallel_speedup"] = res["device_10k_speedup"]
    res["serial_equals_local"] = same
    shutdown_pool()
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
