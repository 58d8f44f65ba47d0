"""How a command ends: exit codes, and the one-line usage error for bad input."""

from __future__ import annotations

import sys

OK, FLAGGED, USAGE, NOT_PROMOTED, INTERRUPTED = 0, 1, 2, 3, 130


class UsageError(Exception):
    """Bad input from the person at the keyboard: one line, exit 2."""


def say(message: str) -> None:
    """A line for the person at the terminal, on stderr (stdout carries results)."""
    print(message, file=sys.stderr, flush=True)
