// The periods of a shift as an editable table: one row per period (label, kind, start, end,
// activity, route, protection factor), rows added and removed with buttons. Times are typed as
// HH:MM[:SS] or as a date and time; the chart's bands write them when dragged. Errors arrive
// from the engine as "periods.<index>.<part>" and are shown in the row, beside the cell at
// fault; times that do not read and overlaps are shown at once, before the engine answers.
// A task log kept in a spreadsheet (CSV or TSV) can replace the rows: the engine reads it
// (the field's `table_file` names its describer) and a file it refuses changes nothing.
import { el } from "./forms.js";
import { decodeFile, describeText } from "./files.js";
import { KINDS, formatTime, nextPeriod, overlaps, spans } from "./periods.js";

const KIND_LABELS = { task: "Task", background: "Background", break: "Break" };
const PARTS = ["label", "kind", "start", "end", "activity", "route", "protection_factor"];
const HEADS = {
  label: "Label", kind: "Kind", start: "Start", end: "End", activity: "Activity",
  route: "Breathing route", protection_factor: "Protection factor",
};

const asList = (raw) => {
  if (Array.isArray(raw)) return raw;
  if (typeof raw === "string" && raw.trim().startsWith("[")) {
    try {
      const parsed = JSON.parse(raw);
      return Array.isArray(parsed) ? parsed : [];
    } catch {
      return [];
    }
  }
  return [];
};
const text = (v) => (v === undefined || v === null ? "" : typeof v === "object" ? JSON.stringify(v) : String(v));

/**
 * Build the editor into `container`. `field`: the `periods` description (its item_fields give
 * the activity and route choices when declared; `fallback` otherwise: {activity, route} choice
 * lists). `getStart()` gives the series start (ISO) or "" before a file is read; `getTotal()`
 * its length in seconds. Returns a handle like the form's fields (get, set, showError, listen)
 * with `showPartErrors(errors)` for "periods.i.part" messages and `setSpan(i, span)` for drags.
 */
