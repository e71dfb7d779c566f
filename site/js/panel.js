// Shared machinery of a calculation panel: form from the field descriptions, coalesced
// recalculation on input (only the newest reply is kept), per-field errors, stale marking of
// the last good results, warnings and sources. A panel supplies only its own rendering.
import { FieldSet, el } from "./forms.js";
import { renew } from "./dom.js";
import { formatNumber } from "./format.js";
import { download, stamp } from "./files.js";
import { failureReply } from "./engine.js";
import { scenarioLine } from "./chartparts.js";
import { unitText } from "./units.js";

const describeError = (err) => String(err && err.message ? err.message : err).slice(0, 120);

export class CalcPanel {
  /**
   * @param {object} opts {id, kind, title, intro, engine, description, render(reply), onChange}
   */
  constructor(root, opts) {
    this.opts = opts;
    this.engine = opts.engine;
    this.root = root;
    this.busy = false;
    this.queued = false;
    this.lastGood = null;
    this.lastGoodInputs = null;
    this.demoLabel = "";
    this.listeners = new Set();
    this.shownListeners = new Set();

    root.append(el("h2", { id: `${opts.id}-title` }, opts.title));
    if (opts.intro) root.append(el("p", { class: "intro" }, opts.intro));
    // narrow screens stack the results under the inputs: a way to them at once
    const jump = el("button", { type: "button", class: "secondary jump-results" }, "Jump to results");
    root.append(jump);
    const grid = el("div", { class: "panel-grid" });
    const form = el("form", { class: "inputs", "aria-labelledby": `${opts.id}-title`, novalidate: "" });
    form.addEventListener("submit", (e) => e.preventDefault());
    this.fieldsBox = el("fieldset");
    this.fieldsBox.append(el("legend", {}, opts.legend || "Inputs"));
    form.append(this.fieldsBox);
    this.formMessage = el("p", { class: "form-message", role: "alert", hidden: "" });
    form.append(this.formMessage);
    grid.append(form);
    this.output = el("div", { class: "outputs", "aria-live": "polite", tabindex: "-1" });
    jump.addEventListener("click", () => {
      this.output.scrollIntoView({ block: "start" });
      this.output.focus({ preventScroll: true });
    });
    this.staleNote = el("p", { class: "stale-note", hidden: "" },
      "Out of date: the results below are from the last valid inputs. Correct the marked fields to update them.");
    this.output.append(this.staleNote);
    this.body = el("div", { class: "output-body" });
    this.output.append(this.body);
    this.warnings = el("ul", { class: "warnings", "aria-label": "Warnings" });
    this.output.append(this.warnings);
    this.sources = el("details", { class: "sources" });
    this.output.append(this.sources);
    const tools = el("div", { class: "export-tools", role: "group", "aria-label": "Exports" });
    const csvResults = el("button", { type: "button", class: "secondary" }, "Download results (CSV)");
    csvResults.addEventListener("click", () => this.exportCsv("results"));
    const csvCurves = el("button", { type: "button", class: "secondary" }, "Download curves (CSV)");
    csvCurves.addEventListener("click", () => this.exportCsv("curves"));
    // spreadsheets read a CSV file as UTF-8 (µ, ², ³ intact) only when it starts with a
    // byte-order mark; other programs may want the file without one
    const encodingId = `${opts.id}-csv-encoding`;
    this.csvEncoding = el("select", { id: encodingId, class: "csv-encoding" });
    this.csvEncoding.append(
      el("option", { value: "bom" }, "UTF-8 with BOM, for spreadsheets"),
      el("option", { value: "plain" }, "UTF-8 without BOM"),
    );
    const encodingBox = el("span", { class: "csv-encoding-box" });
    encodingBox.append(el("label", { for: encodingId }, "CSV files"), this.csvEncoding);
    tools.append(csvResults, csvCurves, encodingBox);
    this.output.append(tools);
    grid.append(this.output);
    root.append(grid);

    this.fields = new FieldSet(this.fieldsBox, opts.description.fields, opts.id);
    this.fields.onInput(() => {
      this.demoLabel = "";
      this.schedule();
    });
  }

  /** Whether `name` is an input of this panel (for reporting unknown link entries). */
  knows(name) {
    return name === "demo" || this.fields.handles.has(name);
  }

  isStale() {
    return this.output.classList.contains("stale");
  }

