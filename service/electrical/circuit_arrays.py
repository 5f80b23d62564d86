"""Circuits as columns: what the check pipeline reads, built once per call.

:func:`prepare` makes the per-item lookups that can fail (device, conductors, the rules for the supply
and role), so that one bad circuit never sinks the others: each failure names its path from the
circuit's point of view, rooted at ``supply`` or ``circuit``. The circuits that pass become one
:class:`CircuitColumns`: numbers as float arrays (NaN where not given), choices as arrays, the
conductors as :class:`~service.electrical.cables.conductors.ConductorColumns` and the devices grouped so
that each characteristic is read once per group.
"""

from __future__ import annotations

from collections.abc import Hashable, Mapping, Sequence
from dataclasses import dataclass
from functools import lru_cache
from typing import Any

import numpy as np

from service.electrical.cables import capacity
from service.electrical.cables import conductors as cond
from service.electrical.column_tools import groups
from service.electrical.devices import let_through, residual
from service.electrical.devices.base import Device
from service.electrical.devices.catalogue import resolve
from service.electrical.errors import ElectricalError, InvalidInput
from service.electrical.inputs import Circuit, Supply, electrode_problem
from service.electrical.network import voltage_factors
from service.electrical.rules import disconnection, requirements

# parameters of the rules that come from the supply (the others come from the circuit)
SUPPLY_PARAMETERS = frozenset(
    {"earthing", "u0_v", "ze_ohm", "c_max", "current_kind", "reduced_low_voltage", "zs_ohm", "electrode_ohm"}
)


@dataclass(frozen=True)
class CircuitFailure:
    """A circuit the core could not compute with: where in the item (``supply`` or ``circuit`` first), and why."""

    index: int
    id: str | None
    path: tuple
    message: str
    error: type[ElectricalError] = ElectricalError

    @property
    def field(self) -> str:
        return ".".join(str(p) for p in self.path)

    def as_error(self) -> ElectricalError:
        """The error that stopped the circuit, to raise where one circuit was asked for."""
        return self.error(self.path, self.message)


def _optional(values: Sequence[float | None]) -> np.ndarray:
    return np.array([np.nan if v is None else float(v) for v in values], dtype=float)


@dataclass
class CircuitColumns:
    """N circuits (with their supplies) as arrays; the inputs themselves are kept for the results."""

    supplies: Sequence[Supply]
    circuits: Sequence[Circuit]
    earthing: np.ndarray
    tt: np.ndarray
    u0_v: np.ndarray
    ze_ohm: np.ndarray
    pfc_stated_ka: np.ndarray
    c_max: list[float | None]
    electrode_ohm: np.ndarray
    bonded: np.ndarray
    current_kind: np.ndarray
    reduced_low_voltage: np.ndarray
    role: np.ndarray
    load: np.ndarray
    phases: np.ndarray  # the circuit's: 1 or 3
    supply_phases: np.ndarray
    use: np.ndarray
    supply_kind: np.ndarray
    drop_limit_percent: np.ndarray  # the circuit's own limit, NaN for Appendix 4's
    upstream_drop_percent: np.ndarray  # from the origin to the circuit's board
    three_phase_ka: np.ndarray  # stated symmetrical three-phase fault at the origin of the circuit
    earth_fault_max_ka: np.ndarray  # stated largest earth fault there
    rating_a: np.ndarray
    design_current_a: np.ndarray
    r1r2_given_ohm: np.ndarray
    conductors: cond.ConductorColumns
    devices: list[Device]
    device_groups: Mapping[Hashable, np.ndarray]
    energy_groups: Mapping[Hashable, np.ndarray]  # by device and energy-limiting class
    standard_device: np.ndarray  # a built-in device (its data are the standard's, for a.c.), not a user's curve
    is_fuse: np.ndarray
    standard: np.ndarray  # the device's standard (None for a user's curve)
    has_rcd: np.ndarray
    residual_ma: np.ndarray
    rcd_groups: Mapping[Hashable, np.ndarray]
    let_through_a2s: np.ndarray
    energy_class: list[int | None]
    breaking_capacity_ka: np.ndarray
    conditional_ka: np.ndarray
    line_neutral_loop_ohm: np.ndarray
    board: np.ndarray  # the board of an installation whose carried-down values the supply holds (None: the origin)
    needs: requirements.RequirementColumns  # what the rules beyond the calculations read

    @property
    def n(self) -> int:
        return len(self.circuits)


def _conditional(supplies: Sequence[Supply], circuits: Sequence[Circuit]) -> np.ndarray:
    """The conditional short-circuit rating each circuit's device is used under: its own, else its board's."""
    own = [c.conditional_short_circuit_ka for c in circuits]
    return _optional([s.conditional_short_circuit_ka if o is None else o for s, o in zip(supplies, own, strict=True)])