export function periodTable(container, field, { fallback = {}, getStart, getTotal, maxRows = 200 }) {
  const choices = {};
  for (const f of field.item_fields || []) if (f.choices) choices[f.name] = f.choices;
  choices.kind = choices.kind || KINDS.map((k) => ({ value: k, label: KIND_LABELS[k] }));
  choices.activity = choices.activity || fallback.activity || [];
  choices.route = choices.route || fallback.route || [];
  // a choice a record leaves out takes the declared default (as the engine does), not the first option
  const defaults = {};
  for (const f of field.item_fields || []) if (f.choices && typeof f.default === "string") defaults[f.name] = f.default;

  const wrap = el("div", { class: "field periods-field", "data-field": field.name });
  const group = el("fieldset", { class: "periods-box" });
  group.append(el("legend", {}, field.label || "Periods"));
  group.append(el("p", { class: "help", id: "shift-periods-help" },
    `${field.help ? `${field.help} ` : ""}Times as HH:MM or HH:MM:SS (on the date of the first reading; a clock time earlier than the first reading is the next day's) or as a date and time, YYYY-MM-DD HH:MM. Or drag a band's edges on the chart.`));
  const tableBox = el("div", { class: "table-box periods-scroll" });
  const table = el("table", { class: "periods-table" });
  table.append(el("caption", { class: "visually-hidden" }, "Periods of the shift"));
  const head = el("thead");
  const hr = el("tr");
  hr.append(el("th", { scope: "col" }, "#"));
  for (const p of PARTS) hr.append(el("th", { scope: "col" }, HEADS[p]));
  const removeHead = el("th", { scope: "col" });
  removeHead.append(el("span", { class: "visually-hidden" }, "Remove"));
  hr.append(removeHead);
  head.append(hr);
  const body = el("tbody");
  table.append(head, body);
  tableBox.append(table);
  const tools = el("div", { class: "period-tools", role: "group", "aria-label": "Add a period" });
  const addButtons = KINDS.map((kind) => {
    const b = el("button", { type: "button", class: "secondary", "data-add": kind }, `Add ${KIND_LABELS[kind].toLowerCase()}`);
    b.addEventListener("click", () => {
      const next = nextPeriod(read(), getStart(), getTotal(), kind, kind === "break" ? 900 : 1800);
      const base = rows.length ? read()[rows.length - 1] : {};
      addRow({ activity: base.activity || "light_exercise", route: base.route || "mixed", protection_factor: "1", ...next });
      rows[rows.length - 1].cells.label.focus();
      notify();
    });
    return b;
  });
  tools.append(...addButtons);
  const overlapNote = el("p", { class: "error periods-overlap", role: "status", hidden: "" });
  const listError = el("p", { class: "error", hidden: "" });
  group.append(tableBox, overlapNote, tools, listError);
  const fromFile = field.table_file ? periodFile(group, field.table_file) : null;
  wrap.append(group);
  container.append(wrap);

  const listeners = [];
  let rows = [];
  let passThrough; // a longer list from a link than the table holds: sent as it came
  const notify = () => {
    passThrough = undefined;
    check();
    for (const cb of listeners) cb();
  };

  /** The file control beside the table: a task log's rows replace the periods, or nothing changes. */
  function periodFile(box, spec) {
    const fid = "shift-periods-file";
    const shellBox = el("div", { class: "field periods-file", "data-field": "periods_file" });
    const input = el("input", { id: fid, type: "file", accept: spec.accept || ".csv,.txt,.tsv",
      "aria-describedby": `${fid}-help ${fid}-status ${fid}-error` });
    const help = el("p", { class: "help", id: `${fid}-help` },
      "Columns found by their headers: label, kind, start, end, activity, route, protection factor (start and end needed; notes above the header row, semicolons and decimal commas are read). Its rows replace the periods above.");
    const status = el("p", { class: "file-status", id: `${fid}-status`, role: "status" }, "");
    const error = el("p", { class: "error", id: `${fid}-error`, hidden: "" });
    shellBox.append(el("label", { for: fid }, "Read the periods from a task log (CSV or TSV)"), input, help, status, error);
    box.append(shellBox);
    let mine = 0;
    const refuse = (message) => {
      error.textContent = `${message} The periods were not changed.`;
      error.hidden = false;
      status.textContent = "";
      shellBox.classList.add("invalid");
    };
    input.addEventListener("change", async () => {
      const file = input.files[0];
      if (!file) return;
      const turn = ++mine;
      const name = file.name.slice(0, 80);
      status.textContent = `Reading ${name}…`;
      let got;
      try {
        got = await decodeFile(file, spec.max_bytes || 256 * 1024);
      } catch (err) {
        got = { ok: false, message: `could not be read (${String(err && err.name ? err.name : err).slice(0, 60)})` };
      }
      let read = got.ok ? await describeText(spec.describe || "periods", got.text, 0) : got;
      if (turn !== mine) return;
      input.value = ""; // the same file can be chosen again after it is fixed
      if (!read || !read.ok || !Array.isArray(read.records)) {
        refuse(`${name}: ${String(read?.message || "could not be read.").slice(0, 400)}`);
        return;
      }
      if (read.records.length > maxRows) read = { ...read, records: read.records.slice(0, maxRows) };
      error.hidden = true;
      shellBox.classList.remove("invalid");
      const lines = read.lines || [];
      const span = lines.length ? ` (lines ${lines[0]}–${lines[lines.length - 1]})` : "";
      status.textContent = `Read ${read.records.length} ${read.records.length === 1 ? "period" : "periods"} from ${name}${span}.`;
      setItems(read.records);
      notify();
    });
    return { input, status, error };
  }

  function select(list, value, label) {
    const s = el("select", { "aria-label": label });
    for (const c of list) s.append(el("option", { value: c.value }, c.label));
    if (value !== undefined && ![...s.options].some((o) => o.value === text(value))) s.append(el("option", { value: text(value) }, text(value)));
    s.value = value === undefined ? (list[0]?.value ?? "") : text(value);
    return s;
  }

  function addRow(values) {
    const tr = el("tr", { class: "period-row" });
    const number = el("th", { scope: "row", class: "period-number" });
    tr.append(number);
    const cells = {};
    const tds = {};
    for (const part of PARTS) {
      const td = el("td", { "data-part": part });
      td.append(el("span", { class: "cell-label", "aria-hidden": "true" }, HEADS[part]));
      let input;
      if (part === "kind" || part === "activity" || part === "route") {
        input = select(choices[part], values[part] ?? defaults[part], "");
      } else {
        input = el("input", {
          type: "text", autocomplete: "off", spellcheck: "false",
          inputmode: part === "protection_factor" ? "decimal" : "text",
          size: part === "label" ? "14" : part === "protection_factor" ? "4" : "8",
        });
        input.value = text(part === "protection_factor" && values[part] === undefined ? "1" : values[part]);
      }
      input.dataset.part = part;
      input.addEventListener("input", notify);
      input.addEventListener("change", notify);
      td.append(input);
      cells[part] = input;
      tds[part] = td;
      tr.append(td);
    }
    const removeTd = el("td", { class: "period-remove" });
    const remove = el("button", { type: "button", class: "secondary" }, "Remove");
    remove.addEventListener("click", () => {
      const at = rows.indexOf(row);
      rows.splice(at, 1);
      tr.remove();
      errorRow.remove();
      relabel();
      notify();
      (rows[Math.min(at, rows.length - 1)]?.cells.label || addButtons[0]).focus();
    });
    removeTd.append(remove);
    tr.append(removeTd);
    const errorRow = el("tr", { class: "period-error", hidden: "" });
    const errorCell = el("td", { colspan: String(PARTS.length + 2), class: "error" });
    errorRow.append(errorCell);
    body.append(tr, errorRow);
    const row = { tr, number, cells, tds, remove, errorRow, errorCell, local: "", remote: new Map() };
    rows.push(row);
    relabel();
    return row;
  }

  function relabel() {
    rows.forEach((r, i) => {
      r.number.textContent = String(i + 1);
      const name = r.cells.label.value.trim() || `${KIND_LABELS[r.cells.kind.value] || "Period"} ${i + 1}`;
      for (const part of PARTS) r.cells[part].setAttribute("aria-label", `${HEADS[part]} of period ${i + 1}`);
      r.remove.setAttribute("aria-label", `Remove period ${i + 1} (${name})`);
      r.tr.dataset.kind = r.cells.kind.value;
      r.tr.dataset.index = String(i);
    });
    for (const b of addButtons) b.disabled = rows.length >= maxRows;
  }

  function readRow(r) {
    const out = {};
    for (const part of PARTS) out[part] = r.cells[part].value;
    return out;
  }

  function read() {
    return rows.map(readRow);
  }

  /** Show what the page knows at once: times that do not read, overlaps. */
  function check() {
    relabel();
    const start = getStart();
    const list = read();
    const found = spans(list, start);
    rows.forEach((r, i) => {
      r.local = found[i].error ? `${HEADS[found[i].error.split(":")[0]] || ""}: ${found[i].error.replace(/^\w+: /, "")}` : "";
    });
    const clashes = start ? overlaps(list, start) : [];
    const said = clashes.map((c) => `Periods ${c.a + 1} and ${c.b + 1} overlap from ${formatTime(c.start, start)} to ${formatTime(c.end, start)}.`);
    overlapNote.textContent = said.join(" ");
    overlapNote.hidden = said.length === 0;
    for (const r of rows) r.tr.classList.remove("overlapping");
    for (const c of clashes) {
      rows[c.a]?.tr.classList.add("overlapping");
      rows[c.b]?.tr.classList.add("overlapping");
    }
    paint();
    return { spans: found, clashes };
  }

  function paint() {
    for (const r of rows) {
      const messages = [];
      if (r.local) messages.push(r.local);
      for (const [part, message] of r.remote) if (!r.local || (part !== "start" && part !== "end")) messages.push(message);
      r.errorCell.textContent = messages.join(" ");
      r.errorRow.hidden = messages.length === 0;
      r.tr.classList.toggle("invalid", messages.length > 0);
      for (const part of PARTS) {
        const bad = r.remote.has(part) || (r.local && r.local.startsWith(HEADS[part]));
        if (bad) r.cells[part].setAttribute("aria-invalid", "true");
        else r.cells[part].removeAttribute("aria-invalid");
      }
    }
  }

  function setItems(list) {
    body.replaceChildren();
    rows = [];
    const items = asList(list);
    passThrough = items.length > maxRows ? items : undefined;
    for (const values of items.slice(0, maxRows)) addRow(values && typeof values === "object" ? values : {});
    check();
  }

  return {
    field, wrap, input: addButtons[0], unitSelect: null,
    get() {
      return passThrough !== undefined ? passThrough : read();
    },
    set(raw) {
      setItems(raw);
    },
    /** A message about the whole list (field "periods"). */
    showError(message) {
      listError.textContent = message || "";
      listError.hidden = !message;
      wrap.classList.toggle("invalid", Boolean(message));
    },
    /** Messages for "periods.<i>.<part>" (or "periods.<i>"): shown in row i beside the part. */
    showPartErrors(errors) {
      for (const r of rows) r.remote = new Map();
      const stray = [];
      for (const e of errors) {
        const m = /^periods[.[](\d+)\]?(?:\.(\w+))?$/.exec(e.field || "");
        const r = m ? rows[Number(m[1])] : null;
        if (!r) {
          stray.push(e.message);
          continue;
        }
        const part = PARTS.includes(m[2]) ? m[2] : "label";
        if (!r.remote.has(part)) r.remote.set(part, e.message);
      }
      paint();
      return stray;
    },
    /** Write a dragged span (seconds from the series start) into row i as typed times. */
    setSpan(i, span) {
      const r = rows[i];
      const start = getStart();
      if (!r || !start) return;
      r.cells.start.value = formatTime(span.start, start);
      r.cells.end.value = formatTime(span.end, start);
    },
    /** Re-read after a drag or a new file: local checks, then tell the panel. */
    changed: notify,
    check,
    listen(cb) { listeners.push(cb); },
    /** The row (tr) of period i, for tests and focus. */
    row: (i) => rows[i]?.tr,
    /** The task-log file control (input, status, error), when the field declares one. */
    fromFile,
  };
}
