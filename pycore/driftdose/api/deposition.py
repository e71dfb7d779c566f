"""Calculation ``deposition``: where a workplace aerosol deposits in the respiratory tract.

Answers, for a size distribution given as up to four lognormal modes (count- or mass-based)
or as a measured spectrum in CSV, the deposition fraction per region (ICRP 66 regions, or
head airways / tracheobronchial / alveolar for the simplified fits), the deposited number,
surface area and mass per hour and per exposure, for the ICRP reference worker, one
activity or custom breathing, with an optional comparison with benchmark concentrations the
user enters. Curves: deposition fraction per region versus size with the distribution
overlaid, and dose per region as bars.

``demo_scenarios()`` lists invented demo inputs (labelled as such) that the page loads with
one click; they are also attached to the first field's description.
"""

from __future__ import annotations

import bisect
import math
from dataclasses import replace
from typing import Any

from .._numerics import logspace
from ..compose.aerosol import (
    Aerosol,
    ModeSpec,
    aerosol_from_modes,
    aerosol_from_spectrum,
    is_converted,
)
from ..conventions import convention_shares
from ..deposition import Subject, activity, reference_worker
from ..deposition.icrp66 import BreathingPattern
from ..deposition.icrp66 import warnings_for as icrp66_warnings
from ..deposition.simplified import validity_warnings as simplified_warnings
from ..diameters import ParticleDescription
from ..distribution import GSD_MAX, MAX_MODES, BinnedSpectrum
from ..dose import DoseResult, deposited_dose, deposition_curves
from ..ldsa import lung_deposited_surface_area
from ..sources import cite
from .fields import Field, FieldError
from .labels import COORDINATE_WORDS, DIAMETER_TYPE_WORDS, REGION_LABELS
from .particle_air_fields import (
    DENSITY_BASIS,
    DIAMETER_TYPE_CHOICES,
    PARTICLE_DENSITY,
    SHAPE_FACTOR,
)
from .reply import text_result
from .spectrum_fields import D_RANGE, NUMBER_MAX, NUMBER_MIN, import_spectrum, spectrum_fields

TITLE = "Respiratory deposition and dose per shift"

CURVE_POINTS = 241
CURVE_RANGE = (1e-9, 100e-6)  # [m]
MASS_MAX = 1e-2  # [kg/m^3], 10 g/m^3
MASS_MIN = 1e-15  # [kg/m^3], 1e-6 ug/m^3
BENCHMARK_NUMBER_MIN = 1.0  # [1/m^3]: smaller benchmarks make the ratio overflow
BENCHMARK_MASS_MIN = 1e-12  # [kg/m^3], 1 ng/m^3

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
                {
                    "basis": "count",
                    "median": {"value": 40, "unit": "nm"},
                    "diameter_type": "volume_equivalent",
                    "gsd": 1.7,
                    "concentration": {"value": 150000, "unit": "1/cm3"},
                },
                {
                    "basis": "count",
                    "median": {"value": 250, "unit": "nm"},
                    "diameter_type": "volume_equivalent",
                    "gsd": 1.6,
                    "concentration": {"value": 8000, "unit": "1/cm3"},
                },
            ],
            "particle_density": {"value": 5.0, "unit": "g/cm3"},
            "shape_factor": {"value": 1.2, "unit": "1"},
            "model": "icrp66",
            "breathing": "reference_worker",
            "route": "mixed",
            "exposure_duration": {"value": 8, "unit": "h"},
        },
    },
    {
        "id": "demo_dust",
        "label": "Invented demo: grinding dust by mass, with a benchmark",
        "note": "Invented numbers, and an invented benchmark; not a legal limit.",
        "inputs": {
            "size_source": "lognormal",
            "modes": [
                {
                    "basis": "mass",
                    "median": {"value": 6, "unit": "um"},
                    "diameter_type": "aerodynamic",
                    "gsd": 2.2,
                    "concentration": {"value": 2.0, "unit": "mg/m3"},
                }
            ],
            "particle_density": {"value": 2.6, "unit": "g/cm3"},
            "shape_factor": {"value": 1.4, "unit": "1"},
            "model": "icrp66",
            "breathing": "activity",
            "activity": "heavy_exercise",
            "route": "mixed",
            "exposure_duration": {"value": 4, "unit": "h"},
            "benchmark_mass": {"value": 1.0, "unit": "mg/m3"},
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
            "particle_density": {"value": 1.5, "unit": "g/cm3"},
            "shape_factor": {"value": 1.0, "unit": "1"},
            "model": "icrp66",
            "breathing": "reference_worker",
            "route": "mixed",
            "exposure_duration": {"value": 8, "unit": "h"},
            "benchmark_number": {"value": 20000, "unit": "1/cm3"},
        },
    },
)
"""Invented demo scenarios (labelled as invented) for the page's one-click loading."""


