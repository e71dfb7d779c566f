// Three inputs of the shift panel that depend on the chosen columns: which column is
// summarised, the benchmark (value and a unit of that column's quantity), and the lognormal
// modes that give each task's size distribution its shape. Each is a field handle of the
// panel's form (get, set, showError, listen). Presentation only: the engine checks them.
import { el, fieldShell } from "./dom.js";
import { unitLabel } from "./units.js";

// units the engine accepts for a benchmark of each quantity (the first is the default)
// (codes; labelled from the unit table)
export const BENCHMARK_UNITS = {
  number: ["1/cm3", "1/m3"],
  ldsa: ["um2/cm3", "m2/m3"],
  mass: ["ug/m3", "mg/m3", "kg/m3"],
};
const NAMES = { number: "number concentration", ldsa: "LDSA", mass: "mass concentration" };

function shell(container, field, labelText) {
  return fieldShell(container, field.name, "shift", labelText || field.label, field.help);
}

/**
 * The summarised column: a choice among the value columns (not size channels). `getColumns()`
 * gives the value-column records. Blank: the engine takes the first that is not a channel.
 */
export function quantityPicker(container, field, getColumns) {
  const s = shell(container, field);
  const sel = el("select", { id: s.id, "aria-describedby": `${s.id}-help ${s.id}-error` });
  s.wrap.append(sel, s.help, s.error);
  const listeners = [];
  let value = typeof field.default === "string" ? field.default : "";
  const fill = () => {
    const cols = getColumns().filter((c) => c.quantity !== "channel");
    const options = [["", cols.length ? `First value column (${cols[0].column})` : "First value column"], ...cols.map((c) => [c.column, `${c.column} (${NAMES[c.quantity] || c.quantity})`])];
    if (value && !options.some(([v]) => v === value)) options.push([value, `${value} (as given)`]);
    sel.replaceChildren(...options.map(([v, l]) => el("option", { value: v }, l)));
    sel.value = value;
  };
  sel.addEventListener("change", () => {
    value = sel.value;
    for (const cb of listeners) cb();
  });
  fill();
  return {
    field, wrap: s.wrap, input: sel, unitSelect: null, fill,
    get: () => value,
    set(raw) { value = typeof raw === "string" ? raw : ""; fill(); },
    /** The quantity (number, ldsa, mass) of the summarised column, or "". */
    quantity() {
      const cols = getColumns().filter((c) => c.quantity !== "channel");
      const c = value ? cols.find((x) => x.column.toLowerCase() === value.toLowerCase()) : cols[0];
      return c ? c.quantity : "";
    },
    showError: s.showError,
    listen(cb) { listeners.push(cb); },
  };
}

/** The benchmark: an optional value with a unit of the summarised quantity. */
export function benchmarkInput(container, field, getQuantity) {
  const s = shell(container, field);
  const row = el("div", { class: "field-row" });
  const input = el("input", { id: s.id, type: "text", inputmode: "decimal", autocomplete: "off", "aria-describedby": `${s.id}-help ${s.id}-error` });
  const unit = el("select", { "aria-label": `${field.label} unit` });
  row.append(input, unit);
  s.wrap.append(row, s.help, s.error);
  const listeners = [];
  let wanted = "";
  const fill = () => {
    const units = BENCHMARK_UNITS[getQuantity()] || BENCHMARK_UNITS.number;
    const keep = wanted || unit.value;
    unit.replaceChildren(...units.map((v) => el("option", { value: v }, unitLabel(v))));
    if (keep && !units.includes(keep)) unit.append(el("option", { value: keep }, keep));
    unit.value = keep && [...unit.options].some((o) => o.value === keep) ? keep : units[0];
  };
  const notify = () => {
    wanted = unit.value;
    for (const cb of listeners) cb();
  };
  input.addEventListener("input", notify);
  unit.addEventListener("change", notify);
  fill();
  return {
    field, wrap: s.wrap, input, unitSelect: unit, fill,
    get: () => (input.value.trim() ? { value: input.value, unit: unit.value } : null),
    set(raw) {
      if (raw && typeof raw === "object") {
        input.value = raw.value === undefined || raw.value === null ? "" : String(raw.value);
        wanted = typeof raw.unit === "string" ? raw.unit : "";
      } else {
        input.value = raw === undefined || raw === null ? "" : String(raw);
        wanted = "";
      }
      fill();
    },
    showError(message) {
      s.showError(message);
      if (message) input.setAttribute("aria-invalid", "true");
      else input.removeAttribute("aria-invalid");
    },
    listen(cb) { listeners.push(cb); },
  };
}
