// Time-series chart of a logged shift (Chart.js): x is seconds from the series start, labelled
// as clock time; y linear or logarithmic. Task, background and break periods are bands drawn
// over the series; their edges can be dragged (or a whole band moved), snapping to a round step
// at the screen's scale and to the edges of the other bands. The series arrive thinned for
// drawing from the engine (each bucket's minimum and maximum, so peaks survive).
import { createChart, cssVar, seriesColour, setDatasets } from "./charts.js";
import { formatNumber } from "./format.js";
import { unitText } from "./units.js";
import { moveEdge, moveSpan, snapEdge, snapStep, tickText } from "./periods.js";

const KIND_VARS = { task: "--band-task", background: "--band-background", break: "--band-break" };
const KIND_FALLBACK = { task: "rgba(11,110,105,0.16)", background: "rgba(79,91,107,0.16)", break: "rgba(161,98,7,0.14)" };
const CLOCK_STEPS = [60, 300, 600, 900, 1800, 3600, 7200, 10_800, 21_600, 43_200, 86_400];

/** Tick values at round clock times (whole hours, quarter hours, ...) between min and max. */
export function clockTicks(min, max, startIso, most = 9) {
  const span = Math.max(1, max - min);
  const step = CLOCK_STEPS.find((s) => span / s <= most) ?? 86_400;
  // the series start's seconds after midnight: ticks fall where the clock is a multiple of step
  const m = /T(\d{2}):(\d{2}):(\d{2})/.exec(String(startIso || ""));
  const offset = m ? Number(m[1]) * 3600 + Number(m[2]) * 60 + Number(m[3]) : 0;
  const out = [];
  for (let v = Math.ceil((min + offset) / step) * step - offset; v <= max && out.length < 100; v += step) out.push(v);
  return out;
}

function bandColour(kind) {
  return cssVar(KIND_VARS[kind] || "--band-task") || KIND_FALLBACK[kind] || KIND_FALLBACK.task;
}

/**
 * Create the chart on `canvas`. Options: onDrag(index, {start, end}) while a band moves,
 * onCommit(index, {start, end}) when it is let go. Returns a controller.
 */
