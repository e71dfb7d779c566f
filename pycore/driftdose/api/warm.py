"""Warm-up requests for the browser's engine, run while the page is idle after start-up.

The browser compiles the engine's WebAssembly first to quick, slow code and optimises the
functions that prove hot only as they keep running. Until then each calculation is two to
four times slower: in the page, the first 15 or so deposition requests after start took
14-30 ms of engine time against 4-8 ms later (measured per request in the worker), whether
the page had been idle for seconds before or not. So the worker sends these requests
through the same door as the page's (:func:`driftdose.api.handle_json`), one at a time,
whenever no request of the page's has arrived for a moment (``js/worker.js``), and the
person's own first edits find the engine warm.

The requests are ordinary ones built from the declared fields' defaults with a few values
changed (densities no form starts with), so they run the code a person's edits run: the
lognormal deposition integration with the ICRP 66 model (one and two modes, nose and
mouth breathing), the sampling chain and the motion panel. Their results are kept like any
others (the engine's caches are bounded and hold only correct results); nothing is shown.
The command line never uses this module.
"""

from __future__ import annotations

import json
from typing import Any

__all__ = ["WARM_STEPS", "warm_request", "warm_step"]

WARM_STEPS = 24
"""Requests in one warm-up (about 0.5-0.6 s of engine time in a page just started)."""


def _density(step: int) -> dict[str, str]:
    # 1.013, 1.026, ... g/cm3: distinct per step, so no step is answered from a kept result
    return {"value": f"{1 + 0.013 * (step + 1):.3f}", "unit": "g/cm3"}


def warm_request(step: int) -> dict[str, Any]:
    """The ``step``-th warm-up request (0 <= step < :data:`WARM_STEPS`).

    Parameters
    ----------
    step : int
        Position in the warm-up.

    Returns
    -------
    dict
        A request for :func:`driftdose.api.handle`: ``{"kind", "inputs"}``; inputs left out
        take their declared defaults.
    """
    if not 0 <= step < WARM_STEPS:
        raise ValueError(f"warm-up step {step} is not in 0..{WARM_STEPS - 1}")
    if step == 0:
        return {"kind": "motion", "inputs": {"particle_density": _density(step)}}
    if step == 1:
        return {"kind": "sampling", "inputs": {"particle_density": _density(step)}}
    if step % 2:  # a two-mode aerosol breathed through the mouth: the heaviest common case
        modes = [
            {"basis": "count", "median": {"value": "40", "unit": "nm"}, "gsd": "1.8",
             "concentration": {"value": "100000", "unit": "1/cm3"}},
            {"basis": "mass", "median": {"value": "5", "unit": "um"}, "gsd": "2.5",
             "concentration": {"value": "1", "unit": "mg/m3"}},
        ]  # fmt: skip
        inputs = {"modes": modes, "route": "mouth_breather", "particle_density": _density(step)}
        return {"kind": "deposition", "inputs": inputs}
    return {"kind": "deposition", "inputs": {"particle_density": _density(step)}}


def warm_step(step: int) -> bool:
    """Run the ``step``-th warm-up request through :func:`driftdose.api.handle_json`.

    Parameters
    ----------
    step : int
        Position in the warm-up (0 <= step < :data:`WARM_STEPS`).

    Returns
    -------
    bool
        Whether the engine answered it with results (``"ok": true``).
    """
    from . import handle_json  # the package's door, imported when first used

    reply = json.loads(handle_json(json.dumps(warm_request(step))))
    return reply.get("ok") is True
