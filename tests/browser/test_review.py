"""Design-review features in the real dashboard (Chromium): two people at once never see each other's
inputs; every demo scenario loads through the page's upload control, the units switch, and the
handout report downloads as one self-contained HTML file."""

from __future__ import annotations

import re
import time
import urllib.parse
from pathlib import Path

import pytest

from liftcore import scenario as sc
from liftcore.studies import run_study
from tests.browser.conftest import ROOT, wait_for_app

SCENARIOS = sorted((ROOT / "scenarios").glob("*.toml"))
VIEWPORT = {"width": 1600, "height": 1000}


def params_of(page) -> dict:
    return dict(urllib.parse.parse_qsl(urllib.parse.urlparse(page.url).query))


def number_input(page, label: str):
    return page.locator('[data-testid="stNumberInput"]', has_text=label).first.locator("input")


def set_number(page, label: str, value: str) -> None:
    box = number_input(page, label)
    box.fill(value)
    box.press("Enter")
    settle(page)


def headline_values(page) -> list[str]:
    return page.locator('[data-testid="stMetricValue"]').all_inner_texts()


def settle(page, timeout_s: float = 90.0) -> None:
    """Wait for the run to finish and for no element of an earlier run to be left on screen."""
    wait_for_app(page, timeout_s)
    deadline = time.time() + timeout_s
    while page.locator('[data-stale="true"]').count() and time.time() < deadline:
        time.sleep(0.2)
    wait_for_app(page, timeout_s)


def headlines_by_label(page) -> dict[str, str]:
    out = {}
    for m in page.locator('[data-testid="stMetric"]').all():
        label = m.locator('[data-testid="stMetricLabel"]').inner_text().strip()
        out[label] = m.locator('[data-testid="stMetricValue"]').inner_text().strip()
    return out


def compare_results(page) -> list[list[str]]:
    """The rows of the Compare page's results table: the result's name, then each option's cell."""
    rows = page.locator("table.lc-compare", has_text="Result").first.locator("tbody tr")
    return [r.locator("td").all_inner_texts() for r in rows.all()]


def check_headlines(page, kind: str, values: dict, system: str) -> None:
    """The big numbers on the page are the study's headlines for these inputs, in ``system``."""
    if kind == "flight":  # one sentence above the picture carries every headline
        from liftcore.studies import flight

        shown = page.locator(".st-key-flight_summary p.lc-summary").first.inner_text()
        assert shown == flight.summary(run_study(kind, values), system).replace("**", "")
        return
    want = {h.label: h.text(system) for h in run_study(kind, values).headlines}
    shown = {k: v for k, v in headlines_by_label(page).items() if k in want}
    assert shown, f"no headline of the {kind} study on the page"
    assert shown == {k: want[k] for k in shown}


def no_exception(page) -> None:
    exc = page.locator('[data-testid="stException"]')
    assert exc.count() == 0, exc.first.inner_text()


def network_scripts(html: str) -> list[str]:
    return re.findall(r"<script[^>]*\bsrc\s*=\s*[\"']?\s*(?:https?:)?//[^>]*>", html, flags=re.I)


def switch_units(page, system: str) -> None:
    page.locator('[data-testid="stSidebar"] [data-testid="stButtonGroup"] button', has_text=system).first.click()
    settle(page)


def open_tools(page) -> None:
    exp = page.locator('[data-testid="stSidebar"] [data-testid="stExpander"]', has_text="Save, load, share").first
    if exp.locator('[data-testid="stFileUploader"]').first.is_hidden():
        exp.locator("summary").click()
    exp.locator('[data-testid="stFileUploader"]').first.wait_for(state="visible")


def upload(page, label: str, path: Path) -> None:
    up = page.locator('[data-testid="stFileUploader"]', has_text=label).first
    up.locator('input[type="file"]').set_input_files(str(path))
    settle(page)


def download(page, button_text: str, target: Path) -> str:
    with page.expect_download(timeout=120_000) as info:
        page.locator('[data-testid="stDownloadButton"] button', has_text=button_text).first.click()
    info.value.save_as(str(target))
    return target.read_text(encoding="utf-8")