def demo_scenarios() -> list[dict[str, Any]]:
    """Return the invented demo scenarios: id, label, note and the request inputs."""
    return [dict(d) for d in DEMOS]


MEDIAN_NAMES = {
    "count": {
        "volume_equivalent": "count median diameter, volume-equivalent (CMD)",
        "optical": "count median optical diameter (taken as volume-equivalent)",
        "mobility": "count median mobility diameter",
        "aerodynamic": "count median aerodynamic diameter (CMAD)",
    },
    "mass": {
        "volume_equivalent": "mass median diameter, geometric (MMD)",
        "optical": "mass median optical diameter (taken as volume-equivalent)",
        "mobility": "mass median mobility diameter",
        "aerodynamic": "mass median aerodynamic diameter (MMAD)",
    },
}
"""What a mode's median is, by basis and diameter type (shown beside the median field)."""

_CONCENTRATION_LABEL = "Concentration (number for count modes, mass for mass modes)"
_DIAMETER_TYPE = Field(
    "diameter_type",
    "The median is a diameter of type",
    "choice",
    "volume_equivalent",
    choices=DIAMETER_TYPE_CHOICES,
    help="Mass mode: aerodynamic gives the MMAD, volume-equivalent the geometric mass median. "
    "Left out: volume-equivalent for a count mode, aerodynamic for a mass mode.",
)
_NUMBER_CONCENTRATION = Field(
    "concentration",
    _CONCENTRATION_LABEL,
    "number_concentration",
    (None, "1/cm3"),
    ("1/cm3", "1/m3"),
    minimum=NUMBER_MIN,
    maximum=NUMBER_MAX,
    applies=("basis", ("count",)),
)

MODE_FIELDS: tuple[Field, ...] = (
    Field(
        "basis",
        "Mode given by",
        "choice",
        "count",
        choices=(
            ("count", "Count (CMD, number concentration)"),
            ("mass", "Mass (mass median, mass concentration)"),
        ),
    ),
    Field(
        "median",
        "Median diameter: count median (count mode) or mass median (mass mode)",
        "length",
        (None, "nm"),
        ("nm", "um"),
        minimum=D_RANGE[0],
        maximum=D_RANGE[1],
    ),
    replace(
        _DIAMETER_TYPE,
        variants=(
            replace(_DIAMETER_TYPE, applies=("basis", ("count",))),
            replace(_DIAMETER_TYPE, default="aerodynamic", applies=("basis", ("mass",))),
        ),
    ),
    Field(
        "gsd",
        "Geometric standard deviation",
        "dimensionless",
        (None, "1"),
        ("1",),
        minimum=1.0,
        exclusive_min=True,
        maximum=GSD_MAX,
        help="Above 1 (1 would mean all particles share one size; e.g. 1.05 for a nearly "
        f"uniform aerosol); above {GSD_MAX:g} is implausible for one mode: use several modes.",
    ),
    replace(
        _NUMBER_CONCENTRATION,
        units=("1/cm3", "1/m3", "mg/m3", "ug/m3"),
        minimum=None,
        maximum=None,
        applies=None,
        variants=(
            _NUMBER_CONCENTRATION,
            Field(
                "concentration",
                _CONCENTRATION_LABEL,
                "mass_concentration",
                (None, "mg/m3"),
                ("mg/m3", "ug/m3"),
                minimum=MASS_MIN,
                maximum=MASS_MAX,
                applies=("basis", ("mass",)),
            ),
        ),
    ),
)
"""What each lognormal mode holds; parsed as every other field is."""

