// Panel "shift": a logged shift from instrument files to the exposure and dose of each task.
// The files are read by the core's decoder and parsed by the engine; the page shows the series
// as a chart with the periods as bands (drag their edges, or type times in the periods table),
// the per-task table, the shift summary with its 8-h TWA, and the dose per region stacked by
// task. Presentation only: every number and message comes from driftdose.api ("shift").
import { CalcPanel } from "../panel.js";
import { el, renderField } from "../forms.js";
import { chartFigure } from "../charts.js";
import { createTimeChart } from "../timechart.js";
import { overlaps, spans } from "../periods.js";
import { periodTable } from "../periodtable.js";
import { importBlock } from "../shiftimport.js";
import { benchmarkInput, quantityPicker } from "../shiftchoices.js";
import { doseView, shiftSummary, taskTable } from "./shiftresults.js";
import { renew } from "../dom.js";

export const id = "shift";
export const kind = "shift";
export const title = "Shift from logged data";
const DEMO_ID = "shift_workshop"; // driftdose.shift.demo.DEMO_ID: its files are generated again

// inputs drawn by this panel itself rather than by the generic form
const NEAR = {
  text: "series_text", file: "series_file", header: "series_header_line", time: "series_time_column",
  date: "series_date_column", columns: "quantity_columns",
};
const NEAR_EXTRA = ["series_time_format", "series_start_time"];
const FAR = {
  text: "background_text", file: "background_file", header: "background_header_line", time: "background_time_column",
  date: "background_date_column", column: "background_column",
};
const FAR_EXTRA = ["background_time_format", "background_start_time", "background_unit"];
// series_drawn is the panel's own bookkeeping (added to each request by inputs() below): never a
// field of the form, the link or the saved inputs
const OWN = new Set([...Object.values(NEAR), ...NEAR_EXTRA, ...Object.values(FAR), ...FAR_EXTRA, "periods", "quantity", "benchmark", "modes", "series_drawn"]);
// which dose inputs apply to which size source (presentation only; the engine checks)
const DOSE_RULES = {
  channel_type: ["channels"],
  modes: ["modes"],
  spectrum_text: ["spectrum"], spectrum_diameter_column: ["spectrum"], spectrum_concentration_column: ["spectrum"],
  spectrum_concentration_type: ["spectrum"], spectrum_diameter_unit: ["spectrum"],
  scale_column: ["modes", "spectrum"],
  dose_basis: ["channels", "modes", "spectrum"], particle_density: ["channels", "modes", "spectrum"],
  density_basis: ["channels", "modes", "spectrum"], shape_factor: ["channels", "modes", "spectrum"],
  model: ["channels", "modes", "spectrum"],
};

