// What arrives from outside the page (a link's fragment, an inputs file) is read here before any
// of it reaches a panel. Nothing here touches the DOM, so Node's test runner checks it directly.
//
// Rules:
// - decoding builds objects without a prototype, so no key (`__proto__`, `constructor`,
//   `prototype`, ...) can reach Object.prototype or any other shared object;
// - only the keys the panels declare (the field descriptions of forms.json) are kept; every
//   other key is refused and named, with its path, so the page can say so;
// - depth, number of values and text size are bounded before anything is applied or posted;
// - the whole input is read before anything is applied: a refusal changes nothing.
// Values keep their raw form (Python validates them as typed input): a value of a field is
// text, a number, true/false, null or {value, unit}; lists of modes or stages are lists of
// such items. Any other structure in a value's place becomes its JSON text, which the form
// shows and the engine then names as invalid.

export const STATE_VERSION = "1";
export const STATE_FORMAT = "drift-and-dose-inputs";

export const LIMITS = Object.freeze({
  depth: 12, // nesting below a field's value (a list of items with {value, unit} needs 3)
  nodes: 100_000, // objects, lists and values in one link or file
  chars: 16_000_000, // characters of text in one link or file (two 5 MB spectra fit)
  keyChars: 200, // a longer key is refused without reading it further
  items: 1000, // items of one list (the engine says how many it allows, which is fewer)
  fragmentChars: 16_000_000, // characters of a fragment, before decoding
});

const REFUSED_SHOWN = 8; // refused keys named in a notice at most
// former names of each panel's fields (forms.json `formerly`), kept beside the schema
const FORMER = new WeakMap();

const isPlain = (v) => v !== null && typeof v === "object" && !Array.isArray(v);
const bare = () => Object.create(null);

/** Text with lone surrogates replaced, so it survives JSON and Python's UTF-8 unchanged. */
function wellFormed(text) {
  return typeof text.toWellFormed === "function" ? text.toWellFormed() : text;
}

/** A key as it may be named in a notice: short, printable. */
export function showKey(key) {
  const text = String(key).replace(/[\u0000-\u001f\u007f-\u009f]/g, "?");
  return text.length > 60 ? `${text.slice(0, 57)}…` : text;
}

/**
 * The declared shape of every panel, from the forms.json description of each calculation:
 * {panelId: {fieldName: field}} (maps without prototypes). The survey details of the record
 * (`options.survey`: their names) travel as one more group, "survey", of text entries.
 * @param {object} forms forms.json content
 * @param {Array<{id: string, kind?: string}>} panels
 * @param {{survey?: string[]}} options
 */
export function schemaFrom(forms, panels, options = {}) {
  const schema = bare();
  for (const p of panels) {
    const description = forms && forms.calculations && Object.hasOwn(forms.calculations, p.kind || p.id)
      ? forms.calculations[p.kind || p.id] : null;
    const fields = bare();
    const former = bare();
    for (const f of (description && description.fields) || []) {
      fields[f.name] = f;
      for (const old of Array.isArray(f.formerly) ? f.formerly : []) {
        if (typeof old === "string") former[old] = f.name;
      }
    }
    FORMER.set(fields, former);
    schema[p.id] = fields;
  }
  if (options.survey) {
    const fields = bare();
    for (const name of options.survey) fields[name] = { name, kind: "text" };
    schema.survey = fields;
  }
  return schema;
}

/**
 * The declared name a link or file key stands for: the key itself, or the current name of a
 * field that was called so in an earlier version (a link written before a rename still
 * reads); null when the panel declares no such field.
 */
export function declaredName(fields, name) {
  if (Object.hasOwn(fields, name)) return name;
  const former = FORMER.get(fields);
  return former && Object.hasOwn(former, name) && Object.hasOwn(fields, former[name]) ? former[name] : null;
}

/**
 * Measure a value without recursion: depth, node count and characters of text. Stops early
 * (`over` set) as soon as a bound is passed, so a hostile value costs at most its bound.
 */
