"""Selectivity between a circuit's device and the device that feeds its board (BS 7671:2018 536.4, IEC 60364-5-53).

For each pair the current up to which only the downstream device operates, and how that is known:

- a maker's selectivity limit for the pair, given in the request, prevails;
- gG fuse over gG fuse: total where the downstream fuse's largest operating I2t does not exceed the upstream
  fuse's smallest pre-arcing I2t (IEC 60269-1, data/gg_i2t.json, from memory);
- breaker over breaker: at most up to the upstream's lower instantaneous limit (3, 5, 10 In for B, C, D;
  0.8 Ii for an adjustable breaker), and only where the downstream trips instantaneously below it and its
  conventional tripping current (1.45 In; 1.30 Ir) lies below the upstream's conventional non-tripping
  current (1.13 In; 1.05 Ir) (common practice);
- gG fuse over breaker: below 0.1 s the breaker's let-through I2t against the fuse's pre-arcing I2t, where
  above 0.1 s the breaker's curve stays below the fuse's no-melt gates: it trips instantaneously below the
  fuse's 0.1 s no-melt current, within 10 s at the 10 s no-melt current, and by 1.45 In below the fuse's
  conventional non-fusing current (IEC 60269-1 gates, from memory);
- other pairs: not shown by standard data (the maker's table).

The verdict compares that current with the largest fault at the downstream device: ``total`` where the
fault cannot exceed it, ``partial`` (up to it) where it can, ``none`` where the conditions fail,
``not-verified`` where the data cannot show it. An RCD pair is selective where the upstream RCD is
time-delayed (type S) with IΔn at least three times the downstream's (common practice).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from enum import StrEnum
from functools import lru_cache

import numpy as np

from service.electrical.column_tools import select
from service.electrical.datafiles import device_table
from service.electrical.devices import adjustable, catalogue, let_through
from service.electrical.devices.base import Device
from service.electrical.inputs import DeviceSpec, Rcd
from service.electrical.results.verdicts import Verdict


class Selective(StrEnum):
    TOTAL = "total"
    PARTIAL = "partial"
    NONE = "none"
    NOT_VERIFIED = Verdict.NOT_VERIFIED.value


SELECTIVE = tuple(s.value for s in Selective)


@dataclass(frozen=True)
class PairLimit:
    """Up to ``limit_a`` only the downstream device operates (inf: at any current; 0: not selective; NaN: not shown)."""

    limit_a: float
    basis: str


ANY = math.inf
NOT_SHOWN = math.nan


def _breaker_limits(dev: Device, spec: DeviceSpec) -> tuple[float, float, float, float]:
    """(lower instantaneous, upper instantaneous, conventional tripping, conventional non-tripping) in A."""
    if dev.standard == adjustable.standard():
        table = device_table("adjustable_breakers")
        ir = dev.overload_current_a
        conventional = table["conventional"]
        upper = table["pickup_tolerance"]["upper"] * float(spec.ii_a)
        return (
            adjustable.selective_limit_a(spec),
            upper,
            conventional["tripping_multiple"] * ir,
            conventional["non_tripping_multiple"] * ir,
        )
    table = device_table("breakers")
    multiples = table["types"][dev.type]
    rating = dev.rating_a
    return (
        multiples["instantaneous_lower_multiple"] * rating,
        multiples["instantaneous_upper_multiple"] * rating,
        table["thermal_points"][0]["multiple"] * rating,
        table["non_tripping_point"]["multiple"] * rating,
    )


def _is_breaker(dev: Device) -> bool:
    return dev.kind == "circuit-breaker"


def _is_gg(dev: Device) -> bool:
    return dev.kind == "fuse" and dev.type == "gG"


def _gate(rating_a: float) -> dict | None:
    """The gG gate row of a rating or the next smaller one (smaller no-melt currents: the safe side upstream)."""
    rows = sorted(device_table("gg_gates")["rows"], key=lambda r: r["rating_a"])
    below = [r for r in rows if r["rating_a"] <= rating_a]
    return below[-1] if below else None


def _breaker_over_breaker(down: Device, down_spec: DeviceSpec, up: Device, up_spec: DeviceSpec) -> PairLimit:
    up_lower, _, _, up_no_trip = _breaker_limits(up, up_spec)
    _, down_upper, down_trip, _ = _breaker_limits(down, down_spec)
    if down_upper >= up_lower:
        return PairLimit(
            0.0,
            f"the downstream trips instantaneously only from {down_upper:g} A, at or above the "
            f"upstream's lower instantaneous limit {up_lower:g} A: no selectivity shown",
        )
    if down_trip > up_no_trip:
        return PairLimit(
            0.0,
            f"overload region: the downstream trips by {down_trip:g} A, above the upstream's "
            f"conventional non-tripping {up_no_trip:g} A",
        )
    return PairLimit(up_lower, f"up to the upstream's lower instantaneous limit {up_lower:g} A (common practice)")


def _fuse_over_fuse(down: Device, up: Device) -> PairLimit:
    operating = let_through.gg_operating_a2s(down.rating_a)
    pre_arcing = let_through.gg_pre_arcing_a2s(up.rating_a)
    if operating is None or pre_arcing is None:
        return PairLimit(NOT_SHOWN, "no gG I2t for one of the ratings: the maker's selectivity table decides")
    if operating[0] <= pre_arcing:
        return PairLimit(
            ANY,
            f"gG I2t: downstream operating {operating[0]:g} A2s not above upstream pre-arcing "
            f"{pre_arcing:g} A2s (IEC 60269-1, from memory)",
        )
    return PairLimit(
        NOT_SHOWN,
        f"gG I2t: downstream operating {operating[0]:g} A2s above upstream pre-arcing "
        f"{pre_arcing:g} A2s; the maker's selectivity table decides",
    )


def _fuse_over_breaker(down: Device, down_spec: DeviceSpec, up: Device) -> PairLimit:
    gate, pre_arcing = _gate(up.rating_a), let_through.gg_pre_arcing_a2s(up.rating_a)
    if gate is None or pre_arcing is None or not _is_breaker(down) or down.standard == adjustable.standard():
        return PairLimit(NOT_SHOWN, "no standard data for this fuse over this breaker: the maker's table decides")
    _, down_upper, down_trip, _ = _breaker_limits(down, down_spec)
    non_fusing = device_table("fuse_families")["conventional_non_fusing_multiple"] * up.rating_a
    at_10s = float(np.asarray(down.time_at(gate["imin_10s_a"])[0]))
    if down_upper >= gate["imin_0_1s_a"] or down_trip > non_fusing or not at_10s <= 10.0:
        return PairLimit(
            0.0,
            f"the breaker's curve reaches the fuse's no-melt limits ({gate['imin_0_1s_a']:g} A in 0.1 s, "
            f"{gate['imin_10s_a']:g} A in 10 s, {non_fusing:g} A conventional): no selectivity shown",
        )
    if down_spec.let_through_curve is not None:
        limit = let_through.curve_limit_a(down_spec.let_through_curve, pre_arcing)
        return PairLimit(
            limit,
            f"the maker's let-through curve against the fuse's pre-arcing {pre_arcing:g} A2s (read on log-log axes, "
            "never beyond the curve's last point)",
        )
    if down_spec.let_through_a2s is not None:
        limit = ANY if down_spec.let_through_a2s <= pre_arcing else 0.0
        return PairLimit(
            limit,
            f"the maker's let-through {down_spec.let_through_a2s:g} A2s against the fuse's "
            f"pre-arcing {pre_arcing:g} A2s",
        )
    return _class_limit(down, down_spec, pre_arcing)


def _class_limit(down: Device, down_spec: DeviceSpec, pre_arcing: float) -> PairLimit:
    """The largest prospective current whose class let-through stays below the fuse's pre-arcing I2t."""
    if not let_through.class_applies(down.type, down.rating_a):
        return PairLimit(NOT_SHOWN, "the breaker's let-through is not classed: give the maker's let_through_curve")
    columns = [c["prospective_current_a"] for b in device_table("let_through_energy")["bands"] for c in b["columns"]]
    energy_class = down_spec.energy_limiting_class or let_through.default_class()[0]
    energies = let_through.class_let_through_a2s(down.type, down.rating_a, energy_class, sorted(set(columns)))
    below = [c for c, e in zip(sorted(set(columns)), energies.tolist(), strict=True) if e <= pre_arcing]
    if not below:
        return PairLimit(
            NOT_SHOWN,
            f"the class {energy_class} let-through exceeds the fuse's pre-arcing {pre_arcing:g} A2s at "
            "any tabulated current: the maker's selectivity table decides",
        )
    return PairLimit(
        max(below),
        f"class {energy_class} let-through against the fuse's pre-arcing {pre_arcing:g} A2s "
        "(BS EN 60898-1 Annex ZA, IEC 60269-1, from memory)",
    )


