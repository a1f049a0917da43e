"""Benchmark: batched round-element laws against the scalar path, side by side in one run.

For seeded random designs (ball and pad radius 1e-3 … 10 l_c, pad thickness 0.02 … 1 × radius,
pin radius 1e-3 … 3 l_c and length 1 … 20 × radius, θ 0 … 170°):

* ``<kind>_tables_per_s``: limit and 241-point device table per design, all designs in one
  call of :mod:`floatcalc.core.round_batch`;
* ``<kind>_tables_per_s_scalar_core``: the same from :mod:`floatcalc.core.round_bodies`
  (``ball_limit`` / ``pad_limit`` / ``pad_curve``) one design at a time, plus the device
  adapter's table steps (numpy.interp), on a subset;
* ``<kind>_tables_per_s_round_api``: :func:`floatcalc.round.ball` / ``pad`` / ``pin`` (what
  the device's round adapter calls now: units, validation, the meniscus profile for drawing);
* ``<kind>_batch_max_rel_diff``: largest relative difference of the limit force and table
  (batch against the scalar core) on that subset.

Rings (:mod:`floatcalc.core.ring_batch` against :func:`floatcalc.core.round_bodies.ring_limit`,
which shoots the enclosed meniscus directly): ``ring_limits_per_s`` and ``ring_ms`` over
random rings of the whole range (R_r 0.05 … 100 l_c, b/R_r 1e-3 … 0.5, θ 0 … 180°),
``ring_ms_typical`` for θ 90 … 170°, R_r 0.5 … 20 l_c, b/R_r 0.01 … 0.2, ``ring_ms_single``
(one ring per call), ``ring_scalar_s`` (the scalar path, a few rings) and
``ring_max_rel_diff`` (limit force).

``ball_150_180deg_per_s_edges_direct`` / ``_table``: balls with θ 150 … 180°, whose contact
inclinations near 180° lie beyond the shipped table, shot directly (as the scalar path) or read
from the cap table; ``ball_edges_table_max_rel_diff`` between the two.

``<kind>_element_ms_single``: one element per call of :func:`floatcalc.round.element_tables`
(SI in and out), what a device build would pay per element on the fast path.
"""

from __future__ import annotations

import math
import time

import numpy as np

TARGETS = {
    "ring_ms_typical": ("<=", 10.0),
    "ball_batch_max_rel_diff": ("<=", 1e-8),
    "pad_batch_max_rel_diff": ("<=", 1e-8),
    "pin_batch_max_rel_diff": ("<=", 1e-8),
    "ring_max_rel_diff": ("<=", 1e-6),
}


def _table(D, F, Fst, d_lim, rc, points=241):
    """The device adapter's table steps on one scalar curve (numpy.interp)."""
    from scipy.special import k0e, k1e

    keep = D < d_lim
    f_lim, s_lim = np.interp(d_lim, D, F), np.interp(d_lim, D, Fst)
    D, F, Fst = np.append(D[keep], d_lim), np.append(F[keep], f_lim), np.append(Fst[keep], s_lim)
    if D[0] < 0.0 < D[-1]:
        k = D > 0.0
        F = np.concatenate([[np.interp(0.0, D, F)], F[k]])
        Fst = np.concatenate([[np.interp(0.0, D, Fst)], Fst[k]])
        D = np.concatenate([[0.0], D[k]])
    grid = np.linspace(D[0], D[-1], points)
    rc = max(rc, 1e-9)
    return grid, np.interp(grid, D, F), np.interp(grid, D, Fst) / (2 * math.pi * rc * k1e(rc) / k0e(rc))


def _designs(n, seed):
    rng = np.random.default_rng(seed)
    R = np.exp(rng.uniform(np.log(1e-3), np.log(10.0), n))
    th = rng.uniform(0.0, math.radians(170), n)
    t = R * np.exp(rng.uniform(np.log(0.02), np.log(1.0), n))
    bp = np.exp(rng.uniform(np.log(1e-3), np.log(3.0), n))
    L = bp * rng.uniform(1.0, 20.0, n)
    return R, th, t, bp, L


