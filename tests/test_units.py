"""The units boundary: floatcalc.units.to_si and format_si.

Conversion factors are checked against exact definitions (NIST SP 811, 2008 edition):
1 in = 25.4 mm, 1 ° = π/180 rad, T[K] = (T[°F] + 459.67)·5/9, 1 dyn/cm = 1 mN/m,
1 g/cm³ = 1000 kg/m³.
"""

from __future__ import annotations

import math

import numpy as np
import pint
import pytest

from floatcalc.errors import InputError
from floatcalc.units import Q_, format_si, registry, to_si


@pytest.mark.parametrize("value, kind, expected", [
    ("0.15 mm", "length", 0.15e-3),
    ("150 um", "length", 150e-6),
    ("150 µm", "length", 150e-6),          # micro sign as users paste it
    ("150 μm", "length", 150e-6),          # Greek mu
    ("1 inch", "length", 0.0254),          # NIST SP 811: exact
    ("0.25mm", "length", 0.25e-3),
    ("150 deg", "angle", math.radians(150)),
    ("150°", "angle", math.radians(150)),
    ("2.5 rad", "angle", 2.5),
    ("20 degC", "temperature", 293.15),
    ("20 °C", "temperature", 293.15),
    ("68 degF", "temperature", (68 + 459.67) * 5 / 9),  # NIST SP 811
    ("300 K", "temperature", 300.0),
    ("72 dyn/cm", "surface_tension", 0.072),           # 1 dyn/cm = 1 mN/m
    ("1 g/cm^3", "density", 1000.0),
    ("35 g/kg", "salinity", 35.0),
    ("3.5 %", "salinity", 35.0),
    ("5 mN", "force", 5e-3),
])
def test_strings_convert_to_si(value, kind, expected):
    assert to_si(value, kind, "x") == pytest.approx(expected, rel=1e-12)


def test_plain_numbers_are_si_and_arrays_need_permission():
    assert to_si(2.5e-4, "length", "radius") == 2.5e-4
    a = to_si([1e-4, 2e-4], "length", "radius", array=True)
    np.testing.assert_array_equal(a, [1e-4, 2e-4])
    with pytest.raises(InputError, match="radius: must be a single value"):
        to_si([1e-4, 2e-4], "length", "radius")


def test_quantities_from_this_and_other_registries():
    assert to_si(Q_(250, "um"), "length", "radius") == pytest.approx(2.5e-4)
    other = pint.UnitRegistry()
    assert to_si(other.Quantity(0.25, "mm"), "length", "radius") == pytest.approx(2.5e-4)
    assert to_si(other.Quantity(150, "degree"), "angle", "a") == pytest.approx(math.radians(150))
    assert registry() is registry()  # one registry for the package


@pytest.mark.parametrize("value, kind, fragment", [
    ("3 kg", "length", "radius: must be a length"),
    ("2 mm", "angle", "radius: must be an angle"),
    ("150", "angle", "radius: needs a unit"),
    ("35", "salinity", "radius: needs a unit"),
    ("", "length", "radius: must be a length (e.g. '0.2 mm'), got an empty string"),
    ("abc", "length", "radius: is not a number with a unit"),
    ("nan mm", "length", "radius: must be a finite number"),
    ("inf mm", "length", "radius: must be a finite number"),
    (float("nan"), "length", "radius: must be a finite number"),
    (None, "length", "radius: must be a length"),
    (True, "length", "radius: must be a length"),
    ("1 deg", "length", "radius: must be a length"),   # dimensionless angle is not a length ratio
    ("5 mm", "temperature", "radius: must be a temperature"),
])
def test_bad_values_give_one_line_input_errors(value, kind, fragment):
    with pytest.raises(InputError) as info:
        to_si(value, kind, "radius")
    msg = str(info.value)
    assert fragment in msg
    assert "\n" not in msg


def test_unknown_kind_is_a_programming_error():
    with pytest.raises(KeyError):
        to_si(1.0, "colour", "x")


def test_format_si():
    assert format_si(1.5e-4, "length", "mm") == "0.15 mm"
    assert format_si(0.0254, "length", "inch") == "1 inch"


def test_import_floatcalc_stays_light():
    # House rule (DEVELOPERS.md): plain `import floatcalc` loads none of pint, SciPy,
    # matplotlib or Streamlit; checked in a fresh interpreter.
    import json
    import subprocess
    import sys

    code = ("import sys, json, floatcalc; "
            "print(json.dumps([m for m in ('pint', 'scipy', 'matplotlib', 'streamlit') if m in sys.modules]))")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True, timeout=60)
    assert json.loads(out.stdout) == []


def test_every_lazy_export_resolves():
    import floatcalc

    for name in floatcalc.__all__:
        assert getattr(floatcalc, name) is not None, name
    with pytest.raises(AttributeError):
        floatcalc.no_such_name  # noqa: B018
