"""Bad input through the page: every numeric and choice field of every panel, absurd
combinations, a link with unknown units and choices, and malformed files for every file
import (the spectrum CSV of each panel that has one, and "Load inputs (JSON)").

The corpus is generated from ``driftdose.api.describe()`` (see corpus/cases.py), so a field
added to any calculation is covered without editing this file. One page serves every case
(the engine loads once); each case sets its bad value(s), waits for the panel's update and
checks, against the API run in CPython on the very inputs the page sent:

- each message is at its place (the field's own error element; a stage's or the chain's
  note; the form message for cross-field problems and fields not on screen) and names what
  it is about;
- no console error (the watch of conftest.py) and no NaN, undefined, Infinity, null, object
  or traceback anywhere in the page's text;
- the earlier results are kept (the results text unchanged) and marked out of date;
- the page stays responsive: the next valid input (the previous values put back) updates the
  results within 1 s, measured in the page with the panel's ``data-updates`` counter.

A page that hangs fails its case by Playwright's timeout and is replaced for the next case.
"""

from __future__ import annotations

import contextlib
import json
import time
from pathlib import Path
from urllib.parse import quote

import pytest

from .conftest import new_watched_page, wait_ready
from .corpus import cases as corpus
from .corpus.driver import (
    DESCRIPTION,
    PANELS,
    bad_text,
    check_clear,
    check_placement,
    install,
    oracle,
    page_inputs,
    step,
)

pytestmark = pytest.mark.e2e

# The next valid input must bring the results back without a stuck page. This is a hang check,
# not a speed target (speed lives in tests/bench/benchmark.py): a shared 2-core CI machine can
# take over 20 s to re-read a 20 000-row file under load, a stuck worker never answers.
SLOW_MS = 30_000  # waiting for any reply to a bad input; only a hang exceeds it
RESPONSIVE_MS = SLOW_MS

FIELD_CASES = corpus.field_cases()
COMBO_CASES = corpus.combo_cases()
CSV_CASES = corpus.csv_cases()
JSON_CASES = corpus.json_cases()
CSV_PANELS = [
    pid for pid in PANELS if any(f["name"] == "csv_text" for f in DESCRIPTION[pid]["fields"])
]


