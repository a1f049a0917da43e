"""The page in a real headless Chromium: it opens with results, an input change changes them,
a bad value shows its message at the field, and the saved design file loads in Python and in
``floatcalc device``.

Starts ``streamlit run app.py`` on 127.0.0.1 at a free port in a subprocess, drives the page
with Playwright's Python API on the Debian Chromium at /usr/bin/chromium (never a downloaded
browser), saves a screenshot to a temporary path (printed), and always stops the server.
"""

from __future__ import annotations

import json
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


def start_server(log_path: Path):
    """(process, url, log file) of ``streamlit run app.py`` on a free local port."""
    port = _free_port()
    log = open(log_path, "w")
    env = {**os.environ, "MPLBACKEND": "Agg"}
    proc = subprocess.Popen(
        [sys.executable, "-m", "streamlit", "run", str(REPO / "app.py"), "--server.headless", "true",
         "--server.port", str(port), "--server.address", "127.0.0.1", "--browser.gatherUsageStats", "false",
         "--server.fileWatcherType", "none"],
        cwd=REPO, stdout=log, stderr=subprocess.STDOUT, env=env)
    url = f"http://127.0.0.1:{port}"
    try:
        _wait_healthy(url, proc)
    except Exception:
        stop_server(proc, log)
        raise
    return proc, url, log


def stop_server(proc, log) -> None:
    proc.terminate()
    try:
        proc.wait(timeout=15)
    except subprocess.TimeoutExpired:
        proc.kill()
        proc.wait(timeout=15)
    log.close()


@pytest.fixture()
def server(tmp_path):
    proc, url, log = start_server(tmp_path / "streamlit.log")
    try:
        yield url
    finally:
        stop_server(proc, log)


def settle(page) -> None:
    """Wait until the page has finished its run (no running-status widget)."""
    page.wait_for_timeout(1500)
    page.wait_for_function("() => !document.querySelector('[data-testid=\"stStatusWidget\"]')",
                           timeout=120_000)
    page.wait_for_timeout(600)


def _capacity(page) -> float:
    row = page.locator('[data-testid="stTable"] tr', has_text="capacity (every element intact)").first
    return float(row.locator("td").last.inner_text().split()[0])


def test_page_in_chromium_reacts_and_saves_a_loadable_design(server, tmp_path):
    from playwright.sync_api import sync_playwright

    with sync_playwright() as p:
        ctx = p.chromium.launch_persistent_context(
            user_data_dir=str(tmp_path / "chromium-profile"), executable_path=CHROMIUM, headless=True,
            args=FLAGS, viewport={"width": 1280, "height": 800}, accept_downloads=True)
        try:
            page = ctx.new_page()
            page.goto(server, timeout=90_000)
            page.get_by_text("Verdict: floats").first.wait_for(timeout=120_000)
            page.get_by_text("twelve-leg surface skimmer").first.wait_for(timeout=30_000)
            settle(page)
            before = _capacity(page)
            field = page.get_by_role("textbox", name="radius [mm]").first
            field.fill("0.25 mm")
            field.press("Enter")
            deadline = time.monotonic() + 90
            after = before
            while time.monotonic() < deadline and after == before:
                page.wait_for_timeout(400)
                after = _capacity(page)
            assert after != before, f"capacity stayed at {before}"
            settle(page)
            shot = tmp_path / "floatcalc_page.png"
            page.screenshot(path=str(shot), full_page=True)
            print(f"screenshot: {shot}")
            assert shot.stat().st_size > 10_000
            # the saved design loads in Python and in floatcalc device
            with page.expect_download(timeout=60_000) as dl:
                page.get_by_text("save this design (TOML)").first.click()
            saved = tmp_path / "saved.toml"
            dl.value.save_as(saved)
            from floatcalc.design import load_design

            d = load_design(saved)
            assert d.data["elements"][0]["radius"] == "0.25 mm" and not d.notes
            code = "import sys; from floatcalc.cli import main; sys.exit(main(sys.argv[1:]))"
            res = subprocess.run([sys.executable, "-c", code, "device", str(saved), "--json"], cwd=REPO,
                                 capture_output=True, text=True, timeout=300)
            assert res.returncode == 0, res.stderr
            cap = json.loads(res.stdout)["capacity_N"] * 1e3
            assert cap == pytest.approx(after, rel=1e-3)  # one answer: page and command
            # a bad value: its message at the field, the last results kept and marked
            field.fill("-1 mm")
            field.press("Enter")
            page.get_by_text("elements[0].radius: must be positive").first.wait_for(timeout=60_000)
            page.get_by_text("Not current").first.wait_for(timeout=30_000)
            assert page.get_by_text("Traceback").count() == 0
        finally:
            ctx.close()
