// Client side of the calculation worker: one promise per request, newest-only channels.
// The page never calls postMessage directly; replies are plain JSON objects from driftdose.api.
//
// Nothing here may leave a panel waiting for good: inputs too deep or too big are not posted,
// a failure to post answers at once, and a worker that dies (an error event, or no sign of life
// while requests wait) answers every waiting request with a failure, reports "dead" to the
// status listeners and can be restarted (restart()) with the page's inputs untouched.
import { postRefusal } from "./intake.js";

/** A reply that says why there is no result (shown like an engine message). */
export function failureReply(message) {
  return { ok: false, errors: [{ field: "", message }], failure: true, message };
}

/** File texts at least this long are sent to the engine once, then named by their key. */
export const KEEP_CHARS = 32_768;
/** Keys of file texts remembered (the engine keeps as many; driftdose.api.kept.KEPT_TEXTS). */
const KEPT_TEXTS = 4;

export class Engine {
  /**
   * @param {URL} workerUrl the module worker
   * @param {object} options {wheel}: the wheel of this build (from forms.json; a value or a
   *   promise), so the worker never loads another build's engine into this page; {started}:
   *   a worker already started and given its wheel (boot.js), with the events it sent so far,
   *   used for the first start only
   */
  constructor(workerUrl, options = {}) {
    this.workerUrl = workerUrl;
    this.options = options;
    this.nextId = 1;
    this.pending = new Map();
    this.latest = new Map();
    this.kept = new Map(); // file text -> the engine's key for it (its SHA-256)
    this.listeners = new Set();
    this.watchdogMs = 90_000; // no sign of life from the worker for this long while a request waits: dead
    this.state = "loading";
    this._start();
  }

  _start() {
    this.state = "loading";
    this.kept.clear(); // a fresh worker holds no file text
    this.ready = new Promise((resolve, reject) => {
      this._resolveReady = resolve;
      this._rejectReady = reject;
    });
    this.ready.catch(() => {}); // failures are reported through the status listeners
    const started = this.options.started;
    this.options = { ...this.options, started: null }; // a restart starts a fresh worker
    const worker = started ? started.worker : new Worker(this.workerUrl, { type: "module" });
    this.worker = worker;
    this.lastSign = performance.now();
    worker.addEventListener("message", (event) => {
      if (this.worker !== worker) return;
      this.lastSign = performance.now();
      this._onMessage(event.data);
    });
    worker.addEventListener("error", (event) => {
      if (this.worker !== worker) return;
      if (event.preventDefault) event.preventDefault();
      const message = event.message || "the worker stopped with an error";
      if (this.state === "loading") this._failStart(message);
      else this._died(`The calculation engine stopped (${message}).`);
    });
    worker.addEventListener("messageerror", () => {
      if (this.worker === worker) this._died("The calculation engine sent a reply the page could not read.");
    });
    if (started) {
      // what the worker said before the page's modules were ready, in order; after the
      // constructor's caller has added its status listeners (a microtask runs before any later
      // message from the worker)
      queueMicrotask(() => {
        for (const event of started.kept) {
          if (this.worker !== worker) break;
          if (event.type === "message") {
            this.lastSign = performance.now();
            this._onMessage(event.data);
          } else if (event.type === "error") {
            this._failStart(event.message || "the worker stopped with an error");
          } else {
            this._died("The calculation engine sent a reply the page could not read.");
          }
        }
      });
      return;
    }
    Promise.resolve(this.options.wheel).then((wheel) => {
      if (this.worker === worker) worker.postMessage({ op: "init", wheel });
    });
  }

  onStatus(listener) {
    this.listeners.add(listener);
  }

  _emit(status) {
    for (const listener of this.listeners) listener(status);
  }

  _failStart(message) {
    if (this.state !== "loading") return;
    this.state = "failed";
    this._emit({ type: "failed", message });
    this._rejectReady(new Error(message));
    this._answerAll("The calculation engine could not start.");
  }

  _onMessage(msg) {
    if (!msg || typeof msg !== "object") return;
    if (msg.type === "progress") {
      this._emit(msg);
    } else if (msg.type === "ready") {
      this.state = "ready";
      this._emit(msg);
      this._resolveReady(msg);
    } else if (msg.type === "failed") {
      this._failStart(msg.message);
    } else if (msg.type === "warm") {
      this._emit({ type: "warm", ok: msg.ok === true, steps: Number(msg.steps) || 0, ms: Number(msg.ms) || 0 });
    } else if (msg.type === "reply") {
      const entry = this.pending.get(msg.id);
      if (!entry) return;
      this.pending.delete(msg.id);
      entry.resolve(msg.reply);
    }
  }

  /** Answer every waiting request with a failure. */
  _answerAll(message) {
    const waiting = [...this.pending.values()];
    this.pending.clear();
    for (const entry of waiting) entry.resolve(failureReply(message));
  }

  /** The worker is gone: say so, answer everything waiting, and wait for restart(). */
  _died(message) {
    if (this.state === "dead") return;
    this.state = "dead";
    clearInterval(this._watch);
    this._watch = null;
    try {
      this.worker.terminate();
    } catch {
      // already gone
    }
    this._rejectReady(new Error(message));
    this._emit({ type: "dead", message });
    this._answerAll(`${message} Restart it to update the results.`);
  }

  /** Start a fresh worker; the inputs live in the page, so nothing else is lost. */
  restart() {
    clearInterval(this._watch);
    this._watch = null;
    const old = this.worker;
    this.worker = null;
    try {
      old.terminate();
    } catch {
      // already gone
    }
    this._answerAll("The calculation engine was restarted.");
    this._emit({ type: "progress", value: 5, text: "Restarting the calculation engine…" });
    this._start();
    return this.ready;
  }

