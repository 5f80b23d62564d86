"""Size a circuit for a load, and find the longest run that keeps every check passing.

Sizing tries every tabulated line conductor size at once through the array path of
:func:`service.electrical.circuit.check_circuits`, with capacity (Ib <= In <= Iz, BS 7671 433.1.1)
and voltage drop (Appendix 4, 6.4) beside the fault checks, and keeps the smallest that passes;
each smaller size is reported with the check that ruled it out.

The longest run is solved in closed form where the rule is linear in length (Zs = Ze + L x (r1+r2)
per metre; voltage drop = mV/A/m x Ib x L), then confirmed by the full check; where another check
(e.g. the adiabatic one under a fuse) binds first, it is found by bisection on the same checks.
"""

from __future__ import annotations

import dataclasses
import math
from dataclasses import dataclass, field
from typing import Any

import numpy as np

from . import capacity as cap
from .circuit import FAIL, NOT_VERIFIED, Circuit, CircuitFailure, Conductors, DeviceSpec, Supply, check_circuits, conductor_columns
from .datafiles import device_table
from .devices import breakers, fuses
from .errors import InvalidInput, NoRule
from .protective import selection_csa_mm2

RULED_OUT_ORDER = ("capacity", "voltage-drop", "disconnection-time", "max-zs", "protective-conductor", "rcd", "breaking-capacity")
MAX_LENGTH_M = 5000.0


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


def ratings_for(standard: str) -> list[float]:
    if standard in breakers.breaker_standards():
        return [float(r) for r in device_table("breakers")["usual_ratings_a"]]
    return fuses.fuse_ratings(standard)


def design_current(demand: Demand, u0_v: float) -> float:
    if demand.design_current_a is not None:
        return float(demand.design_current_a)
    if demand.power_kw is None:
        raise InvalidInput("load.design_current_a", "give the design current, or the power in kW")
    return cap.design_current_a(demand.power_kw, demand.power_factor, demand.phases, u0_v)


def installed_capacity(inst: Installation, it_a: float, insulation: str, device_standard: str | None) -> tuple[float, dict[str, dict[str, Any]]]:
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
        factors["thermal_insulation"] = {"factor": 1.0, "basis": f"method {inst.installation_method} already allows for the insulation"}
    else:
        ci, basis = cap.thermal_insulation_factor(inst.thermal_insulation_mm)
        factors["thermal_insulation"] = {"factor": ci, "basis": basis}
    cc, basis = cap.device_factor(device_standard)
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
    return float(selection_csa_mm2(line_csa_mm2)[0])


def _first_problem(result, iz: float | None, in_a: float, vd: dict[str, Any] | None) -> tuple[str | None, float | None, float | None, str | None]:
    """The first check, in RULED_OUT_ORDER, that rules this circuit out (fail, or not-verified for fault checks)."""
    if iz is not None and in_a > iz * (1 + 1e-12):
        return "capacity", in_a, iz, "A"
    if vd is not None and vd["percent"] > vd["limit_percent"] * (1 + 1e-12):
        return "voltage-drop", vd["percent"], vd["limit_percent"], "%"
    checks = {c.check: c for c in result.checks}
    for name in RULED_OUT_ORDER[2:]:
        c = checks.get(name)
        if c is None:
            continue
        if c.verdict == FAIL or (c.verdict == NOT_VERIFIED and name != "breaking-capacity"):
            return name, c.value, c.limit, c.unit
    return None, None, None, None


def _voltage_drop(inst: Installation, demand: Demand, csa: float, ib: float, u0_v: float, length_m: float) -> dict[str, Any]:
    mv, basis = cap.voltage_drop_mv_per_a_m(inst.cable, csa, demand.phases, inst.reactance_mohm_per_m)
    nominal = u0_v if demand.phases == 1 else math.sqrt(3) * u0_v
    drop = mv * ib * length_m / 1000.0
    if demand.voltage_drop_limit_percent is not None:
        limit, limit_basis = float(demand.voltage_drop_limit_percent), "set in the request"
    else:
        limit, limit_basis = cap.voltage_drop_limit_percent(demand.supply_kind, demand.use)
    return {"mv_per_a_m": mv, "basis": basis, "drop_v": drop, "percent": drop / nominal * 100.0,
            "limit_percent": limit, "limit_basis": limit_basis}


