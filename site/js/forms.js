// Build form fields from the field descriptions that driftdose.api publishes (forms.json), read
// raw inputs back, and show per-field messages. No physical rule lives here: Python validates.
import { sha256Hex } from "./digest.js";
import { decodeFile, describeText } from "./files.js";
import { optionText } from "./format.js";
import { pickValue, previewRows, tableSummary } from "./preview.js";
import { unitText } from "./units.js";

let counter = 0;

// Typographic labels for unit codes that arrive without one (presentation only).
const UNIT_LABELS = { um: "µm", "1/cm3": "1/cm³", "1/m3": "1/m³", "mg/m3": "mg/m³", "ug/m3": "µg/m³", m3: "m³", "kg/m3": "kg/m³", "g/cm3": "g/cm³" };

function el(tag, attrs = {}, text = "") {
  const node = document.createElement(tag);
  for (const [key, value] of Object.entries(attrs)) {
    if (value !== undefined && value !== null) node.setAttribute(key, value);
  }
  if (text) node.textContent = text;
  return node;
}

export { el };

/**
 * Choose `value` in `select`, adding it as an option when the list lacks it: a unit or choice
 * from a link or file that the page does not offer stays visible and reaches the engine, whose
 * message then names it.
 */
function choose(select, value) {
  if (![...select.options].some((o) => o.value === value)) select.append(el("option", { value }, value));
  select.value = value;
}

/** A value from a link or file as the text of a field: structured values are shown as JSON. */
function asText(value) {
  if (value === undefined || value === null) return "";
  return typeof value === "object" ? JSON.stringify(value) : String(value);
}

/**
 * Render one field description into `container`; returns a handle with get(), set(), showError().
 */
export function renderField(container, field, prefix) {
  if (field.kind === "records") return renderList(container, field, prefix);
  if (field.kind === "data" && field.accept) return renderFile(container, field, prefix);
  if (field.picker) return renderPicker(container, field, prefix);
  const id = `${prefix}-${field.name}-${++counter}`;
  const wrap = el("div", { class: "field", "data-field": field.name });
  const label = el("label", { for: id }, field.label);
  wrap.append(label);
  const row = el("div", { class: "field-row" });
  const helpId = `${id}-help`;
  const errorId = `${id}-error`;
  let input;
  let unitSelect = null;
  let showChoice = () => {};
  if (field.kind === "choice") {
    // a long option text is shortened in the closed select (which cannot wrap); the chosen
    // option's full text is then shown under it, where it wraps
    const fullId = `${id}-full`;
    input = el("select", { id, name: field.name, "aria-describedby": `${helpId} ${errorId} ${fullId}` });
    const full = new Map();
    for (const choice of field.choices) {
      const text = optionText(choice.label);
      const option = el("option", { value: choice.value, ...(text !== choice.label ? { title: choice.label } : {}) }, text);
      if (text !== choice.label) full.set(choice.value, choice.label);
      input.append(option);
    }
    input.value = field.default;
    row.append(input);
    const note = el("p", { class: "choice-full", id: fullId, hidden: "" });
    showChoice = () => {
      const text = full.get(input.value) || "";
      note.textContent = text;
      note.hidden = !text;
    };
    input.addEventListener("change", showChoice);
    wrap.append(row, note);
  } else {
    input = el("input", {
      id, name: field.name, type: "text", inputmode: field.kind === "text" ? "text" : "decimal", autocomplete: "off",
      spellcheck: "false", "aria-describedby": `${helpId} ${errorId}`,
    });
    const def = field.default && typeof field.default === "object" ? field.default : { value: field.default };
    input.value = def.value === null || def.value === undefined ? "" : String(def.value);
    row.append(input);
    if (field.units && field.units.length > 1) {
      unitSelect = el("select", { "aria-label": `${field.label} unit`, name: `${field.name}-unit` });
      for (const u of field.units) unitSelect.append(el("option", { value: u.unit }, u.label));
      unitSelect.value = def.unit;
      row.append(unitSelect);
    } else if (field.units && field.units.length === 1 && unitText(field.units[0].unit)) {
      row.append(el("span", { class: "unit" }, unitText(field.units[0].unit)));
    }
  }
  if (row.parentNode !== wrap) wrap.append(row);
  showChoice();
  const helpText = [field.help, field.range ? `Valid: ${field.range}.` : ""].filter(Boolean).join(" ");
  wrap.append(el("p", { class: "help", id: helpId }, helpText));
  const error = el("p", { class: "error", id: errorId, hidden: "" });
  wrap.append(error);
  container.append(wrap);

  const defaultUnit = unitSelect ? unitSelect.value : (field.units && field.units[0] ? field.units[0].unit : undefined);
  return {
    field, input, unitSelect, wrap,
    get() {
      if (field.kind === "choice" || field.kind === "text" || field.kind === "plain" || field.kind === "integer") return input.value;
      return { value: input.value, unit: unitSelect ? unitSelect.value : defaultUnit };
    },
    set(raw) {
      if (field.kind === "choice") {
        choose(input, asText(raw));
        showChoice();
      } else if (raw && typeof raw === "object" && !Array.isArray(raw)) {
        input.value = asText(raw.value);
        if (unitSelect && raw.unit !== undefined) choose(unitSelect, asText(raw.unit));
      } else {
        input.value = asText(raw);
      }
    },
    showError(message) {
      if (message) {
        error.textContent = message;
        error.hidden = false;
        wrap.classList.add("invalid");
        input.setAttribute("aria-invalid", "true");
      } else {
        error.textContent = "";
        error.hidden = true;
        wrap.classList.remove("invalid");
        input.removeAttribute("aria-invalid");
      }
    },
  };
}

