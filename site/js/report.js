// The printable record of the calculation shown: built from the panel's last valid inputs and
// reply, shown only in print (the browser's "Save as PDF" makes the file). Survey details, every
// input with its unit and valid range, the result tables as they are on screen, the charts,
// warnings, published methods, cautions, imported files with their SHA-256, and the link (with
// a QR code when it is short enough) and the inputs fingerprint. Everything is inserted as text.
import { el } from "./forms.js";
import { SURVEY_FIELDS } from "./survey.js";
import { drawNow } from "./charts.js";

export const CAUTIONS = [
  "These are screening estimates from published models, each valid only within the stated ranges.",
  "They are not a substitute for measurement or for professional judgment.",
  "Local regulations, exposure limits and licensed practice take precedence.",
];
export const LINK_PRINT_MAX = 4000; // longer links (an imported file inside) are not printed
export const QR_MAX = 1800; // characters of link in a QR code of at most 7 cm with 0.4 mm modules
export const LINK_PIECE = 24; // printed pieces: the line breaks only between them

/**
 * Split a link into pieces of at most `width` characters for printing, breaking only at safe
 * places: after "&" (between inputs) first, otherwise never inside a %XX escape. Joined again,
 * the pieces give the link unchanged.
 */
export function linkPieces(link, width = LINK_PIECE) {
  const pieces = [];
  for (const part of link.split(/(?<=&)/)) {
    let rest = part;
    while (rest.length > width) {
      let cut = width;
      // a cut inside "%XX" moves back to before the "%"
      const pct = rest.lastIndexOf("%", cut - 1);
      if (pct >= 0 && pct > cut - 3) cut = pct;
      if (cut <= 0) cut = width;
      pieces.push(rest.slice(0, cut));
      rest = rest.slice(cut);
    }
    if (rest) pieces.push(rest);
  }
  return pieces;
}

/**
 * Fill `target` with the record of `controller` (a CalcPanel). `info`: {version, pyodide,
 * survey, fingerprint, link}.
 */
export function buildReport(target, controller, info) {
  const now = new Date();
  const title = controller.opts.title;
  const parts = [
    el("h1", {}, `Drift & Dose screening record — ${title}`),
    el("p", { class: "report-meta" },
      `Printed ${isoMinutes(now)} UTC (${now.toLocaleString()}) with Drift & Dose ${info.version || "(version unknown)"}, calculation engine Pyodide ${info.pyodide || "(not loaded)"}. Inputs fingerprint ${info.fingerprint} (the same as in the saved inputs file).`),
  ];
  parts.push(surveyTable(info.survey || {}));
  const reply = controller.lastGood;
  if (controller.demoLabel) {
    parts.push(el("p", { class: "report-demo" },
      `Invented demo data: ${controller.demoLabel}. These inputs are not a measurement.`));
  }
  const cautions = el("section", { class: "report-cautions", "aria-label": "Cautions" });
  cautions.append(el("h2", {}, "Cautions"));
  const list = el("ul");
  for (const c of CAUTIONS) list.append(el("li", {}, c));
  cautions.append(list);
  parts.push(cautions);
  if (!reply) {
    parts.push(el("p", {}, "No valid result for this calculation yet."));
  } else {
    if (controller.isStale()) {
      parts.push(el("p", { class: "report-demo" },
        "The current inputs are not valid; this record shows the last valid inputs and their results."));
    }
    parts.push(...panelRecord(controller, reply));
  }
  parts.push(linkSection(info));
  target.replaceChildren(...parts);
  target.dataset.panel = controller.opts.id;
}

function isoMinutes(date) {
  return date.toISOString().slice(0, 16).replace("T", " ");
}

/** The page-margin line (date, tool version, fingerprint) printed on every page. */
export function footerText(info, now = new Date()) {
  return `Drift & Dose ${info.version || ""} · printed ${isoMinutes(now)} UTC · inputs ${info.fingerprint}`;
}

