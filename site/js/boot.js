// Run first, as a classic script in the page's head, before the page's modules load: starts the
// calculation worker and asks for the form descriptions (forms.json), and hands the worker the
// name of this build's engine as soon as they arrive. The engine then starts while the page's
// modules load and build the forms; app.js adopts both (globalThis.driftdoseBoot). Messages the
// worker sends before that are kept and replayed in order. The single-file edition (which sets
// globalThis.driftdoseForms before the page's scripts run) starts its worker from app.js.
(() => {
  if (globalThis.driftdoseForms) return;
  // asked for once, here: app.js takes this promise (it fetches only when this script did not run)
  const forms = fetch("forms.json").then((r) => {
    if (!r.ok) throw new Error(`forms.json: HTTP ${r.status}`);
    return r.json();
  });
  forms.catch(() => {}); // app.js reports a page that cannot start
  let worker;
  try {
    if (typeof Worker === "undefined") throw new Error("no Worker");
    worker = new Worker(new URL("js/worker.js", document.baseURI), { type: "module" });
  } catch {
    globalThis.driftdoseBoot = { forms, adopt: () => null };
    return;
  }
  const kept = [];
  const keep = (event) => {
    if (event.type === "error" && event.preventDefault) event.preventDefault();
    kept.push(event);
  };
  for (const type of ["message", "error", "messageerror"]) worker.addEventListener(type, keep);
  forms.then(
    (f) => worker.postMessage({ op: "init", wheel: f.wheel }),
    () => worker.postMessage({ op: "init", wheel: undefined }),
  );
  let adopted = false;
  globalThis.driftdoseBoot = {
    forms,
    /** The started worker and the events it sent so far (once; null afterwards). */
    adopt() {
      if (adopted) return null;
      adopted = true;
      for (const type of ["message", "error", "messageerror"]) worker.removeEventListener(type, keep);
      return { worker, kept: kept.splice(0) };
    },
  };
})();
