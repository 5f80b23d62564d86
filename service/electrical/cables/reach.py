"""The longest run of a circuit that keeps every check passing, and the check that limits it.

Solved in closed form where the rule is linear in length (Zs = Ze + L x (r1+r2) per metre; voltage
drop = mV/A/m x Ib x L), then confirmed by the whole check; where another check binds first (the
adiabatic check under a fuse, a breaker's instantaneous limit), the length where the smallest margin of
the checks changes sign is found by Brent's method (scipy.optimize.brentq) on the whole check.
"""

from __future__ import annotations

import dataclasses
import math
from typing import Any

import numpy as np

from service.electrical.cables.conductors import loop_resistance_per_m
from service.electrical.cables.sizing import (
    REQUIREMENT_CHECKS,
    RULE_CHECKS,
    RULED_OUT_ORDER,
    CableRun,
    Demand,
    SizingResult,
    installation_paths,
    ruled_out_by,
    rules_out,
    size_circuit,
    voltage_drop,
)
from service.electrical.circuit_arrays import CircuitFailure
from service.electrical.devices.catalogue import resolve
from service.electrical.errors import InvalidInput
from service.electrical.inputs import Circuit, DeviceSpec, Supply
from service.electrical.network.faults import c_min
from service.electrical.pipeline import check_circuits
from service.electrical.results import precision
from service.electrical.results.circuit_result import Check, CircuitResult
from service.electrical.results.verdicts import Verdict

MAX_LENGTH_M = 5000.0
MAX_FAULT_TIME_S = 5.0


def size_with_reach(
    supply: Supply, demand: Demand, inst: CableRun, device: DeviceSpec
) -> tuple[SizingResult, dict | None]:
    """:func:`size_circuit`, and the longest run of the size chosen (None where no size passes)."""
    result = size_circuit(supply, demand, inst, device)
    if result.circuit is None:
        return result, None
    # the very circuit the sizing checked: its material, cpc (armour), ring, parallel cables and limits
    return result, max_length(supply, result.circuit, inst, demand)


def ruling(supply: Supply, circuit: Circuit, lengths: Any) -> list[tuple[str | None, float]]:
    """For each length (m): the first rule that fails (None where all pass) and the smallest margin (%).

    The margin is positive where every check passes and negative where one fails (the failing check's
    margin, or -1 where it has none), so that it changes sign at the longest run.
    """
    items = [
        dataclasses.replace(circuit, conductors=dataclasses.replace(circuit.conductors, length_m=float(L)))
        for L in np.atleast_1d(lengths)
    ]
    out = []
    for outcome in check_circuits(supply, items, exact=True):
        if isinstance(outcome, CircuitFailure):
            out.append((outcome.field, -1.0))
            continue
        out.append((ruled_out_by(outcome)[0], _smallest_margin(outcome)))
    return out


def _smallest_margin(result: CircuitResult) -> float:
    margins = []
    rules = {RULE_CHECKS.get(name, name): name for name in RULED_OUT_ORDER}
    for c in result.checks:
        if c.check not in rules:
            continue
        m = c.margin_percent
        if rules_out(rules[c.check], c.verdict):
            margins.append(m if m is not None and m < 0 else -1.0)
        elif c.verdict == Verdict.PASS:
            margins.append(100.0 if m is None else max(m, 0.0))
    return min(margins, default=100.0)


def _as_run(supply: Supply, circuit: Circuit, inst: CableRun | None, demand: Demand | None) -> tuple[Supply, Circuit]:
    """The supply and circuit to search over: with the cable's run, use and limit where the request gives them."""
    if demand is None:
        return supply, circuit
    ib = circuit.design_current_a if demand.design_current_a is None else demand.design_current_a
    run = circuit.installation if inst is None else inst
    return dataclasses.replace(supply, supply_kind=demand.supply_kind), dataclasses.replace(
        circuit,
        installation=run,
        design_current_a=ib,
        use=demand.use,
        voltage_drop_limit_percent=demand.voltage_drop_limit_percent,
        phases=demand.phases,
    )


