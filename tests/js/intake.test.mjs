// Unit tests of the page's reading of links and inputs files (site/js/intake.js).
import assert from "node:assert/strict";
import { test } from "node:test";
import {
  LIMITS, STATE_FORMAT, acceptedNotice, decodeFragment, measure, postRefusal, readInputsFile,
  refusedNotice,
} from "../../site/js/intake.js";
import { FORMS, SCHEMA } from "./schema.mjs";

const file = (panels, extra = {}) => JSON.stringify({ format: STATE_FORMAT, version: 1, panels, ...extra });

/** Every object in `v` (lists aside) has no prototype. */
function prototypeFree(v) {
  if (Array.isArray(v)) return v.every(prototypeFree);
  if (v !== null && typeof v === "object") {
    return Object.getPrototypeOf(v) === null && Object.values(v).every(prototypeFree);
  }
  return true;
}

test("a plain link decodes into declared fields, with units split only where a field has units", () => {
  const d = decodeFragment("#v=1&panel=deposition&motion.time=2~min&deposition.csv_diameter_column=Dp~corr&deposition.model=icrp66", SCHEMA);
  assert.equal(d.ok, true);
  assert.equal(d.version, "1");
  assert.equal(d.panel, "deposition");
  assert.deepEqual({ ...d.panels.motion.time }, { value: "2", unit: "min" });
  assert.equal(d.panels.deposition.csv_diameter_column, "Dp~corr");
  assert.equal(d.panels.deposition.model, "icrp66");
  assert.deepEqual(d.refused, []);
  assert.ok(prototypeFree(d.panels));
  assert.equal(acceptedNotice(d, "This link"), "");
});

test("a stage parameter under its former name is read under the current one", () => {
  // links written before the rename gave a cyclone's curve GSD and an impactor's curve width
  // both as `steepness`; each now has its own name, declared with `formerly` in forms.json
  const stages = [
    { type: "cyclone", d50: { value: "4", unit: "um" }, steepness: { value: "1.6", unit: "1" } },
    { type: "impactor", nozzle_diameter: { value: "1", unit: "mm" }, steepness: { value: "1.3", unit: "1" } },
    { type: "cyclone", steepness: { value: "9", unit: "1" }, curve_gsd: { value: "1.4", unit: "1" } },
  ];
  const d = decodeFragment(`#v=1&sampling.stages=${encodeURIComponent(`j:${JSON.stringify(stages)}`)}`, SCHEMA);
  assert.equal(d.ok, true);
  assert.deepEqual(d.refused, []);
  const [cyclone, impactor, both] = d.panels.sampling.stages;
  assert.equal(cyclone.curve_gsd.value, "1.6");
  assert.equal(impactor.efficiency_width.value, "1.3");
  assert.equal(both.curve_gsd.value, "1.4"); // the current name wins over the former one
  for (const stage of [cyclone, impactor, both]) assert.equal(Object.hasOwn(stage, "steepness"), false);
  const tube = [{ type: "tube", steepness: { value: "1.6", unit: "1" } }]; // not a former name here
  const t = decodeFragment(`#v=1&sampling.stages=${encodeURIComponent(`j:${JSON.stringify(tube)}`)}`, SCHEMA);
  assert.deepEqual(t.refused, ["sampling.stages[0].steepness"]);
});

test("prototype keys in a link are refused and named, and reach no object", () => {
  for (const key of ["__proto__.text", "constructor.name", "constructor.prototype", "__proto__.__proto__", "__proto__.unit", "__proto__.toString", "motion.__proto__", "motion.constructor", "prototype.x"]) {
    const d = decodeFragment(`#v=1&${encodeURIComponent(key)}=${encodeURIComponent("j:{}")}&motion.time=3~s`, SCHEMA);
    assert.equal(d.ok, true, key);
    assert.deepEqual(d.refused, [key], key);
    assert.equal(({}).text, undefined);
    assert.equal(({}).unit, undefined);
    assert.equal(typeof ({}).toString, "function");
    assert.equal(d.panels.motion.time.value, "3");
    assert.match(acceptedNotice(d, "This link"), new RegExp(key.replace(/[.$]/g, "\\$&")));
  }
});

