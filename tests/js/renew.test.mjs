// In-place renewal of shown results (site/js/dom.js renew): the page ends up showing exactly the
// freshly built nodes, while nodes of the same shape are kept and only what differs is written.
// A small stand-in for the DOM's node interface keeps count of the writes.
import test from "node:test";
import assert from "node:assert/strict";
import { renew } from "../../site/js/dom.js";

let writes = 0;

class Node {
  constructor(nodeType, nodeName) {
    this.nodeType = nodeType;
    this.nodeName = nodeName;
    this.childNodes = [];
    this.attributes = [];
    this.parent = null;
    this._value = null;
  }
  get firstChild() { return this.childNodes[0] ?? null; }
  get lastChild() { return this.childNodes[this.childNodes.length - 1] ?? null; }
  get nodeValue() { return this._value; }
  set nodeValue(v) { writes++; this._value = v; }
  getAttribute(name) { const a = this.attributes.find((x) => x.name === name); return a ? a.value : null; }
  hasAttribute(name) { return this.attributes.some((x) => x.name === name); }
  setAttribute(name, value) {
    writes++;
    const a = this.attributes.find((x) => x.name === name);
    if (a) a.value = String(value);
    else this.attributes.push({ name, value: String(value) });
  }
  removeAttribute(name) { writes++; this.attributes = this.attributes.filter((x) => x.name !== name); }
  append(...nodes) {
    for (const n of nodes) {
      if (n.parent) n.parent.childNodes.splice(n.parent.childNodes.indexOf(n), 1);
      n.parent = this;
      this.childNodes.push(n);
    }
  }
  replaceChildren(...nodes) {
    writes++;
    for (const n of this.childNodes) n.parent = null;
    this.childNodes = [];
    this.append(...nodes);
  }
  replaceWith(node) {
    writes++;
    const list = this.parent.childNodes;
    if (node.parent) node.parent.childNodes.splice(node.parent.childNodes.indexOf(node), 1);
    list[list.indexOf(this)] = node;
    node.parent = this.parent;
    this.parent = null;
  }
}

const text = (t) => { const n = new Node(3, "#text"); n._value = t; return n; };
const comment = (t) => { const n = new Node(8, "#comment"); n._value = t; return n; };
function h(tag, attrs = {}, ...children) {
  const n = new Node(1, tag.toUpperCase());
  for (const [k, v] of Object.entries(attrs)) n.attributes.push({ name: k, value: String(v) });
  n.append(...children.map((c) => (typeof c === "string" ? text(c) : c)));
  return n;
}
const show = (n) => (n.nodeType === 1
  ? `<${n.nodeName}${[...n.attributes].sort((a, b) => a.name.localeCompare(b.name)).map((a) => ` ${a.name}="${a.value}"`).join("")}>${n.childNodes.map(show).join("")}</${n.nodeName}>`
  : n.nodeType === 3 ? n.nodeValue : `<!--${n.nodeValue}-->`);
const table = (rows, attrs = {}) => h("table", { class: "results", ...attrs },
  h("tbody", {}, ...rows.map(([k, v]) => h("tr", { "data-key": k }, h("th", {}, k), h("td", { class: "value" }, v)))));

test("a table of the same shape keeps its elements; only the changed texts are written", () => {
  const box = h("div");
  renew(box, table([["a", "1"], ["b", "2"], ["c", "3"]]));
  const before = box.childNodes[0];
  const cells = before.childNodes[0].childNodes.map((tr) => tr.childNodes[1]);
  writes = 0;
  const fresh = table([["a", "1"], ["b", "2.5"], ["c", "3"]]);
  const expected = show(fresh);
  renew(box, fresh);
  assert.equal(box.childNodes[0], before);
  assert.deepEqual(before.childNodes[0].childNodes.map((tr) => tr.childNodes[1]), cells);
  assert.equal(writes, 1);
  assert.equal(show(box), `<DIV>${expected}</DIV>`);
});

test("nothing is written when nothing changed", () => {
  const box = h("div");
  renew(box, table([["a", "1"]]));
  writes = 0;
  renew(box, table([["a", "1"]]));
  assert.equal(writes, 0);
});

