"""Compositions of calculations: each module calls the models in order for one calculation,
takes SI inputs and returns a frozen dataclass with documented units. Never imports
:mod:`driftdose.api`.

- :mod:`~driftdose.compose.aerosol`: the aerosol in the models' diameters, from lognormal mode
  specifications or a measured spectrum (used by deposition, burden and uncertainty).
"""
