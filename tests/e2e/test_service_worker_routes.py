"""The service worker's static routes: after one visit, the build's files come straight from this
build's cache (the browser's static routing, without the worker's fetch handler), while the page
itself and the always-fresh descriptions stay with the fetch handler; a file asked for with a
query string is still answered from the cache offline (the handler's look-up without it). The
warm-up worker of the first visit (js/warm.js) ends without an error or warning.

What the browser did is read from the DevTools protocol (``serviceWorkerRouterInfo`` of each
response), the same record its network panel shows.
"""

from __future__ import annotations

import pytest

from .conftest import wait_ready
from .helpers import reload_under_service_worker

pytestmark = pytest.mark.e2e

ACTIVATED = """async () => {
  const reg = await navigator.serviceWorker.ready;
  while (!reg.active || reg.active.state !== 'activated') {
    await new Promise((r) => setTimeout(r, 100));
  }
}"""


def _responses_after_reload(context, page) -> dict[str, dict]:
    cdp = context.new_cdp_session(page)
    seen: dict[str, dict] = {}
    cdp.on(
        "Network.responseReceived",
        lambda p: seen.__setitem__(p["response"]["url"], p["response"]),
    )
    cdp.send("Network.enable")
    reload_under_service_worker(page, lambda: wait_ready(page))
    page.evaluate("() => fetch('build-info.json', { cache: 'no-store' }).then((r) => r.json())")
    cdp.send("Network.disable")
    return seen


def _by_path(seen: dict[str, dict], base_url: str, path: str) -> dict:
    matches = [r for url, r in seen.items() if url.split("?")[0] == base_url + path]
    assert matches, f"no response seen for {path}"
    return matches[-1]


def test_build_files_come_from_the_cache_by_static_route(browser, base_url):
    context = browser.new_context()
    try:
        page = context.new_page()
        errors: list[str] = []
        page.on("console", lambda m: errors.append(m.text) if m.type == "error" else None)
        page.on(
            "worker",
            lambda w: w.on(
                "console",
                lambda m: errors.append(m.text) if m.type in ("error", "warning") else None,
            ),
        )
        page.goto(base_url)
        wait_ready(page)
        page.evaluate(ACTIVATED)
        # the warm-up worker (js/warm.js: the engine's script and its factory, no engine) ends
        page.wait_for_selector("html[data-engine-code='warm']", state="attached", timeout=60_000)
        seen = _responses_after_reload(context, page)
        for path in ("js/boot.js", "js/app.js", "forms.json", "css/style.css"):
            response = _by_path(seen, base_url, path)
            route = response.get("serviceWorkerRouterInfo") or {}
            assert route.get("matchedSourceType") == "cache", (path, route)
            assert route.get("actualSourceType") == "cache", (path, route)
            assert response.get("status") == 200
        # the page and the deployment's description go to the fetch handler (no cache route)
        for path in ("", "build-info.json"):
            route = _by_path(seen, base_url, path).get("serviceWorkerRouterInfo") or {}
            assert route.get("matchedSourceType") != "cache", (path, route)
        assert not errors
    finally:
        context.close()


def test_file_with_a_query_string_is_answered_offline(browser, base_url):
    context = browser.new_context()
    try:
        page = context.new_page()
        page.goto(base_url)
        wait_ready(page)
        page.evaluate(ACTIVATED)
        reload_under_service_worker(page, lambda: wait_ready(page))
        context.set_offline(True)
        got = page.evaluate(
            """async () => {
                 const plain = await fetch('js/units.js');
                 const queried = await fetch('js/units.js?v=2');
                 const same = (await plain.text()) === (await queried.text());
                 return [plain.status, queried.status, same];
               }"""
        )
        assert got == [200, 200, True]
        missing = page.evaluate(
            "() => fetch('js/no-such-file.js').then((r) => r.status, () => 'failed')"
        )
        assert missing == "failed"  # not in the cache: the network, which is off
    finally:
        context.close()
