// Coalesced work (site/js/later.js): one run per burst, at once when flushed, never twice.
import test from "node:test";
import assert from "node:assert/strict";
import { coalesced } from "../../site/js/later.js";

const tick = () => new Promise((resolve) => setTimeout(resolve, 5));

test("a burst of requests runs the work once, a task later", async () => {
  let runs = 0;
  const later = coalesced(() => runs++);
  later.schedule();
  later.schedule();
  later.schedule();
  assert.equal(runs, 0); // not on the caller's path
  assert.equal(later.pending, true);
  await tick();
  assert.equal(runs, 1);
  assert.equal(later.pending, false);
  later.schedule();
  await tick();
  assert.equal(runs, 2);
});

test("flush runs due work at once and only once; with nothing due it does nothing", async () => {
  let runs = 0;
  const later = coalesced(() => runs++);
  later.flush();
  assert.equal(runs, 0);
  later.schedule();
  later.flush();
  assert.equal(runs, 1);
  assert.equal(later.pending, false);
  await tick();
  assert.equal(runs, 1); // the timer was dropped
});

test("now runs the work even when none is due and drops the one due", async () => {
  let runs = 0;
  const later = coalesced(() => runs++);
  later.now();
  assert.equal(runs, 1);
  later.schedule();
  later.now();
  assert.equal(runs, 2);
  await tick();
  assert.equal(runs, 2);
});

test("work that throws leaves nothing due (the next request schedules afresh)", async () => {
  let runs = 0;
  const later = coalesced(() => {
    runs++;
    if (runs === 1) throw new Error("boom");
  });
  later.schedule();
  assert.throws(() => later.flush(), /boom/);
  assert.equal(later.pending, false);
  later.schedule();
  await tick();
  assert.equal(runs, 2);
});

test("with restart, the work waits until the requests have stopped for the delay", async () => {
  let runs = 0;
  const calls = [];
  // a fake clock: setTimeout records, the test fires the newest timer by hand
  const timers = {
    setTimeout: (fn, ms) => { calls.push({ fn, ms, live: true }); return calls.length - 1; },
    clearTimeout: (id) => { calls[id].live = false; },
  };
  const later = coalesced(() => runs++, { delay: 400, restart: true, timers });
  later.schedule();
  later.schedule();
  later.schedule();
  assert.equal(calls.length, 3, "each request starts the wait afresh");
  assert.deepEqual(calls.map((c) => c.live), [false, false, true], "only the newest wait is live");
  assert.ok(calls.every((c) => c.ms === 400));
  assert.equal(runs, 0);
  calls[2].fn();
  assert.equal(runs, 1);
  assert.equal(later.pending, false);
  later.flush();
  assert.equal(runs, 1, "nothing was due any more");
});

test("without restart, requests during the wait add nothing (the first wait stands)", () => {
  const calls = [];
  const timers = { setTimeout: (fn, ms) => calls.push({ fn, ms }) - 1, clearTimeout: () => {} };
  const later = coalesced(() => {}, { delay: 400, timers });
  later.schedule();
  later.schedule();
  assert.equal(calls.length, 1);
});