test("prototype keys inside JSON values of a link are refused at their place", () => {
  const modes = [{ basis: "count", __proto__: { polluted: 1 }, constructor: { prototype: { polluted: 1 } }, median: { value: "50", unit: "nm", __proto__: 1 } }];
  const text = JSON.stringify(modes).replace('"basis"', '"__proto__":{"polluted":2},"basis"');
  const d = decodeFragment(`#v=1&deposition.modes=${encodeURIComponent(`j:${text}`)}`, SCHEMA);
  assert.equal(d.ok, true);
  assert.deepEqual(d.refused.sort(), ["deposition.modes[0].__proto__", "deposition.modes[0].constructor"].sort());
  assert.equal(({}).polluted, undefined);
  assert.equal(d.panels.deposition.modes[0].basis, "count");
  assert.ok(prototypeFree(d.panels));
});

test("stage keys are those of the stage's type", () => {
  const stages = [{ type: "tube", length: { value: "1", unit: "m" }, bend_angle: "90", wings: 2 }, { type: "rocket", name: "x", fuel: 1 }, 7, null];
  const d = decodeFragment(`#v=1&sampling.stages=${encodeURIComponent(`j:${JSON.stringify(stages)}`)}`, SCHEMA);
  assert.equal(d.ok, true);
  assert.deepEqual(d.refused, ["sampling.stages[0].bend_angle", "sampling.stages[0].wings", "sampling.stages[1].fuel"]);
  assert.equal(d.panels.sampling.stages[1].type, "rocket");
  assert.equal(d.panels.sampling.stages[2], 7);
  assert.equal(d.panels.sampling.stages[3], null);
});

test("structures where a value belongs become their JSON text", () => {
  const d = readInputsFile(file({ motion: { particle_diameter: { value: { x: 1 }, unit: { y: 2 } }, time: [1, 2], diameter_type: { a: 1 }, pressure: true, temperature: null } }), SCHEMA);
  assert.equal(d.ok, true);
  const m = d.panels.motion;
  assert.equal(m.particle_diameter.value, '{"x":1}');
  assert.equal(m.particle_diameter.unit, '{"y":2}');
  assert.equal(m.time, "[1,2]");
  assert.equal(m.diameter_type, '{"a":1}');
  assert.equal(m.pressure, true);
  assert.equal(m.temperature, null);
  // an object that cannot become a primitive no longer reaches the form
  const odd = readInputsFile(file({ sampling: { stages: [{ type: "tube", length: { value: { toString: 1, valueOf: 2 }, unit: "m" } }] } }), SCHEMA);
  assert.equal(typeof odd.panels.sampling.stages[0].length.value, "string");
  assert.doesNotThrow(() => `${odd.panels.sampling.stages[0].length.value}`);
});

test("a link without v= is not called another version", () => {
  const d = decodeFragment("#motion.time=1~s", SCHEMA);
  const text = acceptedNotice(d, "This link");
  assert.doesNotMatch(text, /null|another version/);
  assert.match(text, /does not say which format/);
  assert.equal(decodeFragment("#main", SCHEMA), null);
  assert.equal(decodeFragment("", SCHEMA), null);
  assert.equal(decodeFragment("#", SCHEMA), null);
  assert.match(acceptedNotice(decodeFragment("#v=7&motion.time=1~s", SCHEMA), "This link"), /format 7/);
});

test("deep and large structures are refused before anything is applied", () => {
  const deep = (n) => "[".repeat(n) + "]".repeat(n);
  for (const n of [30, 3000, 5000, 100_000]) {
    const d = decodeFragment(`#v=1&deposition.modes=j:${deep(n)}`, SCHEMA);
    assert.equal(d.ok, false, String(n));
    assert.match(d.error, /nested more than/);
    assert.equal(Object.keys(d.panels).length, 0);
    assert.match(refusedNotice(d, "This link"), /^This link was refused: it is nested more than \d+ levels deep\. Nothing was changed/);
    const f = readInputsFile(`{"format":"${STATE_FORMAT}","panels":{"motion":{"time":${deep(n)}}}}`, SCHEMA);
    assert.equal(f.ok, false, String(n));
  }
  const wide = readInputsFile(file({ deposition: { modes: Array.from({ length: LIMITS.nodes }, () => 1) } }), SCHEMA);
  assert.equal(wide.ok, false);
  assert.match(wide.error, /more than 100,000 values/);
  const tooLong = decodeFragment(`#v=1&motion.time=${"9".repeat(LIMITS.fragmentChars)}`, SCHEMA);
  assert.equal(tooLong.ok, false);
});

