// Panel "What the sampler sees": a chain of sampling stages the user builds (tubes, bends,
// pre-separators, impactor stages, wire screens), its penetration against particle size per stage
// and overall, a target curve to compare with, and a measured spectrum corrected for the losses.
// Presentation only: every number and every message comes from driftdose.api ("sampling").
import { CalcPanel, resultsTable } from "../panel.js";
import { el, renderField } from "../forms.js";
import { chartFigure, createChart, decadeTicks, seriesColour, setAxes, setDatasets } from "../charts.js";
import { axisTitle, curvePoints, readout } from "../chartparts.js";
import { formatNumber, lengthTick } from "../format.js";
import { fromSI, toSI, unitLabel, unitText, withUnit } from "../units.js";

export const id = "sampling";
export const title = "What the sampler sees";

const OVERALL_KEYS = ["overall_10nm", "overall_100nm", "overall_1um", "overall_10um"];
const SHOWN_KEYS = ["pass_band", "departure_max", "departure_mean", "csv_rows"];
const SUMMARY_KEYS = [...OVERALL_KEYS, ...SHOWN_KEYS]; // the printed record has no stage table
const RENDER_LIMIT = 40; // stages drawn from a tampered link at most (the API refuses above its own limit)

const ROW_SLICE = 400; // table rows added per task
const CHART_POINTS = 2000; // points drawn per series at most

/**
 * At most CHART_POINTS points of a series for drawing: the lowest and the highest point of each
 * run of neighbouring points, in order (so peaks and dips stay visible). Presentation only.
 */
function thin(points) {
  if (points.length <= CHART_POINTS) return points;
  const step = Math.ceil(points.length / (CHART_POINTS / 2));
  const out = [];
  for (let i = 0; i < points.length; i += step) {
    let lo = null;
    let hi = null;
    for (let j = i; j < Math.min(points.length, i + step); j++) {
      const p = points[j];
      if (p.y === null) continue;
      if (!lo || p.y < lo.y) lo = p;
      if (!hi || p.y > hi.y) hi = p;
    }
    if (!lo) out.push(points[i]);
    else if (lo === hi) out.push(lo);
    else out.push(...(points.indexOf(lo, i) < points.indexOf(hi, i) ? [lo, hi] : [hi, lo]));
  }
  return out;
}
const isObject = (v) => v !== null && typeof v === "object" && !Array.isArray(v);
const percent = (row) => (row ? `${formatNumber(row.value)} %` : "—");
// a stage as the reply names it (structured): the user's own name, else its type
const stageName = (stage) => stage.name || stage.type_label;

/**
 * The chain builder: an ordered list of stages, each a fieldset of the fields its type declares.
 * Stage errors from the API arrive as field "stages.<index>.<parameter>".
 */
