"""Wrong API keys slow their client down: after a set number of wrong keys within a window, that client's requests
wait (429 with Retry-After) until the window has passed, so keys cannot be guessed at the server's speed.

Counted per client address in each worker (a shared store or the ingress counts across workers and replicas); the
table of clients is bounded, the oldest dropped first.
"""

from __future__ import annotations

import re
import threading
import time
from collections import OrderedDict

UNITS = {"second": 1.0, "minute": 60.0, "hour": 3600.0}
MAX_CLIENTS = 10_000


def parse(rule: str) -> tuple[int, float]:
    """'10/minute' -> (10, 60.0)."""
    match = re.fullmatch(r"\s*(\d+)\s*/\s*(second|minute|hour)\s*", rule)
    if match is None:
        raise ValueError(f"FAULTPATH_KEY_FAILURES is like 10/minute, not {rule!r}")
    return int(match.group(1)), UNITS[match.group(2)]


class KeyFailures:
    """Wrong keys per client within a window."""

    def __init__(self, rule: str):
        self.allowed, self.window_s = parse(rule)
        self._seen: OrderedDict[str, list[float]] = OrderedDict()
        self._lock = threading.Lock()

    def _recent(self, client: str, now: float) -> list[float]:
        times = [t for t in self._seen.get(client, []) if now - t < self.window_s]
        if times:
            self._seen[client] = times
            self._seen.move_to_end(client)
        else:
            self._seen.pop(client, None)
        return times

    def wait_s(self, client: str) -> float:
        """How long the client must wait before its key is looked at again (0: not at all)."""
        now = time.monotonic()
        with self._lock:
            times = self._recent(client, now)
            if len(times) < self.allowed:
                return 0.0
            return max(self.window_s - (now - times[-self.allowed]), 1.0)

    def failed(self, client: str) -> None:
        now = time.monotonic()
        with self._lock:
            times = self._recent(client, now)
            times.append(now)
            self._seen[client] = times
            self._seen.move_to_end(client)
            while len(self._seen) > MAX_CLIENTS:
                self._seen.popitem(last=False)
