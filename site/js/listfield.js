// A `records` field: a list of groups of sub-fields (such as lognormal modes), each sub-field
// rendered as a plain field by the form's own renderer.
import { el, fieldShell, onValue } from "./dom.js";
import { unitLabel } from "./units.js";

/**
 * A `records` field (such as lognormal modes): one group of sub-fields per record, with add and
 * remove buttons; a message about one value sits beside that value only. `renderField` renders
 * one sub-field (the form's renderer, passed in so that the modules do not import each other).
 */
export function renderList(container, field, prefix, renderField) {
  const shell = fieldShell(container, field.name, prefix);
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
      else if (f.units) sub.units = f.units.map((u) => (typeof u === "string" ? { unit: u, label: unitLabel(u) } : u));
      if (sub.kind !== "choice" && !(sub.default && typeof sub.default === "object")) sub.kind = "plain";
      const h = renderField(box, sub, `${prefix}-${field.name}`);
      onValue(h.input, notify);
      if (h.unitSelect) onValue(h.unitSelect, notify);
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