class _SupplyColumns:
    """Columns of the supplies' fields; where every circuit has the same supply, each value is read once."""

    def __init__(self, supplies: Sequence[Supply]):
        first = supplies[0] if supplies else None
        self.one = first if all(s is first for s in supplies) else None
        self.supplies, self.n = supplies, len(supplies)

    def values(self, name: str) -> list[Any]:
        if self.one is not None:
            return [getattr(self.one, name)] * self.n
        return [getattr(s, name) for s in self.supplies]

    def array(self, name: str, dtype: Any) -> np.ndarray:
        if self.one is not None:
            return np.full(self.n, getattr(self.one, name), dtype=dtype)
        return np.array(self.values(name), dtype=dtype)


def columns_of(supplies: Sequence[Supply], circuits: Sequence[Circuit]) -> CircuitColumns:
    """The columns of circuits that :func:`prepare` accepted."""
    device_groups = groups([c.device.curve_key for c in circuits])
    devices: list[Device] = [None] * len(circuits)  # type: ignore[list-item]
    for idx in device_groups.values():
        dev = resolve(circuits[idx[0]].device)
        for i in idx.tolist():
            devices[i] = dev
    rcds = [c.device.rcd for c in circuits]
    sc = _SupplyColumns(supplies)
    earthing = sc.array("earthing", object)
    return CircuitColumns(
        supplies=supplies,
        circuits=circuits,
        earthing=earthing,
        tt=earthing == "TT",
        u0_v=sc.array("u0_v", float),
        ze_ohm=sc.array("ze_ohm", float),
        pfc_stated_ka=_optional(sc.values("prospective_fault_current_ka")),
        c_max=sc.values("c_max"),
        electrode_ohm=_optional(sc.values("electrode_ohm")),
        bonded=sc.array("bonding_complete", bool),
        current_kind=sc.array("current_kind", object),
        reduced_low_voltage=sc.array("reduced_low_voltage", bool),
        role=np.array([c.role for c in circuits], dtype=object),
        load=np.array([c.load for c in circuits], dtype=object),
        phases=np.array([c.phases for c in circuits], dtype=np.int8),
        supply_phases=sc.array("phases", np.int8),
        use=np.array([c.use for c in circuits], dtype=object),
        supply_kind=sc.array("supply_kind", object),
        drop_limit_percent=_optional([c.voltage_drop_limit_percent for c in circuits]),
        upstream_drop_percent=sc.array("voltage_drop_percent", float),
        three_phase_ka=_optional(sc.values("three_phase_fault_current_ka")),
        earth_fault_max_ka=_optional(sc.values("max_earth_fault_current_ka")),
        rating_a=np.array([d.overload_current_a for d in devices], dtype=float),  # In, or Ir where adjustable
        design_current_a=_optional([c.design_current_a for c in circuits]),
        r1r2_given_ohm=_optional([c.r1_plus_r2_ohm for c in circuits]),
        conductors=cond.conductor_columns([c.conductors for c in circuits]),
        devices=devices,
        device_groups=device_groups,
        energy_groups=groups(
            [(c.device.curve_key, c.device.energy_limiting_class, c.device.let_through_curve) for c in circuits]
        ),
        standard_device=np.array([d.standard is not None for d in devices], dtype=bool),
        is_fuse=np.array([d.kind == "fuse" for d in devices], dtype=bool),
        standard=np.array([d.standard for d in devices], dtype=object),
        has_rcd=np.array([r is not None for r in rcds], dtype=bool),
        residual_ma=np.array([np.inf if r is None else r.residual_current_ma for r in rcds], dtype=float),
        rcd_groups={
            k: v for k, v in groups([(r.residual_current_ma, r.delay) if r else None for r in rcds]).items() if k
        },
        let_through_a2s=_optional([c.device.let_through_a2s for c in circuits]),
        energy_class=[c.device.energy_limiting_class for c in circuits],
        breaking_capacity_ka=_optional([c.device.breaking_capacity_ka for c in circuits]),
        conditional_ka=_conditional(supplies, circuits),
        line_neutral_loop_ohm=_optional(sc.values("line_neutral_loop_ohm")),
        board=sc.array("board", object),
        needs=requirements.requirement_columns(supplies, circuits),
    )


def prepare(supplies: Sequence[Supply], circuits: Sequence[Circuit]) -> tuple[list[int], list[CircuitFailure]]:
    """Which circuits can be computed (their indices) and a failure for each of the others, in order."""
    good: list[int] = []
    failures: list[CircuitFailure] = []
    rules: dict[tuple, ElectricalError | None] = {}  # by the supply object: hashing a Supply is not free
    for i, (s, c) in enumerate(zip(supplies, circuits, strict=True)):
        key = (id(s), c.role, c.load, c.device.rating_a)
        if key not in rules:
            rules[key] = _rules_problem(s, c.role, c.load, c.device.rating_a)
        problem = _problem(s, c, rules[key])
        if problem is None:
            good.append(i)
        else:
            failures.append(CircuitFailure(i, c.id, problem.path, problem.message, type(problem)))
    return good, failures


