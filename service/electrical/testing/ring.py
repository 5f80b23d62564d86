"""Ring final circuit continuity (BS 7671:2018 643.2.1; the tolerances are common practice).

The end-to-end readings of a ring are judged on their differences, each against the 0.05 ohm the rule
allows: r1 and rn of each other; r2 of r1 times the line/cpc size ratio; and the R1+R2 at the sockets of
(r1 + r2) / 4 (the loop at the mid-point). The expected end-to-end values for the test sheet come from the
conductors' resistance at the test temperature.
"""

from __future__ import annotations

import dataclasses
from typing import Any

from service.electrical.cables.conductors import conductor_columns, operating_temperature_c, temperature_multiplier
from service.electrical.errors import InvalidInput
from service.electrical.inputs import Conductors
from service.electrical.results.verdicts import Verdict
from service.electrical.testing.measured import Judgement

TOLERANCE_OHM = 0.05  # common practice
BASIS = "BS 7671:2018 643.2.1, continuity of ring final circuit conductors; the 0.05 ohm tolerance is common practice"


def _difference(test: str, said: str, difference: float, note: str) -> Judgement:
    verdict = Verdict.PASS if difference <= TOLERANCE_OHM + 1e-12 else Verdict.FAIL
    return Judgement(test, verdict, said, difference, TOLERANCE_OHM, "ohm", BASIS, note)


def judge_ring(measured: Any, conductors: Conductors | None) -> list[Judgement]:
    """Ring continuity from the end-to-end readings: each rule judged on the difference it is about."""
    m, c, tol = measured, conductors, TOLERANCE_OHM
    if all(r is None for r in (m.ring_r1_ohm, m.ring_rn_ohm, m.ring_r2_ohm)):
        return []
    if c is None or not c.ring:
        raise InvalidInput(("measured", "ring_r1_ohm"), "ring continuity readings are for a ring final circuit")
    out = []
    if m.ring_r1_ohm is not None and m.ring_rn_ohm is not None:
        said = f"line and neutral ends within {tol:g} ohm of each other"
        note = f"r1 {m.ring_r1_ohm:g} ohm, rn {m.ring_rn_ohm:g} ohm"
        out.append(_difference("ring-r1-rn", said, abs(m.ring_r1_ohm - m.ring_rn_ohm), note))
    if m.ring_r1_ohm is not None and m.ring_r2_ohm is not None:
        expected = m.ring_r1_ohm * c.line_csa_mm2 / c.cpc_csa_mm2
        said = f"cpc ends within {tol:g} ohm of r1 x {c.line_csa_mm2:g}/{c.cpc_csa_mm2:g} (the cable's size ratio)"
        note = f"r2 {m.ring_r2_ohm:g} ohm against r1 x ratio {expected:.3f} ohm"
        out.append(_difference("ring-r2", said, abs(m.ring_r2_ohm - expected), note))
    if m.ring_r1_ohm is not None and m.ring_r2_ohm is not None and m.r1_plus_r2_ohm is not None:
        expected = (m.ring_r1_ohm + m.ring_r2_ohm) / 4
        said = f"R1+R2 at the sockets within {tol:g} ohm of (r1 + r2) / 4 (the highest reading is at the mid-point)"
        note = f"R1+R2 {m.r1_plus_r2_ohm:g} ohm against (r1 + r2) / 4 = {expected:.3f} ohm"
        out.append(_difference("ring-r1-plus-r2", said, abs(m.r1_plus_r2_ohm - expected), note))
    return out


def end_to_end_ohm(conductors: Conductors, temperature_c: float) -> tuple[float, float, float]:
    """(r1, rn, r2): a ring's end-to-end resistances at ``temperature_c``, ohm, from the conductors' resistance over
    the whole ring (IEC 60228 values; the cpc of a ring is a core of the same cable, at the same temperature)."""
    whole = conductor_columns([dataclasses.replace(conductors, ring=False)])
    scale = float(
        temperature_multiplier(temperature_c) / temperature_multiplier(operating_temperature_c(conductors.insulation))
    )
    return float(whole.r1[0]) * scale, float(whole.rn[0]) * scale, float(whole.r2[0]) * scale
