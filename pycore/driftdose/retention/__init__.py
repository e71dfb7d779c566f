"""Retained burden: clearance of insoluble particles after deposition (ICRP transport model).

:mod:`.model` holds the published transport parameters (ICRP 66 and its ICRP 130 revision),
the split of each region's deposit among compartments and the work pattern;
:mod:`.kinetics` solves the compartment equations exactly for piecewise-constant input.
"""

from .kinetics import Network, Off, On, Repeat, Seq
from .model import (
    DAY,
    RATE_SETS,
    YEAR,
    BurdenResult,
    compartment_inputs,
    deposition_rates,
    exposure_end,
    retained_burden,
    single_exposure,
    slow_fraction,
    split_deposit,
    work_schedule,
)

__all__ = [
    "DAY",
    "RATE_SETS",
    "YEAR",
    "BurdenResult",
    "Network",
    "Off",
    "On",
    "Repeat",
    "Seq",
    "compartment_inputs",
    "deposition_rates",
    "exposure_end",
    "retained_burden",
    "single_exposure",
    "slow_fraction",
    "split_deposit",
    "work_schedule",
]
