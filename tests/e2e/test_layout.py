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
        # long option texts are not cut (the select is as wide as its longest option or wraps)
        if width == 1280:
            cut = page.evaluate(
                """(pid) => [...document.querySelectorAll('#panel-' + pid + ' select')]
                   .filter(s => s.offsetParent && s.scrollWidth > s.clientWidth + 1)
                   .map(s => s.name || s.id)""",
                panel,
            )
            assert not cut, cut
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
