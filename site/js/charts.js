// Thin layer over Chart.js (vendored UMD build, global `Chart`): log-log line charts with hover
// readouts, theme colours from CSS, and PNG export with a title, the scenario and the tool
// version drawn above and below the chart and kept as text chunks in the file.
import { formatNumber } from "./format.js";
import { el } from "./forms.js";
import { download, stamp } from "./files.js";
import { decadeStride, fitLegendText, imageText, pngWithText, readout as nameValue, wrapText } from "./chartparts.js";
import { DrawQueue } from "./drawqueue.js";
import { coalesced } from "./later.js";

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

// Charts far from the view are redrawn once edits pause for QUIET_MS (in the page's next idle
// time), when they come within NEAR_VIEW of the view, or when their pixels are asked for
// (drawqueue.js): an edit's time goes to what is seen. A chart whose place is not known yet is
// drawn at once.
const NEAR_VIEW = "300px 0px";
const QUIET_MS = 250;
const queue = new DrawQueue({
  draw: (chart) => {
    if (chart.canvas) chart.update("none"); // a destroyed chart has no canvas
  },
  later: typeof requestIdleCallback === "function"
    ? coalesced(() => requestIdleCallback(() => queue.flushAll(), { timeout: 1000 }), { delay: QUIET_MS, restart: true })
    : null,
});
let watcher = null;

function watch(chart) {
  if (typeof IntersectionObserver !== "function") return;
  watcher ||= new IntersectionObserver((entries) => {
    for (const entry of entries) {
      const drawn = window.Chart.getChart(entry.target);
      if (drawn) queue.seen(drawn, entry.isIntersecting);
    }
  }, { rootMargin: NEAR_VIEW });
  watcher.observe(chart.canvas);
}

/** Draw `chart` now if a redraw of it waits (before reading its pixels). */
export function drawNow(chart) {
  if (chart) queue.flush(chart);
}

globalThis.addEventListener?.("beforeprint", () => queue.flushAll());

function isDecade(value) {
  const exp = Math.log10(value);
  return Math.abs(exp - Math.round(exp)) < 1e-9;
}

/**
 * Tick label callback of a logarithmic axis that labels only powers of ten, by `label(value)`.
 * The other ticks are dropped (Chart.js drops a tick whose label is null): unlabelled, their
 * grid lines transparent, they would only cost time on every update. The first and last stay,
 * unlabelled, so that the axis is laid out as with all of them.
 */
export function decadeTicks(label) {
  const strides = new WeakMap(); // per tick list: Chart.js calls this once per tick of a list
  return function tick(value, index, ticks) {
    if (!isDecade(value)) return index === 0 || index === ticks.length - 1 ? "" : null;
    // the axis's maximum, when a decade, comes twice (as a decade and as the bound): one label
    if (index > 0 && Math.abs(ticks[index - 1].value - value) <= 1e-9 * value) return null;
    if (!strides.has(ticks)) strides.set(ticks, labelStride(this, ticks, label));
    const { stride, first } = strides.get(ticks);
    // on a narrow horizontal axis every stride-th decade is labelled; the rest keep their grid line
    return Math.round(Math.log10(value) - first) % stride === 0 ? label(value) : "";
  };
}

/** Which decades of a horizontal logarithmic `scale` carry labels: {stride, first exponent}. */
function labelStride(scale, ticks, label) {
  const decades = ticks.filter((t) => isDecade(t.value));
  const first = decades.length ? Math.log10(decades[0].value) : 0;
  if (!scale || typeof scale.isHorizontal !== "function" || !scale.isHorizontal()) return { stride: 1, first };
  const size = scale.options?.ticks?.font?.size ?? window.Chart?.defaults?.font?.size ?? 12;
  const longest = Math.max(0, ...decades.map((t) => String(label(t.value)).length));
  // about 0.62 em per character of these labels ("100 nm", "10 µm"), and a gap of 12 px
  return { stride: decadeStride(scale.width, decades.length, longest * 0.62 * size + 12), first };
}

