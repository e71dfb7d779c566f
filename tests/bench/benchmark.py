#!/usr/bin/env python3
"""Speed and size figures of Drift & Dose, printed as one JSON object (a script, not a test).

    .venv/bin/python tests/bench/benchmark.py [--runs 5] [--edits 40]

Measures in one run, on one server, in the same Chromium:
- page time to ready divided by a bare Pyodide page's load time (both load Pyodide in a module
  worker; cold caches, fresh browser contexts, alternating runs, medians);
- repeat visit (HTTP cache warm) time to ready divided by the cold time;
- input change to updated chart, per panel: median and 95th percentile over many edits;
- the app's own assets (everything but Pyodide's core), gzip-compressed size;
- the heaviest core calculations in CPython, and the same requests in the page, with ratios;
- the single-file edition: its size, and its time to ready from file:// divided by the served
  page's (cold, fresh contexts, alternating runs, medians).
Targets are recorded in the README; this script only reports.
"""

from __future__ import annotations

import argparse
import gzip
import importlib.util
import json
import statistics
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
sys.path.insert(0, str(ROOT / "pycore"))
sys.path.insert(0, str(ROOT / "tests"))

from e2e.conftest import CHROMIUM_ARGS, find_chromium  # noqa: E402

from driftdose import api  # noqa: E402

BARE_HTML = """<!doctype html><html data-engine="loading"><head><meta charset="utf-8">
<script type="module" src="bare.js"></script></head><body>bare</body></html>"""
BARE_JS = """const w = new Worker(new URL("./bare-worker.js", import.meta.url), {type: "module"});
w.onmessage = () => { document.documentElement.dataset.engine = "ready"; };"""
BARE_WORKER = """import { loadPyodide } from "../pyodide/pyodide.mjs";
const pyodide = await loadPyodide({
  indexURL: new URL("../pyodide/", import.meta.url).href, packages: [] });
postMessage("ready");
self.onmessage = async (event) => {
  // timing of the core's own functions in Pyodide (not part of the ready measurement)
  const info = await (await fetch(new URL("../build-info.json", import.meta.url))).json();
  await pyodide.loadPackage(new URL("../" + info.wheel, import.meta.url).href);
  postMessage(pyodide.runPython(event.data));
};"""
BARE_BENCH_JS = """const url = new URL("./bare-worker.js", import.meta.url);
const w = new Worker(url, {type: "module"});
window.benchInPyodide = (code) => new Promise((resolve) => {
  w.onmessage = (e) => { if (e.data !== "ready") resolve(e.data); };
  w.postMessage(code);
});
w.addEventListener("message", (e) => {
  if (e.data === "ready") document.documentElement.dataset.engine = "ready"; });"""
ICRP66_CURVES_CODE = """
import statistics, time
from driftdose._numerics import logspace
from driftdose.deposition import icrp66_curves, reference_worker
sizes = logspace(1e-9, 100e-6, 200)
subject = reference_worker("mouth_breather")
times = []
for _ in range(15):
    t0 = time.perf_counter()
    icrp66_curves(sizes, 3000.0, 1.5, subject)
    times.append((time.perf_counter() - t0) * 1000)
statistics.median(times)
"""

# (panel id, input label, values to cycle) for the recalculation timing
EDITS = [
    ("motion", "Particle diameter", ["100", "150", "220", "330", "470", "680"]),
    ("deposition", "Particle density", ["1", "1.5", "2", "2.5", "3", "4"]),
    ("sampling", "Sampling flow", ["1.5", "2", "2.5", "3", "4", "5"]),
]
# heaviest request per calculation, for the CPython-vs-page comparison
HEAVY = [
    (
        "sampling",
        {
            "stages": [
                {
                    "type": "tube",
                    "length": {"value": 20, "unit": "m"},
                    "tube_diameter": {"value": 4, "unit": "mm"},
                },
                {
                    "type": "bend",
                    "tube_diameter": {"value": 4, "unit": "mm"},
                    "bend_angle": {"value": 90, "unit": "deg"},
                    "curvature_radius": {"value": 5, "unit": "cm"},
                },
                {"type": "cyclone", "curve": "iso7708_respirable"},
                {
                    "type": "screens",
                    "wire_diameter": {"value": 50, "unit": "um"},
                    "solidity": 0.3,
                    "thickness": {"value": 100, "unit": "um"},
                    "n_screens": 10,
                },
            ],
            "target": "respirable",
        },
    ),
    (
        "deposition",
        {
            "modes": [
                {
                    "basis": "count",
                    "median": {"value": 40, "unit": "nm"},
                    "gsd": 1.8,
                    "concentration": {"value": 1e5, "unit": "1/cm3"},
                },
                {
                    "basis": "mass",
                    "median": {"value": 5, "unit": "um"},
                    "gsd": 2.5,
                    "concentration": {"value": 1, "unit": "mg/m3"},
                },
            ],
            "particle_density": {"value": 3, "unit": "g/cm3"},
            "shape_factor": {"value": 1.5, "unit": "1"},
            "route": "mouth_breather",
        },
    ),
    (
        "motion",
        {
            "diameter_type": "aerodynamic",
            "particle_density": {"value": 3, "unit": "g/cm3"},
            "shape_factor": {"value": 1.5, "unit": "1"},
        },
    ),
]


