"""Component value text to numbers in SI base units; what cannot be read is said, never zero."""

from __future__ import annotations

import math
import re
from collections.abc import Callable, Iterator
from dataclasses import dataclass
from functools import lru_cache

from ledlint.quantities.ratings import CHIP_SIZES

# Parsed once per distinct text: a board repeats the same values and footprints many times over.
_cached = lru_cache(maxsize=8192)


@dataclass(frozen=True)
class Quantity:
    """A number and the exact text it came from.

    The number is in its SI base unit (ohm, W, V, A, K/W, or a fraction for tolerances), except
    temperatures, which stay in degrees Celsius.
    """

    value: float
    text: str


@dataclass(frozen=True)
class Unknown:
    """Text that holds no usable value, and why."""

    text: str
    reason: str


Parsed = Quantity | Unknown

# ASCII digits only: re's \d also matches other scripts' digits, which no value field uses.
# A decimal comma counts where it cannot be a thousands separator ("0,25W", not "1,000V"), and an
# exponent is read ("2e-2A").
_NUM = r"(?:[0-9]+(?:\.[0-9]+|,(?![0-9]{3}(?![0-9]))[0-9]+)?|\.[0-9]+)(?:[eE][+-]?[0-9]{1,4})?"
_SIGNS = "+-\u2212"  # U+2212 is the typographic minus sign
_SIGN = r"[+\-\u2212]"
# A quantity starts a token: not inside a word, a signed number, a decimal comma or a fraction.
_START = r"(?<![\w.+\-\u2212])(?<![0-9][,/])"
_END = r"(?![\w])"

# A unit letter R followed by digits or '_' starts a case code ("2.2k R0402"), not the unit.
# IEC 60062 letters for resistance; 'r' and 'k' are written in lowercase too.  In a resistor
# value 'M' is mega, following the schematic convention; SPICE reads 'M' as milli and wants 'Meg'.
# Multipliers are powers of ten, applied through the decimal text so "4.7k" is exactly 4700.0.
_RKM_EXPONENT = {"R": 0, "r": 0, "K": 3, "k": 3, "M": 6, "G": 9, "T": 12, "L": -3}
# Prefixes after a decimal number; 'm' is the informal milli of current-sense resistors.
_SI_EXPONENT = {"K": 3, "k": 3, "M": 6, "G": 9, "T": 12, "L": -3, "Meg": 6, "MEG": 6, "meg": 6, "m": -3}
_MAX_EXPONENT_DIGITS = 4  # far beyond any float, and short enough for int()

_RESISTANCE = re.compile(
    r"""
    (?:
        (?P<rkm_int>[0-9]*)(?P<rkm_letter>[RrKkMGTL])(?P<rkm_tail>[0-9]+)
      |
        (?P<si_num>[0-9]+(?:[.,][0-9]+)?|[.,][0-9]+)(?P<si_exp>[eE][+-]?[0-9]+)?
        (?:\s*(?P<si_prefix>Meg|MEG|meg|[kKMGTLm]))?
    )
    (?:\s*(?P<unit>[\u03a9\u2126]|[oO][hH][mM][sS]?|[Rr](?![0-9_])))?
    """,
    re.VERBOSE,
)
# What may follow a value: the end, or a separator before the extras.
_VALUE_END = re.compile(r"$|[\s,;/()]")
_SEPARATORS = re.compile(r"[\s,;/()]+")
# A comma between digits is a decimal comma only when it cannot be a thousands separator.
_THOUSANDS = re.compile(r"[0-9],[0-9]{3}(?![0-9])")
# IEC 60062 tolerance letters (B to K from resistor specs, M from capacitor tables).
_TOLERANCE_LETTERS = {
    "B": 0.001,
    "C": 0.0025,
    "D": 0.005,
    "F": 0.01,
    "G": 0.02,
    "J": 0.05,
    "K": 0.10,
    "M": 0.20,
}

