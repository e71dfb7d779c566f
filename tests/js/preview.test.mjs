// The preview of a measured file (site/js/preview.js): the summary of what the core reader
// found, the first rows with their roles, and the value a column picker shows. The
// descriptions below have the shape of driftdose.tables.describe_table (documented in the
// package's docstring; tests/api/test_spectrum_import.py checks the real reply's keys).
import { test } from "node:test";
import assert from "node:assert/strict";
import { pickValue, previewRows, tableSummary } from "../../site/js/preview.js";

const TABLE = {
  delimiter: "semicolon", decimal: "comma", header_line: 5, header_given: false, units_line: null,
  rows: 3, first_line: 6, last_line: 8,
  columns: [], gaps: [{ number: 2, name: "N [1/cm³]", count: 7, lines: [6, 7, 8, 9, 10, 11, 12] }],
  metadata: [{ line: 1, text: "Instrument;sizer" }, { line: 2, text: "Date;04.03.2026" }, { line: 3, text: "Flow;3,0" }, { line: 4, text: "Operator;A" }],
  footer: [{ line: 9, text: "Total;;2150" }], skipped_lines: 0,
  preview: { header: ["Dp [nm]", "N [1/cm³]"], rows: [{ line: 6, cells: ["10,5", "100"] }, { line: 7, cells: ["21", ""] }] },
  notes: [],
};

test("the summary names separator, decimal mark, header line, notes, rows, gaps and left-out rows", () => {
  const s = tableSummary(TABLE);
  assert.match(s, /^Semicolon-separated, decimal comma\./);
  assert.match(s, /Header found on line 5 \(4 lines of notes above it set aside\)\./);
  assert.match(s, /3 data rows, lines 6–8\./);
  assert.match(s, /Empty cells in column 2 “N \[1\/cm³\]”: 7 rows \(line 6, 7, 8, 9, 10, …\)\./);
  assert.match(s, /Left out after the data: line 9 “Total;;2150”\./);
});

test("a header line given by the user, a units row, no header", () => {
  assert.match(tableSummary({ ...TABLE, header_given: true, units_line: 6, metadata: [] }), /Header on line 5, units on line 6\./);
  assert.match(tableSummary({ ...TABLE, header_line: null, preview: { header: null, rows: [] } }), /No header row: columns are numbered\./);
  assert.equal(tableSummary(null), "");
});

test("preview rows: the last notes, the header, then data rows, each with its file line", () => {
  const rows = previewRows(TABLE, 2);
  assert.deepEqual(rows.map((r) => [r.line, r.role]), [[3, "note"], [4, "note"], [5, "header"], [6, "data"], [7, "data"]]);
  assert.deepEqual(rows[0].cells, ["Flow;3,0"]);
  assert.deepEqual(rows[3].cells, ["10,5", "100"]);
  assert.deepEqual(previewRows(null), []);
});

const PICKER = {
  options: [{ value: "Dp [nm]", label: "1: Dp [nm]" }, { value: "N [1/cm³]", label: "2: N [1/cm³]" }, { value: "Remark", label: "4: Remark" }],
  suggest: "N [1/cm³]",
  fills: {},
};

test("a freshly picked file takes the suggestion; otherwise the value in use stays", () => {
  assert.equal(pickValue("1", PICKER, true), "N [1/cm³]");
  assert.equal(pickValue("Dp [nm]", PICKER, false), "Dp [nm]");
  // a name typed in a link is kept as it came: the engine reads it (part of a name, any case)
  assert.equal(pickValue("dp", PICKER, false), "dp");
});

test("a column number from a link becomes that column's option, by its number not its place", () => {
  assert.equal(pickValue("2", PICKER, false), "N [1/cm³]");
  assert.equal(pickValue("4", PICKER, false), "Remark");
  assert.equal(pickValue("3", PICKER, false), "3"); // an empty column has no option: kept
  assert.equal(pickValue("", PICKER, false), "N [1/cm³]");
  assert.equal(pickValue("7", null, false), "7");
});

test("a long file: the summary says how many of its lines were examined", () => {
  const s = tableSummary({ ...TABLE, examined_lines: 2000, total_lines: 100001, rows: 1999, first_line: 2 });
  assert.match(s, /The first 2,000 lines of 100,001 were examined here \(the calculation reads them all\): 1,999 data rows from line 2\./);
});
