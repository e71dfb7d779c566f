"""Files in the page as instruments and spreadsheets write them, read by the core's decoder
(``driftdose.textfile``, the command line's too): UTF-8 with and without a byte-order mark,
UTF-16 LE/BE with a mark, Latin-1 with a header chosen by its name, notes above the header,
a ``sep=`` first line; sizes shown are the file's bytes; ambiguous thousands are refused with
their line; a stage named like a formula leaves the page neutralised in both CSV downloads.
"""

from __future__ import annotations

import codecs
import csv
import io
import json

import pytest

from driftdose import api, export
from driftdose.textfile import decode_text, size_text

from .conftest import ARTIFACTS, screenshot
from .helpers import export_parts
from .test_deposition_page import PANEL, _assert_cells_match, _open, _settled

pytestmark = pytest.mark.e2e

SPECTRUM = (
    "sep=;\n"
    "Instrument;mobility sizer (invented)\n"
    "Größe [nm];dN [1/cm³]\n"
    "20;1000\n30;3000\n50;6000\n80;5000\n120;2500\n200;900\n400;150\n"
)
ENCODINGS = {
    "utf-8": lambda t: t.encode("utf-8"),
    "utf-8-bom": lambda t: codecs.BOM_UTF8 + t.encode("utf-8"),
    "utf-16-le": lambda t: codecs.BOM_UTF16_LE + t.encode("utf-16-le"),
    "utf-16-be": lambda t: codecs.BOM_UTF16_BE + t.encode("utf-16-be"),
    "latin-1": lambda t: t.replace("\n", "\r\n").encode("latin-1"),
}


def _pick(page, data: bytes, name: str = "spectrum.csv") -> None:
    panel = page.locator(PANEL)
    panel.get_by_label("Size distribution from").select_option("csv")
    before = int(panel.get_attribute("data-updates") or 0)
    panel.get_by_label("Spectrum CSV file").set_input_files(
        {"name": name, "mimeType": "text/csv", "buffer": data}
    )
    page.wait_for_function(
        "n => Number(document.getElementById('panel-deposition').dataset.updates || 0) > n",
        arg=before,
    )
    # the answer counted may be the one to the source choice: wait for the file's own turn
    page.wait_for_function(
        "() => !document.querySelector('#panel-deposition .field[data-field=csv_text]"
        " .file-status').textContent.startsWith('Reading')"
    )


def _map_columns(page) -> None:
    panel = page.locator(PANEL)
    panel.get_by_label("Diameter column").select_option("Größe [nm]")
    panel.get_by_label("Concentration column").select_option("dN [1/cm³]")
    panel.get_by_label("Concentration is given").select_option("per_bin")
    page.wait_for_function("() => location.hash.includes('csv_concentration_type=per_bin')")
    _settled(page)


def _status(page) -> str:
    return page.locator(f"{PANEL} .field[data-field=csv_text] .file-status").inner_text()


def _csv_text(page) -> str:
    return page.evaluate(
        "async () => (await import('./js/app.js')).controllers.get('deposition')"
        ".getState().csv_text"
    )


@pytest.mark.parametrize("encoding", list(ENCODINGS))
def test_spectrum_in_each_encoding_reads_as_the_cli_reads_it(page, base_url, encoding):
    data = ENCODINGS[encoding](SPECTRUM)
    _open(page, base_url)
    _pick(page, data)
    _map_columns(page)
    decoded = decode_text(data)
    assert _csv_text(page) == decoded.text  # the very text the command line sends
    status = _status(page)
    assert f"({size_text(len(data))})" in status  # the file's bytes, not its characters
    for note in decoded.notes:
        assert note in status
    reply = api.handle(
        {
            "kind": "deposition",
            "inputs": {
                "size_source": "csv",
                "csv_text": decoded.text,
                "csv_diameter_column": "Größe [nm]",
                "csv_concentration_column": "dn [1/CM³]",
                "csv_concentration_type": "per_bin",
            },
        }
    )
    assert reply["ok"], reply
    assert page.locator(PANEL).get_attribute("data-state") == "ok"
    assert _assert_cells_match(page, reply) == 36
    if encoding == "latin-1":
        screenshot(page, "files-latin1-spectrum")


