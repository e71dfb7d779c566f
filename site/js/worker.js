// Module worker that owns Pyodide and the driftdose package. Messages in: first {op: "init",
// wheel} (the wheel of the page's own build, named in its forms.json), then {id, kind, inputs}
// (an export is the kind "export" of the same door, driftdose.api.handle) or {id, op:
// "decode", ...}; out: {type: "progress"|"ready"|"failed"} or {type:
// "reply", id, reply}. A JSON string crosses into Python and back, so no Python object leaks
// into JavaScript.
//
// Versions never mix: the engine is the page's own wheel. build-info.json (which may already
// describe a newer deployment) is used for the snapshot only when it names that same wheel;
// a wheel missing from the server means the server holds another build, and the worker says so.
//
// Nothing waits for what it does not need: build-info.json is asked for as the worker starts,
// the page's wheel is checked while the snapshot loads, and the page (boot.js) sends the wheel
// before its own modules have loaded. Phase marks (ms since the epoch) go with "ready".
//
// Start-up: when build-info.json names a memory snapshot (the engine started at build time with
// the package imported, see build.py), the engine restores it instead of starting Python. The
// engine refuses a snapshot of another engine build; this worker refuses one whose stamp differs
// from build-info.json. Either refusal, or any failure, falls back to the normal start: start
// Python, install the wheel, import the package. The standard library and the wheel hold
// bytecode compiled at build time, so the normal start compiles nothing either.
import "./worker-shim.js"; // first: before Pyodide's module code runs
import { loadPyodide } from "../pyodide/pyodide.mjs";
import { expandSparse } from "./sparse.js";

const base = new URL("../", import.meta.url);
const indexURL = new URL("pyodide/", base).href;
let handleJson = null;
let textfile = null;
let fileDescriber = null;
// phase marks, in ms since the page's time origin's epoch (performance.timeOrigin + now())
const marks = { workerStart: stamp() };

function stamp() {
  return performance.timeOrigin + performance.now();
}

function progress(value, text) {
  postMessage({ type: "progress", value, text });
}

let init;
const initialised = new Promise((resolve) => {
  init = resolve;
});
// the deployed build's description, asked for at once (used only if it names the page's wheel)
const served = fetch(new URL("build-info.json", base))
  .then((r) => r.json())
  .catch(() => ({}));

/** The page's own wheel, checked to be on the server. */
async function ownWheel(path) {
  if (typeof path !== "string" || !/^wheels\/[\w.+-]+\/[\w.+-]+\.whl$/.test(path) || path.includes("..")) {
    throw new Error("this page does not name its engine; reload the page");
  }
  const response = await fetch(new URL(path, base));
  marks.wheelAnswered = stamp();
  if (!response.ok) {
    throw new Error(response.status === 404
      ? "the server now holds another version of Drift & Dose than this page; reload the page to use it"
      : `the engine could not be loaded (HTTP ${response.status})`);
  }
  await response.arrayBuffer();
  return path;
}

async function fromSnapshot(info) {
  const snapshot = fetch(new URL(info.snapshot.file, base))
    .then((r) => {
      if (!r.ok) throw new Error(`snapshot: HTTP ${r.status}`);
      return r.arrayBuffer();
    })
    .then((buffer) => {
      marks.snapshotFetched = stamp();
      return expandSparse(buffer);
    });
  snapshot.catch(() => {}); // handled where loadPyodide awaits it; not an unhandled rejection
  const pyodide = await loadPyodide({
    indexURL,
    packages: [],
    _loadSnapshot: snapshot,
    fsInit: async () => { marks.engineStarted = stamp(); },
  });
  marks.bootstrapped = stamp();
  const found = pyodide.globals.get("DRIFTDOSE_SNAPSHOT");
  if (found !== info.snapshot.stamp) {
    throw new Error(`snapshot stamp ${found} does not match this build (${info.snapshot.stamp})`);
  }
  // the snapshot holds the build's random state: draw fresh seeds from the browser. (The hash
  // secret of str and bytes cannot change once objects exist; it stays the build's fixed one.)
  pyodide.runPython("import sys\nif 'random' in sys.modules: sys.modules['random'].seed()");
  return pyodide;
}

