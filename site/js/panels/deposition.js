// Panel "Where it lands": regional deposition in the respiratory tract and dose per shift.
import { CalcPanel, resultsTable } from "../panel.js";
import { el } from "../forms.js";
import { renew } from "../dom.js";
import { chartFigure, createChart, decadeTicks, seriesColour, setDatasets } from "../charts.js";
import { axisTitle, curvePoints, readout } from "../chartparts.js";
import { formatNumber, lengthTick } from "../format.js";
import { fromSI, toSI, unitText, withUnit } from "../units.js";
import { sizesTable } from "../sizetable.js";

export const id = "deposition";
export const title = "Where it lands";

const METRICS = [
  ["number", "Number"],
  ["surface", "Surface area"],
  ["mass", "Mass"],
];

// the inputs named on a saved chart image
const SCENARIO = [
  "size_source", "modes", "csv_text", "spectrum_diameter_type", "particle_density", "density_basis",
  "shape_factor", "model", "breathing", "activity", "route", "tidal_volume", "breathing_frequency",
  "nasal_fraction", "exposure_duration",
];

export function mount(root, { engine, description }) {
  const fields = description.fields.map((f) => (f.name === "modes" ? { ...f, item_label: "a mode" } : f));
  const demos = (fields.find((f) => f.name === "size_source") || {}).demos || [];
  let fractionChart = null;
  let xUnit = "um"; // unit code of the fraction chart's sizes, as the last reply named it
  let doseChart = null;
  let doseUnit = ""; // read by the dose chart's readout, which outlives one reply
  let lastReply = null;

  const summaryBox = el("div", { class: "table-box" });
  const modesBox = el("div", { class: "table-box", "data-part": "modes" });
  const ldsaBox = el("div", { class: "table-box", "data-part": "ldsa" });
  const regionBox = el("div", { class: "table-box" });
  const sizesBox = el("div", { "data-part": "sizes" }); // the exact values at the typed sizes
  const metricSelect = el("select", { id: "deposition-metric" });
  for (const [value, label] of METRICS) metricSelect.append(el("option", { value }, label));
  metricSelect.value = "mass";
  const perSelect = el("select", { id: "deposition-per" });
  perSelect.append(el("option", { value: "dose" }, "Over the exposure"), el("option", { value: "rate" }, "Per hour"));
  const controls = el("div", { class: "view-controls" });
  controls.append(
    el("label", { for: "deposition-metric" }, "Dose as"), metricSelect,
    el("label", { for: "deposition-per" }, "Shown"), perSelect,
  );

  const fractionFigure = chartFigure("deposition-fraction",
    "Deposition fraction in each region against particle size (ICRP region names), with your size distribution overlaid, scaled to a peak of 1. The size axis is the diameter named on it (volume-equivalent; mobility with an effective density): an aerodynamic median of dense particles sits at a smaller size here. The table of modes gives each median in both.",
    "Save fraction chart image", "drift-dose-deposition-fractions.png", () => fractionChart,
    () => ({ title: "Deposition fraction by region against particle size", scenario: scenario() }));
  const doseFigure = chartFigure("deposition-dose",
    "Deposited dose per region for the chosen metric.",
    "Save dose chart image", "drift-dose-deposition-dose.png", () => doseChart,
    () => ({ title: doseChart?.options.scales.y.title.text || "Deposited dose by region", scenario: scenario() }));

  const panel = new CalcPanel(root, {
    id, kind: "deposition", title: "Where it lands: respiratory deposition and dose",
    intro: "Of the particles a worker breathes, the share that deposits in each region of the respiratory tract, and the number, surface area and mass deposited over the exposure. Define the aerosol by lognormal modes or import a measured spectrum.",
    legend: "Aerosol, breathing and exposure",
    describeData(name, raw) {
      if (name === "csv_text") {
        const lines = String(raw).split(/\r?\n/).filter((l) => l.trim()).length;
        return `imported text, ${lines} non-empty lines (${String(raw).length} characters)`;
      }
      if (name === "modes" && Array.isArray(raw)) {
        return raw.map((m, i) => {
          const q = (x) => (x && typeof x === "object" ? withUnit(x.value, x.unit) : String(x));
          const type = m.diameter_type ? ` (${String(m.diameter_type).replace("_", "-")})` : "";
          return `Mode ${i + 1}: by ${m.basis}, median ${q(m.median)}${type}, GSD ${q(m.gsd)}, concentration ${q(m.concentration)}`;
        }).join("; ");
      }
      return JSON.stringify(raw);
    },
    engine, description: { ...description, fields },
    render(reply) {
      lastReply = reply;
      const keys = Object.keys(reply.results);
      const general = keys.filter((k) => !/^(fraction|rate|dose|ldsa|mode\d+)_/.test(k) && k !== "sizes_table");
      const modeKeys = keys.filter((k) => /^mode\d+_/.test(k));
      renew(summaryBox, resultsTable(reply.results, "Aerosol and breathing", general));
      renew(modesBox, ...(modeKeys.length
        ? [resultsTable(reply.results, `Modes as the models use them (size axis: ${reply.curves.x_label.replace(/^Particle diameter \((.*)\)$/, "$1")} diameter)`, modeKeys)]
        : []));
      renew(ldsaBox, resultsTable(reply.results,
        "Lung-deposited surface area (LDSA): deposited particle surface per cm³ of inhaled air",
        keys.filter((k) => k.startsWith("ldsa_"))));
      renderRegions();
      const sizes = sizesTable(reply.results.sizes_table, "deposition-sizes");
      renew(sizesBox, ...(sizes ? [sizes] : []));
      renderFractionChart(reply.curves);
      renderDoseChart();
    },
    tableKeys: undefined,
  });

  function renderRegions() {
    const reply = lastReply;
    const bars = reply.curves.dose_bars;
    const per = perSelect.value;
    const table = el("table", { class: "results regions" });
    table.append(el("caption", {}, per === "dose" ? `Deposition by region, over ${bars.per}` : "Deposition by region, per hour"));
    const head = el("thead");
    const row1 = el("tr");
    row1.append(el("th", { scope: "col", rowspan: "2" }, "Region"));
    row1.append(el("th", { scope: "colgroup", colspan: "3" }, "Deposited fraction of inhaled"));
    row1.append(el("th", { scope: "colgroup", colspan: "3" }, per === "dose" ? "Deposited amount" : "Deposited per hour"));
    const row2 = el("tr");
    for (const [, label] of METRICS) row2.append(el("th", { scope: "col" }, label.toLowerCase()));
    for (const [metric, label] of METRICS) {
      const unit = unitText(reply.results[`${per}_${bars.keys[0]}_${metric}`]?.unit || "");
      row2.append(el("th", { scope: "col" }, `${label.toLowerCase()} (${unit})`));
    }
    head.append(row1, row2);
    table.append(head);
    const body = el("tbody");
    bars.keys.forEach((key, i) => {
      const tr = el("tr", { "data-region": key });
      tr.append(el("th", { scope: "row" }, bars.regions[i]));
      for (const [metric] of METRICS) cell(tr, reply.results[`fraction_${key}_${metric}`], "1", `fraction_${key}_${metric}`);
      for (const [metric] of METRICS) {
        const r = reply.results[`${per}_${key}_${metric}`];
        const headUnit = reply.results[`${per}_${bars.keys[0]}_${metric}`]?.unit;
        cell(tr, r, r && r.unit !== headUnit ? r.unit : "1", `${per}_${key}_${metric}`);
      }
      body.append(tr);
    });
    table.append(body);
    renew(regionBox, table);
  }

  /** A value cell; `unit` the code printed after the number ("1": none, as under a column's unit). */
  function cell(tr, r, unit, key) {
    const text = r ? withUnit(formatNumber(r.value), unit) : "—";
    tr.append(el("td", { class: "value", "data-key": key }, text));
  }

  function renderFractionChart(curves) {
    xUnit = curves.x_unit; // sizes arrive in the unit the reply names
    if (!fractionChart) {
      const metres = (v) => toSI(v, xUnit);
      fractionChart = createChart(fractionFigure.canvas, {
        // the size ticks carry their units ("10 nm", "1 µm"): the title names the quantity only
        x: { title: axisTitle(curves.x_label, unitText(curves.x_unit), true), tick: decadeTicks((v) => lengthTick(metres(v))), readout: (x) => lengthTick(metres(x)), min: fromSI(1e-9, curves.x_unit), max: fromSI(100e-6, curves.x_unit) },
        y: { title: curves.y_label, type: "linear", min: 0, max: 1 },
        y2: { title: "Your distribution (scaled)", type: "linear", min: 0, max: 1, position: "right", secondary: true },
      }, {
        readout: (ctx) => readout(ctx.dataset.label, formatNumber(ctx.parsed.y, 3)),
        steadyLayout: () => xUnit, // fixed bounds; the size ticks are written in this unit
      });
    }
    fractionChart.options.scales.x.title.text = axisTitle(curves.x_label, unitText(curves.x_unit), true);
    const sets = [];
    Object.values(curves.deposition).forEach((curve, i) => {
      sets.push({
        label: curve.label, data: curvePoints(curves, curve), borderColor: seriesColour(i), backgroundColor: seriesColour(i),
        pointRadius: 0, borderWidth: curve.label.startsWith("Total") ? 3 : 2, borderDash: curve.label.startsWith("Total") ? [8, 4] : [], yAxisID: "y",
      });
    });
    Object.values(curves.distribution).filter((c) => c && Array.isArray(c.y)).forEach((curve, i) => {
      sets.push({
        label: curve.label, data: curvePoints(curves, curve), yAxisID: "y2", pointRadius: 0, borderWidth: 1,
        borderColor: seriesColour(6 - i), backgroundColor: i === 0 ? "rgba(120,120,120,0.18)" : "rgba(120,120,120,0.08)", fill: "origin",
      });
    });
    setDatasets(fractionChart, sets);
  }

  function renderDoseChart() {
    const bars = lastReply.curves.dose_bars;
    const metric = metricSelect.value;
    const per = perSelect.value;
    const data = bars[metric];
    const values = per === "dose" ? data.y : data.per_hour;
    const unit = unitText(per === "dose" ? data.unit : `${data.unit}/h`); // codes: "ug", "ug/h"
    const label = per === "dose" ? data.label : data.per_hour_label; // both named by the reply
    const yTitle = `${label} (${unit})`;
    doseUnit = unit;
    if (!doseChart) {
      doseChart = createChart(doseFigure.canvas, {
        x: { title: "Region", type: "category" },
        y: { title: yTitle, type: "linear", min: 0 },
      }, { type: "bar", readout: (ctx) => readout(ctx.dataset.label, `${formatNumber(ctx.parsed.y, 4)} ${doseUnit}`) });
    }
    doseChart.options.scales.y.title.text = yTitle; // the chart is updated in place
    doseChart.data.labels = bars.keys.map((k) => (k === "total" ? "Total" : k));
    setDatasets(doseChart, [{ label, data: values, backgroundColor: bars.keys.map((_, i) => seriesColour(i)) }]);
    doseFigure.canvas.setAttribute("aria-label", `Bar chart of ${data.label.toLowerCase()} by region: ${bars.keys.map((k, i) => `${k} ${formatNumber(values[i], 3)} ${unit}`).join(", ")}.`);
  }

  function scenario() {
    const files = panel.importedFiles().map((f) => `file ${f.name}`);
    return [panel.scenario(SCENARIO.filter((n) => n !== "csv_text" || !files.length)), ...files].join(" · ");
  }

  metricSelect.addEventListener("change", () => lastReply && renderDoseChart());
  perSelect.addEventListener("change", () => {
    if (!lastReply) return;
    renderRegions();
    renderDoseChart();
  });

  if (demos.length) {
    panel.useDemos(demos, {
      groupLabel: "Invented demo scenarios",
      prompt: "Try an invented demo scenario (not measurements):",
    });
  }

  const applyVisibility = panel.fields.showDeclared(fields);
  const baseSet = panel.setState.bind(panel);
  panel.setState = (values) => {
    const csv = panel.fields.handles.get("csv_text");
    const demo = demos.find((d) => d.id === values.demo);
    if (Array.isArray(values.modes)) {
      // a mode from before the diameter type existed keeps its meaning (the engine's rule)
      values = { ...values, modes: values.modes.map((m) => (m && typeof m === "object" && !Array.isArray(m) && m.diameter_type === undefined
        ? { ...m, diameter_type: m.basis === "mass" ? "aerodynamic" : "volume_equivalent" } : m)) };
    }
    baseSet(values);
    if (csv && demo && demo.inputs.csv_text) csv.set(demo.inputs.csv_text, "invented demo spectrum");
    applyVisibility();
  };

  // beside each mode's median, what it is (count or mass median of which diameter); the words
  // come from the field description
  const medianNames = (fields.find((f) => f.name === "modes") || {}).median_names || {};
  function sayMedians() {
    for (const box of root.querySelectorAll("fieldset.item")) {
      const basis = box.querySelector('[data-field="basis"] select')?.value;
      const type = box.querySelector('[data-field="diameter_type"] select')?.value;
      const wrap = box.querySelector('[data-field="median"]');
      const input = wrap?.querySelector("input");
      if (!wrap || !input) continue;
      let says = wrap.querySelector(".median-says");
      if (!says) {
        says = el("p", { class: "help median-says", id: `${input.id}-says` });
        wrap.append(says);
        input.setAttribute("aria-describedby", `${input.getAttribute("aria-describedby") || ""} ${says.id}`.trim());
      }
      const name = medianNames[basis]?.[type];
      says.textContent = name ? `This median is the ${name}.` : "";
    }
  }
  panel.onChange(sayMedians);
  sayMedians();

  panel.body.append(summaryBox, modesBox, ldsaBox, regionBox, sizesBox, controls, doseFigure.figure, fractionFigure.figure);
  return panel;
}
