// Module worker that owns Pyodide and the driftdose package. Messages in: {id, kind, inputs};
// out: {type: "progress"|"ready"|"failed"} or {type: "reply", id, reply}. A JSON string crosses
// into Python and back, so no Python object leaks into JavaScript.
import { loadPyodide } from "../pyodide/pyodide.mjs";

const base = new URL("../", import.meta.url);
let handleJson = null;

function progress(value, text) {
  postMessage({ type: "progress", value, text });
}

async function start() {
  const t0 = performance.now();
  progress(10, "Loading the Python runtime…");
  const infoPromise = fetch(new URL("build-info.json", base)).then((r) => r.json());
  const pyodide = await loadPyodide({ indexURL: new URL("pyodide/", base).href, packages: [] });
  progress(70, "Loading the aerosol models…");
  const info = await infoPromise;
  await pyodide.loadPackage(new URL(info.wheel, base).href, { messageCallback: () => {} });
  progress(90, "Preparing…");
  const api = pyodide.pyimport("driftdose.api");
  handleJson = api.handle_json;
  const version = JSON.parse(handleJson(JSON.stringify({ kind: "describe" }))).version;
  postMessage({ type: "ready", version, pyodide: pyodide.version, ms: performance.now() - t0 });
}

const started = start().catch((err) => {
  postMessage({ type: "failed", message: String(err && err.message ? err.message : err) });
  throw err;
});

self.addEventListener("message", async (event) => {
  const { id, kind, inputs } = event.data;
  let reply;
  try {
    await started;
    reply = JSON.parse(handleJson(JSON.stringify({ kind, inputs })));
  } catch (err) {
    reply = { ok: false, errors: [{ field: "", message: "The calculation engine is not available." }] };
  }
  postMessage({ type: "reply", id, reply });
});
