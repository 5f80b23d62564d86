"""The selectivity step: each circuit's device against the device that feeds its board (BS 7671:2018 536.4).

Reported wherever the upstream device is known (the supply of a circuit of an installation's board carries
it) or selectivity is required (not-verified where the upstream device is not known); it counts in the
circuit's verdict only where selectivity is required (the circuit's or its board's ``selectivity_required``:
a fault here must not take out the board above). ``total`` passes; ``partial`` (the largest fault at the
device can exceed the limit) and ``none`` fail; ``not-verified`` where standard data cannot show it. The
largest fault at the device is the prospective fault current at its board (434.1: line-neutral, line-earth
or three-phase, the largest). The rules are in :mod:`service.electrical.devices.selectivity`.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from service.electrical.checks.base import CheckColumns, Earlier, check_step
from service.electrical.circuit_arrays import CircuitColumns
from service.electrical.column_tools import select
from service.electrical.devices import selectivity
from service.electrical.devices.response import DeviceResponse
from service.electrical.devices.selectivity import SELECTIVE, Selective
from service.electrical.network.faults import FaultLoop
from service.electrical.results import verdicts
from service.electrical.results.shapes import figure

NO_UPSTREAM = "the device feeding the board is not known: give it (an installation's board device, or its feed)"
BASIS = "BS 7671:2018 536.4: a fault on this circuit clears without operating the device that feeds its board"


def _pairs(cols: CircuitColumns, where: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    limit, basis = np.full(cols.n, np.nan), np.full(cols.n, None, dtype=object)
    for i in np.flatnonzero(where).tolist():
        supply, circuit = cols.supplies[i], cols.circuits[i]
        pair = selectivity.pair_limit(circuit.device, supply.upstream_device, circuit.selectivity_limit_a)
        limit[i], basis[i] = pair.limit_a, pair.basis
    return limit, basis


def _residual(cols: CircuitColumns, where: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    words, bases = np.full(cols.n, None, dtype=object), np.full(cols.n, None, dtype=object)
    for i in np.flatnonzero(where).tolist():
        up = cols.supplies[i].upstream_device
        words[i], bases[i] = selectivity.rcd_pair(cols.circuits[i].device.rcd, up.rcd)
    return words, bases


def _flags(cols: CircuitColumns) -> tuple[np.ndarray, np.ndarray]:
    """Where the upstream device is known, and where selectivity is required (each supply read once)."""
    by_supply = {id(s): s for s in cols.supplies}
    known = {k: s.upstream_device is not None for k, s in by_supply.items()}
    wanted = {k: s.selectivity_required for k, s in by_supply.items()}
    has_upstream = np.array([known[id(s)] for s in cols.supplies], dtype=bool)
    required = np.array(
        [c.selectivity_required or wanted[id(s)] for s, c in zip(cols.supplies, cols.circuits, strict=True)], dtype=bool
    )
    return has_upstream, required


@dataclass
class SelectivityResult:
    """The circuit's device against the device feeding its board (536.4)."""

    with_: str | None = figure("the upstream device's id", key="with")
    up_to_a: float | None = figure("only the downstream device operates up to this current; null: at any or none")
    max_fault_current_a: float | None = figure("the largest fault at the downstream device (the board's PFC)")
    basis: str | None = figure("how the pair's limit is known")
    residual: str | None = figure("where both devices have an RCD", choices=SELECTIVE)
    residual_basis: str | None = figure("how the RCDs' selectivity is known")
    verdict: str = figure(
        "total, partial (up to up_to_a), none, or not-verified; the check says pass or fail",
        nullable=False,
        choices=SELECTIVE,
    )


@check_step("selectivity", unit="A")
def selectivity_check(cols: CircuitColumns, loop: FaultLoop, trip: DeviceResponse, earlier: Earlier) -> CheckColumns:
    """Total selectivity passes; partial or none fails; not-verified where the data cannot show it."""
    has_upstream, required = _flags(cols)
    limit, basis = _pairs(cols, has_upstream)
    max_fault_a = loop.pfc_ka * 1000.0
    word, up_to = selectivity.verdicts_of(limit, max_fault_a)
    rcd_word, rcd_basis = _residual(cols, has_upstream)
    verdict = select(
        [word == Selective.NOT_VERIFIED, (word == Selective.TOTAL) & (rcd_word != Selective.NONE)],
        [verdicts.NOT_VERIFIED, verdicts.PASS],
        verdicts.FAIL,
    ).astype(np.int8)
    basis = np.where(has_upstream, basis, NO_UPSTREAM).astype(object)
    upstream = np.where(has_upstream, np.array([s.upstream_id for s in cols.supplies], dtype=object), None)
    detail = {
        "with": upstream,
        "verdict": word,
        "up_to_a": up_to,
        "max_fault_current_a": max_fault_a,
        "basis": basis,
        "residual": rcd_word,
        "residual_basis": rcd_basis,
    }
    return CheckColumns(
        "selectivity",
        "A",
        verdict,
        max_fault_a,
        np.where(np.isinf(limit), np.nan, limit),
        np.full(cols.n, BASIS, dtype=object),
        basis,
        applies=has_upstream | required,
        counts=required,
        detail=("selectivity", detail),
    )
