"""The sampling panel in Chromium: chain built by labels, stage errors, demos, link and file round
trips, tampered links, spectrum correction with flagged bins, curve export, narrow and dark views.

Numbers shown are compared with ``api.handle`` for the same request at the page's precision
(four significant figures); the page computes nothing itself.
"""

from __future__ import annotations

import csv
import io
import json
import time
import urllib.parse

import pytest
from playwright.sync_api import expect

from driftdose import api, export
from driftdose.api.sampling import DEMOS
from driftdose.api.units import unit_label

from .conftest import ARTIFACTS, new_watched_page, page_link, screenshot, wait_ready
from .helpers import export_parts, parse_shown, round_sig
from .test_layout import BROKEN_WORDS_JS

pytestmark = pytest.mark.e2e

PANEL = "#panel-sampling"
REFERENCE_KEYS = ("overall_10nm", "overall_100nm", "overall_1um", "overall_10um")

SPECTRUM_CSV = (
    "diameter_nm;dN/dlogDp\n"
    "5;800\n10;2500\n20;6000\n40;9000\n80;7000\n160;3000\n320;900\n640;200\n1280;40\n2560;8\n"
)


def q(value, unit):
    return {"value": value, "unit": unit}


# the default chain of the page (the sampling API's default for ``stages``)
DEFAULT_TUBE = {
    "type": "tube",
    "name": "10 m of 4 mm tubing",
    "length": q(10, "m"),
    "tube_diameter": q(4, "mm"),
    "inclination": q(0, "deg"),
    "mechanisms": "both",
}
DEFAULT_BEND = {
    "type": "bend",
    "name": "90° bend",
    "tube_diameter": q(4, "mm"),
    "bend_angle": q(90, "deg"),
    "curvature_radius": q(5, "cm"),
}


def _updates(page) -> int:
    return int(page.locator(PANEL).get_attribute("data-updates") or 0)


def _open(page, base_url: str, fragment: str = "#v=1&panel=sampling") -> None:
    page.goto(base_url + fragment)
    wait_ready(page)
    page.wait_for_function(
        "() => { const s = document.getElementById('panel-sampling');"
        " return Number(s.dataset.updates || 0) >= 1 && !s.hasAttribute('aria-busy'); }"
    )


def _after(page, before: int) -> None:
    """Wait until the panel has answered an input made after ``before`` updates."""
    page.wait_for_function(
        "n => { const s = document.getElementById('panel-sampling');"
        " return Number(s.dataset.updates || 0) > n && !s.hasAttribute('aria-busy'); }",
        arg=before,
    )


def _stage(page, number: int, label: str):
    return page.locator(PANEL).get_by_role("group", name=f"Stage {number}: {label}", exact=True)


def _legends(page) -> list[str]:
    return page.locator(f"{PANEL} fieldset.stage > legend").all_inner_texts()


def _add_stage(page, type_label: str) -> None:
    panel = page.locator(PANEL)
    panel.get_by_label("Type of the new stage").select_option(label=type_label)
    panel.get_by_role("button", name="Add stage").click()


def _cells(page) -> dict[str, str]:
    cells = page.locator(f"{PANEL} table.stage-table td[data-key]")
    return {
        cells.nth(i).get_attribute("data-key"): cells.nth(i).inner_text()
        for i in range(cells.count())
    }


def _cells_become(page, expected: dict[str, str], timeout_s: float = 15.0) -> dict[str, str]:
    """The stage table's cells once they equal ``expected`` or ``timeout_s`` has passed (a
    loaded file may answer once per applied part before the table holds every row)."""
    deadline = time.monotonic() + timeout_s
    shown = _cells(page)
    while shown != expected and time.monotonic() < deadline:
        page.wait_for_timeout(100)
        shown = _cells(page)
    return shown


def _shown_percent(text: str) -> float:
    assert text.endswith(" %"), text
    return parse_shown(text[:-2])


