"""Public API of the vertical-wall meniscus (floatcalc.wall_meniscus).

The physics (de Gennes et al. rise formula, profile against direct ODE integration) is checked
in tests/reference/test_rod_reference.py; here: units, signs, Wilhelmy pull, errors.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

import floatcalc as fc
from floatcalc.errors import InputError


def test_signs_and_symmetry():
    up = fc.wall_meniscus("30 deg")
    down = fc.wall_meniscus("150 deg")
    flat = fc.wall_meniscus("90 deg")
    assert up.contact_height.magnitude > 0 > down.contact_height.magnitude
    # θ and 180° − θ give mirror-image menisci (de Gennes et al. 2004: h ∝ sqrt(2(1 − sin θ)))
    assert up.contact_height.to("m").magnitude == pytest.approx(-down.contact_height.to("m").magnitude)
    assert flat.contact_height.to("m").magnitude == pytest.approx(0.0, abs=1e-15)
    assert up.inclination_at_wall.to("deg").magnitude == pytest.approx(60.0)


def test_wilhelmy_pull_and_json():
    # Wilhelmy (1863): a wetted plate is pulled down with σ cos θ per unit length; θ = 0 → σ.
    w = fc.water("20 degC")
    r = fc.wall_meniscus("0 deg", liquid=w)
    assert r.force_per_length.to("N/m").magnitude == pytest.approx(w.sigma, rel=1e-12)
    d = r.to_dict()
    assert {"contact_height_m", "force_per_length_N_per_m", "contact_angle_deg", "capillary_length_m"} <= set(d)
    assert d["contact_height_m"] == pytest.approx(math.sqrt(2) * w.lc, rel=1e-12)
    assert d["cautions"] and "profile" not in d
    x, z = r.profile["x_m"], r.profile["z_m"]
    assert x[0] == 0.0 and z[0] == pytest.approx(d["contact_height_m"])
    assert np.all(np.diff(x) > 0) and np.all(np.isfinite(z))


def test_flammable_liquid_caution_reaches_result():
    r = fc.wall_meniscus("20 deg", liquid=fc.liquid("acetone"))
    assert any("Flammable" in c for c in r.cautions)


@pytest.mark.parametrize("value, fragment", [
    ("190 deg", "contact_angle: must be between 0 and 180 deg"),
    ("30", "contact_angle: needs a unit"),
    ("nan deg", "contact_angle: must be a finite number"),
    ("3 mm", "contact_angle: must be an angle"),
])
def test_bad_angles(value, fragment):
    with pytest.raises(InputError, match=fragment):
        fc.wall_meniscus(value)
