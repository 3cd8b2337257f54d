"""Page answer time in a real browser: each dashboard page against a trivial Streamlit page.

A page's *answer time* is the time from the key press (Enter) that commits a new number in the
first number input of the page's sidebar to the moment the app's script state (the
``data-test-script-state`` attribute of ``[data-testid="stApp"]``) last returns to
``notRunning``: it must have left ``notRunning`` and then stay there for ``QUIET_MS``. Both
moments are stamped inside the page (the key event's own time stamp and a MutationObserver
reading ``performance.now()``), so Python's polling does not blur them. Every change types a
value not used before, so no result comes from a cache.

Two servers are started on free loopback ports and stopped at the end: the dashboard
(``app.py``) and ``benchmarks/trivial_page.py`` (one number input, one metric, one small Plotly
chart), both through ``benchmarks/page_server.py`` so the server's own script time is logged.
Headless Debian Chromium (``/usr/bin/chromium``), 1600 x 1000, one tab per page; the pages
take their changes in turn, round by round, so drifts in the machine's load hit all of them
alike. One warm-up change per page is not counted.

Printed per page: median and min-max answer time, the ratio to the trivial page's median
(target: every page <= 4 x), and the median split of the answer time: key to the server's
script start, the script itself, Streamlit's clean-up after it (widget state, garbage
collection), and the rest up to ``notRunning`` (sending the last messages and the browser
drawing them); plus the browser's long tasks (> 50 ms) in that time. Progress goes to stderr.

    python -m benchmarks bench_pages
    python -m benchmarks.bench_pages [--changes N] [--pages flow,rotor] [--quiet-ms MS]
"""

from __future__ import annotations

import argparse
import json
import os
import socket
import statistics
import subprocess
import sys
import tempfile
import time
import urllib.request
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
HERE = Path(__file__).resolve().parent
if str(ROOT) not in sys.path:
    sys.path.insert(0, str(ROOT))

PAGES = ("flow", "field", "rotor", "voyage", "flight")
CHANGES = 10
WARMUP = 1
QUIET_MS = 400
TARGET_RATIO = 4.0
VIEWPORT = {"width": 1600, "height": 1000}
#: Longest wait for one page load or one answer. [s]
TIMEOUT_S = 180.0
NUMBER_INPUT = '[data-testid="stSidebar"] [data-testid="stNumberInput"] input'

#: Installed in every tab before the app loads: stamps the Enter key, every change of the script
#: state and the browser's long tasks, all on the page's performance.now() clock [ms].
RECORDER = """(() => {
  const rec = window.__lcBench = {key: null, states: [], long: [], muts: [],
    reset() { this.key = null; this.states = []; this.long = []; this.muts = []; }};
  window.addEventListener('keydown', e => {
    if (e.key === 'Enter' && rec.key === null) rec.key = e.timeStamp;
  }, true);
  new MutationObserver(ms => {
    const t = performance.now();
    for (const m of ms) {
      const s = m.target.getAttribute('data-test-script-state');
      const last = rec.states.length ? rec.states[rec.states.length - 1][1] : null;
      if (s !== last) rec.states.push([t, s]);
    }
  }).observe(document, {attributes: true, attributeFilter: ['data-test-script-state'], subtree: true});
  // one time stamp per batch of DOM changes (elements and text, not attributes): the fallback
  // when a run was so short that the browser drew 'running' and 'notRunning' in one go
  new MutationObserver(() => { rec.muts.push(performance.now()); })
    .observe(document, {childList: true, characterData: true, subtree: true});
  try {
    new PerformanceObserver(list => {
      for (const e of list.getEntries()) rec.long.push([e.startTime, e.duration]);
    }).observe({type: 'longtask', buffered: true});
  } catch (err) { /* no long-task timing in this browser */ }
})();"""

#: True once the script state left notRunning after the key press, came back and stayed QUIET ms;
#: or, when no state change shows, once the state is notRunning, a second has passed since the
#: key and the page has not changed for QUIET ms (the server's log then tells whether it ran).
ANSWERED = """quiet => {
  const r = window.__lcBench;
  if (!r || r.key === null) return false;
  const now = performance.now();
  const s = r.states.filter(x => x[0] >= r.key);
  if (s.some(x => x[1] !== 'notRunning')) {
    const last = s[s.length - 1];
    return last[1] === 'notRunning' && now - last[0] >= quiet;
  }
  const el = document.querySelector('[data-testid="stApp"]');
  const lastMut = r.muts.length ? r.muts[r.muts.length - 1] : r.key;
  return el && el.getAttribute('data-test-script-state') === 'notRunning'
    && now - r.key >= 1000 && now - lastMut >= quiet;
}"""