def _problem(supply: Supply, circuit: Circuit, rules: ElectricalError | None) -> ElectricalError | None:
    """The first per-item lookup that fails, with its path rooted at ``supply`` or ``circuit``.

    Each lookup is made once per distinct device, conductor arrangement and rule case, so a schedule
    of thousands of circuits costs a few dozen.
    """
    if circuit.conductors is None and circuit.r1_plus_r2_ohm is None:
        return InvalidInput(("circuit", "conductors"), "give the conductors, or a known r1_plus_r2_ohm")
    c = circuit.conductors
    for problem in (
        device_problem(circuit.device),
        None if c is None else _conductor_problem(cond.arrangement(c), c.parallel_cables, c.ring),
        rules,
        _phase_problem(supply.phases, circuit.phases, circuit.phase, circuit.use, supply.supply_kind),
        None if circuit.installation is None else _installation_problem(circuit.installation, circuit.phases),
        requirements.circuit_problem(circuit, supply.edition),
    ):
        if problem is not None:
            return problem
    return None


@lru_cache(maxsize=4096)
def device_problem(spec) -> ElectricalError | None:
    try:
        dev = resolve(spec)
        if spec.energy_limiting_class is not None and spec.energy_limiting_class not in let_through.ENERGY_CLASSES:
            raise InvalidInput("energy_limiting_class", f"the class is one of {list(let_through.ENERGY_CLASSES)}")
        if spec.let_through_curve is not None:
            let_through.check_curve(spec.let_through_curve)
        if spec.rcd is not None:
            residual.rcd_characteristic(spec.rcd.residual_current_ma, spec.rcd.delay)
        if dev.residual and spec.rcd is None:
            raise InvalidInput("rcd", f"an RCBO to {dev.standard} needs its residual part: rcd.residual_current_ma")
    except ElectricalError as err:
        return err.within("circuit", "device")
    return None


@lru_cache(maxsize=4096)
def _conductor_problem(arrangement: tuple, parallel_cables: int, ring: bool = False) -> ElectricalError | None:
    try:
        cond.check_parallel_cables(parallel_cables)
        if ring and parallel_cables > 1:
            raise InvalidInput("parallel_cables", "a ring final circuit is one cable: not run in parallel cables")
        cond.constants_of(*arrangement)
    except ElectricalError as err:
        return err.within("circuit", "conductors")
    return None


PHASES = ("L1", "L2", "L3")


@lru_cache(maxsize=64)
def _phase_problem(
    supply_phases: int, phases: int, phase: str | None, use: str, supply_kind: str
) -> ElectricalError | None:
    """A three-phase circuit needs a three-phase supply; a single-phase one names its phase on one (L1, L2, L3)."""
    if supply_phases not in (1, 3):
        return InvalidInput(("supply", "phases"), "phases is 1 or 3")
    if phases not in (1, 3):
        return InvalidInput(("circuit", "phases"), "phases is 1 or 3")
    if phases == 3 and supply_phases != 3:
        return InvalidInput(("circuit", "phases"), "a three-phase circuit needs a three-phase supply (supply.phases 3)")
    if phase is not None and (phase not in PHASES or phases == 3):
        return InvalidInput(("circuit", "phase"), f"a single-phase circuit's phase is one of {list(PHASES)}")
    if use not in capacity.USES:
        return InvalidInput(("circuit", "use"), f"use is one of {list(capacity.USES)}")
    if supply_kind not in capacity.SUPPLY_KINDS:
        return InvalidInput(("supply", "supply_kind"), f"supply_kind is one of {list(capacity.SUPPLY_KINDS)}")
    return None


@lru_cache(maxsize=1024)
def _installation_problem(inst, phases: int) -> ElectricalError | None:
    """The installation's table, method and factors exist (the overload check reads them)."""
    try:
        if phases not in (1, 3):
            raise InvalidInput("phases", "phases is 1 or 3")
        capacity.capacities(inst.cable, inst.installation_method, phases)
        capacity.derating(inst, capacity.cable_table(inst.cable)["insulation"], None, 0.0)
    except ElectricalError as err:
        if err.path[0] == "phases":
            return err.within("circuit")
        return err.within("circuit", "installation")
    return None


@lru_cache(maxsize=4096)
def _rules_problem(supply: Supply, role: str, load: str | None, rating_a: float) -> ElectricalError | None:
    for name in ("ze_ohm", "u0_v"):
        if not getattr(supply, name) > 0:
            return InvalidInput(("supply", name), "must be greater than zero")
    electrode = electrode_problem(supply.earthing, supply.ze_ohm, supply.electrode_ohm)
    if electrode is not None:
        return InvalidInput(("supply", "ze_ohm"), electrode)
    try:
        disconnection.max_disconnection_time_s(
            supply.earthing, supply.u0_v, role, load, rating_a, supply.current_kind, False, supply.reduced_low_voltage
        )
        voltage_factors.check_c_max(voltage_factors.c_max_default() if supply.c_max is None else supply.c_max)
    except ElectricalError as err:
        return err.within("supply" if err.path[0] in SUPPLY_PARAMETERS else "circuit")
    return None
