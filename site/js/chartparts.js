// Pure pieces of the charts (no DOM, tested under Node): axis titles, hover readouts, the one-line
// scenario of an exported image, text wrapping for its header, and the PNG text chunks that carry
// title, scenario and tool version inside the saved file.

/** At most this many particles are compared in the motion panel (the form's and two more). */
export const MAX_COMPARED = 3;

/**
 * Title of an axis; `unit` the printed label (unitText: empty for a pure number). When the tick
 * labels carry their own units ("10 nm", "1 µm"), the title is the quantity alone: a unit in the
 * title would contradict ticks in other units.
 */
export function axisTitle(label, unit, ticksCarryUnit = false) {
  const name = String(label ?? "").trim();
  if (ticksCarryUnit || !unit) return name;
  return `${name} (${unit})`;
}

/** Hover readout of one point: the series named, then its value ("Settling distance: 3 µm"). */
export function readout(series, valueText) {
  return `${String(series ?? "").trim() || "Value"}: ${valueText}`;
}

/** Letter of the n-th particle compared (0 → "A"). */
export function particleLetter(index) {
  return String.fromCharCode(65 + index);
}

/**
 * One line naming the scenario of a chart from rows {label, value, unit} (the inputs in the
 * words of the form, `unit` the printed label, empty for a pure number): "Particle diameter 1 µm · Particle density 1 g/cm³ · …". Rows whose
 * label is in `skip` are left out; with `maxLength`, a longer line ends at the last whole entry
 * that fits with the " · …" that marks the cut.
 */
export function scenarioLine(rows, { skip = [], maxLength = Infinity } = {}) {
  const parts = [];
  for (const row of rows || []) {
    if (!row || skip.includes(row.label)) continue;
    const value = String(row.value ?? "").replace(/\s+/g, " ").trim();
    if (!value) continue;
    const unit = row.unit ? ` ${row.unit}` : "";
    parts.push(`${row.label} ${value}${unit}`);
  }
  const whole = parts.join(" · ");
  if (whole.length <= maxLength) return whole;
  let kept = parts.length - 1;
  while (kept > 0 && `${parts.slice(0, kept).join(" · ")} · …`.length > maxLength) kept--;
  if (kept === 0) return `${parts[0].slice(0, Math.max(0, maxLength - 1))}…`;
  return `${parts.slice(0, kept).join(" · ")} · …`;
}

/**
 * Break `text` into lines no wider than `maxWidth` as measured by `measure(text)`, at spaces;
 * a word wider than a line stands alone. At most `maxLines` lines: the last one ends in "…"
 * when text was left out.
 */
export function wrapText(text, maxWidth, measure, maxLines = Infinity) {
  const words = String(text ?? "").split(/\s+/).filter(Boolean);
  const lines = [];
  let line = "";
  for (const word of words) {
    const next = line ? `${line} ${word}` : word;
    if (line && measure(next) > maxWidth) {
      lines.push(line);
      line = word;
    } else {
      line = next;
    }
  }
  if (line) lines.push(line);
  if (lines.length <= maxLines) return lines;
  const kept = lines.slice(0, maxLines);
  let last = `${kept[maxLines - 1]} …`;
  while (measure(last) > maxWidth && last.includes(" ")) last = `${last.slice(0, last.lastIndexOf(" ", last.length - 3))} …`;
  kept[maxLines - 1] = last;
  return kept;
}

/**
 * Every how many decades a logarithmic axis labels: 1 when labels `labelPx` wide (gap included)
 * fit between neighbouring decades `span / (decades - 1)` pixels apart, else 2, 3, … (a narrow
 * chart labels 1 nm, 100 nm, 10 µm instead of running six labels together).
 */
export function decadeStride(span, decades, labelPx) {
  if (!(span > 0) || !(decades > 1) || !(labelPx > 0)) return 1;
  return Math.max(1, Math.ceil(labelPx / (span / (decades - 1))));
}

/**
 * A legend entry's text that fits `maxWidth` as measured by `measure(text)`: the whole text;
 * else the text without its closing parenthetical ("Your distribution by number (dW/dln d, …)"
 * → "Your distribution by number"); else cut at a space and ended with "…". The series keeps
 * its full name in hover readouts and exports.
 */
export function fitLegendText(text, maxWidth, measure) {
  const whole = String(text ?? "");
  if (!(maxWidth > 0) || measure(whole) <= maxWidth) return whole;
  const short = whole.replace(/\s*\([^()]*\)\s*$/, "");
  if (short && short !== whole && measure(short) <= maxWidth) return short;
  const words = (short || whole).split(/\s+/).filter(Boolean);
  for (let kept = words.length - 1; kept > 1; kept--) {
    const cut = `${words.slice(0, kept).join(" ")} …`;
    if (measure(cut) <= maxWidth) return cut;
  }
  return `${words[0] ?? ""} …`;
}

