#!/usr/bin/env python3
"""Speed and size figures of Drift & Dose, printed as one JSON object (a script, not a test).

    .venv/bin/python tests/bench/benchmark.py [--runs 5] [--edits 80]

Measures in one run, on one server, in the same Chromium:
- time to ready of three editions of the page, each divided by a bare Pyodide page's load time
  (all load Pyodide in a module worker; cold caches, fresh browser contexts, alternating runs,
  medians): `source` (standard library and package as sources: the engine compiles them on
  every start), `bytecode` (both compiled at build time) and `snapshot` (the default build: the
  engine's memory with the package imported, restored); with each, the phase marks the worker
  reports (engine started, Python bootstrapped, package imported; ms after navigation) and the
  first chart drawn, and the bytes a first visit downloads before ready (as sent, and gzip);
- repeat visits in an on-disk browser profile (closed and reopened between visits): the second
  visit's time to ready (and the browser's CPU time) divided by the first's, with the service
  worker answering and with service workers blocked (HTTP cache only); and (part
  ``repeat_throttled``) the same for the default build served over a shared 50 Mbit/s link with
  20 ms per response, where a first visit pays its download;
- input change to updated chart, per panel: median and 95th percentile over many edits (input
  event -> data-updates bumped -> next animation frame), with two of its phases: input -> the
  request posted (median) and the panel's apply() showing the reply (median, p95); timed once
  the page has settled (the engine's warm-up reported done, or 5 s after ready for a build
  without one);
- the app's own assets (everything but Pyodide's core), gzip-compressed size;
- the heaviest core calculations in CPython, and the same requests in the page, with ratios;
- the retained burden over 40 working years, and a 1000-sample propagation of the dose of a
  two-mode aerosol, in CPython and in the page;
- the shift calculation on a 24 h file logged every second (86 400 rows, a date-time column and
  two value columns): the first request (read, parse, summarise) and re-summarising after a
  period moves (the parsed file is kept between requests), in CPython (`--cpython-only` prints
  these and the other CPython figures without building or starting a browser);
- the shift panel (``shift_bench.py``): a 24-h file at 1 s (86 400 rows) picked, read,
  summarised and drawn; re-summarising after moving a period (median, 95th percentile);
- the single-file edition: its size, and its time to ready from file:// divided by the served
  page's (cold, fresh contexts, alternating runs, medians);
- before and after, in the same run: the page and the package of an earlier revision
  (``--before``, default the state before the start-up and recompute work) built beside the
  current ones; the heaviest deposition request in CPython (alternating processes, wall and CPU
  time, and the largest difference between the two versions' numbers), input change to chart
  on every panel and on the heaviest deposition case (alternating blocks of edits), and repeat
  visits in an on-disk profile (the variants alternating within each run). ``--parts`` runs a
  subset.
Targets are recorded in the README; this script only reports.
"""

from __future__ import annotations

import argparse
import gzip
import importlib.util
import json
import os
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
sys.path.insert(0, str(ROOT / "pycore"))
sys.path.insert(0, str(ROOT / "tests"))

from bench.shift_bench import day_file, shift_figures  # noqa: E402
from e2e.conftest import chromium_args, find_chromium  # noqa: E402

from driftdose import api  # noqa: E402

