"""Size a circuit for a load, and find the longest run that keeps every check passing.

Sizing tries every tabulated line conductor size at once through the array path of
:func:`service.electrical.pipeline.check_circuits`, with capacity (Ib <= In <= Iz, BS 7671 433.1.1)
and voltage drop (Appendix 4, 6.4) beside the fault checks, and keeps the smallest that passes;
each smaller size is reported with the check that ruled it out.

The longest run of a circuit is in :mod:`service.electrical.cables.reach`.
"""

from __future__ import annotations

import dataclasses
from collections.abc import Iterator
from contextlib import contextmanager
from dataclasses import dataclass, field
from typing import Any

from service.electrical.cables import capacity as cap
from service.electrical.cables import conductors as cond
from service.electrical.cables.protective import selection_csa_mm2
from service.electrical.cables.sizing_notes import arrangement_cautions, never_shown, sizing_cautions
from service.electrical.circuit_arrays import CircuitFailure, device_problem
from service.electrical.datafiles import core_table
from service.electrical.devices import adjustable, catalogue
from service.electrical.errors import ElectricalError, InvalidInput, NoRule
from service.electrical.inputs import CableRun, Circuit, Conductors, DeviceSpec, EvCharge, Supply
from service.electrical.pipeline import check_circuits
from service.electrical.results import precision
from service.electrical.results.circuit_result import Check, CircuitResult
from service.electrical.results.verdicts import Verdict
from service.electrical.rules import requirements

# what rules a size out, in the order tried; breaking capacity is the device's, not the cable's, and never does
RULED_OUT_ORDER = (
    "capacity",
    "voltage-drop",
    "disconnection-time",
    "max-zs",
    "short-circuit",
    "protective-conductor",
    "rcd",
)


@dataclass(frozen=True)
class Demand:
    """The load, where it is and what the voltage drop rule is for it."""

    length_m: float
    phases: int = 1
    design_current_a: float | None = None
    power_kw: float | None = None
    power_factor: float = 1.0
    use: str = "other"
    supply_kind: str = "public"
    voltage_drop_limit_percent: float | None = None
    role: str = "final"
    load: str | None = None
    id: str | None = None
    conditional_short_circuit_ka: float | None = None  # the board's rating with its upstream device
    parallel_cables: int = 1  # equal cables in parallel, sharing the load (523.7)
    ring: bool = False  # a ring final circuit (433.1.204): length_m is the whole ring
    cpc: str = "cable"  # the family's own cpc (a core, the twin-and-earth cpc, Table 54.7), or "armour"
    cores: int | None = None  # an armoured cable's cores, for its armour as the cpc
    # what it supplies and where, for the rules beyond the calculations (as on a Circuit)
    equipment: str | None = None
    socket_outlet_rating_a: float | None = None
    location: str | None = None
    ev: EvCharge | None = None


INSTALLATION_FIELDS = frozenset(f.name for f in dataclasses.fields(CableRun))


@contextmanager
def installation_paths() -> Iterator[None]:
    """Errors about how the cable is run get a path below ``installation`` (as the requests nest it)."""
    try:
        yield
    except ElectricalError as err:
        if err.path and err.path[0] in INSTALLATION_FIELDS:
            raise err.within("installation") from None
        raise


@dataclass
class Capacity:
    it_a: float
    iz_a: float
    factors: dict[str, dict[str, Any]]
    confidence: str


@dataclass
class SizeTried:
    line_csa_mm2: float
    cpc_csa_mm2: float
    verdict: str
    ruled_out_by: str | None
    value: float | None
    limit: float | None
    unit: str | None


@dataclass
class SizingResult:
    design_current_a: float
    device: dict[str, Any]
    selected: dict[str, Any] | None
    tried: list[SizeTried]
    cautions: list[str] = field(default_factory=list)
    circuit: Circuit | None = None  # the chosen size's circuit, as checked (the longest run searches on it)
    requirements: list[Check] = field(default_factory=list)  # the rules beyond the calculations, for the design


REQUIREMENT_CHECKS = ("additional-protection", "rcd-type", "arc-fault-detection", "ev-earthing")


