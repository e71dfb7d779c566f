// Panel "How it moves": Brownian displacement versus settling for one particle and over sizes,
// with up to two more particles compared (each computed by its own request to the engine).
import { CalcPanel, resultsTable } from "../panel.js";
import { el, renderField } from "../forms.js";
import { renew } from "../dom.js";
import { chartFigure, createChart, decadeTicks, seriesColour, setDatasets } from "../charts.js";
import { MAX_COMPARED, axisTitle, curvePoints, particleLetter, readout } from "../chartparts.js";
import { formatNumber, lengthTick } from "../format.js";
import { fromSI, toSI, unitLabel, unitText, withUnit } from "../units.js";

export const id = "motion";
export const title = "How it moves";

const TABLE_KEYS = [
  "volume_equivalent_diameter", "aerodynamic_diameter", "dominant", "rms_displacement",
  "settling_distance", "displacement_ratio", "crossover_diameter", "brownian_time", "settling_time",
  "diffusion_coefficient", "settling_velocity", "settling_model", "slip_correction", "knudsen_number",
  "mean_free_path", "mobility", "relaxation_time", "stopping_distance", "initial_reynolds_number",
  "stopping_model", "reynolds_number", "air_viscosity",
];
// rows of the comparison table
const COMPARE_KEYS = [
  "volume_equivalent_diameter", "aerodynamic_diameter", "dominant", "rms_displacement",
  "settling_distance", "displacement_ratio", "brownian_time", "settling_time",
  "diffusion_coefficient", "settling_velocity", "relaxation_time", "stopping_distance",
];
// the inputs a compared particle has of its own; the rest (diameter type, air, time,
// reference distance, initial velocity) it shares with the form's particle
const OWN_FIELDS = ["particle_diameter", "particle_density", "shape_factor"];
// one dash pattern and marker per particle: A (the form's), B, C
const DASHES = [[], [2, 3], [9, 3, 2, 3]];
const MARKERS = ["rectRot", "triangle", "rect"];
// inputs that change the curves (not only where a particle sits on them)
const SCENARIO = ["particle_diameter", "diameter_type", "particle_density", "shape_factor", "temperature", "pressure", "time"];

const sameCurve = (a, b) => a.y.length === b.y.length && a.y.every((y, i) => y === b.y[i]);