test("attributes are added, changed and removed to match", () => {
  const box = h("div");
  renew(box, h("p", { hidden: "", class: "x", "data-n": "1" }, "t"));
  const p = box.childNodes[0];
  renew(box, h("p", { class: "y", title: "new" }, "t"));
  assert.equal(box.childNodes[0], p);
  assert.equal(show(box), '<DIV><P class="y" title="new">t</P></DIV>');
});

test("children that differ in number or names are replaced, the rest kept", () => {
  const box = h("div");
  renew(box, table([["a", "1"], ["b", "2"]]));
  const tbl = box.childNodes[0];
  const fresh = table([["a", "1"], ["b", "2"], ["c", "3"]]);
  const expected = show(fresh);
  renew(box, fresh);
  assert.equal(box.childNodes[0], tbl); // the table is kept, its rows replaced
  assert.equal(show(box), `<DIV>${expected}</DIV>`);
  // a cell that gains an element beside its text
  const withNote = h("table", { class: "results" }, h("tbody", {}, h("tr", { "data-key": "a" }, h("th", {}, "a", h("span", { class: "note" }, " (n)")), h("td", { class: "value" }, "1"))));
  const wanted = show(withNote);
  renew(box, withNote);
  assert.equal(show(box), `<DIV>${wanted}</DIV>`);
  // an empty cell that gains a text, and one that loses it
  renew(box, table([["a", ""]]));
  renew(box, table([["a", "9"]]));
  assert.equal(show(box), `<DIV>${show(table([["a", "9"]]))}</DIV>`);
  renew(box, table([["a", ""]]));
  assert.equal(show(box), `<DIV>${show(table([["a", ""]]))}</DIV>`);
});

test("a different element, no nodes and other node kinds are shown as given", () => {
  const box = h("div");
  renew(box, table([["a", "1"]]));
  renew(box, h("p", {}, "none"));
  assert.equal(show(box), "<DIV><P>none</P></DIV>");
  renew(box);
  assert.equal(box.childNodes.length, 0);
  renew(box, h("p", {}, comment("x")));
  renew(box, h("p", {}, comment("y")));
  assert.equal(show(box), "<DIV><P><!--y--></P></DIV>");
  renew(box, h("p"), h("p", {}, "two"));
  assert.equal(show(box), "<DIV><P></P><P>two</P></DIV>");
});

test("an attribute renamed (as many attributes, one written) is removed", () => {
  const box = h("div");
  renew(box, h("td", { class: "value", "data-key": "a" }, "1"));
  renew(box, h("td", { class: "value", "data-size": "0" }, "1"));
  assert.equal(show(box), '<DIV><TD class="value" data-size="0">1</TD></DIV>');
});

test("a cell holding only text keeps its text node; text and elements swapped are replaced", () => {
  const box = h("div", {}, h("td", { class: "value" }, "1.5"), h("td", {}, "same"), h("td", {}, "a"), h("td", {}, h("b", {}, "bold")));
  const [number, same, plain, rich] = box.childNodes;
  const numberText = number.childNodes[0];
  writes = 0;
  renew(box, h("td", { class: "value" }, "2.5"), h("td", {}, "same"), h("td", {}, h("b", {}, "now bold")), h("td", {}, "now plain"));
  assert.equal(writes, 3); // the changed number, and the two cells whose child changed kind
  assert.equal(box.childNodes[0], number);
  assert.equal(number.childNodes[0], numberText);
  assert.equal(numberText.nodeValue, "2.5");
  assert.equal(same.childNodes[0].nodeValue, "same");
  assert.equal(plain.childNodes[0].nodeName, "B");
  assert.equal(plain.childNodes[0].childNodes[0].nodeValue, "now bold");
  assert.equal(rich.childNodes.length, 1);
  assert.equal(rich.childNodes[0].nodeType, 3);
  assert.equal(rich.childNodes[0].nodeValue, "now plain");
  // a cell that gains a second text node is renewed child by child, as before
  renew(number, text("3.5"), text(" µm"));
  assert.deepEqual(number.childNodes.map((n) => n.nodeValue), ["3.5", " µm"]);
});
