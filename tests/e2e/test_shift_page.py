"""The shift panel end to end: a logged file through the preview, periods typed and dragged.

An 8-h file logged every second (notes above the header, semicolons, decimal commas) is
generated here, imported through the file control and its preview; the value columns are
picked, three tasks and a background period are typed in the periods table and one task's end
is dragged on the chart. The 8-h TWA and the dose per region the page shows are checked
against ``driftdose.api.handle`` called here with the same inputs; the link carries the
periods but not the file, the saved inputs file carries the file; the record prints within
4 pages with the file's name and SHA-256. Layout at phone to desktop widths, screenshots in
test-artifacts/.
"""

from __future__ import annotations

import hashlib
import json
import math
import re
import shutil
import subprocess
import urllib.parse
from pathlib import Path

import pytest

from driftdose import api
from driftdose.unit_labels import unit_text

from .conftest import ARTIFACTS, new_watched_page, page_link, screenshot, wait_ready
from .helpers import parse_shown, round_sig
from .test_layout import BROKEN_WORDS_JS

pytestmark = pytest.mark.e2e

START_S = 7 * 3600  # the file starts at 07:00:00
LEVELS = [  # (from, to, mean number concentration [1/cm³]) of the generated file
    ("07:00", "07:30", 3000.0),
    ("07:30", "09:30", 60_000.0),
    ("09:30", "10:00", 3500.0),
    ("10:00", "12:00", 25_000.0),
    ("12:00", "12:30", 3000.0),
    ("12:30", "14:30", 90_000.0),
    ("14:30", "15:00", 3200.0),
]
PERIODS = [  # what the test types: label, kind, start, end, activity, route, protection factor
    ("Background before", "background", "07:00", "07:30", "light_exercise", "mixed", "1"),
    ("Cutting", "task", "07:30", "09:30", "light_exercise", "mixed", "1"),
    ("Grinding", "task", "10:00", "12:00", "heavy_exercise", "mixed", "4"),
    ("Packing", "task", "12:30", "14:00", "light_exercise", "nose", "1"),
]
DRAG_TO = "14:30"  # Packing's end is dragged from 14:00 to here


def _seconds(clock: str) -> int:
    h, m = clock.split(":")
    return int(h) * 3600 + int(m) * 60


def logged_file() -> str:
    """An 8-h logger export: notes, a semicolon table, decimal commas, one reading a second."""
    lines = [
        "Logger export (generated for the test)",
        "Serial;T-0001",
        "Interval;1 s",
        "",
        "Date time;Number concentration (1/cm3);LDSA (um2/cm3)",
    ]
    for k in range(8 * 3600):
        t = START_S + k
        level = next(v for a, b, v in LEVELS if _seconds(a) <= t < _seconds(b))
        # a smooth wobble keeps the readings varied but reproducible
        n = level * (1 + 0.3 * math.sin(k / 37.0))
        stamp = f"2026-03-10 {t // 3600:02d}:{t % 3600 // 60:02d}:{t % 60:02d}"
        lines.append(f"{stamp};{n:.1f}".replace(".", ",") + f";{n * 0.003:.3f}".replace(".", ","))
    return "\n".join(lines) + "\n"


def _updates(page) -> int:
    return int(page.locator("#panel-shift").get_attribute("data-updates") or 0)


def _settle(page, before: int) -> None:
    page.wait_for_function(
        "n => { const s = document.getElementById('panel-shift');"
        " return Number(s.dataset.updates || 0) > n && !s.hasAttribute('aria-busy'); }",
        arg=before,
        timeout=120_000,
    )


def _quiet(page) -> None:
    """Wait until no request is in flight and the last reply is shown."""
    page.wait_for_timeout(300)
    page.wait_for_function(
        "() => !document.getElementById('panel-shift').hasAttribute('aria-busy')",
        timeout=120_000,
    )


def _ok(page) -> None:
    page.wait_for_function("() => document.getElementById('panel-shift').dataset.state === 'ok'")


def _row(page, i: int):
    return page.locator("#panel-shift tr.period-row").nth(i)


