"""The motion panel in Chromium: readiness, numbers against the core, bad input, chart."""

from __future__ import annotations

import re

import pytest

from driftdose import api
from driftdose.unit_labels import unit_text

from .conftest import ARTIFACTS, screenshot, wait_ready
from .helpers import parse_shown, png_size, png_text, round_sig, table_values

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
        assert unit == unit_text(row["unit"]), key  # the table's label of the code
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


def _open_recording(page, base_url: str) -> None:
    """Open the page and, once the motion panel has settled, record in window.__order each
    request posted to the engine ('post'), link written ('link') and result shown ('shown')."""
    page.goto(base_url)
    wait_ready(page)
    _wait_updates(page, "motion", 1)
    _settled(page)
    page.evaluate(
        """async () => {
             const m = await import('./js/app.js');
             window.__order = [];
             const latestOn = m.engine.latestOn.bind(m.engine);
             m.engine.latestOn = (...a) => { window.__order.push('post'); return latestOn(...a); };
             const replace = history.replaceState.bind(history);
             history.replaceState = (...a) => {
               window.__order.push('link');
               return replace(...a);
             };
             m.controllers.get('motion').onShown(() => window.__order.push('shown'));
           }"""
    )


def _posts(page) -> int:
    return page.evaluate("() => window.__order.filter((e) => e === 'post').length")


def test_edit_posts_its_request_before_the_link_is_written(page, base_url):
    """An edit's request reaches the engine before the address bar is touched; a burst of input
    and its result write the link once, after they pause; the page losing focus (as when the
    address bar is clicked) writes a due link at once."""
    _open_recording(page, base_url)
    before = int(page.locator("#panel-motion").get_attribute("data-updates"))
    page.evaluate(
        """() => {
             const box = document.getElementById('panel-motion');
             const input = box.querySelector('[data-field="particle_density"] input');
             for (const v of ['2', '2.7', '2.75']) {
               input.value = v;
               input.dispatchEvent(new Event('input', {bubbles: true}));
             }
           }"""
    )
    _wait_updates(page, "motion", before + 1)
    page.wait_for_function("() => location.hash.includes('particle_density=2.75')")
    _settled(page)
    order = page.evaluate("() => window.__order")
    assert order[0] == "post", order  # the request first
    assert order.count("link") == 1, order  # one write for the burst and its result
    assert "particle_density=2.75" in page.url
    # an edit, then the page loses focus: the link is written at once, in the same task
    before = int(page.locator("#panel-motion").get_attribute("data-updates"))
    written = page.evaluate(
        """() => {
             const box = document.getElementById('panel-motion');
             const input = box.querySelector('[data-field="particle_density"] input');
             input.value = '3.25';
             input.dispatchEvent(new Event('input', {bubbles: true}));
             const before = location.hash.includes('particle_density=3.25');
             window.dispatchEvent(new Event('blur'));
             return [before, location.hash.includes('particle_density=3.25')];
           }"""
    )
    assert written == [False, True], written
    _wait_updates(page, "motion", before + 1)
    _settled(page)


def test_one_request_per_new_value(page, base_url):
    """Typing asks the engine once per new value; leaving the field (its "change") and a select's
    "change" after its "input" ask nothing more; a unit chosen is a new request."""
    _open_recording(page, base_url)
    field = page.locator("#panel-motion").get_by_label("Particle density", exact=True)
    field.fill("2.5")
    _settled(page)
    assert _posts(page) == 1
    field.press("Tab")  # leaving the field raises "change" with the same value
    page.wait_for_timeout(300)
    _settled(page)
    assert _posts(page) == 1
    unit = page.locator('#panel-motion [data-field="particle_density"] select')
    unit.select_option(index=1)  # the browser raises "input" and "change" for the one choice
    _settled(page)
    page.wait_for_timeout(300)
    assert _posts(page) == 2


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


def test_axis_titles_and_readouts_name_their_series(page, base_url):
    page.goto(base_url)
    wait_ready(page)
    _wait_updates(page, "motion", 1)
    got = page.evaluate(
        """() => {
        const chart = Chart.getChart(document.querySelector('#panel-motion canvas'));
        const i = chart.data.datasets.findIndex((d) => d.label === 'This particle');
        const el = chart.getDatasetMeta(i).data[0];
        chart.tooltip.setActiveElements([{datasetIndex: i, index: 0}, {datasetIndex: i, index: 1}],
          {x: el.x, y: el.y});
        chart.update('none');
        return {
          x: chart.options.scales.x.title.text, y: chart.options.scales.y.title.text,
          ticks: chart.scales.x.ticks.map((t) => t.label).filter(Boolean),
          lines: chart.tooltip.body.flatMap((b) => b.lines),
        };
    }"""
    )
    # the ticks carry their units ("1 nm", "10 µm"): no unit in the titles
    assert "nm" in " ".join(got["ticks"]) and "µm" in " ".join(got["ticks"])
    assert got["x"] == "Volume-equivalent diameter"
    assert got["y"] == "Distance in the chosen time"
    lines = got["lines"]
    assert len(lines) == 2, lines
    assert lines[0].startswith("This particle, Brownian displacement: ")
    assert lines[1].startswith("This particle, settling distance: ")


