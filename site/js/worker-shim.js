// Imported first by worker.js, so it runs before Pyodide's own module code. Pyodide tells a
// classic worker from a module worker by calling importScripts("data:text/javascript,"); in a
// module worker that call only throws, but Firefox first checks it against the page's
// Content-Security-Policy (which allows no data: scripts) and logs a violation. Throwing here,
// as the browser would, gives Pyodide the same answer without the refused load.
if (typeof globalThis.WorkerGlobalScope !== "undefined" && typeof globalThis.importScripts === "function") {
  globalThis.importScripts = () => {
    throw new TypeError("importScripts() cannot be used in a module worker.");
  };
}
