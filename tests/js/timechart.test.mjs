// Clock ticks of the shift's time-series chart (site/js/timechart.js): labels fall on round
// clock times whatever second the series starts at, and never crowd the axis.
import { test } from "node:test";
import assert from "node:assert/strict";
import { clockTicks } from "../../site/js/timechart.js";

test("an 8-h series starting at 06:45:00 is labelled on the whole hours", () => {
  // 07:00 is 900 s after the start, then every 3600 s up to 14:00 (26 100 s)
  const ticks = clockTicks(0, 8 * 3600, "2026-03-10T06:45:00", 9);
  assert.deepEqual(ticks, [900, 4500, 8100, 11_700, 15_300, 18_900, 22_500, 26_100]);
});

test("fewer labels on a narrow axis: a longer round step", () => {
  const ticks = clockTicks(0, 8 * 3600, "2026-03-10T06:45:00", 4);
  // two-hour step: 08:00, 10:00, 12:00, 14:00
  assert.deepEqual(ticks, [4500, 11_700, 18_900, 26_100]);
});

test("a short stretch gets minutes; a start at an odd second still lands on the clock", () => {
  const ticks = clockTicks(0, 1200, "2026-03-10T07:02:17", 9);
  // 5-min step: 07:05:00 is 163 s after 07:02:17
  assert.deepEqual(ticks, [163, 463, 763, 1063]);
});

test("24 h and more: steps of hours, never more than asked", () => {
  for (const most of [2, 5, 9, 20]) {
    const ticks = clockTicks(0, 86_400, "2026-03-10T00:00:00", most);
    assert.ok(ticks.length <= most + 1, `${ticks.length} ticks for ${most}`);
    assert.ok(ticks.every((t) => t % 3600 === 0));
  }
  assert.deepEqual(clockTicks(0, 10, "bad"), [0]);
});
