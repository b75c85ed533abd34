"""Batch solving: run many analyses as coroutines and solve what they ask for together.

An analysis that needs the engine yields a list of requests, (engine circuit, whether its loop
gain is wanted), and is sent back the answers, (its Corners, its loop gain or None). Collecting
every waiting analysis's requests before solving lets the engine solve each circuit shape once
for the whole board. A circuit the engine cannot model fails only the analysis that asked.
"""

from __future__ import annotations

from collections.abc import Callable, Generator
from typing import TypeVar, Union

from ledlint.engine import Circuit, Corners, LoopGain, ModelError, corners_many, loop_gains_many

T = TypeVar("T")
Request = tuple[Circuit, bool]
Answer = tuple[Corners, Union[float, None]]
Job = Generator[list[Request], list[Answer], T]


def solve_all(items: list[T | Job[T]], unmodelled: Callable[[int, ModelError], T]) -> list[T]:
    """Each item finished: those already done as they are, the coroutines run to their end.

    `unmodelled(i, error)` is what item i becomes when the engine cannot model a circuit it asked for.
    """
    done: dict[int, T] = {}
    waiting: dict[int, tuple[Job[T], list[Request]]] = {}

    def advance(i: int, g: Job[T], answer: list[Answer] | None) -> None:
        try:
            waiting[i] = (g, g.send(answer) if answer is not None else next(g))
        except StopIteration as stop:
            done[i] = stop.value
        except ModelError as exc:
            done[i] = unmodelled(i, exc)

    for i, item in enumerate(items):
        if isinstance(item, Generator):
            advance(i, item, None)
        else:
            done[i] = item
    while waiting:
        batch = list(waiting.items())
        waiting.clear()
        cors = _corners([ec for _, (_, reqs) in batch for ec, _ in reqs])
        with_gain = list(dict.fromkeys(ec for _, (_, reqs) in batch for ec, g in reqs if g))
        gains = dict(zip(with_gain, (None if lg is None else lg.gain for lg in _loop_gains(with_gain))))
        for i, (g, reqs) in batch:
            answers: list[Answer] = []
            for ec, want in reqs:
                solved = cors[ec]
                if isinstance(solved, ModelError):
                    done[i] = unmodelled(i, solved)
                    break
                answers.append((solved, gains.get(ec) if want else None))
            else:
                advance(i, g, answers)
    return [done[i] for i in range(len(items))]


def _corners(circuits: list[Circuit]) -> dict[Circuit, Corners | ModelError]:
    try:
        return dict(zip(circuits, corners_many(circuits)))
    except ModelError:  # find the culprit: one bad group must not lose the rest
        out: dict[Circuit, Corners | ModelError] = {}
        for ec in dict.fromkeys(circuits):
            try:
                out[ec] = corners_many([ec])[0]
            except ModelError as exc:
                out[ec] = exc
        return out


def _loop_gains(circuits: list[Circuit]) -> list[LoopGain | None]:
    try:
        return list(loop_gains_many(circuits))
    except ModelError:  # one bad group must not lose the rest: fall back circuit by circuit
        out: list[LoopGain | None] = []
        for ec in circuits:
            try:
                out.append(loop_gains_many([ec])[0])
            except ModelError:
                out.append(None)
        return out
