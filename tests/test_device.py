"""Whole devices: equilibrium, capacity, tilt, stiffness, tipping (floatcalc.device.solve).

Independent checks named beside each test: a lever-rule moment balance with the rod law
inverted by root finding, the far-apart sum of single-rod limits, the exact parallel-rod
solution (floatcalc.core.parallel2d, itself checked against direct ODE integration), Keller's
theorem by numerical integration of the superposed meniscus, and response to small loads.
"""

from __future__ import annotations

import json
import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy.optimize import brentq

from floatcalc.cli import main
from floatcalc.core import equilibrium as eq
from floatcalc.core import finite_rod, rod2d
from floatcalc.device import Device, example, solve_device
from floatcalc.device.design import design_from_data
from floatcalc.device.parallel import parallel_rods
from floatcalc.errors import InputError
from floatcalc.liquids import water

W20 = water("20 degC")
LC, SIGMA = W20.lc, W20.sigma
THETA = 115.0


def rods(legs, mass="0.5 g", com=("0 mm", "0 mm"), radius="0.15 mm", com_height=None):
    """Design dict of rods: legs = [(x_mm, y_mm, heading_deg, length_mm), ...]."""
    body = {"mass": mass, "centre_of_mass": list(com)}
    if com_height is not None:
        body["centre_of_mass_height"] = com_height
    return design_from_data({
        "schema_version": 1,
        "liquid": {"name": "water", "temperature": "20 degC"},
        "body": body,
        "legs": [{"kind": "rod", "name": f"r{i}", "position": [f"{x} mm", f"{y} mm"], "heading": f"{h} deg",
                  "radius": radius, "length": f"{L} mm", "material": "steel",
                  "coating": {"advancing": f"{THETA} deg"}} for i, (x, y, h, L) in enumerate(legs)],
    })


def square(half=10.0, L=12.0, **kw):
    return rods([(half, half, 0, L), (-half, half, 0, L), (-half, -half, 0, L), (half, -half, 0, L)], **kw)


_SQUARE_DEV = Device.from_design(square())
_SQUARE_SUP = _SQUARE_DEV.support()
_SQUARE_W = _SQUARE_DEV.weight / (SIGMA * LC)


def test_symmetric_devices_come_out_level():
    r = solve_device(square())
    assert abs(r.pitch.magnitude) < 1e-6 and abs(r.roll.magnitude) < 1e-6
    forces = [e.force.to("N").magnitude for e in r.elements]
    assert max(forces) == pytest.approx(min(forces), rel=1e-9)


def _rod_depth_for_force(F, R, L):
    """Invert the finite-rod law F(φ) by Brent's method; returns the lowest-point depth [m]."""
    th = math.radians(THETA)
    lim = finite_rod.limit(R / LC, th, L / LC)

    def g(phi):
        a, b, _ = finite_rod.force_parts(phi, R / LC, th, L / LC)
        return float(a + b) * SIGMA * LC - F

    phi = brentq(g, math.pi - th, lim["phi"], xtol=1e-14)
    return float(finite_rod.force_parts(phi, R / LC, th, L / LC)[2]) * LC


def test_moving_the_centre_of_mass_tilts_as_a_moment_balance_says():
    """Two rods along y at x = ±a, far apart (no shared meniscus): lever rule F± = W(1/2 ± x_G/2a),
    each depth from inverting its own force law, pitch = atan((d+ − d−)/2a)."""
    a, L, R = 30.0, 15.0, 0.15e-3
    d = rods([(a, 0, 90, L), (-a, 0, 90, L)], mass="0.3 g", com=("6 mm", "0 mm"))
    r = solve_device(d)
    dev = r.device
    W = dev.weight
    xg = dev.centre_of_mass[0]
    Fp = W * (0.5 + xg / (2 * a * 1e-3))
    Fm = W - Fp
    dp, dm = _rod_depth_for_force(Fp, R, L * 1e-3), _rod_depth_for_force(Fm, R, L * 1e-3)
    pitch = math.degrees(math.atan((dp - dm) / (2 * a * 1e-3)))
    assert r.pitch.magnitude > 0  # the +x side goes down
    assert r.pitch.magnitude == pytest.approx(pitch, rel=2e-3)
    assert abs(r.roll.magnitude) < 1e-9
    assert r.elements[0].force.to("N").magnitude == pytest.approx(Fp, rel=1e-6)


@pytest.mark.slow
def test_far_apart_elements_add_up_to_their_single_limits():
    """Rods 30 l_c apart: total carried at capacity = sum of single finite-rod limits."""
    L, R = 12.0e-3, 0.15e-3
    r = solve_device(square(half=40.0, L=12.0))
    one = finite_rod.limit(R / LC, math.radians(THETA), L / LC)["force"] * SIGMA * LC
    total = (r.weight + r.max_payload).to("N").magnitude
    assert total == pytest.approx(4 * one, rel=1e-4)


