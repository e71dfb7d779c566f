// Results of the shift panel: the shift summary in words and numbers, the per-task table, and
// the dose per region stacked by task (chart and table). Presentation only: the reply of
// driftdose.api ("shift") carries every number, unit and label.
import { el } from "../forms.js";
import { renew } from "../dom.js";
import { chartFigure, createChart, seriesColour, setDatasets } from "../charts.js";
import { formatNumber } from "../format.js";
import { resultsTable } from "../panel.js";
import { unitText } from "../units.js";

const isObject = (v) => v !== null && typeof v === "object" && !Array.isArray(v);
/** A reply value: a number, or {value, unit}, or {text}; shown with its unit. */
function shown(v, unit = "") {
  if (v === null || v === undefined) return "—";
  if (isObject(v)) {
    if (v.text !== undefined) return String(v.text);
    return shown(v.value, v.unit === undefined ? unit : unitText(v.unit));
  }
  if (typeof v === "number") return `${formatNumber(v)}${unit ? ` ${unit}` : ""}`;
  return String(v);
}

const SUMMARY_KEYS = ["twa8h", "twa8h_corrected", "twa_ratio", "shift_mean", "shift_peak15", "shift_max", "coverage", "twa_rule", "background_method"];
const clock = (iso) => String(iso || "").replace(/^\d{4}-\d{2}-\d{2}T/, "").replace(/:00$/, "");

/** The shift summary: the 8-h TWA and how it was reached, in words, then the numbers. */
export function shiftSummary(results) {
  if (!isObject(results) || !isObject(results.twa8h)) return [];
  const out = [];
  const twa = results.twa8h;
  const words = [`8-h time-weighted average: ${shown(twa)}`];
  if (isObject(results.twa8h_corrected) && Number.isFinite(results.twa8h_corrected.value)) words.push(`${shown(results.twa8h_corrected)} with the background taken out`);
  let text = `${words.join("; ")}.`;
  if (results.twa_rule?.text) text += ` The ${results.twa_rule.text.replace(/^the /i, "")}.`.replace(/^ The u/, " U");
  if (results.background_method?.text) text += ` Background: ${results.background_method.text}.`;
  // in the printed record too (report.js copies a .record-note as a paragraph)
  out.push(el("p", { class: "shift-words record-note", "data-key": "words" }, text.replace(" The unmeasured", " Unmeasured")));
  const box = el("div", { class: "table-box", "data-part": "shift", tabindex: "0", role: "region", "aria-label": "Shift summary" });
  box.append(resultsTable(results, "Shift summary", SUMMARY_KEYS.filter((k) => isObject(results[k]))));
  out.push(box);
  return out;
}

const percent = (x) => (typeof x === "number" && Number.isFinite(x) ? `${formatNumber(100 * x, 3)} %` : "—");
const number = (x) => (typeof x === "number" && Number.isFinite(x) ? formatNumber(x) : "—");
const minutes = (s) => (typeof s === "number" && Number.isFinite(s) ? formatNumber(s / 60, 4) : "—");

/**
 * The per-period table: one row per period in the order entered, then the shift.
 * `tasks` and `shift`: the reply's tables {label, unit, rows}.
 */
export function taskTable(tasks, shift) {
  const unit = unitText(tasks?.unit || shift?.unit || "");
  const columns = [
    ["kind", "Kind", (r) => String(r.kind || "shift")],
    ["time", "From – to", (r) => `${clock(r.start)}–${clock(r.end)}`],
    ["duration_s", "Duration (min)", (r) => minutes(r.duration_s)],
    ["coverage", "Measured", (r) => percent(r.coverage)],
    ["mean", `Mean (${unit})`, (r) => number(r.mean)],
    ["median", "Median", (r) => number(r.median)],
    ["p95", "95th percentile", (r) => number(r.p95)],
    ["max", "Maximum", (r) => number(r.max)],
    ["peak15", "Highest 15-min mean", (r) => number(r.peak15)],
    ["background", "Background", (r) => number(r.background)],
    ["corrected_mean", "Mean less background", (r) => number(r.corrected_mean)],
    ["below_background_share", "Below background", (r) => percent(r.below_background_share)],
    ["ratio", "Mean ÷ benchmark", (r) => number(r.ratio)],
    ["share_above", "Time above benchmark", (r) => percent(r.share_above)],
  ];
  const rows = Array.isArray(tasks?.rows) ? tasks.rows : [];
  const all = [...rows, ...(Array.isArray(shift?.rows) ? shift.rows.map((r) => ({ ...r, kind: "shift" })) : [])];
  // columns with nothing to show (no background, no benchmark) are left out
  const used = columns.filter(([key]) => key === "kind" || key === "time" || all.some((r) => r[key] !== null && r[key] !== undefined));
  const table = el("table", { class: "results task-table" });
  table.append(el("caption", {}, `Per period and for the shift (concentrations in ${unit})`));
  const head = el("thead");
  const hr = el("tr");
  hr.append(el("th", { scope: "col" }, "Period"));
  for (const [, label] of used) hr.append(el("th", { scope: "col" }, label));
  head.append(hr);
  const body = el("tbody");
  for (const row of all) {
    const tr = el("tr", { "data-period": row.index === undefined ? "shift" : String(row.index), "data-kind": String(row.kind || "") });
    tr.append(el("th", { scope: "row" }, String(row.period ?? row.label ?? "")));
    for (const [key, , cell] of used) tr.append(el("td", { class: key === "kind" || key === "time" ? "" : "value", "data-key": key }, cell(row)));
    body.append(tr);
  }
  table.append(head, body);
  return table;
}

