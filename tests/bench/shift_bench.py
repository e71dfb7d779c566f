#!/usr/bin/env python3
"""Speed of the shift panel in the page (a script, not a test: figures are printed).

    .venv/bin/python tests/bench/shift_bench.py [--moves 20]
    .venv/bin/python tests/bench/shift_bench.py --dist /tmp/a --dist /tmp/b --rounds 3

With ``--dist`` (given more than once), builds made beforehand (``build.py --out DIR``) are
measured in turn, round after round, so that a change and the build before it see the same
load; each round opens a fresh browser.

A 24-h file logged every second (86 400 rows, a time column and one number column, notes
above the header) is generated, picked in the shift panel's file control, read, summarised
and drawn: the time from the file control's change to the chart drawn after the reply. Then
four periods are set and one period's end is moved as a drag does (the page rewrites the
period and sends the inputs again; the engine keeps the parsed series of the same text):
median and 95th percentile of move to redrawn results. The same requests in CPython for
comparison. :func:`shift_figures` is also called by ``benchmark.py``.
"""

from __future__ import annotations

import argparse
import json
import os
import statistics
import sys
import time
from pathlib import Path
from typing import Any

ROOT = Path(__file__).resolve().parents[2]
sys.path.insert(0, str(ROOT / "pycore"))
sys.path.insert(0, str(ROOT / "tests"))

from e2e.conftest import chromium_args, find_chromium  # noqa: E402

from driftdose import api  # noqa: E402

HOURS = 24
PERIODS = [
    {"label": "Background", "kind": "background", "start": "00:00", "end": "01:00"},
    {"label": "Task A", "kind": "task", "start": "02:00", "end": "06:00"},
    {"label": "Break", "kind": "break", "start": "06:00", "end": "06:30"},
    {"label": "Task B", "kind": "task", "start": "07:00", "end": "15:00"},
]


def day_file(hours: int = HOURS) -> str:
    """A logger export of ``hours`` at 1 s: notes, header, time and number columns."""
    lines = ["Generated for the speed figures", "Interval,1 s", "", "Time,Number (1/cm3)"]
    for k in range(hours * 3600):
        n = 5000 + 40_000 * (7200 <= k < 21600) + 20_000 * (25200 <= k < 54000) + (k * 7919) % 997
        lines.append(f"2026-03-10 {k // 3600:02d}:{k % 3600 // 60:02d}:{k % 60:02d},{n}")
    return "\n".join(lines) + "\n"


def _pct(values: list[float], q: float) -> float:
    ordered = sorted(values)
    k = (len(ordered) - 1) * q
    lo, hi = int(k), min(int(k) + 1, len(ordered) - 1)
    return ordered[lo] + (ordered[hi] - ordered[lo]) * (k - lo)


def _inputs(text: str, periods: list[dict]) -> dict:
    return {
        "series_text": text,
        "quantity_columns": [{"column": "Number", "quantity": "number", "unit": ""}],
        "periods": periods,
        "background_method": "marked_mean",
    }


def cpython_figures(text: str, moves: int) -> dict:
    """Read + summarise once, then re-summarise after moving a period (parsed series kept,
    the drawn series named as the page names it). CPU time of this process [ms]."""
    t0 = time.process_time()
    reply = api.handle({"kind": "shift", "inputs": _inputs(text, PERIODS)})
    first = (time.process_time() - t0) * 1000
    assert reply["ok"], reply.get("errors")
    drawn = reply["curves"]["series"]["key"]
    times = []
    for i in range(moves):
        periods = [dict(p) for p in PERIODS]
        periods[3]["end"] = f"{15 + (i % 4)}:{(i * 7) % 60:02d}"
        t0 = time.process_time()
        api.handle({"kind": "shift", "inputs": {**_inputs(text, periods), "series_drawn": drawn}})
        times.append((time.process_time() - t0) * 1000)
    return {
        "read_and_summarise_ms": round(first, 1),
        "move_period_median_ms": round(statistics.median(times), 1),
        "move_period_p95_ms": round(_pct(times, 0.95), 1),
    }


