// Runtime of the single-file edition (written into the page by `python build.py --single-file`).
//
// The build stores every file of the served edition in the page as base64 text inside
// non-executing <script type="application/octet-stream"> elements (gzip-compressed where that
// pays), with a manifest. This module makes those bytes look like the served folder, so the
// page's own modules run unchanged:
// - paths are "virtual": relative to the folder of the HTML file, exactly as in dist/, and are
//   answered from the embedded bytes, never from disk or network;
// - our ES modules become blob: URLs; the build has replaced each relative import specifier by
//   "@@dd-module:<path>@@" and each module-URL expression by "@@dd-url:<path>@@", and here those
//   tokens become the dependency's blob: URL and the module's virtual URL;
// - fetch() is replaced by one that answers embedded paths and refuses everything else
//   (blob: and data: URLs pass through), in the page and in the worker;
// - a worker made from an embedded module (the calculation worker) starts as a small classic
//   worker from a blob: URL, receives the embedded (still encoded) files in its first message,
//   decodes only what it asks for, and imports the module as above.
// This module must import nothing and not ask for its own URL: the inline loader starts it as is.

const TOKEN = /@@dd-(module|url):([^@"'`\s]+)@@/g;
const NOT_EMBEDDED = "is not part of the single-file edition, and this page never uses the network";

function decodeBase64(text) {
  if (typeof Uint8Array.fromBase64 === "function") return Uint8Array.fromBase64(text);
  const bin = atob(text);
  const out = new Uint8Array(bin.length);
  for (let i = 0; i < bin.length; i++) out[i] = bin.charCodeAt(i);
  return out;
}

/** The embedded files: path -> {gzip, type, tokens}; `read(path)` gives the base64 text. */
class Embedded {
  constructor(base, files, read) {
    this.base = base;
    this.files = files;
    this.read = read;
    this.modules = new Map();
  }

  /** Path of `url` inside the embedded tree, or null. */
  pathOf(url) {
    const u = new URL(url, this.base);
    u.search = "";
    u.hash = "";
    if (!u.href.startsWith(this.base)) return null;
    const path = decodeURIComponent(u.href.slice(this.base.length));
    return Object.hasOwn(this.files, path) ? path : null;
  }

  /** The file's bytes as a stream (gzip) or a Uint8Array. */
  async body(path) {
    const bytes = decodeBase64(await this.read(path));
    if (!this.files[path].gzip) return bytes;
    return new Blob([bytes]).stream().pipeThrough(new DecompressionStream("gzip"));
  }

  async response(path) {
    const headers = { "Content-Type": this.files[path].type };
    return new Response(await this.body(path), { status: 200, statusText: "OK", headers });
  }

  async blob(path, type = this.files[path].type) {
    const data = await (await this.response(path)).arrayBuffer();
    return new Blob([data], { type });
  }

  async text(path) {
    return (await this.response(path)).text();
  }

  /** blob: URL of the module at `path`, its dependencies made first (the build forbids cycles).
   * With a `prologue` (source put before the module's own), a separate copy is made. */
  moduleUrl(path, prologue = "") {
    const key = prologue ? `${path}\n${prologue}` : path;
    if (!this.modules.has(key)) this.modules.set(key, this._makeModule(path, prologue));
    return this.modules.get(key);
  }

  async _makeModule(path, prologue = "") {
    const info = this.files[path];
    if (!info) throw new Error(`module ${path} ${NOT_EMBEDDED}`);
    if (!info.tokens && !prologue) return URL.createObjectURL(await this.blob(path, "text/javascript"));
    const source = prologue + (await this.text(path));
    const urls = new Map();
    for (const [, kind, target] of source.matchAll(TOKEN)) {
      if (kind === "module" && !urls.has(target)) urls.set(target, this.moduleUrl(target));
    }
    for (const [target, promise] of urls) urls.set(target, await promise);
    const resolved = source.replace(TOKEN, (_, kind, target) =>
      kind === "module" ? urls.get(target) : new URL(target, this.base).href);
    return URL.createObjectURL(new Blob([resolved], { type: "text/javascript" }));
  }

  /** A fetch() that answers embedded paths, passes blob:/data: on, and refuses the rest. */
  fetchFunction(realFetch, relativeTo) {
    return (input, init) => {
      let url;
      try {
        url = new URL(input instanceof Request ? input.url : String(input), relativeTo);
      } catch (err) {
        return Promise.reject(err);
      }
      if (url.protocol === "blob:" || url.protocol === "data:") return realFetch(input, init);
      const path = this.pathOf(url);
      if (path === null) return Promise.reject(new TypeError(`${url.href} ${NOT_EMBEDDED}`));
      return this.response(path);
    };
  }
}

function fail(err) {
  console.error(err);
  document.documentElement.dataset.engine = "failed";
  const text = document.getElementById("engine-text");
  if (text) text.textContent = `The page could not start: ${err && err.message ? err.message : err}`;
}

/**
 * Body of the calculation worker's entry script, run as a classic worker from a blob: URL (a
 * module worker made from a blob: URL does not start in a page opened from file://, and a
 * worker there cannot read the page's blob: URLs). The first message carries this module's
 * source and the embedded files; later messages are held until the worker module has loaded.
 */
function workerEntry() {
  const held = [];
  let started = false;
  const hold = (event) => {
    event.stopImmediatePropagation();
    if (started) {
      held.push(event.data);
      return;
    }
    started = true;
    const init = event.data;
    const release = () => {
      self.removeEventListener("message", hold);
      for (const data of held) self.dispatchEvent(new MessageEvent("message", { data }));
    };
    import(URL.createObjectURL(new Blob([init.runtime], { type: "text/javascript" })))
      .then((runtime) => runtime.startWorker(init))
      .then(() => postMessage({ ddWorker: "started" }))
      // WebKit refuses module scripts in a worker of a file:// page: the page runs it instead
      .catch((err) => postMessage({ ddWorker: "refused", message: String(err) }))
      .finally(release);
  };
  self.addEventListener("message", hold);
}

/** Called in the worker by workerEntry: fetch() from the embedded files, then the module. */
export async function startWorker(init) {
  const embedded = new Embedded(init.base, init.files, async (path) => init.files[path].text);
  globalThis.fetch = embedded.fetchFunction(globalThis.fetch.bind(globalThis), init.base);
  await import(await embedded.moduleUrl(init.entry));
}

/**
 * What the page sees as the calculation worker: the real worker, or (where the browser refuses
 * the worker's modules, as WebKit does for a file:// page) the same module run in the page
 * with a worker-like scope. Messages sent before the worker says which are held and replayed.
 */
class WorkerOrPage extends EventTarget {
  constructor(worker, startPage) {
    super();
    this.worker = worker;
    this.mode = "waiting";
    this.held = [];
    worker.addEventListener("error", (event) => {
      this.dispatchEvent(new ErrorEvent("error", { message: event.message, error: event.error }));
    });
    worker.addEventListener("message", (event) => {
      const data = event.data;
      if (data && data.ddWorker === "refused") {
        worker.terminate();
        console.warn(`The calculation runs in the page: ${data.message}`);
        this.mode = "page";
        startPage(this).then((scope) => {
          this.scope = scope;
          for (const held of this.held.splice(0)) scope.receive(held);
        }).catch((err) => {
          this.dispatchEvent(new MessageEvent("message", { data: { type: "failed", message: String(err && err.message ? err.message : err) } }));
        });
        return;
      }
      if (data && data.ddWorker === "started") {
        this.mode = "worker";
        this.held.length = 0;
        return;
      }
      this.dispatchEvent(new MessageEvent("message", { data }));
    });
  }

  postMessage(data) {
    if (this.mode === "page") {
      if (this.scope) this.scope.receive(data);
      else this.held.push(data);
      return;
    }
    if (this.mode === "waiting") this.held.push(data); // replayed in the page if need be
    this.worker.postMessage(data);
  }

  terminate() {
    this.worker.terminate();
  }
}

/** The worker module run in the page: its `self` and `postMessage` are a worker-like scope. */
async function startInPage(embedded, path, front) {
  const scope = new EventTarget();
  scope.front = front;
  scope.receive = (data) => {
    const copy = structuredClone(data);
    setTimeout(() => scope.dispatchEvent(new MessageEvent("message", { data: copy })));
  };
  scope.postMessage = (data) => {
    const copy = structuredClone(data);
    setTimeout(() => scope.front.dispatchEvent(new MessageEvent("message", { data: copy })));
  };
  globalThis.__ddWorkerScope = scope;
  const prologue = "const self = globalThis.__ddWorkerScope;\n"
    + "const postMessage = (data) => self.postMessage(data);\n";
  await import(await embedded.moduleUrl(path, prologue));
  return scope;
}

/**
 * Start the page: fetch(), Worker (for embedded worker modules only) and the forms hook of
 * app.js (globalThis.driftdoseForms), then the page's scripts in document order.
 * `manifest` = {runtime, files, scripts: [{path, module}], forms}.
 */
export async function startPage(manifest) {
  try {
    const base = new URL(".", document.baseURI).href;
    const files = manifest.files;
    const element = (path) => document.getElementById(files[path].id);
    const embedded = new Embedded(base, files, async (path) => element(path).textContent);
    globalThis.fetch = embedded.fetchFunction(globalThis.fetch.bind(globalThis), document.baseURI);
    globalThis.driftdoseForms = JSON.parse(await embedded.text(manifest.forms));
    const runtime = await embedded.text(manifest.runtime);
    const entry = URL.createObjectURL(new Blob([`(${workerEntry})();\n`], { type: "text/javascript" }));
    const NativeWorker = globalThis.Worker;
    globalThis.Worker = class EmbeddedWorker extends NativeWorker {
      constructor(url, options = {}) {
        const path = embedded.pathOf(url);
        if (path === null || !files[path].tokens) {
          super(url, options);
          return;
        }
        super(entry, { name: options.name || path });
        const sent = {};
        for (const [name, info] of Object.entries(files)) {
          sent[name] = { ...info, text: element(name).textContent };
        }
        super.postMessage({ runtime, base, entry: path, files: sent });
        return new WorkerOrPage(this, (front) => startInPage(embedded, path, front));
      }
    };
    for (const script of manifest.scripts) {
      if (script.module) {
        await import(await embedded.moduleUrl(script.path));
      } else {
        const url = URL.createObjectURL(await embedded.blob(script.path, "text/javascript"));
        await new Promise((resolve, reject) => {
          const tag = document.createElement("script");
          tag.src = url;
          tag.onload = resolve;
          tag.onerror = () => reject(new Error(`script ${script.path} did not load`));
          document.head.append(tag);
        });
      }
    }
  } catch (err) {
    fail(err);
  }
}
