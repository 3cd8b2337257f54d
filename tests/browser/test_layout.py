"""No clipped or overlapping text in any chart, in the real dashboard and in the handout.

Every page of ``views.PAGES`` (each of its tabs, and the few buttons that add charts: the launch
search, the track fit, the demo comparison) and the handout of every demo scenario are measured in
Chromium at three screen sizes. For every Plotly chart on screen:

- every visible SVG text (titles, axis titles, tick labels, legend entries, annotations, colour
  bars, polar labels, bar and point labels) lies inside the chart's own box, and the chart lies
  inside the box Streamlit gives it;
- no two texts of different roles overlap (title and legend, legend and axis title, one
  annotation and another, the tick labels of one polar chart and those of the next); tick labels
  of one axis are not compared with each other;
- no annotation box covers a marker of a small marker trace (the current point, the operating
  point, a searched best);
- 3-D scenes (drawn in WebGL, so their axis labels are no SVG text) are screenshot without the SVG
  layers: nothing the scene draws may touch the edge of its box, and no title or legend text may
  sit on what the scene draws.

Failures name the page, the screen size, the chart title and the two texts. Screenshots of every
failing chart go to the ``shots_dir`` fixture; with LIFTCORE_SHOTS set (to keep them), so do
full-page screenshots of every page, tab and handout at 1280x720, to look at.
"""

from __future__ import annotations

import io
import os
import re
import time

import numpy as np
import pytest

from liftcore import report
from liftcore import scenario as sc
from liftcore.studies import run_study
from tests.browser.conftest import ROOT, full_screenshot, wait_for_app
from views import PAGES

VIEWPORTS = ((1280, 720), (1600, 1000), (1920, 1080))
#: Buttons that add charts to the tab they sit in (clicked once when seen).
CHART_BUTTONS = ("Load the invented demo comparison", "Search the best launch", "Fit the tracks")
#: Text boxes may touch or overlap by this much (glyph boxes carry a little blank space). [px]
TOLERANCE_PX = 2.0
#: Luminance below which a pixel of a 3-D scene counts as drawn (text, lines; not the grid). [0-255]
INK_LUMINANCE = 150
#: Drawn pixels allowed in a 3-D scene's edge strip, or under one title or legend text. [px]
INK_ALLOWED = 4
EDGE_STRIP_PX = 3
#: A 3-D scene with fewer drawn pixels than this drew nothing (its axes alone draw thousands). [px]
SCENE_INK_MIN = 500

