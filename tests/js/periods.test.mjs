// Periods of a shift (site/js/periods.js): time text <-> seconds from the series start,
// snapping of dragged edges, ordering and overlaps. Calendar facts (leap years, month
// lengths) are common practice; the expected seconds are worked by hand beside each check.
import { test } from "node:test";
import assert from "node:assert/strict";
import {
  clockText, covered, formatTime, isoSeconds, isoText, moveEdge, moveSpan, nextPeriod, order,
  overlaps, parseClock, parseTime, snapEdge, snapStep, spans, tickText,
} from "../../site/js/periods.js";

const START = "2026-03-10T07:00:00";

test("clock text reads HH:MM and HH:MM:SS and refuses impossible times", () => {
  assert.equal(parseClock("07:30"), 7 * 3600 + 30 * 60);
  assert.equal(parseClock("7:05:09"), 7 * 3600 + 5 * 60 + 9);
  assert.equal(parseClock(" 00:00 "), 0);
  assert.equal(parseClock("24:00"), 86_400);
  for (const bad of ["24:01", "07:60", "07:30:60", "25:00", "7", "07:3", "07-30", "", null, undefined, "０7:30", "07:30:00.5", "1e3:00"]) {
    assert.equal(parseClock(bad), null, String(bad));
  }
});

test("ISO local date-times count naive days: leap day and month ends", () => {
  // 2024-02-29 exists (leap year, common practice); 2026-02-29 does not
  const leap = isoSeconds("2024-02-29T00:00");
  const next = isoSeconds("2024-03-01 00:00:00");
  assert.equal(next - leap, 86_400);
  assert.equal(isoSeconds("2026-02-29T00:00"), null);
  assert.equal(isoSeconds("2026-04-31T00:00"), null);
  assert.equal(isoSeconds("2026-13-01T00:00"), null);
  // 1970-01-02T01:00 is one day and one hour after the epoch: 90 000 s
  assert.equal(isoSeconds("1970-01-02T01:00"), 90_000);
  assert.equal(isoText(90_000), "1970-01-02T01:00:00");
  assert.equal(isoText(isoSeconds("2026-12-31T23:59:59") + 1), "2027-01-01T00:00:00");
});

test("a clock time counts on the first date of the series, or the next day before its start", () => {
  assert.deepEqual(parseTime("07:30", START), { ok: true, seconds: 1800 });
  // before 07:00 it is the next morning (a night shift typed as clock times): 24 h less 30 s
  assert.deepEqual(parseTime("06:59:30", START), { ok: true, seconds: 86_400 - 30 });
  assert.deepEqual(parseTime("01:00", START), { ok: true, seconds: 18 * 3600 });
  // the next morning of a night shift: 2026-03-11 01:00 is 18 h after 07:00 the day before
  assert.deepEqual(parseTime("2026-03-11 01:00", START), { ok: true, seconds: 18 * 3600 });
  assert.deepEqual(parseTime("2026-03-10T15:00:00", START), { ok: true, seconds: 8 * 3600 });
  // a start with fractional seconds or a zone-free date only
  assert.equal(parseTime("07:00:01", "2026-03-10T07:00:00.250").seconds, 1);
  assert.equal(parseTime("01:00", "2026-03-10").seconds, 3600);
  assert.equal(parseTime("00:00", "2026-03-10").seconds, 0);
});

test("unreadable times say what to write; without a start the clock is kept", () => {
  for (const bad of ["", "  ", "7.30", "half past seven", "2026-03-10", "2026-02-30 07:00"]) {
    const got = parseTime(bad, START);
    assert.equal(got.ok, false, bad);
    assert.match(got.error, /HH:MM/);
  }
  assert.deepEqual(parseTime("08:15", null), { ok: true, seconds: null, clock: 8 * 3600 + 900 });
});

test("formatting is the inverse of reading, on the first date and after midnight", () => {
  for (const s of [0, 1, 59, 60, 1800, 3599, 8 * 3600, 16 * 3600 + 59 * 60 + 59]) {
    assert.equal(parseTime(formatTime(s, START), START).seconds, s, String(s));
  }
  assert.equal(formatTime(1800, START), "07:30");
  assert.equal(formatTime(1805, START), "07:30:05");
  // the next morning before 07:00 reads back as a clock time; from 07:00 on it needs the date
  assert.equal(formatTime(18 * 3600, START), "01:00");
  assert.equal(formatTime(18 * 3600 + 7, START), "01:00:07");
  assert.equal(formatTime(24 * 3600, START), "2026-03-11T07:00");
  assert.equal(formatTime(-60, START), "2026-03-10T06:59");
  for (const s of [18 * 3600 + 7, 24 * 3600, 30 * 3600 + 1, -60, 50 * 3600]) {
    assert.equal(parseTime(formatTime(s, START), START).seconds, s, String(s));
  }
  assert.equal(formatTime(NaN, START), "");
  assert.equal(formatTime(10, "not a date"), "");
});

test("ticks give the clock and the day after the first", () => {
  assert.equal(tickText(0, START), "07:00");
  assert.equal(tickText(3600 + 30, START, true), "08:00:30");
  assert.equal(tickText(18 * 3600, START), "01:00 (+1 d)");
  assert.equal(clockText(59), "00:00:59");
});