  /** Rows {label, value, unit} describing `inputs` in the words of the form. */
  describeInputs(inputs) {
    const rows = [];
    for (const field of this.opts.description.fields) {
      const raw = inputs ? inputs[field.name] : undefined;
      if (raw === undefined || raw === null || raw === "") continue;
      if (typeof raw === "object" && "value" in raw && (raw.value === "" || raw.value === null)) continue;
      if (this.fields.handles.get(field.name)?.wrap.hidden) continue; // not in use with these choices
      if (field.kind === "choice") {
        const choice = (field.choices || []).find((c) => c.value === raw);
        rows.push({ name: field.name, label: field.label, value: choice ? choice.label : String(raw), unit: "" });
      } else if (raw && typeof raw === "object" && "value" in raw) {
        rows.push({ name: field.name, label: field.label, value: String(raw.value), unit: unitText(raw.unit), range: field.range || "" });
      } else if (field.kind === "data" || field.kind === "records") {
        rows.push({ name: field.name, label: field.label, value: this.opts.describeData ? this.opts.describeData(field.name, raw) : JSON.stringify(raw), unit: "" });
      } else {
        rows.push({ name: field.name, label: field.label, value: String(raw), unit: "", range: field.range || "" });
      }
    }
    return rows;
  }

  /**
   * The scenario of the shown results in one line, for exported chart images: the inputs in
   * use named in `names` (all when omitted), after the invented demo's name when one is shown.
   */
  scenario(names) {
    const rows = this.describeInputs(this.lastGoodInputs)
      .filter((r) => !names || (r.name && names.includes(r.name)));
    const line = scenarioLine(rows, { maxLength: 400 });
    return this.demoLabel ? `Invented demo: ${this.demoLabel} · ${line}` : line;
  }

  /** Files in use by the last valid inputs: [{name, size, sha256, from}]. */
  importedFiles() {
    const out = [];
    for (const [name, handle] of this.fields.handles) {
      if (!handle.source || handle.wrap.hidden) continue;
      const raw = this.lastGoodInputs ? this.lastGoodInputs[name] : undefined;
      const info = handle.source();
      if (info && typeof raw === "string" && raw) out.push(info);
    }
    return out;
  }

  async exportCsv(part) {
    if (!this.lastGood) return;
    const bom = this.csvEncoding.value === "bom";
    const reply = await this.engine.exportCsv(this.opts.kind, this.lastGoodInputs, this.lastGood, part, bom);
    if (reply && reply.ok) {
      download(`drift-dose-${this.opts.id}-${part}-${stamp()}.csv`, reply.text, "text/csv;charset=utf-8");
    } else {
      this.formMessage.textContent = `The CSV file could not be written: ${(reply?.errors || []).map((e) => e.message).join(" ") || "no reply"}`;
      this.formMessage.hidden = false;
    }
  }

  /**
   * Call `listener(panel)` on every change of the inputs, after the change's request has been
   * posted: work there delays the next request, never the one of the change.
   */
  onChange(listener) {
    this.listeners.add(listener);
  }

  /** Call `listener(panel)` when a reply has been shown, before `data-updates` counts it. */
  onShown(listener) {
    this.shownListeners.add(listener);
  }

  /** Inputs as they travel in links and files; an invented demo in use travels with them. */
  getState() {
    const values = this.fields.values();
    return this.demoLabel ? { ...values, demo: this.demoId } : values;
  }

  setState(values) {
    const demo = (this.demos || []).find((d) => d.id === values.demo);
    if (demo) {
      this.demoLabel = demo.label;
      this.demoId = demo.id;
      this.demoNote.textContent = `Showing: ${demo.label}. ${demo.note || demo.description || ""}`;
      this.demoNote.hidden = false;
    }
    this.fields.setValues(values);
    this.schedule();
  }

  /**
   * Offer invented demo scenarios: one button each, loaded with one click and marked as
   * invented in the page, the link and the report. Returns the group of buttons.
   */
  useDemos(demos, { groupLabel, prompt }) {
    this.demos = demos;
    this.demoNote = el("p", { class: "demo-note", role: "status", hidden: "" });
    this.output.prepend(this.demoNote);
    this.onChange(() => {
      if (!this.demoLabel) this.demoNote.hidden = true;
    });
    const box = el("div", { class: "demos", role: "group", "aria-label": groupLabel });
    box.append(el("p", { class: "help" }, prompt));
    for (const demo of demos) {
      const button = el("button", { type: "button", class: "secondary" }, demo.label);
      button.addEventListener("click", () => this.setState({ ...demo.inputs, demo: demo.id }));
      box.append(button);
    }
    this.fieldsBox.prepend(box);
    return box;
  }