def design_current(demand: Demand, u0_v: float) -> float:
    if demand.design_current_a is not None:
        return float(demand.design_current_a)
    if demand.power_kw is None:
        raise InvalidInput("design_current_a", "give the design current, or the power in kW")
    return cap.design_current_a(demand.power_kw, demand.power_factor, demand.phases, u0_v)


CPC_CHOICES = ("cable", "armour")


def cpc_for(cable: str, line_csa_mm2: float, cpc: str = "cable", cores: int | None = None) -> float:
    """The cpc a cable family gives: its own (twin and earth), a core (multicore), or Table 54.7 (single-core);
    or the armour of an armoured multicore cable (its cross-section, data/armour_resistance.json)."""
    if cpc == "armour":
        insulation = cap.cable_table(cable)["insulation"]
        if "armoured" not in cable or insulation != core_table("armour_resistance")["insulation"]:
            raise InvalidInput("cpc", f"armour data are for thermosetting armoured multicore cables, not {cable}")
        return cond.armour_area_mm2(insulation, line_csa_mm2, cores)
    rule = cap.cable_table(cable)["cpc"]
    if rule["kind"] == "sheath":
        raise InvalidInput("cable", f"{cable}: the sheath is the cpc and its resistance is the maker's")
    if rule["kind"] == "fixed":
        try:
            return float(rule["cpc_csa_mm2"][f"{line_csa_mm2:g}"])
        except KeyError:
            raise NoRule("line_csa_mm2", f"no standard {cable} cable of {line_csa_mm2:g} mm2") from None
    if rule["kind"] == "core":
        return float(line_csa_mm2)
    return float(selection_csa_mm2(line_csa_mm2))


def check_arrangement(demand: Demand) -> None:
    """A ring is one cable: not one of cables in parallel (each would carry an unknown share)."""
    if demand.ring and demand.parallel_cables > 1:
        raise InvalidInput("ring", "a ring final circuit is not run in parallel cables: give one or the other")
    if demand.cpc not in CPC_CHOICES:
        raise InvalidInput("cpc", f"cpc is one of {list(CPC_CHOICES)}")


RULE_CHECKS = {"capacity": "overload", "voltage-drop": "voltage-drop"}  # the rules that only fail, never block


def ruled_out_by(
    result: CircuitResult, lenient: frozenset[str] = frozenset()
) -> tuple[str | None, float | None, float | None, str | None]:
    """The first rule, in RULED_OUT_ORDER, that rules this circuit out: the overload check (``capacity``) and
    the voltage drop where they fail, then the fault checks (fail, or not-verified unless in ``lenient``).

    Returns ``(rule, value, limit, unit)``, all None where nothing rules it out.
    """
    for name in RULED_OUT_ORDER:
        c = result.check(RULE_CHECKS.get(name, name))
        if c is not None and rules_out(name, c.verdict, lenient):
            return name, c.value, c.limit, c.unit
    return None, None, None, None


def rules_out(name: str, verdict: str, lenient: frozenset[str] = frozenset()) -> bool:
    """A rule rules a size out when it fails; a fault check also when it cannot be shown (unless lenient).

    The capacity and the voltage drop rule a size out only by failing: without the data they need (no cable
    table, say) they say nothing of the size.
    """
    if verdict == Verdict.FAIL:
        return True
    return verdict == Verdict.NOT_VERIFIED and name not in lenient and name not in RULE_CHECKS


