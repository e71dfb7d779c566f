// Pieces of the charts: axis titles, readouts, the scenario line and the PNG text chunks of a
// saved chart image.
import { test } from "node:test";
import assert from "node:assert/strict";
import { inflateSync, deflateSync } from "node:zlib";
import {
  MAX_COMPARED, axisTitle, crc32, curvePoints, curveX, decadeStride, fitLegendText, imageText, particleLetter, pngText, pngWithText,
  readout, scenarioLine, wrapText,
} from "../../site/js/chartparts.js";

test("an axis whose ticks carry units has no unit in its title; otherwise the unit is named", () => {
  assert.equal(axisTitle("Volume-equivalent diameter", "µm", true), "Volume-equivalent diameter");
  assert.equal(axisTitle("Number concentration", "1/cm³"), "Number concentration (1/cm³)");
  assert.equal(axisTitle("Penetration", ""), "Penetration"); // a pure number prints no unit
  assert.equal(axisTitle("Time from the first exposure", "days", false), "Time from the first exposure (days)");
  assert.equal(axisTitle(" Region ", ""), "Region");
});

test("a readout names its series", () => {
  assert.equal(readout("Particle B, settling distance", "3 µm"), "Particle B, settling distance: 3 µm");
  assert.equal(readout("", "0.5"), "Value: 0.5");
  assert.equal(readout(undefined, "0.5"), "Value: 0.5");
});

test("three particles at most, lettered A, B, C", () => {
  assert.equal(MAX_COMPARED, 3);
  assert.deepEqual([0, 1, 2].map(particleLetter), ["A", "B", "C"]);
});

test("the scenario line joins inputs with their units and stops at a whole entry", () => {
  const rows = [
    { label: "Particle diameter", value: "2.5", unit: "µm" },
    { label: "Diameter type", value: "Aerodynamic", unit: "" },
    { label: "Shape factor", value: "1", unit: "" },
    { label: "Empty", value: "", unit: "m" },
    { label: "Notes", value: "two\nlines", unit: "" },
  ];
  assert.equal(scenarioLine(rows), "Particle diameter 2.5 µm · Diameter type Aerodynamic · Shape factor 1 · Notes two lines");
  assert.equal(scenarioLine(rows, { skip: ["Diameter type"] }), "Particle diameter 2.5 µm · Shape factor 1 · Notes two lines");
  const cut = scenarioLine(rows, { maxLength: 60 });
  assert.equal(cut, "Particle diameter 2.5 µm · Diameter type Aerodynamic · …");
  assert.ok(scenarioLine(rows, { maxLength: 56 }).length <= 56);
  assert.equal(scenarioLine(rows, { maxLength: 55 }), "Particle diameter 2.5 µm · …");
  assert.equal(scenarioLine([{ label: "A very long label", value: "x" }], { maxLength: 6 }), "A ver…");
  assert.equal(scenarioLine(null), "");
  assert.equal(scenarioLine([null, { label: "x", value: null }]), "");
});

test("wrapping keeps every word, breaks at spaces and marks what a line limit leaves out", () => {
  const measure = (t) => t.length; // one unit per character
  const text = "Drift and Dose exported chart with a rather long scenario line";
  const lines = wrapText(text, 20, measure);
  assert.ok(lines.every((l) => l.length <= 20), lines);
  assert.equal(lines.join(" "), text);
  const two = wrapText(text, 20, measure, 2);
  assert.equal(two.length, 2);
  assert.ok(two[1].endsWith(" …") && two[1].length <= 20, two);
  assert.deepEqual(wrapText("averyveryverylongword short", 5, measure), ["averyveryverylongword", "short"]);
  assert.deepEqual(wrapText("", 10, measure), []);
});

