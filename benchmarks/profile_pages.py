"""Where a page's rerun spends its time: the server side of bench_pages' answer time.

Runs each page script with Streamlit's AppTest (``views/<kind>.py`` directly, SI units), changes
its first sidebar number input to values not used before (so no cache hit) and reports

* the script time of a rerun (median of ``TIMED`` changes, no profiler) and the inclusive time
  of its parts: the study run, ``figures_in_units``, ``st.plotly_chart`` (with Plotly's
  ``to_json`` inside it), ``st.dataframe``, the sidebar widgets, the page tools, the unit
  conversions; and one full garbage collection after the run (Streamlit runs one after every
  script run, ``runner.postScriptGC``);
* the forward messages the rerun sends to the browser: count and bytes by element type, and the
  size of each chart's JSON;
* the top functions by cumulative time of one rerun under cProfile (which slows pure Python
  code down more than numpy, so read its shares, not its seconds), and the self time per package.

Not a benchmark with a target (not run by ``python -m benchmarks``); bench_pages measures the
answer time in the browser.

    python -m benchmarks.profile_pages [flow rotor ...]
"""

from __future__ import annotations

import cProfile
import gc
import importlib
import inspect
import io
import json
import pstats
import statistics
import sys
import tempfile
import time
from collections import defaultdict
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
if str(ROOT) not in sys.path:
    sys.path.insert(0, str(ROOT))

PAGES = ("flow", "field", "rotor", "voyage", "flight")
TIMED = 5
TOP = 10
#: Frames left out of the top list: the script runner, Streamlit's call wrappers, the page itself.
_PLUMBING = ("scriptrunner/", "metrics_util.py", "runtime/state/", "exec_code.py", "<string>",
             "~", "threading.py")


#: The order the parts are printed in (a part indented under the one it is inside).
_ORDER = ("study run (run_study)", "figures_in_units", "figure builders (liftcore.figures_*)",
          "  of which base_figure (house style)", "  plotly figure API (incl. base_figure)",
          "st.plotly_chart", "  of which plotly.io.to_json", "st.dataframe", "sidebar: render_inputs",
          "  input_widget", "page_tools (save/share/keep)", "show_headlines",
          "unit conversions (liftcore.units)")


class Hooks:
    """Wall-clock accumulators on named functions and a tally of the forward messages."""

    def __init__(self):
        self.spent = defaultdict(float)
        self.calls = defaultdict(int)
        self.messages = []
        self._undo = []
        self._depth = defaultdict(int)

    def wrap(self, owner, name: str, label: str) -> None:
        original = getattr(owner, name)

        def timed(*args, **kwargs):
            self._depth[label] += 1
            t0 = time.perf_counter()
            try:
                return original(*args, **kwargs)
            finally:
                self._depth[label] -= 1
                if self._depth[label] == 0:  # count recursion once
                    self.spent[label] += time.perf_counter() - t0
                self.calls[label] += 1

        setattr(owner, name, timed)
        self._undo.append((owner, name, original))

    def install(self, kind: str) -> None:
        import plotly.io
        from streamlit.elements.arrow import ArrowMixin
        from streamlit.elements.plotly_chart import PlotlyMixin
        from streamlit.runtime.scriptrunner import script_runner as sr

        import liftcore.units as units
        import views.inputs as inputs
        import views.results as results
        import views.tools as tools
        from liftcore import studies

        mod = studies.study(kind)
        self.wrap(results, "run_study", "study run (run_study)")
        if hasattr(mod, "figures_in_units"):
            self.wrap(mod, "figures_in_units", "figures_in_units")
        import streamlit

        # st.plotly_chart is bound to the main container at import: wrap it and the method
        self.wrap(streamlit, "plotly_chart", "st.plotly_chart")
        self.wrap(PlotlyMixin, "plotly_chart", "st.plotly_chart")
        self.wrap(plotly.io, "to_json", "  of which plotly.io.to_json")
        self.wrap(streamlit, "dataframe", "st.dataframe")
        self.wrap(ArrowMixin, "dataframe", "st.dataframe")
        self.wrap(inputs, "render_inputs", "sidebar: render_inputs")
        self.wrap(inputs, "input_widget", "  input_widget")
        self.wrap(tools, "page_tools", "page_tools (save/share/keep)")
        self.wrap(results, "show_headlines", "show_headlines")
        for fn in ("to_display", "from_display", "unit_label"):
            self.wrap(units, fn, "unit conversions (liftcore.units)")
        # figure building: every function of the topic figure modules (one label, so nested
        # calls count once), base_figure where they call it, and Plotly's figure API under them
        from plotly.basedatatypes import BaseFigure

        for name in ("figures_flow", "figures_rotor", "figures_voyage", "figures_ball"):
            m = importlib.import_module(f"liftcore.{name}")
            for fn_name, fn in list(vars(m).items()):
                if inspect.isfunction(fn) and fn.__module__ == m.__name__:
                    self.wrap(m, fn_name, "figure builders (liftcore.figures_*)")
            if hasattr(m, "base_figure"):
                self.wrap(m, "base_figure", "  of which base_figure (house style)")
        for fn_name in ("__init__", "update_layout", "add_trace", "add_traces", "update_xaxes",
                        "update_yaxes", "update_traces", "add_annotation", "add_shape",
                        "add_hline", "add_vline", "add_hrect", "add_vrect"):
            if hasattr(BaseFigure, fn_name):
                self.wrap(BaseFigure, fn_name, "  plotly figure API (incl. base_figure)")
        hooks = self

        original = sr.ScriptRunner._enqueue_forward_msg

        def tally(runner, msg):
            hooks.messages.append(msg)
            return original(runner, msg)

        sr.ScriptRunner._enqueue_forward_msg = tally
        self._undo.append((sr.ScriptRunner, "_enqueue_forward_msg", original))

    def uninstall(self) -> None:
        for owner, name, original in reversed(self._undo):
            setattr(owner, name, original)
        self._undo.clear()

    def reset(self) -> None:
        self.spent.clear()
        self.calls.clear()
        self.messages.clear()


