"""Retained burden and dose ranges in Chromium: the invented working-life demo, shown numbers
against the core's reply, progress and cancel of the propagation, log time axis, the link."""

from __future__ import annotations

import pytest

from driftdose import api
from driftdose.api.burden import DEMOS

from .conftest import ARTIFACTS, page_link, wait_ready
from .helpers import parse_shown, round_sig

pytestmark = pytest.mark.e2e

DEMO = DEMOS[0]


def _inputs() -> dict:
    dep = {k: v for k, v in DEMO["deposition"].items() if k != "demo"}
    return {**dep, **DEMO["burden"], **DEMO["ranges"]}


def _done(page, section: str, updates: int = 1) -> None:
    page.wait_for_function(
        "([id, n]) => { const s = document.getElementById(id);"
        " return s && !s.hasAttribute('aria-busy') && s.dataset.state === 'ok'"
        " && Number(s.dataset.updates || 0) >= n; }",
        arg=[section, updates],
        timeout=300_000,  # a 1000-sample propagation on a loaded machine
    )


def _cells(page, selector: str) -> dict[str, str]:
    cells = page.locator(f"{selector} td[data-key]")
    return {
        cells.nth(i).get_attribute("data-key"): cells.nth(i).inner_text()
        for i in range(cells.count())
    }


def _load_demo(page, base_url: str) -> None:
    page.goto(base_url + "#v=1&panel=deposition")
    wait_ready(page)
    # the sections compute once they are on screen
    assert page.locator("#section-ranges").get_attribute("data-updates") is None
    page.locator("#section-burden").scroll_into_view_if_needed()
    _done(page, "section-burden")
    page.locator("#section-ranges").scroll_into_view_if_needed()
    _done(page, "section-ranges")
    page.locator("#section-burden").scroll_into_view_if_needed()
    page.locator("#load-demo_working_life").click()
    page.wait_for_function("() => location.hash.includes('ranges.seed=2026')")
    _done(page, "section-burden", 2)
    page.locator("#section-ranges").scroll_into_view_if_needed()
    _done(page, "section-ranges", 2)


def test_demo_shows_working_life_burden_and_dose_range_equal_to_core(page, base_url):
    _load_demo(page, base_url)
    burden = api.handle({"kind": "burden", "inputs": _inputs()})
    ranges = api.handle({"kind": "uncertainty", "inputs": _inputs()})
    assert burden["ok"] and ranges["ok"]
    # retained alveolar mass after the working life, as shown in the milestone table
    shown = _cells(page, "#section-burden table.milestones")
    assert len(shown) == 9 * 5
    for key, text in shown.items():
        assert parse_shown(text) == pytest.approx(
            round_sig(burden["results"][key]["value"]), rel=1e-12
        ), key
    assert "burden_life_AI_mass" in shown
    # dose ranges per region, and the input named as driving the spread
    cells = _cells(page, "#section-ranges table.ranges")
    compared = 0
    for key, text in cells.items():
        row = ranges["results"][key]
        if key.endswith("_leading"):
            assert text == row["text"], key
        else:
            assert parse_shown(text) == pytest.approx(round_sig(row["value"]), rel=1e-12), key
        compared += 1
    assert compared == 6 * 5
    headline = page.locator("#ranges-headline").inner_text()
    lead = ranges["results"]["range_dose_AI_mass_leading"]["text"]
    assert f"driving the spread most: {lead}" in headline
    assert "after 40 working years" in headline
    # the demo is labelled as invented in both sections
    assert "Invented demo" in page.locator("#section-burden .demo-note").inner_text()
    assert "Invented demo" in page.locator("#section-ranges .demo-note").inner_text()
    ARTIFACTS.mkdir(exist_ok=True)
    for width in (320, 375, 768, 1280):
        page.set_viewport_size({"width": width, "height": 900})
        for part in ("burden", "ranges"):
            section = page.locator(f"#section-{part}")
            section.scroll_into_view_if_needed()
            section.screenshot(path=str(ARTIFACTS / f"{part}-demo-{width}.png"))