export function mount(root, { engine, description }) {
  let chart = null;
  let compared = []; // [{letter, reply, inputs}] of the extra particles, newest round
  const tableBox = el("div", { class: "table-box" });
  const compareTableBox = el("div", { class: "table-box", "data-part": "compare" });
  const figure = chartFigure("motion",
    "Distance travelled in the chosen time against particle size. Brownian motion is the root-mean-square displacement in one direction, √(2Dt). Compared particles are marked with their letters; their curves are drawn dashed where they differ.",
    "Save chart image", "drift-dose-motion-chart.png", () => chart,
    () => ({ title: "Diffusion versus settling: distance in the chosen time", scenario: scenarioText() }));

  const panel = new CalcPanel(root, {
    id, kind: "motion", title: "How it moves: diffusion versus settling",
    intro: "For a particle of one size: how far Brownian motion carries it and how far it settles in the same time, where the two are equal, and how long each takes to cross a reference distance such as an alveolus. Compare up to three particles.",
    legend: "Particle and air",
    tableKeys: TABLE_KEYS,
    engine, description,
    render(reply) {
      renew(tableBox, resultsTable(reply.results, rows.length ? "Properties of particle A" : "Properties of this particle", TABLE_KEYS));
      if (rows.length) {
        compareAll(); // draws when the compared particles are in
      } else {
        compared = [];
        renew(compareTableBox);
        draw();
      }
    },
  });

  // --- compared particles ------------------------------------------------------------------
  const ownFields = OWN_FIELDS.map((name) => description.fields.find((f) => f.name === name)).filter(Boolean);
  const compareBox = el("fieldset", { class: "compare" });
  compareBox.append(el("legend", {}, "Compare particles"),
    el("p", { class: "help" }, `Up to ${MAX_COMPARED - 1} more particles, each with its own diameter, density and shape factor; they share the diameter type, air, time and distances above.`));
  const rowsBox = el("div", { class: "items" });
  const add = el("button", { type: "button", class: "secondary" }, "Add a particle to compare");
  compareBox.append(rowsBox, add);
  const rows = [];

  function relabel() {
    rows.forEach((row, i) => {
      const letter = particleLetter(i + 1);
      row.legend.textContent = `Particle ${letter}`;
      row.remove.textContent = `Remove particle ${letter}`;
    });
    add.disabled = rows.length >= MAX_COMPARED - 1;
    add.hidden = add.disabled;
  }

  function addRow(values) {
    if (rows.length >= MAX_COMPARED - 1) return;
    const box = el("fieldset", { class: "item compare-particle" });
    const legend = el("legend");
    box.append(legend);
    const handles = new Map();
    for (const f of ownFields) handles.set(f.name, renderField(box, f, `motion-compare-${rows.length + 1}`));
    const base = panel.fields.values();
    for (const [name, handle] of handles) handle.set(values?.[name] ?? base[name]);
    const error = el("p", { class: "error", role: "alert", hidden: "" });
    const remove = el("button", { type: "button", class: "secondary" });
    box.append(error, remove);
    const row = { box, legend, handles, error, remove };
    remove.addEventListener("click", () => {
      rows.splice(rows.indexOf(row), 1);
      box.remove();
      relabel();
      panel.schedule();
      add.focus();
    });
    for (const handle of handles.values()) {
      for (const node of [handle.input, handle.unitSelect].filter(Boolean)) {
        node.addEventListener("input", () => compareAll());
        node.addEventListener("change", () => compareAll());
      }
    }
    rows.push(row);
    rowsBox.append(box);
    relabel();
    return row;
  }

  add.addEventListener("click", () => {
    const row = addRow();
    if (!row) return;
    panel.schedule();
    row.handles.get("particle_diameter")?.input.focus();
  });

  // one request per compared particle; only the newest round is shown
  let round = 0;
  async function compareAll() {
    const base = panel.lastGoodInputs;
    if (!base || !panel.lastGood) return;
    const mine = ++round;
    const asked = rows.map((row) => {
      const own = Object.fromEntries([...row.handles].map(([name, h]) => [name, h.get()]));
      return { row, inputs: { ...base, ...own } };
    });
    const replies = await Promise.all(asked.map(({ inputs }) => engine.request("motion", inputs)));
    if (mine !== round) return;
    compared = [];
    asked.forEach(({ row, inputs }, i) => {
      const reply = replies[i];
      const letter = particleLetter(i + 1);
      const stray = [];
      for (const [name, handle] of row.handles) {
        const e = reply && !reply.ok ? (reply.errors || []).find((x) => x.field === name) : null;
        handle.showError(e ? e.message : "");
      }
      if (reply && !reply.ok) for (const e of reply.errors || []) if (!row.handles.has(e.field)) stray.push(e.message);
      row.error.textContent = stray.join(" ");
      row.error.hidden = !stray.length;
      row.box.classList.toggle("invalid", Boolean(reply && !reply.ok));
      if (reply && reply.ok) compared.push({ letter, reply, inputs });
    });
    renderCompareTable();
    draw();
    root.dataset.compared = String(Number(root.dataset.compared || 0) + 1);
  }

  function renderCompareTable() {
    if (!rows.length) {
      renew(compareTableBox);
      return;
    }
    const all = [{ letter: "A", reply: panel.lastGood }, ...compared];
    const table = el("table", { class: "results compare-table" });
    table.append(el("caption", {}, `Particles compared (${all.map((p) => p.letter).join(", ")}; A is the particle of the form)`));
    const head = el("thead");
    const hr = el("tr");
    hr.append(el("th", { scope: "col" }, "Quantity"));
    for (const p of all) hr.append(el("th", { scope: "col" }, `Particle ${p.letter}`));
    head.append(hr);
    table.append(head);
    const body = el("tbody");
    for (const key of COMPARE_KEYS) {
      const first = all[0].reply.results[key];
      if (!first) continue;
      const tr = el("tr", { "data-compare": key });
      tr.append(el("th", { scope: "row" }, first.label));
      for (const p of all) {
        const r = p.reply.results[key];
        const text = !r ? "—" : r.text !== undefined ? r.text : withUnit(formatNumber(r.value), r.unit);
        tr.append(el("td", { class: "value", "data-particle": p.letter }, text));
      }
      body.append(tr);
    }
    table.append(body);
    renew(compareTableBox, table);
  }

  // --- chart ---------------------------------------------------------------------------------
  function draw() {
    const reply = panel.lastGood;
    if (!reply) return;
    const c = reply.curves;
    // sizes and distances arrive in the units the reply names by code; converted to metres here
    const xm = (v) => toSI(v, c.x_unit);
    const ym = (v) => toSI(v, c.y_unit);
    if (!chart) {
      chart = createChart(figure.canvas, {
        // the ticks carry their units ("10 nm", "1 µm"): the titles name the quantity only
        x: { title: axisTitle(c.x_label, unitText(c.x_unit), true), tick: decadeTicks((v) => lengthTick(xm(v))), readout: (x) => lengthTick(xm(x)), min: fromSI(1e-9, c.x_unit), max: fromSI(100e-6, c.x_unit) },
        y: { title: axisTitle(c.y_label, unitText(c.y_unit), true), tick: decadeTicks((v) => lengthTick(ym(v))) },
      }, {
        // a marker holds a particle's two points: each named by its own series
        readout: (ctx) => readout(ctx.dataset.pointNames?.[ctx.dataIndex] ?? ctx.dataset.label, lengthTick(ym(ctx.parsed.y))),
      });
    }
    chart.options.scales.x.title.text = axisTitle(c.x_label, unitText(c.x_unit), true);
    const many = compared.length > 0;
    const datasets = [
      line(c, c.brownian, 0), line(c, c.settling, 1),
      { ...line(c, c.reference, 2), borderDash: [6, 4], borderWidth: 1.5 },
      marker(c, c.this_particle, many ? "Particle A" : "This particle", 4, MARKERS[0]),
    ];
    if (c.crossover) datasets.push(pointMark(c, c.crossover, 3, "circle", 7));
    compared.forEach((p, i) => {
      const o = p.reply.curves;
      const name = `Particle ${p.letter}`;
      if (!sameCurve(o.brownian, c.brownian)) datasets.push({ ...line(o, o.brownian, 0, `${name}: ${o.brownian.label}`), borderDash: DASHES[i + 1], borderWidth: 1.5 });
      if (!sameCurve(o.settling, c.settling)) datasets.push({ ...line(o, o.settling, 1, `${name}: ${o.settling.label}`), borderDash: DASHES[i + 1], borderWidth: 1.5 });
      datasets.push(marker(o, o.this_particle, name, 5 + i, MARKERS[i + 1]));
    });
    setDatasets(chart, datasets);
    const where = (p) => `${p.letter} at ${lengthTick(toSI(p.reply.curves.this_particle.x[0], p.reply.curves.x_unit))}`;
    figure.canvas.setAttribute("aria-label", `Log-log chart: Brownian displacement and settling distance against ${c.x_label.toLowerCase()}${
      c.crossover ? `; they cross at ${formatNumber(c.crossover.x[0], 3)} ${unitLabel(c.x_unit)}` : ""}${
      many ? `; particles ${[{ letter: "A", reply }, ...compared].map(where).join(", ")}` : ""}.`);
  }

  function scenarioText() {
    const letters = compared.map((p) => {
      const own = OWN_FIELDS.map((n) => p.inputs[n]).filter((v) => v && typeof v === "object")
        .map((v) => withUnit(v.value, v.unit));
      return `Particle ${p.letter}: ${own.join(", ")}`;
    });
    const line = panel.scenario(SCENARIO);
    return [compared.length ? `Particle A: ${line}` : line, ...letters].filter(Boolean).join(" · ");
  }

  // the compared particles are inputs of the record too
  const baseDescribe = panel.describeInputs.bind(panel);
  panel.describeInputs = (inputs) => [
    ...baseDescribe(inputs),
    ...(inputs === panel.lastGoodInputs ? compared : []).map((p) => ({
      label: `Particle ${p.letter} (compared)`,
      value: OWN_FIELDS.map((n) => {
        const f = ownFields.find((x) => x.name === n);
        const v = p.inputs[n];
        return f && v && typeof v === "object" ? `${f.label} ${withUnit(v.value, v.unit)}` : "";
      }).filter(Boolean).join("; "),
      unit: "",
    })),
  ];

  panel.fieldsBox.append(compareBox);
  relabel();
  panel.body.append(tableBox, compareTableBox, figure.figure);
  // the page can load the compared particles (tests, a future link entry)
  panel.compare = { add: addRow, rows };
  return panel;
}

function line(curves, curve, colour, label = curve.label) {
  return {
    label, data: curvePoints(curves, curve), borderColor: seriesColour(colour),
    backgroundColor: seriesColour(colour), pointRadius: 0, borderWidth: 2.5, tension: 0,
  };
}

/** A particle's two points (Brownian displacement, settling distance), each named in readouts. */
function marker(curves, curve, name, colour, style) {
  return {
    ...pointMark(curves, curve, colour, style, 6), label: name,
    pointNames: [`${name}, Brownian displacement`, `${name}, settling distance`],
  };
}

function pointMark(curves, curve, colour, style, radius) {
  return {
    label: curve.label, data: curvePoints(curves, curve), showLine: false, pointStyle: style,
    pointRadius: radius, pointHoverRadius: radius + 2, borderColor: seriesColour(colour),
    backgroundColor: seriesColour(colour),
  };
}
