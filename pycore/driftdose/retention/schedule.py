"""Work patterns as exposure blocks: shifts, weeks and years of a working life."""

from __future__ import annotations

import math

from .kinetics import Off, On, Repeat, Seq, block_duration
from .rates import DAY, YEAR

__all__ = ["exposure_end", "single_exposure", "work_schedule"]


def work_schedule(
    hours_per_shift: float,
    shifts_per_week: int,
    weeks_per_year: int,
    years: int,
) -> Seq | Repeat:
    """A work pattern as exposure blocks, starting with the first shift.

    Parameters
    ----------
    hours_per_shift : float
        Exposure per shift, above 0 and at most 24. [h]
    shifts_per_week : int
        1 to 7 shifts, on consecutive days, each starting at the same time of day [1/week].
    weeks_per_year : int
        1 to 52 working weeks, then the rest of the year off [1/year].
    years : int
        Working years, at least 1 [year].

    Returns
    -------
    Repeat
        ``years`` years of 365.25 days: ``weeks_per_year`` weeks of ``shifts_per_week`` days
        with a shift, then the remaining days of the week off; the rest of the year off.

    """
    if not (0.0 < hours_per_shift <= 24.0):
        raise ValueError("hours_per_shift must be above 0 and at most 24")
    if not (1 <= shifts_per_week <= 7 and 1 <= weeks_per_year <= 52 and years >= 1):
        raise ValueError("shifts per week 1-7, weeks per year 1-52, years at least 1")
    on = hours_per_shift * 3600.0
    day: On | Seq = On(on) if on >= DAY else Seq((On(on), Off(DAY - on)))
    week_parts: list = [Repeat(shifts_per_week, day)]
    if shifts_per_week < 7:
        week_parts.append(Off((7 - shifts_per_week) * DAY))
    week = Seq(tuple(week_parts))
    year_parts: list = [Repeat(weeks_per_year, week)]
    rest = YEAR - weeks_per_year * 7 * DAY
    if rest > 0.0:
        year_parts.append(Off(rest))
    return Repeat(years, Seq(tuple(year_parts)))


def single_exposure(duration: float) -> On:
    """One exposure of ``duration`` at time 0.

    Parameters
    ----------
    duration : float
        Exposure duration [s].
    """
    if not (duration > 0.0 and math.isfinite(duration)):
        raise ValueError("duration must be positive")
    return On(duration)


def exposure_end(schedule: On | Off | Seq | Repeat) -> float:
    """End of the last exposure of a schedule (trailing off-time excluded). [s]

    Parameters
    ----------
    schedule : On, Off, Seq or Repeat
        The exposure schedule.
    """
    if isinstance(schedule, On):
        return schedule.duration
    if isinstance(schedule, Off):
        return 0.0
    if isinstance(schedule, Seq):
        start, end = 0.0, 0.0
        for c in schedule.blocks:
            e = exposure_end(c)
            if e > 0.0:
                end = start + e
            start += block_duration(c)
        return end
    d1 = block_duration(schedule.block)
    return (schedule.count - 1) * d1 + exposure_end(schedule.block)
