"""The s-expression layer keeps every atom's exact text and fails cleanly on bad input."""

from __future__ import annotations

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from ledlint.errors import InputError
from ledlint.netlist.sexpr import MAX_DEPTH, parse, unescape


# sexpdata's defaults would turn each of these into something else (nil -> [], t -> True,
# 01 -> 1, 1e3 -> 1000.0, /LED[0] split at the brackets, ';' a comment). KiCad's lexer
# takes bare atoms literally (kicad-netlist-format.md §2.1-2.2).
@pytest.mark.parametrize(
    "atom",
    ["nil", "t", "01", "1e3", "/LED[0]", "a;b", ";", "#x", "'q", "-0", "1.50", "inf", "NaN",
     "C:\\work\\x.sch", '10"', "{slash}", "`b`", "[1-5]", "µF", "15kΩ", "IC'1", "!OE", "~{RESET}"],
)
def test_bare_atoms_come_through_as_exact_text(atom: str) -> None:
    tree = parse(f"(value {atom})")
    assert tree == ["value", atom]
    assert type(tree[1]) is str


@pytest.mark.parametrize("atom", ["nil", "t", "01", "1e3", "/LED[0]", "a;b"])
def test_sexpdata_would_change_these_atoms(atom: str) -> None:
    # Documents why the reader does not use sexpdata's parser (README design notes).
    sexpdata = pytest.importorskip("sexpdata")
    try:
        got = sexpdata.loads(f"(value {atom})")
    except Exception:  # sexpdata raises on some of them; that is a change too
        return
    assert got[1:] != [atom] or type(got[1]) is not str


@pytest.mark.parametrize(
    ("body", "text"),
    [
        (r"a\"b", 'a"b'),  # DSNLEXER escapes (kicad-netlist-format.md §2.2)
        (r"C:\\Users\\x", "C:\\Users\\x"),
        (r"line\nbreak", "line\nbreak"),
        (r"\t\r\a\b\f\v", "\t\r\a\b\f\v"),
        (r"\x41\x4a", "AJ"),
        (r"\101\60", "A0"),
        (r"\q", "\\q"),  # an unknown escape keeps its backslash
        ("16PS.1\\\" DL", '16PS.1" DL'),
    ],
)
def test_quoted_string_escapes(body: str, text: str) -> None:
    assert parse(f'(x "{body}")') == ["x", text]
    assert unescape(body) == text


def test_quoted_and_bare_numbers_are_the_same_text() -> None:
    assert parse('(code "1")') == parse("(code 1)") == ["code", "1"]


def test_empty_quoted_string_and_empty_list() -> None:
    assert parse('(a "" () (b))') == ["a", "", [], ["b"]]


def test_unbalanced_parens_inside_strings_do_not_count() -> None:
    assert parse('(d "a (b" c)') == ["d", "a (b", "c"]


def test_crlf_and_tabs_are_whitespace() -> None:
    assert parse("(a\r\n\tb\r\n)") == ["a", "b"]


def test_offsets_point_at_the_opening_paren() -> None:
    tree = parse("(a\n  (b c)\n  (d))")
    assert tree.offset == 0 and tree[1].offset == 5 and tree[2].offset == 13


def _error(text: str) -> InputError:
    with pytest.raises(InputError) as info:
        parse(text, "f.net")
    return info.value


@pytest.mark.parametrize(
    ("text", "line", "column", "words"),
    [
        ("", 1, 1, "empty"),
        ("   \n  ", 1, 1, "empty"),
        ("(export\n  (a b)", 2, 8, "end of file"),
        ("(a))", 1, 4, "more lists closed"),
        (")", 1, 1, "more lists closed"),
        ('(a\n "b)\n', 2, 2, "unterminated string"),
        ('{"schema": 1}', 1, 1, "JSON"),
        ("<?xml version='1.0'?>", 1, 1, "XML"),
        ("# EESchema Netlist Version 1.1", 1, 1, "legacy"),
        ("# A README, not a netlist\n", 1, 1, "expected '('"),
        ("hello", 1, 1, "expected '('"),
        ("(a) (b)", 1, 5, "after the netlist"),
    ],
)
def test_bad_input_names_line_and_column(text: str, line: int, column: int, words: str) -> None:
    err = _error(text)
    assert (err.line, err.column) == (line, column)
    assert words in err.message
    assert str(err).startswith(f"f.net:{line}:{column}: error: ")


def test_deep_nesting_is_a_clean_error_not_a_crash() -> None:
    err = _error("(" * 200_000 + ")" * 200_000)
    assert "nested deeper" in err.message
    assert err.column == MAX_DEPTH + 1


_atoms = st.one_of(
    st.text(alphabet=st.characters(blacklist_characters=' \t\r\n\f\v()"'), min_size=1, max_size=8),
    st.text(max_size=8).map(lambda s: '"' + s.replace("\\", "\\\\").replace('"', '\\"').replace("\n", "\\n")
                            .replace("\r", "\\r") + '"'),
)


@settings(max_examples=300, deadline=None)
@given(st.lists(st.one_of(_atoms, st.sampled_from(["(", ")", "(", ")", " ", "\n", '"', "\\"])), max_size=40))
def test_random_token_soup_only_raises_input_error(tokens: list[str]) -> None:
    try:
        parse(" ".join(tokens))
    except InputError:
        pass


@settings(max_examples=300, deadline=None)
@given(st.text(max_size=60))
def test_random_text_only_raises_input_error(text: str) -> None:
    try:
        parse(text)
    except InputError:
        pass