@pytest.mark.slow
def test_far_apart_balls_add_up_to_their_single_limits():
    """Three ball feet 30 l_c apart (round element kind over floatcalc.round): the device carries
    three single-ball limits at capacity (sum of separate elements)."""
    from floatcalc.round import ball

    legs = [{"kind": "ball", "position": [f"{60 * math.cos(a):.6f} mm", f"{60 * math.sin(a):.6f} mm"],
             "radius": "1 mm", "material": "nylon", "coating": {"advancing": "150 deg"}}
            for a in (0.0, 2 * math.pi / 3, 4 * math.pi / 3)]
    d = design_from_data({"schema_version": 1, "liquid": {"name": "water"},
                          "body": {"mass": "0.02 g", "centre_of_mass": ["0 mm", "0 mm"]}, "legs": legs})
    r = solve_device(d)
    one = ball("1 mm", "150 deg", material_density="1140 kg/m^3").max_force.to("N").magnitude
    assert (r.weight + r.max_payload).to("N").magnitude == pytest.approx(3 * one, rel=1e-4)


@pytest.mark.parametrize("spacing_mm, tol", [(8.0, 0.005), (5.0, 0.025)])
def test_superposition_agrees_with_exact_parallel_rods(spacing_mm, tol):
    """Two long parallel rods: device model (superposed linear menisci) against the exact 2D
    shared-meniscus solution with the turning-point first integral, ends added from the finite-rod
    model. Tolerance from the stated model range (footprints ≥ 1.5 l_c apart)."""
    L, R = 200.0, 0.25e-3
    d = rods([(0, spacing_mm / 2, 0, L), (0, -spacing_mm / 2, 0, L)], radius="0.25 mm", mass="0.5 g")
    r = solve_device(d)
    exact = parallel_rods("0.25 mm", f"{L} mm", f"{THETA} deg", 2, f"{spacing_mm} mm").max_force.to("N").magnitude
    one = finite_rod.limit(R / LC, math.radians(THETA), L * 1e-3 / LC)
    ends = one["end_part"] / (one["force"] - one["end_part"])
    total = (r.weight + r.max_payload).to("N").magnitude
    assert total == pytest.approx(exact * (1 + ends), rel=tol)


def test_rod_row_kind_uses_the_exact_parallel_solution():
    """A ``rod_row`` element carries the exact parallel-rod limit (adapter consistency), and at
    3 l_c spacing it agrees with three separate rods and superposed menisci (another method)
    within 1 % once the separate rods' end caps are removed."""
    L = 100.0
    row = design_from_data({"schema_version": 1, "liquid": {"name": "water"},
                            "body": {"mass": "0.5 g", "centre_of_mass": ["0 mm", "0 mm"]},
                            "legs": [{"kind": "rod_row", "position": ["0 mm", "0 mm"], "radius": "0.25 mm",
                                      "length": f"{L} mm", "count": 3, "spacing": "8.2 mm", "material": "steel",
                                      "coating": {"advancing": f"{THETA} deg"}}]})
    r = solve_device(row)
    exact = parallel_rods("0.25 mm", f"{L} mm", f"{THETA} deg", 3, "8.2 mm").max_force.to("N").magnitude
    carried = (r.weight + r.max_payload).to("N").magnitude
    assert carried == pytest.approx(exact, rel=1e-5)
    sep = solve_device(rods([(0, 8.2, 0, L), (0, 0, 0, L), (0, -8.2, 0, L)], radius="0.25 mm", mass="0.5 g"))
    one = finite_rod.limit(0.25e-3 / LC, math.radians(THETA), L * 1e-3 / LC)
    ends = one["end_part"] / (one["force"] - one["end_part"])
    assert (sep.weight + sep.max_payload).to("N").magnitude / (1 + ends) == pytest.approx(carried, rel=0.01)


