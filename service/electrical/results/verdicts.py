"""Verdicts, and the small integer codes the array path carries them in.

A verdict is ``pass``, ``fail`` or ``not-verified`` (the data cannot show compliance either way).
On arrays a verdict is a code, ordered so that the worse verdict has the larger code: the overall
verdict of several checks is then their maximum.
"""

from __future__ import annotations

from collections.abc import Iterable, Mapping
from enum import StrEnum
from typing import Any

import numpy as np


class Verdict(StrEnum):
    PASS = "pass"
    NOT_VERIFIED = "not-verified"
    FAIL = "fail"


VERDICTS: tuple[Verdict, ...] = tuple(Verdict)  # a code is the position here
PASS = np.int8(0)
NOT_VERIFIED = np.int8(1)
FAIL = np.int8(2)
CODE_OF = {v: np.int8(i) for i, v in enumerate(VERDICTS)}
COUNTED = (Verdict.PASS, Verdict.FAIL, Verdict.NOT_VERIFIED)  # the order summaries count them in


def summary(counted: Mapping[str, int], circuits: int) -> dict[str, int]:
    """A batch's summary: the circuits sent, how many came to each verdict, and the rest as ``invalid``."""
    counts = {str(v): int(counted.get(v, 0)) for v in COUNTED}
    return {"circuits": circuits, **counts, "invalid": circuits - sum(counts.values())}


def codes(values: Any) -> np.ndarray:
    """An int8 array of verdict codes from an array of conditions or codes (a scalar is broadcast by numpy)."""
    return np.asarray(values, dtype=np.int8)


def where(condition: Any, if_true: Any, if_false: Any) -> np.ndarray:
    """``np.where`` for verdict codes, keeping the int8 type."""
    return np.where(condition, if_true, if_false).astype(np.int8, copy=False)


def decode(values: np.ndarray) -> list[Verdict]:
    """The verdicts of an array of codes."""
    return [VERDICTS[c] for c in np.asarray(values).tolist()]


def overall(verdicts: Iterable[str]) -> Verdict:
    """``fail`` if any verdict fails, else ``not-verified`` if any is, else ``pass``."""
    worst = PASS
    for v in verdicts:
        worst = max(worst, CODE_OF[Verdict(v)])
    return VERDICTS[worst]