def _expected_inputs(text: str, periods: list[dict]) -> dict:
    return {
        "series_text": text,
        "series_time_column": "Date time",
        "quantity_columns": [
            {"column": "Number concentration", "quantity": "number", "unit": ""},
            {"column": "LDSA", "quantity": "ldsa", "unit": ""},
        ],
        "periods": periods,
        "background_method": "marked_mean",
        "unmeasured_as": "zero",
        "size_source": "modes",
    }


def test_logged_file_periods_typed_and_dragged_match_the_core(watched, base_url, tmp_path):
    page, _watch = watched
    text = logged_file()
    page.goto(base_url + "#v=1&panel=shift")
    wait_ready(page)
    page.wait_for_function(
        "() => Number(document.getElementById('panel-shift').dataset.updates || 0) >= 1"
    )

    # the file, through the preview
    before = _updates(page)
    page.locator("#panel-shift [data-field=series_text] input[type=file]").set_input_files(
        {"name": "logger-export.csv", "mimeType": "text/csv", "buffer": text.encode("utf-8")}
    )
    _settle(page, before)
    preview = page.locator("#panel-shift .import-preview table").first
    preview.wait_for(state="visible")
    assert "Date time" in preview.inner_text()
    assert "07:00:00" in preview.inner_text()
    assert "3000,0" in preview.inner_text()  # cells as written in the file
    assert "header on line 5" in preview.locator("caption").inner_text()
    summary = page.locator("#panel-shift .import-summary").first.inner_text()
    assert "28,800 readings every 1 s" in summary, summary

    # columns: time by name, number and LDSA columns with what they hold
    page.locator("#panel-shift [data-field=series_time_column] select").select_option("Date time")
    columns = page.locator("#panel-shift [data-field=quantity_columns]")
    for name, what in (("Number concentration", "number"), ("LDSA", "ldsa")):
        box = columns.get_by_role("checkbox", name=re.compile(f"^{name}"))
        if box.is_checked():  # the default first value column: chosen again by name
            box.uncheck()
        box.check()
        columns.get_by_label(re.compile(f"^What {name}")).select_option(what)
    page.locator("#panel-shift [data-field=background_method] select").select_option("marked_mean")
    page.locator("#panel-shift [data-field=size_source] select").select_option("modes")

    # periods typed into the table
    for label, kind, start, end, activity, route, factor in PERIODS:
        page.locator("#panel-shift button[data-add=task]").click()
        row = _row(page, page.locator("#panel-shift tr.period-row").count() - 1)
        row.locator("td[data-part=label] input").fill(label)
        row.locator("td[data-part=kind] select").select_option(kind)
        row.locator("td[data-part=start] input").fill(start)
        row.locator("td[data-part=end] input").fill(end)
        row.locator("td[data-part=activity] select").select_option(activity)
        row.locator("td[data-part=route] select").select_option(route)
        row.locator("td[data-part=protection_factor] input").fill(factor)
    _quiet(page)
    _ok(page)

    # one period by dragging: Packing's end from 14:00 towards 14:30 on the chart
    canvas = page.locator("#shift-series-canvas")
    canvas.scroll_into_view_if_needed()
    box = canvas.bounding_box()
    at = page.evaluate(
        """([a, b]) => { const c = Chart.getChart(document.getElementById('shift-series-canvas'));
             const x = c.scales.x; return [x.getPixelForValue(a), x.getPixelForValue(b),
             (c.chartArea.top + c.chartArea.bottom) / 2]; }""",
        [_seconds("14:00") - START_S, _seconds(DRAG_TO) - START_S],
    )
    before = _updates(page)
    page.mouse.move(box["x"] + at[0] - 2, box["y"] + at[2])
    page.mouse.down()
    page.mouse.move(box["x"] + at[0] + 10, box["y"] + at[2], steps=3)
    page.mouse.move(box["x"] + at[1], box["y"] + at[2], steps=8)
    page.mouse.up()
    _settle(page, before)
    _quiet(page)
    dragged = _row(page, 3).locator("td[data-part=end] input").input_value()
    # the edge snaps to a round step at the chart's scale (at most 5 min at 1280 px)
    assert dragged != "14:00"
    assert abs(_seconds(dragged) - _seconds(DRAG_TO)) <= 300, dragged
    _ok(page)

    # the same inputs through the core
    periods = [
        {
            "label": label,
            "kind": kind,
            "start": start,
            "end": dragged if label == "Packing" else end,
            "activity": activity,
            "route": route,
            "protection_factor": factor,
        }
        for label, kind, start, end, activity, route, factor in PERIODS
    ]
    reply = api.handle({"kind": "shift", "inputs": _expected_inputs(text, periods)})
    assert reply["ok"], reply.get("errors")
    twa = reply["results"]["twa8h"]
    shown = page.locator("#panel-shift table.results tr[data-key=twa8h] td.value").inner_text()
    assert parse_shown(shown) == pytest.approx(round_sig(twa["value"]), rel=1e-9)
    assert unit_text(twa["unit"]) in page.locator("#panel-shift tr[data-key=twa8h]").inner_text()
    words = page.locator("#panel-shift .shift-words").inner_text()
    assert "8-h time-weighted average" in words
    assert "mean of the periods marked as background" in words.lower() or "Background:" in words
    # dose per region (deposited mass, all tasks) as the core gives it
    dose = reply["results"]["dose"]
    for i, region in enumerate(dose["regions"]):
        cell = page.locator(f"#panel-shift td[data-key=mass_{region}]")
        assert parse_shown(cell.inner_text()) == pytest.approx(
            round_sig(dose["total"]["mass"][i]), rel=1e-9
        ), region
    assert page.locator("#panel-shift table.dose-table thead").inner_text().count("Cutting") == 1

    # the link carries the periods and choices, not the 1 MB file; the inputs file carries it
    link = urllib.parse.unquote(urllib.parse.urlsplit(page_link(page)).fragment)
    assert "shift.periods=j:" in link and "Packing" in link
    assert "shift.series_text" not in link
    assert page.locator("#link-size-note").is_visible()
    with page.expect_download() as info:
        page.get_by_role("button", name="Save inputs (JSON)").click()
    saved = json.loads(Path(info.value.path()).read_text(encoding="utf-8"))
    assert saved["panels"]["shift"]["series_text"] == text
    assert saved["panels"]["shift"]["periods"][3]["end"] == dragged
    sha = hashlib.sha256(text.encode("utf-8")).hexdigest()
    assert saved["panels"]["shift"]["series_file"]["sha256"] == sha

    screenshot(page, "shift-page-1280")
    _printed_record(page, tmp_path, sha, twa)


