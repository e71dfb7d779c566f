// Periods of a shift on the page: time text <-> seconds from the start of the logged series,
// snapping of dragged band edges, ordering and overlaps. No DOM here (Node's test runner checks
// it directly); the engine validates every period again and has the last word.
//
// Times are local wall-clock times without a zone, as instruments log them. A time is either
// "HH:MM" / "HH:MM:SS" (on the date of the series start; a clock time before the first reading
// is the next day's, as the engine reads it, so a night shift can be typed as clock times) or an
// ISO local date-time "YYYY-MM-DDTHH:MM[:SS]" (a space may stand for the T). Inside the page a
// time is a number of seconds from the series start, on a naive (zone-free) calendar.

export const KINDS = Object.freeze(["task", "background", "break"]);
const DAY = 86_400;
const CLOCK = /^(\d{1,2}):(\d{2})(?::(\d{2}))?$/;
const DATE_TIME = /^(\d{4})-(\d{2})-(\d{2})[T ](\d{1,2}):(\d{2})(?::(\d{2}))?$/;
const DATE_ONLY = /^(\d{4})-(\d{2})-(\d{2})/;

/** Seconds since midnight of "HH:MM[:SS]" (00:00 to 24:00), or null. */
export function parseClock(text) {
  const m = CLOCK.exec(String(text ?? "").trim());
  if (!m) return null;
  const [h, mi, s] = [Number(m[1]), Number(m[2]), Number(m[3] ?? 0)];
  if (mi > 59 || s > 59 || h > 24 || (h === 24 && (mi || s))) return null;
  return h * 3600 + mi * 60 + s;
}

/** Whole days since 1970-01-01 of a valid calendar date, or null. */
function dayNumber(y, mo, d) {
  if (mo < 1 || mo > 12 || d < 1) return null;
  const ms = Date.UTC(y, mo - 1, d);
  const back = new Date(ms);
  if (back.getUTCFullYear() !== y || back.getUTCMonth() !== mo - 1 || back.getUTCDate() !== d) return null;
  return Math.round(ms / 86_400_000);
}

/** Naive epoch seconds of an ISO local date-time ("2026-03-10T07:00:00"), or null. */
export function isoSeconds(text) {
  const m = DATE_TIME.exec(String(text ?? "").trim());
  if (!m) return null;
  const day = dayNumber(Number(m[1]), Number(m[2]), Number(m[3]));
  const clock = parseClock(`${m[4]}:${m[5]}${m[6] !== undefined ? `:${m[6]}` : ""}`);
  if (day === null || clock === null) return null;
  return day * DAY + clock;
}

const pad = (n) => String(n).padStart(2, "0");

/** ISO local date-time "YYYY-MM-DDTHH:MM:SS" of naive epoch seconds. */
export function isoText(seconds) {
  const whole = Math.round(seconds);
  const d = new Date(Math.floor(whole / DAY) * 86_400_000);
  const rest = whole - Math.floor(whole / DAY) * DAY;
  return `${d.getUTCFullYear()}-${pad(d.getUTCMonth() + 1)}-${pad(d.getUTCDate())}T${clockText(rest, true)}`;
}

/** "HH:MM" (or "HH:MM:SS" when seconds are not whole minutes, or `withSeconds`). */
export function clockText(secondsOfDay, withSeconds = false) {
  const s = Math.round(secondsOfDay);
  const h = Math.floor(s / 3600);
  const mi = Math.floor((s % 3600) / 60);
  const se = s % 60;
  return withSeconds || se ? `${pad(h)}:${pad(mi)}:${pad(se)}` : `${pad(h)}:${pad(mi)}`;
}

/** Naive epoch seconds of the start of the series (its ISO text), or null. */
function startOf(startIso) {
  const text = String(startIso ?? "");
  const full = isoSeconds(text.replace(/\.\d+$/, "").slice(0, 19));
  if (full !== null) return full;
  const m = DATE_ONLY.exec(text);
  if (!m) return null;
  const day = dayNumber(Number(m[1]), Number(m[2]), Number(m[3]));
  return day === null ? null : day * DAY;
}

