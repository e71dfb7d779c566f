"""Unit conversion at the boundary: definitions, aliases and round trips.

Conversion factors are checked against their definitions (NIST Special Publication 811,
2008 edition, Appendix B, and the SI Brochure, 9th ed., 2019); exact factors are compared to
within rounding only.
"""

from __future__ import annotations

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from driftdose.api import units
from driftdose.api.units import SI_UNIT, UNITS, auto_unit, canonical_unit, from_si, to_si

FAST = settings(max_examples=100, deadline=None)


@pytest.mark.parametrize(
    ("value", "kind", "unit", "si"),
    [
        # Length: SI prefixes (SI Brochure 2019, Table 7).
        pytest.param(10.0, "length", "nm", 10e-9, id="si-prefix-nm"),
        pytest.param(2.5, "length", "um", 2.5e-6, id="si-prefix-um"),
        pytest.param(2.5, "length", "\u00b5m", 2.5e-6, id="micro-sign-um"),
        pytest.param(2.5, "length", "\u03bcm", 2.5e-6, id="greek-mu-um"),
        pytest.param(2.5, "length", "micron", 2.5e-6, id="micron"),
        pytest.param(0.2, "length", "mm", 0.2e-3, id="si-prefix-mm"),
        pytest.param(3.0, "length", "cm", 0.03, id="si-prefix-cm"),
        # Temperature: T/K = t/degC + 273.15; T/K = (t/degF + 459.67) / 1.8 (NIST SP 811 B.8).
        pytest.param(20.0, "temperature", "degC", 293.15, id="nist811-degC-20"),
        pytest.param(20.0, "temperature", "\u00b0C", 293.15, id="nist811-degC-symbol"),
        pytest.param(20.0, "temperature", "\u2103", 293.15, id="nist811-degC-single-char"),
        pytest.param(-273.15, "temperature", "degC", 0.0, id="nist811-absolute-zero"),
        pytest.param(68.0, "temperature", "\u00b0F", 293.15, id="nist811-degF-68"),
        pytest.param(32.0, "temperature", "degF", 273.15, id="nist811-degF-freezing"),
        pytest.param(212.0, "temperature", "F", 373.15, id="nist811-degF-boiling"),
        pytest.param(-40.0, "temperature", "degF", 233.15, id="nist811-degF-minus40"),
        pytest.param(-40.0, "temperature", "C", 233.15, id="nist811-degC-minus40"),
        pytest.param(300.0, "temperature", "K", 300.0, id="kelvin"),
        # Pressure: 1 atm = 101 325 Pa exactly; conventional mmHg 133.322 387 415 Pa; psi
        # 6 894.757 293 168 Pa; bar 1e5 Pa (NIST SP 811 B.8).
        pytest.param(101.325, "pressure", "kPa", 101325.0, id="kPa"),
        pytest.param(1.0, "pressure", "atm", 101325.0, id="nist811-atm"),
        pytest.param(1013.25, "pressure", "hPa", 101325.0, id="hPa"),
        pytest.param(101325.0, "pressure", "Pa", 101325.0, id="Pa"),
        pytest.param(1.0, "pressure", "bar", 1e5, id="nist811-bar"),
        pytest.param(1.0, "pressure", "mmHg", 133.322387415, id="nist811-mmHg"),
        pytest.param(1.0, "pressure", "psi", 6894.757293168, id="nist811-psi"),
        # Time.
        pytest.param(1.0, "time", "s", 1.0, id="s"),
        pytest.param(2.0, "time", "min", 120.0, id="min"),
        pytest.param(1.5, "time", "h", 5400.0, id="h"),
        pytest.param(8.0, "time", "hr", 28800.0, id="hr-alias"),
        pytest.param(250.0, "time", "ms", 0.25, id="ms"),
        # Density: 1 g/cm^3 = 1000 kg/m^3.
        pytest.param(1.0, "density", "g/cm3", 1000.0, id="g-per-cm3"),
        pytest.param(2.65, "density", "g/cm\u00b3", 2650.0, id="g-per-cm3-superscript"),
        pytest.param(1.0, "density", "g/mL", 1000.0, id="g-per-mL"),
        pytest.param(1000.0, "density", "kg/m3", 1000.0, id="kg-per-m3"),
        pytest.param(1000.0, "density", "kg/m\u00b3", 1000.0, id="kg-per-m3-superscript"),
        # Flow: 1 L/min = 1e-3 m^3 / 60 s.
        pytest.param(1.0, "flow", "L/min", 1e-3 / 60.0, id="L-per-min"),
        pytest.param(2.0, "flow", "l/min", 2e-3 / 60.0, id="l-per-min-alias"),
        pytest.param(2.0, "flow", "lpm", 2e-3 / 60.0, id="lpm-alias"),
        pytest.param(3.6, "flow", "m3/h", 1e-3, id="m3-per-h"),
        pytest.param(1.0, "flow", "cm3/s", 1e-6, id="cm3-per-s"),
        pytest.param(1.5, "ventilation", "m3/h", 1.5 / 3600.0, id="ventilation-m3-per-h"),
        # Velocity, concentrations, volume, angle.
        pytest.param(3.0, "velocity", "cm/s", 0.03, id="cm-per-s"),
        pytest.param(40000.0, "number_concentration", "1/cm3", 4e10, id="per-cm3"),
        pytest.param(0.3, "mass_concentration", "mg/m3", 0.3e-6, id="mg-per-m3"),
        pytest.param(1.0, "mass_concentration", "\u00b5g/m3", 1e-9, id="ug-per-m3"),
        pytest.param(9.6, "volume", "m3", 9.6, id="m3"),
        pytest.param(500.0, "volume", "L", 0.5, id="litre"),
        pytest.param(180.0, "angle", "deg", math.pi, id="deg"),
        pytest.param(1.0, "dimensionless", "", 1.0, id="dimensionless-empty"),
    ],
)
def test_to_si_definitions(value: float, kind: str, unit: str, si: float) -> None:
    assert to_si(value, kind, unit) == pytest.approx(si, rel=1e-14, abs=1e-12)
    # Round trip back to the unit the value came in.
    assert from_si(to_si(value, kind, unit), kind, unit) == pytest.approx(
        value, rel=1e-12, abs=1e-9
    )


