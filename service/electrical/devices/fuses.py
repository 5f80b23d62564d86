"""Fuses to BS 88-2, BS 88-3, BS 3036 and BS 1362 from tabulated operating currents.

The published points are Ia for 0.4 s and 5 s (data/fuse_operating_currents.json). For gG fuses
(BS 88-2, BS 88-3) the short-time end is closed on the safe side by the IEC 60269-1 gate
Imax(0.1 s) (data/gg_gates.json): every time read from the segment that reaches it is labelled
``estimated``, which covers the 0.1 s, 0.2 s and 1 s columns and BS 88-2 40-63 A at 0.4 s that
no public source gives. A long-time point at the conventional fusing current (IEC 60269-1) is
added for pictures, also labelled estimated. BS 3036 and BS 1362 fuses have no gates: their
data stop at 0.4 s and a shorter required time is ``not-verified``.
"""

from __future__ import annotations

from functools import lru_cache
from typing import Any

import numpy as np

from service.electrical.datafiles import core_table, device_table, provenance
from service.electrical.devices import let_through
from service.electrical.devices.base import Device
from service.electrical.devices.characteristic import Characteristic
from service.electrical.errors import UnknownDevice
from service.electrical.inputs import DeviceSpec

PUBLISHED_TIMES_S = (5.0, 0.4)


def _families() -> dict:
    return device_table("fuse_families")["families"]


def fuse_standards() -> list[str]:
    return list(_families())


def fuse_ratings(standard: str) -> list[float]:
    rows = device_table("fuse_operating_currents")["standards"].get(standard, [])
    return [float(r["rating_a"]) for r in rows]


def _row(standard: str, rating_a: float) -> dict:
    for row in device_table("fuse_operating_currents")["standards"][standard]:
        if float(row["rating_a"]) == float(rating_a):
            return row
    raise UnknownDevice(
        "rating_a", f"no published data for a {rating_a:g} A {standard} fuse; ratings: {fuse_ratings(standard)}"
    )


def gate_for(rating_a: float) -> dict | None:
    """The IEC 60269-1 gate row for a gG rating: its own, or the next larger rating's (safe side)."""
    rows = sorted(device_table("gg_gates")["rows"], key=lambda r: r["rating_a"])
    for row in rows:
        if row["rating_a"] >= rating_a:
            return row
    return None


def conventional_point(rating_a: float) -> dict:
    """Conventional fusing current multiple and time for a gG fuse (IEC 60269-1)."""
    for row in device_table("fuse_families")["conventional_gg"]:
        if row["rating_up_to_a"] is None or rating_a <= row["rating_up_to_a"]:
            return row
    raise AssertionError("conventional_gg has an open-ended last row")


