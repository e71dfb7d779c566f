// Import of one logged file for the shift panel: the file control (read by the core's decoder,
// name and SHA-256 kept for the record), the "header is on line N" override, a preview of the
// first rows as the engine read them, and the column pickers (time, optional date, and the
// columns to summarise with what each holds). Each control is a field handle of the panel's
// form (get, set, showError, listen), so links, saved inputs and errors reach it by its name.
import { el, fieldShell } from "./dom.js";
import { renderField } from "./forms.js";
import { decodeFile } from "./files.js";
import { sha256Hex } from "./digest.js";

const QUANTITIES = [
  ["number", "Number"],
  ["ldsa", "LDSA"],
  ["mass", "Mass"],
  ["channel", "Size channel"],
];
const PREVIEW_ROWS = 8;
/** A column's name with its unit, unless the name already shows it. */
const withUnit = (c) => (c.unit && !String(c.name).includes(c.unit) ? `${c.name} (${c.unit})` : String(c.name));
/** Whether a column given as `spec` (a whole header, its name without the unit, or a number) is column i. */
const sameColumn = (spec, c, i) => {
  const s = String(spec ?? "").trim().toLowerCase();
  return s !== "" && (s === String(c.name).toLowerCase() || s === String(c.label || "").toLowerCase() || s === String(i + 1));
};
const clock = (iso) => String(iso || "").replace("T", " ");

/** What the engine read, in words: readings, interval, span, gaps. */
export function importSummary(info) {
  const parts = [];
  if (Number.isFinite(info.rows)) parts.push(`${info.rows.toLocaleString("en")} readings`);
  if (Number.isFinite(info.interval_s)) parts.push(`every ${info.interval_s} s`);
  if (info.start && info.end) parts.push(`from ${clock(info.start)} to ${clock(info.end)}`);
  const gaps = Array.isArray(info.gaps) ? info.gaps : [];
  const count = Number.isFinite(info.gap_count) ? info.gap_count : gaps.length;
  let text = `${parts.join(" ")}.`;
  if (count) {
    const shown = gaps.slice(0, 3).map((g) => `${clock(g.start)} (${g.seconds} s)`).join(", ");
    text += ` ${count} ${count === 1 ? "gap" : "gaps"} in the readings: ${shown}${count > 3 ? ", …" : ""}.`;
  } else {
    text += " No gaps.";
  }
  return text;
}

function shell(container, name, label, helpText) {
  return fieldShell(container, name, "shift", label, helpText);
}

/**
 * Build one import block into `container`. `names`: {text, file, header, time, date, columns,
 * column} (field names; missing ones are left out: `columns` is a list of value columns with
 * what each holds, `column` a single column of the same quantity), `extra`: more field names
 * drawn by the form's own renderer (time format, start time, unit), `fields`: the field
 * descriptions by name, `title`: the legend. Returns {handles: Map(name -> handle),
 * showImport(importInfo, preview), source()}.
 */