BARE_HTML = """<!doctype html><html data-engine="loading"><head><meta charset="utf-8">
<script type="module" src="bare.js"></script></head><body>bare</body></html>"""
BARE_JS = """const w = new Worker(new URL("./bare-worker.js", import.meta.url), {type: "module"});
w.onmessage = () => { document.documentElement.dataset.engine = "ready"; };"""
BARE_WORKER = """import { loadPyodide } from "../source/pyodide/pyodide.mjs";
const pyodide = await loadPyodide({
  indexURL: new URL("../source/pyodide/", import.meta.url).href, packages: [] });
postMessage("ready");
self.onmessage = async (event) => {
  // timing of the core's own functions in Pyodide (not part of the ready measurement)
  const info = await (await fetch(new URL("../source/build-info.json", import.meta.url))).json();
  await pyodide.loadPackage(new URL("../source/" + info.wheel, import.meta.url).href);
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

# (name, panel id, input label, values to cycle, inputs set first or None) for the
# recalculation timing; a panel the page does not have is left out
EDITS = [
    ("motion", "motion", "Particle diameter", ["100", "150", "220", "330", "470", "680"], None),
    ("deposition", "deposition", "Particle density", ["1", "1.5", "2", "2.5", "3", "4"], None),
    ("sampling", "sampling", "Sampling flow", ["1.5", "2", "2.5", "3", "4", "5"], None),
]
BEFORE = "54c83b0"  # main before the start-up and recompute work of 2 December 2026
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


# the heaviest deposition case (two modes, mouth breather) edited in the page
EDITS.append(
    (
        "deposition_heaviest",
        "deposition",
        "Particle density",
        ["3", "3.5", "4", "2.5", "2", "4.5"],
        HEAVY[1][1],
    )
)


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


VARIANTS = {  # edition -> build() options
    "source": {"bytecode": False, "snapshot": False},
    "bytecode": {"bytecode": True, "snapshot": False},
    "snapshot": {"bytecode": True, "snapshot": True},
}
FIRST_CHART = (
    "() => Number(document.querySelector('.panel:not([hidden])')?.dataset.updates || 0) > 0"
)


class _Counter:
    """Bytes the server sent, per path (reset before each page load)."""

    def __init__(self) -> None:
        self.sent: dict[str, int] = {}
        self.until_ready: dict[str, int] = {}


class _Link:
    """A shared network link for the bench server: every response waits ``latency_ms`` before
    its headers, and all bodies together go at most ``mbit`` Mbit/s (64 KB slices, in turn)."""

    def __init__(self, mbit: float, latency_ms: float) -> None:
        import threading

        self.mbit, self.latency_ms = mbit, latency_ms
        self.bytes_per_s = mbit * 1e6 / 8
        self.lock = threading.Lock()
        self.free_at = 0.0

    def wait_for(self, size: int) -> None:
        with self.lock:
            now = time.monotonic()
            self.free_at = max(now, self.free_at) + size / self.bytes_per_s
            wait = self.free_at - now
        time.sleep(wait)


def _serve_counting(build, root: Path, counter: _Counter, link: _Link | None = None):
    import functools
    import http.server
    import threading

    class Handler(build._Handler):
        def end_headers(self) -> None:
            if link is not None:
                time.sleep(link.latency_ms / 1000)
            super().end_headers()

        def copyfile(self, source, outputfile) -> None:
            start = source.tell()
            if link is None:
                super().copyfile(source, outputfile)
            else:
                while chunk := source.read(65536):
                    link.wait_for(len(chunk))
                    outputfile.write(chunk)
            path = self.path.split("?")[0]
            counter.sent[path] = counter.sent.get(path, 0) + source.tell() - start

    handler = functools.partial(Handler, directory=str(root))
    server = http.server.ThreadingHTTPServer(("127.0.0.1", 0), handler)
    threading.Thread(target=server.serve_forever, daemon=True).start()
    return server


def _time_to_ready(
    context,
    url: str,
    phases: bool = False,
    counter: _Counter | None = None,
    in_page: bool = False,
    keep_open: bool = False,
):
    page = context.new_page()
    t0 = time.perf_counter()
    page.goto(url)
    page.wait_for_selector("html[data-engine='ready']", timeout=180_000)
    elapsed = time.perf_counter() - t0
    if in_page:  # ms from navigation to the engine's ready mark (the page's own clock)
        ready_ms = page.evaluate(
            "() => JSON.parse(document.documentElement.dataset.engineMarks || '{}')"
            ".packageImported - performance.timeOrigin"
        )
        if not keep_open:
            page.close()
        return elapsed, ready_ms
    if counter is not None:  # before the service worker's precaching starts
        counter.until_ready = dict(counter.sent)
    if phases:
        page.wait_for_function(FIRST_CHART, timeout=60_000)
        marks = page.evaluate(
            """() => {
                 const root = document.documentElement;
                 const m = JSON.parse(root.dataset.engineMarks || '{}');
                 const rel = (v) => v === undefined ? null : v - performance.timeOrigin;
                 const out = {};
                 for (const [k, v] of Object.entries(m)) out[k] = rel(v);
                 out.firstChart = performance.now();
                 out.start = root.dataset.engineStart;
                 return out;
               }"""
        )
        page.close()
        return elapsed, marks
    page.close()
    return elapsed


def _median_marks(runs: list[dict]) -> dict:
    keys = ["workerStart", "engineStarted", "bootstrapped", "packageImported", "firstChart"]
    out = {k: round(statistics.median(r[k] for r in runs), 1) for k in keys if runs[0].get(k)}
    out["start"] = sorted({r["start"] for r in runs})
    return out


def _gzip_bytes(root: Path, sent: dict[str, int]) -> int:
    total = 0
    for path in sent:
        file = root / path.lstrip("/")
        if file.is_dir():
            file = file / "index.html"
        if file.is_file():
            total += len(gzip.compress(file.read_bytes(), 6))
    return total


def _browser_cpu_s(profile: str) -> float:
    """CPU time (user + system) of the running browser processes started on ``profile``."""
    total = 0
    for pid in os.listdir("/proc"):
        if not pid.isdigit():
            continue
        try:
            if profile.encode() not in Path(f"/proc/{pid}/cmdline").read_bytes():
                continue
            fields = Path(f"/proc/{pid}/stat").read_text().rsplit(")", 1)[1].split()
        except OSError:
            continue
        total += int(fields[11]) + int(fields[12])
    return total / os.sysconf("SC_CLK_TCK")


def _profile_visit_pair(pw, url: str, block_sw: bool, warms: bool) -> tuple[float, ...]:
    """One first and one second visit, each in a freshly started browser on one new on-disk
    profile: (first s, second s, first in-page ms, second in-page ms, first CPU s, second CPU
    s), CPU being that of all the browser's processes from opening the page to ready (/proc).

    With the service worker, the first visit ends once it has cached the build and, where the
    page does so (``warms``: its ``js/warm.js``), loaded the engine's script once through it.
    """
    out: list[float] = []
    with tempfile.TemporaryDirectory() as profile:
        for first in (True, False):
            ctx = pw.chromium.launch_persistent_context(
                profile,
                executable_path=find_chromium(),
                args=chromium_args(pw),
                service_workers="block" if block_sw else "allow",
            )
            stay = first and not block_sw
            cpu0 = _browser_cpu_s(profile)
            elapsed, ready_ms = _time_to_ready(ctx, url, in_page=True, keep_open=stay)
            out += [elapsed, ready_ms, _browser_cpu_s(profile) - cpu0]
            if stay:  # the same page stays while the service worker caches the build
                page = ctx.pages[-1]
                page.evaluate(
                    "async () => { const r = await navigator.serviceWorker.ready;"
                    " return r.active && r.active.state; }"
                )
                if warms:  # and the engine's script compiled once through it (app.js)
                    page.wait_for_selector(
                        "html[data-engine-code='warm']", state="attached", timeout=180_000
                    )
                page.close()
            ctx.close()
    return out[0], out[3], out[1], out[4], out[2], out[5]


def _profile_visits(pw, base: str, variants: dict[str, tuple[str, bool, bool]], runs: int) -> dict:
    """First and second visits per variant (name -> (folder, block service workers, warms)),
    the variants alternating within each run so that they share the machine's load."""
    got: dict[str, list[tuple[float, ...]]] = {name: [] for name in variants}
    for _ in range(runs):
        for name, (folder, block_sw, warms) in variants.items():
            got[name].append(_profile_visit_pair(pw, base + folder + "/", block_sw, warms))
    out = {}
    for name, pairs in got.items():
        first, second, page_first, page_second, cpu_first, cpu_second = (
            statistics.median(p[i] for p in pairs) for i in range(6)
        )
        out[name] = {
            "first_s": round(first, 3),
            "second_s": round(second, 3),
            "second_over_first": round(second / first, 3),
            # from the page's navigation to the engine's ready mark (browser start-up left out)
            "in_page_first_ms": round(page_first),
            "in_page_second_ms": round(page_second),
            "in_page_second_over_first": round(page_second / page_first, 3),
            # the ratio in each run, first and second visit side by side in time
            "in_page_second_over_first_per_run": [round(p[3] / p[2], 3) for p in pairs],
            # CPU time of the browser's processes, page opened to ready: less at the load's mercy
            "cpu_first_s": round(cpu_first, 2),
            "cpu_second_s": round(cpu_second, 2),
            "cpu_second_over_first": round(cpu_second / cpu_first, 3),
        }
    return out


