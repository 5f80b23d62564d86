"""The protective-conductor check: the cpc against sqrt(I^2 t) / k, or Table 54.7 by selection.

BS 7671:2018 543.1.3 (the adiabatic equation, 0.1 s to 5 s) and 543.1.4 (Table 54.7). Below 0.1 s the
energy is the device's let-through I^2 t where given, else I^2 x 0.1 s on the safe side.
"""

from __future__ import annotations

import numpy as np

from .. import protective, verdicts
from ..columns import CircuitColumns
from ..faults import FaultLoop
from ..response import DeviceResponse
from .base import CheckColumns, check_step, pick

BASES = {
    "adiabatic": "BS 7671:2018 543.1.3, S >= sqrt(I^2 t) / k",
    "selection": "BS 7671:2018 543.1.4, Table 54.7 (cpc by selection)",
}
NOTES = {
    "no-cpc": "The cpc is not described (conductors not given), so its size cannot be checked.",
    "energy-0.1s": "Energy I^2 x 0.1 s (conservative: the device clears within 0.1 s).",
    "let-through": "Energy from the device's let-through I^2 t given in the request.",
    "selection": "The cpc meets Table 54.7 by selection.",
    "selection-no-adiabatic": "The cpc meets Table 54.7 by selection; the adiabatic check does not apply at this time.",
    "outside-adiabatic": (
        "The adiabatic equation applies from 0.1 s to 5 s; at this fault the device's time is outside it."
    ),
}
CAUTION_ENERGY = (
    "Below 0.1 s the cpc check uses I^2 x 0.1 s, a conservative stand-in for the device's let-through energy "
    "(give let_through_a2s to use the maker's value)."
)


@check_step("protective-conductor")
def protective_conductor(cols: CircuitColumns, loop: FaultLoop, trip: DeviceResponse) -> CheckColumns:
    """Pass where the cpc is at least the adiabatic minimum, or the Table 54.7 size; not-verified without conductors."""
    c = cols.conductors
    energy, method = protective.fault_energy_a2s(loop.earth_fault_a, trip.time_s, cols.let_through_a2s)
    with np.errstate(invalid="ignore"):
        s_min = np.where(c.present, protective.min_csa_mm2(energy, c.k), np.nan)
    same = c.cpc_material == c.line_material
    selection = protective.selection_csa_mm2(c.line_csa, np.where(same, 1.0, c.k_line), np.where(same, 1.0, c.k))
    verdict, by_calculation, by_selection = protective.cpc_verdicts(c.cpc_csa, s_min, selection)
    verdict = verdicts.where(c.present, verdict, verdicts.NOT_VERIFIED)
    basis = np.where(c.present & ~by_calculation & by_selection, BASES["selection"], BASES["adiabatic"]).astype(object)
    conservative = method == "conservative-0.1s"
    energy_note = pick([conservative, method == "let-through"], [NOTES["energy-0.1s"], NOTES["let-through"]])
    finite = np.isfinite(s_min)
    note = np.select(
        [~c.present, by_calculation, by_selection & finite, by_selection, ~finite],
        [NOTES["no-cpc"], energy_note, NOTES["selection"], NOTES["selection-no-adiabatic"], NOTES["outside-adiabatic"]],
        energy_note,
    ).astype(object)
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
        cautions=[(c.present & conservative, CAUTION_ENERGY)],
    )


def _size_margin(s_min: np.ndarray, csa: np.ndarray) -> np.ndarray:
    """(S - Smin) / S x 100: how much of the cpc is to spare."""
    with np.errstate(divide="ignore", invalid="ignore"):
        return np.where(np.isfinite(s_min) & np.isfinite(csa), (csa - s_min) / csa * 100.0, np.nan)
