"""Time stamps of logged data: text to seconds on one local clock line.

Every time is held as seconds since 1970-01-01 00:00 on the clock the instrument wrote
(naive local time: no time zone is assumed; a written UTC offset is honoured, see below).
Dates count days in the proleptic Gregorian calendar, the calendar of ISO 8601 and of
Python's :mod:`datetime`, against which the tests check every form.

Forms read (:data:`TIME_FORMATS`):

- ``iso``: ISO 8601 extended form ``YYYY-MM-DDThh:mm[:ss[.fff]]`` (``T`` or a space between
  date and time), optionally followed by ``Z`` or a UTC offset ``±hh:mm``/``±hhmm``; with
  offsets, every time is moved to the offset of the first time stamp (so a change of summer
  time inside a file keeps the readings in order);
- ``day_first``: ``DD/MM/YYYY hh:mm[:ss[.fff]]`` (``/``, ``.`` or ``-`` between the date parts);
- ``month_first``: ``MM/DD/YYYY hh:mm[:ss[.fff]]``, optionally with ``AM``/``PM``;
- ``elapsed_seconds``: a number of seconds after a start time given separately.

Years are written with four digits; a two-digit year is refused rather than guessed.
"""

from __future__ import annotations

import re
from dataclasses import dataclass

__all__ = [
    "TIME_FORMATS",
    "ClockError",
    "TimeParser",
    "clock_text",
    "days_from_civil",
    "parse_clock_time",
    "parse_iso",
]

TIME_FORMATS = ("iso", "day_first", "month_first", "elapsed_seconds")
"""Time stamp forms read by :class:`TimeParser`."""

DAY = 86400.0
"""Seconds per day. [s]"""

_TIME = re.compile(r"(\d{1,2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,9}))?)?\s*([AaPp][Mm])?")
_DATE_ISO = re.compile(r"(\d{4})-(\d{2})-(\d{2})")
_DATE_DMY = re.compile(r"(\d{1,2})[./-](\d{1,2})[./-](\d+)")
_OFFSET = re.compile(r"(?:([Zz])|([+-])(\d{2}):?(\d{2}))")


class ClockError(ValueError):
    """A time stamp that cannot be read; ``message`` says why in plain words."""

    def __init__(self, message: str) -> None:
        super().__init__(message)
        self.message = message


def days_from_civil(year: int, month: int, day: int) -> int:
    """Days from 1970-01-01 to a date of the proleptic Gregorian calendar.

    Parameters
    ----------
    year, month, day : int
        The date (month 1-12, day 1-31).

    Returns
    -------
    int
        Days since 1970-01-01 (negative before it). [d]

    Notes
    -----
    The algorithm ``days_from_civil`` of H. Hinnant, "chrono-Compatible Low-Level Date
    Algorithms" (2013, from memory): years start in March so that the leap day is the last
    day of the year; eras of 400 years hold 146 097 days. Checked against
    :mod:`datetime` in the tests.

    Examples
    --------
    >>> days_from_civil(1970, 1, 1), days_from_civil(2000, 3, 1), days_from_civil(1969, 12, 31)
    (0, 11017, -1)

    """
    y = year - (month <= 2)
    era = (y if y >= 0 else y - 399) // 400
    yoe = y - era * 400
    doy = (153 * (month + (-3 if month > 2 else 9)) + 2) // 5 + day - 1
    doe = yoe * 365 + yoe // 4 - yoe // 100 + doy
    return era * 146097 + doe - 719468


def _days_in_month(year: int, month: int) -> int:
    if month == 2:
        leap = year % 4 == 0 and (year % 100 != 0 or year % 400 == 0)
        return 29 if leap else 28
    return 30 if month in (4, 6, 9, 11) else 31


def _date(year: int, month: int, day: int, text: str) -> int:
    if not 1 <= month <= 12:
        raise ClockError(f"{text!r}: month {month} is not 1-12.")
    if not 1 <= day <= _days_in_month(year, month):
        raise ClockError(f"{text!r}: day {day} does not exist in {year}-{month:02d}.")
    if not 1900 <= year <= 2200:
        raise ClockError(f"{text!r}: year {year} is outside 1900-2200.")
    return days_from_civil(year, month, day)


def _clock(m: re.Match[str], text: str, ampm_allowed: bool) -> float:
    hh, mm = int(m.group(1)), int(m.group(2))
    ss = int(m.group(3) or 0)
    frac = m.group(4)
    ampm = m.group(5)
    if ampm:
        if not ampm_allowed:
            raise ClockError(f"{text!r}: AM/PM is read only with month-first dates.")
        if not 1 <= hh <= 12:
            raise ClockError(f"{text!r}: hour {hh} with AM/PM must be 1-12.")
        hh = hh % 12 + (12 if ampm.lower() == "pm" else 0)
    if hh > 23 or mm > 59 or ss > 59:  # leap seconds are not read (common practice for loggers)
        raise ClockError(f"{text!r}: {m.group(0).strip()} is not a time of day.")
    seconds = hh * 3600.0 + mm * 60.0 + ss
    if frac:
        seconds += int(frac) / 10 ** len(frac)
    return seconds


