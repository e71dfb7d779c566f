"""The command line's name, exit statuses and the one error a user's input raises."""

from __future__ import annotations

PROG = "driftdose"
EXIT_OK, EXIT_FAILURE, EXIT_USAGE = 0, 1, 2


class UserError(Exception):
    """A problem with what the user gave; printed as ``field: message``, exit status 2."""

    def __init__(self, field: str, message: str) -> None:
        super().__init__(message)
        self.field = field
        self.message = message
