"""Find a device by standard, type and rating; list the built-in devices with their sources."""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from typing import Any

from ..datafiles import device_table, provenance
from ..errors import UnknownDevice
from . import breakers, fuses
from .base import Device
from .user_curve import user_device


def resolve(spec: Mapping[str, Any]) -> Device:
    """The :class:`Device` for a request's device object.

    ``spec`` keys: ``standard``, ``type``, ``rating_a`` and, for a device of the user's own,
    ``curve_points`` (a list of ``{current_a, time_s}``) in place of ``standard``.
    """
    rating = spec.get("rating_a")
    if rating is None:
        raise UnknownDevice("rating_a", "a device needs its rating in amperes")
    rating = float(rating)
    points = spec.get("curve_points")
    standard = spec.get("standard")
    if points is not None:
        if standard is not None:
            raise UnknownDevice("curve_points", "give either a standard or curve_points, not both")
        return user_device(rating, tuple((float(p["current_a"]), float(p["time_s"])) for p in points))
    if standard is None:
        raise UnknownDevice("standard", "a device needs a standard, or curve_points for a device of your own")
    if standard in breakers.breaker_standards():
        if spec.get("type") is None:
            raise UnknownDevice("type", f"a {standard} circuit-breaker needs its type: B, C or D")
        return breakers.circuit_breaker(standard, spec["type"], rating)
    if standard in fuses.fuse_standards():
        return fuses.fuse(standard, spec.get("type"), rating)
    known = breakers.breaker_standards() + fuses.fuse_standards()
    raise UnknownDevice("standard", f"unknown device standard {standard!r}; use one of {known}")


def _families() -> list[dict[str, Any]]:
    out: list[dict[str, Any]] = []
    table = device_table("breakers")
    for standard, info in table["standards"].items():
        for type_ in table["types"]:
            dev = breakers.circuit_breaker(standard, type_, 32)
            out.append(
                {
                    "device_id": dev.device_id,
                    "kind": "circuit-breaker",
                    "standard": standard,
                    "type": type_,
                    "title": info["title"],
                    "ratings_a": [float(r) for r in table["usual_ratings_a"]],
                    "any_rating": {"min_a": float(table["rating_range_a"]["min"]), "max_a": float(table["rating_range_a"]["max"])},
                    "residual": bool(info["residual"]),
                    "data": provenance(table),
                }
            )
    fuse_table = device_table("fuse_operating_currents")
    for standard, info in device_table("fuse_families")["families"].items():
        dev = fuses.fuse(standard, info["type"], fuses.fuse_ratings(standard)[0])
        sources = [provenance(fuse_table)]
        if info["gates"]:
            sources.append(provenance(device_table("gg_gates")))
        out.append(
            {
                "device_id": dev.device_id,
                "kind": "fuse",
                "standard": standard,
                "type": info["type"],
                "title": info["title"],
                "ratings_a": fuses.fuse_ratings(standard),
                "any_rating": None,
                "residual": False,
                "data": sources[0],
                "estimates": sources[1] if len(sources) > 1 else None,
            }
        )
    return out


def catalogue() -> list[dict[str, Any]]:
    """Every built-in device family: standard, type, ratings, and each data table's source and confidence."""
    return _families()


def device_by_id(device_id: str, rating_a: float) -> Device:
    """The device of a catalogue id (e.g. ``bs-en-60898-b``) at ``rating_a``."""
    for family in _families():
        if family["device_id"] == device_id:
            return resolve({"standard": family["standard"], "type": family["type"], "rating_a": rating_a})
    ids: Sequence[str] = [f["device_id"] for f in _families()]
    raise UnknownDevice("device_id", f"unknown device {device_id!r}; use one of {list(ids)}")
