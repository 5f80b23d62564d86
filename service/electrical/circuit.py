"""The whole check of one circuit or of many: every figure, every check, a verdict and cautions.

One path serves all: :func:`check_circuits` turns the circuits into columns and computes each
formula once over all of them (devices are grouped, so each characteristic is read once per group).
:func:`check_circuit` is that path with one circuit.

Checks and the clauses they rest on (BS 7671:2018):
- ``disconnection-time``: time read off the device's characteristic at the earth fault current
  against the maximum time of Table 41.1 / 411.3.2.3 / 411.3.2.4 / 411.8.3;
- ``max-zs``: Zs against U0 x Cmin / Ia (411.4.4 TN, 411.5.4 TT), or 50 V / IΔn with an RCD;
- ``protective-conductor``: cpc size against sqrt(I^2 t) / k (543.1.3), or Table 54.7 (543.1.4);
- ``breaking-capacity``: the device's rated breaking capacity against the prospective fault current (434.5.1);
- ``rcd``: Zs (TN, 411.4.5) or RA (TT, 411.5.3) x IΔn <= 50 V, where an RCD is fitted.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass, field
from functools import lru_cache
from typing import Any

import numpy as np

from . import conductors as cond
from . import disconnection, faults, protective
from .arrays import groups
from .devices import residual
from .devices.base import Device
from .devices.catalogue import resolve
from .devices.characteristic import AT_MOST, BEYOND_DATA, ESTIMATED
from .errors import ElectricalError, InvalidInput
from .limits import max_zs_ohm

PASS, FAIL, NOT_VERIFIED = "pass", "fail", "not-verified"
VERDICTS = (PASS, FAIL, NOT_VERIFIED)
CHECKS = ("disconnection-time", "max-zs", "protective-conductor", "breaking-capacity", "rcd")

# the words results carry, in one place
BASES = {
    "zs-tn": "BS 7671:2018 411.4.4, Zs <= U0 x Cmin / Ia",
    "zs-tt": "BS 7671:2018 411.5.4, Zs <= U0 x Cmin / Ia",
    "rcd-tn": "BS 7671:2018 411.4.5, Zs x IΔn <= 50 V",
    "rcd-tt": "BS 7671:2018 411.5.3, RA x IΔn <= 50 V",
    "by-rcd": " (fault protection by the RCD)",
    "adiabatic": "BS 7671:2018 543.1.3, S >= sqrt(I^2 t) / k",
    "selection": "BS 7671:2018 543.1.4, Table 54.7 (cpc by selection)",
    "breaking-capacity": "BS 7671:2018 434.5.1, rated breaking capacity >= prospective fault current",
    "pfc-stated": "stated in the request",
    "pfc-from-ze": "U0 x cmax / Ze with cmax {c_max:g} (IEC 60909-0 Table 1)",
}
NOTES = {
    "time-estimated": "Time read from an estimated part of the curve (see the device notes).",
    "no-time-set": "Table 41.1 sets no disconnection time for this case; disconnection may still be required for other reasons.",
    "below-data": "The fault current is below the device's data: no disconnection is shown.",
    "at-most-only": "The device's data show operation only within 'at most' this time; the shorter time required cannot be shown from standard data.",
    "ia-estimated": "Ia read from an estimated part of the curve.",
    "rcd-protects": "The overcurrent device alone would not meet its limit; the RCD provides fault protection.",
    "no-ia": "The device's data cannot show operation within the required time, so no maximum Zs follows.",
    "no-cpc": "The cpc is not described (conductors not given), so its size cannot be checked.",
    "energy-0.1s": "Energy I^2 x 0.1 s (conservative: the device clears within 0.1 s).",
    "let-through": "Energy from the device's let-through I^2 t given in the request.",
    "selection": "The cpc meets Table 54.7 by selection.",
    "selection-no-adiabatic": "The cpc meets Table 54.7 by selection; the adiabatic check does not apply at this time.",
    "outside-adiabatic": "The adiabatic equation applies from 0.1 s to 5 s; at this fault the device's time is outside it.",
    "no-breaking-capacity": "State the device's rated short-circuit capacity (breaking_capacity_ka).",
    "breaking-capacity-default": "Rated breaking capacity not given: taken as the {basis}.",
    "ra-not-given": "RA not given: Zs used in its place (larger, so on the safe side).",
}
CAUTIONS = {
    "energy-0.1s": "Below 0.1 s the cpc check uses I^2 x 0.1 s, a conservative stand-in for the device's let-through energy (give let_through_a2s to use the maker's value).",
    "breaking-capacity-memory": "Breaking capacity taken from a standard minimum that is from memory: confirm it from the maker's data.",
    "pfc-from-ze": "Prospective fault current calculated from Ze; the line-neutral (or three-phase) value may be higher: state the larger one.",
    "electrode-unstable": "Earth electrode resistance above 200 ohm may not be stable (note to BS 7671:2018 Table 41.5).",
    "estimated": "A figure rests on an estimated part of the device's curve; a maker's curve (curve_points) removes the estimate.",
    "additional-protection": "Socket-outlets rated up to 32 A need additional protection by a 30 mA RCD (BS 7671:2018 411.3.3), unless an exception applies.",
    "ib-over-in": "The design current exceeds the device rating (Ib <= In, BS 7671:2018 433.1.1).",
    "r1r2-given": "R1+R2 taken as given: it must be the value at the conductors' operating temperature.",
}

GENERAL_CAUTIONS = (
    "This result supports a competent person; it does not replace one. A competent person must verify the design.",
    "The current edition of BS 7671 / IEC 60364, local codes and licensed practice prevail over this result.",
    "Site measurements (Ze, Zs, R1+R2, RCD operation) must confirm the design before the circuit is put into service.",
)


@dataclass(frozen=True)
class Supply:
    """The supply at the origin. For TT, ``ze_ohm`` is the whole external loop including RA."""

    earthing: str
    u0_v: float
    ze_ohm: float
    prospective_fault_current_ka: float | None = None
    c_max: float | None = None
    electrode_ohm: float | None = None
    bonding_complete: bool = False
    current_kind: str = "ac"
    reduced_low_voltage: bool = False


@dataclass(frozen=True)
class Rcd:
    residual_current_ma: float
    delay: str = "general"


@dataclass(frozen=True)
class DeviceSpec:
    rating_a: float
    standard: str | None = None
    type: str | None = None
    breaking_capacity_ka: float | None = None
    curve_points: tuple[tuple[float, float], ...] | None = None
    rcd: Rcd | None = None
    let_through_a2s: float | None = None

    def as_mapping(self) -> dict[str, Any]:
        points = None if self.curve_points is None else [{"current_a": c, "time_s": t} for c, t in self.curve_points]
        return {"standard": self.standard, "type": self.type, "rating_a": self.rating_a, "curve_points": points}

    @property
    def curve_key(self) -> tuple:
        return (self.standard, self.type, float(self.rating_a), self.curve_points)


@dataclass(frozen=True)
class Conductors:
    material: str
    insulation: str
    line_csa_mm2: float
    cpc_csa_mm2: float
    length_m: float
    cpc_arrangement: str = "in-cable"
    ring: bool = False
    parallel_cables: int = 1
    conductor_class: int = 2
    cpc_material: str | None = None
    cpc_resistance_mohm_per_m: float | None = None
    bare_condition: str | None = None


@dataclass(frozen=True)
class Circuit:
    device: DeviceSpec
    conductors: Conductors | None = None
    r1_plus_r2_ohm: float | None = None
    role: str = "final"
    load: str | None = None
    id: str | None = None
    design_current_a: float | None = None


@dataclass
class Check:
    check: str
    verdict: str
    value: float | None
    limit: float | None
    unit: str
    margin_percent: float | None
    basis: str
    note: str | None = None


@dataclass
class CircuitResult:
    id: str | None
    r1_plus_r2_ohm: float | None
    zs_ohm: float
    earth_fault_current_a: float
    earth_fault_current_nominal_a: float
    prospective_fault_current_ka: float
    prospective_fault_current_basis: str
    device: dict[str, Any]
    disconnection_time_s: float | None
    disconnection_time_bound: str
    disconnection_region: str
    disconnected_by: str | None
    max_disconnection_time_s: float | None
    max_disconnection_basis: str
    operating_current_a: float | None
    operating_current_bound: str
    max_zs_ohm: float | None
    zs_margin_percent: float | None
    protective_conductor: dict[str, Any]
    checks: list[Check]
    verdict: str
    cautions: list[str] = field(default_factory=list)


@dataclass
class CircuitFailure:
    """A circuit the core could not compute with: which field, and why."""

    index: int
    id: str | None
    field: str
    message: str


def overall_verdict(verdicts: Sequence[str]) -> str:
    """``fail`` if any check fails, else ``not-verified`` if any is, else ``pass``."""
    if FAIL in verdicts:
        return FAIL
    if NOT_VERIFIED in verdicts:
        return NOT_VERIFIED
    return PASS


def _opt(values: Sequence[Any]) -> np.ndarray:
    return np.array([np.nan if v is None else float(v) for v in values], dtype=float)


def _column(items: Sequence[Any], name: str) -> list[Any]:
    return [getattr(item, name) for item in items]


class _Rows:
    """Columns of the circuits being checked (only those that passed the per-item lookups)."""

    def __init__(self, supplies: Sequence[Supply], circuits: Sequence[Circuit]):
        self.n = len(circuits)
        self.earthing = np.array(_column(supplies, "earthing"), dtype=object)
        self.u0 = np.array(_column(supplies, "u0_v"), dtype=float)
        self.ze = np.array(_column(supplies, "ze_ohm"), dtype=float)
        self.pfc_stated = _opt(_column(supplies, "prospective_fault_current_ka"))
        self.electrode = _opt(_column(supplies, "electrode_ohm"))
        self.bonded = np.array(_column(supplies, "bonding_complete"), dtype=bool)
        self.kind = np.array(_column(supplies, "current_kind"), dtype=object)
        self.rlv = np.array(_column(supplies, "reduced_low_voltage"), dtype=bool)
        self.c_max = [s.c_max for s in supplies]
        self.role = np.array(_column(circuits, "role"), dtype=object)
        self.load = np.array(_column(circuits, "load"), dtype=object)
        self.rating = np.array([c.device.rating_a for c in circuits], dtype=float)
        self.r1r2_given = _opt(_column(circuits, "r1_plus_r2_ohm"))
        self.has_cond = np.array([c.conductors is not None for c in circuits], dtype=bool)


_CONSTANT_FIELDS = ("line_r20", "cpc_r20", "line_temp", "cpc_temp", "k", "k_formula", "k_tabulated", "k_line")


@lru_cache(maxsize=4096)
def conductor_constants(material: str, insulation: str, line_csa_mm2: float, cpc_csa_mm2: float, cpc_arrangement: str,
                        conductor_class: int, cpc_material: str | None, cpc_resistance_mohm_per_m: float | None,
                        bare_condition: str | None) -> tuple:
    """What a conductor arrangement contributes whatever its length: resistances at 20 degC (mohm/m),
    the temperatures the rules assume, k for the cpc and for the line conductor, and the k table.

    The line conductor is taken at its insulation's operating temperature; the cpc at the initial
    temperature of its k case (BS 7671 Tables 54.2-54.6), which is the same for a core of the cable.
    Raises the core's typed errors naming the conductor field. One lookup per distinct arrangement.
    """
    cpc_mat = cpc_material or (material if cpc_arrangement in ("in-cable", "separate", "bare") else "steel")
    line_r20 = cond.resistance_mohm_per_m(material, line_csa_mm2, conductor_class, field="line_csa_mm2")[0]
    case = protective.k_case(cpc_mat, cpc_arrangement, insulation, cpc_csa_mm2, bare_condition)
    k_line = protective.k_case(material, "in-cable", insulation, line_csa_mm2)["k"]
    if cpc_resistance_mohm_per_m is not None:
        cpc_r20 = float(cpc_resistance_mohm_per_m)
    elif cpc_mat in cond.MATERIALS:
        cpc_r20 = cond.resistance_mohm_per_m(cpc_mat, cpc_csa_mm2, conductor_class, field="cpc_csa_mm2")[0]
    else:
        raise InvalidInput(
            "cpc_resistance_mohm_per_m",
            f"a {cpc_mat} {cpc_arrangement} used as the cpc needs its resistance at 20 degC from the maker's data",
        )
    line_temp = cond.operating_temperature_c(insulation, 1, field="insulation")[0]
    tabulated = np.nan if case["k_tabulated"] is None else case["k_tabulated"]
    numbers = (line_r20, cpc_r20, line_temp, case["initial_c"], case["k"], case["k_formula"], tabulated, k_line)
    return tuple(float(v) for v in numbers) + (case["table"], cpc_mat)


def conductor_columns(items: Sequence[Conductors | None]) -> dict[str, np.ndarray]:
    """R1, R2 (ohm, at the temperatures the rules assume), k and sizes for each item (NaN where None).

    R = r20 x (1 + 0.004 (theta - 20)) x L / n, a quarter of the end-to-end value on a ring
    (:func:`conductor_constants` gives r20 and the temperatures).
    """
    n = len(items)
    out = {name: np.full(n, np.nan) for name in ("r1", "r2", "cpc_csa", "line_csa") + _CONSTANT_FIELDS}
    out["k_table"] = np.full(n, None, dtype=object)
    out["cpc_material"] = np.full(n, None, dtype=object)
    out["line_material"] = np.full(n, None, dtype=object)
    idx = [i for i, c in enumerate(items) if c is not None]
    if not idx:
        return out
    cs = [items[i] for i in idx]
    constants = [
        conductor_constants(c.material, c.insulation, c.line_csa_mm2, c.cpc_csa_mm2, c.cpc_arrangement, c.conductor_class,
                            c.cpc_material, c.cpc_resistance_mohm_per_m, c.bare_condition)
        for c in cs
    ]
    sel = np.asarray(idx)
    numeric = np.array([k[:len(_CONSTANT_FIELDS)] for k in constants], dtype=float)
    for j, name in enumerate(_CONSTANT_FIELDS):
        out[name][sel] = numeric[:, j]
    length = np.array([c.length_m for c in cs], dtype=float)
    parallel = np.array([c.parallel_cables for c in cs], dtype=float)
    ring = cond.ring_factor(np.array([c.ring for c in cs], dtype=bool), length.shape)
    out["r1"][sel] = cond.conductor_resistance_ohm(numeric[:, 0], length, numeric[:, 2], parallel) * ring
    out["r2"][sel] = cond.conductor_resistance_ohm(numeric[:, 1], length, numeric[:, 3], parallel) * ring
    out["cpc_csa"][sel] = [c.cpc_csa_mm2 for c in cs]
    out["line_csa"][sel] = [c.line_csa_mm2 for c in cs]
    out["k_table"][sel] = np.fromiter((k[-2] for k in constants), dtype=object, count=len(cs))
    out["cpc_material"][sel] = np.fromiter((k[-1] for k in constants), dtype=object, count=len(cs))
    out["line_material"][sel] = np.fromiter((c.material for c in cs), dtype=object, count=len(cs))
    return out


def _prefixed(prefix: str, err: ElectricalError) -> ElectricalError:
    field = err.field if err.field.startswith(prefix) else f"{prefix}{err.field}"
    return type(err)(field, err.message)


_SUPPLY_FIELDS = ("earthing", "u0_v", "ze_ohm", "c_max", "current_kind", "zs_ohm")


def _validate_one(supply: Supply, circuit: Circuit) -> None:
    """Per-item lookups that can fail, so that one bad circuit never sinks a batch.

    Errors name the field from the circuit's point of view: ``device.rating_a``,
    ``conductors.line_csa_mm2``, ``supply.u0_v``, ``role``. Each lookup is made once per distinct
    device, conductor arrangement and rule case, so a schedule of thousands costs a few dozen.
    """
    if circuit.conductors is None and circuit.r1_plus_r2_ohm is None:
        raise InvalidInput("conductors", "give the conductors, or a known r1_plus_r2_ohm")
    c = circuit.conductors
    problems = (
        _device_problem(circuit.device),
        None if c is None else _conductor_problem(c),
        _rules_problem(supply, circuit.role, circuit.load, circuit.device.rating_a),
    )
    for problem in problems:
        if problem is not None:
            raise problem


@lru_cache(maxsize=4096)
def _device_problem(spec: DeviceSpec) -> ElectricalError | None:
    try:
        dev = resolve(spec.as_mapping())
        if spec.rcd is not None:
            residual.rcd_characteristic(spec.rcd.residual_current_ma, spec.rcd.delay)
        if dev.residual and spec.rcd is None:
            raise InvalidInput("rcd", f"an RCBO to {dev.standard} needs its residual part: rcd.residual_current_ma")
    except ElectricalError as err:
        return _prefixed("device.", err)
    return None


def _conductor_problem(c: Conductors) -> ElectricalError | None:
    try:
        cond.check_parallel_cables(c.parallel_cables)
        conductor_constants(c.material, c.insulation, c.line_csa_mm2, c.cpc_csa_mm2, c.cpc_arrangement, c.conductor_class,
                            c.cpc_material, c.cpc_resistance_mohm_per_m, c.bare_condition)
    except ElectricalError as err:
        return _prefixed("conductors.", err)
    return None


@lru_cache(maxsize=4096)
def _rules_problem(supply: Supply, role: str, load: str | None, rating_a: float) -> ElectricalError | None:
    for name in ("ze_ohm", "u0_v"):
        if not getattr(supply, name) > 0:
            return InvalidInput(f"supply.{name}", "must be greater than zero")
    try:
        disconnection.max_disconnection_time_s(
            supply.earthing, supply.u0_v, role, load, rating_a, supply.current_kind, False, supply.reduced_low_voltage,
        )
        faults.prospective_fault_current_ka(supply.u0_v, supply.ze_ohm, supply.prospective_fault_current_ka, supply.c_max)
    except ElectricalError as err:
        return _prefixed("supply.", err) if err.field in _SUPPLY_FIELDS else err
    return None


def check_circuit(supply: Supply, circuit: Circuit) -> CircuitResult:
    """Check one circuit: :func:`check_circuits` with one element. Raises the core's typed errors."""
    result = check_circuits(supply, [circuit])[0]
    if isinstance(result, CircuitFailure):
        raise ElectricalError(result.field, result.message)
    return result


