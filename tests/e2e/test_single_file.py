"""The single-file edition: one HTML file opened from file:// with no server and no network.

The file is built from the session's served build into an empty folder (so nothing beside it
could be read; the folder name has a space and a non-ASCII letter), opened in a fresh Chromium
context with the network emulated offline, and must reach readiness and show the core's numbers
while every request stays inside the page: its own file:// URL, or data:/blob: URLs.
"""

from __future__ import annotations

import re
import shutil
from pathlib import Path
from urllib.parse import urlsplit

import pytest

from driftdose import api

from .conftest import screenshot, wait_ready
from .helpers import parse_shown, round_sig, table_values

LIMIT_BYTES = 12_000_000  # the single file is at most 12 MB (the edition's size budget)


@pytest.fixture(scope="module")
def single_file(tmp_path_factory: pytest.TempPathFactory, dist_dir: Path, build_module) -> Path:
    # a folder name with a space and a non-ASCII letter, as on many desktops
    folder = tmp_path_factory.mktemp("single") / "Drift files ä"
    folder.mkdir()
    target = folder / build_module.SINGLE_NAME
    build_module.build_single_file(target, dist_dir)
    return target


class FileWatch:
    """Records every request of a file:// page and refuses those that leave the page."""

    def __init__(self, page_url: str) -> None:
        self.page_url = page_url
        self.requests: list[str] = []
        self.outside: list[str] = []
        self.errors: list[str] = []

    def inside(self, url: str) -> bool:
        return urlsplit(url).scheme in ("blob", "data") or url.split("#")[0] == self.page_url

    def route(self, route) -> None:
        if self.inside(route.request.url):
            route.continue_()
        else:
            self.outside.append(route.request.url)
            route.abort()

    def request(self, request) -> None:
        self.requests.append(request.url)
        if not self.inside(request.url):
            self.outside.append(request.url)

    def console(self, msg) -> None:
        if msg.type == "error":
            self.errors.append(f"console: {msg.text}")


@pytest.fixture
def opened(browser, single_file: Path):
    """The single file opened from file:// in a fresh offline context; yields (page, watch)."""
    url = single_file.as_uri()
    watch = FileWatch(url)
    context = browser.new_context(offline=True, viewport={"width": 1280, "height": 900})
    context.route("**/*", watch.route)
    context.on("request", watch.request)
    page = context.new_page()
    page.on("console", watch.console)
    page.on("pageerror", lambda exc: watch.errors.append(f"uncaught: {exc}"))
    page.on("worker", lambda w: w.on("console", watch.console))
    page.goto(url)
    wait_ready(page)
    page.wait_for_function(
        "() => Number(document.getElementById('panel-motion').dataset.updates || 0) >= 1"
    )
    yield page, watch
    context.close()
    assert not watch.outside, f"requests that left the page: {watch.outside}"
    assert not watch.errors, f"console errors: {watch.errors}"


def test_build_single_file_size_and_alone(single_file: Path):
    assert single_file.stat().st_size <= LIMIT_BYTES
    assert [p.name for p in single_file.parent.iterdir()] == [single_file.name]


def test_build_single_file_deterministic(single_file: Path, dist_dir: Path, build_module, tmp_path):
    again = tmp_path / "again.html"
    build_module.build_single_file(again, dist_dir)
    assert again.read_bytes() == single_file.read_bytes()


def test_build_single_file_csp_is_strict(single_file: Path):
    head = single_file.read_text(encoding="utf-8")[:20_000]
    csp = re.search(r'http-equiv="Content-Security-Policy" content="([^"]+)"', head).group(1)
    directives = dict(d.strip().split(" ", 1) for d in csp.split(";"))
    assert directives["default-src"] == "'none'"
    assert directives["connect-src"] == "blob:"
    assert directives["worker-src"] == "blob:"
    for name in ("script-src", "style-src"):
        assert "'self'" not in directives[name] and "'unsafe-inline'" not in directives[name]
        assert "'unsafe-eval'" not in directives[name]
    assert "http" not in csp and "*" not in csp


@pytest.mark.parametrize(
    ("name", "needle"),
    [
        ("pyodide.mjs", "createPyodideModule"),
        ("pyodide.mjs", "lockFileContents"),
        ("pyodide.mjs", '"pyodide.asm.wasm"'),
        ("pyodide.mjs", '"python_stdlib.zip"'),
        ("pyodide.d.ts", "createPyodideModule?: CreatePyodideModuleFn"),
        ("python_stdlib.zip", None),
    ],
    ids=["loader-option", "lock-option", "wasm-name", "stdlib-name", "typed-option", "no-stdlib"],
)
def test_build_single_file_fails_when_pyodide_changes(
    dist_dir: Path, build_module, tmp_path, monkeypatch, name, needle
):
    built = tmp_path / "built"
    shutil.copytree(dist_dir, built)
    modules = tmp_path / "node_modules"
    (modules / "pyodide").mkdir(parents=True)
    shutil.copyfile(
        build_module.MODULES / "pyodide" / "pyodide.d.ts", modules / "pyodide" / "pyodide.d.ts"
    )
    monkeypatch.setattr(build_module, "MODULES", modules)
    path = (modules if name.endswith(".d.ts") else built) / "pyodide" / name
    if needle is None:
        path.unlink()
    else:
        text = path.read_text(encoding="utf-8")
        assert needle in text
        path.write_text(text.replace(needle, "renamedInALaterRelease"), encoding="utf-8")
    with pytest.raises(build_module.BuildError, match=re.escape(needle or name)):
        build_module.build_single_file(tmp_path / "out.html", built)


