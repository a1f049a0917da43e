"""Screenshots of each page panel at 1280 × 800 in headless Chromium, into artifacts/.

Run from the repository root: ``MPLBACKEND=Agg python tests/screenshots.py``. Starts the page
with the browser tests' helpers (tests/_browser.py: same server, Chromium, launch flags and
waits on the page's run state), visits each panel, saves
``artifacts/page_<panel>.png`` and stops the server. For people to look at: nothing here
asserts (the browser test does).
"""

from __future__ import annotations

import sys
from pathlib import Path

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE))
sys.path.insert(0, str(HERE.parent))

from _browser import launch_context, open_page, settle, start_server, stop_server  # noqa: E402
from test_browser import FEET, FLEX, MIXED, _choose, _enter  # noqa: E402

OUT = HERE.parent / "artifacts"


def _shot(page, name: str, anchor: str | None = None, exact: bool = True) -> None:
    if anchor:
        el = page.get_by_text(anchor, exact=exact).first
        el.scroll_into_view_if_needed(timeout=30_000)
        page.evaluate("""(t) => { const el = [...document.querySelectorAll('h1,h2,h3,p,summary,span,label')]
            .find(e => e.textContent.trim() === t); if (el) { el.scrollIntoView({block: 'start'}); const m = document.querySelector('section.main, [data-testid="stMain"]'); if (m) m.scrollBy(0, -70); } }""", anchor)
        page.wait_for_timeout(500)
    path = OUT / f"page_{name}.png"
    page.screenshot(path=str(path))
    print(path)


def _load_example(page, name: str) -> None:
    _choose(page, "built-in examples (all invented)", name)   # one choice loads it
    settle(page)


ROW = """# Invented design for the screenshots (not a real device)
schema_version = 2
description = "Invented: a raft on a row of three rods and two flexible wire legs"
invented = true

[body]
mass = "0.6 g"

[[elements]]
kind = "rod_row"
name = "raft rods"
position = ["0 mm", "0 mm"]
radius = "0.25 mm"
length = "40 mm"
rods = 3
spacing = "1.2 mm"
material = "steel"
coating = { advancing = "115 deg", receding = "95 deg" }

[[elements]]
kind = "flexible_leg"
name = "wire leg"
count = 2
layout = "around"
layout_radius = "12 mm"
start_angle = "90 deg"
radius = "0.1 mm"
length = "30 mm"
material = "steel"
coating = { advancing = "115 deg", receding = "95 deg" }
"""


def _upload(page, text: str, name: str) -> None:
    path = OUT / name
    path.write_text(text)
    page.locator('[data-testid="stFileUploader"] input[type="file"]').set_input_files(str(path))
    settle(page)


def _drawing(page, label: str) -> None:
    page.get_by_text(label, exact=True).first.click()
    settle(page)


def main() -> None:
    from playwright.sync_api import sync_playwright

    OUT.mkdir(exist_ok=True)
    proc, url, log = start_server(OUT / "streamlit.log")
    try:
        with sync_playwright() as p:
            ctx = launch_context(p, OUT / ".chromium-profile")
            page = open_page(url, ctx)
            _shot(page, "1_top")
            _shot(page, "2_elements", "Support elements")
            _shot(page, "3_results", "Results")
            _shot(page, "3b_elements_table", "Elements at this load")
            _shot(page, "4_plan", "Drawings")
            _drawing(page, "what breaks first")
            _shot(page, "5_breaks_first", "Drawings")
            _drawing(page, "element tables")
            _shot(page, "6_element_tables", "Drawings")
            _drawing(page, "safety-factor sweep")
            page.get_by_role("button", name="run the sweep").click()
            settle(page)
            _shot(page, "7_sweep", "Drawings")
            _shot(page, "8_warnings", "Warnings and cautions")
            page.get_by_role("button", name="prepare the PDF report").click()
            settle(page)
            _shot(page, "9_reports", "Reports")
            _load_example(page, "compare")
            _shot(page, "10_compare", "Compare designs")
            _load_example(page, "classroom")
            page.get_by_text("Classroom: soap and surface tension").first.click()
            settle(page, rerun=False)  # an expander: no run
            slider = page.get_by_role("slider").first
            slider.focus()
            slider.press("Home")  # the slider's lowest value, 30 mN/m
            settle(page)
            _shot(page, "11_classroom", "Classroom: soap and surface tension")
            # a mixed design: rods and ball feet, one foot's table open for editing
            mixed = MIXED + "".join(f"""
[[elements]]
kind = "ball"
name = "{n}"
position = ["{x}", "{y}"]
radius = "0.5 mm"
material = "steel"
coating = {{ advancing = "115 deg", receding = "95 deg" }}
""" for n, (x, y) in FEET.items())
            _upload(page, mixed, "shot_mixed.toml")
            _choose(page, "table to edit (4 tables)", "table 3: 1 ball foot — foot B")
            settle(page)
            _shot(page, "12_mixed_ball_foot", "Support elements")
            _enter(page, "radius [mm]", "-0.6 mm")
            page.get_by_text("Not current").first.wait_for(timeout=60_000)
            settle(page)
            _shot(page, "13_bad_value_field", "Support elements")
            _shot(page, "14_bad_value_results", "Results")
            _upload(page, FLEX, "shot_flex.toml")
            page.get_by_text("bending of one leg alone at its limit load").first.wait_for(timeout=120_000)
            _shot(page, "15_flexible_leg", "bending of one leg alone at its limit load", exact=False)
            _upload(page, ROW, "shot_row.toml")
            _drawing(page, "element tables")
            _shot(page, "16_rod_row_section", "Drawings")
            page.mouse.move(800, 400)
            page.mouse.wheel(0, 500)
            page.wait_for_timeout(600)
            _shot(page, "17_rod_row_close_up")
            ctx.close()
    finally:
        stop_server(proc, log)


if __name__ == "__main__":
    main()
