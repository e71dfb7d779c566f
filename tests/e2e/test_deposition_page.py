"""The deposition panel in Chromium: lognormal modes, CSV import, demos, link round trip."""

from __future__ import annotations

import pytest

from driftdose import api

from .conftest import ARTIFACTS, new_watched_page, page_link, screenshot, wait_ready
from .helpers import parse_shown, png_text, round_sig
from .test_layout import BROKEN_WORDS_JS

pytestmark = pytest.mark.e2e

PANEL = "#panel-deposition"


def _open(page, base_url: str, fragment: str = "#v=1&panel=deposition") -> None:
    page.goto(base_url + fragment)
    wait_ready(page)
    page.wait_for_function(
        "() => Number(document.getElementById('panel-deposition').dataset.updates || 0) >= 1"
    )


def _settled(page) -> None:
    page.wait_for_function(
        "() => { const s = document.getElementById('panel-deposition');"
        " return !s.hasAttribute('aria-busy') && s.dataset.state; }"
    )


def _region_cells(page) -> dict[str, str]:
    cells = page.locator(f"{PANEL} table.regions td[data-key]")
    return {
        cells.nth(i).get_attribute("data-key"): cells.nth(i).inner_text()
        for i in range(cells.count())
    }


def _assert_cells_match(page, reply: dict) -> int:
    compared = 0
    for key, text in _region_cells(page).items():
        row = reply["results"][key]
        value = text.split(" ", 1)[0] if "×" not in text else text
        assert parse_shown(value) == pytest.approx(round_sig(row["value"]), rel=1e-12), key
        compared += 1
    return compared


def test_lognormal_mode_by_labels_matches_core(page, base_url):
    _open(page, base_url)
    panel = page.locator(PANEL)
    panel.get_by_label(
        "Median diameter: count median (count mode) or mass median (mass mode)", exact=True
    ).fill("80")
    panel.get_by_label("Geometric standard deviation", exact=True).fill("2")
    panel.get_by_label("Particle density", exact=True).fill("2.5")
    panel.get_by_label("Exposure duration", exact=True).fill("6")
    panel.get_by_label("Deposition model").select_option("icrp66")
    page.wait_for_function("() => location.hash.includes('deposition.exposure_duration=6')")
    _settled(page)
    reply = api.handle(
        {
            "kind": "deposition",
            "inputs": {
                "modes": [
                    {
                        "basis": "count",
                        "median": {"value": "80", "unit": "nm"},
                        "gsd": "2",
                        "concentration": {"value": "10000", "unit": "1/cm3"},
                    }
                ],
                "particle_density": {"value": "2.5", "unit": "g/cm3"},
                "exposure_duration": {"value": "6", "unit": "h"},
            },
        }
    )
    assert reply["ok"], reply
    assert _assert_cells_match(page, reply) == 36
    screenshot(page, "deposition-lognormal")


def test_add_second_mode_and_mass_basis(page, base_url):
    _open(page, base_url)
    panel = page.locator(PANEL)
    panel.get_by_role("button", name="Add a mode").click()
    second = panel.locator("fieldset.item").nth(1)
    second.get_by_label("Mode given by").select_option("mass")
    second.get_by_label("The median is a diameter of type").select_option("aerodynamic")
    second.get_by_label(
        "Median diameter: count median (count mode) or mass median (mass mode)", exact=True
    ).fill("5")
    second.get_by_label(
        "Median diameter: count median (count mode) or mass median (mass mode) unit"
    ).select_option("um")
    second.get_by_label(
        "Concentration (number for count modes, mass for mass modes)", exact=True
    ).fill("1")
    second.get_by_label(
        "Concentration (number for count modes, mass for mass modes) unit"
    ).select_option("mg/m3")
    page.wait_for_function("() => location.hash.includes('mg%2Fm3')")
    _settled(page)
    reply = api.handle(
        {
            "kind": "deposition",
            "inputs": {
                "modes": [
                    {
                        "basis": "count",
                        "median": {"value": "50", "unit": "nm"},
                        "gsd": "1.8",
                        "concentration": {"value": "10000", "unit": "1/cm3"},
                    },
                    {
                        "basis": "mass",
                        "median": {"value": "5", "unit": "um"},
                        "diameter_type": "aerodynamic",
                        "gsd": "1.8",
                        "concentration": {"value": "1", "unit": "mg/m3"},
                    },
                ]
            },
        }
    )
    assert reply["ok"], reply
    assert _assert_cells_match(page, reply) == 36


