"""Benchmark: tabulated axisymmetric contact height against direct solves and a plain baseline.

Measured side by side in one run on the same seeded points (contact radius 1e-4 to 100 l_c,
log-uniform; inclination −3.1 to 3.1 rad, uniform: the table's whole range):

* ``axisym_evals_per_s``: contact heights per second of
  ``floatcalc.core.axisym.contact_height`` (table, vectorised) on 1e5 points, best repeat;
* ``axisym_direct_evals_per_s``: the direct batch solver ``contact_height_direct`` at tight
  tolerance, vectorised over a subset;
* ``axisym_baseline_evals_per_s``: the way a careful user would write it without floatcalc —
  for each point, ``scipy.integrate.solve_ivp`` (DOP853, rtol 1e-10) on the arclength form,
  started on the linearised K0 far field and stopped by an event where ψ reaches the contact
  value, with ``scipy.optimize.brentq`` on the far-field amplitude so that the event happens at
  the contact radius (written out below, independent of floatcalc);
* ``axisym_max_rel_err``: largest relative error of the table against the tight direct solve
  on the subset; ``axisym_baseline_max_rel_diff``: baseline against the direct solve;
* ``axisym_speedup_vs_baseline``: table rate over baseline rate.
"""

from __future__ import annotations

import math
import time

import numpy as np

TARGETS = {
    "axisym_evals_per_s": (">=", 1e5),
    "axisym_max_rel_err": ("<=", 1e-6),
}

SEED = 31


def points(n: int, seed: int = SEED):
    from floatcalc.core import axisym_table as tab

    rng = np.random.default_rng(seed)
    r = np.exp(rng.uniform(math.log(tab.R_MIN), math.log(tab.R_MAX), n))
    return r, rng.uniform(-tab.PSI_TABLE, tab.PSI_TABLE, n)


def baseline_height(rc: float, psi: float) -> float:
    """Contact height by plain per-point shooting with solve_ivp (see module docstring)."""
    from scipy.integrate import solve_ivp
    from scipy.optimize import brentq
    from scipy.special import k0e, k1e

    a = abs(psi)
    r_far = rc + 16.0

    def rhs(s, y):  # arclength form, s decreasing inward (we integrate in −s)
        r, z, p = y
        return [-math.cos(p), -math.sin(p), -(z - math.sin(p) / r)]

    def hit(s, y):
        return y[2] - a

    hit.terminal = True

    def shot(logA):
        A = math.exp(logA)
        y0 = [r_far, -A * k0e(r_far) * math.exp(-r_far), math.atan(A * k1e(r_far) * math.exp(-r_far))]
        sol = solve_ivp(rhs, (0.0, 60.0), y0, method="DOP853", rtol=1e-10, atol=1e-14, events=hit)
        if sol.status != 1:
            return None
        return sol.y_events[0][0]

    def miss(logA):
        y = shot(logA)
        return (r_far if y is None else y[0]) - rc

    la0 = math.log(math.tan(min(a, 1.0)) / (k1e(rc) * math.exp(-rc)))
    lo, hi = la0 - 4.0, la0 + 4.0
    la = brentq(miss, lo, hi, xtol=1e-13)
    return -math.copysign(abs(shot(la)[1]), psi)  # depressed (z < 0) for ψ > 0


def _best_time(fn, repeats: int) -> float:
    best = math.inf
    for _ in range(repeats):
        t0 = time.perf_counter()
        fn()
        best = min(best, time.perf_counter() - t0)
    return best


def run(quick: bool = False) -> dict:
    from floatcalc.core import axisym

    n = 100_000
    n_sub = 200 if quick else 1000
    n_base = 4 if quick else 20
    repeats = 3 if quick else 5
    r, p = points(n)
    axisym.contact_height(r[:10], p[:10])  # warm-up: table load, SciPy import
    t_table = _best_time(lambda: axisym.contact_height(r, p), repeats)
    rs, ps = r[:n_sub], p[:n_sub]
    t0 = time.perf_counter()
    direct = axisym.contact_height_direct(rs, ps)
    t_direct = time.perf_counter() - t0
    table_sub = axisym.contact_height(rs, ps)
    rel = np.abs(table_sub / direct - 1.0)
    # baseline on a subset (moderate inclinations where plain shooting brackets reliably)
    sel = np.flatnonzero(np.abs(ps) < 2.5)[:n_base]
    baseline_height(float(rs[sel[0]]), float(ps[sel[0]]))  # warm-up
    t0 = time.perf_counter()
    base = np.array([baseline_height(float(rs[k]), float(ps[k])) for k in sel])
    t_base = time.perf_counter() - t0
    evals = n / t_table
    base_rate = sel.size / t_base
    return {
        "axisym_evals_per_s": evals,
        "axisym_direct_evals_per_s": n_sub / t_direct,
        "axisym_baseline_evals_per_s": base_rate,
        "axisym_speedup_vs_baseline": evals / base_rate,
        "axisym_max_rel_err": float(rel.max()),
        "axisym_baseline_max_rel_diff": float(np.max(np.abs(base / direct[sel] - 1.0))),
        "axisym_points_checked": int(n_sub),
        "axisym_baseline_points": int(sel.size),
    }


if __name__ == "__main__":
    import argparse

    ap = argparse.ArgumentParser(description="axisymmetric meniscus benchmark")
    ap.add_argument("--quick", action="store_true")
    out = run(ap.parse_args().quick)
    for k, v in out.items():
        print(f"{k:32s} {v:.4g}" if isinstance(v, float) else f"{k:32s} {v}")
