"""The arc-fault-detection check: an AFDD (BS EN 62606) at the origin of single-phase AC final circuits supplying
socket-outlets up to 32 A, required in the premises the edition lists and recommended elsewhere (BS 7671:2018
421.1.7). A recommendation is a caution, never a fail. Which premises: data/requirements.json, per edition (the
two editions define a higher-risk residential building differently, said in the note).
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
from service.electrical.rules import requirements

NOTES = {
    "premises": "not stated: give premises (an AFDD is required in some premises, 421.1.7)",
    "afdd": "not stated: give device.afdd (required in these premises)",
    "missing": "required in these premises, and no AFDD is fitted",
    "fitted": "an AFDD is fitted",
    "recommended": "recommended, not required, in these premises",
}
CAUTION = (
    "An arc fault detection device (BS EN 62606) is recommended for this socket-outlet circuit (421.1.7): "
    "record the decision if none is fitted."
)


def _required(cols: CircuitColumns) -> np.ndarray:
    """Where the premises are of a kind the circuit's edition requires AFDDs in."""
    n = cols.needs
    out = np.zeros(n.n, dtype=bool)
    for edition in dict.fromkeys(n.edition.tolist()):
        out |= stated(n.edition, edition) & among(n.premises, requirements.rule(edition, "afdd")["required_in"])
    return out


@check_step("arc-fault-detection", unit="")
def arc_fault_detection(cols: CircuitColumns, loop: FaultLoop, trip: DeviceResponse, earlier: Earlier) -> CheckColumns:
    """Fail where an AFDD is required and stated absent; not-verified where the premises or the device's AFDD is
    not stated where it decides; pass otherwise, with a caution where one is only recommended."""
    n = cols.needs
    with np.errstate(invalid="ignore"):
        small = ~(n.socket_outlet_rating_a > requirements.number("socket_outlets_up_to_a"))
    applies = (
        (n.role == "final") & (n.load == "socket-outlets") & small & (n.phases == 1)
        & (n.current_kind == "ac")
    )  # fmt: skip
    required = _required(cols)
    conditions = [
        unknown(n.premises),
        required & unknown(n.afdd),
        required & stated(n.afdd, False),
        stated(n.afdd, True),
        required,
    ]
    codes = [verdicts.NOT_VERIFIED, verdicts.NOT_VERIFIED, verdicts.FAIL, verdicts.PASS, verdicts.PASS]
    texts = [NOTES[k] for k in ("premises", "afdd", "missing", "fitted", "fitted")]
    empty = np.full(n.n, np.nan)
    recommended = applies & ~required & ~unknown(n.premises) & ~stated(n.afdd, True)
    check = CheckColumns(
        "arc-fault-detection",
        "",
        verdicts.codes(select(conditions, codes, verdicts.PASS)),
        empty,
        empty,
        bases(n.edition, [], [], "afdd"),
        pick(conditions, texts, NOTES["recommended"]),
        applies=applies,
        cautions=[(recommended, CAUTION)],
    )
    return spread(check, n.inverse)
