"""Benchmark: flexible-leg limit (floatcalc.core.beam) against scipy.integrate.solve_bvp.

Measured side by side in one run on the same invented legs (wire radius 0.05–0.2 mm, length
10–60 mm, E 2.5–411 GPa, advancing angle 110–170°, clamp angle −5 to 10°; seeded):

* ``flexleg_limit_time_s_median`` / ``_max``: time of one full limit search (continuation in
  clamp depth from first touch with the wetting history, to the largest clamp force or local
  breakthrough, plus the support where the deepest point first reaches the rod law's limit
  depth), the figure a device solve pays per leg;
* ``flexleg_scan_time_s_median``: the baseline, a brute-force scan of clamp depth in steps of
  0.01 l_c with the same solver up to breakthrough (what finding the maximum costs without
  the tangent predictor and regula falsi on dV/dD_c), and ``flexleg_speedup_vs_scan``;
* ``flexleg_scan_max_rel_diff``: largest relative amount by which the scan's best force
  exceeds the limit found (0 if the limit is never below a scanned state);
* ``flexleg_state_time_ms``: one equilibrium at a given clamp depth, warm-started;
* ``flexleg_bvp_time_ms``: the same equilibrium (clamp at the limit depth found) solved by
  ``scipy.integrate.solve_bvp`` (collocation, tolerance 1e-8) started from the same bent
  shape (from the straight leg it does not converge for strongly bent legs), and
  ``flexleg_speedup_vs_bvp`` the ratio;
* ``flexleg_max_rel_diff_vs_bvp``: largest relative difference of the clamp force between
  the two methods (an independent discretisation of the same elastica);
* ``flexleg_gain_over_local_median`` / ``_max``: the limit over the support when the deepest
  point first reaches the rod law's limit depth (the criterion of earlier versions).
"""

from __future__ import annotations

import math
import time

import numpy as np

TARGETS = {
    "flexleg_limit_time_s_max": ("<=", 0.5),
    "flexleg_max_rel_diff_vs_bvp": ("<=", 1e-4),
    "flexleg_scan_max_rel_diff": ("<=", 1e-9),
}

SEED = 5


def _legs(n, seed=SEED):
    from floatcalc.flexleg import _prepare

    rng = np.random.default_rng(seed)
    out = []
    for _ in range(n):
        R = rng.uniform(0.05, 0.2) * 1e-3
        L = rng.uniform(10, 60) * 1e-3
        E = 10 ** rng.uniform(math.log10(2.5e9), math.log10(4.11e11))
        th = math.radians(rng.uniform(110, 170))
        a = math.radians(rng.uniform(-5, 10))
        out.append(_prepare(R, L, th, E, None, a, None, None, 7850.0, None)[7])
    return out


def _bvp(leg, Dc, wet, n=200, guess=None):
    from scipy.integrate import solve_bvp

    fd, B, a = leg.found, leg.B, leg.alpha
    h = leg.L / (wet.size - 1)

    def rhs(s, u):
        th, M, V, y = u
        q, _ = fd.load(y, wet[np.clip(np.rint(s / h).astype(int), 0, wet.size - 1)])
        return np.vstack([-M / B, -V * np.cos(th), -q, np.sin(th)])

    def bc(u0, u1):
        return np.array([u0[0] - a, u0[3] - Dc, u1[1], u1[2]])

    s = np.linspace(0.0, leg.L, n + 1)
    u = np.zeros((4, s.size))
    u[0] = a
    u[3] = Dc + s * math.sin(a)
    if guess is not None:  # the collocation solver also needs a start near the bent leg
        u = np.array([np.interp(s, guess["s"], guess[k]) for k in ("theta", "M", "V", "y")])
    sol = solve_bvp(rhs, bc, s, u, tol=1e-8, max_nodes=200000)
    if not sol.success:
        raise RuntimeError(sol.message)
    return float(sol.sol(0.0)[2])


