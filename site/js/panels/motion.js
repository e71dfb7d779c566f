// Panel "How it moves": Brownian displacement versus settling for one particle and over sizes.
import { CalcPanel, resultsTable } from "../panel.js";
import { el } from "../forms.js";
import { createChart, decadeTicks, exportChart, seriesColour, setDatasets } from "../charts.js";
import { formatNumber, lengthTick } from "../format.js";

export const id = "motion";
export const title = "How it moves";

const TABLE_KEYS = [
  "volume_equivalent_diameter", "aerodynamic_diameter", "dominant", "rms_displacement",
  "settling_distance", "displacement_ratio", "crossover_diameter", "brownian_time", "settling_time",
  "diffusion_coefficient", "settling_velocity", "settling_model", "slip_correction", "knudsen_number",
  "mean_free_path", "mobility", "relaxation_time", "stopping_distance", "initial_reynolds_number",
  "stopping_model", "reynolds_number", "air_viscosity",
];

const toPoints = (curve) => curve.x.map((x, i) => ({ x, y: curve.y[i] }));

export function mount(root, { engine, description }) {
  let chart = null;
  const tableBox = el("div", { class: "table-box" });
  const figure = el("figure", { class: "chart-card" });
  const canvasBox = el("div", { class: "chart-box" });
  const canvas = el("canvas", {
    role: "img",
    "aria-label": "Log-log chart of Brownian rms displacement and settling distance against particle diameter",
  });
  canvasBox.append(canvas);
  const caption = el("figcaption", {},
    "Distance travelled in the chosen time against particle size. Brownian motion is the root-mean-square displacement in one direction, √(2Dt).");
  const save = el("button", { type: "button", class: "secondary" }, "Save chart image");
  save.addEventListener("click", () => chart && exportChart(chart, "drift-dose-motion-chart.png"));
  figure.append(canvasBox, caption, save);

  const panel = new CalcPanel(root, {
    id, kind: "motion", title: "How it moves: diffusion versus settling",
    intro: "For a particle of one size: how far Brownian motion carries it and how far it settles in the same time, where the two are equal, and how long each takes to cross a reference distance such as an alveolus.",
    legend: "Particle and air",
    tableKeys: TABLE_KEYS,
    engine, description,
    render(reply) {
      tableBox.replaceChildren(resultsTable(reply.results, "Properties of this particle", TABLE_KEYS));
      const c = reply.curves;
      if (!chart) {
        chart = createChart(canvas, {
          x: { title: `${c.x_label} (µm)`, tick: decadeTicks((v) => lengthTick(v * 1e-6)), readout: (x) => lengthTick(x * 1e-6), min: 1e-3, max: 100 },
          y: { title: c.y_label, tick: decadeTicks(lengthTick) },
        }, {
          readout: (ctx) => `${ctx.dataset.label}: ${lengthTick(ctx.parsed.y)}`,
        });
      }
      const datasets = [
        line(c.brownian, 0), line(c.settling, 1),
        { ...line(c.reference, 2), borderDash: [6, 4], borderWidth: 1.5 },
        marker(c.this_particle, 4, "rectRot"),
      ];
      if (c.crossover) datasets.push(marker(c.crossover, 3, "circle", 7));
      setDatasets(chart, datasets);
      canvas.setAttribute("aria-label", `Log-log chart: Brownian displacement and settling distance against ${c.x_label.toLowerCase()}${
        c.crossover ? `; they cross at ${formatNumber(c.crossover.x[0], 3)} µm` : ""}.`);
    },
  });
  panel.body.append(tableBox, figure);
  return panel;
}

function line(curve, colour) {
  return {
    label: curve.label, data: toPoints(curve), borderColor: seriesColour(colour),
    backgroundColor: seriesColour(colour), pointRadius: 0, borderWidth: 2.5, tension: 0,
  };
}

function marker(curve, colour, style, radius = 6) {
  return {
    label: curve.label, data: toPoints(curve), showLine: false, pointStyle: style,
    pointRadius: radius, pointHoverRadius: radius + 2, borderColor: seriesColour(colour),
    backgroundColor: seriesColour(colour),
  };
}
