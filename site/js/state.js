// Input state in the URL fragment, so that a link reproduces a calculation exactly.
// Format (version 1): #v=1&panel=<id>&<panel>.<field>=<value>[~<unit>]
// Values are raw strings: they go through the same Python validation as typed input.

export const STATE_VERSION = "1";

export function encodeState(activePanel, panels) {
  const params = new URLSearchParams();
  params.set("v", STATE_VERSION);
  params.set("panel", activePanel);
  for (const [pid, values] of Object.entries(panels)) {
    for (const [name, raw] of Object.entries(values)) {
      if (raw && typeof raw === "object") {
        params.set(`${pid}.${name}`, raw.unit ? `${raw.value}~${raw.unit}` : String(raw.value));
      } else {
        params.set(`${pid}.${name}`, String(raw));
      }
    }
  }
  return params.toString();
}

/** Decode a fragment; returns {version, panel, panels: {id: {field: raw}}} or null. */
export function decodeState(hash) {
  const text = (hash || "").replace(/^#/, "");
  if (!text) return null;
  const params = new URLSearchParams(text);
  const out = { version: params.get("v"), panel: params.get("panel"), panels: {} };
  for (const [key, value] of params) {
    const dot = key.indexOf(".");
    if (dot < 1) continue;
    const pid = key.slice(0, dot);
    const name = key.slice(dot + 1);
    const tilde = value.lastIndexOf("~");
    const raw = tilde >= 0 ? { value: value.slice(0, tilde), unit: value.slice(tilde + 1) } : value;
    (out.panels[pid] ||= {})[name] = raw;
  }
  return out;
}
