"""Concurrent single checks served together: a short collection window in a threaded worker.

The core's cost for one circuit is mostly numpy's cost per call, which is the same for one circuit or
fifty. Where several single checks are in flight in one worker (threads), the first to arrive waits a
short window (``FAULTPATH_COALESCE_MS``), takes every check that arrived meanwhile and runs them through
the core as one set of arrays; each request gets its own result. A check alone in the worker is run at
once, without waiting. The answer of each request is exactly what it would have been alone.
"""

from __future__ import annotations

import threading
import time
from collections.abc import Callable, Sequence
from dataclasses import dataclass, field
from typing import Any

from service.electrical.inputs import Circuit, Supply
from service.electrical.pipeline import check_circuits

MAX_BATCH = 64


@dataclass
class _Waiting:
    supply: Supply
    circuit: Circuit
    scope: tuple[str, ...] | None
    done: threading.Event = field(default_factory=threading.Event)
    result: Any = None
    error: BaseException | None = None


class Coalescer:
    """Single checks of one worker, gathered for ``window_s`` while others are in flight."""

    def __init__(self, window_s: float, counted: Callable[[int, float], None] | None = None):
        self.window_s = window_s
        self.counted = counted  # told each run's size and CPU seconds (the app's metrics)
        self.lock = threading.Lock()
        self.pending: list[_Waiting] = []
        self.in_flight = 0
        self.gathering = False
        self.batches = 0  # how many runs served more than one request (for the bench and the tests)

    def check(self, supply: Supply, circuit: Circuit, scope: Sequence[str] | None) -> Any:
        """The result (or failure) of one circuit, computed with whatever else arrives in the window."""
        item = _Waiting(supply, circuit, None if scope is None else tuple(scope))
        with self.lock:
            self.in_flight += 1
            self.pending.append(item)
            lead = not self.gathering
            if lead:
                self.gathering = True
            alone = self.in_flight == 1
        try:
            if lead:
                if not alone and self.window_s > 0:
                    time.sleep(self.window_s)  # the others in flight join the batch meanwhile
                with self.lock:
                    taken, self.pending, self.gathering = self.pending, [], False
                for start in range(0, len(taken), MAX_BATCH):
                    batch = taken[start : start + MAX_BATCH]
                    _run(batch, self.counted)
                    self.batches += len(batch) > 1
            item.done.wait()
        finally:
            with self.lock:
                self.in_flight -= 1
        if item.error is not None:
            raise item.error
        return item.result


def _run(batch: list[_Waiting], counted: Callable[[int, float], None] | None) -> None:
    """One core run per scope among the batch; every waiting request is told its own answer."""
    by_scope: dict[tuple[str, ...] | None, list[_Waiting]] = {}
    for item in batch:
        by_scope.setdefault(item.scope, []).append(item)
    for scope, items in by_scope.items():
        started = time.thread_time()
        try:
            results = check_circuits([i.supply for i in items], [i.circuit for i in items], scope)
        except BaseException as err:  # every request of the run answers with the error (a 500, logged once each)
            for i in items:
                i.error = err
                i.done.set()
            continue
        if counted is not None:
            counted(len(items), time.thread_time() - started)
        for i, result in zip(items, results, strict=True):
            i.result = result
            i.done.set()