def test_csv_file_import_matches_core(page, base_url, tmp_path):
    text = "size_nm,conc\n20,1000\n30,3000\n50,6000\n80,5000\n120,2500\n200,900\n400,150\n"
    path = tmp_path / "spectrum.csv"
    path.write_text(text)
    _open(page, base_url)
    panel = page.locator(PANEL)
    panel.get_by_label("Size distribution from").select_option("csv")
    panel.get_by_label("Spectrum CSV file").set_input_files(str(path))
    panel.get_by_label("Diameter column").select_option("size_nm")
    panel.get_by_label("Concentration column").select_option("conc")
    panel.get_by_label("Concentration is given").select_option("per_bin")
    page.wait_for_function("() => location.hash.includes('csv_concentration_column=conc')")
    _settled(page)
    reply = api.handle(
        {
            "kind": "deposition",
            "inputs": {
                "size_source": "csv",
                "csv_text": text,
                "csv_diameter_column": "size_nm",
                "csv_concentration_column": "conc",
                "csv_concentration_type": "per_bin",
            },
        }
    )
    assert reply["ok"], reply
    assert _assert_cells_match(page, reply) == 36
    screenshot(page, "deposition-csv")


def test_bad_csv_reports_line_number(page, base_url, tmp_path):
    path = tmp_path / "bad.csv"
    path.write_text("d,n\n10,100\n20,abc\n")
    _open(page, base_url)
    panel = page.locator(PANEL)
    panel.get_by_label("Size distribution from").select_option("csv")
    panel.get_by_label("Spectrum CSV file").set_input_files(str(path))
    error = panel.locator(".field[data-field=csv_text] .error")
    # the empty-file message may show first; wait for the file's own error
    error.filter(has_text="Line 3").wait_for(state="visible")
    assert page.locator(f"{PANEL} .stale-note").is_visible()


def test_demo_loads_with_one_click_and_is_marked_invented(page, base_url):
    _open(page, base_url)
    page.locator(PANEL).get_by_role(
        "button", name="Invented demo: metal fume, two fine modes"
    ).click()
    note = page.locator(f"{PANEL} .demo-note")
    note.wait_for(state="visible")
    assert "Invented demo" in note.inner_text()
    page.wait_for_function("() => location.hash.includes('deposition.demo=demo_fume')")
    _settled(page)
    page.evaluate("() => window.dispatchEvent(new Event('beforeprint'))")
    assert "Invented demo data" in page.locator("#report").inner_text()
    # size ticks carry their units: the size axis title has none; the dose readout names its
    # series and unit
    got = page.evaluate(
        """() => {
        const f = Chart.getChart(document.querySelector('#deposition-fraction-canvas'));
        const d = Chart.getChart(document.querySelector('#deposition-dose-canvas'));
        const el = d.getDatasetMeta(0).data[0];
        d.tooltip.setActiveElements([{datasetIndex: 0, index: 0}], {x: el.x, y: el.y});
        d.update('none');
        return {x: f.options.scales.x.title.text, lines: d.tooltip.body.flatMap((b) => b.lines),
                label: d.data.datasets[0].label};
    }"""
    )
    assert got["x"].startswith("Particle diameter") and "µm" not in got["x"]
    assert got["lines"][0].startswith(got["label"] + ": ")
    with page.expect_download() as info:
        page.locator(PANEL).get_by_role("button", name="Save fraction chart image").click()
    text = png_text(open(info.value.path(), "rb").read())
    assert text["Title"] == "Deposition fraction by region against particle size"
    assert text["Description"].startswith("Invented demo: ")
    assert "Mode 1: by " in text["Description"]
    assert text["Software"] == "Drift & Dose " + page.locator("#app-version").inner_text()


def test_link_round_trip_reproduces_deposition(page, base_url, browser):
    _open(page, base_url)
    page.locator(PANEL).get_by_role(
        "button", name="Invented demo: measured spectrum from CSV"
    ).click()
    page.wait_for_function("() => location.hash.includes('csv_text')")
    _settled(page)
    cells = _region_cells(page)
    url = page.url
    other = browser.new_context()
    try:
        p2 = other.new_page()
        p2.goto(url)
        wait_ready(p2)
        p2.wait_for_function(
            "() => Number(document.getElementById('panel-deposition').dataset.updates || 0) >= 1"
        )
        assert _region_cells(p2) == cells
        assert p2.locator(f"{PANEL} .demo-note").is_visible()
    finally:
        other.close()


