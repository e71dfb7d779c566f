"""Short forms of the commonest field declarations: bounded quantities, numbers and text.

A calculation with many inputs of one pattern (a length above zero, a width of a curve above
one, a count from 1 to N) declares each on one line through these; the result is a plain
:class:`~driftdose.api.fields.Field`, so ``describe``, parsing and the command line see no
difference. Anything else a field needs (help, applies, former names) passes through ``more``.
"""

from __future__ import annotations

from typing import Any

from .fields import Field

__all__ = ["bounded", "positive", "ratio", "spread", "text", "whole"]


def bounded(
    name: str,
    label: str,
    kind: str,
    default: tuple[float | None, str],
    units: tuple[str, ...],
    minimum: float,
    maximum: float,
    **more: Any,
) -> Field:
    """A quantity valid from ``minimum`` to ``maximum``, both included.

    Parameters
    ----------
    name : str
        The input's name in requests, links and flags.
    label : str
        What the form and the command line call it.
    kind : str
        Its unit kind (a key of :data:`driftdose.api.units.UNITS`).
    default : tuple
        ``(value, unit)``; value None for an input without a default.
    units : tuple of str
        The units offered, the default's first.
    minimum : float
        Smallest valid value [SI unit of ``kind``].
    maximum : float
        Largest valid value [SI unit of ``kind``].
    **more : any
        Other :class:`~driftdose.api.fields.Field` attributes (help, applies, ...).

    Returns
    -------
    Field
        The declaration.
    """
    return Field(name, label, kind, default, units, minimum=minimum, maximum=maximum, **more)


def positive(
    name: str,
    label: str,
    kind: str,
    default: tuple[float | None, str],
    units: tuple[str, ...],
    maximum: float,
    **more: Any,
) -> Field:
    """A quantity greater than zero and at most ``maximum``.

    Parameters
    ----------
    name : str
        The input's name in requests, links and flags.
    label : str
        What the form and the command line call it.
    kind : str
        Its unit kind (a key of :data:`driftdose.api.units.UNITS`).
    default : tuple
        ``(value, unit)``; value None for an input without a default.
    units : tuple of str
        The units offered, the default's first.
    maximum : float
        Largest valid value [SI unit of ``kind``].
    **more : any
        Other :class:`~driftdose.api.fields.Field` attributes (help, applies, ...).

    Returns
    -------
    Field
        The declaration.
    """
    return bounded(name, label, kind, default, units, 0.0, maximum, exclusive_min=True, **more)


def spread(name: str, label: str, default: float | None, maximum: float, **more: Any) -> Field:
    """A dimensionless factor greater than 1 and at most ``maximum``: a GSD, a curve's width.

    Parameters
    ----------
    name : str
        The input's name in requests, links and flags.
    label : str
        What the form and the command line call it.
    default : float or None
        The default factor [-]; None for an input without a default.
    maximum : float
        Largest valid factor [-].
    **more : any
        Other :class:`~driftdose.api.fields.Field` attributes (help, applies, ...).

    Returns
    -------
    Field
        The declaration.
    """
    return ratio(name, label, default, 1.0, maximum, exclusive_min=True, **more)


def whole(name: str, label: str, default: int, minimum: int, maximum: int, **more: Any) -> Field:
    """A whole number from ``minimum`` to ``maximum``, both included.

    Parameters
    ----------
    name : str
        The input's name in requests, links and flags.
    label : str
        What the form and the command line call it.
    default : int
        The default [-].
    minimum : int
        Smallest valid number [-].
    maximum : int
        Largest valid number [-].
    **more : any
        Other :class:`~driftdose.api.fields.Field` attributes (help, applies, ...).

    Returns
    -------
    Field
        The declaration.
    """
    return Field(name, label, "integer", default, minimum=minimum, maximum=maximum, **more)


def ratio(
    name: str, label: str, default: float | None, minimum: float, maximum: float, **more: Any
) -> Field:
    """A dimensionless number from ``minimum`` to ``maximum``, both included.

    Parameters
    ----------
    name : str
        The input's name in requests, links and flags.
    label : str
        What the form and the command line call it.
    default : float or None
        The default [-]; None for an input without a default.
    minimum : float
        Smallest valid value [-].
    maximum : float
        Largest valid value [-].
    **more : any
        Other :class:`~driftdose.api.fields.Field` attributes (help, applies, ...).

    Returns
    -------
    Field
        The declaration.
    """
    return bounded(name, label, "dimensionless", (default, "1"), ("1",), minimum, maximum, **more)


def text(name: str, label: str, default: str | None, max_length: int, **more: Any) -> Field:
    """Free text of at most ``max_length`` characters (a column's name, a unit, a time).

    Parameters
    ----------
    name : str
        The input's name in requests, links and flags.
    label : str
        What the form and the command line call it.
    default : str or None
        The default text; None for an input without a default.
    max_length : int
        Most characters accepted [-].
    **more : any
        Other :class:`~driftdose.api.fields.Field` attributes (required, help, applies, ...).

    Returns
    -------
    Field
        The declaration.
    """
    return Field(name, label, "text", default, extra={"max_length": max_length}, **more)