/** A set of fields rendered into a form; collects inputs and routes errors to fields. */
export class FieldSet {
  constructor(container, fields, prefix) {
    this.handles = new Map();
    for (const field of fields) this.handles.set(field.name, renderField(container, field, prefix));
    this.linkFiles();
  }

  /**
   * Tie each measured-file field to its header-line field (`file`) and column pickers
   * (`picker`): a new description of the file refills the pickers, and a picker's column
   * fills the unit choices its header states.
   */
  linkFiles() {
    for (const handle of this.handles.values()) {
      const f = handle.field;
      const file = this.handles.get(f.file || f.picker);
      if (!file || !file.onTable) continue;
      if (f.file) {
        file.useHeaderLine(() => handle.get());
        handle.input.addEventListener("change", () => file.describe(false));
      }
      if (f.picker) {
        handle.applyFills = (fills) => {
          for (const [name, value] of Object.entries(fills || {})) this.handles.get(name)?.set(value);
        };
        file.onTable((got, fresh) => handle.fill(got && got.ok ? got.pickers[f.name] : null, fresh));
      }
    }
  }

  values() {
    const out = {};
    for (const [name, handle] of this.handles) out[name] = handle.get();
    return out;
  }

  setValues(values) {
    for (const [name, raw] of Object.entries(values)) {
      const handle = this.handles.get(name);
      if (handle) handle.set(raw);
    }
  }

  /**
   * Show errors from a reply; returns the messages that belong to no field here, and those of
   * fields hidden for the current choices (e.g. from a link), which would otherwise go unseen.
   */
  showErrors(errors) {
    const byField = new Map();
    const byItem = new Map(); // errors of one value inside a list field: "<field>.<index>[.<sub>]"
    const orphans = [];
    for (const e of errors || []) {
      const path = String(e.field ?? "");
      const head = path.split(".")[0];
      const list = path !== head ? this.handles.get(head) : undefined;
      if (list && list.showItemErrors) {
        if (!byItem.has(head)) byItem.set(head, []);
        byItem.get(head).push({ ...e, field: path });
        if (list.wrap.hidden) orphans.push(e.message);
      } else if (this.handles.has(path) && !byField.has(path)) {
        byField.set(path, e.message);
        if (this.handles.get(path).wrap.hidden) orphans.push(e.message);
      } else {
        orphans.push(e.message);
      }
    }
    for (const [name, handle] of this.handles) {
      handle.showError(byField.get(name) || "");
      if (handle.showItemErrors) orphans.push(...handle.showItemErrors(handle.wrap.hidden ? [] : byItem.get(name) || []));
    }
    return orphans;
  }

  /**
   * Show each field that declares `applies_when` ({field, values}, from the published field
   * descriptions) only while that other field has one of the values. Returns the re-apply
   * function, as showWhen does.
   */
  showDeclared(fields) {
    const rules = {};
    for (const f of fields) if (f.applies_when) rules[f.name] = [f.applies_when.field, f.applies_when.values];
    return this.showWhen(rules);
  }

