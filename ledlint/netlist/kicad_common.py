"""What every KiCad reader shares: reading and decoding a file, KiCad's own properties, DNP conventions.

kicad-netlist-format.md §1.4 (properties), §5 (do not populate) and §6.8 (encoding).
"""

from __future__ import annotations

import re
from pathlib import Path
from typing import Mapping

from ledlint.errors import InputError, byte_position, failure_reason
from ledlint.netlist.model import Note

# The largest design file read: eight times a 20,000-part board's 15 MB netlist, and a stop for
# endless inputs such as a device or a pipe. The README states it, and what it costs (memory
# runs to about fifteen times the file).
MAX_BYTES = 128 << 20

# Properties KiCad writes for its own purposes, as opposed to the user's fields.
KICAD_PROPERTIES = frozenset(
    {"sheetname", "sheetfile", "sheet name", "sheet file", "dnp", "exclude_from_bom",
     "exclude_from_board", "exclude_from_pos_files", "exclude_from_sim"}
)
# A user field or value that marks a part "do not populate" in KiCad 5 designs, which had
# no native flag (common practice).
_DNP_FIELDS = frozenset({"dnp", "dnf", "do not populate", "do not fit"})
_DNP_TRUE = frozenset({"1", "yes", "y", "true", "x", "dnp", "dnf"})
_DNP_VALUES = frozenset({"dnp", "dnf", "dni", "nf", "n/f", "nofit", "no fit", "do not populate"})
_DIGITS = re.compile(r"(\d+)")


def is_kicad_property(name: str) -> bool:
    return name.lower() in KICAD_PROPERTIES or name.startswith("ki_")


def empty_marker(text: str) -> str:
    """'~' is KiCad's "empty" placeholder for values, datasheets and pin names (§6.11)."""
    return "" if text == "~" else text


def marked_dnp(value: str, fields: Mapping[str, str]) -> bool:
    """A value or user field that says "do not populate" (the KiCad 5 habit)."""
    return value.lower() in _DNP_VALUES or bool(fields) and any(
        k.lower() in _DNP_FIELDS and v.strip().lower() in _DNP_TRUE for k, v in fields.items())


def natural(text: str) -> tuple[tuple[int, int | str], ...]:
    """KiCad's StrNumCmp order: digit runs compare as numbers (R2 before R10)."""
    return tuple((0, int(p)) if p.isdigit() else (1, p) for p in _DIGITS.split(text) if p)


def read_bytes(path: str | Path, what: str) -> bytes:
    """A file's bytes; a missing, unreadable, binary or oversized file is an InputError naming it.
    A binary stream is refused from its first block rather than read whole."""
    name = str(path)
    try:
        with open(path, "rb") as fh:
            head = fh.read(min(1 << 16, MAX_BYTES + 1))
            nul = head.find(b"\0")
            if nul >= 0:
                line, col = byte_position(head, nul)
                raise InputError(f"binary file (NUL byte), not a {what}", name, line, col)
            data = head + fh.read(max(0, MAX_BYTES + 1 - len(head)))
    except FileNotFoundError:
        raise InputError("no such file", name) from None
    except IsADirectoryError:
        raise InputError(f"is a folder, not a {what}", name) from None
    except OSError as exc:
        raise InputError(f"cannot read: {failure_reason(exc)}", name) from None
    if len(data) > MAX_BYTES:
        raise InputError(f"larger than {MAX_BYTES >> 20} MiB: too large for a {what}", name)
    return data


def decode(data: bytes, path: str = "", what: str = "KiCad netlist") -> tuple[str, list[Note]]:
    """Bytes to text. KiCad writes UTF-8 (kicad-netlist-format.md §6.8).

    A file that is not text (a NUL byte, or invalid UTF-8 before the first '(') is an error.
    Invalid bytes later in an otherwise good file are replaced by U+FFFD and noted, so one
    bad byte in a description does not lose the file.
    """
    nul = data.find(b"\0")
    if nul >= 0:
        line, col = byte_position(data, nul)
        raise InputError(f"binary file (NUL byte), not a {what}", path, line, col)
    if data.startswith(b"\xef\xbb\xbf"):
        data = data[3:]
    try:
        return data.decode("utf-8"), []
    except UnicodeDecodeError as exc:
        line, col = byte_position(data, exc.start)
        if not data.lstrip().startswith(b"("):
            raise InputError(f"not a text file (invalid UTF-8), not a {what}", path, line, col) from None
        note = Note(line, col, f"invalid UTF-8 byte 0x{data[exc.start]:02X}; undecodable bytes read as U+FFFD")
        return data.decode("utf-8", errors="replace"), [note]
