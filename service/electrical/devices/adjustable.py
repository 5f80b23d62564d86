"""Adjustable (moulded-case) circuit-breakers to BS EN 60947-2, from their settings.

Settings: Ir (long-time), Ii (instantaneous) and, for electronic units, Isd with its delay tsd. The
standard fixes the conventional tripping current 1.30 Ir within the conventional time (1 h up to 63 A,
2 h above) and the instantaneous accuracy (+-20 %), not a curve (data/adjustable_breakers.json, from
memory). The characteristic is the envelope those give, on the safe side for disconnection: trips within
the conventional time from 1.30 Ir, within tsd from 1.2 Isd, within 0.1 s from 1.2 Ii. Where the maker's
thermal points are given (``curve_points``), they replace the flat envelope below the pickups.
"""

from __future__ import annotations

from functools import lru_cache
from typing import Any

import numpy as np

from service.electrical.datafiles import device_table, provenance
from service.electrical.devices.base import Device
from service.electrical.devices.characteristic import Characteristic
from service.electrical.errors import InvalidInput, UnknownDevice
from service.electrical.inputs import DeviceSpec


def _table() -> dict:
    return device_table("adjustable_breakers")


def standard() -> str:
    return _table()["standard"]


def _settings(spec: DeviceSpec) -> tuple[float, float, float | None, float | None]:
    """(Ir, Ii, Isd, tsd) in A and s, checked against the frame and each other; errors name the field."""
    rating = float(spec.rating_a)
    limits = _table()["rating_range_a"]
    if not limits["min"] <= rating <= limits["max"]:
        raise UnknownDevice("rating_a", f"{standard()} frames here are {limits['min']:g} A to {limits['max']:g} A")
    ir = rating if spec.ir_a is None else float(spec.ir_a)
    if not 0 < ir <= rating:
        raise InvalidInput("ir_a", f"the long-time setting Ir is above 0 and at most the frame's {rating:g} A")
    if spec.ii_a is None:
        raise InvalidInput("ii_a", "an adjustable breaker needs its instantaneous setting Ii (ii_a, A)")
    ii = float(spec.ii_a)
    if ii <= ir:
        raise InvalidInput("ii_a", "the instantaneous setting Ii is above Ir")
    isd, tsd = spec.isd_a, spec.tsd_s
    if (isd is None) != (tsd is None):
        raise InvalidInput("isd_a" if isd is None else "tsd_s", "give the short-time pickup Isd with its delay tsd")
    if isd is not None and not ir < isd < ii:
        raise InvalidInput("isd_a", "the short-time pickup Isd lies between Ir and Ii")
    delays = _table()["short_time_delay_s"]
    if tsd is not None and not delays["min"] <= tsd <= delays["max"]:
        raise InvalidInput("tsd_s", f"the short-time delay tsd is from {delays['min']:g} s to {delays['max']:g} s")
    return ir, ii, isd, tsd


def _points(spec: DeviceSpec, ir: float, ii: float, isd: float | None, tsd: float | None) -> list[tuple[float, float]]:
    table = _table()
    conventional = table["conventional"]
    upper = table["pickup_tolerance"]["upper"]
    t_conv = float(conventional["time_s_up_to_63a"] if ir <= 63 else conventional["time_s_above_63a"])
    first_pickup = upper * (isd if isd is not None else ii)
    if spec.curve_points:
        points = [(c, t) for c, t in sorted(spec.curve_points) if c < first_pickup]
        if not points:
            raise InvalidInput("curve_points", "the maker's points lie below the short-time or instantaneous pickup")
    else:
        points = [(conventional["tripping_multiple"] * ir, t_conv)]
    last_time = points[-1][1]
    points.append((first_pickup, last_time))
    if isd is not None:
        points += [(first_pickup, tsd), (upper * ii, tsd)]
    points.append((upper * ii, float(table["instantaneous_time_s"])))
    return points


@lru_cache(maxsize=1024)
def adjustable_breaker(spec: DeviceSpec) -> Device:
    """The device of an adjustable breaker's settings (errors name the setting at fault)."""
    ir, ii, isd, tsd = _settings(spec)
    points = _points(spec, ir, ii, isd, tsd)
    upper = _table()["pickup_tolerance"]["upper"]
    regions = [(points[0][0], "thermal")]
    if isd is not None:
        regions.append((upper * isd, "short-time"))
    regions.append((upper * ii, "instantaneous"))
    notes = [
        f"Settings Ir {ir:g} A, Ii {ii:g} A" + (f", Isd {isd:g} A with tsd {tsd:g} s" if isd is not None else "") + ".",
        "Pickups taken at their upper tolerance (1.2 x setting) for disconnection (BS EN 60947-2, from memory).",
        "The thermal region is the maker's points given"
        if spec.curve_points
        else "Between 1.30 Ir and the pickups only the conventional time holds (flat, on the safe side): the "
        "maker's curve (curve_points) shows more.",
    ]
    return Device(
        device_id=device_id(),
        kind="circuit-breaker",
        standard=standard(),
        type=None,
        rating_a=float(spec.rating_a),
        characteristic=Characteristic.from_points(points),
        regions=tuple(regions),
        source=_table()["source"],
        confidence=_table()["confidence"],
        notes=tuple(notes),
        setting_a=ir,
    )


def device_id() -> str:
    return standard().lower().replace(" ", "-")


def selective_limit_a(spec: DeviceSpec) -> float:
    """The current up to which an upstream adjustable breaker surely does not trip instantaneously: 0.8 x Ii."""
    _, ii, _, _ = _settings(spec)
    return _table()["pickup_tolerance"]["lower"] * ii


class Adjustable:
    """The family of adjustable breakers (BS EN 60947-2), registered with the catalogue."""

    kind = "circuit-breaker"
    takes_curve_points = True  # the maker's thermal points, beside the settings

    def standards(self) -> list[str]:
        return [standard()]

    def types(self) -> list[str]:
        return []

    def build(self, spec: DeviceSpec) -> Device:
        if spec.type is not None:
            raise UnknownDevice("type", f"{standard()} breakers are set by ir_a, ii_a (isd_a, tsd_s), not a type")
        return adjustable_breaker(spec)

    def ratings(self, standard_name: str) -> list[float]:
        return [float(r) for r in _table()["frame_ratings_a"]]

    def entries(self) -> list[dict[str, Any]]:
        table = _table()
        return [
            {
                "device_id": device_id(),
                "kind": self.kind,
                "standard": standard(),
                "type": None,
                "title": table["title_of_standard"],
                "ratings_a": self.ratings(standard()),
                "any_rating": {
                    "min_a": float(table["rating_range_a"]["min"]),
                    "max_a": float(table["rating_range_a"]["max"]),
                },
                "residual": False,
                "data": provenance(table),
            }
        ]

    def overload_factor(self, standard_name: str) -> tuple[float, str]:
        return 1.0, "no device factor"

    def let_through(self, device: Device, current_a: Any, energy_class: int | None) -> tuple[np.ndarray, str | None]:
        """No standard let-through for adjustable breakers: the maker's figure (let_through_a2s)."""
        return np.full(np.shape(np.atleast_1d(current_a)), np.nan), None

    def catalogue_spec(self, rating_a: float) -> DeviceSpec:
        """Typical settings to draw a frame's curve in the catalogue (Ir = In, Ii = 10 In)."""
        settings = _table()["catalogue_settings"]
        return DeviceSpec(
            rating_a=rating_a,
            standard=standard(),
            ir_a=settings["ir_multiple"] * rating_a,
            ii_a=settings["ii_multiple"] * rating_a,
        )


FAMILY = Adjustable()