def _round_kinds(quick):
    import floatcalc as fc
    from floatcalc import round as rd
    from floatcalc.core import round_batch as B
    from floatcalc.core import round_bodies as rb

    n = 500 if quick else 3000
    m = 40 if quick else 150
    m_api = 5 if quick else 12
    R, th, t, bp, L = _designs(n, 7)
    liq = fc.water()
    lc = liq.lc
    kinds = {
        "ball": (lambda: B.ball_laws(R, th),
                 lambda i: (lambda best, cur: (best["force"], _table(cur["depth"], cur["force"], cur["surface_tension"],
                                                                     best["depth"], best["rc"])))(*rb.ball_limit(R[i], th[i])),
                 lambda i: rd.ball(R[i] * lc, th[i], liquid=liq, material_density=7850.0)),
        "pad": (lambda: B.pad_laws(R, t, th),
                lambda i: (lambda best, cur: (best["force"], _table(cur["depth"], cur["force"], cur["surface_tension"],
                                                                    best["depth"], R[i])))(*rb.pad_limit(R[i], t[i], th[i])),
                lambda i: rd.pad(R[i] * lc, t[i] * lc, th[i], liquid=liq, material_density=7850.0)),
        "pin": (lambda: B.pin_laws(bp, L, th),
                lambda i: (lambda cur: (None, _table(cur["depth"], cur["force"], cur["surface_tension"],
                                                     min(L[i], cur["depth"][-1]), bp[i])))(
                    rb.pad_curve(bp[i], math.inf, th[i], depth_max=L[i])),
                lambda i: rd.pin(bp[i] * lc, th[i], length=L[i] * lc, liquid=liq, material_density=7850.0)),
    }
    out = {"round_designs": n}
    for name, (batch, scalar, api) in kinds.items():
        batch()  # warm (tables, imports)
        t0 = time.perf_counter()
        res = batch()
        tb = time.perf_counter() - t0
        t0 = time.perf_counter()
        ref = [scalar(i) for i in range(m)]
        ts = (time.perf_counter() - t0) / m
        t0 = time.perf_counter()
        for i in range(m_api):
            api(i)
        ta = (time.perf_counter() - t0) / m_api
        diff = 0.0
        for i, (f, (g, fg, hg)) in enumerate(ref):
            if f is not None:
                diff = max(diff, abs(res["max_force"][i] / f - 1.0))
            for a, b in ((res["table"]["depth"][i], g), (res["table"]["force"][i], fg), (res["table"]["contact"][i], hg)):
                diff = max(diff, float(np.max(np.abs(a - b)) / max(np.max(np.abs(b)), 1e-300)))
        out[f"{name}_tables_per_s"] = n / tb
        out[f"{name}_tables_per_s_scalar_core"] = 1.0 / ts
        out[f"{name}_tables_per_s_round_api"] = 1.0 / ta
        out[f"{name}_speedup_vs_round_api"] = (n / tb) * ta
        out[f"{name}_batch_max_rel_diff"] = diff
    return out


def _rings(n, seed, typical=False):
    rng = np.random.default_rng(seed)
    if typical:
        Rr = np.exp(rng.uniform(np.log(0.5), np.log(20.0), n))
        ratio = np.exp(rng.uniform(np.log(0.01), np.log(0.2), n))
        th = rng.uniform(math.radians(90), math.radians(170), n)
    else:
        Rr = np.exp(rng.uniform(np.log(0.05), np.log(100.0), n))
        ratio = np.exp(rng.uniform(np.log(1e-3), np.log(0.5), n))
        th = rng.uniform(0.0, math.pi, n)
    return Rr, np.maximum(Rr * ratio, 1e-4), th


