"""The short-circuit check: the live conductors protected against a fault between them (BS 7671:2018 434.5.2).

For faults up to 5 s, t <= k^2 S^2 / I^2 with k of the line conductor (Table 43.1). Checked at both ends:
at the largest current (the origin of the circuit) the energy the device lets through must not exceed
k^2 S^2; at the smallest (a line-neutral fault at the far end, Cmin, conductors hot) the device must
operate within 5 s and within k^2 S^2 / I^2. The RCD takes no part: it never sees a line-neutral fault.
Value and limit are energies (A^2 s): the larger of the two ends against k^2 S^2.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from service.electrical.cables import protective
from service.electrical.checks.base import CheckColumns, Earlier, check_step, pick
from service.electrical.circuit_arrays import CircuitColumns
from service.electrical.column_tools import one_of, select
from service.electrical.devices.characteristic import AT_MOST, BEYOND_DATA, bound_names
from service.electrical.devices.response import DeviceResponse, FaultEnergy
from service.electrical.network.faults import FaultLoop
from service.electrical.results import verdicts
from service.electrical.results.shapes import figure

BASIS = "BS 7671:2018 434.5.2, t <= k^2 S^2 / I^2 at the largest and the smallest short-circuit current"
MAX_TIME_S = protective.ADIABATIC_MAX_S
NOTES = {
    "no-conductors": "The live conductors are not described (no conductors given): their protection cannot be checked.",
    "no-loop": (
        "The line-neutral loop is not known (in TT it cannot follow from Ze): state supply.line_neutral_loop_ohm "
        "or the prospective fault current."
    ),
    "no-operation": (
        "At the smallest line-neutral fault the device's data show no operation: the live conductors are not "
        "protected against it."
    ),
    "too-slow": "At the smallest line-neutral fault the device takes longer than 5 s.",
    "far-energy": "At the smallest line-neutral fault the device does not operate within k^2 S^2 / I^2.",
    "near-energy": "At the largest fault current the device lets through more than k^2 S^2.",
    "stand-in": (
        "The energy compared is the standard's limit for the device or the conservative I^2 x 0.1 s, not the device's "
        "own: the maker's let-through I^2 t (device.let_through_curve, or device_defaults) may show compliance."
    ),
    "near-unknown": (
        "The largest fault current is not known (TT): the let-through at the origin cannot be checked; state the "
        "prospective fault current."
    ),
}


def _end(energy: FaultEnergy, withstand: np.ndarray, known: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Verdict codes at one end, and which reason (0 ok, 1 no operation, 2 too slow, 3 energy, 4 stand-in)."""
    too_slow = np.isfinite(energy.time_s) & (energy.time_s > MAX_TIME_S)
    with np.errstate(invalid="ignore"):
        over = energy.energy_a2s > withstand * (1 + 1e-9)
    stand_in = one_of(energy.method, protective.STAND_IN_METHODS)
    reason = select([~known, energy.bound == BEYOND_DATA, too_slow, over & stand_in, over], [5, 1, 2, 4, 3], 0)
    verdict = select(
        [reason == 5, reason == 4, (reason > 0) & (energy.bound == AT_MOST) & (reason == 2), reason > 0],
        [verdicts.NOT_VERIFIED, verdicts.NOT_VERIFIED, verdicts.NOT_VERIFIED, verdicts.FAIL],
        verdicts.PASS,
    )
    return verdict.astype(np.int8), reason


def _note(present: np.ndarray, r_far: np.ndarray, r_near: np.ndarray) -> np.ndarray:
    conditions = [
        ~present,
        r_far == 5,
        r_far == 1,
        r_far == 2,
        r_far == 3,
        r_near == 3,
        (r_far == 4) | (r_near == 4),
        r_near == 5,
    ]
    names = [
        "no-conductors",
        "no-loop",
        "no-operation",
        "too-slow",
        "far-energy",
        "near-energy",
        "stand-in",
        "near-unknown",
    ]
    return pick(conditions, [NOTES[name] for name in names])


