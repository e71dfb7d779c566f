// When a chart is redrawn (site/js/drawqueue.js): at once near the view or where unknown; far
// from it, once when the changes pause, when it comes near, or when flushed; never twice for
// one change.
import test from "node:test";
import assert from "node:assert/strict";
import { DrawQueue } from "../../site/js/drawqueue.js";

function setup({ withLater = true } = {}) {
  const drawn = [];
  const later = { schedules: 0, schedule() { this.schedules++; } };
  const queue = new DrawQueue({ draw: (key) => drawn.push(key), later: withLater ? later : null });
  const pause = () => queue.flushAll(); // what `later` does once the requests pause
  return { queue, drawn, later, pause };
}

test("a chart whose place is unknown, or near the view, is drawn at once on every change", () => {
  const { queue, drawn, later } = setup();
  queue.request("a");
  assert.deepEqual(drawn, ["a"]);
  queue.seen("a", true);
  assert.deepEqual(drawn, ["a"]); // coming near with nothing waiting draws nothing
  queue.request("a");
  queue.request("a");
  assert.deepEqual(drawn, ["a", "a", "a"]);
  assert.equal(later.schedules, 0);
});

test("far from the view: not drawn on the change, drawn once when a burst of changes pauses", () => {
  const { queue, drawn, later, pause } = setup();
  queue.seen("far", false);
  queue.request("far");
  queue.request("far");
  queue.request("far");
  assert.deepEqual(drawn, []);
  assert.equal(queue.isWaiting("far"), true);
  assert.equal(later.schedules, 3); // each change puts the redraw off again
  pause();
  assert.deepEqual(drawn, ["far"]);
  assert.equal(queue.isWaiting("far"), false);
  pause();
  assert.deepEqual(drawn, ["far"]); // nothing left: never drawn twice
  queue.request("far");
  pause();
  assert.deepEqual(drawn, ["far", "far"]);
});

test("a waiting chart that comes near the view is drawn then, and not again at the pause", () => {
  const { queue, drawn, pause } = setup();
  queue.seen("c", false);
  queue.request("c");
  queue.seen("c", true);
  assert.deepEqual(drawn, ["c"]);
  pause();
  assert.deepEqual(drawn, ["c"]);
  queue.request("c"); // near now: at once
  assert.deepEqual(drawn, ["c", "c"]);
});

test("flush draws one waiting chart at once (before its pixels are read); others keep waiting", () => {
  const { queue, drawn, pause } = setup();
  queue.seen("a", false);
  queue.seen("b", false);
  queue.request("a");
  queue.request("b");
  queue.flush("a");
  assert.deepEqual(drawn, ["a"]);
  queue.flush("a"); // nothing waits any more
  assert.deepEqual(drawn, ["a"]);
  pause();
  assert.deepEqual(drawn, ["a", "b"]);
});

test("flushAll draws every waiting chart once; forget drops a chart's waiting redraw", () => {
  const { queue, drawn, pause } = setup();
  for (const key of ["a", "b", "c"]) {
    queue.seen(key, false);
    queue.request(key);
  }
  queue.forget("b");
  queue.flushAll();
  assert.deepEqual(drawn.sort(), ["a", "c"]);
  pause();
  assert.equal(drawn.length, 2);
  queue.request("b"); // forgotten: its place is unknown again, so drawn at once
  assert.deepEqual(drawn.slice(2), ["b"]);
});

test("without a scheduler every change is drawn at once, wherever the chart is", () => {
  const { queue, drawn } = setup({ withLater: false });
  queue.seen("a", false);
  queue.request("a");
  assert.deepEqual(drawn, ["a"]);
  assert.equal(queue.isWaiting("a"), false);
});
