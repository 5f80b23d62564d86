"""The rcd-type check: an RCD whose type suits the load (BS 7671:2018 531.3.3; EV charge points 722.531.3.101).

Type AC only for fixed equipment of a kind known to draw no d.c. component (the kinds are the edition's, in
data/requirements.json); otherwise type A, F or B. An EV charge point needs protection against d.c. fault
current of 6 mA or more: a type B RCD, or a type A or F RCD with d.c. fault detection in the charge point.
Applies where an RCD is fitted, and to every EV charge point.
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
    "ev-no-rcd": "an EV charge point needs its own RCD, type B or type A/F with d.c. fault detection",
    "type": "not stated: give device.rcd.type (AC, A, F or B)",
    "ev-ac": "type AC on an EV charge point: a type B RCD, or type A or F with d.c. fault detection, is required",
    "ev-no-dc": "type A or F on an EV charge point without d.c. fault detection (6 mA): type B, or an RDC-DD, needed",
    "ev-dc": "not stated: give ev.dc_fault_detection (a type A or F RCD needs it on a charge point)",
    "ac": "type AC here: type A at least where the load may draw a d.c. component",
    "ac-equipment": "not stated: give the circuit's equipment (type AC: fixed equipment drawing no d.c. only)",
    "ac-ok": "type AC on fixed equipment of a kind with no d.c. component in its load current",
    "ok": "the RCD's type suits the circuit",
}


def _ac_accepted(cols: CircuitColumns) -> np.ndarray:
    """Where type AC is accepted: fixed equipment of a kind the circuit's edition lists as drawing no d.c."""
    n = cols.needs
    fixed = (n.role == "final") & (n.load == "fixed-equipment")
    accepted = np.zeros(n.n, dtype=bool)
    for edition in dict.fromkeys(n.edition.tolist()):
        kinds = requirements.rule(edition, "rcd-type")["type_ac_accepted_for"]
        accepted |= stated(n.edition, edition) & among(n.equipment, kinds)
    return fixed & accepted


@check_step("rcd-type", unit="")
def rcd_type(cols: CircuitColumns, loop: FaultLoop, trip: DeviceResponse, earlier: Earlier) -> CheckColumns:
    """Pass where the RCD's type suits the load; fail where it does not; not-verified where the type, or a fact it
    depends on, is not stated."""
    n = cols.needs
    ev = n.ev & (n.role == "final")
    t = n.rcd_type
    ac, a_or_f, b = stated(t, "AC"), among(t, ("A", "F")), stated(t, "B")
    no_type = n.has_rcd & unknown(t)
    fixed_unsaid = (n.role == "final") & (n.load == "fixed-equipment") & unknown(n.equipment)
    conditions = [
        ev & ~n.has_rcd,
        no_type,
        ev & ac,
        ev & a_or_f & stated(n.ev_dc_fault_detection, False),
        ev & a_or_f & unknown(n.ev_dc_fault_detection),
        ev & (b | (a_or_f & stated(n.ev_dc_fault_detection, True))),
        ac & _ac_accepted(cols),
        ac & fixed_unsaid,
        ac,
    ]
    codes = [verdicts.FAIL, verdicts.NOT_VERIFIED, verdicts.FAIL, verdicts.FAIL, verdicts.NOT_VERIFIED, verdicts.PASS,
             verdicts.PASS, verdicts.NOT_VERIFIED, verdicts.FAIL]  # fmt: skip
    texts = [NOTES[k] for k in ("ev-no-rcd", "type", "ev-ac", "ev-no-dc", "ev-dc", "ok", "ac-ok", "ac-equipment", "ac")]
    verdict = verdicts.codes(select(conditions, codes, verdicts.PASS))
    empty = np.full(n.n, np.nan)
    check = CheckColumns(
        "rcd-type",
        "",
        verdict,
        empty,
        empty,
        bases(n.edition, [ev], ["ev-rcd-type"], "rcd-type"),
        pick(conditions, texts, NOTES["ok"]),
        applies=n.has_rcd | ev,
    )
    return spread(check, n.inverse)
