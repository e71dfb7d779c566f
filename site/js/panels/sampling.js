// Panel "What the sampler sees": a chain of sampling stages the user builds (tubes, bends,
// pre-separators, impactor stages, wire screens), its penetration against particle size per stage
// and overall, a target curve to compare with, and a measured spectrum corrected for the losses.
// Presentation only: every number and every message comes from driftdose.api ("sampling").
import { CalcPanel, resultsTable } from "../panel.js";
import { el } from "../forms.js";
import { renew } from "../dom.js";
import { chartFigure, createChart, decadeTicks, seriesColour, setDatasets } from "../charts.js";
import { axisTitle, curvePoints, readout } from "../chartparts.js";
import { formatNumber, lengthTick } from "../format.js";
import { fromSI, toSI, unitText, withUnit } from "../units.js";
import { sizesTable } from "../sizetable.js";
import { chainEditor } from "./chain.js";
import { spectrumView } from "./spectrum.js";

export const id = "sampling";
export const title = "What the sampler sees";

const OVERALL_KEYS = ["overall_10nm", "overall_100nm", "overall_1um", "overall_10um"];
const SHOWN_KEYS = ["pass_band", "departure_max", "departure_mean", "csv_rows"];
const SUMMARY_KEYS = [...OVERALL_KEYS, ...SHOWN_KEYS]; // the printed record has no stage table

const percent = (row) => (row ? `${formatNumber(row.value)} %` : "—");
// a stage as the reply names it (structured): the user's own name, else its type
const stageName = (stage) => stage.name || stage.type_label;

