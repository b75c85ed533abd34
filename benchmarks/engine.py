"""Time the engine's Monte Carlo on a 100-LED shared-resistor bank, and ngspice on the same samples.

Run: python benchmarks/engine.py [--spice-samples N]. Prints what it measured; asserts nothing.
"""

from __future__ import annotations

import argparse
import time

import numpy as np

from ledlint.engine import Branch, Circuit, LedSpec, Range, monte_carlo
from ledlint.engine.spice import deck, ngspice_available, run_ngspice

SAMPLES = 10_000
LEDS = 100


def bank(rth: float | None) -> Circuit:
    """Demo board: 100 indicator LEDs (Vf 2.0 V ±5 % at 20 mA) in parallel behind one 3.3 ohm
    resistor on a 5 V ±5 % rail, ambient 0-50 °C."""
    led = LedSpec(vf=Range.tolerance(2.0, 0.05), i_test=0.02, n=2.0, r_s=5.0, tc=-0.002, rth=rth)
    return Circuit(branches=tuple(Branch((led,)) for _ in range(LEDS)),
                   supply=Range.tolerance(5.0, 0.05), r_series=Range.tolerance(3.3, 0.05),
                   ambient=Range(25.0, 0.0, 50.0))


def best_time(circuit: Circuit, runs: int) -> float:
    times = []
    for seed in range(runs):
        start = time.perf_counter()
        monte_carlo(circuit, SAMPLES, seed=seed)
        times.append(time.perf_counter() - start)
    return min(times)


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--spice-samples", type=int, default=100,
                        help="samples to run through ngspice, one deck each (default 100; 10000 runs "
                             "them all, about four minutes here)")
    args = parser.parse_args()

    plain, heated = bank(None), bank(400.0)
    monte_carlo(plain, 100)  # first touch of numpy's code paths, not timed
    t_plain = best_time(plain, 5)
    t_heated = best_time(heated, 3)
    print(f"engine: {SAMPLES} Monte Carlo samples of a {LEDS}-LED shared-resistor bank")
    print(f"  without self-heating: {t_plain:.3f} s (best of 5), {t_plain / SAMPLES * 1e6:.1f} us/sample")
    print(f"  with self-heating (Rth 400 K/W): {t_heated:.3f} s (best of 3)")

    if not ngspice_available():
        print("ngspice: not on PATH, comparison skipped")
        return
    mc = monte_carlo(plain, SAMPLES, seed=0)
    n = min(args.spice_samples, SAMPLES)
    worst = 0.0
    start = time.perf_counter()
    for s in range(n):
        spice = run_ngspice(deck(plain, mc.cases, s))
        engine = mc.solution.branch_current[s]
        worst = max(worst, float(np.max(np.abs(np.array(spice.branch_current) / engine - 1.0))))
    t_spice = time.perf_counter() - start
    per_sample = t_spice / n
    every = n == SAMPLES
    print(f"ngspice: {'all' if every else f'the first {n} of'} the same samples, one deck and one `ngspice -b` "
          f"run each (deck writing included)")
    print(f"  measured {t_spice:.2f} s, {per_sample * 1e3:.1f} ms/sample"
          + ("" if every else f"; extrapolated to {SAMPLES}: {per_sample * SAMPLES:.0f} s"))
    print(f"  largest relative difference in a branch current, engine vs ngspice: {worst:.2e}")
    print(f"ratio (ngspice {'measured' if every else 'extrapolated'} / engine without self-heating): "
          f"{per_sample * SAMPLES / t_plain:.0f}x")


if __name__ == "__main__":
    main()
