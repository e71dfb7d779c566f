"""Validation of the motion calculation's inputs: every field, every kind of bad value.

Contract (DEVELOPERS.md, "Architecture"): a bad input gives ``ok: False`` and an error on that
field whose message names the valid range (or the valid choices), so the page can show it
next to the field. No physics here.
"""

from __future__ import annotations

import math

import pytest

from driftdose.api import describe, handle
from driftdose.api.fields import Field, FieldError, applies, format_si, parse_fields
from driftdose.api.motion import FIELDS
from driftdose.api.units import SI_UNIT, UNITS, from_si

QUANTITY_FIELDS = [f for f in FIELDS if f.kind in UNITS]
CHOICE_FIELDS = [f for f in FIELDS if f.kind == "choice"]


def _bad_quantity_inputs(f: Field) -> list[tuple[str, object]]:
    """(case id, raw input) pairs that must all be rejected for quantity field ``f``."""
    du, su = f.default[1], SI_UNIT[f.kind]
    cases: list[tuple[str, object]] = [
        ("empty", ""),
        ("whitespace", "   "),
        ("empty-value", {"value": "", "unit": du}),
        ("null-value", {"value": None, "unit": du}),
        ("missing-value", {"unit": du}),
        ("text", {"value": "abc", "unit": du}),
        ("text-with-unit", "10 nm"),
        ("negative", {"value": -1.0, "unit": su}),
        ("negative-text", {"value": "-1", "unit": su}),
        ("nan", {"value": math.nan, "unit": du}),
        ("nan-text", {"value": "NaN", "unit": du}),
        ("infinity", {"value": math.inf, "unit": du}),
        ("infinity-text", {"value": "Infinity", "unit": du}),
        ("minus-infinity-text", {"value": "-Infinity", "unit": du}),
        ("1e308", {"value": 1e308, "unit": du}),
        ("1e308-text", {"value": "1e308", "unit": du}),
        ("1e400-text", {"value": "1e400", "unit": du}),
        ("huge-int", {"value": 10**400, "unit": du}),
        ("huge-negative-int", {"value": -(10**400), "unit": du}),
        ("unknown-unit", {"value": 1.0, "unit": "furlong"}),
        ("unit-of-other-kind", {"value": 1.0, "unit": "kg/m3" if f.kind != "density" else "nm"}),
        ("unit-not-text", {"value": 1.0, "unit": 5}),
        ("unit-null", {"value": 1.0, "unit": None}),
        ("bool", True),
        ("bool-value", {"value": False, "unit": du}),
        ("list", [1, 2]),
        ("empty-object", {}),
        ("nested-object", {"value": {"value": 1.0}, "unit": du}),
    ]
    if f.minimum is not None:
        if f.exclusive_min or f.minimum > 0:
            cases.append(("zero", {"value": 0.0, "unit": su}))
        low = f.minimum if f.exclusive_min else f.minimum * (1 - 1e-6) - 1e-300
        cases.append(("below-minimum", {"value": low, "unit": su}))
    if f.maximum is not None:
        cases.append(("above-maximum", {"value": f.maximum * (1 + 1e-6), "unit": su}))
    return cases


QUANTITY_CASES = [
    pytest.param(f, raw, id=f"{f.name}-{case}")
    for f in QUANTITY_FIELDS
    for case, raw in _bad_quantity_inputs(f)
]

CHOICE_CASES = [
    pytest.param(f, raw, id=f"{f.name}-{case}")
    for f in CHOICE_FIELDS
    for case, raw in [
        ("empty", ""),
        ("whitespace", "  "),
        ("unknown", "spherical"),
        ("wrong-case", f.choices[0][0].upper()),
        ("number", 5),
        ("bool", True),
        ("list", [f.choices[0][0]]),
        ("object", {"value": f.choices[0][0]}),
        ("huge-text", "x" * 100_000),
    ]
]


def _single_error(reply: dict, field: str) -> str:
    assert reply["ok"] is False
    assert set(reply) == {"ok", "errors"}
    assert len(reply["errors"]) == 1, reply["errors"]
    error = reply["errors"][0]
    assert set(error) == {"field", "message"}
    assert error["field"] == field
    assert isinstance(error["message"], str) and len(error["message"]) < 300
    return error["message"]


@pytest.mark.parametrize(("f", "raw"), QUANTITY_CASES)
def test_handle_rejects_bad_quantity(f: Field, raw: object) -> None:
    reply = handle({"kind": "motion", "inputs": {f.name: raw}})
    message = _single_error(reply, f.name)
    assert f.label in message
    assert f.range_text() in message


