"""The finite-element meniscus reference (tests/reference/fem3d.py) against closed forms.

fem3d is an independent method (a general finite-element library on an unstructured plan mesh)
that later cross-checks use where no published value exists; these tests establish that it
reproduces the cases where an exact answer is known. Each check names its source and says why
its tolerance is what it is. Scaled variables: lengths in l_c, forces in σ l_c.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.optimize import brentq
from scipy.special import i0e, i1e, k0, k0e, k1e

import fem3d as F
from floatcalc.core import axisym as ax
from floatcalc.core import parallel2d as p2


def _psi_axisym(r_c: float, h_c: float, side: str = "outer") -> float:
    """Contact inclination ψ at which floatcalc's axisymmetric shooting solver puts the contact
    line of radius r_c at depth h_c (height −h_c): inverted by root finding."""
    return brentq(lambda p: float(ax.solve(r_c, p, side=side)["height"]) + h_c, 1e-6, 1.4, xtol=1e-14)


# ----------------------------------------------------------------------------- axisymmetric
@pytest.mark.parametrize("r_c", [0.3, 1.0, 3.0])
def test_disc_linear_force_and_profile(r_c):
    """Linearised meniscus outside a disc contact line at depth h_c: h = h_c K₀(r)/K₀(r_c), force
    2π r_c h_c K₁(r_c)/K₀(r_c) (modified Bessel solution of ∇²h = h, e.g. Abramowitz & Stegun
    9.6). Tolerances from the refinement study (module report): the flux and Keller values
    converge as ~h⁴ and sit below 1e-6 relative at level 1, the direct contact-line integral as
    h² (about 1e-4 at level 1); profile values at 5e-4 (elements grow to 0.3 l_c by r − r_c = 2)."""
    h_c = 0.1
    s = F.solve([F.dirichlet_body(F.disc(0.0, 0.0, r_c), h_c=h_c)], level=1)
    exact = 2 * math.pi * r_c * h_c * k1e(r_c) / k0e(r_c)
    assert s.flux[0] == pytest.approx(exact, rel=1e-5)
    assert s.keller == pytest.approx(exact, rel=1e-5)
    assert s.line[0] == pytest.approx(exact, rel=5e-4)
    r = r_c + np.array([0.01, 0.2, 0.5, 1.0, 2.0])
    t = 0.7
    got = s.evaluate(r * np.cos(t), r * np.sin(t))
    np.testing.assert_allclose(got, h_c * k0(r) / k0(r_c), rtol=5e-4)


@pytest.mark.slow
def test_disc_refinement_order():
    """Convergence under uniform refinement (three levels): the direct contact-line integral must
    converge at least as h^1.5 towards the closed form (P2 elements, curved boundary: h² expected),
    and the error estimate of :func:`fem3d.reference` must bound the true error (closed form as
    in the test above). Error estimate: the change between the last two levels."""
    h_c, r_c = 0.1, 1.0
    ref = F.reference([F.dirichlet_body(F.disc(0.0, 0.0, r_c), h_c=h_c)], levels=(0, 1, 2))
    exact = 2 * math.pi * r_c * h_c * k1e(r_c) / k0e(r_c)
    errs = [abs(s.line[0] - exact) for s in ref["solutions"]]
    assert math.log2(errs[0] / errs[1]) > 1.5 and math.log2(errs[1] / errs[2]) > 1.5
    assert ref["order_line"][0] > 1.5
    assert abs(ref["line"][0] - exact) <= ref["err_line"][0]
    assert abs(ref["flux"][0] - exact) <= ref["err_flux"][0] + 1e-9 * exact


@pytest.mark.slow
@pytest.mark.parametrize("r_c,h_c", [(1.0, 0.5), (0.5, 0.3)])
def test_disc_nonlinear_vs_axisymmetric_shooting(r_c, h_c):
    """Nonlinear meniscus around a disc contact line at depth h_c against floatcalc's own
    axisymmetric shooting solver (floatcalc.core.axisym: arclength ODE, RK4 + Richardson,
    ~1e-11): an independent method. The force 2π r_c sin ψ must match the finite-element flux
    and Keller volume to 2e-5 (their measured level-1 error ~1e-6) and the contact-line integral to
    1e-3 (h² convergence); the shooting solver's own displaced volume must match too."""
    psi = _psi_axisym(r_c, h_c)
    force = 2 * math.pi * r_c * math.sin(psi)
    s = F.solve([F.dirichlet_body(F.disc(0.0, 0.0, r_c), h_c=h_c)], level=1, nonlinear=True)
    assert s.flux[0] == pytest.approx(force, rel=2e-5)
    assert s.keller == pytest.approx(force, rel=2e-5)
    assert s.keller == pytest.approx(float(ax.solve(r_c, psi)["volume"]), rel=2e-5)
    assert s.line[0] == pytest.approx(force, rel=1e-3)
    assert s.max_slope == pytest.approx(math.tan(psi), rel=2e-3)
    assert s.warnings == ()  # ψ ≤ 42° here: inside the graph formulation's stated range


