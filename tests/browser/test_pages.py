"""Every page renders in a real browser with no exception shown."""

import pytest

from tests.browser.conftest import full_screenshot, wait_for_app
from views import PAGES


@pytest.mark.parametrize("url_path", [p[2] for p in PAGES])
def test_page_renders_without_exception(app_url, browser, shots_dir, url_path):
    page = browser.new_page(viewport={"width": 1600, "height": 1000})
    try:
        # the default page lives at the app's root address
        page.goto(f"{app_url}/" if url_path == PAGES[0][2] else f"{app_url}/{url_path}")
        wait_for_app(page)
        exceptions = page.locator('[data-testid="stException"]')
        assert exceptions.count() == 0, exceptions.first.inner_text()
        full_screenshot(page, shots_dir / f"{url_path}.png")
        assert page.locator("h1").count() >= 1
    finally:
        page.close()
