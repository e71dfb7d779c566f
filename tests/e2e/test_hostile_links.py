"""Links and files from someone else: they cannot rewrite results, stop the page, freeze a
panel or half-apply; a dead engine is reported and restarted with the inputs kept; the last file
chosen wins; the notice about a link or file stands at the top of the page.

Every case checks what a person sees (the notice, the status line, the results) and that the
page still computes afterwards. The page-side reading itself is unit-tested in tests/js/
(``tests/js/test_node.py`` runs those tests).
"""

from __future__ import annotations

import json
from pathlib import Path
from urllib.parse import quote

import pytest

from .conftest import ARTIFACTS, ROOT, new_watched_page, wait_ready
from .helpers import table_values

pytestmark = pytest.mark.e2e

FORMAT = "drift-and-dose-inputs"

# the shared prototypes' own names, and what a fresh object shows for the keys the links try
PROTOTYPE_CHECK = """
() => ({
  names: Object.getOwnPropertyNames(Object.prototype).sort().join(','),
  arrayNames: Object.getOwnPropertyNames(Array.prototype).sort().join(','),
  probes: ['text', 'unit', 'value', 'label', 'curves', 'target', 'name', 'x', 'rows', 'results']
    .filter((k) => ({})[k] !== undefined || [][k] !== undefined),
  toStringIsNative: ({}).toString === Object.prototype.toString
    && String(Object.prototype.toString).includes('[native code]'),
})
"""


def _updates(page, pid: str) -> int:
    return page.evaluate(
        "pid => Number(document.getElementById('panel-' + pid).dataset.updates || 0)", pid
    )


def _computed(page, pid: str = "motion", more_than: int = 0) -> None:
    page.wait_for_function(
        "([pid, n]) => { const s = document.getElementById('panel-' + pid);"
        " return Number(s.dataset.updates || 0) > n && !s.hasAttribute('aria-busy'); }",
        arg=[pid, more_than],
        timeout=60_000,
    )


def _open(page, url: str) -> None:
    page.goto(url)
    wait_ready(page)
    _computed(
        page,
        page.evaluate(
            "() => document.querySelector('[role=tab][aria-selected=true]').id.replace('tab-', '')"
        ),
    )


def _notice(page) -> str:
    box = page.locator("#link-notice")
    return box.inner_text() if box.is_visible() else ""


def _still_computes(page, pid: str = "motion") -> None:
    """The page is usable: the engine is ready and an edit updates the panel's results."""
    page.evaluate("pid => document.getElementById('tab-' + pid).click()", pid)
    assert page.evaluate("() => document.documentElement.dataset.engine") == "ready"
    before = _updates(page, pid)
    if pid == "motion":
        page.locator("#panel-motion").get_by_label("Particle diameter", exact=True).fill("250")
        page.wait_for_function(
            "() => document.querySelector('#panel-motion"
            " [data-key=volume_equivalent_diameter] td')?.textContent === '250'",
            timeout=30_000,
        )
    _computed(page, pid, before)
    assert (
        page.evaluate("pid => document.getElementById('panel-' + pid).dataset.state", pid) == "ok"
    )


# --- links cannot rewrite results -----------------------------------------------------------

FORGED = "FORGED-VALUE-42"
REWRITING_LINKS = {
    "proto-text": f"__proto__.text={FORGED}",
    "constructor-prototype-text": f"constructor.prototype.text={FORGED}",
    "proto-json-target": "__proto__.target_curve=" + quote('j:{"x":[1,2],"y":[0.5,0.5]}'),
    "proto-rows": "__proto__.rows=" + quote(f'j:[{{"diameter":1,"label":"{FORGED}"}}]'),
    "motion-proto": f"motion.__proto__={FORGED}",
    "encoded-proto": f"%5F%5Fproto%5F%5F.text={FORGED}",
}


