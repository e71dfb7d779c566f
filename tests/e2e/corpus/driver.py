"""Drive the page's panels generically from the published field descriptions.

A field is addressed by a path: ``name`` for a top-level field, ``modes.<i>.<name>`` for a
field of a list item (lognormal modes) and ``stages.<i>.<name>`` for a field of a sampling
stage; these are also the ``field`` names the API gives its errors. Values are set the way a
person's typing and leaving the field does (``input`` and ``change`` events), all fields of
one step in the same task so the panel computes once. Every step measures, in the page, the
time from the input to the panel's next update (its ``data-updates`` counter).

The API itself is the oracle for what a set of inputs should give: the test reads the exact
inputs the page sends (``controllers`` of js/app.js) and asks ``driftdose.api.handle`` in
CPython, then checks that the page shows each message where it belongs.
"""

from __future__ import annotations

import json
import re
from typing import Any

from driftdose import api

DESCRIPTION = api.describe()["calculations"]
KIND = {"motion": "motion", "deposition": "deposition", "sampling": "sampling"}
PANELS = tuple(KIND)

# Words that must never be shown: signs of a number or object that went through unformatted.
BAD_TEXT = re.compile(r"NaN|undefined|Infinity|\[object \w+\]|Internal error|Traceback|\bnull\b")