def _assert_matches(page, reply: dict) -> int:
    """Compare every penetration cell and the summary rows with the reply; return the count."""
    assert reply["ok"], reply
    results = reply["results"]
    cells = _cells(page)
    rows = results["stages_table"]["rows"]
    expected = {
        f"stage-{row['index']}-{j}": p["value"]
        for row in rows
        for j, p in enumerate(row["penetration_at"])
    }
    expected.update({key: results[key]["value"] for key in REFERENCE_KEYS})
    assert set(cells) == set(expected)
    for key, value in expected.items():
        assert _shown_percent(cells[key]) == pytest.approx(round_sig(value), rel=1e-12), key
    summary = page.locator(f"{PANEL} .summary-box tr[data-key]")
    shown = {
        summary.nth(i).get_attribute("data-key"): summary.nth(i).locator("td").first.inner_text()
        for i in range(summary.count())
    }
    assert shown["pass_band"] == results["pass_band"]["text"]
    for key in ("departure_max", "departure_mean"):
        assert (key in shown) == (key in results)
        if key in results:
            assert parse_shown(shown[key]) == pytest.approx(
                round_sig(results[key]["value"]), rel=1e-12
            )
    names = page.locator(f"{PANEL} table.stage-table tbody tr[data-stage] th").all_inner_texts()
    assert len(names) == len(rows) + 1
    return len(expected)


def _request(stages, **inputs) -> dict:
    return api.handle({"kind": "sampling", "inputs": {"stages": stages, **inputs}})


# --- building a chain ---------------------------------------------------------------------------


def test_chain_built_by_labels_matches_core(page, base_url):
    _open(page, base_url)
    assert _legends(page) == ["Stage 1: Straight tube", "Stage 2: Bend"]
    # add a tube and edit it
    _add_stage(page, "Straight tube")
    tube = _stage(page, 3, "Straight tube")
    assert page.evaluate("() => document.activeElement.name") == "name"  # focus on the new stage
    tube.get_by_label("Stage name", exact=True).fill("Short inlet")
    tube.get_by_label("Tube length", exact=True).fill("3")
    tube.get_by_label("Tube inner diameter", exact=True).fill("6")
    # add a screen stack and edit it
    _add_stage(page, "Wire screens")
    screens = _stage(page, 4, "Wire screens")
    screens.get_by_label("Number of screens", exact=True).fill("10")
    screens.get_by_label("Wire diameter", exact=True).fill("40")
    # reorder by keyboard: the screens go up one place, the focus stays on the button
    screens.get_by_role("button", name="Move up").focus()
    page.keyboard.press("Enter")
    assert _legends(page) == [
        "Stage 1: Straight tube",
        "Stage 2: Bend",
        "Stage 3: Wire screens",
        "Stage 4: Straight tube",
    ]
    focused = page.evaluate(
        "() => [document.activeElement.textContent,"
        " document.activeElement.closest('fieldset').querySelector('legend').textContent]"
    )
    assert focused == ["Move up stage 3", "Stage 3: Wire screens"]
    # remove the first stage
    _stage(page, 1, "Straight tube").get_by_role("button", name="Remove").click()
    assert _legends(page) == ["Stage 1: Bend", "Stage 2: Wire screens", "Stage 3: Straight tube"]
    assert _stage(page, 1, "Bend").get_by_role("button", name="Move up").is_disabled()
    assert _stage(page, 3, "Straight tube").get_by_role("button", name="Move down").is_disabled()
    before = _updates(page)
    page.locator(PANEL).get_by_label("Target curve").select_option("icrp66_AI")
    _after(page, before)
    reply = _request(
        [
            DEFAULT_BEND,
            {
                "type": "screens",
                "wire_diameter": q(40, "um"),
                "solidity": q(0.3, "1"),
                "thickness": q(100, "um"),
                "screen_diameter": q(25, "mm"),
                "n_screens": 10,
                "impaction": "off",
            },
            {
                "type": "tube",
                "name": "Short inlet",
                "length": q(3, "m"),
                "tube_diameter": q(6, "mm"),
                "inclination": q(0, "deg"),
                "mechanisms": "both",
            },
        ],
        target="icrp66_AI",
    )
    assert _assert_matches(page, reply) == 16
    names = page.locator(f"{PANEL} table.stage-table tbody th").all_inner_texts()
    assert names[2].startswith("3. Short inlet")
    fragment = urllib.parse.unquote_plus(page_link(page))
    assert "sampling.stages=j:" in fragment and "Short inlet" in fragment
    screenshot(page, "sampling-chain")