#: True once the app has loaded and stayed notRunning for QUIET ms.
SETTLED = """quiet => {
  const el = document.querySelector('[data-testid="stApp"]');
  const r = window.__lcBench;
  if (!el || el.getAttribute('data-test-script-state') !== 'notRunning' || !document.querySelector('h1')) return false;
  const since = r.states.length ? r.states[r.states.length - 1][0] : 0;
  return performance.now() - since >= quiet;
}"""


def log(msg: str) -> None:
    print(f"[bench_pages] {msg}", file=sys.stderr, flush=True)


def free_port() -> int:
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


class Server:
    """A Streamlit server on a free loopback port whose script runs are logged (page_server)."""

    def __init__(self, script: Path, workdir: Path, name: str):
        self.script, self.name = script, name
        self.run_log = workdir / f"{name}-runs.jsonl"
        self.out_log = workdir / f"{name}-server.log"
        self.port = free_port()
        self.url = f"http://127.0.0.1:{self.port}"
        self.proc: subprocess.Popen | None = None

    def start(self) -> None:
        self.run_log.write_text("")
        env = dict(os.environ, LIFTCORE_BENCH_RUN_LOG=str(self.run_log))
        env.pop("LIFTCORE_BENCH_PROFILE_DIR", None)
        with open(self.out_log, "w") as out:
            self.proc = subprocess.Popen(
                [sys.executable, str(HERE / "page_server.py"), "run", str(self.script),
                 "--server.port", str(self.port), "--server.address", "127.0.0.1",
                 "--server.headless", "true", "--browser.gatherUsageStats", "false",
                 "--server.fileWatcherType", "none"],
                cwd=ROOT, env=env, stdout=out, stderr=subprocess.STDOUT)
        deadline = time.time() + 90
        while time.time() < deadline:
            if self.proc.poll() is not None:
                raise RuntimeError(f"{self.name} server exited: {self.out_log.read_text()[-2000:]}")
            try:
                with urllib.request.urlopen(f"{self.url}/_stcore/health", timeout=2) as r:
                    if r.status == 200:
                        return
            except OSError:
                time.sleep(0.3)
        raise RuntimeError(f"the {self.name} server did not start within 90 s")

    def runs(self, since: float, until: float) -> list[dict]:
        """Script executions (page_server records) that started in [since, until] (wall clock)."""
        out = []
        for line in self.run_log.read_text().splitlines():
            rec = json.loads(line)
            if since <= rec["start"] <= until:
                out.append(rec)
        return out

    def stop(self) -> None:
        if self.proc is None or self.proc.poll() is not None:
            return
        self.proc.terminate()
        try:
            self.proc.wait(10)
        except subprocess.TimeoutExpired:
            self.proc.kill()
            self.proc.wait(10)


