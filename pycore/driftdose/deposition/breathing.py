"""Breathing of the reference adult male of ICRP Publication 66: activities, routes, subjects.

Interfaces (SI units): :class:`BreathingPattern` (tidal volume, frequency, nasal fraction and
the airway volumes of one activity), :data:`ACTIVITIES` and :func:`activity` (the four ICRP
activity levels, by breathing route, :data:`ROUTES`), :class:`Subject` (activities and the
hours spent in each), :func:`reference_worker` and :data:`REFERENCE_WORKER` (the ICRP
reference worker), :func:`breathing_warnings` (parameters far from the adult reference
values, :data:`TIDAL_VOLUME_RANGE` and :data:`FREQUENCY_RANGE`).

The deposition models (:mod:`.icrp66`, :mod:`.simplified`) and the dose, retention and
uncertainty calculations take these objects; nothing here computes deposition.
"""

from __future__ import annotations

from dataclasses import dataclass, replace

__all__ = [
    "ACTIVITIES",
    "FREQUENCY_RANGE",
    "REFERENCE_WORKER",
    "ROUTES",
    "TIDAL_VOLUME_RANGE",
    "BreathingPattern",
    "Subject",
    "activity",
    "breathing_warnings",
    "reference_worker",
]

ROUTES = ("nose", "mouth", "mixed", "mouth_breather")
"""Breathing routes: nose only, mouth only, the ICRP normal nose breather (``mixed``: all
through the nose except half through the mouth at heavy exercise), and the ICRP mouth
breather."""

# Nasal fraction F_n by route and activity, ICRP 66 Annex B (from memory):
# normal nose breather 1, 1, 1, 0.5; mouth breather 0.7, 0.7, 0.7, 0.4.
_NASAL_FRACTION = {
    "mixed": {"sleep": 1.0, "sitting": 1.0, "light_exercise": 1.0, "heavy_exercise": 0.5},
    "mouth_breather": {
        "sleep": 0.7,
        "sitting": 0.7,
        "light_exercise": 0.7,
        "heavy_exercise": 0.4,
    },
}


@dataclass(frozen=True)
class BreathingPattern:
    """Breathing parameters of one activity, in SI.

    Attributes
    ----------
    name : str
        Label of the activity.
    tidal_volume : float
        Tidal volume V_T. [m^3]
    frequency : float
        Breathing frequency f. [1/s]
    nasal_fraction : float
        Fraction F_n of the air breathed through the nose. [-]
    frc : float
        Functional residual capacity. [m^3]
    dead_space_et, dead_space_bb_big, dead_space_bb_small : float
        Anatomical dead space of ET, BB and bb at FRC. [m^3]
    scale_t, scale_b, scale_a : float
        ICRP body-size scaling factors for trachea/bronchi, bronchioles, alveoli (1 for the
        adult male). [-]

    """

    name: str
    tidal_volume: float
    frequency: float
    nasal_fraction: float = 1.0
    frc: float = 3301e-6
    dead_space_et: float = 50e-6
    dead_space_bb_big: float = 49e-6
    dead_space_bb_small: float = 47e-6
    scale_t: float = 1.0
    scale_b: float = 1.0
    scale_a: float = 1.0

    @property
    def ventilation(self) -> float:
        """Minute ventilation V_T f. [m^3/s]"""
        return self.tidal_volume * self.frequency

    @property
    def flow(self) -> float:
        """Mean inspiratory flow 2 V_T f (inhalation lasts half the cycle). [m^3/s]"""
        return 2.0 * self.tidal_volume * self.frequency

    def check(self) -> None:
        """Raise ValueError when the parameters cannot describe a breath."""
        if not (0.0 <= self.nasal_fraction <= 1.0):
            raise ValueError("nasal_fraction must be between 0 and 1")
        if self.tidal_volume <= 0.0 or self.frequency <= 0.0 or self.frc <= 0.0:
            raise ValueError("tidal volume, frequency and FRC must be positive")
        grow = 1.0 + self.tidal_volume / self.frc
        dead = self.dead_space_et + (self.dead_space_bb_big + self.dead_space_bb_small) * grow
        if dead >= self.tidal_volume:
            raise ValueError(
                "tidal volume is smaller than the airways' dead space: no air reaches the "
                "alveolar region"
            )


# ICRP 66 Annex B, reference adult male (from memory; the products V_T f
# reproduce the ventilation rates 0.45, 0.54, 1.5 and 3.0 m^3/h).
ACTIVITIES: dict[str, BreathingPattern] = {
    "sleep": BreathingPattern("sleep", 625e-6, 12.0 / 60.0),
    "sitting": BreathingPattern("sitting", 750e-6, 12.0 / 60.0),
    "light_exercise": BreathingPattern("light exercise", 1250e-6, 20.0 / 60.0),
    "heavy_exercise": BreathingPattern("heavy exercise", 1920e-6, 26.0 / 60.0),
}
"""Reference adult male breathing for the four ICRP activity levels, nose breathing."""


