// Sections under "Where it lands": what stays in the respiratory tract over a working life
// (kind "burden") and how sure the dose and burden are (kind "uncertainty"). Both take the
// aerosol, breathing and exposure of the deposition panel and add their own inputs. The
// propagation runs in blocks of samples so that a progress bar can show, and a change of any
// input stops it between blocks and starts again with the new inputs.
import { CalcPanel } from "../panel.js";
import { el } from "../forms.js";
import { chartFigure, createChart, decadeTicks, seriesColour, setAxes, setDatasets } from "../charts.js";
import { axisTitle, curvePoints, readout } from "../chartparts.js";
import { formatNumber } from "../format.js";
import { unitText } from "../units.js";

export const id = "burden";
const WEIGHTS = [["mass", "Mass"], ["number", "Number"], ["surface", "Surface area"]];
const SHOW_AFTER_MS = 150; // a propagation shows its progress bar once it takes longer
const QUIET_MS = 250; // the propagation starts once the inputs have been still this long
const CHART_REGIONS = ["AI", "lungs", "LN", "BB", "bb", "ET"];
const TABLE_REGIONS = ["ET", "BB", "bb", "AI", "LN", "lungs", "GI", "environment", "deposited"];
// the deposition inputs named on a saved chart image
const AEROSOL = ["size_source", "modes", "particle_density", "density_basis", "shape_factor", "breathing", "activity", "route", "exposure_duration"];
const DOSE_REGIONS = ["ET1", "ET2", "BB", "bb", "AI", "total"];

const own = (description, exclude) => ({
  ...description,
  fields: description.fields.filter((f) => !exclude.has(f.name) && f.name !== "block"),
});

function select(idText, options, value) {
  const s = el("select", { id: idText });
  for (const [v, label] of options) s.append(el("option", { value: v }, label));
  s.value = value;
  return s;
}

function timeTick(days) {
  if (days < 1) return `${formatNumber(days * 24, 2)} h`;
  if (days < 365) return `${formatNumber(days, 2)} d`;
  return `${formatNumber(days / 365.25, 2)} y`;
}

/**
 * Mount both sections into `root` (the deposition tab). `forms` holds every calculation's
 * description; `deposition` is the deposition panel's controller. Returns [burden, ranges].
 */