export function measure(value, limits = LIMITS) {
  let nodes = 0;
  let chars = 0;
  let depth = 0;
  const stack = [[value, 0]];
  while (stack.length) {
    const [v, d] = stack.pop();
    nodes += 1;
    if (d > depth) depth = d;
    if (depth > limits.depth) return { depth, nodes, chars, over: "depth" };
    if (nodes > limits.nodes) return { depth, nodes, chars, over: "nodes" };
    if (typeof v === "object" && v !== null && (ArrayBuffer.isView(v) || v instanceof ArrayBuffer)) {
      continue; // bytes (a file for the decoder) travel as one block
    }
    if (typeof v === "string") {
      chars += v.length;
      if (chars > limits.chars) return { depth, nodes, chars, over: "chars" };
    } else if (Array.isArray(v)) {
      for (let i = v.length - 1; i >= 0; i--) stack.push([v[i], d + 1]);
    } else if (v !== null && typeof v === "object") {
      for (const key of Object.keys(v)) {
        chars += key.length;
        stack.push([v[key], d + 1]);
      }
    }
  }
  return { depth, nodes, chars, over: null };
}

/** Why a value may not be posted to the engine (too deep or too big), or "" when it may. */
export function postRefusal(value, limits = { ...LIMITS, depth: 32 }) {
  const m = measure(value, limits);
  if (m.over === "depth") return `the inputs are nested more than ${limits.depth} levels deep`;
  if (m.over === "nodes") return `the inputs hold more than ${limits.nodes.toLocaleString("en")} values`;
  if (m.over === "chars") return `the inputs hold more than ${(limits.chars / 1e6).toFixed(0)} million characters of text`;
  return "";
}

/** The error that refuses a whole link or file for its size, or null. */
function boundsError(value, limits) {
  const m = measure(value, limits);
  if (m.over === "depth") return `it is nested more than ${limits.depth} levels deep`;
  if (m.over === "nodes") return `it holds more than ${limits.nodes.toLocaleString("en")} values`;
  if (m.over === "chars") return `it holds more than ${(limits.chars / 1e6).toFixed(0)} million characters of text`;
  return null;
}

/** A leaf value: primitives as they are (text made well-formed); structures as JSON text. */
function leaf(v) {
  if (typeof v === "string") return wellFormed(v);
  if (v === null || typeof v === "number" || typeof v === "boolean") return v;
  if (v === undefined) return null;
  return wellFormed(JSON.stringify(v) ?? String(v));
}

/**
 * A quantity: {value, unit} keeps only those two keys (as leaves); anything else is a leaf.
 * Refused keys are added to `refused` with `path`.
 */
function quantity(v, path, refused) {
  if (!isPlain(v) || !Object.hasOwn(v, "value")) return leaf(v);
  const out = bare();
  out.value = leaf(v.value);
  if (Object.hasOwn(v, "unit")) out.unit = leaf(v.unit);
  for (const key of Object.keys(v)) if (key !== "value" && key !== "unit") refused.push(`${path}.${showKey(key)}`);
  return out;
}

/**
 * One item of a list (a mode or a stage) with the keys `allowed` maps to their declarations.
 * A key a declaration lists in `formerly` (its name before a rename) is read under the current
 * name, unless the item also gives the current one.
 */
function item(v, allowed, path, refused) {
  if (!isPlain(v)) return leaf(v);
  const out = bare();
  const former = bare();
  for (const name of Object.keys(allowed)) {
    const f = allowed[name];
    for (const old of (f && Array.isArray(f.formerly)) ? f.formerly : []) {
      if (typeof old === "string" && !Object.hasOwn(allowed, old)) former[old] = name;
    }
  }
  for (const key of Object.keys(v)) {
    const name = Object.hasOwn(allowed, key) ? key : Object.hasOwn(former, key) ? former[key] : null;
    if (name === null) {
      refused.push(`${path}.${showKey(key)}`);
      continue;
    }
    if (name !== key && Object.hasOwn(v, name)) continue; // the current name wins
    out[name] = allowed[name] && allowed[name].kind === "choice" ? leaf(v[key]) : quantity(v[key], `${path}.${name}`, refused);
  }
  return out;
}

function stageKeys(field, type) {
  const types = field.stage_types || {};
  const keys = bare();
  keys.type = { kind: "choice" };
  const kinds = typeof type === "string" && Object.hasOwn(types, type) ? [type] : Object.keys(types);
  for (const kind of kinds) for (const f of types[kind].fields || []) keys[f.name] = f;
  return keys;
}

