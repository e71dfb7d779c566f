"""Browser end-to-end fixtures: build once, serve on 127.0.0.1, drive Chromium with Playwright.

Every page fails its test on a console error, an uncaught exception, or any request to a host
other than the test server. Chromium is found in this order: $DRIFTDOSE_CHROMIUM, the system
Chromium (Debian's /usr/bin/chromium and common names), then Playwright's own browser.
"""

from __future__ import annotations

import importlib.util
import os
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
def browser() -> Iterator:
    from playwright.sync_api import sync_playwright

    with sync_playwright() as p:
        b = p.chromium.launch(executable_path=find_chromium(), args=CHROMIUM_ARGS)
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
