"""Maximum earth fault loop impedance for a device and a required time."""

from __future__ import annotations

from typing import Any

import numpy as np

from .arrays import as_float
from .conductors import temperature_multiplier
from .devices.base import Device
from .faults import c_min

COMMON_COLD_FACTOR = 0.8


def max_zs_ohm(device: Device, time_s: Any, u0_v: Any) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Ia (A), how Ia is bounded, and the maximum Zs = U0 x Cmin / Ia (ohm).

    BS 7671:2018 411.4.4 (TN) and 411.5.4 (TT) with Cmin = 0.95 as in Tables 41.2-41.4; Ia is the
    current that operates the device within ``time_s`` (read from its characteristic). NaN where
    the device's data cannot show operation within that time.
    """
    ia, bound = device.current_for(time_s)
    return ia, bound, c_min() * as_float(u0_v) / ia


def measured_limit_ohm(max_zs: Any, operating_c: Any, ambient_c: Any) -> tuple[np.ndarray, np.ndarray]:
    """Limit for a Zs measured with the conductors at ``ambient_c`` instead of their operating temperature.

    The limit scaled by the ratio of resistances (1 + 0.004 (theta_a - 20)) / (1 + 0.004 (theta_op - 20)),
    and beside it the common practice '0.8 rule' (that ratio rounded, applied to the whole Zs).
    Scaling the whole Zs is conservative, since Ze does not change with the installation's temperature.
    """
    limit = as_float(max_zs)
    ratio = temperature_multiplier(ambient_c) / temperature_multiplier(operating_c)
    return limit * ratio, limit * COMMON_COLD_FACTOR
