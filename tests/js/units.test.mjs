// The page's unit table: labels and SI conversions come from the engine's description
// (forms.json "units", written by driftdose.api.describe for this tree), never from the page.
import { test } from "node:test";
import assert from "node:assert/strict";
import { readFileSync } from "node:fs";
import { fromSI, setUnitTable, toSI, unitLabel, unitText } from "../../site/js/units.js";

const forms = JSON.parse(readFileSync(process.env.DRIFTDOSE_FORMS, "utf-8"));
// equal to the last bits of a double (1e-15 relative): a scale factor is one multiplication
const close = (actual, expected) => assert.ok(Math.abs(actual - expected) <= 1e-15 * Math.abs(expected), `${actual} != ${expected}`);

test("codes are labelled and converted from the description's table", () => {
  setUnitTable(forms.units);
  assert.equal(unitLabel("um"), "µm");
  assert.equal(unitLabel("1/cm3"), "1/cm³");
  assert.equal(unitLabel("1"), "–");
  // SI prefixes (BIPM SI Brochure, 9th ed., Table 7): micro = 1e-6, milli = 1e-3
  close(toSI(2.5, "um"), 2.5e-6);
  close(toSI(3, "mm"), 3e-3);
  close(fromSI(2.5e-6, "um"), 2.5);
  // 0 degC = 273.15 K by the definition of the Celsius scale
  close(toSI(0, "degC"), 273.15);
  close(toSI(1, "1/cm3"), 1e6);
});

test("an unknown code is shown as it is and refused in arithmetic", () => {
  setUnitTable(forms.units);
  assert.equal(unitLabel("furlong"), "furlong");
  assert.throws(() => toSI(1, "furlong"), /unknown unit code/);
  assert.throws(() => toSI(1, "__proto__"), /unknown unit code/);
  assert.throws(() => toSI(1, "constructor"), /unknown unit code/);
});

test("a malformed table leaves no usable entry", () => {
  setUnitTable({ um: { label: "µm", factor: "1e-6" }, m: null, __proto__: { factor: 1 } });
  assert.throws(() => toSI(1, "um"), /unknown unit code/);
  assert.throws(() => toSI(1, "m"), /unknown unit code/);
  setUnitTable(null);
  assert.equal(unitLabel("um"), "um");
});

test("unitText: the table's printed label, empty for a pure number (from the description)", () => {
  setUnitTable(forms.units);
  assert.equal(unitText("1"), ""); // a pure number: nothing after it
  assert.equal(unitLabel("1"), "–"); // ... but named in a column
  assert.equal(unitText("um2/cm3"), "µm²/cm³");
  assert.equal(unitText("m2/s"), "m²/s");
  assert.equal(unitText("Pa.s"), "Pa·s");
  assert.equal(unitText("particles/h"), "particles/h");
  assert.equal(unitText("%"), "%");
  assert.equal(unitText("µm"), "µm"); // a label that is no code passes unchanged
});

test("unitText reads the table's text, with no rule of its own about labels", () => {
  // a table whose dimensionless label is printed: the page follows the table, not the label
  setUnitTable({ "1": { label: "–", text: "–", factor: 1 }, x: { label: "1", factor: 1 } });
  assert.equal(unitText("1"), "–");
  assert.equal(unitText("x"), "1"); // no text given: the label
  setUnitTable({ "1": { label: "–", text: 5, factor: 1 } }); // a text that is no string
  assert.equal(unitText("1"), "–");
});
