// Survey details for the record: who measured what, where and with which instrument. Entered
// once for the whole page; kept in links and saved inputs; printed at the top of the record.
// Plain text only (shown with textContent); nothing here enters a calculation.
import { el } from "./forms.js";

export const SURVEY_FIELDS = [
  ["site", "Site"],
  ["area", "Area or workstation"],
  ["task", "Task or process"],
  ["role", "Worker role (no names needed)"],
  ["instrument", "Instrument"],
  ["serial", "Serial number"],
  ["calibration", "Calibration date"],
  ["samples", "Sample or file IDs"],
  ["assessor", "Assessor"],
  ["date", "Survey date"],
];
export const SURVEY_MAX_CHARS = 200;
const NAMES = new Set(SURVEY_FIELDS.map(([name]) => name));

/** Keep only the known survey entries, as plain strings of at most SURVEY_MAX_CHARS. */
export function cleanSurvey(raw) {
  const out = {};
  const ignored = [];
  if (!raw || typeof raw !== "object" || Array.isArray(raw)) return { values: out, ignored };
  for (const [name, value] of Object.entries(raw)) {
    if (!NAMES.has(name)) {
      ignored.push(name);
      continue;
    }
    const text = typeof value === "string" ? value : typeof value === "number" ? String(value) : "";
    const trimmed = text.replace(/[\u0000-\u001f\u007f]/g, " ").trim().slice(0, SURVEY_MAX_CHARS);
    if (trimmed) out[name] = trimmed;
  }
  return { values: out, ignored };
}

/** Build the survey form into `box`; returns {get(), set(raw), onChange(cb)}. */
export function mountSurvey(box) {
  const inputs = new Map();
  const listeners = [];
  const summary = el("summary", {}, "Survey details for the record");
  const count = el("span", { class: "survey-count" });
  summary.append(count);
  const grid = el("div", { class: "survey-grid" });
  for (const [name, label] of SURVEY_FIELDS) {
    const id = `survey-${name}`;
    const wrap = el("div", { class: "field" });
    const input = el("input", {
      id, name: `survey-${name}`, type: name === "calibration" || name === "date" ? "date" : "text",
      maxlength: String(SURVEY_MAX_CHARS), autocomplete: "off",
    });
    input.addEventListener("input", () => {
      relabel();
      for (const cb of listeners) cb();
    });
    wrap.append(el("label", { for: id }, label), input);
    grid.append(wrap);
    inputs.set(name, input);
  }
  box.append(summary,
    el("p", { class: "help" }, "Entered once for all calculations; kept in the link and in saved inputs, and printed at the top of the record. Nothing here changes a result."),
    grid);

  function relabel() {
    const filled = [...inputs.values()].filter((i) => i.value.trim()).length;
    count.textContent = filled ? ` (${filled} of ${inputs.size} filled)` : " (none filled)";
  }
  relabel();

  return {
    get() {
      return cleanSurvey(Object.fromEntries([...inputs].map(([n, i]) => [n, i.value]))).values;
    },
    /** Set from a link or file; returns the names that are not survey entries. */
    set(raw) {
      const { values, ignored } = cleanSurvey(raw);
      for (const [name, input] of inputs) input.value = values[name] || "";
      // a date field keeps only an ISO date; anything else stays visible as text
      for (const [name, input] of inputs) {
        if (input.type === "date" && values[name] && input.value !== values[name]) {
          input.type = "text";
          input.value = values[name];
        }
      }
      relabel();
      return ignored;
    },
    onChange(cb) {
      listeners.push(cb);
    },
  };
}