function chainEditor(field, onChange) {
  const types = field.stage_types || {};
  const max = field.max_stages || 20;
  const box = el("fieldset", { class: "chain" });
  box.append(el("legend", {}, field.label));
  box.append(el("p", { class: "help" }, `${field.help} At most ${max} stages. Each stage can be moved or removed with its own buttons.`));
  const list = el("ol", { class: "stages" });
  const chainError = el("p", { class: "error", hidden: "" });
  const status = el("p", { class: "chain-status visually-hidden", role: "status", "aria-live": "polite" });

  const adder = el("div", { class: "chain-add" });
  const typeId = "sampling-new-stage-type";
  const typeSelect = el("select", { id: typeId });
  for (const [kind, spec] of Object.entries(types)) typeSelect.append(el("option", { value: kind }, spec.label));
  const addButton = el("button", { type: "button", class: "secondary" }, "Add stage");
  const fullNote = el("p", { class: "help", hidden: "" }, `The chain is full (${max} stages).`);
  const typeField = el("div", { class: "field" });
  typeField.append(el("label", { for: typeId }, "Type of the new stage"));
  const typeRow = el("div", { class: "field-row" });
  typeRow.append(typeSelect, addButton);
  typeField.append(typeRow, fullNote);
  adder.append(typeField);
  // the chain shown at first is an example, and says so until it is edited or replaced
  const exampleNote = el("p", { class: "chain-example", hidden: "" },
    "Example chain, shown to start from: replace it with the stages of your own sampling line.");
  box.append(exampleNote, list, chainError, adder, status);

  let stages = [];
  let passThrough; // a non-list value from a link or file, sent as is until the chain is edited
  const changed = () => {
    passThrough = undefined;
    exampleNote.hidden = true;
    onChange();
  };

  function makeStage(raw) {
    const kind = isObject(raw) ? raw.type : undefined;
    const spec = typeof kind === "string" && Object.hasOwn(types, kind) ? types[kind] : null;
    const li = el("li", { class: "stage-item" });
    const set = el("fieldset", { class: "stage", "data-type": spec ? kind : "unknown" });
    const legend = el("legend");
    set.append(legend);
    const stage = { kind, spec, raw, li, set, legend, handles: new Map(), numbers: [] };
    if (spec) {
      if (spec.help) set.append(el("p", { class: "help stage-help" }, spec.help));
      for (const f of spec.fields) {
        const sub = f.kind === "integer" ? { ...f, kind: "plain" } : f;
        const handle = renderField(set, sub, "sampling-stage");
        if (isObject(raw) && raw[f.name] !== undefined) handle.set(raw[f.name]);
        for (const node of [handle.input, handle.unitSelect]) {
          if (!node) continue;
          node.addEventListener("input", changed);
          node.addEventListener("change", changed);
        }
        handle.wrap.dataset.stageField = f.name;
        stage.handles.set(f.name, handle);
      }
    } else {
      const shown = JSON.stringify(raw) ?? String(raw);
      set.append(el("p", { class: "help" },
        `This stage came from a link or file with a type this page does not know (${shown.slice(0, 60)}). Remove it, or add a stage of a known type.`));
    }
    stage.error = el("p", { class: "error", hidden: "" });
    set.append(stage.error);
    const tools = el("div", { class: "stage-tools", role: "group" });
    stage.up = toolButton("Move up");
    stage.down = toolButton("Move down");
    stage.remove = toolButton("Remove");
    stage.up.addEventListener("click", () => move(stage, -1));
    stage.down.addEventListener("click", () => move(stage, 1));
    stage.remove.addEventListener("click", () => removeStage(stage));
    tools.append(stage.up, stage.down, stage.remove);
    stage.tools = tools;
    set.append(tools);
    li.append(set);
    return stage;
  }

  function toolButton(text) {
    const button = el("button", { type: "button", class: "secondary" }, text);
    button.append(el("span", { class: "visually-hidden" }, ""));
    return button;
  }

  function typeLabel(stage) {
    return stage.spec ? stage.spec.label : "unknown type";
  }

  function relabel() {
    stages.forEach((stage, i) => {
      const n = i + 1;
      stage.legend.textContent = `Stage ${n}: ${typeLabel(stage)}`;
      for (const button of [stage.up, stage.down, stage.remove]) button.lastChild.textContent = ` stage ${n}`;
      stage.tools.setAttribute("aria-label", `Stage ${n} order`);
      stage.up.disabled = i === 0;
      stage.down.disabled = i === stages.length - 1;
      stage.set.dataset.index = String(i);
    });
    const full = stages.length >= max;
    addButton.disabled = full;
    fullNote.hidden = !full;
  }

  function announce(text) {
    status.textContent = text;
  }

  function move(stage, step) {
    const i = stages.indexOf(stage);
    const j = i + step;
    if (i < 0 || j < 0 || j >= stages.length) return;
    [stages[i], stages[j]] = [stages[j], stages[i]];
    list.replaceChildren(...stages.map((s) => s.li));
    relabel();
    // keep the keyboard where it was: on the same button, or its partner at the ends
    const again = step < 0 ? stage.up : stage.down;
    (again.disabled ? (step < 0 ? stage.down : stage.up) : again).focus();
    announce(`${typeLabel(stage)} moved to position ${j + 1} of ${stages.length}.`);
    changed();
  }

  function removeStage(stage) {
    const i = stages.indexOf(stage);
    if (i < 0) return;
    stages.splice(i, 1);
    stage.li.remove();
    relabel();
    const next = stages[Math.min(i, stages.length - 1)];
    (next ? next.remove : typeSelect).focus();
    announce(`Stage ${i + 1} (${typeLabel(stage)}) removed; ${stages.length} left.`);
    changed();
  }

  function defaults(kind) {
    const out = { type: kind };
    for (const f of types[kind].fields) if (f.default !== undefined) out[f.name] = f.default;
    return out;
  }

  addButton.addEventListener("click", () => {
    if (stages.length >= max) return;
    const stage = makeStage(defaults(typeSelect.value));
    stages.push(stage);
    list.append(stage.li);
    relabel();
    const first = stage.handles.values().next().value;
    if (first) first.input.focus();
    announce(`Stage ${stages.length} (${typeLabel(stage)}) added.`);
    changed();
  });

  function readStage(stage) {
    if (!stage.spec) return stage.raw;
    const out = { type: stage.kind };
    for (const [name, handle] of stage.handles) out[name] = handle.get();
    return out;
  }

  return {
    box,
    get() {
      return passThrough !== undefined ? passThrough : stages.map(readStage);
    },
    /** Set the stages; `example` marks the page's initial example chain as such. */
    set(raw, example = false) {
      exampleNote.hidden = !example;
      passThrough = Array.isArray(raw) ? undefined : raw;
      stages = (Array.isArray(raw) ? raw.slice(0, RENDER_LIMIT) : []).map(makeStage);
      list.replaceChildren(...stages.map((s) => s.li));
      relabel();
    },
    /** Show the errors that belong to the chain; return the others. */
    showErrors(errors) {
      const rest = [];
      let chainText = "";
      for (const stage of stages) {
        for (const handle of stage.handles.values()) handle.showError("");
        stage.error.hidden = true;
        stage.error.textContent = "";
        stage.set.classList.remove("invalid");
      }
      for (const e of errors || []) {
        const m = /^stages(?:\.(\d+)\.(.+))?$/.exec(e.field || "");
        if (!m) {
          rest.push(e);
          continue;
        }
        const stage = m[1] !== undefined ? stages[Number(m[1])] : null;
        if (!stage) {
          chainText = chainText ? `${chainText} ${e.message}` : e.message;
          continue;
        }
        stage.set.classList.add("invalid");
        const handle = stage.handles.get(m[2]);
        if (handle && !handle.wrap.classList.contains("invalid")) {
          handle.showError(e.message);
        } else {
          stage.error.textContent = stage.error.hidden ? e.message : `${stage.error.textContent} ${e.message}`;
          stage.error.hidden = false;
        }
      }
      chainError.textContent = chainText;
      chainError.hidden = !chainText;
      return rest;
    },
    /** Rows {label, value, unit} describing a stage list in the words of the form. */
    describe(raw) {
      if (!Array.isArray(raw)) return [{ label: field.label, value: JSON.stringify(raw) ?? "", unit: "" }];
      return raw.map((stage, i) => {
        const spec = isObject(stage) && Object.hasOwn(types, stage.type) ? types[stage.type] : null;
        if (!spec) return { label: `Stage ${i + 1}`, value: JSON.stringify(stage) ?? "", unit: "" };
        const parts = [];
        for (const f of spec.fields) {
          const v = stage[f.name];
          if (v === undefined || v === null || v === "" || (isObject(v) && (v.value === "" || v.value === null))) continue;
          if (f.kind === "choice") {
            const choice = (f.choices || []).find((c) => c.value === v);
            parts.push(`${f.label}: ${choice ? choice.label : String(v)}`);
          } else if (isObject(v)) {
            parts.push(`${f.label}: ${withUnit(v.value, v.unit)}`);
          } else {
            parts.push(`${f.label}: ${String(v)}`);
          }
        }
        return { label: `Stage ${i + 1}: ${spec.label}`, value: parts.join("; "), unit: "" };
      });
    },
  };
}

