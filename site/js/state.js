// Input state in the URL fragment, so that a link reproduces a calculation exactly.
// Format (version 1): #v=1&panel=<id>&<panel>.<field>=<value>[~<unit>]; structured inputs
// (lists of modes or stages, imported file text) as <panel>.<field>=j:<JSON>.
// Values are raw strings: they go through the same Python validation as typed input.

export const MAX_LINK_CHARS = 60000;

export const STATE_VERSION = "1";

export function encodeState(activePanel, panels) {
  const params = new URLSearchParams();
  params.set("v", STATE_VERSION);
  params.set("panel", activePanel);
  const dropped = [];
  for (const [pid, values] of Object.entries(panels)) {
    for (const [name, raw] of Object.entries(values)) {
      if (raw === null || raw === undefined) continue;
      if (raw && typeof raw === "object" && !Array.isArray(raw) && "value" in raw) {
        params.set(`${pid}.${name}`, raw.unit ? `${raw.value}~${raw.unit}` : String(raw.value));
      } else if (typeof raw === "object" || (typeof raw === "string" && raw.includes("\n"))) {
        const text = `j:${JSON.stringify(raw)}`;
        if (text.length > MAX_LINK_CHARS) dropped.push(`${pid}.${name}`);
        else params.set(`${pid}.${name}`, text);
      } else {
        params.set(`${pid}.${name}`, String(raw));
      }
    }
  }
  encodeState.dropped = dropped;
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
    let raw;
    if (value.startsWith("j:")) {
      try {
        raw = JSON.parse(value.slice(2));
      } catch {
        raw = value;
      }
    } else {
      const tilde = value.lastIndexOf("~");
      raw = tilde >= 0 ? { value: value.slice(0, tilde), unit: value.slice(tilde + 1) } : value;
    }
    (out.panels[pid] ||= {})[name] = raw;
  }
  return out;
}
