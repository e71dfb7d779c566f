"""Drift & Dose: aerosol particle mechanics for occupational hygiene screening.

Pure Python (standard library ``math`` only) so that the same package runs in CPython and
in the browser under Pyodide. SI units everywhere inside the package.
"""

__version__ = "0.1.0"