@pytest.mark.parametrize("case", list(REWRITING_LINKS), ids=list(REWRITING_LINKS))
def test_link_cannot_rewrite_shown_results(page, base_url, case):
    clean = page.context.new_page()
    clean.goto(base_url)
    wait_ready(clean)
    fresh = clean.evaluate(PROTOTYPE_CHECK)
    clean.close()
    _open(page, f"{base_url}#v=1&panel=motion&{REWRITING_LINKS[case]}&motion.time=2~s")
    assert page.evaluate(PROTOTYPE_CHECK) == fresh
    shown = page.evaluate("() => document.body.innerText")
    assert FORGED not in shown.replace(_notice(page), "")
    values = table_values(page, "motion")
    assert values and all(FORGED not in v for v, _ in values.values())
    notice = _notice(page)
    assert "they were refused: " in notice, notice
    key = REWRITING_LINKS[case].split("=")[0].replace("%5F", "_")
    assert key in notice, (key, notice)
    _still_computes(page)


def test_single_file_link_cannot_rewrite_results(browser, dist_dir: Path, build_module, tmp_path):
    target = tmp_path / build_module.SINGLE_NAME
    build_module.build_single_file(target, dist_dir)
    context = browser.new_context(offline=True, viewport={"width": 1280, "height": 900})
    errors: list[str] = []
    try:
        page = context.new_page()
        page.on("console", lambda m: m.type == "error" and errors.append(m.text))
        page.on("pageerror", lambda e: errors.append(str(e)))
        fresh_page = context.new_page()
        fresh_page.goto(target.as_uri())
        wait_ready(fresh_page)
        fresh = fresh_page.evaluate(PROTOTYPE_CHECK)
        fresh_page.close()
        _open(page, f"{target.as_uri()}#v=1&__proto__.text={FORGED}&motion.time=2~s")
        assert page.evaluate(PROTOTYPE_CHECK) == fresh
        assert FORGED not in " ".join(v for v, _ in table_values(page, "motion").values())
        assert "__proto__.text" in _notice(page)
        _still_computes(page)
        assert not errors, errors
    finally:
        context.close()


# --- links that stopped the page ------------------------------------------------------------

STOPPING_LINKS = [
    "constructor.name=x",
    "constructor.prototype=x",
    "__proto__.__proto__=" + quote("j:{}"),
    "__proto__.unit=furlong",
    "__proto__.toString=x",
]


@pytest.mark.parametrize("link", STOPPING_LINKS, ids=[s.split("=")[0] for s in STOPPING_LINKS])
def test_refused_link_leaves_a_working_page(page, base_url, link):
    _open(page, f"{base_url}#v=1&{link}")
    assert page.evaluate("() => document.documentElement.dataset.engine") == "ready"
    assert link.split("=")[0] in _notice(page)
    for pid in ("motion", "deposition", "sampling"):
        page.evaluate("pid => document.getElementById('tab-' + pid).click()", pid)
        _computed(page, pid)
        assert (
            page.evaluate("pid => document.getElementById('panel-' + pid).dataset.state", pid)
            == "ok"
        )
    _still_computes(page)


# --- deep structures ------------------------------------------------------------------------


def _deep(n: int) -> str:
    return "[" * n + "]" * n


@pytest.mark.parametrize(
    "fragment",
    [
        "deposition.modes=" + quote("j:" + _deep(5000)),
        "deposition.modes=" + quote('j:[{"basis":"count","median":' + _deep(3000) + "}]"),
        "sampling.stages=" + quote('j:[{"type":"tube","length":' + _deep(3000) + "}]"),
    ],
    ids=["modes-5000-deep", "mode-3000-deep", "stage-3000-deep"],
)
def test_deep_link_is_refused_and_page_computes(page, base_url, fragment):
    _open(page, f"{base_url}#v=1&panel=deposition&{fragment}")
    notice = _notice(page)
    assert notice.startswith("This link was refused: it is nested more than"), notice
    for pid in ("deposition", "sampling", "motion"):
        page.evaluate("pid => document.getElementById('tab-' + pid).click()", pid)
        _computed(page, pid)
        assert not page.evaluate(
            "pid => document.getElementById('panel-' + pid).hasAttribute('aria-busy')", pid
        )
    _still_computes(page)


def test_deep_inputs_file_is_refused_and_page_computes(page, base_url, tmp_path):
    _open(page, base_url)
    path = tmp_path / "deep.json"
    path.write_text(
        '{"format": "drift-and-dose-inputs", "version": 1, "panels": {"deposition": '
        '{"size_source": "lognormal", "modes": ' + _deep(3000) + "}}}"
    )
    page.locator("#load-inputs").set_input_files(str(path))
    page.wait_for_function("() => document.getElementById('tool-message').textContent")
    assert page.locator("#tool-message").inner_text().startswith("Could not load deep.json: ")
    assert "nested more than" in _notice(page)
    _still_computes(page)