test("the image text names the version and date; a missing version says so", () => {
  const t = imageText({ title: " Penetration ", scenario: "Flow 2 L/min", version: "0.9.1", date: "2026-12-02" });
  assert.equal(t.title, "Penetration");
  assert.match(t.footer, /^Drift & Dose 0\.9\.1 · 2026-12-02 · /);
  assert.match(imageText({ date: "2026-12-02" }).footer, /version unknown/);
  assert.equal(imageText({}).title, "Chart");
});

test("CRC-32 matches the check value of the standard (\"123456789\" → CBF43926)", () => {
  // the check value of CRC-32/ISO-HDLC, as listed in every CRC catalogue (common practice)
  assert.equal(crc32(new TextEncoder().encode("123456789")), 0xcbf43926);
});

/** A 1×1 PNG built here from zlib, independent of the code under test. */
function tinyPng() {
  const chunk = (type, data) => {
    const body = Buffer.concat([Buffer.from(type, "latin1"), data]);
    const len = Buffer.alloc(4);
    len.writeUInt32BE(data.length);
    const crc = Buffer.alloc(4);
    crc.writeUInt32BE(crc32(body));
    return Buffer.concat([len, body, crc]);
  };
  const ihdr = Buffer.from([0, 0, 0, 1, 0, 0, 0, 1, 8, 2, 0, 0, 0]);
  const idat = deflateSync(Buffer.from([0, 255, 0, 0]));
  return new Uint8Array(Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]), chunk("IHDR", ihdr), chunk("IDAT", idat), chunk("IEND", Buffer.alloc(0)),
  ]));
}

/** Walk the chunks, checking every length and CRC; returns the chunk types in order. */
function chunkTypes(bytes) {
  const buf = Buffer.from(bytes);
  const types = [];
  let at = 8;
  while (at < buf.length) {
    const len = buf.readUInt32BE(at);
    const type = buf.toString("latin1", at + 4, at + 8);
    assert.equal(buf.readUInt32BE(at + 8 + len), crc32(buf.subarray(at + 4, at + 8 + len)), `CRC of ${type}`);
    types.push(type);
    at += 12 + len;
  }
  assert.equal(at, buf.length);
  return types;
}

test("text chunks go after the header with valid CRCs; UTF-8 text (µ, ², ³) reads back", () => {
  const png = tinyPng();
  const fields = { Title: "Deposition fraction", Description: "Median 2.5 µm · 1/cm³ · m²", Software: "Drift & Dose 0.9.1", Empty: "" };
  const out = pngWithText(png, fields);
  assert.deepEqual(chunkTypes(out), ["IHDR", "iTXt", "iTXt", "iTXt", "IDAT", "IEND"]);
  const text = pngText(out);
  assert.deepEqual(text, { Title: "Deposition fraction", Description: "Median 2.5 µm · 1/cm³ · m²", Software: "Drift & Dose 0.9.1" });
  // the image data are untouched
  const idat = (b) => {
    const buf = Buffer.from(b);
    let at = 8;
    while (buf.toString("latin1", at + 4, at + 8) !== "IDAT") at += 12 + buf.readUInt32BE(at);
    return inflateSync(buf.subarray(at + 8, at + 8 + buf.readUInt32BE(at)));
  };
  assert.deepEqual(idat(out), idat(png));
});

test("a NUL in a text cannot end the chunk early; bytes that are not a PNG are refused", () => {
  const out = pngWithText(tinyPng(), { Title: "a\0b" });
  assert.equal(pngText(out).Title, "ab");
  assert.throws(() => pngWithText(new Uint8Array(40), { Title: "x" }), /not a PNG/);
  assert.throws(() => pngWithText(new Uint8Array([0x89, 0x50]), { Title: "x" }), /not a PNG/);
});

