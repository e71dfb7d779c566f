// Page start-up: build the panels from the published field descriptions, start the engine,
// keep the URL fragment in step with the inputs, show loading progress, and offer the record
// tools (copy link, save/load inputs, printable report) and the offline service worker.
import { Engine } from "./engine.js";
import { el } from "./forms.js";
import { download, readText, stamp, useDecoder, useDescriber } from "./files.js";
import { buildReport, footerText } from "./report.js";
import { fingerprint } from "./digest.js";
import { STATE_FORMAT, STATE_VERSION, acceptedNotice, decodeFragment, readInputsFile, refusedNotice, schemaFrom } from "./intake.js";
import { SURVEY_FIELDS, mountSurvey } from "./survey.js";
import { encodeState } from "./state.js";
import { coalesced } from "./later.js";
import { setToolVersion } from "./charts.js";
import { setUnitTable } from "./units.js";
import * as motion from "./panels/motion.js";
import * as deposition from "./panels/deposition.js";
import * as sampling from "./panels/sampling.js";
import * as shift from "./panels/shift.js";
import { mountSections } from "./panels/burden.js";

export const PANELS = [motion, deposition, sampling, shift];
// sections shown with the deposition tab, with their own inputs in links and files
const SECTIONS = [{ id: "burden", kind: "burden" }, { id: "ranges", kind: "uncertainty" }];
// an inputs file holds at most two imported spectra at their own limit (5 MB each) and the rest
const INPUTS_FILE_BYTES = 12 * 1024 * 1024;

const root = document.documentElement;
// the field descriptions and the name of this build's engine (the single-file edition embeds
// them); boot.js, run before the page's modules, has usually asked for them and started the worker
const boot = globalThis.driftdoseBoot;
const formsLoaded = globalThis.driftdoseForms
  ? Promise.resolve(globalThis.driftdoseForms)
  : boot ? boot.forms : fetch("forms.json").then((r) => r.json());
export const engine = new Engine(new URL("./worker.js", import.meta.url), {
  wheel: formsLoaded.then((forms) => forms.wheel, () => undefined),
  started: boot ? boot.adopt() : null,
});
useDecoder((bytes, limit, name, size) => engine.decodeFile(bytes, limit, name, size));
useDescriber((purpose, text, headerLine) => engine.describeTable(purpose, text, headerLine));
export const controllers = new Map();
let active = PANELS[0].id;
let engineInfo = { version: "", pyodide: "" };
let survey = null;
let schema = null; // the declared fields of every panel and the survey (intake.js)
let loadGeneration = 0; // the last inputs file chosen wins over one still being read
let pageFailed = false; // the page itself could not start: a later engine status must not hide it

engine.onStatus((status) => {
  const text = document.getElementById("engine-text");
  const bar = document.getElementById("engine-progress");
  const restart = document.getElementById("engine-restart");
  if (pageFailed) return;
  if (status.type === "progress") {
    root.dataset.engine = "loading";
    text.textContent = status.text;
    bar.value = status.value;
    bar.hidden = false;
    restart.hidden = true;
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
  } else if (status.type === "warm") {
    // the engine's warm-up ran (worker.js); nothing to show, a mark for the speed figures
    root.dataset.engineWarm = status.ok ? `${status.steps} requests, ${Math.round(status.ms)} ms` : "stopped";
  } else if (status.type === "failed") {
    root.dataset.engine = "failed";
    text.textContent = `The calculation engine could not start: ${status.message}`;
    bar.hidden = true;
    if (/another version/.test(status.message)) offerReload(null);
  } else if (status.type === "dead") {
    // the worker died or stopped answering: say so, keep the inputs, offer a fresh engine
    root.dataset.engine = "stopped";
    text.textContent = `${status.message} Your inputs are kept.`;
    bar.hidden = true;
    restart.hidden = false;
  }
});

async function restartEngine() {
  document.getElementById("engine-restart").hidden = true;
  try {
    await engine.restart();
  } catch {
    return; // the status says why
  }
  for (const controller of controllers.values()) controller.schedule();
}

/** Show the update banner; its button activates `worker` (a waiting service worker) or reloads. */
function offerReload(worker) {
  document.getElementById("update-banner").hidden = false;
  document.getElementById("update-reload").onclick = () => {
    if (worker) worker.postMessage("skip-waiting");
    else location.reload();
  };
}

