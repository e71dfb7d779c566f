"""Which inputs apply, by the value of another input: one declaration for the page and the CLI.

The page hides an input that does not apply to the current choices (a spectrum column when the
aerosol is given by lognormal modes, a tidal volume when the breathing is the reference worker);
the command line leaves it out of the inputs it prints. Presentation only: the calculations read
what they need and validate it themselves.
"""

from __future__ import annotations

from typing import Any

_CSV = (
    "csv_text",
    "csv_diameter_column",
    "csv_concentration_column",
    "csv_concentration_type",
    "csv_diameter_unit",
    "csv_concentration_unit",
    "spectrum_diameter_type",
)

#: calculation -> {field: (field it depends on, values of that field for which it applies)}
APPLIES_WHEN: dict[str, dict[str, tuple[str, tuple[str, ...]]]] = {
    "deposition": {
        "modes": ("distribution_source", ("lognormal",)),
        **{name: ("distribution_source", ("csv",)) for name in _CSV},
        "activity": ("breathing", ("activity",)),
        "route": ("breathing", ("reference_worker", "activity")),
        "tidal_volume": ("breathing", ("custom",)),
        "breathing_frequency": ("breathing", ("custom",)),
        "nasal_fraction": ("breathing", ("custom",)),
    },
    "sampling": {
        **{name: ("spectrum_source", ("csv",)) for name in _CSV},
        "shape_factor": ("density_basis", ("effective",)),
    },
}


def applies_when(kind: str, name: str) -> dict[str, Any] | None:
    """``{"field": ..., "values": [...]}`` for a field that applies only to some choices."""
    rule = APPLIES_WHEN.get(kind, {}).get(name)
    return {"field": rule[0], "values": list(rule[1])} if rule else None


def applies(kind: str, name: str, values: dict[str, Any], defaults: dict[str, Any]) -> bool:
    """Whether input ``name`` applies, given the inputs ``values`` (``defaults`` fill gaps)."""
    rule = APPLIES_WHEN.get(kind, {}).get(name)
    if rule is None:
        return True
    other, allowed = rule
    current = values.get(other, defaults.get(other))
    return current in allowed