def test_compare_three_particles_against_the_core(page, base_url):
    page.goto(base_url)
    wait_ready(page)
    _wait_updates(page, "motion", 1)
    panel = page.locator("#panel-motion")
    add = panel.get_by_role("button", name="Add a particle to compare")
    add.click()
    b = panel.locator("fieldset.compare-particle").nth(0)
    b.get_by_label("Particle diameter", exact=True).fill("3")
    b.get_by_label("Particle diameter unit").select_option("um")
    b.get_by_label("Particle density", exact=True).fill("2.2")
    add.click()
    c = panel.locator("fieldset.compare-particle").nth(1)
    c.get_by_label("Particle diameter", exact=True).fill("20")
    c.get_by_label("Particle diameter unit").select_option("nm")
    assert not add.is_visible()  # three particles at most
    page.wait_for_function(
        "() => document.querySelectorAll('#panel-motion .compare-table th[scope=col]').length === 4"
        " && [...document.querySelectorAll('#panel-motion .compare-table td[data-particle=C]')]"
        ".some((td) => td.textContent.startsWith('20 nm'))"
    )
    _settled(page)
    shown = {
        letter: {
            row.get_attribute("data-compare"): row.locator(
                f"td[data-particle={letter}]"
            ).inner_text()
            for row in panel.locator(".compare-table tbody tr").all()
        }
        for letter in "ABC"
    }
    own = {
        "A": {},
        "B": {
            "particle_diameter": {"value": "3", "unit": "um"},
            "particle_density": {"value": "2.2", "unit": "g/cm3"},
        },
        "C": {"particle_diameter": {"value": "20", "unit": "nm"}},
    }
    # the form's particle (A) keeps the defaults the engine publishes
    fields = api.describe()["calculations"]["motion"]["fields"]
    defaults = {f["name"]: f["default"] for f in fields}
    for letter in "ABC":
        reply = api.handle({"kind": "motion", "inputs": {**defaults, **own[letter]}})
        assert reply["ok"], reply
        for key, text in shown[letter].items():
            row = reply["results"][key]
            if "text" in row:
                assert text == row["text"]
                continue
            m = re.fullmatch(r"(-?[\d.]+(?: × 10[⁻⁰¹²³⁴⁵⁶⁷⁸⁹]+)?)(?: (.*))?", text)
            assert m, text
            value, unit = m.group(1), m.group(2) or ""
            assert parse_shown(value) == pytest.approx(round_sig(row["value"]), rel=1e-12), key
            assert unit == unit_text(row["unit"]), key  # the table's label of the code
    assert len(shown["B"]) >= 10
    labels = page.evaluate(
        "() => Chart.getChart(document.querySelector('#panel-motion canvas'))"
        ".data.datasets.map(d => d.label)"
    )
    assert {"Particle A", "Particle B", "Particle C"} <= set(labels)
    # B has its own density: its curves differ and are drawn; C differs only in size: no
    # second copy of the same curves
    assert any(s.startswith("Particle B: Settling distance") for s in labels), labels
    assert not any(s.startswith("Particle C: ") for s in labels), labels
    screenshot(page, "motion-compare-1280")
    page.set_viewport_size({"width": 375, "height": 800})
    screenshot(page, "motion-compare-375")
    overflow = page.evaluate("() => document.documentElement.scrollWidth - innerWidth")
    assert overflow <= 0
    # a bad size in B: the message sits by B's field, A and C stay computed
    page.set_viewport_size({"width": 1280, "height": 900})
    field = b.get_by_label("Particle diameter", exact=True)
    field.fill("-1")
    error = b.locator(".field[data-field=particle_diameter] .error")
    error.wait_for(state="visible")
    assert "from 0.5 nm to 1 mm" in error.inner_text()
    page.wait_for_function(
        "() => document.querySelectorAll('#panel-motion .compare-table th[scope=col]').length === 3"
    )
    # removing a particle leaves two, relettered
    b.get_by_role("button", name="Remove particle B").click()
    page.wait_for_function(
        "() => document.querySelectorAll('#panel-motion fieldset.compare-particle').length === 1"
        " && document.querySelector('#panel-motion fieldset.compare-particle legend')"
        ".textContent === 'Particle B'"
    )
    assert add.is_visible()


def test_saved_chart_image_carries_title_scenario_and_version(page, base_url):
    page.goto(base_url)
    wait_ready(page)
    _wait_updates(page, "motion", 1)
    page.locator("#panel-motion").get_by_label("Particle density", exact=True).fill("7.8")
    page.wait_for_function("() => location.hash.includes('7.8')")
    _settled(page)
    version = page.locator("#app-version").inner_text()
    assert version
    canvas_height = page.evaluate("() => document.querySelector('#panel-motion canvas').height")
    with page.expect_download() as info:
        page.locator("#panel-motion").get_by_role("button", name="Save chart image").click()
    data = open(info.value.path(), "rb").read()
    text = png_text(data)
    assert text["Title"] == "Diffusion versus settling: distance in the chosen time"
    assert "Particle density 7.8 g/cm³" in text["Description"]
    assert "Particle diameter 100 nm" in text["Description"]
    assert text["Software"] == f"Drift & Dose {version}"
    # the title, scenario and footer are drawn above and below the chart itself
    _width, height = png_size(data)
    assert height > canvas_height + 40
    out = ARTIFACTS / "motion-chart-export.png"
    out.parent.mkdir(exist_ok=True)
    out.write_bytes(data)
