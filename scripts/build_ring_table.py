"""Build ``floatcalc/data/ring_table.npz``: inner (enclosed) and extended outer contact heights.

Runs the direct solver of :mod:`floatcalc.core.axisym` (tight tolerance) on the grids of
:func:`floatcalc.core.ring_table.inner_grid` and :func:`~floatcalc.core.ring_table.outer_grid`,
stores the transformed quantities (see :mod:`floatcalc.core.ring_table`), then checks both
interpolants against fresh direct solves on seeded random off-grid points and prints the
largest relative errors (provenance: this script, the solver's version in git, and the
printed figures, recorded in the table file under ``provenance``).

Usage: ``python scripts/build_ring_table.py [--check N]`` (a few minutes on one core).
"""

from __future__ import annotations

import argparse
import subprocess
import time

import numpy as np

from floatcalc.core import ring_table as T
from floatcalc.core.axisym import solve


def _check(n, seed=20261202):
    rng = np.random.default_rng(seed)
    r = np.exp(rng.uniform(np.log(T.IN_R_MIN), np.log(T.IN_R_MAX), n))
    p = rng.uniform(-T.IN_PSI, T.IN_PSI, n)
    e_in = np.abs(T.inner_height(r, p) / solve(r, p, side="inner")["height"] - 1.0)
    r2 = np.exp(rng.uniform(np.log(100.0), np.log(T.OUT_R_MAX), n // 4))
    p2 = rng.uniform(-3.1, 3.1, n // 4)
    e_out = np.abs(T.outer_height(r2, p2) / solve(r2, p2)["height"] - 1.0)
    r3 = np.exp(rng.uniform(np.log(T.CAP_R_USE), np.log(T.OUT_R_MAX), n // 4))
    p3 = rng.uniform(3.1, np.pi, n // 4) * np.where(rng.random(n // 4) < 0.5, -1.0, 1.0)
    d3 = solve(r3, p3)["height"]
    e_cap = np.abs(T.outer_height(r3, p3) / d3 - 1.0)
    a_cap = np.abs(T.outer_height(r3, p3) - d3)
    k, j = int(np.argmax(e_in)), int(np.argmax(e_out))
    c = int(np.argmax(e_cap))
    return (f"inner: max relative error {e_in.max():.2e} on {n} random points (at r_c = {r[k]:.4g}, "
            f"psi = {p[k]:.4f}); outer extension: {e_out.max():.2e} on {n // 4} points "
            f"(at r_c = {r2[j]:.4g}, psi = {p2[j]:.4f}); cap: {e_cap.max():.2e} relative (at r_c = {r3[c]:.4g}, "
            f"psi = {p3[c]:.5f}), {a_cap.max():.2e} l_c absolute, on {n // 4} points")


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--check", type=int, default=2000, help="random points for the accuracy check")
    args = ap.parse_args()
    t0 = time.perf_counter()
    data = T.build(log=lambda s: print(s, flush=True))
    try:
        rev = subprocess.run(["git", "rev-parse", "--short", "HEAD"], capture_output=True, text=True).stdout.strip()
    except OSError:
        rev = "unknown"
    dt = time.perf_counter() - t0
    data["provenance"] = np.array(f"built by scripts/build_ring_table.py from floatcalc.core.axisym.solve "
                                  f"(tight, tol 1e-13) at git {rev}, {dt:.0f} s")
    np.savez_compressed(T.TABLE_PATH, **data)
    T._splines.cache_clear()
    msg = _check(args.check)
    data["provenance"] = np.array(str(data["provenance"]) + "; " + msg)
    np.savez_compressed(T.TABLE_PATH, **data)
    print(f"built in {dt:.0f} s -> {T.TABLE_PATH} ({T.TABLE_PATH.stat().st_size / 1024:.0f} kB)")
    print(msg)


if __name__ == "__main__":
    main()