  /**
   * Recalculate now, or right after the request in flight (coalescing bursts of input); then
   * tell the change listeners (the request is on its way by then).
   */
  schedule() {
    this.compute();
    for (const listener of this.listeners) listener(this);
  }

  /** Recalculate now, or right after the request in flight; the change listeners are not told. */
  compute() {
    if (this.busy) this.queued = true;
    else this.recalc();
  }

  /**
   * One round trip to the engine. Whatever fails (reading the inputs, posting them, the engine,
   * showing the reply) ends the busy state, marks the earlier results out of date and says why.
   */
  async recalc() {
    this.busy = true;
    this.queued = false;
    this.root.setAttribute("aria-busy", "true");
    const started = performance.now();
    let inputs = null;
    let reply;
    try {
      inputs = this.inputs();
      reply = await this.engine.latestOn(this.opts.id, this.opts.kind, inputs);
    } catch (err) {
      reply = failureReply(`The inputs could not be sent to the calculation engine (${describeError(err)}).`);
    } finally {
      this.busy = false;
    }
    if (this.queued) {
      this.recalc();
      return;
    }
    this.root.removeAttribute("aria-busy");
    if (!reply) return;
    try {
      this.apply(reply, inputs);
    } catch (err) {
      this.apply(failureReply(`The results could not be shown (${describeError(err)}).`), inputs);
    }
    for (const listener of this.shownListeners) {
      try {
        listener(this);
      } catch {
        // the results are shown whatever a listener does
      }
    }
    this.root.dataset.updatedMs = String(performance.now() - started);
    this.root.dataset.updates = String(Number(this.root.dataset.updates || 0) + 1);
  }

  /** Inputs sent to the engine; panels with extra state override this. */
  inputs() {
    return this.fields.values();
  }

  apply(reply, inputs) {
    if (!reply || typeof reply !== "object") reply = failureReply("The calculation engine gave no usable reply.");
    let orphans;
    try {
      orphans = this.fields.showErrors(reply.ok ? [] : reply.errors);
    } catch (err) {
      orphans = [...(reply.errors || []).map((e) => String(e && e.message)), `(${describeError(err)})`];
    }
    if (!reply.ok) {
      this.formMessage.textContent = orphans.join(" ");
      this.formMessage.hidden = orphans.length === 0;
      this.output.classList.toggle("stale", this.lastGood !== null);
      this.staleNote.textContent = reply.failure
        ? "Out of date: the results below are from earlier inputs; the current ones could not be computed (the message by the inputs says why)."
        : "Out of date: the results below are from the last valid inputs. Correct the marked fields to update them.";
      this.staleNote.hidden = this.lastGood === null;
      this.root.dataset.state = "invalid";
      return;
    }
    this.formMessage.hidden = true;
    this.lastGood = reply;
    this.lastGoodInputs = inputs;
    this.output.classList.remove("stale");
    this.staleNote.hidden = true;
    this.opts.render(reply, this);
    this.renderWarnings(reply.warnings);
    this.renderSources(reply.sources);
    this.root.dataset.state = "ok";
  }

  renderWarnings(warnings) {
    renew(this.warnings, ...(warnings || []).map((w) => el("li", {}, w)));
    this.warnings.hidden = !warnings || warnings.length === 0;
  }

  renderSources(sources) {
    const list = el("ol");
    for (const s of sources || []) list.append(el("li", {}, s.citation));
    renew(this.sources, el("summary", {}, "Published methods used"), list);
  }
}

/** Render `results` (from a reply) as a table of quantity, value and unit. */
export function resultsTable(results, caption, keys) {
  const table = el("table", { class: "results" });
  table.append(el("caption", {}, caption));
  const head = el("thead");
  const hr = el("tr");
  for (const h of ["Quantity", "Value", "Unit"]) hr.append(el("th", { scope: "col" }, h));
  head.append(hr);
  table.append(head);
  const body = el("tbody");
  for (const key of keys || Object.keys(results)) {
    const r = results[key];
    if (!r) continue;
    const tr = el("tr", { "data-key": key });
    const name = el("th", { scope: "row" }, r.label);
    if (r.symbol) name.append(el("span", { class: "symbol" }, ` ${r.symbol}`));
    if (r.note) name.append(el("span", { class: "note" }, ` (${r.note})`));
    tr.append(name);
    if (r.text !== undefined) {
      tr.append(el("td", { class: "value", colspan: "2" }, r.text));
    } else {
      tr.append(el("td", { class: "value" }, formatNumber(r.value)));
      tr.append(el("td", { class: "unit" }, unitText(r.unit)));
    }
    body.append(tr);
  }
  table.append(body);
  return table;
}