def message_sizes(messages) -> tuple[dict, list]:
    """Bytes by element type and (title, bytes) of every chart's JSON, from the forward messages."""
    by_type = defaultdict(lambda: [0, 0])
    charts = []
    for msg in messages:
        size = msg.ByteSize()
        kind = msg.WhichOneof("type")
        if kind == "delta":
            d = msg.delta
            kind = d.WhichOneof("type")
            if kind == "new_element":
                kind = d.new_element.WhichOneof("type")
                if kind == "plotly_chart":
                    spec = d.new_element.plotly_chart.spec
                    title = json.loads(spec).get("layout", {}).get("title", {})
                    title = title.get("text", "") if isinstance(title, dict) else str(title)
                    charts.append((title or "(untitled)", len(spec.encode())))
        by_type[kind][0] += 1
        by_type[kind][1] += size
    return dict(by_type), charts


def _first_sidebar_number(at):
    boxes = at.sidebar.number_input
    if not boxes:
        raise RuntimeError("the page has no number input in its sidebar")
    return boxes[0]


def _values(v0: float, n: int, start: int):
    return [v0 * (1.0 + 0.002 * k) if v0 else 0.001 * k for k in range(start, start + n)]


def profile_page(kind: str) -> dict:
    from streamlit.testing.v1 import AppTest

    at = AppTest.from_file(str(ROOT / "views" / f"{kind}.py"), default_timeout=600)
    at.run()
    if at.exception:
        raise RuntimeError(f"{kind}: {at.exception[0].message}")
    box = _first_sidebar_number(at)
    label, v0 = box.label, float(box.value)

    def change(value):
        _first_sidebar_number(at).set_value(float(f"{value:.6g}"))
        t0 = time.perf_counter()
        at.run()
        dt = time.perf_counter() - t0
        if at.exception:
            raise RuntimeError(f"{kind}: {at.exception[0].message}")
        if any("out of range" in e.value for e in at.error):
            raise RuntimeError(f"{kind}: {at.error[0].value}")
        return dt

    change(_values(v0, 1, 1)[0])  # warm-up (first change: lazy imports, caches of constants)
    hooks = Hooks()
    hooks.install(kind)
    times, gcs, parts = [], [], defaultdict(list)
    calls = {}
    try:
        for value in _values(v0, TIMED, 2):
            hooks.reset()
            times.append(change(value))
            for k, v in hooks.spent.items():
                parts[k].append(v)
            calls = dict(hooks.calls)
            sizes = message_sizes(hooks.messages)
            t0 = time.perf_counter()
            gc.collect(2)
            gcs.append(time.perf_counter() - t0)
    finally:
        hooks.uninstall()

    prof = cProfile.Profile()
    value = _values(v0, 1, TIMED + 2)[0]
    _first_sidebar_number(at).set_value(float(f"{value:.6g}"))
    from streamlit.runtime.scriptrunner import script_runner as sr

    run_exec = sr.exec_func_with_error_handling

    def profiled(func, ctx):
        prof.enable()
        try:
            return run_exec(func, ctx)
        finally:
            prof.disable()

    sr.exec_func_with_error_handling = profiled
    try:
        t0 = time.perf_counter()
        at.run()
        t_prof = time.perf_counter() - t0
    finally:
        sr.exec_func_with_error_handling = run_exec
    return {"label": label, "from": v0, "times": times, "parts": dict(parts), "calls": calls,
            "gc": gcs, "sizes": sizes, "profile": prof, "t_prof": t_prof}