@pytest.mark.parametrize(
    ("kind", "a", "b"),
    [
        ("length", (1000.0, "nm"), (1.0, "um")),
        ("length", (1.0, "\u00b5m"), (1.0, "\u03bcm")),
        ("temperature", (25.0, "degC"), (77.0, "degF")),
        ("temperature", (25.0, "degC"), (298.15, "K")),
        ("pressure", (1.0, "atm"), (101.325, "kPa")),
        ("pressure", (1.0, "atm"), (1013.25, "hPa")),
        ("time", (1.0, "h"), (60.0, "min")),
        ("density", (2.65, "g/cm3"), (2650.0, "kg/m3")),
        ("flow", (60.0, "L/min"), (3.6, "m3/h")),
    ],
)
def test_to_si_equivalent_spellings(kind: str, a: tuple, b: tuple) -> None:
    assert to_si(a[0], kind, a[1]) == pytest.approx(to_si(b[0], kind, b[1]), rel=1e-14)


def test_canonical_unit_aliases() -> None:
    assert canonical_unit("length", "\u00b5m") == "um"
    assert canonical_unit("length", "\u03bcm") == "um"
    assert canonical_unit("length", " nm ") == "nm"
    assert canonical_unit("temperature", "\u00b0C") == "degC"
    assert canonical_unit("temperature", "\u00b0F") == "degF"
    assert canonical_unit("flow", "l/min") == "L/min"
    assert canonical_unit("density", "g/cm\u00b3") == "g/cm3"


@pytest.mark.parametrize(
    ("kind", "unit"),
    [("length", "furlong"), ("length", "kg"), ("temperature", "R"), ("pressure", "torr")],
)
def test_canonical_unit_unknown(kind: str, unit: str) -> None:
    with pytest.raises(KeyError):
        canonical_unit(kind, unit)
    with pytest.raises(KeyError):
        to_si(1.0, kind, unit)


def test_si_unit_has_factor_one_and_no_offset() -> None:
    for kind, table in UNITS.items():
        u = SI_UNIT[kind]
        assert table[u] == 1.0
        assert to_si(1.0, kind, u) == 1.0 and from_si(1.0, kind, u) == 1.0
    assert SI_UNIT["temperature"] == "K"
    assert SI_UNIT["length"] == "m"
    assert SI_UNIT["flow"] == "m3/s"


def test_unit_label_typography() -> None:
    assert units.unit_label("um") == "\u00b5m"
    assert units.unit_label("degC") == "\u00b0C"
    assert units.unit_label("g/cm3") == "g/cm\u00b3"
    assert units.unit_label("nm") == "nm"


def test_unit_label_parses_back() -> None:
    # Every label the page shows must be accepted when sent back.
    for kind, table in UNITS.items():
        for u in table:
            assert canonical_unit(kind, units.unit_label(u)) == u


@pytest.mark.parametrize(
    ("kind", "si", "unit"),
    [
        ("length", 5e-9, "nm"),
        ("length", 2.5e-6, "um"),
        ("length", 0.2e-3, "um"),
        ("length", 5e-3, "mm"),
        ("length", 3.0, "m"),
        ("time", 0.01, "ms"),
        ("time", 60.0, "s"),
        ("time", 3600.0, "min"),
        ("time", 28800.0, "h"),
        ("velocity", 3.5e-5, "um/s"),
        ("velocity", 3e-3, "mm/s"),
        ("velocity", 0.25, "m/s"),
        ("pressure", 101325.0, "Pa"),
    ],
)
def test_auto_unit_ladders(kind: str, si: float, unit: str) -> None:
    assert auto_unit(kind, si) == unit


_ALL_UNITS = [(k, u) for k, table in UNITS.items() for u in table]


@FAST
@given(st.sampled_from(_ALL_UNITS), st.floats(-1e6, 1e6, allow_nan=False))
def test_from_si_round_trip(kind_unit, x: float) -> None:
    kind, unit = kind_unit
    back = from_si(to_si(x, kind, unit), kind, unit)
    assert math.isclose(back, x, rel_tol=1e-12, abs_tol=1e-9)


@FAST
@given(st.sampled_from(_ALL_UNITS), st.floats(1e-12, 1e12))
def test_to_si_round_trip_from_si(kind_unit, si: float) -> None:
    kind, unit = kind_unit
    back = to_si(from_si(si, kind, unit), kind, unit)
    assert math.isclose(back, si, rel_tol=1e-12, abs_tol=1e-9)
