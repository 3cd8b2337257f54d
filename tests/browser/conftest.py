"""Start the real dashboard on a free loopback port and drive it with Debian's Chromium.

Outside CI the browser tests skip (with the reason) when /usr/bin/chromium is missing; with
CI=true they fail instead, so CI never passes without them.
"""

import os
import socket
import subprocess
import sys
import time
import urllib.request
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[2]
CHROMIUM = "/usr/bin/chromium"
CHROMIUM_ARGS = ["--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
                 "--disable-background-networking", "--disable-component-update", "--disable-sync"]


def _free_port() -> int:
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


def pytest_collection_modifyitems(items):
    for item in items:
        if "tests/browser" in str(item.fspath):
            item.add_marker(pytest.mark.browser)


@pytest.fixture(scope="session")
def app_url():
    if not Path(CHROMIUM).exists():
        if os.environ.get("CI") == "true":
            pytest.fail(f"{CHROMIUM} is missing: CI must install Debian's chromium (see .ci/run)")
        pytest.skip(f"{CHROMIUM} not installed (apt-get install chromium)")
    port = _free_port()
    worker = os.environ.get("PYTEST_XDIST_WORKER", "main")  # one log per test worker
    log = (open(ROOT / ".pytest_cache" / f"streamlit-browser-{worker}.log", "w")
           if (ROOT / ".pytest_cache").exists() else subprocess.DEVNULL)
    proc = subprocess.Popen(
        [sys.executable, "-m", "streamlit", "run", str(ROOT / "app.py"), "--server.port", str(port),
         "--server.address", "127.0.0.1", "--server.headless", "true",
         "--browser.gatherUsageStats", "false", "--server.fileWatcherType", "none"],
        cwd=ROOT, stdout=log, stderr=subprocess.STDOUT)
    url = f"http://127.0.0.1:{port}"
    deadline = time.time() + 60
    while time.time() < deadline:
        try:
            with urllib.request.urlopen(f"{url}/_stcore/health", timeout=2) as r:
                if r.status == 200:
                    break
        except OSError:
            time.sleep(0.3)
    else:
        proc.terminate()
        pytest.fail("the dashboard did not start within 60 s")
    yield url
    proc.terminate()
    try:
        proc.wait(10)
    except subprocess.TimeoutExpired:
        proc.kill()


@pytest.fixture(scope="session")
def browser():
    from playwright.sync_api import sync_playwright

    with sync_playwright() as pw:
        b = pw.chromium.launch(executable_path=CHROMIUM, headless=True, args=CHROMIUM_ARGS)
        yield b
        b.close()


@pytest.fixture(scope="session")
def shots_dir(tmp_path_factory):
    """Screenshots go to $LIFTCORE_SHOTS if set (to look at them), else a temporary folder."""
    d = os.environ.get("LIFTCORE_SHOTS")
    path = Path(d) if d else tmp_path_factory.mktemp("screenshots")
    path.mkdir(parents=True, exist_ok=True)
    return path


def wait_for_app(page, timeout_s: float = 90.0) -> None:
    """Wait until Streamlit has finished running the script (no 'running' indicator)."""
    page.wait_for_selector('[data-testid="stApp"]', timeout=timeout_s * 1000)
    # Every page starts with a title: the script has begun rendering once it is there.
    page.wait_for_selector("h1", timeout=timeout_s * 1000)
    deadline = time.time() + timeout_s
    time.sleep(1.0)
    while time.time() < deadline:
        running = page.locator('[data-testid="stStatusWidget"]').count()
        skeleton = page.locator('[data-testid="stSkeleton"]').count()
        if running == 0 and skeleton == 0:
            time.sleep(0.5)
            if page.locator('[data-testid="stStatusWidget"]').count() == 0:
                return
        time.sleep(0.3)
    raise AssertionError("the page kept running for more than %.0f s" % timeout_s)


def full_screenshot(page, path, width: int = 1600, max_height: int = 7000) -> None:
    """Screenshot of the whole page. Streamlit scrolls inside its own container, so grow the
    viewport to the container's height first (``full_page=True`` alone shows one screen)."""
    height = page.evaluate(
        "() => { const m = document.querySelector('[data-testid=stMain]') ||"
        " document.querySelector('section.main'); return m ? m.scrollHeight : 1000; }")
    page.set_viewport_size({"width": width, "height": int(min(max(height, 800), max_height))})
    page.wait_for_timeout(800)
    page.screenshot(path=str(path), full_page=True)
