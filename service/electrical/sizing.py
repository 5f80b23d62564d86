"""Size a circuit for a load, and find the longest run that keeps every check passing.

Sizing tries every tabulated line conductor size at once through the array path of
:func:`service.electrical.circuit.check_circuits`, with capacity (Ib <= In <= Iz, BS 7671 433.1.1)
and voltage drop (Appendix 4, 6.4) beside the fault checks, and keeps the smallest that passes;
each smaller size is reported with the check that ruled it out.

The longest run of a circuit is in :mod:`service.electrical.reach`.
"""

from __future__ import annotations

import dataclasses
import math
from collections.abc import Iterator
from contextlib import contextmanager
from dataclasses import dataclass, field
from typing import Any

from . import capacity as cap
from .circuit import check_circuits
from .columns import CircuitFailure
from .devices import catalogue
from .errors import ElectricalError, InvalidInput, NoRule
from .model import Circuit, Conductors, DeviceSpec, Supply
from .protective import selection_csa_mm2
from .results import CircuitResult
from .verdicts import Verdict

RULED_OUT_ORDER = (
    "capacity",
    "voltage-drop",
    "disconnection-time",
    "max-zs",
    "protective-conductor",
    "rcd",
    "breaking-capacity",
)


@dataclass(frozen=True)
class Installation:
    """How the cable is run: the table and method, and the factors that reduce its capacity."""

    cable: str
    installation_method: str
    ambient_c: float = 30.0
    grouping: str = "bunched"
    grouped_circuits: int = 1
    thermal_insulation_mm: float = 0.0
    ground_c: float | None = None
    soil_resistivity_k_m_per_w: float | None = None
    in_duct: bool = False
    reactance_mohm_per_m: float | None = None


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


INSTALLATION_FIELDS = frozenset(f.name for f in dataclasses.fields(Installation))


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


def design_current(demand: Demand, u0_v: float) -> float:
    if demand.design_current_a is not None:
        return float(demand.design_current_a)
    if demand.power_kw is None:
        raise InvalidInput("design_current_a", "give the design current, or the power in kW")
    return cap.design_current_a(demand.power_kw, demand.power_factor, demand.phases, u0_v)


def installed_capacity(
    inst: Installation, it_a: float, insulation: str, device_standard: str | None
) -> tuple[float, dict[str, dict[str, Any]]]:
    """Iz = It x Ca x Cg x Ci x Cc (BS 7671 Appendix 4), with each factor's value and basis."""
    factors: dict[str, dict[str, Any]] = {}
    buried = inst.installation_method == "D"
    if buried:
        ca, basis = cap.ground_factor(insulation, 20.0 if inst.ground_c is None else inst.ground_c)
    else:
        ca, basis = cap.ambient_factor(insulation, inst.ambient_c)
    factors["ambient"] = {"factor": ca, "basis": basis}
    if buried and inst.soil_resistivity_k_m_per_w is not None:
        cs, basis = cap.soil_factor(inst.soil_resistivity_k_m_per_w, inst.in_duct)
        factors["soil"] = {"factor": cs, "basis": basis}
    cg, basis = cap.grouping_factor(inst.grouping, inst.grouped_circuits)
    factors["grouping"] = {"factor": cg, "basis": basis}
    table = cap.cable_table(inst.cable)
    if inst.thermal_insulation_mm > 0 and inst.installation_method in table.get("methods_with_insulation_allowed", []):
        factors["thermal_insulation"] = {
            "factor": 1.0,
            "basis": f"method {inst.installation_method} already allows for the insulation",
        }
    else:
        ci, basis = cap.thermal_insulation_factor(inst.thermal_insulation_mm)
        factors["thermal_insulation"] = {"factor": ci, "basis": basis}
    cc, basis = catalogue.overload_factor(device_standard)
    factors["device"] = {"factor": cc, "basis": basis}
    iz = it_a * math.prod(f["factor"] for f in factors.values())
    return iz, factors


def cpc_for(cable: str, line_csa_mm2: float) -> float:
    """The cpc a cable family gives: its own (twin and earth), a core (multicore), or Table 54.7 (single-core)."""
    rule = cap.cable_table(cable)["cpc"]
    if rule["kind"] == "fixed":
        try:
            return float(rule["cpc_csa_mm2"][f"{line_csa_mm2:g}"])
        except KeyError:
            raise NoRule("line_csa_mm2", f"no standard {cable} cable of {line_csa_mm2:g} mm2") from None
    if rule["kind"] == "core":
        return float(line_csa_mm2)
    return float(selection_csa_mm2(line_csa_mm2))


def ruled_out_by(
    result: CircuitResult, iz: float | None, in_a: float, vd: dict[str, Any] | None
) -> tuple[str | None, float | None, float | None, str | None]:
    """The first check, in RULED_OUT_ORDER, that rules this circuit out (fail, or not-verified for fault checks).

    Returns ``(check, value, limit, unit)``, all None where nothing rules it out.
    """
    if iz is not None and in_a > iz * (1 + 1e-12):
        return "capacity", in_a, iz, "A"
    if vd is not None and vd["percent"] > vd["limit_percent"] * (1 + 1e-12):
        return "voltage-drop", vd["percent"], vd["limit_percent"], "%"
    for name in RULED_OUT_ORDER[2:]:
        c = result.check(name)
        if c is not None and rules_out(c.check, c.verdict):
            return name, c.value, c.limit, c.unit
    return None, None, None, None


