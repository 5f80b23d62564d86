"""What both file checks share: their exit statuses and the progress bar on standard error."""

from __future__ import annotations

import time
from typing import TextIO

from service.electrical.results.verdicts import Verdict

SHOWN_FROM = 2000  # the bar shows from this many circuits

EXIT_PASS, EXIT_FAIL, EXIT_UNREADABLE, EXIT_INVALID, EXIT_NOT_VERIFIED = 0, 1, 2, 3, 4


def exit_status(counts: dict[str, int]) -> int:
    """0 only when every circuit passes; 1 any fails; else 3 some could not be checked; else 4 some not-verified."""
    if counts[Verdict.FAIL]:
        return EXIT_FAIL
    if counts["invalid"]:
        return EXIT_INVALID
    if counts[Verdict.NOT_VERIFIED]:
        return EXIT_NOT_VERIFIED
    return EXIT_PASS


class Progress:
    """A bar on standard error when it is a terminal; silent otherwise."""

    def __init__(self, total: int | None, stream: TextIO):
        """``total`` None: not known beforehand (a JSON file read incrementally): the count and rate only."""
        self.total, self.stream = total, stream
        self.shown = stream.isatty() and (total is None or total >= SHOWN_FROM)
        self.started = time.monotonic()

    def update(self, done: int) -> None:
        if not self.shown:
            return
        rate = done / max(time.monotonic() - self.started, 1e-9)
        if self.total is None:
            self.stream.write(f"\r{done} circuits, {rate:,.0f}/s")
            self.stream.flush()
            return
        width = 30
        filled = int(width * done / max(self.total, 1))
        self.stream.write(f"\r[{'#' * filled}{'.' * (width - filled)}] {done}/{self.total} circuits, {rate:,.0f}/s")
        self.stream.flush()
        if done >= self.total:
            self.stream.write("\n")

    def close(self) -> None:
        if self.shown and self.total is None:
            self.stream.write("\n")