async function normalStart(info) {
  const pyodide = await loadPyodide({
    indexURL,
    packages: [],
    fsInit: async () => { marks.engineStarted = stamp(); },
  });
  marks.bootstrapped = stamp();
  progress(70, "Loading the aerosol models…");
  const problems = [];
  await pyodide.loadPackage(new URL(info.wheel, base).href, { messageCallback: () => {}, errorCallback: (m) => problems.push(m) });
  if (problems.length) throw new Error(`the engine could not be installed: ${String(problems[0]).slice(0, 200)}`);
  return pyodide;
}

async function start() {
  const t0 = performance.now();
  progress(10, "Loading the Python runtime…");
  const wheel = (await initialised).wheel;
  marks.initReceived = stamp();
  const wheelChecked = ownWheel(wheel);
  wheelChecked.catch(() => {}); // awaited below, before anything is used
  const deployed = await served;
  marks.infoFetched = stamp();
  // the snapshot only when build-info.json describes this page's build (same wheel)
  const info = typeof wheel === "string" && deployed.wheel === wheel ? deployed : { wheel };
  let pyodide = null;
  let how = "normal";
  let refused = "";
  if (info.snapshot) {
    try {
      pyodide = await fromSnapshot(info);
      how = "snapshot";
    } catch (err) {
      refused = String(err && err.message ? err.message : err);
      console.warn(`Engine snapshot not used (${refused}); starting the engine normally.`);
    }
  }
  // the page's own engine is on the server, or nothing is used (a missing wheel: the server
  // holds another build; the page says so)
  await wheelChecked;
  if (!pyodide) pyodide = await normalStart(info);
  const tRuntime = performance.now() - t0;
  progress(90, "Preparing…");
  const api = pyodide.pyimport("driftdose.api");
  handleJson = api.handle_json;
  textfile = pyodide.pyimport("driftdose.textfile");
  fileDescriber = pyodide.pyimport("driftdose.api.files");
  const version = pyodide.runPython("import driftdose\ndriftdose.__version__");
  marks.packageImported = stamp();
  postMessage({
    type: "ready", version, pyodide: pyodide.version, ms: performance.now() - t0, runtimeMs: tRuntime,
    start: how, refused, marks,
  });
}

const started = start().catch((err) => {
  postMessage({ type: "failed", message: String(err && err.message ? err.message : err) });
  throw err;
});

// A file the user picked, as bytes: decoded by the core's one decoder (driftdose.textfile),
// the same the command line uses, so a file reads alike in both.
function decodeFile({ bytes, limit, name, size }) {
  // undefined, not null: Pyodide turns undefined into None (null becomes its own jsnull)
  return JSON.parse(textfile.decode_text_json(bytes ?? undefined, limit, name, size));
}

// A decoded file described for the page (table found, preview, column pickers) by the core's
// measured-file reader (driftdose.tables, through driftdose.api.files).
function describeTable({ purpose, text, header_line: headerLine }) {
  return JSON.parse(fileDescriber.describe_file_json(String(purpose), typeof text === "string" ? text : "", Number(headerLine) || 0));
}

self.addEventListener("message", async (event) => {
  if (!event.data || typeof event.data !== "object") return;
  const { id, kind, inputs, op } = event.data;
  if (op === "init") {
    init(event.data);
    return;
  }
  let reply;
  try {
    await started;
    if (op === "decode") reply = decodeFile(event.data);
    else if (op === "table") reply = describeTable(event.data);
    else reply = JSON.parse(handleJson(JSON.stringify({ kind, inputs })));
  } catch (err) {
    const message = "The calculation engine is not available.";
    reply = { ok: false, errors: [{ field: "", message }], message };
  }
  postMessage({ type: "reply", id, reply });
});