function showPanel(pid, focus = false) {
  active = pid;
  for (const p of PANELS) {
    const selected = p.id === pid;
    const tab = document.getElementById(`tab-${p.id}`);
    tab.setAttribute("aria-selected", String(selected));
    tab.tabIndex = selected ? 0 : -1;
    document.getElementById(`panel-${p.id}`).hidden = !selected;
  }
  // sections that belong to a tab but live outside its panel element (their own controllers)
  for (const more of document.querySelectorAll("[data-follows]")) more.hidden = more.dataset.follows !== pid;
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

function writeLink() {
  const survey_ = survey ? survey.get() : {};
  const panels = Object.keys(survey_).length ? { ...allInputs(), survey: survey_ } : allInputs();
  const fragment = `#${encodeState(active, panels)}`;
  // replacing the address costs about a millisecond per kilobyte of link: not when it is the same
  if (location.hash !== fragment) history.replaceState(null, "", fragment);
  const dropped = encodeState.dropped || [];
  document.getElementById("link-size-note").hidden = dropped.length === 0;
}

// The link in the address bar follows the inputs off the input path. Replacing the address
// costs the page about a millisecond per kilobyte of link and the browser's own process 15-30
// ms more, which on a two-core machine slows the engine computing the edit, so the link is
// written once the edits and their results have paused for LINK_QUIET_MS (each edit and each
// shown result asks for it: linkWriter.schedule), and at once (flush) whenever something may
// read it: the page losing focus (the address bar, another window or tab), being hidden or
// left, the copy, save and print tools. A result can be on screen for that quiet spell before
// its link, never when the link is read.
const LINK_QUIET_MS = 400;
const linkWriter = coalesced(writeLink, { delay: LINK_QUIET_MS, restart: true });
const writeState = linkWriter.now;

/** The notice at the top of the page about the last link or file read ("" hides it). */
function notice(message) {
  const box = document.getElementById("link-notice");
  box.textContent = message;
  box.hidden = !message;
}

function toolMessage(message) {
  document.getElementById("tool-message").textContent = message;
}

/**
 * Apply a link or file read by intake.js (its keys are those the panels and the survey declare;
 * `decoded.ok` is true). Every panel's inputs and the survey are kept first: should applying
 * fail, they are put back, so a link or file is applied whole or not at all. Returns "" or the
 * reason it was not applied.
 */
function applyState(decoded) {
  const before = new Map();
  for (const [pid, controller] of controllers) before.set(pid, controller.getState());
  const surveyBefore = survey.get();
  const shown = active;
  try {
    if (Object.hasOwn(decoded.panels, "survey")) survey.set(decoded.panels.survey);
    for (const pid of Object.keys(decoded.panels)) {
      if (pid !== "survey") controllers.get(pid).setState(decoded.panels[pid]);
    }
    if (decoded.panel && controllers.has(decoded.panel)) showPanel(decoded.panel);
    return "";
  } catch (err) {
    for (const [pid, values] of before) {
      try {
        controllers.get(pid).setState(values);
      } catch {
        // the panel keeps what it shows; the notice says why
      }
    }
    try {
      survey.set(surveyBefore);
    } catch {
      // as above
    }
    showPanel(shown);
    return `it could not be applied (${String(err && err.message ? err.message : "unknown error").slice(0, 120)})`;
  }
}

/**
 * Read and apply a link (the address bar's, or the fragment a navigation within the page went
 * to), with a notice when anything was refused. A fragment that is not a link (an anchor) is
 * left alone. Returns whether the fragment was a link (applied or refused).
 */
function applyLink(hash = location.hash) {
  const decoded = decodeFragment(hash, schema);
  if (!decoded) return false;
  if (!decoded.ok) {
    notice(refusedNotice(decoded, "This link"));
    return true;
  }
  const failure = applyState(decoded);
  notice(failure ? refusedNotice({ error: failure }, "This link") : acceptedNotice(decoded, "This link"));
  return true;
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
    linkWriter.flush();
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
    const generation = ++loadGeneration;
    const name = file.name.slice(0, 80);
    const refuse = (why) => {
      toolMessage(`Could not load ${name}: ${why.replace(/\.$/, "")}.`);
      notice(`The file ${name} was refused: ${why.replace(/\.$/, "")}. Nothing was changed; the page works with the inputs it had.`);
    };
    let text;
    try {
      text = await readText(file, INPUTS_FILE_BYTES);
    } catch (err) {
      if (generation === loadGeneration) refuse(err.message);
      return;
    }
    if (generation !== loadGeneration) return; // a later choice is being read
    const decoded = readInputsFile(text, schema);
    if (!decoded.ok) {
      refuse(decoded.error);
      return;
    }
    const failure = applyState(decoded);
    if (failure) {
      refuse(failure);
      return;
    }
    notice(acceptedNotice(decoded, "The file"));
    toolMessage(`Loaded inputs from ${name}.`);
  });
  document.getElementById("print-report").addEventListener("click", () => {
    prepareReport();
    window.print();
  });
  window.addEventListener("beforeprint", prepareReport);
  window.addEventListener("pagehide", linkWriter.flush);
  window.addEventListener("blur", linkWriter.flush);
  document.addEventListener("visibilitychange", () => {
    if (document.visibilityState === "hidden") linkWriter.flush();
  });
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
  const hadController = Boolean(navigator.serviceWorker.controller);
  navigator.serviceWorker.register(`sw.js?build=${encodeURIComponent(build)}`).then((reg) => {
    const offer = (worker) => {
      if (worker && hadController) offerReload(worker);
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
    } else if (!hadController) {
      warmEngineCode();
    }
  });
}

