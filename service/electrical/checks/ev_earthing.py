"""The ev-earthing check: a charge point on a PME (TN-C-S) supply outdoors needs a measure against a broken PEN
(BS 7671:2018 722.411.4.1): its own earth electrode (TT), or a device that disconnects on a broken PEN.

Applies to every EV charge point. On TN-S and TT supplies the rule does not bite (pass, said in the note).
Where the charge point's location or measure is not stated on a PME supply, not-verified, naming the field.
"""

from __future__ import annotations

import numpy as np

from service.electrical.checks.base import CheckColumns, Earlier, check_step, pick
from service.electrical.checks.facts import among, bases, spread, stated, unknown
from service.electrical.circuit_arrays import CircuitColumns
from service.electrical.column_tools import select
from service.electrical.devices.response import DeviceResponse
from service.electrical.network.faults import FaultLoop
from service.electrical.results import verdicts

NOTES = {
    "not-pme": "not a PME (TN-C-S) supply",
    "measure": "a measure against a broken PEN is fitted",
    "none-outdoors": "a PME earthing facility used for a charge point outdoors, with no measure against a broken PEN",
    "measure-unsaid": "not stated: give ev.earthing_measure (open-pen-device, earth-electrode or none)",
    "location": "not stated: give the charge point's location (outdoors or not), or ev.earthing_measure",
    "indoors": "not outdoors: the charge point's location is stated as not outdoors",
}
MEASURES = ("open-pen-device", "earth-electrode")


@check_step("ev-earthing", unit="")
def ev_earthing(cols: CircuitColumns, loop: FaultLoop, trip: DeviceResponse, earlier: Earlier) -> CheckColumns:
    """Fail where a charge point outdoors on PME has no measure against a broken PEN; pass where one is fitted,
    the supply is not PME, or the charge point is stated to be elsewhere than outdoors."""
    n = cols.needs
    pme = n.earthing == "TN-C-S"
    outdoors = stated(n.location, "outdoors")
    conditions = [
        ~pme,
        among(n.ev_earthing_measure, MEASURES),
        outdoors & stated(n.ev_earthing_measure, "none"),
        outdoors & unknown(n.ev_earthing_measure),
        unknown(n.location),
    ]
    codes = [verdicts.PASS, verdicts.PASS, verdicts.FAIL, verdicts.NOT_VERIFIED, verdicts.NOT_VERIFIED]
    texts = [NOTES[k] for k in ("not-pme", "measure", "none-outdoors", "measure-unsaid", "location")]
    empty = np.full(n.n, np.nan)
    check = CheckColumns(
        "ev-earthing",
        "",
        verdicts.codes(select(conditions, codes, verdicts.PASS)),
        empty,
        empty,
        bases(n.edition, [], [], "ev-earthing"),
        pick(conditions, texts, NOTES["indoors"]),
        applies=n.ev & (n.role == "final"),
    )
    return spread(check, n.inverse)
