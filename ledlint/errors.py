"""Error types that the command line turns into one-line messages and exit code 2."""

from __future__ import annotations

import re
from pathlib import Path

from ledlint.sanitise import shown

_LINE_BREAK = re.compile(rb"\r\n|\n|\r")


class LedlintError(Exception):
    """Base of every error the tool reports to the user instead of a traceback."""

    def __init__(self, message: str, path: str = "", line: int = 0, column: int = 0) -> None:
        super().__init__(message)
        self.message = message
        self.path = path
        self.line = line
        self.column = column

    def __str__(self) -> str:
        # One line, whatever the file or its contents hold: a name with a newline or an escape
        # sequence must not forge a second error line or reach the terminal.
        message = shown(self.message)
        if not self.path:
            return f"ledlint: error: {message}"
        where = shown(self.path) + (f":{self.line}:{self.column or 1}" if self.line else "")
        return f"{where}: error: {message}"


class InputError(LedlintError):
    """A netlist file that cannot be read: missing, not text, not a netlist, malformed."""


class ConfigError(LedlintError):
    """A configuration file or option that is malformed or names something unknown."""


def byte_position(data: bytes, index: int) -> tuple[int, int]:
    """Line and column (1-based, in characters) of byte `index` of UTF-8 text."""
    breaks = list(_LINE_BREAK.finditer(data, 0, index))  # CRLF, LF or a lone CR, as sexpr.Locator counts
    start = breaks[-1].end() if breaks else 0
    return len(breaks) + 1, len(data[start:index].decode("utf-8", errors="replace")) + 1


def read_utf8(path: str | Path, what: str, error: type[LedlintError] = LedlintError) -> str:
    """A UTF-8 text file's contents; a file that is missing, unreadable or not UTF-8 is an
    `error` naming the file (and, for a bad byte, its line and column)."""
    try:
        data = Path(path).read_bytes()
    except FileNotFoundError:
        raise error(f"no such {what}", str(path)) from None
    except OSError as exc:
        raise error(f"cannot read the {what}: {failure_reason(exc)}", str(path)) from None
    try:
        return data.decode("utf-8")
    except UnicodeDecodeError as exc:
        line, column = byte_position(data, exc.start)
        raise error(f"the {what} is not UTF-8 text (byte 0x{data[exc.start]:02x})", str(path), line, column) from None


def failure_reason(exc: Exception) -> str:
    """Why a file could not be read or written, in words, without the path the message names."""
    if isinstance(exc, OSError) and exc.strerror:
        return exc.strerror
    return str(exc)