# the link of the throttled first visit: a good 4G connection or a modest office line (a chosen
# figure, not a measured one); the local server alone pays almost no download
LINK_MBIT, LINK_LATENCY_MS = 50.0, 20.0


def _throttled_visits(pw, build, root: Path, runs: int) -> dict:
    """First and repeat visit of the default build over a shared 50 Mbit/s, 20 ms link.

    The link is the bench server's own (``_Link``): Chrome's network emulation applies to the
    page's target and would leave out the requests of the calculation worker and the service
    worker, which carry nearly all the bytes.
    """
    link = _Link(LINK_MBIT, LINK_LATENCY_MS)
    server = _serve_counting(build, root, _Counter(), link)
    host, port = server.server_address[:2]
    try:
        warms = (root / "snapshot" / "js" / "warm.js").exists()
        out = _profile_visits(
            pw, f"http://{host}:{port}/", {"snapshot": ("snapshot", False, warms)}, runs
        )["snapshot"]
    finally:
        server.shutdown()
    return {"link": f"{LINK_MBIT:g} Mbit/s down, {LINK_LATENCY_MS:g} ms per response", **out}


# phases of an edit, marked by wrapping the engine's latestOn and each panel's apply:
# input -> request posted, and the time apply() takes to show the reply
_PHASE_MARKS = """async () => {
  const m = await import('./js/app.js');
  if (m.engine.__marked) return;
  m.engine.__marked = true;
  window.__phases = {};
  const latestOn = m.engine.latestOn.bind(m.engine);
  m.engine.latestOn = (...a) => {
    window.__phases.posted = performance.now();
    return latestOn(...a);
  };
  for (const c of m.controllers.values()) {
    const apply = c.apply.bind(c);
    c.apply = (...a) => {
      const t = performance.now();
      try { return apply(...a); } finally { window.__phases.apply = performance.now() - t; }
    };
  }
}"""