test("long option texts lose their parenthetical parts; short ones stay whole", async () => {
  const { optionText, OPTION_CHARS } = await import("../../site/js/format.js");
  assert.equal(optionText("ICRP 66 full regional model (ET1, ET2, BB, bb, AI)"), "ICRP 66 full regional model");
  assert.equal(optionText("ICRP 66 deposition in ET2 (back of nose, mouth, pharynx, larynx), reference worker"),
    "ICRP 66 deposition in ET2, reference worker");
  assert.equal(optionText("Volume-equivalent (geometric)"), "Volume-equivalent (geometric)"); // short: whole
  assert.equal(optionText("(only a parenthetical that is long enough to be cut)"), "(only a parenthetical that is long enough to be cut)");
  const long = "A label without any parenthesis that runs long";
  assert.equal(optionText(long), long);
  assert.ok("Volume-equivalent (geometric)".length <= OPTION_CHARS);
  assert.equal(optionText(undefined), "");
});

test("a curve's x values are its own list or the shared axis it names (sent once per reply)", () => {
  const curves = { axes: { diameter: [0.001, 0.01, 0.1] }, a: { x: "diameter", y: [1, 2, 3] }, b: { x: [5, 6], y: [7, 8] } };
  assert.equal(curveX(curves, curves.a), curves.axes.diameter); // the same array, not a copy
  assert.deepEqual(curveX(curves, curves.b), [5, 6]);
  assert.deepEqual(curvePoints(curves, curves.a), [{ x: 0.001, y: 1 }, { x: 0.01, y: 2 }, { x: 0.1, y: 3 }]);
  assert.deepEqual(curvePoints(curves, curves.a, (y) => y > 1), [{ x: 0.001, y: null }, { x: 0.01, y: 2 }, { x: 0.1, y: 3 }]);
});

test("an unknown, inherited or malformed axis name gives no points (never a prototype's value)", () => {
  const axes = { axes: { diameter: [1, 2] } };
  for (const [curves, curve] of [
    [axes, { x: "size", y: [1, 2] }],
    [axes, { x: "__proto__", y: [1, 2] }],
    [axes, { x: "constructor", y: [1, 2] }],
    [axes, { x: "toString", y: [1, 2] }],
    [{ axes: { diameter: "1,2" } }, { x: "diameter", y: [1, 2] }],
    [{ axes: null }, { x: "diameter", y: [1, 2] }],
    [{}, { x: "diameter", y: [1, 2] }],
    [null, { x: "diameter", y: [1, 2] }],
    [axes, { x: 3, y: [1] }],
    [axes, null],
  ]) {
    assert.deepEqual(curveX(curves, curve), []);
    assert.deepEqual(curvePoints(curves, curve), []);
  }
});

// A narrow chart's logarithmic axis labels every other decade (or fewer) instead of running
// "10 nm100 nm" together; a legend entry too long for the chart loses its parenthetical first.
test("decade labels thin out when the axis is too narrow for all of them", () => {
  // 1 nm … 100 µm: six decades; labels ~45 px wide with their gap
  assert.equal(decadeStride(900, 6, 45), 1);
  assert.equal(decadeStride(225, 6, 45), 1); // exactly 45 px apart
  assert.equal(decadeStride(224, 6, 45), 2);
  assert.equal(decadeStride(100, 6, 45), 3);
  for (const bad of [0, -5, NaN, undefined]) assert.equal(decadeStride(bad, 6, 45), 1);
  assert.equal(decadeStride(300, 1, 45), 1);
});

test("a legend text too wide loses its closing parenthetical, then words, never silently all", () => {
  const measure = (t) => t.length * 7; // 7 px per character
  const text = "Your distribution by number (dW/dln d, scaled to peak 1)";
  assert.equal(fitLegendText(text, 1000, measure), text);
  assert.equal(fitLegendText(text, 200, measure), "Your distribution by number");
  assert.equal(fitLegendText(text, 140, measure), "Your distribution …");
  assert.equal(fitLegendText(text, 120, measure), "Your …");
  assert.equal(fitLegendText("ET1 (front of the nose)", 0, measure), "ET1 (front of the nose)");
  assert.equal(fitLegendText("Total", 20, measure), "Total …"); // the first word stays whole
});
