"""Propagation of input uncertainty to regional dose and retained burden.

Interfaces: :class:`Spread` (a multiplicative uncertainty: uniform, triangular or lognormal
factor around the nominal value), :func:`design` (Latin-hypercube or plain Monte Carlo
sample of the factors from a recorded seed), :class:`DepositionTables` (regional deposition
tabulated once against size and interpolated for each sample), :func:`percentile`,
:func:`spearman` and :func:`propagate`.

Reproducibility: the only source of randomness is ``random.Random(seed).random()`` (the
Mersenne Twister, whose stream for a given integer seed is the same in every CPython
version); permutations are drawn by our own Fisher-Yates loop on that stream, and normal
quantiles come from ``statistics.NormalDist``. A seed therefore reproduces the same sample
in CPython and in the page; numbers derived from it agree to the last few bits of the
platform's ``exp`` and ``log``.

Speed: the ICRP 66 regional model is evaluated once per table node, not per sample: the
deposition fraction of each region (and the slow-cleared bronchial share of ICRP 66) is
tabulated on a grid in ln d from 1 nm to 100 um for a few densities and shape factors that
span the sampled ones, and each sample interpolates linearly in ln d, ln density and ln
shape factor. Each sample's lognormal modes are integrated by Gauss-Hermite quadrature.
The nominal case is computed with the full model, and every sample is the nominal value
times the ratio fast(sample) / fast(nominal) (a ratio estimator): the interpolation error,
which is nearly the same for nearby inputs, cancels to first order, and a propagation whose
ranges all have zero width returns the full model's nominal result exactly.

One module per topic, every name re-exported here: :mod:`.spreads` (spreads and the sample
design), :mod:`.ranks` (percentiles, Spearman), :mod:`.tables` (tabulated deposition) and
:mod:`.propagation` (samples through the tables to the outputs).
"""

from __future__ import annotations

from .propagation import Propagation, propagate
from .ranks import percentile, spearman
from .spreads import INPUTS, KINDS, U_CLIP, Spread, design
from .tables import (
    COLUMNS,
    GH_NODES,
    NODE_SPACING,
    REGIONS,
    TABLE_STEP,
    DepositionTables,
    make_tables,
    table_nodes,
)

__all__ = [
    "COLUMNS",
    "GH_NODES",
    "INPUTS",
    "KINDS",
    "NODE_SPACING",
    "REGIONS",
    "TABLE_STEP",
    "U_CLIP",
    "DepositionTables",
    "Propagation",
    "Spread",
    "design",
    "make_tables",
    "percentile",
    "propagate",
    "spearman",
    "table_nodes",
]
