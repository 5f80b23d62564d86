"""The registry of device families: find a device for a request, list the built-in devices.

Each family module (breakers, fuses) exports a family object; this module is the only place that
holds the list. The request schemas' choices, sizing and the capacity factors ask it.
"""

from __future__ import annotations

from functools import lru_cache
from typing import Any

import numpy as np

from service.electrical.devices import adjustable, breakers, fuses
from service.electrical.devices.base import Device, Family
from service.electrical.devices.user_curve import user_device
from service.electrical.errors import UnknownDevice
from service.electrical.inputs import DeviceSpec

FAMILIES: tuple[Family, ...] = (breakers.FAMILY, fuses.FAMILY, adjustable.FAMILY)


def standards() -> list[str]:
    """Every standard some family answers to, in registry order."""
    return [s for family in FAMILIES for s in family.standards()]


def types() -> list[str]:
    """Every device type some family answers to (B, C, D, gG ...)."""
    out: list[str] = []
    for family in FAMILIES:
        out.extend(t for t in family.types() if t not in out)
    return out


def family_of(standard: str) -> Family:
    """The family that answers to ``standard``; UnknownDevice naming ``standard`` otherwise."""
    for family in FAMILIES:
        if standard in family.standards():
            return family
    raise UnknownDevice("standard", f"unknown device standard {standard!r}; use one of {standards()}")


@lru_cache(maxsize=4096)
def resolve(spec: DeviceSpec) -> Device:
    """The :class:`Device` for a request's device: a standard, type and rating, or the user's curve points.

    Raises UnknownDevice (or InvalidInput for bad curve points) with a path relative to the device.
    """
    if spec.standard is None:
        if spec.curve_points is None:
            raise UnknownDevice("standard", "a device needs a standard, or curve_points for a device of your own")
        return user_device(float(spec.rating_a), tuple((float(c), float(t)) for c, t in spec.curve_points))
    family = family_of(spec.standard)
    if spec.curve_points is not None and not takes_curve_points(spec.standard):
        raise UnknownDevice("curve_points", "give either a standard or curve_points, not both")
    return family.build(spec)


def takes_curve_points(standard: str) -> bool:
    """Whether a device of ``standard`` may carry the maker's curve points beside its standard (adjustable breakers)."""
    return getattr(family_of(standard), "takes_curve_points", False)


def ratings_for(standard: str) -> list[float]:
    """The ratings a designer chooses from for ``standard`` (for sizing), smallest first."""
    return family_of(standard).ratings(standard)


def overload_factor(standard: str | None) -> tuple[float, str]:
    """Cc for the capacity of a cable protected by a device of ``standard`` (BS 7671 Appendix 4)."""
    if standard is None:
        return 1.0, "no device factor"
    return family_of(standard).overload_factor(standard)


def catalogue() -> list[dict[str, Any]]:
    """Every built-in device family: standard, type, ratings, and each data table's source and confidence."""
    return [entry for family in FAMILIES for entry in family.entries()]


def device_by_id(device_id: str, rating_a: float) -> Device:
    """The device of a catalogue id (e.g. ``bs-en-60898-b``) at ``rating_a``."""
    for entry in catalogue():
        if entry["device_id"] == device_id:
            family = family_of(entry["standard"])
            if hasattr(family, "catalogue_spec"):
                return resolve(family.catalogue_spec(float(rating_a)))
            return resolve(DeviceSpec(rating_a=float(rating_a), standard=entry["standard"], type=entry["type"]))
    raise UnknownDevice(
        "device_id", f"unknown device {device_id!r}; use one of {[e['device_id'] for e in catalogue()]}"
    )


def let_through(device: Device, current_a: Any, energy_class: int | None = None) -> tuple[Any, str | None]:
    """The standard's largest let-through I2t (A2s) for the device at each prospective current when it clears
    within 0.1 s (NaN where its data say nothing: a user's curve, a type D breaker, a BS 3036 fuse), with its basis."""
    if device.standard is None:
        return np.full(np.shape(np.atleast_1d(current_a)), np.nan), None
    return family_of(device.standard).let_through(device, current_a, energy_class)