def test_failure_to_post_ends_busy_and_marks_results_out_of_date(page, base_url):
    _open(page, base_url)
    shown = table_values(page, "motion")
    # inputs that cannot cross to the worker (a function cannot be cloned)
    page.evaluate(
        "async () => { const m = await import('./js/app.js');"
        " const c = m.controllers.get('motion'); c.inputs = () => ({ f: () => 1 }); }"
    )
    before = _updates(page, "motion")
    page.locator("#panel-motion").get_by_label("Particle diameter", exact=True).fill("7")
    _computed(page, "motion", before)
    section = page.locator("#panel-motion")
    assert section.get_attribute("aria-busy") is None
    assert page.locator("#panel-motion .stale-note").is_visible()
    message = page.locator("#panel-motion .form-message").inner_text()
    assert "could not be sent to the calculation engine" in message, message
    assert table_values(page, "motion") == shown  # the earlier results, marked out of date
    # and a value too deep to post is refused before posting, with the same outcome
    page.evaluate(
        "async () => { const m = await import('./js/app.js');"
        " const c = m.controllers.get('motion'); let v = [];"
        " for (let i = 0; i < 5000; i++) v = [v]; c.inputs = () => ({ deep: v }); }"
    )
    before = _updates(page, "motion")
    page.locator("#panel-motion").get_by_label("Particle diameter", exact=True).fill("8")
    _computed(page, "motion", before)
    message = page.locator("#panel-motion .form-message").inner_text()
    assert "Not sent to the calculation engine: the inputs are nested more than" in message


# --- a refused inputs file changes nothing --------------------------------------------------


def _all_states(page) -> dict:
    return page.evaluate(
        "async () => { const m = await import('./js/app.js'); const out = {};"
        " for (const [pid, c] of m.controllers) out[pid] = c.getState();"
        " return JSON.parse(JSON.stringify(out)); }"
    )


@pytest.mark.parametrize(
    "content",
    [
        # applied panel by panel before, then failed on the version: half a file was loaded
        {
            "format": FORMAT,
            "version": {"toString": 1, "valueOf": 2},
            "panels": {"motion": {"time": {"value": "7", "unit": "s"}}},
        },
        {
            "format": FORMAT,
            "version": 1,
            "panels": {
                "motion": {"time": {"value": "7", "unit": "s"}},
                "sampling": {"stages": "@@deep@@"},
            },
        },
    ],
    ids=["version-object", "deep-after-good"],
)
def test_refused_inputs_file_changes_nothing(page, base_url, tmp_path, content):
    _open(page, base_url)
    before = _all_states(page)
    path = tmp_path / "bad.json"
    path.write_text(json.dumps(content).replace('"@@deep@@"', _deep(3000)))
    page.locator("#load-inputs").set_input_files(str(path))
    page.wait_for_function("() => document.getElementById('tool-message').textContent")
    message = page.locator("#tool-message").inner_text()
    assert message.startswith("Could not load bad.json: "), message
    assert _all_states(page) == before
    assert "Nothing was changed" in _notice(page)
    _still_computes(page)


# --- smaller --------------------------------------------------------------------------------


def test_link_without_version_and_anchor(page, base_url):
    _open(page, f"{base_url}#motion.time=2~s")
    notice = _notice(page)
    assert "null" not in notice and "another version" not in notice, notice
    assert "does not say which format" in notice
    page.goto(f"{base_url}#main")
    page.reload()
    wait_ready(page)
    assert _notice(page) == ""


def test_later_refusal_replaces_earlier_notice(page, base_url, tmp_path):
    _open(page, f"{base_url}#v=1&motion.nofield=1&motion.time=2~s")
    assert "motion.nofield" in _notice(page)
    path = tmp_path / "other.json"
    path.write_text(json.dumps({"format": "something-else", "panels": {}}))
    page.locator("#load-inputs").set_input_files(str(path))
    page.wait_for_function("() => document.getElementById('tool-message').textContent")
    notice = _notice(page)
    assert "motion.nofield" not in notice, notice
    assert notice.startswith("The file other.json was refused"), notice


