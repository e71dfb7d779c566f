// Page start-up: build the panels from the published field descriptions, start the engine,
// keep the URL fragment in step with the inputs, and show the engine's loading progress.
import { Engine } from "./engine.js";
import { el } from "./forms.js";
import { STATE_VERSION, decodeState, encodeState } from "./state.js";
import * as motion from "./panels/motion.js";

const PANELS = [motion];

const root = document.documentElement;
export const engine = new Engine(new URL("./worker.js", import.meta.url));
const controllers = new Map();
let active = PANELS[0].id;

engine.onStatus((status) => {
  const text = document.getElementById("engine-text");
  const bar = document.getElementById("engine-progress");
  if (status.type === "progress") {
    text.textContent = status.text;
    bar.value = status.value;
  } else if (status.type === "ready") {
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
    document.getElementById(`tab-${p.id}`).setAttribute("aria-selected", String(selected));
    document.getElementById(`tab-${p.id}`).tabIndex = selected ? 0 : -1;
    document.getElementById(`panel-${p.id}`).hidden = !selected;
  }
  if (focus) document.getElementById(`tab-${pid}`).focus();
  writeState();
}

function writeState() {
  const panels = {};
  for (const [pid, controller] of controllers) panels[pid] = controller.getState();
  history.replaceState(null, "", `#${encodeState(active, panels)}`);
}

function notice(message) {
  const box = document.getElementById("link-notice");
  box.textContent = message;
  box.hidden = !message;
}

async function start() {
  const forms = await (await fetch("forms.json")).json();
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
  const state = decodeState(location.hash);
  if (state) {
    if (state.version !== STATE_VERSION) {
      notice("This link was made by another version of the tool; its inputs were loaded as far as they still apply. Check them before relying on the results.");
    }
    for (const [pid, values] of Object.entries(state.panels)) controllers.get(pid)?.fields.setValues(values);
    if (state.panel && controllers.has(state.panel)) active = state.panel;
  }
  showPanel(active);
  try {
    await engine.ready;
  } catch {
    return;
  }
  for (const controller of controllers.values()) controller.schedule();
}

start().catch((err) => {
  root.dataset.engine = "failed";
  document.getElementById("engine-text").textContent = `The page could not start: ${err.message}`;
});