_PERCENT = re.compile(_START + r"(?:\u00b1|\+/-|\+-)?\s*(?P<num>[0-9]+(?:[.,][0-9]+)?|\.[0-9]+)\s*%")
_POWER = re.compile(
    _START
    + r"(?:(?P<numer>[0-9]+)/(?P<denom>[0-9]+)|(?P<num>"
    + _NUM
    + r"))\s*(?P<prefix>m)?[Ww](?:atts?)?"
    + _END
)
_VOLTAGE = re.compile(
    _START + r"(?P<sign>" + _SIGN + r")?(?P<num>" + _NUM + r")"
    r"(?:(?P<glued>[Vv](?P<tail>[0-9]+))|\s*(?P<prefix>[mkµμu])?[Vv](?:DC|dc)?)" + _END
)
_CURRENT = re.compile(_START + r"(?P<num>" + _NUM + r")\s*(?P<prefix>[mµμun])?[Aa]" + _END)
_VF = re.compile(r"\s*(?:V[fF]\s*[=:]?\s*)?(?P<v>\S.*?)\s*(?:(?:@|\bat\b)\s*(?P<i>\S.*?))?\s*")
_THERMAL = re.compile(r"\s*(?P<num>" + _NUM + r")\s*(?:(?:K|°\s*C|\u2103|C)\s*/\s*W)?\s*")
_TEMPERATURE = re.compile(
    r"\s*(?P<sign>" + _SIGN + r")?(?P<num>" + _NUM + r")\s*(?:°\s*C|\u2103|C|deg\s*C)?\s*"
)
_PREFIX_EXPONENT = {"": 0, "m": -3, "k": 3, "µ": -6, "μ": -6, "u": -6, "n": -9}
# A chip case code, bare or with its part letter as BOM and footprint names write it ("R0402",
# "R_0603"; common practice).
_CASE_SIZE = re.compile("(?:[RCL]_?)?(?:" + "|".join(sorted(CHIP_SIZES)) + ")")
_BLANKS = re.compile(r"\s{2,}")
_TCR = re.compile(r"[0-9]+\s*ppm(?:/(?:K|°C))?")
_VOLTAGE_RATING = re.compile(r"(?:" + _NUM + r")\s*k?V")


def _squeeze(text: str) -> str:
    """Runs of blanks as one: the patterns allow blanks around a number, and a long run would
    make each search start over it again (quadratic time on hostile input)."""
    return _BLANKS.sub(" ", text) if "  " in text or "\t" in text else text


def _finite(number: float) -> float | None:
    return number if math.isfinite(number) else None


def _scaled(mantissa: str, exponent: int) -> float | None:
    """The decimal mantissa times ten to the exponent, correctly rounded; None when out of range.

    Underflow counts as out of range: a non-zero mantissa never comes back as zero.
    """
    mantissa = mantissa.replace(",", ".")
    if "e" in mantissa.lower():  # "2e-2": fold the written exponent into the scale
        mantissa, written = re.split("[eE]", mantissa)
        exponent += int(written)
    number = float(f"{mantissa}e{exponent}")
    if not math.isfinite(number) or (number == 0 and any(digit in "123456789" for digit in mantissa)):
        return None
    return number


def _signed(sign: str | None, magnitude: float) -> float:
    return -magnitude if sign in ("-", "\u2212") else magnitude


@_cached
def parse_resistance(text: str) -> Parsed:
    """Read a resistance in ohms from IEC 60062 letter code ("4K7", "R47") or SI form ("4.7 kΩ").

    Extras after the value (tolerance, power, voltage rating, TCR, case size) are allowed;
    anything else makes the whole value Unknown rather than a guess.  A decimal comma is
    read as such ("1,5k") unless it could be a thousands separator ("1,500").
    """
    value = _leading_resistance(text)
    if isinstance(value, Unknown):
        return value
    quantity, rest = value
    for token in _extras(rest):
        if token.kind is None:
            return Unknown(
                text, f"'{token.text}' after '{quantity.text}' is not a tolerance, rating or case size"
            )
    return quantity


def _leading_resistance(text: str) -> tuple[Quantity, str] | Unknown:
    stripped = text.strip()
    if not stripped:
        return Unknown(text, "empty value")
    if not any(ch in "0123456789" for ch in stripped):
        if any(ch.isalpha() for ch in stripped):
            return Unknown(text, f"'{stripped}' is not a resistance")
        return Unknown(text, f"no number in '{stripped}'")
    if stripped[0] in _SIGNS:
        return Unknown(text, f"'{stripped}' is not a resistance: a resistance cannot be signed")
    start = len(text) - len(text.lstrip())
    match = _RESISTANCE.match(text, start)
    if match is None or match.end() == start:
        return Unknown(text, f"'{stripped}' is not a resistance")
    after = text[match.end() :]
    if match.group("rkm_letter") and after[:1] in _TOLERANCE_LETTERS and _VALUE_END.match(after[1:]):
        # The letter code's own tolerance suffix, "4K7J": read as "4K7 J" (IEC 60062, from memory).
        after = " " + after
    if re.match(r"/[0-9]+\s*[Ww]", after) and not match.group("si_prefix") and not match.group("unit"):
        # "1/4W" is a power rating, not 1 Ω with extras.
        return Unknown(text, f"'{stripped}' is a power rating, not a resistance")
    if not _VALUE_END.match(after):
        if after[0] in "-\u2212~" and after[1:2].isdigit():
            return Unknown(text, f"'{stripped}' is a range, not one resistance")
        return Unknown(text, f"'{stripped}' is not a resistance: unexpected '{after.split()[0]}'")
    number = match.group(0)
    ohms = _resistance_value(match)
    if isinstance(ohms, str):
        return Unknown(text, f"'{number}' {ohms}")
    return Quantity(ohms, number), after


