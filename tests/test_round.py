"""Public API of the round elements: inputs, stages, force-at-depth, independent quadratures."""

from __future__ import annotations

import dataclasses
import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy.integrate import quad

from floatcalc import InputError, ball, pad, pin, ring, water
from floatcalc.core import axisym as ax
from floatcalc.core import round_bodies as rb


@pytest.mark.parametrize("call,field", [
    (lambda: ball("-1 mm", "150 deg"), "radius"),
    (lambda: ball("1 mm", "190 deg"), "contact_angle"),
    (lambda: ball("3 kg", "150 deg"), "radius"),
    (lambda: ball("2 m", "150 deg"), "radius"),
    (lambda: pad("2 mm", "0 mm", "110 deg"), "thickness"),
    (lambda: ring("0.3 mm", "0.2 mm", "150 deg"), "ring_radius"),
    (lambda: pin("0.1 mm", "60 deg", depth="-1 mm"), "depth"),
    (lambda: pin("0.1 mm", "60 deg", depth="5 mm", length="2 mm"), "depth"),
    (lambda: ball("1 mm", "150 deg", material_density="0 kg/m^3"), "material_density"),
])
def test_bad_input_one_line(call, field):
    with pytest.raises(InputError) as exc:
        call()
    msg = str(exc.value)
    assert msg.startswith(f"{field}: ") and "\n" not in msg and ", got " in msg


def test_ball_pressure_part_against_quadrature():
    """Cap formula F_p = V_cap + π r_c² d vs direct quadrature of the hydrostatic pressure
    ρ g (−z) times the vertical normal component over the wetted spherical cap."""
    R, th = 0.6, math.radians(130)
    phi = 2.0
    s = rb.ball_state(np.array([phi]), R, th)
    zc = -s["d"][0]
    zcen = zc + R * math.cos(phi)  # centre height: contact at angle φ from the lowest point

    def integrand(a):  # a from the lowest point; dA = 2π (R sin a) R da; n_z(into body) = cos a
        z = zcen - R * math.cos(a)
        return (-z) * math.cos(a) * 2 * math.pi * R * math.sin(a) * R

    ref, _ = quad(integrand, 0.0, phi, epsabs=1e-14, epsrel=1e-13)
    assert s["pressure"][0] == pytest.approx(ref, rel=1e-10)


def test_torus_pressure_against_quadrature():
    Rr, b, D, po, pi_ = 2.0, 0.3, 0.7, 2.2, 1.4

    def integrand(a):
        z = (b - D) - b * math.cos(a)
        return (-z) * math.cos(a) * 2 * math.pi * (Rr + b * math.sin(a)) * b

    ref, _ = quad(integrand, -pi_, po, epsabs=1e-14, epsrel=1e-13)
    assert float(rb.torus_pressure(Rr, b, D, po, pi_)) == pytest.approx(ref, rel=1e-12)


def test_pad_stages_and_continuity():
    r = pad("2 mm", "0.2 mm", "110 deg")
    stages = np.array(r.curve.stage)
    assert list(dict.fromkeys(stages)) == list(rb.STAGES)
    D = r.curve.depth.to("m").magnitude
    F = r.curve.force.to("N").magnitude
    assert np.all(np.diff(D) > 0)
    # continuous across stage changes: jump no larger than the neighbouring step
    for k in np.flatnonzero(stages[1:] != stages[:-1]):
        assert abs(F[k + 1] - F[k]) < 3 * max(abs(F[k] - F[k - 1]), abs(F[k + 2] - F[k + 1]))
    # on the side the surface-tension part is constant (ψ = θ − 90°): Wilhelmy-type pull
    side = stages == rb.STAGES[1]
    w = water()
    st_side = r.curve.surface_tension.to("N").magnitude[side]
    assert np.allclose(st_side, 2 * math.pi * 2e-3 * w.sigma * math.sin(math.radians(20)), rtol=1e-12)
    assert r.stage_at_max == rb.STAGES[2]


def test_wetting_thin_pad_starts_pinned_at_top():
    """θ < 90° and a pad thinner than the raised meniscus: the line is at the top edge at once."""
    r = pad("2 mm", "0.05 mm", "60 deg")
    assert r.curve.stage[0] == rb.STAGES[2]
    assert rb.STAGES[0] not in r.curve.stage


