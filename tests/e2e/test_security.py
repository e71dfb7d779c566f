"""Security: a strict Content-Security-Policy, no inline script, and nothing a link, a file or
a result carries is ever run or parsed as markup.

Script and markup payloads go through every link parameter (every field of every panel, the
panel id, the format version, unknown keys, units, list items and stage names), every
imported text (spectrum CSV cells, headers and file names, the column mapping, inputs-file
keys and values) and the values that come back in results, warnings, messages and the
printable report. After each, nothing may have run (``window.__pwned`` stays undefined, no
dialog opens), no element of the payload may exist (no img, svg, iframe, script, link with a
``javascript:`` address or ``on...`` handler attribute), the payload must be readable as
text, and every request must stay on the test server (conftest's watch fails on other hosts;
here also no request for a payload's relative address such as ``x``).
"""

from __future__ import annotations

import functools
import http.server
import json
import re
import shutil
import threading
import urllib.request
from html.parser import HTMLParser
from pathlib import Path
from urllib.parse import quote, urlencode, urlsplit

import pytest

from .conftest import ROOT, new_watched_page, wait_ready
from .corpus.driver import DESCRIPTION, PANELS, install

pytestmark = pytest.mark.e2e

PAYLOADS = {
    "img-onerror": '<img src=x onerror="window.__pwned=1">',
    "script-tag": "<script>window.__pwned=2</script>",
    "javascript-url": "javascript:window.__pwned=3",
    "svg-onload": '"><svg onload=window.__pwned=4>',
    "template": "${window.__pwned=5}{{constructor.constructor('window.__pwned=6')()}}",
    "iframe": '\'><iframe src="javascript:alert(7)"></iframe>',
    "anchor": '<a href="javascript:alert(8)" id=pwnlink>x</a>',
    "entities": "&lt;img src=x onerror=alert(9)&gt;&#60;svg onload=alert(10)&#62;",
}
SHORT = list(PAYLOADS.values())  # each at most 80 characters (fits every text field)
LONG = "<b>" + "<img src=x onerror=alert(11)>" * 100 + "</b>"  # 3000 characters (in links)
HUGE = "<b>" + "<img src=x onerror=alert(12)>" * 10_000 + "</b>"  # 300 000 (in a file)
STATE_FORMAT = "drift-and-dose-inputs"

INERT_CHECK = r"""
() => {
  const own = (url) => {
    try { return new URL(url, location.href).origin === location.origin; } catch { return false; }
  };
  const all = [...document.querySelectorAll("*")];
  return {
    pwned: window.__pwned === undefined ? null : String(window.__pwned),
    // the record's own images: charts (PNG drawn from a canvas) and the link's QR code (GIF
    // drawn by the vendored QR library); anything else is payload markup
    imgs: [...document.querySelectorAll("img")]
      .filter((i) => !(i.classList.contains("report-chart")
        && i.getAttribute("src").startsWith("data:image/png")))
      .filter((i) => !(i.classList.contains("report-qr")
        && i.getAttribute("src").startsWith("data:image/gif;base64,")))
      .map((i) => i.outerHTML.slice(0, 80)),
    foreign: [...document.querySelectorAll(
      "svg, iframe, frame, object, embed, b, base, meta[http-equiv=refresh]")]
      .map((e) => e.tagName),
    scripts: [...document.scripts].filter((s) => !s.src || !own(s.src))
      .map((s) => s.outerHTML.slice(0, 80)),
    handlers: all
      .filter((e) => [...e.attributes].some((a) => a.name.toLowerCase().startsWith("on")))
      .map((e) => e.outerHTML.slice(0, 80)),
    jsUrls: all.filter((e) => ["href", "src", "action", "formaction", "xlink:href"]
      .some((n) => /^\s*javascript:/i.test(e.getAttribute(n) || "")))
      .map((e) => e.outerHTML.slice(0, 80)),
    pwnlink: Boolean(document.getElementById("pwnlink")),
  };
}
"""