#: Draws each chart's JSON with plotly.js in a fresh div (like a chart Streamlit mounts anew, which
#: it does when the figure changes) three times; returns [[parse ms, draw ms], ...] per chart.
DRAW_JS = """async ([specs, width]) => {
  const out = [];
  for (const s of specs) {
    const times = [];
    for (let i = 0; i < 4; i++) {
      const div = document.createElement('div');
      div.style.width = width + 'px';
      document.body.appendChild(div);
      const t0 = performance.now();
      const fig = JSON.parse(s);
      const t1 = performance.now();
      await Plotly.newPlot(div, fig.data, fig.layout, {displaylogo: false});
      await new Promise(r => requestAnimationFrame(() => setTimeout(r, 0)));
      const t2 = performance.now();
      const gl = div.querySelectorAll('canvas').length;
      Plotly.purge(div);
      div.remove();
      if (i > 0) times.push([t1 - t0, t2 - t1, gl]);
    }
    out.push(times);
  }
  return out;
}"""


#: Chart widths on the pages at 1600 x 1000 with the sidebar open: half and full main area. [px]
WIDTHS = (550, 1110)


def draw_times(kind: str) -> list:
    """(title, kB, parse ms, {width: draw ms}, canvases) of each chart of the study's default
    result, drawn by plotly.js (the copy shipped with the plotly package: no download) in
    Debian's Chromium at each of ``WIDTHS``."""
    import plotly
    from playwright.sync_api import sync_playwright

    from liftcore.studies import run_study, study
    from tests.browser.conftest import CHROMIUM, CHROMIUM_ARGS

    if not Path(CHROMIUM).exists():
        return []
    result = run_study(kind, {})
    mod = study(kind)
    make = getattr(mod, "figures_in_units", None)
    figs = list(make(result, "SI") if callable(make) else result.figures)
    specs = [plotly.io.to_json(fig, validate=False) for _, fig in figs]
    js = Path(plotly.__file__).parent / "package_data" / "plotly.min.js"
    with tempfile.TemporaryDirectory() as tmp:
        html = Path(tmp) / "draw.html"
        html.write_text(f'<!DOCTYPE html><html><head><script src="{js.as_uri()}"></script></head><body></body></html>')
        with sync_playwright() as pw:
            browser = pw.chromium.launch(executable_path=CHROMIUM, headless=True, args=CHROMIUM_ARGS)
            try:
                page = browser.new_page(viewport={"width": 1600, "height": 1000})
                page.goto(html.as_uri())
                page.evaluate(DRAW_JS, [specs[:1], WIDTHS[0]])  # warm-up: plotly.js's first draw
                times = {w: page.evaluate(DRAW_JS, [specs, w]) for w in WIDTHS}
            finally:
                browser.close()
    out = []
    for i, ((title, _), spec) in enumerate(zip(figs, specs)):
        t = times[WIDTHS[0]][i]
        out.append((title, len(spec.encode()) / 1e3, statistics.median(x[0] for x in t),
                    {w: statistics.median(x[1] for x in times[w][i]) for w in WIDTHS}, t[0][2]))
    return out