def test_keller_whole_device_by_integrating_the_superposed_meniscus():
    """Keller's theorem (Phys. Fluids 10, 3009, 1998) for the whole device: the surface-tension
    force of all elements equals the weight of liquid displaced by the superposed meniscus,
    integrated numerically on a grid. Light load (|ψ| ≲ 0.2 rad), so linear and nonlinear
    meniscus areas agree to about 1 %; tolerance 3 %."""
    L, R = 15.0, 0.15e-3
    d = rods([(0, 4.0, 0, L), (0, 0.0, 0, L), (0, -4.0, 0, L)], mass="0.12 g")
    r = solve_device(d)
    dev = r.device
    th = math.radians(THETA)
    st_force = 0.0
    for h0 in r.contact_depths:
        psi = 2 * math.asin(h0 / (2 * LC))
        assert abs(psi) < 0.25
        phi = psi + math.pi - th
        ends = 2 * float(finite_rod.end_length(R / LC * math.sin(phi)))
        st_force += SIGMA * 2 * math.sin(psi) * (L * 1e-3 + ends * LC)
    dx = 0.04 * LC  # halving dx changes the integral by 0.4 %
    x = np.arange(-(L * 1e-3 / 2 + 12 * LC), L * 1e-3 / 2 + 12 * LC, dx)
    y = np.arange(-16 * LC, 16 * LC, dx)
    X, Y = np.meshgrid(x, y)
    h = dev.meniscus_depth(X, Y, r.contact_depths)
    inside = np.zeros_like(h, dtype=bool)
    for m in dev.models:  # the footprints themselves displace no meniscus liquid
        cx, cy = m.points.mean(axis=0)
        inside |= (np.abs(X - cx) <= L * 1e-3 / 2) & (np.abs(Y - cy) <= R)
    displaced = W20.rho * W20.g * h[~inside].sum() * dx * dx
    assert displaced == pytest.approx(st_force, rel=0.03)


def test_payload_beyond_capacity_sinks_with_shortfall():
    skimmer = Device.from_design(example("skimmer"))
    r0 = solve_device(skimmer)
    extra = r0.max_payload_mass.to("g").magnitude + 0.5
    r = solve_device(skimmer, payload=f"{extra} g")
    assert r.verdict == "sinks"
    assert r.shortfall.to("N").magnitude == pytest.approx(0.5e-3 * W20.g, rel=1e-4)
    assert solve_device(skimmer, payload=f"{extra - 1.0} g").verdict == "floats"


def test_first_to_fail_is_on_the_heavy_side():
    r = solve_device(square(com=("3 mm", "1 mm")))
    assert r.first_to_fail == "r0"  # the leg at (+x, +y)
    assert r.pitch.magnitude > 0 and r.roll.magnitude > 0


def test_heave_and_pitch_stiffness_match_small_load_response():
    """k_heave ≈ ΔW/Δheave and k_pitch ≈ ΔW·t/Δpitch for a small payload (finite response)."""
    d = square(com=("0 mm", "0 mm"), com_height="0 mm")
    r0 = solve_device(d)
    dm = 1e-3 * r0.max_payload_mass.to("g").magnitude
    r1 = solve_device(d, payload=f"{dm} g")
    dz = (r1.heave - r0.heave).to("m").magnitude
    assert r0.stiffness_heave.to("N/m").magnitude == pytest.approx(dm * 1e-3 * W20.g / dz, rel=0.01)
    t = 5e-3
    r2 = solve_device(d, payload=f"{dm} g", payload_position=(f"{t} m", "0 m"))
    dpitch = math.radians((r2.pitch - r1.pitch).to("deg").magnitude)
    assert r0.stiffness_pitch.to("N*m/rad").magnitude == pytest.approx(dm * 1e-3 * W20.g * t / dpitch, rel=0.03)


@pytest.mark.slow
def test_tipping_offset_is_where_an_element_gives_way():
    r = solve_device(_SQUARE_DEV)
    tip = r.tipping[0]
    assert tip["direction"] == "+x" and tip["offset_m"] > 0
    P = r.tipping_payload.to("N").magnitude / W20.g * 1e3
    x = tip["offset_m"]
    assert solve_device(_SQUARE_DEV, payload=f"{P} g", payload_position=(f"{0.98 * x} m", "0 m")).verdict == "floats"
    assert solve_device(_SQUARE_DEV, payload=f"{P} g", payload_position=(f"{1.02 * x} m", "0 m")).verdict == "sinks"


def test_tipping_offsets_match_a_tight_brent_root_of_the_margin():
    """solve_device's Newton search of the tipping offset against Brent's method (scipy.optimize.brentq,
    xtol 1e-10 l_c) on the same margin max_j (e_j − e_lim,j), from equilibrium.solve, in all four
    directions of the invented skimmer: the offsets agree to 2e-5 l_c (the search stops at a
    Newton step of 1e-5 l_c)."""
    dev = Device.from_design(example("skimmer"))
    r = solve_device(dev)
    sup = dev.support()
    lc, fs = dev.liquid.lc, dev.liquid.sigma * dev.liquid.lc
    Ws, (xs, ys) = dev.weight / fs, (c / lc for c in dev.centre_of_mass)
    P = r.tipping_payload.to("N").magnitude / fs
    for tip in r.tipping:
        dx, dy = {"+x": (1, 0), "-x": (-1, 0), "+y": (0, 1), "-y": (0, -1)}[tip["direction"]]
        t = tip["offset_m"] / lc

        def margin(s):
            Wt = Ws + P
            _, e = eq.solve(sup, Wt, (Ws * xs + P * (xs + s * dx)) / Wt, (Ws * ys + P * (ys + s * dy)) / Wt)
            return float(np.max(e - sup.limit_depth))

        ref = brentq(margin, 0.9 * t, 1.1 * t, xtol=1e-10)
        assert abs(t - ref) < 2e-5, (tip["direction"], t, ref)