/** A field's value in the shape its declaration allows. */
function fieldValue(field, v, path, refused) {
  if (field.item_fields) {
    if (!Array.isArray(v)) return leaf(v);
    const allowed = bare();
    for (const f of field.item_fields) allowed[f.name] = f;
    return v.slice(0, LIMITS.items).map((x, i) => item(x, allowed, `${path}[${i}]`, refused));
  }
  if (field.stage_types) {
    if (!Array.isArray(v)) return leaf(v);
    return v.slice(0, LIMITS.items).map((x, i) => item(x, stageKeys(field, isPlain(x) ? x.type : undefined), `${path}[${i}]`, refused));
  }
  if (field.kind === "choice" || field.kind === "text" || field.kind === "data" || field.kind === "records") return leaf(v);
  return quantity(v, path, refused);
}

/**
 * Keep the panels' declared entries of `panels` (an object {panelId: {field: raw}}); returns
 * {panels, refused} with `panels` a map without prototype of maps without prototype.
 */
export function cleanPanels(panels, schema) {
  const refused = [];
  const out = bare();
  if (!isPlain(panels)) return { panels: out, refused };
  for (const pid of Object.keys(panels)) {
    const fields = Object.hasOwn(schema, pid) ? schema[pid] : null;
    const values = panels[pid];
    if (!fields || !isPlain(values)) {
      refused.push(showKey(pid));
      continue;
    }
    const clean = bare();
    for (const name of Object.keys(values)) {
      if (name === "demo") {
        if (typeof values.demo === "string") clean.demo = wellFormed(values.demo);
        else refused.push(`${showKey(pid)}.demo`);
      } else if (declaredName(fields, name) !== null) {
        // a former name gives way to the current one when both are present
        const current = declaredName(fields, name);
        if (current !== name && Object.hasOwn(values, current)) continue;
        clean[current] = fieldValue(fields[current], values[name], `${pid}.${current}`, refused);
      } else {
        refused.push(`${showKey(pid)}.${showKey(name)}`);
      }
    }
    out[pid] = clean;
  }
  return { panels: out, refused };
}

/** Decode a fragment value: `j:<JSON>`, `value~unit` for fields with units, else text. */
function fragmentValue(field, value) {
  if (value.startsWith("j:")) {
    try {
      return { raw: JSON.parse(value.slice(2)) };
    } catch {
      return { raw: value };
    }
  }
  const hasUnits = field && !field.item_fields && !field.stage_types && field.kind !== "choice"
    && field.kind !== "text" && field.kind !== "data" && field.kind !== "records";
  const tilde = hasUnits ? value.lastIndexOf("~") : -1;
  return { raw: tilde >= 0 ? { value: value.slice(0, tilde), unit: value.slice(tilde + 1) } : value };
}

/**
 * Read a fragment (`#v=1&panel=<id>&<panel>.<field>=<value>[~<unit>]`).
 * Returns null when the fragment carries no inputs (empty, or an in-page anchor such as
 * `#main`); otherwise {ok, error, version, panel, panels, refused}. With ok false nothing may be
 * applied; `refused` lists the keys left out of an accepted link.
 */
