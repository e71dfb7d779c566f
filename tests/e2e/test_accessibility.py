"""Accessibility and layout: axe-core on every panel, keyboard-only use, 375 px, dark, print."""

from __future__ import annotations

import pytest

from .conftest import ROOT, new_watched_page, screenshot, wait_ready

pytestmark = pytest.mark.e2e

AXE = ROOT / "site" / "node_modules" / "axe-core" / "axe.min.js"


def _panel_ids(page) -> list[str]:
    return page.eval_on_selector_all("[role=tab]", "tabs => tabs.map(t => t.id.slice(4))")


def _open_panel(page, pid: str) -> None:
    page.locator(f"#tab-{pid}").click()
    page.wait_for_function(
        "p => Number(document.getElementById('panel-' + p).dataset.updates || 0) >= 1 && "
        "!document.getElementById('panel-' + p).hasAttribute('aria-busy')",
        arg=pid,
    )


@pytest.fixture
def axe_page(browser, base_url):
    # axe is injected as a script, which the page's Content-Security-Policy rightly forbids;
    # this context alone bypasses the CSP so the checker can run
    context, page, watch = new_watched_page(
        browser, base_url, bypass_csp=True, viewport={"width": 1280, "height": 900}
    )
    yield page
    context.close()
    assert not watch.outside and not watch.errors, (watch.outside, watch.errors)


@pytest.mark.parametrize("scheme", ["light", "dark"])
def test_axe_reports_no_serious_violation_on_any_panel(axe_page, base_url, scheme):
    page = axe_page
    page.emulate_media(color_scheme=scheme)
    page.goto(base_url)
    wait_ready(page)
    page.add_script_tag(path=str(AXE))
    found = {}
    for pid in _panel_ids(page):
        _open_panel(page, pid)
        result = page.evaluate(
            """async () => {
                 const r = await axe.run(document, {resultTypes: ['violations']});
                 return r.violations.filter(v => ['serious', 'critical'].includes(v.impact))
                   .map(v => ({id: v.id, impact: v.impact, help: v.help,
                               nodes: v.nodes.slice(0, 3).map(n => n.target.join(' '))}));
               }"""
        )
        if result:
            found[pid] = result
        if pid == "shift":
            # the shift panel has results only once a file is read: its invented demo
            before = page.evaluate(
                "() => Number(document.getElementById('panel-shift').dataset.updates)"
            )
            page.get_by_role("button", name="Invented demo: a workshop shift").click()
            page.wait_for_function(
                "n => { const s = document.getElementById('panel-shift');"
                " return Number(s.dataset.updates) > n && s.dataset.state === 'ok'; }",
                arg=before,
                timeout=120_000,
            )
        # results kept but marked out of date must stay readable (contrast) too
        field = page.locator(f"#panel-{pid} input[inputmode=decimal]:visible").first
        good = field.input_value()
        field.fill("not a number")
        page.locator(f"#panel-{pid} .stale-note").wait_for(state="visible")
        stale = page.evaluate(
            """async () => {
                 const r = await axe.run(document, {resultTypes: ['violations']});
                 return r.violations.filter(v => ['serious', 'critical'].includes(v.impact))
                   .map(v => ({id: v.id, impact: v.impact,
                               nodes: v.nodes.slice(0, 3).map(n => n.target.join(' '))}));
               }"""
        )
        if stale:
            found[f"{pid} (out of date)"] = stale
        field.fill(good)
        page.locator(f"#panel-{pid} .stale-note").wait_for(state="hidden")
    assert not found, found


