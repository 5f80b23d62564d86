"""The additional-protection check: an RCD of IΔn <= 30 mA where the rules call for one.

BS 7671:2018 (A2:2022 numbering, carried forward to A4:2026): 411.3.3 socket-outlets up to 32 A; 411.3.4
luminaires in dwellings; 522.6.202/203 cables concealed in walls; 701.411.3.3 every circuit of a location
containing a bath or shower; 722.531.2.101 each EV charge point. Only a general (not time-delayed) RCD of
IΔn <= 30 mA counts (415.1.1). Where the request leaves out a fact a rule depends on, and no such RCD is
fitted, the check is not-verified and names the fact; a special location whose rules are not modelled is
not-verified, whatever is fitted.
"""

from __future__ import annotations

import numpy as np

from service.electrical.checks.base import CheckColumns, Earlier, check_step, pick
from service.electrical.checks.facts import among, bases, joined, spread, stated, unknown
from service.electrical.circuit_arrays import CircuitColumns
from service.electrical.devices import residual
from service.electrical.devices.response import DeviceResponse
from service.electrical.network.faults import FaultLoop
from service.electrical.results import verdicts
from service.electrical.rules import requirements

NOTES = {
    "no-rcd": "required, and no RCD is fitted",
    "above-30": "required: the RCD fitted is above 30 mA and does not count as additional protection (415.1.1)",
    "delayed": "required: a time-delayed (S) RCD does not count as additional protection (415.1.1)",
    "met": "required, and a 30 mA RCD is fitted",
    "special": "the rules of this special location are not modelled: check its Part 7 section by hand",
    "concealed": "installation.concealed_in_wall (522.6.202/203)",
    "covering": "installation.earthed_metallic_covering (522.6.202)",
    "metal-wall": "installation.wall_has_metal_parts (522.6.203)",
    "location": "location (701.411.3.3, Part 7)",
    "equipment": "equipment, or premises (411.3.4)",
    "premises": "premises (411.3.4, luminaires in dwellings)",
    "not-required": "not required for this circuit by the rules modelled",
    "fitted": "a 30 mA RCD is fitted",
}


def _required(cols: CircuitColumns) -> dict[str, np.ndarray]:
    """Where each rule calls for a 30 mA RCD, by rule name (as in data/requirements.json)."""
    n = cols.needs
    final = n.role == "final"
    covered = stated(n.earthed_metallic_covering, True)
    bare = stated(n.earthed_metallic_covering, False)
    in_wall = among(n.concealed_in_wall, ("under-50-mm", "50-mm-or-deeper"))
    with np.errstate(invalid="ignore"):
        small_sockets = ~(n.socket_outlet_rating_a > requirements.number("socket_outlets_up_to_a"))
    return {
        "sockets": final & (n.load == "socket-outlets") & small_sockets,
        "dwelling-lighting": final
        & stated(n.equipment, "lighting")
        & among(n.premises, requirements.choices("dwellings")),
        "concealed-shallow": stated(n.concealed_in_wall, "under-50-mm") & bare,
        "concealed-metal-wall": in_wall & stated(n.wall_has_metal_parts, True) & ~covered,
        "bathroom": final & (stated(n.location, "bathroom") | stated(n.equipment, "shower")),
        "ev-rcd": final & n.ev,
    }


def _unknown(cols: CircuitColumns) -> list[tuple[np.ndarray, str]]:
    """Where a rule cannot be judged for want of a fact, each with the words naming it (a note names them all)."""
    n = cols.needs
    final = n.role == "final"
    covered = stated(n.earthed_metallic_covering, True)
    dwelling_or_unsaid = unknown(n.premises) | among(n.premises, requirements.choices("dwellings"))
    return [
        (unknown(n.concealed_in_wall) & ~covered, NOTES["concealed"]),
        (stated(n.concealed_in_wall, "under-50-mm") & unknown(n.earthed_metallic_covering), NOTES["covering"]),
        (
            stated(n.concealed_in_wall, "50-mm-or-deeper") & unknown(n.wall_has_metal_parts) & ~covered,
            NOTES["metal-wall"],
        ),
        (final & unknown(n.location) & ~stated(n.equipment, "shower"), NOTES["location"]),
        (final & unknown(n.equipment) & (n.load != "socket-outlets") & dwelling_or_unsaid, NOTES["equipment"]),
        (final & stated(n.equipment, "lighting") & unknown(n.premises), NOTES["premises"]),
    ]


@check_step("additional-protection", unit="mA")
def additional_protection(
    cols: CircuitColumns, loop: FaultLoop, trip: DeviceResponse, earlier: Earlier
) -> CheckColumns:
    """Fail where a rule calls for a 30 mA RCD and none that counts is fitted; not-verified where a fact the rules
    depend on is not stated (and no such RCD is fitted) or the location's own rules are not modelled."""
    n = cols.needs
    limit_ma = residual.additional_protection_max_ma()
    general = stated(n.rcd_delay, "general")
    counts = n.has_rcd & (n.residual_ma <= limit_ma) & general
    required = _required(cols)
    needed = np.logical_or.reduce(list(required.values()))
    missing = _unknown(cols)
    unsaid = np.logical_or.reduce([m for m, _ in missing])
    special = (n.role == "final") & among(n.location, requirements.special_locations())
    verdict = verdicts.where(needed & ~counts, verdicts.FAIL, verdicts.PASS)
    verdict = verdicts.where(
        (verdict == verdicts.PASS) & ((unsaid & ~counts) | special), verdicts.NOT_VERIFIED, verdict
    )
    failing = needed & ~counts
    asked = joined(
        [m & ~needed & ~counts for m, _ in missing],
        [t for _, t in missing],
        "not stated: give ",
        "; or fit a 30 mA RCD",
    )
    note = pick(
        [failing & ~n.has_rcd, failing & ~general, failing, special & ~failing, asked != None, needed, counts],  # noqa: E711
        [NOTES["no-rcd"], NOTES["delayed"], NOTES["above-30"], NOTES["special"], asked, NOTES["met"], NOTES["fitted"]],
        NOTES["not-required"],
    )  # fmt: skip
    names = list(required)
    basis = bases(n.edition, [required[k] for k in names], names, "rcd-counts")
    check = CheckColumns(
        "additional-protection",
        "mA",
        verdict,
        np.where(n.has_rcd, n.residual_ma, np.nan),
        np.where(needed, limit_ma, np.nan),
        basis,
        note,
    )
    return spread(check, n.inverse)
