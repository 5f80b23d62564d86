"""The breaking-capacity check: the device's capacity against the prospective fault current (BS 7671:2018 434.5.1).

The prospective fault current is the larger of line-neutral and line-earth at the origin (434.1), never
derived from Ze in TT. A device without a stated capacity takes its family's smallest standard value (from
memory). Where the board states a conditional short-circuit rating with its upstream device (a consumer
unit to BS EN 61439-3 Annex ZB, 536.4.203), the device may be used up to that rating.
"""

from __future__ import annotations

import numpy as np

from service.electrical.checks.base import CheckColumns, Earlier, check_step, pick
from service.electrical.circuit_arrays import CircuitColumns
from service.electrical.column_tools import nan_to, select
from service.electrical.devices.response import DeviceResponse
from service.electrical.network.faults import FaultLoop
from service.electrical.results import verdicts

BASES = {
    "rated": "BS 7671:2018 434.5.1, rated breaking capacity >= prospective fault current",
    "conditional": (
        "BS 7671:2018 434.5.1 and 536.4.203: the board's conditional short-circuit rating with its upstream device "
        "(BS EN 61439-3 Annex ZB) >= prospective fault current"
    ),
}
NOTES = {
    "not-given": "State the device's rated short-circuit capacity (breaking_capacity_ka).",
    "default": "Rated breaking capacity not given: taken as the {basis}.",
    "default-short": (
        "Rated breaking capacity not given, and the standard's smallest value is below the prospective fault current: "
        "state the device's rated capacity (breaking_capacity_ka)."
    ),
    "no-pfc": (
        "The prospective fault current is not known: in TT it cannot follow from Ze. State the measured prospective "
        "fault current or the line-neutral loop impedance."
    ),
    "dc": "d.c.: state the device's d.c. breaking capacity (the standard minimums here are for a.c.).",
}
CAUTION_MEMORY = (
    "Breaking capacity taken from a standard minimum that is from memory: confirm it from the maker's data."
)
CAUTION_LINES = (
    "A single-pole device on a three-phase board is judged at the larger of the line-neutral and line-earth faults "
    "(no three-phase fault passes through it); the board's three-phase fault exceeds its rated capacity, which a "
    "fault between the lines of two single-phase circuits could reach: consider a device rated for it."
)


def _defaults(cols: CircuitColumns) -> tuple[np.ndarray, np.ndarray]:
    default = np.full(cols.n, np.nan)
    note = np.full(cols.n, None, dtype=object)
    for idx in cols.device_groups.values():
        dev = cols.devices[idx[0]]
        if dev.default_breaking_capacity_ka is not None:
            default[idx] = dev.default_breaking_capacity_ka
            note[idx] = NOTES["default"].format(basis=dev.default_breaking_capacity_basis)
    return default, note


@check_step("breaking-capacity", unit="kA")
def breaking_capacity(cols: CircuitColumns, loop: FaultLoop, trip: DeviceResponse, earlier: Earlier) -> CheckColumns:
    """Pass where the rated (or minimum, or the board's conditional) capacity covers the prospective fault current."""
    default, default_note = _defaults(cols)
    given = ~np.isnan(cols.breaking_capacity_ka)
    dc = (cols.current_kind == "dc") & ~given
    from_default = ~given & ~np.isnan(default) & ~dc
    icn = np.where(given, cols.breaking_capacity_ka, np.where(dc, np.nan, default))
    conditional = ~np.isnan(cols.conditional_ka) & (nan_to(cols.conditional_ka, 0.0) > nan_to(icn, 0.0))
    limit = np.where(conditional, cols.conditional_ka, icn)
    unknown = np.isnan(loop.pfc_ka)
    short = ~(limit >= loop.pfc_ka)
    # a standard minimum is a lower bound: falling short of it cannot show that the device itself does
    verdict = select(
        [np.isnan(limit) | unknown, ~short, from_default & ~conditional],
        [verdicts.NOT_VERIFIED, verdicts.PASS, verdicts.NOT_VERIFIED],
        verdicts.FAIL,
    )
    note = pick(
        [unknown, dc, np.isnan(limit), from_default & ~conditional],
        [NOTES["no-pfc"], NOTES["dc"], NOTES["not-given"], None],
    )
    note = np.where(from_default & ~conditional & ~unknown, default_note, note)
    note = np.where(from_default & ~conditional & ~unknown & short, NOTES["default-short"], note).astype(object)
    basis = np.where(conditional, BASES["conditional"], BASES["rated"]).astype(object)
    return CheckColumns(
        "breaking-capacity",
        "kA",
        verdict.astype(np.int8),
        loop.pfc_ka,
        limit,
        basis,
        note,
        cautions=[
            (from_default & ~conditional, CAUTION_MEMORY),
            ((cols.phases == 1) & (cols.supply_phases == 3) & (loop.three_phase_a / 1000.0 > limit), CAUTION_LINES),
        ],
    )
