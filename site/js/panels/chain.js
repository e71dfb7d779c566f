// The sampling chain's editor: an ordered list of stages, each the fields its type declares
// (forms.json stage_types), with add, move and remove; stage errors shown beside their value.
import { el, renderField } from "../forms.js";
import { withUnit } from "../units.js";

const RENDER_LIMIT = 40; // stages drawn from a tampered link at most (the API refuses above its own limit)
const isObject = (v) => v !== null && typeof v === "object" && !Array.isArray(v);

/**
 * The chain builder: an ordered list of stages, each a fieldset of the fields its type declares.
 * Stage errors from the API arrive as field "stages.<index>.<parameter>".
 */
export function chainEditor(field, onChange) {
  const types = field.stage_types || {};
  const max = field.max_stages || 20;
  const box = el("fieldset", { class: "chain" });
  box.append(el("legend", {}, field.label));
  box.append(el("p", { class: "help" }, `${field.help} At most ${max} stages. Each stage can be moved or removed with its own buttons.`));
  const list = el("ol", { class: "stages" });
  const chainError = el("p", { class: "error", hidden: "" });
  const status = el("p", { class: "chain-status visually-hidden", role: "status", "aria-live": "polite" });

  const adder = el("div", { class: "chain-add" });
  const typeId = "sampling-new-stage-type";
  const typeSelect = el("select", { id: typeId });
  for (const [kind, spec] of Object.entries(types)) typeSelect.append(el("option", { value: kind }, spec.label));
  const addButton = el("button", { type: "button", class: "secondary" }, "Add stage");
  const fullNote = el("p", { class: "help", hidden: "" }, `The chain is full (${max} stages).`);
  const typeField = el("div", { class: "field" });
  typeField.append(el("label", { for: typeId }, "Type of the new stage"));
  const typeRow = el("div", { class: "field-row" });
  typeRow.append(typeSelect, addButton);
  typeField.append(typeRow, fullNote);
  adder.append(typeField);
  // the chain shown at first is an example, and says so until it is edited or replaced
  const exampleNote = el("p", { class: "chain-example", hidden: "" },
    "Example chain, shown to start from: replace it with the stages of your own sampling line.");
  box.append(exampleNote, list, chainError, adder, status);

  let stages = [];
  let passThrough; // a non-list value from a link or file, sent as is until the chain is edited
  const changed = () => {
    passThrough = undefined;
    exampleNote.hidden = true;
    onChange();
  };

  function makeStage(raw) {
    const kind = isObject(raw) ? raw.type : undefined;
    const spec = typeof kind === "string" && Object.hasOwn(types, kind) ? types[kind] : null;
    const li = el("li", { class: "stage-item" });
    const set = el("fieldset", { class: "stage", "data-type": spec ? kind : "unknown" });
    const legend = el("legend");
    set.append(legend);
    const stage = { kind, spec, raw, li, set, legend, handles: new Map(), numbers: [] };
    if (spec) {
      if (spec.help) set.append(el("p", { class: "help stage-help" }, spec.help));
      for (const f of spec.fields) {
        const sub = f.kind === "integer" ? { ...f, kind: "plain" } : f;
        const handle = renderField(set, sub, "sampling-stage");
        if (isObject(raw) && raw[f.name] !== undefined) handle.set(raw[f.name]);
        for (const node of [handle.input, handle.unitSelect]) {
          if (!node) continue;
          node.addEventListener("input", changed);
          node.addEventListener("change", changed);
        }
        handle.wrap.dataset.stageField = f.name;
        stage.handles.set(f.name, handle);
      }
    } else {
      const shown = JSON.stringify(raw) ?? String(raw);
      set.append(el("p", { class: "help" },
        `This stage came from a link or file with a type this page does not know (${shown.slice(0, 60)}). Remove it, or add a stage of a known type.`));
    }
    stage.error = el("p", { class: "error", hidden: "" });
    set.append(stage.error);
    const tools = el("div", { class: "stage-tools", role: "group" });
    stage.up = toolButton("Move up");
    stage.down = toolButton("Move down");
    stage.remove = toolButton("Remove");
    stage.up.addEventListener("click", () => move(stage, -1));
    stage.down.addEventListener("click", () => move(stage, 1));
    stage.remove.addEventListener("click", () => removeStage(stage));
    tools.append(stage.up, stage.down, stage.remove);
    stage.tools = tools;
    set.append(tools);
    li.append(set);
    return stage;
  }

  function toolButton(text) {
    const button = el("button", { type: "button", class: "secondary" }, text);
    button.append(el("span", { class: "visually-hidden" }, ""));
    return button;
  }

  function typeLabel(stage) {
    return stage.spec ? stage.spec.label : "unknown type";
  }

  function relabel() {
    stages.forEach((stage, i) => {
      const n = i + 1;
      stage.legend.textContent = `Stage ${n}: ${typeLabel(stage)}`;
      for (const button of [stage.up, stage.down, stage.remove]) button.lastChild.textContent = ` stage ${n}`;
      stage.tools.setAttribute("aria-label", `Stage ${n} order`);
      stage.up.disabled = i === 0;
      stage.down.disabled = i === stages.length - 1;
      stage.set.dataset.index = String(i);
    });
    const full = stages.length >= max;
    addButton.disabled = full;
    fullNote.hidden = !full;
  }

  function announce(text) {
    status.textContent = text;
  }

  function move(stage, step) {
    const i = stages.indexOf(stage);
    const j = i + step;
    if (i < 0 || j < 0 || j >= stages.length) return;
    [stages[i], stages[j]] = [stages[j], stages[i]];
    list.replaceChildren(...stages.map((s) => s.li));
    relabel();
    // keep the keyboard where it was: on the same button, or its partner at the ends
    const again = step < 0 ? stage.up : stage.down;
    (again.disabled ? (step < 0 ? stage.down : stage.up) : again).focus();
    announce(`${typeLabel(stage)} moved to position ${j + 1} of ${stages.length}.`);
    changed();
  }

  function removeStage(stage) {
    const i = stages.indexOf(stage);
    if (i < 0) return;
    stages.splice(i, 1);
    stage.li.remove();
    relabel();
    const next = stages[Math.min(i, stages.length - 1)];
    (next ? next.remove : typeSelect).focus();
    announce(`Stage ${i + 1} (${typeLabel(stage)}) removed; ${stages.length} left.`);
    changed();
  }

  function defaults(kind) {
    const out = { type: kind };
    for (const f of types[kind].fields) if (f.default !== undefined) out[f.name] = f.default;
    return out;
  }

  addButton.addEventListener("click", () => {
    if (stages.length >= max) return;
    const stage = makeStage(defaults(typeSelect.value));
    stages.push(stage);
    list.append(stage.li);
    relabel();
    const first = stage.handles.values().next().value;
    if (first) first.input.focus();
    announce(`Stage ${stages.length} (${typeLabel(stage)}) added.`);
    changed();
  });

  function readStage(stage) {
    if (!stage.spec) return stage.raw;
    const out = { type: stage.kind };
    for (const [name, handle] of stage.handles) out[name] = handle.get();
    return out;
  }

  return {
    box,
    get() {
      return passThrough !== undefined ? passThrough : stages.map(readStage);
    },
    /** Set the stages; `example` marks the page's initial example chain as such. */
    set(raw, example = false) {
      exampleNote.hidden = !example;
      passThrough = Array.isArray(raw) ? undefined : raw;
      stages = (Array.isArray(raw) ? raw.slice(0, RENDER_LIMIT) : []).map(makeStage);
      list.replaceChildren(...stages.map((s) => s.li));
      relabel();
    },
    /** Show the errors that belong to the chain; return the others. */
    showErrors(errors) {
      const rest = [];
      let chainText = "";
      for (const stage of stages) {
        for (const handle of stage.handles.values()) handle.showError("");
        stage.error.hidden = true;
        stage.error.textContent = "";
        stage.set.classList.remove("invalid");
      }
      for (const e of errors || []) {
        const m = /^stages(?:\.(\d+)\.(.+))?$/.exec(e.field || "");
        if (!m) {
          rest.push(e);
          continue;
        }
        const stage = m[1] !== undefined ? stages[Number(m[1])] : null;
        if (!stage) {
          chainText = chainText ? `${chainText} ${e.message}` : e.message;
          continue;
        }
        stage.set.classList.add("invalid");
        const handle = stage.handles.get(m[2]);
        if (handle && !handle.wrap.classList.contains("invalid")) {
          handle.showError(e.message);
        } else {
          stage.error.textContent = stage.error.hidden ? e.message : `${stage.error.textContent} ${e.message}`;
          stage.error.hidden = false;
        }
      }
      chainError.textContent = chainText;
      chainError.hidden = !chainText;
      return rest;
    },
    /** Rows {label, value, unit} describing a stage list in the words of the form. */
    describe(raw) {
      if (!Array.isArray(raw)) return [{ label: field.label, value: JSON.stringify(raw) ?? "", unit: "" }];
      return raw.map((stage, i) => {
        const spec = isObject(stage) && Object.hasOwn(types, stage.type) ? types[stage.type] : null;
        if (!spec) return { label: `Stage ${i + 1}`, value: JSON.stringify(stage) ?? "", unit: "" };
        const parts = [];
        for (const f of spec.fields) {
          const v = stage[f.name];
          if (v === undefined || v === null || v === "" || (isObject(v) && (v.value === "" || v.value === null))) continue;
          if (f.kind === "choice") {
            const choice = (f.choices || []).find((c) => c.value === v);
            parts.push(`${f.label}: ${choice ? choice.label : String(v)}`);
          } else if (isObject(v)) {
            parts.push(`${f.label}: ${withUnit(v.value, v.unit)}`);
          } else {
            parts.push(`${f.label}: ${String(v)}`);
          }
        }
        return { label: `Stage ${i + 1}: ${spec.label}`, value: parts.join("; "), unit: "" };
      });
    },
  };
}