/**
 * A typed time as seconds from the series start: {ok: true, seconds} or {ok: false, error}.
 * "HH:MM[:SS]" counts on the date of `startIso`, or on the next day when it is earlier than
 * the start; a date-time counts as written.
 */
export function parseTime(text, startIso) {
  const raw = String(text ?? "").trim();
  if (!raw) return { ok: false, error: "Enter a time (HH:MM, or a date and time YYYY-MM-DD HH:MM)." };
  const origin = startOf(startIso);
  const clock = parseClock(raw);
  if (clock !== null) {
    if (origin === null) return { ok: true, seconds: null, clock };
    const seconds = Math.floor(origin / DAY) * DAY + clock - origin;
    return { ok: true, seconds: seconds < 0 ? seconds + DAY : seconds };
  }
  const absolute = isoSeconds(raw);
  if (absolute !== null) {
    if (origin === null) return { ok: true, seconds: null, clock: absolute % DAY };
    return { ok: true, seconds: absolute - origin };
  }
  return { ok: false, error: `“${raw.slice(0, 30)}” is not a time: write HH:MM or HH:MM:SS, or a date and time YYYY-MM-DD HH:MM.` };
}

/**
 * Seconds from the series start as the text a person types: "HH:MM[:SS]" where the clock time
 * reads back to the same moment (the first date from the start on, the next day before the
 * start's clock time), otherwise the ISO local date-time.
 */
export function formatTime(seconds, startIso) {
  const origin = startOf(startIso);
  if (origin === null || !Number.isFinite(seconds)) return "";
  const s = Math.round(seconds);
  const at = origin + s;
  const day = Math.floor(at / DAY) - Math.floor(origin / DAY);
  const clock = at - Math.floor(at / DAY) * DAY;
  if ((day === 0 && s >= 0) || (day === 1 && clock < origin - Math.floor(origin / DAY) * DAY)) return clockText(clock);
  return isoText(at).replace(/:00$/, "");
}

/** Clock text of seconds from the series start, for axis ticks and readouts ("07:30", "+1 d 01:00"). */
export function tickText(seconds, startIso, withSeconds = false) {
  const origin = startOf(startIso);
  if (origin === null || !Number.isFinite(seconds)) return "";
  const at = origin + Math.round(seconds);
  const days = Math.floor(at / DAY) - Math.floor(origin / DAY);
  const clock = clockText(at - Math.floor(at / DAY) * DAY, withSeconds);
  return days ? `${clock} (+${days} d)` : clock;
}

const STEPS = [1, 5, 10, 15, 30, 60, 120, 300, 600, 900, 1800, 3600];

/** The snapping step for a drag: the smallest round step of at least `pixels` on screen. */
export function snapStep(secondsPerPixel, pixels = 4) {
  const want = Math.abs(secondsPerPixel) * pixels;
  return STEPS.find((s) => s >= want) ?? 3600;
}

/**
 * Where a dragged edge lands: on a neighbouring edge within `tolerance` seconds (so periods can
 * be made to abut), else on a multiple of `step`; never outside [lo, hi].
 */
export function snapEdge(seconds, { step = 1, edges = [], tolerance = 0, lo = -Infinity, hi = Infinity } = {}) {
  let best = null;
  for (const e of edges) {
    if (!Number.isFinite(e)) continue;
    const d = Math.abs(e - seconds);
    if (d <= tolerance && (best === null || d < Math.abs(best - seconds))) best = e;
  }
  const at = best !== null ? best : Math.round(seconds / step) * step;
  return Math.min(hi, Math.max(lo, at));
}

/**
 * Move one edge ("start" or "end") of a period given in seconds to `seconds`, keeping it at
 * least `minimum` long: the edge stops at the other edge rather than crossing it.
 */
