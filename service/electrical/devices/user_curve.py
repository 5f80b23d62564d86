"""A device described by the user's own curve points (e.g. a maker's published curve)."""

from __future__ import annotations

from functools import lru_cache

from service.electrical.devices.base import Device
from service.electrical.devices.characteristic import Characteristic
from service.electrical.errors import InvalidInput, UnknownDevice


@lru_cache(maxsize=1024)
def user_device(rating_a: float, points: tuple[tuple[float, float], ...]) -> Device:
    """A device from at least two (current A, maximum operating time s) points.

    Points may come in any order; sorted by current, every time must be lower than the one before.
    """
    if len(points) < 2:
        raise UnknownDevice("curve_points", "a user curve needs at least two points")
    for k, (current, time) in enumerate(points):
        if not (current > 0 and time > 0):
            raise InvalidInput(("curve_points", k), "current_a and time_s must be greater than zero")
    ordered = sorted(points)
    for k in range(1, len(ordered)):
        if ordered[k][0] == ordered[k - 1][0] or ordered[k][1] >= ordered[k - 1][1]:
            raise InvalidInput(
                "curve_points",
                "time must fall strictly as current rises (no two points with the same current or time order reversed)",
            )
    return Device(
        device_id="user-curve",
        kind="user-curve",
        standard=None,
        type=None,
        rating_a=float(rating_a),
        characteristic=Characteristic.from_points(ordered),
        regions=((ordered[0][0], "user-curve"), (ordered[-1][0], "above-data")),
        source="curve points given in the request",
        confidence="as given by the user",
        notes=("Times are read from the user's points; check them against the maker's published data.",),
    )