HELPERS = r"""
(() => {
  if (window.__dd) return;
  const panelOf = (pid) => document.getElementById(`panel-${pid}`);
  const shown = (node) => Boolean(node) && node.checkVisibility();
  const esc = (s) => CSS.escape(s);
  function topWrap(pid, name) {
    const panel = panelOf(pid);
    return [...panel.querySelectorAll(`.field[data-field="${esc(name)}"]`)]
      .find((w) => !w.parentElement.closest(".field, fieldset.stage, fieldset.item")) || null;
  }
  function wrapFor(pid, path) {
    const parts = path.split(".");
    if (parts.length === 1) return topWrap(pid, path);
    const [list, idx, name] = parts;
    const panel = panelOf(pid);
    if (list === "stages") {
      const stage = idx.startsWith("@")
        ? panel.querySelector(`fieldset.stage[data-type="${esc(idx.slice(1))}"]`)
        : panel.querySelector(`fieldset.stage[data-index="${esc(idx)}"]`);
      return stage ? stage.querySelector(`.field[data-stage-field="${esc(name)}"]`) : null;
    }
    const outer = topWrap(pid, list);
    const item = outer ? outer.querySelectorAll("fieldset.item")[Number(idx)] : null;
    return item ? item.querySelector(`.field[data-field="${esc(name)}"]`) : null;
  }
  function controls(wrap) {
    const row = wrap.querySelector(":scope > .field-row");
    if (!row) return { control: wrap.querySelector("input, select"), unit: null };
    const [control, second] = row.children;
    return { control, unit: second && second.tagName === "SELECT" ? second : null };
  }
  function ownerOf(node) {
    const stage = node.closest("fieldset.stage");
    const field = node.closest(".field");
    if (stage) {
      if (field && stage.contains(field) && field.dataset.stageField) {
        return `stages.${stage.dataset.index}.${field.dataset.stageField}`;
      }
      return `stages.${stage.dataset.index}`;
    }
    if (node.parentElement.matches("fieldset.chain")) return "stages";
    let top = field;
    while (top && top.parentElement.closest(".field")) top = top.parentElement.closest(".field");
    const item = node.closest("fieldset.item");
    if (top && item && top.contains(item)) {
      // a record of a list field: the value's path, or the record's for a message about it
      const index = [...top.querySelectorAll("fieldset.item")].indexOf(item);
      const where = `${top.dataset.field}.${index}`;
      if (field && field !== top && item.contains(field)) return `${where}.${field.dataset.field}`;
      return where;
    }
    return top ? top.dataset.field : "?";
  }
  function waitUpdate(pid, before, timeout) {
    const panel = panelOf(pid);
    const t0 = performance.now();
    return new Promise((resolve) => {
      const check = () => {
        const n = Number(panel.dataset.updates || 0);
        if (n > before && !panel.hasAttribute("aria-busy")) {
          resolve({ ms: performance.now() - t0, updates: n });
          return true;
        }
        if (performance.now() - t0 > timeout) {
          resolve({ ms: performance.now() - t0, updates: n, timeout: true });
          return true;
        }
        return false;
      };
      if (check()) return;
      const timer = setInterval(() => { if (check()) clearInterval(timer); }, 2);
    });
  }
  window.__dd = {
    exists(pid, path) {
      const wrap = wrapFor(pid, path);
      return { exists: Boolean(wrap), visible: shown(wrap) };
    },
    read(pid, paths) {
      return paths.map((path) => {
        const { control, unit } = controls(wrapFor(pid, path));
        return { path, value: control.value, unit: unit ? unit.value : null };
      });
    },
    last: {},
    /**
     * Apply ops [{path, value?, unit?, inject?, injectUnit?}] at once. The time to the panel's
     * next update lands in last[pid] ({ms, updates} or {timeout: true}); the test waits for it
     * from outside, so a page that hangs fails by Playwright's own timeout.
     */
    start(pid, ops, timeout, withText) {
      this.last[pid] = null;
      this.run(pid, ops, timeout).then(
        (r) => { this.last[pid] = { ...r, snap: this.snapshot(pid, [], withText) }; },
        (err) => { this.last[pid] = { error: String(err) }; });
    },
    async run(pid, ops, timeout) {
      const touched = new Set();
      for (const op of ops) {
        const wrap = wrapFor(pid, op.path);
        if (!wrap) throw new Error(`no field ${op.path} in ${pid}`);
        const { control, unit } = controls(wrap);
        for (const [key, target] of [["inject", control], ["injectUnit", unit]]) {
          if (!(key in op)) continue;
          const option = document.createElement("option");
          option.value = op[key];
          option.textContent = op[key];
          option.dataset.injected = "1";
          target.append(option);
          target.value = op[key];
          touched.add(target);
        }
        if ("value" in op && control.dataset.picker !== undefined
            && ![...control.options].some((o) => o.value === op.value)) {
          // a column picker keeps a name or number it does not list, as a link gives it
          const option = document.createElement("option");
          option.value = op.value;
          option.textContent = op.value;
          control.append(option);
        }
        if ("value" in op) { control.value = op.value; touched.add(control); }
        if ("unit" in op && unit) { unit.value = op.unit; touched.add(unit); }
      }
      if (ops.some((op) => op.cleanup)) this.removeInjected();
      const before = Number(panelOf(pid).dataset.updates || 0);
      const done = waitUpdate(pid, before, timeout);
      for (const node of touched) {
        node.dispatchEvent(new Event("input", { bubbles: true }));
        node.dispatchEvent(new Event("change", { bubbles: true }));
      }
      return done;
    },
    /** Click a button (by its text) inside the panel and resolve on the update. */
    async click(pid, text, timeout) {
      const panel = panelOf(pid);
      const button = [...panel.querySelectorAll("button")]
        .find((b) => b.textContent.trim() === text);
      if (!button) throw new Error(`no button ${text}`);
      const before = Number(panel.dataset.updates || 0);
      const done = waitUpdate(pid, before, timeout);
      button.click();
      return done;
    },
    wait(pid, before, timeout) { return waitUpdate(pid, before, timeout); },
    removeInjected() {
      for (const node of document.querySelectorAll("option[data-injected]")) node.remove();
    },
    stageIndex(pid, type) {
      const stage = panelOf(pid).querySelector(`fieldset.stage[data-type="${esc(type)}"]`);
      return stage ? Number(stage.dataset.index) : -1;
    },
    /** Show the panel; say which paths are visible; the values there; and a snapshot. */
    prepare(pid, paths) {
      this.showPanel(pid);
      const fields = Object.fromEntries(paths.map((p) => [p, this.exists(pid, p)]));
      const ready = Object.values(fields).every((f) => f.exists);
      return { fields, snap: this.snapshot(pid, []), values: ready ? this.read(pid, paths) : null };
    },
    snapshot(pid, paths, withText) {
      const panel = panelOf(pid);
      const errors = [];
      for (const node of panel.querySelectorAll(".error")) {
        if (!node.textContent.trim() || !shown(node)) continue;
        errors.push({ owner: ownerOf(node), text: node.textContent });
      }
      const message = panel.querySelector(".form-message");
      const fields = {};
      for (const path of paths || []) fields[path] = this.exists(pid, path);
      return {
        updates: Number(panel.dataset.updates || 0),
        state: panel.dataset.state || "",
        busy: panel.hasAttribute("aria-busy"),
        stale: shown(panel.querySelector(".stale-note")),
        formMessage: shown(message) ? message.textContent : "",
        errors,
        fields,
        output: panel.querySelector(".output-body").innerText,
        fileStatus: [...panel.querySelectorAll(".file-status")].filter(shown)
          .map((n) => n.textContent),
        text: withText ? this.pageText() : "",
      };
    },
    /** Every text the page shows or holds for showing, to search for leaked NaN and such. */
    pageText() {
      const held = [...document.querySelectorAll(
        ".error, .form-message, .stale-note, .warnings, .notice, .tool-message, .file-status, "
        + ".demo-note, .outputs, #report, #link-notice, #engine-text")].map((n) => n.textContent);
      return `${document.body.innerText}\n${held.join("\n")}`;
    },
    showPanel(pid) {
      const section = panelOf(pid);
      if (section.hidden) document.getElementById(`tab-${pid}`).click();
      return !section.hidden;
    },
  };
})();
"""


