"""What a sizing answer says beside its sizes: the checks no size can show, and the cautions of the choice."""

from __future__ import annotations

from collections.abc import Sequence
from typing import Any

from service.electrical.circuit_arrays import CircuitFailure
from service.electrical.inputs import CableRun
from service.electrical.results.verdicts import Verdict


def never_shown(outcomes: list, names: Sequence[str]) -> frozenset[str]:
    """The fault checks that are not-verified for every size tried (the data, not the size, are missing)."""
    results = [o for o in outcomes if not isinstance(o, CircuitFailure)]
    return frozenset(
        n
        for n in names
        if results and all((c := r.check(n)) is not None and c.verdict == Verdict.NOT_VERIFIED for r in results)
    )


def arrangement_cautions(parallel_cables: int, cpc: str) -> list[str]:
    """What sizing says of cables in parallel and of armour as the cpc."""
    out = []
    if parallel_cables > 1:
        out.append(
            f"{parallel_cables} cables in parallel are taken to share the load equally (523.7): the same "
            "type, size, length and route, connected together at both ends."
        )
    if cpc == "armour":
        out.append(
            "The armour as the cpc: its resistance is worked from the armour's cross-section (makers' tables, see "
            "the data file's confidence); the glands must be made to carry the fault current."
        )
    return out


def sizing_cautions(selected: dict[str, Any] | None, inst: CableRun, lenient: frozenset[str], outcomes) -> list[str]:
    out = []
    for name in sorted(lenient):
        note = next(
            (c.note for o in outcomes if not isinstance(o, CircuitFailure) for c in o.checks if c.check == name), None
        )
        out.append(
            f"The {name} check cannot be shown for any size from the data given ({note}); sizes were not ruled "
            "out by it."
        )
    if selected is None:
        return out + ["No tabulated size passes every check for this load, length and installation."]
    if "M" in (selected["capacity"].confidence or ""):
        out.append(
            f"The capacity of {selected['line_csa_mm2']:g} mm2 by method {inst.installation_method} is from memory "
            "(unverified): confirm it in BS 7671 before relying on it."
        )
    if any("from memory" in f["basis"] for f in (selected["capacity"].factors or {}).values()):
        out.append("A correction factor used is from memory (unverified): see the factors' bases.")
    return out
