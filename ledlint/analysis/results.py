"""What the analysis says of each circuit: one result type per outcome and kind, with only the
fields that outcome has. Rules and the circuit summary read these; nothing here computes."""

from __future__ import annotations

from dataclasses import dataclass
from enum import Enum
from typing import TYPE_CHECKING, ClassVar

from ledlint.analysis.setpoints import SetCurrent
from ledlint.analysis.supplies import Supply
from ledlint.analysis.switching import SwitchDrive
from ledlint.circuits.circuit import LedCircuit
from ledlint.netlist.model import Netlist, Pin
from ledlint.parts.kinds import LedId
from ledlint.parts.params import LedParams, Missing, Param, ResistorParams
from ledlint.quantities.ranges import Range

if TYPE_CHECKING:  # the engine (and numpy) load only where circuits are solved
    from ledlint.engine.model import Circuit as EngineCircuit


@dataclass(frozen=True)
class LedResult:
    id: LedId
    params: LedParams
    current: Range  # A over the corners (nominal, least, most)
    vf: float  # V at the nominal corner
    tj_max: float  # °C
    reverse_v: float = 0.0  # the most reverse voltage it can see, ≥ 0
    low: float = 0.0  # A at the low corner (least supply, most resistance, every LED at Vf max, cold)


class ResistorRole(Enum):
    BALLAST = "ballast"  # sets a voltage-driven string's current
    BALANCING = "balancing"  # evens the split between parallel strings
    SENSE = "sense"  # a current sink's or driver's feedback resistor


@dataclass(frozen=True)
class ResistorResult:
    ref: str
    params: ResistorParams
    role: ResistorRole
    current_max: float
    power_max: float  # W at its worst corner
    ambient_max: float


@dataclass(frozen=True)
class PinResult:
    pin: Pin
    limit: Param
    current_max: float
    sourcing: bool
    base: SwitchDrive | None = None  # the pin drives a switch's base rather than the LEDs themselves


@dataclass(frozen=True)
class Sharing:
    """How strings in parallel share: Monte Carlo and the hogging corners."""

    samples: int
    seed: int  # of its random draws: a re-run with the same seed and circuit gives the same split
    spread_p99: float  # (max − min)/mean of the per-sample split, 99th percentile
    worst_led: LedId
    worst_current: float  # A, the most any one LED reaches in any sample or corner
    equal_share: float  # A, total / strings at nominal


@dataclass(frozen=True)
class Analysis:
    """A circuit the analysis did not compute: a kind it does not analyse (addressable,
    multiplexed, not fitted, unrecognised). The base of every result."""

    solved: ClassVar[bool] = False
    circuit: LedCircuit
    missing: tuple[Missing, ...] = ()  # what kept it, or one of its checks, from being computed
    gaps: tuple[Missing, ...] = ()  # what one check lacks while the rest ran (an LED's unknown If_max)
    rail: str = ""  # the rail net the current comes from (a driver pin's: its IC's supply)


@dataclass(frozen=True)
class Incomplete(Analysis):
    """An analysable circuit that lacks a value the board does not give."""

    supply: Supply | None = None
    set_current: SetCurrent | None = None
    assumptions: tuple[str, ...] = ()
    unlimited: bool = False  # nothing limits the current whatever the missing value is
    ambiguity: str = ""  # why an LED's type, and so its Vf, is uncertain


@dataclass(frozen=True)
class Computed(Analysis):
    """A circuit with computed figures."""

    solved: ClassVar[bool] = True
    supply: Supply | None = None
    leds: tuple[LedResult, ...] = ()
    resistors: tuple[ResistorResult, ...] = ()
    assumptions: tuple[str, ...] = ()
    ambient_basis: str = ""  # the ambient range the corners span, and where it comes from

    @property
    def reversed(self) -> bool:
        """The supply is never positive across it: fitted or powered backwards."""
        return self.supply is not None and self.supply.volts.maximum <= 0


@dataclass(frozen=True)
class Blocked(Computed):
    """A string with a part facing against the rest: it never conducts, and its LEDs see the
    reverse voltages here."""


@dataclass(frozen=True)
class Driven(Computed):
    """An operating point over the corners: per-LED currents, resistor dissipation, headroom."""

    engine: tuple[EngineCircuit, ...] = ()  # the engine's circuits, one per string lit alone or one in all
    pins: tuple[PinResult, ...] = ()
    nominal_current: float = 0.0  # per LED (a bank: the equal share)
    headroom_v: float | None = None
    ambiguity: str = ""
    sharing: Sharing | None = None  # strings in parallel: how they split


@dataclass(frozen=True)
class VoltageDriven(Driven):
    """A string or bank fed from a voltage through resistors."""

    min_ratio: float = 1.0  # least current at the low corner / nominal, worst LED
    loop_gain: float | None = None
    unlimited: bool = False
    drives: tuple[SwitchDrive, ...] = ()  # the pins that switch its transistors


@dataclass(frozen=True)
class StringResult(VoltageDriven):
    """A series string's operating point."""


@dataclass(frozen=True)
class BankResult(VoltageDriven):
    """A shared-resistor bank's operating point, with its split when the strings are lit together."""


@dataclass(frozen=True, kw_only=True)
class CurrentDriven(Driven):
    """Strings on a current output: the set-point and how the strings share it."""

    set_current: SetCurrent


@dataclass(frozen=True, kw_only=True)
class SinkResult(CurrentDriven):
    """A transistor current sink's operating point."""


@dataclass(frozen=True, kw_only=True)
class DriverResult(CurrentDriven):
    """A driver output's operating point."""


@dataclass(frozen=True)
class BoardAnalysis:
    netlist: Netlist
    circuits: tuple[LedCircuit, ...]
    analyses: tuple[Analysis, ...]
    cautions: tuple[str, ...]  # safety: mains or high voltage seen on the board
