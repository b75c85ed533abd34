"""Configuration is strict: unknown keys and malformed values are errors that suggest a fix."""

from __future__ import annotations

import pytest

from ledlint.config import Config, discover, from_mapping, load
from ledlint.errors import ConfigError
from ledlint.review.rules import load_rules
from ledlint.checks.registry import settings


def test_defaults_without_a_file() -> None:
    c = Config()
    assert (c.ambient_min_c, c.ambient_max_c) == (0.0, 40.0) and c.rails == {} and c.waivers == ()


def test_rails_parts_rules_and_waivers(tmp_path) -> None:
    f = tmp_path / "ledlint.toml"
    f.write_text('''
[ambient]
min = -20
max = "85 °C"

[rails."+12V"]
nominal = 12
tolerance = "10%"

[rails.VCC]
nominal = "5V"
min = 4.5
max = 5.5

[rails.VBAT]
nominal = 3.7

[refs.D1]
Vf = "2.0V@20mA"
if_max = "25mA"

[values."LED red"]
colour = "red"

[rules.current-margin]
margin = 0.8
severity = "error"

[[waivers]]
rule = "shared-resistor-bank"
ref = "R1"
reason = "only one LED lit at a time (firmware)"
''', encoding="utf-8")
    c = load(f)
    assert (c.ambient_min_c, c.ambient_max_c) == (-20.0, 85.0)
    r = c.rails["+12V"]
    assert (r.nominal, r.minimum, r.maximum) == pytest.approx((12.0, 10.8, 13.2))  # ±10 % of 12 V
    assert (c.rails["VCC"].minimum, c.rails["VCC"].maximum) == (4.5, 5.5)
    assert c.rails["VBAT"].minimum == pytest.approx(3.7 * 0.95)  # ±5 % when only a nominal is given
    assert c.refs["D1"] == {"Vf": "2.0V@20mA", "If_max": "25mA"}  # keys match without case, stored canonical
    assert c.part_settings("D1", "LED red", "Device", "LED")["colour"][0] == "red"
    s = settings(load_rules(), c)
    assert s.options["current-margin"]["margin"] == 0.8 and s.severity["current-margin"] == "error"
    assert c.waivers[0].ref == "R1" and "firmware" in c.waivers[0].reason


@pytest.mark.parametrize(
    ("data", "words"),
    [
        ({"rail": {}}, "did you mean 'rails'?"),
        ({"rails": {"+5V": {"nominall": 5}}}, "did you mean 'nominal'?"),
        ({"rails": {"+5V": {"nominal": "five"}}}, "is not a voltage"),
        ({"rails": {"+5V": {"nominal": 5, "min": 5.5}}}, "min <= nominal <= max"),
        ({"refs": {"D1": {"Vff": "2V"}}}, "did you mean 'Vf'?"),
        ({"refs": {"D1": {"Vf": True}}}, "not a valid value"),
        ({"refs": {"U1": {"dropout": 0.5}}}, "write it with its unit"),
        ({"refs": {"U1": {"driver": "lineer"}}}, "did you mean 'linear'?"),
        ({"refs": {"D4": {"Vf_R": "2.0V", "Vf_Q": "x"}}}, "Vf_Q"),
        ({"ambient": {"min": 50, "max": 20}}, "above max"),
        ({"ambient": {"maxx": 20}}, "did you mean 'max'?"),
        ({"waivers": [{"rule": "unlimited-led", "ref": "D1"}]}, "needs 'rule' and 'reason'"),
        ({"waivers": [{"rule": "unlimited-led", "reason": "x"}]}, "names a component"),
        ({"waivers": {"rule": "x"}}, "array of tables"),
        ({"refs": {"D1": {"Vf": "2V", "vf": "2.1V"}}}, "'vf' is set twice"),
    ],
)
def test_bad_configuration_names_the_key(data: dict, words: str) -> None:
    with pytest.raises(ConfigError) as info:
        from_mapping(data, "ledlint.toml")
    assert words in info.value.message