export function moveEdge(span, edge, seconds, minimum = 1) {
  const next = { start: span.start, end: span.end };
  if (edge === "start") next.start = Math.min(seconds, span.end - minimum);
  else next.end = Math.max(seconds, span.start + minimum);
  return next;
}

/** Move a whole period by `delta` seconds, kept inside [lo, hi] with its length. */
export function moveSpan(span, delta, lo = -Infinity, hi = Infinity) {
  const length = span.end - span.start;
  let start = span.start + delta;
  if (start < lo) start = lo;
  if (start + length > hi) start = hi - length;
  return { start, end: start + length };
}

/**
 * Spans of periods: [{index, kind, label, start, end, error}] with seconds from the series
 * start (null where the time does not read; `error` then says which edge and why).
 */
export function spans(periods, startIso) {
  return (periods || []).map((p, index) => {
    const a = parseTime(p && p.start, startIso);
    const b = parseTime(p && p.end, startIso);
    const out = { index, kind: p && p.kind, label: String((p && p.label) || ""), start: a.ok ? a.seconds : null, end: b.ok ? b.seconds : null, error: "" };
    if (!a.ok) out.error = `start: ${a.error}`;
    else if (!b.ok) out.error = `end: ${b.error}`;
    else if (out.start !== null && out.end !== null && out.end <= out.start) out.error = "end: the end must come after the start.";
    return out;
  });
}

/** Indices of `periods` ordered by start time (unreadable times last, original order kept). */
export function order(periods, startIso) {
  const list = spans(periods, startIso);
  return list
    .slice()
    .sort((x, y) => {
      const a = x.start ?? Infinity;
      const b = y.start ?? Infinity;
      return a === b ? x.index - y.index : a - b;
    })
    .map((s) => s.index);
}

/**
 * Overlaps between periods: no two periods may share time, whatever their kinds (as the engine
 * rules: a moment is a task, a break or background, never two). Returns [{a, b, start, end}]
 * (indices in the order entered, the shared time in seconds from the series start).
 */
export function overlaps(periods, startIso) {
  const list = spans(periods, startIso).filter((s) => !s.error && s.start !== null && s.end !== null);
  const out = [];
  for (let i = 0; i < list.length; i++) {
    for (let j = i + 1; j < list.length; j++) {
      const p = list[i];
      const q = list[j];
      const start = Math.max(p.start, q.start);
      const end = Math.min(p.end, q.end);
      if (end > start) out.push({ a: p.index, b: q.index, start, end });
    }
  }
  return out;
}

/** Total seconds covered by periods of `kind` (overlaps counted once). */
export function covered(periods, startIso, kind) {
  const list = spans(periods, startIso)
    .filter((s) => s.kind === kind && !s.error && s.start !== null && s.end !== null)
    .sort((x, y) => x.start - y.start);
  let total = 0;
  let reach = -Infinity;
  for (const s of list) {
    const from = Math.max(s.start, reach);
    if (s.end > from) total += s.end - from;
    reach = Math.max(reach, s.end);
  }
  return total;
}

/**
 * A new period placed after the last one: the next free stretch of `length` seconds within
 * [0, total] (or at the start when there is none), with its times as text.
 */
export function nextPeriod(periods, startIso, total, kind = "task", length = 1800) {
  const list = spans(periods, startIso).filter((s) => !s.error && s.end !== null);
  const last = list.reduce((m, s) => Math.max(m, s.end), 0);
  let start = last + length <= total ? last : 0;
  if (!Number.isFinite(start)) start = 0;
  const end = Math.min(total > 0 ? total : start + length, start + length);
  const count = (periods || []).filter((p) => p && p.kind === kind).length + 1;
  const names = { task: "Task", background: "Background", break: "Break" };
  return {
    label: `${names[kind] || "Period"} ${count}`, kind,
    start: formatTime(start, startIso), end: formatTime(end > start ? end : start + length, startIso),
  };
}