def max_length(
    supply: Supply, circuit: Circuit, inst: CableRun | None = None, demand: Demand | None = None
) -> dict[str, Any]:
    """The longest run (m) that keeps every check passing, and the check that limits it.

    Closed form for the loop impedance, L = (max Zs - Ze) / (r1+r2 per metre), for the voltage drop,
    L = limit x U / (mV/A/m x Ib), and for the far end's line-neutral fault, L = (U0 Cmin / Ia(5 s) - Zpn) /
    (r1+rn per metre); then confirmed by the whole check. Where another check binds first (the adiabatic check
    under a fuse, a breaker's instantaneous limit), the length where the smallest margin of the checks changes
    sign is found by Brent's method (scipy.optimize.brentq) on the whole check. ``inst`` and ``demand`` add
    the voltage drop rule. Lengths to the centimetre, the longest run rounded down (never past the boundary).
    """
    found = _max_length(supply, circuit, inst, demand)
    if found["max_length_m"] is not None:
        found["max_length_m"] = math.floor(found["max_length_m"] * 100) / 100
    forms = found["closed_form_m"]
    found["closed_form_m"] = {k: v for k, v in forms.items() if 0 <= v <= MAX_LENGTH_M}
    found = precision.rounded_record(found)
    found["breakdown"] = [_limit_of(name, length) for name, length in forms.items()]
    found["note"] = FIXES.get(found["limited_by"]) if found["max_length_m"] is None else None
    run_supply, run_circuit = _as_run(supply, circuit, inst, demand)
    at = circuit.conductors.length_m if found["max_length_m"] is None else found["max_length_m"]
    found["requirements"], found["cautions"] = _said(run_supply, run_circuit, at)
    return found


# what would let a run pass where no length does, by the check that fails at the shortest length (common practice)
FIXES = {
    "capacity": "the cable cannot carry the device's rating: a larger cable, or a smaller device",
    "protective-conductor": "a larger cpc, or the maker's let-through data (device.let_through_curve)",
    "short-circuit": "a larger line conductor, a device that clears sooner, or the maker's let-through data",
    "disconnection-time": "a lower Ze, an RCD, or a device that trips at a lower current",
    "max-zs": "a lower Ze, an RCD, or a device that trips at a lower current",
    "voltage-drop": "a larger cable, or the load nearer the origin",
    "rcd": "a lower loop impedance or electrode resistance, or an RCD of smaller IΔn",
}


def _limit_of(name: str, length_m: float) -> dict[str, Any]:
    """One row of the breakdown: the longest run the check's closed form allows, or why it cannot limit the run."""
    if length_m > MAX_LENGTH_M:
        note = f"cannot limit the run within {MAX_LENGTH_M:g} m (its limit lies beyond any real run)"
        return {"check": name, "max_length_m": None, "note": note}
    if length_m < 0:
        return {"check": name, "max_length_m": 0.0, "note": "fails at any length: the origin alone exceeds its limit"}
    rounded = float(precision.rounded(length_m, precision.RULES["m"]))
    return {"check": name, "max_length_m": rounded, "note": "closed form (the whole check confirms the answer)"}


def _said(supply: Supply, circuit: Circuit, length_m: float) -> tuple[list[Check], list[str]]:
    """The rules beyond the calculations for the circuit (they do not depend on its length) and its cautions at the
    length answered (or, where no length passes, at the length given)."""
    run = dataclasses.replace(circuit, conductors=dataclasses.replace(circuit.conductors, length_m=float(length_m)))
    outcome = check_circuits(supply, [run])[0]
    if isinstance(outcome, CircuitFailure):
        return [], []
    return [c for c in outcome.checks if c.check in REQUIREMENT_CHECKS], outcome.cautions


