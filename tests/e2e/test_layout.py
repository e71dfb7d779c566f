"""Layout at phone, tablet and desktop widths: no horizontal page overflow, no word or unit broken
inside, tables that reflow (scrolling sideways with the first column whole), results reachable at
once, long option texts not cut. Screenshots of every panel at every width go to test-artifacts/.
"""

from __future__ import annotations

import re

import pytest

from .conftest import ARTIFACTS, new_watched_page, screenshot, wait_ready

pytestmark = pytest.mark.e2e

WIDTHS = (320, 375, 768, 1280)
NARROW = 832  # 52rem: below it the inputs and results stack

# Words laid out on more than one line (a word or unit broken inside, "tub e", "n m"), in the
# visible text of the page.
BROKEN_WORDS_JS = """
(root) => {
  const out = [];
  const walker = document.createTreeWalker(root, NodeFilter.SHOW_TEXT);
  for (let node = walker.nextNode(); node; node = walker.nextNode()) {
    const parent = node.parentElement;
    const skip = '[hidden], script, style, option, .visually-hidden, canvas';
    if (!parent || parent.closest(skip)) continue;
    if (!parent.getClientRects().length) continue;
    // a line may end after the hyphen of a compound ("volume-" / "equivalent"), as in print
    for (const m of node.data.matchAll(/[^\\s\\u200b-]+/g)) {
      const range = document.createRange();
      range.setStart(node, m.index);
      range.setEnd(node, m.index + m[0].length);
      const rects = [...range.getClientRects()].filter(r => r.width > 0);
      const tops = new Set(rects.map(r => Math.round(r.top)));
      if (tops.size > 1) out.push(m[0]);
    }
  }
  return out;
}
"""


# Selects whose closed box cannot show their longest option in full. Each shown select is
# measured against a copy of itself sized by the browser to its options (width auto, same place,
# same font): the copy's width is what the longest option text needs with the select's own
# padding and arrow. Returns {measured, cut: [{name, have, need, longest}]}.
SELECT_CUT_JS = """
(scope) => {
  const cut = [];
  let measured = 0;
  for (const s of document.querySelectorAll(scope + ' select')) {
    if (!s.offsetParent || !s.options.length) continue;
    const probe = s.cloneNode(true);
    probe.removeAttribute('id');
    probe.removeAttribute('name');
    probe.style.cssText = 'position:absolute; visibility:hidden; left:0; top:0;'
      + ' width:auto; min-width:0; max-width:none; flex:none;';
    s.parentElement.append(probe);
    const need = probe.getBoundingClientRect().width;
    probe.remove();
    const have = s.getBoundingClientRect().width;
    measured += 1;
    if (have + 0.5 < need) {
      const longest = [...s.options].map(o => o.text).sort((a, b) => b.length - a.length)[0];
      cut.push({name: s.name || s.id || s.getAttribute('aria-label'), have, need, longest});
    }
  }
  return {measured, cut};
}
"""


def _open(browser, base_url, width: int, fragment: str, demo: str | None = None):
    context, page, watch = new_watched_page(
        browser, base_url, viewport={"width": width, "height": 800}
    )
    page.goto(base_url + fragment)
    wait_ready(page)
    page.wait_for_function(
        "() => [...document.querySelectorAll('.panel')].every(p =>"
        " Number(p.dataset.updates || 0) >= 1 && !p.hasAttribute('aria-busy'))"
    )
    if demo:
        pid = re.search(r"panel=(\w+)", fragment).group(1)
        before = int(page.locator(f"#panel-{pid}").get_attribute("data-updates"))
        page.get_by_role("button", name=re.compile(demo)).click()
        page.wait_for_function(
            "([pid, n]) => { const s = document.getElementById('panel-' + pid);"
            " return Number(s.dataset.updates || 0) > n && !s.hasAttribute('aria-busy'); }",
            arg=[pid, before],
        )
    return context, page, watch


def _view(page, name: str) -> None:
    """Save what the window shows (not the full page) under test-artifacts/."""
    ARTIFACTS.mkdir(exist_ok=True)
    page.screenshot(path=str(ARTIFACTS / f"{name}.png"))


CASES = {
    "motion": ("#v=1&panel=motion", None),
    "deposition": ("#v=1&panel=deposition", "Invented demo: metal fume"),
    "sampling": ("#v=1&panel=sampling", "Short line with a respirable"),
}


