"""Text from a design or a configuration made safe to show: one sanitiser for every human-facing
string, the error line's as well as the reports'.

A netlist in CI comes from anyone. Control characters (C0 and C1: escape sequences, the bell,
a newline that forges a second error line), bidirectional controls (which make text read in
another order than it is stored, Unicode TR#36 and CVE-2021-42574) and line separators are shown
as U+FFFD. A run of text too long to read (a multi-megabyte value) is cut, saying how long it was
and naming it by a short hash, so that a machine-readable report can keep it once in full.
"""

from __future__ import annotations

import hashlib
import re

# C0 and C1 controls, DEL, the bidirectional marks, embeddings, overrides and isolates, and the
# Unicode line and paragraph separators.
UNSAFE = re.compile("[\x00-\x1f\x7f-\x9f\u061c\u200e\u200f\u202a-\u202e\u2066-\u2069\u2028\u2029]")
_UNSAFE_IN_JSON = re.compile("[\x7f-\x9f\u061c\u200e\u200f\u202a-\u202e\u2066-\u2069\u2028\u2029]")
LONG = 200  # characters: a run without spaces longer than this is cut for display
_KEEP = 60
MAX_TEXT = 10_000  # characters: a longer text is shown by its start and end
_ENDS = 2_000
# A run is cut without the quotes, brackets and separators a message puts around a value.
_LONG_RUN = re.compile(r"""[^\s'"(),;:]{%d,}""" % (LONG + 1))


def printable(text: str) -> str:
    """Text with every unsafe character shown as U+FFFD."""
    return UNSAFE.sub("\ufffd", text)


def text_id(text: str) -> str:
    """A short, stable name for a long text: the first 8 hex digits of its SHA-256."""
    return hashlib.sha256(text.encode("utf-8", "surrogatepass")).hexdigest()[:8]


def clip(text: str) -> str:
    """Text with each run of more than LONG characters without a space cut to its start, its length
    and its name: "1kxxxx… (2,097,154 characters, text 3f2a9c1b)". Text still longer than MAX_TEXT
    (a name of a million short words) keeps its start and its end, where a message's numbers are."""
    if len(text) <= LONG:
        return text
    cut = _LONG_RUN.sub(lambda m: f"{m.group()[:_KEEP]}… ({len(m.group()):,} characters, text "
                                  f"{text_id(m.group())})", text)
    if len(cut) > MAX_TEXT:
        cut = f"{cut[:_ENDS]} … ({len(cut) - 2 * _ENDS:,} characters not shown) … {cut[-_ENDS:]}"
    return cut


def long_runs(text: str) -> list[str]:
    """The runs of text that clip() cuts and names, in full."""
    return _LONG_RUN.findall(text) if len(text) > LONG else []


# Keys whose strings are file paths or addresses: kept whole, as a tool must find the file.
PATH_KEYS = frozenset({"path", "file", "config", "uri", "$schema"})


def clip_all(document: object, cut: dict[str, str]) -> object:
    """A JSON-like document with every string clipped but paths (PATH_KEYS); each text clip() names
    goes into `cut` under its name, so that a machine-readable report holds it once however often it
    is shown."""
    if isinstance(document, str):
        if len(document) <= LONG:
            return document
        for run in long_runs(document):
            cut[text_id(run)] = run
        return clip(document)
    if isinstance(document, dict):
        return {k: v if k in PATH_KEYS else clip_all(v, cut) for k, v in document.items()}
    if isinstance(document, (list, tuple)):
        return [clip_all(v, cut) for v in document]
    return document


def shown(text: str) -> str:
    """Text as a person should see it: clipped, then made printable."""
    return printable(clip(text))


def json_text(document: object) -> str:
    """A JSON document, indented, with every unsafe character written as a \\u escape: the same
    data, which no viewer or terminal can take for a control or a reordering."""
    import json

    text = json.dumps(document, indent=2, ensure_ascii=False)  # C0 controls come out escaped already
    return _UNSAFE_IN_JSON.sub(lambda m: f"\\u{ord(m.group()):04x}", text) + "\n"
