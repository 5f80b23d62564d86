"""Circuit-breakers to BS EN 60898-1 and RCBOs to BS EN 61009-1, types B, C and D.

The characteristic is the envelope of the standard's limits (data/breakers.json): the thermal
test points 1.45 In and 2.55 In, flat from 2.55 In to the upper instantaneous limit (5, 10 or
20 In), then a vertical drop to 0.1 s. So for any required time from 0.1 s to the 2.55 In time
the operating current Ia is the upper instantaneous limit, as BS 7671:2018 Table 41.3 uses it.
"""

from __future__ import annotations

from functools import lru_cache
from typing import Any

import numpy as np

from service.electrical.datafiles import device_table, provenance
from service.electrical.devices import let_through
from service.electrical.devices.base import Device
from service.electrical.devices.characteristic import Characteristic
from service.electrical.errors import UnknownDevice
from service.electrical.inputs import DeviceSpec


def _table() -> dict:
    return device_table("breakers")


def breaker_standards() -> list[str]:
    return list(_table()["standards"])


def breaker_types() -> list[str]:
    return list(_table()["types"])


@lru_cache(maxsize=4096)
def circuit_breaker(standard: str, type_: str, rating_a: float) -> Device:
    """The device for a breaker of ``standard`` ('BS EN 60898' or 'BS EN 61009'), type and rating."""
    table = _table()
    if standard not in table["standards"]:
        raise UnknownDevice(
            "standard", f"unknown circuit-breaker standard {standard!r}; use one of {breaker_standards()}"
        )
    if type_ not in table["types"]:
        raise UnknownDevice("type", f"circuit-breakers to {standard} are type B, C or D, not {type_!r}")
    rmin, rmax = table["rating_range_a"]["min"], table["rating_range_a"]["max"]
    if not (rmin <= rating_a <= rmax):
        raise UnknownDevice("rating_a", f"{standard} covers ratings from {rmin:g} A to {rmax:g} A, not {rating_a:g} A")
    multiples = table["types"][type_]
    t_145, t_255 = table["thermal_points"]
    long_time = t_145["time_s_up_to_63a"] if rating_a <= 63 else t_145["time_s_above_63a"]
    mid_time = t_255["time_s_up_to_32a"] if rating_a <= 32 else t_255["time_s_above_32a"]
    upper = multiples["instantaneous_upper_multiple"] * rating_a
    inst_time = table["instantaneous_time_s"]
    points = [(t_145["multiple"] * rating_a, long_time), (t_255["multiple"] * rating_a, mid_time)]
    five_s = multiples.get("table_41_3_5s_multiple")
    if five_s is not None:  # type D: within 5 s at 10 In (BS 7671:2018+A2 Table 41.3, 5 s column)
        points += [(five_s * rating_a, mid_time), (five_s * rating_a, 5.0), (upper, 5.0)]
    else:
        points.append((upper, mid_time))
    points.append((upper, inst_time))
    return Device(
        device_id=device_id(standard, type_),
        kind="circuit-breaker",
        standard=standard,
        type=type_,
        rating_a=float(rating_a),
        characteristic=Characteristic.from_points(points),
        regions=((t_145["multiple"] * rating_a, "thermal"), (upper, "instantaneous")),
        source=table["source"],
        confidence=table["confidence"],
        notes=_notes(table, multiples, upper, inst_time),
        residual=bool(table["standards"][standard]["residual"]),
        default_breaking_capacity_ka=float(table["minimum_breaking_capacity_ka"]),
        default_breaking_capacity_basis=(
            f"smallest rated short-circuit capacity of {standard} breakers, "
            f"{table['minimum_breaking_capacity_ka']:g} kA "
            f"(confidence {table['minimum_breaking_capacity_confidence']})"
        ),
    )


def _notes(table: dict, multiples: dict, upper: float, inst_time: float) -> tuple[str, ...]:
    notes = [
        f"Trips within {inst_time:g} s at and above {multiples['instantaneous_upper_multiple']:g} In "
        f"({upper:g} A); the standard's data cannot show a shorter time."
    ]
    if multiples.get("table_41_3_5s_multiple") is not None:
        notes.append(f"Within 5 s at {multiples['table_41_3_5s_multiple']:g} In: {table['table_41_3_5s']['source']}.")
    return tuple(notes)


def device_id(standard: str, type_: str) -> str:
    """The catalogue id of a breaker family, e.g. ``bs-en-60898-b``."""
    return f"{standard.lower().replace(' ', '-')}-{type_.lower()}"


class Breakers:
    """The family of BS EN 60898 breakers and BS EN 61009 RCBOs, registered with the catalogue."""

    kind = "circuit-breaker"

    def standards(self) -> list[str]:
        return breaker_standards()

    def types(self) -> list[str]:
        return breaker_types()

    def build(self, spec: DeviceSpec) -> Device:
        if spec.type is None:
            raise UnknownDevice("type", f"a {spec.standard} circuit-breaker needs its type: B, C or D")
        return circuit_breaker(spec.standard, spec.type, float(spec.rating_a))

    def ratings(self, standard: str) -> list[float]:
        return [float(r) for r in _table()["usual_ratings_a"]]

    def entries(self) -> list[dict[str, Any]]:
        table = _table()
        return [
            {
                "device_id": device_id(standard, type_),
                "kind": self.kind,
                "standard": standard,
                "type": type_,
                "title": info["title"],
                "ratings_a": self.ratings(standard),
                "any_rating": {
                    "min_a": float(table["rating_range_a"]["min"]),
                    "max_a": float(table["rating_range_a"]["max"]),
                },
                "residual": bool(info["residual"]),
                "data": provenance(table),
            }
            for standard, info in table["standards"].items()
            for type_ in table["types"]
        ]

    def overload_factor(self, standard: str) -> tuple[float, str]:
        return 1.0, "no device factor"

    def let_through(self, device: Device, current_a: Any, energy_class: int | None) -> tuple[np.ndarray, str | None]:
        """The class's largest let-through I2t (BS EN 60898-1 Annex ZA) for types B and C up to 32 A; NaN otherwise."""
        if not let_through.class_applies(device.type, device.rating_a):
            return np.full(np.shape(np.atleast_1d(current_a)), np.nan), None
        if energy_class is not None:
            marked, said = energy_class, "as given"
        else:
            marked, why = let_through.default_class()
            said = f"not given: {why}"
        energy = let_through.class_let_through_a2s(device.type, device.rating_a, marked, current_a)
        return energy, f"energy-limiting class {marked} ({said}), BS EN 60898-1 Annex ZA, from memory"


FAMILY = Breakers()