def _max_length(
    supply: Supply, circuit: Circuit, inst: CableRun | None = None, demand: Demand | None = None
) -> dict[str, Any]:
    if circuit.conductors is None:
        raise InvalidInput(("circuit", "conductors"), "the longest run needs the conductors")
    candidates = _closed_forms(supply, circuit, inst, demand)
    supply, circuit = _as_run(supply, circuit, inst, demand)

    def passes(length: float) -> bool:
        return ruling(supply, circuit, [length])[0][0] is None

    start = float(circuit.conductors.length_m)
    if not passes(start):
        grid = np.linspace(0.0, MAX_LENGTH_M, 257)
        names = ruling(supply, circuit, grid)
        passing = [L for L, (name, _) in zip(grid, names, strict=True) if name is None]
        if not passing:
            return {
                "max_length_m": None,
                "limited_by": names[0][0],
                "closed_form_m": candidates,
                "method": "no length passes",
            }
        start = float(passing[0])
    guess = max(start, min([MAX_LENGTH_M] + list(candidates.values())))
    (at_guess, _), (beyond, _) = ruling(supply, circuit, [guess * (1 - 1e-9), min(guess * 1.01, MAX_LENGTH_M * 1.01)])
    if at_guess is None and (beyond is not None or guess >= MAX_LENGTH_M):
        return {
            "max_length_m": guess,
            "limited_by": beyond if guess < MAX_LENGTH_M else None,
            "closed_form_m": candidates,
            "method": "closed form, confirmed by the whole check",
        }
    lo, hi = (start, guess) if at_guess is not None else (guess, MAX_LENGTH_M)
    if passes(hi):
        return {
            "max_length_m": MAX_LENGTH_M,
            "limited_by": None,
            "closed_form_m": candidates,
            "method": "every length up to the schema's limit passes",
        }
    found = _boundary(lambda length: ruling(supply, circuit, [length])[0], lo, hi)
    return {
        "max_length_m": found,
        "limited_by": ruling(supply, circuit, [found * 1.01])[0][0],
        "closed_form_m": candidates,
        "method": "Brent's method on the smallest margin of the whole check",
    }


LENGTH_TOLERANCE_M = 1e-4


def _boundary(judge, lo: float, hi: float) -> float:
    """The longest length in [lo, hi] that passes, where ``lo`` passes and ``hi`` does not (Brent's method)."""

    from scipy.optimize import brentq  # imported here: scipy.optimize costs half a second at worker start

    def signed_margin(length: float) -> float:
        name, margin = judge(length)
        return margin if name is None else min(margin, -1e-9)

    found = brentq(signed_margin, lo, hi, xtol=LENGTH_TOLERANCE_M)
    for step in range(8):  # the root may sit a tolerance on the failing side of the step
        if judge(found)[0] is None:
            return float(found)
        found = max(lo, found - LENGTH_TOLERANCE_M * 2**step)
    return float(lo)


def _closed_forms(supply: Supply, circuit: Circuit, inst: CableRun | None, demand: Demand | None):
    """The closed-form lengths: max Zs, the far end's short circuit, and the voltage drop where asked for."""
    per_m, r2_per_m, line_neutral_per_m = loop_resistance_per_m(circuit.conductors)
    at_zero = check_circuits(
        supply,
        [dataclasses.replace(circuit, conductors=dataclasses.replace(circuit.conductors, length_m=0.0))],
        exact=True,
    )[0]
    if isinstance(at_zero, CircuitFailure):
        raise at_zero.error(at_zero.path, at_zero.message)
    candidates: dict[str, float] = {}
    zs_limit = at_zero.check("max-zs").limit
    rcd = at_zero.check("rcd")
    if rcd is not None and rcd.limit is not None:
        zs_limit = max(zs_limit or 0.0, rcd.limit)
    if zs_limit is not None:
        by_ra = supply.earthing == "TT" and rcd is not None and supply.electrode_ohm is not None
        candidates["max-zs"] = (
            (zs_limit - supply.electrode_ohm) / r2_per_m if by_ra else (zs_limit - supply.ze_ohm) / per_m
        )
    in_5s, _ = resolve(circuit.device).current_for(MAX_FAULT_TIME_S)
    if at_zero.line_neutral_loop_ohm is not None and np.isfinite(in_5s):
        # the far end's line-neutral fault must operate the device within 5 s (434.5.2)
        candidates["short-circuit"] = (
            c_min() * supply.u0_v / in_5s - at_zero.line_neutral_loop_ohm
        ) / line_neutral_per_m
    ib = circuit.design_current_a if demand is None or demand.design_current_a is None else demand.design_current_a
    if inst is not None and demand is not None and ib:
        with installation_paths():
            c = circuit.conductors  # a ring's drop is a quarter of its whole length's (as the check takes it)
            vd_1m = voltage_drop(inst, demand, c.line_csa_mm2, ib, supply.u0_v, 1.0, c.ring, c.parallel_cables)
        candidates["voltage-drop"] = vd_1m["limit_percent"] / vd_1m["percent"]
    return candidates
