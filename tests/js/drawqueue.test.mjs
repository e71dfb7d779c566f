// When a chart is redrawn (site/js/drawqueue.js): at once near the view or where unknown; far
// from it, once when idle, when it comes near, or when flushed; never twice for one change.
import test from "node:test";
import assert from "node:assert/strict";
import { DrawQueue } from "../../site/js/drawqueue.js";

function setup({ withIdle = true } = {}) {
  const drawn = [];
  const idleCalls = [];
  const queue = new DrawQueue({
    draw: (key) => drawn.push(key),
    idle: withIdle ? (callback) => idleCalls.push(callback) : null,
  });
  const runIdle = () => idleCalls.splice(0).forEach((callback) => callback());
  return { queue, drawn, idleCalls, runIdle };
}

test("a chart whose place is unknown, or near the view, is drawn at once on every change", () => {
  const { queue, drawn, idleCalls } = setup();
  queue.request("a");
  assert.deepEqual(drawn, ["a"]);
  queue.seen("a", true);
  assert.deepEqual(drawn, ["a"]); // coming near with nothing waiting draws nothing
  queue.request("a");
  queue.request("a");
  assert.deepEqual(drawn, ["a", "a", "a"]);
  assert.equal(idleCalls.length, 0);
});

test("far from the view: not drawn on the change, drawn once when idle for a burst of changes", () => {
  const { queue, drawn, idleCalls, runIdle } = setup();
  queue.seen("far", false);
  queue.request("far");
  queue.request("far");
  queue.request("far");
  assert.deepEqual(drawn, []);
  assert.equal(queue.isWaiting("far"), true);
  assert.equal(idleCalls.length, 1); // one idle callback for the burst
  runIdle();
  assert.deepEqual(drawn, ["far"]);
  assert.equal(queue.isWaiting("far"), false);
  runIdle();
  assert.deepEqual(drawn, ["far"]); // nothing left: never drawn twice
  queue.request("far"); // the next change schedules again
  assert.equal(idleCalls.length, 1);
  runIdle();
  assert.deepEqual(drawn, ["far", "far"]);
});

test("a waiting chart that comes near the view is drawn then, and not again when idle", () => {
  const { queue, drawn, runIdle } = setup();
  queue.seen("c", false);
  queue.request("c");
  queue.seen("c", true);
  assert.deepEqual(drawn, ["c"]);
  runIdle();
  assert.deepEqual(drawn, ["c"]);
  queue.request("c"); // near now: at once
  assert.deepEqual(drawn, ["c", "c"]);
});

test("flush draws one waiting chart at once (before its pixels are read); others keep waiting", () => {
  const { queue, drawn, runIdle } = setup();
  queue.seen("a", false);
  queue.seen("b", false);
  queue.request("a");
  queue.request("b");
  queue.flush("a");
  assert.deepEqual(drawn, ["a"]);
  queue.flush("a"); // nothing waits any more
  assert.deepEqual(drawn, ["a"]);
  runIdle();
  assert.deepEqual(drawn, ["a", "b"]);
});

test("flushAll draws every waiting chart once; forget drops a chart's waiting redraw", () => {
  const { queue, drawn, runIdle } = setup();
  for (const key of ["a", "b", "c"]) {
    queue.seen(key, false);
    queue.request(key);
  }
  queue.forget("b");
  queue.flushAll();
  assert.deepEqual(drawn.sort(), ["a", "c"]);
  runIdle();
  assert.equal(drawn.length, 2);
  queue.request("b"); // forgotten: its place is unknown again, so drawn at once
  assert.deepEqual(drawn.slice(2), ["b"]);
});

test("without an idle scheduler every change is drawn at once, wherever the chart is", () => {
  const { queue, drawn } = setup({ withIdle: false });
  queue.seen("a", false);
  queue.request("a");
  assert.deepEqual(drawn, ["a"]);
  assert.equal(queue.isWaiting("a"), false);
});
