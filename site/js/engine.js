// Client side of the calculation worker: one promise per request, newest-only channels.
// The page never calls postMessage directly; replies are plain JSON objects from driftdose.api.

export class Engine {
  constructor(workerUrl) {
    this.worker = new Worker(workerUrl, { type: "module" });
    this.nextId = 1;
    this.pending = new Map();
    this.latest = new Map();
    this.listeners = new Set();
    this.ready = new Promise((resolve, reject) => {
      this._resolveReady = resolve;
      this._rejectReady = reject;
    });
    this.worker.addEventListener("message", (event) => this._onMessage(event.data));
    this.worker.addEventListener("error", (event) => {
      this._emit({ type: "failed", message: event.message || "The calculation engine failed to start." });
      this._rejectReady(new Error(event.message));
    });
  }

  onStatus(listener) {
    this.listeners.add(listener);
  }

  _emit(status) {
    for (const listener of this.listeners) listener(status);
  }

  _onMessage(msg) {
    if (msg.type === "progress") {
      this._emit(msg);
    } else if (msg.type === "ready") {
      this._emit(msg);
      this._resolveReady(msg);
    } else if (msg.type === "failed") {
      this._emit(msg);
      this._rejectReady(new Error(msg.message));
    } else if (msg.type === "reply") {
      const entry = this.pending.get(msg.id);
      if (!entry) return;
      this.pending.delete(msg.id);
      entry.resolve(msg.reply);
    }
  }

  /** Send one request; resolves with the reply object. */
  request(kind, inputs) {
    const id = this.nextId++;
    return new Promise((resolve) => {
      this.pending.set(id, { resolve });
      this.worker.postMessage({ id, kind, inputs });
    });
  }

  /** Turn a reply into CSV text ("results" or "curves") with the core's exporter. */
  exportCsv(reply, part) {
    const id = this.nextId++;
    return new Promise((resolve) => {
      this.pending.set(id, { resolve });
      this.worker.postMessage({ id, op: "export", reply, part });
    });
  }

  /**
   * Decode a picked file's bytes with the core's decoder; resolves with {ok, text, size,
   * size_text, encoding, notes} or {ok: false, message}. With `bytes` null (a file over
   * `limit`, never read) the reply is the refusal that names the file's size.
   */
  decodeFile(bytes, limit, name, size) {
    const id = this.nextId++;
    return new Promise((resolve) => {
      this.pending.set(id, { resolve });
      this.worker.postMessage({ id, op: "decode", bytes, limit, name, size });
    });
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
