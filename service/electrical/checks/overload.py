"""The overload check: Ib <= In <= Iz (BS 7671:2018 433.1.1), the ring final rule (433.1.204).

Iz = It x Ca x Cg x Ci x Cc from the capacity tables and factors of Appendix 4 (``circuit.installation``),
times the number of cables in parallel (equal sharing, 523.7). For a BS 3036 fuse Cc = 0.725
(433.1.202). The second condition of 433.1.1, I2 <= 1.45 Iz, holds for breakers and gG fuses
whenever In <= Iz (their I2 is at most 1.45 In) and through Cc for BS 3036.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import numpy as np

from service.electrical.cables import capacity
from service.electrical.checks.base import CheckColumns, Earlier, check_step, pick
from service.electrical.circuit_arrays import CircuitColumns
from service.electrical.column_tools import select
from service.electrical.datafiles import core_table
from service.electrical.devices.response import DeviceResponse
from service.electrical.errors import ElectricalError
from service.electrical.network.faults import FaultLoop
from service.electrical.results import verdicts
from service.electrical.results.shapes import figure

BASES = {
    "general": "BS 7671:2018 433.1.1, Ib <= In <= Iz",
    "ring": "BS 7671:2018 433.1.204, ring final circuit: Iz >= 20 A for a 30 or 32 A device (from memory)",
}
NOTES = {
    "ib-over-in": "The design current exceeds the device's rating (Ib <= In).",
    "no-design-current": "State the design current (circuit.design_current_a) to check overload protection.",
    "no-installation": "State how the cable is run (circuit.installation) to check overload protection.",
    "no-cell": "The capacity table has no cell for this size and method: give the maker's or the book's figure.",
    "material": "The cable family's table is for another conductor material: choose the family of the conductors.",
    "ring-outside": (
        "433.1.204 covers rings of 2.5 mm2 copper (or larger) on 30 or 32 A devices; for another ring the load "
        "sharing must be shown by the design."
    ),
    "memory": "A capacity cell or factor used is from memory or derived (unverified): see the factors' bases.",
    "terminals": (
        "The cable is rated for a conductor above 70 degC: the equipment it lands on must have terminals rated for "
        "that temperature, or the cable is taken at its 70 degC rating (512.1.5; state installation.terminals_c)."
    ),
}


def _capacity(cols: CircuitColumns):
    """It, Iz, the factors, the confidence and the basis of It for every circuit with an installation (NaN
    elsewhere): the request's capacity_a, else the table's cell (the 70 degC table's where the cable runs
    hotter than terminals rated 70 degC, 512.1.5)."""
    n = cols.n
    it, iz = np.full(n, np.nan), np.full(n, np.nan)
    factors, confidence = np.full(n, None, dtype=object), np.full(n, None, dtype=object)
    basis = np.full(n, None, dtype=object)
    c = cols.conductors
    for i, circuit in enumerate(cols.circuits):
        inst = circuit.installation
        if inst is None or not c.present[i]:
            continue
        cell = _cell(inst, circuit.phases, float(c.line_csa[i]), c.line_material[i])
        if cell is None:
            continue
        insulation = capacity.cable_table(inst.cable)["insulation"]
        product, factors[i] = capacity.derating(inst, insulation, circuit.device.standard, float(c.line_csa[i]))
        it[i], iz[i], confidence[i], basis[i] = cell[0], cell[0] * product * c.parallel[i], cell[1], cell[2]
    return it, iz, factors, confidence, basis


def _cell(inst, phases: int, csa_mm2: float, material: str) -> tuple[float, str, str] | None:
    """(It, its confidence, its basis), or None where no table cell or given value covers the cable."""
    if inst.capacity_a is not None:
        return inst.capacity_a, "given", "given in the request (installation.capacity_a)"
    table = capacity.cable_table(inst.cable)
    if material != table.get("material", "copper"):
        return None
    cable = inst.cable
    if inst.terminals_c is not None and inst.terminals_c < table["conductor_operating_c"]:
        cable = capacity.AT_70C.get(cable)
        if cable is None or inst.terminals_c < 70:
            return None
    try:
        cell = capacity.tabulated(cable, inst.installation_method, phases, csa_mm2)
    except ElectricalError:  # no column for these phases, or the method is not in the 70 degC table
        return None
    if cell is None:
        return None
    source = capacity.cable_table(cable)["source"]
    at = f", at 70 degC for terminals rated {inst.terminals_c:g} degC" if cable != inst.cable else ""
    return cell.it_a, cell.confidence, f"{source}, method {inst.installation_method}{at}"


def _ring_rule(cols: CircuitColumns) -> tuple[np.ndarray, dict]:
    """Where the ring rule of 433.1.204 covers the circuit (data/ring_final.json), and the rule."""
    c, ring = cols.conductors, core_table("ring_final")
    covered = c.ring & np.isin(cols.rating_a, ring["ratings_a"]) & (c.line_csa >= ring["min_csa_mm2"])
    covered &= np.isin(cols.standard, ring["standards"]) & (c.line_material == "copper")
    return covered, ring


def _other_material(cols: CircuitColumns) -> np.ndarray:
    """Where the conductors' material is not the one the cable family's table is for (and no capacity is given)."""
    out = np.zeros(cols.n, dtype=bool)
    for i, circuit in enumerate(cols.circuits):
        inst = circuit.installation
        if inst is not None and cols.conductors.present[i] and inst.capacity_a is None:
            out[i] = cols.conductors.line_material[i] != capacity.cable_table(inst.cable).get("material", "copper")
    return out


def _hot_terminals(cols: CircuitColumns) -> np.ndarray:
    """Where a cable rated above 70 degC is used without a stated terminal rating."""
    return np.array(
        [
            c.installation is not None
            and c.installation.terminals_c is None
            and capacity.cable_table(c.installation.cable)["conductor_operating_c"] > 70
            for c in cols.circuits
        ],
        dtype=bool,
    )


def _from_memory(factors: np.ndarray, confidence: np.ndarray) -> np.ndarray:
    """Where the capacity cell or a factor used is from memory."""
    return np.array(
        [
            f is not None
            and (conf in ("M", "D") or "M " in (conf or "") or any("memory" in v["basis"] for v in f.values()))
            for f, conf in zip(factors, confidence, strict=True)
        ],
        dtype=bool,
    )


@dataclass
class Factor:
    """One correction factor and where it comes from."""

    factor: float = figure(nullable=False)
    basis: str = figure(nullable=False)


@dataclass
class OverloadResult:
    """Overload (433.1): Ib <= In <= Iz."""

    design_current_a: float | None = figure("Ib")
    rating_a: float | None = figure("In")
    it_a: float | None = figure("tabulated capacity")
    iz_a: float | None = figure("It x Ca x Cg x Ci x Cc, times the cables in parallel")
    spare_capacity_a: float | None = figure("Iz - Ib: what the cable could still carry (negative: overloaded)")
    factors: dict[str, Any] | None = figure("the correction factors applied, by name", values=Factor)
    capacity_confidence: str | None = figure("how sure the tabulated capacity is")
    capacity_basis: str | None = figure("where It comes from")
    verdict: str = figure(nullable=False, choices=verdicts.VERDICTS)
    basis: str = figure("the clause the verdict rests on", nullable=False)


@check_step("overload", unit="A")
def overload(cols: CircuitColumns, loop: FaultLoop, trip: DeviceResponse, earlier: Earlier) -> CheckColumns:
    """Pass where Ib <= In <= Iz (or the ring rule); not-verified without the design current or the installation."""
    c = cols.conductors
    it, iz, factors, confidence, it_basis = _capacity(cols)
    ib, in_a = cols.design_current_a, cols.rating_a
    ring_rule, ring = _ring_rule(cols)
    with np.errstate(invalid="ignore"):
        ib_over = ib > in_a * (1 + 1e-9)
        in_ok = in_a <= iz * (1 + 1e-9)
    ring_ok = np.where(iz >= ring["min_iz_a"], verdicts.PASS, verdicts.FAIL)
    conditions = [ib_over, np.isnan(ib) | np.isnan(iz), c.ring & ~ring_rule, ring_rule, in_ok]
    choices = [verdicts.FAIL, verdicts.NOT_VERIFIED, verdicts.NOT_VERIFIED, ring_ok, verdicts.PASS]
    verdict = select(conditions, choices, verdicts.FAIL).astype(np.int8)
    no_inst = np.array([ci.installation is None for ci in cols.circuits], dtype=bool)
    why = [ib_over, np.isnan(ib), no_inst, _other_material(cols), np.isnan(iz), c.ring & ~ring_rule]
    names = ["ib-over-in", "no-design-current", "no-installation", "material", "no-cell", "ring-outside"]
    note = pick(why, [NOTES[name] for name in names])
    basis = np.where(ring_rule, BASES["ring"], BASES["general"]).astype(object)
    detail = {
        "design_current_a": ib,
        "rating_a": in_a,
        "it_a": it,
        "iz_a": iz,
        "spare_capacity_a": iz - ib,
        "factors": factors,
        "capacity_confidence": confidence,
        "capacity_basis": it_basis,
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
        cautions=[(_from_memory(factors, confidence), NOTES["memory"]), (_hot_terminals(cols), NOTES["terminals"])],
    )