class Session:
    """The one page all cases share (replaced after a failure that may have left it hung)."""

    def __init__(self, browser, base_url: str, tmp: Path) -> None:
        self.browser = browser
        self.base_url = base_url
        self.tmp = tmp
        self.context = None
        self.outside: list[str] = []
        self.broken = True
        self.contexts: dict[tuple[str, str], tuple[str, str]] = {}
        self.good_csv = tmp / "good-spectrum.csv"
        self.good_csv.write_text(corpus.GOOD_CSV)

    def open(self, fragment: str = "") -> None:
        self.close()
        self.context, self.page, self.watch = new_watched_page(
            self.browser, self.base_url, viewport={"width": 1280, "height": 900}
        )
        self.page.set_default_timeout(SLOW_MS)
        self.page.goto(self.base_url + fragment)
        wait_ready(self.page)
        install(self.page)
        self.page.wait_for_function(
            "pids => pids.every(p => Number(document.getElementById('panel-' + p)"
            ".dataset.updates || 0) >= 1 && !document.getElementById('panel-' + p)"
            ".hasAttribute('aria-busy'))",
            arg=list(PANELS),
        )
        self.broken = False

    def close(self) -> None:
        if self.context is not None:
            self.outside += self.watch.outside
            with contextlib.suppress(Exception):
                self.context.close()
            self.context = None

    @contextlib.contextmanager
    def case(self):
        """Run one case: fresh page if the last one failed; console errors belong to it."""
        if self.broken:
            self.open()
        start = len(self.watch.errors)
        try:
            yield
        except BaseException:
            self.broken = True
            raise
        finally:
            new = self.watch.errors[start:]
            del self.watch.errors[start:]
        assert not new, f"console errors: {new}"

    # -- steps ----------------------------------------------------------------------------
    def run(self, pid: str, ops: list[dict], timeout: float = SLOW_MS, text: bool = False) -> dict:
        out = step(self.page, pid, ops, timeout, text)
        assert not out.get("timeout"), f"{pid}: no update within {timeout} ms"
        return out

    def snapshot(self, pid: str, paths: list[str] | None = None, text: bool = False) -> dict:
        return self.page.evaluate(
            "([pid, paths, t]) => window.__dd.snapshot(pid, paths, t)", [pid, paths or [], text]
        )

    def exists(self, pid: str, path: str) -> dict:
        return self.page.evaluate("([p, f]) => window.__dd.exists(p, f)", [pid, path])

    def settle(self, pid: str) -> dict:
        self.page.wait_for_function(
            "pid => !document.getElementById('panel-' + pid).hasAttribute('aria-busy')", arg=pid
        )
        return self.snapshot(pid)

    def read(self, pid: str, paths: list[str]) -> list[dict]:
        return self.page.evaluate("([p, f]) => window.__dd.read(p, f)", [pid, paths])

    def choose_file(self, pid: str, selector: str, files) -> dict:
        """Choose a file in a file field; return the panel's update (or a timeout mark)."""
        before = self.snapshot(pid)["updates"]
        t0 = time.monotonic()
        self.page.locator(selector).set_input_files(files)
        self.page.evaluate(
            "([p, n, t]) => { window.__dd.last[p] = null;"
            " window.__dd.wait(p, n, t).then(r => { window.__dd.last[p] = r; }); }",
            [pid, before, SLOW_MS],  # a hang check: a 20 000-row file takes seconds under load
        )
        self.page.wait_for_function("pid => window.__dd.last[pid]", arg=pid)
        out = self.page.evaluate("pid => window.__dd.last[pid]", pid)
        out["wall_ms"] = 1000 * (time.monotonic() - t0)
        return out

    # -- reaching a field -----------------------------------------------------------------
    def resolve(self, pid: str, path: str) -> str:
        """Turn ``stages.@tube.length`` into ``stages.<index>.length``, adding the stage."""
        if ".@" not in path:
            return path
        head, rest = path.split(".@", 1)
        kind, name = rest.split(".", 1)
        index = self.page.evaluate("([p, k]) => window.__dd.stageIndex(p, k)", [pid, kind])
        if index < 0:
            self.page.evaluate(
                "k => { const s = document.getElementById('sampling-new-stage-type');"
                " s.value = k; s.dispatchEvent(new Event('change', {bubbles: true})); }",
                kind,
            )
            self.page.evaluate("([p, t]) => window.__dd.click(p, 'Add stage', t)", [pid, SLOW_MS])
            index = self.page.evaluate("([p, k]) => window.__dd.stageIndex(p, k)", [pid, kind])
            assert index >= 0, f"could not add a {kind} stage"
        return f"{head}.{index}.{name}"  # "@<type>" paths also work in the page

    def reveal(self, pid: str, path: str) -> None:
        """Make the field at ``path`` visible by choosing what it depends on (found by trial)."""
        top = path.split(".")[0]
        if self.exists(pid, path)["visible"]:
            return
        known = self.contexts.get((pid, top))
        candidates = [known] if known else []
        for f in DESCRIPTION[pid]["fields"]:
            if f["kind"] == "choice" and self.exists(pid, f["name"])["visible"]:
                candidates += [(f["name"], c["value"]) for c in f["choices"]]
        for name, value in candidates:
            (previous,) = self.read(pid, [name])
            self.run(pid, [{"path": name, "value": value}])
            self.load_missing_files(pid)
            if self.exists(pid, path)["visible"]:
                self.contexts[(pid, top)] = (name, value)
                return
            self.run(pid, [{"path": name, "value": previous["value"]}])
        raise AssertionError(f"{pid}: no choice shows the field {path}")

    def load_missing_files(self, pid: str) -> None:
        """A visible file field without a file gets the good spectrum (a valid context)."""
        inputs = self.page.locator(f"#panel-{pid} .field:visible input[type=file]")
        for i in range(inputs.count()):
            field = inputs.nth(i)
            status = field.locator("xpath=..").locator(".file-status").inner_text()
            if status.startswith("No file"):
                before = self.snapshot(pid)["updates"]
                field.set_input_files(str(self.good_csv))
                self.page.wait_for_function(
                    "([p, n]) => Number(document.getElementById('panel-' + p).dataset.updates"
                    " || 0) > n",
                    arg=[pid, before],
                )

    def recover(self, pid: str) -> dict:
        """Bring the panel back to valid inputs (the published defaults) if it is not."""
        snap = self.settle(pid)
        if snap["state"] == "ok" and not snap["stale"]:
            return snap
        ops = []
        for f in DESCRIPTION[pid]["fields"]:
            if not self.exists(pid, f["name"])["exists"]:
                continue
            if f["kind"] == "choice":
                ops.append({"path": f["name"], "value": f["default"]})
            elif isinstance(f.get("default"), dict):
                value = f["default"]["value"]
                op = {"path": f["name"], "value": "" if value is None else str(value)}
                if len(f.get("units", [])) > 1:
                    op["unit"] = f["default"]["unit"]
                ops.append(op)
        self.run(pid, [*ops, {"path": ops[0]["path"], "cleanup": True}])
        self.load_missing_files(pid)
        return self.settle(pid)

    def prepare(self, pid: str, paths: list[str]) -> tuple[list[str], dict]:
        """Show the panel and the fields at ``paths`` with valid inputs; return resolved paths."""
        info = self.page.evaluate("([p, f]) => window.__dd.prepare(p, f)", [pid, paths])
        self.saved = info["values"]
        snap = info["snap"]
        ready = all(v["visible"] for v in info["fields"].values())
        if not ready or snap["state"] != "ok" or snap["stale"] or snap["busy"]:
            for p in paths:
                self.resolve(pid, p)
            self.recover(pid)
            for p in paths:
                self.reveal(pid, p)
            snap = self.settle(pid)
            self.saved = self.read(pid, paths)
        assert snap["state"] == "ok" and not snap["stale"], f"{pid}: not valid before: {snap}"
        return paths, snap