def _fresh_value(values: list[str], n: int) -> str:
    """The n-th edit's value: the listed values in turn, each pass scaled by 1 + 0.001 k, so
    no value repeats within a run (a kept result must not answer an edit it has seen)."""
    base = float(values[n % len(values)])
    return f"{base * (1 + 0.001 * (n // len(values) + 1)):.6g}"


def _recalc_times(
    page,
    panel: str,
    label: str,
    values: list[str],
    edits: int,
    phases: list | None = None,
    first: int = 0,
) -> list[float]:
    """Input event -> data-updates bumped -> next animation frame, in ms, per edit; with
    ``phases`` (after _PHASE_MARKS) also {post, apply} in ms per edit appended there. Edit i
    types ``_fresh_value(values, first + i)``."""
    field = page.locator(f"#panel-{panel}").get_by_label(label, exact=True)
    handle = field.element_handle()
    out = []
    for i in range(edits):
        value = _fresh_value(values, first + i)
        got = page.evaluate(
            """([input, panel, value]) => new Promise((resolve) => {
                 const section = document.getElementById('panel-' + panel);
                 const before = Number(section.dataset.updates || 0);
                 const t0 = performance.now();
                 const marks = window.__phases || {};
                 const obs = new MutationObserver(() => {
                   if (Number(section.dataset.updates || 0) > before) {
                     obs.disconnect();
                     requestAnimationFrame(() => resolve({
                       total: performance.now() - t0,
                       post: marks.posted >= t0 ? marks.posted - t0 : null,
                       apply: marks.apply ?? null,
                     }));
                   }
                 });
                 obs.observe(section, {attributes: true, attributeFilter: ['data-updates']});
                 input.value = value;
                 input.dispatchEvent(new Event('input', {bubbles: true}));
               })""",
            [handle, panel, value],
        )
        out.append(got["total"])
        if phases is not None:
            phases.append({"post": got["post"], "apply": got["apply"]})
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


# retained burden (40 years of a 5-day week, every shift resolved) and the 1000-sample
# propagation of a two-mode aerosol: each run gets a fresh seed, so no cached block is reused
BURDEN_INPUTS = {**HEAVY[1][1], "route": "mixed", "working_years": 40, "years_after": 10}
RANGES_INPUTS = {**BURDEN_INPUTS, "samples": 1000}


def _ranges_cpython_ms(repeats: int = 3) -> float:
    times = []
    for seed in range(repeats):
        t0 = time.perf_counter()
        reply = api.handle({"kind": "uncertainty", "inputs": {**RANGES_INPUTS, "seed": 100 + seed}})
        times.append((time.perf_counter() - t0) * 1000)
        assert reply["ok"], reply
    return statistics.median(times)


def _ranges_page_ms(page, repeats: int = 3) -> float:
    return page.evaluate(
        """async ([inputs, repeats]) => {
             const mod = await import('./js/app.js');
             const times = [];
             for (let i = 0; i < repeats; i++) {
               const t0 = performance.now();
               const reply = await mod.engine.request('uncertainty', { ...inputs, seed: 200 + i });
               times.push(performance.now() - t0);
               if (!reply.ok) throw new Error(JSON.stringify(reply.errors));
             }
             times.sort((a, b) => a - b);
             return times[Math.floor(times.length / 2)];
           }""",
        [RANGES_INPUTS, repeats],
    )