def test_latin1_file_near_the_limit_is_accepted_with_its_size(page, base_url):
    rows = "".join(
        f"{10 + i * 0.01:.2f};{100 + i % 7};Bemerkung {'äöüß' * 58}\n" for i in range(20_000)
    )
    data = ("Größe [nm];dN [1/cm³];Notiz\n" + rows).encode("latin-1")
    assert 4.8 * 2**20 < len(data) <= 5 * 2**20
    _open(page, base_url)
    _pick(page, data, "big-latin1.csv")
    _map_columns(page)
    assert f"({size_text(len(data))})" in _status(page)
    assert page.locator(PANEL).get_attribute("data-state") == "ok"


def test_file_over_the_limit_named_with_its_bytes(page, base_url):
    data = b"d;n\n" + b"10;1\n" * 1_100_000  # 5.25 MB
    _open(page, base_url)
    _pick(page, data, "big.csv")
    assert _status(page) == f"big.csv is {size_text(len(data))}; the limit is 5 MB."


def test_quoted_thousands_refused_with_the_line(page, base_url):
    _open(page, base_url)
    _pick(page, b'd,n\n20,"1,000"\n30,"3,000"\n')
    error = page.locator(f"{PANEL} .field[data-field=csv_text] .error")
    error.filter(has_text="Line 2").wait_for(state="visible")
    assert "ambiguous" in error.inner_text()
    assert page.locator(f"{PANEL} .stale-note").is_visible()


def test_utf16_without_mark_refused_at_the_field(page, base_url):
    _open(page, base_url)
    _pick(page, SPECTRUM.encode("utf-16-le"), "no-mark.csv")
    assert "UTF-16 text without a byte-order mark" in _status(page)


# --- notes above the header, the preview and the pickers ------------------------------------

SIZER_EXPORT = (
    "Instrument;mobility sizer (invented)\r\n"
    "Serial;0042\r\n"
    "Date;04.03.2026\r\n"
    "Sheath flow;3,0 L/min\r\n"
    "\r\n"
    "Dp [µm];dN/dlogDp [#/cm³];Remark\r\n"
    "0,020;1000;\r\n0,030;3000;\r\n0,050;6000;ok\r\n0,080;5000;\r\n"
    "0,120;2500;\r\n0,200;900;\r\n0,400;150;\r\n"
    "Total;;18550;\r\n"
)


def _field(page, name: str):
    return page.locator(f"{PANEL} .field[data-field={name}]")


def test_notes_above_the_header_import_through_the_preview_with_the_right_columns(page, base_url):
    _open(page, base_url)
    _pick(page, SIZER_EXPORT.encode("latin-1"), "sizer-export.csv")
    _settled(page)
    panel = page.locator(PANEL)
    preview = _field(page, "csv_text").locator(".table-preview")
    summary = preview.locator(".table-summary").inner_text()
    assert summary.startswith("Semicolon-separated, decimal comma.")
    assert "Header found on line 6 (4 lines of notes above it set aside)." in summary
    assert "7 data rows, lines 7–13." in summary
    assert "Left out after the data: line 14" in summary
    header = preview.locator("tr.preview-header th")
    assert header.all_inner_texts() == ["Line 6", "Dp [µm]", "dN/dlogDp [#/cm³]", "Remark"]
    first = preview.locator("tr.preview-data").first.locator("th, td").all_inner_texts()
    assert first == ["Line 7", "0,020", "1000", ""]
    # the pickers hold the file's columns, the units and kind come from the headers
    assert panel.get_by_label("Diameter column").input_value() == "Dp [µm]"
    assert panel.get_by_label("Concentration column").input_value() == "dN/dlogDp [#/cm³]"
    assert panel.get_by_label("Diameter unit in the file").input_value() == "um"
    assert panel.get_by_label("Concentration is given").input_value() == "dN/dlogDp"
    assert panel.get_by_label("Concentration unit in the file").input_value() == "1/cm3"
    options = panel.get_by_label("Concentration column").locator("option").all_inner_texts()
    assert options == ["1: Dp [µm]", "2: dN/dlogDp [#/cm³]", "3: Remark"]
    assert page.locator(PANEL).get_attribute("data-state") == "ok"
    reply = api.handle(
        {
            "kind": "deposition",
            "inputs": {
                "distribution_source": "csv",
                "csv_text": decode_text(SIZER_EXPORT.encode("latin-1")).text,
                "csv_diameter_column": "1",
                "csv_concentration_column": "2",
                "csv_diameter_unit": "um",
                "csv_concentration_type": "dN/dlogDp",
            },
        }
    )
    assert reply["ok"], reply
    assert _assert_cells_match(page, reply) == 36
    for width in (375, 1280):
        page.set_viewport_size({"width": width, "height": 900})
        preview.scroll_into_view_if_needed()
        screenshot(page, f"files-preview-{width}")
        _field(page, "csv_text").screenshot(
            path=str(ARTIFACTS / f"files-preview-field-{width}.png")
        )
        overflow = page.evaluate("() => document.documentElement.scrollWidth > innerWidth + 1")
        assert not overflow, f"the page scrolls sideways at {width} px"


