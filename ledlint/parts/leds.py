"""Built-in LED technologies (typical Vf, spread, ratings, model constants) and colour inference.

Values are from ../shared/field-facts.md §5 with the marker given there. They are defaults for
a part whose schematic says only its colour; a `Vf`, `If_max` or `Rth` field always wins.
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from functools import lru_cache

# Parsed once per distinct text: a board repeats the same values and footprints many times over.
_cached = lru_cache(maxsize=8192)

TEST_CURRENT = 0.020  # A: the usual datasheet test current for indicator LEDs (field-facts §5a)
VR_MAX = 5.0  # V: the usual reverse-voltage rating, the IR leakage test condition (§5b)
SPREAD = 0.10  # when only a typical Vf is known, min and max are typical ∓10 % (a design choice)


@dataclass(frozen=True)
class Technology:
    """An LED technology as the trade's tables give it."""

    name: str  # as shown in reports, e.g. "red (AlInGaP)"
    vf_typ: float  # V at TEST_CURRENT, 25 °C
    vf_max: float
    tc: float  # dVf/dT at constant current, V/K
    n: float  # ideality factor for the Shockley fit


# Vf typ / max at 20 mA. Sources (field-facts.md): robot.lk "5mm LED typical technical data"
# table [published] for red, yellow and GaP green; InGaN green and blue [from memory]; white
# [published: distributor 5 mm white LED datasheet, 3.00 typ / 3.40 max]; orange [from memory];
# infrared [from memory: 940 nm ≈ 1.2-1.4 V at 20 mA]. Temperature coefficients: −2 mV/K as the
# general default (common practice, within the published −1.5…−4 mV/K range), −3 mV/K for
# InGaN (Khanna, Fundamentals of Solid-State Lighting, eq. 14.1). Ideality: n ≈ 2 for AlInGaP,
# GaAsP and GaP, and within 2-7 for InGaN (Shah et al., J. Appl. Phys. 94, 2627), taken as 3.
TECHNOLOGIES: dict[str, Technology] = {
    "infrared": Technology("infrared", 1.30, 1.60, -0.0015, 2.0),
    "red": Technology("red", 1.85, 2.50, -0.002, 2.0),
    "orange": Technology("orange", 2.05, 2.50, -0.002, 2.0),
    "yellow": Technology("yellow", 2.10, 2.50, -0.002, 2.0),
    "green (GaP)": Technology("green (GaP)", 2.20, 2.50, -0.002, 2.0),
    "green (InGaN)": Technology("green (InGaN)", 3.20, 3.80, -0.003, 3.0),
    "blue": Technology("blue", 3.20, 3.60, -0.003, 3.0),
    "white": Technology("white", 3.00, 3.40, -0.003, 3.0),
    "ultraviolet": Technology("ultraviolet", 3.40, 4.00, -0.003, 3.0),
}
# "Green" alone does not say which: GaP (≈2.2 V) and InGaN (≈3.2 V) are both common.
AMBIGUOUS_GREEN = "green"

# Small indicator packages: DC forward current ratings of 20-30 mA are typical (field-facts §5b,
# published: 3 mm green 20 mA, 5 mm white 25 mA, red/yellow 30 mA, 0805 20-25 mA), and a
# junction-to-ambient thermal resistance of about 400 K/W (field-facts §5b: T-1¾ lamps at
# 412 and 618 K/W; rounded down, a design choice).
INDICATOR_IF_MAX = (0.020, 0.030)
INDICATOR_RTH = 400.0
_INDICATOR_FOOTPRINT = re.compile(
    r"(?<![0-9])(0402|0603|0805|1206|1005|1608|2012|3216)(?![0-9])|LED_D[0-9.]+mm|[35]mm|PLCC-?2(?![0-9])|"
    r"SOD-?123|SOD-?323|0603D|T-?1",
    re.I,
)

_TOKEN = re.compile(r"[A-Za-z]+|[0-9]{3}\s?nm", re.I)
_WORDS: tuple[tuple[str, frozenset[str]], ...] = (
    ("infrared", frozenset({"infrared", "ir"})),
    ("ultraviolet", frozenset({"ultraviolet", "uv"})),
    ("white", frozenset({"white", "wht", "wh"})),
    ("blue", frozenset({"blue", "blu"})),
    ("yellow", frozenset({"yellow", "yel", "ylw", "amber", "amb"})),
    ("orange", frozenset({"orange", "org", "orn"})),
    ("red", frozenset({"red", "rd"})),
    (AMBIGUOUS_GREEN, frozenset({"green", "grn", "gn"})),
)
_INGAN_HINTS = re.compile(r"ingan|true\s*green|pure\s*green|emerald|5[0-3][0-9]\s?nm", re.I)
_GAP_HINTS = re.compile(r"(?<![a-z])gap(?![a-z])|yellow[\s-]*green|5[5-7][0-9]\s?nm|algainp|alingap", re.I)
_DIE_COLOURS = {"R": "red", "G": "green (InGaN)", "B": "blue", "W": "white", "Y": "yellow", "O": "orange",
                "IR": "infrared", "UV": "ultraviolet", "WW": "white", "CW": "white"}


def _wavelength(text: str) -> str | None:
    m = re.search(r"(?<![0-9])([3-9][0-9]{2})\s?nm", text, re.I)
    if not m:
        return None
    nm = int(m.group(1))
    # Visible bands (Wikipedia "Light-emitting diode" colour table, via field-facts §5a).
    for upper, name in ((400, "ultraviolet"), (500, "blue"), (535, "green (InGaN)"), (575, "green (GaP)"),
                        (597, "yellow"), (615, "orange"), (760, "red")):
        if nm < upper:
            return name
    return "infrared"


@_cached
def colour_from_text(text: str) -> str | None:
    """The technology a part's words name ('red', 'green (GaP)', 'green', …), or None.

    Two different colours in the text (a bicolour part, or a description that names several)
    give None: the text does not say which die this is.
    """
    by_wavelength = _wavelength(text)
    if by_wavelength:
        return by_wavelength
    if re.search(r"yellow[\s-]*green", text, re.I):
        return "green (GaP)"  # "yellow-green" names one colour, the GaP green
    tokens = {t.lower() for t in _TOKEN.findall(text)}
    found = {name for name, words in _WORDS if tokens & words}
    if len(found) != 1:
        return None
    colour = found.pop()
    if colour == AMBIGUOUS_GREEN:
        if _INGAN_HINTS.search(text):
            return "green (InGaN)"
        if _GAP_HINTS.search(text):
            return "green (GaP)"
    return colour


def die_colour(die_name: str) -> str | None:
    """The colour a multi-die package's die name stands for (R, G, B, ...)."""
    return _DIE_COLOURS.get(die_name.upper())


@_cached
def is_indicator_footprint(footprint: str) -> bool:
    """A small indicator package (chip 0402-1206, 3 mm / 5 mm through-hole, PLCC-2)."""
    return bool(_INDICATOR_FOOTPRINT.search(footprint.split(":")[-1]))


def series_resistance(current_rating: float) -> float:
    """Series resistance for the diode model, scaled to the part's current rating.

    0.2 V at the rated current reproduces the recalled ranges of field-facts §5c: indicator
    LEDs ≈ 5-20 Ω (10 Ω at 20 mA), 1 W class ≈ 0.3-1.5 Ω (0.57 Ω at 350 mA) [from memory].
    A low-current LED (rated 2 mA) is an indicator die run gently, not a more resistive one, so
    ratings under 20 mA keep the indicator's 10 Ω.
    """
    return 0.2 / max(current_rating, 0.020)
