"""Shared test settings: Hypothesis profile (seeded, no deadline) and common fixtures."""

from __future__ import annotations

import pytest
from hypothesis import settings

# One Streamlit server and one Chromium per pytest process, shared by the browser tests
# (tests/_browser.py; started only when such a test runs).
from _browser import browser_context, browser_server  # noqa: E402,F401

# Derandomised so that every run explores the same examples (house rule: seeded randomness).
settings.register_profile("floatcalc", derandomize=True, deadline=None, print_blob=True)
settings.load_profile("floatcalc")


@pytest.fixture(scope="session")
def water20():
    import floatcalc as fc

    return fc.water("20 degC")
