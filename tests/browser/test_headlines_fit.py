"""Headline numbers and their labels are never cut ("-5,194 kN…") on a projector or a laptop:
every label and value of every big number fits its column, on every page, at 1280 x 720 and
1600 x 1000 (the flight page's spread tab too)."""

from __future__ import annotations

import pytest

from tests.browser.conftest import full_screenshot, wait_for_app
from tests.browser.test_review import settle
from views import PAGES

#: (path, flight tab to open or None)
VIEWS = [(p[2], None) for p in PAGES if p[2] not in ("overview", "compare")] + [("flight", "Launch spread")]

CUT = """() => {
  const out = [];
  for (const m of document.querySelectorAll('[data-testid="stMetric"]')) {
    const col = m.closest('[data-testid="stColumn"]') || m;
    const box = col.getBoundingClientRect();
    for (const part of m.querySelectorAll('[data-testid="stMetricLabel"] p, [data-testid="stMetricValue"] p')) {
      const r = part.getBoundingClientRect();
      const cut = part.scrollWidth > part.clientWidth + 1 || r.right > box.right + 1 || r.left < box.left - 1;
      if (cut && r.width > 0) out.push(part.innerText + ` (${Math.round(r.left)}-${Math.round(r.right)} px in `
                                       + `${Math.round(box.left)}-${Math.round(box.right)})`);
    }
  }
  return out;
}"""


@pytest.mark.parametrize("viewport", [(1280, 720), (1600, 1000)], ids=["1280x720", "1600x1000"])
def test_no_headline_is_cut(app_url, browser, shots_dir, viewport):
    w, h = viewport
    ctx = browser.new_context(viewport={"width": w, "height": h})
    problems = []
    try:
        page = ctx.new_page()
        for path, tab in VIEWS:
            page.goto(f"{app_url}/{path}")
            wait_for_app(page)
            if tab:
                page.get_by_role("tab", name=tab).click()
                settle(page)
            assert page.locator('[data-testid="stException"]').count() == 0
            problems += [f"{path}{' / ' + tab if tab else ''} at {w}x{h}: {c}" for c in page.evaluate(CUT)]
            if w == 1280 and not tab:
                full_screenshot(page, shots_dir / f"headlines_{path}_{w}.png", width=w)
                page.set_viewport_size({"width": w, "height": h})
    finally:
        ctx.close()
    assert not problems, "cut headline text:\n" + "\n".join(problems)
