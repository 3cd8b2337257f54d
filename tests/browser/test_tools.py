"""The page tools in the real dashboard: keep as option, downloads while an input is out of
range, and the handout right after a new title."""

from __future__ import annotations

from tests.browser.test_review import (VIEWPORT, download, no_exception, open_tools, set_number,
                                       settle)
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