def shift_figures(page, text: str, moves: int = 20) -> dict:
    """In a page at the app's address: pick the file, then move a period ``moves`` times."""
    page.evaluate("() => document.getElementById('tab-shift').click()")
    page.wait_for_function(
        "() => Number(document.getElementById('panel-shift').dataset.updates || 0) >= 1"
        " && !document.getElementById('panel-shift').hasAttribute('aria-busy')",
        timeout=120_000,
    )
    control = page.locator("#panel-shift [data-field=series_text] input[type=file]")
    # the clock starts when the page sees the chosen file
    control.evaluate(
        "e => e.addEventListener('change', () => { window.__shiftT0 = performance.now(); },"
        " {capture: true, once: true})"
    )
    before = int(page.locator("#panel-shift").get_attribute("data-updates") or 0)
    control.set_input_files(
        {"name": "day.csv", "mimeType": "text/csv", "buffer": text.encode("utf-8")}
    )
    page.wait_for_function(
        "n => { const s = document.getElementById('panel-shift');"
        " return Number(s.dataset.updates || 0) > n && s.dataset.state === 'ok'; }",
        arg=before,
        timeout=300_000,
    )
    first = page.evaluate(
        "() => new Promise((r) => requestAnimationFrame(() => r(performance.now()"
        " - window.__shiftT0)))"
    )
    # the periods, and the first reply with them (the series is then parsed and kept)
    page.evaluate(
        """async (periods) => {
             const c = (await import('./js/app.js')).controllers.get('shift');
             const section = document.getElementById('panel-shift');
             const before = Number(section.dataset.updates);
             const t = c.fields.handles.get('periods');
             t.set(periods.map((p) => ({...p, activity: 'light_exercise', route: 'mixed',
                                        protection_factor: '1'})));
             t.changed();
             await new Promise((resolve) => {
               const obs = new MutationObserver(() => {
                 if (Number(section.dataset.updates) > before
                     && !section.hasAttribute('aria-busy')) { obs.disconnect(); resolve(); }
               });
               obs.observe(section, {attributes: true});
             });
           }""",
        PERIODS,
    )
    times = page.evaluate(
        """async (moves) => {
             const c = (await import('./js/app.js')).controllers.get('shift');
             const section = document.getElementById('panel-shift');
             const t = c.fields.handles.get('periods');
             const out = [];
             for (let i = 0; i < moves; i++) {
               const before = Number(section.dataset.updates);
               const t0 = performance.now();
               // as a drag's release: the period's end rewritten, then the inputs sent
               t.setSpan(3, {start: 7 * 3600, end: (15 + (i % 4)) * 3600 + ((i * 7) % 60) * 60});
               t.changed();
               await new Promise((resolve) => {
                 const obs = new MutationObserver(() => {
                   if (Number(section.dataset.updates) > before
                       && !section.hasAttribute('aria-busy')) {
                     obs.disconnect();
                     requestAnimationFrame(() => resolve());
                   }
                 });
                 obs.observe(section, {attributes: true});
               });
               out.push(performance.now() - t0);
             }
             return out;
           }""",
        moves,
    )
    return {
        "rows": HOURS * 3600,
        "file_MB": round(len(text.encode("utf-8")) / 1e6, 2),
        "pick_to_drawn_ms": round(first, 1),
        "move_period_to_drawn_median_ms": round(statistics.median(times), 1),
        "move_period_to_drawn_p95_ms": round(_pct(times, 0.95), 1),
    }


def _page_figures(build: Any, dist: Path, text: str, moves: int) -> dict:
    """Serve ``dist`` on 127.0.0.1 and measure it in a fresh browser."""
    from playwright.sync_api import sync_playwright

    server, _ = build.serve(dist, 0)
    host, port = server.server_address[:2]
    try:
        with sync_playwright() as pw:
            browser = pw.chromium.launch(executable_path=find_chromium(), args=chromium_args(pw))
            ctx = browser.new_context(viewport={"width": 1280, "height": 900})
            page = ctx.new_page()
            page.goto(f"http://{host}:{port}/#v=1&panel=shift")
            page.wait_for_selector("html[data-engine='ready']", timeout=120_000)
            out = shift_figures(page, text, moves)
            ctx.close()
            browser.close()
    finally:
        server.shutdown()
    return {"load_average": [round(x, 2) for x in os.getloadavg()], **out}


def main() -> int:
    parser = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    parser.add_argument("--moves", type=int, default=20)
    parser.add_argument("--dist", action="append", type=Path, default=[])
    parser.add_argument("--rounds", type=int, default=1)
    args = parser.parse_args()
    import importlib.util
    import tempfile

    figures: dict = {"load_average_at_start": [round(x, 2) for x in os.getloadavg()]}
    text = day_file()
    spec = importlib.util.spec_from_file_location("driftdose_build", ROOT / "build.py")
    build = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(build)
    if args.dist:
        runs: dict[str, list[dict]] = {str(d): [] for d in args.dist}
        for _ in range(args.rounds):
            for d in args.dist:
                runs[str(d)].append(_page_figures(build, d, text, args.moves))
        figures["page_runs"] = runs
    else:
        figures["cpython"] = cpython_figures(text, args.moves)
        with tempfile.TemporaryDirectory() as tmp:
            dist = Path(tmp) / "dist"
            build.build(dist)
            figures["page"] = _page_figures(build, dist, text, args.moves)
    figures["load_average_at_end"] = [round(x, 2) for x in os.getloadavg()]
    print(json.dumps(figures, indent=1))
    return 0


if __name__ == "__main__":
    sys.exit(main())