def _resistance_value(match: re.Match[str]) -> float | str:
    """The value of a resistance match, or the reason it has none."""
    unit = match.group("unit")
    letter = match.group("rkm_letter")
    if letter is not None:
        digits = match.group("rkm_int")
        if not digits and letter not in "Rr":
            return "has no digit before its multiplier letter"
        if unit is not None and unit in "Rr":
            return "carries two multiplier letters"
        number = _scaled(f"{digits or '0'}.{match.group('rkm_tail')}", _RKM_EXPONENT[letter])
        return "is out of range" if number is None else number
    mantissa = match.group("si_num")
    if "," in mantissa:
        if _THOUSANDS.search(mantissa) or (match.group("si_prefix") is None and unit is None):
            return "is ambiguous: the comma may be a decimal point or a thousands separator"
        mantissa = mantissa.replace(",", ".")
    if len(mantissa) > 1 and mantissa[0] == "0" and mantissa[1].isdigit():
        return "has a leading zero, as a case size has, and is not read as a resistance"
    prefix = match.group("si_prefix")
    written = (match.group("si_exp") or "e0")[1:]
    if len(written.lstrip("+-")) > _MAX_EXPONENT_DIGITS:
        return "is out of range"
    exponent = int(written) + (_SI_EXPONENT[prefix] if prefix else 0)
    number = _scaled(mantissa, exponent)
    return "is out of range" if number is None else number


@dataclass(frozen=True)
class _Extra:
    text: str
    kind: str | None  # "tolerance", "power", "voltage", "tcr", "case"; None when unrecognised


def _extras(rest: str) -> Iterator[_Extra]:
    """Split what follows a value into recognised extras."""
    position = 0
    while True:
        gap = _SEPARATORS.match(rest, position)
        if gap is not None:
            position = gap.end()
        if position >= len(rest):
            return
        extra = _one_extra(rest, position)
        yield extra
        if extra.kind is None:
            return
        position += len(extra.text)


def _one_extra(rest: str, position: int) -> _Extra:
    for kind, pattern in (
        ("tolerance", _PERCENT),
        ("power", _POWER),
        ("voltage", _VOLTAGE_RATING),
        ("tcr", _TCR),
        ("case", _CASE_SIZE),
    ):
        found = pattern.match(rest, position)
        if found is not None and _boundary(rest, found.end()):
            return _Extra(found.group(0), kind)
    word = _SEPARATORS.split(rest[position:], maxsplit=1)[0]
    if word in _TOLERANCE_LETTERS:
        return _Extra(word, "tolerance")
    return _Extra(word or rest[position], None)


def _boundary(text: str, index: int) -> bool:
    return _VALUE_END.match(text, index) is not None


def _percent(match: re.Match[str]) -> Quantity | None:
    number = _scaled(match.group("num").replace(",", "."), -2)
    return None if number is None else Quantity(number, match.group(0).strip())


def _only(candidates: list[Quantity]) -> Quantity | None:
    """The one quantity found, or None when there is none or they disagree."""
    values = {candidate.value for candidate in candidates}
    return candidates[0] if len(values) == 1 else None


@_cached
def parse_tolerance(text: str) -> Quantity | None:
    """Read a tolerance as a fraction: "1%", "±5 %", or an IEC 60062 letter ("F") as a whole token.

    Letters count alone or after a resistance value ("4K7 F"); percentages count anywhere.
    """
    text = _squeeze(text)
    stripped = text.strip()
    if stripped in _TOLERANCE_LETTERS:
        return Quantity(_TOLERANCE_LETTERS[stripped], stripped)
    found = [q for m in _PERCENT.finditer(text) if _boundary(text, m.end()) and (q := _percent(m))]
    leading = _leading_resistance(text)
    if not isinstance(leading, Unknown):
        letters = [extra.text for extra in _extras(leading[1]) if extra.text in _TOLERANCE_LETTERS]
        found += [Quantity(_TOLERANCE_LETTERS[letter], letter) for letter in letters]
    return _only(found)