CPYTHON_TIMER = """
import json, statistics, sys, time
sys.path.insert(0, sys.argv[1])
from driftdose import api
request, repeats, vary = json.loads(sys.argv[2]), int(sys.argv[3]), sys.argv[4] == "vary"
reply = api.handle(request)
wall, cpu = [], []
for i in range(repeats):
    if vary:  # a new density each time: nothing computed before can be reused
        request["inputs"]["particle_density"] = {"value": 3 + (i + 1) * 1e-3, "unit": "g/cm3"}
    t0, c0 = time.perf_counter(), time.process_time()
    reply = api.handle(request)
    wall.append((time.perf_counter() - t0) * 1000)
    cpu.append((time.process_time() - c0) * 1000)
    assert reply["ok"], reply
values = {k: v["value"] for k, v in reply["results"].items() if isinstance(v.get("value"), float)}
print(json.dumps({"wall": wall, "cpu": cpu, "values": values}))
"""


def _before_tree(rev: str, folder: Path) -> Path:
    """The repository at revision ``rev`` (git archive), sharing this tree's front-end packages."""
    out = folder / "before-src"
    out.mkdir()
    archive = subprocess.run(
        ["git", "-C", str(ROOT), "archive", rev], check=True, capture_output=True
    ).stdout
    subprocess.run(["tar", "-x", "-C", str(out)], input=archive, check=True)
    (out / "site" / "node_modules").symlink_to(ROOT / "site" / "node_modules")
    return out


def _build_before(src: Path, dist: Path) -> None:
    code = "import sys; from pathlib import Path; import build; build.build(Path(sys.argv[1]))"
    subprocess.run([sys.executable, "-c", code, str(dist)], cwd=src, check=True)


def _cpython_before_after(
    src: Path, kind: str, inputs: dict, rounds: int = 6, vary: bool = False
) -> dict:
    """One request in CPython, before and after, alternating processes (10 timings each).

    ``vary``: the density changes with every request (what an edit of the density costs);
    otherwise the same request is repeated (an edit of anything that leaves the deposition
    curves as they were: amounts, medians, spreads, exposure).
    """
    request = json.dumps({"kind": kind, "inputs": inputs})
    times = {"before": {"wall": [], "cpu": []}, "after": {"wall": [], "cpu": []}}
    values = {}
    for _ in range(rounds):
        for name, pycore in (("before", src / "pycore"), ("after", ROOT / "pycore")):
            done = subprocess.run(
                [
                    sys.executable,
                    "-c",
                    CPYTHON_TIMER,
                    str(pycore),
                    request,
                    "10",
                    "vary" if vary else "same",
                ],
                check=True,
                capture_output=True,
                text=True,
            )
            got = json.loads(done.stdout)
            times[name]["wall"] += got["wall"]
            times[name]["cpu"] += got["cpu"]
            values[name] = got["values"]
    out = {}
    for clock in ("wall", "cpu"):
        b = statistics.median(times["before"][clock])
        a = statistics.median(times["after"][clock])
        out[f"{clock}_ms_before"] = round(b, 2)
        out[f"{clock}_ms_after"] = round(a, 2)
        out[f"{clock}_after_over_before"] = round(a / b, 3)
    common = set(values["before"]) & set(values["after"])
    diffs = [
        abs(values["after"][k] - values["before"][k]) / abs(values["before"][k])
        for k in common
        if values["before"][k] != 0.0
    ]
    out["results_compared"] = len(common)
    out["largest_relative_difference"] = max(diffs, default=0.0)
    return out


def _single_file_figures(build, browser, root: Path, base: str, runs: int) -> dict:
    """Single-file edition: size, time to ready from file://, ratios to the served pages."""
    with tempfile.TemporaryDirectory() as folder:
        target = Path(folder) / build.SINGLE_NAME
        build.build_single_file(target, root / "snapshot")
        served, bare, single = [], [], []
        for _ in range(runs):
            for url, out in ((base + "bare/", bare), (base + "snapshot/", served)):
                ctx = browser.new_context()
                out.append(_time_to_ready(ctx, url))
                ctx.close()
            ctx = browser.new_context()
            single.append(_time_to_ready(ctx, target.as_uri()))
            ctx.close()
        med = {k: statistics.median(v) for k, v in (("s", single), ("p", served), ("b", bare))}
        return {
            "size_MB": round(target.stat().st_size / 1e6, 2),
            "ready_s": round(med["s"], 3),
            "served_page_ready_s": round(med["p"], 3),
            "bare_page_ready_s": round(med["b"], 3),
            "ready_ratio_single_over_served": round(med["s"] / med["p"], 3),
            "ready_ratio_single_over_bare": round(med["s"] / med["b"], 3),
        }


