// Module worker started once, when the service worker first takes control of the page (app.js):
// it loads the engine's script (pyodide.asm.mjs, 1.25 MB) through the service worker, so that
// Chromium keeps the compiled code beside the cached copy and the next visit starts from that
// code instead of compiling the script again. Loading only defines the engine's factory; nothing
// of the engine runs here.
import "../pyodide/pyodide.asm.mjs";

// The browser stores the compiled code in a task after the module has run; app.js ends this
// worker on the message, so it waits a moment first (nothing waits on it: the page is ready).
setTimeout(() => postMessage("warm"), 500);
