"""A time budget for each rule: a rule that runs too long is abandoned, never waited on forever.

The rules of a review run one after another on a daemon worker thread while the engine waits
for them with a timeout. Why a thread and not a measured call: a measured call can only notice
afterwards that a rule was slow; a rule stuck in an endless loop, or blocked inside C code,
would never return and the review would hang.

The whole list goes to the worker in one hand-off, and each function's start time is recorded
as it begins; the engine wakes only when the list is done or when the running function passes
its budget. So a normal review pays one thread hand-off (tens of microseconds), not one per
rule. When a function is over its budget:

- the engine stops waiting: that function's outcome is :class:`RuleTimeout`, and the engine
  reports the rule ``unassessed`` with the error, so the review is ``incomplete`` and can never
  be ``go`` because of it;
- the worker is abandoned (daemon threads do not keep the process alive) and a fresh one runs
  the functions that remain, so nothing else is lost;
- on CPython the abandoned worker is also sent an asynchronous :class:`RuleAbandoned`, which
  ends a pure-Python loop at its next bytecode; a rule blocked inside C code (a socket, a
  sleep) ends only when that call returns. Rules must do no I/O, so this is the rare case.

A budget of 0 runs the functions inline, unfenced against hanging (for stepping through a rule
in a debugger). Whatever a function raises, inline or on the worker, is its outcome, including
``SystemExit``, ``KeyboardInterrupt``, ``GeneratorExit`` or any other ``BaseException`` a rule
raises itself: none of them can end the review, let alone end the program with status 0. (A
Ctrl-C is delivered to the main thread, which waits for the worker, so it still stops a run.)

Besides each rule's budget, the whole list has one (:data:`DEFAULT_REVIEW_BUDGET_S`): when it
runs out, the running function is abandoned and the ones not yet started are not run; each
gets :class:`ReviewTimeout` as its outcome.

While rules run (and packs load, see :func:`stdout_to_stderr`) ``sys.stdout`` is pointed at
stderr, so a rule that prints cannot put text into a review written to stdout.
"""

from __future__ import annotations

import contextlib
import io
import queue
import sys
import threading
import time
from collections.abc import Callable, Iterator, Sequence
from dataclasses import dataclass

#: Seconds a rule may run when the profile sets no ``rule_time_budget``.
DEFAULT_BUDGET_S = 2.0
#: Seconds all the rules of one review may take together (a profile may set its own later).
DEFAULT_REVIEW_BUDGET_S = 60.0


class ReviewTimeout(Exception):
    """The review's whole time budget ran out before this rule finished (or started)."""

    def __init__(self, budget_s: float) -> None:
        super().__init__(budget_s)
        self.budget_s = budget_s

    def __str__(self) -> str:
        return (
            f"the review ran out of its whole time budget of {self.budget_s:g} s "
            "before this rule finished"
        )


class _Stderr(io.TextIOBase):
    """What ``sys.stdout`` is while rules run: writes go to stderr; closing it does nothing,
    so a rule cannot close the real stderr through it."""

    def write(self, text: str) -> int:
        return sys.stderr.write(text)

    def flush(self) -> None:
        sys.stderr.flush()

    def writable(self) -> bool:
        return True

    def close(self) -> None:
        pass


@contextlib.contextmanager
def stdout_to_stderr() -> Iterator[None]:
    """Keep stdout for the review: anything printed meanwhile (by a pack loading, a rule
    running) goes to stderr instead. Text written to file descriptor 1 directly is not
    caught; rules must do no I/O at all."""
    saved = sys.stdout
    with contextlib.suppress(Exception):
        saved.flush()
    sys.stdout = _Stderr()
    try:
        yield
    finally:
        sys.stdout = saved


class RuleTimeout(Exception):
    """The rule did not finish within its time budget."""

    def __init__(self, budget_s: float) -> None:
        super().__init__(budget_s)
        self.budget_s = budget_s

    def __str__(self) -> str:
        return f"the rule did not finish within its time budget of {self.budget_s:g} s"


class RuleAbandoned(BaseException):
    """Raised inside an abandoned rule to end it; a BaseException so ``except Exception`` in a
    rule cannot swallow it."""


@dataclass(frozen=True)
class Outcome:
    """What one function gave: its value, or the exception it raised (or RuleTimeout)."""

    value: object = None
    error: BaseException | None = None


def _call(function: Callable[[], object]) -> Outcome:
    """``function()`` inline; whatever it raises is its outcome (see the module docstring)."""
    try:
        return Outcome(function())
    except BaseException as exc:  # noqa: BLE001 - handed back to the engine, which fences it
        return Outcome(error=exc)


