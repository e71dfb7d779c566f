"""The engine's warm-up (worker.js, driftdose.api.warm) runs only while the page is quiet.

Right after start the browser runs the engine's WebAssembly as quick, unoptimised code; the
worker sends its warm-up requests while the page sends none, so a person's first edits find
it optimised. What must hold for the person: the warm-up never makes an edit wait for more
than the one warm-up request running, it waits while edits keep coming, and it ends (the page
marks ``data-engine-warm``). Common practice for just-in-time compiled code; no published values.
"""

from __future__ import annotations

import re

import pytest

from driftdose.api.warm import WARM_STEPS

from .conftest import wait_ready

EDITS = """async ([input, count]) => {
  const section = document.getElementById('panel-motion');
  const root = document.documentElement;
  let shown = Number(section.dataset.updates || 0);
  let k = 0;
  async function edit() {
    const t0 = performance.now();
    k += 1;
    input.value = String(100 + 0.37 * k);
    input.dispatchEvent(new Event('input', {bubbles: true}));
    while (Number(section.dataset.updates || 0) <= shown) {
      await new Promise((r) => setTimeout(r, 2));
    }
    shown = Number(section.dataset.updates);
    return performance.now() - t0;
  }
  const warmAtStart = root.dataset.engineWarm || '';
  for (let i = 0; i < count; i++) await edit();
  const lastEdit = performance.now();
  const warmAtLastEdit = root.dataset.engineWarm || '';
  await new Promise((r) => setTimeout(r, 300)); // quiet: the warm-up begins (after 250 ms)
  const during = await edit();
  const t = performance.now();
  while (!root.dataset.engineWarm && performance.now() - t < 60000) {
    await new Promise((r) => setTimeout(r, 5));
  }
  return {warmAtStart, warmAtLastEdit, during, warm: root.dataset.engineWarm || '',
          warmAt: performance.now(), lastEdit};
}"""


@pytest.mark.e2e
def test_warm_up_waits_for_quiet_and_never_holds_an_edit(watched, base_url: str):
    page, _ = watched
    page.goto(base_url)
    wait_ready(page)
    field = page.locator("#panel-motion").get_by_label("Particle diameter", exact=True)
    got = page.evaluate(EDITS, [field.element_handle(), 25])
    # the warm-up had not ended before the edits, nor while they kept coming
    assert got["warmAtStart"] == "" and got["warmAtLastEdit"] == "", got
    assert got["warmAt"] > got["lastEdit"]
    found = re.fullmatch(r"(\d+) requests, (\d+) ms", got["warm"])
    assert found, got["warm"]
    steps, spent = int(found[1]), int(found[2])
    assert steps == WARM_STEPS
    # an edit made once the warm-up had begun waited for one of its requests at most, not for
    # the rest of it (which took `spent` ms of engine time in all)
    assert got["during"] < spent / 2, (got["during"], spent)
