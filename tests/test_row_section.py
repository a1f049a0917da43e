"""Cross-section of a rod row (the shared menisci of core.parallel2d) and its drawing.

The drawn profile is checked against the 2D Young–Laplace equation by finite differences on
its own points, and against the 2D form of Keller's theorem (Keller, Phys. Fluids 10, 3009,
1998: the vertical surface-tension pull of a contact line equals the weight of liquid the
meniscus displaces, here ∫ h dx = sin ψ per meniscus side in l_c units) by numerical
integration; neither check uses the first integral the profile is built from. The row state is
that of Vella, Lee & Kim, Langmuir 22, 5979 (2006), as in core.parallel2d.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from floatcalc.core import parallel2d, rod2d

CASES = [(0.1, 120.0, 1.0, 3), (0.183, 115.0, 0.44, 2), (0.05, 150.0, 2.5, 4), (0.3, 100.0, 0.9, 5)]


def _curvature(x, z):
    """Signed curvature of a plane curve from its points (second-order finite differences)."""
    xd, zd = np.gradient(x), np.gradient(z)
    xdd, zdd = np.gradient(xd), np.gradient(zd)
    return (xd * zdd - zd * xdd) / (xd * xd + zd * zd) ** 1.5


@pytest.mark.parametrize("R, th, S, N", CASES)
def test_gap_meniscus_obeys_young_laplace(R, th, S, N):
    # 2D Young–Laplace with z up and lengths in l_c: curvature = z (hydrostatic pressure
    # ρ g h balanced by σ κ; de Gennes, Brochard-Wyart & Quéré 2004, ch. 1)
    p = parallel2d.row_profile(R, math.radians(th), S, N, n=1200)
    for gx, gz in p["gaps"]:
        k = _curvature(gx, gz)
        sl = slice(3, len(gx) - 3)  # np.gradient is first order at the ends
        assert np.allclose(k[sl], gz[sl], rtol=1e-3, atol=1e-4), np.max(np.abs(k[sl] - gz[sl]))


@pytest.mark.parametrize("R, th, S, N", CASES)
def test_meniscus_area_equals_sin_psi_keller(R, th, S, N):
    p = parallel2d.row_profile(R, math.radians(th), S, N, extent=12.0, n=4000)
    for gx, gz in p["gaps"]:  # each half gap: contact line to the turning point
        half = len(gx) // 2
        area = np.trapezoid(-gz[: half + 1], gx[: half + 1])
        assert area == pytest.approx(math.sin(p["psi_inner"]), abs=2e-4)
    xr, zr = p["outer_right"]
    area = np.trapezoid(-zr, xr)  # out to 12 l_c: the tail beyond is below 1e-5
    assert area == pytest.approx(math.sin(p["psi_outer"]), abs=2e-4)


@pytest.mark.parametrize("R, th, S, N", CASES)
def test_gaps_meet_the_rods_at_their_contact_points(R, th, S, N):
    """The gap drawn from mid-gap (distance X(ψ, h_m)) ends on the rod's circle at φ_i, and the
    outer meniscus starts at φ_o: the limit state satisfies the gap and rigidity conditions."""
    p = parallel2d.row_profile(R, math.radians(th), S, N)
    cx, cz = p["contacts"]
    for k, (gx, gz) in enumerate(p["gaps"]):
        assert gx[0] == pytest.approx(cx[2 * k + 1], abs=1e-5) and gz[0] == pytest.approx(cz[2 * k + 1], abs=1e-5)
        assert gx[-1] == pytest.approx(cx[2 * k + 2], abs=1e-5) and gz[-1] == pytest.approx(cz[2 * k + 2], abs=1e-5)
        assert np.all(np.diff(gx) > 0)
    xs = p["centres_x"]
    assert np.allclose(np.hypot(cx - np.repeat(xs, 2), cz - p["centre_z"]), R)  # on the circles
    xr, zr = p["outer_right"]
    assert (xr[0], zr[0]) == pytest.approx((cx[-1], cz[-1]), abs=1e-5)
    # mirror symmetry of a level row
    assert np.allclose(cx, -cx[::-1]) and np.allclose(cz, cz[::-1])


def test_one_rod_is_the_single_rod_profile():
    R, th = 0.1, math.radians(120)
    p = parallel2d.row_profile(R, th, 1.0, 1, extent=6.0, n=200)
    lim = rod2d.limit_force(R, th)
    one = rod2d.profile(R, th, float(lim["phi"]))
    assert p["gaps"] == []
    assert np.allclose(p["outer_right"][0], one["right"][0]) and np.allclose(p["outer_right"][1], one["right"][1])
    assert p["centre_z"] == pytest.approx(float(one["centre_z"]), abs=1e-9)


@pytest.mark.slow
def test_rod_row_drawing_shows_every_rod_and_contact_and_the_pdf_uses_it(monkeypatch, tmp_path):
    from floatcalc import plotting
    from floatcalc.design import design_from_data
    from floatcalc.device.parallel import parallel_rods
    from floatcalc.device.solve import solve_device
    from floatcalc.output.pdf import write_pdf

    r = parallel_rods("0.25 mm", "40 mm", "115 deg", 3, "1.2 mm")
    for zoom in (False, True):
        ax = plotting.meniscus_section(r, zoom=zoom)
        assert sum(1 for a in ax.patches if a.get_gid() == "solid") == 3
        pts = next(c for c in ax.collections if c.get_gid() == "contact points")
        assert len(pts.get_offsets()) == 6
        assert sum(1 for ln in ax.lines if ln.get_gid() == "shared meniscus") == 2
        assert ax.get_aspect() == 1.0
    calls = []
    real = plotting._row_section
    monkeypatch.setattr(plotting, "_row_section", lambda *a, **kw: calls.append(1) or real(*a, **kw))
    d = design_from_data({"schema_version": 2, "description": "invented test row", "body": {"mass": "0.5 g"},
                          "elements": [{"kind": "rod_row", "position": ["0 mm", "0 mm"], "radius": "0.25 mm",
                                        "length": "40 mm", "rods": 3, "spacing": "1.2 mm", "material": "steel",
                                        "coating": {"advancing": "115 deg"}}]})
    write_pdf(d, solve_device(d), tmp_path / "row.pdf")
    assert calls and (tmp_path / "row.pdf").stat().st_size > 10_000
