// The sampling panel's corrected spectrum: summary, a table filled a slice per task and a
// log-log chart of measured and corrected concentration, with unreliable bins marked.
// Presentation only: every number comes from the reply.
import { el } from "../forms.js";
import { chartFigure, createChart, decadeTicks, seriesColour, setAxes, setDatasets } from "../charts.js";
import { axisTitle, curvePoints, readout } from "../chartparts.js";
import { formatNumber, lengthTick } from "../format.js";
import { toSI, unitLabel, unitText } from "../units.js";

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

/**
 * The corrected-spectrum section; `scenario()` names the inputs on a saved chart image. Returns
 * {section, render(table, curves, shared)}: `table` the reply's spectrum_table (none hides the
 * section), `curves` its spectrum curves, `shared` the reply's whole curves (shared axes).
 */
export function spectrumView(scenario) {
  let spectrumChart = null;
  let spectrumUnit = ""; // read by the spectrum chart's readout, which outlives one reply
  const spectrumSection = el("section", { class: "spectrum-result", "aria-labelledby": "sampling-spectrum-title", hidden: "" });
  const spectrumTitle = el("h3", { id: "sampling-spectrum-title" }, "Measured spectrum corrected for the chain's losses");
  const spectrumSummary = el("p", { class: "spectrum-summary" });
  const spectrumTableBox = el("div", { class: "table-box spectrum-table-box", tabindex: "0", role: "region", "aria-label": "Corrected spectrum table" });
  const spectrumFigure = chartFigure("sampling-spectrum",
    "Measured and corrected concentration per size bin. Bins the chain passes with less than 50 % are drawn as large triangles: their correction is unreliable.",
    "Save spectrum chart image", "drift-dose-sampling-spectrum.png", () => spectrumChart,
    () => ({ title: "Measured spectrum corrected for the chain's losses", scenario: scenario() }));
  spectrumSection.append(spectrumTitle, spectrumSummary, spectrumTableBox);

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

  return { section: spectrumSection, render: renderSpectrum };
}
