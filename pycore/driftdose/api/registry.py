"""Registry of calculations: ``kind`` -> module with ``TITLE``, ``FIELDS`` and ``run``.

To add a calculation, write a module in this package with those three names and add it here.
"""

from __future__ import annotations

from types import ModuleType

from . import burden, deposition, motion, sampling, shift, uncertainty

CALCULATIONS: dict[str, ModuleType] = {
    "motion": motion,
    "deposition": deposition,
    "sampling": sampling,
    "burden": burden,
    "uncertainty": uncertainty,
    "shift": shift,
}
