// The table of exact values at the sizes the user typed (reply result "sizes_table", shaped by
// driftdose.api.size_list): one row per size, a column per curve. Shared by the sampling and
// deposition panels; presentation only, every number comes from the reply.
import { el } from "./dom.js";
import { formatNumber, lengthTick } from "./format.js";
import { unitText } from "./units.js";

/** A cell's text: a length in words ("25 nm"), else the value with its unit, or the words. */
export function sizeCell(q) {
  if (!q) return "—";
  if (q.text !== undefined) return q.text;
  if (q.key === "aerodynamic" || q.key === "diameter") return lengthTick(q.si);
  const unit = unitText(q.unit);
  return `${formatNumber(q.value)}${unit ? ` ${unit}` : ""}`;
}

/**
 * The table for `table` (the reply's sizes_table): a row per curve (the aerodynamic diameter
 * first), a column per size, in a box that scrolls sideways on a narrow screen with the first
 * column kept in view; null when no sizes were asked for.
 */
export function sizesTable(table, id) {
  if (!table || !Array.isArray(table.rows) || !table.rows.length) return null;
  const t = el("table", { class: "results sizes-table" });
  t.append(el("caption", {}, table.label));
  const head = el("thead");
  const hr = el("tr");
  hr.append(el("th", { scope: "col" }, `Size (${table.coordinate})`));
  for (const row of table.rows) hr.append(el("th", { scope: "col", class: "value" }, row.label));
  head.append(hr);
  const body = el("tbody");
  const keys = table.rows[0].quantities.filter((q) => q.key !== "diameter").map((q) => [q.key, q.label]);
  for (const [key, label] of keys) {
    const tr = el("tr", { "data-key": key });
    tr.append(el("th", { scope: "row" }, label));
    table.rows.forEach((row, i) => {
      const q = row.quantities.find((c) => c.key === key);
      tr.append(el("td", { class: "value", "data-key": key, "data-size": String(i) }, sizeCell(q)));
    });
    body.append(tr);
  }
  t.append(head, body);
  const box = el("div", { class: "table-box sizes-box", tabindex: "0", role: "region", "aria-label": "Values at your sizes (scrolls sideways on narrow screens)", id });
  const note = el("p", { class: "help" }, "Computed by the models at each size typed, not read off the chart.");
  box.append(t, note);
  return box;
}
