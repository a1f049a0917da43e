"""Hypothesis fuzzing of the value grammar (floatcalc.units.to_si on text).

Random texts built from digits, unit names and operator characters must give a float or an
InputError (never another exception, a hang, or a non-finite float), each within 50 ms of CPU
(``time.thread_time``: the calling thread's CPU, where the parser runs; ``process_time`` counts
every thread of the pytest-xdist worker, and in one quick-lane run charged 0.48 s to a single
call that takes under 1 ms in a fresh process).
Well-formed values built from a number and a unit of known size must convert exactly; the unit
sizes are exact definitions (NIST SP 811, 2008 edition, appendix B).
"""

from __future__ import annotations

import math
import time

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from floatcalc.errors import InputError
from floatcalc.units import KINDS, to_si

_NAMES = ["mm", "m", "um", "µm", "cm", "kg", "g", "N", "mN", "s", "deg", "degC", "degF", "C", "F",
          "K", "rad", "%", "°", "°C", "in", "ft", "Pa", "GPa", "dyn", "e", "E", "nan", "inf", "mmm"]
_CHARS = list("0123456789.eE+-*/^() ,_") + ["**", "·", "²", "³", "⁻", "\u2212", "\u00a0", "\u2028", "\x1b",
                                              "x", "\\", "'", "9**9", "1e999", "1e-999"]
_TOKENS = st.sampled_from(_NAMES + _CHARS)
_TEXT = st.lists(_TOKENS, max_size=40).map("".join)

_FUZZ = settings(max_examples=400, deadline=None, derandomize=True,
                 suppress_health_check=[HealthCheck.too_slow])


@pytest.fixture(scope="module", autouse=True)
def _registry_built():
    to_si("1 mm", "length", "x")  # the registry's one-off build is not part of the timings


@_FUZZ
@given(text=_TEXT, kind=st.sampled_from(sorted(KINDS)))
def test_random_text_gives_a_float_or_an_input_error_quickly(text, kind):
    t0 = time.thread_time()
    try:
        value = to_si(text, kind, "x")
    except InputError as exc:
        msg = str(exc)
        assert msg.startswith("x: ") and msg == msg.splitlines()[0], repr(msg)
    else:
        assert isinstance(value, float) and math.isfinite(value), (text, value)
    assert time.thread_time() - t0 < 0.05, text


@_FUZZ
@given(text=st.text(max_size=80), kind=st.sampled_from(sorted(KINDS)))
def test_arbitrary_unicode_gives_a_float_or_an_input_error(text, kind):
    t0 = time.thread_time()
    try:
        value = to_si(text, kind, "x")
    except InputError:
        pass
    else:
        assert isinstance(value, float) and math.isfinite(value), (text, value)
    assert time.thread_time() - t0 < 0.05, repr(text)


# unit -> (kind, size in SI); exact by definition (NIST SP 811 appendix B)
_SIZES = {
    "mm": ("length", 1e-3), "um": ("length", 1e-6), "µm": ("length", 1e-6), "cm": ("length", 1e-2),
    "inch": ("length", 0.0254), "ft": ("length", 0.3048), "m": ("length", 1.0),
    "mN/m": ("surface_tension", 1e-3), "dyn/cm": ("surface_tension", 1e-3),
    "kg/m^3": ("density", 1.0), "g/cm³": ("density", 1000.0), "g/kg": ("salinity", 1.0),
    "mN": ("force", 1e-3), "GPa": ("pressure", 1e9), "mPa*s": ("viscosity", 1e-3),
}


@_FUZZ
@given(x=st.floats(min_value=-1e6, max_value=1e6, allow_nan=False, allow_infinity=False),
       unit=st.sampled_from(sorted(_SIZES)), space=st.sampled_from(["", " ", "  ", "\u00a0"]),
       style=st.sampled_from(["{:.6g}", "{:.3e}", "{!r}", "{:.4f}"]))
def test_well_formed_values_convert_exactly(x, unit, space, style):
    number = style.format(x)
    kind, size = _SIZES[unit]
    assert to_si(f"{number}{space}{unit}", kind, "x") == pytest.approx(float(number) * size, rel=1e-12, abs=1e-300)
