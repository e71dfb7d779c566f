"""Sharing and keeping a record: JSON save/load, CSV exports, printable report, offline use."""

from __future__ import annotations

import csv
import io
import json

import pytest

from driftdose import api

from .conftest import screenshot, wait_ready
from .helpers import export_parts, reload_under_service_worker, table_values

pytestmark = pytest.mark.e2e


def _ready_with_results(page, base_url: str, fragment: str = "") -> None:
    page.goto(base_url + fragment)
    wait_ready(page)
    page.wait_for_function(
        "() => Number(document.getElementById('panel-motion').dataset.updates || 0) >= 1"
    )


def _settled(page) -> None:
    page.wait_for_function(
        "() => !document.getElementById('panel-motion').hasAttribute('aria-busy')"
    )


def test_save_and_load_inputs_json(page, base_url, tmp_path):
    _ready_with_results(page, base_url)
    page.locator("#panel-motion").get_by_label("Particle diameter", exact=True).fill("3")
    page.locator("#panel-motion").get_by_label("Particle diameter unit").select_option("um")
    page.locator("#panel-motion").get_by_label("Air pressure", exact=True).fill("0.8")
    page.locator("#panel-motion").get_by_label("Air pressure unit").select_option("atm")
    _settled(page)
    shown = table_values(page, "motion")
    with page.expect_download() as info:
        page.get_by_role("button", name="Save inputs (JSON)").click()
    saved = json.loads(open(info.value.path(), encoding="utf-8").read())
    assert saved["format"] == "drift-and-dose-inputs"
    assert saved["panels"]["motion"]["particle_diameter"] == {"value": "3", "unit": "um"}
    path = tmp_path / "inputs.json"
    path.write_text(json.dumps(saved))
    page.goto(base_url + "#")
    page.reload()
    _ready_with_results(page, base_url)
    assert (
        page.locator("#panel-motion").get_by_label("Particle diameter", exact=True).input_value()
        == "100"
    )
    page.locator("#load-inputs").set_input_files(str(path))
    page.wait_for_function(
        "() => document.querySelector('#panel-motion "
        "[data-key=volume_equivalent_diameter] td')?.textContent === '3'"
    )
    _settled(page)
    assert page.locator("#panel-motion").get_by_label("Air pressure unit").input_value() == "atm"
    assert table_values(page, "motion") == shown


def test_load_rejects_foreign_json(page, base_url, tmp_path):
    _ready_with_results(page, base_url)
    bad = tmp_path / "other.json"
    bad.write_text('{"hello": 1}')
    page.locator("#load-inputs").set_input_files(str(bad))
    message = page.locator("#tool-message")
    message.filter(has_text="Could not load").wait_for()
    assert "not a Drift & Dose inputs file" in message.inner_text()


def test_results_csv_export_matches_core(page, base_url):
    _ready_with_results(page, base_url)
    with page.expect_download() as info:
        page.locator("#panel-motion").get_by_role("button", name="Download results (CSV)").click()
    raw = open(info.value.path(), "rb").read()
    assert raw.startswith(b"\xef\xbb\xbf")  # the default: a byte-order mark for spreadsheets
    head, table = export_parts(raw.decode("utf-8"))
    assert head[0] == ["Drift & Dose export", "results"]
    assert ["calculation", "motion", api.CALCULATIONS["motion"].TITLE] in head
    rows = list(csv.reader(io.StringIO(table)))
    assert rows[0] == ["quantity", "symbol", "value", "unit", "value_si", "si_unit", "note"]
    reply = api.handle({"kind": "motion", "inputs": {}})
    by_label = {r[0]: r for r in rows[1:]}
    d = reply["results"]["diffusion_coefficient"]
    assert float(by_label[d["label"]][2]) == pytest.approx(d["value"], rel=1e-12)
    assert by_label[d["label"]][3] == "m²/s"


def test_curves_csv_export_has_units_in_header(page, base_url):
    _ready_with_results(page, base_url)
    with page.expect_download() as info:
        page.locator("#panel-motion").get_by_role("button", name="Download curves (CSV)").click()
    _head, table = export_parts(open(info.value.path(), encoding="utf-8").read())
    rows = list(csv.reader(io.StringIO(table)))
    assert rows[0] == [
        "curve",
        "Volume-equivalent diameter [µm]",
        "Distance in the chosen time [m]",
    ]
    brownian = [r for r in rows[1:] if r[0].startswith("Brownian")]
    assert len(brownian) >= 200


