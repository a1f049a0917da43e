"""Fast limit and device table of ring footpads, for arrays of rings, in scaled variables.

The law of :func:`floatcalc.core.round_bodies.ring_limit` (a closed loop of round wire, radius
b, centre line at radius R_r, lying flat in the surface): an outer contact line at φ_o with the
exterior meniscus, an inner one at φ_i with the enclosed meniscus, both at the same depth D of
the wire's lowest point,

.. math::

    D = d_o(R_r + b\\sin\\phi_o, \\psi_o) + b(1 - \\cos\\phi_o)
      = d_i(R_r - b\\sin\\phi_i, \\psi_i) + b(1 - \\cos\\phi_i),\\qquad \\psi = \\phi + \\theta - \\pi,

    F = 2\\pi(r_o\\sin\\psi_o + r_i\\sin\\psi_i) + F_p(D, \\phi_o, \\phi_i)

(F_p the exact pressure integral over the wetted torus,
:func:`floatcalc.core.round_bodies.torus_pressure`). Where the scalar path shoots the inner
meniscus directly at every step (seconds a ring), here both contact heights come from tables:
the exterior one from :mod:`floatcalc.core.axisym_table` (extended to r_c = 300 by
:mod:`floatcalc.core.ring_table`) and the enclosed one from :mod:`floatcalc.core.ring_table`
(both within 1e-9 … 1e-6 of the direct solver). The steps are those of the scalar path: the
inner depth on 2n + 1 positions φ_i and its longest rising run; the outer positions φ_o on n
points whose depth lies in that run's range, followed while the depth rises (push-down
branch); for each, the φ_i of equal depth (bracketed on the grid, then Illinois regula falsi
on the table to 1e-13 l_c); the largest force refined by two parabola stages (9 and 5
sub-points) around the coarse maximum.

The enclosed liquid's weight is given by Keller's theorem applied to the inner meniscus: it
equals the inner line's pull 2π r_i sin ψ_i (reported as ``enclosed``).

Validity: that of the scalar law (static, rigid ring, R_r ≥ 2b, no neighbour within a few
l_c); tested against the direct solver over R_r = 0.05 … 100 l_c, b/R_r = 1e-3 … 0.5,
θ = 0 … 180° (tests/test_round_batch.py, scripts/check_ring_batch.py). Points outside the tables
(contact inclinations within 0.04 rad of ±π at the ends of a curve, or radii above 300 l_c)
fall back to the direct solver, which costs about 10 ms a point.

>>> out = ring_laws(2.3, 0.074, np.radians(150))   # R_r = 2.3 l_c (about 6 mm on water), 0.2 mm wire
>>> round(float(out["max_force"]), 3)
29.605

References
----------
.. [1] J. B. Keller, Phys. Fluids 10, 3009 (1998).
.. [2] D. Vella, D.-G. Lee, H.-Y. Kim, Langmuir 22, 5979 (2006) (the 2D limit of a large ring).
"""

from __future__ import annotations

import numpy as np

from ..errors import ConvergenceError
from . import ring_table
from .round_batch import TABLE_POINTS, _compact, _rising, device_table
from .round_bodies import torus_pressure

PI = np.pi


def _d_out(Rr, b, th, phi):
    return -ring_table.outer_height(Rr + b * np.sin(phi), phi + th - PI) + b * (1.0 - np.cos(phi))


def _d_in(Rr, b, th, phi):
    return -ring_table.inner_height(Rr - b * np.sin(phi), phi + th - PI) + b * (1.0 - np.cos(phi))


def _longest_run(Di):
    """(start, length) of the longest run of rising depth per row (as the scalar path)."""
    up = np.diff(Di, axis=1) > 0
    starts, lens = np.zeros(len(Di), dtype=int), np.zeros(len(Di), dtype=int)
    for i, row in enumerate(up.tolist()):
        best = run = start = bstart = 0
        for k, u in enumerate(row):
            run, start = (run + 1, start) if u else (0, k + 1)
            if run > best:
                best, bstart = run, start
        starts[i], lens[i] = bstart, best + 1
    return starts, lens