  /** Check, while requests wait, that the worker still shows signs of life. */
  _watchdog() {
    if (this._watch) return;
    this._watch = setInterval(() => {
      if (!this.pending.size) {
        clearInterval(this._watch);
        this._watch = null;
        return;
      }
      if (this.state === "ready" && performance.now() - this.lastSign > this.watchdogMs) {
        this._died(`The calculation engine stopped responding (no answer for ${Math.round(this.watchdogMs / 1000)} s).`);
      }
    }, Math.min(1000, this.watchdogMs / 4));
  }

  _post(message) {
    const id = this.nextId++;
    message.id = id;
    return new Promise((resolve) => {
      if (this.state === "dead" || this.state === "failed") {
        resolve(failureReply(this.state === "dead"
          ? "The calculation engine has stopped. Restart it to update the results."
          : "The calculation engine could not start."));
        return;
      }
      const refusal = postRefusal(message);
      if (refusal) {
        resolve(failureReply(`Not sent to the calculation engine: ${refusal}.`));
        return;
      }
      if (!this.pending.size) this.lastSign = performance.now();
      this.pending.set(id, { resolve });
      try {
        this.worker.postMessage(message);
      } catch (err) {
        this.pending.delete(id);
        resolve(failureReply(`The inputs could not be sent to the calculation engine (${String(err && err.name ? err.name : err).slice(0, 60)}).`));
        return;
      }
      this._watchdog();
    });
  }

  /**
   * Send one request; resolves with the reply object (a failure reply when it cannot run).
   * A file text of KEEP_CHARS or more that the engine already holds is named by the key the
   * engine gave it (its SHA-256; driftdose.api.kept) instead of being sent again; when the
   * engine no longer holds it (a restarted worker), the engine asks ("resend") and the request
   * goes again with the text.
   */
  async request(kind, inputs) {
    const named = {};
    let sent = inputs;
    let carries = false;
    if (inputs && typeof inputs === "object" && !Array.isArray(inputs)) {
      for (const [name, value] of Object.entries(inputs)) {
        if (typeof value !== "string" || value.length < KEEP_CHARS) continue;
        const key = this.kept.get(value);
        if (key) {
          if (sent === inputs) sent = { ...inputs };
          delete sent[name];
          named[name] = key;
        } else {
          carries = true;
        }
      }
    }
    const message = { kind, inputs: sent };
    if (carries) message.keep = true;
    if (sent !== inputs) message.kept = named;
    let reply = await this._post(message);
    if (sent !== inputs && reply && Array.isArray(reply.resend)) {
      for (const name of Object.keys(named)) this.kept.delete(inputs[name]);
      reply = await this._post({ kind, inputs, keep: true });
    }
    if (reply && reply.kept && typeof reply.kept === "object") {
      for (const [name, key] of Object.entries(reply.kept)) {
        const text = inputs?.[name];
        if (typeof text !== "string" || text.length < KEEP_CHARS || typeof key !== "string") continue;
        this._remember(text, key);
      }
    }
    if (reply && typeof reply === "object") delete reply.kept;
    return reply;
  }

  /**
   * A shown reply as CSV text ("results" or "curves") with the header block naming the tool
   * version, date, calculation and inputs: the engine's request kind "export" (the same door as
   * every calculation). `bom` starts the text with a byte-order mark for spreadsheets.
   */
  exportCsv(calculation, inputs, reply, part, bom = true) {
    return this.request("export", { calculation, part, inputs, reply, bom });
  }

  /**
   * Decode a picked file's bytes with the core's decoder; resolves with {ok, text, size,
   * size_text, encoding, notes} or {ok: false, message}. With `bytes` null (a file over
   * `limit`, never read) the reply is the refusal that names the file's size.
   */
  async decodeFile(bytes, limit, name, size) {
    // a text long enough to be named is kept by the engine as it is decoded (api.kept)
    const keep = Boolean(bytes && bytes.length >= KEEP_CHARS);
    const reply = await this._post({ op: "decode", bytes, limit, name, size, ...(keep ? { keep } : {}) });
    if (reply && typeof reply === "object" && reply.ok && typeof reply.kept === "string" && typeof reply.text === "string") {
      if (reply.text.length >= KEEP_CHARS) this._remember(reply.text, reply.kept);
      delete reply.kept;
    }
    return reply;
  }

  /** Note that the engine holds `text` under `key` (the newest KEPT_TEXTS are remembered). */
  _remember(text, key) {
    this.kept.delete(text);
    this.kept.set(text, key);
    while (this.kept.size > KEPT_TEXTS) this.kept.delete(this.kept.keys().next().value);
  }

  /** The invented demo shift generated by the core: {ok, id, label, note, series, background, periods}. */
  shiftDemo() {
    return this._post({ op: "shift_demo" });
  }

  /**
   * Describe a decoded measured file with the core's reader: resolves with {ok, table,
   * pickers} or {ok: false, field, message, line} (see driftdose.api.files).
   */
  describeTable(purpose, text, headerLine) {
    return this._post({ op: "table", purpose, text, header_line: headerLine });
  }

  /**
   * Send a request on a named channel; resolves with the reply, or with null when a newer
   * request on the same channel was sent meanwhile (the page keeps only the newest answer).
   */
  async latestOn(channel, kind, inputs) {
    const token = {};
    this.latest.set(channel, token);
    const reply = await this.request(kind, inputs);
    return this.latest.get(channel) === token ? reply : null;
  }
}
