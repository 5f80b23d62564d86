"""The voltage-drop check: the drop from the origin of the installation to the load against its limit.

BS 7671:2018 525 and Appendix 4 section 6.4: 3 % for lighting and 5 % for other uses on a public supply
(6 % and 8 % on a private one, from memory), measured from the origin: the drop of the sub-mains above a
board counts against each circuit below it. The circuit's own drop is mV/A/m x Ib x L (the three-phase
column and the line voltage for a three-phase circuit), shared by cables in parallel, over a quarter of
the length on a ring. A distribution circuit is judged on the drop to the board it feeds against the
limit of its use, which the final circuits below can only add to.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from service.electrical.cables import capacity
from service.electrical.checks.base import CheckColumns, Earlier, check_step, pick
from service.electrical.circuit_arrays import CircuitColumns
from service.electrical.column_tools import select
from service.electrical.devices.response import DeviceResponse
from service.electrical.errors import ElectricalError
from service.electrical.network.faults import FaultLoop
from service.electrical.results import verdicts
from service.electrical.results.shapes import figure

BASES = {
    "final": "BS 7671:2018 525, Appendix 4 (6.4): the drop from the origin within the limit for the use",
    "distribution": "BS 7671:2018 525, Appendix 4 (6.4): the drop from the origin to the board fed, within the limit",
}
NOTES = {
    "no-design-current": "State the design current (circuit.design_current_a) to work out the voltage drop.",
    "no-installation": "State the cable (circuit.installation) for its mV/A/m, to work out the voltage drop.",
    "no-cell": "The cable's table has no mV/A/m for this size: give the maker's or the book's figure.",
    "no-upstream": "The drop from the origin to this board is not known: its feed needs a design current and a cable.",
}


def _mv_per_a_m(cols: CircuitColumns) -> tuple[np.ndarray, np.ndarray]:
    """mV/A/m of each circuit's cable (Tables 4D5, 4E4B ...), one lookup per distinct cable, size and phases."""
    mv, basis, seen = np.full(cols.n, np.nan), np.full(cols.n, None, dtype=object), {}
    c = cols.conductors
    for i, circuit in enumerate(cols.circuits):
        run = circuit.installation
        if run is None or not c.present[i]:
            continue
        if run.voltage_drop_mv_per_a_m is not None:
            mv[i], basis[i] = run.voltage_drop_mv_per_a_m, "given in the request (installation.voltage_drop_mv_per_a_m)"
            continue
        key = (run.cable, float(c.line_csa[i]), circuit.phases, run.reactance_mohm_per_m, run.installation_method)
        if key not in seen:
            try:
                seen[key] = capacity.voltage_drop_mv_per_a_m(*key)
            except ElectricalError:
                seen[key] = (np.nan, None)
        mv[i], basis[i] = seen[key]
    return mv, basis


def _limits(cols: CircuitColumns) -> tuple[np.ndarray, np.ndarray]:
    limit, basis = np.empty(cols.n), np.empty(cols.n, dtype=object)
    for key in set(zip(cols.supply_kind.tolist(), cols.use.tolist(), strict=True)):
        value, text = capacity.voltage_drop_limit_percent(*key)
        where = (cols.supply_kind == key[0]) & (cols.use == key[1])
        limit[where], basis[where] = value, text
    own = ~np.isnan(cols.drop_limit_percent)
    return np.where(own, cols.drop_limit_percent, limit), np.where(own, "set for the circuit", basis).astype(object)


@dataclass
class VoltageDropResult:
    """The drop from the origin to the load against its limit (525)."""

    mv_per_a_m: float | None = figure("the cable's voltage drop per ampere and metre (Appendix 4 tables, or given)")
    mv_basis: str | None = figure("where mV/A/m comes from")
    drop_v: float | None = figure("mV/A/m x Ib x L / 1000 (a ring: a quarter of the loop)")
    circuit_percent: float | None = figure("of the nominal voltage (U0 single-phase, U0 x √3 three-phase)")
    upstream_percent: float = figure("the drop from the origin to the board", nullable=False)
    from_origin_percent: float | None = figure("upstream_percent + circuit_percent")
    limit_percent: float | None = figure("Appendix 4 Table 4Ab, or the request's limit")
    limit_basis: str | None = figure("where the limit comes from")
    verdict: str = figure(nullable=False, choices=verdicts.VERDICTS)
    basis: str = figure("the clause the verdict rests on", nullable=False)


@check_step("voltage-drop", unit="%")
def voltage_drop(cols: CircuitColumns, loop: FaultLoop, trip: DeviceResponse, earlier: Earlier) -> CheckColumns:
    """Pass where the drop from the origin is within the limit; not-verified without Ib or the cable's mV/A/m."""
    c = cols.conductors
    mv, mv_basis = _mv_per_a_m(cols)
    drop = capacity.drop_v(mv, cols.design_current_a, c.length_m, c.parallel, c.ring)
    own = drop / capacity.nominal_voltage_v(cols.u0_v, cols.phases) * 100.0
    total = cols.upstream_drop_percent + own
    limit, limit_basis = _limits(cols)
    verdict = select(
        [np.isnan(total), total <= limit * (1 + 1e-9)], [verdicts.NOT_VERIFIED, verdicts.PASS], verdicts.FAIL
    )
    no_inst = np.array([ci.installation is None for ci in cols.circuits], dtype=bool)
    note = pick(
        [np.isnan(cols.design_current_a), no_inst | ~c.present, np.isnan(mv), np.isnan(cols.upstream_drop_percent)],
        [NOTES["no-design-current"], NOTES["no-installation"], NOTES["no-cell"], NOTES["no-upstream"]],
    )
    basis = np.where(cols.role == "distribution", BASES["distribution"], BASES["final"]).astype(object)
    detail = {
        "mv_per_a_m": mv,
        "mv_basis": mv_basis,
        "drop_v": drop,
        "circuit_percent": own,
        "upstream_percent": cols.upstream_drop_percent,
        "from_origin_percent": total,
        "limit_percent": limit,
        "limit_basis": limit_basis,
        "verdict": verdict.astype(np.int8),
        "basis": basis,
    }
    return CheckColumns(
        "voltage-drop",
        "%",
        verdict.astype(np.int8),
        total,
        limit,
        basis,
        note,
        detail=("voltage_drop", detail),
        figures={"voltage_drop_from_origin_percent": total},
    )