def _ring_figures(quick):
    from floatcalc.core import ring_batch as RB
    from floatcalc.core import round_bodies as rb

    n = 60 if quick else 300
    RB.ring_laws(1.0, 0.1, 2.0)
    out = {"rings": n}
    Rr, b, th = _rings(n, 8)
    t0 = time.perf_counter()
    res = RB.ring_laws(Rr, b, th)
    dt = time.perf_counter() - t0
    out["ring_limits_per_s"] = n / dt
    out["ring_ms"] = 1e3 * dt / n
    Rt, bt, tt = _rings(n, 9, typical=True)
    t0 = time.perf_counter()
    RB.ring_laws(Rt, bt, tt)
    out["ring_ms_typical"] = 1e3 * (time.perf_counter() - t0) / n
    k = 10 if quick else 30
    t0 = time.perf_counter()
    for i in range(k):
        RB.ring_laws(Rt[i], bt[i], tt[i])
    out["ring_ms_single"] = 1e3 * (time.perf_counter() - t0) / k
    m = 1 if quick else 4
    t0 = time.perf_counter()
    diff = 0.0
    for i in range(m):
        best, _ = rb.ring_limit(Rt[i], bt[i], tt[i])
        diff = max(diff, abs(float(RB.ring_laws(Rt[i], bt[i], tt[i])["max_force"]) / best["force"] - 1.0))
    out["ring_scalar_s"] = (time.perf_counter() - t0) / m
    out["ring_speedup"] = out["ring_scalar_s"] * 1e3 / out["ring_ms_typical"]
    out["ring_max_rel_diff"] = diff
    return out


def _single_elements(quick):
    """One element per call of floatcalc.round.element_tables (SI), as a device build would."""
    from floatcalc import round as rd

    k = 10 if quick else 40
    cases = {"ball": dict(radius=1e-3), "pad": dict(radius=2e-3, thickness=0.2e-3),
             "pin": dict(radius=0.1e-3, length=3e-3), "ring": dict(ring_radius=5e-3, wire_radius=0.2e-3)}
    out = {}
    for name, geo in cases.items():
        rd.element_tables(name, contact_angle=math.radians(150), **geo)
        t0 = time.perf_counter()
        for i in range(k):
            rd.element_tables(name, contact_angle=math.radians(140 + i * 0.5), **geo)
        out[f"{name}_element_ms_single"] = 1e3 * (time.perf_counter() - t0) / k
    return out


def _edges(quick):
    """Balls with θ 150 … 180° (some beyond the shipped table's |ψ| ≤ 3.1): direct shots as the
    scalar path (``edges="direct"``) against the cap table (``edges="table"``)."""
    from floatcalc.core import round_batch as B

    n = 100 if quick else 300
    rng = np.random.default_rng(3)
    R = np.exp(rng.uniform(np.log(0.05), np.log(5.0), n))
    th = rng.uniform(math.radians(150), math.pi, n)
    B.ball_laws(0.5, 2.0, edges="table")
    out = {}
    for e in ("direct", "table"):
        t0 = time.perf_counter()
        res = B.ball_laws(R, th, edges=e)
        out[f"ball_150_180deg_per_s_edges_{e}"] = n / (time.perf_counter() - t0)
        out.setdefault("_f", []).append(res["max_force"])
    a, b = out.pop("_f")
    out["ball_edges_table_max_rel_diff"] = float(np.max(np.abs(b / a - 1.0)))
    return out


def run(quick: bool = False) -> dict:
    return {**_round_kinds(quick), **_edges(quick), **_ring_figures(quick), **_single_elements(quick)}


if __name__ == "__main__":
    import argparse

    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--quick", action="store_true")
    args = ap.parse_args()
    res = run(args.quick)
    width = max(map(len, res))
    for key, v in res.items():
        print(f"{key:<{width}}  {v:.4g}" if isinstance(v, float) else f"{key:<{width}}  {v}")