def test_validity_warnings():
    """Outside its validity the reference says so: a linearised solve with steep contact-line
    slopes (h_c = 0.8 on a disc of radius 0.3: slope h_c K₁/K₀(0.3) ≈ 1.78) carries a warning."""
    s = F.solve([F.dirichlet_body(F.disc(0.0, 0.0, 0.3), h_c=0.8)], level=0)
    assert s.max_slope == pytest.approx(0.8 * k1e(0.3) / k0e(0.3), rel=1e-2) and any("linearised" in w for w in s.warnings)


def test_annulus_linear_closed_form():
    """Ring footpad (annulus r_i..r_o, pinned at depth h_c on both edges): inside, the regular
    solution h = h_c I₀(r)/I₀(r_i) (force 2π r_i h_c I₁/I₀(r_i)); outside, the K₀ solution as for
    the disc. The whole meniscus includes the enclosed free surface (Keller 1998)."""
    r_i, r_o, h_c = 1.5, 2.0, 0.1
    s = F.solve([F.dirichlet_body(F.annulus(0.3, -0.2, r_i, r_o), h_c=h_c)], level=1)
    exact = 2 * math.pi * h_c * (r_i * i1e(r_i) / i0e(r_i) + r_o * k1e(r_o) / k0e(r_o))
    assert s.flux[0] == pytest.approx(exact, rel=1e-5)
    assert s.keller == pytest.approx(exact, rel=1e-5)
    assert s.line[0] == pytest.approx(exact, rel=5e-4)
    assert s.evaluate(np.array([0.3]), np.array([-0.2]))[0] == pytest.approx(h_c / i0e(r_i) * math.exp(-r_i), rel=1e-4)


@pytest.mark.slow
def test_annulus_nonlinear_vs_axisymmetric_shooting():
    """Nonlinear ring footpad against floatcalc.core.axisym on both sides (side="inner" for the
    enclosed meniscus, "outer" outside): total force 2π (r_i sin ψ_i + r_o sin ψ_o)."""
    r_i, r_o, h_c = 1.0, 1.4, 0.4
    psi_i = _psi_axisym(r_i, h_c, side="inner")
    psi_o = _psi_axisym(r_o, h_c)
    exact = 2 * math.pi * (r_i * math.sin(psi_i) + r_o * math.sin(psi_o))
    s = F.solve([F.dirichlet_body(F.annulus(0.0, 0.0, r_i, r_o), h_c=h_c)], level=1, nonlinear=True)
    assert s.flux[0] == pytest.approx(exact, rel=2e-5)
    assert s.keller == pytest.approx(exact, rel=2e-5)
    assert s.line[0] == pytest.approx(exact, rel=1e-3)