def _short(path: str) -> str:
    for marker in ("site-packages/", str(ROOT) + "/"):
        if marker in path:
            return path.split(marker, 1)[1]
    return path


def print_report(kind: str, r: dict) -> None:
    print(f"== {kind}: rerun after changing {r['label']!r} from {r['from']:g} (AppTest, SI) ==")
    t = r["times"]
    print(f"script time, {len(t)} new values: median {statistics.median(t):.3f} s "
          f"(min {min(t):.3f}, max {max(t):.3f}); full garbage collection after it "
          f"{statistics.median(r['gc']):.3f} s")
    print("  inclusive parts (median s, calls in the last rerun):")
    for k in sorted(r["parts"], key=lambda k: _ORDER.index(k) if k in _ORDER else len(_ORDER)):
        v = r["parts"][k]
        print(f"    {k:<40} {statistics.median(v):7.3f} s  {r['calls'].get(k, 0):5d} calls")
    by_type, charts = r["sizes"]
    total = sum(b for _, b in by_type.values())
    print(f"  forward messages: {sum(n for n, _ in by_type.values())}, {total / 1e3:.1f} kB in all")
    for k, (n, b) in sorted(by_type.items(), key=lambda kv: -kv[1][1]):
        print(f"    {k:<24} {n:4d} msgs {b / 1e3:9.1f} kB")
    print("  charts (JSON bytes):")
    for title, b in charts:
        print(f"    {b / 1e3:8.1f} kB  {title}")
    s = io.StringIO()
    st = pstats.Stats(r["profile"], stream=s)
    rows = []
    for (path, line, fn), (cc, nc, tt, ct, _callers) in st.stats.items():
        if any(p in path for p in _PLUMBING) or path.endswith(f"views/{kind}.py") and fn == "<module>":
            continue
        rows.append((ct, tt, nc, f"{_short(path)}:{line}({fn})"))
    rows.sort(reverse=True)
    print(f"  top {TOP} by cumulative time under cProfile (this rerun {r['t_prof']:.3f} s profiled):")
    for ct, tt, nc, name in rows[:TOP]:
        print(f"    {ct:7.3f} s cum  {tt:7.3f} s self  {nc:7d} calls  {name}")
    pkg = defaultdict(float)
    for (path, _line, _fn), (_cc, _nc, tt, _ct, _callers) in st.stats.items():
        p = _short(path)
        if p == "~" or p.startswith("<"):
            top = "built-in functions"
        elif p.startswith("/"):
            top = "standard library"
        else:
            top = p.split("/", 1)[0]
        pkg[top] += tt
    tot = sum(pkg.values())
    print("  self time by package under cProfile: " + ", ".join(
        f"{k} {v / tot:.0%}" for k, v in sorted(pkg.items(), key=lambda kv: -kv[1])[:9]))
    print()


def print_draw_times(kind: str) -> None:
    rows = draw_times(kind)
    if not rows:
        print(f"  (no {kind} charts drawn: Chromium missing)")
        return
    print(f"  browser: each chart of the default {kind} result drawn anew by plotly.js "
          f"(median of 3; JSON.parse, then newPlot to the next frame; {' and '.join(map(str, WIDTHS))} px wide):")
    for title, kb, parse, draw, gl in rows:
        print(f"    {parse:6.1f} ms parse  " + "  ".join(f"{draw[w]:7.1f} ms draw at {w}" for w in WIDTHS)
              + f"  {kb:7.1f} kB{'  WebGL canvas' if gl else ''}  {title}")
    print("    total " + ", ".join(f"{sum(r[2] + r[3][w] for r in rows):.0f} ms at {w} px" for w in WIDTHS))
    print()


def main(argv=()) -> None:
    args = list(argv)
    browser = "--no-browser" not in args
    kinds = [a for a in args if not a.startswith("--")] or list(PAGES)
    for kind in kinds:
        print(f"[profile_pages] {kind}", file=sys.stderr, flush=True)
        print_report(kind, profile_page(kind))
    if browser:
        for kind in kinds:
            print(f"[profile_pages] drawing the {kind} charts", file=sys.stderr, flush=True)
            print_draw_times(kind)


if __name__ == "__main__":
    main(sys.argv[1:])
