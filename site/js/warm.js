// Module worker started once, when the service worker first takes control of the page (app.js):
// it loads the engine's script (pyodide.asm.mjs, 1.25 MB) through the service worker, so that
// Chromium keeps the compiled code beside the cached copy and the next visit starts from that
// code instead of compiling the script again. It also calls the engine's Emscripten factory
// with an `instantiateWasm` hook that never answers: the factory runs up to the point where it
// asks for the WebAssembly and waits there, so its own code (most of what a start compiles of
// the script) is compiled too and kept with the rest (traced: 620 KB of code kept instead of
// 20 KB, and the second visit's factory ran in 40 ms instead of 130-340). Nothing of the engine
// itself runs: no WebAssembly, no Python.
import createEngineModule from "../pyodide/pyodide.asm.mjs";

try {
  createEngineModule({ instantiateWasm: () => ({}) }).catch(() => {});
} catch {
  // only the compiled code is wanted
}
// Chromium stores the compiled code in a task after the module has run; app.js ends this worker
// on the message, so it waits a moment first (nothing waits on it: the page is ready).
setTimeout(() => postMessage("warm"), 500);
