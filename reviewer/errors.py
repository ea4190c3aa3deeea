"""Errors a user can cause, each turned into one clear line at the command-line edge."""

from __future__ import annotations


class InputError(Exception):
    """Bad input: names the file, the field path and what was expected."""

    def __init__(self, file: str, field: str, expected: str) -> None:
        super().__init__(file, field, expected)
        self.file = file
        self.field = field
        self.expected = expected

    def __str__(self) -> str:
        return f"{self.file}: {self.field}: {self.expected}"