function surveyTable(survey) {
  const section = el("section", { class: "report-survey", "aria-label": "Survey details" });
  const table = el("table", { class: "results survey-table" });
  table.append(el("caption", {}, "Survey details"));
  const body = el("tbody");
  for (let i = 0; i < SURVEY_FIELDS.length; i += 2) {
    const tr = el("tr");
    for (const [name, label] of SURVEY_FIELDS.slice(i, i + 2)) {
      tr.append(el("th", { scope: "row" }, label), el("td", {}, survey[name] || "—"));
    }
    body.append(tr);
  }
  table.append(body);
  section.append(table);
  return section;
}

function panelRecord(controller, reply) {
  const parts = [];
  parts.push(el("h2", {}, "Inputs"));
  const inputs = el("table", { class: "results report-inputs" });
  const head = el("thead");
  const hr = el("tr");
  for (const h of ["Input", "Value", "Unit", "Valid range"]) hr.append(el("th", { scope: "col" }, h));
  head.append(hr);
  const body = el("tbody");
  for (const row of controller.describeInputs(controller.lastGoodInputs)) {
    const tr = el("tr");
    tr.append(el("th", { scope: "row" }, row.label), el("td", {}, row.value), el("td", { class: "unit" }, row.unit),
      el("td", { class: "range" }, keepUnits(row.range || "")));
    body.append(tr);
  }
  inputs.append(head, body);
  parts.push(inputs);
  const files = controller.importedFiles ? controller.importedFiles() : [];
  if (files.length) {
    parts.push(el("h3", {}, "Imported files"));
    const ul = el("ul", { class: "report-files" });
    for (const f of files) {
      ul.append(el("li", {}, `${f.name} — ${f.size.toLocaleString()} bytes, SHA-256 ${f.sha256}${f.from === "text" ? " (of the text as UTF-8; the original file was not opened on this page)" : ""}`));
    }
    parts.push(ul);
  }
  parts.push(el("h2", {}, "Results"));
  // the same tables as on screen (stage details included), copied as they are
  const details = el("div", { class: "report-details" });
  for (const table of controller.body.querySelectorAll("table")) {
    if (table.closest("[hidden]")) continue;
    const copy = table.cloneNode(true);
    copy.removeAttribute("id");
    for (const node of copy.querySelectorAll("[id]")) node.removeAttribute("id");
    const inDetails = table.closest("details");
    if (inDetails) {
      // the summary line names the stage and its flow regime
      const summary = inDetails.querySelector("summary");
      if (copy.caption && summary) copy.caption.textContent = summary.textContent;
      details.append(copy);
    } else if (copy.tBodies[0] && copy.tBodies[0].rows.length > SPLIT_ROWS) parts.push(splitTable(copy));
    else {
      copy.classList.add("report-keep");
      parts.push(copy);
    }
  }
  if (details.childElementCount) parts.push(el("h3", {}, "Stage details"), details);
  for (const node of controller.body.querySelectorAll(".spectrum-summary, .record-note")) {
    if (!node.closest("[hidden]")) parts.push(el("p", { class: "report-note" }, node.textContent));
  }
  const charts = el("div", { class: "report-charts" });
  for (const canvas of controller.root.querySelectorAll("canvas")) {
    const src = chartImage(canvas);
    if (!src) continue;
    const figure = el("figure", { class: "report-figure" });
    figure.append(el("img", { class: "report-chart", src, alt: canvas.getAttribute("aria-label") || "Chart" }));
    const caption = canvas.closest("figure")?.querySelector("figcaption");
    if (caption) figure.append(el("figcaption", {}, caption.textContent));
    charts.append(figure);
  }
  if (charts.childElementCount) parts.push(charts);
  if (reply.warnings && reply.warnings.length) {
    parts.push(el("h2", {}, "Warnings raised"));
    const ul = el("ul", { class: "report-warnings" });
    for (const w of reply.warnings) ul.append(el("li", {}, w));
    parts.push(ul);
  }
  parts.push(el("h2", {}, "Models, sources and validity"));
  if (controller.opts.validity) parts.push(el("p", { class: "report-validity" }, controller.opts.validity));
  const ol = el("ol", { class: "report-sources" });
  for (const s of reply.sources || []) ol.append(el("li", {}, s.citation));
  parts.push(ol);
  return parts;
}

const SPLIT_ROWS = 24;

