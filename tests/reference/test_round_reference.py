"""Round support elements against published asymptotics, classical relations and the 2D limit.

Each check names its source beside the assertion, with the tolerance and why.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from floatcalc import ball, pad, pin, ring, water
from floatcalc.core import axisym as ax
from floatcalc.core import rod2d
from floatcalc.core import round_bodies as rb

EULER_GAMMA = 0.5772156649015329  # Euler's constant


@pytest.mark.parametrize("b", [1e-3, 3e-3, 1e-2])
@pytest.mark.parametrize("theta_deg", [0.0, 30.0, 60.0, 80.0])
def test_thin_fibre_james_1974(b, theta_deg):
    """James, J. Fluid Mech. 63, 657 (1974): meniscus height on a thin fibre of radius b ≪ l_c,
    h ≈ b cos θ [ln(4 l_c / (b (1 + sin θ))) − γ_E]. The next term of the matched expansion is
    smaller by O(b² ln² b) relative (order from the paper's expansion, recalled from memory), so
    the tolerance is b² ln² b."""
    th = math.radians(theta_deg)
    h = float(ax.contact_height_direct(b, th - math.pi / 2))  # contact line on the side: ψ = θ − 90°
    james = b * math.cos(th) * (math.log(4.0 / (b * (1.0 + math.sin(th)))) - EULER_GAMMA)
    assert h == pytest.approx(james, rel=b * b * math.log(b) ** 2)


def test_thin_fibre_james_through_public_api():
    """Same James (1974) asymptote through floatcalc.pin in SI (water 20 °C, b = 5 µm)."""
    w = water()
    b, th = 5e-6, math.radians(40)
    r = pin(b, th, liquid=w)
    bs = b / w.lc
    james = b * math.cos(th) * (math.log(4.0 / (bs * (1 + math.sin(th)))) - EULER_GAMMA)
    assert r.meniscus_height.to("m").magnitude == pytest.approx(james, rel=bs * bs * math.log(bs) ** 2)


@pytest.mark.parametrize("theta_deg", [60.0, 120.0, 150.0, 180.0])
def test_small_sphere_limit(theta_deg):
    """Flotation of small spheres (Scheludko, Toshev & Bojadjiev, J. Chem. Soc. Faraday Trans. 1
    72, 2815, 1976; Nutt, Chem. Eng. Sci. 12, 133, 1960): as Bo → 0 the largest capillary force
    is 2πRσ sin²(θ/2). Gravity corrections are O(Bo ln Bo) = O(R² ln R) relative, so we take
    tolerance R² ln²(1/R) and also require the error to shrink ~R² (≥ 30× per decade)."""
    th = math.radians(theta_deg)
    errs = []
    for R in (1e-3, 1e-2):
        best, _ = rb.ball_limit(R, th)
        ref = 2 * math.pi * R * math.sin(th / 2) ** 2
        err = abs(best["force"] / ref - 1)
        assert err < R * R * math.log(R) ** 2
        errs.append(err)
    assert errs[1] / errs[0] > 30


@pytest.mark.parametrize("theta_deg", [0.0, 45.0, 70.0])
def test_wilhelmy_relation_against_meniscus_weight(theta_deg):
    """Wilhelmy (Ann. Phys. 195, 177, 1863): the surface-tension pull on a vertical fibre is
    σ P cos θ. Checked independently of the force formula: by vertical force balance on the
    liquid (Keller 1998) the pull equals the weight of the raised meniscus, obtained here by
    the trapezoid rule on the returned profile. Tolerance 5e-4 (trapezoid on the drawn profile)."""
    w = water()
    b, th = 0.2e-3, math.radians(theta_deg)
    r = pin(b, th, liquid=w)
    P = 2 * math.pi * b
    assert -r.surface_tension_part.to("N").magnitude == pytest.approx(w.sigma * P * math.cos(th), rel=1e-12)
    rr, zz = r.profile["r_m"], r.profile["z_m"]
    weight = w.rho * w.g * np.trapezoid(2 * np.pi * rr * zz, rr)
    assert weight == pytest.approx(w.sigma * P * math.cos(th), rel=5e-4, abs=1e-12)


def test_large_contact_radius_tends_to_2d():
    """2D first integral (PHYSICS.md; de Gennes, Brochard-Wyart & Quéré 2004): |h| = 2 l_c sin(ψ/2)
    for a straight contact line. The axisymmetric height approaches it as 1/r_c (azimuthal
    curvature sin ψ / r): r_c (1 − h/h_2D) must settle to a constant (change < 3 % from
    r_c = 40 to 80), and the relative gap at r_c = 80 be below 1/r_c."""
    psi = np.array([0.5, 1.5, 2.5])
    c = []
    for r in (20.0, 40.0, 80.0):
        d = -ax.contact_height(r, psi)
        gap = 1 - d / (2 * np.sin(psi / 2))
        assert np.all(gap > 0)
        c.append(r * gap)
    assert np.all(np.abs(c[2] / c[1] - 1) < 0.03)
    assert np.all(c[2] / 80.0 < 1 / 80.0)


def test_keller_theorem_ball():
    """Keller, Phys. Fluids 10, 3009 (1998): the vertical surface-tension force on a body equals
    the weight of liquid displaced by the meniscus outside its contact line. Force from the
    contact line (2π r_c σ sin ψ at the ball's limit), volume by the trapezoid rule on the
    returned profile. Tolerance 5e-4 (trapezoid on the drawn profile)."""
    w = water()
    r = ball("1.5 mm", "140 deg", liquid=w)
    rr, zz = r.profile["r_m"], r.profile["z_m"]
    displaced = np.trapezoid(2 * np.pi * rr * (-zz), rr)
    assert w.rho * w.g * displaced == pytest.approx(r.surface_tension_part.to("N").magnitude, rel=5e-4)


@pytest.mark.slow
def test_keller_theorem_ring_inner_meniscus():
    """Keller (1998) for the liquid enclosed by a ring: the inner contact line carries the weight
    of the depressed liquid inside; volume by the trapezoid rule on the inner profile."""
    w = water()
    r = ring("4 mm", "0.15 mm", "150 deg", liquid=w)
    prof = r.profile["inner"]
    vol = np.trapezoid(2 * np.pi * prof["r_m"] * (-prof["z_m"]), prof["r_m"])
    assert w.rho * w.g * vol == pytest.approx(r.details["enclosed_liquid_force_N"], rel=5e-4)


@pytest.mark.slow
def test_large_ring_tends_to_2d_rod():
    """A ring many capillary lengths across is locally a straight rod with a meniscus on each
    side: force per wire length → the exact 2D rod law (Vella, Lee & Kim, Langmuir 22, 5979,
    2006; floatcalc.core.rod2d). Curvature corrections are O(1/R_r) per side and of opposite
    sign inside and outside; we require agreement to 1/R_r and a gap that shrinks with R_r."""
    b, th = 0.1, math.radians(150)
    ref = float(rod2d.limit_force(b, th)["force"])
    gaps = []
    for Rr in (10.0, 40.0):
        best, _ = rb.ring_limit(Rr, b, th)
        per_len = best["force"] / (2 * math.pi * Rr)
        gap = abs(per_len / ref - 1)
        assert gap < 1.0 / Rr
        gaps.append(gap)
    assert gaps[1] < gaps[0]


def test_pad_edge_pinning_gibbs():
    """Gibbs' inequality at a 90° edge (Oliver, Huh & Mason, J. Colloid Interface Sci. 59, 568,
    1977): the interface may turn through π − α = 90° at each edge. A non-wetting pad therefore
    pins at the bottom edge up to ψ = θ − 90°, and at the top edge up to ψ = θ; the limit exceeds
    that of the same disc with the line free to move on the side only (stage 2 end)."""
    r = pad("3 mm", "0.3 mm", "110 deg")
    st = np.array(r.curve.stage)
    psi_side = 20.0
    assert list(dict.fromkeys(st)) == list(rb.STAGES)
    assert r.inclination_at_max.magnitude > psi_side
    assert r.inclination_at_max.magnitude <= 110.0 + 1e-9
    f = r.curve.force.to("N").magnitude
    assert r.max_force.to("N").magnitude > f[st == rb.STAGES[1]].max()
