"""What every check step returns: a small set of arrays, one value per circuit."""

from __future__ import annotations

from collections.abc import Callable, Mapping, Sequence
from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any

import numpy as np

from service.electrical.column_tools import select

if TYPE_CHECKING:
    from service.electrical.circuit_arrays import CircuitColumns
    from service.electrical.devices.response import DeviceResponse
    from service.electrical.network.faults import FaultLoop


def margin_percent(value: Any, limit: Any) -> np.ndarray:
    """(limit - value) / limit x 100; NaN where either is missing or the limit is zero."""
    v = np.asarray(value, dtype=float)
    lim = np.asarray(limit, dtype=float)
    with np.errstate(divide="ignore", invalid="ignore"):
        return np.where(np.isfinite(v) & np.isfinite(lim) & (lim != 0), (lim - v) / lim * 100.0, np.nan)


def pick(conditions: Sequence[np.ndarray], texts: Sequence[str | None], default: str | None = None) -> np.ndarray:
    """For each circuit, the text of the first condition that holds (``default`` where none does)."""
    return select(list(conditions), list(texts), default).astype(object)


@dataclass
class CheckColumns:
    """One check over N circuits: verdict codes (see :mod:`service.electrical.results.verdicts`), value and limit
    in ``unit``, margin, the clause each verdict rests on, a note, and where the check applies.

    ``detail`` optionally names a sub-object of the circuit result and its columns (the protective
    conductor's k, energy and sizes); ``cautions`` are (mask, text) pairs added to the results;
    ``device_data`` marks a check that rests on the overcurrent device's a.c. data.
    """

    check: str
    unit: str
    verdict: np.ndarray
    value: np.ndarray
    limit: np.ndarray
    basis: np.ndarray
    note: np.ndarray
    applies: np.ndarray | None = None
    margin_percent: np.ndarray | None = None
    detail: tuple[str, dict[str, Any]] | None = None
    cautions: list[tuple[np.ndarray, str]] = field(default_factory=list)
    device_data: bool = False  # rests on the overcurrent device's (a.c.) data: not-verified on d.c. without d.c. data
    figures: dict[str, Any] = field(default_factory=dict)  # top-level figures of the circuit result it gives
    counts: np.ndarray | None = None  # where it counts in the overall verdict (None: wherever it applies)

    def __post_init__(self) -> None:
        if self.margin_percent is None:
            self.margin_percent = margin_percent(self.value, self.limit)


Earlier = Mapping[str, CheckColumns]  # the checks computed before this one, by name
Step = Callable[["CircuitColumns", "FaultLoop", "DeviceResponse", Earlier], CheckColumns]


def check_step(name: str, unit: str) -> Callable[[Step], Step]:
    """Mark a function as the step of check ``name`` (the name its results carry), whose value and limit are
    in ``unit``."""

    def mark(func: Step) -> Step:
        func.check_name = name  # type: ignore[attr-defined]
        func.unit = unit  # type: ignore[attr-defined]
        return func

    return mark
