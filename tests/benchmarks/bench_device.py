"""Benchmark: whole-device solve of the built-in invented twelve-leg skimmer, and cost growth.

Figures, measured side by side in one run:

* ``device_solve_s``: time of :func:`floatcalc.device.solve_device` on the built-in skimmer
  (equilibrium, capacity at the centre of mass, best payload place, stiffness, four tipping
  offsets), with its element tables already built, best of several repeats;
* ``device_build_s``: loading the design file and building every element's force–depth
  table once (vectorised), best of the repeats;
* ``device_cost_s_n4/n12/n48``: full solve of invented radial rod layouts with 4, 12 and 48
  legs (same leg, hub radius growing so neighbours stay 1.6 l_c apart), and
  ``device_cost_growth_48_over_4``;
* side by side in the same run, the cost of seeing the neighbours: ``device_build_s`` and
  ``device_cost_s_n*`` include the solved interaction model of close elements
  (:mod:`floatcalc.device.interact`); ``device_build_superposition_s`` and
  ``device_cost_superposition_s_n*`` are the same with the shielding factors given (the
  superposition-only model of the previous version), with ``device_skimmer_capacity_ratio``
  (capacity with interactions over superposition only).
"""

from __future__ import annotations

import math
import time

TARGETS = {
    "device_solve_s": ("<=", 0.5),
    "device_build_s": ("<=", 1.0),
    "device_cost_s_n48": ("<=", 10.0),
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


def _best(fn, repeats):
    best = math.inf
    out = None
    for _ in range(repeats):
        t0 = time.perf_counter()
        out = fn()
        best = min(best, time.perf_counter() - t0)
    return best, out


def run(quick: bool = False) -> dict:
    from floatcalc.device import Device, example_path, load_design, solve_device

    repeats = 3 if quick else 7
    solve_device(Device.from_design(load_design(example_path("skimmer"))))  # warm imports

    t_build, dev = _best(lambda: Device.from_design(load_design(example_path("skimmer"))), repeats)
    ones = (1.0,) * len(dev.models)
    t_build0, dev0 = _best(lambda: Device.from_design(load_design(example_path("skimmer")), shielding=ones), repeats)
    t_solve, res = _best(lambda: solve_device(dev), repeats)
    res0 = solve_device(dev0)
    out = {
        "device_build_s": t_build,
        "device_build_superposition_s": t_build0,
        "device_skimmer_capacity_ratio": res.capacity.magnitude / res0.capacity.magnitude,
        "device_solve_s": t_solve,
        "device_skimmer_max_payload_g": res.max_payload_mass.to("g").magnitude,
        "device_skimmer_verdict": res.verdict,
    }
    for n in (4, 12, 48):
        design = _radial(n)
        t, _ = _best(lambda d=design: solve_device(Device.from_design(d)), max(1, repeats // 2))
        out[f"device_cost_s_n{n}"] = t
        t0, _ = _best(lambda d=design: solve_device(Device.from_design(d, shielding=(1.0,) * n)), max(1, repeats // 2))
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