def _scan(leg, n, th0, step=0.01):
    """Brute force: fixed steps in clamp depth from first touch, previous state as the guess."""
    from floatcalc.core import beam

    fd = leg.found
    y_nat = beam.natural_depths(th0, leg.L)
    Dc = -beam.max_depth(y_nat)
    wet = (Dc + y_nat) >= -1e-12
    sol = beam._solve_from_stiff(leg.L, leg.B, leg.alpha, Dc, fd.bind(wet), n=n, th0=th0, end="clamped")
    best = -np.inf
    while beam.max_depth(sol["y"]) <= fd.d_b:
        best = max(best, float(sol["V"][0]))
        wet = fd.update_wet(wet, sol["y"])
        Dc += step
        try:
            sol = beam.solve(leg.L, leg.B, leg.alpha, Dc, fd.bind(wet), n=n, th0=th0, guess=sol["U"])
        except Exception:  # past a fold: start again from a stiff leg
            sol = beam._solve_from_stiff(leg.L, leg.B, leg.alpha, Dc, fd.bind(wet), n=n, th0=th0,
                                         end="clamped")
    return best


def run(quick: bool = False) -> dict:
    from floatcalc.core import beam

    legs = _legs(4 if quick else 12)
    t_lim, t_scan, scan_diff, t_state, t_bvp, diffs, gain = [], [], [], [], [], [], []
    for leg in legs:
        n = leg.nodes()
        th0 = leg.th0(n)
        t0 = time.perf_counter()
        lim = beam.limit(leg.L, leg.B, leg.alpha, leg.found, n=n, th0=th0)
        t_lim.append(time.perf_counter() - t0)
        if lim["onset"] is not None:
            gain.append(lim["V"][0] / lim["onset"]["V"])
        t0 = time.perf_counter()
        best = _scan(leg, n, th0)
        t_scan.append(time.perf_counter() - t0)
        scan_diff.append(max(0.0, (best - lim["V"][0]) / abs(lim["V"][0])))
        q = leg.found.bind(lim["wet"])
        t0 = time.perf_counter()
        beam.solve(leg.L, leg.B, leg.alpha, lim["clamp_depth"] - 1e-3, q, n=n, th0=th0, guess=lim["U"])
        t_state.append(time.perf_counter() - t0)
        # the same state on a fine grid for the comparison (second order: error ~ (n/4n)^2)
        s_f = np.linspace(0.0, leg.L, 4 * n + 1)
        guess = np.empty(4 * s_f.size)
        for c, key in enumerate(("theta", "M", "V", "y")):
            guess[c::4] = np.interp(s_f, lim["s"], lim[key])
        wet_f = lim["wet"][np.clip(np.rint(np.arange(s_f.size) / 4).astype(int), 0, n)]
        fine = beam.solve(leg.L, leg.B, leg.alpha, lim["clamp_depth"], leg.found.bind(wet_f), n=4 * n,
                          th0=leg.th0(4 * n), guess=guess)
        t0 = time.perf_counter()
        v_bvp = _bvp(leg, lim["clamp_depth"], lim["wet"], guess=lim)
        t_bvp.append(time.perf_counter() - t0)
        diffs.append(abs(fine["V"][0] - v_bvp) / abs(v_bvp))
    return {
        "flexleg_legs": len(legs),
        "flexleg_limit_time_s_median": float(np.median(t_lim)),
        "flexleg_limit_time_s_max": float(np.max(t_lim)),
        "flexleg_scan_time_s_median": float(np.median(t_scan)),
        "flexleg_speedup_vs_scan": float(np.median(t_scan) / np.median(t_lim)),
        "flexleg_scan_max_rel_diff": float(np.max(scan_diff)),
        "flexleg_state_time_ms": 1e3 * float(np.median(t_state)),
        "flexleg_bvp_time_ms": 1e3 * float(np.median(t_bvp)),
        "flexleg_speedup_vs_bvp": float(np.median(t_bvp) / np.median(t_state)),
        "flexleg_max_rel_diff_vs_bvp": float(np.max(diffs)),
        "flexleg_gain_over_local_median": float(np.median(gain)) if gain else float("nan"),
        "flexleg_gain_over_local_max": float(np.max(gain)) if gain else float("nan"),
    }


if __name__ == "__main__":  # pragma: no cover
    for k, v in run(quick=False).items():
        print(f"{k:32s} {v:.4g}")
