// Build form fields from the field descriptions that driftdose.api publishes (forms.json), read
// raw inputs back, and show per-field messages. No physical rule lives here: Python validates.
// File fields and column pickers are in filefields.js, lists of records in listfield.js.
import { asText, choose, el, fieldId, onValue } from "./dom.js";
import { renderFile, renderPicker } from "./filefields.js";
import { optionText } from "./format.js";
import { renderList } from "./listfield.js";
import { unitText } from "./units.js";

export { el };

/**
 * Render one field description into `container`; returns a handle with get(), set(), showError().
 */
export function renderField(container, field, prefix) {
  if (field.kind === "records") return renderList(container, field, prefix, renderField);
  if (field.kind === "data" && field.accept) return renderFile(container, field, prefix);
  if (field.picker) return renderPicker(container, field, prefix);
  const id = fieldId(prefix, field.name);
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
      id, name: field.name, type: "text", inputmode: field.kind === "text" || field.kind === "sizes" ? "text" : "decimal", autocomplete: "off",
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
  let shownError = ""; // every reply shows its errors: only a change of message touches the page
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
      message = message || "";
      if (message === shownError) return;
      shownError = message;
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
      onValue(handle.input, callback);
      if (handle.unitSelect) onValue(handle.unitSelect, callback);
    }
  }
}
