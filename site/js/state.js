// Input state in the URL fragment, so that a link reproduces a calculation exactly.
// Format (version 1): #v=1&panel=<id>&<panel>.<field>=<value>[~<unit>]; structured inputs
// (lists of modes or stages, imported file text) as <panel>.<field>=j:<JSON>.
// Values are raw strings: they go through the same Python validation as typed input. Links are
// read back by intake.js (declared keys only, bounded, without prototypes).

import { STATE_VERSION } from "./intake.js";

export const MAX_LINK_CHARS = 60000;

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
