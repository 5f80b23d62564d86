"""What every protective device offers the rest of the core, and what every device family provides."""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any, Protocol

import numpy as np

from service.electrical.column_tools import as_float, scalar_io
from service.electrical.devices.characteristic import Characteristic

if TYPE_CHECKING:
    from service.electrical.inputs import DeviceSpec

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
    setting_a: float | None = None  # the current the overload rule and Table 41.1's scope read (Ir where adjustable)

    @property
    def overload_current_a(self) -> float:
        """In for Ib <= In <= Iz: the rating, or the long-time setting of an adjustable breaker."""
        return self.rating_a if self.setting_a is None else self.setting_a

    @property
    def label(self) -> str:
        parts = [self.standard or "user curve", self.type or "", f"{self.rating_a:g} A"]
        return " ".join(p for p in parts if p)

    def summary(self) -> dict[str, Any]:
        """Who the device is and where its data come from, as results and answers show it."""
        return {
            "device_id": self.device_id,
            "label": self.label,
            "source": self.source,
            "confidence": self.confidence,
            "notes": list(self.notes),
        }

    def region_codes(self, current_a: Any) -> np.ndarray:
        """The region of each current as a position in :meth:`region_names` (0: below the data)."""
        lowest = np.array([lo for lo, _ in self.regions], dtype=float)
        return np.searchsorted(lowest, as_float(current_a), side="right")

    def region_names(self) -> tuple[str, ...]:
        return (BELOW_DATA,) + tuple(name for _, name in self.regions)

    @scalar_io
    def region_at(self, current_a: Any) -> np.ndarray:
        """The name of the part of the curve each current (A) falls in."""
        return np.array(self.region_names(), dtype=object)[self.region_codes(current_a)]

    def time_at(self, current_a: Any) -> tuple[Any, Any]:
        """Maximum operating time (s) and its bound at each current (A): :meth:`Characteristic.time_at`."""
        return self.characteristic.time_at(current_a)

    def current_for(self, time_s: Any) -> tuple[Any, Any]:
        """Smallest operating current (A) and its bound for each time (s): :meth:`Characteristic.current_for`."""
        return self.characteristic.current_for(time_s)


class Family(Protocol):
    """A family of devices registered with the catalogue (breakers, fuses, ...).

    The catalogue, the request schemas' choices, sizing and the capacity factors read the registry;
    no other module branches on a standard's name.
    """

    kind: str

    def standards(self) -> list[str]:
        """The standards the family answers to."""

    def types(self) -> list[str]:
        """Every type a request may name for this family."""

    def build(self, spec: DeviceSpec) -> Device:
        """The device for a request's spec; raises UnknownDevice naming the spec's field."""

    def ratings(self, standard: str) -> list[float]:
        """The ratings a designer chooses from (the usual or published ones), smallest first."""

    def entries(self) -> list[dict[str, Any]]:
        """The catalogue rows: one per standard and type, with ratings and the data's provenance."""

    def overload_factor(self, standard: str) -> tuple[float, str]:
        """Cc for the capacity of the cable the device protects against overload, with its basis."""

    def let_through(self, device: Device, current_a: Any, energy_class: int | None) -> tuple[np.ndarray, str | None]:
        """The largest I2t (A2s) the device lets through at each prospective current when it clears within
        0.1 s, from the standard's data (NaN where they say nothing), with its basis."""
