"""Maximum earth fault loop impedance for a device and a required time."""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import numpy as np

from service.electrical.cables.conductors import operating_temperature_c, temperature_multiplier
from service.electrical.column_tools import as_float, finite_or_none, scalar_io
from service.electrical.devices.base import Device
from service.electrical.devices.catalogue import resolve
from service.electrical.devices.characteristic import bound_names
from service.electrical.devices.residual import rcd_max_loop_ohm
from service.electrical.errors import ElectricalError
from service.electrical.inputs import DeviceSpec
from service.electrical.network.faults import c_min

COMMON_COLD_FACTOR = 0.8


@scalar_io
def max_zs_ohm(device: Device, time_s: Any, u0_v: Any) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Ia (A), how Ia is bounded, and the maximum Zs = U0 x Cmin / Ia (ohm).

    BS 7671:2018 411.4.4 (TN) and 411.5.4 (TT) with Cmin = 0.95 as in Tables 41.2-41.4; Ia is the
    current that operates the device within ``time_s`` (read from its characteristic). NaN where
    the device's data cannot show operation within that time.
    """
    ia, codes = device.characteristic.current_codes(time_s)
    return ia, bound_names(codes), max_zs_for_current_ohm(u0_v, ia)


def max_zs_for_current_ohm(u0_v: Any, operating_current_a: Any) -> np.ndarray:
    """Max Zs = U0 x Cmin / Ia, ohm (BS 7671:2018 411.4.4, 411.5.4; Cmin 0.95 as in Tables 41.2-41.4)."""
    return c_min() * as_float(u0_v) / as_float(operating_current_a)


@scalar_io
def measured_limit_ohm(max_zs: Any, operating_c: Any, ambient_c: Any) -> tuple[np.ndarray, np.ndarray]:
    """Limit for a Zs measured with the conductors at ``ambient_c`` instead of their operating temperature.

    The limit scaled by the ratio of resistances (1 + 0.004 (theta_a - 20)) / (1 + 0.004 (theta_op - 20)),
    and beside it the common practice '0.8 rule' (that ratio rounded, applied to the whole Zs).
    Scaling the whole Zs is conservative, since Ze does not change with the installation's temperature.
    """
    limit = as_float(max_zs)
    ratio = temperature_multiplier(ambient_c) / temperature_multiplier(operating_c)
    return limit * ratio, limit * COMMON_COLD_FACTOR


MAX_ZS_BASIS = "BS 7671:2018 411.4.4 / 411.5.4: Zs <= U0 x Cmin / Ia, Cmin 0.95 (Tables 41.2-41.4 form)"


@dataclass
class MaxZs:
    """The answer to 'how high may Zs be?': Ia, max Zs, the limit for a value measured cold, the RCD's limit."""

    operating_current_a: float | None
    bound: str
    max_zs_ohm: float | None
    max_measured_zs_ohm: float | None
    max_measured_zs_rule_of_thumb_ohm: float | None
    rcd_max_zs_ohm: float | None
    device: dict[str, Any]
    basis: str = MAX_ZS_BASIS


def max_zs_for(
    spec: DeviceSpec, time_s: float, u0_v: float, insulation: str = "thermoplastic-70", ambient_c: float = 20.0
) -> MaxZs:
    """Ia for ``time_s``, max Zs = U0 x Cmin / Ia, its limit for a Zs measured at ``ambient_c``, and 50 V / IΔn.

    Errors carry a path below the device.
    """
    try:
        dev = resolve(spec)
    except ElectricalError as err:
        raise err.within("device") from None
    ia, bound, zs = max_zs_ohm(dev, time_s, u0_v)
    cold, rule = measured_limit_ohm(zs, operating_temperature_c(insulation), ambient_c)
    rcd = None if spec.rcd is None else finite_or_none(rcd_max_loop_ohm(spec.rcd.residual_current_ma))
    return MaxZs(
        operating_current_a=finite_or_none(ia),
        bound=str(bound),
        max_zs_ohm=finite_or_none(zs),
        max_measured_zs_ohm=finite_or_none(cold),
        max_measured_zs_rule_of_thumb_ohm=finite_or_none(rule),
        rcd_max_zs_ohm=rcd,
        device=dev.summary(),
    )