def shift_log_24h() -> str:
    """An invented 24 h log at 1 s: ISO date-time, number concentration, LDSA (with gaps-free
    sinusoidal values and a metadata line above the header)."""
    import math

    lines = ["Invented 24 h log for the benchmark", "Time,Number [1/cm3],LDSA [um2/cm3]"]
    for k in range(86_400):
        h, m, s = k // 3600, k % 3600 // 60, k % 60
        n = 4000 + 3000 * math.sin(k / 2000.0) + (k * 7919 % 1000)
        lines.append(f"2026-03-05 {h:02d}:{m:02d}:{s:02d},{n:.1f},{n / 150:.2f}")
    return "\n".join(lines) + "\n"


def _shift_figures(moves: int = 20) -> dict:
    """First request and re-summaries of the shift calculation on a 24 h, 1 s file."""
    text = shift_log_24h()
    periods = [
        {"label": "Before", "kind": "background", "start": "07:00", "end": "07:30"},
        {"label": "Task 1", "kind": "task", "start": "07:30", "end": "10:00"},
        {"label": "Break", "kind": "break", "start": "10:00", "end": "10:30"},
        {"label": "Task 2", "kind": "task", "start": "10:30", "end": "15:00"},
        {"label": "After", "kind": "background", "start": "15:00", "end": "15:30"},
    ]
    inputs = {
        "series_text": text,
        "quantity_columns": [
            {"column": "number", "quantity": "number"},
            {"column": "ldsa", "quantity": "ldsa"},
        ],
        "periods": periods,
        "background_method": "pre_post",
    }
    cpu0, wall0 = time.process_time(), time.perf_counter()
    reply = api.handle({"kind": "shift", "inputs": inputs})
    first = (time.process_time() - cpu0, time.perf_counter() - wall0)
    assert reply["ok"], reply
    cpu, wall = [], []
    for i in range(moves):
        periods[1]["end"] = f"09:{10 + i:02d}"
        periods[2]["start"] = periods[1]["end"]
        c0, w0 = time.process_time(), time.perf_counter()
        assert api.handle({"kind": "shift", "inputs": inputs})["ok"]
        cpu.append(1e3 * (time.process_time() - c0))
        wall.append(1e3 * (time.perf_counter() - w0))
    return {
        "file_MB": round(len(text.encode()) / 1048576, 2),
        "rows": 86_400,
        "first_request_cpu_s": round(first[0], 3),
        "first_request_wall_s": round(first[1], 3),
        "resummarise_cpu_ms_median": round(statistics.median(cpu), 1),
        "resummarise_cpu_ms_p95": round(_pct(cpu, 0.95), 1),
        "resummarise_wall_ms_p95": round(_pct(wall, 0.95), 1),
    }


PARTS = ("editions", "repeat", "repeat_throttled", "edits", "heavy", "single")


def _open_ready(browser, url: str):
    ctx = browser.new_context(viewport={"width": 1280, "height": 900})
    page = ctx.new_page()
    page.goto(url)
    page.wait_for_selector("html[data-engine='ready']", timeout=180_000)
    page.wait_for_function("() => document.querySelector('table.results')")
    # settled: the engine's warm-up done (driftdose.api.warm), or 5 s for a build without one
    page.wait_for_function(
        "(t) => document.documentElement.dataset.engineWarm || performance.now() > t",
        arg=page.evaluate("() => performance.now() + 5000"),
        timeout=60_000,
    )
    return ctx, page


_SET_INPUTS = """async ([pid, inputs]) => {
  const m = await import('./js/app.js');
  const section = document.getElementById('panel-' + pid);
  const before = Number(section.dataset.updates || 0);
  m.controllers.get(pid).setState(inputs);
  const t0 = performance.now();
  while (Number(section.dataset.updates || 0) <= before && performance.now() - t0 < 60000) {
    await new Promise((r) => setTimeout(r, 20));
  }
}"""