# ----------------------------------------------------------------------------- 2D limits
def _per_length(bodies_of, lengths, **kw):
    """Force per unit length of long bodies from the difference of two lengths (the end
    contributions cancel; what remains decays like e^{−L})."""
    a = F.solve(bodies_of(lengths[0]), **kw)
    b = F.solve(bodies_of(lengths[1]), **kw)
    dL = lengths[1] - lengths[0]
    return (b.flux - a.flux) / dL, (b.line - a.line) / dL, b


@pytest.mark.parametrize("nonlinear,h_c", [(False, 0.3), pytest.param(True, 0.6, marks=pytest.mark.slow)])
def test_long_strip_two_flat_walls(nonlinear, h_c):
    """A long strip footprint pinned at depth h_c: far from its ends each long side is a flat wall.
    Linear: h = h_c e^{−n}, force per length per side h_c. Nonlinear: first integral of the 2D
    Young–Laplace equation, h_c = 2 sin(ψ/2), force per length per side sin ψ (PHYSICS.md; de
    Gennes, Brochard-Wyart & Quéré, Capillarity and Wetting Phenomena, 2004). Per-length values
    from lengths 6 and 12 (end-to-end coupling ~e^{−6}): flux to 1e-4, contact-line integral 1e-3."""
    w = 0.25
    exact = 2 * (math.sin(2 * math.asin(h_c / 2)) if nonlinear else h_c)
    fl, li, big = _per_length(lambda L: [F.dirichlet_body(F.stadium(0.4, -0.3, 0.5, L, w), h_c=h_c)],
                              (6.0, 12.0), level=0, nonlinear=nonlinear, h_line=0.05)
    assert fl[0] == pytest.approx(exact, rel=1e-4)
    assert li[0] == pytest.approx(exact, rel=1e-3)
    if not nonlinear:  # profile across the mid-length of the long strip
        n = np.array([0.1, 0.5, 1.0])
        hd = 0.5
        x = 0.4 - math.sin(hd) * (w + n)
        y = -0.3 + math.cos(hd) * (w + n)
        np.testing.assert_allclose(big.evaluate(x, y), h_c * np.exp(-n), rtol=3e-3)


def _gap_psi(h_c: float, gap: float) -> float:
    """Inner contact inclination of a symmetric 2D gap of width ``gap`` between two contact lines
    at depth h_c: turning-point integral h_c² − h_m² = 2(1 − cos ψ) with the distance to mid-gap
    X(ψ, h_m) = gap/2 (floatcalc.core.parallel2d.gap_distance; Vella, Lee & Kim, Langmuir 22,
    5979, 2006, treat the pair)."""
    top = 2 * math.asin(h_c / 2)

    def f(ps):
        hm = math.sqrt(max(h_c * h_c - 4 * math.sin(ps / 2) ** 2, 0.0))
        return float(p2.gap_distance(ps, hm)) - gap / 2

    return brentq(f, 1e-12, top * (1 - 1e-13), xtol=1e-15)


@pytest.mark.parametrize("nonlinear,h_c,gap", [
    (False, 0.3, 1.0), (False, 0.3, 0.5), pytest.param(True, 0.4, 1.0, marks=pytest.mark.slow)])
def test_two_parallel_strips_gap(nonlinear, h_c, gap):
    """Two long parallel strips pinned at depth h_c, gap ``gap`` between the facing contact lines.
    Per length per strip: outer side as a flat wall; inner side linear h_c tanh(gap/2) (from
    h = h_c cosh(x)/cosh(gap/2)), nonlinear sin ψ_i from the exact 2D turning-point solution.
    Flux to 1e-4 (per-length by the difference of lengths 6 and 12); contact-line integral 1e-3."""
    w = 0.2
    y = gap / 2 + w

    def bodies(L):
        return [F.dirichlet_body(F.stadium(0.0, y, 0.0, L, w), h_c=h_c),
                F.dirichlet_body(F.stadium(0.0, -y, 0.0, L, w), h_c=h_c)]

    if nonlinear:
        exact = math.sin(2 * math.asin(h_c / 2)) + math.sin(_gap_psi(h_c, gap))
    else:
        exact = h_c * (1 + math.tanh(gap / 2))
    fl, li, _ = _per_length(bodies, (6.0, 12.0), level=0, nonlinear=nonlinear, h_line=0.05)
    np.testing.assert_allclose(fl, exact, rtol=1e-4)
    np.testing.assert_allclose(li, exact, rtol=1e-3)