def voltage_drop(
    inst: CableRun,
    demand: Demand,
    csa: float,
    ib: float,
    u0_v: float,
    length_m: float,
    ring: bool = False,
    parallel_cables: int = 1,
) -> dict[str, Any]:
    """The voltage drop of the run: mV/A/m x Ib x L, in volts and in percent of U0 (or of the line voltage); a
    ring's a quarter of its whole length's, cables in parallel share it (:func:`capacity.drop_v`).

    The limit beside it is the request's, else Appendix 4 section 6.4's for the supply and use.
    """
    if inst.voltage_drop_mv_per_a_m is not None:
        mv, basis = inst.voltage_drop_mv_per_a_m, "given in the request (installation.voltage_drop_mv_per_a_m)"
    else:
        mv, basis = cap.voltage_drop_mv_per_a_m(
            inst.cable, csa, demand.phases, inst.reactance_mohm_per_m, inst.installation_method
        )
    nominal = float(cap.nominal_voltage_v(u0_v, demand.phases))
    drop = float(cap.drop_v(mv, ib, length_m, parallel_cables, ring))
    if demand.voltage_drop_limit_percent is not None:
        limit, limit_basis = float(demand.voltage_drop_limit_percent), "set in the request"
    else:
        limit, limit_basis = cap.voltage_drop_limit_percent(demand.supply_kind, demand.use)
    return {
        "mv_per_a_m": mv,
        "basis": basis,
        "drop_v": drop,
        "percent": drop / nominal * 100.0,
        "limit_percent": limit,
        "limit_basis": limit_basis,
    }


def _candidates(supply: Supply, demand: Demand, inst: CableRun, device: DeviceSpec, ib: float):
    """The circuits to try, one per tabulated size with a cpc (each with its installation and Ib, so the
    pipeline's overload check judges its capacity), and the size rows beside them."""
    in_a = rating_for(device, ib, demand.ring)
    spec = dataclasses.replace(device, rating_a=in_a)
    problem = device_problem(spec)
    if problem is not None:  # the device, not a size: say so once
        raise type(problem)(("device",) + problem.path[2:], problem.message)
    table = cap.cable_table(inst.cable)
    insulation, material = table["insulation"], table.get("material", "copper")
    circuits, rows = [], []
    for size in cap.capacities(inst.cable, inst.installation_method, demand.phases):
        try:
            cpc = cpc_for(inst.cable, size.csa_mm2, demand.cpc, demand.cores)
        except NoRule:
            continue
        conductors = Conductors(
            material,
            insulation,
            size.csa_mm2,
            cpc,
            demand.length_m,
            ring=demand.ring,
            parallel_cables=demand.parallel_cables,
            cpc_arrangement="armour" if demand.cpc == "armour" else "in-cable",
            cores=demand.cores if demand.cpc == "armour" else None,
        )
        circuits.append(
            Circuit(
                device=spec,
                conductors=conductors,
                role=demand.role,
                load=demand.load,
                id=demand.id,
                design_current_a=ib,
                installation=inst,
                phases=demand.phases,
                conditional_short_circuit_ka=demand.conditional_short_circuit_ka,
                use=demand.use,
                voltage_drop_limit_percent=demand.voltage_drop_limit_percent,
                equipment=demand.equipment,
                socket_outlet_rating_a=demand.socket_outlet_rating_a,
                location=demand.location,
                ev=demand.ev,
            )
        )
        rows.append((size, cpc))
    return in_a, insulation, circuits, rows


def rating_for(device: DeviceSpec, ib: float, ring: bool = False) -> float:
    """The smallest standard rating at or above Ib; for a ring, the smallest the ring rule covers (30 or 32 A)."""
    if device.standard == adjustable.standard():
        raise InvalidInput(
            ("device", "standard"), "an adjustable breaker is set, not chosen by rating: check it with circuits/check"
        )
    ratings = [r for r in catalogue.ratings_for(device.standard) if r >= ib - 1e-9] if device.standard else []
    if ring:
        rule = core_table("ring_final")
        ratings = [r for r in ratings if r in rule["ratings_a"]] if device.standard in rule["standards"] else []
        if not ratings:
            raise InvalidInput(
                "ring",
                f"a ring under 433.1.204 takes a {rule['ratings_a']} A device of {rule['standards']}, Ib at most",
            )
    if not ratings:
        raise InvalidInput(("device", "rating_a"), f"no standard rating of {device.standard} reaches Ib = {ib:.1f} A")
    return ratings[0]


def _drop_record(vd: dict[str, Any]) -> dict[str, Any]:
    """The circuit's own voltage drop as a sizing result gives it (from the voltage-drop check's detail)."""
    return {
        "mv_per_a_m": vd["mv_per_a_m"],
        "basis": vd["mv_basis"],
        "drop_v": vd["drop_v"],
        "percent": vd["circuit_percent"],
        "limit_percent": vd["limit_percent"],
        "limit_basis": vd["limit_basis"],
    }