def _icrp66_curves_ms(repeats: int = 15) -> float:
    """Full ICRP 66 regional curves at 200 sizes (ICRP default worker aerosol), CPython."""
    from driftdose._numerics import logspace
    from driftdose.deposition import icrp66_curves, reference_worker

    sizes = logspace(1e-9, 100e-6, 200)
    times = []
    for _ in range(repeats):
        t0 = time.perf_counter()
        icrp66_curves(sizes, 3000.0, 1.5, reference_worker("mouth_breather"))
        times.append((time.perf_counter() - t0) * 1000)
    return statistics.median(times)


def _load_build():
    spec = importlib.util.spec_from_file_location("driftdose_build", ROOT / "build.py")
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


def _pct(values: list[float], q: float) -> float:
    ordered = sorted(values)
    k = (len(ordered) - 1) * q
    lo, hi = int(k), min(int(k) + 1, len(ordered) - 1)
    return ordered[lo] + (ordered[hi] - ordered[lo]) * (k - lo)


def _time_to_ready(context, url: str) -> float:
    page = context.new_page()
    t0 = time.perf_counter()
    page.goto(url)
    page.wait_for_selector("html[data-engine='ready']", timeout=120_000)
    elapsed = time.perf_counter() - t0
    page.close()
    return elapsed


def _recalc_times(page, panel: str, label: str, values: list[str], edits: int) -> list[float]:
    field = page.locator(f"#panel-{panel}").get_by_label(label, exact=True)
    handle = field.element_handle()
    out = []
    for i in range(edits):
        value = values[i % len(values)]
        ms = page.evaluate(
            """([input, panel, value]) => new Promise((resolve) => {
                 const section = document.getElementById('panel-' + panel);
                 const before = Number(section.dataset.updates || 0);
                 const t0 = performance.now();
                 const obs = new MutationObserver(() => {
                   if (Number(section.dataset.updates || 0) > before) {
                     obs.disconnect();
                     requestAnimationFrame(() => resolve(performance.now() - t0));
                   }
                 });
                 obs.observe(section, {attributes: true, attributeFilter: ['data-updates']});
                 input.value = value;
                 input.dispatchEvent(new Event('input', {bubbles: true}));
               })""",
            [handle, panel, value],
        )
        out.append(ms)
    return out


def _cpython_ms(kind: str, inputs: dict, repeats: int = 20) -> float:
    api.handle({"kind": kind, "inputs": inputs})
    times = []
    for _ in range(repeats):
        t0 = time.perf_counter()
        reply = api.handle({"kind": kind, "inputs": inputs})
        times.append((time.perf_counter() - t0) * 1000)
        assert reply["ok"], reply
    return statistics.median(times)


def _page_ms(page, kind: str, inputs: dict, repeats: int = 20) -> float:
    return page.evaluate(
        """async ([kind, inputs, repeats]) => {
             const mod = await import('./js/app.js');
             const engine = mod.engine;
             await engine.request(kind, inputs);
             const times = [];
             for (let i = 0; i < repeats; i++) {
               const t0 = performance.now();
               const reply = await engine.request(kind, inputs);
               times.push(performance.now() - t0);
               if (!reply.ok) throw new Error(JSON.stringify(reply.errors));
             }
             times.sort((a, b) => a - b);
             return times[Math.floor(times.length / 2)];
           }""",
        [kind, inputs, repeats],
    )


def _single_file_figures(build, browser, dist: Path, base: str, runs: int) -> dict:
    """Single-file edition: size, time to ready from file://, ratio to the served page."""
    with tempfile.TemporaryDirectory() as folder:
        target = Path(folder) / build.SINGLE_NAME
        build.build_single_file(target, dist)
        served, single = [], []
        for _ in range(runs):
            ctx = browser.new_context()
            served.append(_time_to_ready(ctx, base))
            ctx.close()
            ctx = browser.new_context()
            single.append(_time_to_ready(ctx, target.as_uri()))
            ctx.close()
        return {
            "size_MB": round(target.stat().st_size / 1e6, 2),
            "ready_s": round(statistics.median(single), 3),
            "served_page_ready_s": round(statistics.median(served), 3),
            "ready_ratio_single_over_served": round(
                statistics.median(single) / statistics.median(served), 3
            ),
        }


