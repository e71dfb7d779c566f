"""Diameter types, effective density, per-mode rows and LDSA as the page shows them.

Every number shown in the mode and LDSA tables must equal the core's reply for the same
inputs, rounded as the page rounds (4 significant figures).
"""

from __future__ import annotations

import json
import shutil
import subprocess
from urllib.parse import quote

import pytest

from driftdose import api
from driftdose.unit_labels import unit_text

from .conftest import new_watched_page, screenshot, wait_ready
from .helpers import parse_shown, round_sig, table_values

pytestmark = pytest.mark.e2e

PANEL = "#panel-deposition"


def _settled(page, updates: int = 1) -> None:
    page.wait_for_function(
        "(n) => { const s = document.getElementById('panel-deposition');"
        " return Number(s.dataset.updates || 0) >= n && !s.hasAttribute('aria-busy')"
        " && s.dataset.state; }",
        arg=updates,
    )


def _compare(page, reply: dict, prefix: str) -> int:
    shown = table_values(page, "deposition")
    keys = [k for k in reply["results"] if k.startswith(prefix)]
    assert keys
    for key in keys:
        row = reply["results"][key]
        value, unit = shown[key]
        assert parse_shown(value) == pytest.approx(round_sig(row["value"]), rel=1e-12), key
        assert unit == unit_text(row["unit"]), key  # the table's label of the code
    return len(keys)


def test_mass_median_rows_and_ldsa_shown_equal_core(page, base_url):
    modes = [
        {
            "basis": "mass",
            "median": {"value": "0.3", "unit": "um"},
            "diameter_type": "aerodynamic",
            "gsd": "2",
            "concentration": {"value": "1", "unit": "mg/m3"},
        },
        {
            "basis": "count",
            "median": {"value": "60", "unit": "nm"},
            "diameter_type": "mobility",
            "gsd": "1.7",
            "concentration": {"value": "20000", "unit": "1/cm3"},
        },
    ]
    fragment = (
        "#v=1&panel=deposition&deposition.modes=j:"
        + quote(json.dumps(modes))
        + "&deposition.particle_density=5~g%2Fcm3&deposition.shape_factor=1.4~1"
    )
    page.goto(base_url + fragment)
    wait_ready(page)
    _settled(page)
    inputs = {
        "modes": modes,
        "particle_density": {"value": "5", "unit": "g/cm3"},
        "shape_factor": {"value": "1.4", "unit": "1"},
    }
    reply = api.handle({"kind": "deposition", "inputs": inputs})
    assert reply["ok"], reply
    assert _compare(page, reply, "mode") == 10
    assert _compare(page, reply, "ldsa_") == 3
    caption = page.locator(f"{PANEL} [data-part=modes] caption").inner_text()
    assert "volume-equivalent" in caption
    screenshot(page, "deposition-modes-ldsa")

    # effective density: the size axis and the rows turn to mobility diameters
    page.locator(PANEL).get_by_label("Density given as").select_option("effective")
    _settled(page, 2)
    page.wait_for_function(
        "() => document.querySelector('#panel-deposition [data-part=modes] caption')"
        ".textContent.includes('mobility')"
    )
    reply = api.handle({"kind": "deposition", "inputs": {**inputs, "density_basis": "effective"}})
    assert _compare(page, reply, "mode") == 10
    assert _compare(page, reply, "ldsa_") == 3


def test_old_link_mass_mode_keeps_aerodynamic_meaning(page, base_url):
    modes = [
        {
            "basis": "mass",
            "median": {"value": "4", "unit": "um"},
            "gsd": "2",
            "concentration": {"value": "1", "unit": "mg/m3"},
        }
    ]
    page.goto(base_url + "#v=1&panel=deposition&deposition.modes=j:" + quote(json.dumps(modes)))
    wait_ready(page)
    _settled(page)
    shown = page.locator(f"{PANEL} fieldset.item").first.get_by_label(
        "The median is a diameter of type"
    )
    assert shown.input_value() == "aerodynamic"
    reply = api.handle({"kind": "deposition", "inputs": {"modes": modes}})
    assert _compare(page, reply, "mode") == 5


