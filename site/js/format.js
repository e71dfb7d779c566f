// Number formatting for display: significant figures, powers of ten written with superscripts.

const SUPERSCRIPT = { "-": "⁻", 0: "⁰", 1: "¹", 2: "²", 3: "³", 4: "⁴", 5: "⁵", 6: "⁶", 7: "⁷", 8: "⁸", 9: "⁹" };

export const SIG_FIGS = 4;

/** Format a finite number with `digits` significant figures ("2.735 × 10⁻¹¹", "0.1234"). */
export function formatNumber(value, digits = SIG_FIGS) {
  if (typeof value !== "number" || !Number.isFinite(value)) return "—";
  if (value === 0) return "0";
  const abs = Math.abs(value);
  if (abs >= 1e-3 && abs < 1e6) {
    const text = value.toPrecision(digits);
    // toPrecision switches to exponent form once the integer part has more digits than asked
    return text.includes("e") ? String(Number(text)) : trimZeros(text);
  }
  const [mantissa, exponent] = value.toExponential(digits - 1).split("e");
  const exp = String(Number(exponent)).split("").map((c) => SUPERSCRIPT[c]).join("");
  return `${trimZeros(mantissa)} × 10${exp}`;
}

function trimZeros(text) {
  if (!text.includes(".") || text.includes("e")) return text;
  return text.replace(/\.?0+$/, "");
}

/** Parse a string made by formatNumber back into a number (used by tests and exports). */
export function parseFormatted(text) {
  const map = Object.fromEntries(Object.entries(SUPERSCRIPT).map(([k, v]) => [v, k]));
  const m = text.match(/^(-?[\d.]+)(?: × 10([⁻⁰¹²³⁴⁵⁶⁷⁸⁹]+))?$/);
  if (!m) return NaN;
  const exp = m[2] ? Number(m[2].split("").map((c) => map[c]).join("")) : 0;
  return Number(m[1]) * 10 ** exp;
}

/** Short tick label for a power of ten of a length in metres ("1 nm", "10 µm", "1 m"). */
export function lengthTick(metres) {
  const units = [[1e-9, "nm"], [1e-6, "µm"], [1e-3, "mm"], [1, "m"], [1e3, "km"]];
  let chosen = units[0];
  for (const u of units) if (metres >= u[0] * 0.999) chosen = u;
  return `${formatNumber(metres / chosen[0], 3)} ${chosen[1]}`;
}

/** Option texts longer than this are shown without their parenthetical parts. */
export const OPTION_CHARS = 32;

/**
 * The text of an option in a select: a label longer than OPTION_CHARS loses its parenthetical
 * parts ("ICRP 66 full regional model (ET1, ET2, BB, bb, AI)" → "ICRP 66 full regional
 * model"), since a closed select cannot wrap; the full label is shown beside it (forms.js).
 */
export function optionText(label) {
  const text = String(label ?? "");
  if (text.length <= OPTION_CHARS) return text;
  const short = text.replace(/\s*\([^()]*\)/g, "").replace(/\s+,/g, ",").replace(/\s{2,}/g, " ").trim();
  return short || text;
}