@pytest.mark.parametrize("width", WIDTHS)
@pytest.mark.parametrize("panel", list(CASES))
def test_layout_at_width(browser, base_url, panel, width):
    fragment, demo = CASES[panel]
    context, page, watch = _open(browser, base_url, width, fragment, demo)
    try:
        # no horizontal overflow of the page itself (tables scroll inside their own box)
        overflow = page.evaluate(
            "() => document.documentElement.scrollWidth - document.documentElement.clientWidth"
        )
        assert overflow <= 0, f"page is {overflow}px wider than the window"
        broken = page.evaluate(BROKEN_WORDS_JS, page.locator("main").element_handle())
        assert not broken, f"words broken inside at {width}px: {broken[:12]}"
        # a table wider than its box scrolls sideways; its first column stays whole
        for box in page.locator(f"#panel-{panel} .table-box").all():
            if not box.is_visible():
                continue
            first = box.locator("tbody th[scope=row]").first
            if first.count():
                assert first.evaluate("e => e.scrollWidth <= e.clientWidth + 1")
            # from 375 px a quantity / value / unit table fits whole: a result given as words
            # wraps rather than pushing the unit column out of view (at 320 px long numbers may
            # still make it scroll, its first column staying in place)
            fits = box.evaluate(
                "b => { const t = b.querySelector('table'); const body = t && t.tBodies[0];"
                " const cols = body && body.rows[0] ? body.rows[0].cells.length : 0;"
                " return cols > 3 || b.scrollWidth <= b.clientWidth + 1; }"
            )
            assert fits or width < 375, f"a three-column results table scrolls at {width}px"
        # long option texts are not cut: every shown select is at least as wide as the same
        # select sized to its longest option (measured, see SELECT_CUT_JS)
        if width == 1280:
            selects = page.evaluate(SELECT_CUT_JS, f"#panel-{panel}")
            assert selects["measured"] >= 3, selects
            assert not selects["cut"], selects["cut"]
        jump = page.locator(f"#panel-{panel} .jump-results")
        if width < NARROW:
            # results reachable at once: a jump button at the top of the panel
            assert jump.is_visible()
            top = jump.bounding_box()["y"]
            assert top < 800 * 2, f"jump button {top}px down"
            jump.click()
            page.wait_for_function(
                "pid => { const r = document.querySelector('#panel-' + pid + ' .outputs')"
                ".getBoundingClientRect(); return r.top >= -2 && r.top < 120; }",
                arg=panel,
            )
            focused = page.evaluate("() => document.activeElement.className")
            assert "outputs" in focused
            _view(page, f"layout-{panel}-{width}-results")
            # the region and stage tables, where the first column must stay whole
            table = page.locator(f"#panel-{panel} .table-box").nth(1)
            if table.count():
                table.scroll_into_view_if_needed()
                _view(page, f"layout-{panel}-{width}-table")
            page.evaluate("() => window.scrollTo(0, 0)")
            _view(page, f"layout-{panel}-{width}-top")
        else:
            assert not jump.is_visible()
        screenshot(page, f"layout-{panel}-{width}")
    finally:
        context.close()
    assert not watch.outside, watch.outside
    assert not watch.errors, watch.errors


def test_default_chain_is_labelled_as_an_example_until_edited(page, base_url):
    page.goto(base_url + "#v=1&panel=sampling")
    wait_ready(page)
    note = page.locator("#panel-sampling .chain-example")
    assert note.is_visible() and note.inner_text().startswith("Example chain")
    page.locator("#panel-sampling fieldset.stage").first.get_by_label(
        "Tube length", exact=True
    ).fill("3")
    assert not note.is_visible()


def test_select_measure_finds_a_cut_option(page, base_url):
    """The measure of long option texts can fail: a select squeezed below its longest option is
    reported, the same select at its natural width is not."""
    page.set_viewport_size({"width": 1280, "height": 800})
    page.goto(base_url + "#v=1&panel=deposition")
    wait_ready(page)
    model = page.locator("#panel-deposition select[name=model]")
    model.wait_for(state="visible")
    model.evaluate("s => { s.style.width = 'auto'; s.style.flex = 'none'; }")
    assert page.evaluate(SELECT_CUT_JS, "#panel-deposition")["cut"] == [] or all(
        c["name"] != "model" for c in page.evaluate(SELECT_CUT_JS, "#panel-deposition")["cut"]
    )
    model.evaluate("s => { s.style.width = '80px'; }")
    cut = page.evaluate(SELECT_CUT_JS, "#panel-deposition")["cut"]
    squeezed = [c for c in cut if c["name"] == "model"]
    assert squeezed and squeezed[0]["have"] == pytest.approx(80, abs=1)
    assert squeezed[0]["need"] > 200
