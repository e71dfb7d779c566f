// Work taken off the input path: run once, after a quiet spell, or at once where its result is
// needed (flush). The page's link state is written this way: replacing the address of a page
// with a link of a few kilobytes keeps the browser's own process busy for 15-30 ms, which on a
// two-core machine slows the engine computing the edit's result, so the link is written once
// the edits pause, and at once whenever something is about to read it.

/**
 * Coalesce calls of `work`: `schedule()` asks for one run `delay` ms later (with `restart`,
 * `delay` ms after the last call: a burst of calls waits until it has ended; without, further
 * calls before then add nothing), `flush()` runs it now when one is due, `now()` runs it now
 * in any case (and drops the one due), `pending` says whether one is due.
 */
export function coalesced(work, { delay = 0, restart = false, timers = globalThis } = {}) {
  let timer = null;
  const cancel = () => {
    if (timer !== null) timers.clearTimeout(timer);
    timer = null;
  };
  const now = () => {
    cancel();
    work();
  };
  return {
    schedule() {
      if (timer !== null && restart) cancel();
      if (timer === null) timer = timers.setTimeout(now, delay);
    },
    flush() {
      if (timer !== null) now();
    },
    now,
    get pending() {
      return timer !== null;
    },
  };
}