/**
 * The first time the service worker takes control (the first visit, once everything is cached):
 * load the engine's script once through it in a short-lived worker, so that the browser keeps
 * its compiled code with the cached copy and the next visit does not compile it again.
 * `data-engine-code="warm"` on the root says it is done.
 */
function warmEngineCode() {
  let worker;
  try {
    worker = new Worker(new URL("./warm.js", import.meta.url), { type: "module" });
  } catch {
    return;
  }
  const done = () => {
    worker.terminate();
    root.dataset.engineCode = "warm";
  };
  worker.addEventListener("message", done);
  worker.addEventListener("error", (event) => {
    event.preventDefault();
    worker.terminate();
  });
}

async function start() {
  const forms = await formsLoaded;
  setUnitTable(forms.units);
  document.getElementById("app-version").textContent = forms.version;
  setToolVersion(forms.version);
  // a panel whose calculation this build's engine does not describe is left out
  PANELS.splice(0, PANELS.length, ...PANELS.filter((p) => forms.calculations[p.kind || p.id]));
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
    const controller = p.mount(section, { engine, description: forms.calculations[p.kind || p.id], forms });
    controller.onChange(linkWriter.schedule);
    controller.onShown(linkWriter.schedule);
    controllers.set(p.id, controller);
  }
  survey = mountSurvey(document.getElementById("survey"));
  survey.onChange(linkWriter.schedule);
  // retained burden and dose ranges: sections of the deposition tab, fed by its inputs
  if (controllers.has("deposition") && forms.calculations.burden && forms.calculations.uncertainty) {
    const more = el("div", { id: "panel-deposition-more", class: "panel-more", "data-follows": "deposition", hidden: "" });
    document.getElementById("panel-deposition").after(more);
    const sections = mountSections(more,
      { engine, forms, deposition: controllers.get("deposition") });
    for (const controller of sections) {
      controller.onChange(linkWriter.schedule);
      controller.onShown(linkWriter.schedule);
      controllers.set(controller.opts.id, controller);
    }
  }
  schema = schemaFrom(forms, [...PANELS, ...SECTIONS], { survey: SURVEY_FIELDS.map(([name]) => name) });
  setupTools();
  applyLink();
  // A link pasted into the address bar of the open page differs only after the "#", so the
  // browser stays on the page: it is read as a link opened anew (refused whole, with the
  // notice, or applied whole). Its own fragment is taken from the event, not the address bar,
  // which a pending write of the page's link could replace first. Afterwards the address bar
  // is given the link of what the page shows (a refused link must not stay there to be copied).
  // The page's own writes (history.replaceState) do not raise this event.
  window.addEventListener("hashchange", (event) => {
    if (applyLink(new URL(event.newURL).hash)) linkWriter.schedule();
  });
  showPanel(active);
  try {
    await engine.ready;
  } catch {
    return;
  }
  for (const controller of controllers.values()) controller.schedule();
  // precaching the build for offline use downloads everything once more: start it only when
  // the page is ready, so it never competes with the first load
  // the deployed build is asked for past every cache (HTTP cache, service worker, proxies), or a
  // new deployment on a host without cache headers would go unnoticed
  if (!globalThis.driftdoseForms) {
    fetch(`build-info.json?at=${Date.now()}`, { cache: "no-store" })
      .then((r) => r.json())
      .then((info) => setupServiceWorker(info.build))
      .catch(() => {});
  }
}

document.getElementById("engine-restart").addEventListener("click", restartEngine);

start().catch((err) => {
  pageFailed = true;
  root.dataset.engine = "failed";
  document.getElementById("engine-text").textContent = `The page could not start: ${err.message}`;
});