def _inner_match(Rr, b, th, D, pa, pb, da, db, iters: int = 60):
    """φ_i in [pa, pb] with inner depth D (da ≤ D ≤ db at the ends): Illinois regula falsi."""
    ga, gb = da - D, db - D
    a, c = pa.copy(), pb.copy()
    x = a.copy()
    scale = np.maximum(1.0, np.abs(D))
    side = np.zeros(D.shape, dtype=int)
    done = (np.abs(ga) <= 1e-13 * scale) | (np.abs(gb) <= 1e-13 * scale)
    x = np.where(np.abs(ga) <= np.abs(gb), a, c)
    for _ in range(iters):
        w = np.flatnonzero(~done)
        if w.size == 0:
            break
        den = gb[w] - ga[w]
        xw = np.where(den != 0, (a[w] * gb[w] - c[w] * ga[w]) / np.where(den != 0, den, 1.0), 0.5 * (a[w] + c[w]))
        xw = np.clip(xw, np.minimum(a[w], c[w]), np.maximum(a[w], c[w]))
        g = _d_in(Rr[w], b[w], th[w], xw) - D[w]
        x[w] = xw
        conv = (np.abs(g) <= 1e-13 * scale[w]) | (np.abs(c[w] - a[w]) <= 1e-15)
        left = np.sign(g) == np.sign(ga[w])
        # replace the end with the same sign; halve the other end's value when the same end
        # is kept twice in a row (Illinois)
        a[w] = np.where(left, xw, a[w])
        ga[w] = np.where(left, g, np.where(side[w] == -1, 0.5 * ga[w], ga[w]))
        c[w] = np.where(left, c[w], xw)
        gb[w] = np.where(left, np.where(side[w] == 1, 0.5 * gb[w], gb[w]), g)
        side[w] = np.where(left, 1, -1)
        done[w] = conv
    if not np.all(done):
        raise ConvergenceError("ring footpad: inner and outer contact positions did not match")
    return x


class _Ring:
    """Inner run of each ring and the state at given outer positions (rows = rings)."""

    def __init__(self, Rr, b, th, n):
        self.Rr, self.b, self.th = Rr, b, th
        S = Rr.size
        phi = np.linspace(0.0, PI, 2 * n + 1)
        P = np.broadcast_to(phi, (S, phi.size))
        Di = _d_in(Rr[:, None], b[:, None], th[:, None], P)
        s0, ln = _longest_run(Di)
        if np.any(ln < 4):
            raise ConvergenceError("ring footpad: no rising branch of the inner meniscus depth found")
        self.phi_i, self.Di, self.s0, self.ln = phi, Di, s0, ln
        rows = np.arange(S)
        self.lo, self.hi = Di[rows, s0], Di[rows, s0 + ln - 1]

    def states(self, phi_o, rows):
        """States at outer positions phi_o (flat arrays) of rings ``rows``."""
        Rr, b, th = self.Rr[rows], self.b[rows], self.th[rows]
        D = _d_out(Rr, b, th, phi_o)
        # bracket on the inner grid inside the rising run
        Di, s0, ln = self.Di[rows], self.s0[rows], self.ln[rows]
        col = np.arange(Di.shape[1])[None, :]
        in_run = (col >= s0[:, None]) & (col < (s0 + ln)[:, None])
        below = np.count_nonzero(in_run & (Di <= D[:, None]), axis=1)  # searchsorted in the run
        j = s0 + np.clip(below - 1, 0, ln - 2)
        r = np.arange(D.size)
        pa, pb = self.phi_i[j], self.phi_i[j + 1]
        phi_i = _inner_match(Rr, b, th, D, pa, pb, Di[r, j], Di[r, j + 1])
        psi_o, psi_i = phi_o + th - PI, phi_i + th - PI
        rco, rci = Rr + b * np.sin(phi_o), Rr - b * np.sin(phi_i)
        f_st = 2.0 * PI * (rco * np.sin(psi_o) + rci * np.sin(psi_i))
        f_p = torus_pressure(Rr, b, D, phi_o, phi_i)
        return {"depth": D, "phi_outer": phi_o, "phi_inner": phi_i, "psi_outer": psi_o, "psi_inner": psi_i,
                "surface_tension": f_st, "pressure": f_p, "enclosed": 2.0 * PI * rci * np.sin(psi_i),
                "force": f_st + f_p}


