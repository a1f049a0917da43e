"""Shared helpers of the browser tests (tests/test_browser.py, tests/test_page_fuzz.py) and of
tests/screenshots.py: the Streamlit server, the Chromium context and waiting for a page run.

* :func:`start_server` / :func:`stop_server`: ``streamlit run app.py`` on 127.0.0.1 at a free
  port, waited for on its health endpoint; always stopped.
* :func:`launch_context`: Playwright on the Debian Chromium at /usr/bin/chromium (never a
  downloaded browser), with :data:`FLAGS`, and a watcher of the page's run state.
* :func:`settle`: waits on real conditions, no fixed sleeps: the page's own run state, the
  attribute ``data-test-script-state`` of ``[data-testid="stApp"]`` that Streamlit keeps at
  ``notRunning`` between runs. A script injected into every page (:data:`WATCH_JS`) counts the
  runs that finished; ``settle`` waits until a run that finished after the last settle is seen
  (a short wait when the action started none, e.g. opening an expander), then until the page is
  idle and stays idle for a short quiet time (a run may ask for another, e.g. loading an
  example).
* The fixtures ``browser_server`` and ``browser_context`` (session scope, imported by
  tests/conftest.py): one server and one Chromium per pytest process at most, shared by every
  browser test that runs in it, started only when such a test runs.
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

# pytestmark of every browser test module
MARKS = [
    pytest.mark.browser,
    pytest.mark.slow,
    pytest.mark.skipif(not os.path.exists(CHROMIUM),
                       reason="Debian chromium is not installed at /usr/bin/chromium (.ci/run installs it)"),
]

# Counts the page runs that finished (the app root's run state going back to notRunning).
WATCH_JS = """(() => {
  if (window.__fcWatch) return;
  window.__fcWatch = true;
  window.__fcDone = 0;
  let last = null;
  const look = () => {
    const app = document.querySelector('[data-testid="stApp"]');
    const s = app ? app.getAttribute('data-test-script-state') : null;
    if (s !== last) {
      if (s === 'notRunning' && last !== null) window.__fcDone += 1;
      last = s;
    }
  };
  new MutationObserver(look).observe(document, {subtree: true, childList: true, attributes: true,
                                               attributeFilter: ['data-test-script-state']});
})();"""
IDLE_JS = """() => {
  const app = document.querySelector('[data-testid="stApp"]');
  return !!app && app.getAttribute('data-test-script-state') === 'notRunning'
         && !document.querySelector('[data-testid="stStatusWidget"]');
}"""
DONE_JS = "(n) => (window.__fcDone || 0) > n"

START_S = 5.0    # how long an action may take to start its run (a fresh run starts in well under 1 s)
QUIET_S = 0.2    # idle this long after a run: no further run asked for (a follow-up run starts within ms)
RUN_S = 120.0    # the longest a run may take on a loaded shared machine


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
        time.sleep(0.2)
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


def launch_context(playwright, profile_dir: Path, height: int = 800, **kw):
    """A persistent Chromium context (the Debian build, :data:`FLAGS`) whose pages count their runs."""
    ctx = playwright.chromium.launch_persistent_context(
        user_data_dir=str(profile_dir), executable_path=CHROMIUM, headless=True, args=FLAGS,
        viewport={"width": 1280, "height": height}, **kw)
    ctx.add_init_script(WATCH_JS)
    return ctx


_SEEN: dict[int, int] = {}  # id(page) -> finished runs counted at its last settle


def _done(page) -> int:
    return int(page.evaluate("() => window.__fcDone || 0"))


def settle(page, timeout_s: float = RUN_S, rerun: bool = True) -> float:
    """Wait until the run started by the last action has finished and the page is idle; returns
    the seconds it took. ``rerun=False`` for an action that starts no run (no wait for one)."""
    t0 = time.monotonic()
    seen = _SEEN.get(id(page), 0)
    if rerun:
        try:  # a run finished since the last settle (or this action's run, still going, ends)
            page.wait_for_function(DONE_JS, arg=seen, timeout=START_S * 1000, polling=50)
        except Exception:  # noqa: BLE001 - no run finished yet: running (waited below) or none started
            pass
    while True:
        page.wait_for_function(IDLE_JS, timeout=timeout_s * 1000, polling=50)
        n = _done(page)
        page.wait_for_timeout(QUIET_S * 1000)
        if _done(page) == n and page.evaluate(IDLE_JS):
            break
    _SEEN[id(page)] = _done(page)
    dt = time.monotonic() - t0
    if os.environ.get("FLOATCALC_SETTLE_LOG"):  # a developer's aid: where the browser tests wait
        caller = sys._getframe(1)
        print(f"settle {dt:5.2f} s ({_SEEN[id(page)] - seen} runs) at {caller.f_code.co_name}:{caller.f_lineno}")
    return dt


def open_page(url: str, context, timeout_s: float = RUN_S, before=None):
    """A new page (a new Streamlit session) on the opening design, settled; ``before(page)`` is
    called before the page requests anything."""
    pg = context.new_page()
    if before is not None:
        before(pg)
    pg.set_default_timeout(90_000)  # a shared machine: widgets stay disabled while a rerun runs
    pg.goto(url, timeout=90_000)
    pg.get_by_text("Verdict: floats").first.wait_for(timeout=timeout_s * 1000)
    settle(pg, rerun=False)
    return pg


# ------------------------------------------------------------------------------------------------
# Fixtures (imported by tests/conftest.py): one server and one browser per pytest process at most

@pytest.fixture(scope="session")
def browser_server(tmp_path_factory):
    """URL of one ``streamlit run app.py`` for this pytest process (started when first needed)."""
    proc, url, log = start_server(tmp_path_factory.mktemp("streamlit") / "streamlit.log")
    try:
        yield url
    finally:
        stop_server(proc, log)


@pytest.fixture(scope="session")
def browser_context(tmp_path_factory):
    """One headless Chromium context for this pytest process; each test opens its own pages."""
    from playwright.sync_api import sync_playwright

    with sync_playwright() as p:
        ctx = launch_context(p, tmp_path_factory.mktemp("chromium") / "profile", height=900,
                             accept_downloads=True)
        try:
            yield ctx
        finally:
            ctx.close()