export function mount(root, { engine, description }) {
  const stagesField = description.fields.find((f) => f.name === "stages") || { name: "stages", label: "Sampling chain", help: "", stage_types: {}, demos: {} };
  const fields = description.fields.filter((f) => f.name !== "stages");
  const demos = Object.entries(stagesField.demos || {}).map(([demoId, d]) => ({ id: demoId, ...d }));
  let penetrationChart = null;
  let spectrumChart = null;
  let spectrumUnit = ""; // read by the spectrum chart's readout, which outlives one reply

  const summaryBox = el("div", { class: "table-box summary-box" });
  const stageBox = el("div", { class: "table-box", tabindex: "0", role: "region", "aria-label": "Penetration by stage (scrolls sideways on narrow screens)" });
  const detailBox = el("div", { class: "stage-details" });
  const penetrationFigure = chartFigure("sampling-penetration",
    "Penetration (the fraction of particles that get through) against particle size, for each stage and for the whole chain, with the target curve if one is chosen.",
    "Save penetration chart image", "drift-dose-sampling-penetration.png", () => penetrationChart,
    () => ({ title: "Penetration through the sampling chain against particle size", scenario: scenario() }));
  const spectrumSection = el("section", { class: "spectrum-result", "aria-labelledby": "sampling-spectrum-title", hidden: "" });
  const spectrumTitle = el("h3", { id: "sampling-spectrum-title" }, "Measured spectrum corrected for the chain's losses");
  const spectrumSummary = el("p", { class: "spectrum-summary" });
  const spectrumTableBox = el("div", { class: "table-box spectrum-table-box", tabindex: "0", role: "region", "aria-label": "Corrected spectrum table" });
  const spectrumFigure = chartFigure("sampling-spectrum",
    "Measured and corrected concentration per size bin. Bins the chain passes with less than 50 % are drawn as large triangles: their correction is unreliable.",
    "Save spectrum chart image", "drift-dose-sampling-spectrum.png", () => spectrumChart,
    () => ({ title: "Measured spectrum corrected for the chain's losses", scenario: scenario() }));
  spectrumSection.append(spectrumTitle, spectrumSummary, spectrumTableBox);

  const panel = new CalcPanel(root, {
    id, kind: "sampling", title: "What the sampler sees: sampling lines and pre-separators",
    intro: "Build the chain of tubes, bends, pre-separators, impactor stages and wire screens between the air you sample and your instrument or filter. See what fraction of each particle size gets through, compare it with a health-related fraction or with where particles deposit in the airways, and correct a measured spectrum for the losses.",
    legend: "Sampling chain, air and target",
    engine, description: { ...description, fields },
    tableKeys: SUMMARY_KEYS,
    describeData: (name, raw) => describeData(name, raw),
    render(reply) {
      const results = reply.results;
      summaryBox.replaceChildren(resultsTable(results, results.departure_max ? "Whole chain and target" : "Whole chain", SHOWN_KEYS));
      renderStageTable(results);
      renderDetails(results.stages_table);
      renderPenetrationChart(reply.curves);
      renderSpectrum(results.spectrum_table, reply.curves.spectrum, reply.curves);
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
    stageBox.replaceChildren(t);
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
    detailBox.replaceChildren(...parts);
  }

  function renderPenetrationChart(curves) {
    const metres = (v) => toSI(v, curves.x_unit); // sizes arrive in the unit the reply names
    if (!penetrationChart) {
      penetrationChart = createChart(penetrationFigure.canvas, {
        // the size ticks carry their units ("10 nm", "1 µm"): the title names the quantity only
        x: { title: axisTitle(curves.x_label, unitText(curves.x_unit), true), tick: decadeTicks((v) => lengthTick(metres(v))), readout: (x) => lengthTick(metres(x)), min: fromSI(1e-9, curves.x_unit), max: fromSI(100e-6, curves.x_unit) },
        y: { title: "Penetration (fraction passing)", type: "linear", min: 0, max: 1 },
      }, { readout: (ctx) => readout(ctx.dataset.label, `${formatNumber(ctx.parsed.y * 100, 3)} %`) });
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

  function renderSpectrum(table, curves, shared) {
    spectrumSection.hidden = !table;
    if (!table) {
      // no canvas left in the panel (the printed record draws every canvas of the panel); the
      // chart itself is kept and updated in place when a spectrum comes back
      spectrumFigure.figure.remove();
      return;
    }
    if (!spectrumFigure.figure.isConnected) spectrumSection.append(spectrumFigure.figure);
    const aero = table.diameter_type === "aerodynamic";
    const typeWord = table.diameter_type === "volume_equivalent" ? "" : table.diameter_type_label;
    const bad = table.rows.filter((r) => r.unreliable).length;
    const how = "Each bin's concentration is divided by the chain's penetration at its diameter.";
    spectrumSummary.textContent = bad
      ? `${bad} of ${table.rows.length} bins pass the chain with less than 50 %: their correction is unreliable. They are marked “unreliable” in the table and drawn as large triangles on the chart. ${how}`
      : `All ${table.rows.length} bins pass the chain with at least 50 %. ${how}`;
    spectrumSummary.classList.toggle("has-unreliable", bad > 0);
    const t = el("table", { class: "results spectrum-table" });
    t.append(el("caption", {}, `Corrected spectrum, ${table.concentration_label}`));
    const head = el("thead");
    const hr = el("tr");
    for (const h of [`Diameter${typeWord ? ` (${typeWord})` : ""}, ${unitLabel(table.diameter_unit)}`, "Measured", "Penetration", "Corrected", "Correction"]) {
      hr.append(el("th", { scope: "col" }, h));
    }
    head.append(hr);
    t.append(head);
    const body = el("tbody");
    const row = (r, i) => {
      const tr = el("tr", { "data-bin": String(i), class: r.unreliable ? "unreliable" : "" });
      tr.append(el("th", { scope: "row", class: "value" }, formatNumber(r.diameter)));
      tr.append(el("td", { class: "value", "data-col": "measured" }, formatNumber(r.measured)));
      tr.append(el("td", { class: "value", "data-col": "penetration" }, `${formatNumber(r.penetration * 100)} %`));
      tr.append(el("td", { class: "value", "data-col": "corrected" }, r.corrected === null ? "not given" : formatNumber(r.corrected)));
      tr.append(el("td", { "data-col": "flag" }, r.unreliable ? "⚠ unreliable: under 50 % gets through" : "reliable"));
      return tr;
    };
    t.append(body);
    spectrumTableBox.replaceChildren(t);
    fillRows(body, table.rows, row);
    renderSpectrumChart(curves, aero, shared);
  }

  // A long table (a spectrum of thousands of bins) is filled a slice per task, so the page
  // never stops answering while it grows; a newer reply stops an older fill.
  let filling = 0;
  function fillRows(body, rows, row) {
    const mine = ++filling;
    let next = 0;
    const slice = () => {
      if (mine !== filling) return;
      const end = Math.min(rows.length, next + ROW_SLICE);
      const part = document.createDocumentFragment();
      for (; next < end; next++) part.append(row(rows[next], next));
      body.append(part);
      if (next < rows.length) {
        spectrumTableBox.setAttribute("aria-busy", "true");
        setTimeout(slice, 0);
      } else {
        spectrumTableBox.removeAttribute("aria-busy");
      }
    };
    slice();
  }

  // `shared`: the reply's whole curves (the spectrum's diameters are one of its shared axes)
  function renderSpectrumChart(curves, aero, shared) {
    const positive = (curve) => curvePoints(shared, curve, (y) => y > 0);
    // created once, its axes and data updated in place; the size ticks carry their units, the
    // concentration ticks are bare numbers (so that title names the unit)
    const metres = (v) => toSI(v, curves.x_unit); // sizes arrive in the unit the reply names
    const axes = {
      x: { title: axisTitle(curves.x_label, unitText(curves.x_unit), true), tick: decadeTicks((v) => lengthTick(metres(v))), readout: (x) => `${lengthTick(metres(x))}${aero ? " aerodynamic" : ""}` },
      y: { title: axisTitle(curves.y_label, unitText(curves.y_unit)), tick: decadeTicks((v) => formatNumber(v, 2)) },
    };
    if (spectrumChart) setAxes(spectrumChart, axes);
    else spectrumChart = createChart(spectrumFigure.canvas, axes, { readout: (ctx) => readout(ctx.dataset.label, `${formatNumber(ctx.parsed.y, 4)} ${spectrumUnit}`) });
    spectrumUnit = curves.y_unit ? unitLabel(curves.y_unit) : "";
    const all = positive(curves.corrected);
    const flagged = thin(all.map((p, i) => ({ x: p.x, y: curves.unreliable[i] ? p.y : null })));
    const corrected = thin(all);
    setDatasets(spectrumChart, [
      { label: curves.measured.label, data: thin(positive(curves.measured)), borderColor: seriesColour(3), backgroundColor: seriesColour(3), pointRadius: 2.5, pointStyle: "circle", borderWidth: 1.5 },
      { label: curves.corrected.label, data: corrected, borderColor: seriesColour(1), backgroundColor: seriesColour(1), pointRadius: 2.5, pointStyle: "rect", borderWidth: 2, borderDash: [6, 3] },
      { label: "Unreliable bins (under 50 % penetration)", data: flagged, showLine: false, pointStyle: "triangle", pointRadius: 7, pointHoverRadius: 9, borderColor: seriesColour(5), backgroundColor: "transparent", borderWidth: 2 },
    ]);
    const bad = curves.unreliable.filter(Boolean).length;
    const drawn = corrected.length < all.length ? ` (drawn with the lowest and highest of each run of ${Math.ceil(all.length / (CHART_POINTS / 2))} neighbouring bins)` : "";
    spectrumFigure.canvas.setAttribute("aria-label",
      `Log-log chart of measured and corrected concentration against diameter for ${curves.unreliable.length} bins${drawn}; ${bad} flagged as unreliable. The table above gives every value.`);
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

  panel.body.append(summaryBox, stageBox, penetrationFigure.figure, spectrumSection, detailBox);
  return panel;
}