def size_circuit(supply: Supply, demand: Demand, inst: CableRun, device: DeviceSpec) -> SizingResult:
    """The smallest device rating >= Ib and the smallest line conductor and cpc that pass every check.

    Every size is checked at once through the array path: the overload check (Ib <= In <= Iz, 433.1.1), the
    voltage drop (Appendix 4, 6.4) and the fault checks. Each smaller size is reported with the rule that
    ruled it out. A fault check that cannot be shown for any size (the data are missing, not the copper)
    does not rule sizes out: a caution says so. The rules beyond the calculations do not depend on the size:
    where the device given fails one that a device can meet (a 30 mA RCD of the right type, an AFDD), the
    circuit is sized with the device the rules call for, and the answer says so; the others are reported in
    ``requirements`` with a caution each.
    """
    result = _size(supply, demand, inst, device)
    amended, said = requirements.required_device(device, result.requirements, demand.equipment, demand.ev)
    if amended != device:
        result = _size(supply, demand, inst, amended)
        result.cautions[:0] = said
    result.cautions += [
        f"The {c.check} requirement is {c.verdict} for this circuit ({c.basis}): {c.note}."
        for c in result.requirements
        if c.verdict != Verdict.PASS
    ]
    return result


def _size(supply: Supply, demand: Demand, inst: CableRun, device: DeviceSpec) -> SizingResult:
    ib = design_current(demand, supply.u0_v)
    check_arrangement(demand)
    with installation_paths():
        cap.derating(inst, cap.cable_table(inst.cable)["insulation"], device.standard, 0.0)  # the run itself, once
        in_a, insulation, circuits, rows = _candidates(supply, demand, inst, device, ib)
        outcomes = check_circuits(dataclasses.replace(supply, supply_kind=demand.supply_kind), circuits)
    lenient = never_shown(outcomes, [n for n in RULED_OUT_ORDER if n not in RULE_CHECKS])
    tried: list[SizeTried] = []
    selected = chosen = None
    for (size, cpc), circuit, outcome in zip(rows, circuits, outcomes, strict=True):
        if isinstance(outcome, CircuitFailure):
            tried.append(SizeTried(size.csa_mm2, cpc, Verdict.NOT_VERIFIED, outcome.field, None, None, None))
            continue
        name, value, limit, unit = ruled_out_by(outcome, lenient)
        if name is None:
            overload = outcome.overload
            capacity = Capacity(
                overload["it_a"], overload["iz_a"], overload["factors"], overload["capacity_confidence"]
            )
            selected = {
                "line_csa_mm2": size.csa_mm2,
                "cpc_csa_mm2": cpc,
                "cpc": demand.cpc,
                "parallel_cables": demand.parallel_cables,
                "ring": demand.ring,
                "material": circuit.conductors.material,
                "insulation": insulation,
                "capacity": capacity,
                "voltage_drop": _drop_record(outcome.voltage_drop),
                "check": outcome,
            }
            chosen = circuit
            break
        rule = precision.rule_for_unit(unit) if unit != "%" else precision.RULES["percent"]
        value, limit = (None if v is None else float(precision.rounded(v, rule)) for v in (value, limit))
        tried.append(SizeTried(size.csa_mm2, cpc, Verdict.FAIL, name, value, limit, unit))
    first = next((o for o in outcomes if isinstance(o, CircuitResult)), None)
    shown = selected["check"] if selected is not None else first
    return SizingResult(
        design_current_a=ib,
        device={
            "standard": device.standard,
            "type": device.type,
            "rating_a": in_a,
            "rcd": None if device.rcd is None else vars(device.rcd),
            "afdd": device.afdd,
        },
        selected=selected,
        tried=tried,
        cautions=sizing_cautions(selected, inst, lenient, outcomes)
        + arrangement_cautions(demand.parallel_cables, demand.cpc),
        circuit=chosen,
        requirements=[] if shown is None else [c for c in shown.checks if c.check in REQUIREMENT_CHECKS],
    )