def test_bad_stage_input_shows_on_its_field_and_marks_results_stale(page, base_url):
    _open(page, base_url)
    panel = page.locator(PANEL)
    stale = panel.locator(".stale-note")
    tube = _stage(page, 1, "Straight tube")
    before = _updates(page)
    tube.get_by_label("Tube length", exact=True).fill("0")
    _after(page, before)
    error = tube.locator(".field[data-field=length] .error")
    assert error.is_visible()
    assert error.inner_text().startswith("Stage 1 (straight tube): Tube length must be greater")
    assert tube.get_by_label("Tube length", exact=True).get_attribute("aria-invalid") == "true"
    assert stale.is_visible() and panel.get_attribute("data-state") == "invalid"
    assert panel.locator(".outputs.stale table.stage-table").is_visible()  # last results kept
    before = _updates(page)
    tube.get_by_label("Tube length", exact=True).fill("10")
    _after(page, before)
    assert not error.is_visible() and not stale.is_visible()
    # a screen stack with a solidity above 1
    _add_stage(page, "Wire screens")
    screens = _stage(page, 3, "Wire screens")
    before = _updates(page)
    screens.get_by_label("Solidity (solid volume fraction)", exact=True).fill("1.2")
    _after(page, before)
    error = screens.locator(".field[data-field=solidity] .error")
    assert error.inner_text().startswith("Stage 3 (wire screens): Solidity")
    assert stale.is_visible()
    assert panel.locator("fieldset.stage.invalid").count() == 1
    before = _updates(page)
    screens.get_by_label("Solidity (solid volume fraction)", exact=True).fill("0.3")
    _after(page, before)
    assert not stale.is_visible()
    # impossible geometry: a bend radius smaller than the tube's radius
    bend = _stage(page, 2, "Bend")
    before = _updates(page)
    bend.get_by_label("Bend radius (to the tube axis) unit").select_option("mm")
    bend.get_by_label("Bend radius (to the tube axis)", exact=True).fill("1.5")
    _after(page, before)
    error = bend.locator(".field[data-field=curvature_radius] .error")
    assert error.inner_text().startswith("Stage 2 (bend):")
    # a flow that makes a stage's speed absurd is reported on the sampling flow
    before = _updates(page)
    bend.get_by_label("Bend radius (to the tube axis)", exact=True).fill("15")
    panel.get_by_label("Sampling flow", exact=True).fill("5000")
    _after(page, before)
    flow_error = panel.locator(".inputs > fieldset > .field[data-field=flow] .error")
    assert flow_error.is_visible() and flow_error.inner_text()
    screenshot(page, "sampling-bad-input")


def test_empty_chain_is_a_message_and_adding_a_stage_recovers(page, base_url):
    _open(page, base_url)
    panel = page.locator(PANEL)
    _stage(page, 2, "Bend").get_by_role("button", name="Remove").click()
    before = _updates(page)
    _stage(page, 1, "Straight tube").get_by_role("button", name="Remove").click()
    _after(page, before)
    assert _legends(page) == []
    assert panel.locator(".chain > .error").inner_text() == (
        "Add at least one stage to the sampling chain."
    )
    assert page.evaluate("() => document.activeElement.id") == "sampling-new-stage-type"
    before = _updates(page)
    _add_stage(page, "Cyclone or pre-separator")
    _after(page, before)
    assert panel.get_attribute("data-state") == "ok"
    reply = _request([{"type": "cyclone"}])
    _assert_matches(page, reply)


# --- demos, links and files -----------------------------------------------------------------


def test_demo_loads_with_one_click_and_is_marked_invented(page, base_url):
    _open(page, base_url)
    demo = DEMOS["screen_stack"]
    before = _updates(page)
    page.locator(PANEL).get_by_role("button", name=demo["label"]).click()
    _after(page, before)
    note = page.locator(f"{PANEL} .demo-note")
    assert note.is_visible() and "invented" in note.inner_text().lower()
    assert _legends(page) == ["Stage 1: Straight tube", "Stage 2: Wire screens"]
    assert "sampling.demo=screen_stack" in page_link(page)
    _assert_matches(page, api.handle({"kind": "sampling", "inputs": demo["inputs"]}))
    page.evaluate("() => window.dispatchEvent(new Event('beforeprint'))")
    report = page.locator("#report").inner_text()
    assert f"Invented demo data: {demo['label']}" in report
    assert "Stage 2: Wire screens" in report and "Number of screens: 20" in report
    # an edit of the chain leaves the demo: the note goes
    _stage(page, 2, "Wire screens").get_by_label("Number of screens", exact=True).fill("5")
    assert not note.is_visible()
    assert "sampling.demo" not in page_link(page)