def test_two_people_never_see_each_others_inputs(app_url, browser, shots_dir):
    a_ctx = browser.new_context(viewport=VIEWPORT)
    b_ctx = browser.new_context(viewport=VIEWPORT)
    try:
        a, b = a_ctx.new_page(), b_ctx.new_page()
        # A opens a broken share link: a clear message, and the defaults
        a.goto(f"{app_url}/flow?v=1&radius_m=banana")
        b.goto(f"{app_url}/flow")
        wait_for_app(a)
        wait_for_app(b)
        alert = a.locator('[data-testid="stAlert"]', has_text="This link could not be used")
        assert alert.count() == 1 and "radius_m" in alert.inner_text()
        assert float(number_input(a, "Cylinder radius").input_value()) == pytest.approx(0.5)
        base = headline_values(b)
        set_number(a, "Cylinder radius", "0.7")
        set_number(b, "Flow speed", "12")
        switch_units(a, "imperial")  # A runs again after B's change (B ran after A's)
        no_exception(a)
        no_exception(b)
        # 1 ft = 0.3048 m, 1 mph = 0.44704 m/s (exact definitions); inputs show the fewest digits
        # within 0.1 % (2.3 ft, 17.9 mph)
        assert float(number_input(a, "Cylinder radius").input_value()) == pytest.approx(0.7 / 0.3048, rel=1e-3)
        assert float(number_input(a, "Flow speed").input_value()) == pytest.approx(8 / 0.44704, rel=1e-3)
        assert float(number_input(b, "Cylinder radius").input_value()) == pytest.approx(0.5)
        assert float(number_input(b, "Flow speed").input_value()) == pytest.approx(12.0)
        assert headline_values(b) != base
        # each address is that person's share link
        assert params_of(a) == {"v": "1", "units": "imperial", "radius_m": "0.7"}
        assert params_of(b) == {"v": "1", "speed_m_s": "12"}
        a.screenshot(path=str(shots_dir / "review_session_a.png"), full_page=True)
        b.screenshot(path=str(shots_dir / "review_session_b.png"), full_page=True)
    finally:
        a_ctx.close()
        b_ctx.close()


def _kind_of(path: Path) -> str:
    d = sc.load_document(path)
    return "compare" if isinstance(d, sc.Comparison) else d.kind


KINDS = sorted({_kind_of(p) for p in SCENARIOS})


@pytest.mark.parametrize("kind", KINDS)
def test_demo_scenarios_load_switch_units_and_download_a_report(app_url, browser, shots_dir, tmp_path, kind):
    """Every file in scenarios/ of this kind, one after the other in one browser session."""
    ctx = browser.new_context(viewport=VIEWPORT, accept_downloads=True)
    try:
        page = ctx.new_page()
        page.goto(f"{app_url}/{kind}")
        wait_for_app(page)
        files = [p for p in SCENARIOS if _kind_of(p) == kind]
        for path in files:
            doc = sc.load_document(path)
            if isinstance(doc, sc.Comparison):
                upload(page, "Load a comparison or scenario file", path)
                no_exception(page)
                assert page.locator('[data-testid="stAlert"]', has_text=f"Loaded {path.name}").count() == 1
                for o in doc.options:
                    assert page.get_by_text(o.name, exact=True).count() >= 1
                other = "SI" if doc.unit_system != "SI" else "marine"
                before = compare_results(page)
                assert before and len(before[0]) == len(doc.options) + 1  # a column per option
                switch_units(page, other)
                no_exception(page)
                after = compare_results(page)
                assert after != before and len(after) == len(before)
                html = download(page, "Comparison report", tmp_path / f"{path.stem}.html")
            else:
                open_tools(page)
                upload(page, "Load a scenario file", path)
                no_exception(page)
                assert page.locator('[data-testid="stAlert"]', has_text=f"Loaded {path.name}").count() == 1
                # the address now holds exactly the scenario's share link
                assert params_of(page) == sc.link_params(doc.kind, doc.inputs, doc.unit_system)[0]
                check_headlines(page, doc.kind, doc.inputs, doc.unit_system)
                other = "imperial" if doc.unit_system != "imperial" else "SI"
                switch_units(page, other)
                no_exception(page)
                assert params_of(page) == sc.link_params(doc.kind, doc.inputs, other)[0]  # inputs kept
                check_headlines(page, doc.kind, doc.inputs, other)
                html = download(page, "Handout report", tmp_path / f"{path.stem}.html")
            if path == files[-1]:
                page.screenshot(path=str(shots_dir / f"review_{kind}.png"), full_page=True)
            assert html.startswith("<!DOCTYPE html>")
            assert network_scripts(html) == []
            assert "Plotly.newPlot" in html and "@media print" in html
            assert doc.title.replace("&", "&amp;").replace("'", "&#x27;") in html
    finally:
        ctx.close()