def test_mode_error_sits_beside_the_wrong_value_only(page, base_url):
    """A wrong value in one mode is marked where it is: its message beside that value, no
    message on the other values, the other mode or the list as a whole; fixing it clears it."""
    _open(page, base_url)
    panel = page.locator(PANEL)
    panel.get_by_role("button", name="Add a mode").click()
    second = panel.locator("fieldset.item").nth(1)
    second.get_by_label("Geometric standard deviation", exact=True).fill("0,8")
    page.wait_for_function(
        "() => document.getElementById('panel-deposition').dataset.state === 'invalid'"
    )
    _settled(page)
    gsd = second.locator("[data-field=gsd]")
    error = gsd.locator(".error")
    assert error.is_visible()
    assert error.inner_text().startswith("Mode 2: Geometric standard deviation must be greater")
    assert gsd.get_attribute("class").split().count("invalid") == 1
    assert gsd.locator("input").get_attribute("aria-invalid") == "true"
    visible = panel.locator(".field[data-field=modes] .error:visible")
    assert visible.count() == 1  # only the one beside the GSD of mode 2
    first = panel.locator("fieldset.item").nth(0)
    assert first.locator(".invalid").count() == 0
    assert second.locator(".invalid").count() == 1
    screenshot(page, "deposition-mode-error")
    # a thousands separator is refused in a mode as in a plain field, beside the value
    second.get_by_label("Geometric standard deviation", exact=True).fill("1,8")
    second.get_by_label(
        "Median diameter: count median (count mode) or mass median (mass mode)", exact=True
    ).fill("1,000")
    page.wait_for_function(
        "() => [...document.querySelectorAll('#panel-deposition fieldset.item')][1]"
        ".querySelector('[data-field=median] .error').textContent.includes('ambiguous')"
    )
    assert not error.is_visible()
    second.get_by_label(
        "Median diameter: count median (count mode) or mass median (mass mode)", exact=True
    ).fill("100")
    page.wait_for_function(
        "() => document.getElementById('panel-deposition').dataset.state === 'ok'"
    )
    assert panel.locator(".field[data-field=modes] .error:visible").count() == 0


def test_typed_sizes_give_the_api_values_and_a_bad_entry_is_refused(browser, base_url):
    context, page, watch = new_watched_page(
        browser, base_url, viewport={"width": 1280, "height": 900}
    )
    try:
        _open(page, base_url)
        panel = page.locator(PANEL)
        typed = "25 nm; 0,3 µm; 4 µm"  # decimal commas with semicolons between the sizes
        panel.get_by_label("Values at these sizes", exact=True).fill(typed)
        page.wait_for_selector(f"{PANEL} table.sizes-table")
        _settled(page)
        reply = api.handle(
            {"kind": "deposition", "inputs": {"sizes": {"value": typed, "unit": "nm"}}}
        )
        assert reply["ok"], reply
        rows = reply["results"]["sizes_table"]["rows"]
        assert [r["label"] for r in rows] == ["25 nm", "300 nm", "4 µm"]
        names = panel.locator("table.sizes-table thead th").all_inner_texts()[1:]
        assert names == [r["label"] for r in rows]
        compared = 0
        for i, row in enumerate(rows):
            for cell in row["quantities"]:
                if cell["key"] in ("diameter", "aerodynamic"):
                    continue
                where = f"table.sizes-table td[data-key='{cell['key']}'][data-size='{i}']"
                text = panel.locator(where).inner_text()
                assert text.endswith(" %"), text
                assert parse_shown(text[:-2]) == pytest.approx(
                    round_sig(cell["value"]), rel=1e-12
                ), (i, cell["key"])
                compared += 1
        assert compared == 3 * (6 + 4)  # ICRP 66 regions with the total, four conventions
        # ISO 7708:1995 tabulates 50 % respirable at 4 µm aerodynamic (from memory); unit
        # density, so the size typed is the aerodynamic diameter
        respirable = panel.locator("td[data-key='iso7708_respirable'][data-size='2']")
        assert parse_shown(respirable.inner_text()[:-2]) == pytest.approx(50.0, abs=0.05)
        assert "deposition.sizes=" in page_link(page)
        panel.locator(".sizes-box").screenshot(
            path=str(ARTIFACTS / "deposition-sizes-table-1280.png")
        )
        page.set_viewport_size({"width": 375, "height": 800})
        assert page.evaluate("() => document.documentElement.scrollWidth") <= 375
        broken = page.evaluate(BROKEN_WORDS_JS, panel.locator("table.sizes-table").element_handle())
        assert not broken, broken
        panel.locator(".sizes-box").screenshot(
            path=str(ARTIFACTS / "deposition-sizes-table-375.png")
        )
        before = panel.locator("table.sizes-table").inner_text()
        panel.get_by_label("Values at these sizes", exact=True).fill("25 nm; NaN")
        error = panel.locator(".field[data-field=sizes] .error")
        error.wait_for(state="visible")
        assert "not a number" in error.inner_text()
        assert panel.locator(".stale-note").is_visible()
        assert panel.locator("table.sizes-table").inner_text() == before  # nothing changed
        screenshot(page, "deposition-sizes-375")
    finally:
        context.close()
    assert not watch.errors and not watch.outside