/** The three lines an exported chart image carries: title, scenario and the footer. */
export function imageText({ title, scenario, version, date }) {
  return {
    title: String(title ?? "").trim() || "Chart",
    scenario: String(scenario ?? "").trim(),
    footer: `Drift & Dose ${version || "(version unknown)"} · ${date} · screening estimate, see the record for methods and cautions`,
  };
}

// --- PNG text chunks ------------------------------------------------------------------------

let crcTable = null;

/** CRC-32 (ISO 3309, as PNG uses it) of `bytes`. */
export function crc32(bytes) {
  if (!crcTable) {
    crcTable = new Uint32Array(256);
    for (let n = 0; n < 256; n++) {
      let c = n;
      for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
      crcTable[n] = c >>> 0;
    }
  }
  let c = 0xffffffff;
  for (const b of bytes) c = crcTable[(c ^ b) & 0xff] ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}

const PNG_SIGNATURE = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];

function chunk(type, data) {
  const out = new Uint8Array(12 + data.length);
  const view = new DataView(out.buffer);
  view.setUint32(0, data.length);
  const typeBytes = new TextEncoder().encode(type);
  out.set(typeBytes, 4);
  out.set(data, 8);
  view.setUint32(8 + data.length, crc32(out.subarray(4, 8 + data.length)));
  return out;
}

/**
 * An iTXt chunk (PNG 1.2, section 11.3.4.5): keyword (Latin letters), no compression, empty
 * language tag, UTF-8 text, so µ, ² and ³ survive.
 */
function itxt(keyword, text) {
  const enc = new TextEncoder();
  const key = enc.encode(keyword);
  const body = enc.encode(String(text).replace(/\0/g, ""));
  const data = new Uint8Array(key.length + 5 + body.length);
  data.set(key, 0);
  // after the keyword: NUL, compression flag 0, method 0, empty language tag + NUL, empty
  // translated keyword + NUL
  data.set([0, 0, 0, 0, 0], key.length);
  data.set(body, key.length + 5);
  return chunk("iTXt", data);
}

/**
 * PNG `bytes` with text chunks inserted after the header chunk: `fields` maps a PNG keyword
 * ("Title", "Description", "Software", "Creation Time") to its text. Throws on bytes that are
 * not a PNG.
 */
export function pngWithText(bytes, fields) {
  if (bytes.length < 33 || PNG_SIGNATURE.some((b, i) => bytes[i] !== b)) throw new Error("not a PNG image");
  const ihdrEnd = 8 + 12 + new DataView(bytes.buffer, bytes.byteOffset).getUint32(8);
  const extra = Object.entries(fields).filter(([, v]) => v !== undefined && v !== "").map(([k, v]) => itxt(k, v));
  const size = bytes.length + extra.reduce((n, c) => n + c.length, 0);
  const out = new Uint8Array(size);
  out.set(bytes.subarray(0, ihdrEnd), 0);
  let at = ihdrEnd;
  for (const c of extra) {
    out.set(c, at);
    at += c.length;
  }
  out.set(bytes.subarray(ihdrEnd), at);
  return out;
}

/** The text chunks of a PNG as {keyword: text} (iTXt and tEXt), for checks. */
export function pngText(bytes) {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const out = {};
  const dec = new TextDecoder();
  let at = 8;
  while (at + 12 <= bytes.length) {
    const length = view.getUint32(at);
    const type = dec.decode(bytes.subarray(at + 4, at + 8));
    const data = bytes.subarray(at + 8, at + 8 + length);
    if (type === "iTXt" || type === "tEXt") {
      const nul = data.indexOf(0);
      const key = dec.decode(data.subarray(0, nul));
      if (type === "tEXt") {
        out[key] = new TextDecoder("latin1").decode(data.subarray(nul + 1));
      } else {
        let p = nul + 3; // NUL, compression flag, method
        p = data.indexOf(0, p) + 1; // language tag
        p = data.indexOf(0, p) + 1; // translated keyword
        out[key] = dec.decode(data.subarray(p));
      }
    }
    at += 12 + length;
    if (type === "IEND") break;
  }
  return out;
}

/**
 * The x values of one curve of a reply: its own list, or the shared axis of `curves.axes` it
 * names (a reply sends an x array shared by several curves once). Anything else gives [].
 */
export function curveX(curves, curve) {
  let x = curve?.x;
  if (typeof x === "string") {
    const axes = curves?.axes;
    x = axes && typeof axes === "object" && Object.hasOwn(axes, x) ? axes[x] : null;
  }
  return Array.isArray(x) ? x : [];
}

/**
 * A curve of a reply as chart points {x, y}; with `keep`, a point whose y fails `keep(y)` gets
 * y null (a gap in the line).
 */
export function curvePoints(curves, curve, keep = null) {
  const y = Array.isArray(curve?.y) ? curve.y : [];
  return curveX(curves, curve).map((x, i) => ({ x, y: keep && !keep(y[i]) ? null : y[i] }));
}
