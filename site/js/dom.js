// Small pieces shared by the page's forms and panels: element creation, in-place renewal of
// shown results, a select that keeps a value it lacks, text of a raw value, unique ids and the
// shell of a field with its error line.

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

const ELEMENT = 1;
const TEXT = 3;

/**
 * Make `fresh` (a node built anew, not in the page) the content of `old` (a node in the page of
 * the same name) by changing `old` in place: texts and attributes that differ are written, and
 * only where the children differ in number or names are they replaced by those of `fresh`. The
 * page then shows exactly what `fresh` holds, but a table whose numbers changed keeps its
 * elements, so the browser restyles and repaints only what changed. Event listeners and
 * properties not held in attributes (an input's typed value) are not copied: use it for shown
 * results, built by `el`.
 */
function renewNode(old, fresh) {
  if (fresh.nodeType === TEXT) {
    if (old.nodeValue !== fresh.nodeValue) old.nodeValue = fresh.nodeValue;
    return;
  }
  if (fresh.nodeType !== ELEMENT) {
    old.replaceWith(fresh);
    return;
  }
  const wanted = fresh.attributes;
  const had = old.attributes;
  // as many attributes, none written: the same set, nothing to remove
  let differs = wanted.length !== had.length;
  for (let i = 0; i < wanted.length; i++) {
    const { name, value } = wanted[i];
    if (old.getAttribute(name) !== value) {
      old.setAttribute(name, value);
      differs = true;
    }
  }
  if (differs) {
    for (let i = had.length - 1; i >= 0; i--) {
      if (!fresh.hasAttribute(had[i].name)) old.removeAttribute(had[i].name);
    }
  }
  // a lone text child (a table cell's number): compared as text, no walk of child lists
  const only = fresh.firstChild;
  if (only && only === fresh.lastChild && only.nodeType === TEXT) {
    const mine = old.firstChild;
    if (mine && mine === old.lastChild && mine.nodeType === TEXT) {
      if (mine.nodeValue !== only.nodeValue) mine.nodeValue = only.nodeValue;
      return;
    }
  }
  renewChildren(old, fresh.childNodes);
}

/** `nodes`: an array or a NodeList of nodes not in the page (a NodeList of `fresh`). */
function renewChildren(box, nodes) {
  const old = box.childNodes;
  const count = nodes.length;
  let same = old.length === count;
  for (let i = 0; same && i < count; i++) {
    same = old[i].nodeType === nodes[i].nodeType && old[i].nodeName === nodes[i].nodeName;
  }
  if (!same) {
    box.replaceChildren(...nodes); // a NodeList is copied by the spread before any node moves
    return;
  }
  for (let i = 0; i < count; i++) renewNode(old[i], nodes[i]);
}

/**
 * Show `nodes` (built anew, e.g. a results table) as the children of `box`, as
 * `box.replaceChildren(...nodes)` would, changing the nodes already there in place where they
 * have the same shape (see renewNode).
 */
export function renew(box, ...nodes) {
  renewChildren(box, [...nodes]);
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

/**
 * Call `callback` when the value of `control` (an input or select) changes: on every "input"
 * event, and on a "change" event only when the value differs from the one last announced.
 * Leaving a text field raises "change" with the value its "input" events already announced,
 * and a select raises both events for one choice: either would otherwise ask the engine for
 * the same results twice. A value set by the page and then announced by "change" alone is news.
 */
export function onValue(control, callback) {
  let announced = control.value;
  control.addEventListener("input", (event) => {
    announced = control.value;
    callback(event);
  });
  control.addEventListener("change", (event) => {
    if (control.value === announced) return;
    announced = control.value;
    callback(event);
  });
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
  let shown = ""; // only a change of message touches the page
  return {
    id, wrap, help, error,
    showError(message) {
      if ((message || "") === shown) return;
      shown = message || "";
      error.textContent = message || "";
      error.hidden = !message;
      wrap.classList.toggle("invalid", Boolean(message));
    },
  };
}