export function importBlock(container, { names, extra = [], fields, title, intro, limit, onFile }) {
  const box = el("fieldset", { class: "import-block" });
  box.append(el("legend", {}, title));
  if (intro) box.append(el("p", { class: "help" }, intro));
  container.append(box);
  const handles = new Map();
  const listeners = [];
  const notify = () => {
    for (const cb of listeners) cb();
  };

  // --- the file ------------------------------------------------------------------------
  const fileShell = shell(box, names.text, "File to import",
    fields[names.text]?.help || "A CSV or text file (comma, semicolon or tab separated), read on this device only.");
  const input = el("input", { id: fileShell.id, type: "file", accept: fields[names.text]?.accept || ".csv,.txt,.tsv,text/csv,text/plain",
    "aria-describedby": `${fileShell.id}-status ${fileShell.id}-help ${fileShell.id}-error` });
  const status = el("p", { class: "file-status", id: `${fileShell.id}-status` }, "No file loaded.");
  fileShell.wrap.append(input, status, fileShell.help, fileShell.error);
  let text = null;
  let source = null; // {name, size, sha256, from}
  let named = null; // {name, sha256, bytes} from a link without the text
  let refusal = "";
  let generation = 0;
  input.addEventListener("change", async () => {
    const file = input.files[0];
    const mine = ++generation;
    if (!file) return;
    status.textContent = `Reading ${file.name.slice(0, 80)}…`;
    let got;
    try {
      got = await decodeFile(file, limit || fields[names.text]?.max_bytes || 8 * 1024 * 1024);
    } catch (err) {
      got = { ok: false, message: `could not be read (${String(err && err.name ? err.name : err).slice(0, 60)})` };
    }
    if (mine !== generation) return;
    if (!got.ok) {
      text = null;
      source = null;
      refusal = got.message.startsWith(file.name.slice(0, 80)) ? got.message : `${file.name.slice(0, 80)}: ${got.message}`;
      status.textContent = refusal;
      fileShell.showError(refusal);
      notify();
      return;
    }
    refusal = "";
    text = got.text;
    // the decoder's SHA-256 of the bytes (computed by the engine); JavaScript's only without it
    const sha256 = typeof got.sha256 === "string" && /^[0-9a-f]{64}$/.test(got.sha256) ? got.sha256 : sha256Hex(got.bytes);
    source = { name: file.name.slice(0, 200), size: got.bytes.length, sha256, from: "file" };
    const matches = named && named.sha256 === source.sha256 ? " It is the file the link names (same SHA-256)." : "";
    named = null;
    status.textContent = [`Loaded ${source.name.slice(0, 80)} (${got.size_text}).`, ...(got.notes || [])].join(" ") + matches;
    if (onFile) onFile(source);
    notify();
  });
  handles.set(names.text, {
    field: fields[names.text] || { name: names.text }, wrap: fileShell.wrap, input, unitSelect: null,
    get: () => text,
    source: () => source,
    showError(message) { fileShell.showError(message && refusal && message !== refusal ? `${refusal} ${message}` : message); },
    set(raw, label = "") {
      generation += 1;
      refusal = "";
      text = typeof raw === "string" && raw ? raw : null;
      source = text ? { name: (label || "text from a link or file").slice(0, 200), size: new TextEncoder().encode(text).length, sha256: sha256Hex(text), from: label ? "generated" : "text" } : null;
      if (text) status.textContent = `Loaded ${label || "text"} (${text.length.toLocaleString("en")} characters).`;
      else if (!named) status.textContent = "No file loaded.";
      if (onFile) onFile(source);
    },
    listen(cb) { listeners.push(cb); },
  });
  if (names.file) {
    // {name, sha256, bytes} of the file in use: travels in links (the text may not), for the record
    handles.set(names.file, {
      field: fields[names.file] || { name: names.file }, wrap: el("div", { hidden: "" }), input: null, unitSelect: null,
      get: () => (source ? { name: source.name, sha256: source.sha256, bytes: source.size } : null),
      set(raw) {
        if (typeof raw === "string" && raw.startsWith("{")) {
          try { raw = JSON.parse(raw); } catch { raw = null; } // a link carries it as JSON text
        }
        if (text || !raw || typeof raw !== "object") return;
        named = { name: String(raw.name || "").slice(0, 200), sha256: String(raw.sha256 || "").slice(0, 64), bytes: Number(raw.bytes) || 0 };
        status.textContent = `This link names the file ${named.name} (${named.bytes.toLocaleString("en")} bytes, SHA-256 ${named.sha256.slice(0, 16)}…), which is too large to travel in a link: choose it again, or load the saved inputs file.`;
      },
      showError(message) { if (message) fileShell.showError(message); },
      listen() {},
    });
  }

  // --- header line, columns -------------------------------------------------------------
  if (names.header && fields[names.header]) {
    const f = fields[names.header];
    const s = shell(box, names.header, f.label || "Header is on line", f.help || "0: found by the engine (the first row of names above the data).");
    const headerInput = el("input", { id: s.id, type: "text", inputmode: "numeric", autocomplete: "off", size: "4", "aria-describedby": `${s.id}-help ${s.id}-error` });
    headerInput.value = String(f.default ?? 0);
    s.wrap.append(headerInput, s.help, s.error);
    headerInput.addEventListener("input", notify);
    handles.set(names.header, {
      field: f, wrap: s.wrap, input: headerInput, unitSelect: null,
      get: () => headerInput.value, set: (raw) => { headerInput.value = raw === undefined || raw === null ? "0" : String(raw); },
      showError: s.showError, listen(cb) { listeners.push(cb); },
    });
  }
  for (const name of extra) {
    if (!fields[name]) continue;
    const h = renderField(box, fields[name], "shift");
    h.input.addEventListener("input", notify);
    h.input.addEventListener("change", notify);
    h.listen = (cb) => listeners.push(cb);
    handles.set(name, h);
  }
  const summary = el("p", { class: "import-summary", hidden: "" });
  const previewBox = el("div", { class: "table-box import-preview", hidden: "", tabindex: "0", role: "region", "aria-label": "First rows of the file" });
  box.append(summary, previewBox);
  const columnsBox = el("div", { class: "column-pickers" });
  box.append(columnsBox);

  let detected = []; // [{name, unit}] from the engine
  const pick = (name, label, optional) => {
    if (!name || !fields[name]) return null;
    const f = fields[name];
    const s = shell(columnsBox, name, f.label || label, f.help || "");
    const sel = el("select", { id: s.id, "aria-describedby": `${s.id}-help ${s.id}-error` });
    s.wrap.append(sel, s.help, s.error);
    let value = typeof f.default === "string" ? f.default : "";
    const fill = () => {
      // a column given by its number ("1") shows as that column of the file
      const hit = detected.find((c, i) => sameColumn(value, c, i));
      const byNumber = hit && hit.name !== value ? hit.name : null;
      const options = [...(optional ? [["", "(none)"]] : []), ...detected.map((c, i) => [c.name, `${withUnit(c)} — column ${i + 1}`])];
      if (!byNumber && (value || !optional) && !options.some(([v]) => v === value)) options.push([value, value ? `${value} (as given)` : "(first column)"]);
      sel.replaceChildren(...options.map(([v, l]) => el("option", { value: v }, l)));
      sel.value = byNumber || value;
    };
    sel.addEventListener("change", () => {
      value = sel.value;
      notify();
    });
    fill();
    handles.set(name, {
      field: f, wrap: s.wrap, input: sel, unitSelect: null, fill,
      get: () => value, set(raw) { value = typeof raw === "string" ? raw : ""; fill(); },
      showError: s.showError, listen(cb) { listeners.push(cb); },
    });
    return sel;
  };
  pick(names.time, "Time column", false);
  pick(names.date, "Date column (when date and time are apart)", true);
  pick(names.column, "Column", false);

  let chosen = []; // [{column, quantity, unit}]
  if (names.columns && fields[names.columns]) {
    const f = fields[names.columns];
    const s = shell(columnsBox, names.columns, "", f.help || "");
    const group = el("fieldset", { class: "column-list" });
    group.append(el("legend", {}, f.label || "Columns to summarise"));
    const list = el("div", { class: "column-items" });
    group.append(list, s.help, s.error);
    s.wrap.append(group);
    const fill = () => {
      list.replaceChildren();
      const names_ = detected.map((c) => c.name);
      for (const c of chosen) if (!detected.some((d, i) => sameColumn(c.column, d, i)) && !names_.includes(c.column)) names_.push(c.column);
      if (!names_.length) list.append(el("p", { class: "help" }, "The columns appear here once a file is read."));
      names_.forEach((name, i) => {
        const info = detected.find((c) => c.name === name) || {};
        const mine = chosen.find((c) => c.column === name || (info.name !== undefined && sameColumn(c.column, info, detected.indexOf(info))));
        const row = el("div", { class: "column-item" });
        const idBase = `${s.id}-${i}`;
        const check = el("input", { type: "checkbox", id: `${idBase}-use` });
        check.checked = Boolean(mine);
        const label = el("label", { for: `${idBase}-use` }, info.name !== undefined ? withUnit(info) : name);
        const what = el("select", { id: `${idBase}-what`, "aria-label": `What ${name} holds` });
        for (const [v, l] of QUANTITIES) what.append(el("option", { value: v }, l));
        what.value = mine?.quantity || info.quantity || "number";
        what.disabled = !check.checked;
        // a size channel carries its diameter (nm)
        const diameter = el("input", { type: "text", inputmode: "decimal", id: `${idBase}-d`, size: "5", autocomplete: "off", "aria-label": `Diameter of ${name} (nm)` });
        const dBox = el("span", { class: "channel-diameter" });
        dBox.append(diameter, el("span", { class: "unit" }, "nm"));
        const d0 = mine?.diameter;
        diameter.value = d0 && typeof d0 === "object" ? String(d0.value ?? "") : d0 === undefined || d0 === null ? "" : String(d0);
        const showD = () => { dBox.hidden = !(check.checked && what.value === "channel"); };
        showD();
        const update = () => {
          what.disabled = !check.checked;
          showD();
          const others = chosen.filter((c) => c !== mine && c.column !== name);
          // the column is named as the file names it (whole header)
          const rec = { column: name, quantity: what.value, unit: mine && mine.quantity === what.value ? mine.unit || "" : "" };
          if (what.value === "channel") rec.diameter = { value: diameter.value, unit: "nm" };
          chosen = check.checked ? [...others, rec] : others;
          // keep the file's column order
          const at = (c) => { const k = detected.findIndex((d, j) => sameColumn(c.column, d, j)); return k >= 0 ? k : names_.indexOf(c.column); };
          chosen.sort((a, b) => at(a) - at(b));
          notify();
          fill();
          list.querySelector(`#${CSS.escape(document.activeElement?.id || "none")}`)?.focus();
        };
        check.addEventListener("change", update);
        what.addEventListener("change", update);
        diameter.addEventListener("change", update);
        row.append(check, label, what, dBox);
        list.append(row);
      });
    };
    handles.set(names.columns, {
      field: f, wrap: s.wrap, input: list, unitSelect: null, fill,
      get: () => chosen.map((c) => ({ ...c })),
      set(raw) {
        let items = raw;
        if (typeof raw === "string") {
          try { items = JSON.parse(raw); } catch { items = []; }
        }
        chosen = Array.isArray(items) ? items.filter((c) => c && typeof c === "object" && typeof c.column === "string")
          .map((c) => ({ column: c.column, quantity: String(c.quantity || "number"), unit: String(c.unit ?? ""), ...(c.diameter !== undefined ? { diameter: c.diameter } : {}) })) : [];
        fill();
      },
      showError: s.showError, listen(cb) { listeners.push(cb); },
    });
    handles.get(names.columns).set(f.default ?? []); // the declared first value column
  }

  let shownImport = ""; // the reading last shown, as JSON: a moved period leaves it as it was
  /** Show the engine's reading of the file: columns for the pickers, the first rows. */
  function showImport(info, preview) {
    const shown = JSON.stringify([info ?? null, preview === undefined ? "(unchanged)" : preview]);
    if (shown === shownImport) return;
    shownImport = shown;
    if (info && Array.isArray(info.columns)) {
      const labels = Array.isArray(info.table?.columns) ? info.table.columns : [];
      detected = info.columns.map((c, i) => (typeof c === "string" ? { name: c, unit: "" }
        : { name: String(c.name), unit: String(c.unit || ""), label: labels[i]?.label || "" }));
      for (const h of handles.values()) if (h.fill) h.fill();
    }
    summary.textContent = info ? importSummary(info) : "";
    summary.hidden = !info;
    const header = preview && Array.isArray(preview.header) ? preview.header : null;
    if (preview && !Array.isArray(preview) && Array.isArray(preview.rows)) preview = preview.rows;
    if (Array.isArray(preview) && preview.length) {
      const table = el("table", { class: "results preview-table" });
      table.append(el("caption", {}, info && info.header_line
        ? `First rows as read (header on line ${info.header_line}${info.delimiter ? `, ${info.delimiter} separated` : ""}${info.decimal ? `, decimal mark “${info.decimal}”` : ""})`
        : "First rows as read"));
      const headRow = el("tr");
      (header || detected.map((c) => c.name)).forEach((name, i) => {
        headRow.append(el("th", { scope: "col" }, withUnit({ name, unit: detected[i]?.unit || "" })));
      });
      const thead = el("thead");
      thead.append(headRow);
      const tbody = el("tbody");
      for (const cells of preview.slice(0, PREVIEW_ROWS)) {
        const tr = el("tr");
        const row = Array.isArray(cells) ? cells : Array.isArray(cells?.cells) ? cells.cells : [];
        for (const cell of row) tr.append(el("td", {}, String(cell)));
        tbody.append(tr);
      }
      table.append(thead, tbody);
      previewBox.replaceChildren(table);
      previewBox.hidden = false;
    } else if (preview === null) {
      previewBox.replaceChildren();
      previewBox.hidden = true;
    }
  }

  return { handles, showImport, box, hasText: () => Boolean(text), source: () => source };
}