FIELDS: tuple[Field, ...] = (
    Field(
        "size_source",
        "Size distribution from",
        "choice",
        "lognormal",
        choices=(("lognormal", "Lognormal modes"), ("csv", "Measured spectrum (CSV file)")),
        help="Describe the aerosol by up to four lognormal modes, or import a measured spectrum.",
        extra={"demos": [dict(d) for d in DEMOS]},
        formerly=("distribution_source",),
    ),
    Field(
        "modes",
        "Lognormal modes",
        "records",
        [
            {
                "basis": "count",
                "median": {"value": 50, "unit": "nm"},
                "diameter_type": "volume_equivalent",
                "gsd": 1.8,
                "concentration": {"value": 10000, "unit": "1/cm3"},
            }
        ],
        required=False,
        applies=("size_source", ("lognormal",)),
        help="Up to four modes, each by count (count median, GSD, number concentration) or "
        "by mass (mass median, GSD, mass concentration); say which diameter each median is.",
        item_fields=MODE_FIELDS,
        min_items=1,
        max_items=MAX_MODES,
        item_label="Mode",
        extra={"median_names": MEDIAN_NAMES},
    ),
    *spectrum_fields("size_source"),
    replace(
        PARTICLE_DENSITY,
        help="Material density, or the effective density if chosen below (applies to every "
        "mode or bin).",
    ),
    DENSITY_BASIS,
    replace(SHAPE_FACTOR, help="1 for spheres; ICRP's default worker aerosol uses 1.5."),
    Field(
        "model",
        "Deposition model",
        "choice",
        "icrp66",
        choices=(
            ("icrp66", "ICRP 66 full regional model (ET1, ET2, BB, bb, AI)"),
            ("simplified", "Simplified fits to ICRP 66 (Hinds 1999)"),
        ),
    ),
    Field(
        "thermodynamic_convention",
        "Shape factor in diffusion",
        "choice",
        "icrp66",
        choices=(
            ("icrp66", "As ICRP 66 (volume-equivalent sphere)"),
            ("mobility", "Slows diffusion too (mobility-equivalent sphere)"),
        ),
        help=(
            "The shape factor always enters the aerodynamic diameter. ICRP 66 computes "
            "diffusion for a sphere of the volume-equivalent diameter, and its own tables "
            "follow from that; the second choice also slows diffusion by the shape factor "
            "(physically fuller, but it departs from the published model)."
        ),
    ),
    Field(
        "breathing",
        "Breathing",
        "choice",
        "reference_worker",
        choices=(
            ("reference_worker", "ICRP reference worker (2.5 h sitting, 5.5 h light exercise)"),
            ("activity", "One activity level"),
            ("custom", "Custom breathing parameters"),
        ),
    ),
    Field(
        "activity",
        "Activity level",
        "choice",
        "light_exercise",
        choices=(
            ("sleep", "Sleep"),
            ("sitting", "Sitting awake"),
            ("light_exercise", "Light exercise"),
            ("heavy_exercise", "Heavy exercise"),
        ),
        applies=("breathing", ("activity",)),
    ),
    Field(
        "route",
        "Breathing route",
        "choice",
        "mixed",
        choices=(
            ("mixed", "Normal nose breather (ICRP: mouth joins at heavy exercise)"),
            ("nose", "Nose only"),
            ("mouth", "Mouth only"),
            ("mouth_breather", "Habitual mouth breather (ICRP)"),
        ),
        applies=("breathing", ("reference_worker", "activity")),
    ),
    Field(
        "tidal_volume",
        "Tidal volume (custom)",
        "volume",
        (1.25, "L"),
        ("L", "m3"),
        minimum=0.1e-3,
        maximum=4e-3,
        applies=("breathing", ("custom",)),
    ),
    Field(
        "breathing_frequency",
        "Breathing frequency (custom), breaths per minute",
        "dimensionless",
        (20.0, "1"),
        ("1",),
        minimum=4.0,
        maximum=60.0,
        applies=("breathing", ("custom",)),
    ),
    Field(
        "nasal_fraction",
        "Share of air through the nose (custom)",
        "dimensionless",
        (1.0, "1"),
        ("1",),
        minimum=0.0,
        maximum=1.0,
        applies=("breathing", ("custom",)),
    ),
    Field(
        "exposure_duration",
        "Exposure duration",
        "time",
        (8.0, "h"),
        ("h", "min"),
        minimum=1.0,
        maximum=24 * 3600.0,
    ),
    Field(
        "benchmark_number",
        "Benchmark number concentration (optional)",
        "number_concentration",
        (None, "1/cm3"),
        ("1/cm3", "1/m3"),
        minimum=BENCHMARK_NUMBER_MIN,
        maximum=NUMBER_MAX,
        required=False,
        help="A value you choose to compare with, with its source; none is built in.",
    ),
    Field(
        "benchmark_mass",
        "Benchmark mass concentration (optional)",
        "mass_concentration",
        (None, "mg/m3"),
        ("mg/m3", "ug/m3"),
        minimum=BENCHMARK_MASS_MIN,
        maximum=MASS_MAX,
        required=False,
        help="A value you choose to compare with, with its source; none is built in.",
    ),
)