  /**
   * Show a field only while another field has one of the given values (presentation only:
   * Python validates every input). `rules`: {field: [otherField, [values...]]}. Returns the
   * function that re-applies the rules (call it after setting values programmatically).
   */
  showWhen(rules) {
    const apply = () => {
      for (const [name, [other, values]] of Object.entries(rules)) {
        const handle = this.handles.get(name);
        const ruler = this.handles.get(other);
        if (handle && ruler) handle.wrap.hidden = !values.includes(ruler.get());
      }
    };
    for (const name of new Set(Object.values(rules).map(([o]) => o))) {
      this.handles.get(name)?.input.addEventListener("change", apply);
    }
    apply();
    return apply;
  }

  onInput(callback) {
    for (const handle of this.handles.values()) {
      if (handle.listen) {
        handle.listen(callback);
        continue;
      }
      handle.input.addEventListener("input", callback);
      handle.input.addEventListener("change", callback);
      if (handle.unitSelect) handle.unitSelect.addEventListener("change", callback);
    }
  }
}

function fieldShell(container, field, prefix) {
  const id = `${prefix}-${field.name}-${++counter}`;
  const wrap = el("div", { class: "field", "data-field": field.name });
  const error = el("p", { class: "error", id: `${id}-error`, hidden: "" });
  container.append(wrap);
  return {
    id, wrap, error,
    showError(message) {
      error.textContent = message || "";
      error.hidden = !message;
      wrap.classList.toggle("invalid", Boolean(message));
    },
  };
}

/** A file field: reads a text file the user picks; the text is what the engine receives. */
function renderFile(container, field, prefix) {
  const shell = fieldShell(container, field, prefix);
  const input = el("input", { id: shell.id, type: "file", accept: field.accept, "aria-describedby": `${shell.id}-help ${shell.id}-status ${shell.id}-error` });
  const label = el("label", { for: shell.id }, field.label);
  const status = el("p", { class: "file-status", id: `${shell.id}-status` }, "No file loaded.");
  const preview = el("div", { class: "table-preview", id: `${shell.id}-preview`, hidden: "" });
  shell.wrap.append(label, input, status, preview, el("p", { class: "help", id: `${shell.id}-help` }, field.help || ""), shell.error);
  const tableListeners = [];
  let headerLine = () => 0;
  let described = 0; // the last description asked for wins
  // the core reader's view of the text in use: summary and first rows under the control
  async function describe(fresh) {
    const mine = ++described;
    await Promise.resolve(); // values set together (a link) are all in place first
    let got = null;
    if (field.describe && typeof text === "string" && text) {
      got = await describeText(field.describe, text, Number(headerLine()) || 0);
    }
    if (mine !== described) return;
    showPreview(preview, got && got.ok ? got.table : null);
    for (const cb of tableListeners) cb(got, fresh);
  }
  let text = field.default ?? null;
  let name = "";
  let refusal = ""; // why the last file chosen was not read; joins the engine's message
  let source = null; // {name, size, sha256, from} of the text in use, for the record
  let generation = 0; // the last file chosen wins: a file still being read when another is chosen is dropped
  const listeners = [];
  input.addEventListener("change", async () => {
    const file = input.files[0];
    const mine = ++generation;
    if (!file) return;
    const limit = field.max_bytes || 5 * 1024 * 1024;
    status.textContent = `Reading ${file.name.slice(0, 80)}…`;
    let got;
    try {
      got = await decodeFile(file, limit); // the core's decoder, as the command line's
    } catch (err) {
      got = { ok: false, message: `could not be read (${String(err && err.name ? err.name : err).slice(0, 60)})` };
    }
    if (mine !== generation) return; // another file was chosen meanwhile
    if (!got.ok) {
      // the earlier file no longer stands: recalculate without one (its results go stale)
      text = null;
      name = "";
      source = null;
      showPreview(preview, null);
      refusal = got.message.startsWith(file.name.slice(0, 80)) ? got.message : `${file.name.slice(0, 80)}: ${got.message}`;
      status.textContent = refusal;
      for (const cb of listeners) cb();
      return;
    }
    refusal = "";
    text = got.text;
    name = file.name;
    source = { name: name.slice(0, 200), size: got.bytes.length, sha256: got.sha256 || sha256Hex(got.bytes), from: "file" };
    status.textContent = [`Loaded ${name.slice(0, 80)} (${got.size_text}).`, ...got.notes].join(" ");
    await describe(true); // the pickers take the new file's columns before it is sent
    if (mine !== generation) return;
    for (const cb of listeners) cb();
  });
  return {
    field, wrap: shell.wrap, input, unitSelect: null,
    showError(message) { shell.showError(message && refusal ? `${refusal} ${message}` : message); },
    get() { return text; },
    source() { return source; },
    set(raw, label = "") {
      generation += 1; // a file still being read no longer applies
      refusal = "";
      text = raw === undefined ? null : raw;
      name = label;
      source = typeof text === "string" && text
        ? { name: label || "text from a link or file", size: new TextEncoder().encode(text).length, sha256: sha256Hex(text), from: "text" }
        : null;
      status.textContent = text ? `Loaded ${label || "text"} (${String(text).length.toLocaleString()} characters).` : "No file loaded.";
      describe(false);
    },
    listen(cb) { listeners.push(cb); },
    onTable(cb) { tableListeners.push(cb); },
    useHeaderLine(fn) { headerLine = fn; },
    describe,
  };
}

