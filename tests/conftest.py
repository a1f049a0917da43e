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


# Count of deselected tests. Under pytest-xdist the workers collect and deselect, so each sends
# its count to the controller (every worker collects the same tests: one count is kept).
_DESELECTED = {"n": 0}


def pytest_deselected(items):
    _DESELECTED["n"] += len(items)


def pytest_sessionfinish(session, exitstatus):
    out = getattr(session.config, "workeroutput", None)
    if out is not None:
        out["floatcalc_deselected"] = _DESELECTED["n"]


def pytest_testnodedown(node, error):
    n = getattr(node, "workeroutput", {}).get("floatcalc_deselected")
    if n is not None:
        _DESELECTED["n"] = max(_DESELECTED["n"], n)


def pytest_terminal_summary(terminalreporter, exitstatus, config):
    """Say what the lane left out (nothing is skipped silently): the default lane deselects the
    tests marked slow (pyproject addopts ``-m 'not slow'``)."""
    expr = config.option.markexpr or ""
    if "not slow" in expr:
        n = _DESELECTED["n"]
        terminalreporter.write_line(
            f"quick lane: {n} test(s) deselected (-m {expr!r} leaves out those marked slow); run them with "
            "`pytest -n auto -m slow`, "
            "everything with `pytest -n auto -m \"\"`; CI (.ci/run) runs both lanes",
            yellow=True)