def _edit_figures(browser, sites: dict[str, str], edits: int, blocks: int = 4) -> dict:
    """Input change to chart on every panel, per site, in alternating blocks of edits."""
    pages = {name: _open_ready(browser, url) for name, url in sites.items()}
    defaults = {
        name: page.evaluate(
            "async () => { const m = await import('./js/app.js');"
            " return Object.fromEntries([...m.controllers].map(([k, c]) => [k, c.getState()])); }"
        )
        for name, (_, page) in pages.items()
    }
    times: dict[str, dict[str, list[float]]] = {name: {} for name in sites}
    phases: dict[str, dict[str, list[dict]]] = {name: {} for name in sites}
    for _, page in pages.values():
        page.evaluate(_PHASE_MARKS)
    per_block = max(1, edits // blocks)
    for block in range(blocks):
        for name, (_, page) in pages.items():
            for key, panel, label, values, setup in EDITS:
                if not page.locator(f"#panel-{panel}").count():
                    continue
                page.evaluate(f"() => document.getElementById('tab-{panel}').click()")
                page.evaluate(_SET_INPUTS, [panel, setup or defaults[name][panel]])
                marks = phases[name].setdefault(key, [])
                got = _recalc_times(
                    page, panel, label, values, per_block, marks, first=block * per_block
                )
                times[name].setdefault(key, []).extend(got)
    for ctx, _ in pages.values():
        ctx.close()
    out: dict = {}
    for key in {k for by_site in times.values() for k in by_site}:
        row = {}
        for name in sites:
            if key in times[name]:
                row[f"median_ms_{name}"] = round(statistics.median(times[name][key]), 1)
                row[f"p95_ms_{name}"] = round(_pct(times[name][key], 0.95), 1)
                # where it goes: input -> request posted; apply() showing the reply
                post = [m["post"] for m in phases[name][key] if m["post"] is not None]
                apply = [m["apply"] for m in phases[name][key] if m["apply"] is not None]
                if post:
                    row[f"posted_ms_median_{name}"] = round(statistics.median(post), 2)
                if apply:
                    row[f"apply_ms_median_{name}"] = round(statistics.median(apply), 1)
                    row[f"apply_ms_p95_{name}"] = round(_pct(apply, 0.95), 1)
        if "p95_ms_before" in row and "p95_ms_after" in row:
            row["p95_after_over_before"] = round(row["p95_ms_after"] / row["p95_ms_before"], 3)
        out[key] = row
    return out


def main() -> int:
    parser = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    parser.add_argument("--runs", type=int, default=5)
    parser.add_argument("--edits", type=int, default=80)
    parser.add_argument("--profile-runs", type=int, default=3)
    parser.add_argument(
        "--cpython-only", action="store_true", help="only the CPython figures (no build)"
    )
    parser.add_argument("--before", default=BEFORE, help="git revision to compare with")
    parser.add_argument("--parts", default=",".join(PARTS), help="subset of " + ",".join(PARTS))
    args = parser.parse_args()
    parts = set(args.parts.split(","))
    if args.cpython_only:
        figures = {"load_average_at_start": [round(x, 2) for x in os.getloadavg()]}
        figures["icrp66_curves_200_sizes_cpython_ms"] = round(_icrp66_curves_ms(), 2)
        figures["shift_24h_1s_cpython"] = _shift_figures()
        figures["load_average_at_end"] = [round(x, 2) for x in os.getloadavg()]
        print(json.dumps(figures, indent=2))
        return 0
    from playwright.sync_api import sync_playwright

    build = _load_build()
    figures: dict = {"load_average_at_start": [round(x, 2) for x in os.getloadavg()]}
    figures["before_revision"] = args.before
    figures["icrp66_curves_200_sizes_cpython_ms"] = round(_icrp66_curves_ms(), 2)
    figures["shift_24h_1s_cpython"] = _shift_figures()
    with tempfile.TemporaryDirectory() as tmp:
        src = _before_tree(args.before, Path(tmp))
        if parts & {"heavy", "edits"}:
            figures["heaviest_deposition_cpython_before_after"] = {
                "same_request": _cpython_before_after(src, "deposition", HEAVY[1][1]),
                "density_changed": _cpython_before_after(src, "deposition", HEAVY[1][1], vary=True),
            }
        root = Path(tmp) / "site"
        root.mkdir()
        # the bare page loads the unmodified engine of the source edition
        needs_all = parts & {"editions", "heavy", "single"}
        variants = VARIANTS if needs_all else {"snapshot": VARIANTS["snapshot"]}
        for name, options in variants.items():
            build.build(root / name, **options)
        if parts & {"repeat", "edits"}:
            _build_before(src, root / "before")
        dist = root / "snapshot"
        bare = root / "bare"
        bare.mkdir()
        (bare / "index.html").write_text(BARE_HTML)
        (bare / "bare.js").write_text(BARE_JS)
        (bare / "bare-worker.js").write_text(BARE_WORKER)
        (bare / "bench.html").write_text(BARE_HTML.replace("bare.js", "bench.js"))
        (bare / "bench.js").write_text(BARE_BENCH_JS)
        own = [p for p in dist.rglob("*") if p.is_file() and p.parts[-2] != "pyodide"]
        own = [p for p in own if "snapshot" not in p.relative_to(dist).parts]
        figures["own_assets_gzip_MB"] = round(
            sum(len(gzip.compress(p.read_bytes(), 9)) for p in own) / 1e6, 3
        )
        counter = _Counter()
        server = _serve_counting(build, root, counter)
        host, port = server.server_address[:2]
        base = f"http://{host}:{port}/"
        with sync_playwright() as pw:
            browser = pw.chromium.launch(executable_path=find_chromium(), args=chromium_args(pw))
            if "editions" in parts:
                ready: dict[str, list] = {k: [] for k in ("bare", *VARIANTS)}
                marks: dict[str, list] = {k: [] for k in VARIANTS}
                sent: dict[str, dict] = {}
                for _ in range(args.runs):
                    for name in ready:
                        # no service worker: the build's precaching (which starts once the
                        # page is ready) must not count as the page's own first-visit bytes
                        ctx = browser.new_context(service_workers="block")
                        counter.sent.clear()
                        if name == "bare":
                            ready[name].append(_time_to_ready(ctx, base + "bare/"))
                            until_ready = dict(counter.sent)
                        else:
                            elapsed, m = _time_to_ready(
                                ctx, base + name + "/", phases=True, counter=counter
                            )
                            ready[name].append(elapsed)
                            marks[name].append(m)
                            until_ready = counter.until_ready
                        sent[name] = {
                            k: v for k, v in until_ready.items() if not k.endswith("sw.js")
                        }
                        ctx.close()
                bare_s = statistics.median(ready["bare"])
                figures["bare_pyodide_ready_s"] = round(bare_s, 3)
                editions = {}
                for name in VARIANTS:
                    med = statistics.median(ready[name])
                    editions[name] = {
                        "ready_s": round(med, 3),
                        "ready_over_bare": round(med / bare_s, 3),
                        "phases_ms_after_navigation": _median_marks(marks[name]),
                        "first_visit_MB_until_ready": round(sum(sent[name].values()) / 1e6, 2),
                        "first_visit_MB_gzip": round(_gzip_bytes(root, sent[name]) / 1e6, 2),
                    }
                figures["editions"] = editions
                figures["bare_first_visit_MB"] = round(sum(sent["bare"].values()) / 1e6, 2)
            if "repeat" in parts:
                names = ["snapshot", "before"] + (["bytecode"] if "editions" in parts else [])
                figures["repeat_visit_on_disk_profile"] = _profile_visits(
                    pw,
                    base,
                    {
                        f"{name}{'' if sw == 'allow' else '_no_service_worker'}": (
                            name,
                            sw == "block",
                            (root / name / "js" / "warm.js").exists(),
                        )
                        for name in names
                        for sw in ("allow", "block")
                    },
                    args.profile_runs,
                )
            if "repeat_throttled" in parts:
                figures["repeat_visit_throttled_link"] = _throttled_visits(
                    pw, build, root, args.profile_runs
                )
            if "edits" in parts:
                figures["input_to_chart"] = _edit_figures(
                    browser, {"before": base + "before/", "after": base + "snapshot/"}, args.edits
                )
            if "heavy" in parts:
                ctx, page = _open_ready(browser, base + "snapshot/")
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
                cpy = _cpython_ms("burden", BURDEN_INPUTS, 5)
                web = _page_ms(page, "burden", BURDEN_INPUTS, 5)
                figures["burden_40_years"] = {
                    "cpython_ms": round(cpy, 2),
                    "page_ms": round(web, 2),
                    "page_over_cpython": round(web / cpy, 2),
                }
                cpy = _ranges_cpython_ms()
                web = _ranges_page_ms(page)
                figures["ranges_1000_samples_two_modes"] = {
                    "cpython_ms": round(cpy, 1),
                    "page_ms": round(web, 1),
                    "page_over_cpython": round(web / cpy, 2),
                }
                # the shift panel: a 24-h file at 1 s read, summarised and drawn; periods moved
                figures["shift_24h_1s_page"] = shift_figures(page, day_file(), min(args.edits, 20))
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
            if "single" in parts:
                figures["single_file"] = _single_file_figures(build, browser, root, base, args.runs)
            browser.close()
        server.shutdown()
    figures["load_average_at_end"] = [round(x, 2) for x in os.getloadavg()]
    print(json.dumps(figures, indent=1))
    return 0


if __name__ == "__main__":
    sys.exit(main())
