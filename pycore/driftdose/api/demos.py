"""Invented demo scenarios of the deposition panel and of its burden and ranges sections.

Every scenario is labelled as invented: numbers for trying the tool, not measurements or
typical values. The page loads them with one click from the first field's description.
"""

from __future__ import annotations

from typing import Any

__all__ = ["BURDEN_DEMOS", "DEMOS", "demo_scenarios"]


def _q(value: float, unit: str) -> dict[str, Any]:
    return {"value": value, "unit": unit}


def _mode(
    basis: str,
    median: tuple[float, str],
    diameter_type: str,
    gsd: float,
    concentration: tuple[float, str],
) -> dict[str, Any]:
    """One lognormal mode of a demo, as the ``modes`` field takes it."""
    return {
        "basis": basis,
        "median": _q(*median),
        "diameter_type": diameter_type,
        "gsd": gsd,
        "concentration": _q(*concentration),
    }


_DEMO_CSV = (
    "# invented demo spectrum, not a measurement\n"
    "diameter_nm;dN/dlogDp_per_cm3\n"
    "10;1200\n15;3500\n20;7800\n30;14500\n40;19800\n50;21500\n70;19000\n100;13200\n"
    "150;7100\n200;3900\n300;1500\n400;620\n500;280\n700;90\n1000;25\n"
)

DEMOS: tuple[dict[str, Any], ...] = (
    {
        "id": "demo_fume",
        "label": "Invented demo: metal fume, two fine modes",
        "note": "Invented numbers for trying the tool; not a measurement or a typical value.",
        "inputs": {
            "size_source": "lognormal",
            "modes": [
                _mode("count", (40, "nm"), "volume_equivalent", 1.7, (150000, "1/cm3")),
                _mode("count", (250, "nm"), "volume_equivalent", 1.6, (8000, "1/cm3")),
            ],
            "particle_density": _q(5.0, "g/cm3"),
            "shape_factor": _q(1.2, "1"),
            "model": "icrp66",
            "breathing": "reference_worker",
            "route": "mixed",
            "exposure_duration": _q(8, "h"),
        },
    },
    {
        "id": "demo_dust",
        "label": "Invented demo: grinding dust by mass, with a benchmark",
        "note": "Invented numbers, and an invented benchmark; not a legal limit.",
        "inputs": {
            "size_source": "lognormal",
            "modes": [_mode("mass", (6, "um"), "aerodynamic", 2.2, (2.0, "mg/m3"))],
            "particle_density": _q(2.6, "g/cm3"),
            "shape_factor": _q(1.4, "1"),
            "model": "icrp66",
            "breathing": "activity",
            "activity": "heavy_exercise",
            "route": "mixed",
            "exposure_duration": _q(4, "h"),
            "benchmark_mass": _q(1.0, "mg/m3"),
        },
    },
    {
        "id": "demo_spectrum",
        "label": "Invented demo: measured spectrum from CSV",
        "note": "An invented spectrum in CSV form, to show the import; not a measurement.",
        "inputs": {
            "size_source": "csv",
            "csv_text": _DEMO_CSV,
            "csv_diameter_column": "diameter_nm",
            "csv_concentration_column": "dN/dlogDp_per_cm3",
            "csv_concentration_type": "dN/dlogDp",
            "csv_diameter_unit": "nm",
            "csv_concentration_unit": "1/cm3",
            "particle_density": _q(1.5, "g/cm3"),
            "shape_factor": _q(1.0, "1"),
            "model": "icrp66",
            "breathing": "reference_worker",
            "route": "mixed",
            "exposure_duration": _q(8, "h"),
            "benchmark_number": _q(20000, "1/cm3"),
        },
    },
)
"""Invented demo scenarios (labelled as invented) for the page's one-click loading."""


def demo_scenarios() -> list[dict[str, Any]]:
    """Return the invented demo scenarios: id, label, note and the request inputs."""
    return [dict(d) for d in DEMOS]


BURDEN_DEMOS: tuple[dict[str, Any], ...] = (
    {
        "id": "demo_working_life",
        "label": "Invented demo: oxide fume over a working life",
        "note": "Invented numbers for trying the tool: the metal-fume demo aerosol breathed "
        "8 h a shift, 5 shifts a week, 46 weeks a year for 40 years, with invented ranges "
        "for the uncertain inputs; not a measurement or a typical value.",
        "deposition": {**DEMOS[0]["inputs"], "demo": DEMOS[0]["id"]},
        "burden": {
            "transport_rates": "icrp66",
            "exposure_pattern": "work",
            "shifts_per_week": 5,
            "weeks_per_year": 46,
            "working_years": 40,
            "years_after": 10,
        },
        "ranges": {
            "samples": 1000,
            "seed": 2026,
            "sampling_method": "lhs",
            "median_spread": "triangular",
            "median_percent": _q(25, "1"),
            "gsd_spread": "triangular",
            "gsd_percent": _q(10, "1"),
            "density_spread": "uniform",
            "density_percent": _q(15, "1"),
            "shape_factor_spread": "uniform",
            "shape_factor_percent": _q(10, "1"),
            "breathing_spread": "triangular",
            "breathing_percent": _q(25, "1"),
            "concentration_spread": "lognormal",
            "concentration_gsd": _q(1.6, "1"),
        },
    },
)
"""Invented demo (labelled as invented): inputs for the deposition, burden and ranges parts."""