def test_a_wrong_header_line_is_shown_beside_the_control_that_is_wrong(page, base_url):
    _open(page, base_url)
    _pick(page, SIZER_EXPORT.encode("latin-1"), "sizer-export.csv")
    _settled(page)
    panel = page.locator(PANEL)
    before = int(panel.get_attribute("data-updates") or 0)
    panel.get_by_label("Header is on line").fill("40")
    panel.get_by_label("Header is on line").blur()
    error = _field(page, "csv_header_line").locator(".error")
    error.filter(has_text="Line 40 does not exist").wait_for(state="visible")
    assert int(panel.get_attribute("data-updates") or 0) > before
    assert _field(page, "csv_text").locator(".error").is_hidden()
    # line 2 as the header: the pickers' columns are not there, so the picker says so
    panel.get_by_label("Header is on line").fill("2")
    panel.get_by_label("Header is on line").blur()
    picker_error = _field(page, "csv_diameter_column").locator(".error")
    picker_error.filter(has_text="No column named").wait_for(state="visible")
    summary = _field(page, "csv_text").locator(".table-summary").inner_text()
    assert "Header on line 2" in summary
    # back to "find it": valid again
    panel.get_by_label("Header is on line").fill("0")
    panel.get_by_label("Header is on line").blur()
    page.wait_for_function(
        "() => document.getElementById('panel-deposition').dataset.state === 'ok'"
    )
    assert picker_error.is_hidden()


# --- exports ------------------------------------------------------------------------------------


@pytest.mark.parametrize("part", ["results", "curves"])
def test_stage_named_like_a_formula_is_neutralised_in_downloads(page, base_url, part):
    page.goto(base_url + "#v=1&panel=sampling")
    page.wait_for_selector("html[data-engine='ready']")
    panel = page.locator("#panel-sampling")
    page.wait_for_function(
        "() => Number(document.getElementById('panel-sampling').dataset.updates || 0) >= 1"
    )
    before = int(panel.get_attribute("data-updates") or 0)
    panel.get_by_role("group", name="Stage 1: Straight tube", exact=True).get_by_label(
        "Stage name"
    ).fill("=1+1")
    page.wait_for_function(
        "n => { const s = document.getElementById('panel-sampling');"
        " return Number(s.dataset.updates || 0) > n && !s.hasAttribute('aria-busy'); }",
        arg=before,
    )
    label = "Download results (CSV)" if part == "results" else "Download curves (CSV)"
    with page.expect_download() as info:
        panel.get_by_role("button", name=label).click()
    text = info.value.path().read_text(encoding="utf-8")
    cells = [c for row in csv.reader(io.StringIO(text, newline="")) for c in row]
    assert "'=1+1" in cells
    assert "=1+1" not in cells
    for c in cells:
        if c.startswith(("=", "+", "-", "@", "\t", "\r")):
            float(c)  # only numbers may start so
    # the very file the command line writes for the same inputs
    inputs = page.evaluate(
        "async () => (await import('./js/app.js')).controllers.get('sampling').getState()"
    )
    reply = api.handle({"kind": "sampling", "inputs": json.loads(json.dumps(inputs))})
    assert reply["ok"], reply
    expected = export.results_csv(reply) if part == "results" else export.curves_csv(reply)
    _head, table = export_parts(text)
    assert len(table.splitlines()) == len(expected.splitlines())
