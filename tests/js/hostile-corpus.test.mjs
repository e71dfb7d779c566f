// A generated corpus of hostile links and inputs files (prototype keys at every position, depth,
// size, types, encodings, percent-encoding). For every case: nothing is added to or changed on
// a shared prototype, nothing throws, a refusal carries no inputs, an accepted result holds only
// prototype-free objects with declared keys and can be posted to the engine (structured clone)
// within the bounds the page posts, and the input itself is left as it was.
import assert from "node:assert/strict";
import { test } from "node:test";
import { LIMITS, STATE_FORMAT, acceptedNotice, decodeFragment, postRefusal, readInputsFile, refusedNotice } from "../../site/js/intake.js";
import { SCHEMA } from "./schema.mjs";

const CASES = 12_000;

// a small deterministic generator (mulberry32), so a failing case can be found again by number
function rng(seed) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const PROTO_KEYS = ["__proto__", "constructor", "prototype", "__proto__.__proto__", "constructor.prototype",
  "toString", "valueOf", "hasOwnProperty", "__defineGetter__", "__lookupSetter__", "isPrototypeOf", "then", "toJSON"];
const ENCODED = ["%5F%5Fproto%5F%5F", "__proto%5F%5F", "%5f%5fproto%5f%5f", "constructor%2Eprototype", "%C0%AE", "%", "%zz", "%E0%A4%A", "%00", "%ED%A0%80", "+", "%2B", "%26", "%3D", "%23"];
const ODD_TEXT = ["", " ", "\u0000", "\uFEFF", "\u202Eevil", "\uD800", "\uDFFF\uD800", "𝟘𝟙", "1e309", "-0", "NaN", "Infinity", "0x10", "1_000", "١٢٣", "<img src=x onerror=alert(1)>", "${x}", "'\"`", "\\", "~", "~~", "j:", "j:{", "j:null", "j:[]", "j:{}", "j:\"x\"", "a".repeat(300)];
const PANEL_IDS = ["motion", "deposition", "sampling", "survey"];

// a snapshot of everything a pollution could reach
const SHARED = [Object.prototype, Array.prototype, Function.prototype, String.prototype, Number.prototype,
  Boolean.prototype, Object, Array, JSON, Map.prototype, Set.prototype, Promise.prototype, globalThis];
function snapshot() {
  return SHARED.map((o) => Object.getOwnPropertyNames(o).sort().join("|")
    + Object.getOwnPropertyNames(o).map((k) => {
      const d = Object.getOwnPropertyDescriptor(o, k);
      return typeof d.value === "function" ? `${k}:f` : `${k}:${typeof d.value}${d.get ? "g" : ""}${d.set ? "s" : ""}`;
    }).join(","));
}

// percent-encoding as a sender might do it: a lone surrogate goes out raw
function enc(text) {
  try {
    return encodeURIComponent(text);
  } catch {
    return text;
  }
}

function pick(r, list) {
  return list[Math.floor(r() * list.length)];
}

function fieldNames(pid) {
  return Object.keys(SCHEMA[pid]);
}

function deep(r) {
  const n = pick(r, [2, 5, 13, 14, 15, 40, 3000, 5000]);
  const open = pick(r, ["[", '{"a":', '{"__proto__":', '{"constructor":{"prototype":']);
  const close = open === "[" ? "]" : "}".repeat(open.split("{").length - 1);
  return open.repeat(n) + "1" + close.repeat(n);
}

/** A JSON text with hostile keys at a random place of a value (list, item, quantity). */
function hostileJson(r) {
  const key = pick(r, PROTO_KEYS.concat(["value", "unit", "type", "basis", "median", "x"]));
  const inner = { [key]: pick(r, [1, "x", null, true, { polluted: 1 }, [1], { value: "1", unit: "m" }]) };
  const shapes = [
    () => `{${JSON.stringify(key)}:${JSON.stringify(inner)}}`,
    () => `[{${JSON.stringify(key)}:{"polluted":1},"type":"tube","basis":"count"}]`,
    () => `[{"median":{"value":"1","unit":"nm",${JSON.stringify(key)}:{"polluted":1}}}]`,
    () => `[{"type":"bend","flow":{${JSON.stringify(key)}:1,"value":{${JSON.stringify(key)}:{"polluted":1}}}}]`,
    () => `{"value":"1","unit":"nm",${JSON.stringify(key)}:{"polluted":1}}`,
    () => deep(r),
    () => JSON.stringify(Array.from({ length: pick(r, [0, 1, 5, 1001, 5000]) }, () => inner)),
    () => JSON.stringify(pick(r, ODD_TEXT)),
    () => pick(r, ["1", "true", "null", "1e999", "-1", '"\\ud800"', "{}", "[]"]),
  ];
  return pick(r, shapes)();
}