def test_notice_stands_at_the_top(browser, base_url):
    for width in (375, 1280):
        context, page, watch = new_watched_page(
            browser, base_url, viewport={"width": width, "height": 800}
        )
        try:
            _open(page, f"{base_url}#v=1&panel=sampling&__proto__.text=x&sampling.nothing=1")
            notice = page.locator("#link-notice").bounding_box()
            tabs = page.locator("#panel-tabs").bounding_box()
            assert notice is not None and notice["y"] < tabs["y"]
            assert notice["y"] + notice["height"] <= 800, "the notice is below the first screen"
            assert notice["x"] >= 0 and notice["x"] + notice["width"] <= width
            ARTIFACTS.mkdir(exist_ok=True)
            page.screenshot(path=str(ARTIFACTS / f"link-notice-{width}.png"))
            assert not watch.errors, watch.errors
        finally:
            context.close()


def test_installed_lock_is_not_served(dist_dir: Path):
    assert (ROOT / "site" / ".installed-lock").exists(), "bash .ci/setup writes it"
    assert not (dist_dir / ".installed-lock").exists()
    urls = [f["url"] for f in json.loads((dist_dir / "precache.json").read_text())["files"]]
    assert not [u for u in urls if "installed-lock" in u or u.startswith("tests/")]


# --- a link pasted into the open page -------------------------------------------------------
# Only the part after "#" differs, so the browser stays on the page (a "hashchange"): the link
# must be read like one opened anew, never ignored while the address bar shows it.


def _paste(page, fragment: str) -> None:
    page.evaluate("f => { location.hash = f; }", fragment)


def _shown_tab(page) -> str:
    return page.evaluate(
        "() => document.querySelector('[role=tab][aria-selected=true]').id.replace('tab-', '')"
    )


def test_link_pasted_into_open_page_is_applied(page, base_url):
    _open(page, base_url)
    assert _shown_tab(page) == "motion"
    before = _updates(page, "sampling")
    _paste(page, "#v=1&panel=sampling&motion.time=7~s&sampling.flow=3.5~L/min")
    _computed(page, "sampling", before)
    assert _shown_tab(page) == "sampling"
    states = _all_states(page)
    assert states["motion"]["time"] == {"value": "7", "unit": "s"}
    assert states["sampling"]["flow"] == {"value": "3.5", "unit": "L/min"}
    assert _notice(page) == ""
    _still_computes(page)


def test_anchor_in_open_page_changes_nothing(page, base_url):
    _open(page, f"{base_url}#v=1&motion.nofield=1&motion.time=2~s")
    notice = _notice(page)
    before = _all_states(page)
    _paste(page, "#main")
    page.wait_for_timeout(600)  # longer than the page's quiet spell before it writes its link
    assert _all_states(page) == before
    assert _notice(page) == notice


@pytest.mark.parametrize(
    "fragment, says",
    [
        ("#v=1&panel=deposition&deposition.modes=" + quote("j:" + _deep(5000)), "nested more than"),
        (
            "#v=1&panel=sampling&sampling.stages=" + quote("j:[" + "0," * 100_001 + "0]"),
            "more than 100,000 values",
        ),
    ],
    ids=["deep", "many-values"],
)
def test_refused_link_pasted_into_open_page_changes_nothing(page, base_url, fragment, says):
    _open(page, base_url)
    page.locator("#panel-motion").get_by_label("Particle diameter", exact=True).fill("321")
    _computed(page, "motion")
    before = _all_states(page)
    shown = table_values(page, "motion")
    _paste(page, fragment)
    page.wait_for_function("() => !document.getElementById('link-notice').hidden")
    notice = _notice(page)
    assert notice.startswith("This link was refused: "), notice
    assert says in notice and "Nothing was changed" in notice, notice
    assert _all_states(page) == before
    assert _shown_tab(page) == "motion"
    assert table_values(page, "motion") == shown
    # the address bar is given back the link of what the page shows
    page.wait_for_function(
        "() => location.hash.includes('motion.particle_diameter=321')", timeout=10_000
    )
    assert len(page.evaluate("() => location.hash")) < 20_000
    _still_computes(page)


