"""Run the command line: ``python -m driftdose`` (see :mod:`driftdose.cli`)."""

import sys

from .cli import main

if __name__ == "__main__":
    sys.exit(main())