#: a mode's basis as the page, links and saved inputs write it -> the core's word (the core
#: says "number" for counts everywhere: number, surface and mass weights and concentrations)
_CORE_BASIS = {"count": "number", "mass": "mass"}
_MEDIAN_WORDS = {"number": "count", "mass": "mass"}  # the trade's words: count median, mass median


def _aerosol(v: dict[str, Any]) -> tuple[Aerosol, dict[str, Any] | None]:
    """The aerosol of the validated inputs, and the CSV import report for a spectrum."""
    desc = ParticleDescription(
        v["particle_density"], v["shape_factor"], v.get("density_basis") or "material"
    )
    if v["size_source"] == "lognormal":
        modes = [ModeSpec(**{**m, "basis": _CORE_BASIS[m["basis"]]}) for m in v["modes"]]
        return aerosol_from_modes(modes, desc), None
    imported, report = import_spectrum(v)
    try:
        aerosol = aerosol_from_spectrum(
            imported.diameters,
            imported.numbers,
            v.get("spectrum_diameter_type") or "volume_equivalent",
            desc,
        )
    except ValueError:
        raise FieldError(
            "csv_text",
            "Two bins of the spectrum fall on the same size after conversion to the models' "
            "diameter; merge them.",
        ) from None
    return aerosol, report


def _subject(v: dict[str, Any]) -> Subject:
    route = v["route"]
    if v["breathing"] == "reference_worker":
        return reference_worker(route)
    if v["breathing"] == "activity":
        return Subject.single(activity(v["activity"], route))
    pattern = BreathingPattern(
        "custom breathing",
        v["tidal_volume"],
        v["breathing_frequency"] / 60.0,
        v["nasal_fraction"],
    )
    try:
        return Subject.single(pattern)
    except ValueError as exc:
        raise FieldError("tidal_volume", f"Custom breathing: {exc}.") from None


def _row(
    label: str, si: float, factor: float, unit: str, si_unit: str, symbol: str = "", note: str = ""
) -> dict[str, Any]:
    return {
        "label": label,
        "symbol": symbol,
        "value": si / factor,
        "unit": unit,
        "si": si,
        "si_unit": si_unit,
        "note": note,
    }


# display units for the three weights: (factor to SI, unit label, SI unit label)
_DOSE_UNITS = {
    "number": (1.0, "particles", "1"),
    "surface": (1e-6, "mm²", "m²"),
    "mass": (1e-9, "µg", "kg"),
}
_WEIGHT_LABEL = {"number": "number", "surface": "surface area", "mass": "mass"}