export function mountSections(root, { engine, forms, deposition }) {
  const depNames = new Set(forms.calculations.deposition.fields.map((f) => f.name));
  const burdenDesc = own(forms.calculations.burden, depNames);
  const burdenNames = new Set([...depNames, ...burdenDesc.fields.map((f) => f.name)]);
  const rangesDesc = own(forms.calculations.uncertainty, burdenNames);
  const demos = (burdenDesc.fields.find((f) => f.name === "transport_rates") || {}).demos || [];

  const burdenRoot = el("section", { id: "section-burden", class: "subpanel", "aria-labelledby": "burden-title" });
  const rangesRoot = el("section", { id: "section-ranges", class: "subpanel", "aria-labelledby": "ranges-title" });
  root.append(burdenRoot, rangesRoot);

  // --- retained burden ---------------------------------------------------------------
  let burdenReply = null;
  let burdenChart = null;
  let burdenUnit = ""; // read by the chart's readout, which outlives one reply
  const milestoneBox = el("div", { class: "table-box" });
  const burdenWeight = select("burden-weight", WEIGHTS, "mass");
  const timeAxis = select("burden-time-axis", [["logarithmic", "Logarithmic"], ["linear", "Linear"]], "logarithmic");
  const burdenControls = el("div", { class: "view-controls" });
  burdenControls.append(
    el("label", { for: "burden-weight" }, "Amount as"), burdenWeight,
    el("label", { for: "burden-time-axis" }, "Time axis"), timeAxis,
  );
  const burdenFigure = chartFigure("burden-time",
    "Amount retained in each region against time since the first exposure (insoluble particles).",
    "Save burden chart image", "drift-dose-retained-burden.png", () => burdenChart,
    () => ({ title: "Retained burden against time", scenario: [deposition.scenario(AEROSOL), burden.scenario()].filter(Boolean).join(" · ") }));

  const burden = new CalcPanel(burdenRoot, {
    id: "burden", kind: "burden", title: "What stays: retained burden over months and years",
    intro: "The deposit of every shift, cleared by the published particle-transport model of the ICRP respiratory tract model (insoluble particles: nothing dissolves). Uses the aerosol, breathing and exposure duration above as one shift.",
    legend: "Work pattern and clearance",
    engine, description: burdenDesc,
    render(reply) {
      burdenReply = reply;
      renderMilestones();
      renderBurdenChart();
    },
  });
  burden.inputs = () => ({ ...deposition.inputs(), ...burden.fields.values() });

  function renderMilestones() {
    const reply = burdenReply;
    const w = burdenWeight.value;
    const marks = reply.curves.milestones;
    const table = el("table", { class: "results milestones" });
    const unit = unitText(reply.results[`burden_${marks[0].key}_AI_${w}`].unit);
    table.append(el("caption", {}, `Retained and cleared ${w === "surface" ? "surface area" : w} (${unit})`));
    const head = el("tr");
    head.append(el("th", { scope: "col" }, "Region"));
    for (const m of marks) head.append(el("th", { scope: "col" }, m.label));
    const thead = el("thead");
    thead.append(head);
    table.append(thead);
    const body = el("tbody");
    for (const region of TABLE_REGIONS) {
      const tr = el("tr", { "data-region": region });
      const label = reply.curves.region_labels[region];
      tr.append(el("th", { scope: "row" }, label));
      for (const m of marks) {
        const key = `burden_${m.key}_${region}_${w}`;
        tr.append(el("td", { class: "value", "data-key": key }, formatNumber(reply.results[key].value)));
      }
      body.append(tr);
    }
    table.append(body);
    milestoneBox.replaceChildren(table);
  }

  function renderBurdenChart() {
    const w = burdenWeight.value;
    const curves = burdenReply.curves[w];
    const logTime = timeAxis.value === "logarithmic";
    // created once and updated in place; on the logarithmic axis the ticks carry their units
    // ("1 d", "10 y"), on the linear one they are days
    const axes = {
      x: { title: axisTitle(curves.x_label, "days", logTime), type: logTime ? "logarithmic" : "linear",
        tick: logTime ? decadeTicks(timeTick) : undefined, readout: timeTick },
      y: { title: axisTitle(curves.y_label, unitText(curves.y_unit)), type: "linear", min: 0 },
    };
    burdenUnit = unitText(curves.y_unit);
    if (burdenChart) setAxes(burdenChart, axes);
    else burdenChart = createChart(burdenFigure.canvas, axes, { readout: (ctx) => readout(ctx.dataset.label, `${formatNumber(ctx.parsed.y, 4)} ${burdenUnit}`) });
    setDatasets(burdenChart, CHART_REGIONS.map((r, i) => {
      const s = curves.series[r];
      return {
        label: s.label, data: curvePoints(burdenReply.curves, s), borderColor: seriesColour(i),
        backgroundColor: seriesColour(i), pointRadius: 0, borderWidth: r === "lungs" ? 3 : 2,
        borderDash: r === "lungs" ? [8, 4] : [], hidden: r === "ET" || r === "BB" || r === "bb",
      };
    }));
    const ai = curves.series.AI;
    burdenFigure.canvas.setAttribute("aria-label",
      `Line chart of retained ${w} against time; alveolar-interstitial region at the end: ${formatNumber(ai.y[ai.y.length - 1], 3)} ${burdenUnit}.`);
  }

  burdenWeight.addEventListener("change", () => burdenReply && (renderMilestones(), renderBurdenChart()));
  timeAxis.addEventListener("change", () => burdenReply && renderBurdenChart());
  burden.body.append(milestoneBox, burdenControls, burdenFigure.figure);

  // --- ranges (uncertainty) ------------------------------------------------------------
  let rangesReply = null;
  let bandChart = null;
  let bandUnit = "";
  const progressBox = el("div", { class: "propagation", hidden: "" });
  const progressBar = el("progress", { max: "100", value: "0", id: "ranges-progress", "aria-label": "Samples computed" });
  const progressText = el("p", { class: "help", role: "status" });
  progressBox.append(progressBar, progressText);
  const headline = el("p", { class: "headline", id: "ranges-headline" });
  const rangeWeight = select("ranges-weight", WEIGHTS, "mass");
  const rangeControls = el("div", { class: "view-controls" });
  rangeControls.append(el("label", { for: "ranges-weight" }, "Dose as"), rangeWeight);
  const doseBox = el("div", { class: "table-box" });
  const burdenRangeBox = el("div", { class: "table-box" });
  const bandFigure = chartFigure("ranges-bands",
    "Deposited dose per region: bars from the 5th to the 95th percentile, the median and the value from the inputs as entered.",
    "Save range chart image", "drift-dose-dose-ranges.png", () => bandChart,
    () => ({ title: "Dose ranges by region", scenario: [deposition.scenario(AEROSOL), ranges.scenario()].filter(Boolean).join(" · ") }));

  const ranges = new CalcPanel(rangesRoot, {
    id: "ranges", kind: "uncertainty", title: "How sure: ranges of dose and retained burden",
    intro: "Give a spread to the inputs you know only within a range. A Latin-hypercube sample from the recorded seed gives the 5th, 50th and 95th percentiles, and the input that drives the spread most (largest rank correlation).",
    legend: "Uncertain inputs and sampling",
    engine, description: rangesDesc,
    render(reply) {
      rangesReply = reply;
      renderRanges();
    },
  });
  ranges.inputs = () => ({ ...burden.inputs(), ...ranges.fields.values() });

  // propagation in blocks: progress after SHOW_AFTER_MS, stop as soon as any input changes
  ranges.recalc = async function recalc() {
    this.busy = true;
    this.queued = false;
    this.root.setAttribute("aria-busy", "true");
    const started = performance.now();
    const inputs = this.inputs();
    let block = 1;
    let reply = null;
    for (;;) {
      reply = await this.engine.latestOn(this.opts.id, this.opts.kind, { ...inputs, block: String(block) });
      if (this.queued || !reply) break;
      const p = reply.ok && reply.curves && reply.curves.progress;
      if (!p || p.done >= p.total) break;
      if (performance.now() - started > SHOW_AFTER_MS) {
        progressBox.hidden = false;
        progressBar.value = Math.round((100 * p.done) / p.total);
        progressText.textContent = `Computing samples: ${p.done} of ${p.total}…`;
      }
      block += 1;
    }
    this.busy = false;
    progressBox.hidden = true;
    if (this.queued) {
      this.recalc();
      return;
    }
    this.root.removeAttribute("aria-busy");
    if (!reply) return;
    this.apply(reply, inputs);
    this.root.dataset.updatedMs = String(performance.now() - started);
    this.root.dataset.updates = String(Number(this.root.dataset.updates || 0) + 1);
  };

  function row(tr, key, r) {
    tr.append(el("td", { class: "value", "data-key": key }, r ? formatNumber(r.value) : "—"));
  }

  function renderRanges() {
    const res = rangesReply.results;
    const w = rangeWeight.value;
    const unit = unitText(res[`range_dose_AI_${w}_p50`].unit);
    const life = Object.keys(res).find((k) => /^range_burden_(life|year)_AI_mass_p50$/.test(k));
    const stem = life ? life.replace(/_p50$/, "") : null;
    const lead = res.range_dose_AI_mass_leading.text;
    const parts = [
      `Alveolar (AI) mass dose per shift: 5–95 % range ${formatNumber(res.range_dose_AI_mass_p5.value)} to ${formatNumber(res.range_dose_AI_mass_p95.value)} ${unitText(res.range_dose_AI_mass_p5.unit)}; the input driving the spread most: ${lead}.`,
    ];
    if (stem) {
      const when = res[`${stem}_p50`].label.split(", ").slice(2, -1).join(", ");
      parts.push(` Alveolar (AI) mass retained ${when}: median ${formatNumber(res[`${stem}_p50`].value)} ${unitText(res[`${stem}_p50`].unit)} (5–95 %: ${formatNumber(res[`${stem}_p5`].value)} to ${formatNumber(res[`${stem}_p95`].value)}).`);
    }
    headline.textContent = parts.join("");

    const table = el("table", { class: "results ranges" });
    table.append(el("caption", {}, `Deposited ${w === "surface" ? "surface area" : w} per region over ${rangesReply.curves.dose_bands.per} (${unit})`));
    const head = el("tr");
    for (const h of ["Region", "As entered", "5th percentile", "Median", "95th percentile", "Drives the spread most"]) {
      head.append(el("th", { scope: "col" }, h));
    }
    const thead = el("thead");
    thead.append(head);
    table.append(thead);
    const body = el("tbody");
    rangesReply.curves.dose_bands.keys.forEach((region, i) => {
      const tr = el("tr", { "data-region": region });
      tr.append(el("th", { scope: "row" }, rangesReply.curves.dose_bands.regions[i]));
      for (const tag of ["nominal", "p5", "p50", "p95"]) {
        const key = `range_dose_${region}_${w}_${tag}`;
        row(tr, key, res[key]);
      }
      const key = `range_dose_${region}_${w}_leading`;
      tr.append(el("td", { "data-key": key }, res[key].text));
      body.append(tr);
    });
    table.append(body);
    doseBox.replaceChildren(table);

    const bt = el("table", { class: "results ranges-burden" });
    bt.append(el("caption", {}, "Retained burden"));
    const bh = el("tr");
    for (const h of ["Quantity", "As entered", "5th percentile", "Median", "95th percentile", "Unit", "Drives the spread most"]) {
      bh.append(el("th", { scope: "col" }, h));
    }
    const bthead = el("thead");
    bthead.append(bh);
    bt.append(bthead);
    const bb = el("tbody");
    for (const key of Object.keys(res).filter((k) => /^range_burden_.*_p50$/.test(k))) {
      const base = key.replace(/_p50$/, "");
      if (!base.endsWith(`_${w}`)) continue;
      const tr = el("tr", { "data-key": base });
      tr.append(el("th", { scope: "row" }, res[key].label.replace(/, 50th percentile$/, "")));
      for (const tag of ["nominal", "p5", "p50", "p95"]) row(tr, `${base}_${tag}`, res[`${base}_${tag}`]);
      tr.append(el("td", { class: "unit" }, unitText(res[key].unit)));
      tr.append(el("td", { "data-key": `${base}_leading` }, res[`${base}_leading`].text));
      bb.append(tr);
    }
    bt.append(bb);
    burdenRangeBox.replaceChildren(bt);
    renderBands();
  }

  function renderBands() {
    const bands = rangesReply.curves.dose_bands;
    const w = rangeWeight.value;
    const unit = unitText(bands[`${w}_p50`].unit);
    const axes = {
      x: { title: "Region", type: "category" },
      y: { title: axisTitle(`Deposited over ${bands.per}`, unit), type: "logarithmic" },
    };
    bandUnit = unit;
    if (bandChart) {
      setAxes(bandChart, axes);
    } else {
      bandChart = createChart(bandFigure.canvas, axes, { type: "bar", readout: (ctx) => {
        const v = ctx.raw;
        return Array.isArray(v)
          ? readout(ctx.dataset.label, `${formatNumber(v[0], 4)} to ${formatNumber(v[1], 4)} ${bandUnit}`)
          : readout(ctx.dataset.label, `${formatNumber(ctx.parsed.y, 4)} ${bandUnit}`);
      } });
    }
    bandChart.data.labels = bands.keys.map((k) => (k === "total" ? "Total" : k));
    setDatasets(bandChart, [
      { type: "bar", label: "5th to 95th percentile", data: bands.keys.map((_, i) => [bands[`${w}_p5`].y[i], bands[`${w}_p95`].y[i]]),
        backgroundColor: seriesColour(0), borderColor: seriesColour(0), borderSkipped: false, order: 3 },
      { type: "line", label: "Median", data: bands[`${w}_p50`].y, showLine: false, pointRadius: 6, pointStyle: "rectRot",
        borderColor: seriesColour(3), backgroundColor: seriesColour(3), order: 1 },
      { type: "line", label: "As entered", data: bands[`${w}_nominal`].y, showLine: false, pointRadius: 5, pointStyle: "circle",
        borderColor: seriesColour(5), backgroundColor: "transparent", borderWidth: 2, order: 0 },
    ]);
    bandFigure.canvas.setAttribute("aria-label",
      `Dose ranges by region (${w}): ${bands.keys.map((k, i) => `${k} ${formatNumber(bands[`${w}_p5`].y[i], 3)} to ${formatNumber(bands[`${w}_p95`].y[i], 3)} ${unit}`).join("; ")}.`);
  }

  rangeWeight.addEventListener("change", () => rangesReply && renderRanges());
  ranges.body.append(progressBox, headline, rangeControls, doseBox, bandFigure.figure, burdenRangeBox);

  // field visibility: declared on the fields (applies_when in forms.json)
  const applyRanges = ranges.fields.showDeclared(rangesDesc.fields);
  const applyBurden = burden.fields.showDeclared(burdenDesc.fields);

  // the deposition inputs feed both sections; a burden input feeds the ranges too
  // (deferred, so that the deposition panel's own request goes to the engine first)
  deposition.onChange(() => setTimeout(() => {
    burden.schedule();
    ranges.schedule();
  }, 0));
  burden.fields.onInput(() => setTimeout(() => ranges.schedule(), 0));

  // invented demo: loads the deposition, burden and range inputs together
  const demoNote = (panel) => {
    panel.demos = demos;
    panel.demoNote = el("p", { class: "demo-note", role: "status", hidden: "" });
    panel.output.prepend(panel.demoNote);
    panel.onChange(() => {
      if (!panel.demoLabel) panel.demoNote.hidden = true;
    });
  };
  demoNote(burden);
  demoNote(ranges);
  if (demos.length) {
    const box = el("div", { class: "demos", role: "group", "aria-label": "Invented demo over a working life" });
    box.append(el("p", { class: "help" }, "Try an invented demo (not measurements):"));
    for (const demo of demos) {
      const button = el("button", { type: "button", class: "secondary", id: `load-${demo.id}` }, demo.label);
      button.addEventListener("click", () => {
        deposition.setState(demo.deposition);
        burden.setState({ ...demo.burden, demo: demo.id });
        ranges.setState({ ...demo.ranges, demo: demo.id });
        applyBurden();
        applyRanges();
      });
      box.append(button);
    }
    burden.fieldsBox.prepend(box);
  }
  const baseBurdenSet = burden.setState.bind(burden);
  burden.setState = (values) => {
    baseBurdenSet(values);
    applyBurden();
  };
  const baseRangesSet = ranges.setState.bind(ranges);
  ranges.setState = (values) => {
    baseRangesSet(values);
    applyRanges();
  };
  // Both sections compute only while they are on screen (the propagation takes seconds,
  // the burden series a few hundred milliseconds in the page): a change made elsewhere waits
  // until they are scrolled to, and the propagation waits for a pause in typing, so neither
  // delays the deposition panel's own answers.
  // The gated schedule tells the change listeners itself, once per call (the link follows the
  // inputs even while a section waits), so its run starts the computation without them.
  const gate = (panel, root, quietMs) => {
    let visible = false;
    let pending = true;
    let timer = 0;
    const run = () => {
      pending = false;
      panel.compute();
    };
    panel.schedule = function schedule() {
      for (const listener of this.listeners) listener(this);
      if (!visible) {
        pending = true;
        return;
      }
      if (this.busy) {
        this.compute(); // queued after the run in flight, without waiting for a pause
        return;
      }
      clearTimeout(timer);
      if (quietMs) timer = setTimeout(run, quietMs);
      else run();
    };
    const observer = new IntersectionObserver((entries) => {
      visible = entries.some((e) => e.isIntersecting);
      if (visible && pending) run();
    });
    observer.observe(root);
  };
  gate(burden, burdenRoot, 0);
  gate(ranges, rangesRoot, QUIET_MS);
  return [burden, ranges];
}