@pytest.mark.parametrize(
    ("rules", "words"),
    [
        ({"curent-margin": {}}, "did you mean 'current-margin'?"),
        ({"current-margin": {"margn": 0.8}}, "did you mean 'margin'?"),
        ({"current-margin": {"severity": "fatal"}}, "'fatal'"),
        ({"current-margin": {"margin": "high"}}, "expected a number"),
    ],
)
def test_rule_options_are_checked_against_the_rules(rules: dict, words: str) -> None:
    with pytest.raises(ConfigError) as info:
        settings(load_rules(), from_mapping({"rules": rules}))
    assert words in info.value.message


def test_toml_syntax_error_has_line_and_column(tmp_path) -> None:
    f = tmp_path / "ledlint.toml"
    f.write_text('[rails]\n"+5V" = \n', encoding="utf-8")
    with pytest.raises(ConfigError) as info:
        load(f)
    assert info.value.line == 2 and "not valid TOML" in info.value.message


def test_a_file_that_is_not_utf8_says_where(tmp_path) -> None:
    # TOML files are UTF-8 (TOML 1.0 spec, "Spec"): a stray Latin-1 byte is named, not echoed.
    f = tmp_path / "ledlint.toml"
    f.write_bytes(b'[ambient]\nmin = 0 # caf\xe9\n')
    with pytest.raises(ConfigError) as info:
        load(f)
    err = info.value
    assert (err.message, err.line, err.column) == ("the configuration file is not UTF-8 text (byte 0xe9)", 2, 14)


def test_discovery_walks_up_and_reads_pyproject(tmp_path) -> None:
    board = tmp_path / "hw" / "main" / "board.net"
    board.parent.mkdir(parents=True)
    assert discover(board) is None
    (tmp_path / "pyproject.toml").write_text('[tool.other]\nx = 1\n')
    assert discover(board) is None  # a pyproject without [tool.ledlint] does not count
    (tmp_path / "pyproject.toml").write_text('[tool.ledlint.rails."+5V"]\nnominal = 5\n')
    assert discover(board) == tmp_path / "pyproject.toml"
    assert load(tmp_path / "pyproject.toml").rails["+5V"].nominal == 5.0
    (tmp_path / "hw" / "ledlint.toml").write_text("")
    assert discover(board) == tmp_path / "hw" / "ledlint.toml"  # the nearest wins


def test_broken_pyproject_meant_for_us_is_an_error(tmp_path) -> None:
    board = tmp_path / "board.net"
    (tmp_path / "pyproject.toml").write_text('[tool.other\nx = 1\n')
    assert discover(board) is None  # broken, but not ours: someone else's problem
    (tmp_path / "pyproject.toml").write_text('[tool.ledlint.rails."+5V"]\nnominal = = 5\n')
    assert discover(board) == tmp_path / "pyproject.toml"
    with pytest.raises(ConfigError) as e:
        load(tmp_path / "pyproject.toml")
    assert e.value.line == 2  # file, line and column, not silence (tomllib reports the position)


def test_settings_that_match_no_part_are_reported(tmp_path) -> None:
    """A mistyped reference would change nothing; the run says which tables matched no part."""
    from kicad8 import Board

    from ledlint.review.run import check

    b = Board("cfg", "unused settings")
    b.resistor("R1", "330", "+5V", "/A")
    b.led("D1", "LED_red", "/A", "GND")
    (tmp_path / "cfg.net").write_text(b.text(), encoding="utf-8")
    (tmp_path / "ledlint.toml").write_text('[refs."D1"]\nIf_max = "20mA"\n[refs."D99"]\nIf_max = "20mA"\n'
                                           '[values."NOPE"]\nPower = "0.25W"\n', encoding="utf-8")
    result = check([tmp_path / "cfg.net"])
    assert len(result.unused_settings) == 2
    assert "[refs.'D99']" in result.unused_settings[0] and "[values.'NOPE']" in result.unused_settings[1]


def test_a_colour_set_to_no_known_colour_says_so(tmp_path) -> None:
    from kicad8 import Board
    from rulecheck import of_rule, run_board

    b = Board("cfg", "colour")
    b.resistor("R1", "330", "+5V", "/A")
    b.led("D1", "yellow", "/A", "GND")
    [f] = of_rule(run_board(b, tmp_path, '[refs."D1"]\ncolour = "purple"\n'), "missing-parameter")
    assert "colour = 'purple' names no colour ledlint knows" in f.message
