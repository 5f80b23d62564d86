"""Residual current devices (BS EN 61008-1 RCCBs, the residual part of BS EN 61009-1 RCBOs).

Maximum break times at 1, 2 and 5 times the rated residual current IΔn, as a staircase
characteristic of residual current; fault protection by Zs (TN) or RA (TT) x IΔn <= 50 V.
"""

from __future__ import annotations

from functools import lru_cache
from typing import Any

import numpy as np

from service.electrical.column_tools import as_float, scalar_io
from service.electrical.datafiles import device_table
from service.electrical.devices.characteristic import Characteristic
from service.electrical.errors import UnknownDevice


def _table() -> dict:
    return device_table("residual")


def delays() -> list[str]:
    return list(_table()["delays"])


@lru_cache(maxsize=256)
def rcd_characteristic(residual_current_ma: float, delay: str = "general") -> Characteristic:
    """Maximum break time against residual current (A) for an RCD of IΔn ``residual_current_ma``.

    BS EN 61008-1 / 61009-1 Table 1: general 300 / 150 / 40 ms, type S 500 / 200 / 150 ms at
    1, 2 and 5 IΔn; flat between those multiples (the time at the lower multiple holds).
    """
    table = _table()
    if delay not in table["delays"]:
        raise UnknownDevice(("rcd", "delay"), f"RCD delay is one of {delays()}, not {delay!r}")
    if not residual_current_ma > 0:
        raise UnknownDevice(("rcd", "residual_current_ma"), "the rated residual current must be greater than zero")
    row = table["delays"][delay]
    idn = residual_current_ma / 1000.0
    points: list[tuple[float, float]] = []
    for k, (multiple, time) in enumerate(zip(row["multiples"], row["max_time_s"], strict=True)):
        if k > 0:
            points.append((multiple * idn, points[-1][1]))
        points.append((multiple * idn, time))
    return Characteristic.from_points(points)


@scalar_io
def rcd_max_loop_ohm(residual_current_ma: Any) -> np.ndarray:
    """Largest Zs (TN) or RA (TT), ohm, for fault protection by an RCD: 50 V / IΔn.

    BS 7671:2018 411.4.5 (TN) and 411.5.3 (TT); Table 41.5 lists 1667, 500, 167 and 100 ohm for
    30, 100, 300 and 500 mA.
    """
    return float(_table()["touch_voltage_limit_v"]) / (as_float(residual_current_ma) / 1000.0)


def additional_protection_max_ma() -> float:
    """IΔn for additional protection: at most 30 mA (BS 7671:2018 415.1.1)."""
    return float(_table()["additional_protection_max_ma"])


def stable_resistance_limit_ohm() -> float:
    """Earth electrode resistances above this may not be stable (note to Table 41.5)."""
    return float(_table()["stable_resistance_limit_ohm"])