@lru_cache(maxsize=512)
def fuse(standard: str, type_: str | None, rating_a: float) -> Device:
    """The device for a fuse of ``standard`` and ``rating_a``; ``type_`` must match the family."""
    families = _families()
    if standard not in families:
        raise UnknownDevice("standard", f"unknown fuse standard {standard!r}; use one of {fuse_standards()}")
    family = families[standard]
    if type_ not in (None, family["type"]):
        expected = f"'{family['type']}' or none" if family["type"] else "none"
        raise UnknownDevice("type", f"{standard} fuses have type {expected}, not {type_!r}")
    row = _row(standard, rating_a)
    points: list[tuple[float, float]] = []
    estimated: list[bool] = []
    notes: list[str] = []
    gated = bool(family["gates"])
    if gated:
        conv = conventional_point(rating_a)
        points.append((conv["multiple"] * rating_a, float(conv["time_s"])))
        estimated.append(True)
        notes.append(
            f"Long-time point at the conventional fusing current {conv['multiple']:g} In within "
            f"{conv['time_s']:g} s (IEC 60269-1, confidence {conv['confidence']}): estimated, for pictures."
        )
    for time_s, key in zip(PUBLISHED_TIMES_S, ("ia_5s_a", "ia_0_4s_a"), strict=True):
        if row[key] is not None:
            points.append((float(row[key]), time_s))
            estimated.append(False)
    if gated:
        gate = gate_for(rating_a)
        if gate is not None and gate["imax_0_1s_a"] > points[-1][0]:
            points.append((float(gate["imax_0_1s_a"]), 0.1))
            estimated.append(True)
            own = "its own" if gate["rating_a"] == rating_a else f"the next larger rating's ({gate['rating_a']:g} A)"
            notes.append(
                f"0.1 s point from {own} IEC 60269-1 gate Imax(0.1 s) = {gate['imax_0_1s_a']:g} A (pre-arcing, "
                "from memory); times between the last published point and it are estimated straight on "
                "log-log axes, on the safe side of the fuse's curve."
            )
    if row["ia_0_4s_a"] is None:
        notes.append(f"No published 0.4 s current for a {rating_a:g} A {standard} fuse.")
    return Device(
        device_id=device_id(standard),
        kind="fuse",
        standard=standard,
        type=family["type"],
        rating_a=float(rating_a),
        characteristic=Characteristic.from_points(points, estimated),
        regions=((points[0][0], "fuse-curve"), (points[-1][0], "above-data")),
        source=device_table("fuse_operating_currents")["source"],
        confidence=row["confidence"],
        notes=tuple(notes),
        default_breaking_capacity_ka=float(family["breaking_capacity_ka_min"]),
        default_breaking_capacity_basis=(
            f"minimum rated breaking capacity for {standard} fuses, {family['breaking_capacity_ka_min']:g} kA "
            f"(confidence {family['breaking_capacity_confidence']})"
        ),
    )


def device_id(standard: str) -> str:
    """The catalogue id of a fuse family, e.g. ``bs-88-2-gg`` or ``bs-3036``."""
    slug = standard.lower().replace(" ", "-")
    ftype = _families()[standard]["type"]
    return f"{slug}-{ftype.lower()}" if ftype else slug


class Fuses:
    """The fuse families (BS 88-2, BS 88-3, BS 3036, BS 1362), registered with the catalogue."""

    kind = "fuse"

    def standards(self) -> list[str]:
        return fuse_standards()

    def types(self) -> list[str]:
        return sorted({f["type"] for f in _families().values() if f["type"]})

    def build(self, spec: DeviceSpec) -> Device:
        return fuse(spec.standard, spec.type, float(spec.rating_a))

    def ratings(self, standard: str) -> list[float]:
        return fuse_ratings(standard)

    def entries(self) -> list[dict[str, Any]]:
        out = []
        for standard, info in _families().items():
            out.append(
                {
                    "device_id": device_id(standard),
                    "kind": self.kind,
                    "standard": standard,
                    "type": info["type"],
                    "title": info["title"],
                    "ratings_a": fuse_ratings(standard),
                    "any_rating": None,
                    "residual": False,
                    "data": provenance(device_table("fuse_operating_currents")),
                    "estimates": provenance(device_table("gg_gates")) if info["gates"] else None,
                }
            )
        return out

    def let_through(self, device: Device, current_a: Any, energy_class: int | None) -> tuple[np.ndarray, str | None]:
        """A gG fuse's largest operating I2t (IEC 60269-1); NaN for the families without gG data."""
        shape = np.shape(np.atleast_1d(current_a))
        found = let_through.gg_operating_a2s(device.rating_a) if _families()[device.standard]["gates"] else None
        if found is None:
            return np.full(shape, np.nan), None
        return np.full(shape, found[0]), found[1]

    def overload_factor(self, standard: str) -> tuple[float, str]:
        """Cc: 0.725 for a BS 3036 semi-enclosed fuse (BS 7671 Appendix 4), 1.0 for the others."""
        table = core_table("correction_factors")["protective_device"]
        factor = table["factors"].get(standard)
        if factor is None:
            return 1.0, "no device factor"
        return float(factor), f"BS 7671 {table['clause']}: {standard} fuse, Cc = {factor:g}"


FAMILY = Fuses()