def test_prototype_keys_pasted_into_open_page_are_refused(page, base_url):
    clean = page.context.new_page()
    clean.goto(base_url)
    wait_ready(clean)
    fresh = clean.evaluate(PROTOTYPE_CHECK)
    clean.close()
    _open(page, base_url)
    before = _updates(page, "motion")
    _paste(
        page, f"#v=1&panel=motion&__proto__.text={FORGED}&constructor.prototype.x=1&motion.time=3~s"
    )
    _computed(page, "motion", before)
    assert page.evaluate(PROTOTYPE_CHECK) == fresh
    assert _all_states(page)["motion"]["time"] == {"value": "3", "unit": "s"}
    notice = _notice(page)
    assert "__proto__.text" in notice and "constructor.prototype.x" in notice, notice
    assert FORGED not in page.evaluate("() => document.body.innerText").replace(notice, "")
    _still_computes(page)


# --- the last file chosen wins --------------------------------------------------------------


def test_last_spectrum_file_chosen_wins(page, base_url, tmp_path):
    _open(page, f"{base_url}#v=1&panel=deposition&deposition.size_source=csv")
    big = tmp_path / "big.csv"
    rows = "\n".join(f"{10 + i * 0.001:.3f},{1000 + i}" for i in range(335_000))
    big.write_text("diameter_nm,dN\n" + rows + "\n")
    assert 4_500_000 < big.stat().st_size < 5 * 1024 * 1024
    small = tmp_path / "small.csv"
    small.write_text("diameter_nm,dN\n20,100\n40,200\n80,50\n")
    field = page.locator("#panel-deposition [data-field=csv_text] input[type=file]")
    # both choices within one task: the big file is still being read when the small one arrives
    handle = field.element_handle()
    page.evaluate(
        """async ([input, big, small]) => {
            const make = (text, name) => new File([text], name, { type: 'text/csv' });
            const pick = (file) => {
              const dt = new DataTransfer(); dt.items.add(file); input.files = dt.files;
              input.dispatchEvent(new Event('change', { bubbles: true }));
            };
            pick(make(big, 'big.csv'));
            pick(make(small, 'small.csv'));
        }""",
        [handle, big.read_text(), small.read_text()],
    )
    page.wait_for_timeout(3000)
    _computed(page, "deposition")
    status = page.locator("#panel-deposition [data-field=csv_text] .file-status").inner_text()
    assert "small.csv" in status, status
    sent = page.evaluate(
        "async () => (await import('./js/app.js')).controllers.get('deposition').inputs().csv_text"
    )
    assert sent == small.read_text()


# --- a dead engine ---------------------------------------------------------------------------


def test_dead_engine_is_reported_and_restarted_with_inputs_kept(page, base_url):
    _open(page, base_url)
    page.locator("#panel-motion").get_by_label("Particle diameter", exact=True).fill("321")
    page.wait_for_function(
        "() => document.querySelector('#panel-motion"
        " [data-key=volume_equivalent_diameter] td')?.textContent === '321'"
    )
    # the worker dies (as when the browser ends it); the page learns it by its silence
    page.evaluate(
        "async () => { const m = await import('./js/app.js'); m.engine.watchdogMs = 1500;"
        " m.engine.worker.terminate(); }"
    )
    page.locator("#panel-motion").get_by_label("Particle diameter", exact=True).fill("654")
    page.wait_for_function(
        "() => document.documentElement.dataset.engine === 'stopped'", timeout=20_000
    )
    status = page.locator("#engine-text").inner_text()
    assert "stopped" in status and "inputs are kept" in status, status
    _computed(page, "motion")
    assert page.locator("#panel-motion .stale-note").is_visible()
    assert "Restart" in page.locator("#panel-motion .form-message").inner_text()
    restart = page.get_by_role("button", name="Restart the engine")
    assert restart.is_visible()
    restart.click()
    wait_ready(page)
    page.wait_for_function(
        "() => document.querySelector('#panel-motion"
        " [data-key=volume_equivalent_diameter] td')?.textContent === '654'",
        timeout=60_000,
    )
    assert not page.locator("#panel-motion .stale-note").is_visible()
    assert (
        page.locator("#panel-motion").get_by_label("Particle diameter", exact=True).input_value()
        == "654"
    )