@pytest.fixture(scope="module")
def session(browser, base_url, tmp_path_factory):
    s = Session(browser, base_url, tmp_path_factory.mktemp("corpus"))
    yield s
    s.close()
    assert not s.outside, f"requests to other hosts: {s.outside}"


def _responsive(back: dict, after: dict, before: dict) -> list[str]:
    problems = []
    if back.get("timeout") or back["ms"] > RESPONSIVE_MS:
        problems.append(f"next valid input took {back['ms']:.0f} ms (limit {RESPONSIVE_MS})")
    if after["state"] != "ok" or after["stale"] or after["errors"] or after["formMessage"]:
        problems.append(f"valid inputs again but not current: {after}")
    if after["output"] != before["output"]:
        problems.append("results differ after putting the previous values back")
    return problems


def _check_reply_shown(pid: str, reply: dict, snap: dict, before: dict) -> list[str]:
    """The page shows ``reply`` (from the API in CPython) the way the corpus requires."""
    problems = []
    if reply["ok"]:
        if snap["state"] != "ok" or snap["stale"] or snap["errors"] or snap["formMessage"]:
            problems.append(f"valid inputs not shown as current results: {snap}")
        return problems
    problems += check_clear(pid, reply)
    problems += check_placement(pid, reply, snap)
    if snap["state"] != "invalid":
        problems.append(f"panel state {snap['state']!r} after an error reply")
    if not snap["stale"]:
        problems.append("earlier results not marked out of date")
    if snap["output"] != before["output"]:
        problems.append("earlier results changed after an error reply")
    return problems