/** Show a table description's summary and first rows in `box` (hidden without one). */
function showPreview(box, table) {
  box.replaceChildren();
  box.hidden = !table;
  if (!table) return;
  box.append(el("p", { class: "table-summary" }, tableSummary(table)));
  const rows = previewRows(table);
  const width = Math.max(1, ...rows.filter((r) => r.role !== "note").map((r) => r.cells.length));
  const grid = el("table", { class: "preview-rows" });
  grid.append(el("caption", {}, "First rows of the file"));
  const body = el("tbody");
  for (const row of rows) {
    const tr = el("tr", { class: `preview-${row.role}` });
    tr.append(el("th", { scope: "row" }, `Line ${row.line}`));
    if (row.role === "note") {
      tr.append(el("td", { colspan: String(width) }, row.cells[0]));
    } else {
      for (const cell of row.cells) tr.append(el(row.role === "header" ? "th" : "td", row.role === "header" ? { scope: "col" } : {}, cell));
    }
    body.append(tr);
  }
  grid.append(body);
  const scroll = el("div", { class: "preview-scroll", tabindex: "0", role: "region", "aria-label": "First rows of the file" });
  scroll.append(grid);
  box.append(scroll);
}

/**
 * A column picker: a list of the columns the file's header names (from the core reader), the
 * value sent as the header's name (or the column's number). A name or number from a link that
 * is not in the list stays selectable as it came; the engine reads it the same way.
 */
function renderPicker(container, field, prefix) {
  const id = `${prefix}-${field.name}-${++counter}`;
  const wrap = el("div", { class: "field", "data-field": field.name });
  const select = el("select", { id, name: field.name, "data-picker": field.picker, "aria-describedby": `${id}-help ${id}-error` });
  wrap.append(el("label", { for: id }, field.label), select);
  wrap.append(el("p", { class: "help", id: `${id}-help` }, field.help || ""));
  const error = el("p", { class: "error", id: `${id}-error`, hidden: "" });
  wrap.append(error);
  container.append(wrap);
  let fills = {};
  let refilling = false;
  const handle = {
    field, input: select, unitSelect: null, wrap, applyFills: null,
    get() { return select.value; },
    set(raw) { choose(select, asText(raw)); },
    fill(picker, fresh) {
      const before = select.value;
      fills = picker ? picker.fills || {} : {};
      select.replaceChildren();
      for (const o of picker ? picker.options : []) select.append(el("option", { value: o.value }, o.label));
      const value = pickValue(before, picker, fresh);
      if (value !== "" || !picker) choose(select, value);
      if (fresh && handle.applyFills) handle.applyFills(fills[select.value]);
      // a value changed by the file (not by the user) is sent again
      if (!fresh && select.value !== before) {
        refilling = true;
        select.dispatchEvent(new Event("change"));
        refilling = false;
      }
    },
    showError(message) {
      error.textContent = message || "";
      error.hidden = !message;
      wrap.classList.toggle("invalid", Boolean(message));
      if (message) select.setAttribute("aria-invalid", "true");
      else select.removeAttribute("aria-invalid");
    },
  };
  select.addEventListener("change", () => {
    // the person chose a column: its header's unit and kind fill the choices below
    if (!refilling && handle.applyFills) handle.applyFills(fills[select.value]);
  });
  choose(select, asText(field.default));
  return handle;
}

/**
 * A `records` field (such as lognormal modes): one group of sub-fields per record, with add and
 * remove buttons; a message about one value sits beside that value only.
 */