def _printed_record(page, tmp_path: Path, sha: str, twa: dict) -> None:
    if not all(shutil.which(t) for t in ("pdfinfo", "pdftotext", "pdftoppm")):
        pytest.skip("poppler-utils not installed; .ci/setup installs it")
    page.evaluate("() => window.dispatchEvent(new Event('beforeprint'))")
    path = tmp_path / "shift-record.pdf"
    path.write_bytes(page.pdf(format="A4"))
    info = subprocess.run(["pdfinfo", str(path)], capture_output=True, text=True, check=True)
    pages = int(re.search(r"^Pages:\s+(\d+)", info.stdout, re.M).group(1))
    assert pages <= 4, f"the record takes {pages} pages"
    text = subprocess.run(
        ["pdftotext", "-layout", str(path), "-"], capture_output=True, text=True, check=True
    ).stdout
    flat = " ".join(text.split())
    assert "logger-export.csv" in flat
    assert sha in flat.replace(" ", "") or sha[:32] in flat.replace(" ", "")
    assert "Shift summary" in flat
    assert "8-h TWA" in flat
    assert round_sig(twa["value"]) == parse_shown(
        re.search(r"8-h TWA.*?(\d[\d.]*(?: × 10[⁻⁰¹²³⁴⁵⁶⁷⁸⁹]+)?) 1/cm³", flat).group(1)
    )
    for needed in ("Cutting", "Grinding", "Packing", "AI (alveolar-interstitial)", "Cautions"):
        assert needed in flat, needed
    ARTIFACTS.mkdir(exist_ok=True)
    for old in ARTIFACTS.glob("shift-record-*.png"):
        old.unlink()
    subprocess.run(
        ["pdftoppm", "-r", "60", "-png", str(path), str(ARTIFACTS / "shift-record")], check=True
    )