def run(v: dict[str, Any]) -> dict[str, Any]:
    """Compute the deposition reply from validated SI inputs."""
    aerosol, report = _aerosol(v)
    dist, desc = aerosol.distribution, aerosol.description
    rho, chi = desc.model_density, desc.model_shape_factor
    subject = _subject(v)
    model = v["model"]
    duration = v["exposure_duration"]
    try:
        res = deposited_dose(
            dist,
            subject,
            duration,
            model,
            benchmark_number=v.get("benchmark_number"),
            benchmark_mass=v.get("benchmark_mass"),
            thermodynamic=v["thermodynamic_convention"],
        )
    except ValueError as exc:
        raise FieldError("", str(exc)) from None
    warnings = _warnings(dist, subject, model, res, v) + _basis_warnings(dist, desc)
    if report is not None:
        warnings.extend(f"CSV import: {n}" for n in report["notes"])
    sources = [
        "icrp66",
        "hatch_choate1929",
        "iso7708",
        "kim2005",
        "einstein1905",
        "ldsa_fissan2007",
    ]
    if aerosol.mobility_used():
        sources.append("decarlo2004")
    if model == "simplified":
        sources.insert(1, "hinds1999_ch11")
    if v["breathing"] == "reference_worker":
        sources.insert(1, "icrp68")
    return {
        "results": {
            **_results(res, subject, dist, report),
            **_ldsa_rows(res),
            **_mode_rows(aerosol),
        },
        "curves": _curves(dist, subject, model, rho, chi, res, desc),
        "warnings": warnings,
        "sources": cite(*sources),
    }


def _results(
    res: DoseResult, subject: Subject, dist: Any, report: dict[str, Any] | None
) -> dict[str, Any]:
    out: dict[str, Any] = {
        "breathing": text_result("Breathing", subject.name),
        "inhaled_volume": _row(
            "Air inhaled over the exposure", res.inhaled_volume, 1.0, "m³", "m³", "V"
        ),
        "ventilation": _row(
            "Mean ventilation", res.ventilation, 1.0 / 3600.0, "m³/h", "m³/s", "V̇ₑ"
        ),
        "number_concentration": _row(
            "Airborne number concentration", res.ambient["number"], 1e6, "1/cm³", "1/m³"
        ),
        "surface_concentration": _row(
            "Airborne surface-area concentration",
            res.ambient["surface"],
            1e-6,
            "µm²/cm³",
            "m²/m³",
        ),
        "mass_concentration": _row(
            "Airborne mass concentration", res.ambient["mass"], 1e-9, "µg/m³", "kg/m³"
        ),
    }
    iso_labels = {
        "inhalable": "inhalable",
        "thoracic": "thoracic",
        "respirable": "respirable",
        "high_risk_respirable": "high-risk respirable",
    }
    all_shares = convention_shares(dist, ("mass", "number"))
    for w in ("mass", "number"):
        shares = all_shares[w]
        for key, label in iso_labels.items():
            out[f"iso7708_{key}_{w}"] = _row(
                f"Share of airborne {w} in the ISO 7708 {label} fraction",
                shares[key],
                1.0,
                "–",
                "–",
            )
    if report is not None:
        out["csv_rows"] = text_result(
            "Spectrum imported",
            f"{report['rows']} rows (lines {report['first_line']}–{report['last_line']}), "
            f"{report['delimiter']}-separated",
        )
    hours = res.duration / 3600.0
    for r in res.regions:
        name = REGION_LABELS[r]
        for w in ("number", "surface", "mass"):
            out[f"fraction_{r}_{w}"] = _row(
                f"{name}: deposited fraction by {_WEIGHT_LABEL[w]}",
                res.fractions[r][w],
                1.0,
                "–",
                "–",
            )
        for w in ("number", "surface", "mass"):
            factor, unit, si_unit = _DOSE_UNITS[w]
            out[f"rate_{r}_{w}"] = _row(
                f"{name}: {_WEIGHT_LABEL[w]} deposited per hour",
                res.rates[r][w] * 3600.0,
                factor,
                f"{unit}/h",
                f"{si_unit}/h",
            )
            out[f"dose_{r}_{w}"] = _row(
                f"{name}: {_WEIGHT_LABEL[w]} deposited in {hours:g} h",
                res.doses[r][w],
                factor,
                unit,
                si_unit,
            )
    for metric, ratio in res.benchmark.items():
        out[f"benchmark_{metric}"] = _row(
            f"Airborne {metric} concentration ÷ your benchmark", ratio, 1.0, "–", "–"
        )
    return out


_LDSA_LABELS = {
    "alveolar": "alveolar",
    "tracheobronchial": "tracheobronchial",
    "total": "total (all regions)",
}


