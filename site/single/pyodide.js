// Stands in for pyodide/pyodide.mjs in the single-file edition (the build points imports of
// that file here). It calls the unmodified loader with two options of Pyodide 314:
// `createPyodideModule`, the Emscripten factory imported here from its embedded blob: URL
// (so the loader does not import pyodide.asm.mjs from a URL), and `lockFileContents`, the
// embedded lock file. The wasm and the standard library are still requested by the loader
// from `indexURL`; the single-file runtime's fetch() answers them from the embedded bytes.
import { loadPyodide as loadUnmodified, version } from "../pyodide/pyodide.mjs";
import createPyodideModule from "../pyodide/pyodide.asm.mjs";

export { version };

export async function loadPyodide(options = {}) {
  const indexURL = options.indexURL || new URL("../pyodide/", import.meta.url).href;
  const lock = fetch(new URL("pyodide-lock.json", indexURL)).then((r) => r.text());
  return loadUnmodified({
    ...options,
    indexURL,
    packageBaseUrl: options.packageBaseUrl || indexURL,
    lockFileContents: lock,
    createPyodideModule,
  });
}