def test_progress_shows_and_an_input_change_cancels_the_propagation(page, base_url):
    _load_demo(page, base_url)
    section = page.locator("#section-ranges")
    before = int(section.get_attribute("data-updates"))
    section.get_by_label("Number of samples", exact=True).fill("5000")
    page.wait_for_function(
        "() => !document.querySelector('#section-ranges .propagation').hidden", timeout=60_000
    )
    value = page.locator("#ranges-progress").get_attribute("value")
    assert 0 <= int(value) < 100
    # change an input while it runs: the 5000-sample run stops, the new one completes
    section.get_by_label("Random seed", exact=True).fill("7")
    section.get_by_label("Number of samples", exact=True).fill("300")
    _done(page, "section-ranges", before + 1)
    text = page.locator("#section-ranges").inner_text()
    assert (
        "Computing samples" not in text or page.locator("#section-ranges .propagation").is_hidden()
    )
    reply = api.handle({"kind": "uncertainty", "inputs": {**_inputs(), "seed": 7, "samples": 300}})
    cells = _cells(page, "#section-ranges table.ranges")
    assert parse_shown(cells["range_dose_AI_mass_p95"]) == pytest.approx(
        round_sig(reply["results"]["range_dose_AI_mass_p95"]["value"]), rel=1e-12
    )


def test_section_tells_its_listeners_once_per_change(page, base_url):
    """A change to a section on screen reaches its change listeners (the link writer) once, as
    a change to one waiting off screen does; each computes once."""
    page.goto(base_url + "#v=1&panel=deposition")
    wait_ready(page)
    page.locator("#section-burden").scroll_into_view_if_needed()
    _done(page, "section-burden")
    page.evaluate(
        """async () => {
             const m = await import('./js/app.js');
             window.__told = {burden: 0, ranges: 0};
             for (const id of ['burden', 'ranges']) {
               m.controllers.get(id).onChange(() => { window.__told[id] += 1; });
             }
           }"""
    )
    before = int(page.locator("#section-burden").get_attribute("data-updates"))
    page.locator("#section-burden").get_by_label("Working years", exact=True).fill("30")
    _done(page, "section-burden", before + 1)
    page.wait_for_timeout(300)
    assert page.evaluate("() => window.__told.burden") == 1
    assert int(page.locator("#section-burden").get_attribute("data-updates")) == before + 1
    # the ranges section waits off screen: told at once, computed once shown
    assert page.locator("#section-ranges").get_attribute("data-updates") is None
    told = page.evaluate("() => window.__told.ranges")  # it follows the burden's inputs too
    page.evaluate(  # typed without scrolling to it (a fill would bring it on screen)
        """() => {
             const input = document.querySelector('#section-ranges [data-field="seed"] input');
             input.value = '11';
             input.dispatchEvent(new Event('input', {bubbles: true}));
           }"""
    )
    assert page.evaluate("() => window.__told.ranges") == told + 1
    assert page.locator("#section-ranges").get_attribute("data-updates") is None


def test_time_axis_switch_and_link_round_trip(page, base_url, browser):
    _load_demo(page, base_url)
    axis = (
        "() => { const c = Chart.getChart(document.querySelector('#burden-time-canvas'));"
        " window.__seen = window.__seen || c; return {same: window.__seen === c,"
        " type: c.options.scales.x.type, title: c.options.scales.x.title.text,"
        " y: c.options.scales.y.title.text}; }"
    )
    log = page.evaluate(axis)
    # log axis: ticks carry their units ("1 d", "10 y"), so the title names the quantity only
    assert log == {
        "same": True,
        "type": "logarithmic",
        "title": "Time from the first exposure",
        "y": log["y"],
    }
    assert log["y"].endswith(")")  # bare-number ticks: the unit is in the title
    page.locator("#burden-time-axis").select_option("linear")
    lin = page.evaluate(axis)
    # linear axis: bare numbers of days; the chart is the same one, updated in place
    assert lin["same"] and lin["type"] == "linear"
    assert lin["title"] == "Time from the first exposure (days)"
    page.locator("#burden-time-axis").select_option("logarithmic")
    assert page.evaluate(axis)["same"]
    link = page_link(page)
    other = browser.new_page()
    try:
        other.goto(link)
        wait_ready(other)
        other.locator("#section-ranges").scroll_into_view_if_needed()
        other.wait_for_function(
            "() => { const s = document.getElementById('section-ranges');"
            " return s && s.dataset.state === 'ok' && !s.hasAttribute('aria-busy'); }",
            timeout=120_000,
        )
        a = _cells(page, "#section-ranges table.ranges")
        b = _cells(other, "#section-ranges table.ranges")
        assert a == b
    finally:
        other.close()