@pytest.mark.parametrize(("f", "raw"), CHOICE_CASES)
def test_handle_rejects_bad_choice(f: Field, raw: object) -> None:
    reply = handle({"kind": "motion", "inputs": {f.name: raw}})
    message = _single_error(reply, f.name)
    assert f.label in message
    for value, _label in f.choices:
        assert value in message


def test_handle_reports_every_bad_field_at_once() -> None:
    inputs = {f.name: "abc" for f in FIELDS}
    reply = handle({"kind": "motion", "inputs": inputs})
    assert reply["ok"] is False
    assert [e["field"] for e in reply["errors"]] == [f.name for f in FIELDS]


# ---------------------------------------------------------------------------------------------
# Valid inputs that must be accepted
# ---------------------------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("f", "unit", "bound"),
    [
        pytest.param(f, u, b, id=f"{f.name}-{u}-{which}")
        for f in QUANTITY_FIELDS
        for u in f.units
        for which, b in (("min", f.minimum), ("max", f.maximum))
        if b is not None and not (which == "min" and f.exclusive_min)
    ],
)
def test_parse_accepts_stated_limits_in_every_offered_unit(f: Field, unit: str, bound) -> None:
    assert f.parse({"value": from_si(bound, f.kind, unit), "unit": unit}) == pytest.approx(bound)


@pytest.mark.parametrize(
    ("name", "value", "unit", "si"),
    [
        # The limits as the message prints them, typed back in (rounding on conversion must
        # not reject them: -50 degC is 223.14999999999998 K in binary floating point).
        ("temperature", -50, "degC", 223.15),
        ("temperature", "500", "\u00b0C", 773.15),
        ("particle_diameter", 0.5, "nm", 0.5e-9),
        ("particle_diameter", 1000, "um", 1e-3),
        ("particle_density", "0.1", "g/cm3", 100.0),
        ("time", 1, "ms", 1e-3),
        ("time", 24, "h", 86400.0),
        ("pressure", 10, "kPa", 10e3),
        ("reference_distance", 0.1, "um", 1e-7),
        # Spellings people type.
        ("temperature", "\u221250", "degC", 223.15),  # Unicode minus sign
        ("particle_diameter", "0,5", "\u00b5m", 0.5e-6),  # decimal comma, micro sign
        ("particle_diameter", " 2.5e-1 ", "\u03bcm", 0.25e-6),  # Greek mu, spaces
        ("particle_density", 2650, "kg/m\u00b3", 2650.0),
        ("time", "1.5", "h", 5400.0),
        ("pressure", 1, "atm", 101325.0),
        ("pressure", 1013.25, "hPa", 101325.0),
        ("initial_velocity", 50, "cm/s", 0.5),
    ],
)
def test_parse_accepts_valid_spellings(name: str, value, unit: str, si: float) -> None:
    f = next(f for f in FIELDS if f.name == name)
    assert f.parse({"value": value, "unit": unit}) == pytest.approx(si, rel=1e-12)
    assert handle({"kind": "motion", "inputs": {name: {"value": value, "unit": unit}}})["ok"]


def test_parse_plain_number_is_si() -> None:
    f = next(f for f in FIELDS if f.name == "temperature")
    assert f.parse(300) == 300.0
    assert f.parse({"value": 300}) == 300.0


def test_parse_fields_defaults_and_unknown_names() -> None:
    values, errors = parse_fields(FIELDS, {"no_such_field": 1, "time": None})
    assert errors == []
    assert values["time"] == 1.0  # default 1 s
    assert values["particle_diameter"] == pytest.approx(100e-9)  # default 100 nm
    assert values["temperature"] == pytest.approx(293.15)  # default 20 degC
    assert values["pressure"] == pytest.approx(101325.0)  # default 101.325 kPa
    assert "no_such_field" not in values


def test_parse_fields_inputs_not_an_object() -> None:
    for inputs in (None, [], "text", 5):
        values, errors = parse_fields(FIELDS, inputs)
        assert values == {}
        assert errors[0]["field"] == ""


def test_every_default_is_valid() -> None:
    for f in FIELDS:
        raw = {"value": f.default[0], "unit": f.default[1]} if f.kind in UNITS else f.default
        f.parse(raw)  # raises FieldError if not
        if f.kind in UNITS:
            assert f.default[1] in f.units


# ---------------------------------------------------------------------------------------------
# Range texts and number formatting
# ---------------------------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("name", "text"),
    [
        # Regression pins of the wording shown to users (no claim beyond that).
        ("particle_diameter", "from 0.5 nm to 1 mm"),
        ("particle_density", "from 0.1 g/cm\u00b3 to 25 g/cm\u00b3"),
        ("shape_factor", "from 1 to 5"),
        ("temperature", "from -50 \u00b0C to 500 \u00b0C"),
        ("pressure", "from 10 kPa to 200 kPa"),
        ("time", "from 1 ms to 24 h"),
        ("reference_distance", "from 100 nm to 10 m"),
        ("initial_velocity", "greater than 0 m/s and at most 100 m/s"),
    ],
)
def test_range_text_motion_fields(name: str, text: str) -> None:
    assert next(f for f in FIELDS if f.name == name).range_text() == text