@lru_cache(maxsize=4096)
def pair_limit(down_spec: DeviceSpec, up_spec: DeviceSpec, maker_limit_a: float | None = None) -> PairLimit:
    """The current up to which ``down`` operates and ``up`` does not, for the overcurrent devices of the pair."""
    if maker_limit_a is not None:
        return PairLimit(float(maker_limit_a), "the maker's selectivity limit for the pair (given)")
    down, up = catalogue.resolve(down_spec), catalogue.resolve(up_spec)
    if _is_gg(down) and _is_gg(up):
        return _fuse_over_fuse(down, up)
    if _is_breaker(down) and _is_breaker(up):
        return _breaker_over_breaker(down, down_spec, up, up_spec)
    if _is_gg(up):
        return _fuse_over_breaker(down, down_spec, up)
    return PairLimit(NOT_SHOWN, "no standard data show selectivity for this pair: the maker's table decides")


def verdicts_of(limit_a: np.ndarray, fault_a: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Selectivity words and the current up to which it holds, against the largest fault at the downstream device."""
    word = select(
        [np.isnan(limit_a), limit_a <= 0, np.isnan(fault_a), fault_a <= limit_a],
        [Selective.NOT_VERIFIED, Selective.NONE, Selective.NOT_VERIFIED, Selective.TOTAL],
        Selective.PARTIAL,
    ).astype(object)
    up_to = np.where(np.isfinite(limit_a) & (limit_a > 0), limit_a, np.nan)
    return word, up_to


def rcd_ratio() -> float:
    """How many times the downstream RCD's IΔn the upstream one's must be, beside its time delay (common practice)."""
    return float(device_table("residual")["selectivity_ratio"])


def rcd_pair(down: Rcd | None, up: Rcd | None) -> tuple[Selective | None, str | None]:
    """Selectivity of two RCDs in series: the upstream type S with IΔn at least three times the downstream's."""
    if down is None or up is None:
        return None, None
    ratio = rcd_ratio()
    if up.delay == "S" and up.residual_current_ma >= ratio * down.residual_current_ma:
        return (
            Selective.TOTAL,
            f"upstream RCD type S, {up.residual_current_ma:g} mA >= {ratio:g} x {down.residual_current_ma:g} mA",
        )
    return Selective.NONE, f"an RCD pair needs the upstream time-delayed (type S) with at least {ratio:g} x IΔn"