def test_centre_of_mass_outside_support_is_an_input_error():
    with pytest.raises(InputError, match=r"^body.centre_of_mass: must lie inside the support polygon"):
        Device.from_design(square(com=("40 mm", "0 mm")))


def test_overlapping_elements_are_an_input_error():
    with pytest.raises(InputError, match="footprints overlap"):
        Device.from_design(rods([(0, 0, 0, 10), (0, 0, 90, 10), (20, 20, 0, 10)]))


@settings(max_examples=60, deadline=None)  # each example is an equilibrium solve (~10 ms)
@given(st.floats(-3.0, 3.0), st.floats(-3.0, 3.0))
def test_tilt_follows_the_centre_of_mass(xg_mm, yg_mm):
    """Symmetric square: pitch has the sign of x_G and roll the sign of y_G (mirror symmetry).

    (Centres of mass up to 3 mm off: further out the corner rod passes its limit under the
    device's own weight and no intact equilibrium exists.)"""
    sup = _SQUARE_SUP
    W = _SQUARE_W
    u, e = eq.solve(sup, W, xg_mm * 1e-3 / LC, yg_mm * 1e-3 / LC)
    for slope, c in ((u[1], xg_mm), (u[2], yg_mm)):
        if abs(c) > 1e-3:
            assert np.sign(slope) == np.sign(c)
        else:
            assert abs(slope) < 1e-4  # slope ∝ offset: about 0.03 per mm here


def test_cli_device_json_keys(capsys):
    code = main(["device", "--example", "skimmer", "--payload", "0.5g", "--json"])
    d = json.loads(capsys.readouterr().out)
    assert code == 0
    assert {"max_payload_N", "first_to_fail", "equilibrium", "elements", "verdict"} <= set(d)
    assert set(d["equilibrium"]) == {"heave_m", "pitch_deg", "roll_deg"}
    assert len(d["elements"]) == 12 and {"force_N", "depth_m", "utilisation", "breakthrough_order",
                                         "limit_force_N"} <= set(d["elements"][0])
    assert sum(e["force_N"] for e in d["elements"]) == pytest.approx(d["weight_N"] + d["applied_payload_N"],
                                                                     rel=1e-9)
    assert d["load_N"] == pytest.approx(d["weight_N"] + d["applied_payload_N"], rel=1e-12)
    assert d["capacity_N"] == pytest.approx(d["weight_N"] + d["max_payload_N"], rel=1e-12)
    assert d["sinking_payload_N"] >= d["max_payload_N"] * (1 - 1e-9)
    assert any("clean liquid surface" in c for c in d["cautions"])


def test_cli_demo_runs_the_invented_skimmer(capsys):
    code = main(["demo"])
    out = capsys.readouterr().out
    assert code == 0 and "Invented example" in out and "twelve-leg" in out and "leg 12" in out


@pytest.mark.parametrize("name", ["skimmer", "robot"])
def test_best_payload_is_carried_where_it_is_reported(name):
    """The best payload and its position (equilibrium.best_capacity, Nelder–Mead over the tilt)
    against statics, by a second solve with the payload placed there: the state that carries
    the best payload is an admissible equilibrium for a load at that position, so the capacity
    there is at least the best payload, and no more than the search's tolerance above it (a
    larger capacity anywhere would be a better optimum); it is at least the capacity at the
    centre of mass, and weight plus best payload stay under the sum of the element limits
    (PHYSICS.md bound). Invented examples."""
    dev = Device.from_design(example(name))
    r = solve_device(dev)
    best = r.best_payload.to("N").magnitude
    assert best >= r.max_payload.to("N").magnitude * (1 - 1e-12)
    x, y = r.best_payload_position.to("m").magnitude
    there = solve_device(dev, payload="0 g", payload_position=(f"{float(x)!r} m", f"{float(y)!r} m")).max_payload.to("N").magnitude
    assert there >= best * (1 - 1e-9)
    assert there <= best * (1 + 1e-4)
    limits = sum(e.limit_force.to("N").magnitude for e in r.elements)
    assert best + dev.weight <= limits * (1 + 1e-12)
