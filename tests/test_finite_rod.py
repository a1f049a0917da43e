"""End effects of finite rods (floatcalc.core.finite_rod).

Independent checks: a finite-difference solution of the linearised meniscus ∇²h = h round a
stadium-shaped contact line (scipy.sparse, built here), the small- and large-argument
expansions of K₀ and K₁ (Abramowitz & Stegun, Handbook of Mathematical Functions, 9.6.8,
9.6.13 and 9.7.2), and the 2D rod law of floatcalc.core.rod2d in the long-rod limit.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
import scipy.sparse as sp
import scipy.sparse.linalg as spl

from floatcalc.core import finite_rod, rod2d
from floatcalc.rods import rod

EULER_GAMMA = 0.5772156649015329


def _stadium_area(L, w, dx=0.025, D=7.0):
    """∫ h dA outside a stadium (half-length L/2 + caps of radius w), h = 1 on it, h → 0 far away.

    Quarter domain with mirror (Neumann) conditions on the symmetry axes, h = 0 at distance D,
    5-point Laplacian on a cell-centred grid; cells whose centre lies in the stadium are fixed
    at h = 1 (staircase boundary, first-order accurate).
    """
    nx, ny = int(round((L / 2 + D) / dx)), int(round(D / dx))
    x = (np.arange(nx) + 0.5) * dx
    y = (np.arange(ny) + 0.5) * dx
    X, Y = np.meshgrid(x, y, indexing="ij")
    inside = ((X <= L / 2) & (Y <= w)) | ((X - L / 2) ** 2 + Y ** 2 <= w * w)
    idx = np.arange(nx * ny).reshape(nx, ny)
    rows, cols = [], []
    for a, b in (((slice(1, None), slice(None)), (slice(None, -1), slice(None))),
                 ((slice(None, -1), slice(None)), (slice(1, None), slice(None))),
                 ((slice(None), slice(1, None)), (slice(None), slice(None, -1))),
                 ((slice(None), slice(None, -1)), (slice(None), slice(1, None)))):
        rows.append(idx[a].ravel())
        cols.append(idx[b].ravel())
    rows, cols = np.concatenate(rows), np.concatenate(cols)
    diag = np.full(nx * ny, -4.0 / dx**2 - 1.0)
    diag[idx[0, :]] += 1.0 / dx**2
    diag[idx[:, 0]] += 1.0 / dx**2
    A = sp.csr_matrix((np.full(rows.size, 1.0 / dx**2), (rows, cols)), shape=(nx * ny,) * 2) + sp.diags(diag)
    free = ~inside.ravel()
    A = sp.diags(free.astype(float)) @ A + sp.diags((~free).astype(float))
    h = spl.spsolve(A.tocsc(), (~free).astype(float))
    return 4.0 * h[free].sum() * dx * dx


@pytest.mark.slow
@pytest.mark.parametrize("w", [0.5, 0.2])
def test_end_term_matches_finite_difference_meniscus(w):
    """Displaced meniscus area round a stadium: per length 2 h0 and one end π w K1/K0 (model).

    Tolerance: 3 % on the per-length part and 8 % on the end term, from the staircase boundary
    of the grid (its per-length error, about 1.5 %, shows the grid's own accuracy) and from the
    model's patching of 2D sides and axisymmetric caps.
    """
    a4 = _stadium_area(4.0, w)
    a8 = _stadium_area(8.0, w)
    per_length = (a8 - a4) / 4.0
    end = (a4 - 4.0 * per_length) / 2.0
    assert per_length == pytest.approx(2.0, rel=0.03)
    # model: one end adds 2 ℓ_e(w) of displaced area per unit contact depth
    assert end == pytest.approx(2.0 * float(finite_rod.end_length(w)), rel=0.08)


def test_end_length_small_and_large_width_asymptotes():
    """K0(w) ≈ −ln(w/2) − γ, K1(w) ≈ 1/w (A&S 9.6.13, 9.6.8); K1/K0 → 1 + 1/(2w) (A&S 9.7.2)."""
    w = 1e-4
    assert float(finite_rod.end_length(w)) == pytest.approx(0.5 * math.pi / (math.log(2 / w) - EULER_GAMMA), rel=1e-3)
    w = 200.0
    assert float(finite_rod.end_length(w)) == pytest.approx(0.5 * math.pi * w * (1 + 0.5 / w), rel=1e-4)


@pytest.mark.parametrize("R, theta_deg", [(0.05, 115.0), (0.2, 150.0)])
def test_long_rods_approach_L_times_2d(R, theta_deg):
    th = math.radians(theta_deg)
    f2d = float(rod2d.limit_force(R, th)["force"])
    for L in (1e3, 1e4):
        assert finite_rod.limit(R, th, L)["force"] / L == pytest.approx(f2d, rel=20.0 / L)


@pytest.mark.parametrize("R, theta_deg, L", [(0.055, 115.0, 7.3), (0.09, 150.0, 7.3), (0.02, 150.0, 2.2),
                                           (0.18, 100.0, 3.7), (0.37, 120.0, 11.0)])
def test_ends_add_nothing_and_overstate_the_solved_ends_by_little(R, theta_deg, L):
    """Safe side of the rod law's ends, against two independent values: the exact 2D law
    (Vella, Lee & Kim, Langmuir 22, 5979, 2006; core.rod2d) times L, and the solved 3D meniscus
    of the same rod with flat end faces (core.interactions, inner–outer matching; itself checked
    against the finite-element reference, tests/reference/test_interactions_vs_fem.py).

    The ends of a depressed rod add nothing (F = f_2D L to the grid's 1e-9), and the rod law
    exceeds the solved limit by at most 0.06 σ l_c per end (the deficit of the solved ends,
    stated in core.finite_rod.end_force; measured 0.01–0.05).
    """
    from floatcalc.core import interactions as ia

    th = math.radians(theta_deg)
    f2d = float(rod2d.limit_force(R, th)["force"])
    law = finite_rod.limit(R, th, L)
    assert law["end_part"] == 0.0
    assert law["force"] == pytest.approx(f2d * L, rel=1e-9)
    solved = ia.isolated_limit(ia.RodBody(0.0, 0.0, 0.0, L, R, th), 1.0)["force"]
    assert -1e-6 <= law["force"] - solved <= 2 * 0.06


def test_rod_warning_names_end_effects():
    r = rod("0.15 mm", "10 mm", "115 deg")
    assert any("rod ends" in w and "%" in w for w in r.warnings)


@settings(max_examples=200, deadline=None)
@given(R=st.floats(0.01, 1.0), theta=st.floats(60.0, 179.0), L=st.floats(2.0, 40.0))
def test_surface_tension_force_within_the_contact_line_bound(R, theta, L):
    # PHYSICS.md bound: the vertical surface-tension force on a body is at most σ times the
    # length of its contact line; for a flat-ended rod that is 2L + 4R sin φ (two side lines
    # and the chord across each end face), in σ l_c here.
    th = math.radians(theta)
    lim = finite_rod.limit(R, th, L)
    f_st, _, _ = rod2d.force_parts(lim["phi"], R, th)
    st_force = float(f_st) * L + lim["end_part"]
    assert st_force <= (2 * L + 4 * R * math.sin(lim["phi"])) * (1 + 1e-12)
    # and the ends alone within their chords
    assert abs(lim["end_part"]) <= 4 * R * math.sin(lim["phi"]) * (1 + 1e-12)