test("a thousand modes or a megabyte of text still reach the engine, which names the problem", () => {
  const modes = readInputsFile(file({ deposition: { modes: Array(1000).fill({ basis: "count" }) } }), SCHEMA);
  assert.equal(modes.ok, true);
  assert.equal(modes.panels.deposition.modes.length, 1000);
  const long = readInputsFile(file({ motion: { particle_diameter: { value: "9".repeat(900_000), unit: "nm" } } }), SCHEMA);
  assert.equal(long.ok, true);
  assert.equal(postRefusal(long.panels), "");
});

test("inputs files: what is refused, what is loaded with a notice", () => {
  for (const text of ["", "null", "42", "[]", '"x"', "{", '{"format":"x","panels":{}}', `{"format":"${STATE_FORMAT}","panels":"motion"}`, `{"format":"${STATE_FORMAT}"}`, `{"format":"${STATE_FORMAT}","x":NaN}`]) {
    const d = readInputsFile(text, SCHEMA);
    assert.equal(d.ok, false, text);
    assert.ok(d.error.length > 5);
    assert.equal(Object.keys(d.panels).length, 0);
  }
  assert.equal(readInputsFile(`\uFEFF${file({ motion: {} })}`, SCHEMA).ok, true);
  assert.equal(readInputsFile(file(null), SCHEMA).ok, true);
  const unknown = readInputsFile(file({ nowhere: { a: 1 }, motion: { nofield: "1", time: "2" } }), SCHEMA);
  assert.equal(unknown.ok, true);
  assert.deepEqual(unknown.refused, ["nowhere", "motion.nofield"]);
  assert.match(acceptedNotice(unknown, "The file"), /nowhere, motion\.nofield/);
  const proto = readInputsFile('{"format": "drift-and-dose-inputs", "version": 1, "panels": {"__proto__": {"x": 1}, "motion": {"constructor": "1", "__proto__": {"time": "1"}}}}', SCHEMA);
  assert.equal(proto.ok, true);
  assert.deepEqual(proto.refused, ["__proto__", "motion.constructor", "motion.__proto__"]);
  assert.equal(({}).x, undefined);
  assert.equal(({}).time, undefined);
});

test("measure walks without recursion and stops at its bound", () => {
  let v = [];
  for (let i = 0; i < 200_000; i++) v = [v];
  const m = measure(v);
  assert.equal(m.over, "depth");
  assert.ok(m.nodes <= LIMITS.depth + 2);
  assert.match(postRefusal(v), /nested more than 32 levels/);
  assert.equal(postRefusal({ kind: "x", inputs: { a: [{ value: "1", unit: "m" }] } }), "");
});

test("an inputs file whose format version is a structure is refused whole", () => {
  const d = readInputsFile(file({ motion: { time: { value: "7", unit: "s" } } }, { version: { toString: 1, valueOf: 2 } }), SCHEMA);
  assert.equal(d.ok, false);
  assert.match(d.error, /format version/);
  assert.equal(Object.keys(d.panels).length, 0);
});

test("survey details: survey.<name> in a link, survey beside panels in a file, unknown names refused", () => {
  const d = decodeFragment("#v=1&survey.site=Plant%204&survey.__proto__=x&survey.nobody=1&motion.time=1~s", SCHEMA);
  assert.equal(d.ok, true);
  assert.equal(d.panels.survey.site, "Plant 4");
  assert.deepEqual(d.refused, ["survey.__proto__", "survey.nobody"]);
  const f = readInputsFile(file({ motion: {} }, { survey: { site: "Hall B", date: "2026-01-02", constructor: "x" } }), SCHEMA);
  assert.equal(f.ok, true);
  assert.equal(f.panels.survey.site, "Hall B");
  assert.deepEqual(f.refused, ["survey.constructor"]);
  assert.equal(readInputsFile(file({ motion: {} }, { survey: "x" }), SCHEMA).refused[0], "survey");
});