# One pass over every visible chart: the failures found, the 3-D scenes to look at in pixels.
CHECK_JS = r"""
(tol) => {
  const strip = s => String(s || '').replace(/<[^>]*>/g, ' ').replace(/\s+/g, ' ').trim();
  const short = s => { s = strip(s); return s.length > 70 ? s.slice(0, 69) + '…' : s; };
  const rect = r => ({l: r.left, t: r.top, r: r.right, b: r.bottom});
  const overlap = (a, b) => Math.min(a.r, b.r) - Math.max(a.l, b.l) > tol
                         && Math.min(a.b, b.b) - Math.max(a.t, b.t) > tol;
  const fmt = r => `[${Math.round(r.l)},${Math.round(r.t)} ${Math.round(r.r - r.l)}x${Math.round(r.b - r.t)}]`;
  const visible = el => {
    for (let e = el; e && e.nodeType === 1; e = e.parentElement) {
      const cs = getComputedStyle(e);
      if (cs.display === 'none' || cs.visibility === 'hidden' || Number(cs.opacity) === 0) return false;
    }
    return true;
  };
  function roleOf(t, gd) {
    const cls = t.getAttribute('class') || '';
    if (/\bgtitle/.test(cls)) return 'title';
    let m = cls.match(/^([xy]\d*)title$/);
    if (m) return 'axis title ' + m[1];
    for (let e = t.parentElement; e && e !== gd; e = e.parentElement) {
      const c = e.getAttribute('class') || '';
      if (/\bannotation\b/.test(c)) return 'annotation ' + (e.getAttribute('data-index') || '?');
      if (/\blegend\b/.test(c)) return 'legend';
      if (/\bcolorbar\b/.test(c)) return 'colour bar ' + c;
      m = c.match(/^([xy]\d+)tick$/);
      if (m) return 'ticks ' + m[1];
      m = c.match(/^(angular|radial)axistick$/) || c.match(/^(x|y)tick$/);
      if (m) {
        let sub = null;
        for (let p = e; p && p !== gd; p = p.parentElement)
          if (/^(polar|ternary|smith)\d*$/.test(p.getAttribute('class') || '')) { sub = p; break; }
        if (sub) return `ticks ${m[1] === 'angular' ? 'angular' : 'radial'} ${sub.getAttribute('class')}`;
        return 'ticks ' + m[1];
      }
      if (/\btextpoint\b/.test(c) || /\bbartext\b/.test(cls)) {
        const tr = t.closest('g.trace');
        return 'data text ' + (tr ? Array.from(tr.parentElement.children).indexOf(tr) : '');
      }
      if (/\bscene\b|gl-container/.test(c)) return 'scene';
    }
    return 'other ' + cls;
  }
  document.querySelectorAll('[data-lc-chart]').forEach(e => e.removeAttribute('data-lc-chart'));
  const charts = Array.from(document.querySelectorAll('.js-plotly-plot'))
    .filter(gd => gd.getBoundingClientRect().width > 0 && visible(gd));
  const out = [];
  charts.forEach((gd, idx) => {
    gd.setAttribute('data-lc-chart', String(idx));
    const fl = gd._fullLayout || {};
    // the title without its subtitle lines (set in a smaller span)
    const title = short(((fl.title && fl.title.text) || '').split('<span')[0]) || `(untitled chart ${idx + 1})`;
    const svg = gd.querySelector('svg.main-svg');
    const problems = [];
    if (!svg) { out.push({idx, title, problems: ['no chart drawn'], scene: null}); return; }
    const box = rect(svg.getBoundingClientRect());
    const holder = gd.closest('[data-testid="stPlotlyChart"]') || gd.parentElement;
    const hb = rect(holder.getBoundingClientRect());
    if (box.l < hb.l - tol || box.r > hb.r + tol)
      problems.push(`chart ${fmt(box)} is wider than its place ${fmt(hb)}`);
    const items = [];
    for (const t of gd.querySelectorAll('svg.main-svg text')) {
      if (t.closest('.hoverlayer')) continue;
      const text = strip(t.textContent);
      if (!text) continue;
      const r = t.getBoundingClientRect();
      if (r.width < 0.5 || r.height < 0.5 || !visible(t)) continue;
      items.push({role: roleOf(t, gd), text, r: rect(r)});
    }
    for (const it of items) {
      const r = it.r;
      if (r.l < box.l - tol || r.t < box.t - tol || r.r > box.r + tol || r.b > box.b + tol) {
        const sides = [r.l < box.l - tol ? 'left' : '', r.r > box.r + tol ? 'right' : '',
                       r.t < box.t - tol ? 'top' : '', r.b > box.b + tol ? 'bottom' : ''].filter(Boolean);
        problems.push(`cut at the ${sides.join('/')}: "${short(it.text)}" (${it.role}) ${fmt(r)} in ${fmt(box)}`);
      }
    }
    for (let i = 0; i < items.length; i++) {
      for (let j = i + 1; j < items.length; j++) {
        const a = items[i], b = items[j];
        if (a.role === b.role) continue;
        if (overlap(a.r, b.r))
          problems.push(`"${short(a.text)}" (${a.role}) overlaps "${short(b.text)}" (${b.role})`);
      }
    }
    // annotation boxes against the markers of small marker traces (current point, searched best)
    const marks = [];
    for (const tr of gd.querySelectorAll('.scatterlayer .trace')) {
      const pts = Array.from(tr.querySelectorAll('path.point')).filter(p => visible(p));
      if (!pts.length || pts.length > 20) continue;
      for (const p of pts) {
        const r = p.getBoundingClientRect();
        if (r.width > 0) marks.push({l: r.left + 1, t: r.top + 1, r: r.right - 1, b: r.bottom - 1});
      }
    }
    for (const a of gd.querySelectorAll('.annotation')) {
      if (!visible(a)) continue;
      const text = strip(a.textContent);
      const bg = a.querySelector('rect.bg');
      const painted = bg && ((bg.style.fill && !/rgba\(0, 0, 0, 0\)|transparent/.test(bg.style.fill))
                             || Number(bg.style.strokeWidth || 0) > 0);
      const t = a.querySelector('text');
      const src = painted ? bg : t;
      if (!src) continue;
      const r = rect(src.getBoundingClientRect());
      if (r.r - r.l < 1) continue;
      for (const m of marks) {
        if (overlap(r, m)) { problems.push(`annotation "${short(text)}" covers a marker at ${fmt(m)}`); break; }
      }
    }
    let scene = null;
    const sceneKeys = Object.keys(fl).filter(k => /^scene\d*$/.test(k));
    if (sceneKeys.length) {
      const sz = fl._size;
      const boxes = sceneKeys.map(k => {
        const d = fl[k].domain;
        return {l: box.l + sz.l + d.x[0] * sz.w, r: box.l + sz.l + d.x[1] * sz.w,
                t: box.t + sz.t + (1 - d.y[1]) * sz.h, b: box.t + sz.t + (1 - d.y[0]) * sz.h};
      });
      scene = {boxes, texts: items.filter(it => it.role === 'title' || it.role === 'legend')
                                    .map(it => ({text: it.text, role: it.role, r: it.r})),
               chart: rect(gd.getBoundingClientRect())};
    }
    out.push({idx, title, problems, scene});
  });
  return out;
}
"""

