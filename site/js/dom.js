// Small pieces shared by the page's forms and panels: element creation, a select that keeps a
// value it lacks, text of a raw value, unique ids and the shell of a field with its error line.

let counter = 0;

/** A new element with attributes (undefined and null ones left out) and text. */
export function el(tag, attrs = {}, text = "") {
  const node = document.createElement(tag);
  for (const [key, value] of Object.entries(attrs)) {
    if (value !== undefined && value !== null) node.setAttribute(key, value);
  }
  if (text) node.textContent = text;
  return node;
}

/** A unique element id for the field `name` under `prefix`. */
export function fieldId(prefix, name) {
  return `${prefix}-${name}-${++counter}`;
}

/**
 * Choose `value` in `select`, adding it as an option when the list lacks it: a unit or choice
 * from a link or file that the page does not offer stays visible and reaches the engine, whose
 * message then names it.
 */
export function choose(select, value) {
  if (![...select.options].some((o) => o.value === value)) select.append(el("option", { value }, value));
  select.value = value;
}

/** A value from a link or file as the text of a field: structured values are shown as JSON. */
export function asText(value) {
  if (value === undefined || value === null) return "";
  return typeof value === "object" ? JSON.stringify(value) : String(value);
}

/**
 * The wrapper of the field `name` appended to `container`: a unique id under `prefix`, the
 * label (when given, placed in the wrapper), a help line and an error line (shown by
 * showError) for the caller to place.
 */
export function fieldShell(container, name, prefix, label = "", helpText = "") {
  const id = fieldId(prefix, name);
  const wrap = el("div", { class: "field", "data-field": name });
  if (label) wrap.append(el("label", { for: id }, label));
  const help = el("p", { class: "help", id: `${id}-help` }, helpText || "");
  const error = el("p", { class: "error", id: `${id}-error`, hidden: "" });
  container.append(wrap);
  return {
    id, wrap, help, error,
    showError(message) {
      error.textContent = message || "";
      error.hidden = !message;
      wrap.classList.toggle("invalid", Boolean(message));
    },
  };
}
