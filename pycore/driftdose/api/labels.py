"""Words the replies of several calculations share: region names and diameter types.

One table each, so deposition, burden, uncertainty and sampling name a region or a kind of
diameter the same way.
"""

from __future__ import annotations

__all__ = ["COORDINATE_WORDS", "DIAMETER_TYPE_WORDS", "REGION_LABELS", "WEIGHT_WORDS"]

REGION_LABELS: dict[str, str] = {
    "ET1": "ET1 (front of the nose)",
    "ET2": "ET2 (back of nose, mouth, pharynx, larynx)",
    "BB": "BB (bronchi)",
    "bb": "bb (bronchioles)",
    "AI": "AI (alveolar-interstitial)",
    "head_airways": "Head airways",
    "tracheobronchial": "Tracheobronchial",
    "alveolar": "Alveolar",
    "total": "Total",
}
"""Label of every deposition region (ICRP 66 regions and those of the simplified fits)."""

DIAMETER_TYPE_WORDS: dict[str, str] = {
    "volume_equivalent": "volume-equivalent",
    "optical": "optical",
    "mobility": "mobility",
    "aerodynamic": "aerodynamic",
}
"""A measured diameter's type in words (keys of ``diameters.DIAMETER_TYPES``)."""

COORDINATE_WORDS: dict[str, str] = {
    "volume_equivalent": "volume-equivalent",
    "mobility": "mobility-equivalent",
}
"""The size axis the models compute on, in words (``ParticleDescription.coordinate``)."""

WEIGHT_WORDS: dict[str, str] = {"number": "number", "surface": "surface area", "mass": "mass"}
"""A weight of a distribution (``distribution.WEIGHTS``) in words."""