def test_link_and_inputs_file_reproduce_the_chain(page, base_url, browser, tmp_path):
    _open(page, base_url)
    panel = page.locator(PANEL)
    before = _updates(page)
    panel.get_by_role("button", name=DEMOS["respirable_line"]["label"]).click()
    _after(page, before)
    separator = _stage(page, 2, "Cyclone or pre-separator")
    separator.get_by_label("Cut size (aerodynamic, 50 % penetration)", exact=True).fill("3.5")
    _add_stage(page, "Impactor stage")
    impactor = _stage(page, 3, "Impactor stage")
    impactor.get_by_label("Jet shape").select_option("rectangular")
    impactor.get_by_label("Slit length (rectangular jets)", exact=True).fill("20")
    before = _updates(page)
    panel.get_by_label("Target curve").select_option("thoracic")
    _after(page, before)
    assert panel.get_attribute("data-state") == "ok"
    cells, legends, url = _cells(page), _legends(page), page_link(page)
    assert len(legends) == 3
    # the link, in a fresh browser context
    other = browser.new_context()
    try:
        p2 = other.new_page()
        _open(p2, url.split("#")[0], "#" + url.split("#", 1)[1])
        assert _legends(p2) == legends
        assert _cells_become(p2, cells) == cells
        cut = _stage(p2, 2, "Cyclone or pre-separator").get_by_label(
            "Cut size (aerodynamic, 50 % penetration)", exact=True
        )
        assert cut.input_value() == "3.5"
        assert _stage(p2, 3, "Impactor stage").get_by_label("Jet shape").input_value() == (
            "rectangular"
        )
        assert p2.locator(PANEL).get_by_label("Target curve").input_value() == "thoracic"
    finally:
        other.close()
    # the inputs file: save, change the chain, load it back
    with page.expect_download() as info:
        page.get_by_role("button", name="Save inputs (JSON)").click()
    path = tmp_path / "inputs.json"
    info.value.save_as(path)
    saved = json.loads(path.read_text())["panels"]["sampling"]
    assert [s["type"] for s in saved["stages"]] == ["tube", "cyclone", "impactor"]
    assert saved["stages"][1]["d50"] == {"value": "3.5", "unit": "um"}
    _stage(page, 1, "Straight tube").get_by_role("button", name="Remove").click()
    assert len(_legends(page)) == 2
    before = _updates(page)
    page.locator("#load-inputs").set_input_files(str(path))
    _after(page, before)
    assert _legends(page) == legends
    assert _cells_become(page, cells) == cells


@pytest.mark.parametrize(
    ("stages", "expect"),
    [
        pytest.param(
            '[{"type":"pipe"},{"type":"tube","length":{"value":"0","unit":"m"}},"tube"]',
            {
                "legends": [
                    "Stage 1: unknown type",
                    "Stage 2: Straight tube",
                    "Stage 3: unknown type",
                ],
                "stage_errors": {1: "Stage 1: type must be one of", 3: "Stage 3: must be"},
                "field_errors": {(2, "length"): "Stage 2 (straight tube): Tube length"},
            },
            id="unknown-type-zero-length-not-an-object",
        ),
        pytest.param(
            '[{"type":"screens","solidity":{"value":"1.2","unit":"1"},"n_screens":"many"}]',
            {
                "legends": ["Stage 1: Wire screens"],
                "field_errors": {
                    (1, "solidity"): "Stage 1 (wire screens): Solidity",
                    (1, "n_screens"): "Stage 1 (wire screens): Number of screens",
                },
            },
            id="bad-values",
        ),
        pytest.param(
            "{broken",
            {"legends": [], "chain_error": "Add at least one stage"},
            id="not-json",
        ),
        pytest.param(
            json.dumps([{"type": "cyclone"}] * 25),
            {
                "legends": [f"Stage {i}: Cyclone or pre-separator" for i in range(1, 26)],
                "chain_error": "at most 20 stages",
            },
            id="too-many",
        ),
    ],
)
def test_tampered_stage_list_gives_field_errors(page, base_url, stages, expect):
    _open(
        page, base_url, "#v=1&panel=sampling&sampling.stages=" + urllib.parse.quote(f"j:{stages}")
    )
    panel = page.locator(PANEL)
    assert panel.get_attribute("data-state") == "invalid"
    assert _legends(page) == expect["legends"]
    stage_sets = panel.locator("fieldset.stage")
    for number, start in expect.get("stage_errors", {}).items():
        error = stage_sets.nth(number - 1).locator(":scope > p.error")
        assert error.inner_text().startswith(start)
    for (number, name), start in expect.get("field_errors", {}).items():
        error = stage_sets.nth(number - 1).locator(f".field[data-field={name}] .error")
        assert error.inner_text().startswith(start)
    if "chain_error" in expect:
        assert expect["chain_error"] in panel.locator(".chain > .error").inner_text()
    assert panel.locator("h2").is_visible()  # the page still works
    assert panel.get_by_role("button", name="Add stage").is_visible()