def step(page, pid: str, ops: list[dict], timeout: float, text: bool = False) -> dict:
    """Apply ``ops`` to panel ``pid`` and wait for its update.

    Returns {ms, updates, snap}: the time from the input to the update, measured in the page,
    and the panel's snapshot right after it (with the page's text if ``text``). The wait is
    Playwright's (outside the page), so a page whose main thread hangs makes this raise
    instead of waiting for ever.
    """
    page.evaluate(
        "([pid, ops, t, x]) => window.__dd.start(pid, ops, t, x)", [pid, ops, timeout, text]
    )
    handle = page.wait_for_function("pid => window.__dd.last[pid]", arg=pid, timeout=timeout + 5000)
    out = handle.json_value()
    if "error" in out:
        raise AssertionError(out["error"])
    return out


def install(page) -> None:
    """Install the helpers (again after every navigation)."""
    page.evaluate(HELPERS)


def page_inputs(page, pid: str) -> dict[str, Any]:
    """The inputs the panel sends to the engine, read from the page's own controller."""
    text = page.evaluate(
        "async (pid) => JSON.stringify("
        "(await import('./js/app.js')).controllers.get(pid).inputs())",
        pid,
    )
    return json.loads(text)


def oracle(pid: str, inputs: dict[str, Any]) -> dict[str, Any]:
    """The reply of the API (in CPython) for the inputs the page sends."""
    return api.handle({"kind": KIND[pid], "inputs": inputs})


def bad_text(page, text: str | None = None) -> list[str]:
    """Places where the page shows NaN, undefined, Infinity, null, an object or a traceback."""
    if text is None:
        text = page.evaluate("() => window.__dd.pageText()")
    return [text[max(0, m.start() - 50) : m.end() + 50] for m in BAD_TEXT.finditer(text)]


def field_label(pid: str, path: str) -> str:
    """The label of the field at ``path`` (a top-level, mode or stage field)."""
    parts = path.split(".")
    fields = {f["name"]: f for f in DESCRIPTION[pid]["fields"]}
    if len(parts) == 1:
        return fields[path]["label"] if path in fields else ""
    outer = fields.get(parts[0], {})
    if "item_fields" in outer:
        return next((f["label"] for f in outer["item_fields"] if f["name"] == parts[2]), "")
    for spec in outer.get("stage_types", {}).values():
        for f in spec["fields"]:
            if f["name"] == parts[2]:
                return f["label"]
    return ""


def mentions_field(pid: str, path: str, message: str) -> bool:
    """Whether a message names what it is about, so a person knows what to correct."""
    low = message.lower()
    parts = path.split(".")
    if parts[0] == "stages" and len(parts) == 3:
        return re.match(rf"stage {int(parts[1]) + 1}\b", low) is not None
    if parts[0] == "modes":
        return low.startswith("mode ") or "mode" in low
    label = field_label(pid, path)
    core = re.sub(r"\s*\(.*?\)", "", label).split(",")[0].strip().lower()
    return bool(core) and (core in low or core.split()[-1] in low)


def check_placement(pid: str, reply: dict[str, Any], snap: dict[str, Any]) -> list[str]:
    """Check that every error of ``reply`` is shown at the right place and nothing else is.

    The right place: the field's own error element when the field is on screen (the first
    message of each field; a further one may join the panel's form message or the stage's
    note); the chain's note for ``stages``; the form message for cross-field problems and
    fields not on screen.
    """
    problems: list[str] = []
    by_owner: dict[str, str] = {}
    for e in snap["errors"]:
        by_owner[e["owner"]] = by_owner.get(e["owner"], "") + " " + e["text"]
    form = snap["formMessage"]
    seen: set[str] = set()
    messages = [e["message"] for e in reply.get("errors", [])]
    for e in reply.get("errors", []):
        f, msg = e["field"], e["message"]
        info = snap["fields"].get(f, {"exists": False, "visible": False})
        if f == "stages":
            owner = "stages"
        elif "." in f:  # a value inside a record (a stage, a mode)
            owner = f if info["visible"] else ".".join(f.split(".")[:2])
        elif f and info["visible"]:
            owner = f
        else:
            owner = ""
        first = owner not in seen
        seen.add(owner)
        places = [by_owner.get(owner, "")] if owner else [form]
        if owner and not first:
            places += [form, by_owner.get(".".join(owner.split(".")[:2]), "")]
        if not any(msg in p for p in places):
            problems.append(
                f"message for {f!r} not at {owner or 'the form message'}: {msg!r}; "
                f"shown: {by_owner}, form: {form!r}"
            )
    for owner, text in by_owner.items():
        if not any(m in text for m in messages):
            problems.append(f"stray message at {owner}: {text.strip()!r}")
    if form and not any(m in form for m in messages):
        problems.append(f"stray form message: {form!r}")
    return problems


def check_clear(pid: str, reply: dict[str, Any]) -> list[str]:
    """Messages must be plain, bounded and name the field they are about."""
    problems = []
    for e in reply.get("errors", []):
        msg = e["message"]
        if not msg.strip() or len(msg) > 600 or BAD_TEXT.search(msg):
            problems.append(f"unclear message for {e['field']!r}: {msg!r}")
        elif e["field"] and not mentions_field(pid, e["field"], msg):
            if e["field"] not in ("csv_text", "stages"):
                problems.append(f"message does not name its field {e['field']!r}: {msg!r}")
    return problems