function hostileKey(r) {
  const parts = [];
  const n = 1 + Math.floor(r() * 3);
  for (let i = 0; i < n; i++) {
    parts.push(pick(r, [pick(r, PROTO_KEYS), pick(r, PANEL_IDS), pick(r, ENCODED), pick(r, ["v", "panel", "demo", "", "x"]),
      pick(r, fieldNames(pick(r, PANEL_IDS)))]));
  }
  return parts.join(pick(r, [".", ".", "%2E", "[", "]."]));
}

function hostileValue(r) {
  const kind = Math.floor(r() * 6);
  if (kind === 0) return enc(`j:${hostileJson(r)}`);
  if (kind === 1) return `j:${hostileJson(r)}`; // not percent-encoded: & and = split it
  if (kind === 2) return enc(`${pick(r, ODD_TEXT)}~${pick(r, ODD_TEXT.concat(PROTO_KEYS))}`);
  if (kind === 3) return pick(r, ENCODED) + pick(r, ODD_TEXT.slice(0, 8));
  if (kind === 4) return enc(pick(r, ODD_TEXT));
  return enc(`j:${deep(r)}`);
}

function hostileFragment(r) {
  const parts = [];
  if (r() < 0.7) parts.push(`v=${pick(r, ["1", "2", "", "null", "__proto__", "%00"])}`);
  if (r() < 0.5) parts.push(`panel=${pick(r, PANEL_IDS.concat(PROTO_KEYS))}`);
  const n = 1 + Math.floor(r() * 6);
  for (let i = 0; i < n; i++) {
    const pid = pick(r, PANEL_IDS);
    const key = r() < 0.5 ? hostileKey(r) : `${r() < 0.8 ? pid : pick(r, PROTO_KEYS)}.${r() < 0.6 ? pick(r, fieldNames(pid)) : pick(r, PROTO_KEYS)}`;
    parts.push(`${r() < 0.2 ? enc(key) : key}=${hostileValue(r)}`);
  }
  return `${pick(r, ["#", "", "##", "#&"])}${parts.join(pick(r, ["&", "&", "&&", ";"]))}`;
}