@_cached
def parse_power(text: str) -> Quantity | None:
    """Read a power in watts: "0.25W", "1/4 W", "250mW", also inside value text ("1K, 1/4W 5%")."""
    text = _squeeze(text)
    found = []
    for match in _POWER.finditer(text):
        exponent = -3 if match.group("prefix") else 0
        if match.group("numer") is not None:
            denominator = float(match.group("denom"))
            if denominator == 0:
                return None
            number = _finite(float(match.group("numer")) / denominator * 10.0**exponent)
        else:
            number = _scaled(match.group("num"), exponent)
        if number is None:
            return None
        found.append(Quantity(number, match.group(0)))
    return _only(found)


@_cached
def parse_voltage(text: str) -> Quantity | None:
    """Read a voltage in volts: "3.0V", "12 V", "-12V", "250mV", and the letter form "3V3"."""
    text = _squeeze(text)
    found = []
    for match in _VOLTAGE.finditer(text):
        if match.group("glued") is not None:
            if any(c in match.group("num") for c in ".,eE"):
                continue
            number = _scaled(f"{match.group('num')}.{match.group('tail')}", 0)
        else:
            number = _scaled(match.group("num"), _PREFIX_EXPONENT[match.group("prefix") or ""])
        if number is None:
            return None
        found.append(Quantity(_signed(match.group("sign"), number), match.group(0)))
    return _only(found)


@_cached
def parse_current(text: str) -> Quantity | None:
    """Read a current in amperes: "20mA", "0.35A", "350 mA", "500µA"."""
    text = _squeeze(text)
    found = []
    for match in _CURRENT.finditer(text):
        number = _scaled(match.group("num"), _PREFIX_EXPONENT[match.group("prefix") or ""])
        if number is None:
            return None
        found.append(Quantity(number, match.group(0)))
    return _only(found)


@_cached
def parse_vf(text: str) -> tuple[Quantity, Quantity | None] | None:
    """Read an LED forward voltage and its test current: "3.0V@20mA"; "2.1V" gives no current."""
    match = _VF.fullmatch(text)
    if match is None:
        return None
    voltage = _whole(match.group("v"), _VOLTAGE, parse_voltage)
    if voltage is None or voltage.value <= 0:
        return None
    if match.group("i") is None:
        return voltage, None
    current = _whole(match.group("i"), _CURRENT, parse_current)
    return None if current is None else (voltage, current)


def _whole(text: str, pattern: re.Pattern[str], parse: Callable[[str], Quantity | None]) -> Quantity | None:
    """Parse text that must be exactly one quantity of the pattern's kind."""
    return parse(text) if pattern.fullmatch(text) else None


@_cached
def parse_thermal_resistance(text: str) -> Quantity | None:
    """Read a thermal resistance in K/W: "400K/W", "400 °C/W", or a bare "400"."""
    match = _THERMAL.fullmatch(text)
    if match is None:
        return None
    number = _finite(float(match.group("num").replace(",", ".")))  # a decimal comma, as _NUM allows
    return None if number is None else Quantity(number, text.strip())


@_cached
def parse_temperature(text: str) -> Quantity | None:
    """Read a temperature in degrees Celsius (not kelvin): "70°C", "70 C", "-40", "85 °C"."""
    match = _TEMPERATURE.fullmatch(text)
    if match is None:
        return None
    number = _finite(float(match.group("num").replace(",", ".")))  # a decimal comma, as _NUM allows
    return None if number is None else Quantity(_signed(match.group("sign"), number), text.strip())


_PREFIXES = ((1e9, "G"), (1e6, "M"), (1e3, "k"), (1.0, ""), (1e-3, "m"), (1e-6, "µ"), (1e-9, "n"), (1e-12, "p"))


def quantity(value: float, unit: str, digits: int = 3) -> str:
    """A value with an engineering prefix and three significant figures: 25.8 mA, 4.7 kΩ, 0.42 W."""
    if unit == "%":
        return f"{value * 100:.{digits}g} %"
    if unit in ("°C", "K/W", ""):
        return f"{value:.{digits}g}{' ' + unit if unit else ''}"
    if value == 0 or not math.isfinite(value):
        return f"{value:g} {unit}"
    mag = abs(value)
    for scale, prefix in _PREFIXES:
        if mag >= scale * (1 - 0.5 * 10.0 ** -digits):
            return f"{value / scale:.{digits}g} {prefix}{unit}"
    return f"{value:.{digits}g} {unit}"
