"""The rcd check: Zs (TN) or RA (TT) x IΔn <= 50 V where an RCD is fitted (BS 7671:2018 411.4.5, 411.5.3).

Also the RCD's cautions: an unstable electrode (note to Table 41.5). Whether a 30 mA RCD is required is the
additional-protection check's.
"""

from __future__ import annotations

import numpy as np

from service.electrical.checks.base import CheckColumns, Earlier, check_step, pick
from service.electrical.circuit_arrays import CircuitColumns
from service.electrical.devices import residual
from service.electrical.devices.response import DeviceResponse
from service.electrical.network.faults import FaultLoop
from service.electrical.results import verdicts

BASES = {"tn": "BS 7671:2018 411.4.5, Zs x IΔn <= 50 V", "tt": "BS 7671:2018 411.5.3, RA x IΔn <= 50 V"}
NOTES = {
    "ra-not-given": "RA not given: Zs used in its place (larger, so on the safe side).",
    "dc": "d.c.: a general-purpose RCD does not respond to smooth d.c. fault current; it gives no protection here.",
}
CAUTIONS = {
    "electrode-unstable": (
        "Earth electrode resistance above 200 ohm may not be stable (note to BS 7671:2018 Table 41.5)."
    ),
    "loop-unstable": (
        "The loop the RCD is credited on is above 200 ohm: such a value may not be stable (note to BS 7671:2018 "
        "Table 41.5); on TN it points to a fault in the protective conductor path."
    ),
}


@check_step("rcd", unit="ohm")
def rcd(cols: CircuitColumns, loop: FaultLoop, trip: DeviceResponse, earlier: Earlier) -> CheckColumns:
    """Pass where the loop the RCD protects stays within 50 V / IΔn; reported only where an RCD is fitted."""
    verdict = verdicts.where(trip.rcd_loop_ohm <= trip.rcd_limit_ohm, verdicts.PASS, verdicts.FAIL)
    verdict = verdicts.where(cols.has_rcd & ~trip.rcd_credited, verdicts.NOT_VERIFIED, verdict)
    basis = np.where(cols.tt, BASES["tt"], BASES["tn"]).astype(object)
    note = pick(
        [cols.has_rcd & ~trip.rcd_credited, cols.tt & np.isnan(cols.electrode_ohm)],
        [NOTES["dc"], NOTES["ra-not-given"]],
    )
    stable = residual.stable_resistance_limit_ohm()
    with np.errstate(invalid="ignore"):
        unstable = cols.tt & cols.has_rcd & (cols.electrode_ohm > stable)
        high_loop = ~cols.tt & trip.by_rcd & (trip.rcd_loop_ohm > stable)
    return CheckColumns(
        "rcd",
        "ohm",
        verdict,
        trip.rcd_loop_ohm,
        trip.rcd_limit_ohm,
        basis,
        note,
        applies=cols.has_rcd,
        cautions=[(unstable, CAUTIONS["electrode-unstable"]), (high_loop, CAUTIONS["loop-unstable"])],
    )