def clock_text(seconds: float, with_date: bool = True) -> str:
    """Write a clock time (seconds since 1970-01-01, local) as ISO 8601 text.

    Parameters
    ----------
    seconds : float
        Clock time since 1970-01-01 00:00, local [s].
    with_date : bool
        Write the date as well as the time of day.

    Examples
    --------
    >>> clock_text(days_from_civil(2026, 3, 5) * 86400.0 + 8 * 3600 + 0.5)
    '2026-03-05T08:00:00.5'

    """
    day, rest = divmod(round(seconds, 3), DAY)
    z = int(day) + 719468
    era = (z if z >= 0 else z - 146096) // 146097
    doe = z - era * 146097
    yoe = (doe - doe // 1460 + doe // 36524 - doe // 146096) // 365
    doy = doe - (365 * yoe + yoe // 4 - yoe // 100)
    mp = (5 * doy + 2) // 153
    d = doy - (153 * mp + 2) // 5 + 1
    m = mp + 3 if mp < 10 else mp - 9
    y = yoe + era * 400 + (m <= 2)
    whole = int(rest)
    hh, mm, ss = whole // 3600, whole % 3600 // 60, whole % 60
    frac = rest - whole
    time = f"{hh:02d}:{mm:02d}:{ss:02d}" + (f"{frac:.3f}".rstrip("0")[1:] if frac > 5e-4 else "")
    return f"{y:04d}-{m:02d}-{d:02d}T{time}" if with_date else time


def parse_iso(text: str) -> tuple[float, float | None]:
    """Read an ISO 8601 local date-time (see the module notes).

    Parameters
    ----------
    text : str
        ``YYYY-MM-DDThh:mm[:ss[.fff]]`` with an optional ``Z`` or ``±hh:mm``.

    Returns
    -------
    tuple of float
        Seconds since 1970-01-01 on the written clock [s], and the written UTC offset [s]
        or None when none was written.

    Raises
    ------
    ClockError
        For any other text.

    Examples
    --------
    >>> parse_iso("1970-01-02T00:00:01")
    (86401.0, None)
    >>> parse_iso("1970-01-01 01:00+01:00")
    (3600.0, 3600.0)

    """
    s = text.strip()
    d = _DATE_ISO.match(s)
    if d is None:
        raise ClockError(f"{text[:40]!r} is not an ISO 8601 date-time (2026-03-05T08:00:00).")
    rest = s[d.end() :]
    if not rest or rest[0] not in "Tt ":
        raise ClockError(f"{text[:40]!r}: a time of day must follow the date (T08:00:00).")
    t = _TIME.match(rest, 1)
    if t is None or t.group(5):
        raise ClockError(f"{text[:40]!r}: the time of day must be hh:mm[:ss].")
    day = _date(int(d.group(1)), int(d.group(2)), int(d.group(3)), text[:40])
    seconds = day * DAY + _clock(t, text[:40], False)
    tail = rest[t.end() :].strip()
    if not tail:
        return seconds, None
    o = _OFFSET.fullmatch(tail)
    if o is None:
        raise ClockError(f"{text[:40]!r}: unexpected {tail[:20]!r} after the time.")
    if o.group(1):
        return seconds, 0.0
    sign = 1.0 if o.group(2) == "+" else -1.0
    oh, om = int(o.group(3)), int(o.group(4))
    if oh > 23 or om > 59:
        raise ClockError(f"{text[:40]!r}: {tail!r} is not a UTC offset.")
    return seconds, sign * (oh * 3600.0 + om * 60.0)


def parse_clock_time(text: str) -> float:
    """Seconds after midnight of a clock time ``hh:mm[:ss[.fff]]``. [s]

    Parameters
    ----------
    text : str
        The clock time as written.

    Examples
    --------
    >>> parse_clock_time("08:30"), parse_clock_time("23:59:59.5")
    (30600.0, 86399.5)

    """
    m = _TIME.fullmatch(text.strip())
    if m is None or m.group(5):
        raise ClockError(f"{text[:40]!r} is not a clock time (hh:mm or hh:mm:ss).")
    return _clock(m, text[:40], False)


@dataclass
class TimeParser:
    """Reader of one file's time stamps, in one chosen form (see the module notes).

    Dates repeat from row to row; each date text is read once and kept.

    Attributes
    ----------
    form : str
        One of :data:`TIME_FORMATS`.
    start : float
        For ``elapsed_seconds``: the clock time of elapsed time zero. [s]

    """

    form: str
    start: float = 0.0

    def __post_init__(self) -> None:
        """Check the form; set up the date cache."""
        if self.form not in TIME_FORMATS:
            raise ValueError(f"unknown time form {self.form!r}; valid: {', '.join(TIME_FORMATS)}")
        self._dates: dict[str, int] = {}
        self._offset: float | None = None
        self.offsets_seen = False

    def __call__(self, text: str, date_text: str | None = None) -> float:
        """Read one time stamp (with its date from another column if ``date_text``). [s]"""
        if self.form == "elapsed_seconds":
            return self.start + self._elapsed(text)
        if date_text is not None:
            text = f"{date_text.strip()} {text.strip()}"
        if self.form == "iso":
            fast = self._iso_fast(text)
            if fast is not None:
                return fast
            seconds, offset = parse_iso(text)
            if offset is None and not self.offsets_seen and len(self._dates) < 4096:
                self._dates[text.strip()[:10]] = int(seconds // DAY)
            if offset is not None:
                if self._dates and not self.offsets_seen:
                    raise ClockError(
                        f"{text[:40]!r}: a UTC offset appears where earlier rows had none."
                    )
                self.offsets_seen = True
                if self._offset is None:
                    self._offset = offset
                seconds += self._offset - offset
            elif self.offsets_seen:
                raise ClockError(f"{text[:40]!r}: a UTC offset is missing (earlier rows had one).")
            return seconds
        return self._dmy(text)

    def _iso_fast(self, text: str) -> float | None:
        """``YYYY-MM-DD hh:mm:ss[.fff]`` of a date already read, without a UTC offset; None
        for anything else (read in full by :func:`parse_iso`)."""
        s = text.strip()
        n = len(s)
        if n < 19 or s[10] not in "T " or s[13] != ":" or s[16] != ":" or self.offsets_seen:
            return None
        day = self._dates.get(s[:10])
        if day is None:
            return None
        digits = s[11:13] + s[14:16] + s[17:19]
        if not (digits.isascii() and digits.isdigit()):
            return None
        hh, mm, ss = int(digits[:2]), int(digits[2:4]), int(digits[4:])
        if hh > 23 or mm > 59 or ss > 59:
            return None
        seconds = day * DAY + hh * 3600.0 + mm * 60.0 + ss
        if n == 19:
            return seconds
        frac = s[20:]
        if s[19] not in ".," or not frac or not (frac.isascii() and frac.isdigit()):
            return None
        return seconds + int(frac) / 10 ** len(frac)

    def _elapsed(self, text: str) -> float:
        s = text.strip().replace(",", ".")
        try:
            value = float(s)
        except ValueError:
            raise ClockError(f"{text[:40]!r} is not a number of seconds.") from None
        if not (0.0 <= value <= 366 * DAY):  # NaN fails both
            raise ClockError(f"{text[:40]!r}: elapsed seconds must be from 0 to 366 days.")
        return value

    def _dmy(self, text: str) -> float:
        s = text.strip()
        cut = s.find(" ")
        if cut < 0:
            raise ClockError(f"{text[:40]!r}: expected a date and a time of day.")
        date_part, time_part = s[:cut], s[cut + 1 :]
        day = self._dates.get(date_part)
        if day is None:
            m = _DATE_DMY.fullmatch(date_part)
            if m is None:
                order = "DD/MM/YYYY" if self.form == "day_first" else "MM/DD/YYYY"
                raise ClockError(f"{text[:40]!r}: the date is not {order}.")
            a, b, year_text = m.groups()
            if len(year_text) != 4:
                raise ClockError(f"{text[:40]!r}: write the year with four digits.")
            dd, mo = (int(a), int(b)) if self.form == "day_first" else (int(b), int(a))
            day = _date(int(year_text), mo, dd, text[:40])
            if len(self._dates) < 4096:
                self._dates[date_part] = day
        tp = time_part.strip()
        if len(tp) == 8 and tp[2] == ":" and tp[5] == ":":
            digits = tp[:2] + tp[3:5] + tp[6:]
            if digits.isascii() and digits.isdigit():
                hh, mm, ss = int(digits[:2]), int(digits[2:4]), int(digits[4:])
                if hh <= 23 and mm <= 59 and ss <= 59:
                    return day * DAY + hh * 3600.0 + mm * 60.0 + ss
        t = _TIME.fullmatch(tp)
        if t is None:
            raise ClockError(f"{text[:40]!r}: the time of day must be hh:mm[:ss].")
        return day * DAY + _clock(t, text[:40], self.form == "month_first")