# --- spectrum correction ------------------------------------------------------------------------


def _import_spectrum(page, tmp_path, text: str = SPECTRUM_CSV) -> None:
    path = tmp_path / "spectrum.csv"
    path.write_text(text)
    panel = page.locator(PANEL)
    panel.get_by_label("Measured spectrum to correct").select_option("csv")
    panel.get_by_label("Spectrum CSV file").set_input_files(str(path))
    panel.get_by_label("Diameter column").select_option("diameter_nm")
    before = _updates(page)
    panel.get_by_label("Concentration column").select_option("dN/dlogDp")
    _after(page, before)


def test_csv_spectrum_corrected_with_unreliable_bins_flagged(page, base_url, tmp_path):
    _open(page, base_url)
    _import_spectrum(page, tmp_path)
    reply = _request(
        [DEFAULT_TUBE, DEFAULT_BEND],
        size_source="csv",
        csv_text=SPECTRUM_CSV,
        csv_diameter_column="diameter_nm",
        csv_concentration_column="dN/dlogDp",
    )
    assert reply["ok"], reply
    expected = reply["results"]["spectrum_table"]["rows"]
    rows = page.locator(f"{PANEL} table.spectrum-table tbody tr")
    assert rows.count() == len(expected) == 10
    flagged = 0
    for i, row in enumerate(expected):
        tr = rows.nth(i)
        assert parse_shown(tr.locator("th").inner_text()) == pytest.approx(
            round_sig(row["diameter"]), rel=1e-12
        )
        for col, value in (("measured", row["measured"]), ("corrected", row["corrected"])):
            shown = tr.locator(f"td[data-col={col}]").inner_text()
            assert parse_shown(shown) == pytest.approx(round_sig(value), rel=1e-12), (i, col)
        shown = tr.locator("td[data-col=penetration]").inner_text()
        assert _shown_percent(shown) == pytest.approx(round_sig(100 * row["penetration"]))
        flag = tr.locator("td[data-col=flag]").inner_text()
        # flagged in words, not by colour alone
        assert ("unreliable" in flag) == row["unreliable"]
        assert ("unreliable" in (tr.get_attribute("class") or "")) == row["unreliable"]
        flagged += row["unreliable"]
    assert 0 < flagged < len(expected)
    summary = page.locator(f"{PANEL} .spectrum-summary").inner_text()
    assert summary.startswith(
        f"{flagged} of {len(expected)} bins pass the chain with less than 50 %"
    )
    assert page.locator(f"{PANEL} #sampling-spectrum-canvas").is_visible()
    # it travels with the link
    assert "sampling.csv_text=j:" in urllib.parse.unquote_plus(page_link(page))
    chart = (
        "() => { const c = Chart.getChart(document.querySelector('#sampling-spectrum-canvas'));"
        " window.__seen = window.__seen || c; return {same: window.__seen === c,"
        " x: c.options.scales.x.title.text, y: c.options.scales.y.title.text,"
        " penetration: Chart.getChart(document.querySelector('#sampling-penetration-canvas'))"
        ".options.scales.x.title.text}; }"
    )
    titles = page.evaluate(chart)
    # size ticks carry units ("10 nm"): no unit in the size titles; bare concentration ticks:
    # the unit in that title
    assert "µm" not in titles["x"] and "µm" not in titles["penetration"]
    # the reply names the unit by code; the page labels it from the table sent with the forms
    assert titles["y"].endswith(f"({unit_label(reply['curves']['spectrum']['y_unit'])})")
    before = _updates(page)
    panel = page.locator(PANEL)
    panel.get_by_label("Air temperature", exact=True).fill("25")
    _after(page, before)
    assert page.evaluate(chart)["same"]  # updated in place, not recreated
    screenshot(page, "sampling-spectrum")


