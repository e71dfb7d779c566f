"""Periods of a shift: tasks, background measurements and breaks, checked against the series.

A :class:`Period` is a stretch of the shift with a label, its kind (:data:`PERIOD_KINDS`),
its start and end (seconds from the first reading), and for a task the breathing (activity
level and route of :mod:`driftdose.deposition`) and the assigned protection factor of the
respiratory protective device worn, entered by the user (no product values are built in).
:func:`check_periods` refuses periods that overlap, run backwards or lie outside the
logged time, naming the period.
"""

from __future__ import annotations

import itertools
from collections.abc import Sequence
from dataclasses import dataclass

from ..deposition import ACTIVITIES, ROUTES
from .clock import clock_text

__all__ = [
    "MAX_PERIODS",
    "PERIOD_KINDS",
    "PROTECTION_MAX",
    "Period",
    "PeriodError",
    "check_periods",
]

PERIOD_KINDS = ("task", "background", "break")
"""What a period is: a task (exposure of interest), a background measurement, a break."""

MAX_PERIODS = 200
"""Most periods in one shift."""

PROTECTION_MAX = 100_000.0
"""Largest assigned protection factor accepted (a bound for typing errors). [-]"""


class PeriodError(ValueError):
    """A period that cannot be used; ``index`` is its place in the list, ``part`` the
    sub-field at fault (``start``, ``end``, ...)."""

    def __init__(self, message: str, index: int, part: str) -> None:
        super().__init__(message)
        self.message = message
        self.index = index
        self.part = part


@dataclass(frozen=True)
class Period:
    """One period of the shift.

    Attributes
    ----------
    label : str
        Name shown in tables.
    kind : str
        ``task``, ``background`` or ``break``.
    start, end : float
        Start and end, seconds after the first reading. [s]
    activity : str
        Activity level (keys of :data:`driftdose.deposition.ACTIVITIES`).
    route : str
        Breathing route (one of :data:`driftdose.deposition.ROUTES`).
    protection_factor : float
        Assigned protection factor of the respiratory protection worn, ≥ 1 (1: none); the
        inhaled concentration is the ambient one divided by it. [-]

    """

    label: str
    kind: str
    start: float
    end: float
    activity: str = "light_exercise"
    route: str = "mixed"
    protection_factor: float = 1.0

    @property
    def duration(self) -> float:
        """Length of the period. [s]"""
        return self.end - self.start


def check_periods(
    periods: Sequence[Period], first: float, last: float, start_clock: float = 0.0
) -> None:
    """Refuse periods that cannot be used (the first problem found, by period).

    Parameters
    ----------
    periods : sequence of Period
        In the order entered.
    first, last : float
        Logged time span: first reading, end of the last reading. [s from start]
    start_clock : float
        Clock time of the first reading, for messages. [s since 1970-01-01]

    Raises
    ------
    PeriodError
        Too many periods, an unknown kind, activity or route, a protection factor below 1,
        an end not after the start, a period outside the logged time, or two periods that
        overlap (named by their labels and times).

    """
    if len(periods) > MAX_PERIODS:
        raise PeriodError(f"At most {MAX_PERIODS} periods; {len(periods)} were given.", -1, "")

    def when(x: float) -> str:
        return clock_text(start_clock + x).replace("T", " ")

    for i, p in enumerate(periods):
        if p.kind not in PERIOD_KINDS:
            raise PeriodError(f"The kind must be one of {', '.join(PERIOD_KINDS)}.", i, "kind")
        if p.activity not in ACTIVITIES:
            raise PeriodError(
                f"The activity must be one of {', '.join(ACTIVITIES)}.", i, "activity"
            )
        if p.route not in ROUTES:
            raise PeriodError(f"The route must be one of {', '.join(ROUTES)}.", i, "route")
        if not 1.0 <= p.protection_factor <= PROTECTION_MAX:  # NaN fails
            raise PeriodError(
                f"The protection factor must be from 1 (no protection) to {PROTECTION_MAX:g}.",
                i,
                "protection_factor",
            )
        if not p.end > p.start:
            raise PeriodError(
                f"{p.label!r} ends ({when(p.end)}) before or when it starts ({when(p.start)}).",
                i,
                "end",
            )
        if p.start < first:
            raise PeriodError(
                f"{p.label!r} starts at {when(p.start)}, before the first reading ({when(first)}).",
                i,
                "start",
            )
        if p.end > last:
            raise PeriodError(
                f"{p.label!r} ends at {when(p.end)}, after the logged time ({when(last)}).",
                i,
                "end",
            )
    order = sorted(range(len(periods)), key=lambda k: (periods[k].start, k))
    for a, b in itertools.pairwise(order):
        pa, pb = periods[a], periods[b]
        if pb.start < pa.end:
            later = max(a, b)
            other = a if later == b else b
            po = periods[other]
            raise PeriodError(
                f"{periods[later].label!r} ({when(periods[later].start)} – "
                f"{when(periods[later].end)}) overlaps period {other + 1} {po.label!r} "
                f"({when(po.start)} – {when(po.end)}); a time belongs to one period.",
                later,
                "start",
            )
