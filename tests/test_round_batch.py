"""Batched ball, pad and pin laws (floatcalc.core.round_batch).

What each comparison proves:

* batch against the scalar path (floatcalc.core.round_bodies.ball_limit / pad_limit /
  pad_curve, and floatcalc.round's public ball / pad / pin): both evaluate the same shipped
  contact-height table, so agreement to 1e-8 proves that the vectorised bookkeeping (branch
  cuts, stages, dropped points, the limit refinement, the device table's cut, first-contact
  start and resampling) reproduces the scalar algorithm; it says nothing about the table.
* batch against the direct axisymmetric solver (floatcalc.core.axisym.solve, independent of the
  table): proves the tabulated force law is accurate where the batch puts the limit.
* published limits: the small-sphere maximum 2πRσ sin²(θ/2) (Scheludko, Toshev & Bojadjiev,
  J. Chem. Soc. Faraday Trans. 1, 72, 2815, 1976; Nutt, Chem. Eng. Sci. 12, 133, 1960) and
  James's thin-fibre meniscus height (J. Fluid Mech. 63, 657, 1974); the contact-line bound of
  PHYSICS.md (vertical surface-tension force ≤ σ × contact-line length).
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from floatcalc.core import round_batch as B
from floatcalc.core import round_bodies as rb

REL = 1e-8


def _ref_table(D, F, Fst, d_lim, rc, points=241):
    """The device's round-element table built step by step with numpy.interp on one curve:
    cut at the limit depth, start at depth 0 if the curve crosses it, resample evenly
    (the steps of floatcalc/device/elements.py, _RoundKind.model, in scaled units)."""
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


def _close(a, b, rel=REL, scale=None):
    s = np.max(np.abs(b)) if scale is None else scale
    assert np.max(np.abs(np.asarray(a) - np.asarray(b))) <= rel * max(s, 1e-300), (a, b)


def _rand(seed, n, lo, hi):
    rng = np.random.default_rng(seed)
    return np.exp(rng.uniform(np.log(lo), np.log(hi), n)), rng


def test_row_interpolation_equals_numpy_interp_row_by_row():
    """_interp_rows against numpy.interp on each row (the reference: numpy itself), on both of
    its paths: finite rows (numpy.interp row by row) and rows with non-finite padding past
    their length (the vectorised formula). Queries hit nodes exactly, fall between them and
    outside the row; one row has a single node."""
    rng = np.random.default_rng(11)
    S, W, Q = 40, 30, 25
    X = np.cumsum(rng.uniform(1e-3, 1.0, (S, W)), axis=1) - 5.0
    n = rng.integers(2, W + 1, S)
    n[0] = 1
    T = (rng.normal(size=(S, W)) * 1e3, rng.normal(size=(S, W)))
    xq = rng.uniform(-6.0, X[:, -1:] + 1.0, (S, Q))
    for i in range(S):
        xq[i, :4] = X[i, rng.integers(0, n[i], 4)]
    xq = np.sort(xq, axis=1)
    padded = X.copy()
    padded[np.arange(W)[None, :] >= n[:, None]] = np.nan
    for rows in (X, padded):
        for q in (xq, xq[:, 5:6]):   # many queries a row, and one
            got = B._interp_rows(q, rows, T, n)
            for o, Ti in zip(got, T):
                ref = np.array([np.interp(q[i], X[i, :n[i]], Ti[i, :n[i]]) for i in range(S)])
                assert np.array_equal(o, ref)


def test_compact_keeps_each_rows_entries_in_order_then_its_last():
    """_compact against boolean selection row by row: the kept entries in their order, then
    copies of the last kept entry (of the first entry when a row keeps none)."""
    rng = np.random.default_rng(12)
    for S, W, p in ((1, 1, 0.5), (7, 13, 0.0), (30, 50, 0.3), (30, 50, 0.9), (5, 40, 1.0)):
        mask = rng.random((S, W)) < p
        a, b = rng.normal(size=(S, W)), rng.integers(0, 9, (S, W))
        n, ca, cb = B._compact(mask, a, b)
        for i in range(S):
            k = int(mask[i].sum())
            assert n[i] == k
            for src, out in ((a, ca), (b, cb)):
                kept = src[i][mask[i]] if k else src[i][:1]
                assert np.array_equal(out[i], np.concatenate([kept, np.repeat(kept[-1], W - kept.size)]))


def test_ball_batch_equals_scalar_path_on_random_designs():
    R, rng = _rand(11, 40, 1e-3, 30.0)
    th = rng.uniform(0.0, math.pi, R.size)
    th[:4] = [0.0, math.pi, math.pi / 2, math.radians(179)]
    out = B.ball_laws(R, th)
    for i in range(R.size):
        best, cur = rb.ball_limit(R[i], th[i])
        assert out["max_force"][i] == pytest.approx(best["force"], rel=REL)
        assert out["depth_at_max"][i] == pytest.approx(best["depth"], rel=REL, abs=1e-12)
        assert out["contact_radius_at_max"][i] == pytest.approx(best["rc"], rel=REL, abs=1e-12)
        assert bool(out["submerged"][i]) == (best["phi"] >= math.pi - 1e-9)
        g, f, h = _ref_table(cur["depth"], cur["force"], cur["surface_tension"], best["depth"], best["rc"])
        _close(out["table"]["depth"][i], g)
        _close(out["table"]["force"][i], f)
        _close(out["table"]["contact"][i], h)


def test_pad_batch_equals_scalar_path_on_random_designs():
    a, rng = _rand(12, 40, 1e-4, 30.0)
    t = a * np.exp(rng.uniform(np.log(0.01), np.log(3.0), a.size))
    th = rng.uniform(0.0, math.pi, a.size)
    th[:4] = [0.0, math.pi / 2, math.radians(100), math.radians(175)]
    t[4] = 1e-3 * a[4]  # thin wetted pad: the line starts on the top edge
    th[4] = math.radians(40)
    out = B.pad_laws(a, t, th)
    for i in range(a.size):
        best, cur = rb.pad_limit(a[i], t[i], th[i])
        assert out["max_force"][i] == pytest.approx(best["force"], rel=REL)
        assert out["depth_at_max"][i] == pytest.approx(best["depth"], rel=REL, abs=1e-12)
        assert int(out["stage_at_max"][i]) == int(best["stage"])
        n = out["curve"]["n"][i]
        np.testing.assert_allclose(out["curve"]["depth"][i, :n], cur["depth"], rtol=REL, atol=1e-14)
        g, f, h = _ref_table(cur["depth"], cur["force"], cur["surface_tension"], best["depth"], a[i])
        _close(out["table"]["depth"][i], g)
        _close(out["table"]["force"][i], f)
        _close(out["table"]["contact"][i], h)


def test_pin_batch_equals_scalar_curve_cut_at_its_length():
    b, rng = _rand(13, 30, 1e-4, 10.0)
    L = np.exp(rng.uniform(np.log(0.01), np.log(10.0), b.size))
    th = rng.uniform(0.0, math.pi, b.size)
    out = B.pin_laws(b, L, th)
    for i in range(b.size):
        cur = rb.pad_curve(b[i], math.inf, th[i], depth_max=L[i])
        g, f, h = _ref_table(cur["depth"], cur["force"], cur["surface_tension"], min(L[i], cur["depth"][-1]), b[i])
        _close(out["table"]["depth"][i], g)
        _close(out["table"]["force"][i], f)
        _close(out["table"]["contact"][i], h)
    assert np.allclose(out["limit_depth"], L, rtol=1e-12)


def test_batch_matches_public_round_functions_in_si():
    """floatcalc.round (units, liquid, validation) gives the same limit as the batch after scaling."""
    import floatcalc as fc
    from floatcalc import round as rd

    liq = fc.water()
    lc, fs = liq.lc, liq.sigma * liq.lc
    R = np.array([0.2e-3, 1.0e-3, 3.0e-3])
    th = np.radians([150.0, 100.0, 60.0])
    bl = B.ball_laws(R / lc, th)
    pl = B.pad_laws(R / lc, 0.1 * R / lc, th)
    for i in range(R.size):
        b = rd.ball(R[i], th[i], material_density=7850.0)
        p = rd.pad(R[i], 0.1 * R[i], th[i], material_density=7850.0)
        assert bl["max_force"][i] * fs == pytest.approx(b.max_force.to("N").magnitude, rel=REL)
        assert bl["depth_at_max"][i] * lc == pytest.approx(b.depth_at_max.to("m").magnitude, rel=REL)
        assert pl["max_force"][i] * fs == pytest.approx(p.max_force.to("N").magnitude, rel=REL)
        assert pl["depth_at_max"][i] * lc == pytest.approx(p.depth_at_max.to("m").magnitude, rel=REL)


@pytest.mark.slow
def test_ball_limit_against_the_direct_solver():
    """Independent of the table: the force law with contact heights from the direct shooting
    solver, maximised on a fine grid around the batch's φ, agrees with the batch's limit."""
    from floatcalc.core.axisym import contact_height_direct

    R, rng = _rand(14, 4, 1e-2, 10.0)
    th = rng.uniform(math.radians(60), math.radians(175), R.size)
    out = B.ball_laws(R, th)
    for i in range(R.size):
        phi = out["phi_at_max"][i] + np.linspace(-0.01, 0.01, 21)
        rc, psi = R[i] * np.sin(phi), phi + th[i] - math.pi
        d = -contact_height_direct(rc, psi)
        c = np.cos(phi)
        F = 2 * math.pi * rc * np.sin(psi) + math.pi / 3 * R[i] ** 3 * (1 - c) ** 2 * (2 + c) + math.pi * rc**2 * d
        # table accuracy ≤ 1e-6 relative in z_c (axisym_table), the grid's spacing adds ≲ 1e-7
        assert out["max_force"][i] == pytest.approx(F.max(), rel=2e-6)


def test_small_sphere_limit():
    """2πRσ sin²(θ/2) as R/l_c → 0 (Scheludko et al. 1976; Nutt 1960); at R = 1e-3 l_c the
    gravity correction is ~1e-5 (measured), tolerance 1e-4."""
    th = np.radians([30.0, 90.0, 150.0, 180.0])
    out = B.ball_laws(1e-3, th)
    np.testing.assert_allclose(out["max_force"], 2 * np.pi * 1e-3 * np.sin(th / 2) ** 2, rtol=1e-4)


def test_thin_pin_meniscus_height_james():
    """h = b cos θ [ln(4 l_c / (b (1 + sin θ))) − γ_E] for b ≪ l_c (James 1974); tolerance 1e-4
    at b = 1e-3 l_c (next-order terms O(b² ln b))."""
    b, th = 1e-3, np.radians([20.0, 60.0, 80.0])
    out = B.pin_laws(b, 1.0, th)
    james = b * np.cos(th) * (np.log(4 / (b * (1 + np.sin(th)))) - np.euler_gamma)
    np.testing.assert_allclose(out["meniscus_height"], james, rtol=1e-4)


def test_contact_line_bound_on_every_table_point():
    """PHYSICS.md bound: the surface-tension part never exceeds σ × the contact-line length."""
    R, rng = _rand(15, 30, 1e-3, 10.0)
    th = rng.uniform(0.0, math.pi, R.size)
    for out, rc_max in ((B.ball_laws(R, th), R), (B.pad_laws(R, 0.2 * R, th), R), (B.pin_laws(R, 3 * R, th), R)):
        st = out["table"]["surface_tension"]
        assert np.all(np.abs(st) <= 2 * np.pi * rc_max[:, None] * (1 + 1e-12))
        assert np.all(np.diff(out["table"]["depth"], axis=1) >= 0)
        assert np.all(np.isfinite(out["table"]["force"]))


def test_shapes_and_broadcasting():
    one = B.ball_laws(0.5, math.radians(120))
    assert one["max_force"].shape == () and one["table"]["force"].shape == (241,)
    grid = B.pad_laws(np.array([[0.5], [1.0]]), 0.05, np.radians([100.0, 150.0]))
    assert grid["max_force"].shape == (2, 2) and grid["table"]["depth"].shape == (2, 2, 241)
    ref = B.pad_laws(1.0, 0.05, math.radians(150))
    assert grid["max_force"][1, 1] == ref["max_force"]


# ---------------------------------------------------------------------------------------------
# Rings (floatcalc.core.ring_batch over the tables of floatcalc.core.ring_table)


def test_inner_and_extended_outer_tables_against_the_direct_solver():
    """Tables of ring_table against fresh direct shooting (core.axisym.solve) off the grid
    (scripts/build_ring_table.py checks 1000 points: 8.5e-10 inner, 8e-13 outer extension)."""
    from floatcalc.core import axisym, ring_table

    rng = np.random.default_rng(21)
    r = np.exp(rng.uniform(np.log(0.01), np.log(300.0), 6))
    p = rng.uniform(-math.pi + 1e-6, math.pi - 1e-6, 6)
    p[:2] = [3.14, -3.13]  # near the top of the wire, where the enclosed cap is steepest
    np.testing.assert_allclose(ring_table.inner_height(r, p), axisym.solve(r, p, side="inner")["height"], rtol=1e-6)
    r2 = np.exp(rng.uniform(np.log(100.0), np.log(300.0), 3))
    p2 = rng.uniform(-3.1, 3.1, 3)
    np.testing.assert_allclose(ring_table.outer_height(r2, p2), axisym.solve(r2, p2)["height"], rtol=1e-6)
    # cap of the exterior table, 3.1 < |ψ| ≤ π: absolute 1e-6 l_c (z_c → 0 towards π for thin
    # bodies; the solver's own uncertainty there is up to 5e-5 l_c, core.axisym.solve)
    r3 = np.array([0.03, 0.3, 0.64, 5.0, 120.0])
    p3 = np.array([3.12, -3.14, 3.1355, 3.1415, -3.13])
    np.testing.assert_allclose(ring_table.outer_height(r3, p3), axisym.solve(r3, p3)["height"], rtol=0, atol=1e-6)


@pytest.mark.slow
def test_ring_fast_path_against_direct_inner_solves():
    """floatcalc.core.round_bodies.ring_limit shoots the enclosed meniscus directly at every
    step (independent of the inner table); the limit force agrees to 1e-7 (measured ≤ 4e-10 on
    these rings, ≤ 1e-8 over the whole range by scripts/check_ring_batch.py). The depth at the
    limit sits on a flat maximum: a shift of 1e-5 in depth changes the force by ~1e-10, so it is
    compared to 1e-4."""
    from floatcalc.core import ring_batch as RB

    Rr = np.array([2.3, 0.1])
    b = np.array([0.074, 0.01])
    th = np.radians([150.0, 60.0])
    out = RB.ring_laws(Rr, b, th)
    for i in range(Rr.size):
        best, cur = rb.ring_limit(Rr[i], b[i], th[i])
        assert out["max_force"][i] == pytest.approx(best["force"], rel=1e-7)
        assert out["max_force"][i] >= best["force"] * (1 - 1e-12)  # refinement never lower
        assert out["depth_at_max"][i] == pytest.approx(best["depth"], rel=1e-4)
        assert out["phi_inner_at_max"][i] == pytest.approx(best["phi_inner"], rel=1e-3)
        n = out["curve"]["n"][i]
        assert n == cur["depth"].size
        np.testing.assert_allclose(out["curve"]["force"][i, :n], cur["force"], rtol=1e-7)


def test_ring_enclosed_weight_keller_against_direct_volume():
    """Keller (Phys. Fluids 10, 3009, 1998): the inner line's pull 2π r_i sin ψ_i equals the
    weight of the depressed liquid inside the ring, here the volume integrated by the direct
    solver along its shot (independent of the table and of the pull)."""
    from floatcalc.core import axisym
    from floatcalc.core import ring_batch as RB

    out = RB.ring_laws(np.array([2.3, 0.5]), np.array([0.074, 0.1]), np.radians([150.0, 120.0]))
    rci = np.array([2.3, 0.5]) - np.array([0.074, 0.1]) * np.sin(out["phi_inner_at_max"])
    vol = axisym.solve(rci, out["psi_inner_at_max"], side="inner")["volume"]
    np.testing.assert_allclose(out["enclosed_at_max"], vol, rtol=1e-6)


def test_large_ring_tends_to_the_2d_rod_law():
    """A ring much larger than l_c carries the 2D limit per length of a rod of the wire's
    radius on each unit of its centre line (Vella, Lee & Kim, Langmuir 22, 5979, 2006;
    floatcalc.core.rod2d); the difference falls like 1/R_r² (measured 2e-5 at R_r = 100)."""
    from floatcalc.core import ring_batch as RB
    from floatcalc.core import rod2d

    b, th = 0.5, math.radians(120)
    rod = float(rod2d.limit_force(b, th)["force"])
    err = [abs(float(RB.ring_laws(R, b, th)["max_force"]) / (2 * math.pi * R) / rod - 1) for R in (30.0, 100.0)]
    assert err[1] < 1e-4 and err[1] < err[0] / 5


def test_ring_contact_line_bound_and_table():
    from floatcalc.core import ring_batch as RB

    rng = np.random.default_rng(22)
    Rr = np.exp(rng.uniform(np.log(0.05), np.log(100.0), 12))
    b = np.maximum(Rr * np.exp(rng.uniform(np.log(1e-3), np.log(0.5), 12)), 1e-4)
    th = rng.uniform(0.0, math.pi, 12)
    out = RB.ring_laws(Rr, b, th)
    # PHYSICS.md: vertical surface-tension force ≤ σ × contact-line length (both lines)
    assert np.all(np.abs(out["surface_tension_at_max"]) <= 2 * np.pi * (2 * Rr) * (1 + 1e-12))
    assert np.all(out["max_force"] >= out["table"]["force"].max(axis=-1) * (1 - 1e-9))
    assert np.all(np.diff(out["table"]["depth"], axis=-1) >= 0)
    one = RB.ring_laws(Rr[3], b[3], th[3])
    assert float(one["max_force"]) == pytest.approx(out["max_force"][3], rel=1e-12)


def test_edges_from_the_cap_table_match_the_direct_path():
    """θ within 2.4° of 0 or 180°: contact inclinations beyond the shipped table. ``edges="table"``
    reads them from ring_table's cap (checked there against the direct solver); the limit agrees
    with the scalar path, which shoots them directly, to 1e-6."""
    R = np.array([0.5, 2.0, 0.5])
    th = np.radians([179.0, 178.5, 0.5])
    fast = B.ball_laws(R, th, edges="table")
    for i in range(R.size):
        best, _ = rb.ball_limit(R[i], th[i])
        assert fast["max_force"][i] == pytest.approx(best["force"], rel=1e-6)
    a, t, thp = np.array([0.3, 1.5]), np.array([0.03, 0.2]), np.radians([179.5, 178.0])
    fp = B.pad_laws(a, t, thp, edges="table")
    for i in range(a.size):
        best, _ = rb.pad_limit(a[i], t[i], thp[i])
        assert fp["max_force"][i] == pytest.approx(best["force"], rel=1e-6)
        assert fp["depth_at_max"][i] == pytest.approx(best["depth"], rel=1e-5)
    with pytest.raises(ValueError):
        B.ball_laws(0.5, 2.0, edges="guess")