def check_circuits(supply: Supply | Sequence[Supply], circuits: Sequence[Circuit]) -> list[CircuitResult | CircuitFailure]:
    """Check many circuits as arrays; one result or one failure per circuit, in order."""
    supplies = [supply] * len(circuits) if isinstance(supply, Supply) else list(supply)
    if len(supplies) != len(circuits):
        raise InvalidInput("supply", "give one supply, or one per circuit")
    out: list[CircuitResult | CircuitFailure | None] = [None] * len(circuits)
    good: list[int] = []
    for i, (s, c) in enumerate(zip(supplies, circuits)):
        try:
            _validate_one(s, c)
            good.append(i)
        except ElectricalError as err:
            out[i] = CircuitFailure(i, c.id, err.field, err.message)
    if good:
        results = _evaluate([supplies[i] for i in good], [circuits[i] for i in good])
        for i, r in zip(good, results):
            out[i] = r
    return out  # type: ignore[return-value]


def _evaluate(supplies: Sequence[Supply], circuits: Sequence[Circuit]) -> list[CircuitResult]:
    rows = _Rows(supplies, circuits)
    n = rows.n
    cc = conductor_columns([c.conductors for c in circuits])
    calc_r1r2 = cc["r1"] + cc["r2"]
    r1r2 = np.where(np.isnan(rows.r1r2_given), calc_r1r2, rows.r1r2_given)

    # 411.4.4 / 411.5.4: the loop and the fault currents
    zs = faults.loop_impedance_ohm(rows.ze, r1r2)
    i_f = faults.earth_fault_current_a(rows.u0, zs)
    i_nom = faults.earth_fault_current_a(rows.u0, zs, voltage_factor=1.0)
    pfc = np.empty(n)
    for key, idx in groups(rows.c_max).items():
        pfc[idx] = faults.prospective_fault_current_ka(rows.u0[idx], rows.ze[idx], rows.pfc_stated[idx], key)

    # which times apply: the overcurrent device may use TN times in a bonded TT installation
    tt = rows.earthing == "TT"
    t_req_oc, basis_oc = disconnection.max_disconnection_time_s(
        rows.earthing, rows.u0, rows.role, rows.load, rows.rating, rows.kind, tt & rows.bonded, rows.rlv
    )
    t_req_rcd, basis_rcd = disconnection.max_disconnection_time_s(
        rows.earthing, rows.u0, rows.role, rows.load, rows.rating, rows.kind, False, rows.rlv
    )

    # the overcurrent device, one characteristic per distinct device
    devices: list[Device] = [None] * n  # type: ignore[list-item]
    t_oc = np.empty(n)
    b_oc = np.empty(n, dtype=object)
    region = np.empty(n, dtype=object)
    ia = np.empty(n)
    b_ia = np.empty(n, dtype=object)
    max_zs_oc = np.empty(n)
    for key, idx in groups([c.device.curve_key for c in circuits]).items():
        dev = resolve(circuits[idx[0]].device.as_mapping())
        t_oc[idx], b_oc[idx] = dev.time_at(i_f[idx])
        region[idx] = dev.region_at(i_f[idx])
        ia[idx], b_ia[idx], max_zs_oc[idx] = max_zs_ohm(dev, np.nan_to_num(t_req_oc[idx], nan=np.inf), rows.u0[idx])
        for i in idx:
            devices[i] = dev

    # the RCD, where fitted
    has_rcd = np.array([c.device.rcd is not None for c in circuits], dtype=bool)
    t_rcd = np.full(n, np.inf)
    b_rcd = np.full(n, BEYOND_DATA, dtype=object)
    rcd_limit = np.full(n, np.nan)
    for key, idx in groups([(c.device.rcd.residual_current_ma, c.device.rcd.delay) if c.device.rcd else None for c in circuits]).items():
        if key is None:
            continue
        t_rcd[idx], b_rcd[idx] = residual.rcd_characteristic(*key).time_at(i_f[idx])
        rcd_limit[idx] = residual.rcd_max_loop_ohm(key[0])
    ra = np.where(tt, np.where(np.isnan(rows.electrode), zs, rows.electrode + np.nan_to_num(cc["r2"])), zs)

    has_cond = rows.has_cond

    # disconnection time: the overcurrent device, else the RCD (411.3.2, 411.4.5, 411.5.3)
    v_oc = _time_verdicts(t_oc, b_oc, t_req_oc)
    v_rcd = np.where(has_rcd, _time_verdicts(t_rcd, b_rcd, t_req_rcd), None)
    by_rcd = has_rcd & (v_oc != PASS) & (v_rcd == PASS)
    t = np.where(by_rcd, t_rcd, t_oc)
    bound = np.where(by_rcd, b_rcd, b_oc)
    limit = np.where(by_rcd, t_req_rcd, t_req_oc)
    t_basis = np.where(by_rcd, basis_rcd, basis_oc)
    dt_verdict = np.where(by_rcd, PASS, np.where(has_rcd & ((v_oc == NOT_VERIFIED) | (v_rcd == NOT_VERIFIED)), NOT_VERIFIED, v_oc))
    dt_note = np.select(
        [bound == ESTIMATED, ~np.isfinite(limit), bound == BEYOND_DATA, dt_verdict == NOT_VERIFIED],
        [NOTES["time-estimated"], NOTES["no-time-set"], NOTES["below-data"], NOTES["at-most-only"]], None)

    # max Zs: the overcurrent device's U0 Cmin / Ia; with an RCD, 50 V / IΔn where that is not met
    oc_ok = np.isfinite(max_zs_oc) & (zs <= max_zs_oc)
    use_rcd = ~oc_ok & has_rcd
    rcd_value = np.where(tt, ra, zs)
    mz_value = np.where(use_rcd, rcd_value, zs)
    mz_limit = np.where(use_rcd, rcd_limit, max_zs_oc)
    mz_verdict = np.where(oc_ok, PASS, np.where(use_rcd, np.where(rcd_value <= rcd_limit, PASS, FAIL),
                                               np.where(np.isfinite(max_zs_oc), FAIL, NOT_VERIFIED)))
    mz_basis = np.where(use_rcd, np.where(tt, BASES["rcd-tt"] + BASES["by-rcd"], BASES["rcd-tn"] + BASES["by-rcd"]),
                        np.where(tt, BASES["zs-tt"], BASES["zs-tn"]))
    mz_note = np.select([oc_ok & (b_ia == ESTIMATED), use_rcd, ~oc_ok & ~np.isfinite(max_zs_oc)],
                        [NOTES["ia-estimated"], NOTES["rcd-protects"], NOTES["no-ia"]], None)

    # protective conductor (543.1.3, or Table 54.7 by selection, 543.1.4)
    let_through = np.array([np.nan if c.device.let_through_a2s is None else c.device.let_through_a2s for c in circuits])
    energy, method = protective.fault_energy_a2s(i_f, t, let_through)
    with np.errstate(invalid="ignore"):
        s_min = protective.min_csa_mm2(energy, cc["k"])
    s_min = np.where(has_cond, s_min, np.nan)
    csa = cc["cpc_csa"]
    same = cc["cpc_material"] == cc["line_material"]
    selection = protective.selection_csa_mm2(cc["line_csa"], np.where(same, 1.0, cc["k_line"]), np.where(same, 1.0, cc["k"]))
    finite_s = np.isfinite(s_min)
    cpc_verdict, adi_ok, sel_ok = protective.cpc_verdicts(csa, s_min, selection)
    pc_verdict = np.where(~has_cond, NOT_VERIFIED, cpc_verdict)
    pc_basis = np.where(has_cond & ~adi_ok & sel_ok, BASES["selection"], BASES["adiabatic"])
    method_note = np.select([method == "conservative-0.1s", method == "let-through"], [NOTES["energy-0.1s"], NOTES["let-through"]], None)
    pc_note = np.select([~has_cond, adi_ok, sel_ok & finite_s, sel_ok, ~finite_s],
                        [NOTES["no-cpc"], method_note, NOTES["selection"], NOTES["selection-no-adiabatic"], NOTES["outside-adiabatic"]], method_note)
    next_size = protective.next_standard_size_mm2(s_min)

    # breaking capacity against the prospective fault current at the origin (434.5.1)
    icn_given = np.array([np.nan if c.device.breaking_capacity_ka is None else c.device.breaking_capacity_ka for c in circuits])
    icn_default = np.array([np.nan if d.default_breaking_capacity_ka is None else d.default_breaking_capacity_ka for d in devices])
    from_default = np.isnan(icn_given) & ~np.isnan(icn_default)
    icn = np.where(np.isnan(icn_given), icn_default, icn_given)
    bc_verdict = np.where(np.isnan(icn), NOT_VERIFIED, np.where(icn >= pfc, PASS, FAIL))

    # the RCD's 50 V rule
    rcd_verdict = np.where(rcd_value <= rcd_limit, PASS, FAIL)
    no_ra = tt & np.isnan(rows.electrode)

    # cautions from the data and the rules
    socket_rule = (rows.role == "final") & (rows.load == "socket-outlets") & (rows.rating <= 32)
    idn = np.array([np.inf if c.device.rcd is None else c.device.rcd.residual_current_ma for c in circuits])
    design = np.array([np.nan if c.design_current_a is None else c.design_current_a for c in circuits])
    flags = [
        (has_cond & (method == "conservative-0.1s"), CAUTIONS["energy-0.1s"]),
        (from_default, CAUTIONS["breaking-capacity-memory"]),
        (np.isnan(rows.pfc_stated), CAUTIONS["pfc-from-ze"]),
        (tt & has_rcd & (rows.electrode > residual.stable_resistance_limit_ohm()), CAUTIONS["electrode-unstable"]),
        ((bound == ESTIMATED) | (b_ia == ESTIMATED), CAUTIONS["estimated"]),
        (socket_rule & (idn > residual.additional_protection_max_ma()), CAUTIONS["additional-protection"]),
        (design > rows.rating, CAUTIONS["ib-over-in"]),
        (~np.isnan(rows.r1r2_given), CAUTIONS["r1r2-given"]),
    ]
    caution_lists = [list(GENERAL_CAUTIONS) for _ in range(n)]
    for mask, text in flags:
        for i in np.flatnonzero(mask):
            caution_lists[i].append(text)

    pfc_basis = [
        BASES["pfc-stated"] if s.prospective_fault_current_ka is not None else
        BASES["pfc-from-ze"].format(c_max=s.c_max or faults.c_max_default())
        for s in supplies
    ]
    bc_note = np.where(from_default, None, np.where(np.isnan(icn), NOTES["no-breaking-capacity"], None)).astype(object)
    for i in np.flatnonzero(from_default):
        bc_note[i] = NOTES["breaking-capacity-default"].format(basis=devices[i].default_breaking_capacity_basis)

    numbers = _listed_many(
        r1r2=r1r2, zs=zs, i_f=i_f, i_nom=i_nom, pfc=pfc, t=t, limit=limit, ia=ia, mz_value=mz_value, mz_limit=mz_limit,
        k=cc["k"], k_formula=cc["k_formula"], s_min=s_min, csa=csa, next_size=next_size, selection=selection, energy=energy,
        icn=icn, rcd_value=rcd_value, rcd_limit=rcd_limit,
        dt_margin=_margin_array(t, limit), mz_margin=_margin_array(mz_value, mz_limit), pc_margin=_margin_array(s_min, csa),
        bc_margin=_margin_array(pfc, icn), rcd_margin=_margin_array(rcd_value, rcd_limit),
    )
    cols = dict(
        numbers,
        bound=bound.tolist(), t_basis=t_basis.tolist(), dt_verdict=dt_verdict.tolist(), dt_note=dt_note.tolist(),
        region=np.where(by_rcd, "residual", region).tolist(),
        by=np.where(bound == BEYOND_DATA, None, np.where(by_rcd, "rcd", "overcurrent-device")).tolist(),
        b_ia=b_ia.tolist(), mz_verdict=mz_verdict.tolist(), mz_basis=mz_basis.tolist(), mz_note=mz_note.tolist(),
        k_table=cc["k_table"].tolist(), method=method.tolist(),
        pc_verdict=pc_verdict.tolist(), pc_basis=pc_basis.tolist(), pc_note=pc_note.tolist(), has_cond=has_cond.tolist(),
        bc_verdict=bc_verdict.tolist(), bc_note=bc_note.tolist(),
        has_rcd=has_rcd.tolist(), rcd_verdict=rcd_verdict.tolist(),
        rcd_basis=np.where(tt, BASES["rcd-tt"], BASES["rcd-tn"]).tolist(),
        rcd_note=np.where(no_ra, NOTES["ra-not-given"], None).tolist(),
    )
    summaries = {id(d): {"device_id": d.device_id, "label": d.label, "source": d.source, "confidence": d.confidence,
                         "notes": list(d.notes)} for d in {id(d): d for d in devices}.values()}
    names = list(cols)
    rows_of = zip(*(cols[name] for name in names))
    return [
        _assemble(circuit, summaries[id(dev)], basis, cautions, dict(zip(names, row)))
        for circuit, dev, basis, cautions, row in zip(circuits, devices, pfc_basis, caution_lists, rows_of)
    ]