function hostileFile(r) {
  const panels = {};
  const n = Math.floor(r() * 4);
  let text;
  for (let i = 0; i < n; i++) {
    const pid = r() < 0.75 ? pick(r, PANEL_IDS) : pick(r, PROTO_KEYS);
    const values = {};
    const m = 1 + Math.floor(r() * 4);
    for (let j = 0; j < m; j++) {
      const name = r() < 0.6 && Object.hasOwn(SCHEMA, pid) ? pick(r, fieldNames(pid)) : pick(r, PROTO_KEYS.concat(["demo", "x"]));
      values[name] = `@@${j}@@`;
    }
    panels[pid] = values;
  }
  const top = { format: r() < 0.9 ? STATE_FORMAT : pick(r, PROTO_KEYS), version: pick(r, [1, "1", 2, null, "__proto__", [1], { a: 1 }]) };
  if (r() < 0.3) top.panel = pick(r, PANEL_IDS.concat(PROTO_KEYS));
  text = JSON.stringify({ ...top, panels: r() < 0.95 ? panels : pick(r, ["motion", 1, null, [], true]) });
  // JSON.stringify drops nothing here; put hostile JSON in each value's place and hostile keys at the top
  text = text.replace(/"@@\d+@@"/g, () => hostileJson(r));
  if (r() < 0.3) text = text.replace(/^\{/, `{${JSON.stringify(pick(r, PROTO_KEYS))}:{"polluted":1},`);
  if (r() < 0.2) text = text.replace('"panels":{', `"panels":{"__proto__":{"motion":{"time":"1"}},`);
  if (r() < 0.05) text = `\uFEFF${text}`;
  if (r() < 0.05) text = text.slice(0, Math.floor(r() * text.length));
  return text;
}

const DECLARED_ITEM_KEYS = (() => {
  const keys = new Set(["type", "value", "unit"]);
  for (const pid of PANEL_IDS) {
    for (const f of Object.values(SCHEMA[pid])) {
      for (const i of f.item_fields || []) keys.add(i.name);
      for (const spec of Object.values(f.stage_types || {})) for (const s of spec.fields) keys.add(s.name);
    }
  }
  return keys;
})();

/** Problems with an accepted result: prototypes, undeclared keys, non-primitive leaves. */
function checkAccepted(d) {
  const problems = [];
  if (Object.getPrototypeOf(d.panels) !== null) problems.push("panels has a prototype");
  for (const pid of Object.keys(d.panels)) {
    if (!Object.hasOwn(SCHEMA, pid)) problems.push(`undeclared panel ${pid}`);
    const values = d.panels[pid];
    if (Object.getPrototypeOf(values) !== null) problems.push(`${pid} has a prototype`);
    for (const name of Object.keys(values)) {
      if (name !== "demo" && !Object.hasOwn(SCHEMA[pid], name)) problems.push(`undeclared field ${pid}.${name}`);
      const stack = [[values[name], 0]];
      while (stack.length) {
        const [v, depth] = stack.pop();
        if (depth > 3) problems.push(`${pid}.${name} deeper than a list of quantities`);
        if (Array.isArray(v)) v.forEach((x) => stack.push([x, depth + 1]));
        else if (v !== null && typeof v === "object") {
          if (Object.getPrototypeOf(v) !== null) problems.push(`${pid}.${name} holds an object with a prototype`);
          for (const k of Object.keys(v)) {
            if (!DECLARED_ITEM_KEYS.has(k)) problems.push(`undeclared key ${k} in ${pid}.${name}`);
            stack.push([v[k], depth + 1]);
          }
        } else if (typeof v === "string") {
          if (v !== v.toWellFormed()) problems.push(`${pid}.${name} holds a lone surrogate`);
        } else if (!(v === null || typeof v === "number" || typeof v === "boolean")) {
          problems.push(`${pid}.${name} holds a ${typeof v}`);
        }
      }
    }
  }
  if (postRefusal({ kind: "x", inputs: d.panels }) !== "") problems.push("accepted but not postable");
  structuredClone(d.panels); // what postMessage does: must not throw
  return problems;
}

test(`${CASES} hostile links and inputs files: no pollution, no throw, refusals carry nothing`, () => {
  const before = snapshot();
  const r = rng(20260101);
  let accepted = 0;
  let refused = 0;
  let withRefusedKeys = 0;
  const failures = [];
  for (let i = 0; i < CASES; i++) {
    const isFile = i % 2 === 1;
    const input = isFile ? hostileFile(r) : hostileFragment(r);
    let d;
    try {
      d = isFile ? readInputsFile(input, SCHEMA) : decodeFragment(input, SCHEMA);
    } catch (err) {
      failures.push(`case ${i}: threw ${err && err.message}: ${input.slice(0, 200)}`);
      continue;
    }
    if (d === null) continue; // no inputs in it (an anchor)
    const problems = [];
    if (d.ok) {
      accepted += 1;
      if (d.refused.length) withRefusedKeys += 1;
      problems.push(...checkAccepted(d));
      const notice = acceptedNotice(d, isFile ? "The file" : "This link");
      if (d.refused.length && !notice.includes("they were refused: ")) problems.push("refused keys not named");
      if (/undefined|\[object/.test(notice)) problems.push(`notice reads ${notice}`);
    } else {
      refused += 1;
      if (Object.keys(d.panels).length || d.refused.length) problems.push("a refusal carries inputs");
      if (!d.error) problems.push("a refusal without a reason");
      if (/undefined|\[object/.test(refusedNotice(d, "This link"))) problems.push("refusal notice unclear");
    }
    if (({}).polluted !== undefined || ({}).text !== undefined || ({}).time !== undefined || ({}).x !== undefined) {
      problems.push("Object.prototype polluted");
    }
    if (problems.length) failures.push(`case ${i}: ${problems.slice(0, 3).join("; ")}: ${input.slice(0, 200)}`);
    if (failures.length > 20) break;
  }
  assert.deepEqual(failures, []);
  assert.deepEqual(snapshot(), before, "a shared prototype or global changed");
  // the corpus reaches every outcome
  assert.ok(accepted > 1000, `accepted ${accepted}`);
  assert.ok(refused > 500, `refused ${refused}`);
  assert.ok(withRefusedKeys > 1000, `with refused keys ${withRefusedKeys}`);
});

test("a decoded link or file never shares objects with its input, and decoding twice agrees", () => {
  const r = rng(7);
  for (let i = 0; i < 500; i++) {
    const text = hostileFile(r);
    let parsed;
    try {
      parsed = JSON.parse(text.replace(/^\uFEFF/, ""));
    } catch {
      continue;
    }
    let shown;
    try {
      shown = JSON.stringify(parsed);
    } catch {
      continue; // deeper than this test's own stringify goes
    }
    const a = readInputsFile(text, SCHEMA);
    const b = readInputsFile(text, SCHEMA);
    assert.equal(JSON.stringify(a), JSON.stringify(b));
    assert.equal(JSON.stringify(parsed), shown, "the input was changed");
  }
  assert.equal(LIMITS.depth >= 4, true);
});
