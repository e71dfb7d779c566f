// Build form fields from the field descriptions that driftdose.api publishes (forms.json), read
// raw inputs back, and show per-field messages. No physical rule lives here: Python validates.

let counter = 0;

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
 * Render one field description into `container`; returns a handle with get(), set(), showError().
 */
export function renderField(container, field, prefix) {
  const id = `${prefix}-${field.name}-${++counter}`;
  const wrap = el("div", { class: "field", "data-field": field.name });
  const label = el("label", { for: id }, field.label);
  wrap.append(label);
  const row = el("div", { class: "field-row" });
  const helpId = `${id}-help`;
  const errorId = `${id}-error`;
  let input;
  let unitSelect = null;
  if (field.kind === "choice") {
    input = el("select", { id, name: field.name, "aria-describedby": `${helpId} ${errorId}` });
    for (const choice of field.choices) {
      const option = el("option", { value: choice.value }, choice.label);
      input.append(option);
    }
    input.value = field.default;
    row.append(input);
  } else {
    input = el("input", {
      id, name: field.name, type: "text", inputmode: "decimal", autocomplete: "off",
      spellcheck: "false", "aria-describedby": `${helpId} ${errorId}`,
    });
    const def = field.default && typeof field.default === "object" ? field.default : { value: field.default };
    input.value = String(def.value);
    row.append(input);
    if (field.units && field.units.length > 1) {
      unitSelect = el("select", { "aria-label": `${field.label} unit`, name: `${field.name}-unit` });
      for (const u of field.units) unitSelect.append(el("option", { value: u.unit }, u.label));
      unitSelect.value = def.unit;
      row.append(unitSelect);
    } else if (field.units && field.units.length === 1 && field.units[0].label !== "–") {
      row.append(el("span", { class: "unit" }, field.units[0].label));
    }
  }
  wrap.append(row);
  const helpText = [field.help, field.range ? `Valid: ${field.range}.` : ""].filter(Boolean).join(" ");
  wrap.append(el("p", { class: "help", id: helpId }, helpText));
  const error = el("p", { class: "error", id: errorId, hidden: "" });
  wrap.append(error);
  container.append(wrap);

  const defaultUnit = unitSelect ? unitSelect.value : (field.units && field.units[0] ? field.units[0].unit : undefined);
  return {
    field, input, unitSelect, wrap,
    get() {
      if (field.kind === "choice") return input.value;
      return { value: input.value, unit: unitSelect ? unitSelect.value : defaultUnit };
    },
    set(raw) {
      if (field.kind === "choice") {
        input.value = String(raw);
      } else if (raw && typeof raw === "object") {
        input.value = raw.value === undefined || raw.value === null ? "" : String(raw.value);
        if (unitSelect && raw.unit !== undefined) unitSelect.value = String(raw.unit);
      } else {
        input.value = raw === undefined || raw === null ? "" : String(raw);
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

  /** Show errors from a reply; returns the messages that belong to no field here. */
  showErrors(errors) {
    const byField = new Map();
    const orphans = [];
    for (const e of errors || []) {
      if (this.handles.has(e.field) && !byField.has(e.field)) byField.set(e.field, e.message);
      else orphans.push(e.message);
    }
    for (const [name, handle] of this.handles) handle.showError(byField.get(name) || "");
    return orphans;
  }

  onInput(callback) {
    for (const handle of this.handles.values()) {
      handle.input.addEventListener("input", callback);
      handle.input.addEventListener("change", callback);
      if (handle.unitSelect) handle.unitSelect.addEventListener("change", callback);
    }
  }
}
