"""driver-headroom: a constant-current driver that cannot regulate over its input range.

What it flags
    A linear sink (an IC or a transistor) or a buck driver whose minimum input cannot cover
    the string's maximum forward voltage plus the sense voltage plus the regulator's dropout;
    a boost driver whose string needs more than its output limit, or less than its maximum
    input (a boost cannot step down).

Why it matters
    Out of regulation, a "constant-current" circuit is a poorly chosen resistor: the current
    follows the supply and the LEDs' Vf, exactly what the driver was bought to prevent. A
    boost whose input exceeds the string voltage passes current through its inductor and
    diode unregulated.

Example
    A linear sink with 0.2 V sense and 0.5 V dropout driving three white LEDs (3.4 V max each)
    from a 12 V ±10 % rail: 10.8 − (10.2 + 0.2 + 0.5) = −0.1 V. Error. Fixed: two strings of
    two LEDs, or a 15 V rail.

Fix
    Fewer LEDs per string, a higher input, a boost driver; for a boost, a string longer than
    the maximum input (or a buck-boost).

Formula
    linear, buck: V_in,min ≥ Σ Vf,max(I_set, T_cold) + V_sense + V_dropout.
    boost: Σ Vf,max ≤ V_out,max and Σ Vf,min > V_in,max.

Source
    The headroom of linear sinks and of buck and boost drivers is common practice: a boost
    output must stand a margin above the highest string voltage plus the sink's own headroom,
    and a buck or linear stage needs its input above the string plus sense and dropout
    (Kirchhoff's voltage law round the loop).
"""

from __future__ import annotations

from typing import Iterator

from ledlint.checks.findings import Finding, Severity, Value
from ledlint.parts.params import known
from ledlint.analysis.results import CurrentDriven
from ledlint.analysis.setpoints import DriverKind
from ledlint.circuits.circuit import CircuitKind
from ledlint.circuits.driver import DriverOutput
from ledlint.circuits.sink import CurrentSink
from ledlint.checks.registry import Rule, RuleContext
from ledlint.rules._support import circuit_assumptions, ids, led_assumptions


def check(ctx: RuleContext) -> Iterator[Finding]:
    for a in ctx.analyses:
        c = a.circuit
        if not isinstance(a, CurrentDriven):
            continue
        assert isinstance(c, (CurrentSink, DriverOutput))
        setc = a.set_current
        out = c.sink.transistor.ref if isinstance(c, CurrentSink) else c.driver.ref
        limits = dict(setc.limits)
        if setc.current.maximum <= 0:
            yield ctx.finding(a, Severity.ERROR, "{out} never conducts: {basis}, so {leds} stay dark",
                              values=(Value("current", 0.0, "A"),), out=out, basis=setc.basis, leds=ids(c.leds),
                              assumed=tuple(circuit_assumptions(a)),
                              hint="raise the reference above one V_BE (or V_GS) plus the sense voltage wanted")
            continue
        if "current_max" in limits and setc.current.maximum > limits["current_max"]:
            yield ctx.finding(a, Severity.ERROR, "{out} is set to up to {current}, above its current_max of {cmax}",
                              values=(Value("current", setc.current.maximum, "A", limits["current_max"], ">"),
                                      Value("cmax", limits["current_max"], "A")), out=out,
                              assumed=tuple(circuit_assumptions(a)),
                              hint="raise the sense resistor, or use a driver rated for the current")
        if a.supply is not None and setc.kind is not DriverKind.BOOST:
            v = a.supply.volts
            if "vin_min" in limits and v.minimum < limits["vin_min"]:
                yield ctx.finding(a, Severity.ERROR, "{out}'s input can fall to {vin}, below its vin_min of {limit}",
                                  values=(Value("vin", v.minimum, "V", limits["vin_min"], "<"),
                                          Value("limit", limits["vin_min"], "V")), out=out,
                                  assumed=tuple(circuit_assumptions(a)), hint="a higher input, or a driver for it")
            if "vin_max" in limits and v.maximum > limits["vin_max"]:
                yield ctx.finding(a, Severity.ERROR, "{out}'s input can reach {vin}, above its vin_max of {limit}",
                                  values=(Value("vin", v.maximum, "V", limits["vin_max"], ">"),
                                          Value("limit", limits["vin_max"], "V")), out=out,
                                  assumed=tuple(circuit_assumptions(a)), hint="a lower input, or a driver for it")
        strings = [sum(known(r.params.vf_max) for r in a.leds if r.id in {e.led for e in b.leds})
                   for b in c.branches if all(r.params.complete for r in a.leds)]
        assumed = tuple(x for r in a.leds for x in led_assumptions(r))[:6] + tuple(circuit_assumptions(a))
        if setc.kind is DriverKind.BOOST and strings:
            high = max(strings)
            low = min(sum(known(r.params.vf_min) for r in a.leds if r.id in {e.led for e in b.leds})
                      for b in c.branches)
            if "vout_max" in limits and high > limits["vout_max"]:
                yield ctx.finding(a, Severity.ERROR, "{out} (boost) cannot reach the string voltage: {leds} need up "
                                  "to {string}, its output limit is {vout}", values=(
                                      Value("string", high, "V", limits["vout_max"], ">"),
                                      Value("vout", limits["vout_max"], "V")), out=out, leds=ids(c.leds),
                                  assumed=assumed, hint="shorter strings, or a driver with a higher output limit")
            vin_max = limits.get("vin_max") or (a.supply.volts.maximum if a.supply else None)
            if vin_max is not None and low <= vin_max:
                yield ctx.finding(a, Severity.ERROR, "{out} (boost) cannot regulate: its input can reach {vin}, "
                                  "above the string's least voltage {string}; a boost cannot step down",
                                  values=(Value("vin", vin_max, "V"), Value("string", low, "V", vin_max, "<=")),
                                  out=out, assumed=assumed, hint="more LEDs per string, or a buck-boost driver")
            continue
        if a.headroom_v is None or a.headroom_v >= 0:
            continue
        assert a.supply is not None  # a headroom is worked out from a known supply
        need = a.supply.volts.minimum - a.headroom_v
        yield ctx.finding(
            a, Severity.ERROR, "{out} cannot hold its current: the input can fall to {vin}, but {who} needs {need} "
            "(string at maximum Vf and the coldest ambient, {cold}, plus {sense} sense and {dropout} dropout); "
            "short by {short}",
            values=(Value("vin", a.supply.volts.minimum, "V"), Value("need", need, "V"),
                    Value("short", -a.headroom_v, "V", 0.0, ">"), Value("sense", setc.sense_voltage.maximum, "V"),
                    Value("dropout", setc.dropout.maximum, "V")),
            out=out, who=(f"each of its {len(c.branches)} strings (such as {ids([e.id for e in c.branches[0].leds])})"
                          if len(c.branches) > 1 else f"the string {ids(c.leds)}"),
            cold=f"{a.engine[0].ambient.minimum:g} °C" if a.engine else "cold",
            assumed=assumed, hint="fewer LEDs per string, a higher input, or a boost driver")


RULE = Rule(
    id="driver-headroom",
    summary="constant-current driver or sink without the input voltage to regulate",
    severity=Severity.ERROR,
    check=check,
    doc=__doc__,
    kinds=(CircuitKind.SINK, CircuitKind.DRIVER),
)