def _parabola_vertex(x, y):
    """Vertex of the parabola through three points per row (x[:, 1] if not concave)."""
    h0, h1 = x[:, 0] - x[:, 1], x[:, 2] - x[:, 1]
    y0, y1, y2 = y[:, 0] - y[:, 1], y[:, 1] * 0.0, y[:, 2] - y[:, 1]
    # y - y1 = A h² + B h through (h0, y0), (h1, y2)
    det = h0 * h1 * (h0 - h1)
    A = (y0 * h1 - y2 * h0) / det
    B = (y2 * h0 * h0 - y0 * h1 * h1) / det
    xv = x[:, 1] - np.where(A < 0, B / (2 * A), 0.0)
    return np.clip(xv, x[:, 0], x[:, 2]), y1


def ring_laws(ring_radius, wire_radius, contact_angle, *, n: int = 61, points: int = TABLE_POINTS,
              min_contact_radius: float = 1e-9) -> dict:
    """Limit and device table of ring footpads for arrays of rings.

    Parameters
    ----------
    ring_radius : array_like [l_c]
        Radius R_r of the wire's centre line (≥ 2 b).
    wire_radius : array_like [l_c]
        Wire radius b.
    contact_angle : array_like [rad]
        Advancing contact angle θ (0 to π). The three inputs broadcast together.
    n : int
        Outer contact positions of the coarse curve (2n + 1 inner ones), as the scalar path.
    points : int
        Points of the device table.

    Returns
    -------
    dict of arrays: ``max_force`` [σ l_c], ``depth_at_max`` [l_c] (wire's lowest point),
    ``surface_tension_at_max``, ``pressure_at_max``, ``enclosed_at_max`` [σ l_c],
    ``phi_outer_at_max``, ``phi_inner_at_max``, ``psi_outer_at_max``, ``psi_inner_at_max``
    [rad], ``contact_radius_at_max`` (outer line) and ``starts_deep`` (the curve starts below
    depth 0: shallower states have no matching inner meniscus on the followed branch);
    ``table`` as :func:`floatcalc.core.round_batch.ball_laws` (contact depth with
    r_c = R_r + b, as the device's ring adapter), ``limit_force``, ``limit_depth``, and
    ``curve`` (flat padded rows with ``n``).

    Raises
    ------
    ConvergenceError
        If a ring has no rising branch of the inner depth, as the scalar path.
    """
    Rr, b, th = np.broadcast_arrays(*(np.asarray(x, dtype=float) for x in (ring_radius, wire_radius, contact_angle)))
    shape = Rr.shape
    Rr, b, th = Rr.ravel().copy(), b.ravel().copy(), th.ravel().copy()
    S = Rr.size
    ring = _Ring(Rr, b, th, n)
    phi = np.linspace(0.0, PI, n)
    P = np.broadcast_to(phi, (S, n))
    Do = _d_out(Rr[:, None], b[:, None], th[:, None], P)
    keep = (Do >= ring.lo[:, None]) & (Do <= ring.hi[:, None])
    cnt, Pk, Dk = _compact(keep, np.ascontiguousarray(P), Do)
    i0, i1 = _rising(Dk, cnt)
    col = np.arange(n)[None, :]
    onb = (col >= i0[:, None]) & (col < i1[:, None]) & (cnt[:, None] > 0)
    nb, Pb = _compact(onb, Pk)[:2]
    if np.any(nb < 1):
        raise ConvergenceError("ring footpad: no outer contact position on the inner meniscus's depth range")
    rows2 = np.broadcast_to(np.arange(S)[:, None], (S, n))
    valid = col < nb[:, None]
    st = ring.states(Pb[valid], rows2[valid])
    cur = {k: np.zeros((S, n)) for k in st}
    for k, v in st.items():
        cur[k][valid] = v
        # pad each row with its last entry
        cur[k] = np.where(valid, cur[k], cur[k][np.arange(S), nb - 1][:, None])
    rows = np.arange(S)
    k = np.argmax(np.where(valid, cur["force"], -np.inf), axis=1)
    best = {key: cur[key][rows, k].copy() for key in cur}
    inside = (k > 0) & (k < nb - 1)
    w = np.flatnonzero(inside)
    if w.size:
        lo, hi = cur["phi_outer"][w, k[w] - 1], cur["phi_outer"][w, k[w] + 1]
        sub = np.linspace(lo, hi, 9, axis=-1)
        s1 = ring.states(sub.ravel(), np.repeat(w, 9))
        F1 = s1["force"].reshape(-1, 9)
        j = np.clip(np.argmax(F1, axis=1), 1, 7)
        r = np.arange(w.size)[:, None]
        x3 = sub[r, j[:, None] + np.arange(-1, 2)]
        xv, _ = _parabola_vertex(x3, F1[r, j[:, None] + np.arange(-1, 2)])
        h = (hi - lo) / 8.0 / 8.0
        sub2 = xv[:, None] + h[:, None] * np.arange(-2, 3)
        sub2 = np.clip(sub2, lo[:, None], hi[:, None])
        s2 = ring.states(sub2.ravel(), np.repeat(w, 5))
        F2 = s2["force"].reshape(-1, 5)
        j2 = np.clip(np.argmax(F2, axis=1), 1, 3)
        x3 = sub2[r, j2[:, None] + np.arange(-1, 2)]
        ok = (x3[:, 2] > x3[:, 0])
        xv2, _ = _parabola_vertex(np.where(ok[:, None], x3, x3 + np.array([-1e-12, 0, 1e-12])),
                                  F2[r, j2[:, None] + np.arange(-1, 2)])
        s3 = ring.states(xv2, w)
        # the best of all evaluated states (never below the coarse maximum)
        cand_F = np.column_stack([best["force"][w], F1.max(axis=1), F2.max(axis=1), s3["force"]])
        pick = np.argmax(cand_F, axis=1)
        i1_, i2_ = np.argmax(F1, axis=1), np.argmax(F2, axis=1)
        for key in best:
            opts = np.column_stack([best[key][w], s1[key].reshape(-1, 9)[np.arange(w.size), i1_],
                                    s2[key].reshape(-1, 5)[np.arange(w.size), i2_], s3[key]])
            best[key][w] = opts[np.arange(w.size), pick]
    rc_out = Rr + b
    tab = device_table(cur["depth"], cur["force"], cur["surface_tension"], nb, best["depth"], rc_out, points,
                       min_contact_radius)
    res = {"max_force": best["force"], "depth_at_max": best["depth"],
           "surface_tension_at_max": best["surface_tension"], "pressure_at_max": best["pressure"],
           "enclosed_at_max": best["enclosed"], "phi_outer_at_max": best["phi_outer"],
           "phi_inner_at_max": best["phi_inner"], "psi_outer_at_max": best["psi_outer"],
           "psi_inner_at_max": best["psi_inner"],
           "contact_radius_at_max": Rr + b * np.sin(best["phi_outer"]), "starts_deep": cur["depth"][:, 0] > 1e-9}
    out = {key: v.reshape(shape) for key, v in res.items()}
    out["table"] = {key: v.reshape(*shape, v.shape[-1]) for key, v in tab.items()}
    out["limit_force"] = out["table"]["force"][..., -1]
    out["limit_depth"] = out["table"]["depth"][..., -1]
    out["curve"] = {**cur, "n": nb}
    return out
