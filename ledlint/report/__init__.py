"""Output formats: one module per format, each consuming findings and rule metadata."""

from __future__ import annotations

import re

# C0 and C1 control characters but tab and newline: a netlist could carry terminal escapes in a
# name or value, and a report must not pass them to the reader's terminal or CI log.
_CONTROL = re.compile(r"[\x00-\x08\x0b-\x1f\x7f-\x9f]")


def printable(text: str) -> str:
    """Text with control characters shown as U+FFFD."""
    return _CONTROL.sub("\ufffd", text)