export function createTimeChart(canvas, { onDrag, onCommit } = {}) {
  const state = {
    start: "", bands: [], clashes: [], log: false, hover: null, drag: null, min: 0, max: 1, unit: "",
    shownBands: "", // the bands last drawn, as JSON
  };
  const bandPlugin = {
    id: "driftdoseBands",
    beforeDatasetsDraw(chart) {
      const { ctx, chartArea: area, scales: { x } } = chart;
      if (!area) return;
      ctx.save();
      ctx.beginPath();
      ctx.rect(area.left, area.top, area.right - area.left, area.bottom - area.top);
      ctx.clip();
      ctx.font = `12px ${cssVar("--font-body") || "sans-serif"}`;
      ctx.textBaseline = "top";
      for (const band of state.bands) {
        if (band.start === null || band.end === null || band.error) continue;
        const left = x.getPixelForValue(band.start);
        const right = x.getPixelForValue(band.end);
        ctx.fillStyle = bandColour(band.kind);
        ctx.fillRect(left, area.top, right - left, area.bottom - area.top);
        const active = state.drag?.index === band.index || state.hover?.index === band.index;
        ctx.strokeStyle = cssVar("--muted") || "#555";
        ctx.lineWidth = active ? 3 : 1;
        ctx.setLineDash(band.kind === "break" ? [4, 3] : []);
        for (const px of [left, right]) {
          ctx.beginPath();
          ctx.moveTo(px, area.top);
          ctx.lineTo(px, area.bottom);
          ctx.stroke();
        }
        ctx.setLineDash([]);
        if (right - left > 24) {
          ctx.fillStyle = cssVar("--ink") || "#000";
          const text = band.label || band.kind;
          let shown = text;
          while (shown.length > 1 && ctx.measureText(shown).width > right - left - 6) shown = shown.slice(0, -1);
          if (shown !== text) shown = `${shown.slice(0, -1)}…`;
          ctx.fillText(shown, left + 3, area.top + 3 + (band.kind === "background" ? 14 : 0));
        }
      }
      // overlaps: hatched in the error colour
      ctx.strokeStyle = cssVar("--error") || "#b3261e";
      ctx.lineWidth = 1.5;
      for (const c of state.clashes) {
        const left = x.getPixelForValue(c.start);
        const right = x.getPixelForValue(c.end);
        ctx.save();
        ctx.beginPath();
        ctx.rect(left, area.top, right - left, area.bottom - area.top);
        ctx.clip();
        for (let px = left - (area.bottom - area.top); px < right; px += 8) {
          ctx.beginPath();
          ctx.moveTo(px, area.bottom);
          ctx.lineTo(px + (area.bottom - area.top), area.top);
          ctx.stroke();
        }
        ctx.restore();
      }
      ctx.restore();
    },
  };

  const chart = createChart(canvas, {
    x: {
      title: "Clock time", type: "linear",
      tick: (v) => tickText(v, state.start),
      readout: (v) => tickText(v, state.start, true),
    },
    y: { title: "Concentration", type: "linear", min: 0 },
  }, {
    readout: (ctx) => `${ctx.dataset.label}: ${formatNumber(ctx.parsed.y, 3)}${state.unit ? ` ${state.unit}` : ""}`,
    plugins: [bandPlugin],
    eager: true, // its bands are drawn over the series with chart.draw(): never a stale series
  });
  chart.options.scales.x.afterBuildTicks = (scale) => {
    // about one label per 70 px, so clock times never collide on a phone
    const most = Math.max(2, Math.floor((scale.width || 600) / 70));
    scale.ticks = clockTicks(scale.min, scale.max, state.start, most).map((value) => ({ value }));
  };
  chart.options.plugins.tooltip.filter = () => !state.drag;

  function yAxis() {
    const y = chart.options.scales.y;
    y.type = state.log ? "logarithmic" : "linear";
    y.min = state.log ? undefined : 0;
    y.suggestedMax = state.log ? undefined : y.suggestedMax;
  }

  // --- dragging ------------------------------------------------------------------------
  function valueAt(event) {
    const rect = canvas.getBoundingClientRect();
    return chart.scales.x.getValueForPixel(event.clientX - rect.left);
  }

  function hit(event) {
    const rect = canvas.getBoundingClientRect();
    const px = event.clientX - rect.left;
    const py = event.clientY - rect.top;
    const area = chart.chartArea;
    if (!area || py < area.top || py > area.bottom || px < area.left - 8 || px > area.right + 8) return null;
    const reach = event.pointerType === "touch" ? 16 : 8;
    const x = chart.scales.x;
    let best = null;
    for (const band of state.bands) {
      if (band.start === null || band.end === null || band.error) continue;
      for (const edge of ["start", "end"]) {
        const at = x.getPixelForValue(band[edge]);
        // where two bands abut, the pointer's side of the line picks the band: inside it
        const inside = edge === "start" ? px >= at : px <= at;
        const d = Math.abs(at - px) + (inside ? 0 : 0.5);
        if (d <= reach && (!best || d < best.d)) best = { index: band.index, edge, d };
      }
    }
    if (best) return best;
    // inside a band: move it whole (the shortest band wins where they overlap)
    const inside = state.bands
      .filter((b) => !b.error && b.start !== null && x.getPixelForValue(b.start) < px && px < x.getPixelForValue(b.end))
      .sort((a, b) => (a.end - a.start) - (b.end - b.start));
    return inside.length ? { index: inside[0].index, edge: "move", d: 0 } : null;
  }

  function dragTo(event) {
    const d = state.drag;
    const band = state.bands.find((b) => b.index === d.index);
    if (!band) return;
    const perPixel = (state.max - state.min) / Math.max(1, chart.chartArea.right - chart.chartArea.left);
    const step = snapStep(perPixel);
    const edges = state.bands.filter((b) => b.index !== d.index && !b.error).flatMap((b) => [b.start, b.end]);
    const tolerance = perPixel * 6;
    const options = { step, edges, tolerance, lo: state.min, hi: state.max };
    let span;
    if (d.edge === "move") {
      const delta = valueAt(event) - d.from;
      const moved = moveSpan(d.span, delta, state.min, state.max);
      const snappedStart = snapEdge(moved.start, options);
      span = moveSpan(d.span, snappedStart - d.span.start, state.min, state.max);
    } else {
      span = moveEdge(d.span, d.edge, snapEdge(valueAt(event), options), step);
    }
    band.start = span.start;
    band.end = span.end;
    d.current = span;
    chart.draw();
    if (onDrag) onDrag(d.index, span);
  }

  canvas.style.touchAction = "pan-y";
  canvas.addEventListener("pointerdown", (event) => {
    if (event.button !== 0) return;
    const h = hit(event);
    if (!h) return;
    const band = state.bands.find((b) => b.index === h.index);
    state.drag = { index: h.index, edge: h.edge, from: valueAt(event), span: { start: band.start, end: band.end }, current: null };
    canvas.setPointerCapture?.(event.pointerId);
    event.preventDefault();
    chart.draw();
  });
  canvas.addEventListener("pointermove", (event) => {
    if (state.drag) {
      dragTo(event);
      return;
    }
    const h = hit(event);
    state.hover = h;
    canvas.style.cursor = !h ? "" : h.edge === "move" ? "grab" : "ew-resize";
  });
  const finish = (event, keep) => {
    const d = state.drag;
    if (!d) return;
    state.drag = null;
    state.shownBands = ""; // the bands were moved by hand: the next setBands draws
    canvas.releasePointerCapture?.(event.pointerId);
    if (keep && d.current && onCommit) onCommit(d.index, d.current);
    else if (!keep) {
      const band = state.bands.find((b) => b.index === d.index);
      if (band) Object.assign(band, d.span);
    }
    chart.draw();
  };
  canvas.addEventListener("pointerup", (event) => finish(event, true));
  canvas.addEventListener("pointercancel", (event) => finish(event, false));
  canvas.addEventListener("pointerleave", () => {
    if (!state.drag) state.hover = null;
  });

  return {
    chart,
    /** Is a band being dragged? (its table row must not be rewritten from a reply meanwhile) */
    dragging: () => Boolean(state.drag),
    /**
     * Draw the series. `series`: {start, t_s, series: [{key, label, unit, y}]}; `extra`: more
     * series of the same form (the background file), drawn dashed.
     */
    setSeries(series, extra = null, yTitle = "") {
      state.start = series.start;
      const t = series.t_s || [];
      state.min = t.length ? t[0] : 0;
      state.max = t.length ? t[t.length - 1] : 1;
      chart.options.scales.x.min = state.min;
      chart.options.scales.x.max = state.max;
      const sets = [];
      const add = (s, list, dashed) => list.forEach((one, i) => {
        const data = new Array(s.t_s.length);
        const offset = Number(s.offset_s) || 0; // a far-field file's start after the near-field one
        for (let k = 0; k < s.t_s.length; k++) data[k] = { x: s.t_s[k] + offset, y: one.y[k] };
        const colour = seriesColour(sets.length);
        const used = one.key === "background"; // the background the engine used, per reading
        sets.push({
          label: dashed ? `${one.label} (far-field file)` : one.label, data, borderColor: used ? cssVar("--ink") : colour, backgroundColor: colour,
          pointRadius: 0, borderWidth: dashed || used ? 1.5 : 1.2, borderDash: dashed ? [5, 3] : used ? [2, 2] : [], spanGaps: false, yAxisID: "y",
        });
        if (i === 0) state.unit = unitText(one.unit || "");
      });
      add(series, series.series || [], false);
      if (extra && Array.isArray(extra.series) && Array.isArray(extra.t_s)) add(extra, extra.series, true);
      chart.options.scales.y.title.text = yTitle || (series.series?.[0] ? `${series.series[0].label}${state.unit ? ` (${state.unit})` : ""}` : "Concentration");
      yAxis();
      setDatasets(chart, sets);
    },
    /** Bands from periods.spans(); `clashes` from periods.overlaps(). Drawn only when changed. */
    setBands(bands, clashes = []) {
      if (state.drag) return;
      const next = JSON.stringify([bands, clashes]);
      if (next === state.shownBands) return;
      state.shownBands = next;
      state.bands = bands.map((b) => ({ ...b }));
      state.clashes = clashes;
      chart.draw();
    },
    /** Linear or logarithmic y; `draw` false when setSeries() follows and draws. */
    setLog(log, draw = true) {
      state.log = Boolean(log);
      yAxis();
      if (draw) chart.update("none");
    },
    /** The x range shown: [min, max] seconds from the series start. */
    range: () => [state.min, state.max],
  };
}