def test_force_at_depth_interpolant():
    r = ball("1 mm", "150 deg")
    D = r.curve.depth.to("m").magnitude
    F = r.curve.force.to("N").magnitude
    mid = 0.5 * (D[10:-1] + D[11:])
    got = r.curve.force_at_depth(mid).to("N").magnitude
    # exact states at those depths, by root-finding φ on the exact curve (independent of the
    # interpolant): depth(φ) is monotone on the branch
    R, th, lc, s = 1e-3 / water().lc, math.radians(150), water().lc, water().sigma
    from scipy.optimize import brentq

    def depth_phi(p):
        return float(rb.ball_state(np.array([p]), R, th)["depth"][0])

    exact = []
    cur = rb.ball_curve(R, th)
    for d in mid[:: 20]:
        k = int(np.searchsorted(cur["depth"], d / lc))
        p = brentq(lambda x: depth_phi(x) - d / lc, cur["phi"][k - 1], cur["phi"][k], xtol=1e-14)
        exact.append(float(rb.ball_state(np.array([p]), R, th)["force"][0]) * s * lc)
    assert np.allclose(got[:: 20], exact, rtol=1e-4)
    assert r.curve.force_at_depth([-1e-3]).magnitude[0] == 0.0
    with pytest.raises(InputError):
        r.curve.force_at_depth([D[-1] * 1.5])
    assert np.allclose(r.curve.force_at_depth(D).to("N").magnitude, F, rtol=1e-12)


def test_pin_tip_pinning_and_side():
    """A non-wetting pin touching at a shallow depth pins at the tip edge: its meniscus height is
    minus the tip depth; deeper, the line sits on the side with ψ = θ − 90°."""
    shallow = pin("0.2 mm", "120 deg", depth="0.02 mm")
    assert shallow.stage == rb.STAGES[0]
    assert shallow.meniscus_height.to("m").magnitude == pytest.approx(-2e-5, rel=1e-9)
    deep = pin("0.2 mm", "120 deg", depth="2 mm", length="10 mm")
    assert deep.stage == rb.STAGES[1]
    assert deep.contact_inclination.magnitude == pytest.approx(30.0)
    w = water()
    assert deep.pressure_part.to("N").magnitude == pytest.approx(w.rho * w.g * math.pi * 4e-8 * 2e-3, rel=1e-12)
    assert deep.payload.magnitude == pytest.approx((deep.vertical_force - deep.own_weight).magnitude)


def test_results_carry_cautions_and_json_keys():
    w = water("70 degC")
    r = ball("1 mm", "120 deg", liquid=w)
    assert any("clean" in c for c in r.cautions) and any("Hot" in c for c in r.cautions)
    d = r.to_dict()
    for key in ("max_force_N", "depth_at_max_m", "payload_N", "bond_number", "warnings"):
        assert key in d
    p = pin("0.1 mm", "60 deg").to_dict()
    assert p["meniscus_height_m"] > 0 and p["vertical_force_N"] < 0


@pytest.mark.slow
def test_ring_both_sides_share_depth():
    """The inner and outer contact positions must give the same lowest-point depth (checked by
    re-solving the inner meniscus at the returned contact position)."""
    Rr, b, th = 2.0, 0.08, math.radians(140)
    best, cur = rb.ring_limit(Rr, b, th)
    rci = Rr - b * math.sin(best["phi_inner"])
    d_in = -float(ax.solve(rci, best["psi_inner"], side="inner")["height"])
    assert d_in + b * (1 - math.cos(best["phi_inner"])) == pytest.approx(best["depth"], abs=1e-7)
    rco = Rr + b * math.sin(best["phi_outer"])
    d_out = -float(ax.contact_height_direct(rco, best["psi_outer"]))
    assert d_out + b * (1 - math.cos(best["phi_outer"])) == pytest.approx(best["depth"], abs=1e-7)