class Probe:
    """One browser tab on one page, changing its first sidebar number input."""

    def __init__(self, name: str, server: Server, path: str):
        self.name, self.server, self.path = name, server, path
        self.used: set[str] = set()
        self.samples: list[dict] = []
        self.page = None
        self.start_value = 0.0
        self.offset_s = 0.0
        self.label = ""

    def open(self, browser) -> None:
        context = browser.new_context(viewport=VIEWPORT)
        self.page = context.new_page()
        self.page.add_init_script(RECORDER)
        self.page.goto(f"{self.server.url}/{self.path}", timeout=TIMEOUT_S * 1000)
        self.page.wait_for_function(SETTLED, arg=1000, polling=100, timeout=TIMEOUT_S * 1000)
        self._check_page()
        box = self.page.locator(NUMBER_INPUT).first
        box.wait_for(timeout=TIMEOUT_S * 1000)
        shown = None
        while shown != box.input_value():  # the value the page settled on (read twice, alike)
            shown = box.input_value()
            self.page.wait_for_timeout(500)
        self.start_value = float(shown)
        self.label = self.page.locator('[data-testid="stSidebar"] [data-testid="stNumberInput"] label').first.inner_text()
        self.offset_s = self._clock_offset()

    def _clock_offset(self) -> float:
        """Browser wall clock (timeOrigin + now) minus this process's time.time() [s]."""
        best = None
        for _ in range(7):
            t0 = time.time()
            b = self.page.evaluate("() => performance.timeOrigin + performance.now()") / 1000.0
            t1 = time.time()
            if best is None or t1 - t0 < best[0]:
                best = (t1 - t0, b - 0.5 * (t0 + t1))
        return best[1]

    def _check_page(self) -> None:
        """Stop on an exception or an out-of-range message: such a page answers too fast to count."""
        exc = self.page.locator('[data-testid="stException"]')
        if exc.count():
            raise RuntimeError(f"{self.name} page shows an exception: {exc.first.inner_text()[:500]}")
        bad = self.page.get_by_text("Some inputs are out of range", exact=False)
        if bad.count():
            raise RuntimeError(f"{self.name} page says: {bad.first.inner_text()[:300]}")

    def next_value(self) -> str:
        """A value near the start value not typed before (a fresh cache key every time)."""
        v0, k = self.start_value, len(self.used) + 1
        while True:
            v = v0 * (1.0 + 0.002 * k) if v0 else 0.001 * k
            text = f"{v:.6g}"
            if text not in self.used and text != f"{v0:.6g}":
                self.used.add(text)
                return text
            k += 1

    def _wall(self, rec: dict, t_ms: float) -> float:
        """A page time stamp [ms] on this process's time.time() clock [s]."""
        return (rec["origin"] + t_ms) / 1000.0 - self.offset_s

    def _answer(self):
        """Wait for the answer; return (key, done) page times [ms], how done was read, the
        server's script runs of this change and the page's record."""
        deadline = time.time() + TIMEOUT_S
        while True:
            self.page.wait_for_function(ANSWERED, arg=QUIET_MS, polling=50, timeout=TIMEOUT_S * 1000)
            rec = self.page.evaluate("() => { const r = window.__lcBench; return {key: r.key, "
                                     "states: r.states, long: r.long, muts: r.muts, origin: performance.timeOrigin}; }")
            key = rec["key"]
            after = [(t, s) for t, s in rec["states"] if t >= key]
            runs = self.server.runs(self._wall(rec, key) - 0.05, time.time())
            if any(s != "notRunning" for _, s in after):
                done = [t for t, s in after if s == "notRunning"][-1]
                runs = [r for r in runs if r["start"] <= self._wall(rec, done)]
                return key, done, "state", runs, rec
            if runs:  # the run was drawn in one go: its results are the first DOM change after it
                end_ms = (runs[-1]["end"] + self.offset_s) * 1000.0 - rec["origin"]
                later = [t for t in rec["muts"] if t >= end_ms]
                if later:
                    return key, later[0], "dom", runs, rec
            if time.time() > deadline:
                raise RuntimeError(f"{self.name}: no answer within {TIMEOUT_S:g} s "
                                   f"({len(runs)} script runs logged)")
            time.sleep(0.2)

    def change(self, counted: bool) -> dict:
        page = self.page
        page.bring_to_front()
        text = self.next_value()
        box = page.locator(NUMBER_INPUT).first
        box.click()
        box.fill(text)
        page.evaluate("() => window.__lcBench.reset()")
        box.press("Enter")
        key, done, how, runs, rec = self._answer()
        self._check_page()
        shown = float(page.locator(NUMBER_INPUT).first.input_value())
        if abs(shown - float(text)) > 1e-9 * max(1.0, abs(float(text))):
            raise RuntimeError(f"{self.name}: typed {text}, the input shows {shown}")
        long_ms = sum(max(0.0, min(s + d, done) - max(s, key)) for s, d in rec["long"])
        key_w, done_w = self._wall(rec, key), self._wall(rec, done)
        sample = {"value": text, "answer_s": (done - key) / 1000.0, "long_s": long_ms / 1000.0,
                  "runs": len(runs), "read_from": how}
        if runs:
            sample["to_script_s"] = max(0.0, runs[0]["start"] - key_w)
            sample["script_s"] = sum(r["end"] - r["start"] for r in runs)
            sample["cleanup_s"] = sum(r["finished"] - r["end"] for r in runs)
            sample["after_s"] = done_w - runs[-1]["finished"]
        if counted:
            self.samples.append(sample)
        return sample


def _median(samples: list[dict], key: str) -> float:
    vals = [s[key] for s in samples if key in s]
    return statistics.median(vals) if vals else float("nan")


def _url_path(kind: str) -> str:
    from views import PAGES as VIEW_PAGES

    for file, _title, url, _icon in VIEW_PAGES:
        if file == f"views/{kind}.py":
            return url
    raise KeyError(f"no page for {kind!r} in views.PAGES")