def _ldsa_rows(res: DoseResult) -> dict[str, Any]:
    """LDSA rows: deposited particle surface per volume of inhaled air, in um^2/cm^3."""
    ldsa = lung_deposited_surface_area(res)
    return {
        f"ldsa_{key}": _row(
            f"Lung-deposited surface area, {_LDSA_LABELS[key]}",
            ldsa[key],
            1e-6,
            "µm²/cm³",
            "m²/m³",
            "LDSA",
            "deposited particle surface per cm³ of inhaled air",
        )
        for key in ("alveolar", "tracheobronchial", "total")
    }


def _mode_rows(aerosol: Aerosol) -> dict[str, Any]:
    """Per mode: the medians the models use, the MMAD and both concentrations."""
    out: dict[str, Any] = {}
    desc = aerosol.description
    modes = getattr(aerosol.distribution, "modes", ())
    coord = COORDINATE_WORDS[desc.coordinate]
    for i, (mode, e) in enumerate(zip(modes, aerosol.modes, strict=True), start=1):
        given = f"entered: {_MEDIAN_WORDS[e.basis]} median, {DIAMETER_TYPE_WORDS[e.diameter_type]}"
        converted = is_converted(desc, e.diameter_type)
        note = given + ("; converted, GSD kept" if converted else "")
        mmd = mode.median("mass")
        out[f"mode{i}_count_median"] = _row(
            f"Mode {i}: count median ({coord})",
            mode.cmd,
            1e-9,
            "nm",
            "m",
            "CMD",
            note,
        )
        out[f"mode{i}_mass_median"] = _row(
            f"Mode {i}: mass median ({coord})", mmd, 1e-6, "µm", "m", "MMD"
        )
        out[f"mode{i}_mmad"] = _row(
            f"Mode {i}: mass median aerodynamic",
            desc.from_model(mmd, "aerodynamic"),
            1e-6,
            "µm",
            "m",
            "MMAD",
        )
        out[f"mode{i}_number"] = _row(
            f"Mode {i}: number concentration", mode.number_concentration, 1e6, "1/cm³", "1/m³"
        )
        out[f"mode{i}_mass"] = _row(
            f"Mode {i}: mass concentration", mode.total("mass"), 1e-9, "µg/m³", "kg/m³"
        )
    return out


def _curves(
    dist: Any,
    subject: Subject,
    model: str,
    rho: float,
    chi: float,
    res: DoseResult,
    desc: ParticleDescription,
) -> dict[str, Any]:
    xs = logspace(*CURVE_RANGE, CURVE_POINTS)
    dep = deposition_curves(model, xs, rho, chi, subject, res.thermodynamic)
    x_um = [x * 1e6 for x in xs]
    series = {
        r: {"label": REGION_LABELS[r], "x": x_um, "y": [min(1.0, max(0.0, y)) for y in dep[r]]}
        for r in res.regions
    }
    overlay = {}
    for w in ("number", "mass"):
        ys = _overlay_density(dist, xs, w)
        top = max(ys) if ys else 0.0
        overlay[w] = {
            "label": f"Your distribution by {w} (dW/dln d, scaled to peak 1)",
            "x": x_um,
            "y": [y / top if top > 0 else 0.0 for y in ys],
        }
    hours = res.duration / 3600.0
    bars: dict[str, Any] = {
        "regions": [REGION_LABELS[r] for r in res.regions],
        "keys": list(res.regions),
        "per": f"{hours:g} h",
    }
    for w in ("number", "surface", "mass"):
        factor, unit, _ = _DOSE_UNITS[w]
        bars[w] = {
            "label": f"Deposited {_WEIGHT_LABEL[w]} in {hours:g} h",
            "unit": unit,
            "y": [res.doses[r][w] / factor for r in res.regions],
            "per_hour": [res.rates[r][w] * 3600.0 / factor for r in res.regions],
            "per_hour_label": f"Deposited {_WEIGHT_LABEL[w]} per hour",
        }
    return {
        "x_label": f"Particle diameter ({COORDINATE_WORDS[desc.coordinate]})",
        "x_unit": "µm",
        "y_label": "Deposition fraction",
        "y_unit": "–",
        "deposition": series,
        "distribution": {
            "y_label": "Your distribution, scaled to a peak of 1",
            "y_unit": "–",
            **overlay,
        },
        "dose_bars": bars,
    }