@pytest.mark.parametrize("width", (320, 375, 768, 1280))
def test_shift_demo_layout_at_width(browser, base_url, width):
    context, page, watch = new_watched_page(
        browser, base_url, viewport={"width": width, "height": 800}
    )
    try:
        page.goto(base_url + "#v=1&panel=shift")
        wait_ready(page)
        page.wait_for_function(
            "() => Number(document.getElementById('panel-shift').dataset.updates || 0) >= 1"
        )
        before = _updates(page)
        page.get_by_role("button", name=re.compile("Invented demo: a workshop shift")).click()
        _settle(page, before)
        _ok(page)
        assert "Invented demo" in page.locator("#panel-shift .demo-note").inner_text()
        overflow = page.evaluate(
            "() => document.documentElement.scrollWidth - document.documentElement.clientWidth"
        )
        assert overflow <= 0, f"page is {overflow}px wider than the window"
        broken = page.evaluate(BROKEN_WORDS_JS, page.locator("main").element_handle())
        assert not broken, f"words broken inside at {width}px: {broken[:12]}"
        for box in page.locator("#panel-shift .table-box").all():
            if box.is_visible():
                first = box.locator("tbody th[scope=row]").first
                if first.count():
                    assert first.evaluate("e => e.scrollWidth <= e.clientWidth + 1")
        if width == 1280:
            cut = page.evaluate(
                """() => [...document.querySelectorAll('#panel-shift select')]
                   .filter(s => s.offsetParent && s.scrollWidth > s.clientWidth + 1)
                   .map(s => s.name || s.id || s.getAttribute('aria-label'))"""
            )
            assert not cut, cut
        screenshot(page, f"shift-layout-{width}")
        page.locator("#shift-series-canvas").scroll_into_view_if_needed()
        ARTIFACTS.mkdir(exist_ok=True)
        page.screenshot(path=str(ARTIFACTS / f"shift-layout-{width}-chart.png"))
    finally:
        context.close()
    assert not watch.outside, watch.outside
    assert not watch.errors, watch.errors


def test_hostile_shift_link_is_shown_as_text_and_the_panel_still_computes(watched, base_url):
    """Payloads and wrong shapes in every structured input of the shift panel's link."""
    page, _watch = watched
    payload = "<img src=x onerror=alert(1)>"
    pairs = {
        "shift.periods": "j:"
        + json.dumps(
            [
                {"label": payload, "kind": "task", "start": "<b>", "end": "99:99"},
                {"label": "__proto__", "kind": "<svg onload=alert(2)>", "start": {"a": 1}},
                "not a period",
            ]
        ),
        "shift.quantity_columns": 'j:"junk"',
        "shift.benchmark": "j:" + json.dumps({"value": payload, "unit": "<x>"}),
        "shift.modes": "j:[1,2,3]",
        "shift.series_file": "j:" + json.dumps({"name": payload, "sha256": "zz", "bytes": "1e99"}),
        "shift.demo": "__proto__",
    }
    fragment = "#v=1&panel=shift&" + "&".join(
        f"{k}={urllib.parse.quote(v, safe='')}" for k, v in pairs.items()
    )
    page.goto(base_url + fragment)
    wait_ready(page)
    page.wait_for_function(
        "() => Number(document.getElementById('panel-shift').dataset.updates || 0) >= 1"
        " && !document.getElementById('panel-shift').hasAttribute('aria-busy')"
    )
    # the payload stays text: in the label field, in the file status line; nothing ran
    assert _row(page, 0).locator("td[data-part=label] input").input_value() == payload
    assert payload in page.locator("#panel-shift .file-status").first.inner_text()
    assert page.locator("#panel-shift img").count() == 0
    assert page.evaluate("() => ({}).a === undefined && !('polluted' in Object.prototype)")
    # and the panel computes once a file is given
    before = _updates(page)
    page.locator("#panel-shift [data-field=series_text] input[type=file]").set_input_files(
        {"name": "x.csv", "mimeType": "text/csv", "buffer": logged_file().encode("utf-8")}
    )
    _settle(page, before)
    assert page.locator("#panel-shift").get_attribute("data-state") in ("ok", "invalid")
    assert page.locator("#panel-shift tr.period-error:visible").count() >= 1