def main() -> int:
    parser = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    parser.add_argument("--runs", type=int, default=5)
    parser.add_argument("--edits", type=int, default=40)
    args = parser.parse_args()
    from playwright.sync_api import sync_playwright

    build = _load_build()
    figures: dict = {"icrp66_curves_200_sizes_cpython_ms": round(_icrp66_curves_ms(), 2)}
    with tempfile.TemporaryDirectory() as tmp:
        dist = Path(tmp) / "site"
        build.build(dist)
        bare = dist / "bare"
        bare.mkdir()
        (bare / "index.html").write_text(BARE_HTML)
        (bare / "bare.js").write_text(BARE_JS)
        (bare / "bare-worker.js").write_text(BARE_WORKER)
        (bare / "bench.html").write_text(BARE_HTML.replace("bare.js", "bench.js"))
        (bare / "bench.js").write_text(BARE_BENCH_JS)
        own = [
            p
            for p in dist.rglob("*")
            if p.is_file() and "pyodide" not in p.parts and "bare" not in p.parts
        ]
        figures["own_assets_gzip_MB"] = round(
            sum(len(gzip.compress(p.read_bytes(), 9)) for p in own) / 1e6, 3
        )
        figures["pyodide_core_MB"] = round(
            sum(p.stat().st_size for p in (dist / "pyodide").iterdir()) / 1e6, 2
        )
        server, _ = build.serve(dist, 0)
        host, port = server.server_address[:2]
        base = f"http://{host}:{port}/"
        with sync_playwright() as pw:
            browser = pw.chromium.launch(executable_path=find_chromium(), args=CHROMIUM_ARGS)
            app_cold, bare_cold, app_warm = [], [], []
            for _ in range(args.runs):
                ctx = browser.new_context()
                bare_cold.append(_time_to_ready(ctx, base + "bare/"))
                ctx.close()
                ctx = browser.new_context()
                app_cold.append(_time_to_ready(ctx, base))
                app_warm.append(_time_to_ready(ctx, base))
                ctx.close()
            figures["bare_pyodide_ready_s"] = round(statistics.median(bare_cold), 3)
            figures["page_ready_cold_s"] = round(statistics.median(app_cold), 3)
            figures["page_ready_repeat_s"] = round(statistics.median(app_warm), 3)
            figures["ready_ratio_page_over_bare"] = round(
                statistics.median(app_cold) / statistics.median(bare_cold), 3
            )
            figures["repeat_over_cold_ratio"] = round(
                statistics.median(app_warm) / statistics.median(app_cold), 3
            )

            ctx = browser.new_context(viewport={"width": 1280, "height": 900})
            page = ctx.new_page()
            page.goto(base)
            page.wait_for_selector("html[data-engine='ready']", timeout=120_000)
            page.wait_for_function("() => document.querySelector('table.results')")
            recalc = {}
            for panel, label, values in EDITS:
                page.evaluate(f"() => document.getElementById('tab-{panel}').click()")
                times = _recalc_times(page, panel, label, values, args.edits)
                recalc[panel] = {
                    "median_ms": round(statistics.median(times), 1),
                    "p95_ms": round(_pct(times, 0.95), 1),
                }
            figures["input_to_chart"] = recalc
            heavy = {}
            for kind, inputs in HEAVY:
                cpy = _cpython_ms(kind, inputs)
                web = _page_ms(page, kind, inputs)
                heavy[kind] = {
                    "cpython_ms": round(cpy, 2),
                    "page_ms": round(web, 2),
                    "page_over_cpython": round(web / cpy, 2),
                }
            figures["heaviest_calculations"] = heavy
            ctx.close()
            ctx = browser.new_context()
            page = ctx.new_page()
            page.goto(base + "bare/bench.html")
            page.wait_for_selector("html[data-engine='ready']", timeout=120_000)
            in_page = page.evaluate("code => window.benchInPyodide(code)", ICRP66_CURVES_CODE)
            cpy = figures["icrp66_curves_200_sizes_cpython_ms"]
            figures["icrp66_curves_200_sizes_page_ms"] = round(in_page, 2)
            figures["icrp66_curves_page_over_cpython"] = round(in_page / cpy, 2)
            ctx.close()
            figures["single_file"] = _single_file_figures(build, browser, dist, base, args.runs)
            browser.close()
        server.shutdown()
    print(json.dumps(figures, indent=1))
    return 0


if __name__ == "__main__":
    sys.exit(main())