def test_each_median_says_what_it_is(page, base_url):
    page.goto(base_url + "#v=1&panel=deposition")
    wait_ready(page)
    _settled(page)
    mode = page.locator(f"{PANEL} fieldset.item").first
    says = mode.locator(".median-says")
    assert says.inner_text() == "This median is the count median diameter, volume-equivalent (CMD)."
    mode.get_by_label("Mode given by").select_option("mass")
    mode.get_by_label("The median is a diameter of type").select_option("aerodynamic")
    assert says.inner_text() == "This median is the mass median aerodynamic diameter (MMAD)."
    mode.get_by_label("The median is a diameter of type").select_option("volume_equivalent")
    assert says.inner_text() == "This median is the mass median diameter, geometric (MMD)."
    described = mode.get_by_label(
        "Median diameter: count median (count mode) or mass median (mass mode)", exact=True
    ).get_attribute("aria-describedby")
    assert says.get_attribute("id") in described.split()
    page.locator(PANEL).get_by_role("button", name="Add a mode").click()
    second = page.locator(f"{PANEL} fieldset.item").nth(1).locator(".median-says")
    assert second.inner_text() == "This median is the mass median diameter, geometric (MMD)."


@pytest.mark.parametrize("width", [320, 375, 768, 1280])
def test_mode_and_ldsa_tables_fit_the_screen(browser, base_url, width):
    modes = [
        {
            "basis": "mass",
            "median": {"value": "0.3", "unit": "um"},
            "diameter_type": "aerodynamic",
            "gsd": "2",
            "concentration": {"value": "1", "unit": "mg/m3"},
        }
    ]
    context, page, watch = new_watched_page(
        browser, base_url, viewport={"width": width, "height": 900}
    )
    try:
        page.goto(
            base_url
            + "#v=1&panel=deposition&deposition.modes=j:"
            + quote(json.dumps(modes))
            + "&deposition.particle_density=5~g%2Fcm3"
        )
        wait_ready(page)
        _settled(page)
        for part in ("modes", "ldsa"):
            box = page.locator(f"{PANEL} [data-part={part}]")
            rect = box.bounding_box()
            assert rect["x"] >= -0.5 and rect["x"] + rect["width"] <= width + 0.5, part
            # a table wider than the screen scrolls sideways inside its own box (the page's
            # phone-width layout) and never widens the page
            table = box.locator("table")
            if table.bounding_box()["width"] > rect["width"] + 0.5:
                scroller = table.evaluate(
                    "t => { const b = t.closest('.table-box');"
                    " return b ? getComputedStyle(b).overflowX : null; }"
                )
                assert scroller == "auto", f"{part}: a wide table that does not scroll in a box"
        assert page.evaluate("() => document.documentElement.scrollWidth") <= width
        page.locator(f"{PANEL} [data-part=modes]").scroll_into_view_if_needed()
        page.screenshot(
            path=str(screenshot(page, f"sizes-{width}").with_name(f"sizes-{width}-view.png"))
        )
    finally:
        context.close()
    assert not watch.errors and not watch.outside


def test_printed_record_lists_ldsa_modes_and_source(page, base_url, tmp_path):
    page.goto(base_url + "#v=1&panel=deposition")
    wait_ready(page)
    _settled(page)
    page.evaluate("() => window.dispatchEvent(new Event('beforeprint'))")
    page.emulate_media(media="print")
    report = page.locator("#report")
    assert report.is_visible()
    text = report.inner_text()
    reply = api.handle({"kind": "deposition", "inputs": {}})
    for key in ("ldsa_alveolar", "ldsa_tracheobronchial", "ldsa_total", "mode1_count_median"):
        row = reply["results"][key]
        assert row["label"] in text, key
        shown = report.locator(f"tr[data-key={key}] td").first.inner_text()
        assert parse_shown(shown) == pytest.approx(round_sig(row["value"]), rel=1e-12), key
    assert "Fissan" in text
    pdf = tmp_path / "record.pdf"
    pdf.write_bytes(page.pdf())
    assert pdf.read_bytes()[:4] == b"%PDF"
    if shutil.which("pdftoppm"):
        out = screenshot(page, "sizes-record").with_name("sizes-record-pdf")
        subprocess.run(["pdftoppm", "-png", "-r", "60", str(pdf), str(out)], check=True)