def _call_on_worker(function: Callable[[], object]) -> Outcome:
    """As :func:`_call`, but a rule's SystemExit is an outcome too; RuleAbandoned ends the
    worker."""
    try:
        return Outcome(function())
    except RuleAbandoned:
        raise
    except BaseException as exc:  # noqa: BLE001 - handed back to the engine, which fences it
        return Outcome(error=exc)


class _Batch:
    """Functions run in order by one worker; ``current`` is (index, start) of the running one."""

    def __init__(self, functions: Sequence[Callable[[], object]]) -> None:
        self.functions = functions
        self.outcomes: list[Outcome] = []
        self.lock = threading.Lock()  # completing a function and abandoning it exclude each other
        self.abandoned = False
        self.current = (0, time.monotonic())
        self.done = threading.Lock()  # held until the batch ends: cheaper than an Event
        self.done.acquire()

    def run(self) -> None:
        for index, function in enumerate(self.functions):
            outcome = _call_on_worker(function)
            with self.lock:
                if self.abandoned:
                    return
                self.outcomes.append(outcome)
                self.current = (index + 1, time.monotonic())
        self.done.release()

    def abandon_if_stuck(self, seen: tuple[int, float]) -> bool:
        """Give up on the running function if it is still the one seen at its deadline."""
        with self.lock:
            if self.current == seen:
                self.abandoned = True
        return self.abandoned


class _Worker(threading.Thread):
    def __init__(self) -> None:
        super().__init__(name="firstride-rule", daemon=True)
        self.jobs: queue.SimpleQueue[_Batch] = queue.SimpleQueue()
        self.batch: _Batch | None = None

    def run(self) -> None:
        try:
            while True:
                self.batch = self.jobs.get()
                self.batch.run()
                if self.batch.abandoned:
                    return
        except BaseException:  # noqa: BLE001 - RuleAbandoned arriving between rules: just end
            return


_idle: list[_Worker] = []
_idle_lock = threading.Lock()


def _take_worker() -> _Worker:
    with _idle_lock:
        if _idle:
            return _idle.pop()
    worker = _Worker()
    worker.start()
    return worker


def _give_back(worker: _Worker) -> None:
    with _idle_lock:
        _idle.append(worker)


def _interrupt(worker: _Worker) -> None:
    """Best effort: raise RuleAbandoned inside the worker (CPython only)."""
    import ctypes  # only for a rule over its budget: not imported on every review

    try:
        set_async_exc = ctypes.pythonapi.PyThreadState_SetAsyncExc
    except AttributeError:  # not CPython
        return
    if worker.ident is not None and worker.is_alive():
        set_async_exc(ctypes.c_ulong(worker.ident), ctypes.py_object(RuleAbandoned))


def call_each_with_budget(
    functions: Sequence[Callable[[], object]],
    budget_s: float,
    total_s: float | None = DEFAULT_REVIEW_BUDGET_S,
) -> list[Outcome]:
    """Each function in order, each within ``budget_s`` seconds and all of them within
    ``total_s`` (None or 0: no total); one outcome per function."""
    end = None if not total_s or total_s <= 0 else time.monotonic() + total_s
    if budget_s <= 0:
        inline: list[Outcome] = []
        for index, function in enumerate(functions):
            if end is not None and time.monotonic() >= end:
                return inline + _out_of_time(len(functions) - index, total_s)
            inline.append(_call(function))
        return inline
    outcomes: list[Outcome] = []
    remaining = list(functions)
    while remaining:
        if end is not None and time.monotonic() >= end:
            return outcomes + _out_of_time(len(remaining), total_s)
        batch = _Batch(remaining)
        worker = _take_worker()
        worker.jobs.put(batch)
        while True:
            seen = batch.current
            deadline = seen[1] + budget_s if end is None else min(seen[1] + budget_s, end)
            wait = deadline - time.monotonic()
            if batch.done.acquire(timeout=max(wait, 0.0)):
                _give_back(worker)
                return outcomes + batch.outcomes
            if wait <= 0 and batch.abandon_if_stuck(seen):
                break
        _interrupt(worker)
        stuck = seen[0]
        outcomes += batch.outcomes[:stuck]
        if end is not None and deadline >= end:  # the whole review's budget ran out
            return outcomes + _out_of_time(len(remaining) - stuck, total_s)
        outcomes.append(Outcome(error=RuleTimeout(budget_s)))
        remaining = remaining[stuck + 1 :]
    return outcomes


def _out_of_time(count: int, total_s: float | None) -> list[Outcome]:
    return [Outcome(error=ReviewTimeout(total_s or 0.0)) for _ in range(count)]


def call_with_budget(function: Callable[[], object], budget_s: float) -> object:
    """``function()`` within ``budget_s`` seconds: its value, its exception, or RuleTimeout."""
    (outcome,) = call_each_with_budget([function], budget_s)
    if outcome.error is not None:
        raise outcome.error
    return outcome.value
