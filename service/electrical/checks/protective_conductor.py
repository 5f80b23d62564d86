"""The protective-conductor check: the cpc against sqrt(I^2 t) / k, or Table 54.7 by selection.

BS 7671:2018 543.1.3 (the adiabatic equation, 0.1 s to 5 s) and 543.1.4 (Table 54.7). Below 0.1 s the
energy is the device's let-through I^2 t where given, else I^2 x 0.1 s on the safe side.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from service.electrical.cables import protective
from service.electrical.checks.base import CheckColumns, Earlier, check_step, pick
from service.electrical.circuit_arrays import CircuitColumns
from service.electrical.column_tools import nan_to, one_of, select
from service.electrical.devices.response import DeviceResponse
from service.electrical.network.faults import FaultLoop
from service.electrical.results import verdicts
from service.electrical.results.shapes import figure

BASES = {
    "adiabatic": "BS 7671:2018 543.1.3, S >= sqrt(I^2 t) / k",
    "selection": "BS 7671:2018 543.1.4, Table 54.7 (cpc by selection)",
}
NOTES = {
    "no-cpc": "The cpc is not described (conductors not given), so its size cannot be checked.",
    "energy-0.1s": "Energy I^2 x 0.1 s (conservative: the device clears within 0.1 s).",
    "let-through": "Energy from the device's let-through I^2 t given in the request.",
    "let-through-data": "Energy from the standard's largest let-through for the device (see energy_data).",
    "stand-in": (
        "The cpc fails only on a stand-in for the device's energy (the standard's limit or I^2 x 0.1 s): the maker's "
        "let-through I^2 t (device.let_through_curve, or device_defaults for every such device) may show compliance."
    ),
    "selection-unprotected": (
        "Table 54.7 presumes the line conductor is protected against fault current (short-circuit check), which is "
        "not shown: the selection cannot stand in for the adiabatic check."
    ),
    "selection": "The cpc meets Table 54.7 by selection.",
    "selection-no-adiabatic": "The cpc meets Table 54.7 by selection; the adiabatic check does not apply at this time.",
    "outside-adiabatic": (
        "The adiabatic equation applies from 0.1 s to 5 s; at this fault the device's time is outside it."
    ),
}
CAUTION_ENERGY = (
    "Below 0.1 s the cpc check uses I^2 x 0.1 s, a conservative stand-in for the device's let-through energy "
    "(give let_through_curve or let_through_a2s to use the maker's data)."
)


@dataclass
class ProtectiveConductorResult:
    """The protective conductor's figures (543.1): the size it needs against the size it has."""

    k: float | None = figure("the k used: tabulated where the case is a table row, else the formula")
    k_formula: float | None = figure("IEC 60364-5-54 Annex A")
    k_basis: str | None = figure("where k comes from")
    min_csa_mm2: float | None = figure("sqrt(I^2 t) / k, the smallest cpc the fault allows", csv=(9, "min_cpc_csa_mm2"))
    csa_mm2: float | None = figure("the cpc in the circuit", csv=(10, "cpc_csa_mm2"))
    next_standard_csa_mm2: float | None = figure("the smallest standard size at or above min_csa_mm2")
    selection_csa_mm2: float | None = figure("BS 7671 Table 54.7")
    energy_a2s: float | None = figure("the larger of the energies at the smallest and the largest earth fault")
    energy_basis: str | None = figure("how the energy was found", choices=protective.ENERGY_METHODS)
    energy_data: str | None = figure("which standard limit, if any")
    verdict: str = figure(nullable=False, choices=verdicts.VERDICTS)
    basis: str = figure("the clause the verdict rests on", nullable=False)


