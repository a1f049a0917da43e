"""Refinement study of the fem3d reference solver (run by hand: ``python tests/reference/fem3d_study.py``).

Prints, per case and mesh level, the unknowns, CPU and wall seconds, the three force values and,
where a closed form or floatcalc's axisymmetric shooting solver gives the exact value, their
relative errors; then the observed orders. Not collected by pytest (no test functions).
"""

from __future__ import annotations

import math
import os
import sys
import time

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))


def _run(name, bodies, levels, exact=None, nonlinear=False, per_length=None):
    import numpy as np

    import fem3d as F

    print(f"\n== {name} (nonlinear={nonlinear})")
    rows = []
    for k in levels:
        c0, w0 = time.process_time(), time.perf_counter()
        if per_length:
            a = F.solve(bodies(per_length[0]), level=k, nonlinear=nonlinear)
            b = F.solve(bodies(per_length[1]), level=k, nonlinear=nonlinear)
            dL = per_length[1] - per_length[0]
            vals = (float(np.sum(b.line - a.line)) / dL, float(np.sum(b.flux - a.flux)) / dL,
                    (b.keller - a.keller) / dL)
            nd = b.ndofs
        else:
            s = F.solve(bodies, level=k, nonlinear=nonlinear)
            vals = (float(np.sum(s.line)), float(np.sum(s.flux)), s.keller)
            nd = s.ndofs
        cpu, wall = time.process_time() - c0, time.perf_counter() - w0
        rows.append(vals)
        msg = f"level {k}: ndofs {nd:7d}  cpu {cpu:6.2f} s  wall {wall:6.2f} s  line {vals[0]:.9f}  flux {vals[1]:.9f}  keller {vals[2]:.9f}"
        if exact is not None:
            msg += "  rel.err line {:.2e} flux {:.2e} keller {:.2e}".format(*[v / exact - 1 for v in vals])
        print(msg, flush=True)
    rows = np.array(rows)
    if exact is not None:
        err = np.abs(rows - exact)
        for i in range(1, len(rows)):
            print(f"  order {i - 1}->{i}: line {math.log2(err[i - 1, 0] / err[i, 0]):.2f}  flux {math.log2(err[i - 1, 1] / err[i, 1]):.2f}  keller {math.log2(err[i - 1, 2] / err[i, 2]):.2f}")
    elif len(rows) >= 3:
        d = np.abs(np.diff(rows, axis=0))
        for i in range(1, len(d)):
            print(f"  observed order (differences) {i}: line {math.log2(d[i - 1, 0] / d[i, 0]):.2f}  flux {math.log2(d[i - 1, 1] / d[i, 1]):.2f}  keller {math.log2(d[i - 1, 2] / d[i, 2]):.2f}")


def main():
    from scipy.optimize import brentq
    from scipy.special import k0e, k1e

    import fem3d as F
    from floatcalc.core import axisym as ax

    _run("disc r_c=1, h_c=0.1 (exact 2π r h K1/K0)", [F.dirichlet_body(F.disc(0, 0, 1.0), h_c=0.1)],
         (0, 1, 2, 3), exact=2 * math.pi * 0.1 * k1e(1.0) / k0e(1.0))
    psi = brentq(lambda p: float(ax.solve(1.0, p)["height"]) + 0.5, 1e-4, 1.4, xtol=1e-15)
    _run("disc r_c=1, h_c=0.5 (floatcalc.core.axisym)", [F.dirichlet_body(F.disc(0, 0, 1.0), h_c=0.5)],
         (0, 1, 2), exact=2 * math.pi * math.sin(psi), nonlinear=True)
    _run("long strip w=0.25, per length from L=6,12 (exact 2 h_c)",
         lambda L: [F.dirichlet_body(F.stadium(0, 0, 0.5, L, 0.25), h_c=0.3)], (0, 1, 2), exact=0.6,
         per_length=(6.0, 12.0))
    _run("long strip w=0.25, h_c=0.6, per length (exact 2 sin psi, h_c = 2 sin(psi/2))",
         lambda L: [F.dirichlet_body(F.stadium(0, 0, 0.5, L, 0.25), h_c=0.6)], (0, 1),
         exact=2 * math.sin(2 * math.asin(0.3)), nonlinear=True, per_length=(6.0, 12.0))
    _run("X crossing 6 x 6, w=0.1, h_c=0.3", [F.dirichlet_body(F.stadium(0, 0, 0, 6, 0.1), F.stadium(0, 0, 1.5707963267948966, 6, 0.1), h_c=0.3)],
         (0, 1, 2))
    _run("X crossing 6 x 6, w=0.1, h_c=0.3", [F.dirichlet_body(F.stadium(0, 0, 0, 6, 0.1), F.stadium(0, 0, 1.5707963267948966, 6, 0.1), h_c=0.3)],
         (0, 1, 2), nonlinear=True)
    _run("rectangle 8 x 0.5 (corners), h_c=0.3", [F.dirichlet_body(F.rectangle(0, 0, 0.3, 8.0, 0.25), h_c=0.3)], (0, 1, 2))
    _run("thin strip 40 x 0.04 (w=0.02), h_c=0.1", [F.dirichlet_body(F.stadium(0, 0, 0, 40.0, 0.02), h_c=0.1)], (0, 1))


if __name__ == "__main__":
    main()
