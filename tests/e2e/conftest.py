"""Browser end-to-end fixtures: build once, serve on 127.0.0.1, drive Chromium with Playwright.

Every page fails its test on a console error, an uncaught exception, or any request to a host
other than the test server. Chromium is found in this order: $DRIFTDOSE_CHROMIUM, the system
Chromium (Debian's /usr/bin/chromium and common names), then Playwright's own browser.
"""

from __future__ import annotations

import importlib.util
import os
import re
import shutil
from collections.abc import Iterator
from pathlib import Path
from urllib.parse import urlsplit

import pytest

ROOT = Path(__file__).resolve().parents[2]
# run by Debian's /usr/bin/python3 (with gi, WebKitGTK) from test_other_engines.py, never imported
# here: the suite's --doctest-modules would import it and fail where gi is not in the venv
collect_ignore = ["webkit_page.py"]
ARTIFACTS = ROOT / "test-artifacts"
CHROMIUM_ARGS = [
    "--no-sandbox",
    "--disable-gpu",
    "--disable-background-networking",
    "--disable-component-update",
    "--disable-sync",
    "--no-first-run",
    "--disable-quic",
    "--disable-dev-shm-usage",
]
# Parts of Chromium's own window that a headless test never shows: the address bar's suggestion
# popup is built as a web page for every new window. On this 2-core machine it kept a core busy
# about 0.4 s for each page opened (6 contexts: 4.3 s of the browser's CPU with it, 1.8 s
# without, 3 December 2026) and about 1 s as the browser starts, during whatever the test or
# the benchmark is timing.
QUIET_FEATURES = ("WebUIOmniboxPopup", "WebUIOmniboxAimPopup")
_launch_args: list[str] | None = None


def chromium_args(playwright) -> list[str]:
    """CHROMIUM_ARGS plus one ``--disable-features`` that adds QUIET_FEATURES to Playwright's own.

    Chromium reads only the last ``--disable-features`` it is given, and Playwright passes its
    own list before the caller's arguments, so a second list would silently switch Playwright's
    back on. The list is therefore read once from a browser started with CHROMIUM_ARGS (its
    chrome://version page shows the command line) and extended; if it cannot be read, the
    plain CHROMIUM_ARGS are used (``tests/e2e/test_browser_flags.py`` then fails).
    """
    global _launch_args
    if _launch_args is None:
        features: list[str] = []
        try:
            browser = playwright.chromium.launch(
                executable_path=find_chromium(), args=CHROMIUM_ARGS
            )
            try:
                page = browser.new_page()
                page.goto("chrome://version")
                line = page.inner_text("#command_line")
            finally:
                browser.close()
            for value in re.findall(r"--disable-features=(\S+)", line):
                features += [f for f in value.split(",") if f and f not in features]
        except Exception:  # any failure: launch as before
            features = []
        extra = [f for f in QUIET_FEATURES if f not in features]
        merged = [f"--disable-features={','.join(features + extra)}"] if features else []
        _launch_args = CHROMIUM_ARGS + merged
    return list(_launch_args)


def _load_build_module():
    spec = importlib.util.spec_from_file_location("driftdose_build", ROOT / "build.py")
    module = importlib.util.module_from_spec(spec)
    assert spec.loader is not None
    spec.loader.exec_module(module)
    return module


def find_chromium() -> str | None:
    """Path of a Chromium to launch, or None to let Playwright use its own browser."""
    env = os.environ.get("DRIFTDOSE_CHROMIUM")
    if env:
        return env
    for name in ("chromium", "chromium-browser", "google-chrome", "google-chrome-stable"):
        path = shutil.which(name)
        if path:
            return path
    return None


@pytest.fixture(scope="session")
def build_module():
    return _load_build_module()


@pytest.fixture(scope="session")
def dist_dir(tmp_path_factory: pytest.TempPathFactory, build_module) -> Path:
    out = tmp_path_factory.mktemp("dist")
    build_module.build(out)
    return out


@pytest.fixture(scope="session")
def base_url(dist_dir: Path, build_module) -> Iterator[str]:
    server, _ = build_module.serve(dist_dir, 0)
    host, port = server.server_address[:2]
    yield f"http://{host}:{port}/"
    server.shutdown()


@pytest.fixture(scope="session")
def playwright_session() -> Iterator:
    """The session's one Playwright (its sync API runs once per thread)."""
    from playwright.sync_api import sync_playwright

    with sync_playwright() as p:
        yield p


@pytest.fixture(scope="session")
def browser(playwright_session) -> Iterator:
    b = playwright_session.chromium.launch(
        executable_path=find_chromium(), args=chromium_args(playwright_session)
    )
    yield b
    b.close()


class PageWatch:
    """Collects what must never happen on a page: console errors and outside requests."""

    def __init__(self, allowed_origin: str) -> None:
        self.allowed = allowed_origin
        self.errors: list[str] = []
        self.outside: list[str] = []

    def route(self, route) -> None:
        url = route.request.url
        parts = urlsplit(url)
        if parts.scheme in ("data", "blob") or f"{parts.scheme}://{parts.netloc}" == self.allowed:
            route.continue_()
        else:
            self.outside.append(url)
            route.abort()

    def console(self, msg) -> None:
        if msg.type == "error":
            self.errors.append(f"console: {msg.text}")

    def page_error(self, exc) -> None:
        self.errors.append(f"uncaught: {exc}")


def new_watched_page(browser, base_url: str, **context_args):
    """Open a page in a fresh context with the watch installed; returns (context, page, watch)."""
    origin = base_url.rstrip("/")
    watch = PageWatch(origin)
    context = browser.new_context(**context_args)
    context.route("**/*", watch.route)
    page = context.new_page()
    page.on("console", watch.console)
    page.on("pageerror", watch.page_error)
    page.on("worker", lambda w: w.on("console", watch.console))
    return context, page, watch


@pytest.fixture
def watched(browser, base_url: str):
    """Yield a fresh page (1280 x 900) that fails its test on console errors or outside hosts."""
    context, page, watch = new_watched_page(
        browser, base_url, viewport={"width": 1280, "height": 900}
    )
    yield page, watch
    context.close()
    assert not watch.outside, f"requests to other hosts: {watch.outside}"
    assert not watch.errors, f"console errors: {watch.errors}"


@pytest.fixture
def page(watched):
    return watched[0]


def page_link(page) -> str:
    """The page's address as a person copying it gets it. The page writes its link once edits
    pause, and at once when it loses focus (clicking into the address bar does that): a blur
    event is sent first, as the browser would."""
    return page.evaluate("() => { window.dispatchEvent(new Event('blur')); return location.href; }")


def wait_ready(page, timeout: float = 90_000) -> None:
    """Wait for the engine's readiness marker and the first results."""
    page.wait_for_selector("html[data-engine='ready']", timeout=timeout)


def screenshot(page, name: str) -> Path:
    """Save a full-page screenshot under test-artifacts/ and return its path."""
    ARTIFACTS.mkdir(exist_ok=True)
    path = ARTIFACTS / f"{name}.png"
    page.screenshot(path=str(path), full_page=True)
    return path
