"""Let-through energy below 0.1 s: energy-limiting classes of breakers, the operating I2t of gG fuses.

Tables: data/let_through_energy.json (BS EN 60898-1 Annex ZA, from memory) and data/gg_i2t.json
(IEC 60269-1, from memory). Every figure here is a limit the standard allows, not what a given device
does: a check that fails on it cannot be shown either way (the maker's figure decides).
"""

from __future__ import annotations

from functools import lru_cache
from typing import Any

import numpy as np

from service.electrical.column_tools import as_float
from service.electrical.datafiles import device_table
from service.electrical.errors import InvalidInput

ENERGY_CLASSES = (1, 2, 3)


def _classes() -> dict:
    return device_table("let_through_energy")


def default_class() -> tuple[int, str]:
    """The class taken where a breaker's marking is not given, and why (common practice, to be confirmed)."""
    table = _classes()
    return int(table["default_class"]), table["default_class_basis"]


def class_applies(type_: str | None, rating_a: float) -> bool:
    """Whether BS EN 60898-1 Annex ZA classes a breaker of this type and rating (types B and C up to 32 A)."""
    table = _classes()
    return type_ in table["types"] and rating_a <= max(b["rating_up_to_a"] for b in table["bands"])


def class_let_through_a2s(type_: str, rating_a: float, energy_class: int, current_a: Any) -> np.ndarray:
    """Largest I2t (A2s) a breaker of ``energy_class`` may let through at each prospective current.

    The column at or above the current (on the safe side); NaN above the last column, or for class 1
    (no limit set). BS EN 60898-1 Annex ZA.
    """
    if energy_class not in ENERGY_CLASSES:
        raise InvalidInput("energy_limiting_class", f"the energy-limiting class is one of {list(ENERGY_CLASSES)}")
    current = as_float(current_a)
    if energy_class == 1 or not class_applies(type_, rating_a):
        return np.full(current.shape, np.nan)
    limits, energies = _columns(type_, rating_a, energy_class)
    idx = np.searchsorted(limits, current, side="left")
    return np.where(idx < len(limits), energies[np.minimum(idx, len(limits) - 1)], np.nan)


@lru_cache(maxsize=64)
def _columns(type_: str, rating_a: float, energy_class: int) -> tuple[np.ndarray, np.ndarray]:
    band = next(b for b in _classes()["bands"] if b["rating_above_a"] < rating_a <= b["rating_up_to_a"])
    currents = np.array([c["prospective_current_a"] for c in band["columns"]], dtype=float)
    energies = np.array([c[f"class_{energy_class}"][type_] for c in band["columns"]], dtype=float)
    return currents, energies


def _gg_row(rating_a: float) -> dict | None:
    """The gG I2t row of a rating: its own, or the next larger rating's (larger energies: the safe side)."""
    rows = sorted(device_table("gg_i2t")["rows"], key=lambda r: r["rating_a"])
    return next((r for r in rows if r["rating_a"] >= rating_a), None)


def gg_operating_a2s(rating_a: float) -> tuple[float, str] | None:
    """The largest operating I2t of a gG fuse-link (IEC 60269-1, at 0.01 s), with its basis; None beyond the table."""
    row = _gg_row(rating_a)
    if row is None:
        return None
    own = "its own" if row["rating_a"] == rating_a else f"the next larger rating's ({row['rating_a']:g} A)"
    return float(row["operating_max_a2s"]), f"IEC 60269-1 gG operating I2t, {own}, from memory"


def gg_pre_arcing_a2s(rating_a: float) -> float | None:
    """The smallest pre-arcing I2t of a gG fuse-link (IEC 60269-1, at 0.01 s): its own rating's, or the next
    smaller rating's (a smaller energy: the safe side for selectivity); None below the table."""
    rows = sorted(device_table("gg_i2t")["rows"], key=lambda r: r["rating_a"])
    below = [r for r in rows if r["rating_a"] <= rating_a]
    return float(below[-1]["pre_arcing_min_a2s"]) if below else None


def check_curve(curve: tuple[tuple[float, float], ...]) -> None:
    """A maker's let-through curve: at least two points, currents rising, energies above zero and not falling."""
    if len(curve) < 2:
        raise InvalidInput("let_through_curve", "give at least two points")
    currents, energies = zip(*curve, strict=True)
    if any(b <= a for a, b in zip(currents, currents[1:], strict=False)):
        raise InvalidInput("let_through_curve", "the prospective currents must rise from point to point")
    if min(energies) <= 0 or any(b < a for a, b in zip(energies, energies[1:], strict=False)):
        raise InvalidInput(
            "let_through_curve", "the energies must be above zero and must not fall as the current rises"
        )


def curve_a2s(curve: tuple[tuple[float, float], ...], current_a: Any) -> np.ndarray:
    """The maker's let-through I2t (A2s) at each prospective current, read on log-log axes between the points.

    Below the first point's current: the first point's energy (never extrapolated below it, the safe side, as the
    energy rises with the current); above the last point's current: NaN (never extrapolated: the curve says
    nothing there).
    """
    current = as_float(current_a)
    log_i, log_e = np.log(np.array(curve, dtype=float)).T
    with np.errstate(divide="ignore", invalid="ignore"):
        energy = np.exp(np.interp(np.log(current), log_i, log_e))
    for point_a, point_a2s in curve:  # at a point, its own figure (no round trip through logarithms)
        energy = np.where(current == point_a, point_a2s, energy)
    energy = np.where(current < curve[0][0], curve[0][1], energy)
    return np.where(current > curve[-1][0], np.nan, energy)


def curve_limit_a(curve: tuple[tuple[float, float], ...], energy_a2s: float) -> float:
    """The largest prospective current (A) within the curve at which its energy stays at or below ``energy_a2s``:
    the crossing read on log-log axes, the last point's current where the curve never reaches it, 0 where even its
    first point is above it."""
    if curve[0][1] > energy_a2s:
        return 0.0
    for (i0, e0), (i1, e1) in zip(curve, curve[1:], strict=False):
        if e1 > energy_a2s:
            if e1 == e0:
                return i0
            share = (np.log(energy_a2s) - np.log(e0)) / (np.log(e1) - np.log(e0))
            return float(np.exp(np.log(i0) + share * (np.log(i1) - np.log(i0))))
    return float(curve[-1][0])


def provenance() -> list[dict[str, Any]]:
    from service.electrical.datafiles import provenance as of

    return [of(_classes()), of(device_table("gg_i2t"))]