def activity(name: str, route: str = "mixed") -> BreathingPattern:
    """Return reference adult male breathing for an activity and breathing route.

    Parameters
    ----------
    name : str
        ``sleep``, ``sitting``, ``light_exercise`` or ``heavy_exercise``.
    route : str
        One of :data:`ROUTES`.

    Returns
    -------
    BreathingPattern
        With the nasal fraction of the route.

    """
    try:
        base = ACTIVITIES[name]
    except KeyError:
        raise ValueError(f"unknown activity {name!r}; valid: {', '.join(ACTIVITIES)}") from None
    if route == "nose":
        fn = 1.0
    elif route == "mouth":
        fn = 0.0
    elif route in _NASAL_FRACTION:
        fn = _NASAL_FRACTION[route][name]
    else:
        raise ValueError(f"unknown route {route!r}; valid: {', '.join(ROUTES)}")
    return replace(base, nasal_fraction=fn)


@dataclass(frozen=True)
class Subject:
    """A person's breathing over an exposure: activities and the hours spent in each.

    Attributes
    ----------
    name : str
        Label.
    periods : tuple of (BreathingPattern, float)
        Activities and hours. Fractions are weighted by the air volume inhaled in each.
    wind_speed : float
        Ambient wind speed for the inhalability term. [m/s]

    """

    name: str
    periods: tuple[tuple[BreathingPattern, float], ...]
    wind_speed: float = 0.0

    def __post_init__(self) -> None:
        """Require at least one period with positive time."""
        if not self.periods or sum(h for _, h in self.periods) <= 0.0:
            raise ValueError("a subject needs at least one period of positive duration")
        for p, h in self.periods:
            if h < 0.0:
                raise ValueError("hours must be non-negative")
            p.check()

    @property
    def hours(self) -> float:
        """Total time of the periods. [h]"""
        return sum(h for _, h in self.periods)

    @property
    def inhaled_volume(self) -> float:
        """Air inhaled over the periods. [m^3]"""
        return sum(p.ventilation * h * 3600.0 for p, h in self.periods)

    @property
    def mean_ventilation(self) -> float:
        """Time-averaged ventilation. [m^3/s]"""
        return self.inhaled_volume / (self.hours * 3600.0)

    @classmethod
    def single(cls, pattern: BreathingPattern, wind_speed: float = 0.0) -> Subject:
        """Return a subject breathing one pattern throughout."""
        return cls(pattern.name, ((pattern, 1.0),), wind_speed)


def reference_worker(route: str = "mixed") -> Subject:
    """Return the ICRP reference worker: 8 h of 2.5 h sitting and 5.5 h light exercise.

    Parameters
    ----------
    route : str
        Breathing route, one of :data:`ROUTES`; the ICRP reference is ``mixed`` (normal
        nose breather), which at these two activities is nose breathing.

    Returns
    -------
    Subject
        9.6 m^3 inhaled per 8-h shift (ICRP 66, Annex B; ICRP 68; from memory).

    """
    return Subject(
        f"reference worker ({route})",
        ((activity("sitting", route), 2.5), (activity("light_exercise", route), 5.5)),
    )


REFERENCE_WORKER = reference_worker()
"""The ICRP reference worker, normal nose breather."""


TIDAL_VOLUME_RANGE = (300e-6, 3500e-6)
"""Tidal volumes [m^3] outside which :func:`breathing_warnings` warns: far from the ICRP adult
reference values, 625 to 1920 mL (our bounds)."""

FREQUENCY_RANGE = (5.0 / 60.0, 40.0 / 60.0)
"""Breathing frequencies [1/s] outside which :func:`breathing_warnings` warns: far from the
ICRP adult reference values, 12 to 26 per minute (our bounds)."""


def breathing_warnings(subject: Subject) -> list[str]:
    """Warnings for breathing parameters far from the ICRP adult reference values.

    Parameters
    ----------
    subject : Subject
        Breathing over the exposure; every period's pattern is checked.

    Returns
    -------
    list of str
        One sentence per tidal volume [m^3] outside :data:`TIDAL_VOLUME_RANGE` and per
        frequency [1/s] outside :data:`FREQUENCY_RANGE` (ICRP 66, Annex B, reference values
        from memory).

    """
    out = []
    for p, _ in subject.periods:
        if not (TIDAL_VOLUME_RANGE[0] <= p.tidal_volume <= TIDAL_VOLUME_RANGE[1]):
            out.append(
                f"Tidal volume {p.tidal_volume * 1e6:.0f} mL is far from the ICRP adult "
                "reference values (625 to 1920 mL); the model's fits were made for "
                "adult breathing."
            )
        if not (FREQUENCY_RANGE[0] <= p.frequency <= FREQUENCY_RANGE[1]):
            out.append(
                f"Breathing frequency {p.frequency * 60:.0f} per minute is far from the "
                "ICRP adult reference values (12 to 26 per minute)."
            )
    return out