class Guard:
    """Records dialogs and same-origin requests a payload might cause."""

    def __init__(self, page) -> None:
        self.dialogs: list[str] = []
        self.requests: list[str] = []
        page.on("dialog", self._dialog)
        page.on("request", lambda r: self.requests.append(r.url))

    def _dialog(self, dialog) -> None:
        self.dialogs.append(dialog.message)
        dialog.dismiss()

    def check(self, page, where: str) -> None:
        state = page.evaluate(INERT_CHECK)
        assert state["pwned"] is None, f"{where}: a payload ran (window.__pwned = {state['pwned']})"
        assert not self.dialogs, f"{where}: a dialog opened: {self.dialogs}"
        for key in ("imgs", "foreign", "scripts", "handlers", "jsUrls"):
            assert not state[key], f"{where}: payload markup in the DOM ({key}): {state[key]}"
        assert not state["pwnlink"], f"{where}: a payload element exists"
        stray = [
            u
            for u in self.requests
            if urlsplit(u).path.rstrip("/").rsplit("/", 1)[-1] in ("x", "pwned")
            or "javascript" in u
            or "%3C" in urlsplit(u).path
        ]
        assert not stray, f"{where}: requests made by a payload: {stray}"


def _shown(page) -> str:
    """Everything the page shows as text, with the values of its inputs and the report."""
    return page.evaluate(
        "() => [document.body.innerText, document.getElementById('report').textContent,"
        " ...[...document.querySelectorAll('input, select')].map(i => i.value)].join('\\n')"
    )


def _all_settled(page) -> None:
    page.wait_for_function(
        "pids => pids.every(p => Number(document.getElementById('panel-' + p).dataset.updates"
        " || 0) >= 1 && !document.getElementById('panel-' + p).hasAttribute('aria-busy'))",
        arg=list(PANELS),
    )


def _visit_panels_and_print(page, guard: Guard, where: str) -> None:
    """Show every panel (so all its output renders), check; build the report, check."""
    for pid in PANELS:
        page.locator(f"#tab-{pid}").click()
        guard.check(page, f"{where}, panel {pid}")
    page.evaluate("() => window.dispatchEvent(new Event('beforeprint'))")
    guard.check(page, f"{where}, printable report")


# --- the policy and the page's own markup -----------------------------------------------------


class _Markup(HTMLParser):
    def __init__(self) -> None:
        super().__init__()
        self.scripts: list[tuple[dict, str]] = []
        self.csp: list[str] = []
        self.handlers: list[str] = []
        self.js_urls: list[str] = []
        self._in_script: dict | None = None
        self._script_text = ""

    def handle_starttag(self, tag, attrs):
        a = dict(attrs)
        for name, value in attrs:
            if name.lower().startswith("on"):
                self.handlers.append(f"<{tag} {name}>")
            if value and re.match(r"\s*javascript:", value, re.I):
                self.js_urls.append(f"<{tag} {name}={value}>")
        if tag == "meta" and (a.get("http-equiv") or "").lower() == "content-security-policy":
            self.csp.append(a.get("content") or "")
        if tag == "script":
            self._in_script, self._script_text = a, ""

    def handle_data(self, data):
        if self._in_script is not None:
            self._script_text += data

    def handle_endtag(self, tag):
        if tag == "script" and self._in_script is not None:
            self.scripts.append((self._in_script, self._script_text))
            self._in_script = None


def _policy(dist_dir: Path) -> tuple[_Markup, dict[str, list[str]]]:
    parser = _Markup()
    parser.feed((dist_dir / "index.html").read_text(encoding="utf-8"))
    assert len(parser.csp) == 1, "exactly one Content-Security-Policy meta element"
    directives = {}
    for part in parser.csp[0].split(";"):
        words = part.split()
        if words:
            directives[words[0].lower()] = words[1:]
    return parser, directives


def test_csp_meta_is_present_and_strict(dist_dir):
    _, d = _policy(dist_dir)
    assert d["default-src"] == ["'self'"]
    script = d["script-src"]
    assert "'self'" in script
    assert set(script) <= {"'self'", "'wasm-unsafe-eval'"}, script  # wasm only, for Pyodide
    assert d["connect-src"] == ["'self'"]
    assert d["object-src"] == ["'none'"]
    assert d.get("base-uri") in (["'none'"], ["'self'"])
    assert d.get("form-action") == ["'none'"]
    for name, sources in d.items():
        for source in sources:
            assert source in ("'self'", "'none'", "'wasm-unsafe-eval'", "data:", "blob:"), (
                f"{name} allows {source}"
            )
            assert source != "'unsafe-inline'" and source != "'unsafe-eval'", name
    assert "data:" not in script and "blob:" not in script


