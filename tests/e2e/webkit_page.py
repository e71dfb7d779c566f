"""Open a page in WebKitGTK and report its state as one line ``RESULT {json}``.

Run by Debian's ``python3`` (which has the ``gi`` bindings), under ``xvfb-run``:

    xvfb-run -a /usr/bin/python3 tests/e2e/webkit_page.py file:///.../drift-and-dose.html 150

The page's ``data-engine`` is polled until it is ``ready`` or ``failed`` (or the time is up);
then the motion panel's state and number of result cells are read. Console messages go to
standard output (WebKit's own ``CONSOLE ... ERROR`` lines), where the caller looks for errors.
File URLs get no special rights (universal and file access from file URLs stay off, as in a
browser).
"""

from __future__ import annotations

import json
import sys
import time

import gi

gi.require_version("Gtk", "3.0")
gi.require_version("WebKit2", "4.1")
from gi.repository import GLib, Gtk, WebKit2  # noqa: E402

PROBE = """JSON.stringify({
  engine: document.documentElement.dataset.engine || null,
  text: (document.getElementById('engine-text') || {}).textContent || '',
  state: (document.getElementById('panel-motion') || {dataset: {}}).dataset.state || null,
  updates: Number((document.getElementById('panel-motion') || {dataset: {}}).dataset.updates || 0),
  cells: document.querySelectorAll('#panel-motion td').length,
  busy: !!(document.getElementById('panel-motion') || {hasAttribute: () => false})
    .hasAttribute('aria-busy'),
})"""


def main() -> None:
    url, limit = sys.argv[1], float(sys.argv[2])
    window = Gtk.OffscreenWindow()
    view = WebKit2.WebView()
    settings = view.get_settings()
    settings.set_enable_write_console_messages_to_stdout(True)
    settings.set_allow_file_access_from_file_urls(False)
    settings.set_allow_universal_access_from_file_urls(False)
    window.add(view)
    window.set_default_size(1280, 900)
    window.show_all()
    t0 = time.monotonic()
    report: dict = {}

    def finish(extra: dict) -> None:
        report.update(extra, seconds=round(time.monotonic() - t0, 1))
        print("RESULT " + json.dumps(report), flush=True)
        Gtk.main_quit()

    def answered(source: WebKit2.WebView, result: object) -> None:
        try:
            state = json.loads(source.evaluate_javascript_finish(result).to_string())
        except GLib.Error as exc:  # the page is not there yet
            state = {"engine": None, "error": str(exc)}
        report.update(state)
        done = state.get("engine") == "failed" or (
            state.get("engine") == "ready" and state.get("updates", 0) >= 1 and not state["busy"]
        )
        if done or time.monotonic() - t0 > limit:
            finish({"timed_out": not done})
        else:
            GLib.timeout_add(500, poll)

    def poll() -> bool:
        view.evaluate_javascript(PROBE, -1, None, None, None, answered)
        return False

    view.load_uri(url)
    GLib.timeout_add(1000, poll)
    Gtk.main()


if __name__ == "__main__":
    main()
