"""Earth fault loop impedance and fault currents."""

from __future__ import annotations

from typing import Any

import numpy as np

from .arrays import as_float
from .datafiles import core_table
from .errors import InvalidInput


def c_min() -> float:
    """Minimum voltage factor, IEC 60909-0 Table 1 (0.95 at low voltage)."""
    return float(core_table("voltage_factors")["c_min"])


def c_max_default() -> float:
    """cmax used when none is given: 1.10 (IEC 60909-0 Table 1, systems with a +10 % tolerance)."""
    return float(core_table("voltage_factors")["c_max_default"])


def c_max_options() -> list[float]:
    return [float(c) for c in core_table("voltage_factors")["c_max_options"]]


def loop_impedance_ohm(ze_ohm: Any, r1_plus_r2_ohm: Any) -> np.ndarray:
    """Earth fault loop impedance Zs = Ze + (R1+R2), ohm (BS 7671 411.4.4 / 411.5.4).

    For a TT supply ``ze_ohm`` is the whole external part of the loop, including the
    installation's earth electrode resistance RA.
    """
    return as_float(ze_ohm) + as_float(r1_plus_r2_ohm)


def earth_fault_current_a(u0_v: Any, zs_ohm: Any, voltage_factor: float | None = None) -> np.ndarray:
    """Earth fault current If = U0 x Cmin / Zs, A.

    Cmin = 0.95 (IEC 60909-0 Table 1), the factor BS 7671:2018 builds into its maximum Zs
    tables. Pass ``voltage_factor=1`` for the nominal U0 / Zs.
    """
    factor = c_min() if voltage_factor is None else float(voltage_factor)
    zs = as_float(zs_ohm)
    if np.any(zs <= 0):
        raise InvalidInput("zs_ohm", "the loop impedance must be greater than zero")
    return factor * as_float(u0_v) / zs


def prospective_fault_current_ka(
    u0_v: Any, ze_ohm: Any, stated_ka: Any = None, c_max: float | None = None
) -> np.ndarray:
    """Largest prospective fault current at the origin, kA, for the breaking-capacity check.

    A stated value (from the distributor or a measurement) is used where given (NaN marks 'not
    stated' in an array); otherwise U0 x cmax / Ze with cmax 1.10 (or 1.05) from IEC 60909-0
    Table 1. BS 7671 434.1 asks for the larger of the line-neutral and line-earth values.
    """
    factor = c_max_default() if c_max is None else float(c_max)
    if factor not in c_max_options():
        raise InvalidInput("c_max", f"cmax is one of {c_max_options()} (IEC 60909-0 Table 1)")
    calculated = factor * as_float(u0_v) / as_float(ze_ohm) / 1000.0
    if stated_ka is None:
        return calculated
    stated = np.broadcast_to(as_float(stated_ka), calculated.shape)
    return np.where(np.isnan(stated), calculated, stated)
