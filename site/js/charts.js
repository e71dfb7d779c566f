// Thin layer over Chart.js (vendored UMD build, global `Chart`): log-log line charts with hover
// readouts, theme colours from CSS, and PNG export through Chart.js's own toBase64Image().
import { formatNumber } from "./format.js";
import { el } from "./forms.js";

const TINY_SPAN = 1e-250;
const SERIES_VARS = ["--series-1", "--series-2", "--series-3", "--series-4", "--series-5", "--series-6", "--series-7"];

// computed CSS variables, read once per colour scheme (getComputedStyle forces a style pass)
const cssCache = new Map();
globalThis.matchMedia?.("(prefers-color-scheme: dark)").addEventListener?.("change", () => cssCache.clear());

export function cssVar(name) {
  if (!cssCache.has(name)) {
    cssCache.set(name, getComputedStyle(document.documentElement).getPropertyValue(name).trim());
  }
  return cssCache.get(name);
}

export function seriesColour(index) {
  return cssVar(SERIES_VARS[index % SERIES_VARS.length]) || "#444";
}

function isDecade(value) {
  const exp = Math.log10(value);
  return Math.abs(exp - Math.round(exp)) < 1e-9;
}

/** Tick label callback that keeps only powers of ten, labelled by `label(value)`. */
export function decadeTicks(label) {
  return (value) => (isDecade(value) ? label(value) : "");
}

/**
 * Create a chart on `canvas`. `axes` = {x: {title, type, tick}, y: {...}}; datasets are given
 * later through update(). Returns the Chart.js instance.
 */
export function createChart(canvas, axes, { legendLabel, readout, type = "line" } = {}) {
  const Chart = window.Chart;
  const text = cssVar("--ink");
  const grid = cssVar("--grid");
  Chart.defaults.font.family = cssVar("--font-body") || "system-ui, sans-serif";
  const scale = (axis) => ({
    type: axis.type || "logarithmic",
    position: axis.position,
    title: { display: true, text: axis.title, color: text },
    min: axis.min, max: axis.max,
    // Chart.js's linear ticks never finish for a data range below about 1e-300 (the step
    // becomes subnormal and the page hangs); such values are zero to the eye, so the axis
    // spans at least TINY_SPAN. Larger data override this suggestion.
    ...((axis.type === "linear" && axis.max === undefined) ? { suggestedMax: TINY_SPAN } : {}),
    ticks: { color: text, autoSkip: !axis.tick, maxRotation: 0, ...(axis.tick ? { callback: axis.tick } : {}) },
    grid: axis.type && axis.type !== "logarithmic"
      ? { color: grid, drawOnChartArea: !axis.secondary }
      : { color: (ctx) => (ctx.tick && isDecade(ctx.tick.value) ? grid : "transparent"), drawOnChartArea: !axis.secondary },
  });
  const scales = {};
  for (const [key, axis] of Object.entries(axes)) scales[key] = scale(axis);
  return new Chart(canvas, {
    type,
    plugins: [backgroundPlugin],
    data: { datasets: [] },
    options: {
      animation: false,
      responsive: true,
      maintainAspectRatio: false,
      parsing: type === "bar",
      normalized: true,
      interaction: { mode: type === "bar" ? "index" : "nearest", axis: "x", intersect: false },
      scales,
      plugins: {
        legend: { labels: { color: text, usePointStyle: true, filter: legendLabel } },
        tooltip: {
          callbacks: {
            label: readout || ((ctx) => `${ctx.dataset.label}: ${formatNumber(ctx.parsed.y, 3)}`),
            title: (items) => (items.length && axes.x.readout ? axes.x.readout(items[0].parsed.x) : items[0]?.label ?? ""),
          },
        },
      },
    },
  });
}

/**
 * Replace a chart's datasets and redraw without animation. With as many datasets as before,
 * the existing dataset objects are updated in place, so Chart.js keeps their controllers.
 */
export function setDatasets(chart, datasets) {
  const current = chart.data.datasets;
  if (current.length === datasets.length && current.length > 0) {
    datasets.forEach((next, i) => {
      const old = current[i];
      for (const key of Object.keys(old)) if (!(key in next)) delete old[key];
      Object.assign(old, next);
    });
  } else {
    chart.data.datasets = datasets;
  }
  chart.update("none");
}

/** Download the chart as a PNG image with a solid background. */
export function exportChart(chart, filename) {
  const url = chart.toBase64Image("image/png", 1);
  const link = document.createElement("a");
  link.href = url;
  link.download = filename;
  document.body.append(link);
  link.click();
  link.remove();
}

/** Chart.js plugin: paint the canvas background so exported images are not transparent. */
export const backgroundPlugin = {
  id: "driftdoseBackground",
  beforeDraw(chart) {
    const { ctx } = chart;
    ctx.save();
    ctx.globalCompositeOperation = "destination-over";
    ctx.fillStyle = cssVar("--surface") || "#fff";
    ctx.fillRect(0, 0, chart.width, chart.height);
    ctx.restore();
  },
};

/** A figure with a chart canvas, its caption and a button that saves the chart as PNG. */
export function chartFigure(idBase, captionText, buttonText, filename, getChart) {
  const figure = el("figure", { class: "chart-card" });
  const box = el("div", { class: "chart-box" });
  const canvas = el("canvas", { id: `${idBase}-canvas`, role: "img", "aria-label": captionText });
  box.append(canvas);
  const save = el("button", { type: "button", class: "secondary" }, buttonText);
  save.addEventListener("click", () => getChart() && exportChart(getChart(), filename));
  figure.append(box, el("figcaption", {}, captionText), save);
  return { figure, canvas };
}
