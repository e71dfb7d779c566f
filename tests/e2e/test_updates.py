"""Updates on a plain static host: a new deployment is noticed whatever the host's cache headers
say, and a page never runs the engine of another build.

Two servers: the project's own (``Cache-Control: no-cache``) and a plain one that sends no cache
header at all, whose files are dated a year back, so the browser's heuristic caching keeps
them fresh for weeks (10 % of their age, the usual rule); a new deployment's files are dated
now, as an upload dates them.
"""

from __future__ import annotations

import functools
import http.server
import json
import os
import shutil
import threading
import time
from pathlib import Path

import pytest

from .conftest import wait_ready
from .helpers import reload_under_service_worker

pytestmark = pytest.mark.e2e

YEAR = 365 * 24 * 3600


def _plain_server(directory: Path, build_module):
    """A static server without any cache header (as many plain hosts are)."""

    class Handler(http.server.SimpleHTTPRequestHandler):
        extensions_map = {  # noqa: RUF012
            **http.server.SimpleHTTPRequestHandler.extensions_map,
            **build_module.MIME,
        }

        def log_message(self, *args) -> None:
            pass

    server = http.server.ThreadingHTTPServer(
        ("127.0.0.1", 0), functools.partial(Handler, directory=str(directory))
    )
    threading.Thread(target=server.serve_forever, daemon=True).start()
    return server


def _age(directory: Path) -> None:
    past = time.time() - YEAR
    for path in directory.rglob("*"):
        os.utime(path, (past, past))


def _ready(page, url: str) -> None:
    page.goto(url)
    wait_ready(page)
    page.wait_for_function(
        "() => Number(document.getElementById('panel-motion').dataset.updates || 0) >= 1"
    )


def _deploy_next(dist: Path, *, move_wheel: bool) -> str:
    """Change the deployment in place as a new release would; return the new wheel path."""
    style = dist / "css" / "style.css"
    style.write_text(style.read_text() + "\n/* next release */\n")
    info = json.loads((dist / "build-info.json").read_text())
    forms = json.loads((dist / "forms.json").read_text())
    wheel = forms.get("wheel", info["wheel"])
    if move_wheel:
        old = dist / wheel
        new = dist / "wheels" / "0000next00000000" / old.name
        new.parent.mkdir()
        shutil.move(old, new)
        if not any(old.parent.iterdir()):
            old.parent.rmdir()
        wheel = new.relative_to(dist).as_posix()
        if "wheel" in forms:
            forms["wheel"] = wheel
            (dist / "forms.json").write_text(json.dumps(forms))
    info["build"] = "next-release"
    info["wheel"] = wheel
    (dist / "build-info.json").write_text(json.dumps(info))
    return wheel  # the new files are dated now, as an upload dates them


def test_new_deployment_noticed_without_cache_headers(browser, build_module, tmp_path):
    dist = tmp_path / "site"
    build_module.build(dist)
    _age(dist)
    server = _plain_server(dist, build_module)
    url = f"http://127.0.0.1:{server.server_address[1]}/"
    context = browser.new_context()
    try:
        page = context.new_page()
        _ready(page, url)
        reload_under_service_worker(page, lambda: _ready(page, url))
        _deploy_next(dist, move_wheel=False)
        page.reload()
        page.locator("#update-banner").wait_for(state="visible", timeout=60_000)
        with page.expect_navigation():
            page.get_by_role("button", name="Reload to update").click()
        wait_ready(page)
        assert "next release" in page.evaluate("() => fetch('css/style.css').then(r => r.text())")
    finally:
        context.close()
        server.shutdown()


@pytest.mark.parametrize("headers", ["no-cache", "none"])
def test_old_page_never_runs_the_new_engine(browser, build_module, tmp_path, headers):
    dist = tmp_path / "site"
    build_module.build(dist)
    if headers == "none":
        _age(dist)
        server = _plain_server(dist, build_module)
    else:
        server, _ = build_module.serve(dist, 0)
    url = f"http://127.0.0.1:{server.server_address[1]}/"
    context = browser.new_context(service_workers="block")
    requested: list[str] = []
    context.on("request", lambda r: requested.append(r.url))
    try:
        page = context.new_page()
        _ready(page, url)
        forms = page.evaluate("() => fetch('forms.json').then((r) => r.json())")
        new_wheel = _deploy_next(dist, move_wheel=True)
        # a second engine of the open page (its own modules, its own forms) must not load the
        # engine the server now holds
        page.evaluate(
            """async (wheel) => {
                const { Engine } = await import('./js/engine.js');
                const e = new Engine(new URL('./js/worker.js', location.href), { wheel });
                const late = new Promise((r) => setTimeout(r, 45000));
                await Promise.race([e.ready.catch(() => {}), late]);
                e.worker && e.worker.terminate();
            }""",
            forms.get("wheel"),
        )
        assert not [u for u in requested if new_wheel in u], "the old page asked for the new engine"
        # the page's own engine started again (as "Restart the engine" does): it runs this
        # page's engine where a cache still holds it, or says a reload is needed; never the new
        page.evaluate("async () => { const m = await import('./js/app.js'); m.engine.restart(); }")
        page.wait_for_function(
            "() => ['failed', 'ready'].includes(document.documentElement.dataset.engine)",
            timeout=90_000,
        )
        assert not [u for u in requested if new_wheel in u], "the old page asked for the new engine"
        if (
            headers == "no-cache"
            or page.evaluate("() => document.documentElement.dataset.engine") == "failed"
        ):
            status = page.locator("#engine-text").inner_text()
            assert "another version" in status and "reload" in status, status
            assert page.locator("#update-banner").is_visible()
            with page.expect_navigation():
                page.get_by_role("button", name="Reload to update").click()
            wait_ready(page)
    finally:
        context.close()
        server.shutdown()
