// Page start-up: build the panels from the published field descriptions, start the engine,
// keep the URL fragment in step with the inputs, show loading progress, and offer the record
// tools (copy link, save/load inputs, printable report) and the offline service worker.
import { Engine } from "./engine.js";
import { el } from "./forms.js";
import { download, readText, stamp, useDecoder } from "./files.js";
import { buildReport, footerText } from "./report.js";
import { fingerprint } from "./digest.js";
import { mountSurvey } from "./survey.js";
import { STATE_VERSION, decodeState, encodeState } from "./state.js";
import * as motion from "./panels/motion.js";
import * as deposition from "./panels/deposition.js";
import * as sampling from "./panels/sampling.js";

export const PANELS = [motion, deposition, sampling];
const STATE_FORMAT = "drift-and-dose-inputs";

const root = document.documentElement;
export const engine = new Engine(new URL("./worker.js", import.meta.url));
useDecoder((bytes, limit, name, size) => engine.decodeFile(bytes, limit, name, size));
export const controllers = new Map();
let active = PANELS[0].id;
let engineInfo = { version: "", pyodide: "" };
let survey = null;

engine.onStatus((status) => {
  const text = document.getElementById("engine-text");
  const bar = document.getElementById("engine-progress");
  if (status.type === "progress") {
    text.textContent = status.text;
    bar.value = status.value;
  } else if (status.type === "ready") {
    engineInfo = { version: status.version, pyodide: status.pyodide };
    root.dataset.engineMs = String(Math.round(status.ms));
    root.dataset.runtimeMs = String(Math.round(status.runtimeMs));
    root.dataset.engineStart = status.start; // "snapshot" or "normal" (see worker.js)
    root.dataset.engineMarks = JSON.stringify(status.marks || {});
    root.dataset.engine = "ready";
    text.textContent = "Ready — results update as you type.";
    bar.value = 100;
    bar.hidden = true;
    document.getElementById("pyodide-version").textContent = status.pyodide;
  } else if (status.type === "failed") {
    root.dataset.engine = "failed";
    text.textContent = `The calculation engine could not start: ${status.message}`;
    bar.hidden = true;
  }
});

function showPanel(pid, focus = false) {
  active = pid;
  for (const p of PANELS) {
    const selected = p.id === pid;
    const tab = document.getElementById(`tab-${p.id}`);
    tab.setAttribute("aria-selected", String(selected));
    tab.tabIndex = selected ? 0 : -1;
    document.getElementById(`panel-${p.id}`).hidden = !selected;
  }
  if (focus) document.getElementById(`tab-${pid}`).focus();
  writeState();
}

function allInputs() {
  const panels = {};
  for (const [pid, controller] of controllers) panels[pid] = controller.getState();
  return panels;
}

/**
 * Fingerprint of one calculation's inputs with the survey details: the first 12 hex digits of
 * SHA-256 of the canonical JSON of {kind, inputs, survey}. The saved inputs file lists it for
 * every panel, and the record prints the one of its panel.
 */
function panelFingerprint(pid, panels, surveyValues) {
  return fingerprint({ kind: pid, inputs: panels[pid], survey: surveyValues });
}

function writeState() {
  const survey_ = survey ? survey.get() : {};
  const panels = Object.keys(survey_).length ? { ...allInputs(), survey: survey_ } : allInputs();
  history.replaceState(null, "", `#${encodeState(active, panels)}`);
  const dropped = encodeState.dropped || [];
  document.getElementById("link-size-note").hidden = dropped.length === 0;
}

function notice(message) {
  const box = document.getElementById("link-notice");
  box.textContent = message;
  box.hidden = !message;
}

function toolMessage(message) {
  document.getElementById("tool-message").textContent = message;
}

/** Apply a decoded state {panel, panels}; unknown panels and fields are reported, not fatal. */
function applyState(state, origin) {
  const ignored = [];
  // survey details: "survey" beside "panels" in a saved file, survey.<name> entries in a link
  const fromLink = state.panels && Object.hasOwn(state.panels, "survey") ? state.panels.survey : undefined;
  const surveyRaw = Object.hasOwn(state, "survey") ? state.survey : fromLink;
  if (surveyRaw !== undefined && survey) {
    for (const name of survey.set(surveyRaw)) ignored.push(`survey.${name}`);
  }
  for (const [pid, values] of Object.entries(state.panels || {})) {
    if (pid === "survey") continue;
    const controller = controllers.get(pid);
    if (!controller || typeof values !== "object" || values === null) {
      ignored.push(pid);
      continue;
    }
    for (const name of Object.keys(values)) {
      if (!controller.knows(name)) ignored.push(`${pid}.${name}`);
    }
    controller.setState(values);
  }
  if (state.panel && controllers.has(state.panel)) showPanel(state.panel);
  const problems = [];
  if (state.version !== undefined && String(state.version) !== STATE_VERSION) {
    problems.push(`${origin} was made by another version of the tool (format ${String(state.version).slice(0, 12)}); its inputs were loaded as far as they still apply.`);
  }
  if (ignored.length) problems.push(`Ignored unknown entries: ${ignored.slice(0, 6).join(", ").slice(0, 200)}.`);
  if (problems.length) notice(`${problems.join(" ")} Check the inputs before relying on the results.`);
}