def test_keyboard_only_walk_completes_every_calculation(page, base_url):
    page.goto(base_url)
    wait_ready(page)
    ids = _panel_ids(page)
    page.wait_for_function(
        "() => Number(document.getElementById('panel-motion').dataset.updates || 0) >= 1"
    )
    # reach the tab list from the top of the page by Tab alone
    page.keyboard.press("Tab")  # skip link
    for _ in range(12):
        page.keyboard.press("Tab")
        if page.evaluate("() => document.activeElement.getAttribute('role')") == "tab":
            break
    assert page.evaluate("() => document.activeElement.id") == f"tab-{ids[0]}"
    for index, pid in enumerate(ids):
        if index:
            page.keyboard.press("ArrowRight")
            assert page.evaluate("() => document.activeElement.id") == f"tab-{pid}"
        section = page.locator(f"#panel-{pid}")
        assert section.is_visible()
        before = int(section.get_attribute("data-updates") or 0)
        # Tab into the panel until a text input has focus, then change its value by typing
        for _ in range(40):
            page.keyboard.press("Tab")
            ok = page.evaluate(
                "p => { const a = document.activeElement;"
                " return a && a.tagName === 'INPUT' && a.type === 'text' &&"
                " document.getElementById('panel-' + p).contains(a); }",
                pid,
            )
            if ok:
                break
        assert ok, f"no text input reached by keyboard in {pid}"
        value = page.evaluate("() => document.activeElement.value")
        page.keyboard.press("End")
        page.keyboard.type("0" if "." in value or value in ("", "0") else ".5")
        page.wait_for_function(
            "([p, n]) => Number(document.getElementById('panel-' + p).dataset.updates || 0) > n",
            arg=[pid, before],
        )
        assert section.get_attribute("data-state") in ("ok", "invalid")
        # back to the tab list with Shift+Tab is long; focus the selected tab as a user would
        # by pressing Shift+Tab until a tab is reached
        for _ in range(80):
            page.keyboard.press("Shift+Tab")
            if page.evaluate("() => document.activeElement.getAttribute('role')") == "tab":
                break
        assert page.evaluate("() => document.activeElement.id") == f"tab-{pid}"


def test_narrow_screen_has_no_horizontal_scroll_and_all_controls_reachable(browser, base_url):
    context, page, watch = new_watched_page(
        browser, base_url, viewport={"width": 375, "height": 800}
    )
    try:
        page.goto(base_url)
        wait_ready(page)
        for pid in _panel_ids(page):
            _open_panel(page, pid)
            width = page.evaluate("() => document.documentElement.scrollWidth")
            assert width <= 375, f"{pid}: page is {width} px wide"
            outside = page.evaluate(
                """p => [...document.querySelectorAll(
                      `#panel-${p} input, #panel-${p} select, #panel-${p} button,
                       .record-tools button, .record-tools label, [role=tab]`)]
                    .filter(e => e.offsetParent !== null)
                    .map(e => [e.id || e.name || e.textContent.trim().slice(0, 30),
                               e.getBoundingClientRect()])
                    .filter(([, r]) => r.left < -0.5 || r.right > 375.5)
                    .map(([n, r]) => `${n}: ${Math.round(r.left)}..${Math.round(r.right)}`)""",
                pid,
            )
            assert not outside, f"{pid}: controls outside the screen: {outside}"
            screenshot(page, f"narrow-{pid}")
    finally:
        context.close()
    assert not watch.errors and not watch.outside


def test_dark_mode_and_print_by_screenshot(browser, base_url):
    context, page, watch = new_watched_page(
        browser, base_url, color_scheme="dark", viewport={"width": 1280, "height": 900}
    )
    try:
        page.goto(base_url)
        wait_ready(page)
        page.wait_for_function(
            "() => Number(document.getElementById('panel-motion').dataset.updates || 0) >= 1"
        )
        background = page.evaluate("() => getComputedStyle(document.body).backgroundColor")
        channels = [int(c) for c in background[background.index("(") + 1 : -1].split(",")[:3]]
        assert sum(channels) / 3 < 60, background  # a dark page
        ink = page.evaluate("() => getComputedStyle(document.body).color")
        assert sum(int(c) for c in ink[ink.index("(") + 1 : -1].split(",")[:3]) / 3 > 180
        screenshot(page, "dark-motion")
        page.evaluate("() => window.dispatchEvent(new Event('beforeprint'))")
        page.emulate_media(media="print")
        assert page.locator("#report").is_visible()
        screenshot(page, "print-report")
    finally:
        context.close()
    assert not watch.errors and not watch.outside