TASK_LOG = (
    "Task log of an invented survey\n"
    "Label;Kind;Start;End;Activity;Route;Protection factor\n"
    "Before work;background;06:45;07:15;;;\n"
    "Schweißen am Tisch;task;07:15;09:30;light exercise;mixed;2,5\n"
    "Break;break;09:30;09:50;;;\n"
    "Grinding seams;task;09:50;11:45;heavy exercise;nose;\n"
)


def test_periods_read_from_a_task_log_file(watched, base_url):
    """A task log (Latin-1, notes above the header, semicolons, a decimal comma) replaces the
    periods and the shift is computed with them, as the core computes it; a malformed log is
    refused beside the file control with its line and nothing changes."""
    from driftdose.api.period_file import describe_period_file
    from driftdose.shift.demo import demo_shift

    page, _watch = watched
    page.goto(base_url + "#v=1&panel=shift")
    wait_ready(page)
    page.wait_for_function(
        "() => Number(document.getElementById('panel-shift').dataset.updates || 0) >= 1"
    )
    before = _updates(page)
    page.get_by_role("button", name=re.compile("Invented demo: a workshop shift")).click()
    _settle(page, before)
    _quiet(page)
    _ok(page)
    rows = page.locator("#panel-shift tr.period-row")
    shown_before = [rows.nth(i).inner_text() for i in range(rows.count())]
    values_before = page.evaluate(
        "() => [...document.querySelectorAll('#panel-shift tr.period-row input, "
        "#panel-shift tr.period-row select')].map(e => e.value)"
    )
    file_input = page.locator("#shift-periods-file")

    # a malformed log: refused beside the control, with its line; the periods stay
    updates = _updates(page)
    bad = TASK_LOG.replace("11:45;heavy", "noon;heavy")
    file_input.set_input_files(
        {"name": "tasks.csv", "mimeType": "text/csv", "buffer": bad.encode("latin-1")}
    )
    error = page.locator("#shift-periods-file-error")
    error.wait_for(state="visible")
    assert "tasks.csv: Line 6: column 4 ('End')" in error.inner_text()
    assert "'noon'" in error.inner_text() and "not changed" in error.inner_text()
    page.wait_for_timeout(500)
    assert _updates(page) == updates
    assert [rows.nth(i).inner_text() for i in range(rows.count())] == shown_before
    assert (
        page.evaluate(
            "() => [...document.querySelectorAll('#panel-shift tr.period-row input, "
            "#panel-shift tr.period-row select')].map(e => e.value)"
        )
        == values_before
    )

    # the good log replaces the periods and the shift is computed with them
    before = _updates(page)
    file_input.set_input_files(
        {"name": "tasks.csv", "mimeType": "text/csv", "buffer": TASK_LOG.encode("latin-1")}
    )
    _settle(page, before)
    _quiet(page)
    _ok(page)
    assert error.is_hidden()
    status = page.locator("#shift-periods-file-status").inner_text()
    assert "Read 4 periods from tasks.csv (lines 3–6)" in status
    assert rows.count() == 4
    assert _row(page, 1).locator("td[data-part=label] input").input_value() == (
        "Schweißen am Tisch"
    )
    assert _row(page, 1).locator("td[data-part=protection_factor] input").input_value() == "2.5"
    # a route the log leaves blank takes the declared default, as in the engine
    assert _row(page, 0).locator("td[data-part=activity] select").input_value() == (
        "light_exercise"
    )
    assert _row(page, 3).locator("td[data-part=route] select").input_value() == "nose"

    demo = demo_shift()
    records = describe_period_file(TASK_LOG)["records"]
    inputs = {
        **demo["inputs"],
        "series_text": demo["series"]["text"],
        "background_text": demo["background"]["text"],
        "periods": records,
    }
    reply = api.handle({"kind": "shift", "inputs": inputs})
    assert reply["ok"], reply.get("errors")
    twa = reply["results"]["twa8h"]
    shown = page.locator("#panel-shift table.results tr[data-key=twa8h] td.value").inner_text()
    assert parse_shown(shown) == pytest.approx(round_sig(twa["value"]), rel=1e-9)
    page.locator("#shift-periods-file").scroll_into_view_if_needed()
    screenshot(page, "shift-periods-file-1280")
