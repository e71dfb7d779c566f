// The page's engine client adopting a worker that boot.js started before the page's modules
// loaded: the events that worker sent meanwhile reach the status listeners in order, nothing
// is posted twice, and a restart starts a fresh worker of its own with the page's wheel.
import { test } from "node:test";
import assert from "node:assert/strict";

class FakeWorker extends EventTarget {
  static made = [];
  constructor(url, options) {
    super();
    this.url = String(url);
    this.options = options;
    this.posted = [];
    this.terminated = false;
    FakeWorker.made.push(this);
  }
  postMessage(data) {
    this.posted.push(data);
  }
  terminate() {
    this.terminated = true;
  }
}
globalThis.Worker = FakeWorker;
const { Engine } = await import("../../site/js/engine.js");

function message(data) {
  const event = new Event("message");
  event.data = data;
  return event;
}

test("an adopted worker's kept events reach listeners added after construction, in order", async () => {
  FakeWorker.made.length = 0;
  const worker = new FakeWorker("boot", { type: "module" });
  const kept = [
    message({ type: "progress", value: 10, text: "Loading" }),
    message({ type: "ready", version: "1", marks: {} }),
  ];
  const engine = new Engine("worker.js", { wheel: "wheels/x/y.whl", started: { worker, kept } });
  const seen = [];
  engine.onStatus((status) => seen.push(status.type));
  const ready = await engine.ready;
  assert.equal(ready.version, "1");
  assert.deepEqual(seen, ["progress", "ready"]);
  assert.equal(engine.state, "ready");
  assert.equal(FakeWorker.made.length, 1, "no second worker");
  assert.deepEqual(worker.posted, [], "boot.js already sent the wheel");
  // later messages go through the engine's own listeners: a reply reaches its request
  const answer = engine.request("motion", {});
  const { id } = worker.posted.at(-1);
  worker.dispatchEvent(message({ type: "reply", id, reply: { ok: true } }));
  assert.deepEqual(await answer, { ok: true });
});

test("a kept failure fails the start; a restart makes a fresh worker and sends the wheel", async () => {
  FakeWorker.made.length = 0;
  const worker = new FakeWorker("boot", { type: "module" });
  const kept = [message({ type: "failed", message: "the server now holds another version" })];
  const engine = new Engine("worker.js", { wheel: Promise.resolve("wheels/x/y.whl"), started: { worker, kept } });
  const seen = [];
  engine.onStatus((status) => seen.push(status));
  await assert.rejects(engine.ready, /another version/);
  assert.equal(seen[0].type, "failed");
  const restarted = engine.restart();
  const fresh = FakeWorker.made.at(-1);
  assert.notEqual(fresh, worker);
  assert.equal(worker.terminated, true);
  await Promise.resolve();
  await Promise.resolve();
  assert.deepEqual(fresh.posted, [{ op: "init", wheel: "wheels/x/y.whl" }]);
  fresh.dispatchEvent(message({ type: "ready", version: "2" }));
  assert.equal((await restarted).version, "2");
});

test("without boot.js the engine starts its own worker and sends the wheel", async () => {
  FakeWorker.made.length = 0;
  const engine = new Engine("worker.js", { wheel: "wheels/a/b.whl" });
  assert.equal(FakeWorker.made.length, 1);
  await Promise.resolve();
  assert.deepEqual(FakeWorker.made[0].posted, [{ op: "init", wheel: "wheels/a/b.whl" }]);
  engine.restart();
});