function renderList(container, field, prefix) {
  const shell = fieldShell(container, field, prefix);
  const group = el("fieldset", { class: "item-list" });
  group.append(el("legend", {}, field.label));
  if (field.help) group.append(el("p", { class: "help" }, field.help));
  const items = el("div", { class: "items" });
  const add = el("button", { type: "button", class: "secondary" }, `Add ${field.item_label || "an item"}`);
  group.append(items, add, shell.error);
  shell.wrap.append(group);
  const listeners = [];
  let rows = [];
  // a longer list than the form holds, from a link or file: sent as it came (the engine says
  // how many are allowed) until the shown items are edited
  let passThrough;
  const notify = () => {
    passThrough = undefined;
    for (const cb of listeners) cb();
  };

  function itemRow(values) {
    const box = el("fieldset", { class: "item" });
    const legend = el("legend");
    box.append(legend);
    const handles = new Map();
    for (const f of field.item_fields) {
      const sub = { ...f, default: values[f.name] };
      if (!f.units && f.kind !== "choice") sub.units = [];
      else if (f.units) sub.units = f.units.map((u) => (typeof u === "string" ? { unit: u, label: UNIT_LABELS[u] || u } : u));
      if (sub.kind !== "choice" && !(sub.default && typeof sub.default === "object")) sub.kind = "plain";
      const h = renderField(box, sub, `${prefix}-${field.name}`);
      h.input.addEventListener("input", notify);
      h.input.addEventListener("change", notify);
      if (h.unitSelect) h.unitSelect.addEventListener("change", notify);
      handles.set(f.name, h);
    }
    const error = el("p", { class: "error", hidden: "" }); // about the record as a whole
    box.append(error);
    const remove = el("button", { type: "button", class: "secondary" }, "Remove");
    remove.addEventListener("click", () => {
      rows = rows.filter((r) => r !== row);
      box.remove();
      relabel();
      notify();
    });
    box.append(remove);
    const row = { box, legend, handles, remove, error };
    return row;
  }

  function relabel() {
    rows.forEach((r, i) => {
      r.legend.textContent = `${field.item_label ? field.item_label.replace(/^an? /, "") : "Item"} ${i + 1}`.replace(/^./, (c) => c.toUpperCase());
      r.remove.textContent = `Remove ${r.legend.textContent.toLowerCase()}`;
      r.remove.hidden = rows.length <= 1;
    });
    add.hidden = rows.length >= (field.max_items || 4);
  }

  function setItems(list) {
    items.replaceChildren();
    rows = [];
    passThrough = Array.isArray(list) && list.length > (field.max_items || 4) ? list : undefined;
    for (const values of Array.isArray(list) ? list.slice(0, field.max_items || 4) : []) {
      const row = itemRow(values || {});
      rows.push(row);
      items.append(row.box);
    }
    relabel();
  }

  add.addEventListener("click", () => {
    const template = rows.length ? readRow(rows[rows.length - 1]) : (field.default || [{}])[0];
    const row = itemRow(template);
    rows.push(row);
    items.append(row.box);
    relabel();
    row.handles.values().next().value?.input.focus();
    notify();
  });

  function readRow(row) {
    const out = {};
    for (const [name, h] of row.handles) out[name] = h.get();
    return out;
  }

  /**
   * Put each error ({field: "<name>.<index>[.<sub>]", message}) beside the value it names;
   * returns the messages that have no place here (a record the form does not show).
   */
  function showItemErrors(errors) {
    const left = [];
    const shown = new Map(); // handle -> messages
    const rowShown = new Map();
    for (const e of errors) {
      const [, index, sub] = e.field.split(".");
      const row = /^\d+$/.test(index) ? rows[Number(index)] : undefined;
      const target = row && sub !== undefined ? row.handles.get(sub) : undefined;
      if (target) shown.set(target, [...(shown.get(target) || []), e.message]);
      else if (row && sub === undefined) rowShown.set(row, [...(rowShown.get(row) || []), e.message]);
      else left.push(e.message);
    }
    for (const row of rows) {
      for (const h of row.handles.values()) h.showError((shown.get(h) || []).join(" "));
      const text = (rowShown.get(row) || []).join(" ");
      row.error.textContent = text;
      row.error.hidden = !text;
    }
    return left;
  }

  setItems(field.default || []);
  return {
    field, wrap: shell.wrap, input: add, unitSelect: null, showError: shell.showError, showItemErrors,
    get() { return passThrough !== undefined ? passThrough : rows.map(readRow); },
    set(raw) { setItems(raw); },
    listen(cb) { listeners.push(cb); },
  };
}