export function mount(root, { engine, description, forms }) {
  const all = description.fields;
  const byName = Object.fromEntries(all.map((f) => [f.name, f]));
  const generic = all.filter((f) => !OWN.has(f.name));
  const deposition = forms?.calculations?.deposition?.fields || [];
  const fallback = {
    activity: deposition.find((f) => f.name === "activity")?.choices,
    route: deposition.find((f) => f.name === "route")?.choices,
  };
  let lastReply = null;
  let demo = null; // the generated demo shift, once asked for
  let seriesInfo = { start: "", total: 0 };

  const panel = new CalcPanel(root, {
    id, kind: "shift", title: description.title || "Shift exposure and dose from logged data",
    intro: "Import the file a direct-reading instrument logged over a shift (and, if you have one, a far-field or background monitor's file), mark the tasks, breaks and background periods, and read each task's exposure, the shift's 8-hour time-weighted average and the dose deposited in each region of the respiratory tract.",
    legend: "Choices",
    engine, description: { ...description, fields: generic },
    render: (reply) => render(reply),
  });
  panel.demoId = "";

  // --- demo ------------------------------------------------------------------------------
  const demoBox = el("div", { class: "demos", role: "group", "aria-label": "Invented demo shift" });
  demoBox.append(el("p", { class: "help" }, "Try an invented demo shift (generated, not a measurement):"));
  const demoButton = el("button", { type: "button", class: "secondary" }, "Invented demo: a workshop shift (three tasks, breaks, background)");
  demoBox.append(demoButton);
  const demoNote = el("p", { class: "demo-note", role: "status", hidden: "" });
  panel.output.prepend(demoNote);

  // --- files -----------------------------------------------------------------------------
  const filesBox = el("div", { class: "shift-files" });
  panel.fieldsBox.before(demoBox, filesBox);
  const near = importBlock(filesBox, {
    names: NEAR, extra: NEAR_EXTRA, fields: byName, title: "Logged file (near field)",
    intro: "The instrument's export: notes may stand above the header row; units are read from the header where written.",
    onFile: () => fileChanged(),
  });
  const farDetails = el("details", { class: "import-more" });
  farDetails.append(el("summary", {}, "Second file: far field or background monitor (optional)"));
  filesBox.append(farDetails);
  const far = importBlock(farDetails, {
    names: FAR, extra: FAR_EXTRA, fields: byName, title: "Background file",
    intro: "Aligned with the first file by time; used when the background method is the concurrent far field.",
    onFile: () => fileChanged(),
  });

  // --- chart and periods -----------------------------------------------------------------
  const periodsBox = el("section", { class: "shift-periods", "aria-labelledby": "shift-periods-title" });
  periodsBox.append(el("h3", { id: "shift-periods-title" }, "Series and periods"));
  panel.fieldsBox.after(periodsBox);
  const logToggle = el("input", { type: "checkbox", id: "shift-log-y" });
  const seriesSelect = el("select", { id: "shift-series-shown" });
  const chartControls = el("div", { class: "view-controls" });
  const logLabel = el("span", { class: "check" });
  logLabel.append(logToggle, el("label", { for: "shift-log-y" }, "Logarithmic axis"));
  chartControls.append(el("label", { for: "shift-series-shown" }, "Show"), seriesSelect, logLabel);
  const seriesFigure = chartFigure("shift-series",
    "Logged concentration against clock time (thinned for drawing: each stretch keeps its lowest and highest reading, so peaks stay). Bands: tasks (solid edges), breaks (dashed edges), background periods (grey); hatching marks overlapping periods. Drag a band's edge to move it, or drag the band to move it whole.",
    "Save series chart image", "drift-dose-shift-series.png", () => timeChart?.chart);
  const chartEmpty = el("p", { class: "help chart-empty" }, "The chart appears once a file is read.");
  periodsBox.append(chartControls, chartEmpty, seriesFigure.figure);
  let timeChart = null;
  const table = periodTable(periodsBox, byName.periods || { name: "periods", label: "Periods" }, {
    fallback, getStart: () => seriesInfo.start, getTotal: () => seriesInfo.total,
  });

  function ensureChart() {
    if (timeChart) return timeChart;
    timeChart = createTimeChart(seriesFigure.canvas, {
      onDrag: (i, span) => table.setSpan(i, span),
      onCommit: (i, span) => {
        table.setSpan(i, span);
        table.changed();
      },
    });
    return timeChart;
  }

  function drawBands() {
    if (!timeChart || !seriesInfo.start) return;
    const list = table.get();
    timeChart.setBands(spans(list, seriesInfo.start), overlaps(list, seriesInfo.start));
  }

  // The thinned series the page keeps, by the key the engine gave each (curves.*.key): the
  // request names them (series_drawn), and a reply whose series has one of those keys leaves
  // its times and values out ("held"); they are put back here before anything reads the reply,
  // so the reply kept as the panel's last good one (CSV export, record) is whole.
  let keptSeries = new Map(); // key -> {t_s, y: Map(series key -> values)}
  let keptUsed = new Map(); // the background used: its values_key -> values
  function restoreHeld(curves) {
    const next = new Map();
    const used = new Map();
    for (const curve of [curves?.series, curves?.background]) {
      if (!curve || typeof curve.key !== "string") continue;
      const mine = keptSeries.get(curve.key);
      if (curve.held === true && mine) {
        curve.t_s = mine.t_s;
        for (const one of curve.series || []) if (!Array.isArray(one.y) && mine.y.has(one.key)) one.y = mine.y.get(one.key);
      }
      for (const one of curve.series || []) {
        if (typeof one.values_key !== "string") continue;
        if (one.held === true && keptUsed.has(one.values_key)) one.y = keptUsed.get(one.values_key);
        if (Array.isArray(one.y)) {
          one.held = false;
          used.set(one.values_key, one.y);
        }
      }
      if (!Array.isArray(curve.t_s)) continue;
      curve.held = false;
      next.set(curve.key, { t_s: curve.t_s, y: new Map((curve.series || []).filter((x) => x.key !== "background" && Array.isArray(x.y)).map((x) => [x.key, x.y])) });
    }
    keptSeries = next;
    keptUsed = used;
  }
  const baseInputs = panel.inputs.bind(panel);
  panel.inputs = () => {
    const values = baseInputs();
    const keys = [...keptSeries.keys(), ...keptUsed.keys()];
    if (keys.length) values.series_drawn = keys.join(" ");
    return values;
  };
  const baseApply = panel.apply.bind(panel);
  panel.apply = (reply, inputs) => {
    if (inputs && Object.hasOwn(inputs, "series_drawn")) {
      inputs = { ...inputs };
      delete inputs.series_drawn; // bookkeeping, not an input of the record or the export
    }
    return baseApply(reply, inputs);
  };

  let lastDrawn = null; // what the chart shows: [series key, background values, far key, log, column]
  const sameValues = (a, b) => a === b || (Array.isArray(a) && Array.isArray(b) && a.length === b.length && a.every((x, i) => x === b[i]));
  logToggle.addEventListener("change", () => {
    lastDrawn = null;
    timeChart?.setLog(logToggle.checked);
  });
  seriesSelect.addEventListener("change", () => lastReply && drawSeries(lastReply));

  /** The chosen column with the background used (same unit), and far-field columns in that unit. */
  function drawSeries(reply) {
    const series = reply.curves?.series;
    if (!series || !Array.isArray(series.t_s) || !series.t_s.length) return;
    const own = (series.series || []).filter((x) => x.key !== "background");
    const before = seriesSelect.value;
    seriesSelect.replaceChildren(...own.map((x) => el("option", { value: x.key }, x.label)));
    seriesSelect.value = own.some((x) => x.key === before) ? before : own[0]?.key || "";
    const chosen = own.find((x) => x.key === seriesSelect.value) || own[0];
    const same = (x) => chosen && x.unit === chosen.unit;
    const shown = { ...series, series: (series.series || []).filter((x) => x === chosen || (x.key === "background" && same(x))) };
    const farSeries = reply.curves.background;
    const extra = farSeries && Array.isArray(farSeries.series) ? { ...farSeries, series: farSeries.series.filter(same) } : null;
    seriesInfo = { start: series.start, total: series.t_s[series.t_s.length - 1] - series.t_s[0] };
    chartEmpty.hidden = true;
    // a moved period leaves the drawn series as they were (same keys, same background values):
    // the chart is not drawn again
    const used = shown.series.find((x) => x.key === "background")?.y ?? null; // the same array when held
    const drawn = [series.key, used, extra && extra.series.length ? farSeries.key : "", logToggle.checked, chosen?.key, series.start];
    if (timeChart && lastDrawn && drawn.every((x, i) => (i === 1 ? sameValues(x, lastDrawn[1]) : x === lastDrawn[i]))) return;
    lastDrawn = drawn;
    const chart = ensureChart();
    chart.setLog(logToggle.checked, false); // the axis type first, drawn once with the series
    chart.setSeries(shown, extra && extra.series.length ? extra : null);
  }

  // --- the choices that follow the chosen columns ----------------------------------------
  const columnsHandle = near.handles.get(NEAR.columns);
  const summaryChoices = el("div", { class: "summary-choices" });
  panel.fieldsBox.querySelector("legend").after(summaryChoices);
  const quantity = byName.quantity ? quantityPicker(summaryChoices, byName.quantity, () => columnsHandle?.get() || []) : null;
  const benchmark = byName.benchmark ? benchmarkInput(summaryChoices, byName.benchmark, () => quantity?.quantity() || "number") : null;
  const modesAt = panel.fields.handles.get("size_source")?.wrap;
  const modesBox = el("div");
  if (modesAt) modesAt.after(modesBox);
  else panel.fieldsBox.append(modesBox);
  const modes = byName.modes ? renderField(modesBox, byName.modes, "shift") : null; // the records field renderer
  columnsHandle?.listen(() => {
    quantity?.fill();
    benchmark?.fill();
  });
  quantity?.listen(() => benchmark?.fill());

  // --- the form's handles ----------------------------------------------------------------
  for (const block of [near, far]) {
    for (const [name, handle] of block.handles) if (byName[name]) panel.fields.handles.set(name, handle);
  }
  panel.fields.handles.set("periods", table);
  if (quantity) panel.fields.handles.set("quantity", quantity);
  if (benchmark) panel.fields.handles.set("benchmark", benchmark);
  if (modes) panel.fields.handles.set("modes", modes);
  // dose inputs shown for the size source they serve (declared rules first, where given)
  const declared = new Set(all.filter((f) => f.applies_when).map((f) => f.name));
  const rules = {};
  for (const [name, values] of Object.entries(DOSE_RULES)) if (byName[name] && !declared.has(name)) rules[name] = ["size_source", values];
  for (const prefix of ["series_", "background_"]) {
    if (byName[`${prefix}start_time`] && !declared.has(`${prefix}start_time`)) rules[`${prefix}start_time`] = [`${prefix}time_format`, ["elapsed_seconds"]];
  }
  const applyDeclared = panel.fields.showDeclared(all.filter((f) => panel.fields.handles.has(f.name)));
  const applyRules = panel.fields.showWhen(rules);
  const applyVisibility = () => {
    applyDeclared();
    applyRules();
  };
  // The handles of one import block share one list of listeners, so one change of a file
  // reaches this callback once per handle: the panel is scheduled once, after the changes of
  // this turn (a second request right behind the first would compute it all again).
  let scheduled = false;
  const scheduleOnce = () => {
    if (scheduled) return;
    scheduled = true;
    queueMicrotask(() => {
      scheduled = false;
      panel.schedule();
    });
  };
  for (const [name, handle] of panel.fields.handles) {
    if (!OWN.has(name) || !handle.listen) continue;
    if (name === "periods") {
      // a moved period: the request is posted first, the bands drawn while the engine works
      handle.listen(() => {
        panel.schedule();
        drawBands();
      });
    } else {
      handle.listen(scheduleOnce);
    }
  }

  // errors: "periods.2.end" in its row; "quantity_columns.0.column" by the column list
  const baseShow = panel.fields.showErrors.bind(panel.fields);
  panel.fields.showErrors = (errors) => {
    const list = errors || [];
    const mine = list.filter((e) => /^periods[.[]/.test(e.field || ""));
    const rest = list.filter((e) => !mine.includes(e)).map((e) => {
      const base = String(e.field || "").split(/[.[]/)[0];
      return !panel.fields.handles.has(e.field) && panel.fields.handles.has(base) ? { ...e, field: base } : e;
    });
    const stray = table.showPartErrors(mine);
    return [...baseShow(rest), ...stray];
  };

  function fileChanged() {
    // the invented demo stays marked while its file is in use
    const s = near.source();
    if (!s || s.from !== "generated") clearDemo();
  }

  function clearDemo() {
    panel.demoLabel = "";
    panel.demoId = "";
    demoNote.hidden = true;
  }

  async function loadDemo(keep = null) {
    demoButton.disabled = true;
    try {
      demo = demo || (await engine.shiftDemo());
    } finally {
      demoButton.disabled = false;
    }
    if (!demo || !demo.ok) return;
    const values = {
      ...(demo.inputs || {}),
      periods: demo.periods,
      ...(keep || {}),
    };
    near.handles.get(NEAR.text).set(demo.series.text, demo.series.name);
    if (demo.background && far.handles.get(FAR.text)) far.handles.get(FAR.text).set(demo.background.text, demo.background.name);
    panel.demoLabel = demo.label;
    panel.demoId = demo.id;
    demoNote.textContent = `Showing: ${demo.label}. ${demo.note}`;
    demoNote.hidden = false;
    const rest = { ...values };
    for (const name of [NEAR.text, FAR.text, "demo"]) delete rest[name];
    panel.fields.setValues(rest);
    applyVisibility();
    table.check();
    panel.schedule();
  }
  demoButton.addEventListener("click", () => loadDemo());

  // links and saved inputs: the demo travels as its id (its files are generated again)
  const baseGet = panel.getState.bind(panel);
  panel.getState = () => {
    const values = baseGet();
    if (panel.demoId) {
      delete values[NEAR.text];
      delete values[FAR.text];
      values.demo = panel.demoId;
    }
    return values;
  };
  panel.setState = (values) => {
    const v = { ...values };
    if (v.demo === DEMO_ID) {
      const keep = { ...v };
      delete keep.demo;
      loadDemo(keep);
      return;
    }
    clearDemo();
    delete v.demo;
    for (const [name, handle] of panel.fields.handles) {
      if (!Object.hasOwn(v, name)) continue;
      if (name === NEAR.text || name === FAR.text) handle.set(typeof v[name] === "string" ? v[name] : null, "file text from the link or inputs file");
    }
    delete v[NEAR.text];
    delete v[FAR.text];
    panel.fields.setValues(v);
    applyVisibility();
    table.check();
    panel.schedule();
  };

  panel.importedFiles = () => [near, far].map((b) => b.source()).filter(Boolean);
  panel.describeInputs = describeInputs;

  function describeInputs(inputs) {
    const rows = CalcPanel.prototype.describeInputs.call(panel, inputs);
    const cols = (list) => (Array.isArray(list) ? list.map((c) => `${c.column} (${c.quantity})`).join(", ") : "");
    const periods = Array.isArray(inputs?.periods) ? inputs.periods : [];
    const said = periods.map((p, i) => `${i + 1}. ${p.label} (${p.kind}) ${p.start}–${p.end}${p.kind === "task"
      ? `, ${String(p.activity).replace("_", " ")}, ${p.route}, protection factor ${p.protection_factor}` : ""}`).join("; ");
    const extra = [
      ["Time column", inputs?.[NEAR.time] || ""],
      ["Value columns", cols(inputs?.[NEAR.columns])],
      ["Far-field column", inputs?.[FAR.text] ? inputs?.[FAR.column] : ""],
      ["Periods", said],
    ];
    for (const [label, value] of extra) if (value) rows.push({ label, value: String(value), unit: "" });
    return rows;
  }

  // --- results ---------------------------------------------------------------------------
  const summaryBox = el("div", { class: "shift-summary" });
  // boxes that scroll sideways on a phone are reachable by keyboard
  const tasksBox = el("div", { class: "table-box", "data-part": "tasks", tabindex: "0", role: "region", "aria-label": "Per period and for the shift" });
  const dose = doseView();
  panel.body.append(summaryBox, tasksBox, dose.box);

  function render(reply) {
    restoreHeld(reply.curves);
    lastReply = reply;
    const r = reply.results || {};
    near.showImport(r.import, r.preview);
    if (r.background_import) far.showImport(r.background_import, r.background_preview);
    drawSeries(reply);
    table.check();
    drawBands();
    renew(summaryBox, ...shiftSummary(r));
    renew(tasksBox, taskTable(r.tasks, r.shift));
    dose.show(r.dose);
  }

  return Object.assign(panel, { lastReplyOf: () => lastReply });
}
