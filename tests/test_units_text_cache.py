"""units.to_si keeps text it converted (the page validates every field on each rerun): the kept
value is the one the grammar gives, a text is kept per kind (the same text can be valid for one
kind and wrong for another), and failures are never kept (their messages name their field)."""

from __future__ import annotations

import pytest

from floatcalc import units
from floatcalc.errors import InputError


def test_kept_text_gives_the_same_value_and_kinds_stay_apart():
    units._TEXT_SI.clear()
    first = units.to_si("0.15 mm", "length", "radius")
    assert first == pytest.approx(1.5e-4, rel=1e-12)  # 1 mm = 1e-3 m (SI definition)
    assert units.to_si("0.15 mm", "length", "other") == first
    assert ("0.15 mm", "length") in units._TEXT_SI
    with pytest.raises(InputError, match=r"^heading: "):
        units.to_si("0.15 mm", "angle", "heading")  # a length is no angle, kept or not


def test_failures_are_not_kept_and_name_each_field():
    units._TEXT_SI.clear()
    for field in ("a", "b"):
        with pytest.raises(InputError, match=rf"^{field}: "):
            units.to_si("22 C", "temperature", field)
    assert not units._TEXT_SI
    with pytest.raises(InputError):
        units.to_si(["1 mm"], "length", "x")  # a list of text: refused, nothing kept
    assert not units._TEXT_SI
