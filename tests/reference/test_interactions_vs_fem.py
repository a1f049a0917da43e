"""The solved interaction model (floatcalc.core.interactions) against the independent
finite-element reference (tests/reference/fem3d.py: scikit-fem P2 on a graded Triangle mesh,
linearised meniscus with the linearised rod contact-angle condition, or the nonlinear graph
meniscus with the full one). Cases: finite rods 2–40 l_c, a rod beside a ball, two rods in a V.
Crossing rods are refused by the model (tests/reference/test_device_neighbours.py).

Checked: the vertical surface-tension force on the two long sides of a finite rod (θ = 115°,
R = 0.05 l_c, lowest point 0.1 l_c deep: the linear range) for L = 2–40 l_c, with the same end
in both models: a flat end face met at Young's angle ψ_w = θ − π/2 (fem3d ``ends="wall"``, the
slope carried in the linear field as 2 sin(ψ_w/2), the linear solution with the same 2D first
integral, as core.inner2d maps it; with tan ψ_w instead the reference moves by −1.2 % at
L = 2 l_c, the size of the linearisation ambiguity of a 25° end slope) and the side line at the
rod radius (``line_at_radius``). The end faces' own share (chord × sin ψ_w, under 0.07 σ l_c in
all) is not compared: the plan reference cannot draw the chord on a vertical face.

Convergence study (measured; reference error estimate 2e-4 relative, levels 0–1): the model's
sides over the reference at L = 2, 4, 10, 40 l_c are 0.959, 0.976, 0.989, 0.996 on the device's
default mesh (1 panel per l_c, end panels 2R, growth 2, one panel across each end face), and
0.992, 0.995, 0.997, 0.998 on the mesh used here (4 per l_c, 0.25R, growth 1.3, 8 across each
end face), 0.994–0.998 on one twice as fine: the disagreement of the previous comparison (−5 % at
L = 2 l_c) was the reference's end (a stadium whose rounded caps carry the rod condition,
checked below) and the default mesh's coarse ends, which UNDERstate the linear-range force (safe
side; at the limit, where the near-end sections pass their optimum, the default mesh is within
0.01 σ l_c per end of the fine one). The remaining 0.12 % at L = 40 l_c is the exact (nonlinear)
2D section law of the model against the linearised one of the reference.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

import fem3d
from floatcalc.core import interactions as I

TH, R, D = math.radians(115), 0.05, 0.1
FINE = dict(panels_per_lc=4.0, end_panel=0.25, growth=1.3, end_face=8)


def _model_sides(L, **mesh):
    lay = I.Layout([I.RodBody(0.0, 0.0, 0.0, L, R, TH)], **mesh)
    st = lay.solve(np.array([D]))
    n = lay.n_panels
    fst = lay._forces(st.x[:n], lay._local_depth(st.depth, None), st.panel_h, st.panel_psi)[0]
    return float(fst[lay.side].sum()), float(fst[lay.end].sum()), float(st.surface_tension[0])


@pytest.mark.slow
@pytest.mark.parametrize("L", [2.0, 4.0, 10.0, 40.0])
def test_finite_rod_sides_against_the_fem_reference(L):
    g = 2.0 * math.sin(0.5 * (TH - 0.5 * math.pi))
    body = fem3d.rod_body((0.0, 0.0), 0.0, L, R, D, TH, ends="wall", wall_slope=g, line_at_radius=True)
    ref = fem3d.reference([body], levels=(0, 1))
    f, err = float(ref["flux"][0]), float(ref["err_flux"][0])
    assert err < 5e-4 * f
    sides, ends, _ = _model_sides(L, **FINE)
    assert sides == pytest.approx(f, rel=0.01)
    assert 0.0 < ends < 2 * 2 * R  # the end chords pull at most σ per length (PHYSICS.md bound)


@pytest.mark.slow
def test_short_rod_on_the_safe_side_of_a_round_ended_reference():
    # A stadium footprint whose rounded caps carry the rod condition (fem3d's default rod) adds
    # the pull of the caps' contact line; the model's flat end faces carry less: safe side.
    ref = fem3d.reference([fem3d.rod_body((0.0, 0.0), 0.0, 2.0, R, D, TH)], levels=(0, 1))
    f = float(np.atleast_1d(ref["flux"])[0])
    for mesh in ({"panels_per_lc": 2.0}, FINE):
        total = _model_sides(2.0, **mesh)[2]
        assert 0.9 * f <= total <= f * (1 + 1e-9)


def _ball_contact_radius(a, th, D):
    from scipy.optimize import brentq

    from floatcalc.core import round_bodies as rb

    phi = brentq(lambda p: float(rb.ball_state(np.array([p]), a, th)["depth"][0]) - D, 0.3, 3.0)
    return a * math.sin(phi)


@pytest.mark.slow
def test_rod_beside_a_ball_against_the_fem_reference():
    """A 6 l_c rod (R = 0.1 l_c, θ = 120°, lowest point 0.3 l_c deep) and a ball (radius 0.4 l_c,
    θ = 120°, 0.45 l_c deep) whose centre is 1 l_c from the rod's axis (gap about 0.5 l_c), at
    moderate depth, nonlinear reference (fem3d.ball_body: the sphere's own contact-angle law on
    the contact radius the model finds; alone it reproduces the axisymmetric ball to 3e-7).

    Measured: the rod's force within 0.7 %; the ball's 0.35 % below the reference (0.19 % with
    the ball 1.6 l_c from the axis, 0.02 % at 0.4/0.6 l_c depths), with the mode-0 scattering of
    core.interactions (the incoming mean h_in moves the ball's contact depth by κ h_in,
    κ = W(r_c)/I₀(ρ)); taking it as a plain level (κ = 1) put the ball 4.4 / 2.0 / 3.8 % above.
    Asserted at 1.5 % (rod) and 1 % (ball); the issue asks 3 %.
    """
    a, thb, Db = 0.4, math.radians(120), 0.45
    R, th, L, Dr, yb = 0.1, math.radians(120), 6.0, 0.3, 1.0
    lay = I.Layout([I.RodBody(0.0, 0.0, 0.0, L, R, th), I.RoundBody(0.0, yb, "ball", {"radius": a, "theta": thb})],
                   **FINE)
    st = lay.solve(np.array([Dr, Db]))
    rc = _ball_contact_radius(a, thb, float(st.effective_depth[0]))
    ref = fem3d.reference([fem3d.rod_body((0.0, 0.0), 0.0, L, R, Dr, th), fem3d.ball_body((0.0, yb), a, Db, thb, rc)],
                          nonlinear=True, levels=(0, 1))
    f, err = ref["flux"], ref["err_flux"]
    assert np.all(err < 1e-3 * np.abs(f))
    assert st.surface_tension[0] == pytest.approx(f[0], rel=0.015)
    assert st.surface_tension[1] == pytest.approx(f[1], rel=0.01)


@pytest.mark.slow
def test_fem_ball_body_reproduces_the_axisymmetric_ball():
    # Source: floatcalc.core.axisym shooting (through the ball's tabulated law) against the
    # reference's ball condition on its own contact radius: the reference's check before it is
    # used beside a rod.
    a, thb, D = 0.4, math.radians(120), 0.6
    st = I.Layout([I.RoundBody(0.0, 0.0, "ball", {"radius": a, "theta": thb})]).solve(np.array([D]))
    ref = fem3d.reference([fem3d.ball_body((0.0, 0.0), a, D, thb, _ball_contact_radius(a, thb, D))],
                          nonlinear=True, levels=(0, 1))
    assert float(st.surface_tension[0]) == pytest.approx(float(ref["flux"][0]), rel=1e-5)


def _vee(L, angle, gap):
    """Two rods opening from a common apex at ``angle``, their inner end points ``gap`` apart."""
    e0 = 0.5 * gap / math.sin(0.5 * angle)
    out = []
    for h in (0.5 * angle, -0.5 * angle):
        out.append(((e0 + 0.5 * L) * math.cos(h), (e0 + 0.5 * L) * math.sin(h), h))
    return out


@pytest.mark.slow
@pytest.mark.parametrize("nonlinear", [False, True])
def test_non_parallel_rods_against_the_fem_reference(nonlinear):
    """Two 4 l_c rods in a V (60°, inner ends 0.5 l_c apart; R = 0.05 l_c, θ = 115°): the shared
    meniscus lowers each rod's force by 13 % against the rod alone here.

    Linear range (0.1 l_c deep), ends as in the finite-rod check (flat walls, sides compared):
    within 1 % (measured −0.4 %; a 30° V with a 0.3 l_c gap −0.3 %). Moderate depth (0.3 l_c,
    nonlinear reference with the rods' full contact-angle law, its default rounded ends):
    within 3 % and not above the reference (measured −2.1 %; the rounded caps of the reference
    carry more than flat end faces, as for a single rod).
    """
    L, ang, gap, R, th = 4.0, math.radians(60), 0.5, 0.05, math.radians(115)
    D = 0.3 if nonlinear else 0.1
    geo = _vee(L, ang, gap)
    if nonlinear:
        bodies = [fem3d.rod_body((cx, cy), h, L, R, D, th) for cx, cy, h in geo]
    else:
        g = 2.0 * math.sin(0.5 * (th - 0.5 * math.pi))
        bodies = [fem3d.rod_body((cx, cy), h, L, R, D, th, ends="wall", wall_slope=g, line_at_radius=True)
                  for cx, cy, h in geo]
    ref = fem3d.reference(bodies, nonlinear=nonlinear, levels=(0, 1))
    f = np.asarray(ref["flux"])
    assert np.all(np.asarray(ref["err_flux"]) < 1e-4 * f)
    lay = I.Layout([I.RodBody(cx, cy, h, L, R, th) for cx, cy, h in geo], **FINE)
    st = lay.solve(np.array([D, D]))
    if nonlinear:
        ours = st.surface_tension
        assert np.all(ours <= f) and np.all(ours >= 0.97 * f)
    else:
        n = lay.n_panels
        fst = lay._forces(st.x[:n], lay._local_depth(st.depth, None), st.panel_h, st.panel_psi)[0]
        ours = np.bincount(lay.owner[lay.side], fst[lay.side], minlength=2)
        np.testing.assert_allclose(ours, f, rtol=0.01)