def size_circuit(supply: Supply, demand: Demand, inst: Installation, device: DeviceSpec) -> SizingResult:
    """The smallest device rating >= Ib and the smallest line conductor and cpc that pass every check."""
    ib = design_current(demand, supply.u0_v)
    ratings = [r for r in ratings_for(device.standard) if r >= ib - 1e-9] if device.standard else []
    if not ratings:
        raise InvalidInput("device.rating_a", f"no standard rating of {device.standard} reaches Ib = {ib:.1f} A")
    in_a = ratings[0]
    spec = dataclasses.replace(device, rating_a=in_a)
    table = cap.cable_table(inst.cable)
    insulation = table["insulation"]
    sizes = cap.capacities(inst.cable, inst.installation_method, demand.phases)
    circuits, rows = [], []
    for size in sizes:
        try:
            cpc = cpc_for(inst.cable, size.csa_mm2)
        except NoRule:
            continue
        conductors = Conductors("copper", insulation, size.csa_mm2, cpc, demand.length_m)
        circuits.append(Circuit(device=spec, conductors=conductors, role=demand.role, load=demand.load, id=demand.id, design_current_a=ib))
        rows.append((size, cpc))
    outcomes = check_circuits(supply, circuits)
    tried: list[SizeTried] = []
    selected = None
    cautions: list[str] = []
    derating, factors = installed_capacity(inst, 1.0, insulation, device.standard)  # the same for every size
    for (size, cpc), outcome in zip(rows, outcomes):
        iz = size.it_a * derating
        vd = _voltage_drop(inst, demand, size.csa_mm2, ib, supply.u0_v, demand.length_m)
        if isinstance(outcome, CircuitFailure):
            tried.append(SizeTried(size.csa_mm2, cpc, NOT_VERIFIED, outcome.field, None, None, None))
            continue
        name, value, limit, unit = _first_problem(outcome, iz, in_a, vd)
        if name is None:
            selected = {
                "line_csa_mm2": size.csa_mm2, "cpc_csa_mm2": cpc, "material": "copper", "insulation": insulation,
                "capacity": Capacity(size.it_a, iz, factors, size.confidence),
                "voltage_drop": vd, "check": outcome,
            }
            if "M" in size.confidence:
                cautions.append(f"The capacity of {size.csa_mm2:g} mm2 by method {inst.installation_method} is from memory (unverified): confirm it in BS 7671 before relying on it.")
            if any("from memory" in f["basis"] for f in factors.values()):
                cautions.append("A correction factor used is from memory (unverified): see the factors' bases.")
            break
        tried.append(SizeTried(size.csa_mm2, cpc, FAIL, name, value, limit, unit))
    if selected is None:
        cautions.append("No tabulated size passes every check for this load, length and installation.")
    return SizingResult(
        design_current_a=ib,
        device={"standard": device.standard, "type": device.type, "rating_a": in_a},
        selected=selected,
        tried=tried,
        cautions=cautions,
    )


def _ruling(supply: Supply, circuit: Circuit, lengths: np.ndarray, ib: float | None, vd_at_1m: dict[str, Any] | None):
    """For each length, the first check that fails (None where all pass)."""
    items = [dataclasses.replace(circuit, conductors=dataclasses.replace(circuit.conductors, length_m=float(L))) for L in lengths]
    out = []
    for L, outcome in zip(lengths, check_circuits(supply, items)):
        vd = None
        if vd_at_1m is not None:
            vd = dict(vd_at_1m, percent=vd_at_1m["percent"] * L)
        name = outcome.field if isinstance(outcome, CircuitFailure) else _first_problem(outcome, None, 0.0, vd)[0]
        out.append(name)
    return out


