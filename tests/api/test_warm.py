"""The engine's warm-up requests (driftdose.api.warm): valid requests of the page's panels.

The worker runs them while the page is idle after start; if a field they name were renamed
or a value refused, the warm-up would stop at that step (worker.js) and the first edits would
run cold again. These tests hold every step to an answered request. No published values:
the warm-up computes nothing that is shown.
"""

from __future__ import annotations

import json

import pytest

from driftdose.api.warm import WARM_STEPS, warm_request, warm_step


def test_every_step_is_answered_with_results():
    assert all(warm_step(step) for step in range(WARM_STEPS))


def test_steps_cover_the_panels_and_never_repeat_a_request():
    requests = [warm_request(step) for step in range(WARM_STEPS)]
    kinds = [r["kind"] for r in requests]
    assert {"motion", "sampling", "deposition"} <= set(kinds)
    assert kinds.count("deposition") >= WARM_STEPS - 2
    # two-mode mouth-breathing aerosols among them (the heaviest common request)
    assert any(r["inputs"].get("route") == "mouth_breather" for r in requests)
    texts = [json.dumps(r, sort_keys=True) for r in requests]
    assert len(set(texts)) == len(texts), "a repeated request would be answered from kept results"


def test_warm_requests_differ_from_the_defaults_a_page_starts_with():
    # the page's first requests (declared defaults) are not among the warm-up's
    for step in range(WARM_STEPS):
        request = warm_request(step)
        density = request["inputs"]["particle_density"]["value"]
        assert density != "1"


@pytest.mark.parametrize("step", [-1, WARM_STEPS, 10**9])
def test_steps_outside_the_warm_up_are_refused(step):
    with pytest.raises(ValueError):
        warm_request(step)