# Pixel height of each bar as drawn, against the height its current value has on the drawn
# axis: all equal once the chart shows its data.
_DOSE_BARS_SHOW_DATA = """() => {
    const c = Chart.getChart(document.querySelector('#deposition-dose-canvas'));
    const bars = c.getDatasetMeta(0).data;
    const values = c.data.datasets[0].data;
    return bars.length === values.length
        && bars.every((b, i) => Math.abs(b.y - c.scales.y.getPixelForValue(values[i])) < 0.5);
}"""


def test_chart_out_of_view_is_drawn_when_idle_or_before_printing(page, base_url):
    """The dose chart, below the first screen, is not redrawn within an edit's update; it is
    redrawn when the page is next idle, and at once when the record is printed."""
    _open(page, base_url)
    _settled(page)
    assert page.evaluate(
        "() => document.querySelector('#deposition-dose-canvas').getBoundingClientRect().top"
        " > innerHeight + 300"
    )
    assert page.evaluate(_DOSE_BARS_SHOW_DATA)
    page.evaluate(f"() => {{ window.doseBarsShowData = {_DOSE_BARS_SHOW_DATA}; }}")
    density = page.locator(PANEL).get_by_label("Particle density", exact=True)
    # within the update (before any idle time): the bars still show the earlier values; the
    # printed record asks for the chart's pixels, which draws it first
    got = page.evaluate(
        """(input) => new Promise((resolve) => {
        const shows = window.doseBarsShowData;
        const section = document.getElementById('panel-deposition');
        const before = Number(section.dataset.updates);
        const seen = new MutationObserver(() => {
            if (Number(section.dataset.updates) <= before) return;
            seen.disconnect();
            const during = shows();
            window.dispatchEvent(new Event('beforeprint'));
            resolve({during, printed: shows(), state: section.dataset.state,
                     images: document.querySelectorAll('#report img.report-chart').length});
        });
        seen.observe(section, {attributes: true, attributeFilter: ['data-updates']});
        input.value = '7.5';
        input.dispatchEvent(new Event('input', {bubbles: true}));
    })""",
        density.element_handle(),
    )
    assert got == {"during": False, "printed": True, "state": "ok", "images": 2}
    # an edit without printing: drawn once the page is idle (a hang check, not a timing)
    before = page.evaluate(
        "() => Number(document.getElementById('panel-deposition').dataset.updates)"
    )
    density.fill("2.5")
    page.wait_for_function(
        f"() => Number(document.getElementById('panel-deposition').dataset.updates) > {before}"
    )
    page.wait_for_function(_DOSE_BARS_SHOW_DATA, timeout=10_000)
    page.locator("#deposition-dose-canvas").scroll_into_view_if_needed()
    screenshot(page, "deposition-dose-after-edits-1280")


def test_fraction_chart_keeps_its_layout_and_draws_what_a_new_layout_draws(page, base_url):
    """The fraction chart's axes have fixed bounds: an edit that changes only the curves keeps
    the chart's layout (no axis or legend fitted again), and the pixels are those a fresh
    layout gives; a change of the legend's entries lays it out again."""
    _open(page, base_url)
    _settled(page)
    page.locator("#deposition-fraction-canvas").scroll_into_view_if_needed()
    page.evaluate(
        """() => { const update = Chart.layouts.update; window.fractionLayouts = 0;
        Chart.layouts.update = function (chart, ...rest) {
            if (chart.canvas.id === 'deposition-fraction-canvas') window.fractionLayouts++;
            return update.call(this, chart, ...rest);
        }; }"""
    )
    density = page.locator(PANEL).get_by_label("Particle density", exact=True)
    for value in ("2.5", "4"):
        before = page.evaluate(
            "() => Number(document.getElementById('panel-deposition').dataset.updates)"
        )
        density.fill(value)
        page.wait_for_function(
            f"() => Number(document.getElementById('panel-deposition').dataset.updates) > {before}"
        )
        got = page.evaluate(
            """() => {
            const c = Chart.getChart(document.querySelector('#deposition-fraction-canvas'));
            const kept = {layouts: window.fractionLayouts, image: c.canvas.toDataURL()};
            c.$driftdoseLayout = null;  // forget the key: the next update lays out anew
            c.update('none');
            return {kept, layouts: window.fractionLayouts, image: c.canvas.toDataURL()};
        }"""
        )
        assert got["kept"]["layouts"] == 0, value
        assert got["layouts"] == 1, value
        assert got["kept"]["image"] == got["image"], value
        page.evaluate("() => { window.fractionLayouts = 0; }")
    # a legend entry hidden (as a click on it does): laid out again
    page.evaluate(
        """() => { const c = Chart.getChart(document.querySelector('#deposition-fraction-canvas'));
        c.setDatasetVisibility(0, false); c.update('none'); }"""
    )
    assert page.evaluate("() => window.fractionLayouts") == 1