SETTLED_JS = r"""
() => Array.from(document.querySelectorAll('.js-plotly-plot'))
  .filter(gd => gd.getBoundingClientRect().width > 0)
  .map(gd => { const s = gd.querySelector('svg.main-svg');
               return s ? `${s.getAttribute('width')}x${s.getAttribute('height')}` : 'none'; })
  .join(',')
"""

SVG_LAYERS_JS = r"""
(args) => { const gd = document.querySelector(`[data-lc-chart="${args[0]}"]`);
            for (const s of gd.querySelectorAll('svg.main-svg')) s.style.visibility = args[1]; }
"""


def chart_sizes(page) -> str:
    return page.evaluate(SETTLED_JS)


def charts_settled(page, before: str | None = None, timeout_s: float = 15.0) -> None:
    """Wait until every chart keeps its size for three looks in a row; with ``before`` (the
    sizes before a resize), first until they have changed from it (at most 2 s: a chart of fixed
    size, as in the handout, does not)."""
    deadline = time.time() + timeout_s
    if before is not None:
        change_by = time.time() + 2.0
        while chart_sizes(page) == before and time.time() < change_by:
            page.wait_for_timeout(100)
    last, same = None, 0
    while time.time() < deadline:
        now = chart_sizes(page)
        same = same + 1 if now == last else 0
        if same >= 2:
            return
        last = now
        page.wait_for_timeout(150)


def _ink(img, box) -> int:
    """Drawn pixels of ``img`` (a greyscale array) inside ``box`` (l, t, r, b in its pixels)."""
    l, t, r, b = (int(round(v)) for v in box)
    l, t = max(l, 0), max(t, 0)
    r, b = min(r, img.shape[1]), min(b, img.shape[0])
    if r <= l or b <= t:
        return 0
    return int(np.count_nonzero(img[t:b, l:r] < INK_LUMINANCE))