def test_bad_spectrum_file_reports_line_on_file_field(page, base_url, tmp_path):
    _open(page, base_url)
    _import_spectrum(page, tmp_path, "diameter_nm;dN/dlogDp\n10;100\n20;abc\n")
    error = page.locator(f"{PANEL} .field[data-field=csv_text] .error")
    assert error.inner_text().startswith("Line 3")
    assert page.locator(f"{PANEL} .stale-note").is_visible()


# --- exports and views --------------------------------------------------------------------------


def test_curves_csv_export_holds_every_stage_and_the_target(page, base_url):
    _open(page, base_url)
    before = _updates(page)
    page.locator(PANEL).get_by_label("Target curve").select_option("respirable")
    _after(page, before)
    with page.expect_download() as info:
        page.locator(PANEL).get_by_role("button", name="Download curves (CSV)").click()
    text = info.value.path().read_text(encoding="utf-8")
    reply = _request([DEFAULT_TUBE, DEFAULT_BEND], target="respirable")
    expected = export.curves_csv(reply)  # the core's exporter, as the command line writes it
    _head, table = export_parts(text)
    got_rows = list(csv.reader(io.StringIO(table)))
    want_rows = list(csv.reader(io.StringIO(expected)))
    assert len(got_rows) == len(want_rows)
    for got, want in zip(got_rows, want_rows, strict=True):
        assert len(got) == len(want)
        for a, b in zip(got, want, strict=True):
            try:
                assert float(a) == pytest.approx(float(b), rel=1e-12, abs=1e-300)
            except ValueError:
                assert a == b
    labels = {row[0] for row in got_rows[1:] if row}
    assert {"10 m of 4 mm tubing", "90° bend", "Whole chain", "ISO 7708 respirable"} <= labels
    assert got_rows[0][1] == "Particle diameter (volume-equivalent) [µm]"
    with page.expect_download() as info:
        page.locator(PANEL).get_by_role("button", name="Download results (CSV)").click()
    results = info.value.path().read_text(encoding="utf-8")
    assert "Sizes passed with at least 50 %" in results
    assert "Largest departure from the target" in results


@pytest.mark.parametrize("scheme", ["light", "dark"])
def test_narrow_screen_with_spectrum_fits_and_is_readable(browser, base_url, tmp_path, scheme):
    context, page, watch = new_watched_page(
        browser, base_url, viewport={"width": 375, "height": 800}, color_scheme=scheme
    )
    try:
        _open(page, base_url)
        before = _updates(page)
        page.locator(PANEL).get_by_role("button", name=DEMOS["respirable_line"]["label"]).click()
        _after(page, before)
        _import_spectrum(page, tmp_path)
        assert page.evaluate("() => document.documentElement.scrollWidth") <= 375
        outside = page.evaluate(
            """() => [...document.querySelectorAll(
                  '#panel-sampling input, #panel-sampling select, #panel-sampling button')]
                .filter(e => e.offsetParent !== null)
                .map(e => e.getBoundingClientRect())
                .filter(r => r.left < -0.5 || r.right > 375.5).length"""
        )
        assert outside == 0
        screenshot(page, f"sampling-narrow-{scheme}")
    finally:
        context.close()
    assert not watch.errors and not watch.outside


def test_wide_dark_view(browser, base_url):
    context, page, watch = new_watched_page(
        browser, base_url, viewport={"width": 1280, "height": 900}, color_scheme="dark"
    )
    try:
        _open(page, base_url)
        before = _updates(page)
        page.locator(PANEL).get_by_label("Target curve").select_option("simplified_alveolar")
        _after(page, before)
        assert page.locator(f"{PANEL} table.stage-table").is_visible()
        screenshot(page, "sampling-wide-dark")
    finally:
        context.close()
    assert not watch.errors and not watch.outside


def test_link_with_the_former_spectrum_source_name_still_reads(page, base_url):
    # Links saved before the rename say ``spectrum_source``; they load as ``size_source``.
    fragment = "#v=1&panel=sampling&" + urllib.parse.urlencode(
        {
            "sampling.spectrum_source": "csv",
            "sampling.csv_text": "j:" + json.dumps(SPECTRUM_CSV),
            "sampling.csv_diameter_column": "diameter_nm",
            "sampling.csv_concentration_column": "dN/dlogDp",
        }
    )
    _open(page, base_url, fragment)
    page.wait_for_function(
        "() => document.querySelectorAll('#panel-sampling table.spectrum-table tbody tr')"
        ".length === 10"
    )
    assert page.locator(PANEL).get_by_label("Measured spectrum to correct").input_value() == "csv"
    notice = page.locator("#link-notice")
    assert not notice.is_visible() or "refused" not in notice.inner_text()


