"""The motion panel in Chromium: readiness, numbers against the core, bad input, chart."""

from __future__ import annotations

import pytest

from driftdose import api

from .conftest import screenshot, wait_ready
from .helpers import parse_shown, round_sig, table_values

pytestmark = pytest.mark.e2e


def _wait_updates(page, panel: str, at_least: int) -> None:
    page.wait_for_function(
        "([p, n]) => Number(document.getElementById('panel-' + p).dataset.updates || 0) >= n",
        arg=[panel, at_least],
    )


def _settled(page, panel: str = "motion") -> None:
    page.wait_for_function(
        "p => { const s = document.getElementById('panel-' + p);"
        " return !s.hasAttribute('aria-busy') && s.dataset.state; }",
        arg=panel,
    )


def test_page_reaches_ready_and_shows_cautions(page, base_url):
    page.goto(base_url)
    wait_ready(page)
    _wait_updates(page, "motion", 1)
    caution = page.get_by_label("Cautions").inner_text()
    assert "Screening estimates" in caution
    assert "professional judgment" in caution
    assert "local regulations" in caution
    screenshot(page, "motion-default")


def test_numbers_shown_equal_core(page, base_url):
    page.goto(base_url)
    wait_ready(page)
    _wait_updates(page, "motion", 1)
    page.locator("#panel-motion").get_by_label("Particle diameter", exact=True).fill("2.5")
    page.locator("#panel-motion").get_by_label("Particle diameter unit").select_option("um")
    page.locator("#panel-motion").get_by_label("Diameter type").select_option("aerodynamic")
    page.locator("#panel-motion").get_by_label("Particle density", exact=True).fill("2.2")
    page.locator("#panel-motion").get_by_label("Air temperature", exact=True).fill("35")
    page.locator("#panel-motion").get_by_label("Time", exact=True).fill("10")
    page.locator("#panel-motion").get_by_label("Time unit").select_option("min")
    page.wait_for_function(
        "() => document.querySelector('#panel-motion tr[data-key=aerodynamic_diameter] td')"
        "?.textContent === '2.5'"
    )
    _settled(page)
    shown = table_values(page, "motion")
    reply = api.handle(
        {
            "kind": "motion",
            "inputs": {
                "particle_diameter": {"value": "2.5", "unit": "um"},
                "diameter_type": "aerodynamic",
                "particle_density": {"value": "2.2", "unit": "g/cm3"},
                "temperature": {"value": "35", "unit": "degC"},
                "time": {"value": "10", "unit": "min"},
            },
        }
    )
    assert reply["ok"]
    compared = 0
    for key, row in reply["results"].items():
        if "text" in row:
            assert shown[key][0] == row["text"]
            continue
        value, unit = shown[key]
        assert parse_shown(value) == pytest.approx(round_sig(row["value"]), rel=1e-12), key
        assert unit == ("" if row["unit"] == "–" else row["unit"]), key
        compared += 1
    assert compared >= 15


@pytest.mark.parametrize(
    ("label", "value", "fragment"),
    [
        ("Particle diameter", "abc", "must be a number"),
        ("Particle diameter", "-5", "from 0.5 nm to 1 mm"),
        ("Air temperature", "900", "from -50 °C to 500 °C"),
        ("Air pressure", "", "is required"),
        ("Time", "NaN", "finite number"),
    ],
)
def test_bad_input_message_next_to_field_and_results_marked_stale(
    page, base_url, label, value, fragment
):
    page.goto(base_url)
    wait_ready(page)
    _wait_updates(page, "motion", 1)
    before = table_values(page, "motion")
    field = page.locator("#panel-motion").get_by_label(label, exact=True)
    field.fill(value)
    error_id = field.get_attribute("aria-describedby").split()[1]
    error = page.locator(f"[id='{error_id}']")
    error.wait_for(state="visible")
    assert fragment in error.inner_text()
    assert field.get_attribute("aria-invalid") == "true"
    assert page.locator("#panel-motion .stale-note").is_visible()
    assert table_values(page, "motion") == before  # last good results kept
    body = page.locator("body").inner_text()
    assert "NaN" not in body.replace("'NaN'", "") and "undefined" not in body
    assert "Traceback" not in body
    if label == "Particle diameter":
        screenshot(page, "motion-bad-input")


def test_chart_has_curves_crossover_and_exports_png(page, base_url):
    page.goto(base_url)
    wait_ready(page)
    _wait_updates(page, "motion", 1)
    labels = page.evaluate(
        "() => Chart.getChart(document.querySelector('#panel-motion canvas'))"
        ".data.datasets.map(d => [d.label, d.data.length])"
    )
    names = dict(labels)
    assert names["Brownian rms displacement √(2Dt), one direction"] >= 200
    assert names["Settling distance vₜₛ·t"] >= 200
    assert "Crossover" in names and "Reference distance" in names
    with page.expect_download() as info:
        page.get_by_role("button", name="Save chart image").click()
    download = info.value
    assert download.suggested_filename.endswith(".png")
    with open(download.path(), "rb") as fh:
        assert fh.read(8) == b"\x89PNG\r\n\x1a\n"


def test_link_reproduces_inputs(page, base_url, browser):
    page.goto(base_url)
    wait_ready(page)
    _wait_updates(page, "motion", 1)
    page.locator("#panel-motion").get_by_label("Particle density", exact=True).fill("7.8")
    page.wait_for_function("() => location.hash.includes('7.8')")
    _settled(page)
    url = page.url
    shown = table_values(page, "motion")
    other = browser.new_context()
    try:
        p2 = other.new_page()
        p2.goto(url)
        wait_ready(p2)
        _wait_updates(p2, "motion", 1)
        assert (
            p2.locator("#panel-motion").get_by_label("Particle density", exact=True).input_value()
            == "7.8"
        )
        assert table_values(p2, "motion") == shown
    finally:
        other.close()
