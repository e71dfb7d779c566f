// When a chart out of view is redrawn. A chart near the view is redrawn at once; one that is far
// from it (below the first screen, in a hidden panel) is redrawn once the edits pause (the
// caller's `later`), when it comes near the view, or when its pixels are asked for (image
// export, the printed record), whichever comes first: a burst of edits costs it one redraw, and
// no redraw competes with the next edit's work. No DOM here: the caller supplies the scheduler
// and tells where each chart is (tested under Node).

export class DrawQueue {
  /**
   * @param {object} opts {draw(key): redraw now, later: {schedule()} that calls flushAll() once
   *   the requests pause, each schedule() putting it off again (absent: every redraw is at once)}
   */
  constructor({ draw, later = null }) {
    this.draw = draw;
    this.later = later;
    this.near = new Map(); // key → whether it is near the view (unknown: treated as near)
    this.waiting = new Set();
  }

  /** Where `key` is: `near` true when it is in or near the view. Coming near draws a waiting one. */
  seen(key, near) {
    this.near.set(key, Boolean(near));
    if (near) this.flush(key);
  }

  /** `key` changed: redraw it now when near the view (or unknown), else once changes pause. */
  request(key) {
    if (!this.later || this.near.get(key) !== false) {
      this.waiting.delete(key);
      this.draw(key);
      return;
    }
    this.waiting.add(key);
    this.later.schedule();
  }

  /** Whether `key` has a redraw waiting. */
  isWaiting(key) {
    return this.waiting.has(key);
  }

  /** Redraw `key` now if it waits. */
  flush(key) {
    if (!this.waiting.delete(key)) return;
    this.draw(key);
  }

  /** Redraw every waiting one now. */
  flushAll() {
    for (const key of [...this.waiting]) this.flush(key);
  }

  /** Forget `key` (its chart is gone). */
  forget(key) {
    this.waiting.delete(key);
    this.near.delete(key);
  }
}