def _overlay_density(dist: Any, xs: list[float], weight: str) -> list[float]:
    """dW/dln d of ``dist`` at each of the increasing sizes ``xs``.

    A binned spectrum is looked up by bisection with its bin totals computed once (its own
    method scans every bin for each size, which took seconds for a 20 000-row file).
    """
    if not isinstance(dist, BinnedSpectrum):
        return [dist.density_per_ln_d(x, weight) for x in xs]
    e = dist.edges
    per_ln_d = [w / math.log(e[i + 1] / e[i]) for i, (_, w) in enumerate(dist.quadrature(weight))]
    out = []
    for x in xs:
        i = bisect.bisect_right(e, x) - 1
        out.append(per_ln_d[i] if 0 <= i < len(per_ln_d) else 0.0)
    return out


DENSEST_MATERIAL = 22.6e3
"""Density of osmium, the densest element (common practice); an effective density and shape
factor implying a denser material cannot describe one particle. [kg/m^3]"""


def _basis_warnings(dist: Any, desc: ParticleDescription) -> list[str]:
    """Notes on the effective-density description, and a check that it is possible."""
    if desc.basis != "effective":
        return []
    modes = getattr(dist, "modes", None)
    if modes is not None:
        sizes = [d for m in modes for d in (m.cmd, m.median("mass"))]
    else:
        sizes = [dist.diameters[0], dist.diameters[-1]]
    implied = max(desc.implied_material_density(d) for d in sizes)
    out = [
        "With an effective density the sizes are mobility diameters, and the models use the "
        "sphere with the particles' mobility and mass (DeCarlo et al. 2004); surface areas, "
        "and so the LDSA, are those of that sphere, less than the real surface of an "
        "agglomerate of primary particles. The choice of shape factor in diffusion makes no "
        "difference here: that sphere already has the particles' mobility."
    ]
    if implied > DENSEST_MATERIAL:
        out.append(
            f"The effective density and shape factor do not fit together: with them a particle "
            f"of this size would be made of a material of {implied / 1000.0:.3g} g/cm³, denser "
            "than any element. Check both values."
        )
    return out


def _warnings(
    dist: Any, subject: Subject, model: str, res: DoseResult, v: dict[str, Any]
) -> list[str]:
    modes = getattr(dist, "modes", None)
    if modes is not None:
        lo = min(m.median("number") / m.gsd**3.29 for m in modes)  # 0.05 % of number
        hi = max(m.median("mass") * m.gsd**3.29 for m in modes)  # 99.95 % of mass
    else:
        lo, hi = dist.edges[0], dist.edges[-1]
    out = icrp66_warnings(lo, hi, subject) if model == "icrp66" else simplified_warnings(lo, hi)
    if model == "simplified":
        out.append(
            "The simplified fits describe unit-density spheres averaged over breathing "
            "conditions; for other particles their diffusion terms are entered with the "
            "volume-equivalent (thermodynamic) diameter and their impaction and settling "
            "terms with the aerodynamic diameter, and they ignore the breathing chosen "
            "except for the ventilation."
        )
    if (
        v["thermodynamic_convention"] == "mobility"
        and v["shape_factor"] != 1.0
        and v.get("density_basis", "material") == "material"
    ):
        out.append(
            "Diffusion is computed with the shape factor in the mobility (mobility-equivalent "
            "sphere); ICRP 66 and its tables use a sphere of the volume-equivalent diameter, "
            "so results for fine particles are lower than the published model's."
        )
    labels = {"number": "number", "mass": "mass"}
    for metric, ratio in res.benchmark.items():
        if ratio > 1.0:
            out.append(
                f"The airborne {labels[metric]} concentration is {ratio:.3g} times the "
                "benchmark you entered."
            )
    if v["breathing"] == "custom" and v["nasal_fraction"] < 1.0 and model == "icrp66":
        out.append(
            "Part of the air is breathed through the mouth: the mouth deposits fewer coarse "
            "particles than the nose, so more reach the lungs."
        )
    return out
