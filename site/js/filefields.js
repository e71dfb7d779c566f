// Fields that read a measured file: the file itself (decoded by the core, described by its
// reader with a preview of the first rows) and the column pickers its header fills.
import { sha256Hex } from "./digest.js";
import { asText, choose, el, fieldId, fieldShell } from "./dom.js";
import { decodeFile, describeText } from "./files.js";
import { pickValue, previewRows, tableSummary } from "./preview.js";

/** A file field: reads a text file the user picks; the text is what the engine receives. */
export function renderFile(container, field, prefix) {
  const shell = fieldShell(container, field.name, prefix, "", field.help);
  const input = el("input", { id: shell.id, type: "file", accept: field.accept, "aria-describedby": `${shell.id}-help ${shell.id}-status ${shell.id}-error` });
  const label = el("label", { for: shell.id }, field.label);
  const status = el("p", { class: "file-status", id: `${shell.id}-status` }, "No file loaded.");
  const preview = el("div", { class: "table-preview", id: `${shell.id}-preview`, hidden: "" });
  shell.wrap.append(label, input, status, preview, shell.help, shell.error);
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
export function renderPicker(container, field, prefix) {
  const id = fieldId(prefix, field.name);
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