test("snapping: a round step at the screen's scale, neighbouring edges first, inside the series", () => {
  assert.equal(snapStep(0.1), 1);
  assert.equal(snapStep(2), 10); // 4 px of 2 s: the first step of at least 8 s
  assert.equal(snapStep(60), 300);
  assert.equal(snapStep(1e6), 3600);
  assert.equal(snapEdge(1234, { step: 60 }), 1260);
  assert.equal(snapEdge(1234, { step: 60, edges: [1200, 1240], tolerance: 10 }), 1240);
  assert.equal(snapEdge(1234, { step: 60, edges: [1200], tolerance: 10 }), 1260);
  assert.equal(snapEdge(-50, { step: 60, lo: 0, hi: 100 }), 0);
  assert.equal(snapEdge(1e9, { step: 60, lo: 0, hi: 28_800 }), 28_800);
  assert.equal(snapEdge(10, { step: 60, edges: [NaN, Infinity], tolerance: 1e9 }), 0);
});

test("an edge never crosses the other; a moved period keeps its length inside the series", () => {
  assert.deepEqual(moveEdge({ start: 100, end: 200 }, "start", 150), { start: 150, end: 200 });
  assert.deepEqual(moveEdge({ start: 100, end: 200 }, "start", 250), { start: 199, end: 200 });
  assert.deepEqual(moveEdge({ start: 100, end: 200 }, "end", 50, 10), { start: 100, end: 110 });
  assert.deepEqual(moveSpan({ start: 100, end: 200 }, -500, 0, 1000), { start: 0, end: 100 });
  assert.deepEqual(moveSpan({ start: 100, end: 200 }, 5000, 0, 1000), { start: 900, end: 1000 });
});

test("spans name the edge that does not read, and an end before its start", () => {
  const got = spans([
    { label: "a", kind: "task", start: "07:00", end: "08:00" },
    { label: "b", kind: "task", start: "8h", end: "09:00" },
    { label: "c", kind: "task", start: "09:00", end: "bad" },
    { label: "d", kind: "task", start: "10:00", end: "09:30" },
    null,
  ], START);
  assert.equal(got[0].error, "");
  assert.equal(got[0].end, 3600);
  assert.match(got[1].error, /^start: /);
  assert.match(got[2].error, /^end: /);
  assert.match(got[3].error, /after the start/);
  assert.match(got[4].error, /^start: /);
});

test("ordering by start keeps ties and puts unreadable times last", () => {
  const periods = [
    { kind: "task", start: "10:00", end: "11:00" },
    { kind: "task", start: "bad", end: "11:00" },
    { kind: "break", start: "07:30", end: "08:00" },
    { kind: "background", start: "07:30", end: "07:45" },
  ];
  assert.deepEqual(order(periods, START), [2, 3, 0, 1]);
});

test("overlaps: no two periods share time, whatever their kinds; abutting is no overlap", () => {
  const periods = [
    { kind: "task", start: "08:00", end: "10:00" },
    { kind: "break", start: "09:30", end: "10:15" },
    { kind: "background", start: "10:20", end: "10:45" },
    { kind: "background", start: "10:40", end: "11:00" },
    { kind: "task", start: "10:15", end: "10:20" }, // abuts the break and the background
    { kind: "background", start: "08:10", end: "08:20" }, // inside the first task
  ];
  assert.deepEqual(overlaps(periods, START), [
    { a: 0, b: 1, start: 9000, end: 10_800 },
    { a: 0, b: 5, start: 4200, end: 4800 },
    { a: 2, b: 3, start: 13_200, end: 13_500 },
  ]);
  assert.deepEqual(overlaps([{ kind: "task", start: "x", end: "08:00" }, { kind: "task", start: "07:00", end: "09:00" }], START), []);
});

test("covered time counts overlapping periods once", () => {
  const periods = [
    { kind: "task", start: "07:00", end: "08:00" },
    { kind: "task", start: "07:30", end: "08:30" },
    { kind: "task", start: "09:00", end: "09:10" },
    { kind: "break", start: "12:00", end: "12:30" },
  ];
  assert.equal(covered(periods, START, "task"), 5400 + 600);
  assert.equal(covered(periods, START, "break"), 1800);
  assert.equal(covered(periods, START, "background"), 0);
});

test("a new period follows the last one, inside the series when it fits", () => {
  const periods = [{ label: "Welding", kind: "task", start: "07:00", end: "09:00" }];
  assert.deepEqual(nextPeriod(periods, START, 8 * 3600, "task"),
    { label: "Task 2", kind: "task", start: "09:00", end: "09:30" });
  assert.deepEqual(nextPeriod(periods, START, 8 * 3600, "background", 900),
    { label: "Background 1", kind: "background", start: "09:00", end: "09:15" });
  // no room after the last: back to the start of the series
  assert.deepEqual(nextPeriod([{ kind: "task", start: "07:00", end: "15:00" }], START, 8 * 3600, "break"),
    { label: "Break 1", kind: "break", start: "07:00", end: "07:30" });
});
