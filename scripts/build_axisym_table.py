"""Build ``floatcalc/data/axisym_table.npz``: the universal axisymmetric contact-line height.

Runs the direct solver of :mod:`floatcalc.core.axisym` (tight tolerance) on the grid of
:func:`floatcalc.core.axisym_table.grid`, stores the transformed quantity Q (see
:mod:`floatcalc.core.axisym_table`), then checks the interpolant against fresh direct solves on
seeded random off-grid points and prints the largest relative error.

Usage: ``python scripts/build_axisym_table.py [--check N]`` (about 20 s on one core).
"""

from __future__ import annotations

import argparse
import time

import numpy as np

from floatcalc.core import axisym_table as T
from floatcalc.core.axisym import solve


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--check", type=int, default=2000, help="random points for the accuracy check")
    args = ap.parse_args()
    t0 = time.perf_counter()
    lnr, psi, q = T.build()
    np.savez_compressed(T.TABLE_PATH, ln_r=lnr, psi=psi, q=q)
    print(f"built {q.shape[0]} x {q.shape[1]} table in {time.perf_counter() - t0:.1f} s -> {T.TABLE_PATH}"
          f" ({T.TABLE_PATH.stat().st_size / 1024:.0f} kB)")
    T._spline.cache_clear()
    rng = np.random.default_rng(20261201)
    r = np.exp(rng.uniform(np.log(T.R_MIN), np.log(T.R_MAX), args.check))
    p = rng.uniform(-T.PSI_TABLE, T.PSI_TABLE, args.check)
    direct = solve(r, p)["height"]
    table = T.evaluate(r, p)
    err = np.abs(table / direct - 1.0)
    k = int(np.argmax(err))
    print(f"max relative error on {args.check} random points: {err.max():.2e} "
          f"(at r_c = {r[k]:.4g}, psi = {p[k]:.4f} rad)")


if __name__ == "__main__":
    main()
