"""Invented demonstration chains of the sampling calculation.

None copies a published or commercial sampler; each is labelled as invented. The page loads
them with one click (they are sent with the ``stages`` field's description).
"""

from __future__ import annotations

from typing import Any

__all__ = ["DEMOS"]


def _q(value: float, unit: str) -> dict[str, Any]:
    return {"value": value, "unit": unit}


def _tube(name: str, length: dict[str, Any], bore_mm: float) -> dict[str, Any]:
    """A horizontal tube stage losing particles by diffusion and settling."""
    return {
        "type": "tube",
        "name": name,
        "length": length,
        "tube_diameter": _q(bore_mm, "mm"),
        "inclination": _q(0.0, "deg"),
        "mechanisms": "both",
    }


DEMOS: dict[str, dict[str, Any]] = {
    "long_narrow_tube": {
        "label": "Long narrow sampling tube (invented demo)",
        "description": (
            "An invented example, not a real installation: 10 m of 4 mm tubing laid "
            "horizontally and one 90° bend, at 1.5 L/min."
        ),
        "inputs": {
            "flow": _q(1.5, "L/min"),
            "particle_density": _q(1.0, "g/cm3"),
            "target": "none",
            "stages": [
                _tube("10 m of 4 mm tubing", _q(10.0, "m"), 4.0),
                {
                    "type": "bend",
                    "name": "90° bend",
                    "tube_diameter": _q(4.0, "mm"),
                    "bend_angle": _q(90.0, "deg"),
                    "curvature_radius": _q(5.0, "cm"),
                },
            ],
        },
    },
    "screen_stack": {
        "label": "Screen stack (invented demo)",
        "description": (
            "An invented example, not a real instrument: 30 cm of 6 mm tubing feeding a "
            "stack of 20 generic wire screens (40 µm wire, solidity 0.3) 20 mm across, "
            "at 1.5 L/min."
        ),
        "inputs": {
            "flow": _q(1.5, "L/min"),
            "particle_density": _q(1.0, "g/cm3"),
            "target": "none",
            "stages": [
                _tube("Inlet tube", _q(30.0, "cm"), 6.0),
                {
                    "type": "screens",
                    "name": "20 screens",
                    "wire_diameter": _q(40.0, "um"),
                    "solidity": _q(0.3, "1"),
                    "thickness": _q(80.0, "um"),
                    "screen_diameter": _q(20.0, "mm"),
                    "n_screens": 20,
                    "impaction": "off",
                },
            ],
        },
    },
    "respirable_line": {
        "label": "Short line with a respirable pre-separator (invented demo)",
        "description": (
            "An invented example: 1 m of 6 mm horizontal tubing to a pre-separator "
            "with a lognormal curve (cut 4 µm, GSD 1.5), compared with the ISO 7708 "
            "respirable convention, at 2.5 L/min."
        ),
        "inputs": {
            "flow": _q(2.5, "L/min"),
            "particle_density": _q(2.0, "g/cm3"),
            "target": "respirable",
            "stages": [
                _tube("Inlet tube", _q(1.0, "m"), 6.0),
                {
                    "type": "cyclone",
                    "name": "Pre-separator",
                    "curve": "lognormal",
                    "d50": _q(4.0, "um"),
                    "curve_gsd": _q(1.5, "1"),
                },
            ],
        },
    },
}
"""Invented demonstration chains for the page; none copies a published or commercial design."""