def scene_problems(page, chart: dict) -> list[str]:
    """What a 3-D scene draws, seen in pixels with the SVG layers hidden: nothing may touch the
    edge of the scene's box (cut off), no title or legend text may sit on it."""
    from PIL import Image

    sc_info = chart["scene"]
    cb = sc_info["chart"]
    page.evaluate(SVG_LAYERS_JS, [chart["idx"], "hidden"])
    try:
        png = page.locator(f'[data-lc-chart="{chart["idx"]}"]').screenshot()
    finally:
        page.evaluate(SVG_LAYERS_JS, [chart["idx"], ""])
    img = np.asarray(Image.open(io.BytesIO(png)).convert("L"))
    ox, oy = cb["l"], cb["t"]
    out = []
    for b in sc_info["boxes"]:
        l, t, r, bt = b["l"] - ox, b["t"] - oy, b["r"] - ox, b["b"] - oy
        if _ink(img, (l, t, r, bt)) < SCENE_INK_MIN:  # no WebGL, say: the checks below would pass
            out.append("3-D scene drew nothing to check")
            continue
        e = EDGE_STRIP_PX
        for side, strip_box in (("left", (l, t, l + e, bt)), ("right", (r - e, t, r, bt)),
                                ("top", (l, t, r, t + e)), ("bottom", (l, bt - e, r, bt))):
            n = _ink(img, strip_box)
            if n > INK_ALLOWED:
                out.append(f"3-D scene drawn into its {side} edge ({n} px there): cut off")
    for tx in sc_info["texts"]:
        r = tx["r"]
        n = _ink(img, (r["l"] - ox, r["t"] - oy, r["r"] - ox, r["b"] - oy))
        if n > INK_ALLOWED:
            out.append(f"\"{tx['text'][:60]}\" ({tx['role']}) sits on the 3-D scene's drawing ({n} px)")
    return out


def layout_failures(page, where: str, shots_dir, tag: str) -> list[str]:
    """Every problem of every chart on screen now, each line naming ``where`` and the chart."""
    failures = []
    for chart in page.evaluate(CHECK_JS, TOLERANCE_PX):
        problems = list(chart["problems"])
        if chart["scene"]:
            problems += scene_problems(page, chart)
        if problems:
            failures += [f"{where} · {chart['title']} · {p}" for p in problems]
            name = re.sub(r"[^a-z0-9]+", "_", f"{tag}_{chart['idx']}_{chart['title'][:30]}".lower())
            page.locator(f'[data-lc-chart="{chart["idx"]}"]').screenshot(path=str(shots_dir / f"layout_{name}.png"))
    return failures


DRAWN_JS = "() => document.querySelectorAll('.js-plotly-plot svg.main-svg').length"


def settle(page) -> None:
    """Wait for the script run to end, no element of an earlier run to be left on screen and the
    number of drawn charts to hold still for three looks (a chart can follow a slow computation)."""
    wait_for_app(page)
    deadline = time.time() + 90
    while page.locator('[data-stale="true"]').count() and time.time() < deadline:
        time.sleep(0.2)
    last, same = None, 0
    while same < 3 and time.time() < deadline:
        now = page.evaluate(DRAWN_JS)
        same = same + 1 if now == last else 0
        last = now
        page.wait_for_timeout(250)


def click_chart_buttons(page) -> None:
    for label in CHART_BUTTONS:
        button = page.locator('[data-testid="stButton"] button', has_text=label)
        if button.count() and button.first.is_visible() and button.first.is_enabled():
            button.first.click()
            settle(page)


