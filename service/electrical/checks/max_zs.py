"""The max-zs check: Zs against U0 x Cmin / Ia of the overcurrent device, or the RCD's 50 V / IΔn.

BS 7671:2018 411.4.4 (TN) and 411.5.4 (TT); with an RCD where the overcurrent device's limit is not met,
411.4.5 (TN, Zs x IΔn <= 50 V) and 411.5.3 (TT, RA x IΔn <= 50 V).
"""

from __future__ import annotations

import numpy as np

from service.electrical.checks.base import CheckColumns, Earlier, check_step, pick
from service.electrical.checks.rcd import BASES as RCD_BASES
from service.electrical.circuit_arrays import CircuitColumns
from service.electrical.column_tools import select
from service.electrical.devices.characteristic import ESTIMATED
from service.electrical.devices.response import DeviceResponse
from service.electrical.network.faults import FaultLoop
from service.electrical.results import verdicts

BASES = {
    "tn": "BS 7671:2018 411.4.4, Zs <= U0 x Cmin / Ia",
    "tt": "BS 7671:2018 411.5.4, Zs <= U0 x Cmin / Ia",
    "tn-by-rcd": RCD_BASES["tn"] + " (fault protection by the RCD)",
    "tt-by-rcd": RCD_BASES["tt"] + " (fault protection by the RCD)",
}
NOTES = {
    "ia-estimated": "Ia read from an estimated part of the curve.",
    "rcd-protects": "The overcurrent device alone would not meet its limit; the RCD provides fault protection.",
    "no-ia": "The device's data cannot show operation within the required time, so no maximum Zs follows.",
}


@check_step("max-zs", unit="ohm")
def max_zs(cols: CircuitColumns, loop: FaultLoop, trip: DeviceResponse, earlier: Earlier) -> CheckColumns:
    """Pass where Zs is within the overcurrent device's limit, or (with an RCD) the RCD's 50 V limit."""
    limit_oc = trip.max_zs_oc_ohm
    has_limit = np.isfinite(limit_oc)
    oc_ok = has_limit & (loop.zs_ohm <= limit_oc)
    use_rcd = ~oc_ok & trip.rcd_credited
    rcd_ok = trip.rcd_loop_ohm <= trip.rcd_limit_ohm
    verdict = select(
        [oc_ok, use_rcd & rcd_ok, use_rcd, has_limit],
        [verdicts.PASS, verdicts.PASS, verdicts.FAIL, verdicts.FAIL],
        verdicts.NOT_VERIFIED,
    ).astype(np.int8)
    basis = np.where(
        use_rcd, np.where(cols.tt, BASES["tt-by-rcd"], BASES["tn-by-rcd"]), np.where(cols.tt, BASES["tt"], BASES["tn"])
    ).astype(object)
    note = pick(
        [oc_ok & (trip.operating_bound == ESTIMATED), use_rcd, ~has_limit],
        [NOTES["ia-estimated"], NOTES["rcd-protects"], NOTES["no-ia"]],
    )
    value = np.where(use_rcd, trip.rcd_loop_ohm, loop.zs_ohm)
    limit = np.where(use_rcd, trip.rcd_limit_ohm, limit_oc)
    return CheckColumns("max-zs", "ohm", verdict, value, limit, basis, note, device_data=True)
