// The printable record: built from each panel's last valid inputs and reply, shown only in
// print (the browser's "Save as PDF" makes the file). Everything is inserted as text.
import { el } from "./forms.js";
import { resultsTable } from "./panel.js";
import { formatNumber } from "./format.js";

const CAUTIONS = [
  "These are screening estimates from published models, each valid within the stated range.",
  "They are not a substitute for measurement or for professional judgment.",
  "Local regulations, exposure limits and licensed practice take precedence.",
];

/** Fill `target` with the record of every panel in `controllers` (Map id -> CalcPanel). */
export function buildReport(target, controllers, { version, pyodide }) {
  const now = new Date();
  const parts = [
    el("h1", {}, "Drift & Dose — screening record"),
    el("p", { class: "report-meta" },
      `Prepared ${now.toLocaleString()} (${now.toISOString()}) with Drift & Dose ${version}, Python engine Pyodide ${pyodide || "(not loaded)"}.`),
    el("p", { class: "report-meta" }, `Link to these inputs: ${location.href}`),
  ];
  const cautions = el("section", { class: "report-cautions" });
  cautions.append(el("h2", {}, "Cautions"));
  const list = el("ul");
  for (const c of CAUTIONS) list.append(el("li", {}, c));
  cautions.append(list);
  parts.push(cautions);
  for (const controller of controllers.values()) {
    parts.push(panelRecord(controller));
  }
  target.replaceChildren(...parts);
}

function panelRecord(controller) {
  const section = el("section", { class: "report-panel" });
  section.append(el("h2", {}, controller.opts.title));
  const reply = controller.lastGood;
  if (!reply) {
    section.append(el("p", {}, "No valid result for this calculation yet."));
    return section;
  }
  if (controller.demoLabel) {
    section.append(el("p", { class: "report-demo" },
      `Invented demo data: ${controller.demoLabel}. Not a measurement.`));
  }
  if (controller.isStale()) {
    section.append(el("p", { class: "report-demo" },
      "The current inputs are not valid; this record shows the last valid inputs and their results."));
  }
  section.append(el("h3", {}, "Inputs"));
  const inputs = el("table", { class: "results" });
  const body = el("tbody");
  for (const row of controller.describeInputs(controller.lastGoodInputs)) {
    const tr = el("tr");
    tr.append(el("th", { scope: "row" }, row.label), el("td", {}, row.value), el("td", {}, row.unit));
    body.append(tr);
  }
  inputs.append(body);
  section.append(inputs);
  section.append(el("h3", {}, "Results"));
  section.append(resultsTable(reply.results, "Results", controller.opts.tableKeys));
  for (const table of Object.values(reply.results)) {
    if (table && Array.isArray(table.rows)) section.append(tableResult(table));
  }
  for (const canvas of controller.root.querySelectorAll("canvas")) {
    const src = chartImage(canvas);
    if (!src) continue;
    section.append(el("img", { class: "report-chart", src, alt: canvas.getAttribute("aria-label") || "Chart" }));
  }
  if (reply.warnings && reply.warnings.length) {
    section.append(el("h3", {}, "Warnings raised"));
    const ul = el("ul");
    for (const w of reply.warnings) ul.append(el("li", {}, w));
    section.append(ul);
  }
  section.append(el("h3", {}, "Models, sources and validity"));
  const ol = el("ol");
  for (const s of reply.sources || []) ol.append(el("li", {}, s.citation));
  section.append(ol);
  if (reply.assumptions && reply.assumptions.length) {
    const ul = el("ul");
    for (const a of reply.assumptions) ul.append(el("li", {}, a));
    section.append(ul);
  }
  return section;
}

/** A result that is itself a table (a row per stage, per size bin): every column, as text. */
function tableResult(table) {
  const scalar = [];
  const quantities = [];
  for (const row of table.rows) {
    for (const [key, value] of Object.entries(row)) {
      if (key === "quantities" && Array.isArray(value)) {
        for (const q of value) {
          const head = q.unit && q.unit !== "–" ? `${q.label} (${q.unit})` : q.label;
          if (!quantities.includes(head)) quantities.push(head);
        }
      } else if ((value === null || typeof value !== "object") && !scalar.includes(key)) {
        scalar.push(key);
      }
    }
  }
  const unitOf = (key) => table[`${key}_unit`] || (["measured", "corrected"].includes(key) ? table.concentration_unit : "");
  const out = el("table", { class: "results" });
  out.append(el("caption", {}, table.label));
  const head = el("tr");
  for (const key of scalar) head.append(el("th", { scope: "col" }, unitOf(key) ? `${key.replace(/_/g, " ")} (${unitOf(key)})` : key.replace(/_/g, " ")));
  for (const q of quantities) head.append(el("th", { scope: "col" }, q));
  out.append(el("thead", {}, ""), el("tbody"));
  out.querySelector("thead").append(head);
  for (const row of table.rows) {
    const tr = el("tr");
    const byHead = new Map((row.quantities || []).map((q) => [q.unit && q.unit !== "–" ? `${q.label} (${q.unit})` : q.label, q.value ?? q.text]));
    for (const key of scalar) tr.append(el("td", {}, cellText(row[key])));
    for (const q of quantities) tr.append(el("td", {}, cellText(byHead.get(q))));
    out.querySelector("tbody").append(tr);
  }
  return out;
}

function cellText(value) {
  if (typeof value === "number") return formatNumber(value);
  if (typeof value === "boolean") return value ? "yes" : "no";
  return value === undefined || value === null ? "" : String(value);
}

/**
 * PNG data URL of the chart on `canvas`. A chart in a panel that was never shown has no size
 * yet; it is drawn once more, off screen, at a fixed size from the same data and options.
 */
function chartImage(canvas) {
  if (canvas.width && canvas.height) return canvas.toDataURL("image/png");
  const Chart = window.Chart;
  const chart = Chart && Chart.getChart(canvas);
  if (!chart) return "";
  const spare = document.createElement("canvas");
  spare.width = 960;
  spare.height = 480;
  const copy = new Chart(spare, {
    type: chart.config.type,
    data: JSON.parse(JSON.stringify(chart.config.data)),
    options: { ...chart.config.options, responsive: false, animation: false, devicePixelRatio: 1 },
    plugins: chart.config.plugins,
  });
  const url = spare.toDataURL("image/png");
  copy.destroy();
  return url;
}