def test_format_si_significant_figures() -> None:
    assert format_si(1.23456e-6, "length", "um") == "1.23 \u00b5m"
    assert format_si(293.15, "temperature", "degC") == "20 \u00b0C"
    assert format_si(2.5e-11, "length", "m") == "2.5\u00d710\u207b\u00b9\u00b9 m"
    assert format_si(2.0, "dimensionless", "1") == "2"


def test_field_messages_without_bounds() -> None:
    # A field without bounds still gives a clean message (no dangling words).
    f = Field("x", "Some length", "length", (1.0, "m"), ("m",))
    with pytest.raises(FieldError) as info:
        f.parse("abc")
    assert info.value.message == "Some length must be a number, not 'abc'."
    with pytest.raises(FieldError) as info:
        f.parse({"value": 1.0, "unit": "furlong"})
    assert "  " not in info.value.message and "()" not in info.value.message
    g = Field("n", "Count", "integer", 3)
    assert g.range_text() == ""
    with pytest.raises(FieldError) as info:
        g.parse(2.5)
    assert info.value.message == "Count must be a whole number."


def test_integer_field_messages() -> None:
    f = Field("n", "Count", "integer", 3, minimum=1, maximum=10)
    assert f.parse("4") == 4
    for raw, part in ((2.5, "whole number from 1 to 10"), (11, "1 to 10"), ("x", "1 to 10")):
        with pytest.raises(FieldError) as info:
            f.parse(raw)
        assert part in info.value.message and info.value.field == "n"


def test_text_field_length_limit() -> None:
    f = Field("note", "Note", "text", "", required=False, extra={"max_length": 10})
    assert f.parse("short") == "short"
    with pytest.raises(FieldError, match="at most 10 characters"):
        f.parse("x" * 11)
    with pytest.raises(FieldError):
        f.parse(5)


def test_range_failure_in_one_unit_hints_at_the_unit_where_it_fits():
    """A number valid in another offered unit names that unit; one valid in none does not."""

    def message(kind, name, value, unit):
        reply = handle({"kind": kind, "inputs": {name: {"value": value, "unit": unit}}})
        assert not reply["ok"]
        return reply["errors"][0]["message"]

    assert message("motion", "particle_diameter", "0,3", "nm").endswith("0.3 nm — did you mean µm?")
    assert message("motion", "particle_diameter", "5000", "um").endswith(
        "5000 µm — did you mean nm?"
    )
    assert message("motion", "particle_density", "2650", "g/cm3").endswith(
        "2650 g/cm³ — did you mean kg/m³?"
    )
    # out of range in every offered unit: the range only
    assert message("motion", "particle_diameter", "5e9", "nm") == (
        "Particle diameter must be from 0.5 nm to 1 mm."
    )
    # the hint never appears for a valid value
    assert handle(
        {"kind": "motion", "inputs": {"particle_diameter": {"value": "0.3", "unit": "um"}}}
    )["ok"]


def test_applies_declared_on_the_field_is_published_and_read_back():
    f = Field(
        "tidal_volume",
        "Tidal volume",
        "volume",
        (1.0, "L"),
        ("L",),
        applies=("breathing", ("custom",)),
    )
    described = f.describe()
    assert described["applies_when"] == {"field": "breathing", "values": ["custom"]}
    assert applies(described, {"breathing": "custom"}) is True
    assert applies(described, {"breathing": "reference_worker"}) is False
    assert applies(described, {}) is False  # the field it depends on missing: does not apply
    plain = Field("x", "X", "text", "a")
    assert "applies_when" not in plain.describe()
    assert applies(plain.describe(), {}) is True


def test_every_applies_when_names_a_choice_of_its_own_calculation():
    """Each declared rule depends on a choice field of the same calculation, by values it
    offers (a rule that can never hold, or names a field the form lacks, would hide a field
    for good)."""
    seen = 0
    for kind, calc in describe()["calculations"].items():
        by_name = {fd["name"]: fd for fd in calc["fields"]}
        for fd in calc["fields"]:
            rule = fd.get("applies_when")
            if rule is None:
                continue
            seen += 1
            other = by_name.get(rule["field"])
            assert other is not None and other["kind"] == "choice", (kind, fd["name"])
            offered = {c["value"] for c in other["choices"]}
            assert rule["values"] and set(rule["values"]) <= offered, (kind, fd["name"])
            # shown by default or not, the default of the field it depends on is offered
            assert other["default"] in offered
    assert seen >= 20
