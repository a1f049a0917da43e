"""Benchmark: whole-device solve of the built-in invented twelve-leg skimmer, and cost growth.

Figures, measured side by side in one run (wall seconds, best of the repeats; ``_cpu_s`` the
process CPU time of the same runs, less sensitive to other jobs on a shared machine; the
1-minute load average is printed first):

* ``device_solve_s``: :func:`floatcalc.device.solve_device` on the built skimmer (equilibrium,
  capacity at the centre of mass, progressive failure, best payload place, stiffness, four
  tipping offsets);
* ``device_build_cold_s``: loading the design and building the device with the shielding cache
  emptied (element tables and the solved interaction model of the 12-leg cluster,
  :mod:`floatcalc.device.interact`); ``device_build_s`` the same with the cluster already
  solved (the cache hit of a payload or body-mass change, a page rerun);
* ``device_skimmer_total_s`` = build + solve (cache hit) and ``device_skimmer_total_cold_s``;
* ``device_build_superposition_s``, ``device_solve_superposition_s``: the same with the
  superposition-only model of the previous version (``superposition_only=True``: superposed
  linear menisci between all elements, no shielding), ``device_skimmer_capacity_ratio``
  (capacity with interactions over superposition only);
* ``device_cost_s_n4/n12/n24/n48``: build (cache emptied) + solve of invented radial rod layouts
  with 4–48 legs (same leg, hub radius growing so neighbours stay about 1.6 l_c apart: one
  cluster), ``device_cost_superposition_s_n*`` the same with superposition only, and
  ``device_cost_growth_48_over_4``.
"""

from __future__ import annotations

import math
import time

TARGETS = {
    "device_solve_s": ("<=", 0.1),
    "device_skimmer_total_s": ("<=", 0.1),
    "device_cost_s_n48": ("<=", 1.0),
}


def _radial(n: int):
    from floatcalc.device.design import design_from_data

    gap = 4.4  # mm between inner ends
    hub = max(9.0, n * gap / (2 * math.pi))
    legs = []
    for k in range(n):
        a = 2 * math.pi * (k + 0.5) / n
        r = hub + 10.0
        legs.append({"kind": "rod", "name": f"leg {k + 1}",
                     "position": [f"{r * math.cos(a):.4f} mm", f"{r * math.sin(a):.4f} mm"],
                     "heading": f"{math.degrees(a):.4f} deg", "radius": "0.15 mm", "length": "20 mm",
                     "material": "steel", "coating": {"advancing": "115 deg", "receding": "95 deg"}})
    return design_from_data({
        "schema_version": 1, "description": f"Invented benchmark layout: {n} radial legs",
        "liquid": {"name": "water", "temperature": "20 degC"},
        "body": {"mass": f"{0.09 * n:.4f} g", "centre_of_mass": ["0.5 mm", "0 mm"]},
        "legs": legs,
    })


def _best(fn, repeats, before=None):
    best, cpu = math.inf, math.inf
    out = None
    for _ in range(repeats):
        if before is not None:
            before()
        t0, c0 = time.perf_counter(), time.process_time()
        out = fn()
        best = min(best, time.perf_counter() - t0)
        cpu = min(cpu, time.process_time() - c0)
    return best, cpu, out


def run(quick: bool = False) -> dict:
    import os

    from floatcalc.device import Device, example_path, interact, load_design, solve_device

    def cold():
        interact._CACHE.clear()

    repeats = 3 if quick else 7
    solve_device(Device.from_design(load_design(example_path("skimmer"))))  # warm imports
    out = {"device_load_average_1min": os.getloadavg()[0]}
    load = lambda: load_design(example_path("skimmer"))  # noqa: E731
    t_cold, c_cold, _ = _best(lambda: Device.from_design(load()), repeats, before=cold)
    t_build, c_build, dev = _best(lambda: Device.from_design(load()), repeats)
    t_build0, _, dev0 = _best(lambda: Device.from_design(load(), superposition_only=True), repeats)
    t_solve, c_solve, res = _best(lambda: solve_device(dev), repeats)
    t_solve0, _, res0 = _best(lambda: solve_device(dev0), repeats)
    out.update({
        "device_build_cold_s": t_cold, "device_build_cold_cpu_s": c_cold,
        "device_build_s": t_build, "device_build_cpu_s": c_build,
        "device_build_superposition_s": t_build0,
        "device_solve_s": t_solve, "device_solve_cpu_s": c_solve,
        "device_solve_superposition_s": t_solve0,
        "device_skimmer_total_s": t_build + t_solve,
        "device_skimmer_total_cold_s": t_cold + t_solve,
        "device_skimmer_capacity_ratio": res.capacity.magnitude / res0.capacity.magnitude,
        "device_skimmer_max_payload_g": res.max_payload_mass.to("g").magnitude,
        "device_skimmer_verdict": res.verdict,
    })
    for n in (4, 12, 24, 48):
        design = _radial(n)
        r = max(1, repeats // 3)
        t, c, _ = _best(lambda d=design: solve_device(Device.from_design(d)), r, before=cold)
        out[f"device_cost_s_n{n}"] = t
        out[f"device_cost_cpu_s_n{n}"] = c
        t0, _, _ = _best(lambda d=design: solve_device(Device.from_design(d, superposition_only=True)), r)
        out[f"device_cost_superposition_s_n{n}"] = t0
    out["device_cost_growth_48_over_4"] = out["device_cost_s_n48"] / out["device_cost_s_n4"]
    return out


if __name__ == "__main__":
    import argparse
    import json

    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--quick", action="store_true")
    ap.add_argument("--json", action="store_true")
    a = ap.parse_args()
    figures = run(a.quick)
    if a.json:
        print(json.dumps(figures, indent=2))
    else:
        for k, v in figures.items():
            target = TARGETS.get(k)
            tail = f"   (target {target[0]} {target[1]})" if target else ""
            print(f"{k:32s} {v if isinstance(v, str) else f'{v:.4g}'}{tail}")