def _listed_many(**columns: np.ndarray) -> dict[str, list[float | None]]:
    """Float columns as lists, with None where a value is NaN or infinite (JSON has neither).

    All columns go through numpy together: one conversion for the lot, whatever the count of circuits.
    """
    names = list(columns)
    stacked = np.vstack([np.asarray(columns[name], dtype=float) for name in names])
    lists = stacked.tolist()
    for r, c in zip(*np.nonzero(~np.isfinite(stacked))):
        lists[r][c] = None
    return dict(zip(names, lists))


def _margin_array(value: np.ndarray, limit: np.ndarray) -> np.ndarray:
    """(limit - value) / limit x 100; NaN where either is missing or the limit is zero."""
    v = np.asarray(value, dtype=float)
    lim = np.asarray(limit, dtype=float)
    with np.errstate(divide="ignore", invalid="ignore"):
        return np.where(np.isfinite(v) & np.isfinite(lim) & (lim != 0), (lim - v) / lim * 100.0, np.nan)


def _time_verdicts(t: np.ndarray, bound: np.ndarray, limit: np.ndarray) -> np.ndarray:
    """pass where the time is within the limit; at-most data that miss it cannot be shown either way."""
    with np.errstate(invalid="ignore"):
        ok = t <= limit * (1 + 1e-9)
    verdict = np.where(ok, PASS, np.where(bound == AT_MOST, NOT_VERIFIED, FAIL))
    verdict = np.where(bound == BEYOND_DATA, FAIL, verdict)
    return np.where(np.isfinite(limit), verdict, NOT_VERIFIED).astype(object)