def max_length(supply: Supply, circuit: Circuit, inst: Installation | None = None, demand: Demand | None = None) -> dict[str, Any]:
    """The longest run (m) that keeps every check passing, and the check that limits it.

    Closed form for the loop impedance, L = (max Zs - Ze) / (r1+r2 per metre), and for the voltage
    drop, L = limit x U / (mV/A/m x Ib); then confirmed by the whole check, with bisection where
    another check binds first. ``inst`` and ``demand`` add the voltage drop rule.
    """
    if circuit.conductors is None:
        raise InvalidInput("conductors", "the longest run needs the conductors")
    per_m = conductor_columns([dataclasses.replace(circuit.conductors, length_m=1.0)])
    rpm = float(per_m["r1"][0] + per_m["r2"][0])
    r2pm = float(per_m["r2"][0])
    at_zero = check_circuits(supply, [dataclasses.replace(circuit, conductors=dataclasses.replace(circuit.conductors, length_m=0.0))])[0]
    if isinstance(at_zero, CircuitFailure):
        raise InvalidInput(at_zero.field, at_zero.message)
    candidates: dict[str, float] = {}
    checks = {c.check: c for c in at_zero.checks}
    zs_limit = checks["max-zs"].limit
    if "rcd" in checks and checks["rcd"].limit is not None:
        zs_limit = max(zs_limit or 0.0, checks["rcd"].limit)
    if zs_limit is not None:
        tt_by_ra = supply.earthing == "TT" and "rcd" in checks and supply.electrode_ohm is not None
        candidates["max-zs"] = ((zs_limit - supply.electrode_ohm) / r2pm) if tt_by_ra else (zs_limit - supply.ze_ohm) / rpm
    ib = circuit.design_current_a if demand is None or demand.design_current_a is None else demand.design_current_a
    vd_1m = None
    if inst is not None and demand is not None and ib:
        vd_1m = _voltage_drop(inst, demand, circuit.conductors.line_csa_mm2, ib, supply.u0_v, 1.0)
        candidates["voltage-drop"] = vd_1m["limit_percent"] / vd_1m["percent"]

    def ruling(lengths):
        return _ruling(supply, circuit, np.asarray(lengths, dtype=float), ib, vd_1m)

    # a start that passes: the circuit's own length, else the first passing length of a grid up to the limit
    start = float(circuit.conductors.length_m)
    if ruling([start])[0] is not None:
        grid = np.linspace(0.0, MAX_LENGTH_M, 257)
        names = ruling(grid)
        passing = [L for L, name in zip(grid, names) if name is None]
        if not passing:
            return {"max_length_m": None, "limited_by": names[0], "closed_form_m": candidates, "method": "no length passes"}
        start = float(passing[0])
    guess = max(start, min([MAX_LENGTH_M] + list(candidates.values())))
    at_guess, beyond = ruling([guess * (1 - 1e-9), min(guess * 1.01, MAX_LENGTH_M * 1.01)])
    if at_guess is None and (beyond is not None or guess >= MAX_LENGTH_M):
        return {"max_length_m": guess, "limited_by": beyond if guess < MAX_LENGTH_M else None,
                "closed_form_m": candidates, "method": "closed form, confirmed by the whole check"}
    # another check binds first (or the closed form undershoots): bisection on the whole check
    lo, hi = (start, guess) if at_guess is not None else (guess, MAX_LENGTH_M)
    if hi == MAX_LENGTH_M and ruling([MAX_LENGTH_M])[0] is None:
        return {"max_length_m": MAX_LENGTH_M, "limited_by": None, "closed_form_m": candidates, "method": "every length up to the schema's limit passes"}
    for _ in range(4):  # each pass: 64 lengths through the array path
        grid = np.linspace(lo, hi, 65)
        ok = [name is None for name in ruling(grid)]
        last = max(i for i, good in enumerate(ok) if good)
        lo, hi = grid[last], grid[min(last + 1, 64)]
    return {"max_length_m": float(lo), "limited_by": ruling([lo * 1.01])[0], "closed_form_m": candidates,
            "method": "bisection on the whole check"}
