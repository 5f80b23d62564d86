"""What every protective device offers the rest of the core."""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

import numpy as np

from ..arrays import as_float
from .characteristic import Characteristic

BELOW_DATA = "below-data"


@dataclass(frozen=True)
class Device:
    """A protective device of one rating: its characteristic and where its data come from.

    ``regions`` names the parts of the curve: a list of (lowest current A, name) in rising order;
    below the first the region is ``below-data``.
    """

    device_id: str
    kind: str  # circuit-breaker | fuse | user-curve
    standard: str | None
    type: str | None
    rating_a: float
    characteristic: Characteristic
    regions: tuple[tuple[float, str], ...]
    source: str
    confidence: str
    notes: tuple[str, ...] = field(default=())
    residual: bool = False
    default_breaking_capacity_ka: float | None = None
    default_breaking_capacity_basis: str | None = None

    @property
    def label(self) -> str:
        parts = [self.standard or "user curve", self.type or "", f"{self.rating_a:g} A"]
        return " ".join(p for p in parts if p)

    def region_at(self, current_a: Any) -> np.ndarray:
        current = as_float(current_a)
        out = np.full(current.shape, BELOW_DATA, dtype=object)
        for lowest, name in self.regions:
            out = np.where(current >= lowest, name, out)
        return out.astype(object)

    def time_at(self, current_a: Any) -> tuple[np.ndarray, np.ndarray]:
        return self.characteristic.time_at(current_a)

    def current_for(self, time_s: Any) -> tuple[np.ndarray, np.ndarray]:
        return self.characteristic.current_for(time_s)
