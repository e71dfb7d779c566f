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

// A picked file's text goes to the engine once; later requests name it by the engine's key
// (driftdose.api.kept); an engine that no longer holds it asks again and gets the text.
async function readyEngine() {
  const worker = new FakeWorker("boot", { type: "module" });
  const kept = [message({ type: "ready", version: "1", marks: {} })];
  const engine = new Engine("worker.js", { wheel: "wheels/x/y.whl", started: { worker, kept } });
  await engine.ready;
  return { engine, worker };
}

async function answer(worker, reply) {
  await new Promise((r) => setTimeout(r, 0));
  const { id } = worker.posted.at(-1);
  worker.dispatchEvent(message({ type: "reply", id, reply }));
}

test("a long file text is sent once, then named by its key; a resend request sends it again", async () => {
  const { engine, worker } = await readyEngine();
  const text = "Time,Number\n" + "2026-03-10 08:00:00,1\n".repeat(3000);
  const small = "a,b\n1,2\n";
  const inputs = { series_text: text, background_text: small, periods: [] };

  let pending = engine.request("shift", inputs);
  await answer(worker, { ok: true, kept: { series_text: "k1", background_text: "k2" } });
  let reply = await pending;
  let sent = worker.posted.at(-1);
  assert.equal(sent.inputs.series_text, text, "the first request carries the text");
  assert.equal(sent.keep, true);
  assert.equal(sent.kept, undefined);
  assert.deepEqual(reply, { ok: true }, "the keys are not part of the shown reply");

  pending = engine.request("shift", { ...inputs, periods: [1] });
  await answer(worker, { ok: true, results: { n: 2 } });
  reply = await pending;
  sent = worker.posted.at(-1);
  assert.equal("series_text" in sent.inputs, false, "the text is not sent again");
  assert.deepEqual(sent.kept, { series_text: "k1" });
  assert.equal(sent.inputs.background_text, small, "a short text is always sent");
  assert.equal(sent.keep, undefined);
  assert.deepEqual(sent.inputs.periods, [1]);
  assert.deepEqual(reply, { ok: true, results: { n: 2 } });
  assert.equal(inputs.series_text, text, "the caller's inputs are not changed");

  // the engine no longer holds it: the same request goes again with the text
  const before = worker.posted.length;
  pending = engine.request("shift", inputs);
  await answer(worker, { ok: false, errors: [{ field: "series_text", message: "again" }], resend: ["series_text"] });
  await answer(worker, { ok: true, kept: { series_text: "k3" } });
  reply = await pending;
  assert.equal(worker.posted.length, before + 2);
  assert.equal(worker.posted.at(-1).inputs.series_text, text);
  assert.equal(worker.posted.at(-1).keep, true);
  assert.deepEqual(reply, { ok: true });
  pending = engine.request("shift", inputs);
  await answer(worker, { ok: true });
  await pending;
  assert.deepEqual(worker.posted.at(-1).kept, { series_text: "k3" }, "the new key is used");
});

test("a restarted engine is sent the text again", async () => {
  const { engine, worker } = await readyEngine();
  const text = "x".repeat(40_000);
  let pending = engine.request("shift", { series_text: text });
  await answer(worker, { ok: true, kept: { series_text: "k1" } });
  await pending;
  engine.restart();
  const fresh = FakeWorker.made.at(-1);
  assert.notEqual(fresh, worker);
  fresh.dispatchEvent(message({ type: "ready", version: "1", marks: {} }));
  await engine.ready;
  pending = engine.request("shift", { series_text: text });
  await answer(fresh, { ok: true });
  await pending;
  const sent = fresh.posted.at(-1);
  assert.equal(sent.inputs.series_text, text);
  assert.equal(sent.kept, undefined);
});

test("a long picked file is kept as it is decoded: the first request names it, never posts it", async () => {
  const { engine, worker } = await readyEngine();
  const text = "Time,Number\n" + "2026-03-10 08:00:00,1\n".repeat(3000);
  const bytes = new TextEncoder().encode(text);
  let pending = engine.decodeFile(bytes, 5 * 1024 * 1024, "day.csv", bytes.length);
  await answer(worker, { ok: true, text, sha256: "b".repeat(64), kept: "k9" });
  const decoded = await pending;
  const asked = worker.posted.at(-1);
  assert.equal(asked.op, "decode");
  assert.equal(asked.keep, true, "a long file is kept by the engine as it is decoded");
  assert.equal(decoded.kept, undefined, "the key is not part of the decoder's reply");
  assert.equal(decoded.text, text);

  pending = engine.request("shift", { series_text: text, periods: [] });
  await answer(worker, { ok: true });
  await pending;
  const sent = worker.posted.at(-1);
  assert.equal("series_text" in sent.inputs, false, "the text does not travel back into the engine");
  assert.deepEqual(sent.kept, { series_text: "k9" });
  assert.equal(sent.keep, undefined);

  // a short file is decoded without being kept
  const small = new TextEncoder().encode("a,b\n1,2\n");
  pending = engine.decodeFile(small, 1024, "small.csv", small.length);
  await answer(worker, { ok: true, text: "a,b\n1,2\n" });
  await pending;
  assert.equal(worker.posted.at(-1).keep, undefined);
});

// The worker's warm-up report (worker.js, driftdose.api.warm) reaches the status listeners as
// plain numbers and a boolean, whatever the message carried; the engine's state is unchanged.
test("the warm-up report reaches the listeners with its fields made plain", async () => {
  const { engine, worker } = await readyEngine();
  const seen = [];
  engine.onStatus((status) => seen.push(status));
  worker.dispatchEvent(message({ type: "warm", ok: true, steps: 24, ms: 512.6 }));
  worker.dispatchEvent(message({ type: "warm", ok: "yes", steps: "many", ms: { a: 1 }, extra: "<b>" }));
  assert.deepEqual(seen, [
    { type: "warm", ok: true, steps: 24, ms: 512.6 },
    { type: "warm", ok: false, steps: 0, ms: 0 },
  ]);
  assert.equal(engine.state, "ready");
});
