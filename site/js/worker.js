// Module worker that owns Pyodide and the driftdose package. Messages in: {id, kind, inputs};
// out: {type: "progress"|"ready"|"failed"} or {type: "reply", id, reply}. A JSON string crosses
// into Python and back, so no Python object leaks into JavaScript.
import { loadPyodide } from "../pyodide/pyodide.mjs";

const base = new URL("../", import.meta.url);
let handleJson = null;
let exporter = null;

function progress(value, text) {
  postMessage({ type: "progress", value, text });
}

async function start() {
  const t0 = performance.now();
  progress(10, "Loading the Python runtime…");
  const infoPromise = fetch(new URL("build-info.json", base)).then((r) => r.json());
  const pyodide = await loadPyodide({ indexURL: new URL("pyodide/", base).href, packages: [] });
  const tRuntime = performance.now() - t0;
  progress(70, "Loading the aerosol models…");
  const info = await infoPromise;
  await pyodide.loadPackage(new URL(info.wheel, base).href, { messageCallback: () => {} });
  progress(90, "Preparing…");
  const api = pyodide.pyimport("driftdose.api");
  handleJson = api.handle_json;
  exporter = pyodide.pyimport("driftdose.export");
  const version = JSON.parse(handleJson(JSON.stringify({ kind: "describe" }))).version;
  postMessage({ type: "ready", version, pyodide: pyodide.version, ms: performance.now() - t0, runtimeMs: tRuntime });
}

const started = start().catch((err) => {
  postMessage({ type: "failed", message: String(err && err.message ? err.message : err) });
  throw err;
});

function exportCsv(reply, part) {
  const fn = part === "curves" ? exporter.curves_csv_json : exporter.results_csv_json;
  return { ok: true, text: fn(JSON.stringify(reply)) };
}

self.addEventListener("message", async (event) => {
  const { id, kind, inputs, op } = event.data;
  let reply;
  try {
    await started;
    reply = op === "export"
      ? exportCsv(event.data.reply, event.data.part)
      : JSON.parse(handleJson(JSON.stringify({ kind, inputs })));
  } catch (err) {
    reply = { ok: false, errors: [{ field: "", message: "The calculation engine is not available." }] };
  }
  postMessage({ type: "reply", id, reply });
});
