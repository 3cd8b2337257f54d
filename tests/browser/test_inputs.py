"""Number inputs in the real dashboard: a value typed or stepped away and back is the value used.

On every study page, the first two number inputs of the sidebar are typed to another value and
back, then stepped up and down again; after each return the page must show what it showed at the
start (results, summary and the share link in the address bar).
"""

from __future__ import annotations

import pytest

from tests.browser.conftest import wait_for_app
from tests.browser.test_review import VIEWPORT, no_exception, params_of, settle

STUDY_PAGES = ("flow", "field", "rotor", "voyage", "flight")


def sidebar_numbers(page):
    return page.locator('[data-testid="stSidebar"] [data-testid="stNumberInput"]')


def main_text(page) -> str:
    """What the main area says: results, summary sentences, captions (not the charts' pixels)."""
    return page.locator('[data-testid="stMain"]').inner_text()


def type_value(page, box, value: str) -> None:
    box.locator("input").fill(value)
    box.locator("input").press("Enter")
    settle(page)


def step(page, box, direction: str) -> None:
    box.locator(f'[data-testid="stNumberInputStep{direction}"]').click()
    settle(page)


def other_value(text: str) -> str:
    x = float(text)
    return f"{x * 0.8:.6g}" if x > 0 else f"{x - 1:.6g}" if x < 0 else "0.01"


@pytest.mark.parametrize("kind", STUDY_PAGES)
def test_typing_or_stepping_back_restores_the_first_results(app_url, browser, kind):
    ctx = browser.new_context(viewport=VIEWPORT)
    try:
        page = ctx.new_page()
        page.goto(f"{app_url}/{kind}")
        wait_for_app(page)
        settle(page)
        start_text, start_link = main_text(page), params_of(page)
        for i in range(2):
            box = sidebar_numbers(page).nth(i)
            label = box.locator("label").inner_text()
            first = box.locator("input").input_value()
            type_value(page, box, other_value(first))
            no_exception(page)
            assert (params_of(page), main_text(page)) != (start_link, start_text), \
                f"{kind}: {label} typed away changed nothing"
            type_value(page, box, first)
            no_exception(page)
            assert box.locator("input").input_value() == first
            assert params_of(page) == start_link, f"{kind}: {label} typed back, link {params_of(page)}"
            assert main_text(page) == start_text, f"{kind}: {label} typed back, results differ"
            step(page, box, "Up")
            assert (params_of(page), main_text(page)) != (start_link, start_text), \
                f"{kind}: {label} stepped up changed nothing"
            step(page, box, "Down")
            no_exception(page)
            assert float(box.locator("input").input_value()) == pytest.approx(float(first))
            assert params_of(page) == start_link, f"{kind}: {label} stepped back, link {params_of(page)}"
            assert main_text(page) == start_text, f"{kind}: {label} stepped back, results differ"
    finally:
        ctx.close()