def _assemble(circuit: Circuit, device: dict[str, Any], pfc_basis: str, cautions: list[str], c: dict[str, Any]) -> CircuitResult:
    """One circuit's result from its row of the computed columns."""
    checks = [
        Check("disconnection-time", c["dt_verdict"], c["t"], c["limit"], "s", c["dt_margin"], c["t_basis"], c["dt_note"]),
        Check("max-zs", c["mz_verdict"], c["mz_value"], c["mz_limit"], "ohm", c["mz_margin"], c["mz_basis"], c["mz_note"]),
    ]
    if c["has_cond"]:
        pc = {
            "k": c["k"], "k_formula": c["k_formula"], "k_basis": c["k_table"], "min_csa_mm2": c["s_min"],
            "csa_mm2": c["csa"], "next_standard_csa_mm2": c["next_size"], "selection_csa_mm2": c["selection"],
            "energy_a2s": c["energy"], "energy_basis": c["method"], "verdict": c["pc_verdict"], "basis": c["pc_basis"],
        }
        checks.append(Check("protective-conductor", c["pc_verdict"], c["csa"], c["s_min"], "mm2", c["pc_margin"], c["pc_basis"], c["pc_note"]))
    else:
        pc = {"k": None, "k_formula": None, "k_basis": None, "min_csa_mm2": None, "csa_mm2": None, "next_standard_csa_mm2": None,
              "selection_csa_mm2": None, "energy_a2s": None, "energy_basis": None, "verdict": NOT_VERIFIED, "basis": c["pc_basis"]}
        checks.append(Check("protective-conductor", NOT_VERIFIED, None, None, "mm2", None, c["pc_basis"], c["pc_note"]))
    checks.append(Check("breaking-capacity", c["bc_verdict"], c["pfc"], c["icn"], "kA", c["bc_margin"], BASES["breaking-capacity"], c["bc_note"]))
    if c["has_rcd"]:
        checks.append(Check("rcd", c["rcd_verdict"], c["rcd_value"], c["rcd_limit"], "ohm", c["rcd_margin"], c["rcd_basis"], c["rcd_note"]))
    return CircuitResult(
        id=circuit.id,
        r1_plus_r2_ohm=c["r1r2"],
        zs_ohm=c["zs"],
        earth_fault_current_a=c["i_f"],
        earth_fault_current_nominal_a=c["i_nom"],
        prospective_fault_current_ka=c["pfc"],
        prospective_fault_current_basis=pfc_basis,
        device=device,
        disconnection_time_s=c["t"],
        disconnection_time_bound=c["bound"],
        disconnection_region=c["region"],
        disconnected_by=c["by"],
        max_disconnection_time_s=c["limit"],
        max_disconnection_basis=c["t_basis"],
        operating_current_a=c["ia"],
        operating_current_bound=c["b_ia"],
        max_zs_ohm=c["mz_limit"],
        zs_margin_percent=c["mz_margin"],
        protective_conductor=pc,
        checks=checks,
        verdict=overall_verdict([check.verdict for check in checks]),
        cautions=cautions,
    )
