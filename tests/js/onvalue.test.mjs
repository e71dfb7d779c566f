// Field listeners (site/js/dom.js onValue): one call per new value. A text field's "change" on
// leaving it, and a select's "change" right after its "input", repeat a value already announced;
// a value the page set and then announced with "change" alone is new.
import test from "node:test";
import assert from "node:assert/strict";
import { onValue } from "../../site/js/dom.js";

// [name, starting value, events as [type, value set before it (or null)], values announced]
const CASES = [
  ["typing then leaving a text field: once per keystroke, not again on leaving", "10",
    [["input", "1"], ["input", "15"], ["change", null]], ["1", "15"]],
  ["a select's input and change for one choice: once", "nm",
    [["input", "um"], ["change", null], ["input", "nm"], ["change", null]], ["um", "nm"]],
  ["a change alone (no input events; a value set by the page) is news", "a",
    [["change", "b"], ["change", null], ["change", "c"], ["change", "a"]], ["b", "c", "a"]],
  ["typing back to the starting value is announced", "5",
    [["input", ""], ["input", "5"], ["change", null]], ["", "5"]],
];

for (const [name, start, events, expected] of CASES) {
  test(name, () => {
    const control = new EventTarget();
    control.value = start;
    const seen = [];
    onValue(control, () => seen.push(control.value));
    for (const [type, value] of events) {
      if (value !== null) control.value = value;
      control.dispatchEvent(new Event(type));
    }
    assert.deepEqual(seen, expected);
  });
}

test("the callback gets the event that announced the value", () => {
  const control = new EventTarget();
  control.value = "x";
  const types = [];
  onValue(control, (event) => types.push(event.type));
  control.value = "y";
  control.dispatchEvent(new Event("input"));
  control.dispatchEvent(new Event("change"));
  control.value = "z";
  control.dispatchEvent(new Event("change"));
  assert.deepEqual(types, ["input", "change"]);
});
