"""The shift panel sends a picked file's text to the engine once.

A generated 2-h file at 1 s is picked: the engine keeps its text as it decodes the bytes, so
even the first request names the text by the engine's key (the SHA-256 of its UTF-8 bytes)
instead of carrying it back, as do the requests that follow (a period moved); they give the
same results. An
engine that no longer holds the text (its key made stale here, as after a restart of the
engine's memory) asks for it, the page sends it again and the panel still computes; after
a restart of the worker the text is sent in full. The link still carries no file, and the
saved inputs file still carries the text.
"""

from __future__ import annotations

import hashlib
import json
import urllib.parse
from pathlib import Path

import pytest

from .conftest import page_link, wait_ready

pytestmark = pytest.mark.e2e


def day_file() -> str:
    lines = ["Generated for the test", "Time,Number (1/cm3)"]
    for k in range(2 * 3600):
        n = 4000 + 30_000 * (1800 <= k < 5400) + (k * 7919) % 997
        lines.append(f"2026-03-10 {8 + k // 3600:02d}:{k % 3600 // 60:02d}:{k % 60:02d},{n}")
    return "\n".join(lines) + "\n"


SPY = """() => {
  // every message the page posts to the engine's worker, without its text
  window.__posted = [];
  window.__decodes = [];
  const engine = window.__engine;
  const wrap = (worker) => {
    if (!worker || worker.__spied) return;
    const post = worker.postMessage.bind(worker);
    worker.postMessage = (m) => {
      if (m && m.kind === "shift") {
        window.__posted.push({carries: typeof m.inputs?.series_text === "string",
                              kept: m.kept || null, keep: m.keep || false,
                              drawn: m.inputs?.series_drawn || ""});
      }
      if (m && m.op === "decode") window.__decodes.push({keep: m.keep || false});
      post(m);
    };
    worker.__spied = true;
  };
  wrap(engine.worker);
  window.__wrap = () => wrap(engine.worker);
}"""


def _updates(page) -> int:
    return int(page.locator("#panel-shift").get_attribute("data-updates") or 0)


def _move(page, end_minute: int) -> dict:
    """Move the task's end (as a drag's release) and return the shown task row."""
    before = _updates(page)
    page.evaluate(
        """async (end) => {
             const c = (await import('./js/app.js')).controllers.get('shift');
             const t = c.fields.handles.get('periods');
             t.setSpan(1, {start: 40 * 60, end: 3600 + end * 60});  // from the first reading
             t.changed();
           }""",
        end_minute,
    )
    page.wait_for_function(
        "n => { const s = document.getElementById('panel-shift');"
        " return Number(s.dataset.updates || 0) > n && !s.hasAttribute('aria-busy'); }",
        arg=before,
        timeout=120_000,
    )
    assert page.locator("#panel-shift").get_attribute("data-state") == "ok"
    return page.evaluate(
        """async () => {
             const c = (await import('./js/app.js')).controllers.get('shift');
             const r = c.lastReplyOf().results.tasks.rows[1];
             return {end: r.end, mean: r.mean, readings: r.readings};
           }"""
    )


def test_the_file_goes_once_and_again_when_the_engine_asks(watched, base_url):
    page, _watch = watched
    text = day_file()
    page.goto(base_url + "#v=1&panel=shift")
    wait_ready(page)
    page.evaluate("async () => { window.__engine = (await import('./js/app.js')).engine; }")
    page.evaluate(SPY)
    before = _updates(page)
    page.locator("#panel-shift [data-field=series_text] input[type=file]").set_input_files(
        {"name": "day.csv", "mimeType": "text/csv", "buffer": text.encode("utf-8")}
    )
    page.wait_for_function(
        "n => { const s = document.getElementById('panel-shift');"
        " return Number(s.dataset.updates || 0) > n && s.dataset.state === 'ok'; }",
        arg=before,
        timeout=120_000,
    )
    page.evaluate(
        """async () => {
             const c = (await import('./js/app.js')).controllers.get('shift');
             const t = c.fields.handles.get('periods');
             t.set([{label: 'Background', kind: 'background', start: '08:00', end: '08:20'},
                    {label: 'Task', kind: 'task', start: '08:40', end: '09:10',
                     activity: 'light_exercise', route: 'mixed', protection_factor: '1'}]);
             t.changed();
           }"""
    )
    first = _move(page, 20)
    second = _move(page, 30)
    assert second["readings"] == first["readings"] + 600
    posted = page.evaluate("() => window.__posted")
    sha = hashlib.sha256(text.encode("utf-8")).hexdigest()  # FIPS 180-4, as hashlib computes it
    assert page.evaluate("() => window.__decodes") == [{"keep": True}]
    # kept as it was decoded: not even the first request carries the text back
    assert not posted[0]["carries"] and posted[0]["kept"] == {"series_text": sha}, posted[0]
    assert not posted[-1]["carries"], posted[-1]  # a moved period: the key, not the text
    assert posted[-1]["kept"] == {"series_text": sha}
    # the page names the thinned series it keeps; the reply leaves it out and the page puts
    # it back, so the reply it keeps (for the chart, the CSV export, the record) is whole
    shown = page.evaluate(
        """async () => {
             const c = (await import('./js/app.js')).controllers.get('shift');
             const s = c.lastReplyOf().curves.series;
             return {key: s.key, held: s.held, times: s.t_s.length,
                     values: s.series.map((x) => (Array.isArray(x.y) ? x.y.length : -1)),
                     same: c.lastReplyOf() === c.lastGood};
           }"""
    )
    assert posted[-1]["drawn"].split()[0] == shown["key"], (posted[-1], shown)
    assert shown["held"] is False and shown["same"] and shown["times"] > 100
    assert shown["values"] == [shown["times"]] * len(shown["values"]), shown

    # back where it was: the same answer as when the text was sent
    assert _move(page, 20) == first

    # the engine no longer holds the key: it asks, the page sends the text again
    page.evaluate(
        "() => { for (const t of window.__engine.kept.keys())"
        " window.__engine.kept.set(t, '0'.repeat(64)); window.__posted.length = 0; }"
    )
    assert _move(page, 30) == second
    posted = page.evaluate("() => window.__posted")
    assert [p["carries"] for p in posted] == [False, True], posted
    assert posted[0]["kept"] == {"series_text": "0" * 64}

    # a restarted worker is sent the text in full and the panel computes
    page.evaluate("() => window.__engine.restart()")
    page.wait_for_selector("html[data-engine='ready']", timeout=120_000)
    page.evaluate("() => { window.__wrap(); window.__posted.length = 0; }")
    assert _move(page, 20) == first
    posted = page.evaluate("() => window.__posted")
    assert posted and posted[0]["carries"], posted

    # the link carries no file; the saved inputs file carries the text and its SHA-256
    link = urllib.parse.unquote(urllib.parse.urlsplit(page_link(page)).fragment)
    assert "shift.series_text" not in link
    # the keys of the series the page keeps are its own bookkeeping, added to each request:
    # no field of the form shows them, and neither the link nor the saved inputs carry them
    assert page.locator("#panel-shift [data-field=series_drawn]").count() == 0
    assert page.get_by_text("Series the page keeps").count() == 0
    assert "series_drawn" not in link
    with page.expect_download() as info:
        page.get_by_role("button", name="Save inputs (JSON)").click()
    saved = json.loads(Path(info.value.path()).read_text(encoding="utf-8"))
    assert saved["panels"]["shift"]["series_text"] == text
    assert saved["panels"]["shift"]["series_file"]["sha256"] == sha
    assert "series_drawn" not in saved["panels"]["shift"]