@pytest.mark.e2e
def test_single_file_ready_and_numbers_equal_core(opened):
    page, watch = opened
    panel = page.locator("#panel-motion")
    panel.get_by_label("Particle diameter", exact=True).fill("0.8")
    panel.get_by_label("Particle diameter unit").select_option("um")
    panel.get_by_label("Particle density", exact=True).fill("1.5")
    panel.get_by_label("Air temperature", exact=True).fill("5")
    page.wait_for_function(
        "() => document.querySelector('#panel-motion tr[data-key=volume_equivalent_diameter] td')"
        "?.textContent === '800' && !document.getElementById('panel-motion')"
        ".hasAttribute('aria-busy')"
    )
    shown = table_values(page, "motion")
    reply = api.handle(
        {
            "kind": "motion",
            "inputs": {
                "particle_diameter": {"value": "0.8", "unit": "um"},
                "particle_density": {"value": "1.5", "unit": "g/cm3"},
                "temperature": {"value": "5", "unit": "degC"},
            },
        }
    )
    assert reply["ok"]
    compared = 0
    for key, row in reply["results"].items():
        if "text" in row:
            assert shown[key][0] == row["text"], key
            continue
        assert parse_shown(shown[key][0]) == pytest.approx(round_sig(row["value"]), rel=1e-12), key
        compared += 1
    assert compared >= 15
    datasets = page.evaluate(
        "() => Chart.getChart(document.querySelector('#panel-motion canvas')).data.datasets.length"
    )
    assert datasets >= 4
    assert page.locator("#pyodide-version").inner_text().startswith("314.")
    assert watch.requests[0] == watch.page_url  # the listener sees the page's requests
    screenshot(page, "single-file-motion")


@pytest.mark.e2e
def test_single_file_refuses_the_network(opened):
    page, watch = opened
    script = "u => fetch(u).then(() => 'fetched', (e) => String(e))"
    for url in ("https://example.org/x.json", "forms-not-embedded.json"):
        assert "never uses the network" in page.evaluate(script, url)
    (worker,) = page.workers
    assert "never uses the network" in worker.evaluate(script, "https://example.org/y.whl")
    assert worker.evaluate("u => fetch(u).then((r) => r.status)", "build-info.json") == 200
    assert not [u for u in watch.requests if "example.org" in u or "not-embedded" in u]


@pytest.mark.e2e
def test_single_file_every_panel_computes_and_link_reopens(opened):
    page, _ = opened
    tabs = page.locator("#panel-tabs [role=tab]")
    ids = [tabs.nth(i).get_attribute("aria-controls") for i in range(tabs.count())]
    assert "panel-motion" in ids and len(ids) >= 2
    for i, panel in enumerate(ids):
        tabs.nth(i).click()
        page.wait_for_function(
            "id => Number(document.getElementById(id).dataset.updates || 0) >= 1", arg=panel
        )
        if panel == "panel-shift":
            # the shift panel has results only once a logged file is read: its invented demo
            before = page.evaluate(
                "() => Number(document.getElementById('panel-shift').dataset.updates)"
            )
            page.get_by_role("button", name="Invented demo: a workshop shift").click()
            page.wait_for_function(
                "n => { const s = document.getElementById('panel-shift');"
                " return Number(s.dataset.updates) > n && s.dataset.state === 'ok'; }",
                arg=before,
                timeout=120_000,
            )
        assert page.locator(f"#{panel} table.results").first.is_visible()
    tabs.nth(0).click()
    motion = page.locator("#panel-motion")
    motion.get_by_label("Particle density", exact=True).fill("4.25")
    page.wait_for_function("() => location.hash.includes('4.25')")
    page.wait_for_function(
        "() => !document.getElementById('panel-motion').hasAttribute('aria-busy')"
    )
    shown = table_values(page, "motion")
    again = page.context.new_page()
    again.goto(page.url)
    wait_ready(again)
    again.wait_for_function(
        "() => Number(document.getElementById('panel-motion').dataset.updates || 0) >= 1"
    )
    density = again.locator("#panel-motion").get_by_label("Particle density", exact=True)
    assert density.input_value() == "4.25"
    assert table_values(again, "motion") == shown