def _run_case(s: Session, case: corpus.Case) -> None:
    pid = case.pid
    with s.case():
        paths, before = s.prepare(pid, [op["path"] for op in case.ops])
        ops = [{**op, "path": p} for op, p in zip(case.ops, paths, strict=True)]
        saved = s.saved
        snap = s.run(pid, ops, text=True)["snap"]
        problems = [f"shown: …{t}…" for t in bad_text(s.page, snap["text"])]
        if snap["state"] == "ok" and not case.must_fail:
            reply = {"ok": True}
        else:  # the API (in CPython) says what the page should show for these inputs
            reply = oracle(pid, page_inputs(s.page, pid))
            snap = s.snapshot(pid, [e["field"] for e in reply.get("errors", [])])
        if case.must_fail and reply["ok"]:
            problems.append("the API accepted a value that must be refused")
        problems += _check_reply_shown(pid, reply, snap, before)
        # the next valid input: the previous values back, handled within RESPONSIVE_MS
        restore = [
            {"path": r["path"], "value": r["value"], **({"unit": r["unit"]} if r["unit"] else {})}
            for r in saved
        ]
        back = s.run(pid, [*restore, {"path": restore[0]["path"], "cleanup": True}])
        problems += _responsive(back, back["snap"], before)
        assert not problems, "\n".join(problems)


@pytest.mark.parametrize("case", FIELD_CASES, ids=[c.id for c in FIELD_CASES])
def test_field_rejects_or_computes_bad_value(session, case):
    _run_case(session, case)


@pytest.mark.parametrize("case", COMBO_CASES, ids=[c.id for c in COMBO_CASES])
def test_absurd_combination(session, case):
    _run_case(session, case)


def test_corpus_covers_every_field():
    """Every numeric and choice field published by the API has the full set of bad values."""
    for pid, paths in corpus.covered_fields().items():
        for path in paths:
            names = {
                c.name.removeprefix(f"{path}-")
                for c in FIELD_CASES
                if c.pid == pid and c.ops[0]["path"] == path
            }
            is_choice = any(n.startswith("choice") for n in names)
            need = (
                {"choice-not-offered", "choice-injected"}
                if is_choice
                else {v[0] for v in corpus.NUMERIC_VALUES}
            )
            assert need <= names, f"{pid}.{path}: missing {need - names}"
    assert len(FIELD_CASES) + len(COMBO_CASES) >= 150
    assert {c.pid for c in FIELD_CASES} == set(PANELS)
    assert len(CSV_CASES) >= 20 and len(JSON_CASES) >= 20


# --- files -----------------------------------------------------------------------------------


def _file_payload(s: Session, fc: corpus.FileCase):
    if fc.size:
        path = s.tmp / fc.name / fc.filename
        path.parent.mkdir(exist_ok=True)
        if not path.exists():
            with open(path, "wb") as fh:
                fh.truncate(fc.size)  # sparse zeros: content does not matter, only the size
        return str(path)
    return {"name": fc.filename, "mimeType": "text/csv", "buffer": fc.content}


@pytest.mark.parametrize("pid", CSV_PANELS)
@pytest.mark.parametrize("fc", CSV_CASES, ids=[c.name for c in CSV_CASES])
def test_spectrum_file(session, pid, fc):
    s = session
    with s.case():
        s.prepare(pid, ["csv_text"])
        columns = s.read(pid, ["csv_diameter_column", "csv_concentration_column"])
        s.run(
            pid,
            [
                {"path": "csv_diameter_column", "value": "1"},
                {"path": "csv_concentration_column", "value": "2"},
            ],
        )
        before = s.settle(pid)
        file_input = f"#panel-{pid} .field[data-field=csv_text] input[type=file]"
        got = s.choose_file(pid, file_input, _file_payload(s, fc))
        assert not got.get("timeout"), "no update after choosing the file"
        if fc.columns:  # a mapping the pickers do not list (typed in a link): after the file,
            # whose own columns the pickers take when it is chosen
            s.run(
                pid,
                [
                    {"path": "csv_diameter_column", "value": fc.columns[0]},
                    {"path": "csv_concentration_column", "value": fc.columns[1]},
                ],
            )
        snap = s.snapshot(pid, ["csv_text"], text=True)
        problems = [f"shown: …{t}…" for t in bad_text(s.page, snap["text"])]
        reply = oracle(pid, page_inputs(s.page, pid))
        snap = s.snapshot(pid, [e["field"] for e in reply.get("errors", [])])
        problems += _check_reply_shown(pid, reply, snap, before)
        messages = " ".join(e["message"] for e in reply.get("errors", []))
        if fc.expect == "ok":
            if not reply["ok"]:
                problems.append(f"a valid but odd file was refused: {messages}")
            elif "csv_rows" not in reply["results"] and pid == "deposition":
                problems.append("no import report in the results")
        elif reply["ok"]:
            problems.append("a malformed file was accepted")
        elif fc.expect == "line" and "Line " not in messages:
            problems.append(f"no line number in {messages!r}")
        elif fc.expect == "refused":
            shown = " ".join(e["text"] for e in snap["errors"])
            if "MB" not in shown or "limit" not in shown:
                problems.append(f"size refusal not shown at the file field: {shown!r}")
        # the next valid input: the good file and the column mapping back
        back = s.choose_file(pid, file_input, str(s.good_csv))
        ms = s.run(
            pid,
            [
                {"path": "csv_diameter_column", "value": columns[0]["value"]},
                {"path": "csv_concentration_column", "value": columns[1]["value"]},
            ],
        )
        if back.get("timeout") or back["wall_ms"] > RESPONSIVE_MS:
            problems.append(f"a good file after the bad one took {back['wall_ms']:.0f} ms")
        problems += _responsive(ms, s.snapshot(pid), before)
        assert not problems, "\n".join(problems)