def check_all_sizes(page, where: str, shots_dir, tag: str, fixed_size: bool = False) -> tuple[list[str], int]:
    """The layout problems at every screen size, and the number of charts shown (nothing to do
    where there is none). A full screenshot at the first size is kept when LIFTCORE_SHOTS asks for
    screenshots."""
    failures = []
    shown = len([c for c in chart_sizes(page).split(",") if c])
    if not shown:
        return failures, 0
    for w, h in VIEWPORTS:
        before = chart_sizes(page)
        page.set_viewport_size({"width": w, "height": h})
        charts_settled(page, None if fixed_size or (w, h) == VIEWPORTS[0] else before)
        failures += layout_failures(page, f"{where} at {w}x{h}", shots_dir, f"{tag}_{w}")
        if (w, h) == VIEWPORTS[0] and os.environ.get("LIFTCORE_SHOTS"):
            full_screenshot(page, shots_dir / f"layout_{tag}_{w}x{h}.png", width=w)
            page.set_viewport_size({"width": w, "height": h})
            charts_settled(page)
    return failures, shown


@pytest.fixture(scope="module")
def layout_page(browser):
    ctx = browser.new_context(viewport={"width": VIEWPORTS[0][0], "height": VIEWPORTS[0][1]})
    page = ctx.new_page()
    yield page
    ctx.close()


def _report(failures: list[str]) -> str:
    return f"{len(failures)} layout problems:\n" + "\n".join(failures)


@pytest.mark.parametrize("url_path", [p[2] for p in PAGES])
def test_no_clipped_or_overlapping_chart_text_on_the_page(app_url, layout_page, shots_dir, url_path):
    page = layout_page
    page.set_viewport_size({"width": VIEWPORTS[0][0], "height": VIEWPORTS[0][1]})
    page.goto(f"{app_url}/" if url_path == PAGES[0][2] else f"{app_url}/{url_path}")
    settle(page)
    click_chart_buttons(page)
    failures, charts = check_all_sizes(page, f"/{url_path}", shots_dir, url_path)
    tabs = page.locator('[data-testid="stMain"] [data-testid="stTab"]')
    names = [t.strip() for t in tabs.all_inner_texts()]
    for i, name in enumerate(names[1:], start=1):
        page.set_viewport_size({"width": VIEWPORTS[0][0], "height": VIEWPORTS[0][1]})
        page.locator('[data-testid="stMain"] [data-testid="stTab"]').nth(i).click()
        settle(page)
        click_chart_buttons(page)
        slug = re.sub(r"[^a-z0-9]+", "_", name.lower()).strip("_")
        more, n = check_all_sizes(page, f"/{url_path} tab “{name}”", shots_dir, f"{url_path}_{slug}")
        failures += more
        charts += n
    # a page that draws charts must have shown some (else the checks above found nothing to check)
    source = (ROOT / next(p[0] for p in PAGES if p[2] == url_path)).read_text(encoding="utf-8")
    if "show_figure" in source or "plotly_chart" in source:
        assert charts > 0, f"/{url_path} showed no chart to check"
    if failures:
        pytest.fail(_report(failures), pytrace=False)


SCENARIOS = sorted((ROOT / "scenarios").glob("*.toml"))


@pytest.mark.parametrize("path", SCENARIOS, ids=[p.stem for p in SCENARIOS])
def test_no_clipped_or_overlapping_chart_text_in_the_handout(layout_page, shots_dir, tmp_path, path):
    doc = sc.load_document(path)
    if isinstance(doc, sc.Comparison):
        html = report.comparison_report(report.run_comparison(doc), doc.title, doc.note, doc.unit_system)
    else:
        html = report.scenario_report(doc, run_study(doc.kind, doc.inputs))
    target = tmp_path / f"{path.stem}.html"
    target.write_text(html, encoding="utf-8")
    page = layout_page
    page.goto(target.as_uri())
    page.wait_for_function("() => Array.from(document.querySelectorAll('.js-plotly-plot'))"
                           ".every(gd => gd._fullLayout && gd.querySelector('svg.main-svg'))")
    charts_settled(page)
    failures, charts = check_all_sizes(page, f"handout {path.name}", shots_dir, f"handout_{path.stem}",
                                       fixed_size=True)
    assert charts == html.count('<figure class="chart">'), "not every chart of the handout was drawn"
    if failures:
        pytest.fail(_report(failures), pytrace=False)