def test_index_has_no_inline_script_handler_or_javascript_url(dist_dir):
    parser, _ = _policy(dist_dir)
    assert parser.scripts, "the page loads its scripts"
    for attrs, text in parser.scripts:
        assert attrs.get("src"), f"inline script: {text[:80]!r}"
        assert not text.strip(), f"a script element with a src also holds code: {text[:80]!r}"
        assert not urlsplit(attrs["src"]).netloc, f"script from another host: {attrs['src']}"
    assert not parser.handlers, parser.handlers
    assert not parser.js_urls, parser.js_urls


def test_page_scripts_insert_text_never_html():
    """The page's own scripts use no HTML sink nor string evaluation (vendored code aside)."""
    sinks = re.compile(
        r"\.innerHTML|\.outerHTML|insertAdjacentHTML|document\.write|\beval\s*\(|new Function"
        r"|createContextualFragment|DOMParser|srcdoc|setTimeout\(\s*[\"'`]|setAttribute\(\s*[\"'`]on"
        r"|[\"']on[a-z]+[\"']\s*:"
    )
    found = []
    for path in sorted((ROOT / "site").glob("**/*.js")):
        if "node_modules" in path.parts or "vendor" in path.parts:
            continue
        for n, line in enumerate(path.read_text(encoding="utf-8").splitlines(), start=1):
            if sinks.search(line):
                found.append(f"{path.relative_to(ROOT)}:{n}: {line.strip()}")
    assert not found, "\n".join(found)


def test_csp_blocks_an_injected_inline_script(browser, base_url):
    """The policy is in force: an inline script added at run time does not run."""
    context, page, watch = new_watched_page(browser, base_url)
    try:
        page.goto(base_url)
        wait_ready(page)
        blocked = page.evaluate(
            """() => new Promise((resolve) => {
              document.addEventListener("securitypolicyviolation",
                (e) => resolve(e.violatedDirective), { once: true });
              const s = document.createElement("script");
              s.textContent = "window.__inline = 1";
              document.head.append(s);
              setTimeout(() => resolve(null), 2000);
            })"""
        )
        assert blocked and blocked.startswith("script-src"), blocked
        assert page.evaluate("() => window.__inline") is None
        other = [e for e in watch.errors if "Content Security Policy" not in e]
        assert not other, other
        assert not watch.outside
    finally:
        context.close()


def _header_policy(url: str) -> str | None:
    with urllib.request.urlopen(url, timeout=30) as reply:  # the local test server only
        return reply.headers.get("Content-Security-Policy")


def test_served_policy_header_on_page_and_worker(dist_dir, base_url):
    """The server sends the page's policy as a header with every file (the worker included,
    which a meta element does not govern), plus frame-ancestors, which a meta element cannot
    carry."""
    _, meta = _policy(dist_dir)
    for path in ("", "index.html", "js/worker.js", "js/app.js", "forms.json"):
        header = _header_policy(base_url + path)
        assert header is not None, f"no policy header on /{path}"
        directives = {}
        for part in header.split(";"):
            words = part.split()
            if words:
                directives[words[0].lower()] = words[1:]
        assert directives.pop("frame-ancestors") == ["'none'"], path
        assert directives == meta, f"/{path}: header policy differs from the page's meta policy"
    assert "blob:" not in json.dumps(meta), "the served page uses no blob: workers or images"


def test_worker_is_governed_by_the_header_policy(browser, build_module, dist_dir, tmp_path):
    """A worker script served by the same server cannot evaluate strings (script-src has no
    'unsafe-eval'): the header policy reaches workers."""
    copy = tmp_path / "dist"
    shutil.copytree(dist_dir, copy)
    (copy / "probe-worker.js").write_text(
        "let out; try { out = String(eval('6*7')); } catch (e) { out = e.name; }"
        " postMessage(out);\n",
        encoding="utf-8",
    )
    server, _ = build_module.serve(copy, 0)
    host, port = server.server_address[:2]
    url = f"http://{host}:{port}/"
    context, page, watch = new_watched_page(browser, url)
    try:
        page.goto(url)
        answer = page.evaluate(
            """() => new Promise((resolve) => {
              const w = new Worker("probe-worker.js");
              w.onmessage = (e) => resolve(e.data);
              w.onerror = (e) => resolve("error: " + e.message);
            })"""
        )
        assert answer == "EvalError", answer
        assert not watch.outside
    finally:
        context.close()
        server.shutdown()