def report(probes: list[Probe], changes: int, load: tuple) -> dict:
    base = statistics.median(s["answer_s"] for s in probes[0].samples)
    print(f"page answer time, headless Chromium {VIEWPORT['width']} x {VIEWPORT['height']}, "
          f"{os.cpu_count()} CPUs: Enter on a new number in the first sidebar number input -> "
          f"script state last back at notRunning (quiet {QUIET_MS} ms)")
    print(f"machine load (1-min average) at the start {load[0]:.1f}, at the end {load[1]:.1f}: "
          "other work on the machine shows in the times, less in the ratios")
    print(f"median of {changes} new values per page ({WARMUP} warm-up change not counted), "
          "pages in turn round by round")
    print(f"{'page':<9} {'median':>8} {'min - max':>15} {'ratio':>7}  {'target <= 4x':<12} "
          f"{'to script':>9} {'script':>7} {'clean-up':>8} {'rest':>7} {'long tasks':>10}")
    out, worst = {}, (0.0, "")
    for p in probes:
        ans = [s["answer_s"] for s in p.samples]
        med = statistics.median(ans)
        ratio = med / base
        target = "" if p is probes[0] else ("met" if ratio <= TARGET_RATIO else "NOT met")
        if p is not probes[0] and ratio > worst[0]:
            worst = (ratio, p.name)
        print(f"{p.name:<9} {med:7.3f}s {min(ans):6.3f} - {max(ans):6.3f}s {ratio:6.1f}x  {target:<12} "
              f"{_median(p.samples, 'to_script_s'):8.3f}s {_median(p.samples, 'script_s'):6.3f}s "
              f"{_median(p.samples, 'cleanup_s'):7.3f}s {_median(p.samples, 'after_s'):6.3f}s "
              f"{_median(p.samples, 'long_s'):9.3f}s")
        out[p.name] = {"median_s": med, "min_s": min(ans), "max_s": max(ans), "ratio": ratio,
                       "samples": p.samples, "input": p.label}
    print("columns after the target are medians of the answer's parts: key press to the server's "
          "script start, the script, Streamlit's clean-up after it (widget state, garbage "
          "collection), the rest to notRunning (last messages, browser drawing); long tasks: "
          "the browser's main thread in tasks over 50 ms within the answer time")
    dom = [f"{p.name} {sum(s['read_from'] == 'dom' for s in p.samples)}/{len(p.samples)}" for p in probes
           if any(s["read_from"] == "dom" for s in p.samples)]
    if dom:
        print("answers the browser drew in one go (no 'running' state shown), read from the first DOM "
              "change after the script ended: " + ", ".join(dom))
    print("inputs changed: " + "; ".join(f"{p.name}: {p.label!r} from {p.start_value:g}" for p in probes))
    if worst[1]:
        print(f"every page <= {TARGET_RATIO:g} x the trivial page: "
              f"{'met' if worst[0] <= TARGET_RATIO else 'NOT met'} (slowest: {worst[1]} {worst[0]:.1f} x)")
    return out


def main(argv=()) -> dict:
    """Run the benchmark; ``argv`` are this module's own options (none when run by the suite)."""
    p = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    p.add_argument("--changes", type=int, default=CHANGES)
    p.add_argument("--pages", default=",".join(PAGES), help="comma-separated pages (default: all)")
    p.add_argument("--quiet-ms", type=int, default=None)
    args = p.parse_args(argv)
    global QUIET_MS
    if args.quiet_ms is not None:
        QUIET_MS = args.quiet_ms

    from tests.browser.conftest import CHROMIUM, CHROMIUM_ARGS

    if not Path(CHROMIUM).exists():
        print(f"page answer times: {CHROMIUM} not installed (apt-get install chromium), skipped")
        return {}
    from playwright.sync_api import sync_playwright

    kinds = [k.strip() for k in args.pages.split(",") if k.strip()]
    load0 = os.getloadavg()[0]
    with tempfile.TemporaryDirectory(prefix="bench_pages-") as tmp:
        work = Path(tmp)
        servers = [Server(HERE / "trivial_page.py", work, "trivial"), Server(ROOT / "app.py", work, "dashboard")]
        try:
            for s in servers:
                log(f"starting the {s.name} server on {s.url}")
                s.start()
            probes = [Probe("trivial", servers[0], "")] + [Probe(k, servers[1], _url_path(k)) for k in kinds]
            with sync_playwright() as pw:
                browser = pw.chromium.launch(executable_path=CHROMIUM, headless=True, args=CHROMIUM_ARGS)
                try:
                    for pr in probes:
                        t0 = time.perf_counter()
                        pr.open(browser)
                        log(f"opened {pr.name} in {time.perf_counter() - t0:.1f} s; changing "
                            f"{pr.label!r} from {pr.start_value:g}")
                    for r in range(WARMUP + args.changes):
                        counted = r >= WARMUP
                        for pr in probes:
                            s = pr.change(counted)
                            log(f"round {r + 1 - WARMUP if counted else 'warm-up'} {pr.name:<8} "
                                f"{pr.label[:28]!r} = {s['value']:<9} {s['answer_s']:.3f} s"
                                + (f" (script {s['script_s']:.3f} s)" if "script_s" in s else " (no script run logged)"))
                finally:
                    browser.close()
        finally:
            for s in servers:
                s.stop()
        return report(probes, args.changes, (load0, os.getloadavg()[0]))


if __name__ == "__main__":
    main(sys.argv[1:])
