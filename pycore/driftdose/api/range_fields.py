"""The inputs of the dose ranges: how many samples, and the spread of each uncertain input.

Every uncertain input (median, GSD, density, shape factor, breathing rate, concentration) has
a choice of spread and its width: ± a percentage for uniform and triangular spreads, a GSD for
a lognormal factor, each applying only to its own spread (``applies``).
"""

from __future__ import annotations

from ..uncertainty import INPUTS
from .declare import ratio, whole
from .fields import Field

__all__ = ["BLOCK", "DEFAULT_SPREADS", "INPUT_LABELS", "RANGE_FIELDS"]

BLOCK = 50
"""Samples per block when the page runs a propagation in steps."""

INPUT_LABELS = {
    "median": "median diameter",
    "gsd": "GSD",
    "density": "particle density",
    "shape_factor": "shape factor",
    "breathing": "breathing rate",
    "concentration": "concentration",
}
DEFAULT_SPREADS = {  # (shape, ± %, GSD): placeholders to be replaced by the user's own
    "median": ("triangular", 20.0, 1.2),
    "gsd": ("triangular", 10.0, 1.1),
    "density": ("uniform", 10.0, 1.1),
    "shape_factor": ("none", 10.0, 1.1),
    "breathing": ("triangular", 20.0, 1.2),
    "concentration": ("lognormal", 30.0, 1.5),
}


def _spread_fields() -> tuple[Field, ...]:
    out = []
    for name in INPUTS:
        shape, pct, gsd = DEFAULT_SPREADS[name]
        label = INPUT_LABELS[name]
        out.append(
            Field(
                f"{name}_spread",
                f"Uncertainty of the {label}",
                "choice",
                shape,
                choices=(
                    ("none", "None (as entered)"),
                    ("uniform", "Uniform, ± a percentage"),
                    ("triangular", "Triangular, ± a percentage, peak at the value entered"),
                    ("lognormal", "Lognormal factor, by its GSD"),
                ),
                help="A factor on the value entered (on every mode for median and GSD).",
            )
        )
        out.append(
            ratio(
                f"{name}_percent",
                f"± percentage of the {label}",
                pct,
                0.0,
                90.0,
                applies=(f"{name}_spread", ("uniform", "triangular")),
                help="Half-width of a uniform or triangular range, in per cent.",
            )
        )
        out.append(
            ratio(
                f"{name}_gsd",
                f"GSD of the lognormal factor on the {label}",
                gsd,
                1.0,
                5.0,
                applies=(f"{name}_spread", ("lognormal",)),
                help="1 means no spread; 1.5 puts 90 % of the factors between 0.51 and 1.95.",
            )
        )
    return tuple(out)


RANGE_FIELDS: tuple[Field, ...] = (
    whole(
        "samples",
        "Number of samples",
        1000,
        10,
        5000,
        help="More samples give steadier percentiles and take longer.",
    ),
    whole(
        "seed",
        "Random seed",
        1,
        0,
        2**31 - 1,
        help="The same seed and inputs give the same sample, here and in the command line.",
    ),
    Field(
        "sampling_method",
        "Sampling",
        "choice",
        "lhs",
        choices=(("lhs", "Latin hypercube"), ("mc", "Plain Monte Carlo")),
    ),
    *_spread_fields(),
    whole(
        "block",
        "Propagation step (0: all samples at once)",
        0,
        0,
        5000 // BLOCK,
        help=f"The page computes {BLOCK} samples per step to show progress; the result is "
        "the same.",
    ),
)