def _good_state(s: Session) -> dict:
    panels = s.page.evaluate(
        "async () => { const m = await import('./js/app.js'); const out = {};"
        " for (const [pid, c] of m.controllers) out[pid] = c.getState(); return out; }"
    )
    return {"format": corpus.STATE_FORMAT, "version": 1, "panel": "motion", "panels": panels}


def _load_inputs(s: Session, files) -> dict:
    """Choose an inputs file; wait for the tool message and every panel to settle."""
    counts = {pid: s.snapshot(pid)["updates"] for pid in PANELS}
    s.page.evaluate("() => { document.getElementById('tool-message').textContent = ''; }")
    t0 = time.monotonic()
    s.page.locator("#load-inputs").set_input_files(files)
    s.page.wait_for_function("() => document.getElementById('tool-message').textContent")
    message = s.page.locator("#tool-message").inner_text()
    s.page.wait_for_function(
        "pids => pids.every(p => !document.getElementById('panel-' + p).hasAttribute('aria-busy'))",
        arg=list(PANELS),
    )
    changed = [pid for pid in PANELS if s.snapshot(pid)["updates"] > counts[pid]]
    return {"message": message, "ms": 1000 * (time.monotonic() - t0), "changed": changed}


@pytest.mark.parametrize("fc", JSON_CASES, ids=[c.name for c in JSON_CASES])
def test_inputs_file(session, fc):
    s = session
    with s.case():
        befores = {}
        for pid in PANELS:  # shown, so that the results read as a person sees them
            s.page.evaluate("pid => window.__dd.showPanel(pid)", pid)
            befores[pid] = s.recover(pid)
        good = s.tmp / "good-inputs.json"
        good.write_text(json.dumps(_good_state(s)))
        payload = _file_payload(s, fc)
        if isinstance(payload, dict):
            payload["mimeType"] = "application/json"
        got = _load_inputs(s, payload)
        problems = [f"shown: …{t}…" for t in bad_text(s.page)]
        notice = s.page.locator("#link-notice")
        notice_text = notice.inner_text() if notice.is_visible() else ""
        name = fc.filename
        if fc.expect == "refused":
            if not got["message"].startswith(f"Could not load {name}: ") or got["changed"]:
                problems.append(f"not refused clearly: {got}")
        elif fc.expect == "any":
            if not got["message"].startswith((f"Could not load {name}: ", "Loaded inputs")):
                problems.append(f"no clear outcome: {got['message']!r}")
        elif not got["message"].startswith(f"Loaded inputs from {name}"):
            problems.append(f"not loaded: {got['message']!r}")
        if fc.expect == "notice" and not notice_text:
            problems.append("no notice about ignored or foreign entries")
        invalid = []
        for pid in PANELS:
            s.page.evaluate("pid => window.__dd.showPanel(pid)", pid)
            reply = oracle(pid, page_inputs(s.page, pid))
            snap = s.snapshot(pid, [e["field"] for e in reply.get("errors", [])])
            problems += _check_reply_shown(pid, reply, snap, befores[pid])
            if not reply["ok"]:
                invalid.append(pid)
        if fc.expect == "fields" and not invalid:
            problems.append("values of the wrong kind gave no message")
        if fc.expect in ("ok", "refused", "notice") and invalid:
            problems.append(f"panels made invalid: {invalid}")
        # the next valid input: the good inputs file
        back = _load_inputs(s, str(good))
        if back["ms"] > RESPONSIVE_MS:
            problems.append(f"loading good inputs afterwards took {back['ms']:.0f} ms")
        for pid in PANELS:
            after = s.snapshot(pid)
            if after["state"] != "ok" or after["stale"] or after["errors"]:
                problems.append(f"{pid}: good inputs again but not current: {after}")
        s.page.evaluate("() => { document.getElementById('link-notice').hidden = true; }")
        assert not problems, "\n".join(problems)


