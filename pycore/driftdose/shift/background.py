"""Background concentrations per reading, by one of three methods.

- ``marked_mean``: the time-weighted mean of every period marked as background, one value
  for the whole shift;
- ``pre_post``: the mean of each background period placed at its middle and interpolated
  linearly in time between them, constant before the first and after the last; a task
  between a background period before it and one after it so gets the interpolation between
  its pre- and post-task background (common practice for near-field/far-field and
  before/after designs);
- ``far_field``: the concurrent series of a second instrument (far field or background
  monitor), aligned to the near-field times by linear interpolation
  (:func:`driftdose.shift.series.aligned_values`).

``none`` gives no background: corrected values equal the measured ones.
"""

from __future__ import annotations

import bisect
from collections.abc import Sequence
from dataclasses import dataclass

from .periods import Period
from .series import TimeSeries, aligned_values
from .stats import mean_over

__all__ = ["BACKGROUND_METHODS", "Background", "BackgroundError", "background_values"]

BACKGROUND_METHODS = ("none", "marked_mean", "pre_post", "far_field")
"""Ways to obtain the background."""

METHOD_WORDS = {
    "none": "no background correction",
    "marked_mean": "mean of the periods marked as background",
    "pre_post": "interpolated in time between the background periods before and after",
    "far_field": "concurrent far-field (background) series",
}
"""Each method in words, for the reply."""


class BackgroundError(ValueError):
    """The chosen method cannot be applied (no background period, no second series)."""

    def __init__(self, message: str) -> None:
        super().__init__(message)
        self.message = message


@dataclass(frozen=True)
class Background:
    """Background per reading and how it was found.

    Attributes
    ----------
    method : str
        One of :data:`BACKGROUND_METHODS`.
    values : tuple of float or None, or None
        Background per reading of the near-field series [SI]; None for ``none``.
    anchors : tuple of (float, float)
        (time [s from start], mean [SI]) of each background period used.
    notes : tuple of str
        What the user should know (a task with a background on one side only, ...).

    """

    method: str
    values: tuple[float | None, ...] | None
    anchors: tuple[tuple[float, float], ...] = ()
    notes: tuple[str, ...] = ()

    @property
    def words(self) -> str:
        """The method in words."""
        return METHOD_WORDS[self.method]


def background_values(
    method: str,
    series: TimeSeries,
    values: Sequence[float | None],
    periods: Sequence[Period],
    far: TimeSeries | None = None,
    far_key: str | None = None,
) -> Background:
    """Background per reading of ``series`` by ``method`` (see the module notes).

    Parameters
    ----------
    method : str
        One of :data:`BACKGROUND_METHODS`.
    series : TimeSeries
        The near-field series.
    values : sequence of float or None
        The near-field quantity per reading. [SI]
    periods : sequence of Period
        The shift's periods; those of kind ``background`` are used by the period methods.
    far : TimeSeries, optional
        The far-field series for ``far_field``.
    far_key : str, optional
        Its column of the same quantity.

    Returns
    -------
    Background
        Values per reading and the anchors used.

    Raises
    ------
    BackgroundError
        No background period (period methods), no measured reading in one, or no far-field
        series.

    """
    if method == "none":
        return Background(method, None)
    if method == "far_field":
        if far is None or far_key is None:
            raise BackgroundError("Choose the far-field (background) file and its column.")
        aligned = aligned_values(series, far, far_key)
        missing = sum(1 for b in aligned if b is None)
        notes = ()
        if missing == len(aligned):
            raise BackgroundError(
                "The far-field series does not overlap the near-field times; check both "
                "files' dates and clocks."
            )
        if missing:
            notes = (
                f"{missing} of {len(aligned)} readings have no far-field value at their time "
                "(outside its logged time or in its gaps); they are left out of the "
                "corrected values.",
            )
        return Background(method, tuple(aligned), (), notes)
    if method not in ("marked_mean", "pre_post"):
        raise ValueError(f"unknown method {method!r}; valid: {', '.join(BACKGROUND_METHODS)}")
    marked = sorted((p for p in periods if p.kind == "background"), key=lambda p: p.start)
    if not marked:
        raise BackgroundError(
            "Mark at least one period as background for this method (or choose another)."
        )
    anchors: list[tuple[float, float]] = []
    integral = measured = 0.0
    for p in marked:
        mean, part, time = mean_over(series, values, [(p.start, p.end)])
        if mean is None:
            raise BackgroundError(f"The background period {p.label!r} holds no reading.")
        anchors.append((0.5 * (p.start + p.end), mean))
        integral += part
        measured += time
    n = len(series.t)
    if method == "marked_mean":
        level = integral / measured
        return Background(method, (level,) * n, tuple(anchors))
    times = [a for a, _ in anchors]
    levels = [b for _, b in anchors]
    ts = series.t
    out: list[float | None] = [levels[0]] * bisect.bisect_right(ts, times[0])
    for j in range(1, len(times)):  # readings between two anchors: the line through them
        t0, t1, b0, b1 = times[j - 1], times[j], levels[j - 1], levels[j]
        slope = (b1 - b0) / (t1 - t0)
        stop = bisect.bisect_right(ts, t1)
        out.extend(b0 + slope * (t - t0) for t in ts[len(out) : stop])
    out.extend([levels[-1]] * (len(ts) - len(out)))
    notes = []
    for p in periods:
        if p.kind != "task":
            continue
        before = any(a <= p.start for a in times)
        after = any(a >= p.end for a in times)
        if not (before and after):
            side = "after" if before else "before"
            notes.append(
                f"Task {p.label!r} has no background period {side} it; the nearest "
                "background is used unchanged."
            )
    return Background(method, tuple(out), tuple(anchors), tuple(notes))