@settings(max_examples=60, deadline=None)  # 60, not 200: each example runs two full ball limits
@given(R=st.floats(0.01, 3.0), th=st.floats(95.0, 175.0))
def test_ball_limit_monotone_in_contact_angle(R, th):
    """A more non-wetting ball carries more (the force at every φ rises with θ at fixed r_c)."""
    lo, _ = rb.ball_limit(R, math.radians(th))
    hi, _ = rb.ball_limit(R, math.radians(th + 3.0))
    assert hi["force"] > lo["force"]


@settings(max_examples=60, deadline=None)  # 60, not 200: each example runs two pad limits
@given(a=st.floats(0.05, 5.0), t=st.floats(0.01, 1.0), th=st.floats(95.0, 170.0))
def test_pad_limit_grows_with_thickness(a, t, th):
    """A thicker pad pins its top edge deeper, so its limit is larger."""
    lo, _ = rb.pad_limit(a, t, math.radians(th))
    hi, _ = rb.pad_limit(a, t * 1.2, math.radians(th))
    assert hi["force"] > lo["force"]


@pytest.mark.parametrize("theta_deg", [0.0, 90.0, 180.0])
def test_extreme_contact_angles_are_finite(theta_deg):
    """Fully wetting, neutral and fully non-wetting elements give finite limits, and the ball's
    limit grows from θ = 0 to θ = 180° (sanity, common practice)."""
    b = ball("1 mm", f"{theta_deg} deg")
    p = pad("2 mm", "0.3 mm", f"{theta_deg} deg")
    for r in (b, p):
        assert math.isfinite(r.max_force.magnitude) and math.isfinite(r.depth_at_max.magnitude)
    if theta_deg == 180.0:
        assert b.max_force > ball("1 mm", "0 deg").max_force


@pytest.mark.slow
def test_ring_curve_follows_the_push_down_branch():
    """The ring's force-depth curve ran on past the deepest state of its outer side (the outer
    contact line climbing towards the top of the wire lifts the wire again), so its depths were
    not increasing and ``force_at_depth`` failed inside SciPy. Like the ball, the curve must
    end at the deepest state reachable by pushing down. Independent check of where that is: at
    given φ_o the outer side alone fixes the lowest-point depth, D = d_o + b(1 − cos φ_o), with
    d_o from the direct outer solve on a fine φ_o grid here (not the table, not the ring code)."""
    w = water()
    lc = w.lc
    Rr, b, th = 1.0, 0.3, math.radians(170)
    r = ring(Rr * lc, b * lc, th, liquid=w)
    D = r.curve.depth.to("m").magnitude
    F = r.curve.force.to("N").magnitude
    assert np.all(np.diff(D) > 0)
    phi = np.linspace(2.4, 3.0, 121)
    Do = -ax.contact_height_direct(Rr + b * np.sin(phi), phi + th - np.pi) + b * (1 - np.cos(phi))
    # the curve's 3° grid lands within about 1e-3 l_c of the flat maximum
    assert Do.max() - 2e-3 < D[-1] / lc <= Do.max() + 1e-9
    assert np.allclose(r.curve.force_at_depth(D).to("N").magnitude, F, rtol=1e-12)
    # the limit (refined between curve points) lies on this branch
    assert F.max() <= r.max_force.to("N").magnitude <= F.max() * (1 + 1e-3)


def test_pin_curve_covers_the_tip_depth_and_says_what_it_includes():
    """Two pin inconsistencies. (1) With a tip depth but no length the curve stopped at
    max(2 l_c, 4b) past the side stage, so ``curve.force_at_depth(result.depth)`` refused the
    pin's own depth. (2) Without a depth the result warned "pressure on the tip not included",
    true of ``vertical_force`` but not of the curve, which does include it. Independent figures:
    Wilhelmy pull −σ 2πb cos θ (Wilhelmy 1863) plus the hydrostatic pressure ρ g D on the flat
    tip of area πb², written out here."""
    w = water()
    b, th, D = 0.1e-3, math.radians(60), 20e-3
    r = pin(b, th, depth=D, liquid=w)
    expect = -w.sigma * 2 * math.pi * b * math.cos(th) + w.rho * w.g * D * math.pi * b * b
    assert r.vertical_force.to("N").magnitude == pytest.approx(expect, rel=1e-12)
    assert r.curve.force_at_depth([D]).to("N").magnitude[0] == pytest.approx(expect, rel=1e-9)
    free = pin(b, th, liquid=w)
    assert free.pressure_part.magnitude == 0.0
    Dc = free.curve.depth.to("m").magnitude
    assert np.allclose(free.curve.pressure.to("N").magnitude, w.rho * w.g * Dc * math.pi * b * b, rtol=1e-12)
    (msg,) = [m for m in free.warnings if "tip depth not given" in m]
    assert "vertical force" in msg and "curve includes" in msg