# --- values at the sizes the user types -----------------------------------------------------------

SIZES_TYPED = "25 nm, 0.3 µm, 4 µm"


def _size_cells(page, panel: str = PANEL) -> dict[tuple[int, str], str]:
    cells = page.locator(f"{panel} table.sizes-table tbody td[data-key]")
    out = {}
    for i in range(cells.count()):
        cell = cells.nth(i)
        out[(int(cell.get_attribute("data-size")), cell.get_attribute("data-key"))] = (
            cell.inner_text()
        )
    return out


def test_typed_sizes_give_the_api_values_and_bad_entries_are_refused(browser, base_url):
    context, page, watch = new_watched_page(
        browser, base_url, viewport={"width": 1280, "height": 900}
    )
    try:
        _open(page, base_url)
        panel = page.locator(PANEL)
        panel.get_by_label("Target curve").select_option("respirable")
        before = _updates(page)
        panel.get_by_label("Values at these sizes", exact=True).fill(SIZES_TYPED)
        _after(page, before)
        reply = _request(
            [DEFAULT_TUBE, DEFAULT_BEND], target="respirable", sizes=q(SIZES_TYPED, "nm")
        )
        assert reply["ok"], reply
        rows = reply["results"]["sizes_table"]["rows"]
        names = panel.locator("table.sizes-table thead th").all_inner_texts()[1:]
        assert names == [r["label"] for r in rows] == ["25 nm", "300 nm", "4 µm"]
        shown = _size_cells(page)
        expected = {(i, c["key"]): c for i, r in enumerate(rows) for c in r["quantities"]}
        expected = {k: c for k, c in expected.items() if k[1] != "diameter"}
        assert set(shown) == set(expected)
        for (i, key), cell in expected.items():
            if key == "aerodynamic":
                assert shown[(i, key)] == rows[i]["label"]  # unit density: d_ae = d
            else:
                assert _shown_percent(shown[(i, key)]) == pytest.approx(
                    round_sig(cell["value"]), rel=1e-12
                ), (i, key)
        # ISO 7708:1995: the respirable convention passes 50 % at 4 µm aerodynamic (tabulated
        # value, from memory; the formula gives 49.97 %)
        assert _shown_percent(shown[(2, "target")]) == pytest.approx(50.0, abs=0.05)
        # travels with the link
        assert "sampling.sizes=" in urllib.parse.unquote_plus(page_link(page))
        panel.locator(".sizes-box").screenshot(
            path=str(ARTIFACTS / "sampling-sizes-table-1280.png")
        )
        page.set_viewport_size({"width": 375, "height": 800})
        assert page.evaluate("() => document.documentElement.scrollWidth") <= 375
        broken = page.evaluate(BROKEN_WORDS_JS, panel.locator("table.sizes-table").element_handle())
        assert not broken, broken
        panel.locator("table.sizes-table").scroll_into_view_if_needed()
        panel.locator(".sizes-box").screenshot(path=str(ARTIFACTS / "sampling-sizes-table-375.png"))
        page.set_viewport_size({"width": 1280, "height": 900})
        link = page_link(page)  # the link brings the sizes back, and the same values
        page.goto("about:blank")
        page.goto(link)
        wait_ready(page)
        page.wait_for_selector(f"{PANEL} table.sizes-table")
        assert _size_cells(page) == shown
        panel = page.locator(PANEL)

        # refused entries: a message beside the field, the last table kept (marked stale)
        for bad, words in (
            ("5 nm, NaN", "not a number"),
            ("-5 nm", "outside"),
            (", ".join(["5"] * 13), "at most 12"),
            ("9" * 400, "at most 300 characters"),
        ):
            panel.get_by_label("Values at these sizes", exact=True).fill(bad)
            error = panel.locator(".field[data-field=sizes] .error")
            # the message of this entry (the one before may still be shown for a moment)
            expect(error).to_contain_text(words, timeout=20_000)
            assert panel.locator(".stale-note").is_visible()
            assert _size_cells(page) == shown  # nothing changed
        panel.get_by_label("Values at these sizes", exact=True).fill("")
        page.wait_for_function("() => !document.querySelector('#panel-sampling table.sizes-table')")
    finally:
        context.close()
    assert not watch.errors and not watch.outside
