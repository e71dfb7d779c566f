"""Declarative input fields: labels, units, defaults and valid ranges, checked once here.

A calculation declares its inputs as a tuple of :class:`Field`. The same declarations feed
the page's forms (``describe``), the command line's flags and the validation of every
request, so the three never disagree.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Any

from ..unit_labels import unit_text
from .units import SI_UNIT, UNITS, auto_unit, canonical_unit, from_si, to_si, unit_label

__all__ = [
    "Field",
    "FieldError",
    "FieldsError",
    "applies",
    "entered",
    "format_si",
    "parse_fields",
    "parse_number",
]


class FieldError(Exception):
    """A problem with one input field; becomes ``{"field": ..., "message": ...}``."""

    def __init__(self, field_name: str, message: str) -> None:
        super().__init__(message)
        self.field = field_name
        self.message = message


class FieldsError(FieldError):
    """Several problems found in one input (e.g. in different records of a ``records`` field).

    ``errors`` lists them as ``{"field": ..., "message": ...}``; the first also stands as the
    error's own ``field`` and ``message``.
    """

    def __init__(self, errors: list[dict[str, str]]) -> None:
        super().__init__(errors[0]["field"], errors[0]["message"])
        self.errors = errors


@dataclass(frozen=True)
class Field:
    """One input of a calculation.

    ``kind`` is a unit kind of :data:`units.UNITS` for a quantity, ``choice`` for one of
    ``choices``, ``integer`` for a whole number, ``text`` for free text (length-limited) and
    ``data`` for structured JSON data checked by the calculation itself. Bounds
    ``minimum``/``maximum`` are in SI; ``exclusive_min`` makes the lower bound strict.
    ``default`` is ``(value, unit)`` for a quantity, else a plain value.
    ``applies`` is ``(other field, values of it)``: the field applies (the page shows it, the
    command line prints it) only while that other field has one of those values; ``None``
    means always. It is published by :meth:`describe` as ``applies_when``. Within a record,
    ``variants`` are alternative declarations of the same sub-field, chosen by their own
    ``applies`` against the record's other values (a concentration by number for a count
    mode, by mass for a mass mode); the field itself describes the union for the forms.
    ``formerly`` lists names the same input had in earlier versions: a request, link or
    inputs file that gives only a former name is read as if it gave this one (published by
    :meth:`describe` as ``formerly``, so the page's link reader maps them too).
    """

    name: str
    label: str
    kind: str
    default: Any
    units: tuple[str, ...] = ()
    minimum: float | None = None
    maximum: float | None = None
    exclusive_min: bool = False
    choices: tuple[tuple[str, str], ...] = ()
    help: str = ""
    required: bool = True
    applies: tuple[str, tuple[str, ...]] | None = None
    formerly: tuple[str, ...] = ()
    item_fields: tuple[Field, ...] = ()
    min_items: int = 0
    max_items: int = 0
    item_label: str = "Item"
    variants: tuple[Field, ...] = ()
    extra: dict[str, Any] = field(default_factory=dict)

    def describe(self) -> dict[str, Any]:
        """JSON-ready description for the page and the command line."""
        out: dict[str, Any] = {
            "name": self.name,
            "label": self.label,
            "kind": self.kind,
            "help": self.help,
            "required": self.required,
        }
        if self.kind in UNITS:
            value, unit = self.default
            out["default"] = {"value": value, "unit": unit}
            out["units"] = [{"unit": u, "label": unit_label(u)} for u in self.units]
            out["range"] = self.range_text()
        else:
            out["default"] = self.default
        if self.choices:
            out["choices"] = [{"value": v, "label": lab} for v, lab in self.choices]
        if self.kind == "integer":
            out["range"] = self.range_text()
        if self.applies is not None:
            other, values = self.applies
            out["applies_when"] = {"field": other, "values": list(values)}
        if self.formerly:
            out["formerly"] = list(self.formerly)
        if self.kind == "records":
            out["item_fields"] = [f.describe() for f in self.item_fields]
            out["min_items"] = self.min_items
            out["max_items"] = self.max_items
            out["item_label"] = self.item_label
        if self.variants:
            out["variants"] = [v.describe() for v in self.variants]
        out.update(self.extra)
        return out

    def range_text(self) -> str:
        """Human-readable valid range in the field's default unit."""
        if self.kind not in UNITS and self.kind != "integer":
            return ""

        def fmt(x: float) -> str:
            if self.kind == "integer":
                return f"{x:.0f}"
            unit = self.default[1]
            return format_si(x, self.kind, auto_unit(self.kind, x, unit) if x else unit)

        lo = "" if self.minimum is None else fmt(self.minimum)
        hi = "" if self.maximum is None else fmt(self.maximum)
        if lo and hi:
            if self.exclusive_min:
                return f"greater than {lo} and at most {hi}"
            return f"from {lo} to {hi}"
        if lo:
            return f"{'greater than' if self.exclusive_min else 'at least'} {lo}"
        return f"at most {hi}" if hi else ""

    def parse(self, raw: Any) -> Any:
        """Validate one raw input and return it in SI (or as the chosen value)."""
        if raw is None or (isinstance(raw, str) and not raw.strip()):
            if self.required and self.kind == "choice":
                raise FieldError(self.name, f"{self.label}: {self.expected()}.")
            if self.required:
                raise FieldError(self.name, f"{self.label} is required: {self.expected()}.")
            return None
        if self.kind == "choice":
            valid = [v for v, _ in self.choices]
            if not isinstance(raw, str) or raw not in valid:
                raise FieldError(self.name, f"{self.label}: {self.expected()}.")
            return raw
        if self.kind == "text":
            if not isinstance(raw, str) or len(raw) > self.extra.get("max_length", 200):
                raise FieldError(
                    self.name,
                    f"{self.label}: text of at most "
                    f"{self.extra.get('max_length', 200)} characters.",
                )
            return raw
        if self.kind == "data":
            return raw
        if self.kind == "records":
            return self._parse_records(raw)
        if self.kind == "integer":
            number = _number(self, raw)
            if number != int(number):
                raise FieldError(self.name, f"{self.label} must be a whole number{_within(self)}.")
            self._check_range(number, number)
            return int(number)
        # quantity
        if isinstance(raw, dict):
            value, unit = raw.get("value"), raw.get("unit", SI_UNIT[self.kind])
        else:
            value, unit = raw, SI_UNIT[self.kind]
        if value is None or (isinstance(value, str) and not value.strip()):
            if self.required:
                raise FieldError(self.name, f"{self.label} is required: {self.expected()}.")
            return None
        number = _number(self, value)
        try:
            if not isinstance(unit, str):
                raise KeyError(unit)
            si = to_si(number, self.kind, unit)
            unit = canonical_unit(self.kind, unit)
        except KeyError:
            offered = ", ".join(unit_label(u) for u in (self.units or UNITS[self.kind]))
            shown = repr(unit[:20]) if isinstance(unit, str) else "of that type"
            raise FieldError(
                self.name,
                f"{self.label}: unknown unit {shown}; use one of {offered} "
                f"(valid:{_within(self) or ' any value'}).",
            ) from None
        self._check_range(si, number, unit)
        return si

    def expected(self) -> str:
        """Describe a valid input for error messages, naming the valid range or choices."""
        if self.kind == "choice":
            return f"choose one of {', '.join(v for v, _ in self.choices)}"
        if self.kind == "text":
            return f"text of at most {self.extra.get('max_length', 200)} characters"
        if self.kind == "data":
            return "structured data"
        if self.kind == "records":
            return f"a list of at most {self.max_items} records"
        return f"enter a number{_within(self)}"

    def _parse_records(self, raw: Any) -> list[dict[str, Any]]:
        """Validate a list of records; every value goes through its sub-field's :meth:`parse`.

        A sub-field missing from a record takes its default (a required one without a default
        is an error). Keys that are not sub-fields are ignored, as for plain inputs. Errors name
        the path ``<field>.<index>.<sub-field>`` (index from 0) and the record by number.
        """
        noun = self.item_label
        if not isinstance(raw, list):
            raise FieldError(self.name, f"{self.label}: expected a list of {noun.lower()}s.")
        if len(raw) < self.min_items:
            raise FieldError(
                self.name, f"{self.label}: give at least {self.min_items} {noun.lower()}."
            )
        if len(raw) > self.max_items:
            raise FieldError(
                self.name,
                f"{self.label}: at most {self.max_items} {noun.lower()}s can be combined; "
                f"{len(raw)} were given.",
            )
        records: list[dict[str, Any]] = []
        errors: list[dict[str, str]] = []
        for i, item in enumerate(raw):
            where = f"{noun} {i + 1}"
            if not isinstance(item, dict):
                errors.append(
                    {
                        "field": f"{self.name}.{i}",
                        "message": f"{where}: expected an object with "
                        f"{', '.join(f.name for f in self.item_fields)}.",
                    }
                )
                continue
            record: dict[str, Any] = {}
            for sub in self.item_fields:
                decl = sub.variant_for(record)
                value = item.get(sub.name)
                if value is None:
                    value = decl.default_input()
                try:
                    record[sub.name] = decl.parse(value)
                except FieldError as exc:
                    errors.append(
                        {
                            "field": f"{self.name}.{i}.{sub.name}",
                            "message": f"{where}: {exc.message}",
                        }
                    )
            records.append(record)
        if errors:
            raise FieldsError(errors)
        return records

    def variant_for(self, record: dict[str, Any]) -> Field:
        """The declaration that applies within ``record``: the first variant whose ``applies``
        holds for the record's values parsed so far, else this field itself.

        Parameters
        ----------
        record : dict
            Sub-field name -> parsed value (choices as their plain value).

        Returns
        -------
        Field
            The variant, or ``self``.
        """
        for v in self.variants:
            if v.applies is None or record.get(v.applies[0]) in v.applies[1]:
                return v
        return self

    def default_input(self) -> Any:
        """The default as a raw input (``{"value", "unit"}`` for a quantity)."""
        if self.kind in UNITS:
            return {"value": self.default[0], "unit": self.default[1]}
        return self.default

    def _check_range(self, si: float, shown: float, unit: str | None = None) -> None:
        lo, hi = self.minimum, self.maximum
        # A value typed at a stated limit may land one rounding step outside it after unit
        # conversion (-50 degC -> 223.14999999999998 K); accept it (relative slack 1e-12).
        bad = (
            not math.isfinite(si)  # e.g. 1e308 atm overflows on conversion
            or (lo is not None and (si <= lo if self.exclusive_min else si < lo - 1e-12 * abs(lo)))
            or (hi is not None and si > hi + 1e-12 * abs(hi))
        )
        if bad:
            rng = self.range_text() or "a finite number"
            raise FieldError(
                self.name, f"{self.label} must be {rng}.{self._unit_hint(shown, unit)}"
            )

    def _unit_hint(self, shown: float, unit: str | None) -> str:
        """Name another offered unit in which the number typed would be valid ("did you mean")."""
        if unit is None or len(self.units) < 2 or not math.isfinite(shown):
            return ""
        lo, hi = self.minimum, self.maximum
        for other in self.units:
            if canonical_unit(self.kind, other) == unit:
                continue
            si = to_si(shown, self.kind, other)
            if (lo is None or (si > lo if self.exclusive_min else si >= lo)) and (
                hi is None or si <= hi
            ):
                return f" {shown:g} {unit_label(unit)} — did you mean {unit_label(other)}?"
        return ""


def applies(described: dict[str, Any], current: dict[str, Any]) -> bool:
    """Whether a field applies to the current inputs, read from its description.

    Parameters
    ----------
    described : dict
        The field as :meth:`Field.describe` publishes it (``applies_when`` optional).
    current : dict
        Input name -> value as given (choices as their plain value), defaults filled in.

    Returns
    -------
    bool
        False only when the field declares ``applies_when`` and the field it depends on has
        none of the listed values.
    """
    rule = described.get("applies_when")
    return rule is None or current.get(rule["field"]) in rule["values"]


def _within(f: Field) -> str:
    """Return the valid range as a phrase with a leading space, or nothing without bounds."""
    text = f.range_text()
    return f" {text}" if text else ""


def _number(f: Field, value: Any) -> float:
    if isinstance(value, bool):
        raise FieldError(f.name, f"{f.label} must be a number{_within(f)}.")
    if isinstance(value, int | float):
        try:
            number = float(value)
        except OverflowError:  # an int beyond the float range
            number = math.inf if value > 0 else -math.inf
    elif isinstance(value, str):
        text = value.strip().replace("\u2212", "-").replace(" ", "")
        if "_" in text:  # float() reads "1_000"; a person never means that (nor does the CLI)
            raise FieldError(f.name, f"{f.label} must be a number{_within(f)}, not {value[:20]!r}.")
        if text.count(",") == 1 and "." not in text:
            whole, frac = text.split(",")
            if len(frac) == 3 and whole.lstrip("+-") not in ("", "0"):
                # "1,000" may be one thousand or one: refuse to guess
                raise FieldError(
                    f.name,
                    f"{f.label}: {value[:20]!r} is ambiguous; write the "
                    "number without a thousands separator, with a point or a "
                    f"comma for decimals{_within(f)}.",
                )
            text = text.replace(",", ".")  # decimal comma
        try:
            number = float(text)
        except ValueError:
            raise FieldError(
                f.name, f"{f.label} must be a number{_within(f)}, not {value[:20]!r}."
            ) from None
    else:
        raise FieldError(f.name, f"{f.label} must be a number{_within(f)}.")
    if not math.isfinite(number):
        raise FieldError(f.name, f"{f.label} must be a finite number{_within(f)}.")
    return number


def parse_number(value: Any, name: str, label: str) -> float:
    """A finite number read by the rule every field follows.

    A number, or text with a point or a decimal comma; "1,000" (one or a thousand?), "1_000",
    booleans and non-finite values are refused. For a value that is not a field of its own
    (e.g. the value of a ``{value, unit}`` pair).

    Parameters
    ----------
    value : any
        The value as sent.
    name : str
        Where an error is reported (a field's name or a path such as ``benchmark``).
    label : str
        What the message calls the value.

    Returns
    -------
    float
        The number, in the unit it was given in.
    """
    return _number(Field(name, label, "integer", None), value)


_SUPERSCRIPT = str.maketrans("-0123456789", "⁻⁰¹²³⁴⁵⁶⁷⁸⁹")


def format_si(value: float, kind: str, unit: str, digits: int = 3) -> str:
    """Format an SI value in ``unit`` with ``digits`` significant figures and the unit label."""
    shown = from_si(value, kind, unit)
    text = f"{shown:.{digits}g}"
    if "e" in text:
        mant, exp = text.split("e")
        text = f"{mant}×10{str(int(exp)).translate(_SUPERSCRIPT)}"
    label = unit_text(canonical_unit(kind, unit))  # the unit table's text: none for a pure number
    return f"{text} {label}" if label else text


def entered(f: Field, inputs: dict[str, Any]) -> Any:
    """The input of field ``f`` as sent: under its name, else under a former name, else None.

    Parameters
    ----------
    f : Field
        The field.
    inputs : dict
        The inputs as sent.

    Returns
    -------
    Any
        The raw value (``None`` when the input is absent).
    """
    raw = inputs.get(f.name)
    if raw is None:
        raw = next((inputs[old] for old in f.formerly if inputs.get(old) is not None), None)
    return raw


def parse_fields(fields: tuple[Field, ...], inputs: Any) -> tuple[dict[str, Any], list[dict]]:
    """Validate ``inputs`` against ``fields``; return (values in SI, errors).

    Missing optional inputs take their defaults; unknown input names are ignored; an input
    given only under a former name of its field (``Field.formerly``) is read as that field. A
    field
    that does not apply to the other inputs (its ``applies``) is not used: a fault in it is
    no error, and its value is then ``None``.
    """
    if not isinstance(inputs, dict):
        return {}, [{"field": "", "message": "Inputs must be an object of named fields."}]
    values: dict[str, Any] = {}
    errors: list[dict] = []
    failed: dict[str, list[dict]] = {}
    for f in fields:
        raw = entered(f, inputs)
        if raw is None:
            raw = f.default_input()
        try:
            values[f.name] = f.parse(raw)
        except FieldsError as exc:
            failed[f.name] = exc.errors
        except FieldError as exc:
            failed[f.name] = [{"field": exc.field, "message": exc.message}]
    for f in fields:
        if f.name not in failed:
            continue
        if f.applies is not None and values.get(f.applies[0]) not in f.applies[1]:
            values[f.name] = None  # does not apply to these choices: not used, not an error
        else:
            errors.extend(failed[f.name])
    return values, errors
