"""The page tools in the real dashboard: keep as option, downloads while an input is out of
range, and the handout right after a new title."""

from __future__ import annotations

from tests.browser.test_review import (VIEWPORT, download, no_exception, number_input, open_tools,
                                       params_of, set_number, settle, upload)
from tests.browser.conftest import wait_for_app


def keep(page) -> str:
    """Open "Keep as option", keep under the offered name; return that name."""
    page.get_by_text("Keep as option").first.click()
    box = page.locator('[data-testid="stPopoverBody"] input').first
    box.wait_for(state="visible")
    name = box.input_value()
    page.locator('[data-testid="stPopoverBody"] button', has_text="Keep").first.click()
    settle(page)
    return name


def test_two_keeps_give_two_options_with_the_next_free_name(app_url, browser):
    ctx = browser.new_context(viewport=VIEWPORT)
    try:
        page = ctx.new_page()
        page.goto(f"{app_url}/flow")
        wait_for_app(page)
        assert keep(page) == "Option 1"
        set_number(page, "Cylinder radius", "0.6")  # a rerun between the two keeps
        assert keep(page) == "Option 2"
        no_exception(page)
        # through the navigation (a new address would start a new session, without the options)
        page.locator('[data-testid="stSidebarNav"] a', has_text="Compare options").first.click()
        settle(page)
        for name in ("Option 1", "Option 2"):
            assert page.get_by_text(name, exact=True).count() >= 1, name
    finally:
        ctx.close()


def disabled(page, text: str) -> bool:
    return page.locator('[data-testid="stDownloadButton"] button', has_text=text).first.is_disabled()


def test_downloads_wait_while_an_input_is_out_of_range(app_url, browser):
    ctx = browser.new_context(viewport=VIEWPORT, accept_downloads=True)
    try:
        page = ctx.new_page()
        page.goto(f"{app_url}/rotor")
        wait_for_app(page)
        open_tools(page)
        assert not disabled(page, "Handout report") and not disabled(page, "Numbers (.csv)")
        set_number(page, "Rotor diameter", "99")  # the range is 0.2 to 15 m
        no_exception(page)
        for text in ("Handout report", "Save scenario (.toml)", "Numbers (.csv)"):
            assert disabled(page, text), f"{text} stays enabled while an input is out of range"
        sidebar = page.locator('[data-testid="stSidebar"]').inner_text()
        assert "Downloads and the share link wait until every input is in range" in sidebar
        assert "Share link" not in sidebar
        set_number(page, "Rotor diameter", "5")
        assert not disabled(page, "Handout report") and not disabled(page, "Numbers (.csv)")
    finally:
        ctx.close()


def test_the_handout_carries_the_title_just_typed(app_url, browser, tmp_path):
    ctx = browser.new_context(viewport=VIEWPORT, accept_downloads=True)
    try:
        page = ctx.new_page()
        page.goto(f"{app_url}/flow")
        wait_for_app(page)
        open_tools(page)
        title = page.locator('[data-testid="stSidebar"] [data-testid="stTextInput"]', has_text="Title").locator("input")
        title.fill("Invented review case 7")
        title.press("Enter")
        settle(page)
        with page.expect_download(timeout=120_000) as info:
            page.locator('[data-testid="stDownloadButton"] button', has_text="Handout report").first.click()
        assert info.value.suggested_filename == "invented-review-case-7.html"
        target = tmp_path / "report.html"
        info.value.save_as(str(target))
        assert "Invented review case 7" in target.read_text(encoding="utf-8")
    finally:
        ctx.close()


def test_a_scenario_with_a_bad_table_is_refused_and_keeps_what_was_typed(app_url, browser, tmp_path):
    """A scenario file choosing its own coefficient table with CL = 1e308: one error naming the
    row, and the page keeps the diameter typed before (it used to load the file first)."""
    from liftcore.scenario import Scenario, scenario_to_toml
    from liftcore.studies import study

    values = study("rotor").INPUTS.defaults()
    values.update(coefficient_set="user", diameter_m=3.0,
                  user_coefficients_csv="SR,CL,CD\n0,0,0.5\n1,1e308,1\n2,3,1\n")
    bad = tmp_path / "bad-table.toml"
    bad.write_text(scenario_to_toml(Scenario(kind="rotor", inputs=values, title="Invented bad table")))
    ctx = browser.new_context(viewport=VIEWPORT)
    try:
        page = ctx.new_page()
        page.goto(f"{app_url}/rotor")
        wait_for_app(page)
        set_number(page, "Rotor diameter", "6")
        open_tools(page)
        upload(page, "Load a scenario file", bad)
        no_exception(page)
        alert = page.locator('[data-testid="stAlert"]', has_text="CL must lie within ±100").first
        alert.wait_for(state="visible", timeout=30_000)
        assert "data row 2" in alert.inner_text()
        assert float(number_input(page, "Rotor diameter").input_value()) == 6.0
        assert params_of(page).get("diameter_m") == "6"
    finally:
        ctx.close()