def test_other_sites_cannot_frame_the_page(browser, base_url, tmp_path):
    """frame-ancestors 'none': a page of another origin (another port) that frames the tool
    gets an empty frame."""
    (tmp_path / "framer.html").write_text(
        f'<!doctype html><iframe id="f" src="{base_url}"></iframe>', encoding="utf-8"
    )
    handler = functools.partial(http.server.SimpleHTTPRequestHandler, directory=str(tmp_path))
    other = http.server.ThreadingHTTPServer(("127.0.0.1", 0), handler)
    threading.Thread(target=other.serve_forever, daemon=True).start()
    context = browser.new_context()
    try:
        page = context.new_page()
        page.goto(f"http://127.0.0.1:{other.server_address[1]}/framer.html")
        page.wait_for_timeout(1500)
        child = [f for f in page.frames if f is not page.main_frame]
        assert child, "no frame"
        assert (
            not child[0].url.startswith(base_url)
            or child[0].evaluate("() => document.documentElement.hasAttribute('data-engine')")
            is False
        ), "the tool loaded inside another site's frame"
    finally:
        context.close()
        other.shutdown()


# --- links ------------------------------------------------------------------------------------


def _field_values(payloads: list[str]) -> dict[str, dict[str, object]]:
    """Every field of every panel with a payload (rotating), in the link's raw form."""
    out: dict[str, dict[str, object]] = {}
    k = 0

    def nxt() -> str:
        nonlocal k
        k += 1
        return payloads[k % len(payloads)]

    for pid in PANELS:
        values: dict[str, object] = {}
        for f in DESCRIPTION[pid]["fields"]:
            if "item_fields" in f:
                values[f["name"]] = [
                    {i["name"]: {"value": nxt(), "unit": nxt()} for i in f["item_fields"]},
                    {"basis": nxt(), nxt(): nxt()},
                ]
            elif "stage_types" in f:
                stages = []
                for kind, spec in f["stage_types"].items():
                    stage = {"type": kind}
                    for sf in spec["fields"]:
                        stage[sf["name"]] = (
                            nxt()
                            if sf["kind"] in ("text", "choice")
                            else {
                                "value": nxt(),
                                "unit": nxt(),
                            }
                        )
                    stages.append(stage)
                stages.append({"type": nxt(), nxt(): nxt()})
                values[f["name"]] = stages
            elif f.get("accept"):
                values[f["name"]] = f"{nxt()},{nxt()}\n{nxt()},1\n"
            elif isinstance(f.get("default"), dict):
                values[f["name"]] = {"value": nxt(), "unit": nxt()}
            else:
                values[f["name"]] = nxt()
        values[nxt()] = nxt()  # an unknown field
        values["demo"] = nxt()
        out[pid] = values
    return out


def _link(panels: dict[str, dict[str, object]], version: str, panel: str, extra=()) -> str:
    pairs = [("v", version), ("panel", panel)]
    for pid, values in panels.items():
        for name, raw in values.items():
            if isinstance(raw, dict) and "value" in raw:
                pairs.append((f"{pid}.{name}", f"{raw['value']}~{raw['unit']}"))
            elif isinstance(raw, str) and "\n" not in raw:
                pairs.append((f"{pid}.{name}", raw))
            else:
                pairs.append((f"{pid}.{name}", "j:" + json.dumps(raw)))
    pairs += list(extra)
    return "#" + urlencode(pairs, quote_via=quote)


def _open(page, url: str) -> Guard:
    guard = Guard(page)
    page.goto(url)
    wait_ready(page)
    _all_settled(page)
    return guard


def test_link_payloads_in_every_parameter(watched, base_url):
    page, _ = watched
    extra = [(p, "1") for p in SHORT[:3]] + [(f"motion.{p}", p) for p in SHORT[3:6]]
    extra += [(f"{p}.field", p) for p in SHORT[6:]]
    url = base_url + _link(_field_values(SHORT), SHORT[0], SHORT[1], extra)
    guard = _open(page, url)
    _visit_panels_and_print(page, guard, "link with payloads")
    shown = _shown(page)
    for marker in ("<img src=x", "<script>", "javascript:", "<svg onload", "${window", "<iframe"):
        assert marker in shown, f"{marker!r} not shown as text"
    notice = page.locator("#link-notice")
    assert notice.is_visible() and "they were refused: " in notice.inner_text()
    assert "<" in notice.inner_text()  # unknown names quoted as text


