// Field listeners (site/js/dom.js onValue): one call per new value. A text field's "change" on
// leaving it, and a select's "change" right after its "input", repeat a value already announced;
// a value the page set and then announced with "change" alone is new.
import test from "node:test";
import assert from "node:assert/strict";
import { onValue } from "../../site/js/dom.js";

function control(value) {
  const target = new EventTarget();
  target.value = value;
  return target;
}

function fire(target, type, value) {
  if (value !== undefined) target.value = value;
  target.dispatchEvent(new Event(type));
}

test("typing then leaving a text field asks once per keystroke, not again on leaving", () => {
  const input = control("10");
  const seen = [];
  onValue(input, () => seen.push(input.value));
  fire(input, "input", "1");
  fire(input, "input", "15");
  fire(input, "change");
  assert.deepEqual(seen, ["1", "15"]);
});

test("a select's input and change for one choice ask once", () => {
  const select = control("nm");
  const seen = [];
  onValue(select, (event) => seen.push([event.type, select.value]));
  fire(select, "input", "um");
  fire(select, "change");
  fire(select, "input", "nm");
  fire(select, "change");
  assert.deepEqual(seen, [["input", "um"], ["input", "nm"]]);
});

test("a change alone (a browser without input events, a value set by the page) is news", () => {
  const select = control("a");
  const seen = [];
  onValue(select, () => seen.push(select.value));
  fire(select, "change", "b");
  fire(select, "change");
  select.value = "c"; // set by the page (a link applied), then announced by a change
  fire(select, "change");
  fire(select, "change", "a");
  assert.deepEqual(seen, ["b", "c", "a"]);
});

test("going back to the starting value by typing is announced", () => {
  const input = control("5");
  const seen = [];
  onValue(input, () => seen.push(input.value));
  fire(input, "input", "");
  fire(input, "input", "5");
  fire(input, "change");
  assert.deepEqual(seen, ["", "5"]);
});