/** Chart.js's legend entries, each text shortened to fit the chart's width (fitLegendText). */
function fittedLegendLabels(chart) {
  const Chart = window.Chart;
  const items = Chart.defaults.plugins.legend.labels.generateLabels(chart);
  const font = Chart.helpers.toFont(chart.options.plugins.legend.labels.font || Chart.defaults.font);
  const ctx = chart.ctx;
  const room = chart.width - font.size * 2 - 20; // the point marker, its gap and the padding
  ctx.save();
  ctx.font = font.string;
  try {
    return items.map((item) => ({ ...item, text: fitLegendText(item.text, room, (t) => ctx.measureText(t).width) }));
  } finally {
    ctx.restore();
  }
}

/** Chart.js options of one axis: {title, type, tick, readout, min, max, position, secondary}. */
function scaleOptions(axis) {
  const text = cssVar("--ink");
  const grid = cssVar("--grid");
  return {
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
  };
}

/**
 * Create a chart on `canvas`. `axes` = {x: {title, type, tick, readout}, y: {...}}; datasets are
 * given later through setDatasets(), axes changed later through setAxes(): a chart is created
 * once per canvas and updated in place; `plugins` are drawn with this chart only. Unless `eager`,
 * a chart far from the view is redrawn later (see NEAR_VIEW). With `steadyLayout` (a function
 * returning, as text, whatever else its tick labels depend on), a chart whose axes all have fixed
 * bounds keeps its layout while nothing that shapes it changes (layoutKey). Returns the Chart.js
 * instance.
 */
export function createChart(canvas, axes, { legendLabel, readout, type = "line", plugins = [], eager = false, steadyLayout = null } = {}) {
  const Chart = window.Chart;
  Chart.defaults.font.family = cssVar("--font-body") || "system-ui, sans-serif";
  const scales = {};
  for (const [key, axis] of Object.entries(axes)) scales[key] = scaleOptions(axis);
  const chart = new Chart(canvas, {
    type,
    plugins: [backgroundPlugin, steadyLayoutPlugin, ...plugins],
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
        legend: { labels: { color: cssVar("--ink"), usePointStyle: true, filter: legendLabel, generateLabels: fittedLegendLabels } },
        tooltip: {
          callbacks: {
            label: readout || ((ctx) => nameValue(ctx.dataset.label, formatNumber(ctx.parsed.y, 3))),
            title: (items) => {
              const x = chart.$driftdoseAxes?.x;
              return items.length && x?.readout ? x.readout(items[0].parsed.x) : items[0]?.label ?? "";
            },
          },
        },
      },
    },
  });
  chart.$driftdoseAxes = { ...axes };
  chart.$driftdoseSteady = steadyLayout;
  if (!eager) watch(chart);
  return chart;
}

/**
 * Change some axes of a chart (type, title, ticks, hover title) in place; the next
 * setDatasets() or chart.update() draws them.
 */
export function setAxes(chart, axes) {
  for (const [key, axis] of Object.entries(axes)) chart.options.scales[key] = scaleOptions(axis);
  chart.$driftdoseAxes = { ...chart.$driftdoseAxes, ...axes };
}

/**
 * Replace a chart's datasets and redraw without animation (later for a chart far from the
 * view). With as many datasets as before, the existing dataset objects are updated in place, so
 * Chart.js keeps their controllers.
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
  queue.request(chart);
}

let toolVersion = "";

/** The tool version written on every exported chart image (set once the forms are read). */
export function setToolVersion(version) {
  toolVersion = String(version ?? "");
}

function pngBytes(dataUrl) {
  const binary = atob(dataUrl.slice(dataUrl.indexOf(",") + 1));
  const bytes = new Uint8Array(binary.length);
  for (let i = 0; i < binary.length; i++) bytes[i] = binary.charCodeAt(i);
  return bytes;
}

/**
 * The chart as a PNG image (bytes) with a header (title, scenario) and a footer (tool version,
 * date) drawn around it, and the same texts as PNG text chunks (Title, Description, Software).
 */
