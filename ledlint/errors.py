"""Error types that the command line turns into one-line messages and exit code 2."""

from __future__ import annotations


class LedlintError(Exception):
    """Base of every error the tool reports to the user instead of a traceback."""

    def __init__(self, message: str, path: str = "", line: int = 0, column: int = 0) -> None:
        super().__init__(message)
        self.message = message
        self.path = path
        self.line = line
        self.column = column

    def __str__(self) -> str:
        if not self.path:
            return f"ledlint: error: {self.message}"
        where = self.path + (f":{self.line}:{self.column or 1}" if self.line else "")
        return f"{where}: error: {self.message}"


class InputError(LedlintError):
    """A netlist file that cannot be read: missing, not text, not a netlist, malformed."""


class ConfigError(LedlintError):
    """A configuration file or option that is malformed or names something unknown."""


def failure_reason(exc: Exception) -> str:
    """Why a file could not be read or written, in words, without the path the message names."""
    if isinstance(exc, UnicodeDecodeError):
        return f"not UTF-8 text (byte 0x{exc.object[exc.start]:02x} at offset {exc.start})"
    if isinstance(exc, OSError) and exc.strerror:
        return exc.strerror
    return str(exc)
