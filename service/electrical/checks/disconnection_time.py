"""The disconnection-time check: the operating time at the earth fault current against Table 41.1.

BS 7671:2018 411.3.2.2-411.3.2.4 (the times), 411.4.5 (TN) and 411.5.3 (TT) where an RCD disconnects.
"""

from __future__ import annotations

import numpy as np

from service.electrical.checks.base import CheckColumns, Earlier, check_step, pick
from service.electrical.circuit_arrays import CircuitColumns
from service.electrical.devices.characteristic import BEYOND_DATA, ESTIMATED
from service.electrical.devices.response import DeviceResponse
from service.electrical.network.faults import FaultLoop
from service.electrical.results import verdicts

NOTES = {
    "estimated": "Time read from an estimated part of the curve (see the device notes).",
    "no-time-set": (
        "Table 41.1 sets no disconnection time for this case; disconnection may still be required for other reasons."
    ),
    "below-data": "The fault current is below the device's data: no disconnection is shown.",
    "at-most-only": (
        "The device's data show operation only within 'at most' this time; the shorter time required cannot be shown "
        "from standard data."
    ),
}


@check_step("disconnection-time", unit="s")
def disconnection_time(cols: CircuitColumns, loop: FaultLoop, trip: DeviceResponse, earlier: Earlier) -> CheckColumns:
    """Pass where the device that disconnects (the overcurrent device, else the RCD) operates within the time."""
    unsure = trip.rcd_credited & (
        (trip.oc_verdict == verdicts.NOT_VERIFIED) | (trip.rcd_verdict == verdicts.NOT_VERIFIED)
    )
    verdict = verdicts.where(trip.by_rcd, verdicts.PASS, verdicts.where(unsure, verdicts.NOT_VERIFIED, trip.oc_verdict))
    note = pick(
        [
            trip.bound == ESTIMATED,
            ~np.isfinite(trip.required_s),
            trip.bound == BEYOND_DATA,
            verdict == verdicts.NOT_VERIFIED,
        ],
        [NOTES["estimated"], NOTES["no-time-set"], NOTES["below-data"], NOTES["at-most-only"]],
    )
    return CheckColumns(
        "disconnection-time", "s", verdict, trip.time_s, trip.required_s, trip.required_basis, note, device_data=True
    )