def test_link_very_long_payloads(watched, base_url):
    page, _ = watched
    guard = _open(page, base_url + _link(_field_values([LONG]), LONG, LONG))
    _visit_panels_and_print(page, guard, "link with long payloads")
    assert "<img src=x onerror=alert(11)>" in _shown(page)


def _valid_with_payload_text() -> dict[str, dict[str, object]]:
    """Valid inputs whose free text (stage names, CSV headers and mapping) holds payloads."""
    stages = DESCRIPTION["sampling"]["fields"][0]["stage_types"]
    chain = []
    for i, (kind, spec) in enumerate(stages.items()):
        stage = {"type": kind}
        for f in spec["fields"]:
            if f["default"] is not None and not (
                isinstance(f["default"], dict) and f["default"]["value"] is None
            ):
                stage[f["name"]] = f["default"]
        stage["name"] = SHORT[i % len(SHORT)][:60]
        chain.append(stage)
    head_d, head_c = SHORT[0], SHORT[3]
    quoted = [h.replace('"', '""') for h in (head_d, head_c)]
    csv = f'"{quoted[0]}";"{quoted[1]}"\n20;1000\n40;3000\n80;2000\n160;500\n'
    spectrum = {
        "csv_text": csv,
        "csv_diameter_column": head_d,
        "csv_concentration_column": head_c,
        "csv_concentration_type": "per_bin",
    }
    return {
        "deposition": {"size_source": "csv", **spectrum},
        "sampling": {"stages": chain, "size_source": "csv", **spectrum},
    }


def test_link_payloads_that_come_back_in_results_and_report(watched, base_url):
    page, _ = watched
    guard = _open(page, base_url + _link(_valid_with_payload_text(), "1", "sampling"))
    for pid in ("deposition", "sampling"):
        state = page.evaluate("pid => document.getElementById('panel-' + pid).dataset.state", pid)
        errors = page.locator(
            f"#panel-{pid} .error, #panel-{pid} .form-message"
        ).all_text_contents()
        assert state == "ok", f"{pid} did not compute with payload text: {errors}"
    _visit_panels_and_print(page, guard, "results with payload names")
    results = page.locator("#panel-sampling .outputs").inner_text()
    assert SHORT[0][:30] in results and SHORT[1][:30] in results  # stage names, as text
    report = page.locator("#report").text_content()
    assert SHORT[0] in report and SHORT[3] in report  # mapping and names in the record


# --- files and typed text on one page ---------------------------------------------------------


@pytest.fixture(scope="module")
def one_page(browser, base_url):
    context, page, watch = new_watched_page(
        browser, base_url, viewport={"width": 1280, "height": 900}
    )
    page.set_default_timeout(30_000)
    page.goto(base_url)
    wait_ready(page)
    _all_settled(page)
    install(page)
    guard = Guard(page)
    yield page, watch, guard
    context.close()
    assert not watch.outside, f"requests to other hosts: {watch.outside}"
    assert not watch.errors, f"console errors: {watch.errors}"


def _wait_update(page, pid: str, before: int) -> None:
    page.wait_for_function(
        "([p, n]) => { const s = document.getElementById('panel-' + p);"
        " return Number(s.dataset.updates || 0) > n && !s.hasAttribute('aria-busy'); }",
        arg=[pid, before],
    )


def _updates(page, pid: str) -> int:
    return page.evaluate("p => Number(document.getElementById('panel-' + p).dataset.updates)", pid)


CSV_PANELS = [
    pid for pid in PANELS if any(f["name"] == "csv_text" for f in DESCRIPTION[pid]["fields"])
]