@pytest.mark.slow
def test_thick_ring_matches_both_sides():
    """A thick wire (b = 10 l_c on R_r = 20 l_c, θ = 180°) raised ConvergenceError: the Newton
    steps that match the inner and outer lowest-point depths use the slope of a coarse spline
    inverse and converged only linearly, so four steps fell short of 1e-8 l_c. Independent
    check of the returned state: re-solve each side directly at the returned contact positions
    (outer: direct shooting instead of the table; inner: default steps, tight) and require the
    same lowest-point depth to 1e-8 relative."""
    w = water()
    lc = w.lc
    Rr, b, th = 20.0, 10.0, math.radians(180)
    r = ring(Rr * lc, b * lc, th, liquid=w)
    D = r.depth_at_max.to("m").magnitude / lc
    po, pi_ = math.radians(r.details["contact_position_outer_deg"]), math.radians(r.details["contact_position_inner_deg"])
    d_out = -float(ax.contact_height_direct(Rr + b * math.sin(po), po + th - math.pi))
    d_in = -float(ax.solve(Rr - b * math.sin(pi_), pi_ + th - math.pi, side="inner")["height"])
    assert d_out + b * (1 - math.cos(po)) == pytest.approx(D, rel=1e-8)
    assert d_in + b * (1 - math.cos(pi_)) == pytest.approx(D, rel=1e-8)


# ---------------------------------------------------------------------------------------------
# element_tables: many elements of one kind at once (the device's fast path)


def _adapter_table(res, d_lim, rc, lc, sigma, points=241):
    """The steps of the device's round-element adapter (floatcalc/device/elements.py,
    _RoundKind.model) on one public result's curve, in SI, with numpy.interp."""
    from scipy.special import k0e, k1e

    c = res.curve
    D, F, Fst = (q.to(u).magnitude for q, u in ((c.depth, "m"), (c.force, "N"), (c.surface_tension, "N")))
    keep = D < d_lim
    f_lim, s_lim = np.interp(d_lim, D, F), np.interp(d_lim, D, Fst)
    D, F, Fst = np.append(D[keep], d_lim), np.append(F[keep], f_lim), np.append(Fst[keep], s_lim)
    if D[0] < 0.0 < D[-1]:
        k = D > 0.0
        F, Fst = (np.concatenate([[np.interp(0.0, D, T)], T[k]]) for T in (F, Fst))
        D = np.concatenate([[0.0], D[k]])
    grid = np.linspace(D[0], D[-1], points)
    rc = max(rc, 1e-9)
    h0 = np.interp(grid, D, Fst) * lc / (sigma * 2 * math.pi * rc * k1e(rc / lc) / k0e(rc / lc))
    return grid, np.interp(grid, D, F), h0