export function decodeFragment(hash, schema, limits = LIMITS) {
  const text = typeof hash === "string" ? hash.replace(/^#/, "") : "";
  if (!text || !text.includes("=")) return null;
  const result = { ok: false, error: "", version: null, panel: null, panels: bare(), refused: [] };
  if (text.length > limits.fragmentChars) {
    result.error = `it is ${(text.length / 1e6).toFixed(1)} million characters long (at most ${(limits.fragmentChars / 1e6).toFixed(0)} million)`;
    return result;
  }
  let params;
  try {
    params = [...new URLSearchParams(text)];
  } catch {
    result.error = "it could not be decoded";
    return result;
  }
  const raw = bare();
  const refused = [];
  for (const [key0, value0] of params) {
    const key = wellFormed(key0);
    const value = wellFormed(value0);
    if (key.length > limits.keyChars) {
      refused.push(showKey(key));
    } else if (key === "v") {
      result.version = value;
    } else if (key === "panel") {
      result.panel = value;
    } else {
      const dot = key.indexOf(".");
      const pid = dot > 0 ? key.slice(0, dot) : "";
      const name = dot > 0 ? key.slice(dot + 1) : "";
      const fields = pid && Object.hasOwn(schema, pid) ? schema[pid] : null;
      const current = fields && name ? (name === "demo" ? name : declaredName(fields, name)) : null;
      if (current === null) {
        refused.push(showKey(key));
        continue;
      }
      if (!Object.hasOwn(raw, pid)) raw[pid] = bare();
      // a former name gives way to the current one, whichever comes first in the link
      if (current !== name && Object.hasOwn(raw[pid], current)) continue;
      raw[pid][current] = current === "demo" ? value : fragmentValue(fields[current], value).raw;
    }
  }
  const error = boundsError(raw, { ...limits, depth: limits.depth + 2 });
  if (error) {
    result.error = error;
    return result;
  }
  const clean = cleanPanels(raw, schema);
  result.panels = clean.panels;
  result.refused = [...refused, ...clean.refused];
  if (result.panel !== null && !Object.hasOwn(schema, result.panel)) {
    result.refused.push(`panel=${showKey(result.panel)}`);
    result.panel = null;
  }
  result.ok = true;
  return result;
}

/**
 * Read an inputs file's text (already decoded). Returns {ok, error, version, panel, panels,
 * refused}: ok false with the reason when the whole file is refused (then nothing may change).
 */
export function readInputsFile(text, schema, limits = LIMITS) {
  const result = { ok: false, error: "", version: null, panel: null, panels: bare(), refused: [] };
  if (typeof text !== "string") {
    result.error = "it is not text";
    return result;
  }
  if (text.length > limits.chars) {
    result.error = `it holds more than ${(limits.chars / 1e6).toFixed(0)} million characters`;
    return result;
  }
  let data;
  try {
    data = JSON.parse(text.replace(/^\uFEFF/, ""));
  } catch (err) {
    // the parser's own message quotes the file's text; say plainly what is wrong instead
    result.error = err instanceof RangeError
      ? "it is nested too deeply to read"
      : "it is not a valid JSON file (a Drift & Dose inputs file is JSON text)";
    return result;
  }
  if (!isPlain(data) || data.format !== STATE_FORMAT || !Object.hasOwn(data, "panels")
    || !(data.panels === null || isPlain(data.panels))) {
    result.error = "it is not a Drift & Dose inputs file";
    return result;
  }
  const version = Object.hasOwn(data, "version") ? data.version : null;
  if (!(version === null || typeof version === "string" || typeof version === "number")) {
    result.error = "its format version is neither a number nor text";
    return result;
  }
  const error = boundsError([data.panels, data.survey], { ...limits, depth: limits.depth + 3 });
  if (error) {
    result.error = error;
    return result;
  }
  // the survey details stand beside the panels in a saved file
  const groups = bare();
  for (const pid of data.panels === null ? [] : Object.keys(data.panels)) groups[pid] = data.panels[pid];
  if (Object.hasOwn(data, "survey") && data.survey !== null) groups.survey = data.survey;
  const clean = cleanPanels(groups, schema);
  result.panels = clean.panels;
  result.refused = clean.refused;
  result.version = version === null ? null : wellFormed(String(version));
  if (Object.hasOwn(data, "panel")) {
    if (typeof data.panel === "string" && Object.hasOwn(schema, data.panel)) result.panel = data.panel;
    else if (data.panel !== null) result.refused.push(`panel=${showKey(leaf(data.panel))}`);
  }
  result.ok = true;
  return result;
}

/**
 * The notice for an accepted link or file (`origin`: "This link" or "The file"), or "" when
 * there is nothing to say.
 */
export function acceptedNotice(decoded, origin) {
  const problems = [];
  const entries = Object.keys(decoded.panels).length > 0;
  if (decoded.version === null || decoded.version === undefined) {
    if (entries) problems.push(`${origin} does not say which format it uses; it was read as format ${STATE_VERSION}.`);
  } else if (String(decoded.version) !== STATE_VERSION) {
    problems.push(`${origin} was made by another version of the tool (format ${showKey(String(decoded.version)).slice(0, 12)}); its inputs were loaded as far as they still apply.`);
  }
  if (decoded.refused.length) {
    const shown = decoded.refused.slice(0, REFUSED_SHOWN).join(", ");
    const more = decoded.refused.length > REFUSED_SHOWN ? ` and ${decoded.refused.length - REFUSED_SHOWN} more` : "";
    problems.push(`${origin} had entries that no panel declares; they were refused: ${shown}${more}.`);
  }
  if (!problems.length) return "";
  return `${problems.join(" ")} Check the inputs before relying on the results.`;
}

/** The notice for a refused link or file. */
export function refusedNotice(decoded, origin) {
  return `${origin} was refused: ${decoded.error}. Nothing was changed; the page works with the inputs it had.`;
}