@pytest.mark.parametrize("pid", CSV_PANELS)
@pytest.mark.parametrize("name", list(PAYLOADS))
def test_spectrum_file_payloads(one_page, pid, name):
    """Payloads as the file name, header cells, data cells and column mapping."""
    page, _, guard = one_page
    p = PAYLOADS[name]
    page.locator(f"#tab-{pid}").click()
    panel = page.locator(f"#panel-{pid}")
    panel.locator(".field[data-field=size_source] select").select_option("csv")
    quoted = p.replace('"', '""')
    files = [
        f'"{quoted}";n\n20;1000\n40;{quoted}\n',  # a data cell: refused, quoted in the message
        f'd;"{quoted}"\n20;1000\n40;3000\n',  # a header: the mapping below points nowhere
    ]
    for i, text in enumerate(files):
        for field, value in (("csv_diameter_column", p[:80]), ("csv_concentration_column", "2")):
            # a column picker (a select of the file's headers) keeps a name it does not list,
            # as a link gives it: the payload is offered as its own option and chosen
            panel.locator(f".field[data-field={field}] select").evaluate(
                """(select, value) => {
                  if (![...select.options].some((o) => o.value === value)) {
                    const option = document.createElement("option");
                    option.value = value;
                    option.textContent = value;
                    select.append(option);
                  }
                  select.value = value;
                  select.dispatchEvent(new Event("change", { bubbles: true }));
                }""",
                value,
            )
        before = _updates(page, pid)
        panel.locator(".field[data-field=csv_text] input[type=file]").set_input_files(
            {"name": f"{p[:100]}-{i}.csv", "mimeType": "text/csv", "buffer": text.encode()}
        )
        _wait_update(page, pid, before)
        guard.check(page, f"{pid} spectrum file {name} #{i}")
        shown = _shown(page)
        assert p[:12] in shown, f"{p[:12]!r} not shown as text"
        page.evaluate("() => window.dispatchEvent(new Event('beforeprint'))")
        guard.check(page, f"{pid} spectrum file {name} #{i}, report")


@pytest.mark.parametrize("name", list(PAYLOADS))
def test_inputs_file_payloads(one_page, tmp_path, name):
    """An inputs file whose every key and value is a payload."""
    page, _, guard = one_page
    p = PAYLOADS[name]
    state = {
        "format": STATE_FORMAT,
        "version": p,
        "panel": p,
        "tool_version": p,
        "saved": p,
        "panels": {**_field_values([p]), p: {p: p}, HUGE[:100_000]: {}},
    }
    state["panels"]["motion"]["time"] = {"value": HUGE, "unit": p}  # a file well under 1 MB
    path = tmp_path / "inputs.json"
    path.write_text(json.dumps(state))
    page.locator("#load-inputs").set_input_files(
        {"name": f"{p[:100]}.json", "mimeType": "application/json", "buffer": path.read_bytes()}
    )
    page.locator("#tool-message").filter(has_text="inputs").wait_for()
    _all_settled(page)
    _visit_panels_and_print(page, guard, f"inputs file {name}")
    assert p[:12] in _shown(page) + page.locator("#link-notice").inner_text()


@pytest.mark.parametrize("name", list(PAYLOADS))
def test_stage_name_payloads_typed(one_page, name):
    """Stage names typed in the chain builder come back in tables, warnings and the report."""
    page, _, guard = one_page
    p = PAYLOADS[name][:60]
    page.locator("#tab-sampling").click()
    defaults = {f["name"]: f["default"] for f in DESCRIPTION["sampling"]["fields"] if f["default"]}
    state = {"format": STATE_FORMAT, "version": 1, "panels": {"sampling": defaults}}
    before = _updates(page, "sampling")
    page.locator("#load-inputs").set_input_files(
        {"name": "chain.json", "mimeType": "application/json", "buffer": json.dumps(state).encode()}
    )
    _wait_update(page, "sampling", before)
    names = page.locator("#panel-sampling fieldset.stage .field[data-stage-field=name] input")
    for i in range(names.count()):
        before = _updates(page, "sampling")
        names.nth(i).fill(p)
        _wait_update(page, "sampling", before)
    assert page.evaluate("() => document.getElementById('panel-sampling').dataset.state") == "ok"
    guard.check(page, f"stage names {name}")
    assert p in page.locator("#panel-sampling .outputs").text_content()
    page.evaluate("() => window.dispatchEvent(new Event('beforeprint'))")
    guard.check(page, f"stage names {name}, report")
    assert p in page.locator("#report").text_content()