def rules_out(name: str, verdict: str) -> bool:
    return verdict == Verdict.FAIL or (verdict == Verdict.NOT_VERIFIED and name != "breaking-capacity")


def voltage_drop(
    inst: Installation, demand: Demand, csa: float, ib: float, u0_v: float, length_m: float
) -> dict[str, Any]:
    """The voltage drop of the run: mV/A/m x Ib x L, in volts and in percent of U0 (or of the line voltage).

    The limit beside it is the request's, else Appendix 4 section 6.4's for the supply and use.
    """
    mv, basis = cap.voltage_drop_mv_per_a_m(inst.cable, csa, demand.phases, inst.reactance_mohm_per_m)
    nominal = u0_v if demand.phases == 1 else math.sqrt(3) * u0_v
    drop = mv * ib * length_m / 1000.0
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


def _candidates(supply: Supply, demand: Demand, inst: Installation, device: DeviceSpec, ib: float):
    """The circuits to try, one per tabulated size with a cpc, and the size rows beside them."""
    in_a = _rating(device, ib)
    spec = dataclasses.replace(device, rating_a=in_a)
    insulation = cap.cable_table(inst.cable)["insulation"]
    circuits, rows = [], []
    for size in cap.capacities(inst.cable, inst.installation_method, demand.phases):
        try:
            cpc = cpc_for(inst.cable, size.csa_mm2)
        except NoRule:
            continue
        conductors = Conductors("copper", insulation, size.csa_mm2, cpc, demand.length_m)
        circuits.append(
            Circuit(
                device=spec,
                conductors=conductors,
                role=demand.role,
                load=demand.load,
                id=demand.id,
                design_current_a=ib,
            )
        )
        rows.append((size, cpc))
    return in_a, insulation, circuits, rows


def _rating(device: DeviceSpec, ib: float) -> float:
    ratings = [r for r in catalogue.ratings_for(device.standard) if r >= ib - 1e-9] if device.standard else []
    if not ratings:
        raise InvalidInput(("device", "rating_a"), f"no standard rating of {device.standard} reaches Ib = {ib:.1f} A")
    return ratings[0]


def size_circuit(supply: Supply, demand: Demand, inst: Installation, device: DeviceSpec) -> SizingResult:
    """The smallest device rating >= Ib and the smallest line conductor and cpc that pass every check.

    Every size is checked at once through the array path; capacity Iz = It x factors >= In (433.1.1) and
    the voltage drop (Appendix 4, 6.4) are judged beside the fault checks. Each smaller size is reported
    with the check that ruled it out.
    """
    ib = design_current(demand, supply.u0_v)
    with installation_paths():
        in_a, insulation, circuits, rows = _candidates(supply, demand, inst, device, ib)
        derating, factors = installed_capacity(inst, 1.0, insulation, device.standard)  # the same for every size
    tried: list[SizeTried] = []
    selected = None
    for (size, cpc), outcome in zip(rows, check_circuits(supply, circuits), strict=True):
        if isinstance(outcome, CircuitFailure):
            tried.append(SizeTried(size.csa_mm2, cpc, Verdict.NOT_VERIFIED, outcome.field, None, None, None))
            continue
        iz = size.it_a * derating
        with installation_paths():
            vd = voltage_drop(inst, demand, size.csa_mm2, ib, supply.u0_v, demand.length_m)
        name, value, limit, unit = ruled_out_by(outcome, iz, in_a, vd)
        if name is None:
            selected = {
                "line_csa_mm2": size.csa_mm2,
                "cpc_csa_mm2": cpc,
                "material": "copper",
                "insulation": insulation,
                "capacity": Capacity(size.it_a, iz, factors, size.confidence),
                "voltage_drop": vd,
                "check": outcome,
            }
            break
        tried.append(SizeTried(size.csa_mm2, cpc, Verdict.FAIL, name, value, limit, unit))
    return SizingResult(
        design_current_a=ib,
        device={"standard": device.standard, "type": device.type, "rating_a": in_a},
        selected=selected,
        tried=tried,
        cautions=_sizing_cautions(selected, inst, factors),
    )


def _sizing_cautions(
    selected: dict[str, Any] | None, inst: Installation, factors: dict[str, dict[str, Any]]
) -> list[str]:
    if selected is None:
        return ["No tabulated size passes every check for this load, length and installation."]
    out = []
    if "M" in selected["capacity"].confidence:
        out.append(
            f"The capacity of {selected['line_csa_mm2']:g} mm2 by method {inst.installation_method} is from memory "
            "(unverified): confirm it in BS 7671 before relying on it."
        )
    if any("from memory" in f["basis"] for f in factors.values()):
        out.append("A correction factor used is from memory (unverified): see the factors' bases.")
    return out
