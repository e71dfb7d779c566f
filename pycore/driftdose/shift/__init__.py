"""A shift from logged data: time series, periods, background, statistics, TWA, dose per task.

Modules: :mod:`.clock` (time stamps), :mod:`.reader` (a file's table), :mod:`.series`
(readings, logging interval, gaps, alignment of a second series), :mod:`.periods` (tasks,
background periods, breaks), :mod:`.background` (background per reading), :mod:`.stats`
(statistics per period, 8-h TWA), :mod:`.taskdose` (deposited dose of one task),
:mod:`.demo` (an invented demo shift, generated; not a measurement). The
composition of a whole shift is :mod:`driftdose.compose.shift`. SI inside: seconds, 1/m³,
m²/m³, kg/m³.
"""