test("modes, a records field, keep working in links and files: declared sub-field keys, values as sent", async () => {
  const { encodeState } = await import("../../site/js/state.js");
  const { FORMS } = await import("./schema.mjs");
  const modes = FORMS.calculations.deposition.fields.find((f) => f.name === "modes");
  assert.equal(modes.kind, "records");
  assert.deepEqual(modes.item_fields.map((f) => f.name), ["basis", "median", "diameter_type", "gsd", "concentration"]);
  // a mode as the page sends it, one from before the diameter type existed, and text the engine refuses
  const sent = [
    { basis: "count", median: { value: "40", unit: "nm" }, diameter_type: "mobility", gsd: "1.7", concentration: { value: "1e5", unit: "1/cm3" } },
    { basis: "mass", median: { value: "5", unit: "um" }, gsd: 2, concentration: { value: "1,000", unit: "mg/m3" }, colour: "red" },
  ];
  const link = `#${encodeState("deposition", { deposition: { distribution_source: "lognormal", modes: sent } })}`;
  const d = decodeFragment(link, SCHEMA);
  assert.equal(d.ok, true);
  assert.deepEqual(d.refused, ["deposition.modes[1].colour"]);
  const back = JSON.parse(JSON.stringify(d.panels.deposition.modes));
  const { colour, ...kept } = sent[1];
  assert.equal(colour, "red");
  assert.deepEqual(back, [sent[0], kept]); // values pass as sent: Python reads "1,000" and refuses it
  const f = readInputsFile(file({ deposition: { modes: sent } }), SCHEMA);
  assert.equal(f.ok, true);
  assert.deepEqual(JSON.parse(JSON.stringify(f.panels.deposition.modes)), [sent[0], kept]);
});

test("links and files written with a field's former name are read under its current name", () => {
  // deposition's distribution_source and sampling's spectrum_source became size_source
  assert.deepEqual([...FORMS.calculations.deposition.fields.find((f) => f.name === "size_source").formerly], ["distribution_source"]);
  const d = decodeFragment("#v=1&panel=sampling&sampling.spectrum_source=csv&deposition.distribution_source=csv", SCHEMA);
  assert.equal(d.ok, true);
  assert.deepEqual(d.refused, []);
  assert.equal(d.panels.sampling.size_source, "csv");
  assert.equal(d.panels.deposition.size_source, "csv");
  assert.equal(Object.hasOwn(d.panels.sampling, "spectrum_source"), false);
  assert.ok(prototypeFree(d.panels));
  const f = readInputsFile(file({ deposition: { distribution_source: "csv" }, sampling: { spectrum_source: "csv" } }), SCHEMA);
  assert.equal(f.ok, true);
  assert.deepEqual(f.refused, []);
  assert.equal(f.panels.deposition.size_source, "csv");
  assert.equal(f.panels.sampling.size_source, "csv");
});

test("a current name wins over its former name, in either order; other panels' former names are refused", () => {
  for (const hash of ["#v=1&sampling.size_source=none&sampling.spectrum_source=csv", "#v=1&sampling.spectrum_source=csv&sampling.size_source=none"]) {
    const d = decodeFragment(hash, SCHEMA);
    assert.equal(d.panels.sampling.size_source, "none", hash);
    assert.deepEqual(d.refused, [], hash);
  }
  const f = readInputsFile(file({ sampling: { spectrum_source: "csv", size_source: "none" } }), SCHEMA);
  assert.equal(f.panels.sampling.size_source, "none");
  // a former name belongs to its own panel: sampling never had distribution_source
  const d = decodeFragment("#v=1&sampling.distribution_source=csv&motion.spectrum_source=csv", SCHEMA);
  assert.deepEqual(d.refused, ["sampling.distribution_source", "motion.spectrum_source"]);
});