function setupTools() {
  document.getElementById("copy-link").addEventListener("click", async () => {
    writeState();
    try {
      await navigator.clipboard.writeText(location.href);
      toolMessage("Link copied. It reproduces every input on this page.");
    } catch {
      toolMessage(`Copy this link: ${location.href}`);
    }
  });
  document.getElementById("save-inputs").addEventListener("click", () => {
    const panels = allInputs();
    const surveyValues = survey.get();
    const fingerprints = Object.fromEntries(Object.keys(panels).map((pid) => [pid, panelFingerprint(pid, panels, surveyValues)]));
    const state = { format: STATE_FORMAT, version: Number(STATE_VERSION), tool_version: engineInfo.version,
      saved: new Date().toISOString(), fingerprints, panel: active, panels, survey: surveyValues };
    download(`drift-dose-inputs-${stamp()}.json`, `${JSON.stringify(state, null, 1)}\n`, "application/json");
    toolMessage("Inputs saved as a JSON file.");
  });
  document.getElementById("load-inputs").addEventListener("change", async (event) => {
    const file = event.target.files[0];
    event.target.value = "";
    if (!file) return;
    try {
      const text = await readText(file, 1024 * 1024);
      let data;
      try {
        data = JSON.parse(text);
      } catch {
        // the parser's own message quotes the file's text; say plainly what is wrong instead
        throw new Error("it is not a valid JSON file (a Drift & Dose inputs file is JSON text)");
      }
      if (!data || data.format !== STATE_FORMAT || typeof data.panels !== "object") {
        throw new Error("it is not a Drift & Dose inputs file");
      }
      notice("");
      applyState(data, "The file");
      toolMessage(`Loaded inputs from ${file.name.slice(0, 80)}.`);
    } catch (err) {
      toolMessage(`Could not load ${file.name.slice(0, 80)}: ${err.message.replace(/\.$/, "")}.`);
    }
  });
  document.getElementById("print-report").addEventListener("click", () => {
    prepareReport();
    window.print();
  });
  window.addEventListener("beforeprint", prepareReport);
}

let pageStyle = null;

function prepareReport() {
  writeState();
  const panels = allInputs();
  const surveyValues = survey.get();
  // the record's link carries this calculation's inputs and the survey details only
  const linkState = { [active]: panels[active], ...(Object.keys(surveyValues).length ? { survey: surveyValues } : {}) };
  const link = `${location.href.split("#")[0]}#${encodeState(active, linkState)}`;
  const info = {
    ...engineInfo, survey: surveyValues, fingerprint: panelFingerprint(active, panels, surveyValues), link,
    linkDropped: (encodeState.dropped || []).length > 0,
  };
  buildReport(document.getElementById("report"), controllers.get(active), info);
  // date, version and fingerprint in the page margin of every printed page (CSS paged media);
  // a constructed style sheet, which the page's Content-Security-Policy allows
  const text = footerText(info).replace(/["\\\n]/g, " ");
  if (!pageStyle && "adoptedStyleSheets" in document) {
    pageStyle = new CSSStyleSheet();
    document.adoptedStyleSheets = [...document.adoptedStyleSheets, pageStyle];
  }
  if (pageStyle) pageStyle.replaceSync(`@page { @bottom-left { content: "${text}"; } }`);
}

function setupServiceWorker(build) {
  if (!("serviceWorker" in navigator) || location.protocol !== "http:" && location.protocol !== "https:") return;
  const banner = document.getElementById("update-banner");
  const hadController = Boolean(navigator.serviceWorker.controller);
  navigator.serviceWorker.register(`sw.js?build=${encodeURIComponent(build)}`).then((reg) => {
    const offer = (worker) => {
      if (!worker || !hadController) return;
      banner.hidden = false;
      document.getElementById("update-reload").onclick = () => worker.postMessage("skip-waiting");
    };
    if (reg.waiting) offer(reg.waiting);
    reg.addEventListener("updatefound", () => {
      const worker = reg.installing;
      worker.addEventListener("statechange", () => {
        if (worker.state === "installed") offer(worker);
      });
    });
  }).catch(() => {});
  let reloading = false;
  navigator.serviceWorker.addEventListener("controllerchange", () => {
    if (hadController && !reloading) {
      reloading = true;
      location.reload();
    }
  });
}

async function start() {
  const forms = globalThis.driftdoseForms || await (await fetch("forms.json")).json();
  document.getElementById("app-version").textContent = forms.version;
  const tabs = document.getElementById("panel-tabs");
  const panels = document.getElementById("panels");
  for (const p of PANELS) {
    const tab = el("button", {
      type: "button", role: "tab", id: `tab-${p.id}`, "aria-controls": `panel-${p.id}`,
    }, p.title);
    tab.addEventListener("click", () => showPanel(p.id));
    tab.addEventListener("keydown", (e) => {
      const i = PANELS.findIndex((q) => q.id === p.id);
      if (e.key === "ArrowRight") showPanel(PANELS[(i + 1) % PANELS.length].id, true);
      if (e.key === "ArrowLeft") showPanel(PANELS[(i - 1 + PANELS.length) % PANELS.length].id, true);
    });
    tabs.append(tab);
    const section = el("section", { id: `panel-${p.id}`, role: "tabpanel", "aria-labelledby": `tab-${p.id}`, class: "panel" });
    panels.append(section);
    const controller = p.mount(section, { engine, description: forms.calculations[p.kind || p.id] });
    controller.onChange(() => writeState());
    controllers.set(p.id, controller);
  }
  survey = mountSurvey(document.getElementById("survey"));
  survey.onChange(() => writeState());
  setupTools();
  const state = decodeState(location.hash);
  if (state) applyState(state, "This link");
  showPanel(active);
  try {
    await engine.ready;
  } catch {
    return;
  }
  for (const controller of controllers.values()) controller.schedule();
  // precaching the build for offline use downloads everything once more: start it only when
  // the page is ready, so it never competes with the first load
  if (!globalThis.driftdoseForms) {
    fetch("build-info.json").then((r) => r.json()).then((info) => setupServiceWorker(info.build)).catch(() => {});
  }
}

start().catch((err) => {
  root.dataset.engine = "failed";
  document.getElementById("engine-text").textContent = `The page could not start: ${err.message}`;
});
