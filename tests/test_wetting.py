"""Texture models (floatcalc.core.wetting) and coatings under pressure (floatcalc.motion.coating).

Checks and their sources:
* Wenzel and Cassie–Baxter angles: the same numbers as floatcalc.device.elements.effective_angle
  (one question, one answer; the device will be pointed at the core function) and hand values;
* depinning pressure of square posts against its closed form −4aσcosθ_a/(p² − a²) (Extrand,
  Langmuir 18, 7991, 2002; Zheng, Yu & Zhao, Langmuir 21, 12207, 2005) evaluated here by hand;
* grooves against the geometry of a circular meniscus of radius R = σ/Δp spanning the gap and
  meeting the walls at θ_a (an independent construction);
* sag pressures against the sagitta of the arc/cap they describe;
* the flooding switch is monotone in speed and in depth (Hypothesis).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from floatcalc.core import wetting
from floatcalc.device.elements import effective_angle as device_angle
from floatcalc.errors import InputError
from floatcalc.liquids import water
from floatcalc.motion.coating import check_texture, coating_under_pressure

W = water("20 degC")
POSTS = {"texture": "posts", "post_size": 10e-6, "pitch": 40e-6, "post_height": 30e-6}


@pytest.mark.parametrize("deg", [60.0, 95.0, 110.0, 150.0])
def test_effective_angle_matches_device_elements(deg):
    th = math.radians(deg)
    for r in (1.0, 1.4, 3.0):
        assert wetting.effective_angle(th, "wenzel", roughness=r) == pytest.approx(
            device_angle(th, {"texture": "wenzel", "roughness": r}), abs=1e-14)
    for f in (0.05, 0.3, 1.0):
        assert wetting.effective_angle(th, "cassie", solid_fraction=f) == pytest.approx(
            device_angle(th, {"texture": "cassie", "solid_fraction": f}), abs=1e-14)
    assert wetting.effective_angle(th) == pytest.approx(th)


def test_effective_angle_is_vectorised_and_clipped():
    th = np.radians([100.0, 120.0, 80.0])
    out = wetting.effective_angle(th, "wenzel", roughness=np.array([1.0, 3.0, 3.0]))
    assert out[0] == pytest.approx(th[0])
    assert out[1] == pytest.approx(math.pi)      # 3 cos 120° = −1.5 → clipped: complete non-wetting
    assert out[2] == pytest.approx(math.acos(3 * math.cos(th[2])))
    with pytest.raises(ValueError):
        wetting.effective_angle(1.0, "lotus")


def test_square_post_depinning_closed_form():
    # a = 10 µm, p = 40 µm, θ_a = 115°, σ = 72.74 mN/m:
    # Δp = −4 · 10e-6 · 0.07274 · cos 115° / (1600e-12 − 100e-12) = 819.8 Pa (by hand)
    a, p, th = 10e-6, 40e-6, math.radians(115)
    hand = -4 * a * W.sigma * math.cos(th) / (p * p - a * a)
    assert hand == pytest.approx(819.8, rel=1e-3)
    assert W.sigma * wetting.depinning_pressure("posts", a, p, th) == pytest.approx(hand, rel=1e-12)
    # scale-free: lengths in capillary lengths give the pressure in ρ g l_c
    lc = W.lc
    scaled = wetting.depinning_pressure("posts", a / lc, p / lc, th) * W.rho * W.g * lc
    assert scaled == pytest.approx(hand, rel=1e-9)


def test_groove_depinning_from_arc_geometry():
    # A circular meniscus across a gap of width w meets a vertical wall at θ_a when its
    # inclination at the wall is θ_a − 90°, i.e. R = (w/2) / sin(θ_a − 90°); Δp = σ / R.
    for deg in (100.0, 120.0, 150.0, 175.0):
        th = math.radians(deg)
        a, p = 5e-6, 25e-6
        w = p - a
        R = 0.5 * w / math.sin(th - math.pi / 2)
        assert wetting.depinning_pressure("grooves", a, p, th) == pytest.approx(1.0 / R, rel=1e-12)
    assert wetting.depinning_pressure("grooves", 1.0, 2.0, math.radians(80)) == 0.0


@pytest.mark.parametrize("texture,s_of,k", [("grooves", lambda a, p: 0.5 * (p - a), 1.0),
                                            ("posts", lambda a, p: (p - a) / math.sqrt(2), 2.0)])
def test_sag_pressure_is_the_touch_down_of_its_arc(texture, s_of, k):
    a, p, h = 2.0, 10.0, 1.5
    dp = wetting.sag_pressure(texture, a, p, h)
    R = k / dp                     # Laplace: Δp = σ/R (arc) or 2σ/R (cap), σ = 1
    s = s_of(a, p)
    assert R - math.sqrt(R * R - s * s) == pytest.approx(h, rel=1e-12)


def test_shallow_texture_fails_by_sag_tall_by_depinning():
    th = math.radians(150)
    _, sag_shallow = wetting.critical_pressure("posts", 10e-6, 60e-6, 1e-6, th)
    _, sag_tall = wetting.critical_pressure("posts", 10e-6, 60e-6, 100e-6, th)
    assert sag_shallow and not sag_tall


def test_flooding_switch_and_wenzel_fallback():
    dry = coating_under_pressure(POSTS, "115 deg", W, depth="4 mm", speed="0.5 m/s")
    wet = coating_under_pressure(POSTS, "115 deg", W, depth="4 mm", speed="2 m/s")
    assert dry.state == "cassie" and not dry.floods
    assert wet.state == "wenzel" and wet.floods and any("Wenzel angle" in w for w in wet.warnings)
    # Cassie angle from f = 1/16 and Wenzel from r = 1 + 4·10·30/1600 = 1.75 (by hand)
    assert dry.contact_angle.to("deg").magnitude == pytest.approx(
        math.degrees(math.acos((math.cos(math.radians(115)) + 1) / 16 - 1)), rel=1e-12)
    assert wet.contact_angle.to("deg").magnitude == pytest.approx(
        math.degrees(math.acos(1.75 * math.cos(math.radians(115)))), rel=1e-12)
    # the flooding speed is where ½ρv² closes the gap to the critical pressure
    v = dry.flooding_speed.to("m/s").magnitude
    pc, ph = dry.critical_pressure.to("Pa").magnitude, dry.hydrostatic_pressure.to("Pa").magnitude
    assert 0.5 * W.rho * v * v == pytest.approx(pc - ph, rel=1e-12)


@settings(max_examples=60, deadline=None, derandomize=True)
@given(st.floats(0.0, 5.0), st.floats(0.0, 5.0), st.floats(0.0, 8e-3))
def test_flooding_is_monotone_in_speed_and_depth(v1, v2, depth):
    lo, hi = sorted((v1, v2))
    a = coating_under_pressure(POSTS, "120 deg", W, depth=depth, speed=lo)
    b = coating_under_pressure(POSTS, "120 deg", W, depth=depth, speed=hi)
    deeper = coating_under_pressure(POSTS, "120 deg", W, depth=depth + 1e-3, speed=lo)
    assert (not a.floods) or b.floods
    assert (not a.floods) or deeper.floods


def test_wetting_material_floods_at_once():
    s = coating_under_pressure(POSTS, "80 deg", W, depth=0.0, speed=0.0)
    assert s.floods and s.critical_pressure.magnitude == 0.0


def test_texture_dict_problems():
    assert check_texture(POSTS) == []
    bad = check_texture({"texture": "pillars", "post_size": -1.0, "pitch": 1e-5, "height": 1e-5})
    assert any(p.startswith("coating.height: unknown") for p in bad)
    assert any(p.startswith("coating.texture:") for p in bad)
    assert any(p.startswith("coating.post_size:") for p in bad)
    assert any(p.startswith("coating.post_height: required") for p in bad)
    with pytest.raises(InputError, match="texture.pitch"):
        coating_under_pressure({**POSTS, "pitch": 5e-6}, "115 deg", W)


def test_posts_texture_in_a_design_file_sets_the_angle_and_is_checked_under_pressure():
    # A textured coating given in the design file (posts: size, pitch, height): at rest the
    # Cassie–Baxter angle with f = a²/p² (Cassie & Baxter 1944); in a fast stroke the
    # Cassie-to-Wenzel check of floatcalc.motion (Extrand 2002) decides whether it floods.
    import math

    import pytest

    import floatcalc as fc
    from floatcalc.core import wetting
    from floatcalc.design import design_from_data
    from floatcalc.motion.stroke import stroke

    coat = {"advancing": "110 deg", "texture": "posts", "post_size": "10 um", "pitch": "40 um", "post_height": "20 um"}
    d = design_from_data({"schema_version": 2, "body": {"mass": "0.3 g"}, "elements": [
        {"kind": "rod", "count": 4, "layout": "around", "layout_radius": "20 mm", "radius": "0.15 mm",
         "length": "20 mm", "material": "steel", "coating": coat}]})
    c = d.elements[0]["coating"]
    assert [c[k] for k in ("post_size", "pitch", "post_height")] == pytest.approx([1e-5, 4e-5, 2e-5], rel=1e-12)
    expect = wetting.effective_angle(math.radians(110), "cassie", solid_fraction=(10 / 40) ** 2)
    r = fc.solve_device(d)
    assert r.device.models[0].geometry["theta"] == pytest.approx(expect, rel=1e-12)
    slow = stroke(d, "50 ms", "0.1 mN", leg_speed="0.05 m/s")
    fast = stroke(d, "50 ms", "0.1 mN", leg_speed="20 m/s")
    assert slow.coating and fast.coating
    # flooding is monotone in speed: what floods slowly floods fast
    flooded = lambda res: sum(bool(getattr(s, "floods", getattr(s, "flooded", False))) for s in res.coating)  # noqa: E731
    assert flooded(fast) >= flooded(slow)


def test_texture_keys_are_validated_with_key_paths():
    import pytest

    from floatcalc.design import design_from_data
    from floatcalc.errors import InputError

    coat = {"advancing": "110 deg", "texture": "posts", "post_size": "40 um", "pitch": "10 um", "post_height": "20 um"}
    with pytest.raises(InputError, match=r"elements\[0\]\.coating\.pitch: must be larger than post_size"):
        design_from_data({"schema_version": 2, "body": {"mass": "0.3 g"}, "elements": [
            {"kind": "ball", "position": ["0 mm", "0 mm"], "radius": "1 mm", "material": "steel", "coating": coat}]})
