"""The breaking-capacity check: the device's rated short-circuit capacity against the prospective fault current.

BS 7671:2018 434.5.1. A fuse without a stated capacity takes its family's published minimum (from memory).
"""

from __future__ import annotations

import numpy as np

from .. import verdicts
from ..columns import CircuitColumns
from ..faults import FaultLoop
from ..response import DeviceResponse
from .base import CheckColumns, check_step

BASIS = "BS 7671:2018 434.5.1, rated breaking capacity >= prospective fault current"
NOTES = {
    "not-given": "State the device's rated short-circuit capacity (breaking_capacity_ka).",
    "default": "Rated breaking capacity not given: taken as the {basis}.",
}
CAUTION_MEMORY = (
    "Breaking capacity taken from a standard minimum that is from memory: confirm it from the maker's data."
)


@check_step("breaking-capacity")
def breaking_capacity(cols: CircuitColumns, loop: FaultLoop, trip: DeviceResponse) -> CheckColumns:
    """Pass where the rated (or minimum) breaking capacity is at least the prospective fault current at the origin."""
    default = np.full(cols.n, np.nan)
    note = np.full(cols.n, None, dtype=object)
    for idx in cols.device_groups.values():
        dev = cols.devices[idx[0]]
        if dev.default_breaking_capacity_ka is not None:
            default[idx] = dev.default_breaking_capacity_ka
            note[idx] = NOTES["default"].format(basis=dev.default_breaking_capacity_basis)
    given = ~np.isnan(cols.breaking_capacity_ka)
    from_default = ~given & ~np.isnan(default)
    icn = np.where(given, cols.breaking_capacity_ka, default)
    verdict = np.select([np.isnan(icn), icn >= loop.pfc_ka], [verdicts.NOT_VERIFIED, verdicts.PASS], verdicts.FAIL)
    note = np.where(from_default, note, np.where(np.isnan(icn), NOTES["not-given"], None)).astype(object)
    basis = np.full(cols.n, BASIS, dtype=object)
    return CheckColumns(
        "breaking-capacity",
        "kA",
        verdict.astype(np.int8),
        loop.pfc_ka,
        icn,
        basis,
        note,
        cautions=[(from_default, CAUTION_MEMORY)],
    )