def test_gap_inclination_linear_limit():
    """The turning-point root used above reduces, for small depth, to the linear tanh(gap/2)."""
    h_c, gap = 1e-4, 1.3
    assert math.sin(_gap_psi(h_c, gap)) == pytest.approx(h_c * math.tanh(gap / 2), rel=1e-6)


# ----------------------------------------------------------------------------- Keller
@pytest.mark.parametrize("case,nonlinear", [
    pytest.param("cross", False, marks=pytest.mark.slow), ("rod_and_disc", False),
    pytest.param("three_rods", False, marks=pytest.mark.slow),
    pytest.param("cross", True, marks=pytest.mark.slow),
    pytest.param("rod_and_disc", True, marks=pytest.mark.slow),
])
def test_keller_volume_equals_contact_line_force(case, nonlinear):
    """Keller's theorem (Phys. Fluids 10, 3009, 1998): the total vertical surface-tension force on
    the bodies equals the volume displaced by the whole meniscus, for the nonlinear problem too.
    Here (a) Σ∮ ∂ₙh/q ds from the contact-line gradients and (b) ∫∫ h dA are computed
    independently; they must agree to the discretisation error, estimated from two levels."""
    h_c = 0.2 if nonlinear else 0.1
    if case == "cross":
        bodies = [F.dirichlet_body(F.stadium(0, 0, 0.0, 4.0, 0.15), F.stadium(0.5, 0, 1.2, 3.0, 0.15), h_c=h_c)]
    elif case == "rod_and_disc":
        bodies = [F.dirichlet_body(F.stadium(0, 0, 0.2, 4.0, 0.2), h_c=h_c),
                  F.dirichlet_body(F.disc(0.3, 1.4, 0.6), h_c=0.5 * h_c)]
    else:
        bodies = [F.dirichlet_body(F.stadium(0, y, 0.0, 3.0, 0.15), h_c=h_c) for y in (-1.0, 0.0, 1.0)]
    ref = F.reference(bodies, nonlinear=nonlinear, levels=(0, 1))
    total_line = float(np.sum(ref["line"]))
    err = float(np.sum(ref["err_line"])) + ref["err_keller"]
    assert abs(total_line - ref["keller"]) <= err
    assert total_line == pytest.approx(ref["keller"], rel=2e-3)
    # Contact-line bound (PHYSICS.md): each body carries at most σ × its contact-line length.
    sols = ref["solutions"][-1]
    assert np.all(ref["flux"] <= np.array(sols.contact_length))