export function chartImage(chart, { title, scenario } = {}) {
  drawNow(chart);
  const src = chart.canvas;
  const ratio = src.width / (chart.width || src.width) || 1;
  const text = imageText({ title, scenario, version: toolVersion, date: stamp() });
  const width = src.width;
  const canvas = document.createElement("canvas");
  const ctx = canvas.getContext("2d");
  const font = cssVar("--font-body") || "system-ui, sans-serif";
  const pad = Math.round(14 * ratio);
  const big = Math.round(17 * ratio);
  const small = Math.round(12.5 * ratio);
  const measureIn = (spec) => {
    ctx.font = spec;
    return (t) => ctx.measureText(t).width;
  };
  const titleFont = `600 ${big}px ${font}`;
  const smallFont = `${small}px ${font}`;
  const titleLines = wrapText(text.title, width - 2 * pad, measureIn(titleFont), 2);
  const scenarioLines = wrapText(text.scenario, width - 2 * pad, measureIn(smallFont), 3);
  const footerLines = wrapText(text.footer, width - 2 * pad, measureIn(smallFont), 2);
  const step = (px) => Math.round(px * 1.35);
  const header = pad + titleLines.length * step(big) + scenarioLines.length * step(small) + Math.round(pad / 2);
  const footer = Math.round(pad / 2) + footerLines.length * step(small) + pad;
  canvas.width = width;
  canvas.height = header + src.height + footer;
  ctx.fillStyle = cssVar("--surface") || "#fff";
  ctx.fillRect(0, 0, canvas.width, canvas.height);
  ctx.fillStyle = cssVar("--ink") || "#222";
  ctx.textBaseline = "top";
  let y = pad;
  ctx.font = titleFont;
  for (const line of titleLines) {
    ctx.fillText(line, pad, y);
    y += step(big);
  }
  ctx.font = smallFont;
  for (const line of scenarioLines) {
    ctx.fillText(line, pad, y);
    y += step(small);
  }
  ctx.drawImage(src, 0, header);
  y = header + src.height + Math.round(pad / 2);
  for (const line of footerLines) {
    ctx.fillText(line, pad, y);
    y += step(small);
  }
  return pngWithText(pngBytes(canvas.toDataURL("image/png")), {
    Title: text.title, Description: text.scenario, Software: text.footer.split(" · ")[0], "Creation Time": text.footer.split(" · ")[1],
  });
}

/** Download the chart as a PNG image with its title, scenario and the tool version. */
export function exportChart(chart, filename, describe = {}) {
  download(filename, new Blob([chartImage(chart, describe)], { type: "image/png" }));
}

/**
 * What shapes a chart's layout when every axis has fixed bounds: its size, its axes (type,
 * bounds, place, title), its legend entries (label, shown, line width) and what its
 * `steadyLayout` function names. Null for a chart without one, or when an axis has bounds from
 * the data: its ticks, and so the layout, may change with any update.
 */
export function layoutKey(chart) {
  if (typeof chart.$driftdoseSteady !== "function") return null;
  const parts = [String(chart.$driftdoseSteady()), chart.width, chart.height, chart.options.plugins?.legend?.display];
  for (const [id, axis] of Object.entries(chart.options.scales || {})) {
    if (!Number.isFinite(axis?.min) || !Number.isFinite(axis?.max)) return null;
    parts.push(id, axis.type, axis.min, axis.max, axis.position, axis.display, axis.title?.display, axis.title?.text);
  }
  chart.data.datasets.forEach((set, i) => parts.push(set.label, set.borderWidth, chart.isDatasetVisible(i)));
  return JSON.stringify(parts);
}

/**
 * Chart.js plugin: keep the last layout while its key (layoutKey) is the same. Chart.js fits
 * every axis and the legend again on every update (a third of a fixed-axis chart's update);
 * returning false from beforeLayout keeps the layout it has (Chart.js plugin interface).
 */
export const steadyLayoutPlugin = {
  id: "driftdoseSteadyLayout",
  beforeLayout(chart) {
    const key = layoutKey(chart);
    if (key !== null && key === chart.$driftdoseLayout) return false;
    chart.$driftdoseLayout = key;
    return undefined;
  },
};

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

/**
 * A figure with a chart canvas, its caption and a button that saves the chart as PNG.
 * `describe()` returns {title, scenario} for the saved image.
 */
export function chartFigure(idBase, captionText, buttonText, filename, getChart, describe = () => ({})) {
  const figure = el("figure", { class: "chart-card" });
  const box = el("div", { class: "chart-box" });
  const canvas = el("canvas", { id: `${idBase}-canvas`, role: "img", "aria-label": captionText });
  box.append(canvas);
  const save = el("button", { type: "button", class: "secondary" }, buttonText);
  save.addEventListener("click", () => getChart() && exportChart(getChart(), filename, describe()));
  figure.append(box, el("figcaption", {}, captionText), save);
  return { figure, canvas };
}
