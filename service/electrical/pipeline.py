"""The whole check of one circuit or of many: every figure, every check, a verdict and cautions.

One path serves all. :func:`check_circuits` turns the circuits into columns and runs the pipeline
once over all of them::

    loop = fault_loop(cols)               # Zs, If (Cmin), the prospective fault current
    trip = device_response(cols, loop)    # times, Ia, the RCD, which device disconnects
    checks = [step(cols, loop, trip) for step in STEPS]

then :func:`~service.electrical.results.circuit_result.assemble` turns those arrays into one result per circuit.
:func:`check_circuit` is that path with one circuit. The checks and their clauses are listed in
:mod:`service.electrical.checks`.
"""

from __future__ import annotations

from collections.abc import Sequence

import numpy as np

from service.electrical.checks import STEPS, CheckColumns
from service.electrical.circuit_arrays import CircuitColumns, CircuitFailure, columns_of, prepare
from service.electrical.devices.response import device_response
from service.electrical.errors import InvalidInput
from service.electrical.inputs import Circuit, Supply
from service.electrical.network.faults import fault_loop
from service.electrical.results import verdicts
from service.electrical.results.circuit_result import Checked, CircuitResult, assemble

CAUTIONS = {"r1r2-given": "R1+R2 taken as given: it must be the value at the conductors' operating temperature."}


def check_columns(cols: CircuitColumns) -> Checked:
    """Run every step of the check over the columns (one formula per step for all circuits)."""
    loop = fault_loop(cols)
    trip = device_response(cols, loop)
    done: dict[str, CheckColumns] = {}
    for step in STEPS:
        check = step(cols, loop, trip, done)
        if check.device_data:
            _without_dc_data(check, trip.no_dc_data)
        done[check.check] = check
    checks = list(done.values())
    cautions = list(loop.cautions) + list(trip.cautions)
    for check in checks:
        cautions.extend(check.cautions)
    cautions.append((~np.isnan(cols.r1r2_given_ohm), CAUTIONS["r1r2-given"]))
    carried = {text for s in cols.supplies for text in s.cautions}
    for text in sorted(carried):
        cautions.append((np.array([text in s.cautions for s in cols.supplies], dtype=bool), text))
    return Checked(cols, loop, trip, checks, cautions)


NO_DC_DATA = "d.c.: the device's data are for a.c.; give the maker's d.c. curve (curve_points) to check this."


def _without_dc_data(check: CheckColumns, mask: np.ndarray) -> None:
    """A check that rests on the device's a.c. data cannot be made on d.c.: not-verified, saying why."""
    if mask.any():
        check.verdict = verdicts.where(mask, verdicts.NOT_VERIFIED, check.verdict)
        check.note = np.where(mask, NO_DC_DATA, check.note).astype(object)


def check_circuits(
    supply: Supply | Sequence[Supply],
    circuits: Sequence[Circuit],
    scope: Sequence[str] | None = None,
    exact: bool = False,
) -> list[CircuitResult | CircuitFailure]:
    """Check many circuits as arrays; one result or one failure per circuit, in order.

    ``supply`` is one supply for all, or one per circuit. A circuit the rules or the data do not cover
    becomes a :class:`~service.electrical.circuit_arrays.CircuitFailure` naming its path; the others go on.
    ``scope`` names the checks the overall verdict covers (all by default); ``exact`` keeps numbers unrounded
    (for searches that need fine margins).
    """
    good, failures, checked = checked_run(supply, circuits)
    out: list[CircuitResult | CircuitFailure | None] = [None] * len(circuits)
    for failure in failures:
        out[failure.index] = failure
    if checked is not None:
        for i, result in zip(good, assemble(checked, scope, exact), strict=True):
            out[i] = result
    return out  # type: ignore[return-value]


def checked_run(
    supply: Supply | Sequence[Supply], circuits: Sequence[Circuit]
) -> tuple[list[int], list[CircuitFailure], Checked | None]:
    """The pipeline over the circuits the rules cover: their positions, a failure for each of the others, and
    the checked arrays (None where no circuit could be checked). ``supply``: one for all, or one per circuit."""
    supplies = [supply] * len(circuits) if isinstance(supply, Supply) else list(supply)
    if len(supplies) != len(circuits):
        raise InvalidInput("supply", "give one supply, or one per circuit")
    good, failures = prepare(supplies, circuits)
    if not good:
        return good, failures, None
    return good, failures, check_columns(columns_of([supplies[i] for i in good], [circuits[i] for i in good]))


def check_circuit(supply: Supply, circuit: Circuit, scope: Sequence[str] | None = None) -> CircuitResult:
    """Check one circuit: :func:`check_circuits` with one element.

    Raises the core's typed error (the subclass that stopped it) with its path rooted at ``supply``
    or ``circuit``.
    """
    result = check_circuits(supply, [circuit], scope)[0]
    if isinstance(result, CircuitFailure):
        raise result.error(result.path, result.message)
    return result
