"""The page in a real headless Chromium: it opens with results, an input change changes them.

Starts ``streamlit run app.py`` on 127.0.0.1 at a free port in a subprocess, drives the page
with Playwright's Python API on the Debian Chromium at /usr/bin/chromium (never a downloaded
browser), saves a screenshot to a temporary path (printed), and always stops the server.
"""

from __future__ import annotations

import os
import socket
import subprocess
import sys
import time
import urllib.request
from pathlib import Path

import pytest

CHROMIUM = "/usr/bin/chromium"
REPO = Path(__file__).resolve().parents[1]
FLAGS = ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
         "--disable-background-networking", "--disable-component-update", "--disable-sync"]

pytestmark = [
    pytest.mark.browser,
    pytest.mark.slow,
    pytest.mark.skipif(not os.path.exists(CHROMIUM),
                       reason="Debian chromium is not installed at /usr/bin/chromium (.ci/run installs it)"),
]


def _free_port() -> int:
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


def _wait_healthy(url: str, proc, timeout: float = 90.0) -> None:
    end = time.monotonic() + timeout
    while time.monotonic() < end:
        if proc.poll() is not None:
            raise RuntimeError(f"streamlit exited early with code {proc.returncode}")
        try:
            with urllib.request.urlopen(url + "/_stcore/health", timeout=2) as r:
                if r.read().strip() == b"ok":
                    return
        except OSError:
            pass
        time.sleep(0.3)
    raise TimeoutError(f"streamlit did not answer at {url} within {timeout:.0f} s")


@pytest.fixture()
def server(tmp_path):
    port = _free_port()
    log = open(tmp_path / "streamlit.log", "w")
    env = {**os.environ, "MPLBACKEND": "Agg"}
    proc = subprocess.Popen(
        [sys.executable, "-m", "streamlit", "run", str(REPO / "app.py"), "--server.headless", "true",
         "--server.port", str(port), "--server.address", "127.0.0.1", "--browser.gatherUsageStats", "false",
         "--server.fileWatcherType", "none"],
        cwd=REPO, stdout=log, stderr=subprocess.STDOUT, env=env)
    url = f"http://127.0.0.1:{port}"
    try:
        _wait_healthy(url, proc)
        yield url
    finally:
        proc.terminate()
        try:
            proc.wait(timeout=15)
        except subprocess.TimeoutExpired:
            proc.kill()
            proc.wait(timeout=15)
        log.close()


def _settle(page) -> None:
    """Wait until the page has finished its run: drawing and report buttons shown, no status."""
    page.get_by_text("FLOATS WITH MARGIN").first.wait_for(timeout=30_000)
    page.locator('[data-testid="stImage"] img').first.wait_for(timeout=60_000)
    page.get_by_text("Prepare the PDF report").first.wait_for(timeout=60_000)
    page.wait_for_function("() => !document.querySelector('[data-testid=\"stStatusWidget\"]')",
                           timeout=60_000)
    page.wait_for_timeout(500)


def _capacity(page) -> str:
    return page.locator('[data-testid="stMetricValue"]').first.inner_text()


def test_page_in_chromium_reacts_to_an_input(server, tmp_path):
    from playwright.sync_api import sync_playwright

    with sync_playwright() as p:
        ctx = p.chromium.launch_persistent_context(
            user_data_dir=str(tmp_path / "chromium-profile"), executable_path=CHROMIUM, headless=True,
            args=FLAGS, viewport={"width": 1500, "height": 1800})
        try:
            page = ctx.new_page()
            page.goto(server, timeout=90_000)
            page.get_by_text("FLOATS WITH MARGIN").first.wait_for(timeout=90_000)
            page.get_by_text("Invented example: twelve-leg surface skimmer").first.wait_for(timeout=30_000)
            before = _capacity(page)
            field = page.get_by_role("textbox", name="Leg radius")
            field.fill("0.25 mm")
            field.press("Enter")
            deadline = time.monotonic() + 60
            after = before
            while time.monotonic() < deadline and after == before:
                page.wait_for_timeout(300)
                after = _capacity(page)
            assert after != before, f"capacity stayed at {before}"
            # Thicker legs of the same length carry more (Vella, Lee & Kim, Langmuir 22, 5979, 2006).
            assert float(after.split()[0]) > float(before.split()[0])
            _settle(page)
            shot = tmp_path / "floatcalc_page.png"
            page.screenshot(path=str(shot), full_page=True)
            print(f"screenshot: {shot}")
            assert shot.stat().st_size > 10_000
            # A bad value shows its message beside the field, no traceback.
            field.fill("-1 mm")
            field.press("Enter")
            page.get_by_text("radius: must be positive, got -1 mm").first.wait_for(timeout=30_000)
            assert page.get_by_text("Traceback").count() == 0
        finally:
            ctx.close()
