// What the page shows about a measured file under its control, from the core reader's
// description (driftdose.tables.describe_table, through driftdose.api.files): a summary of
// what was found and the first rows. Pure functions (no DOM), tested under node --test.

const DELIMITER_WORDS = { comma: "Comma", semicolon: "Semicolon", tab: "Tab", whitespace: "Blank" };

function plural(n, one, many = `${one}s`) {
  return `${n.toLocaleString("en")} ${n === 1 ? one : many}`;
}

function quoted(text, max = 40) {
  const s = String(text);
  return `“${s.length > max ? `${s.slice(0, max - 1)}…` : s}”`;
}

/**
 * One-paragraph summary of a table description: separator and decimal mark, where the header
 * is (found or given) and what stands above it, the rows, gaps and rows left out.
 */
export function tableSummary(table) {
  if (!table) return "";
  const parts = [];
  parts.push(`${DELIMITER_WORDS[table.delimiter] || table.delimiter}-separated, decimal ${table.decimal === "comma" ? "comma" : "point"}.`);
  if (table.header_line) {
    let where = `Header ${table.header_given ? "on line" : "found on line"} ${table.header_line}`;
    if (table.units_line) where += `, units on line ${table.units_line}`;
    const notes = table.metadata.length;
    where += notes ? ` (${plural(notes, "line")} of notes above it set aside).` : ".";
    parts.push(where);
  } else {
    parts.push("No header row: columns are numbered.");
  }
  if (table.examined_lines) {
    parts.push(`The first ${plural(table.examined_lines, "line")} of ${table.total_lines.toLocaleString("en")} were examined here (the calculation reads them all): ${plural(table.rows, "data row")} from line ${table.first_line}.`);
  } else {
    parts.push(`${plural(table.rows, "data row")}, lines ${table.first_line}–${table.last_line}.`);
  }
  for (const gap of table.gaps || []) {
    const lines = gap.lines.slice(0, 5).join(", ") + (gap.count > 5 ? ", …" : "");
    parts.push(`Empty cells in column ${gap.number} ${quoted(gap.name)}: ${plural(gap.count, "row")} (line ${lines}).`);
  }
  for (const row of table.footer || []) {
    parts.push(`Left out after the data: line ${row.line} ${quoted(row.text)}.`);
  }
  return parts.join(" ");
}

/**
 * The rows of the preview table: notes above the header (at most `notes` of them, as one
 * text cell), the header, then the first data rows; each {line, role, cells}. `role` is
 * "note", "header" or "data".
 */
export function previewRows(table, notes = 3) {
  if (!table) return [];
  const out = [];
  const shown = table.metadata.slice(-notes);
  for (const m of shown) out.push({ line: m.line, role: "note", cells: [m.text] });
  if (table.preview.header) out.push({ line: table.header_line, role: "header", cells: table.preview.header });
  for (const r of table.preview.rows) out.push({ line: r.line, role: "data", cells: r.cells });
  return out;
}

/**
 * The value a column picker shows after a file is described: the suggestion for a freshly
 * picked file; otherwise the current value when it is one of the options (a name or number
 * typed in a link stays as it is, and the engine reads it); the suggestion when the current
 * value was the previous file's column that no longer exists.
 */
export function pickValue(current, picker, fresh) {
  if (!picker) return current;
  const values = picker.options.map((o) => o.value);
  if (fresh && picker.suggest) return picker.suggest;
  if (values.includes(current)) return current;
  if (/^\d+$/.test(String(current).trim())) {
    // a column number from a link or the default: the option of that column
    const hit = picker.options.find((o) => o.label.startsWith(`${Number(current)}: `));
    if (hit) return hit.value;
  }
  if (!fresh && picker.suggest && (current === "" || current === undefined || current === null)) return picker.suggest;
  return current;
}