# --- links -----------------------------------------------------------------------------------


def _bad_link() -> str:
    """A link whose every numeric field has an unknown unit and every choice an unknown value."""
    parts = ["v=1", "panel=motion"]
    for pid in PANELS:
        for f in DESCRIPTION[pid]["fields"]:
            if isinstance(f.get("default"), dict) and "unit" in f["default"]:
                parts.append(f"{pid}.{f['name']}={quote('1~' + corpus.WRONG_UNIT)}")
            elif f["kind"] == "choice":
                parts.append(f"{pid}.{f['name']}={quote(corpus.WRONG_CHOICE)}")
            elif "item_fields" in f:
                item = {
                    i["name"]: {"value": "1", "unit": corpus.WRONG_UNIT} if i.get("units") else "1"
                    for i in f["item_fields"]
                }
                parts.append(f"{pid}.{f['name']}=" + quote("j:" + json.dumps([item])))
            elif "stage_types" in f:
                stages = [
                    {
                        "type": kind,
                        **{
                            sf["name"]: {"value": "1", "unit": corpus.WRONG_UNIT}
                            for sf in spec["fields"]
                            if sf.get("units")
                        },
                    }
                    for kind, spec in f["stage_types"].items()
                ]
                parts.append(f"{pid}.{f['name']}=" + quote("j:" + json.dumps(stages)))
    return "#" + "&".join(parts)


def test_link_with_unknown_units_and_choices(session):
    """Every field of a link carries a unit or choice the page does not offer."""
    s = session
    with s.case():
        s.open(_bad_link())
        problems = [f"shown: …{t}…" for t in bad_text(s.page)]
        for pid in PANELS:
            s.page.evaluate("pid => window.__dd.showPanel(pid)", pid)
            reply = oracle(pid, page_inputs(s.page, pid))
            fields = {e["field"] for e in reply.get("errors", [])}
            snap = s.snapshot(pid, sorted(fields))
            if reply["ok"]:
                problems.append(f"{pid}: a link full of unknown units was accepted")
                continue
            problems += [f"{pid}: {p}" for p in check_placement(pid, reply, snap)]
            problems += [f"{pid}: {p}" for p in check_clear(pid, reply)]
            units = [e for e in reply["errors"] if corpus.WRONG_UNIT in e["message"]]
            if len(units) < 2:
                problems.append(f"{pid}: unknown units not named: {reply['errors']}")
        # the next valid input: the published defaults, loaded as an inputs file
        defaults = {
            pid: {f["name"]: f["default"] for f in DESCRIPTION[pid]["fields"] if f["default"]}
            for pid in PANELS
        }
        good = s.tmp / "default-inputs.json"
        good.write_text(
            json.dumps({"format": corpus.STATE_FORMAT, "version": 1, "panels": defaults})
        )
        back = _load_inputs(s, str(good))
        if back["ms"] > RESPONSIVE_MS:
            problems.append(f"loading valid inputs afterwards took {back['ms']:.0f} ms")
        for pid in PANELS:
            after = s.snapshot(pid)
            if after["state"] != "ok" or after["errors"]:
                problems.append(f"{pid}: valid inputs but not current: {after}")
        s.broken = True  # the next case starts from a clean page
        assert not problems, "\n".join(problems)