# ----------------------------------------------------------------------------- rod condition
def test_long_rod_contact_angle_condition_2d():
    """Linearised contact-angle (Robin) condition of a thin horizontal rod, h + w₀ ∂ₙh = D₀,
    D₀ = D − R(1 + cos θ), w₀ = R sin θ (derived in fem3d's docstring from h_c = D − R(1 − cos φ)
    and ψ = φ + θ − π ≈ ∂ₙh). Long rod, per length by the difference of lengths 6 and 12:
    (1) the exact 2D solution of the same linear problem, h = h_c e^{−n} with h_c = D₀/(1 + w₀),
    surface-tension force per length 2 h_c — flux to 1e-4, contact-line integral to 2e-3;
    (2) the exact nonlinear 2D rod (floatcalc.core.rod2d, Vella, Lee & Kim, Langmuir 22, 5979,
    2006: contact position φ from D = 2 sin(ψ/2) + R(1 − cos φ), surface-tension part 2 sin ψ) —
    to 2e-3, the linearisation error being O(ψ) relative with ψ ≈ 0.01 here (measured 2e-4)."""
    from floatcalc.core import rod2d

    R, th, D = 0.1, math.radians(120.0), 0.06
    w0 = R * math.sin(th)
    lin = 2 * (D - R * (1 + math.cos(th))) / (1 + w0)
    phi = brentq(lambda p: 2 * math.sin((p + th - math.pi) / 2) + R * (1 - math.cos(p)) - D, 0.5, 2.5, xtol=1e-15)
    exact2d = float(rod2d.force_parts(phi, R, th)[0])
    fl, li, big = _per_length(lambda L: [F.rod_body((0.2, 0.1), 0.3, L, R, D, th)], (6.0, 12.0), level=0)
    assert fl[0] == pytest.approx(lin, rel=1e-4)
    assert li[0] == pytest.approx(lin, rel=2e-3)
    assert fl[0] == pytest.approx(exact2d, rel=2e-3)
    assert big.keller == pytest.approx(big.line[0], rel=2e-3)  # Keller 1998, as above


@pytest.mark.slow
@pytest.mark.parametrize("psi", [0.3, 0.6])
def test_long_rod_nonlinear_contact_angle_condition_2d(psi):
    """Full (nonlinear) contact-angle condition of a horizontal rod, sin ψ = g(h) from
    h = D − R(1 − cos φ), ψ = φ + θ − π, on a long rod: per length (lengths 6 and 12) against the
    exact 2D rod of floatcalc.core.rod2d (Vella, Lee & Kim, Langmuir 22, 5979, 2006; first
    integral h = 2 sin(ψ/2)): surface-tension force 2 sin ψ at the depth D = 2 sin(ψ/2) +
    R(1 − cos φ). One long rod's 2D meniscus is translation invariant, so the fixed footprint
    w₀ makes no error here. Flux to 1e-4 (measured 1.5e-5, the coupling of the two ends),
    contact-line integral to 2e-3 (measured ≤ 5e-4)."""
    from floatcalc.core import rod2d

    R, th = 0.2, math.radians(120.0)
    phi = math.pi - th + psi
    D = 2 * math.sin(psi / 2) + R * (1 - math.cos(phi))
    exact = float(rod2d.force_parts(phi, R, th)[0])
    fl, li, big = _per_length(lambda L: [F.rod_body((0.0, 0.0), 0.3, L, R, D, th)], (6.0, 12.0),
                              level=0, nonlinear=True, h_line=0.05)
    assert fl[0] == pytest.approx(exact, rel=1e-4)
    assert li[0] == pytest.approx(exact, rel=2e-3)
    assert big.keller == pytest.approx(big.line[0], rel=2e-3)  # Keller 1998


def test_two_long_rods_contact_angle_condition_gap():
    """Two long parallel rods under the linearised contact-angle condition, gap G between the
    facing contact lines. Exact 2D solution of the same linear problem: outer side
    h_o = D₀/(1 + w₀) with slope h_o; inner side h = h_i cosh(x)/cosh(G/2), slope h_i tanh(G/2),
    and h_i + w₀ h_i tanh(G/2) = D₀. Per rod per length: h_o + h_i tanh(G/2). Flux to 1e-4
    (per length from lengths 6 and 12), contact-line integral to 2e-3."""
    R, th, D, G = 0.1, math.radians(110.0), 0.05, 0.8
    w0 = R * math.sin(th)
    D0 = D - R * (1 + math.cos(th))
    t = math.tanh(G / 2)
    exact = D0 / (1 + w0) + D0 * t / (1 + w0 * t)

    def bodies(L):
        return [F.rod_body((0.0, y), 0.0, L, R, D, th) for y in (0.0, 2 * w0 + G)]

    fl, li, big = _per_length(bodies, (6.0, 12.0), level=0)
    np.testing.assert_allclose(fl, exact, rtol=1e-4)
    np.testing.assert_allclose(li, exact, rtol=2e-3)
    x, y, tri, h = big.triangulation()
    assert tri.shape[1] == 3 and h.shape == x.shape and np.all(np.isfinite(h))
    row = F.parallel_rods(2, 12.0, R, D, th, G, levels=(0,))  # the helper builds the same row
    np.testing.assert_allclose(row["force"], big.flux, rtol=1e-12)