def test_element_tables_equal_public_functions_and_adapter_steps():
    """Same numbers as ball/pad/pin (plus the adapter's table steps) to 1e-8: the batched core
    and the public scalar path evaluate one contact-height table, so this checks that the
    batch reproduces the scalar algorithm and its unit handling (not the table itself: see
    tests/test_round_batch.py for the direct-solver and published checks)."""
    from floatcalc.round import element_tables

    w = water()
    lc, s = w.lc, w.sigma
    R = np.array([0.3e-3, 1.2e-3, 4e-3])
    th = np.radians([165.0, 110.0, 70.0])
    cases = {
        "ball": (dict(radius=R), [ball(R[i], th[i], liquid=w, material_density=7850.0) for i in range(3)]),
        "pad": (dict(radius=R, thickness=0.1 * R),
                [pad(R[i], 0.1 * R[i], th[i], liquid=w, material_density=7850.0) for i in range(3)]),
        "pin": (dict(radius=0.1 * R, length=10 * R),
                [pin(0.1 * R[i], th[i], length=10 * R[i], liquid=w, material_density=7850.0) for i in range(3)]),
    }
    for kind, (geo, ref) in cases.items():
        t = element_tables(kind, contact_angle=th, liquid=w, **geo)
        for i, r in enumerate(ref):
            if kind == "pin":
                d_lim, rc = 10 * R[i], 0.1 * R[i]
                assert t.own_weight_N[i] == pytest.approx(r.own_weight.to("N").magnitude, rel=1e-12)
            else:
                d_lim, rc = r.depth_at_max.to("m").magnitude, r.contact_radius_at_max.to("m").magnitude
                assert t.max_force_N[i] == pytest.approx(r.max_force.to("N").magnitude, rel=1e-8)
                assert t.depth_at_max_m[i] == pytest.approx(d_lim, rel=1e-8)
                assert t.own_weight_N[i] == pytest.approx(r.own_weight.to("N").magnitude, rel=1e-12)
            g, f, h = _adapter_table(r, d_lim, rc, lc, s)
            for got, want in ((t.depth_m[i], g), (t.force_N[i], f), (t.contact_depth_m[i], h)):
                assert np.max(np.abs(got - want)) <= 1e-8 * np.max(np.abs(want))


@pytest.mark.slow
def test_element_tables_ring_against_public_ring():
    """The ring's fast path (tabulated enclosed meniscus) against ring() (direct inner solves):
    limit force to 1e-7 (measured ~1e-11 here); depth on the flat maximum to 1e-4."""
    from floatcalc.round import element_tables

    w = water()
    t = element_tables("ring", ring_radius=5e-3, wire_radius=0.2e-3, contact_angle=math.radians(150), liquid=w)
    r = ring("5 mm", "0.2 mm", "150 deg", liquid=w, material_density=7850.0)
    assert t.max_force_N[0] == pytest.approx(r.max_force.to("N").magnitude, rel=1e-7)
    assert t.depth_at_max_m[0] == pytest.approx(r.depth_at_max.to("m").magnitude, rel=1e-4)
    assert t.own_weight_N[0] == pytest.approx(r.own_weight.to("N").magnitude, rel=1e-12)
    # the one ring perimeter rule, 2π(r_outer + r_inner) at the limit, as ring() reports it
    assert t.perimeter_m[0] == pytest.approx(r.contact_perimeter.to("m").magnitude, rel=1e-4)
    # the table: the adapter's steps on ring()'s curve; its end (the limit depth) moves with
    # the depth at the flat maximum, so the rows agree to that depth's 1e-4
    g, f, h = _adapter_table(r, r.depth_at_max.to("m").magnitude, 5.2e-3, w.lc, w.sigma)
    for got, want in ((t.depth_m[0], g), (t.force_N[0], f), (t.contact_depth_m[0], h)):
        assert np.max(np.abs(got - want)) <= 1e-4 * np.max(np.abs(want))


def test_element_tables_per_element_surface_tension_and_bad_input():
    from floatcalc.round import element_tables

    w = water()
    t = element_tables("pad", radius=2e-3, thickness=0.2e-3, contact_angle=math.radians(110),
                       surface_tension=[w.sigma, 0.05], liquid=w)
    low = pad("2 mm", "0.2 mm", "110 deg", liquid=dataclasses.replace(w, sigma=0.05), material_density=7850.0)
    assert t.max_force_N[1] == pytest.approx(low.max_force.to("N").magnitude, rel=1e-8)
    assert t.max_force_N[1] < t.max_force_N[0]
    for kw in (dict(kind="cube", radius=1e-3), dict(kind="ball", radius=-1e-3), dict(kind="ball"),
               dict(kind="ball", radius=1e-3, contact_angle=4.0), dict(kind="ring", ring_radius=1e-3, wire_radius=0.6e-3)):
        kw.setdefault("contact_angle", 2.0)
        with pytest.raises(InputError) as e:
            element_tables(**kw)
        assert "\n" not in str(e.value)
