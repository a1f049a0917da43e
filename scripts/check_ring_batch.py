"""Check the fast ring footpad law against the direct solver over its whole range.

Seeded random rings: centre-line radius R_r log-uniform over 0.05 … 100 l_c, wire radius
b = R_r × (log-uniform 1e-3 … 0.5, at least 1e-4 l_c), θ uniform over 0 … 180° (plus the
corners of that box). Reference: :func:`floatcalc.core.round_bodies.ring_limit` with the
exterior contact height also taken from the direct solver (``--direct-outer``, default) or
from the exterior table (``--table-outer``), so the reference shoots every meniscus directly.
Prints every ring and the largest relative differences of the limit force and its depth.

Usage: ``python scripts/check_ring_batch.py [--rings N] [--seed S]`` (2–8 s a ring).
"""

from __future__ import annotations

import argparse
import math
import time

import numpy as np

from floatcalc.core import axisym
from floatcalc.core import ring_batch as RB
from floatcalc.core import round_bodies as rb


def rings(n, seed):
    rng = np.random.default_rng(seed)
    Rr = np.exp(rng.uniform(np.log(0.05), np.log(100.0), n))
    ratio = np.exp(rng.uniform(np.log(1e-3), np.log(0.5), n))
    th = rng.uniform(0.0, math.pi, n)
    corners = [(0.05, 0.5, 0.0), (0.05, 0.5, math.pi), (100.0, 0.5, 0.0), (100.0, 0.5, math.pi),
               (0.05, 2e-3, math.pi / 2), (100.0, 1e-3, math.pi / 2), (0.05, 0.5, math.pi / 2), (100.0, 0.5, math.pi / 2)]
    Rr = np.concatenate([[c[0] for c in corners], Rr])
    ratio = np.concatenate([[c[1] for c in corners], ratio])
    th = np.concatenate([[c[2] for c in corners], th])
    return Rr, np.maximum(Rr * ratio, 1e-4), th


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--rings", type=int, default=24)
    ap.add_argument("--seed", type=int, default=20261202)
    ap.add_argument("--table-outer", action="store_true", help="reference uses the exterior table")
    args = ap.parse_args()
    if not args.table_outer:
        rb.depth_outer = lambda rc, psi: -axisym.solve(rc, psi)["height"]
    Rr, b, th = rings(args.rings, args.seed)
    RB.ring_laws(1.0, 0.1, 2.0)  # load the tables first
    t = time.perf_counter()
    fast = RB.ring_laws(Rr, b, th)
    t_fast = time.perf_counter() - t
    worst_f = worst_d = (0.0, None)
    for i in range(Rr.size):
        t = time.perf_counter()
        try:
            best, _ = rb.ring_limit(Rr[i], b[i], th[i])
        except Exception as exc:  # report and go on
            print(f"R_r={Rr[i]:.4g} b={b[i]:.4g} theta={math.degrees(th[i]):.1f}: reference failed: {exc}")
            continue
        ef = abs(fast["max_force"][i] / best["force"] - 1.0)
        ed = abs(fast["depth_at_max"][i] - best["depth"]) / max(abs(best["depth"]), 1e-300)
        where = f"R_r={Rr[i]:.4g} l_c, b={b[i]:.4g} l_c, theta={math.degrees(th[i]):.1f} deg"
        if ef > worst_f[0]:
            worst_f = (ef, where)
        if ed > worst_d[0]:
            worst_d = (ed, where)
        print(f"{where}: F fast {fast['max_force'][i]:.10g} ref {best['force']:.10g} rel {ef:.2e}; "
              f"depth rel {ed:.2e} ({time.perf_counter() - t:.1f} s)", flush=True)
    print(f"fast path: {Rr.size} rings in {t_fast:.3f} s ({1e3 * t_fast / Rr.size:.2f} ms a ring)")
    print(f"largest limit-force difference {worst_f[0]:.2e} at {worst_f[1]}")
    print(f"largest depth-at-limit difference {worst_d[0]:.2e} at {worst_d[1]}")


if __name__ == "__main__":
    main()
