"""Shared test settings: Hypothesis profile (seeded, no deadline) and common fixtures."""

from __future__ import annotations

import pytest
from hypothesis import settings

# Derandomised so that every run explores the same examples (house rule: seeded randomness).
settings.register_profile("floatcalc", derandomize=True, deadline=None, print_blob=True)
settings.load_profile("floatcalc")


@pytest.fixture(scope="session")
def water20():
    import floatcalc as fc

    return fc.water("20 degC")
