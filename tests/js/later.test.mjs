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