@check_step("protective-conductor", unit="mm2")
def protective_conductor(cols: CircuitColumns, loop: FaultLoop, trip: DeviceResponse, earlier: Earlier) -> CheckColumns:
    """Pass where the cpc is at least the adiabatic minimum, or the Table 54.7 size; not-verified without conductors."""
    c = cols.conductors
    energy, method, data_basis = _energy(loop, trip)
    with np.errstate(invalid="ignore"):
        s_min = np.where(c.present, protective.min_csa_mm2(energy, c.k), np.nan)
    same = c.cpc_material == c.line_material
    selection = protective.selection_csa_mm2(c.line_csa, np.where(same, 1.0, c.k_line), np.where(same, 1.0, c.k))
    line_protected = earlier["short-circuit"].verdict == verdicts.PASS
    verdict, by_calculation, by_selection = protective.cpc_verdicts(
        c.cpc_csa, s_min, np.where(line_protected, selection, np.nan)
    )
    stand_in_fail = (verdict == verdicts.FAIL) & one_of(method, protective.STAND_IN_METHODS)
    verdict = verdicts.where(c.present & ~stand_in_fail, verdict, verdicts.NOT_VERIFIED)
    basis = np.where(c.present & ~by_calculation & by_selection, BASES["selection"], BASES["adiabatic"]).astype(object)
    selection_unprotected = c.present & ~line_protected & ~by_calculation & (c.cpc_csa >= nan_to(selection, np.inf))
    note = _note(c.present, method, s_min, stand_in_fail, by_calculation, by_selection, selection_unprotected)
    detail = {
        "k": c.k,
        "k_formula": c.k_formula,
        "k_basis": c.k_table,
        "min_csa_mm2": s_min,
        "csa_mm2": c.cpc_csa,
        "next_standard_csa_mm2": protective.next_standard_size_mm2(s_min),
        "selection_csa_mm2": selection,
        "energy_a2s": np.where(c.present, energy, np.nan),
        "energy_basis": np.where(c.present, method, None).astype(object),
        "energy_data": np.where(c.present, data_basis, None).astype(object),
        "verdict": verdict,
        "basis": basis,
    }
    return CheckColumns(
        "protective-conductor",
        "mm2",
        verdict,
        c.cpc_csa,
        s_min,
        basis,
        note,
        margin_percent=_size_margin(s_min, c.cpc_csa),
        detail=("protective_conductor", detail),
        cautions=[(c.present & (method == "conservative-0.1s"), CAUTION_ENERGY)],
        device_data=True,
    )


def _note(present, method, s_min, stand_in_fail, by_calculation, by_selection, selection_unprotected) -> np.ndarray:
    energy_note = pick(
        [method == "conservative-0.1s", method == "let-through", method == "let-through-data"],
        [NOTES["energy-0.1s"], NOTES["let-through"], NOTES["let-through-data"]],
    )
    finite = np.isfinite(s_min)
    conditions = [
        ~present,
        stand_in_fail,
        by_calculation,
        by_selection & finite,
        by_selection,
        selection_unprotected,
        ~finite,
    ]
    names = [
        "no-cpc",
        "stand-in",
        None,
        "selection",
        "selection-no-adiabatic",
        "selection-unprotected",
        "outside-adiabatic",
    ]
    texts = [energy_note if name is None else NOTES[name] for name in names]
    return select(conditions, texts, energy_note).astype(object)


def _energy(loop: FaultLoop, trip: DeviceResponse):
    """The cpc's energy: the larger of the smallest earth fault (far end) and the largest (origin), A^2 s.

    At the far end the device that disconnects decides (an RCD with I^2 x 0.1 s below 0.1 s, as it does
    not limit the current); at the origin the overcurrent device. Outside the adiabatic range at the far
    end there is no energy to size by (NaN).
    """
    rcd_energy, rcd_method = protective.fault_energy_a2s(loop.earth_fault_a, trip.time_s)
    far_energy = np.where(trip.by_rcd, rcd_energy, trip.cpc_far.energy_a2s)
    far_method = np.where(trip.by_rcd, rcd_method, trip.cpc_far.method)
    near = trip.cpc_near
    use_near = np.isfinite(far_energy) & (nan_to(near.energy_a2s, 0.0) > far_energy)
    energy = np.where(use_near, near.energy_a2s, far_energy)
    method = np.where(use_near, near.method, far_method).astype(object)
    data_basis = np.where(use_near, near.data_basis, np.where(trip.by_rcd, None, trip.cpc_far.data_basis))
    return energy, method, data_basis.astype(object)


def _size_margin(s_min: np.ndarray, csa: np.ndarray) -> np.ndarray:
    """(S - Smin) / S x 100: how much of the cpc is to spare."""
    with np.errstate(divide="ignore", invalid="ignore"):
        return np.where(np.isfinite(s_min) & np.isfinite(csa), (csa - s_min) / csa * 100.0, np.nan)
