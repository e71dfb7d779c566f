"""The single-file edition in Firefox (Debian's firefox-esr) and in WebKit (WebKitGTK): opened
from file://, it must reach readiness, compute the first panel, log no error (a policy
violation included) and make no request outside itself. Chromium is covered by
``test_single_file.py``. How the two engines are driven: ``engines.py``.

A test is skipped only when its browser cannot be installed here; ``.ci/setup`` installs both.
"""

from __future__ import annotations

import time
from pathlib import Path

import pytest

from . import engines

pytestmark = pytest.mark.e2e

READY_S = 180.0  # generous: the machine running the suite may be loaded


@pytest.fixture(scope="module")
def single_file(tmp_path_factory: pytest.TempPathFactory, dist_dir: Path, build_module) -> Path:
    folder = tmp_path_factory.mktemp("engines") / "Drift files ä"
    folder.mkdir()
    target = folder / build_module.SINGLE_NAME
    build_module.build_single_file(target, dist_dir)
    return target


RESOURCES_JS = "return performance.getEntriesByType('resource').map((e) => e.name);"
STATE_JS = """
const motion = document.getElementById('panel-motion');
return {
  engine: document.documentElement.dataset.engine || null,
  text: (document.getElementById('engine-text') || {}).textContent || '',
  state: motion ? motion.dataset.state || null : null,
  updates: motion ? Number(motion.dataset.updates || 0) : 0,
  busy: motion ? motion.hasAttribute('aria-busy') : true,
  cells: document.querySelectorAll('#panel-motion td').length,
};
"""


def test_single_file_in_firefox(single_file: Path):
    binary = engines.firefox_binary()
    if binary is None:
        pytest.skip("Firefox is not installed (Debian package firefox-esr; .ci/setup installs it)")
    with engines.Firefox(binary) as ff:
        ff.command("WebDriver:Navigate", {"url": single_file.as_uri()})
        state: dict = {}
        end = time.monotonic() + READY_S
        while time.monotonic() < end:
            state = ff.script(STATE_JS)
            if state["engine"] == "failed":
                break
            if state["engine"] == "ready" and state["updates"] >= 1 and not state["busy"]:
                break
            time.sleep(0.5)
        errors = ff.console_errors()
        resources = ff.script(RESOURCES_JS)
    assert state["engine"] == "ready", state
    assert state["state"] == "ok" and state["cells"] >= 5, state
    assert not errors, errors
    outside = [u for u in resources if not u.startswith(("blob:", "data:", single_file.as_uri()))]
    assert not outside, outside


def test_single_file_in_webkit(single_file: Path):
    reason = engines.webkit_available()
    if reason:
        pytest.skip(reason)
    report = engines.run_webkit(single_file.as_uri(), READY_S)
    # WebKit refuses module scripts in a worker of a file:// page; the runtime then runs the
    # calculation module in the page (site/single/runtime.js, WorkerOrPage)
    assert report["engine"] == "ready", report
    assert report["state"] == "ok" and report["cells"] >= 5, report
    assert not report["console_errors"], report["console_errors"]