def _detail(cols: CircuitColumns, loop: FaultLoop, far: FaultEnergy, near: FaultEnergy, csa, withstand, verdict):
    with np.errstate(divide="ignore", invalid="ignore"):
        allowed = np.minimum(MAX_TIME_S, withstand / far.current_a**2)
    known = np.isfinite(far.current_a)
    return {
        "k": cols.conductors.k_line,
        "csa_mm2": csa,
        "withstand_a2s": withstand,
        "line_neutral_loop_ohm": loop.zpn_ohm,
        "line_neutral_loop_basis": loop.zpn_basis,
        "max_current_a": near.current_a,
        "max_energy_a2s": near.energy_a2s,
        "max_energy_basis": near.method,
        "min_current_a": far.current_a,
        "min_time_s": far.time_s,
        "min_time_bound": np.where(known, bound_names(far.bound), None).astype(object),
        "allowed_time_s": allowed,
        "min_energy_a2s": far.energy_a2s,
        "min_energy_basis": far.method,
        "let_through_data": np.where(near.data_basis != None, near.data_basis, far.data_basis).astype(object),  # noqa: E711
        "verdict": verdict,
        "basis": np.full(cols.n, BASIS, dtype=object),
    }


@dataclass
class ShortCircuitResult:
    """The live conductors against a fault between them (434.5.2): energies against k^2 S^2."""

    k: float | None = figure("k of the line conductor (BS 7671 Table 43.1)")
    csa_mm2: float | None = figure("the line conductor, all cables in parallel together")
    withstand_a2s: float | None = figure("k^2 S^2")
    line_neutral_loop_ohm: float | None = figure("at the origin")
    line_neutral_loop_basis: str | None = figure("where the line-neutral loop comes from")
    max_current_a: float | None = figure("the largest short-circuit current, at the origin of the circuit")
    max_energy_a2s: float | None = figure("what the device lets through at it")
    max_energy_basis: str | None = figure("how that energy is known")
    min_current_a: float | None = figure("the smallest, a line-neutral fault at the far end (Cmin, conductors hot)")
    min_time_s: float | None = figure("the device's time at it")
    min_time_bound: str | None = figure("how that time is known from the device's data")
    allowed_time_s: float | None = figure("the smaller of 5 s and k^2 S^2 / I^2 at the smallest current")
    min_energy_a2s: float | None = figure("what the device lets through at the smallest current")
    min_energy_basis: str | None = figure("how that energy is known")
    let_through_data: str | None = figure("which standard limit, if any")
    verdict: str = figure(nullable=False, choices=verdicts.VERDICTS)
    basis: str = figure("the clause the verdict rests on", nullable=False)


@check_step("short-circuit", unit="A2s")
def short_circuit(cols: CircuitColumns, loop: FaultLoop, trip: DeviceResponse, earlier: Earlier) -> CheckColumns:
    """Pass where the device protects the live conductors at both ends; not-verified where the data cannot show it."""
    c = cols.conductors
    csa = c.line_csa * c.parallel  # the cables in parallel share the current: their sizes add
    withstand = (c.k_line * csa) ** 2
    far, near = trip.live_far, trip.live_near
    v_far, r_far = _end(far, withstand, c.present & np.isfinite(loop.line_neutral_min_a))
    v_near, r_near = _end(near, withstand, c.present & np.isfinite(loop.line_neutral_max_a))
    verdict = np.maximum(v_far, v_near).astype(np.int8)
    detail = _detail(cols, loop, far, near, csa, withstand, verdict)
    # where the far end is not cleared (no operation, or beyond 5 s) no energy bounds it: no value to show
    value = np.where((r_far == 1) | (r_far == 2), np.nan, np.fmax(far.energy_a2s, near.energy_a2s))
    return CheckColumns(
        "short-circuit",
        "A2s",
        verdict,
        value,
        withstand,
        detail["basis"],
        _note(c.present, r_far, r_near),
        detail=("short_circuit", detail),
        device_data=True,
    )