const METRICS = [["mass", "Deposited mass"], ["surface", "Deposited surface area"], ["number", "Deposited number"]];

/** The dose per region stacked by task: a metric choice, a table and a stacked bar chart. */
export function doseView() {
  const box = el("div", { class: "shift-dose" });
  const controls = el("div", { class: "view-controls" });
  const metric = el("select", { id: "shift-dose-metric" });
  for (const [v, l] of METRICS) metric.append(el("option", { value: v }, l));
  metric.value = "mass";
  controls.append(el("label", { for: "shift-dose-metric" }, "Dose as"), metric);
  const tableBox = el("div", { class: "table-box", "data-part": "dose", tabindex: "0", role: "region", "aria-label": "Dose per region by task" });
  const ldsaBox = el("div", { class: "table-box", "data-part": "dose-ldsa", tabindex: "0", role: "region", "aria-label": "LDSA per task" });
  let chart = null;
  let unit = "";
  const figure = chartFigure("shift-dose",
    "Deposited dose per region of the respiratory tract over the shift, stacked by task (the protection factor divides what is inhaled).",
    "Save dose chart image", "drift-dose-shift-dose.png", () => chart);
  box.append(el("h3", {}, "Dose per region, by task"), controls, tableBox, figure.figure, ldsaBox);
  box.hidden = true;
  let last = null;

  function draw() {
    const dose = last;
    const key = metric.value;
    const label = METRICS.find(([v]) => v === key)[1];
    unit = unitText(dose.units?.[key] || "");
    const regions = dose.regions || [];
    const names = dose.region_labels || regions;
    const tasks = dose.tasks || [];
    const table = el("table", { class: "results dose-table" });
    table.append(el("caption", {}, `${label} over the shift${unit ? ` (${unit})` : ""}, by task`));
    const head = el("thead");
    const hr = el("tr");
    hr.append(el("th", { scope: "col" }, "Region"));
    for (const t of tasks) hr.append(el("th", { scope: "col" }, `${t.period}${t.protection_factor > 1 ? ` (protection factor ${formatNumber(t.protection_factor)})` : ""}`));
    hr.append(el("th", { scope: "col" }, "All tasks"));
    head.append(hr);
    const body = el("tbody");
    regions.forEach((region, ri) => {
      const tr = el("tr", { "data-region": region });
      tr.append(el("th", { scope: "row" }, names[ri]));
      tasks.forEach((t) => tr.append(el("td", { class: "value", "data-task": String(t.index) }, formatNumber(t[key]?.[ri]))));
      tr.append(el("td", { class: "value total", "data-key": `${key}_${region}` }, formatNumber(dose.total?.[key]?.[ri])));
      body.append(tr);
    });
    table.append(head, body);
    renew(tableBox, table);
    // LDSA of the air each task breathed
    const ldsa = el("table", { class: "results dose-ldsa" });
    ldsa.append(el("caption", {}, `Lung-deposited surface area of the inhaled air, per task (${unitText(dose.ldsa_unit || "um2/cm3")})`));
    const lh = el("thead");
    const lr = el("tr");
    for (const h of ["Task", "Alveolar", "Tracheobronchial", "Total"]) lr.append(el("th", { scope: "col" }, h));
    lh.append(lr);
    const lb = el("tbody");
    for (const t of tasks) {
      const tr = el("tr", { "data-task": String(t.index) });
      tr.append(el("th", { scope: "row" }, t.period));
      for (const k of ["alveolar", "tracheobronchial", "total"]) tr.append(el("td", { class: "value" }, formatNumber(t.ldsa?.[k])));
      lb.append(tr);
    }
    ldsa.append(lh, lb);
    renew(ldsaBox, ldsa);
    if (!chart) {
      chart = createChart(figure.canvas, {
        x: { title: "Region", type: "category" },
        y: { title: "Deposited", type: "linear", min: 0 },
      }, { type: "bar", readout: (ctx) => `${ctx.dataset.label}: ${formatNumber(ctx.parsed.y, 4)} ${unit}` });
      chart.options.scales.x.stacked = true;
      chart.options.scales.y.stacked = true;
    }
    const drawn = regions.map((r, i) => [r, i]).filter(([r]) => r !== "total");
    chart.options.scales.y.title.text = unit ? `${label} (${unit})` : label;
    chart.data.labels = drawn.map(([r]) => r);
    setDatasets(chart, tasks.map((t, ti) => ({
      label: t.period, data: drawn.map(([, ri]) => t[key]?.[ri] ?? 0), backgroundColor: seriesColour(ti), stack: "tasks",
    })));
    figure.canvas.setAttribute("aria-label", `Stacked bar chart of ${label.toLowerCase()} by region, stacked by task: ${drawn.map(([r, ri]) => `${r} ${formatNumber(dose.total?.[key]?.[ri], 3)} ${unit}`).join(", ")}.`);
  }

  metric.addEventListener("change", () => last && draw());
  return {
    box,
    show(dose) {
      last = isObject(dose) && Array.isArray(dose.tasks) ? dose : null;
      box.hidden = !last;
      if (last) draw();
    },
  };
}
