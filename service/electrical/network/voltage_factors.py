"""The voltage factors of IEC 60909-0 Table 1 at low voltage (data/voltage_factors.json): Cmin for the smallest
fault currents, cmax for the largest."""

from __future__ import annotations

from service.electrical.datafiles import core_table
from service.electrical.errors import InvalidInput


def c_min() -> float:
    """Minimum voltage factor, IEC 60909-0 Table 1 (0.95 at low voltage)."""
    return float(core_table("voltage_factors")["c_min"])


def c_max_default() -> float:
    """cmax used when none is given: 1.10 (IEC 60909-0 Table 1, systems with a +10 % tolerance)."""
    return float(core_table("voltage_factors")["c_max_default"])


def c_max_bounds() -> tuple[float, float]:
    """The range of cmax at low voltage: 1.05 (+6 % systems) to 1.10 (+10 %), IEC 60909-0 Table 1."""
    low, high = core_table("voltage_factors")["c_max_range"]
    return float(low), float(high)


def check_c_max(c_max: float) -> None:
    """cmax within IEC 60909-0's low-voltage range, else InvalidInput naming ``c_max``."""
    low, high = c_max_bounds()
    if not low <= c_max <= high:
        raise InvalidInput("c_max", f"cmax is from {low:g} to {high:g} at low voltage (IEC 60909-0 Table 1)")
