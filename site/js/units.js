// Unit codes to labels and SI: the one table, sent by the engine's description with the forms
// (forms.json "units"). Replies carry unit codes only ("um", "1/cm3"); panels label and convert
// with these functions and never spell a unit factor of their own.
let table = Object.create(null);

/** Install the table {code: {label, text, kind, factor, offset}} from the forms description. */
export function setUnitTable(units) {
  const next = Object.create(null);
  if (units && typeof units === "object") {
    for (const [code, spec] of Object.entries(units)) {
      if (spec && typeof spec === "object" && Number.isFinite(spec.factor)) {
        const label = typeof spec.label === "string" ? spec.label : code;
        next[code] = {
          label,
          text: typeof spec.text === "string" ? spec.text : label,
          factor: spec.factor,
          offset: Number.isFinite(spec.offset) ? spec.offset : 0,
        };
      }
    }
  }
  table = next;
}

/** The label of a unit code ("um" -> "µm"); an unknown code is shown as it is. */
export function unitLabel(code) {
  const spec = table[code];
  return spec ? spec.label : String(code ?? "");
}

/** The label printed after a number, as the table gives it (empty for a pure number); an
 * unknown code is shown as it is. */
export function unitText(code) {
  const spec = table[code];
  return spec ? spec.text : String(code ?? "");
}

/** A shown value followed by the printed label of its unit code ("2.5 µm"; "0.3" for a pure
 * number). */
export function withUnit(text, code) {
  const unit = unitText(code);
  return unit ? `${text} ${unit}` : String(text);
}

/** A value in the unit `code` converted to SI (x in µm -> metres); unknown codes throw. */
export function toSI(value, code) {
  const spec = table[code];
  if (!spec) throw new Error(`unknown unit code ${JSON.stringify(code)}`);
  return (value + spec.offset) * spec.factor;
}

/** An SI value converted to the unit `code` (metres -> µm); unknown codes throw. */
export function fromSI(value, code) {
  const spec = table[code];
  if (!spec) throw new Error(`unknown unit code ${JSON.stringify(code)}`);
  return value / spec.factor - spec.offset;
}