# ----------------------------------------------------------------------------- convenience
@pytest.mark.slow
def test_two_strips_share_the_meniscus():
    """Neighbours (PHYSICS.md; exact for parallel rods, Vella, Lee & Kim 2006): a strip beside
    another, both pinned at the same depth, carries less than alone, and less the closer it is;
    the two strips of a symmetric pair carry the same force (mesh-independent symmetry, to the
    error estimate); every force stays below σ × contact-line length (PHYSICS.md bound)."""
    L, w, h_c = 4.0, 0.15, 0.2
    one = F.finite_strip_force(L, w, h_c, levels=(0,))
    far = F.two_strips(L, w, 3.0, h_c, levels=(0, 1))
    near = F.two_strips(L, w, 0.6, h_c, levels=(0, 1))
    assert abs(far["force"][0] - far["force"][1]) <= far["err"].sum() + 1e-9
    assert abs(near["force"][0] - near["force"][1]) <= near["err"].sum() + 1e-9
    assert np.all(near["force"] < far["force"]) and np.all(far["force"] < one["force"][0])
    per = near["solution"].contact_length
    assert np.all(near["force"] <= np.array(per))
    # Linear pair: the inner side of a long gap follows tanh(gap/2) (closed form above); the
    # loss relative to the single strip must be of that size along the straight part.
    loss = one["force"][0] - near["force"][0]
    straight = L - 2 * w
    expected = h_c * (1 - math.tanh(0.3)) * straight
    assert 0.7 * expected < loss < 1.3 * expected  # ends make up the rest (order of a cap)


@pytest.mark.slow
def test_crossing_and_disc_helpers_keller():
    """The convenience helpers used by cross-checks: an X, a T and a strip beside a disc; the
    contact-line integral (a) against Keller's displaced volume (b) for the total (Keller 1998),
    within the stated error estimates."""
    for out in (F.crossing_strips(3.0, 2.0, 0.1, 0.2, kind="X", levels=(0, 1)),
                F.crossing_strips(3.0, 2.0, 0.1, 0.2, kind="T", levels=(0, 1)),
                F.strip_beside_disc(3.0, 0.1, 0.5, 0.5, 0.2, 0.1, levels=(0, 1))):
        total = float(np.sum(out["line"]))
        assert abs(total - out["keller"]) <= float(np.sum(out["err_line"])) + out["err_keller"]
        assert np.sum(out["force"]) == pytest.approx(out["keller"], rel=1e-9)  # Galerkin identity


def test_too_deep_for_a_graph_meniscus_raises():
    """Beyond the deepest graph meniscus the reference refuses rather than returning a number:
    around a disc of radius 0.3 the contact line reaches at most depth 0.609 with a graph
    (ψ = 90° in floatcalc.core.axisym, checked here); h_c = 0.8 must raise ConvergenceError
    (the discrete problem would give a near-vertical surface and a force above σ × perimeter)."""
    from floatcalc.errors import ConvergenceError

    assert -float(ax.solve(0.3, math.pi / 2)["height"]) < 0.8
    with pytest.raises(ConvergenceError):
        F.solve([F.dirichlet_body(F.disc(0.0, 0.0, 0.3), h_c=0.8)], nonlinear=True)
