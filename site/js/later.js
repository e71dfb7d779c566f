// Work taken off the input path: run once, a task after any number of requests for it, or at
// once where its result is needed (flush). The page's link state is written this way, so that
// an edit's request reaches the engine before the address bar is touched.

/**
 * Coalesce calls of `work`: `schedule()` asks for one run a task later (`delay` ms; further
 * calls before then add nothing), `flush()` runs it now when one is due, `now()` runs it now
 * in any case (and drops the one due), `pending` says whether one is due.
 */
export function coalesced(work, { delay = 0, timers = globalThis } = {}) {
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