/** A long table (a row per size bin) printed as two halves side by side, each with the head. */
function splitTable(table) {
  const rows = [...table.tBodies[0].rows];
  const half = Math.ceil(rows.length / 2);
  const box = el("div", { class: "report-split" });
  if (table.caption) box.append(el("p", { class: "report-caption" }, table.caption.textContent));
  for (const part of [rows.slice(0, half), rows.slice(half)]) {
    const copy = table.cloneNode(false);
    if (table.tHead) copy.append(table.tHead.cloneNode(true));
    const body = el("tbody");
    body.append(...part);
    // the flag column in short: a mark only where the correction is unreliable
    for (const cell of body.querySelectorAll('td[data-col="flag"]')) {
      cell.textContent = cell.textContent.startsWith("⚠") ? "⚠ unreliable" : "";
    }
    copy.append(body);
    box.append(copy);
  }
  return box;
}

/** A number and its unit kept on one line ("500 °C"). */
function keepUnits(text) {
  return text.replace(/(\d) (?=\S)/g, "$1\u00a0");
}

function linkSection(info) {
  const section = el("section", { class: "report-link", "aria-label": "Link to these inputs" });
  section.append(el("h2", {}, "Link to these inputs"));
  const link = info.link || "";
  const box = el("div", { class: "report-link-box" });
  if (info.linkDropped) {
    section.append(el("p", { class: "report-note" },
      "The imported file is too large to travel in a link: the link below carries the other inputs; the saved inputs file keeps everything."));
  }
  if (link.length <= LINK_PRINT_MAX) {
    const text = el("p", { class: "report-url" });
    linkPieces(link).forEach((piece, i) => {
      if (i) text.append(document.createElement("wbr"));
      text.append(el("span", {}, piece));
    });
    box.append(text);
    const qr = link.length <= QR_MAX ? qrImage(link) : null;
    if (qr) {
      // about 0.4 mm a module, so that a phone reads the printed code
      const side = `${Math.min(7, (qr.modules + 8) * 0.04).toFixed(2)}cm`;
      const img = el("img", { class: "report-qr", src: qr.src, alt: "QR code of the link to these inputs" });
      img.style.width = side;
      img.style.height = side;
      box.prepend(img);
    } else {
      section.append(el("p", { class: "report-note" }, `The link has ${link.length.toLocaleString()} characters, too many for a QR code that prints reliably; use the saved inputs file.`));
    }
  } else {
    box.append(el("p", { class: "report-note" },
      `The link has ${link.length.toLocaleString()} characters (it carries an imported file) and is not printed. Keep the saved inputs file (“Save inputs (JSON)”); its fingerprint is ${info.fingerprint}.`));
  }
  section.append(box);
  section.append(el("p", { class: "report-note" },
    `Opening the link, or loading the saved inputs file, reproduces every input and result of this record. Inputs fingerprint ${info.fingerprint}: the first 12 hex digits of the SHA-256 of this calculation's inputs and the survey details, as the saved inputs file lists it.`));
  return section;
}

/**
 * QR code of `text` (vendored qrcode-generator, error correction L, smallest version that
 * holds it) as {src: GIF data URL, modules}, or null if it does not fit.
 */
function qrImage(text) {
  const make = window.qrcode;
  if (!make) return null;
  try {
    const qr = make(0, "L");
    qr.addData(text, "Byte");
    qr.make();
    return { src: qr.createDataURL(4, 4), modules: qr.getModuleCount() };
  } catch {
    return null;
  }
}

/**
 * PNG data URL of the chart on `canvas`. A chart in a panel that was never shown has no size
 * yet; it is drawn once more, off screen, at a fixed size from the same data and options.
 */
function chartImage(canvas) {
  const Chart = window.Chart;
  const chart = Chart && Chart.getChart(canvas);
  drawNow(chart); // a chart out of view may wait for its redraw
  if (canvas.width && canvas.height) return canvas.toDataURL("image/png");
  if (!chart) return "";
  const spare = document.createElement("canvas");
  spare.width = 960;
  spare.height = 480;
  const copy = new Chart(spare, {
    type: chart.config.type,
    data: JSON.parse(JSON.stringify(chart.config.data)),
    options: { ...chart.config.options, responsive: false, animation: false, devicePixelRatio: 1 },
    plugins: chart.config.plugins,
  });
  const url = spare.toDataURL("image/png");
  copy.destroy();
  return url;
}
