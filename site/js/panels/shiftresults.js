// Results of the shift panel: the shift summary in words and numbers, the per-task table, and
// the dose per region stacked by task (chart and table). Presentation only: the reply of
// driftdose.api ("shift") carries every number, unit and label.
import { el } from "../forms.js";
import { chartFigure, createChart, seriesColour, setDatasets } from "../charts.js";
import { formatNumber } from "../format.js";

const isObject = (v) => v !== null && typeof v === "object" && !Array.isArray(v);
/** A reply value: a number, or {value, unit}, or {text}; shown with its unit. */
function shown(v, unit = "") {
  if (v === null || v === undefined) return "—";
  if (isObject(v)) {
    if (v.text !== undefined) return String(v.text);
    return shown(v.value, v.unit === "–" ? "" : v.unit || unit);
  }
  if (typeof v === "number") return `${formatNumber(v)}${unit ? ` ${unit}` : ""}`;
  return String(v);
}

/** The shift summary: what the 8-h TWA is and how it was reached, in words, then the numbers. */
export function shiftSummary(results) {
  const shift = results?.shift;
  if (!isObject(shift)) return [];
  const out = [];
  if (shift.words || shift.summary) out.push(el("p", { class: "shift-words" }, String(shift.words || shift.summary)));
  const table = el("table", { class: "results shift-table" });
  table.append(el("caption", {}, "Shift summary"));
  const body = el("tbody");
  for (const [key, row] of Object.entries(shift)) {
    if (!isObject(row) || row.label === undefined) continue;
    const tr = el("tr", { "data-key": key });
    tr.append(el("th", { scope: "row" }, String(row.label)));
    if (row.text !== undefined) {
      tr.append(el("td", { class: "value wrap", colspan: "2" }, String(row.text)));
    } else {
      tr.append(el("td", { class: "value" }, formatNumber(row.value)));
      tr.append(el("td", { class: "unit" }, row.unit === "–" ? "" : String(row.unit || "")));
    }
    body.append(tr);
  }
  table.append(body);
  out.push(table);
  return out;
}

/**
 * The per-task table: one row per period. `tasks`: {columns: [{key, label, unit}], rows:
 * [{label, kind, ...values}]} or a list of rows (columns then from the first row's keys).
 */
export function taskTable(tasks, shift) {
  const table = el("table", { class: "results task-table" });
  table.append(el("caption", {}, "Per period: exposure statistics"));
  const columns = tasks?.columns || [];
  const rows = Array.isArray(tasks) ? tasks : tasks?.rows || [];
  const head = el("thead");
  const hr = el("tr");
  hr.append(el("th", { scope: "col" }, "Period"));
  for (const c of columns) hr.append(el("th", { scope: "col" }, c.unit && c.unit !== "–" ? `${c.label} (${c.unit})` : c.label));
  head.append(hr);
  const body = el("tbody");
  for (const row of [...rows, ...(isObject(shift?.row) ? [shift.row] : [])]) {
    const tr = el("tr", { "data-period": String(row.index ?? ""), "data-kind": String(row.kind || "") });
    tr.append(el("th", { scope: "row" }, String(row.label ?? "")));
    for (const c of columns) tr.append(el("td", { class: "value", "data-key": c.key }, shown(row[c.key])));
    body.append(tr);
  }
  table.append(head, body);
  return table;
}

/** The dose per region stacked by task: a metric choice, a stacked bar chart and a table. */
export function doseView() {
  const box = el("div", { class: "shift-dose" });
  const controls = el("div", { class: "view-controls" });
  const metric = el("select", { id: "shift-dose-metric" });
  controls.append(el("label", { for: "shift-dose-metric" }, "Dose as"), metric);
  const tableBox = el("div", { class: "table-box", "data-part": "dose" });
  let chart = null;
  let unit = "";
  const figure = chartFigure("shift-dose",
    "Deposited dose per region of the respiratory tract over the shift, stacked by task (protection factor applied to what is inhaled).",
    "Save dose chart image", "drift-dose-shift-dose.png", () => chart);
  box.append(el("h3", {}, "Dose per region, by task"), controls, tableBox, figure.figure);
  box.hidden = true;
  let last = null;

  function draw() {
    const dose = last;
    const m = (dose.metrics || []).find((x) => x.key === metric.value) || dose.metrics?.[0];
    if (!m) return;
    unit = m.unit || "";
    const regions = dose.regions || [];
    const tasks = dose.tasks || [];
    // table: regions down, tasks across, total last
    const table = el("table", { class: "results dose-table" });
    table.append(el("caption", {}, `${m.label}${unit ? ` (${unit})` : ""}`));
    const head = el("thead");
    const hr = el("tr");
    hr.append(el("th", { scope: "col" }, "Region"));
    for (const t of tasks) hr.append(el("th", { scope: "col" }, t.label));
    hr.append(el("th", { scope: "col" }, "All tasks"));
    head.append(hr);
    const body = el("tbody");
    regions.forEach((region, ri) => {
      const tr = el("tr", { "data-region": region.key });
      tr.append(el("th", { scope: "row" }, region.label));
      tasks.forEach((t, ti) => tr.append(el("td", { class: "value", "data-task": String(ti) }, formatNumber(m.values?.[ti]?.[ri]))));
      tr.append(el("td", { class: "value total", "data-key": `${m.key}_${region.key}` }, formatNumber(m.totals?.[ri])));
      body.append(tr);
    });
    table.append(head, body);
    tableBox.replaceChildren(table);
    if (!chart) {
      chart = createChart(figure.canvas, {
        x: { title: "Region", type: "category" },
        y: { title: "Deposited", type: "linear", min: 0 },
      }, { type: "bar", readout: (ctx) => `${ctx.dataset.label}: ${formatNumber(ctx.parsed.y, 4)} ${unit}` });
      chart.options.scales.x.stacked = true;
      chart.options.scales.y.stacked = true;
    }
    const drawn = regions.filter((r) => r.key !== "total");
    const at = drawn.map((r) => regions.indexOf(r));
    chart.options.scales.y.title.text = `${m.label}${unit ? ` (${unit})` : ""}`;
    chart.data.labels = drawn.map((r) => r.key);
    setDatasets(chart, tasks.map((t, ti) => ({
      label: t.label, data: at.map((ri) => m.values?.[ti]?.[ri] ?? 0), backgroundColor: seriesColour(ti), stack: "tasks",
    })));
    figure.canvas.setAttribute("aria-label", `Stacked bar chart of ${m.label.toLowerCase()} by region and task: ${drawn.map((r, k) => `${r.key} ${formatNumber(m.totals?.[at[k]], 3)} ${unit}`).join(", ")}.`);
  }

  metric.addEventListener("change", () => last && draw());
  return {
    box,
    show(dose) {
      last = isObject(dose) ? dose : null;
      box.hidden = !last;
      if (!last) return;
      const before = metric.value;
      metric.replaceChildren(...(last.metrics || []).map((m) => el("option", { value: m.key }, m.label)));
      if ([...metric.options].some((o) => o.value === before)) metric.value = before;
      else if ([...metric.options].some((o) => o.value === "mass")) metric.value = "mass";
      draw();
    },
  };
}