export function mount(root, { engine, description }) {
  const stagesField = description.fields.find((f) => f.name === "stages") || { name: "stages", label: "Sampling chain", help: "", stage_types: {}, demos: {} };
  const fields = description.fields.filter((f) => f.name !== "stages");
  const demos = Object.entries(stagesField.demos || {}).map(([demoId, d]) => ({ id: demoId, ...d }));
  let penetrationChart = null;

  const summaryBox = el("div", { class: "table-box summary-box" });
  const stageBox = el("div", { class: "table-box", tabindex: "0", role: "region", "aria-label": "Penetration by stage (scrolls sideways on narrow screens)" });
  const detailBox = el("div", { class: "stage-details" });
  const sizesBox = el("div", { "data-part": "sizes" }); // the exact values at the typed sizes
  const penetrationFigure = chartFigure("sampling-penetration",
    "Penetration (the fraction of particles that get through) against particle size, for each stage and for the whole chain, with the target curve if one is chosen.",
    "Save penetration chart image", "drift-dose-sampling-penetration.png", () => penetrationChart,
    () => ({ title: "Penetration through the sampling chain against particle size", scenario: scenario() }));
  const spectrum = spectrumView(() => scenario());
  // totals of measured and corrected number, under the corrected spectrum (how each total is
  // formed is in its note)
  const spectrumTotals = el("div", { class: "table-box", "data-part": "spectrum-totals" });
  spectrum.section.append(spectrumTotals);
  const panel = new CalcPanel(root, {
    id, kind: "sampling", title: "What the sampler sees: sampling lines and pre-separators",
    intro: "Build the chain of tubes, bends, pre-separators, impactor stages and wire screens between the air you sample and your instrument or filter. See what fraction of each particle size gets through, compare it with a health-related fraction or with where particles deposit in the airways, and correct a measured spectrum for the losses.",
    legend: "Sampling chain, air and target",
    engine, description: { ...description, fields },
    tableKeys: SUMMARY_KEYS,
    describeData: (name, raw) => describeData(name, raw),
    render(reply) {
      const results = reply.results;
      renew(summaryBox, resultsTable(results, results.departure_max ? "Whole chain and target" : "Whole chain", SHOWN_KEYS));
      renderStageTable(results);
      const sizes = sizesTable(results.sizes_table, "sampling-sizes");
      renew(sizesBox, ...(sizes ? [sizes] : []));
      renderDetails(results.stages_table);
      renderPenetrationChart(reply.curves);
      spectrum.render(results.spectrum_table, reply.curves.spectrum, reply.curves);
      renew(spectrumTotals, ...(results.spectrum_total_measured
        ? [resultsTable(results, "Total number concentration of the spectrum", ["spectrum_total_measured", "spectrum_total_corrected"])] : []));
    },
  });

  const chain = chainEditor(stagesField, () => {
    panel.demoLabel = "";
    panel.schedule();
  });
  chain.set(stagesField.default || [], true);

  // the scenario of a saved chart image: the chain in one line, then flow, target and spectrum
  function scenario() {
    const inputs = panel.lastGoodInputs || {};
    const stages = Array.isArray(inputs.stages) ? inputs.stages : [];
    const types = stagesField.stage_types || {};
    const chainText = stages.map((st, i) => `${i + 1}. ${(st && st.name) || types[st?.type]?.label || st?.type || "stage"}`).join(", ");
    const files = panel.importedFiles().map((f) => `file ${f.name}`);
    const rest = panel.scenario(["flow", "target", "size_source", "temperature", "pressure", "particle_density", "density_basis", "shape_factor"]);
    return [chainText ? `Chain: ${chainText}` : "", rest, ...files].filter(Boolean).join(" · ");
  }

  function describeData(name, raw) {
    if (name === "csv_text") {
      if (typeof raw !== "string" || !raw) return "none";
      return `CSV text, ${raw.split(/\r?\n/).filter((l) => l.trim()).length} lines (${raw.length.toLocaleString()} characters)`;
    }
    return JSON.stringify(raw);
  }

  function renderStageTable(results) {
    const table = results.stages_table;
    const t = el("table", { class: "results stage-table" });
    t.append(el("caption", {}, "Penetration by stage"));
    const head = el("thead");
    const hr = el("tr");
    hr.append(el("th", { scope: "col" }, "Stage"));
    for (const size of table.reference_sizes) hr.append(el("th", { scope: "col" }, size));
    hr.append(el("th", { scope: "col" }, "50 % penetration at"));
    head.append(hr);
    t.append(head);
    const body = el("tbody");
    for (const row of table.rows) {
      const tr = el("tr", { "data-stage": String(row.index) });
      const name = el("th", { scope: "row" }, `${row.index + 1}. ${stageName(row)}`);
      if (row.name && !row.name.includes(row.type_label)) name.append(el("span", { class: "note" }, ` (${row.type_label.toLowerCase()})`));
      tr.append(name);
      row.penetration_at.forEach((p, j) => tr.append(el("td", { class: "value", "data-key": `stage-${row.index}-${j}` }, percent(p))));
      const halves = row.half_penetration_sizes.map((q) => withUnit(formatNumber(q.value), q.unit)).join(", ") || "none in 1 nm – 100 µm";
      tr.append(el("td", { class: "halves" }, halves));
      body.append(tr);
    }
    const total = el("tr", { class: "overall", "data-stage": "overall" });
    total.append(el("th", { scope: "row" }, "Whole chain"));
    OVERALL_KEYS.forEach((key) => {
      total.append(el("td", { class: "value", "data-key": key }, percent(results[key])));
    });
    total.append(el("td", { class: "halves" }, results.pass_band ? results.pass_band.text : ""));
    body.append(total);
    t.append(body);
    renew(stageBox, t);
  }

  function renderDetails(table) {
    const parts = [el("h3", {}, "Stage details")];
    for (const row of table.rows) {
      const details = el("details", { class: "stage-detail", "data-stage": String(row.index) });
      const regime = row.regime ? `, ${row.regime} flow` : "";
      const flag = row.warnings.length ? ` — ${row.warnings.length} warning${row.warnings.length > 1 ? "s" : ""}` : "";
      details.append(el("summary", {}, `Stage ${row.index + 1}: ${stageName(row)}${regime}${flag}`));
      const quantities = Object.fromEntries(row.quantities.map((q) => [q.key, q]));
      details.append(resultsTable(quantities, `Key figures of stage ${row.index + 1} (${row.type_label.toLowerCase()})`));
      if (row.warnings.length) {
        const ul = el("ul", { class: "warnings" });
        for (const w of row.warnings) ul.append(el("li", {}, w));
        details.append(ul);
      }
      parts.push(details);
    }
    renew(detailBox, ...parts);
  }

  function renderPenetrationChart(curves) {
    const metres = (v) => toSI(v, curves.x_unit); // sizes arrive in the unit the reply names
    if (!penetrationChart) {
      penetrationChart = createChart(penetrationFigure.canvas, {
        // the size ticks carry their units ("10 nm", "1 µm"): the title names the quantity only
        x: { title: axisTitle(curves.x_label, unitText(curves.x_unit), true), tick: decadeTicks((v) => lengthTick(metres(v))), readout: (x) => lengthTick(metres(x)), min: fromSI(1e-9, curves.x_unit), max: fromSI(100e-6, curves.x_unit) },
        y: { title: "Penetration (fraction passing)", type: "linear", min: 0, max: 1 },
      }, {
        readout: (ctx) => readout(ctx.dataset.label, `${formatNumber(ctx.parsed.y * 100, 3)} %`),
        steadyLayout: () => curves.x_unit, // fixed bounds; the size ticks are written in this unit
      });
      // the whole chain is drawn under the stages (dataset order), but listed after them
      penetrationChart.options.plugins.legend.labels.sort = (a, b) => a.datasetIndex - b.datasetIndex;
    }
    penetrationChart.options.scales.x.title.text = axisTitle(curves.x_label, unitText(curves.x_unit), true);
    const sets = curves.stages.map((curve, i) => ({
      label: `${curve.index + 1}. ${stageName(curve)}`, data: curvePoints(curves, curve), borderColor: seriesColour(i + 1), backgroundColor: seriesColour(i + 1),
      pointRadius: 0, borderWidth: 2, borderDash: [5, 3 + 2 * (i % 3)], order: 1,
    }));
    sets.push({
      label: curves.overall.label, data: curvePoints(curves, curves.overall), borderColor: seriesColour(0), backgroundColor: seriesColour(0),
      pointRadius: 0, borderWidth: 4, order: 2,
    });
    if (curves.target) {
      sets.push({
        label: `Target: ${curves.target.label}`, data: curvePoints(curves, curves.target), borderColor: seriesColour(6), backgroundColor: seriesColour(6),
        pointRadius: 0, borderWidth: 2.5, borderDash: [10, 5], spanGaps: false, order: 0,
      });
    }
    setDatasets(penetrationChart, sets);
    const overall = curves.overall;
    penetrationFigure.canvas.setAttribute("aria-label",
      `Chart of penetration against particle size for ${curves.stages.length} stage${curves.stages.length === 1 ? "" : "s"} and the whole chain${curves.target ? `, with the target ${curves.target.label}` : ""}. The whole chain passes ${formatNumber(overall.y[0] * 100, 3)} % at 1 nm and ${formatNumber(overall.y[overall.y.length - 1] * 100, 3)} % at 100 µm; the table gives the figures.`);
  }

  if (demos.length) {
    const box = panel.useDemos(demos, {
      groupLabel: "Invented demo chains",
      prompt: "Try an invented demo chain (not a real installation or instrument):",
    });
    box.after(chain.box);
  } else {
    panel.fieldsBox.querySelector("legend").after(chain.box);
  }

  const applyVisibility = panel.fields.showDeclared(fields);
  // the spectrum inputs are those that apply by the choice the file input applies by
  // (applies_when in forms.json); they leave links and files while the choice is off
  const spectrumRule = (fields.find((f) => f.name === "csv_text") || {}).applies_when;
  const spectrumNames = spectrumRule
    ? fields.filter((f) => f.applies_when && f.applies_when.field === spectrumRule.field).map((f) => f.name)
    : [];
  const dropSpectrum = (state) => {
    if (spectrumRule && !spectrumRule.values.includes(state[spectrumRule.field])) for (const name of spectrumNames) delete state[name];
  };

  const baseShowErrors = panel.fields.showErrors.bind(panel.fields);
  panel.fields.showErrors = (errors) => baseShowErrors(chain.showErrors(errors));
  const baseSet = panel.setState.bind(panel);
  const baseGet = panel.getState.bind(panel);
  const baseKnows = panel.knows.bind(panel);
  const baseDescribe = panel.describeInputs.bind(panel);
  panel.inputs = () => ({ ...panel.fields.values(), stages: chain.get() });
  panel.getState = () => {
    const state = { ...baseGet(), stages: chain.get() };
    dropSpectrum(state);
    return state;
  };
  panel.knows = (name) => name === "stages" || baseKnows(name);
  panel.setState = (values) => {
    if (Object.hasOwn(values, "stages")) chain.set(values.stages);
    const csv = panel.fields.handles.get("csv_text");
    if (csv && Object.hasOwn(values, "csv_text")) csv.set(typeof values.csv_text === "string" ? values.csv_text : null, "spectrum from the link or file");
    const rest = { ...values };
    delete rest.csv_text;
    baseSet(rest);
    applyVisibility();
  };
  panel.describeInputs = (inputs) => {
    if (!inputs) return [];
    const shown = { ...inputs };
    delete shown.stages;
    dropSpectrum(shown);
    return [...chain.describe(inputs.stages), ...baseDescribe(shown)];
  };

  panel.body.append(summaryBox, stageBox, sizesBox, penetrationFigure.figure, spectrum.section, detailBox);
  return panel;
}
