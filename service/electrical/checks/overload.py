"""The overload check: Ib <= In <= Iz (BS 7671:2018 433.1.1), the ring final rule (433.1.204).

Iz = It x Ca x Cg x Ci x Cc from the capacity tables and factors of Appendix 4 (``circuit.installation``),
times the number of cables in parallel (equal sharing, 523.7). For a BS 3036 fuse Cc = 0.725
(433.1.202). The second condition of 433.1.1, I2 <= 1.45 Iz, holds for breakers and gG fuses
whenever In <= Iz (their I2 is at most 1.45 In) and through Cc for BS 3036.
"""

from __future__ import annotations

import numpy as np

from .. import capacity, verdicts
from ..columns import CircuitColumns
from ..datafiles import core_table
from ..errors import ElectricalError
from ..faults import FaultLoop
from ..response import DeviceResponse
from .base import CheckColumns, Earlier, check_step, pick

BASES = {
    "general": "BS 7671:2018 433.1.1, Ib <= In <= Iz",
    "ring": "BS 7671:2018 433.1.204, ring final circuit: Iz >= 20 A for a 30 or 32 A device (from memory)",
}
NOTES = {
    "ib-over-in": "The design current exceeds the device's rating (Ib <= In).",
    "no-design-current": "State the design current (circuit.design_current_a) to check overload protection.",
    "no-installation": "State how the cable is run (circuit.installation) to check overload protection.",
    "no-cell": "The capacity table has no cell for this size and method: give the maker's or the book's figure.",
    "aluminium": "The capacity tables here are for copper: an aluminium cable's capacity needs its own table.",
    "ring-outside": (
        "433.1.204 covers rings of 2.5 mm2 copper (or larger) on 30 or 32 A devices; for another ring the load "
        "sharing must be shown by the design."
    ),
    "memory": "A capacity cell or factor used is from memory (unverified): see the factors' bases.",
}


def _capacity(cols: CircuitColumns):
    """It, Iz, the factors and the confidence for every circuit with an installation (NaN elsewhere)."""
    n = cols.n
    it, iz = np.full(n, np.nan), np.full(n, np.nan)
    factors, confidence = np.full(n, None, dtype=object), np.full(n, None, dtype=object)
    c = cols.conductors
    for i, circuit in enumerate(cols.circuits):
        inst = circuit.installation
        if inst is None or not c.present[i] or c.line_material[i] != "copper":
            continue
        try:
            cell = capacity.tabulated(inst.cable, inst.installation_method, circuit.phases, float(c.line_csa[i]))
        except ElectricalError:  # no column for these phases
            cell = None
        if cell is None:
            continue
        insulation = capacity.cable_table(inst.cable)["insulation"]
        product, factors[i] = capacity.derating(inst, insulation, circuit.device.standard, float(c.line_csa[i]))
        it[i], iz[i], confidence[i] = cell.it_a, cell.it_a * product * c.parallel[i], cell.confidence
    return it, iz, factors, confidence


def _ring_rule(cols: CircuitColumns) -> tuple[np.ndarray, dict]:
    """Where the ring rule of 433.1.204 covers the circuit (data/ring_final.json), and the rule."""
    c, ring = cols.conductors, core_table("ring_final")
    covered = c.ring & np.isin(cols.rating_a, ring["ratings_a"]) & (c.line_csa >= ring["min_csa_mm2"])
    covered &= np.isin(cols.standard, ring["standards"]) & (c.line_material == "copper")
    return covered, ring


def _from_memory(factors: np.ndarray, confidence: np.ndarray) -> np.ndarray:
    """Where the capacity cell or a factor used is from memory."""
    return np.array(
        [
            f is not None and ("M" in (conf or "") or any("memory" in v["basis"] for v in f.values()))
            for f, conf in zip(factors, confidence, strict=True)
        ],
        dtype=bool,
    )


@check_step("overload")
def overload(cols: CircuitColumns, loop: FaultLoop, trip: DeviceResponse, earlier: Earlier) -> CheckColumns:
    """Pass where Ib <= In <= Iz (or the ring rule); not-verified without the design current or the installation."""
    c = cols.conductors
    it, iz, factors, confidence = _capacity(cols)
    ib, in_a = cols.design_current_a, cols.rating_a
    ring_rule, ring = _ring_rule(cols)
    with np.errstate(invalid="ignore"):
        ib_over = ib > in_a * (1 + 1e-9)
        in_ok = in_a <= iz * (1 + 1e-9)
    ring_ok = np.where(iz >= ring["min_iz_a"], verdicts.PASS, verdicts.FAIL)
    conditions = [ib_over, np.isnan(ib) | np.isnan(iz), c.ring & ~ring_rule, ring_rule, in_ok]
    choices = [verdicts.FAIL, verdicts.NOT_VERIFIED, verdicts.NOT_VERIFIED, ring_ok, verdicts.PASS]
    verdict = np.select(conditions, choices, verdicts.FAIL).astype(np.int8)
    no_inst = np.array([ci.installation is None for ci in cols.circuits], dtype=bool)
    why = [ib_over, np.isnan(ib), no_inst, c.present & (c.line_material != "copper"), np.isnan(iz), c.ring & ~ring_rule]
    names = ["ib-over-in", "no-design-current", "no-installation", "aluminium", "no-cell", "ring-outside"]
    note = pick(why, [NOTES[name] for name in names])
    basis = np.where(ring_rule, BASES["ring"], BASES["general"]).astype(object)
    detail = {
        "design_current_a": ib,
        "rating_a": in_a,
        "it_a": it,
        "iz_a": iz,
        "factors": factors,
        "capacity_confidence": confidence,
        "verdict": verdict,
        "basis": basis,
    }
    return CheckColumns(
        "overload",
        "A",
        verdict,
        np.where(ring_rule, ring["min_iz_a"], in_a),
        iz,
        basis,
        note,
        detail=("overload", detail),
        cautions=[(_from_memory(factors, confidence), NOTES["memory"])],
    )