def test_print_report_has_required_sections(page, base_url):
    _ready_with_results(page, base_url, "#v=1&panel=motion&motion.time=5~min")
    _settled(page)
    page.evaluate("() => window.dispatchEvent(new Event('beforeprint'))")
    page.emulate_media(media="print")
    report = page.locator("#report")
    assert report.is_visible()
    assert not page.locator("main").is_visible()
    text = report.inner_text()
    for needed in (
        "screening record",
        "Drift & Dose 0.1.0",
        "Cautions",
        "not a substitute for measurement",
        "professional judgment",
        "Local regulations",
        "Inputs",
        "Results",
        "Models, sources and validity",
        "Kim, J. H.",
        "Time",
        "5",
        "min",
    ):
        assert needed in text, needed
    assert report.locator("img.report-chart").count() >= 1
    screenshot(page, "report-print")
    pdf = page.pdf()
    assert pdf[:4] == b"%PDF"


def test_tampered_link_gives_notice_not_broken_page(page, base_url):
    _ready_with_results(
        page,
        base_url,
        "#v=99&panel=motion&motion.particle_diameter=<img src=x onerror=alert(1)>"
        "&bogus.x=1&motion.nope=2",
    )
    notice = page.locator("#link-notice")
    notice.wait_for(state="visible")
    assert "another version" in notice.inner_text()
    assert "they were refused: bogus.x, motion.nope" in notice.inner_text()
    error = page.locator("#panel-motion .field[data-field=particle_diameter] .error")
    error.wait_for(state="visible")
    assert "must be a number" in error.inner_text()
    assert page.locator("#panel-motion img").count() == 0


def test_offline_after_one_visit(browser, base_url):
    context = browser.new_context()
    outside: list[str] = []
    context.on(
        "request",
        lambda r: (
            None
            if r.url.startswith(base_url) or r.url.startswith(("data:", "blob:"))
            else outside.append(r.url)
        ),
    )
    try:
        page = context.new_page()
        errors: list[str] = []
        page.on("console", lambda m: errors.append(m.text) if m.type == "error" else None)
        _ready_with_results(page, base_url)
        page.evaluate("async () => { await navigator.serviceWorker.ready; }")
        page.wait_for_function(
            "() => navigator.serviceWorker.controller !== null || "
            "caches.keys().then(k => k.length > 0)"
        )
        # wait for the precache to be complete (install finished => active)
        page.evaluate("""async () => {
            const reg = await navigator.serviceWorker.ready;
            while (!reg.active || reg.active.state !== 'activated') {
              await new Promise(r => setTimeout(r, 100));
            }
        }""")
        context.set_offline(True)
        page.reload()
        _ready_with_results(page, base_url)
        page.locator("#panel-motion").get_by_label("Particle diameter", exact=True).fill("42")
        page.wait_for_function(
            "() => document.querySelector('#panel-motion "
            "[data-key=volume_equivalent_diameter] td')?.textContent === '42'"
        )
        assert not errors, errors
        assert not outside, outside
    finally:
        context.close()


def test_new_deployment_is_offered_as_reload(browser, build_module, tmp_path):
    dist = tmp_path / "site"
    build_module.build(dist)
    server, _ = build_module.serve(dist, 0)
    host, port = server.server_address[:2]
    url = f"http://{host}:{port}/"
    context = browser.new_context()
    try:
        page = context.new_page()
        _ready_with_results(page, url)
        reload_under_service_worker(page, lambda: _ready_with_results(page, url))
        # a new deployment: different content, so a different build id
        (dist / "css" / "style.css").write_text(
            (dist / "css" / "style.css").read_text() + "\n/* next release */\n"
        )
        info = json.loads((dist / "build-info.json").read_text())
        info["build"] = "next-release"
        (dist / "build-info.json").write_text(json.dumps(info))
        page.reload()
        banner = page.locator("#update-banner")
        banner.wait_for(state="visible", timeout=60_000)
        with page.expect_navigation():
            page.get_by_role("button", name="Reload to update").click()
        wait_ready(page)
        assert "next release" in page.evaluate("() => fetch('css/style.css').then(r => r.text())")
    finally:
        context.close()
        server.shutdown()
