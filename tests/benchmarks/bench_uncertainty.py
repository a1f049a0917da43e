"""Benchmark: Monte Carlo uncertainty, serial against all local cores, measured in one run.

Figures (seeded; the serial and parallel runs must give identical samples, checked here):

* ``rod_uncertainty_10k_serial_s`` / ``rod_uncertainty_10k_s`` / ``rod_parallel_speedup``:
  10⁴ samples of an invented six-leg rod design (contact angle, radius tolerance, payload and
  a contamination mixture uncertain) serially and on all cores (``executor="local"``). The rod
  model is vectorised, so 10⁴ samples are a few array operations and starting worker
  processes costs more than the work: the speed-up is below 1, and "auto" stays serial.
* ``device_samples``, ``device_serial_s``, ``device_local_s``, ``device_parallel_speedup``: the
  built-in invented twelve-leg skimmer (``floatcalc.device`` example ``skimmer``), whose
  equilibrium solve is scalar, on a smaller measured sample.
* ``uncertainty_10k_s``: time for 10⁴ samples of the built-in device on all cores. Measured
  directly when ``device_samples`` is 10⁴ (``uncertainty_10k_extrapolated`` False);
  otherwise extrapolated linearly from the measured parallel run (True) – said so in the
  output. Target ≤ 10 s.
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


def run(quick: bool = False) -> dict:
    _rod_study("serial")  # warm imports
    t_rs, rs = _timed(_rod_study, "serial")
    t_rl, rl = _timed(_rod_study, "local")
    n = 100 if quick else 1000
    from floatcalc.studies.device_model import device_model

    device_model("skimmer").evaluate({})  # warm imports and the design
    t_ds, ds = _timed(_device_study, n, "serial")
    t_dl, dl = _timed(_device_study, n, "local")
    rod_same = bool(np.array_equal(rs.capacity_samples, rl.capacity_samples))
    dev_same = bool(np.array_equal(ds.capacity_samples, dl.capacity_samples))
    with np.errstate(divide="ignore", invalid="ignore"):
        rel = np.abs(ds.capacity_samples - dl.capacity_samples) / np.abs(ds.capacity_samples)
    same = rod_same and dev_same
    return {
        "cores": os.cpu_count(),
        "rod_uncertainty_10k_serial_s": t_rs,
        "rod_uncertainty_10k_s": t_rl,
        "rod_parallel_speedup": t_rs / t_rl,
        "rod_probability_of_sinking": rs.probability_of_sinking,
        "device_samples": n,
        "device_serial_s": t_ds,
        "device_local_s": t_dl,
        "device_parallel_speedup": t_ds / t_dl,
        "device_ms_per_sample_serial": 1e3 * t_ds / n,
        "uncertainty_10k_s": t_dl * 10_000 / n,
        "uncertainty_10k_extrapolated": n != 10_000,
        "serial_equals_parallel": same,
        "rod_serial_equals_parallel": rod_same,
        "device_serial_equals_parallel": dev_same,
        "device_samples_differing": int(np.count_nonzero(ds.capacity_samples != dl.capacity_samples)),
        "device_max_rel_diff": float(np.nanmax(rel)) if rel.size else 0.0,
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
        print(f"note: uncertainty_10k_s is extrapolated from {res['device_samples']} measured device samples")
